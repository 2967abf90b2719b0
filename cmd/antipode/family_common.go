package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
	"github.com/antipode-color/antipode/mixing"
)

// What the model families' fit, mix and solve commands share
// (family_*.go, and correct and neutralize in pigment_cmds.go).

// fitFlags are the flags of every fit: --out, the model file to write, and
// --json.
type fitFlags struct {
	model  string // what help and messages call the model file: "MODEL.json" …
	out    string
	asJSON bool
}

// define adds --out and --json to fs.
func (f *fitFlags) define(fs *flag.FlagSet) {
	fs.StringVar(&f.out, "out", "", "write the model to `"+f.model+"` (required)")
	fs.BoolVar(&f.asJSON, "json", false, "print the fit report as JSON instead of tables")
}

// parse parses a fit's arguments, which must name one input file (what:
// "measurement", "chart"), and requires --out. It returns the input as a
// one-element list, as saveModel takes it.
func (f *fitFlags) parse(c *command, fs *flag.FlagSet, e *env, args []string, what string) ([]string, error) {
	files, err := parseFlags(c, fs, e, args)
	if err != nil {
		return nil, err
	}
	if len(files) != 1 {
		return nil, usagef("name one %s file: %s", what, c.usage)
	}
	if f.out == "" {
		return nil, usagef("--out %s is required", f.model)
	}
	return files, nil
}

// viewFlags are --illuminant and --observer, under which a model command
// computes object colours.
type viewFlags struct{ illum, obs string }

// define adds the two flags to fs: --illuminant with the default def, its
// help beginning with purpose ("illuminant for the colour" …).
func (v *viewFlags) define(fs *flag.FlagSet, def, purpose string) {
	fs.StringVar(&v.illum, "illuminant", def, purpose+": a CIE `NAME` (see 'antipode illuminants') or a FILE")
	fs.StringVar(&v.obs, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
}

// scorer resolves the flags into a Scorer.
func (v *viewFlags) scorer(e *env) (*mixing.Scorer, error) { return scorerFlags(e, v.illum, v.obs) }

// named resolves the flags into the observer and the named illuminant,
// the observer first (its error wins).
func (v *viewFlags) named(e *env) (*colorimetry.Observer, colorimetry.NamedIlluminant, error) {
	o, err := observerFlag(v.obs)
	if err != nil {
		return nil, colorimetry.NamedIlluminant{}, err
	}
	ill, name, err := illuminantFlag(e, "--illuminant", v.illum)
	if err != nil {
		return nil, colorimetry.NamedIlluminant{}, err
	}
	return o, colorimetry.NamedIlluminant{Name: name, Spectrum: ill}, nil
}

// parseNoArgs parses the flags of a command that takes no positional
// argument (the model file is split off before).
func parseNoArgs(c *command, fs *flag.FlagSet, e *env, args []string) error {
	pos, err := parseFlags(c, fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("unexpected argument %q", pos[0])
	}
	return nil
}

// modelAs asserts that m is the family's model type T (kind names the
// family in the error).
func modelAs[T mixing.Model](m mixing.Model, kind string) (T, error) {
	t, ok := m.(T)
	if !ok {
		return t, fmt.Errorf("not a %s model (kind %q)", kind, m.Kind())
	}
	return t, nil
}

// checkScale checks a --scale value: fraction, percent, or "" (by the
// data).
func checkScale(scale string) error {
	switch scale {
	case "", "fraction", "percent":
		return nil
	}
	return usagef("--scale %s: want fraction or percent", scale)
}

// readCalibration reads a fit's measurement file ("-" is standard input),
// which must be in the rows layout: a file in the columns layout is
// refused with "PATH: " and noRows, which says what is missing.
func readCalibration(e *env, path, noRows string) ([]specio.Named, error) {
	recs, err := readRecords(e, path)
	if err != nil {
		return nil, err
	}
	if len(recs) > 0 && recs[0].Fields == nil {
		return nil, fmt.Errorf("%s: %s", path, noRows)
	}
	return recs, nil
}

// recordsScale returns scale, or for "" the scale of the records' values:
// percent, with a warning about what ("reflectance", "values"), as soon as
// one record reaches above 1.5, else fraction.
func recordsScale(recs []specio.Named, scale, what string) (string, []string) {
	if scale != "" {
		return scale, nil
	}
	for _, r := range recs {
		if v, _ := r.Spectrum.Max(); v > 1.5 {
			return "percent", []string{fmt.Sprintf("%s taken as percent (line %d reaches %.4g > 1.5); say --scale to choose", what, r.Line, v)}
		}
	}
	return "fraction", nil
}

// printFitSummary prints the closing lines of a fit report: the training
// samples (noun: "samples", "films" …) with the RMS spectral residual to
// digits decimals, then the held-out ones, or none and hint on how to hold
// some out.
func printFitSummary(w io.Writer, r *mixing.FitReport, noun string, digits int, hint string) {
	fmt.Fprintf(w, "\nfit:      %d %s, RMS %.*f, ΔE00 mean %.2f, 95th percentile %.2f, max %.2f\n",
		r.Training.N, noun, digits, r.RMS, r.Training.Mean, r.Training.P95, r.Training.Max)
	if r.HeldOut != nil {
		fmt.Fprintf(w, "held out: %d %s, ΔE00 mean %.2f, 95th percentile %.2f, max %.2f\n", r.HeldOut.N, noun, r.HeldOut.Mean, r.HeldOut.P95, r.HeldOut.Max)
	} else {
		fmt.Fprintf(w, "held out: none (%s)\n", hint)
	}
}

// printClosing ends the text of a fit or a mix: the warnings block, then
// the file --out wrote (none when out is empty); sep ("\n" or "") goes
// before each.
func printClosing(w io.Writer, sep string, warns []string, out string) {
	if len(warns) > 0 {
		fmt.Fprintf(w, "%swarnings:\n  %s\n", sep, joinLines(warns))
	}
	if out != "" {
		fmt.Fprintf(w, "%swrote %s\n", sep, out)
	}
}

// objectColour returns the tristimulus values and CIELAB of a reflectance
// or transmittance under the Scorer's illuminant and observer.
func objectColour(sc *mixing.Scorer, s colorimetry.Spectrum) (colorimetry.XYZ, colorimetry.Lab, error) {
	w, err := sc.ObjectWeights(s.Grid())
	if err != nil {
		return colorimetry.XYZ{}, colorimetry.Lab{}, err
	}
	xyz, err := w.XYZ(s)
	if err != nil {
		return colorimetry.XYZ{}, colorimetry.Lab{}, err
	}
	lab, err := xyz.Lab(w.White())
	return xyz, lab, err
}

// writeSpectrumOut writes s to path (--out) as CSV, a wavelength column
// then the spectrum under the heading name; it does nothing when path is
// empty.
func (e *env) writeSpectrumOut(path, name string, s colorimetry.Spectrum) error {
	if path == "" {
		return nil
	}
	var b bytes.Buffer
	if err := specio.WriteColumns(&b, []specio.Named{{Name: name, Spectrum: s}}); err != nil {
		return err
	}
	return e.writeOut("--out", path, b.Bytes())
}

// orNull returns s for JSON, or nil (null) when it is empty.
func orNull(s string) any {
	if s == "" {
		return nil
	}
	return s
}

// fractionSum returns the sum of the mass fractions am and, when it is
// not 1 (within 1e-6), the warning that they are taken as proportions (an
// opaque film's colour depends only on their ratios); mix and correct
// share it.
func fractionSum(am []mixing.Amount) (float64, []string) {
	var sum float64
	for _, a := range am {
		sum += a.Value
	}
	if math.Abs(sum-1) > 1e-6 {
		return sum, []string{fmt.Sprintf("the mass fractions sum to %.6g; taken as proportions", sum)}
	}
	return sum, nil
}

// prependWarnings puts warns (about the target) before each recipe's own.
func prependWarnings(sol mixing.Solution, warns []string) {
	for i := range sol.Recipes {
		sol.Recipes[i].Warnings = append(append([]string(nil), warns...), sol.Recipes[i].Warnings...)
	}
}
