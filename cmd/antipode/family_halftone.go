package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// The halftone family: fit, mix and solve for the Yule–Nielsen modified
// spectral Neugebauer model of a printing press (package mixing,
// Halftone). The grey balance has its own command (greybalance.go).

const halftoneFitHelp = `Calibrates a halftone print model (Yule–Nielsen modified spectral Neugebauer,
with the Demichel equations for independently placed dots) of one to four
inks from a printed chart. The patches whose coverages are all 0 or 100 % are
the Neugebauer primaries: the paper, every solid and every overprint (16 for
four inks; replicates are averaged). The patches of one ink alone between 0
and 100 % are its tint ramp: they give the ink's dot-gain curve (effective
against nominal coverage, monotone) and, together with the overprint tints
not held out, the Yule–Nielsen factor n (1 ≤ n ≤ 10). Overprint tints held
out validate the model.

The measurement file is spectral CSV in the rows layout, one patch per line:

  name         the patch's name (first column), unique
  c, m, y, k   nominal coverage of each process ink, in PERCENT 0–100 as the
               trade writes it; "c (%)" says so, "c (fraction)" declares
               fractions 0–1 instead; an empty cell is 0
  ink:NAME     a spot ink's coverage, e.g. "ink:orange (%)"; process and
               spot inks mix freely, up to four inks in all
  heldout      optional, 1 keeps the patch out of the fit and scores it
  380, 390, …  reflectance, fraction 0–1 (or percent, see --scale), one
               column per wavelength (nm)

  name,c,m,y,k,heldout,380,390,400,…
  paper,0,0,0,0,0,0.693,0.798,0.850,…
  solid-c+m,100,100,0,0,0,0.021,0.025,0.031,…
  c50,50,0,0,0,0,0.412,0.455,0.502,…
  c40m30y30,40,30,30,0,1,0.261,0.270,0.281,…

Missing primaries are named in the error. Each ink needs a ramp, better ten
levels (10 %, 20 % … 90 %); a ramp whose print gets lighter as the coverage
rises (by more than 2 % of effective coverage) is refused, naming the patches.

The report gives n with its standard error, the primaries' CIELAB (and the
spread of replicates), each ink's dot gain at 25, 50 and 75 % and its
largest, and every tint with its RMS spectral residual and ΔE00 under
--illuminant (D50 by default, the graphic arts' viewing illuminant), with
the summary on training and held-out patches.`

func init() {
	registerFamily(&modelFamily{kind: mixing.HalftoneKind, fitHelp: halftoneFitHelp, fit: fitHalftone, mix: mixHalftone, solve: solveHalftone})
	demoSteps = append(demoSteps,
		demoStep{"Characterise the theatre's poster press from its printed chart (primaries, tint ramps, overprint tints).",
			[]string{"fit", "halftone", "press_characterisation.csv", "--out", "press.json", "--tac", "300"}},
		demoStep{"Which coverages print the poster's brick red?",
			[]string{"solve", "press.json", "--target", "press_target.csv:poster-brick"}},
		demoStep{"A fluorescent-looking signal green: the press cannot print it, so the nearest printable colour.",
			[]string{"solve", "press.json", "--target", "press_target.csv:signal-green"}},
		demoStep{"The press's grey balance: c, m, y for neutrals that follow the paper's tint.",
			[]string{"greybalance", "press.json", "--relative", "--steps", "9"}},
	)
}

var fitHalftoneCommand = &command{
	name:  "fit",
	usage: "fit halftone CHART.csv --out PRINT.json [--tac 300] [--n N | --per-ink-n] [--holdout FRACTION] [--illuminant D50] [--observer 1931] [--scale fraction|percent] [--json]",
	about: halftoneFitHelp,
	example: `  $ antipode fit halftone cmd/antipode/demo/press_characterisation.csv --out press.json --tac 300
  $ antipode fit halftone my-chart.csv --out my-press.json --holdout 0.2 --per-ink-n`,
}

var mixHalftoneCommand = &command{
	name:  "mix",
	usage: "mix PRINT.json --amounts ink=fraction,… [--illuminant D50] [--observer 1931] [--out FILE.csv] [--json]",
	about: `Runs a halftone print model forward: the reflectance printed at the given
nominal coverages (fractions 0–1: 40 % is 0.4; inks not named are 0), and its
colour under the illuminant: X, Y, Z and CIELAB, with the effective coverages
after dot gain and the total area coverage. --out writes the reflectance as
CSV (wavelength column, then the spectrum).`,
	example: `  $ antipode fit halftone cmd/antipode/demo/press_characterisation.csv --out press.json
  $ antipode mix press.json --amounts c=0.4,m=0.3,y=0.3
  $ antipode mix press.json --amounts m=0.8,y=0.85,k=0.1 --out red.csv --json`,
}

var solveHalftoneCommand = &command{
	name:  "solve",
	usage: "solve PRINT.json (--target FILE[:NAME] | --lab L,a,b) [--tac 300] [--ink-max ink=fraction,…] [--fix ink=fraction,…] [--illuminant D50] [--observer 1931] [--tolerance 0.5] [--scale fraction|percent] [--json]",
	about: `Finds the nominal coverages that print closest to a target: the smallest
ΔE00 under --illuminant (D50 by default, as graphic arts view prints), each ink
within 0 and its --ink-max, and the sum of the coverages within the total area
coverage limit --tac (percent, as the trade writes it; by default the limit
recorded in the model, or none). Among equally close prints the one with the
least ink wins (so a black ink takes over the grey part of a colour); --fix
holds inks at a coverage, e.g. --fix k=0 for no black.

For a target reflectance (--target) the first recipe is the "closest
spectrum": of equally close colour matches, the one whose reflectance is
nearest the target's (the least metameric, most likely how a printed sample
was made); a "least ink" recipe follows when it saves ink. For a CIELAB
target (--lab) the one recipe uses the least ink.

A target the press cannot print is not an error: the answer is the nearest
printable colour with its ΔE00, marked not reachable ("reachable" means
ΔE00 ≤ --tolerance). Coverages are fractions 0–1 in --ink-max, --fix and the
JSON output (12.2 % is 0.122); the table shows percent, and --tac is percent.

With --json the output is {"recipes":[{"amounts":{ink: fraction 0–1},"dE00",
"reachable","warnings","choice","tac_percent","tac_limit_percent",
"effective":{ink: fraction 0–1},"L","a","b","spectral_rms"}]}.`,
	example: `  $ antipode fit halftone cmd/antipode/demo/press_characterisation.csv --out press.json --tac 300
  $ antipode solve press.json --target cmd/antipode/demo/press_target.csv:poster-brick
  $ antipode solve press.json --lab 60,-20,-35 --tac 280 --fix k=0 --json`,
}

// htReadChart reads a calibration chart, with reflectance as fractions.
func htReadChart(e *env, path, scale string) ([]mixing.HalftoneSample, []string, []string, error) {
	recs, err := readCalibration(e, path, "no coverage columns: the halftone calibration needs the rows layout (name, c, m, y, k in percent, [heldout], then wavelengths; see 'antipode fit halftone --help')")
	if err != nil {
		return nil, nil, nil, err
	}
	scale, warns := recordsScale(recs, scale, "reflectance")
	samples, inks, err := mixing.HalftoneSamples(recs, path)
	if err != nil {
		return nil, nil, nil, err
	}
	if scale == "percent" {
		for i := range samples {
			samples[i].Reflectance = samples[i].Reflectance.Scale(0.01)
		}
	}
	return samples, inks, warns, nil
}

// fitHalftone runs "antipode fit halftone".
func fitHalftone(e *env, args []string) error {
	ff := fitFlags{model: "PRINT.json"}
	var vf viewFlags
	var scale string
	var holdout, n, tac float64
	var perInk bool
	fs := flag.NewFlagSet("fit halftone", flag.ContinueOnError)
	ff.define(fs)
	fs.Float64Var(&tac, "tac", 0, "record the press's total area coverage limit, in `PERCENT` (e.g. 300), for solve and greybalance; 0 records none")
	fs.Float64Var(&n, "n", 0, "fix the Yule–Nielsen factor at `N` (1 gives the spectral Neugebauer model) instead of fitting it")
	fs.BoolVar(&perInk, "per-ink-n", false, "fit one Yule–Nielsen factor per ink, each from its own ramp")
	fs.Float64Var(&holdout, "holdout", 0, "hold out this `FRACTION` (0–1) of the patches for validation, chosen deterministically (never a primary nor a ramp's lightest or darkest tint)")
	vf.define(fs, "D50", "illuminant for the ΔE00 of the report")
	fs.StringVar(&scale, "scale", "", "scale of the reflectances: `fraction` (0–1) or percent; default: percent when a value exceeds 1.5")
	files, err := ff.parse(fitHalftoneCommand, fs, e, args, "chart")
	if err != nil {
		return err
	}
	switch {
	case holdout < 0 || holdout >= 1 || holdout != holdout:
		return usagef("--holdout %v: want a fraction in [0, 1)", holdout)
	case n != 0 && (n < mixing.MinNFactor || n > mixing.MaxNFactor || n != n):
		return usagef("--n %v: want a Yule–Nielsen factor in [%g, %g]", n, float64(mixing.MinNFactor), float64(mixing.MaxNFactor))
	case n != 0 && perInk:
		return usagef("--n and --per-ink-n exclude each other")
	case tac < 0 || tac > 100*mixing.MaxHalftoneInks || tac != tac:
		return usagef("--tac %v: want a total area coverage in percent, e.g. 300", tac)
	}
	if err := checkScale(scale); err != nil {
		return err
	}
	scorer, err := vf.scorer(e)
	if err != nil {
		return err
	}
	path := files[0]
	samples, inks, warns, err := htReadChart(e, path, scale)
	if err != nil {
		return err
	}
	m, err := mixing.FitHalftone(inks, samples, mixing.HalftoneFitSettings{Scorer: scorer, NFactor: n, PerInk: perInk, HoldOut: holdout, TAC: tac})
	if err != nil {
		if strings.HasPrefix(err.Error(), path+":") {
			return err // it names the file and line already
		}
		return fmt.Errorf("%s: %w", path, err)
	}
	if err := saveModel(ff.out, m, files); err != nil {
		return err
	}
	if ff.asJSON {
		nf, se := m.NFactor()
		var tacv any
		if m.TAC() > 0 {
			tacv = m.TAC()
		}
		return writeJSON(e.stdout, map[string]any{
			"model": ff.out, "kind": m.Kind(), "inks": m.Inks(), "n_factor": nf, "n_factor_se": se, "tac_percent": tacv,
			"primaries": m.PrimaryFits(), "inks_fit": m.InkFits(), "fit": m.Report(), "warnings": nonNil(warns),
		})
	}
	printHalftoneFit(e.stdout, m, samples, path, ff.out, warns)
	return nil
}

// printHalftoneFit writes the human-readable fit report.
func printHalftoneFit(w io.Writer, m *mixing.Halftone, samples []mixing.HalftoneSample, path, out string, readWarns []string) {
	r := m.Report()
	g := m.Grid()
	inks := m.Inks()
	pf := m.PrimaryFits()
	measured := 0
	for _, p := range pf {
		measured += len(p.Samples)
	}
	nTints := len(r.Samples)
	fmt.Fprintf(w, "Halftone model from %s: %d inks (%s); %d patches: %d primaries (%d measurements), %d tints; %g–%g nm at %g nm\n",
		path, len(inks), strings.Join(inks, ", "), len(samples), len(pf), measured, nTints, g.Start, g.End(), g.Step)
	n, se := m.NFactor()
	switch {
	case len(n) > 1:
		var parts []string
		for i, v := range n {
			if se[i] > 0 {
				parts = append(parts, fmt.Sprintf("%s %.3f ± %.3f", inks[i], v, se[i]))
			} else {
				parts = append(parts, fmt.Sprintf("%s %.4g", inks[i], v))
			}
		}
		fmt.Fprintf(w, "Yule–Nielsen n per ink: %s\n", strings.Join(parts, ", "))
	case se[0] > 0:
		fmt.Fprintf(w, "Yule–Nielsen n = %.3f ± %.3f (fitted, one for all inks)\n", n[0], se[0])
	default:
		fmt.Fprintf(w, "Yule–Nielsen n = %.4g (one for all inks)\n", n[0])
	}
	if m.TAC() > 0 {
		fmt.Fprintf(w, "total area coverage limit %g %% (recorded for solve and greybalance)\n", m.TAC())
	} else {
		fmt.Fprintln(w, "no total area coverage limit recorded (fit with --tac, or give solve --tac)")
	}
	fmt.Fprintf(w, "CIELAB and ΔE00 under %s, %s; RMS and max in reflectance (0–1)\n", r.Illuminant, r.Observer)

	fmt.Fprintln(w, "\nPrimaries (solids and overprints as measured; the model reproduces them exactly)")
	var pt table
	pt.header("primary", "L*", "a*", "b*", "measured", "spread ΔE00")
	for _, p := range pf {
		spread := "—"
		if len(p.Samples) > 1 {
			spread = fmt.Sprintf("%.2f", p.Spread)
		}
		pt.row(p.Name, fmt.Sprintf("%.2f", p.L), fmt.Sprintf("%.2f", p.A), fmt.Sprintf("%.2f", p.B), fmt.Sprint(len(p.Samples)), spread)
	}
	pt.write(w)

	fmt.Fprintln(w, "\nDot gain (effective minus nominal coverage, percentage points)")
	var gt table
	gt.header("ink", "tints", "levels", "at 25 %", "at 50 %", "at 75 %", "largest")
	for _, f := range m.InkFits() {
		gt.row(f.Ink, fmt.Sprint(f.Patches), fmt.Sprint(f.Levels), fmt.Sprintf("%+.1f", 100*f.Gain25), fmt.Sprintf("%+.1f", 100*f.Gain50),
			fmt.Sprintf("%+.1f", 100*f.Gain75), fmt.Sprintf("%+.1f at %.0f %%", 100*f.MaxGain, 100*f.MaxGainAt))
	}
	gt.write(w)

	fmt.Fprintln(w, "\nTints (nominal coverage, percent)")
	byName := map[string]mixing.HalftoneSample{}
	for _, s := range samples {
		byName[s.Name] = s
	}
	var st table
	hdr := append([]string{"patch"}, inks...)
	st.left = map[int]bool{len(hdr): true}
	st.header(append(hdr, "set", "RMS", "max", "ΔE00")...)
	for _, sf := range r.Samples {
		row := []string{sf.Name}
		cov := map[string]float64{}
		for _, a := range byName[sf.Name].Coverages {
			cov[a.Name] = a.Value
		}
		for _, ink := range inks {
			row = append(row, fmt.Sprintf("%.4g", 100*cov[ink]))
		}
		set := "fit"
		if sf.HeldOut {
			set = "held out"
		}
		st.row(append(row, set, fmt.Sprintf("%.4f", sf.RMS), fmt.Sprintf("%.4f", sf.MaxAbs), fmt.Sprintf("%.2f", sf.DE00))...)
	}
	st.write(w)
	printFitSummary(w, &r, "tints", 4, "mark overprint tints with heldout = 1 or use --holdout")
	printClosing(w, "\n", append(append([]string(nil), readWarns...), r.Warnings...), out)
}

// halftoneModel asserts the model's type.
func halftoneModel(m mixing.Model) (*mixing.Halftone, error) {
	return modelAs[*mixing.Halftone](m, "halftone")
}

// htCoverageFlag parses an ink=fraction list for the flag name. A value
// outside 0–1 is refused; the message converts it as if it were percent
// (12.2 → 0.122), the likeliest mistake, since the solve table and the
// chart write coverages in percent.
func htCoverageFlag(name, s string) ([]mixing.Amount, error) {
	am, err := parseAmounts(s)
	if err != nil {
		return nil, usagef("--%s: %v", name, strings.TrimPrefix(err.Error(), "--amounts: "))
	}
	for _, a := range am {
		switch {
		case a.Value > 1 && a.Value <= 100:
			return nil, usagef("--%s: %s=%g is above 1: coverages are fractions 0–1 (%g %% is %g)", name, a.Name, a.Value, a.Value, a.Value/100)
		case a.Value < 0 || a.Value > 1:
			return nil, usagef("--%s: %s=%g is outside 0–1: coverages are fractions 0–1 (12.2 %% is 0.122)", name, a.Name, a.Value)
		}
	}
	return am, nil
}

// htInkError turns an unknown-ink error into a usage error.
func htInkError(flagName string, err error) error {
	if errors.Is(err, mixing.ErrUnknownInk) {
		return usagef("--%s: %v", flagName, err)
	}
	return err
}

// mixHalftone runs "antipode mix" on a halftone model.
func mixHalftone(e *env, mm mixing.Model, args []string) error {
	var amounts, out string
	var vf viewFlags
	var asJSON bool
	fs := flag.NewFlagSet("mix", flag.ContinueOnError)
	fs.StringVar(&amounts, "amounts", "", "nominal coverages as fractions 0–1, `ink=fraction,…` (40 % is 0.4)")
	vf.define(fs, "D50", "illuminant for the colour")
	fs.StringVar(&out, "out", "", "write the reflectance spectrum to `FILE.csv`")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of text")
	if err := parseNoArgs(mixHalftoneCommand, fs, e, args); err != nil {
		return err
	}
	m, err := halftoneModel(mm)
	if err != nil {
		return err
	}
	if amounts == "" {
		return usagef("--amounts is required (inks: %s)", strings.Join(m.Inks(), ", "))
	}
	am, err := htCoverageFlag("amounts", amounts)
	if err != nil {
		return err
	}
	scorer, err := vf.scorer(e)
	if err != nil {
		return err
	}
	cov, err := m.Coverages(am)
	if err != nil {
		return htInkError("amounts", err)
	}
	s, err := m.Reflectance(am)
	if err != nil {
		return htInkError("amounts", err)
	}
	xyz, lab, err := objectColour(scorer, s)
	if err != nil {
		return err
	}
	eff := m.EffectiveTo(make([]float64, len(cov)), cov)
	var tac float64
	for _, v := range cov {
		tac += v
	}
	if err := e.writeSpectrumOut(out, "reflectance", s); err != nil {
		return err
	}
	var warns []string
	if lim := m.TAC(); lim > 0 && 100*tac > lim+1e-9 {
		warns = append(warns, fmt.Sprintf("total area coverage %.4g %% exceeds the press's limit of %g %%", 100*tac, lim))
	}
	if asJSON {
		amj, effj := map[string]float64{}, map[string]float64{}
		for i, ink := range m.Inks() {
			amj[ink], effj[ink] = cov[i], eff[i]
		}
		return writeJSON(e.stdout, map[string]any{
			"amounts": amj, "effective": effj, "tac_percent": 100 * tac, "illuminant": scorer.Illuminant(), "observer": scorer.Observer(),
			"X": xyz.X, "Y": xyz.Y, "Z": xyz.Z, "L": lab.L, "a": lab.A, "b": lab.B, "out": orNull(out), "warnings": nonNil(warns),
		})
	}
	fmt.Fprintf(e.stdout, "print under %s, %s:\n\n", scorer.Illuminant(), scorer.Observer())
	var t table
	t.header("ink", "nominal %", "effective %")
	for i, ink := range m.Inks() {
		t.row(ink, fmt.Sprintf("%.1f", 100*cov[i]), fmt.Sprintf("%.1f", 100*eff[i]))
	}
	t.row("total", fmt.Sprintf("%.1f", 100*tac), "")
	t.write(e.stdout)
	fmt.Fprintf(e.stdout, "\n  X %.3f  Y %.3f  Z %.3f\n", xyz.X, xyz.Y, xyz.Z)
	fmt.Fprintf(e.stdout, "  L* %.2f  a* %.2f  b* %.2f\n", lab.L, lab.A, lab.B)
	printClosing(e.stdout, "", warns, out)
	return nil
}

// solveHalftone runs "antipode solve" on a halftone model.
func solveHalftone(e *env, mm mixing.Model, args []string) error {
	var target, labArg, scale, inkMax, fix string
	var vf viewFlags
	var tac, tol float64
	var asJSON bool
	fs := flag.NewFlagSet("solve", flag.ContinueOnError)
	fs.StringVar(&target, "target", "", "target reflectance: a spectral `FILE`, or FILE:NAME for one spectrum of it")
	fs.StringVar(&labArg, "lab", "", "target as CIELAB `L,a,b` under --illuminant, instead of --target")
	fs.Float64Var(&tac, "tac", 0, "total area coverage limit in `PERCENT` (e.g. 300); default: the model's, or none")
	fs.StringVar(&inkMax, "ink-max", "", "largest nominal coverage of inks as fractions 0–1, `ink=fraction,…` (95 % is 0.95)")
	fs.StringVar(&fix, "fix", "", "hold inks at nominal coverages as fractions 0–1, `ink=fraction,…` (12.2 % is 0.122), e.g. k=0")
	vf.define(fs, "D50", "illuminant of the colour match")
	fs.Float64Var(&tol, "tolerance", mixing.DefaultHalftoneTolerance, "`ΔE00` up to which the target counts as reached")
	fs.StringVar(&scale, "scale", "", "scale of the target's values: `fraction` (0–1) or percent; default: percent when the maximum exceeds 1.5")
	plotPath := plotFlag(fs)
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	if err := parseNoArgs(solveHalftoneCommand, fs, e, args); err != nil {
		return err
	}
	m, err := halftoneModel(mm)
	if err != nil {
		return err
	}
	if (target == "") == (labArg == "") {
		return usagef("give one target: --target FILE[:NAME] or --lab L,a,b")
	}
	if tac < 0 || tac != tac || tac > 1e6 {
		return usagef("--tac %v: want a total area coverage in percent, e.g. 300", tac)
	}
	if !(tol >= 0) || tol > 1e6 {
		return usagef("--tolerance %v: want a non-negative ΔE00", tol)
	}
	if err := checkScale(scale); err != nil {
		return err
	}
	set := mixing.HalftoneSolveSettings{TAC: tac, Tolerance: tol}
	if inkMax != "" {
		if set.MaxCoverage, err = htCoverageFlag("ink-max", inkMax); err != nil {
			return err
		}
	}
	if fix != "" {
		if set.Fixed, err = htCoverageFlag("fix", fix); err != nil {
			return err
		}
	}
	if set.Scorer, err = vf.scorer(e); err != nil {
		return err
	}
	var sol mixing.Solution
	var what string
	var warns []string
	var labT colorimetry.Lab
	var tgt *namedSpectrum
	if labArg != "" {
		if labT, err = parseLab(labArg); err != nil {
			return err
		}
		what = fmt.Sprintf("CIELAB %s", labArg)
		sol, err = m.SolveLab(labT, set)
	} else {
		in, ts, w, ferr := oneSpectrum(e, "target", target, scale)
		if ferr != nil {
			return ferr
		}
		warns = w
		what = in.place()
		tgt = &namedSpectrum{name: in.name, s: ts}
		if labT, err = set.Scorer.ObjectLab(ts); err != nil {
			return fmt.Errorf("%s: %w", what, err)
		}
		sol, err = m.Solve(ts, set)
	}
	if err != nil {
		var ce *mixing.ConvergenceError
		switch {
		case errors.As(err, &ce):
			return fmt.Errorf("%s: %v; best coverages found: %s", what, err, amountList(m.Inks(), ce.Best, "%.4f"))
		case errors.Is(err, mixing.ErrUnknownInk):
			return usagef("%v", err)
		case strings.Contains(err.Error(), "coverage"):
			return usagef("%v", err)
		}
		return fmt.Errorf("%s: %w", what, err)
	}
	prependWarnings(sol, warns)
	if err := plotObjectSolve(e, *plotPath, "reflectance", vf.illum, vf.obs, tgt, sol, m.Reflectance, fileOf(target)); err != nil {
		return err
	}
	if asJSON {
		return writeSolution(e, sol)
	}
	first := sol.Recipes[0]
	fmt.Fprintf(e.stdout, "target %s: L* %.2f a* %.2f b* %.2f under %s, %s\n", what, labT.L, labT.A, labT.B, set.Scorer.Illuminant(), set.Scorer.Observer())
	limit := "no total area coverage limit"
	if l, ok := first.Extra["tac_limit_percent"].(float64); ok {
		limit = fmt.Sprintf("total area coverage limit %g %%", l)
	}
	fmt.Fprintf(e.stdout, "%s; reachable means ΔE00 ≤ %g; coverages are nominal, in percent\n\n", limit, tol)
	var t table
	t.left = map[int]bool{1: true}
	hdr := []string{"rank", "choice"}
	for _, ink := range m.Inks() {
		hdr = append(hdr, ink+" %")
	}
	t.header(append(hdr, "total %", "ΔE00", "reachable", "spectral RMS")...)
	for i, r := range sol.Recipes {
		row := []string{fmt.Sprint(i + 1), fmt.Sprint(r.Extra["choice"])}
		for _, a := range r.Amounts {
			row = append(row, fmt.Sprintf("%.1f", 100*a.Value))
		}
		reach := "yes"
		if !r.Reachable {
			reach = "no"
		}
		rms := "—"
		if v, ok := r.Extra["spectral_rms"].(float64); ok {
			rms = fmt.Sprintf("%.4f", v)
		}
		t.row(append(row, fmt.Sprintf("%.1f", r.Extra["tac_percent"]), fmt.Sprintf("%.2f", r.DE00), reach, rms)...)
	}
	t.write(e.stdout)
	for i, r := range sol.Recipes {
		eff := r.Extra["effective"].(map[string]float64)
		var parts []string
		for _, a := range r.Amounts {
			parts = append(parts, fmt.Sprintf("%s %.1f %%", a.Name, 100*eff[a.Name]))
		}
		fmt.Fprintf(e.stdout, "\nrecipe %d prints L* %.2f a* %.2f b* %.2f; effective coverage after dot gain: %s", i+1,
			r.Extra["L"], r.Extra["a"], r.Extra["b"], strings.Join(parts, ", "))
	}
	fmt.Fprintln(e.stdout)
	printRecipeWarnings(e.stdout, sol)
	return nil
}

// htPlot draws coverages (0–1) on a line of width+1 cells for 0–100 %:
// each ink's letter (its name's first letter) at its coverage, '*' where
// two meet.
func htPlot(names []string, cov []float64, width int) string {
	cells := []rune(strings.Repeat("·", width+1))
	type mark struct {
		pos int
		r   rune
	}
	var marks []mark
	for i, c := range cov {
		r := []rune(names[i])[0]
		marks = append(marks, mark{int(math.Round(math.Min(math.Max(c, 0), 1) * float64(width))), r})
	}
	sort.SliceStable(marks, func(a, b int) bool { return marks[a].pos < marks[b].pos })
	for _, mk := range marks {
		if cells[mk.pos] != '·' {
			cells[mk.pos] = '*'
		} else {
			cells[mk.pos] = mk.r
		}
	}
	return "|" + string(cells) + "|"
}
