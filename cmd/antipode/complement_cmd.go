package main

import (
	"bytes"
	"errors"
	"flag"
	"fmt"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
	"github.com/antipode-color/antipode/complement"
)

func init() {
	register(&command{
		name:    "complement",
		summary: "derive the complement of a spectrum and its complementary wavelength",
		usage:   "complement A [--as light|reflectance] [--illuminant NAME|FILE] [--observer 1931|1964] [--scale-white S] [--out FILE] [--json]",
		about: `Derives the additive complement of A and prints its colour and the
complementary wavelength of A.

A light a (--as light, the default): c = s·I − a, the light that added to a
gives s times the white I (--illuminant), with the smallest s that keeps c
non-negative, or s from --scale-white. A reflectance r (--as reflectance):
1 − r, which with r sums to the perfect white (as the reflected and transmitted
parts of a non-absorbing beam splitter do). For a filter's subtractive partner
use 'antipode partner --mode subtractive' instead: stacking T and 1 − T never
gives black.

The complementary wavelength is the wavelength whose light, added to A, can
match the white; "power" is that line's radiant power in A's units (for a
reflectance, per unit of the illuminant), and "power ratio" its share
relative to A's total power. --out writes the complement spectrum as CSV.
A is a file with one spectrum or FILE:NAME; - reads standard input and
-:NAME names one of its spectra.`,
		example: `  $ antipode complement cmd/antipode/demo/lamps.csv:wash-amber --out amber-complement.csv
  $ antipode complement cmd/antipode/demo/paints.csv:ky-ochre --as reflectance --json`,
		run: runComplement,
	})
}

type complementResult struct {
	Name          string   `json:"name"`
	As            string   `json:"as"`
	Illuminant    string   `json:"illuminant"`
	Observer      string   `json:"observer"`
	Scale         *float64 `json:"scale"`
	X             float64  `json:"X"`
	Y             float64  `json:"Y"`
	Z             float64  `json:"Z"`
	SmallX        *float64 `json:"x"`
	SmallY        *float64 `json:"y"`
	UPrime        *float64 `json:"u_prime"`
	VPrime        *float64 `json:"v_prime"`
	L             *float64 `json:"L"`
	A             *float64 `json:"a"`
	B             *float64 `json:"b"`
	CompWave      *float64 `json:"complementary_wavelength_nm"`
	LinePower     *float64 `json:"power"`
	LinePowerRate *float64 `json:"power_ratio"`
	Out           *string  `json:"out"`
	Warnings      []string `json:"warnings"`
}

func runComplement(e *env, args []string) error {
	var as, illum, observer, out, valueScale string
	var scale float64
	var asJSON bool
	fs := flag.NewFlagSet("complement", flag.ContinueOnError)
	fs.StringVar(&as, "as", "light", "what A is: `light` or reflectance")
	fs.StringVar(&illum, "illuminant", "D65", "the white: a CIE `NAME` or a FILE")
	fs.StringVar(&observer, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.Float64Var(&scale, "scale-white", 0, "lights: the scale `S` of the white (0: the smallest that keeps the complement non-negative)")
	fs.StringVar(&valueScale, "scale", "", "reflectance: scale of the values, `fraction` (0–1) or percent (0–100); default: percent when the maximum exceeds 1.5")
	fs.StringVar(&out, "out", "", "write the complement spectrum to `FILE` (CSV, wavelength column)")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a report")
	plotPath := fs.String("plot", "", "also draw A and its complement (spectra and the x, y chromaticity diagram) to `FILE` (.svg or .png)")
	pos, err := parseFlags(commands["complement"], fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return usagef("want one spectrum A (got %s)", plural(len(pos), "argument", "arguments"))
	}
	if err := checkScale(valueScale); err != nil {
		return err
	}
	if valueScale != "" && as != "reflectance" {
		return usagef("--scale applies to --as reflectance")
	}
	var m complement.Mode
	switch as {
	case "light":
		m = complement.Lights
	case "reflectance":
		m = complement.Surfaces
	default:
		return usagef("--as %s: want light or reflectance", as)
	}
	obs, err := observerFlag(observer)
	if err != nil {
		return err
	}
	ill, illName, err := illuminantFlag(e, "--illuminant", illum)
	if err != nil {
		return err
	}
	cond, err := complement.NewConditions(obs, ill)
	if err != nil {
		return fmt.Errorf("--illuminant %s: %v", illum, err)
	}
	list, err := spectrumArg(e, pos[0])
	if err != nil {
		return err
	}
	if len(list) != 1 {
		return usagef("%s holds %s; name one as %s", pos[0], plural(len(list), "spectrum", "spectra"), nameOne(pos[0]))
	}
	in := list[0]
	r := complementResult{Name: in.name, As: as, Illuminant: illName, Observer: obs.Name(), Warnings: []string{}}
	var a colorimetry.Spectrum
	var d complement.Derived
	if m == complement.Lights {
		a = in.s.WithExtrap(colorimetry.ExtrapZero)
		d, err = complement.LightComplement(a, ill, scale)
		r.Scale = ptr(d.Scale)
	} else {
		var warns []string
		a, _, _, warns, err = asFraction(in, valueScale, "reflectance")
		if err != nil {
			return err
		}
		r.Warnings = append(r.Warnings, warns...)
		d, err = complement.ReflectanceComplement(a)
	}
	if err != nil {
		return fmt.Errorf("%s: %v", in.place(), err)
	}
	r.Warnings = append(r.Warnings, d.Warnings...)
	c, err := cond.XYZ(d.Spectrum, m)
	if err != nil {
		return fmt.Errorf("%s: complement: %v", in.place(), err)
	}
	if m == complement.Lights {
		// Relative to the white's luminance at the same scale: Y = 100 for s·I.
		wy := cond.White(m).Y * d.Scale
		if wy > 0 {
			c = c.Scale(100 / wy)
		}
	}
	r.X, r.Y, r.Z = c.X, c.Y, c.Z
	if xy, err := c.XY(); err == nil {
		uv, _ := c.UVPrime()
		r.SmallX, r.SmallY, r.UPrime, r.VPrime = ptr(xy.X), ptr(xy.Y), ptr(uv.U), ptr(uv.V)
	}
	if m == complement.Surfaces {
		if lab, err := c.Lab(cond.White(m)); err == nil {
			r.L, r.A, r.B = ptr(lab.L), ptr(lab.A), ptr(lab.B)
		}
	}
	if cw, err := cond.ComplementaryWavelength(a, m); err == nil {
		r.CompWave, r.LinePower, r.LinePowerRate = ptr(cw.Wavelength), ptr(cw.Power), ptr(cw.PowerRatio)
		r.Warnings = append(r.Warnings, cw.Warnings...)
	} else {
		// The library names its parameter ("s: …"); the user knows A.
		msg := err.Error()
		var ie *complement.InputError
		if errors.As(err, &ie) {
			msg = ie.Err.Error()
		}
		if !errors.Is(err, complement.ErrNoComplementaryWavelength) {
			msg = "no complementary wavelength: " + msg
		}
		r.Warnings = append(r.Warnings, msg)
	}
	if out != "" {
		var b bytes.Buffer
		name := in.name + "-complement"
		if err := specio.WriteColumns(&b, []specio.Named{{Name: name, Spectrum: d.Spectrum}}); err != nil {
			return err
		}
		if err := e.writeOut("--out", out, b.Bytes(), pos[0], illum); err != nil {
			return err
		}
		r.Out = &out
	}
	if err := plotComplement(*plotPath, pos[0], out, cond, m, r, a, d); err != nil {
		return err
	}
	if asJSON {
		return writeJSON(e.stdout, r)
	}
	w := e.stdout
	fmt.Fprintf(w, "complement of %s (%s), white %s, %s observer\n\n", r.Name, r.As, r.Illuminant, r.Observer)
	t := &table{left: map[int]bool{2: true}}
	if r.Scale != nil {
		t.row("scale of the white s", fmt.Sprintf("%.4g", *r.Scale), "c = s·white − A")
	}
	t.row("X, Y, Z", fmt.Sprintf("%.4f, %.4f, %.4f", r.X, r.Y, r.Z), map[bool]string{true: "Y = 100 for s·white", false: "perfect diffuser Y = 100"}[m == complement.Lights])
	t.row("x, y", fmt.Sprintf("%s, %s", f4(r.SmallX), f4(r.SmallY)), "")
	t.row("u′, v′", fmt.Sprintf("%s, %s", f4(r.UPrime), f4(r.VPrime)), "")
	if r.L != nil {
		t.row("L*, a*, b*", fmt.Sprintf("%.2f, %.2f, %.2f", *r.L, *r.A, *r.B), "")
	}
	if r.CompWave != nil {
		t.row("complementary wavelength of A", fmt.Sprintf("%.1f nm", *r.CompWave), "")
		t.row("power of that line", fmt.Sprintf("%.4g", *r.LinePower), fmt.Sprintf("ratio to A's power %.4g", *r.LinePowerRate))
	} else {
		t.row("complementary wavelength of A", "—", "none: A's colour is on the purple side or neutral")
	}
	t.write(w)
	if r.Out != nil {
		fmt.Fprintf(w, "\nwrote %s\n", *r.Out)
	}
	if len(r.Warnings) > 0 {
		fmt.Fprintf(w, "\nwarnings:\n  %s\n", joinLines(r.Warnings))
	}
	return nil
}
