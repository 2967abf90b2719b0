package complement_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"pgregory.net/rapid"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// drawTransmittance draws a filter's transmittance on g: a smooth curve
// between 0.001 and 1 (a logistic edge at 400–700 nm, either way up).
func drawTransmittance(t *rapid.T, g colorimetry.Grid, label string) colorimetry.Spectrum {
	edge := rapid.Float64Range(400, 700).Draw(t, label+" edge")
	width := rapid.Float64Range(5, 60).Draw(t, label+" width")
	up := rapid.Bool().Draw(t, label+" long-pass")
	floor := rapid.Float64Range(0.001, 0.3).Draw(t, label+" floor")
	v := make([]float64, g.N)
	for i := range v {
		z := (g.Wavelength(i) - edge) / width
		if !up {
			z = -z
		}
		v[i] = floor + (1-floor)/(1+math.Exp(-z))
	}
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// TestSubtractiveSymmetric checks that stacking is symmetric: a over b
// transmits what b over a does (the stack's transmittance is the product
// a·b, commutative; mathematical invariant, no source). Verdict, stack Y,
// stack chroma and Δu′v′ agree to 1e-12 relative (round-off).
func TestSubtractiveSymmetric(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	rapid.Check(t, func(t *rapid.T) {
		a := drawTransmittance(t, g, "a")
		b := drawTransmittance(t, g, "b")
		ab, err := c.CheckSubtractive(a, b, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		ba, err := c.CheckSubtractive(b, a, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		if ab.Verdict != ba.Verdict || !scalar.EqualWithinAbsOrRel(ab.StackY, ba.StackY, 1e-15, 1e-12) ||
			!scalar.EqualWithinAbsOrRel(ab.StackChroma, ba.StackChroma, 1e-15, 1e-12) ||
			(ab.DeltaUVPrime == nil) != (ba.DeltaUVPrime == nil) ||
			ab.DeltaUVPrime != nil && !scalar.EqualWithinAbsOrRel(*ab.DeltaUVPrime, *ba.DeltaUVPrime, 1e-15, 1e-12) {
			t.Fatalf("a over b: %+v; b over a: %+v", ab, ba)
		}
	})
}

// TestSurfacesAdditiveSymmetricAndScaleFree extends the additive
// invariants of TestAdditiveSymmetricAndScaleFree to surface colours: the
// check of a + b equals that of b + a, and a common scale k changes
// neither Δu′v′ nor the relative spectral residual (both homogeneous of
// degree 0 in the spectra; mathematical invariants, no source). Tol 1e-12
// relative (round-off).
func TestSurfacesAdditiveSymmetricAndScaleFree(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1964(), cie.A())
	g := c.Grid()
	rapid.Check(t, func(t *rapid.T) {
		a := drawTransmittance(t, g, "a")
		b := drawTransmittance(t, g, "b")
		k := rapid.Float64Range(0.01, 1).Draw(t, "k")
		ab, err := c.CheckAdditive(a, b, complement.Surfaces, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		ba, err := c.CheckAdditive(b, a, complement.Surfaces, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		kk, err := c.CheckAdditive(a.Scale(k), b.Scale(k), complement.Surfaces, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, o := range []struct {
			name string
			r    complement.Additive
		}{{"b + a", ba}, {"k·a + k·b", kk}} {
			if !scalar.EqualWithinAbsOrRel(o.r.DeltaUVPrime, ab.DeltaUVPrime, 1e-15, 1e-12) ||
				!scalar.EqualWithinAbsOrRel(o.r.SpectralRMS, ab.SpectralRMS, 1e-15, 1e-12) {
				t.Fatalf("%s: %+v; a + b: %+v", o.name, o.r, ab)
			}
		}
	})
}
