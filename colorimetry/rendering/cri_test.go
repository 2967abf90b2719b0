package rendering

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/floats/scalar"
)

// fluorescent returns CIE illuminant FLn or stops the test.
func fluorescent(t *testing.T, n int) colorimetry.Spectrum {
	t.Helper()
	f, err := cie.Fluorescent(n)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// TestRaFluorescent checks Ra of FL1–FL12 (5 nm, 380–780 nm, the grid of
// the CIE tables) against two sources:
//   - CIE 015 (the colorimetric table of the fluorescent illuminants),
//     which prints Ra rounded to integers and CCT rounded to 10 K
//     (shared/reference PROVENANCE Checks 10);
//   - the independent CIE 13.3 calculation in PROVENANCE Checks 10, which
//     prints Ra to one decimal; it found the CCT by Robertson's method and
//     this package by Ohno's, so the tolerance is half a unit of the
//     printed decimal plus 0.01 for the method.
func TestRaFluorescent(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		n        int
		cie015   float64 // Ra, CIE 015
		cctCIE   float64 // CCT (K), CIE 015
		computed float64 // Ra, PROVENANCE Checks 10
	}{
		{1, 76, 6430, 75.8},
		{2, 64, 4230, 64.2},
		{3, 57, 3450, 56.7},
		{4, 51, 2940, 51.4},
		{5, 72, 6350, 71.7},
		{6, 59, 4150, 59.0},
		{7, 90, 6500, 90.2},
		// FL8 sits on the 5000 K switch: its CCT computes to about 4997 K,
		// so CIE 13.3 takes a Planckian reference and Ra is 95.5; the
		// tabulated 95 follows a daylight reference (see
		// TestRaF8DaylightReference).
		{8, 95, 5000, 95.5},
		{9, 90, 4150, 90.3},
		{10, 81, 5000, 81.0},
		{11, 83, 4000, 82.8},
		{12, 83, 3000, 83.1},
	} {
		got, err := ColourRendering(fluorescent(t, c.n))
		if err != nil {
			t.Errorf("FL%d: %v", c.n, err)
			continue
		}
		if !scalar.EqualWithinAbs(got.Ra, c.computed, 0.06) {
			t.Errorf("FL%d: Ra %.3f, want %.1f (PROVENANCE Checks 10)", c.n, got.Ra, c.computed)
		}
		if c.n != 8 && math.Round(got.Ra) != c.cie015 {
			t.Errorf("FL%d: Ra %.3f rounds to %.0f, CIE 015 gives %.0f", c.n, got.Ra, math.Round(got.Ra), c.cie015)
		}
		// CIE 015 prints the CCT to 10 K; 10 K allows for its rounding and
		// the method (CIE 015 FL2 4230 K, computed here 4224 K).
		if !scalar.EqualWithinAbs(got.CCT.Kelvin, c.cctCIE, 10) {
			t.Errorf("FL%d: CCT %.1f K, CIE 015 gives %.0f K", c.n, got.CCT.Kelvin, c.cctCIE)
		}
		wantRef := 0.0
		if got.CCT.Kelvin >= 5000 {
			wantRef = 1
		}
		if got.Reference.Daylight != wantRef || got.Reference.Kelvin != got.CCT.Kelvin {
			t.Errorf("FL%d: reference %v for CCT %.1f K (CIE 13.3: Planckian below 5000 K, daylight from 5000 K)", c.n, got.Reference, got.CCT.Kelvin)
		}
	}
}

// TestRaF8DaylightReference checks that FL8 against a CIE daylight
// reference of its own CCT gives the tabulated Ra: 95.15 (PROVENANCE
// Checks 10, two decimals: tolerance half a unit of the last plus 0.01 for
// the CCT method), which rounds to the 95 of CIE 015.
func TestRaF8DaylightReference(t *testing.T) {
	t.Parallel()
	tb, err := load()
	if err != nil {
		t.Fatal(err)
	}
	s, err := onGrid(fluorescent(t, 8))
	if err != nil {
		t.Fatal(err)
	}
	cct, err := tb.cct(s)
	if err != nil {
		t.Fatal(err)
	}
	if !(cct.Kelvin < 5000 && cct.Kelvin > 4990) {
		t.Errorf("FL8 CCT %.2f K; PROVENANCE Checks 10 computes 4997 K", cct.Kelvin)
	}
	d, err := daylight(cct.Kelvin)
	if err != nil {
		t.Fatal(err)
	}
	got, err := tb.rendering(s, d)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(got.Ra, 95.15, 0.015) || math.Round(got.Ra) != 95 {
		t.Errorf("FL8 against daylight: Ra %.3f, want 95.15 (PROVENANCE Checks 10) and 95 rounded (CIE 015)", got.Ra)
	}
}

// TestRaReferenceLights checks that the reference illuminants render
// perfectly: a Planckian radiator below 5000 K and CIE daylight from 5000 K
// give Ra = R1…R14 = 100 (CIE 13.3-1995: the reference is the light's own
// kind). Tolerances, common practice (no source): the CCT is found on the
// Planckian locus of the 1 nm observer over 360–830 nm, while the light is
// summed at 5 nm over 380–780 nm, which moves the CCT of a 5 nm Planckian
// radiator a little off its temperature and so its reference; 1 nm spectra
// also pass the 5 nm band pass, which smooths them a little. Either moves
// an index by less than 0.03 (R9, the saturated red, moves most). The
// CCT of a CIE daylight spectrum differs from its nominal temperature by a
// few kelvin (the daylight formulas are fits), so its reference is daylight
// of a slightly different temperature (again below 0.03). Daylight is taken from
// 5100 K: nominal 5000 K daylight computes to just under 5000 K and so,
// correctly, gets a Planckian reference.
func TestRaReferenceLights(t *testing.T) {
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
	for _, c := range []struct {
		name string
		s    colorimetry.Spectrum
		tol  float64
	}{
		{"Planckian 1200 K, 5 nm", planck(1200, colorimetry.Grid5nm), 0.03},
		{"Planckian 3000 K, 5 nm", planck(3000, colorimetry.Grid5nm), 0.03},
		{"Planckian 4999 K, 5 nm", planck(4999, colorimetry.Grid5nm), 0.03},
		{"Planckian 1500 K, 1 nm", planck(1500, g1), 0.03},
		{"Planckian 2700 K, 1 nm", planck(2700, g1), 0.03},
		{"illuminant A, 1 nm", cie.A(), 0.03},
		{"daylight 5100 K", day(5100), 0.03},
		{"daylight 6504 K", day(6504), 0.03},
		{"daylight 12000 K", day(12000), 0.03},
		{"daylight 24990 K", day(24990), 0.03},
	} {
		got, err := ColourRendering(c.s)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if !scalar.EqualWithinAbs(got.Ra, 100, c.tol) {
			t.Errorf("%s: Ra %.6f, want 100", c.name, got.Ra)
		}
		for i, r := range got.R {
			if !scalar.EqualWithinAbs(r, 100, c.tol) {
				t.Errorf("%s: R%d %.6f, want 100", c.name, i+1, r)
			}
		}
		if len(got.Warnings) != 0 {
			t.Errorf("%s: warnings %q for a light on or near the locus", c.name, got.Warnings)
		}
	}
}

// TestAdaptedWhite checks the von Kries constants of CIE 13.3 (typed from
// memory) for consistency: the adapted light must land on the reference
// white, for lights and references across the range of CCTs. The tolerance
// 2e-4 in u, v is common practice (no source) for constants printed to
// three decimals.
func TestAdaptedWhite(t *testing.T) {
	t.Parallel()
	tb, err := load()
	if err != nil {
		t.Fatal(err)
	}
	for _, k := range []struct{ light, ref float64 }{{2000, 3000}, {2856, 2856}, {4000, 6500}, {6500, 4000}, {10000, 15000}} {
		for _, duv := range []float64{-0.005, 0, 0.005} {
			luv, err := tb.planck.UV(k.light, duv)
			if err != nil {
				t.Fatal(err)
			}
			ruv, err := tb.planck.UV(k.ref, 0)
			if err != nil {
				t.Fatal(err)
			}
			ck, dk := cd(luv.U, luv.V)
			cr, dr := cd(ruv.U, ruv.V)
			u, v := adapt13(ck, dk, cr/ck, dr/dk)
			if math.Abs(u-ruv.U) > 2e-4 || math.Abs(v-ruv.V) > 2e-4 {
				t.Errorf("light %v K Duv %+g onto %v K: adapted (%.5f, %.5f), reference white (%.5f, %.5f)", k.light, duv, k.ref, u, v, ruv.U, ruv.V)
			}
		}
	}
}

// TestDuvWarning checks the warning beyond |Duv| = 0.0054 (CIE 13.3-1995,
// from memory) on the fluorescent illuminants, whose Duv is computed here
// (FL1 +0.0071, FL5 +0.0107, FL6 +0.0060; FL7 +0.0032, FL4 −0.0008).
func TestDuvWarning(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		n    int
		warn bool
	}{{1, true}, {5, true}, {6, true}, {7, false}, {4, false}, {10, false}} {
		got, err := ColourRendering(fluorescent(t, c.n))
		if err != nil {
			t.Fatal(err)
		}
		warned := len(got.Warnings) > 0 && strings.Contains(got.Warnings[0], "Duv")
		if warned != c.warn || warned != (math.Abs(got.CCT.Duv) > DuvLimit13) {
			t.Errorf("FL%d: Duv %+.4f, warnings %q; want a warning: %v", c.n, got.CCT.Duv, got.Warnings, c.warn)
		}
	}
}

// TestBandPass checks the reduction of finely sampled lights to 5 nm:
// the triangular band pass keeps the power of a narrow line between the
// 5 nm nodes, and 5 nm data pass unchanged (common practice (no source):
// a triangular band pass of the grid's step conserves the integral).
func TestBandPass(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid{Start: 500, Step: 1, N: 101}
	v := make([]float64, g.N)
	v[47] = 3 // 547 nm, between the nodes 545 and 550 nm
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	out, err := onGrid(s)
	if err != nil {
		t.Fatal(err)
	}
	var sum float64
	for _, x := range out {
		sum += x * grid.Step
	}
	if !scalar.EqualWithinAbs(sum, 3, 1e-12) || !scalar.EqualWithinAbs(out[33], 3*0.6/5, 1e-12) || !scalar.EqualWithinAbs(out[34], 3*0.4/5, 1e-12) {
		t.Errorf("line of 3 W at 547 nm: total %g W, at 545 and 550 nm %g and %g; want 3, 0.36, 0.24", sum, out[33], out[34])
	}
	f := fluorescent(t, 2)
	out, err = onGrid(f)
	if err != nil {
		t.Fatal(err)
	}
	for k, x := range out {
		if x != f.Value(k) {
			t.Fatalf("5 nm data changed at %g nm: %g, was %g", grid.Wavelength(k), x, f.Value(k))
		}
	}
}

// TestRenderingErrors checks that data problems are errors, never panics
// (DESIGN.md), each with the reason named.
func TestRenderingErrors(t *testing.T) {
	t.Parallel()
	mk := func(g colorimetry.Grid, f func(nm float64) float64) colorimetry.Spectrum {
		v := make([]float64, g.N)
		for i := range v {
			v[i] = f(g.Wavelength(i))
		}
		s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	hot, err := cie.Planckian(40000)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name  string
		light colorimetry.Spectrum
		is    error
	}{
		{"empty", colorimetry.Spectrum{}, colorimetry.ErrTooFew},
		{"dark", mk(colorimetry.Grid5nm, func(float64) float64 { return 0 }), colorimetry.ErrZeroLuminance},
		{"outside 380–780 nm", mk(colorimetry.Grid{Start: 800, Step: 5, N: 10}, func(float64) float64 { return 1 }), colorimetry.ErrZeroLuminance},
		{"negative", mk(colorimetry.Grid5nm, func(nm float64) float64 { return 1 - 2*math.Exp(-(nm-600)*(nm-600)/50) }), colorimetry.ErrNegative},
		// A green line is 0.3 from the locus: no CCT (CIE 015:2018).
		{"green line", mk(colorimetry.Grid5nm, func(nm float64) float64 { return math.Exp(-(nm - 530) * (nm - 530) / 50) }), colorimetry.ErrCCTRange},
		// 40 000 K lies beyond the CIE daylight series (CIE 015:2018: 4000–25 000 K).
		{"40 000 K", hot, ErrNoReference},
	} {
		if _, err := ColourRendering(c.light); !errors.Is(err, c.is) {
			t.Errorf("%s: ColourRendering error %v, want %v", c.name, err, c.is)
		}
		if _, err := ColourFidelity(c.light); !errors.Is(err, c.is) {
			t.Errorf("%s: ColourFidelity error %v, want %v", c.name, err, c.is)
		}
	}
}

func TestReferenceString(t *testing.T) {
	t.Parallel()
	// common practice (no source): the reference is named as a lighting
	// engineer would write it.
	for _, c := range []struct {
		r    Reference
		want string
	}{
		{Reference{Kelvin: 2940}, "Planckian 2940 K"},
		{Reference{Kelvin: 6500, Daylight: 1}, "CIE daylight 6500 K"},
		{Reference{Kelvin: 4500, Daylight: 0.5}, "blend at 4500 K, 50 % daylight"},
	} {
		if got := c.r.String(); got != c.want {
			t.Errorf("%+v: %q, want %q", c.r, got, c.want)
		}
	}
}

func BenchmarkColourRendering(b *testing.B) {
	f, err := cie.Fluorescent(2)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		sinkCRI, _ = ColourRendering(f)
	}
}

var sinkCRI CRI
