package mixing_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"pgregory.net/rapid"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// wide draws a non-negative float64 across many orders of magnitude, zero
// and the largest finite values included.
func wide(lo, hi float64) *rapid.Generator[float64] {
	return rapid.OneOf(
		rapid.SampledFrom([]float64{0, 5e-324, 1e-300, 1, 1e300, math.MaxFloat64}),
		rapid.Float64Range(lo, hi),
		rapid.Custom(func(t *rapid.T) float64 { return math.Pow(10, rapid.Float64Range(-300, 300).Draw(t, "exponent")) }),
	)
}

// TestKubelkaMunkRoundTrip checks that the Kubelka–Munk function and its
// inverse undo each other over the whole range of K/S and R∞ (Kubelka &
// Munk 1931: K/S = (1 − R∞)²/(2R∞) and R∞ = 1 + K/S − √((K/S)² + 2K/S)
// are inverse on R∞ ∈ (0, 1], K/S ∈ [0, ∞)). Tol: 1e-9 relative for
// R∞ ≥ 1e-4 (round-off grows as 1/R∞ near 0, measured below 1e-11), 1e-6
// relative in K/S up to 1e12 (cancellation in 1 − R∞ near R∞ = 1).
func TestKubelkaMunkRoundTrip(t *testing.T) {
	t.Parallel()
	rapid.Check(t, func(rt *rapid.T) {
		r := rapid.Float64Range(1e-4, 1).Draw(rt, "R∞")
		if got := mixing.ReflectanceInf(mixing.KS(r)); !scalar.EqualWithinAbsOrRel(got, r, 1e-15, 1e-9) {
			rt.Fatalf("R∞(KS(%v)) = %v", r, got)
		}
		q := math.Pow(10, rapid.Float64Range(-6, 12).Draw(rt, "log10 K/S"))
		if got := mixing.KS(mixing.ReflectanceInf(q)); !scalar.EqualWithinAbsOrRel(got, q, 1e-12, 1e-6) {
			rt.Fatalf("KS(R∞(%v)) = %v", q, got)
		}
	})
}

// TestKubelkaMunkFinite checks that the layer formulas give a finite
// fraction in [0, 1] for every absorption and scattering in [0, 1e150]
// (their documented range) and every thickness from 0 to the largest
// float64 and +Inf,
// over any backing reflectance in [0, 1] (they are reflectances and
// transmittances of a physical layer: Kubelka 1948). And a layer much
// thicker than its hiding depth reflects R∞ (Kubelka 1948, the limit
// x → ∞), within 1e-9.
func TestKubelkaMunkFinite(t *testing.T) {
	t.Parallel()
	rapid.Check(t, func(rt *rapid.T) {
		k := math.Min(wide(0, 100).Draw(rt, "K"), 1e150)
		s := math.Min(wide(0, 100).Draw(rt, "S"), 1e150)
		x := rapid.OneOf(wide(0, 10), rapid.Just(math.Inf(1))).Draw(rt, "X")
		rg := rapid.Float64Range(0, 1).Draw(rt, "Rg")
		r := mixing.LayerReflectance(k, s, x, rg)
		tr := mixing.LayerTransmittance(k, s, x)
		// 1e-12: round-off of the hyperbolic form, which subtracts terms
		// of the size of K/S (measured: 1e-16 at K/S = 1e150).
		if !(r >= -1e-12 && r <= 1+1e-12) {
			rt.Fatalf("LayerReflectance(%v, %v, %v, %v) = %v", k, s, x, rg, r)
		}
		if !(tr >= -1e-12 && tr <= 1+1e-12) {
			rt.Fatalf("LayerTransmittance(%v, %v, %v) = %v", k, s, x, tr)
		}
		if s > 0 && k > 0 && k < 1e150 && s < 1e150 && s*x > 1e4*(1+s/k) {
			if inf := mixing.ReflectanceInf(k / s); !scalar.EqualWithinAbs(r, inf, 1e-9) {
				rt.Fatalf("thick layer K %v S %v X %v: R %v, R∞ %v", k, s, x, r, inf)
			}
		}
	})
}

// TestBeerLambertFinite checks that the dyes model's transmittance is a
// finite fraction in [0, 1] for any concentrations and path length from
// zero to 1e300, and that transmittance multiplies along the path
// (Beer–Lambert: T(c, 2ℓ) = T(c, ℓ)² once the base is removed, checked
// here with a zero base). Tol 1e-12 absolute.
func TestBeerLambertFinite(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid{Start: 400, Step: 20, N: 16}
	base := make([]float64, g.N)
	e1, e2 := make([]float64, g.N), make([]float64, g.N)
	for i := range g.N {
		e1[i] = 0.1 * float64(i)
		e2[i] = 2 - 0.1*float64(i)
	}
	m, err := mixing.NewDyes(g, "g/L", base, []mixing.Dye{{Name: "a", Absorptivity: e1}, {Name: "b", Absorptivity: e2}})
	if err != nil {
		t.Fatal(err)
	}
	rapid.Check(t, func(rt *rapid.T) {
		am := []mixing.Amount{{Name: "a", Value: wide(0, 10).Draw(rt, "a")}, {Name: "b", Value: wide(0, 10).Draw(rt, "b")}}
		ell := rapid.Float64Range(1e-3, 10).Draw(rt, "path")
		if ell > 1e300 {
			return
		}
		s1, _, err1 := m.Transmittance(am, ell)
		s2, _, err2 := m.Transmittance(am, 2*ell)
		if err1 != nil || err2 != nil {
			if err1 != nil && err2 == nil {
				rt.Fatalf("path %v fails (%v), twice the path does not", ell, err1)
			}
			return
		}
		for i := range g.N {
			t1, t2 := s1.Value(i), s2.Value(i)
			if !(t1 >= 0 && t1 <= 1) || !(t2 >= 0 && t2 <= 1) {
				rt.Fatalf("transmittance at %g nm: %v, %v", g.Wavelength(i), t1, t2)
			}
			if !scalar.EqualWithinAbs(t2, t1*t1, 1e-12) {
				rt.Fatalf("at %g nm T(2ℓ) = %v, T(ℓ)² = %v", g.Wavelength(i), t2, t1*t1)
			}
		}
	})
}
