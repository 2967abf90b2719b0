package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// The dyes family: fit, mix and solve for the Beer–Lambert–Bouguer model
// of dyes in a solvent or a tinted film (package mixing, Dyes).

const dyesFitHelp = `Calibrates a Beer–Lambert–Bouguer model of dyes (in a solvent, a varnish or a
tinted film) from a dilution series: absorbance A = −log10 T adds over the
dyes, A(λ) = A_base(λ) + ℓ·Σ cᵢ·εᵢ(λ). For every wavelength the absorptivities
εᵢ (≥ 0) and the base absorbance are fitted by least squares over all training
samples at once, each weighted by its transmittance; values above the
absorbance limit (stray light) are left out and flagged.

The measurement file is spectral CSV in the rows layout, one sample per line:

  name            the sample's name (first column), unique
  dye             the dye's name; "base", "blank" or empty for a blank;
                  for a mixture, name=concentration pairs joined by "+"
                  (its concentration cell stays empty)
  concentration   the dye's concentration; 0 makes a blank. The header may
                  carry the unit: "concentration (g/L)"
  unit            optional, the unit if the header does not carry it
  heldout         optional, 1 keeps the sample out of the fit and scores it
  380, 385, …     transmittance, fraction 0–1 (or percent, see --scale), one
                  column per wavelength (nm)

Replicates (two rows of the same dye and concentration) are welcome: each is
an equation of its own. Every dye needs at least two different non-zero
concentrations; blanks fix the base. All samples share one path length, which
becomes path length 1 of the model; mix and solve take --path-length relative
to it.

  name,dye,concentration (g/L),heldout,380,385,390,…
  blank-1,base,0,0,0.962,0.963,0.963,…
  amber-0.02,kestrel-amber-dye,0.02,0,0.588,0.571,0.556,…
  amber-0.04,kestrel-amber-dye,0.04,0,0.348,0.329,0.313,…
  mix-1,kestrel-amber-dye=0.02+kestrel-teal-dye=0.03,,1,0.512,0.497,…

The report lists every sample (RMS spectral residual in transmittance, ΔE00 of
the transmittance seen as an object colour under --illuminant), the summary on
training and held-out samples, each dye's linearity (R² of absorbance against
concentration at its peak, and the lowest R² over its band) and the samples
where the law breaks down.`

func init() {
	registerFamily(&modelFamily{kind: "dyes", fitHelp: dyesFitHelp, fit: fitDyes, mix: mixDyes, solve: solveDyes})
}

var fitDyesCommand = &command{
	name:  "fit",
	usage: "fit dyes MEASUREMENTS.csv --out MODEL.json [--illuminant D65] [--observer 1931] [--holdout FRACTION] [--absorbance-limit 2.5] [--scale fraction|percent] [--json]",
	about: dyesFitHelp,
	example: `  $ antipode fit dyes cmd/antipode/demo/dyes_dilutions.csv --out dyes.json
  $ antipode fit dyes my-series.csv --out my-dyes.json --holdout 0.2 --illuminant A`,
}

var mixDyesCommand = &command{
	name:  "mix",
	usage: "mix DYES-MODEL.json --amounts name=value,… [--path-length L] [--illuminant D65] [--observer 1931] [--out FILE.csv] [--json]",
	about: `Runs a dyes model forward: the transmittance of the given concentrations (in
the calibration's unit) at relative path length L (1 = the calibration's), and
its colour under the illuminant: X, Y, Z, CIELAB and the luminous
transmittance (Y, 0–100). Dyes not named are absent. Concentrations beyond the
calibrated range are computed but warned about (Beer–Lambert extrapolated).
--out writes the transmittance spectrum as CSV (wavelength column, then the
spectrum).`,
	example: `  $ antipode fit dyes cmd/antipode/demo/dyes_dilutions.csv --out dyes.json
  $ antipode mix dyes.json --amounts kestrel-amber-dye=0.03,kestrel-rose-dye=0.01
  $ antipode mix dyes.json --amounts kestrel-teal-dye=0.05 --path-length 2 --out teal.csv`,
}

var solveDyesCommand = &command{
	name:  "solve",
	usage: "solve DYES-MODEL.json --target FILE[:NAME] [--illuminant D65] [--observer 1931] [--path-length L] [--tolerance 0.5] [--scale fraction|percent] [--json]",
	about: `Finds dye concentrations whose transmittance matches a target transmittance
spectrum: first a spectral least-squares fit in absorbance (concentrations
≥ 0), then a refinement to the smallest ΔE00 under the illuminant. Recipes
are ranked by ΔE00; "reachable" means ΔE00 ≤ --tolerance (0.5 by default).
A target the dyes cannot make still gives the nearest recipe, marked not
reachable. Concentrations are in the calibration's unit.`,
	example: `  $ antipode fit dyes cmd/antipode/demo/dyes_dilutions.csv --out dyes.json
  $ antipode solve dyes.json --target cmd/antipode/demo/dyes_target.csv
  $ antipode solve dyes.json --target wanted.csv:sunset-wash --illuminant A --json`,
}

// fitDyes runs "antipode fit dyes".
func fitDyes(e *env, args []string) error {
	ff := fitFlags{model: "MODEL.json"}
	var vf viewFlags
	var holdout, limit float64
	var scale string
	fs := flag.NewFlagSet("fit dyes", flag.ContinueOnError)
	ff.define(fs)
	vf.define(fs, "D65", "illuminant for the ΔE00 of the report")
	fs.Float64Var(&holdout, "holdout", 0, "hold out this `FRACTION` (0–1) of the samples for validation, chosen deterministically (never blanks nor a dye's lowest or highest concentration)")
	fs.Float64Var(&limit, "absorbance-limit", mixing.DefaultAbsorbanceLimit, "leave out measured absorbance above `A` (stray light)")
	fs.StringVar(&scale, "scale", "", "scale of the transmittances: `fraction` (0–1) or percent; default: percent when a value exceeds 1.5")
	files, err := ff.parse(fitDyesCommand, fs, e, args, "measurement")
	if err != nil {
		return err
	}
	if holdout < 0 || holdout >= 1 || holdout != holdout {
		return usagef("--holdout %v: want a fraction in [0, 1)", holdout)
	}
	if !(limit > 0) || limit > 1e6 {
		return usagef("--absorbance-limit %v: want a positive absorbance", limit)
	}
	if err := checkScale(scale); err != nil {
		return err
	}
	scorer, err := vf.scorer(e)
	if err != nil {
		return err
	}
	path := files[0]
	recs, err := readCalibration(e, path, "no dye or concentration columns: the dyes calibration needs the rows layout (name, dye, concentration, then wavelengths; see 'antipode fit dyes --help')")
	if err != nil {
		return err
	}
	scale, warns := recordsScale(recs, scale, "transmittance")
	samples, unit, err := mixing.DyeSamples(recs, path)
	if err != nil {
		return err
	}
	if scale == "percent" {
		for i := range samples {
			samples[i].Transmittance = samples[i].Transmittance.Scale(0.01)
		}
	}
	m, err := mixing.FitDyes(samples, mixing.DyeFitSettings{Unit: unit, Scorer: scorer, HoldOut: holdout, AbsorbanceLimit: limit})
	if err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	if err := saveModel(ff.out, m, files); err != nil {
		return err
	}
	// The reading's warnings (percent taken) go before the fit's own, in
	// the report as printed; the model file keeps the fit's.
	r := m.Report()
	r.Warnings = append(warns, r.Warnings...)
	if ff.asJSON {
		return writeJSON(e.stdout, map[string]any{
			"model": ff.out, "kind": m.Kind(), "unit": m.Unit(), "dyes": m.Names(), "fit": r,
			"linearity": dyeNonNil(m.Linearity()), "breakdowns": dyeNonNil(m.Breakdowns()),
		})
	}
	printDyeFit(e.stdout, m, &r, samples, path, ff.out)
	return nil
}

// printDyeFit writes the human-readable fit report r of m.
func printDyeFit(w io.Writer, m *mixing.Dyes, r *mixing.FitReport, samples []mixing.DyeSample, path, out string) {
	g := m.Grid()
	unit := dyeUnit(m.Unit())
	fmt.Fprintf(w, "Dyes model from %s: %d samples, %d dyes, %g–%g nm at %g nm, concentrations in %s\n",
		path, len(samples), len(m.Names()), g.Start, g.End(), g.Step, unit)
	fmt.Fprintf(w, "ΔE00 of transmittance under %s, %s; RMS and max in transmittance (0–1)\n\n", r.Illuminant, r.Observer)
	var t table
	t.left = map[int]bool{1: true, 2: true}
	t.header("sample", "contents", "set", "RMS", "max", "ΔE00")
	for k, s := range r.Samples {
		set := "fit"
		if s.HeldOut {
			set = "held out"
		}
		t.row(s.Name, dyeContents(samples[k]), set, fmt.Sprintf("%.4f", s.RMS), fmt.Sprintf("%.4f", s.MaxAbs), fmt.Sprintf("%.2f", s.DE00))
	}
	t.write(w)
	printFitSummary(w, r, "samples", 4, "mark samples with heldout = 1 or use --holdout")

	fmt.Fprintf(w, "\nBeer–Lambert linearity (R² of absorbance against concentration)\n")
	var lt table
	lt.header("dye", "peak nm", "ε at peak", "R² at peak", "lowest R² in band", "band nm", "levels", "calibrated "+unit)
	dyes := m.Dyes()
	for i, l := range m.Linearity() {
		minR2 := "—"
		if l.R2BandMin != nil {
			minR2 = fmt.Sprintf("%.4f at %g", *l.R2BandMin, *l.R2BandMinNM)
		}
		lt.row(l.Dye, fmt.Sprintf("%g", l.PeakNM), fmt.Sprintf("%.3f", l.PeakAbsorptivity), dyeOptFloat(l.R2Peak, "%.4f"), minR2,
			fmt.Sprintf("%g–%g", l.BandFrom, l.BandTo), strconv.Itoa(l.Levels),
			fmt.Sprintf("%.4g–%.4g", dyes[i].CalibratedMin, dyes[i].CalibratedMax))
	}
	lt.write(w)
	fmt.Fprintf(w, "(ε: absorbance per %s at the calibration's path length)\n", unit)

	if b := m.Breakdowns(); len(b) > 0 {
		fmt.Fprintln(w, "\nFlagged samples")
		var ft table
		ft.left = map[int]bool{1: true, 6: true}
		ft.header("sample", "dye", "concentration", "nm", "measured A", "expected A", "reason")
		for _, x := range b {
			reason := "departs from the line of the lower concentrations by > 3σ"
			if x.Reason == "stray_light" {
				reason = fmt.Sprintf("absorbance above %g left out (stray light)", m.AbsorbanceLimit())
			}
			ft.row(x.Sample, dyeOrDash(x.Dye), fmt.Sprintf("%.4g", x.Concentration), fmt.Sprintf("%g", x.Wavelength),
				fmt.Sprintf("%.3f", x.Absorbance), fmt.Sprintf("%.3f", x.Expected), reason)
		}
		ft.write(w)
	}
	printClosing(w, "\n", r.Warnings, out)
}

// dyeContents describes what a calibration sample holds.
func dyeContents(s mixing.DyeSample) string {
	var parts []string
	for _, a := range s.Amounts {
		if a.Value > 0 {
			parts = append(parts, fmt.Sprintf("%s %.4g", a.Name, a.Value))
		}
	}
	if len(parts) == 0 {
		return "blank"
	}
	return strings.Join(parts, " + ")
}

// mixDyes runs "antipode mix" on a dyes model.
func mixDyes(e *env, mm mixing.Model, args []string) error {
	var amounts, out string
	var ell float64
	var vf viewFlags
	var asJSON bool
	fs := flag.NewFlagSet("mix", flag.ContinueOnError)
	fs.StringVar(&amounts, "amounts", "", "concentrations as `name=value,…` in the calibration's unit")
	fs.Float64Var(&ell, "path-length", 1, "path length or film thickness `L` relative to the calibration's")
	vf.define(fs, "D65", "illuminant for the colour")
	fs.StringVar(&out, "out", "", "write the transmittance spectrum to `FILE.csv`")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of text")
	if err := parseNoArgs(mixDyesCommand, fs, e, args); err != nil {
		return err
	}
	m, err := modelAs[*mixing.Dyes](mm, "dyes")
	if err != nil {
		return err
	}
	if amounts == "" {
		return usagef("--amounts is required (dyes: %s)", strings.Join(m.Names(), ", "))
	}
	am, err := parseAmounts(amounts)
	if err != nil {
		return err
	}
	if !(ell > 0) || ell > 1e12 {
		return usagef("--path-length %v: want a positive number", ell)
	}
	scorer, err := vf.scorer(e)
	if err != nil {
		return err
	}
	s, warns, err := m.Transmittance(am, ell)
	if err != nil {
		if errors.Is(err, mixing.ErrUnknownDye) || strings.Contains(err.Error(), "concentration") {
			return usagef("--amounts: %v", err)
		}
		return err
	}
	xyz, lab, err := objectColour(scorer, s)
	if err != nil {
		return err
	}
	c, _ := m.Concentrations(am)
	if err := e.writeSpectrumOut(out, "transmittance", s); err != nil {
		return err
	}
	if asJSON {
		amj := map[string]float64{}
		for i, n := range m.Names() {
			amj[n] = c[i]
		}
		return writeJSON(e.stdout, map[string]any{
			"amounts": amj, "unit": m.Unit(), "path_length": ell, "illuminant": scorer.Illuminant(), "observer": scorer.Observer(),
			"X": xyz.X, "Y": xyz.Y, "Z": xyz.Z, "L": lab.L, "a": lab.A, "b": lab.B, "transmittance_Y": xyz.Y,
			"out": orNull(out), "warnings": nonNil(warns),
		})
	}
	unit := dyeUnit(m.Unit())
	var parts []string
	for i, n := range m.Names() {
		if c[i] > 0 {
			parts = append(parts, fmt.Sprintf("%s %.4g", n, c[i]))
		}
	}
	if len(parts) == 0 {
		parts = []string{"no dye (base only)"}
	}
	fmt.Fprintf(e.stdout, "mix: %s (%s), path length %g\n", strings.Join(parts, " + "), unit, ell)
	fmt.Fprintf(e.stdout, "under %s, %s:\n", scorer.Illuminant(), scorer.Observer())
	fmt.Fprintf(e.stdout, "  X %.3f  Y %.3f  Z %.3f\n", xyz.X, xyz.Y, xyz.Z)
	fmt.Fprintf(e.stdout, "  L* %.2f  a* %.2f  b* %.2f\n", lab.L, lab.A, lab.B)
	fmt.Fprintf(e.stdout, "  luminous transmittance Y %.2f %%\n", xyz.Y)
	printClosing(e.stdout, "", warns, out)
	return nil
}

// solveDyes runs "antipode solve" on a dyes model.
func solveDyes(e *env, mm mixing.Model, args []string) error {
	var target, scale string
	var vf viewFlags
	var ell, tol float64
	var asJSON bool
	fs := flag.NewFlagSet("solve", flag.ContinueOnError)
	fs.StringVar(&target, "target", "", "target transmittance: a spectral `FILE`, or FILE:NAME for one spectrum of it")
	vf.define(fs, "D65", "illuminant of the colour match")
	fs.Float64Var(&ell, "path-length", 1, "path length or film thickness `L` of the recipe, relative to the calibration's")
	fs.Float64Var(&tol, "tolerance", mixing.DefaultDyeTolerance, "`ΔE00` up to which the target counts as reached")
	fs.StringVar(&scale, "scale", "", "scale of the target's values: `fraction` (0–1) or percent; default: percent when the maximum exceeds 1.5")
	plotPath := plotFlag(fs)
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	if err := parseNoArgs(solveDyesCommand, fs, e, args); err != nil {
		return err
	}
	m, err := modelAs[*mixing.Dyes](mm, "dyes")
	if err != nil {
		return err
	}
	if target == "" {
		return usagef("--target FILE is required")
	}
	if !(ell > 0) || ell > 1e12 {
		return usagef("--path-length %v: want a positive number", ell)
	}
	if !(tol >= 0) || tol > 1e6 {
		return usagef("--tolerance %v: want a non-negative ΔE00", tol)
	}
	if err := checkScale(scale); err != nil {
		return err
	}
	scorer, err := vf.scorer(e)
	if err != nil {
		return err
	}
	list, err := spectrumArg(e, target)
	if err != nil {
		return err
	}
	if len(list) != 1 {
		names := make([]string, len(list))
		for i, s := range list {
			names[i] = s.name
		}
		return usagef("--target %s holds %d spectra (%s); name one as FILE:NAME", target, len(list), strings.Join(names, ", "))
	}
	ts, _, _, twarn, err := asFraction(list[0], scale, "transmittance")
	if err != nil {
		return err
	}
	sol, err := m.Solve(ts, mixing.DyeSolveSettings{Scorer: scorer, PathLength: ell, Tolerance: tol})
	if err != nil {
		var ce *mixing.ConvergenceError
		if errors.As(err, &ce) {
			return fmt.Errorf("%s: %v; best concentrations found: %s", list[0].place(), err, amountList(m.Names(), ce.Best, "%.5g"))
		}
		return fmt.Errorf("%s: %w", list[0].place(), err)
	}
	err = plotObjectSolve(e, *plotPath, "transmittance", vf.illum, vf.obs, &namedSpectrum{name: list[0].name, s: ts}, sol,
		func(a []mixing.Amount) (colorimetry.Spectrum, error) {
			s, _, err := m.Transmittance(a, ell)
			return s, err
		}, fileOf(target))
	if err != nil {
		return err
	}
	prependWarnings(sol, twarn)
	if asJSON {
		return writeSolution(e, sol)
	}
	unit := dyeUnit(m.Unit())
	fmt.Fprintf(e.stdout, "target %s, under %s, %s; path length %g; reachable means ΔE00 ≤ %g\n\n",
		list[0].place(), scorer.Illuminant(), scorer.Observer(), ell, tol)
	var t table
	t.left = map[int]bool{1: true}
	hdr := []string{"rank", "method"}
	for _, n := range m.Names() {
		hdr = append(hdr, n+" ("+unit+")")
	}
	hdr = append(hdr, "ΔE00", "reachable", "Y %", "spectral RMS")
	t.header(hdr...)
	for i, r := range sol.Recipes {
		row := []string{strconv.Itoa(i + 1), fmt.Sprint(r.Extra["method"])}
		for _, a := range r.Amounts {
			row = append(row, fmt.Sprintf("%.5g", a.Value))
		}
		reach := "no"
		if r.Reachable {
			reach = "yes"
		}
		row = append(row, fmt.Sprintf("%.3f", r.DE00), reach, fmt.Sprintf("%.2f", r.Extra["transmittance_Y"]),
			fmt.Sprintf("%.4f", r.Extra["spectral_rms"]))
		t.row(row...)
	}
	t.write(e.stdout)
	printRecipeWarnings(e.stdout, sol)
	return nil
}

// dyeUnit returns the unit or a placeholder word for none.
func dyeUnit(u string) string {
	if u == "" {
		return "calibration units"
	}
	return u
}

func dyeOptFloat(v *float64, format string) string {
	if v == nil {
		return "—"
	}
	return fmt.Sprintf(format, *v)
}

func dyeOrDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}

// dyeNonNil returns s, or an empty slice for nil, so JSON shows [].
func dyeNonNil[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
}
