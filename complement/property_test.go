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

// drawLight draws a light on g: one to three Gaussian bands with centres
// 380–780 nm, widths 5–80 nm and amplitudes 0.01–10.
func drawLight(t *rapid.T, g colorimetry.Grid, label string) colorimetry.Spectrum {
	k := rapid.IntRange(1, 3).Draw(t, label+" bands")
	centres, widths, amps := make([]float64, k), make([]float64, k), make([]float64, k)
	for i := range k {
		centres[i] = rapid.Float64Range(380, 780).Draw(t, label+" centre")
		widths[i] = rapid.Float64Range(5, 80).Draw(t, label+" width")
		amps[i] = rapid.Float64Range(0.01, 10).Draw(t, label+" amplitude")
	}
	v := make([]float64, g.N)
	for i := range v {
		for j := range k {
			d := (g.Wavelength(i) - centres[j]) / widths[j]
			v[i] += amps[j] * math.Exp(-0.5*d*d)
		}
	}
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// TestAdditiveSymmetricAndScaleFree checks two invariants of the additive
// check that follow from its definition (mathematical invariants, no
// source): it is symmetric in a and b (a + b = b + a), and a common scale k
// of a and b changes neither the verdict nor Δu′v′ nor the relative
// spectral residual (chromaticity and residual relative to the peak are
// homogeneous of degree 0). Tol 1e-12 relative (round-off; the verdict is
// compared only away from its thresholds, beyond 1e-9 relative).
func TestAdditiveSymmetricAndScaleFree(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	rapid.Check(t, func(t *rapid.T) {
		a := drawLight(t, g, "a")
		b := drawLight(t, g, "b")
		k := math.Pow(10, rapid.Float64Range(-3, 3).Draw(t, "log10 k"))
		ab, err := c.CheckAdditive(a, b, complement.Lights, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		ba, err := c.CheckAdditive(b, a, complement.Lights, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		kk, err := c.CheckAdditive(a.Scale(k), b.Scale(k), complement.Lights, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, o := range []struct {
			name string
			r    complement.Additive
		}{{"b + a", ba}, {"k·a + k·b", kk}} {
			if !scalar.EqualWithinAbsOrRel(o.r.DeltaUVPrime, ab.DeltaUVPrime, 1e-15, 1e-12) ||
				!scalar.EqualWithinAbsOrRel(o.r.SpectralRMS, ab.SpectralRMS, 1e-15, 1e-12) ||
				!scalar.EqualWithinAbsOrRel(o.r.DeltaE00, ab.DeltaE00, 1e-12, 1e-10) {
				t.Fatalf("%s: %+v; a + b: %+v", o.name, o.r, ab)
			}
			nearThreshold := math.Abs(ab.DeltaUVPrime/complement.DefaultDeltaUVPrime-1) < 1e-9 ||
				math.Abs(ab.SpectralRMS/complement.DefaultSpectralRMS-1) < 1e-9
			if !nearThreshold && o.r.Verdict != ab.Verdict {
				t.Fatalf("%s: verdict %s, a + b: %s", o.name, o.r.Verdict, ab.Verdict)
			}
		}
		if !scalar.EqualWithinAbsOrRel(kk.Scale, k*ab.Scale, 0, 1e-12) {
			t.Fatalf("scale of k·a + k·b = %g, want k·%g", kk.Scale, ab.Scale)
		}
	})
}

// TestTristimulusLinear checks Grassmann additivity on the conditions'
// weights: XYZ(a + b) = XYZ(a) + XYZ(b) and XYZ(k·a) = k·XYZ(a), for lights
// and for object colours (tristimulus values are linear in the spectrum,
// CIE 015:2018 §7). Tol 1e-12 relative to the largest component (round-off).
func TestTristimulusLinear(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1964(), fluorescent(t, 2))
	g := c.Grid()
	rapid.Check(t, func(t *rapid.T) {
		a := drawLight(t, g, "a")
		b := drawLight(t, g, "b")
		k := rapid.Float64Range(0.001, 1000).Draw(t, "k")
		sum, err := colorimetry.Add(a, b)
		if err != nil {
			t.Fatal(err)
		}
		for _, m := range []complement.Mode{complement.Lights, complement.Surfaces} {
			xa, _ := c.XYZ(a, m)
			xb, _ := c.XYZ(b, m)
			xs, _ := c.XYZ(sum, m)
			xk, _ := c.XYZ(a.Scale(k), m)
			want := xa.Add(xb)
			tol := 1e-12 * math.Max(want.X, math.Max(want.Y, want.Z))
			if math.Abs(xs.X-want.X) > tol || math.Abs(xs.Y-want.Y) > tol || math.Abs(xs.Z-want.Z) > tol {
				t.Fatalf("%v: XYZ(a + b) = %v, XYZ(a) + XYZ(b) = %v", m, xs, want)
			}
			wk := xa.Scale(k)
			tol = 1e-12 * math.Max(wk.X, math.Max(wk.Y, wk.Z))
			if math.Abs(xk.X-wk.X) > tol || math.Abs(xk.Y-wk.Y) > tol || math.Abs(xk.Z-wk.Z) > tol {
				t.Fatalf("%v: XYZ(k·a) = %v, k·XYZ(a) = %v", m, xk, wk)
			}
		}
	})
}

// TestMixRatioSymmetric checks that swapping a and b gives the reciprocal
// ratio and the same Δu′v′ and line distance (the segment is the same;
// mathematical invariant; tol 1e-9 relative, round-off through the
// projective weights).
func TestMixRatioSymmetric(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.A())
	g := c.Grid()
	rapid.Check(t, func(t *rapid.T) {
		a := drawLight(t, g, "a")
		b := drawLight(t, g, "b")
		ab, err := c.MixRatio(a, b, complement.Lights)
		if err != nil {
			t.Fatal(err)
		}
		ba, err := c.MixRatio(b, a, complement.Lights)
		if err != nil {
			t.Fatal(err)
		}
		if !scalar.EqualWithinAbsOrRel(ab.DeltaUVPrime, ba.DeltaUVPrime, 1e-14, 1e-9) ||
			!scalar.EqualWithinAbsOrRel(ab.LineDistanceUVPrime, ba.LineDistanceUVPrime, 1e-14, 1e-9) {
			t.Fatalf("a, b: %+v; b, a: %+v", ab, ba)
		}
		if ab.Weight != nil && ba.Weight != nil && *ab.Weight > 0 && *ba.Weight > 0 &&
			!scalar.EqualWithinAbsOrRel(*ab.Weight**ba.Weight, 1, 0, 1e-9) {
			t.Fatalf("weights %g and %g are not reciprocal", *ab.Weight, *ba.Weight)
		}
	})
}
