package main

import (
	"flag"
	"fmt"
	"math"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

func init() {
	register(&command{
		name:    "compare",
		summary: "colour differences and metamerism between a standard and samples",
		usage:   "compare STANDARD SAMPLE [--illuminant NAME|FILE] [--observer 1931|1964] [--also A,F11,…] [--as reflectance|transmittance] [--scale fraction|percent] [--uncertainty VALUE] [--json]",
		about: `Compares a standard with one or more samples (reflectance or transmittance):
ΔE*ab (CIE 1976), ΔE94 (graphic-arts constants), ΔE CMC(2:1) and ΔE00
(CIEDE2000), under the illuminant and observer chosen. With --also, the special
metamerism index for a change in illuminant (CIE 015, additive correction in
CIELAB, ΔE00) under each named illuminant, the pair being compared under
--illuminant as reference. Always also a field-size check: ΔE00 with the 1931
2° and the 1964 10° observers under --illuminant (not the CIE observer
metamerism index, which needs the standard deviate observer).

STANDARD is a file with one spectrum, or FILE:NAME for one spectrum of a file.
SAMPLE is a file (every spectrum in it is compared) or FILE:NAME. Either (not
both) may be standard input: - for all of it, -:NAME for one spectrum of it.
Warnings about one spectrum name it ("standard NAME: …", "sample NAME: …").
With --uncertainty VALUE (standard uncertainty of every sample, in the files'
units) u(ΔE00) is propagated (GUM first order, Monte Carlo near zero).`,
		example: `  $ antipode compare cmd/antipode/demo/paints.csv:ky-sage cmd/antipode/demo/paints.csv:ky-teal --also A,F11
  $ antipode compare standard.csv batch-17.csv --observer 1964 --json`,
		run: runCompare,
	})
}

// compareRow is one standard–sample comparison; its JSON keys are a
// contract.
type compareRow struct {
	Standard   string             `json:"standard"`
	Sample     string             `json:"sample"`
	DE76       float64            `json:"dE76"`
	DE94       float64            `json:"dE94"`
	DECMC      float64            `json:"dECMC"`
	DE00       float64            `json:"dE00"`
	UDE00      *float64           `json:"u_dE00"`
	Metamerism map[string]float64 `json:"metamerism"`
	FieldSize  *fieldSize         `json:"field_size"`
	LabStd     [3]float64         `json:"lab_standard"`
	LabSample  [3]float64         `json:"lab_sample"`
	Illuminant string             `json:"illuminant"`
	Observer   string             `json:"observer"`
	Warnings   []string           `json:"warnings"`

	// named is how many of Warnings, at the start, name the spectrum they
	// concern (standard or sample); the rest concern the pair.
	named int
}

type fieldSize struct {
	DE2  float64 `json:"dE00_2deg"`
	DE10 float64 `json:"dE00_10deg"`
}

func runCompare(e *env, args []string) error {
	c := commands["compare"]
	var illum, observer, also, as, scale, unc string
	var asJSON bool
	fs := flag.NewFlagSet("compare", flag.ContinueOnError)
	fs.StringVar(&illum, "illuminant", "D65", "reference illuminant: a CIE `NAME` or a FILE")
	fs.StringVar(&observer, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.StringVar(&also, "also", "", "test illuminants for the metamerism index, comma-separated `NAMES`")
	fs.StringVar(&as, "as", "reflectance", "what the spectra are: `reflectance` or transmittance")
	fs.StringVar(&scale, "scale", "", "`fraction` or percent; default: percent when the maximum exceeds 1.5")
	fs.StringVar(&unc, "uncertainty", "", "standard uncertainty of every sample, a `VALUE` in the files' units")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	pos, err := parseFlags(c, fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) != 2 {
		return usagef("want a STANDARD and a SAMPLE (got %s)", plural(len(pos), "argument", "arguments"))
	}
	if err := oneStdin(pos...); err != nil {
		return err
	}
	if as != "reflectance" && as != "transmittance" {
		return usagef("--as %s: want reflectance or transmittance", as)
	}
	if scale != "" && scale != "fraction" && scale != "percent" {
		return usagef("--scale %s: want fraction or percent", scale)
	}
	var uValue float64
	if unc != "" {
		if _, err := fmt.Sscanf(unc, "%g", &uValue); err != nil || !(uValue >= 0) || math.IsInf(uValue, 0) {
			return usagef("--uncertainty %s: want a non-negative number", unc)
		}
	}
	obs, err := observerFlag(observer)
	if err != nil {
		return err
	}
	ill, illName, err := illuminantFlag(e, "--illuminant", illum)
	if err != nil {
		return err
	}
	var tests []colorimetry.NamedIlluminant
	if also != "" {
		for _, name := range strings.Split(also, ",") {
			name = strings.TrimSpace(name)
			s, n, err := illuminantFlag(e, "--also", name)
			if err != nil {
				return err
			}
			tests = append(tests, colorimetry.NamedIlluminant{Name: n, Spectrum: s})
		}
	}
	stds, err := spectrumArg(e, pos[0])
	if err != nil {
		return err
	}
	if len(stds) != 1 {
		return usagef("STANDARD %s holds %s; name one as %s", pos[0], plural(len(stds), "spectrum", "spectra"), nameOne(pos[0]))
	}
	samples, err := spectrumArg(e, pos[1])
	if err != nil {
		return err
	}
	std, factor, _, stdWarn, err := asFraction(stds[0], scale, as)
	if err != nil {
		return err
	}
	stdWarn = prefixAll(stdWarn, "standard "+stds[0].name+": ")
	g := colorimetry.ComputationGrid(std.Grid())
	w, err := colorimetry.NewObjectWeights(obs, ill, g)
	if err != nil {
		return fmt.Errorf("--illuminant %s: %v", illum, err)
	}
	labStd, err := labOf(w, std, stds[0])
	if err != nil {
		return err
	}
	var rows []compareRow
	for _, in := range samples {
		smp, sf, _, warns, err := asFraction(in, scale, as)
		if err != nil {
			return err
		}
		warns = prefixAll(warns, "sample "+in.name+": ")
		r := compareRow{Standard: stds[0].name, Sample: in.name, Illuminant: illName, Observer: obs.Name(),
			Metamerism: map[string]float64{}, Warnings: append(append([]string{}, stdWarn...), warns...)}
		r.named = len(r.Warnings)
		lab, err := labOf(w, smp, in)
		if err != nil {
			return err
		}
		r.LabStd = [3]float64{labStd.L, labStd.A, labStd.B}
		r.LabSample = [3]float64{lab.L, lab.A, lab.B}
		r.DE76 = colorimetry.DeltaEab(labStd, lab)
		r.DE94 = colorimetry.DeltaE94(labStd, lab, colorimetry.CIE94GraphicArts)
		r.DECMC = colorimetry.DeltaECMC(labStd, lab, 2, 1)
		r.DE00 = colorimetry.DeltaE2000(labStd, lab)
		if len(tests) > 0 {
			res, err := colorimetry.MetamerismIndex(std, smp, obs, ill, tests, g)
			if err != nil {
				return fmt.Errorf("%s: metamerism index: %v", in.place(), err)
			}
			for _, m := range res {
				r.Metamerism[m.Illuminant] = m.Index
			}
			if res[0].Mismatch > 1 {
				r.Warnings = append(r.Warnings, fmt.Sprintf("the pair does not match under %s (ΔE00 %.2f): the metamerism index is corrected additively and means less", illName, res[0].Mismatch))
			}
		}
		if f, err := colorimetry.FieldSizeCheck(std, smp, cie.CIE1931(), cie.CIE1964(), ill, g); err == nil {
			r.FieldSize = &fieldSize{DE2: f.DeltaE2, DE10: f.DeltaE10}
		} else {
			r.Warnings = append(r.Warnings, "field-size check: "+err.Error())
		}
		if unc != "" {
			ua, err := constantUncertainty(std, uValue*factor)
			if err != nil {
				return err
			}
			ub, err := constantUncertainty(smp, uValue*sf)
			if err != nil {
				return err
			}
			u, err := w.DeltaE2000Uncertainty(std, smp, ua, ub, colorimetry.MonteCarlo{})
			if err != nil {
				return fmt.Errorf("%s: uncertainty: %v", in.place(), err)
			}
			r.UDE00 = ptr(u.U)
			if u.Method.Draws > 0 {
				r.Warnings = append(r.Warnings, fmt.Sprintf("u(ΔE00) by %v: ΔE00 is within 3 standard uncertainties of 0; mean %.4f, 95 %% interval [%.4f, %.4f]", u.Method, u.Mean, u.Low, u.High))
			}
		}
		rows = append(rows, r)
	}
	if asJSON {
		return writeJSON(e.stdout, rows)
	}
	printCompare(e, rows, tests)
	return nil
}

func labOf(w *colorimetry.Weights, s colorimetry.Spectrum, in spectrumIn) (colorimetry.Lab, error) {
	c, err := w.XYZ(s)
	if err != nil {
		return colorimetry.Lab{}, fmt.Errorf("%s: %v", in.place(), err)
	}
	lab, err := c.Lab(w.White())
	if err != nil {
		return colorimetry.Lab{}, fmt.Errorf("%s: %v", in.place(), err)
	}
	return lab, nil
}

func constantUncertainty(s colorimetry.Spectrum, u float64) (colorimetry.SpectrumUncertainty, error) {
	v := make([]float64, s.Len())
	for i := range v {
		v[i] = u
	}
	return colorimetry.NewSpectrumUncertainty(s.Grid(), v)
}

func printCompare(e *env, rows []compareRow, tests []colorimetry.NamedIlluminant) {
	w := e.stdout
	if len(rows) == 0 {
		fmt.Fprintln(w, "no samples")
		return
	}
	fmt.Fprintf(w, "standard %s under %s, %s observer\n\n", rows[0].Standard, rows[0].Illuminant, rows[0].Observer)
	t := &table{}
	head := []string{"sample", "ΔE*ab", "ΔE94", "ΔE CMC(2:1)", "ΔE00"}
	if rows[0].UDE00 != nil {
		head = append(head, "u(ΔE00)")
	}
	for _, ti := range tests {
		head = append(head, "MI "+ti.Name)
	}
	head = append(head, "ΔE00 2°→10°")
	t.header(head...)
	for _, r := range rows {
		row := []string{r.Sample, fmt.Sprintf("%.2f", r.DE76), fmt.Sprintf("%.2f", r.DE94), fmt.Sprintf("%.2f", r.DECMC), fmt.Sprintf("%.2f", r.DE00)}
		if r.UDE00 != nil {
			row = append(row, fmt.Sprintf("%.3f", *r.UDE00))
		}
		for _, ti := range tests {
			row = append(row, fmt.Sprintf("%.2f", r.Metamerism[ti.Name]))
		}
		fsz := "—"
		if r.FieldSize != nil {
			fsz = fmt.Sprintf("%.2f→%.2f", r.FieldSize.DE2, r.FieldSize.DE10)
		}
		t.row(append(row, fsz)...)
	}
	t.write(w)
	// Warnings that name their spectrum are printed once (the standard's
	// repeat in every row); those about the pair get the sample's name.
	var notes []string
	seen := map[string]bool{}
	for _, r := range rows {
		for i, wn := range r.Warnings {
			if i >= r.named {
				wn = r.Sample + ": " + wn
			}
			if !seen[wn] {
				seen[wn] = true
				notes = append(notes, wn)
			}
		}
	}
	if len(notes) > 0 {
		fmt.Fprintf(w, "\nwarnings:\n  %s\n", strings.Join(notes, "\n  "))
	}
	if len(tests) > 0 {
		fmt.Fprintf(w, "\nMI: special metamerism index for a change in illuminant (CIE 015), ΔE00 after the additive correction.\n")
	}
}
