package main

import (
	"errors"
	"flag"
	"fmt"
	"math"
	"strings"

	"github.com/antipode-color/antipode/mixing"
)

// The command "greybalance" works on a halftone print model file.

func init() {
	register(&command{
		name:    "greybalance",
		summary: "the coverages of three inks that print neutral greys (halftone model)",
		usage:   "greybalance PRINT.json [--steps 11] [--relative] [--inks c,m,y] [--tac 300] [--illuminant D50] [--observer 1931] [--tolerance 0.5] [--out CURVE.csv] [--json]",
		about: `Finds the grey balance of a press: the nominal coverages of three inks (c, m
and y by default; other inks stay at 0) that print neutral greys, from the
paper's lightness down to the darkest neutral they reach, as a table of
--steps rows evenly spaced in L* and as a curve through them (--out writes the
curve at every whole L* as CSV; --json holds both). Each row is a colour match
(see "antipode solve") within the total area coverage limit --tac.

The neutral aim is absolute, a* = b* = 0 under --illuminant (D50 by default),
or with --relative the paper-relative grey: the paper's a* and b* fading in
proportion to the lightness, to 0 at the lightness of the three inks' solid
overprint,
    a*(L*) = a*_paper·(1 − (L*_paper − L*)/(L*_paper − L*_overprint)),
and likewise b*, after the paper-relative grey of the trade's grey-balance
calibrations (the printing standards ISO 12647-2:2013 and ISO/TS 10128:2009
deal with near-neutral greys; this formula is written from memory, not read
from them). With the
absolute aim the lightest rows of a tinted paper cannot be reached: the paper
cannot be made neutral without darkening it.

The table shows each row's aim, the coverages in percent, what they print
and its ΔE00 from the aim, with a small plot of the coverages (each ink's
initial at its coverage on a 0–100 % line).`,
		example: `  $ antipode fit halftone cmd/antipode/demo/press_characterisation.csv --out press.json --tac 300
  $ antipode greybalance press.json
  $ antipode greybalance press.json --relative --steps 21 --out grey-curve.csv --json`,
		run: runGreyBalance,
	})
}

func runGreyBalance(e *env, args []string) error {
	c := commands["greybalance"]
	var inks, illum, obs, out string
	var steps int
	var tac, tol float64
	var relative, asJSON bool
	fs := flag.NewFlagSet("greybalance", flag.ContinueOnError)
	fs.IntVar(&steps, "steps", 11, "number of rows of the table, from the paper to the darkest neutral (`N` ≥ 2)")
	fs.BoolVar(&relative, "relative", false, "aim at the paper-relative neutral instead of a* = b* = 0")
	fs.StringVar(&inks, "inks", "", "the three inks of the grey, `ink,ink,ink`; default c,m,y (or the model's three inks)")
	fs.Float64Var(&tac, "tac", 0, "total area coverage limit in `PERCENT` (e.g. 300); default: the model's, or none")
	fs.StringVar(&illum, "illuminant", "D50", "illuminant of the neutral: a CIE `NAME` (see 'antipode illuminants') or a FILE")
	fs.StringVar(&obs, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.Float64Var(&tol, "tolerance", mixing.DefaultHalftoneTolerance, "`ΔE00` up to which a neutral counts as reached")
	fs.StringVar(&out, "out", "", "write the curve (coverage in percent at every whole L*) to `CURVE.csv`")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	pos, err := parseFlags(c, fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return usagef("name one halftone model file: %s", c.usage)
	}
	if steps < 2 || steps > 1000 {
		return usagef("--steps %d: want 2 to 1000", steps)
	}
	if tac < 0 || tac != tac || tac > 1e6 {
		return usagef("--tac %v: want a total area coverage in percent, e.g. 300", tac)
	}
	if !(tol >= 0) || tol > 1e6 {
		return usagef("--tolerance %v: want a non-negative ΔE00", tol)
	}
	mm, err := loadModel(pos[0])
	if err != nil {
		return err
	}
	m, err := halftoneModel(mm)
	if err != nil {
		return fmt.Errorf("%s: %v", pos[0], err)
	}
	set := mixing.GreyBalanceSettings{Steps: steps, Relative: relative, TAC: tac, Tolerance: tol}
	if inks != "" {
		for _, n := range strings.Split(inks, ",") {
			set.Inks = append(set.Inks, strings.TrimSpace(n))
		}
	}
	if set.Scorer, err = scorerFlags(e, illum, obs); err != nil {
		return err
	}
	gb, err := m.GreyBalance(set)
	if err != nil {
		var ce *mixing.ConvergenceError
		switch {
		case errors.As(err, &ce):
			return fmt.Errorf("%s: %v; best coverages found: %s", pos[0], err, amountList(m.Inks(), ce.Best, "%.4f"))
		case errors.Is(err, mixing.ErrUnknownInk), strings.Contains(err.Error(), "inks"), strings.Contains(err.Error(), "named twice"):
			return usagef("--inks: %v", err)
		}
		return fmt.Errorf("%s: %w", pos[0], err)
	}
	curve, err := greyCurve(gb)
	if err != nil {
		return err
	}
	if out != "" {
		var b strings.Builder
		b.WriteString("L*")
		for _, ink := range gb.Inks {
			b.WriteString("," + ink + " %")
		}
		b.WriteString("\n")
		for _, row := range curve {
			fmt.Fprintf(&b, "%.2f", row["L"])
			for _, ink := range gb.Inks {
				fmt.Fprintf(&b, ",%.2f", 100*row[ink])
			}
			b.WriteString("\n")
		}
		if err := e.writeOut("--out", out, []byte(b.String()), pos[0]); err != nil {
			return err
		}
	}
	if asJSON {
		return writeJSON(e.stdout, greyJSON(gb, curve, out))
	}
	printGreyBalance(e, pos[0], gb, out)
	return nil
}

// greyCurve samples the grey-balance curve at every whole L* of its range
// (and its ends).
func greyCurve(gb mixing.GreyBalance) ([]map[string]float64, error) {
	n := len(gb.Steps)
	lo, hi := gb.Steps[n-1].Target.L, gb.Steps[0].Target.L
	var ls []float64
	ls = append(ls, lo)
	for L := math.Floor(lo) + 1; L < hi; L++ {
		ls = append(ls, L)
	}
	ls = append(ls, hi)
	var out []map[string]float64
	for _, L := range ls {
		am, err := gb.At(L)
		if err != nil {
			return nil, err
		}
		row := map[string]float64{"L": L}
		for _, a := range am {
			row[a.Name] = a.Value
		}
		out = append(out, row)
	}
	return out, nil
}

// greyJSON is the --json form of a grey balance.
func greyJSON(gb mixing.GreyBalance, curve []map[string]float64, out string) map[string]any {
	var steps []map[string]any
	for _, st := range gb.Steps {
		am := map[string]float64{}
		for _, a := range st.Coverages {
			am[a.Name] = a.Value
		}
		steps = append(steps, map[string]any{"aim": labMap(st.Target), "amounts": am, "lab": labMap(st.Lab), "dE00": st.DE00,
			"reachable": st.Reachable, "tac_percent": st.TACPercent})
	}
	var darkest, limit, outKey any
	if gb.DarkestL > 0 {
		darkest = gb.DarkestL
	}
	if gb.TACLimit > 0 {
		limit = gb.TACLimit
	}
	if out != "" {
		outKey = out
	}
	aim := "absolute"
	if gb.Relative {
		aim = "relative"
	}
	return map[string]any{"inks": gb.Inks, "aim": aim, "illuminant": gb.Illuminant, "observer": gb.Observer,
		"paper": labMap(gb.Paper), "overprint": labMap(gb.Black), "darkest_L": darkest, "tac_limit_percent": limit,
		"tolerance_dE00": gb.Tolerance, "steps": steps, "curve": curve, "out": outKey, "warnings": nonNil(gb.Warnings)}
}

// printGreyBalance writes the table.
func printGreyBalance(e *env, path string, gb mixing.GreyBalance, out string) {
	w := e.stdout
	aim := "absolute neutral aim (a* = b* = 0)"
	if gb.Relative {
		aim = "paper-relative neutral aim"
	}
	fmt.Fprintf(w, "Grey balance of %s with %s under %s, %s; %s\n", path, strings.Join(gb.Inks, ", "), gb.Illuminant, gb.Observer, aim)
	limit := "no total area coverage limit"
	if gb.TACLimit > 0 {
		limit = fmt.Sprintf("total area coverage limit %g %%", gb.TACLimit)
	}
	fmt.Fprintf(w, "paper L* %.2f a* %.2f b* %.2f; %s overprint L* %.2f; %s\n", gb.Paper.L, gb.Paper.A, gb.Paper.B,
		strings.Join(gb.Inks, "+"), gb.Black.L, limit)
	if gb.DarkestL > 0 {
		fmt.Fprintf(w, "darkest neutral within ΔE00 %g: L* %.2f\n\n", gb.Tolerance, gb.DarkestL)
	} else {
		fmt.Fprintf(w, "no neutral within ΔE00 %g\n\n", gb.Tolerance)
	}
	var t table
	hdr := []string{"aim L*", "aim a*", "aim b*"}
	for _, ink := range gb.Inks {
		hdr = append(hdr, ink+" %")
	}
	hdr = append(hdr, "total %", "L*", "a*", "b*", "ΔE00", "reached", htPlotHeader(20))
	t.left = map[int]bool{len(hdr) - 2: true, len(hdr) - 1: true}
	t.header(hdr...)
	for _, st := range gb.Steps {
		row := []string{fmt.Sprintf("%.2f", st.Target.L), htNum2(st.Target.A), htNum2(st.Target.B)}
		cov := make([]float64, len(st.Coverages))
		for i, a := range st.Coverages {
			row = append(row, fmt.Sprintf("%.1f", 100*a.Value))
			cov[i] = a.Value
		}
		reached := "yes"
		if !st.Reachable {
			reached = "no"
		}
		row = append(row, fmt.Sprintf("%.1f", st.TACPercent), fmt.Sprintf("%.2f", st.Lab.L), htNum2(st.Lab.A), htNum2(st.Lab.B),
			fmt.Sprintf("%.2f", st.DE00), reached, htPlot(gb.Inks, cov, 20))
		t.row(row...)
	}
	t.write(w)
	if len(gb.Warnings) > 0 {
		fmt.Fprintf(w, "\nwarnings:\n  %s\n", joinLines(gb.Warnings))
	}
	if out != "" {
		fmt.Fprintf(w, "\nwrote the curve to %s\n", out)
	}
}

// htNum2 formats v with two decimals, without a minus sign on a value that
// rounds to zero.
func htNum2(v float64) string {
	t := fmt.Sprintf("%.2f", v)
	if t == "-0.00" {
		return "0.00"
	}
	return t
}

// htPlotHeader labels the columns of htPlot's line of width+1 cells:
// 0, 50 and 100 (percent) over their cells.
func htPlotHeader(width int) string {
	h := []rune(strings.Repeat(" ", width+3))
	put := func(at int, s string) {
		for i, r := range s {
			if at+i < len(h) {
				h[at+i] = r
			}
		}
	}
	put(1, "0")
	put(1+width/2-1, "50")
	put(width-1, "100%")
	return strings.TrimRight(string(h), " ")
}
