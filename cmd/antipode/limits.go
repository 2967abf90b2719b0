package main

import (
	"bytes"
	"flag"
	"fmt"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

func init() {
	register(&command{
		name:    "limits",
		summary: "the optimal-colour boundary (MacAdam limits) at a lightness",
		usage:   "limits [--illuminant D65] [--observer 1931|1964] [--lightness 50] [--hues 36] [--check FILE [--scale fraction|percent]] [--json]",
		about: `Prints the boundary of the object-colour solid at lightness L*: for each hue
angle, the largest chroma C*ab any reflectance can reach under the illuminant,
with the optimal reflectance that reaches it (reflectance 1 between the edge
wavelengths and 0 elsewhere — a band-pass — or the reverse, a band-stop;
each band-pass has its band-stop as exact complement). For orange-reds the
limit may take two to four bands instead: from about 550 nm on, the
tabulated spectrum locus is nearly straight and not quite convex, so a
line can cross it more than twice. With --check FILE,
says for each reflectance in FILE whether it is realisable and how its chroma
compares with the largest possible at its lightness and hue.`,
		example: `  $ antipode limits --illuminant D65 --lightness 50 --hues 12
  $ antipode limits --check cmd/antipode/demo/paints.csv --illuminant A`,
		run: runLimits,
	})
	register(&command{
		name:    "wavelengths",
		summary: "the complementary-wavelength table for a white, as CSV",
		usage:   "wavelengths [--illuminant D65] [--observer 1931|1964] [--from 380] [--to 700] [--step 5] [--out FILE] [--json]",
		about: `Tabulates, for each wavelength, its complementary wavelength relative to the
white of the illuminant — the wavelength whose light, added in the right amount,
matches the white — and the power and luminance ratios of that mixture
(complement : wavelength). Greens have no complementary wavelength: the line
through the white meets the purple line instead; their rows say "purple line".
CSV on standard output (or --out FILE); --json for an array.`,
		example: `  $ antipode wavelengths --illuminant D65 --step 10
  $ antipode wavelengths --illuminant A --observer 1964 --out pairs-A.csv`,
		run: runWavelengths,
	})
}

func runLimits(e *env, args []string) error {
	var illum, observer, check, scale string
	var light float64
	var hues int
	var asJSON bool
	fs := flag.NewFlagSet("limits", flag.ContinueOnError)
	fs.StringVar(&illum, "illuminant", "D65", "illuminant: a CIE `NAME` or a FILE")
	fs.StringVar(&observer, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.Float64Var(&light, "lightness", 50, "CIELAB lightness `L*` of the slice (0–100)")
	fs.IntVar(&hues, "hues", 36, "number of equally spaced hue angles")
	fs.StringVar(&check, "check", "", "check the reflectances in `FILE` against the solid instead")
	fs.StringVar(&scale, "scale", "", "with --check: scale of the reflectances, `fraction` (0–1) or percent (0–100); default: percent when the maximum exceeds 1.5")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	pos, err := parseFlags(commands["limits"], fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("limits takes no arguments (did you mean --check %s?)", pos[0])
	}
	if err := checkScale(scale); err != nil {
		return err
	}
	if scale != "" && check == "" {
		return usagef("--scale applies to --check")
	}
	if !(light > 0 && light < 100) {
		return usagef("--lightness %g: want a value between 0 and 100 (exclusive)", light)
	}
	if hues < 1 || hues > 3600 {
		return usagef("--hues %d: want 1 to 3600", hues)
	}
	obs, err := observerFlag(observer)
	if err != nil {
		return err
	}
	ill, illName, err := illuminantFlag(e, "--illuminant", illum)
	if err != nil {
		return err
	}
	solid, err := complement.NewObjectSolid(obs, ill, colorimetry.Grid1nm)
	if err != nil {
		return fmt.Errorf("--illuminant %s: %v", illum, err)
	}
	if check != "" {
		return limitsCheck(e, solid, obs, ill, check, scale, illName, asJSON)
	}
	pts, err := solid.Boundary(light, hues)
	if err != nil {
		return err
	}
	type point struct {
		L        float64   `json:"L"`
		C        float64   `json:"C"`
		H        float64   `json:"h"`
		A        float64   `json:"a"`
		B        float64   `json:"b"`
		X        float64   `json:"x"`
		Y        float64   `json:"y"`
		Edges    []float64 `json:"edges_nm"`
		BandStop bool      `json:"band_stop"`
	}
	out := make([]point, len(pts))
	for i, p := range pts {
		lch := p.Lab.LCh()
		out[i] = point{L: p.Lab.L, C: lch.C, H: lch.H, A: p.Lab.A, B: p.Lab.B, X: p.Chromaticity.X, Y: p.Chromaticity.Y, Edges: p.Edges, BandStop: p.BandStop}
	}
	if asJSON {
		return writeJSON(e.stdout, map[string]any{"illuminant": illName, "observer": obs.Name(), "lightness": light, "boundary": out})
	}
	fmt.Fprintf(e.stdout, "optimal colours at L* = %g under %s, %s observer (1 nm grid)\n\n", light, illName, obs.Name())
	t := &table{left: map[int]bool{6: true}}
	t.header("hab", "C*ab max", "a*", "b*", "x", "y", "optimal reflectance")
	for _, p := range out {
		t.row(fmt.Sprintf("%.1f", p.H), fmt.Sprintf("%.2f", p.C), fmt.Sprintf("%.2f", p.A), fmt.Sprintf("%.2f", p.B), fmt.Sprintf("%.4f", p.X), fmt.Sprintf("%.4f", p.Y), describeEdges(p.Edges, p.BandStop))
	}
	t.write(e.stdout)
	return nil
}

// describeEdges says where an optimal reflectance is 1.
func describeEdges(edges []float64, bandStop bool) string {
	var b strings.Builder
	if bandStop {
		b.WriteString("stop ")
	} else {
		b.WriteString("pass ")
	}
	first := true
	for i := 0; i+1 < len(edges); i += 2 {
		if edges[i+1]-edges[i] < 0.05 {
			continue // a band narrower than the printed digit: numerical dust
		}
		if !first {
			b.WriteString(", ")
		}
		first = false
		fmt.Fprintf(&b, "%.1f–%.1f nm", edges[i], edges[i+1])
	}
	if len(edges)%2 == 1 {
		fmt.Fprintf(&b, " edge %.1f nm", edges[len(edges)-1])
	}
	return b.String()
}

func limitsCheck(e *env, solid *complement.ObjectSolid, obs *colorimetry.Observer, ill colorimetry.Spectrum, file, scale, illName string, asJSON bool) error {
	list, err := spectrumArg(e, file)
	if err != nil {
		return err
	}
	type row struct {
		Name       string   `json:"name"`
		Realisable bool     `json:"realisable"`
		L          float64  `json:"L"`
		C          float64  `json:"C"`
		H          float64  `json:"h"`
		MaxC       *float64 `json:"max_chroma"`
		Warnings   []string `json:"warnings"`
	}
	var rows []row
	// The same grid as the solid, so a colour on its boundary stays on it.
	w, err := colorimetry.NewObjectWeights(obs, ill, solid.Grid())
	if err != nil {
		return err
	}
	for _, in := range list {
		s, _, _, warns, err := asFraction(in, scale, "reflectance")
		if err != nil {
			return err
		}
		c, err := w.XYZ(s)
		if err != nil {
			return fmt.Errorf("%s: %v", in.place(), err)
		}
		r := row{Name: in.name, Warnings: nonNil(warns)}
		if r.Realisable, err = solid.Realisable(c); err != nil {
			return fmt.Errorf("%s: %v", in.place(), err)
		}
		lab, err := c.Lab(solid.White())
		if err != nil {
			return fmt.Errorf("%s: %v", in.place(), err)
		}
		lch := lab.LCh()
		r.L, r.C, r.H = lch.L, lch.C, lch.H
		if mc, err := solid.MaxChroma(lch.L, lch.H); err == nil {
			r.MaxC = &mc
		} else {
			r.Warnings = append(r.Warnings, err.Error())
		}
		rows = append(rows, r)
	}
	if asJSON {
		return writeJSON(e.stdout, rows)
	}
	fmt.Fprintf(e.stdout, "%s against the object-colour solid under %s, %s observer (%v)\n\n", file, illName, obs.Name(), solid.Grid())
	t := &table{left: map[int]bool{5: true}}
	t.header("name", "L*", "C*ab", "hab", "C*ab max", "realisable")
	var warns []string
	for _, r := range rows {
		t.row(r.Name, fmt.Sprintf("%.2f", r.L), fmt.Sprintf("%.2f", r.C), fmt.Sprintf("%.1f", r.H), fmtOpt(r.MaxC, "%.2f"), map[bool]string{true: "yes", false: "NO"}[r.Realisable])
		for _, w := range r.Warnings {
			warns = append(warns, r.Name+": "+w)
		}
	}
	t.write(e.stdout)
	if len(warns) > 0 {
		fmt.Fprintf(e.stdout, "\nwarnings:\n  %s\n", joinLines(warns))
	}
	fmt.Fprintln(e.stdout, "\nL*, C*ab and hab are computed on the solid's grid, so they may differ from describe's (5 nm for 5 nm data) in the second decimal.")
	return nil
}

func runWavelengths(e *env, args []string) error {
	var illum, observer, out string
	var from, to, step float64
	var asJSON bool
	fs := flag.NewFlagSet("wavelengths", flag.ContinueOnError)
	fs.StringVar(&illum, "illuminant", "D65", "the white: a CIE `NAME` or a FILE")
	fs.StringVar(&observer, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.Float64Var(&from, "from", 380, "first wavelength, `nm`")
	fs.Float64Var(&to, "to", 700, "last wavelength, `nm`")
	fs.Float64Var(&step, "step", 5, "step, `nm`")
	fs.StringVar(&out, "out", "", "write the CSV to `FILE` instead of standard output")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of CSV")
	pos, err := parseFlags(commands["wavelengths"], fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("wavelengths takes no arguments")
	}
	g, err := colorimetry.NewGrid(from, to, step)
	if err != nil {
		return usagef("--from %g --to %g --step %g: %v", from, to, step, err)
	}
	obs, err := observerFlag(observer)
	if err != nil {
		return err
	}
	ill, _, err := illuminantFlag(e, "--illuminant", illum)
	if err != nil {
		return err
	}
	lw, err := colorimetry.NewLightWeights(obs, colorimetry.ComputationGrid(ill.Grid()))
	if err != nil {
		return err
	}
	wc, err := lw.XYZ(ill.WithExtrap(colorimetry.ExtrapZero))
	if err != nil {
		return fmt.Errorf("--illuminant %s: %v", illum, err)
	}
	white, err := wc.XY()
	if err != nil {
		return fmt.Errorf("--illuminant %s: %v", illum, err)
	}
	pairs, err := complement.ComplementaryWavelengths(obs, white, g)
	if err != nil {
		return err
	}
	if asJSON {
		return writeJSON(e.stdout, pairs)
	}
	var b bytes.Buffer
	fmt.Fprintf(&b, "# complementary wavelengths for the white of %s (x %.5f, y %.5f), %s observer\n", illum, white.X, white.Y, obs.Name())
	b.WriteString("wavelength_nm,complementary_nm,power_ratio,luminance_ratio\n")
	for _, p := range pairs {
		if !p.HasComplement {
			fmt.Fprintf(&b, "%g,purple line,,\n", p.Nm)
			continue
		}
		fmt.Fprintf(&b, "%g,%.2f,%.6g,%.6g\n", p.Nm, p.ComplementNm, p.PowerRatio, p.LuminanceRatio)
	}
	if out != "" {
		return e.writeOut("--out", out, b.Bytes(), illum)
	}
	_, err = e.stdout.Write(b.Bytes())
	return err
}
