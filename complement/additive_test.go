package complement_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// TestBandComplementsExact checks that rectangular band-pass reflectances
// and their band-stop complements 1 − r are exact spectral complements
// under every illuminant and both observers: r + (1 − r) = 1 exactly, and
// by Grassmann additivity (tristimulus values are linear in the spectrum,
// CIE 015:2018 §7) XYZ(r) + XYZ(1 − r) is the white point. Tolerances:
// 1e-12 relative for the tristimulus sum and for Δu′v′ (round-off of a
// 471-term sum), and 1e-15 for the spectral residual (r + (1 − r) is 1 to
// one ulp).
func TestBandComplementsExact(t *testing.T) {
	t.Parallel()
	ill := []struct {
		name string
		s    colorimetry.Spectrum
	}{
		{"A", cie.A()}, {"D65", cie.D65()}, {"D50", cie.D50()}, {"E", cie.E()},
		{"FL2", fluorescent(t, 2)}, {"FL11", fluorescent(t, 11)},
	}
	led, err := cie.LED("LED-B3")
	if err != nil {
		t.Fatal(err)
	}
	ill = append(ill, struct {
		name string
		s    colorimetry.Spectrum
	}{"LED-B3", led})
	for _, il := range ill {
		for _, obs := range []*colorimetry.Observer{cie.CIE1931(), cie.CIE1964()} {
			c := conditions(t, obs, il.s)
			for _, b := range [][2]float64{{400, 500}, {450, 550}, {500, 600}, {560, 700}, {430, 480}} {
				r := band(t, colorimetry.Grid5nm, b[0], b[1])
				d, err := complement.ReflectanceComplement(r)
				if err != nil {
					t.Fatal(err)
				}
				xr, err := c.XYZ(r, complement.Surfaces)
				if err != nil {
					t.Fatal(err)
				}
				xc, err := c.XYZ(d.Spectrum, complement.Surfaces)
				if err != nil {
					t.Fatal(err)
				}
				sum, white := xr.Add(xc), c.White(complement.Surfaces)
				if !scalar.EqualWithinAbsOrRel(sum.X, white.X, 0, 1e-12) || !scalar.EqualWithinAbsOrRel(sum.Y, white.Y, 0, 1e-12) ||
					!scalar.EqualWithinAbsOrRel(sum.Z, white.Z, 0, 1e-12) {
					t.Errorf("%s, %s, band %v: XYZ(r) + XYZ(1 − r) = %v, white %v", il.name, obs.Name(), b, sum, white)
				}
				res, err := c.CheckAdditive(r, d.Spectrum, complement.Surfaces, complement.Options{})
				if err != nil {
					t.Fatal(err)
				}
				if res.Verdict != complement.Spectral || res.DeltaUVPrime > 1e-12 || res.SpectralRMS > 1e-15 ||
					res.SpectralMax > 1e-15 || !scalar.EqualWithinAbsOrRel(res.Scale, 1, 0, 1e-15) || res.DeltaE00 > 1e-9 {
					t.Errorf("%s, %s, band %v: %+v, want an exact spectral complement", il.name, obs.Name(), b, res)
				}
				if res.DeltaDuv == nil || math.Abs(*res.DeltaDuv) > 1e-12 {
					t.Errorf("%s, %s, band %v: ΔDuv %v, want 0", il.name, obs.Name(), b, res.DeltaDuv)
				}
			}
		}
	}
}

// TestCheckAdditiveVerdicts checks the three verdicts on pairs built for
// them, in both modes.
func TestCheckAdditiveVerdicts(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	for _, m := range []complement.Mode{complement.Lights, complement.Surfaces} {
		// Metameric: the sum has exactly the white's chromaticity (by
		// construction, solving the 3×3 system of Grassmann's laws;
		// tol 1e-12 round-off) but not its spectrum.
		a, b := metamericPair(t, c, m, 1)
		r, err := c.CheckAdditive(a, b, m, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		if r.Verdict != complement.Metameric || r.DeltaUVPrime > 1e-12 || r.SpectralRMS < 0.1 || r.DeltaE00 > 1e-9 {
			t.Errorf("%v metameric pair: %+v", m, r)
		}
		// With a loose enough spectral tolerance the same pair passes as
		// spectral: the tolerance is honoured.
		r, err = c.CheckAdditive(a, b, m, complement.Options{SpectralRMS: 5})
		if err != nil || r.Verdict != complement.Spectral {
			t.Errorf("%v metameric pair, SpectralRMS 5: %+v, %v", m, r, err)
		}
		// None: two greens.
		green := gaussians(t, g, []float64{520}, []float64{20}, []float64{0.8})
		yellowGreen := gaussians(t, g, []float64{550}, []float64{25}, []float64{0.7})
		r, err = c.CheckAdditive(green, yellowGreen, m, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		if r.Verdict != complement.None || r.DeltaUVPrime < 0.05 {
			t.Errorf("%v two greens: %+v", m, r)
		}
		// A green sum lies far above the Planckian locus (|Duv| > 0.05,
		// where CCT is not defined, CIE 015:2018): ΔDuv is null with a
		// warning.
		if r.DeltaDuv != nil || !hasWarning(r.Warnings, "ΔDuv") {
			t.Errorf("%v two greens: ΔDuv %v, warnings %q; want null and a warning", m, r.DeltaDuv, r.Warnings)
		}
	}
}

// TestCheckAdditiveSpectralButOff checks the case the verdict rule singles
// out: a spectral residual within tolerance that still moves the colour
// beyond its tolerance (a narrow spike near 555 nm, where ȳ peaks, CIE
// 015:2018) gives None and a warning, not Spectral.
func TestCheckAdditiveSpectralButOff(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	a := gaussians(t, g, []float64{600}, []float64{20}, []float64{1})
	d, err := complement.LightComplement(a, cie.D65(), 0)
	if err != nil {
		t.Fatal(err)
	}
	spike := gaussians(t, g, []float64{555}, []float64{2}, []float64{0.1 * d.Scale * 100})
	b, err := colorimetry.Add(d.Spectrum, spike)
	if err != nil {
		t.Fatal(err)
	}
	opt := complement.Options{SpectralRMS: 0.05, DeltaUVPrime: 1e-4}
	r, err := c.CheckAdditive(a, b, complement.Lights, opt)
	if err != nil {
		t.Fatal(err)
	}
	if r.SpectralRMS > opt.SpectralRMS || r.DeltaUVPrime <= opt.DeltaUVPrime {
		t.Fatalf("fixture does not split the tolerances: %+v", r)
	}
	if r.Verdict != complement.None || !hasWarning(r.Warnings, "within tolerance") {
		t.Errorf("got %+v, want none with a warning", r)
	}
}

func hasWarning(w []string, word string) bool {
	for _, s := range w {
		if strings.Contains(s, word) {
			return true
		}
	}
	return false
}

// TestCheckAdditiveOffWhite checks ΔDuv and ΔE00 for a sum of known
// chromaticity: two halves of a Planckian radiator at 3000 K add up to a
// point on the Planckian locus (Duv = 0 by definition), so against a D65
// white ΔDuv = −Duv(D65) = −0.0032 (Duv of D65 for the CIE 1931 observer,
// from memory; tol 1e-4, the precision of that memory). The sum's
// chromaticity is that of 3000 K, x, y = (0.4369, 0.4041) (CIE 1931, from
// memory; tol 2e-4), and Δu′v′ follows from it by definition (tol 1e-12).
func TestCheckAdditiveOffWhite(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	bb, err := cie.Planckian(3000)
	if err != nil {
		t.Fatal(err)
	}
	half := bb.Scale(0.5)
	r, err := c.CheckAdditive(half, half, complement.Lights, complement.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if r.DeltaDuv == nil || !scalar.EqualWithinAbsOrRel(*r.DeltaDuv, -0.0032, 1e-4, 0) {
		t.Errorf("ΔDuv = %v, want about −0.0032", r.DeltaDuv)
	}
	x, err := c.XYZ(bb, complement.Lights)
	if err != nil {
		t.Fatal(err)
	}
	xy, err := x.XY()
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbsOrRel(xy.X, 0.4369, 2e-4, 0) || !scalar.EqualWithinAbsOrRel(xy.Y, 0.4041, 2e-4, 0) {
		t.Errorf("x, y of 3000 K = %+v, want about (0.4369, 0.4041)", xy)
	}
	p := uvPrime(t, x)
	want := colorimetry.DeltaUVPrime(p, uvPrime(t, c.White(complement.Lights)))
	if !scalar.EqualWithinAbsOrRel(r.DeltaUVPrime, want, 1e-15, 1e-12) || r.Verdict != complement.None || r.DeltaE00 < 10 {
		t.Errorf("got %+v, want Δu′v′ %g, verdict none", r, want)
	}
}

// TestCheckAdditiveErrors checks that bad input is an error naming the
// input.
func TestCheckAdditiveErrors(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	good := gaussians(t, g, []float64{600}, []float64{20}, []float64{0.8})
	zero := onGrid(t, g, func(float64) float64 { return 0 })
	negLight := gaussians(t, g, []float64{600, 450}, []float64{20, 10}, []float64{1, -0.02}) // −2 % of peak
	noiseLight := gaussians(t, g, []float64{600, 450}, []float64{20, 10}, []float64{1, -0.005})
	ir := onGrid(t, colorimetry.Grid{Start: 900, Step: 5, N: 40}, func(float64) float64 { return 1 })
	short := onGrid(t, colorimetry.Grid{Start: 380, Step: 5, N: 10}, func(float64) float64 { return 0.5 })
	long := onGrid(t, colorimetry.Grid{Start: 700, Step: 5, N: 10}, func(float64) float64 { return 0.5 })
	for _, tc := range []struct {
		name  string
		a, b  colorimetry.Spectrum
		m     complement.Mode
		opt   complement.Options
		want  error
		input string
	}{
		{"empty a", colorimetry.Spectrum{}, good, complement.Lights, complement.Options{}, colorimetry.ErrTooFew, "a"},
		{"all-zero b", good, zero, complement.Lights, complement.Options{}, complement.ErrBlack, "b"},
		{"all-zero a, surfaces", zero, good, complement.Surfaces, complement.Options{}, complement.ErrBlack, "a"},
		{"light 2 % of peak below zero", good, negLight, complement.Lights, complement.Options{}, colorimetry.ErrNegative, "b"},
		{"reflectance below −0.01", good, negLight.Scale(1), complement.Surfaces, complement.Options{}, colorimetry.ErrNegative, "b"},
		{"outside the computation grid", ir, good, complement.Lights, complement.Options{}, colorimetry.ErrNoOverlap, "a"},
		{"grids that do not overlap", short, long, complement.Surfaces, complement.Options{}, colorimetry.ErrNoOverlap, ""},
		{"filters are stacked", good, good, complement.Filters, complement.Options{}, complement.ErrMode, ""},
		{"negative tolerance", good, good, complement.Lights, complement.Options{DeltaUVPrime: -1}, complement.ErrOptions, ""},
		{"NaN tolerance", good, good, complement.Lights, complement.Options{SpectralRMS: math.NaN()}, complement.ErrOptions, ""},
	} {
		_, err := c.CheckAdditive(tc.a, tc.b, tc.m, tc.opt)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: got %v, want %v", tc.name, err, tc.want)
			continue
		}
		var ie *complement.InputError
		if tc.input != "" && (!errors.As(err, &ie) || ie.Input != tc.input) {
			t.Errorf("%s: error %q does not name %q", tc.name, err, tc.input)
		}
	}
	// Negative within noise (0.5 % of the peak) is accepted.
	if _, err := c.CheckAdditive(good, noiseLight, complement.Lights, complement.Options{}); err != nil {
		t.Errorf("light 0.5 %% of peak below zero: %v", err)
	}
}

// TestNewConditionsErrors checks that a white without luminance and other
// bad illuminants are errors naming the illuminant.
func TestNewConditionsErrors(t *testing.T) {
	t.Parallel()
	uv := onGrid(t, colorimetry.Grid{Start: 300, Step: 1, N: 531}, func(nm float64) float64 {
		if nm < 355 {
			return 100
		}
		return 0
	})
	for _, tc := range []struct {
		name string
		ill  colorimetry.Spectrum
		want error
	}{
		{"white with no luminance", uv, colorimetry.ErrZeroLuminance},
		{"empty", colorimetry.Spectrum{}, colorimetry.ErrTooFew},
		{"all zero", onGrid(t, colorimetry.Grid5nm, func(float64) float64 { return 0 }), complement.ErrBlack},
	} {
		_, err := complement.NewConditions(cie.CIE1931(), tc.ill)
		var ie *complement.InputError
		if !errors.Is(err, tc.want) || !errors.As(err, &ie) || ie.Input != "illuminant" {
			t.Errorf("%s: got %v, want %v naming the illuminant", tc.name, err, tc.want)
		}
	}
	if _, err := complement.NewConditions(nil, cie.D65()); err == nil {
		t.Error("nil observer: no error")
	}
}
