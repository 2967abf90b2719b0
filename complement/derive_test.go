package complement_test

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// TestLightComplement checks the derived complement c = s·I − a of a light:
// a + c = s·I at every sample (the definition, an algebraic identity; tol
// 1e-13 of the peak of s·I: a few ulps of the subtraction), c ≥ 0, and s is
// the smallest such scale (CIE-independent invariant: some sample of c is
// exactly 0, and 1e-9 less of s leaves a sample negative). The pair is
// then a spectral complement by CheckAdditive with that scale.
func TestLightComplement(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid1nm
	for _, tc := range []struct {
		name  string
		a     colorimetry.Spectrum
		ill   colorimetry.Spectrum
		scale float64 // 0: the smallest
	}{
		{"amber LED under D65", gaussians(t, g, []float64{590}, []float64{8}, []float64{1}), cie.D65(), 0},
		{"two-channel light under A", gaussians(t, g, []float64{460, 620}, []float64{10, 15}, []float64{0.4, 1}), cie.A(), 0},
		{"blue light under FL11", gaussians(t, colorimetry.Grid5nm, []float64{450}, []float64{12}, []float64{2}), fluorescent(t, 11), 0},
		{"amber LED under D65, twice the smallest s", gaussians(t, g, []float64{590}, []float64{8}, []float64{1}), cie.D65(), -2},
	} {
		scale := tc.scale
		if scale < 0 {
			d, err := complement.LightComplement(tc.a, tc.ill, 0)
			if err != nil {
				t.Fatal(err)
			}
			scale = -scale * d.Scale
		}
		d, err := complement.LightComplement(tc.a, tc.ill, scale)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if scale > 0 && d.Scale != scale {
			t.Errorf("%s: scale %g, want the given %g", tc.name, d.Scale, scale)
		}
		ra, ri, err := colorimetry.Align(tc.a, tc.ill)
		if err != nil {
			t.Fatal(err)
		}
		if !ra.Grid().Equal(d.Spectrum.Grid()) {
			t.Fatalf("%s: complement on %v, common grid %v", tc.name, d.Spectrum.Grid(), ra.Grid())
		}
		peak, _ := ri.Max()
		peak *= d.Scale
		minC, zeroAt := math.Inf(1), -1
		for i := range ra.Len() {
			cv := d.Spectrum.Value(i)
			if got, want := ra.Value(i)+cv, d.Scale*ri.Value(i); math.Abs(got-want) > 1e-13*peak {
				t.Errorf("%s: a + c = %g at %g nm, want s·I = %g", tc.name, got, ri.Grid().Wavelength(i), want)
			}
			if cv < minC {
				minC, zeroAt = cv, i
			}
		}
		if minC < 0 {
			t.Errorf("%s: complement negative (%g)", tc.name, minC)
		}
		if scale == 0 {
			if minC != 0 {
				t.Errorf("%s: smallest sample of c is %g, want 0", tc.name, minC)
			}
			lower := d.Scale * (1 - 1e-9)
			if ra.Value(zeroAt) <= lower*ri.Value(zeroAt) {
				t.Errorf("%s: s = %g is not the smallest: at %g nm a = %g ≤ (1−1e-9)·s·I", tc.name, d.Scale, ra.Grid().Wavelength(zeroAt), ra.Value(zeroAt))
			}
			if _, err := complement.LightComplement(tc.a, tc.ill, lower); !errors.Is(err, complement.ErrScale) {
				t.Errorf("%s: scale below the smallest: got %v, want ErrScale", tc.name, err)
			}
		}
		// Spectral complement by the additive check, with the same scale
		// (least squares recovers s exactly: a + c − s·I is zero).
		c := conditions(t, cie.CIE1931(), tc.ill)
		r, err := c.CheckAdditive(tc.a, d.Spectrum, complement.Lights, complement.Options{})
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if r.Verdict != complement.Spectral || r.SpectralRMS > 1e-13 || !scalar.EqualWithinAbsOrRel(r.Scale, d.Scale, 0, 1e-12) {
			t.Errorf("%s: check gave %+v, want spectral with scale %g", tc.name, r, d.Scale)
		}
	}
}

// TestLightComplementErrors checks the errors of LightComplement.
func TestLightComplementErrors(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid1nm
	a := gaussians(t, g, []float64{590}, []float64{8}, []float64{1})
	uvOnly := onGrid(t, g, func(nm float64) float64 { // no power above 400 nm
		if nm < 400 {
			return 1
		}
		return 0
	})
	far, err := colorimetry.NewSpectrumOnGrid(colorimetry.Grid{Start: 900, Step: 5, N: 20}, make([]float64, 20), colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name   string
		a, ill colorimetry.Spectrum
		scale  float64
		want   error
		input  string
	}{
		{"negative scale", a, cie.D65(), -1, complement.ErrScale, ""},
		{"NaN scale", a, cie.D65(), math.NaN(), complement.ErrScale, ""},
		{"illuminant dark where a shines", a, uvOnly, 0, complement.ErrScale, "illuminant"},
		{"empty a", colorimetry.Spectrum{}, cie.D65(), 0, colorimetry.ErrTooFew, "a"},
		{"all-zero a", onGrid(t, g, func(float64) float64 { return 0 }), cie.D65(), 0, complement.ErrBlack, "a"},
		{"all-zero illuminant", a, far, 0, complement.ErrBlack, "illuminant"},
	} {
		_, err := complement.LightComplement(tc.a, tc.ill, tc.scale)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: got %v, want %v", tc.name, err, tc.want)
			continue
		}
		var ie *complement.InputError
		if tc.input != "" && (!errors.As(err, &ie) || ie.Input != tc.input) {
			t.Errorf("%s: error %q does not name %q", tc.name, err, tc.input)
		}
	}
}

// TestReflectanceComplement checks that r + (1 − r) = 1 at every sample
// (the definition; tol 2e-16, one ulp of 1) and the handling of values
// outside 0–1.
func TestReflectanceComplement(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid5nm
	r := logistic(t, g, 580, 20, 0.05, 0.9)
	d, err := complement.ReflectanceComplement(r)
	if err != nil {
		t.Fatal(err)
	}
	if d.Scale != 1 || len(d.Warnings) != 0 || !d.Spectrum.Grid().Equal(g) {
		t.Errorf("got scale %g, warnings %q, grid %v", d.Scale, d.Warnings, d.Spectrum.Grid())
	}
	for i := range g.N {
		if s := r.Value(i) + d.Spectrum.Value(i); math.Abs(s-1) > 2.3e-16 {
			t.Errorf("r + (1 − r) = %.17g at %g nm", s, g.Wavelength(i))
		}
	}

	// Within noise (0.01, common practice (no source)) above 1: kept, with
	// a warning.
	d, err = complement.ReflectanceComplement(logistic(t, g, 580, 20, 0, 1.005))
	if err != nil || len(d.Warnings) != 1 {
		t.Errorf("r up to 1.005: got %v, warnings %q", err, d.Warnings)
	}
	// Beyond noise: an error naming r.
	for _, tc := range []struct {
		name string
		r    colorimetry.Spectrum
		want error
	}{
		{"in percent", logistic(t, g, 580, 20, 5, 90), complement.ErrAboveOne},
		{"negative", logistic(t, g, 580, 20, -0.05, 0.9), colorimetry.ErrNegative},
		{"black", onGrid(t, g, func(float64) float64 { return 0 }), complement.ErrBlack},
	} {
		_, err := complement.ReflectanceComplement(tc.r)
		var ie *complement.InputError
		if !errors.Is(err, tc.want) || !errors.As(err, &ie) || ie.Input != "r" {
			t.Errorf("%s: got %v, want %v naming r", tc.name, err, tc.want)
		}
	}
}
