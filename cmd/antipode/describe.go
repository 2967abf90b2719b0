package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/lucasb-eyer/go-colorful"
)

func init() {
	register(&command{
		name:    "describe",
		summary: "tristimulus values and chromaticity of every spectrum in a file",
		usage:   "describe FILE… [--column NAME,…] [--as light|reflectance|transmittance] [--illuminant NAME|FILE] [--observer 1931|1964] [--scale fraction|percent] [--absolute] [--json]",
		about: `Reads spectral CSV files (wavelength columns or wavelength rows, told apart by
content; comma, semicolon or tab separated; "-" is standard input) and prints
X, Y, Z, x, y, u′, v′ for each spectrum.

Reflectance and transmittance are weighted by the illuminant so that the
perfect diffuser has Y = 100. Lights are relative (Y = 100 for the light
itself) unless --absolute is given, when a spectral radiance in W·sr⁻¹·m⁻²·nm⁻¹
gives luminance in cd/m² (Km = 683.002 lm/W). Without --scale, reflectance or
transmittance whose maximum exceeds 1.5 is taken as percent, and the output
says so.`,
		example: `  $ antipode describe cmd/antipode/demo/paints.csv --column ky-barn-red,ky-teal
  $ antipode describe cmd/antipode/demo/lamps.csv --as light --json
  $ antipode describe my-gels.csv --as transmittance --illuminant A --observer 1964`,
		run: runDescribe,
	})
}

// describeRow is one spectrum's result; its JSON keys are a contract.
type describeRow struct {
	Name     string   `json:"name"`
	File     string   `json:"file"`
	X        float64  `json:"X"`
	Y        float64  `json:"Y"`
	Z        float64  `json:"Z"`
	SmallX   *float64 `json:"x"`
	SmallY   *float64 `json:"y"`
	UPrime   *float64 `json:"u_prime"`
	VPrime   *float64 `json:"v_prime"`
	As       string   `json:"as"`
	Scale    *string  `json:"scale"`
	Observer string   `json:"observer"`
	Illum    *string  `json:"illuminant"`
	Grid     string   `json:"grid"`
	SRGB     *string  `json:"srgb"`
	Warnings []string `json:"warnings"`
}

type describeOpts struct {
	columns    string
	as         string
	illuminant string
	observer   string
	scale      string
	absolute   bool
	json       bool
}

func runDescribe(e *env, args []string) error {
	c := commands["describe"]
	var o describeOpts
	fs := flag.NewFlagSet("describe", flag.ContinueOnError)
	fs.StringVar(&o.columns, "column", "", "only the spectra with these `NAMES` (comma-separated)")
	fs.StringVar(&o.as, "as", "reflectance", "what the spectra are: `light`, reflectance or transmittance")
	fs.StringVar(&o.illuminant, "illuminant", "D65", "illuminant for reflectance and transmittance: a CIE `NAME` (see 'antipode illuminants') or a FILE")
	fs.StringVar(&o.observer, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.StringVar(&o.scale, "scale", "", "scale of reflectance or transmittance values: `fraction` (0–1) or percent (0–100); default: percent when the maximum exceeds 1.5")
	fs.BoolVar(&o.absolute, "absolute", false, "lights: absolute photometric values (Km = 683.002 lm/W) instead of Y = 100")
	fs.BoolVar(&o.json, "json", false, "print JSON instead of a table")
	files, err := parseFlags(c, fs, e, args)
	if err != nil {
		return err
	}
	if len(files) == 0 {
		return usagef("name at least one spectral file (or - for standard input)")
	}
	switch o.as {
	case "light", "reflectance", "transmittance":
	default:
		return usagef("--as %s: want light, reflectance or transmittance", o.as)
	}
	switch o.scale {
	case "", "fraction", "percent":
	default:
		return usagef("--scale %s: want fraction or percent", o.scale)
	}
	if o.absolute && o.as != "light" {
		return usagef("--absolute applies to --as light only")
	}
	obs, err := observerFlag(o.observer)
	if err != nil {
		return err
	}
	var ill colorimetry.Spectrum
	var illName string
	if o.as != "light" {
		ill, illName, err = illuminantFlag(e, o.illuminant)
		if err != nil {
			return err
		}
	}
	calc := newTristimulus(obs, ill, o.as == "light")
	var rows []describeRow
	for _, f := range files {
		list, err := readSpectra(e, f)
		if err != nil {
			return err
		}
		if list, err = selectColumns(list, o.columns, f); err != nil {
			return err
		}
		for _, in := range list {
			r, err := describeOne(calc, in, o, illName)
			if err != nil {
				return err
			}
			rows = append(rows, r)
		}
	}
	if o.json {
		return writeJSON(e.stdout, rows)
	}
	printDescribe(e.stdout, rows, o)
	return nil
}

// tristimulus computes XYZ with weighting tables cached per grid.
type tristimulus struct {
	obs   *colorimetry.Observer
	ill   colorimetry.Spectrum
	light bool
	cache map[colorimetry.Grid]*colorimetry.Weights
}

func newTristimulus(obs *colorimetry.Observer, ill colorimetry.Spectrum, light bool) *tristimulus {
	return &tristimulus{obs: obs, ill: ill, light: light, cache: map[colorimetry.Grid]*colorimetry.Weights{}}
}

// xyz returns the tristimulus values of s on the computation grid that
// suits its sampling (colorimetry.ComputationGrid).
func (t *tristimulus) xyz(s colorimetry.Spectrum) (colorimetry.XYZ, colorimetry.Grid, error) {
	g := colorimetry.ComputationGrid(s.Grid())
	w, ok := t.cache[g]
	if !ok {
		var err error
		if t.light {
			w, err = colorimetry.NewLightWeights(t.obs, g)
		} else {
			w, err = colorimetry.NewObjectWeights(t.obs, t.ill, g)
		}
		if err != nil {
			return colorimetry.XYZ{}, g, err
		}
		t.cache[g] = w
	}
	c, err := w.XYZ(s)
	return c, g, err
}

func describeOne(calc *tristimulus, in spectrumIn, o describeOpts, illName string) (describeRow, error) {
	r := describeRow{Name: in.name, File: in.file, As: o.as, Observer: calc.obs.Name(), Warnings: []string{}}
	where := fmt.Sprintf("%s: spectrum %q", in.file, in.name)
	if in.line > 0 {
		where = fmt.Sprintf("%s:%d: spectrum %q", in.file, in.line, in.name)
	}
	s := in.s
	if o.as == "light" {
		s = s.WithExtrap(colorimetry.ExtrapZero)
		if v, nm := s.Min(); v < 0 {
			peak, _ := s.Max()
			if v < -0.01*math.Abs(peak) {
				return r, fmt.Errorf("%s: negative spectral power %g at %g nm (more than 1%% of the peak)", where, v, nm)
			}
			r.Warnings = append(r.Warnings, fmt.Sprintf("small negative values (down to %.3g at %g nm) taken as noise", v, nm))
		}
	} else {
		r.Illum = &illName
		scale := o.scale
		peak, _ := s.Max()
		if scale == "" {
			scale = "fraction"
			if peak > 1.5 {
				scale = "percent"
				r.Warnings = append(r.Warnings, fmt.Sprintf("values taken as percent (maximum %.4g > 1.5); say --scale to choose", peak))
			}
		}
		if scale == "percent" {
			s = s.Scale(0.01)
			peak /= 100
		}
		r.Scale = &scale
		// 0.01 below zero is spectrophotometer noise near black: common
		// practice (no source).
		if err := s.CheckFraction(0.01); err != nil {
			return r, fmt.Errorf("%s: %v", where, err)
		}
		if peak > 1.05 && o.as == "transmittance" {
			r.Warnings = append(r.Warnings, fmt.Sprintf("transmittance reaches %.4g, above 1", peak))
		}
	}
	c, g, err := calc.xyz(s)
	if err != nil {
		return r, fmt.Errorf("%s: %v", where, err)
	}
	r.Grid = g.String()
	if o.as == "light" && !o.absolute {
		if c, err = c.ScaleToY(100); err != nil {
			return r, fmt.Errorf("%s: the light has no luminance (Y = 0)", where)
		}
	}
	r.X, r.Y, r.Z = c.X, c.Y, c.Z
	if xy, err := c.XY(); err == nil {
		r.SmallX, r.SmallY = &xy.X, &xy.Y
		uv, _ := c.UVPrime()
		r.UPrime, r.VPrime = &uv.U, &uv.V
	} else {
		r.Warnings = append(r.Warnings, "black (X + Y + Z = 0): chromaticity undefined")
	}
	if o.as != "light" {
		hex, inGamut, err := srgbSwatch(c, calc.white())
		if err == nil {
			r.SRGB = &hex
			if !inGamut {
				r.Warnings = append(r.Warnings, "outside the sRGB gamut: the swatch "+hex+" is clipped")
			}
		}
	}
	return r, nil
}

// white returns the perfect diffuser's XYZ under the object illuminant.
func (t *tristimulus) white() colorimetry.XYZ {
	for _, w := range t.cache {
		return w.White()
	}
	return colorimetry.XYZ{}
}

// d65sRGB is the white of IEC 61966-2-1 (sRGB), x = 0.3127, y = 0.3290,
// at Y = 100.
var d65sRGB = colorimetry.XYZ{X: 100 * 0.3127 / 0.3290, Y: 100, Z: 100 * (1 - 0.3127 - 0.3290) / 0.3290}

// srgbSwatch returns the sRGB hex swatch of an object colour seen under
// white: adapted to the sRGB white by Bradford, then encoded by go-colorful
// (which serves at this boundary: sRGB encoding and hex). It reports
// whether the colour lies inside the sRGB gamut; outside, the hex is
// clipped.
func srgbSwatch(c, white colorimetry.XYZ) (string, bool, error) {
	a, err := colorimetry.Adapt(c, white, d65sRGB, colorimetry.Bradford)
	if err != nil {
		return "", false, err
	}
	col := colorful.Xyz(a.X/100, a.Y/100, a.Z/100)
	// 1/510 is half an 8-bit step: colours within it of the cube are in gamut.
	const eps = 1.0 / 510
	in := col.R >= -eps && col.R <= 1+eps && col.G >= -eps && col.G <= 1+eps && col.B >= -eps && col.B <= 1+eps
	return col.Clamped().Hex(), in, nil
}

func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

func printDescribe(w io.Writer, rows []describeRow, o describeOpts) {
	if len(rows) == 0 {
		fmt.Fprintln(w, "no spectra")
		return
	}
	what := o.as
	switch {
	case o.as == "light" && o.absolute:
		what += ", absolute (Km = 683.002 lm/W)"
	case o.as == "light":
		what += ", relative: Y = 100 for each light"
	default:
		what += fmt.Sprintf(" under %s, perfect diffuser Y = 100", *rows[0].Illum)
	}
	fmt.Fprintf(w, "%s; %s observer\n\n", what, rows[0].Observer)
	nameW := 4
	for _, r := range rows {
		nameW = max(nameW, len([]rune(r.Name)))
	}
	fmt.Fprintf(w, "%-*s  %9s %9s %9s  %7s %7s  %7s %7s  %s\n", nameW, "name", "X", "Y", "Z", "x", "y", "u′", "v′", "sRGB")
	for _, r := range rows {
		sw := "—"
		if r.SRGB != nil {
			sw = *r.SRGB
		}
		fmt.Fprintf(w, "%-*s  %9.4f %9.4f %9.4f  %7s %7s  %7s %7s  %s\n", nameW, r.Name, r.X, r.Y, r.Z,
			f4(r.SmallX), f4(r.SmallY), f4(r.UPrime), f4(r.VPrime), sw)
	}
	var notes []string
	for _, r := range rows {
		for _, wn := range r.Warnings {
			notes = append(notes, fmt.Sprintf("%s: %s", r.Name, wn))
		}
	}
	if len(notes) > 0 {
		fmt.Fprintf(w, "\nwarnings:\n  %s\n", strings.Join(notes, "\n  "))
	}
	fmt.Fprintf(w, "\ngrid: %s\n", gridsUsed(rows))
}

func gridsUsed(rows []describeRow) string {
	seen := map[string]bool{}
	var out []string
	for _, r := range rows {
		if !seen[r.Grid] {
			seen[r.Grid] = true
			out = append(out, r.Grid)
		}
	}
	return strings.Join(out, "; ")
}

// f4 formats an optional number with 4 decimals, "—" when absent.
func f4(v *float64) string {
	if v == nil {
		return "—"
	}
	return fmt.Sprintf("%.4f", *v)
}
