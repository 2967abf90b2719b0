package rendering

import (
	"math"
	"sort"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestRfReferenceLights checks that a Planckian radiator up to 4000 K and
// CIE daylight from 5000 K have perfect fidelity (CIE 224:2017: they are
// their own reference): ΔE′ = 0, so Rf = Rf,i = FidelityIndex(0).
// Tolerance 0.01 for the reasons given in TestRaReferenceLights (the CCT
// on the 5 nm grid, the band pass of 1 nm data, the CCT of daylight). Between 4000 and
// 5000 K the reference is the blend, so a Planckian radiator there scores
// below 100 (CIE 224:2017, from memory): at 4500 K by about 1.6 (computed
// here).
func TestRfReferenceLights(t *testing.T) {
	t.Parallel()
	planck := func(k float64, g colorimetry.Grid) colorimetry.Spectrum {
		s, err := colorimetry.Blackbody(k, g, colorimetry.C2)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	day := func(k float64) colorimetry.Spectrum {
		s, err := cie.Daylight(k)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	g1 := colorimetry.Grid{Start: 360, Step: 1, N: 471}
	perfect := FidelityIndex(0)
	for _, c := range []struct {
		name string
		s    colorimetry.Spectrum
		tol  float64
	}{
		{"Planckian 2000 K, 5 nm", planck(2000, colorimetry.Grid5nm), 0.01},
		{"Planckian 3990 K, 5 nm", planck(3990, colorimetry.Grid5nm), 0.01},
		{"Planckian 2700 K, 1 nm", planck(2700, g1), 0.01},
		{"illuminant A, 1 nm", cie.A(), 0.01},
		{"daylight 5000 K", day(5000), 0.01},
		{"daylight 6504 K", day(6504), 0.01},
		{"daylight 20000 K", day(20000), 0.01},
	} {
		got, err := ColourFidelity(c.s)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if !scalar.EqualWithinAbs(got.Rf, perfect, c.tol) {
			t.Errorf("%s: Rf %.6f, want %.6f", c.name, got.Rf, perfect)
		}
		for i, r := range got.Rfi {
			if !scalar.EqualWithinAbs(r, perfect, c.tol) {
				t.Errorf("%s: Rf,%d %.6f, want %.6f", c.name, i+1, r, perfect)
			}
		}
	}
	got, err := ColourFidelity(planck(4500, colorimetry.Grid5nm))
	if err != nil {
		t.Fatal(err)
	}
	if !(got.Rf < 99.5 && got.Rf > 97) || !scalar.EqualWithinAbs(got.Reference.Daylight, 0.5, 1e-3) {
		t.Errorf("Planckian 4500 K: Rf %.3f against %v; want about 98.4 against the half-and-half blend", got.Rf, got.Reference)
	}
}

// TestReferenceBlend checks the CIE 224:2017 reference between 4000 and
// 5000 K (from memory): continuous at both ends, with the daylight share
// (T − 4000)/1000, and its chromaticity between the Planckian radiator and
// daylight of the same temperature (common practice (no source): a mix of
// two lights lies on the line between them).
func TestReferenceBlend(t *testing.T) {
	t.Parallel()
	tb, err := load()
	if err != nil {
		t.Fatal(err)
	}
	xy := func(s []float64) colorimetry.XY {
		c, err := tristimulus(s, nil, tb.x10, tb.y10, tb.z10).XY()
		if err != nil {
			t.Fatal(err)
		}
		return c
	}
	// Continuity: chromaticity just inside and at each end agree to
	// 1e-5 (the change of a Planckian radiator's chromaticity over 0.01 K).
	for _, k := range []float64{4000, 5000} {
		a, _, err := tb.reference224(k - 0.01)
		if err != nil {
			t.Fatal(err)
		}
		b, _, err := tb.reference224(k + 0.01)
		if err != nil {
			t.Fatal(err)
		}
		pa, pb := xy(a), xy(b)
		if math.Hypot(pa.X-pb.X, pa.Y-pb.Y) > 1e-5 {
			t.Errorf("reference jumps at %v K: %v to %v", k, pa, pb)
		}
	}
	ref, r, err := tb.reference224(4300)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(r.Daylight, 0.3, 1e-12) {
		t.Errorf("4300 K: daylight share %g, want 0.3", r.Daylight)
	}
	p, err := planckian(4300)
	if err != nil {
		t.Fatal(err)
	}
	d, err := daylight(4300)
	if err != nil {
		t.Fatal(err)
	}
	pp, pd, pr := xy(p), xy(d), xy(ref)
	// pr = pp + f·(pd − pp) for one f in (0, 1).
	f := ((pr.X-pp.X)*(pd.X-pp.X) + (pr.Y-pp.Y)*(pd.Y-pp.Y)) / ((pd.X-pp.X)*(pd.X-pp.X) + (pd.Y-pp.Y)*(pd.Y-pp.Y))
	off := math.Hypot(pp.X+f*(pd.X-pp.X)-pr.X, pp.Y+f*(pd.Y-pp.Y)-pr.Y)
	if !(f > 0 && f < 1) || off > 1e-12 {
		t.Errorf("blend at 4300 K: %v is not between Planckian %v and daylight %v (f %g, off %g)", pr, pp, pd, f, off)
	}
}

// TestRfFollowsRa is a sanity check, not an outside source: over FL1–FL12
// the CIE 224 fidelity index ranks the lamps much as CIE 13.3's Ra does
// (Spearman's rank correlation above 0.9, computed here 0.93), with the
// same three best lamps (FL7, FL8, FL9, the broadband "deluxe" types) and
// the same three worst (FL3, FL4, FL6, the standard halophosphates).
func TestRfFollowsRa(t *testing.T) {
	t.Parallel()
	n := 12
	ra, rf := make([]float64, n), make([]float64, n)
	for i := range n {
		f := fluorescent(t, i+1)
		c, err := ColourRendering(f)
		if err != nil {
			t.Fatal(err)
		}
		d, err := ColourFidelity(f)
		if err != nil {
			t.Fatal(err)
		}
		ra[i], rf[i] = c.Ra, d.Rf
	}
	rank := func(v []float64) []int {
		idx := make([]int, len(v))
		for i := range idx {
			idx[i] = i
		}
		sort.Slice(idx, func(a, b int) bool { return v[idx[a]] > v[idx[b]] })
		r := make([]int, len(v))
		for pos, i := range idx {
			r[i] = pos
		}
		return r
	}
	r1, r2 := rank(ra), rank(rf)
	var d2 float64
	for i := range r1 {
		d := float64(r1[i] - r2[i])
		d2 += d * d
	}
	rho := 1 - 6*d2/float64(n*(n*n-1))
	if rho < 0.9 {
		t.Errorf("Spearman rank correlation of Rf with Ra over FL1–FL12: %.3f (Ra %v, Rf %v)", rho, ra, rf)
	}
	for _, lamp := range []int{7, 8, 9} {
		if r1[lamp-1] > 2 || r2[lamp-1] > 2 {
			t.Errorf("FL%d: rank %d by Ra and %d by Rf, want among the best three", lamp, r1[lamp-1]+1, r2[lamp-1]+1)
		}
	}
	for _, lamp := range []int{3, 4, 6} {
		if r1[lamp-1] < n-3 || r2[lamp-1] < n-3 {
			t.Errorf("FL%d: rank %d by Ra and %d by Rf, want among the worst three", lamp, r1[lamp-1]+1, r2[lamp-1]+1)
		}
	}
}

// TestFidelityIndex checks the scaling of CIE 224:2017 (from memory),
// Rf = 10·ln(exp((100 − 6.73·ΔE′)/10) + 1): close to the linear
// 100 − 6.73·ΔE′ while that is well above 0 (within 10·e⁻ˣ for x =
// (100 − 6.73·ΔE′)/10), ln 2·10 at ΔE′ = 100/6.73, and positive and
// decreasing beyond.
func TestFidelityIndex(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		de, want, tol float64
	}{
		{0, 100 + 10*math.Log1p(math.Exp(-10)), 1e-12},
		{1, 100 - 6.73, 10 * math.Exp(-(100-6.73)/10)},
		{5, 100 - 5*6.73, 10 * math.Exp(-(100-5*6.73)/10)},
		{100 / 6.73, 10 * math.Ln2, 1e-12},
		{1e4, 0, 1e-300},
	} {
		if got := FidelityIndex(c.de); !scalar.EqualWithinAbs(got, c.want, c.tol) {
			t.Errorf("FidelityIndex(%g) = %.12g, want %.12g", c.de, got, c.want)
		}
	}
	prev := FidelityIndex(0)
	for de := 0.5; de < 40; de += 0.5 {
		got := FidelityIndex(de)
		if !(got < prev && got > 0) {
			t.Fatalf("FidelityIndex(%g) = %g after %g: not decreasing and positive", de, got, prev)
		}
		prev = got
	}
}

func BenchmarkColourFidelity(b *testing.B) {
	f, err := cie.Fluorescent(2)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		sinkFidelity, _ = ColourFidelity(f)
	}
}

var sinkFidelity Fidelity
