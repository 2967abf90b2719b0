package complement_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// TestMixRatioRecovers builds exact metameric complements at a known ratio
// t (a + t·b has exactly the white's chromaticity, by Grassmann
// additivity) and checks that MixRatio recovers t to 1e-9 relative, with
// line distance and Δu′v′ 0 (tol 1e-12: round-off), and the luminance
// ratio Y(a)/(t·Y(b)) from the tristimulus values (tol 1e-9).
func TestMixRatioRecovers(t *testing.T) {
	t.Parallel()
	for _, ill := range []struct {
		name string
		s    colorimetry.Spectrum
	}{{"D65", cie.D65()}, {"A", cie.A()}, {"FL11", fluorescent(t, 11)}} {
		c := conditions(t, cie.CIE1931(), ill.s)
		for _, m := range []complement.Mode{complement.Lights, complement.Surfaces} {
			for _, ratio := range []float64{1.5, 3.7, 12} {
				a, b := metamericPair(t, c, m, ratio)
				r, err := c.MixRatio(a, b, m)
				if err != nil {
					t.Fatal(err)
				}
				if r.Weight == nil || !scalar.EqualWithinAbsOrRel(*r.Weight, ratio, 0, 1e-9) {
					t.Errorf("%s, %v, t = %g: weight %v", ill.name, m, ratio, r.Weight)
					continue
				}
				if r.LineDistanceUVPrime > 1e-12 || r.DeltaUVPrime > 1e-12 || len(r.Warnings) != 0 {
					t.Errorf("%s, %v, t = %g: %+v", ill.name, m, ratio, r)
				}
				xa, _ := c.XYZ(a, m)
				xb, _ := c.XYZ(b, m)
				if want := xa.Y / (ratio * xb.Y); r.RatioLuminance == nil || !scalar.EqualWithinAbsOrRel(*r.RatioLuminance, want, 0, 1e-9) {
					t.Errorf("%s, %v, t = %g: luminance ratio %v, want %g", ill.name, m, ratio, r.RatioLuminance, want)
				}
				if want := ratio * xb.Y / (xa.Y + ratio*xb.Y); !scalar.EqualWithinAbsOrRel(r.FractionLuminance, want, 0, 1e-9) {
					t.Errorf("%s, %v, t = %g: fraction %g, want %g", ill.name, m, ratio, r.FractionLuminance, want)
				}
				if r.RatioPower == nil || !(*r.RatioPower > 0) {
					t.Errorf("%s, %v, t = %g: power ratio %v", ill.name, m, ratio, r.RatioPower)
				}
			}
		}
	}
}

// TestMixRatioIsMinimum checks the exact solution against a brute-force
// search (mathematical invariant: the exact minimiser is no worse than any
// sampled t, tol 1e-12): Δu′v′ of XYZ(a) + t·XYZ(b) over 4001 values of t
// from 10⁻⁴ to 10⁴ on a log scale, for pairs that are not complements.
func TestMixRatioIsMinimum(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	w := uvPrime(t, c.White(complement.Lights))
	for _, tc := range []struct {
		name string
		a, b colorimetry.Spectrum
	}{
		{"orange and blue", gaussians(t, g, []float64{600}, []float64{20}, []float64{1}), gaussians(t, g, []float64{460}, []float64{15}, []float64{0.5})},
		{"yellow and violet", gaussians(t, g, []float64{575}, []float64{15}, []float64{1}), gaussians(t, g, []float64{430}, []float64{10}, []float64{3})},
		{"red and green (no complement)", gaussians(t, g, []float64{630}, []float64{15}, []float64{1}), gaussians(t, g, []float64{530}, []float64{15}, []float64{1})},
	} {
		r, err := c.MixRatio(tc.a, tc.b, complement.Lights)
		if err != nil {
			t.Fatal(err)
		}
		xa, _ := c.XYZ(tc.a, complement.Lights)
		xb, _ := c.XYZ(tc.b, complement.Lights)
		best := math.Inf(1)
		for k := range 4001 {
			tt := math.Pow(10, -4+8*float64(k)/4000)
			d := colorimetry.DeltaUVPrime(uvPrime(t, xa.Add(xb.Scale(tt))), w)
			best = math.Min(best, d)
		}
		if r.DeltaUVPrime > best+1e-12 || r.LineDistanceUVPrime > r.DeltaUVPrime+1e-15 {
			t.Errorf("%s: exact %+v, brute force %g", tc.name, r, best)
		}
		if r.Weight != nil && *r.Weight > 0 {
			// The mix at the returned weight has the returned Δu′v′.
			d := colorimetry.DeltaUVPrime(uvPrime(t, xa.Add(xb.Scale(*r.Weight))), w)
			if !scalar.EqualWithinAbsOrRel(d, r.DeltaUVPrime, 1e-12, 1e-9) {
				t.Errorf("%s: Δu′v′ at t = %g is %g, reported %g", tc.name, *r.Weight, d, r.DeltaUVPrime)
			}
		}
	}
}

// TestMixRatioEnds checks the ends of the segment: when the white's
// projection falls beyond a or beyond b, the nearest mix is that colour
// alone, reported with a warning and the ratio that does not exist left
// null.
func TestMixRatioEnds(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	pale := gaussians(t, g, []float64{450, 550, 610}, []float64{40, 40, 40}, []float64{0.8, 1, 1.1}) // near white
	red := gaussians(t, g, []float64{640}, []float64{15}, []float64{1})
	r, err := c.MixRatio(pale, red, complement.Lights)
	if err != nil {
		t.Fatal(err)
	}
	if r.Weight == nil || *r.Weight != 0 || r.RatioLuminance != nil || r.FractionLuminance != 0 || len(r.Warnings) != 1 {
		t.Errorf("pale + red: %+v, want a alone", r)
	}
	r, err = c.MixRatio(red, pale, complement.Lights)
	if err != nil {
		t.Fatal(err)
	}
	if r.Weight != nil || r.RatioLuminance == nil || *r.RatioLuminance != 0 || r.FractionLuminance != 1 || len(r.Warnings) != 1 {
		t.Errorf("red + pale: %+v, want b alone", r)
	}
	// Same chromaticity: the line is undefined.
	r, err = c.MixRatio(red, red.Scale(2), complement.Lights)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Warnings) != 1 || r.LineDistanceUVPrime != r.DeltaUVPrime {
		t.Errorf("red + 2·red: %+v", r)
	}
}
