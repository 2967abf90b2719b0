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

// stackXYZ computes the tristimulus values of the stack ta^fa·tb^fb under
// the conditions' illuminant straight from the definition (CIE 015:2018
// §7): X = k·Σ S x̄ T Δλ with k = 100 / Σ S ȳ Δλ, on the computation grid,
// with the observer's functions at the grid's wavelengths.
func stackXYZ(t testing.TB, c *complement.Conditions, ta, tb colorimetry.Spectrum, fa, fb float64) colorimetry.XYZ {
	t.Helper()
	g := c.Grid()
	s, err := c.Illuminant().Resample(g)
	if err != nil {
		t.Fatal(err)
	}
	ra, err := ta.Resample(g)
	if err != nil {
		t.Fatal(err)
	}
	rb, err := tb.Resample(g)
	if err != nil {
		t.Fatal(err)
	}
	var x colorimetry.XYZ
	var norm float64
	for i := range g.N {
		xb, yb, zb := c.Observer().At(g.Wavelength(i))
		tr := math.Pow(ra.Value(i), fa) * math.Pow(rb.Value(i), fb)
		sv := s.Value(i)
		x = x.Add(colorimetry.XYZ{X: sv * xb * tr, Y: sv * yb * tr, Z: sv * zb * tr})
		norm += sv * yb
	}
	return x.Scale(100 / norm)
}

// TestCheckSubtractive checks stacks of filters built from flat values and
// logistic edges. StackY is checked against the definition (stackXYZ; tol
// 1e-12 relative, round-off), flat stacks against Y = 100·T exactly (a
// flat transmittance scales the white, so Y = 100·T and C*ab = 0, by the
// normalisation of CIE 015:2018 §7; tol 1e-12 and 1e-9), and the verdict
// against the thresholds (defaults: black Y ≤ 1; neutral Y ≤ 20 and
// C*ab ≤ 2; common practice (no source)).
func TestCheckSubtractive(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	flat := func(v float64) colorimetry.Spectrum { return onGrid(t, g, func(float64) float64 { return v }) }
	amber := logistic(t, g, 560, 20, 0.15, 1) // long-pass with a 0.15 floor
	grey := onGrid(t, g, func(nm float64) float64 { return 0.12 / amber.At(nm) })
	for _, tc := range []struct {
		name     string
		a, b     colorimetry.Spectrum
		opt      complement.Options
		want     complement.Verdict
		flatY    float64 // Y = 100·T for a flat stack, 0 otherwise
		minChrom float64 // chroma at least this
	}{
		{"two clear filters", flat(0.9), flat(0.95), complement.Options{}, complement.None, 85.5, 0},
		{"crossed edges 600/500 nm", logistic(t, g, 600, 8, 0, 1), logistic(t, g, 500, -8, 0, 1), complement.Options{}, complement.Black, 0, 0},
		{"overlapping edges 560/580 nm", logistic(t, g, 560, 8, 0, 1), logistic(t, g, 580, -8, 0, 1), complement.Options{}, complement.None, 0, 50},
		{"amber and its neutralising partner", amber, grey, complement.Options{}, complement.Neutral, 12, 0},
		{"same, neutral limit Y 10", amber, grey, complement.Options{NeutralY: 10}, complement.None, 12, 0},
		{"same, black limit Y 15", amber, grey, complement.Options{BlackY: 15, NeutralY: 20}, complement.Black, 12, 0},
	} {
		r, err := c.CheckSubtractive(tc.a, tc.b, tc.opt)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		want := stackXYZ(t, c, tc.a, tc.b, 1, 1)
		if !scalar.EqualWithinAbsOrRel(r.StackY, want.Y, 1e-14, 1e-12) {
			t.Errorf("%s: Y = %.15g, definition gives %.15g", tc.name, r.StackY, want.Y)
		}
		if tc.flatY > 0 {
			if !scalar.EqualWithinAbsOrRel(r.StackY, tc.flatY, 0, 1e-12) || r.StackChroma > 1e-9 {
				t.Errorf("%s: Y = %.15g, C = %g; want %g and 0", tc.name, r.StackY, r.StackChroma, tc.flatY)
			}
		}
		if r.StackChroma < tc.minChrom || r.Verdict != tc.want {
			t.Errorf("%s: %+v, want verdict %s", tc.name, r, tc.want)
		}
	}

	// A partner that leaves a faint tint (a ±5 % tilt across the
	// spectrum): neutral under the default chroma limit of 2, none under a
	// limit below the tint's chroma.
	tinted := onGrid(t, g, func(nm float64) float64 { return 0.12 / amber.At(nm) * (1 + (nm-580)/4000) })
	r, err := c.CheckSubtractive(amber, tinted, complement.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Verdict != complement.Neutral || !(r.StackChroma > 0.05 && r.StackChroma < 2) {
		t.Fatalf("tinted partner: %+v, want neutral with 0.05 < C*ab < 2", r)
	}
	r2, err := c.CheckSubtractive(amber, tinted, complement.Options{NeutralChroma: r.StackChroma / 2})
	if err != nil {
		t.Fatal(err)
	}
	if r2.Verdict != complement.None {
		t.Errorf("tinted partner, chroma limit %g: %+v, want verdict none", r.StackChroma/2, r2)
	}
}

// TestBeerLambert checks that a factor f raises a layer's transmittance to
// the power f (Beer–Lambert: absorbance is proportional to thickness or
// concentration): factor 2 on a equals stacking a twice (tol 1e-12
// relative, round-off), and the stack matches the definition with Ta^f.
func TestBeerLambert(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1964(), cie.A())
	g := c.Grid()
	a := logistic(t, g, 520, 15, 0.05, 0.9)
	b := logistic(t, g, 610, -12, 0.02, 0.95)
	one := onGrid(t, g, func(float64) float64 { return 1 })
	twice, err := c.CheckSubtractive(a, a, complement.Options{})
	if err != nil {
		t.Fatal(err)
	}
	doubled, err := c.CheckSubtractive(a, one, complement.Options{FactorA: 2})
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbsOrRel(doubled.StackY, twice.StackY, 0, 1e-12) || !scalar.EqualWithinAbsOrRel(doubled.StackChroma, twice.StackChroma, 0, 1e-10) {
		t.Errorf("a with factor 2: Y %.15g, C %.12g; a·a: Y %.15g, C %.12g", doubled.StackY, doubled.StackChroma, twice.StackY, twice.StackChroma)
	}
	for _, f := range [][2]float64{{0.5, 1}, {1, 3}, {2.5, 0.7}} {
		r, err := c.CheckSubtractive(a, b, complement.Options{FactorA: f[0], FactorB: f[1]})
		if err != nil {
			t.Fatal(err)
		}
		want := stackXYZ(t, c, a, b, f[0], f[1])
		if !scalar.EqualWithinAbsOrRel(r.StackY, want.Y, 1e-14, 1e-12) {
			t.Errorf("factors %v: Y = %.15g, definition gives %.15g", f, r.StackY, want.Y)
		}
	}
}

// TestCheckSubtractiveErrors checks that bad filters are errors naming the
// input, and bad options errors.
func TestCheckSubtractiveErrors(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	good := logistic(t, g, 560, 10, 0, 1)
	for _, tc := range []struct {
		name  string
		a, b  colorimetry.Spectrum
		opt   complement.Options
		want  error
		input string
	}{
		{"negative beyond noise", good, logistic(t, g, 560, 10, -0.05, 1), complement.Options{}, colorimetry.ErrNegative, "b"},
		{"all zero", onGrid(t, g, func(float64) float64 { return 0 }), good, complement.Options{}, complement.ErrBlack, "a"},
		{"empty", good, colorimetry.Spectrum{}, complement.Options{}, colorimetry.ErrTooFew, "b"},
		{"neutral limit below black limit", good, good, complement.Options{BlackY: 5, NeutralY: 2}, complement.ErrOptions, ""},
		{"negative factor", good, good, complement.Options{FactorA: -1}, complement.ErrOptions, ""},
	} {
		_, err := c.CheckSubtractive(tc.a, tc.b, tc.opt)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: got %v, want %v", tc.name, err, tc.want)
			continue
		}
		var ie *complement.InputError
		if tc.input != "" && (!errors.As(err, &ie) || ie.Input != tc.input) {
			t.Errorf("%s: error %q does not name %q", tc.name, err, tc.input)
		}
	}
	// Within noise below zero: clamped to zero, with a warning.
	r, err := c.CheckSubtractive(good, logistic(t, g, 560, -10, -0.005, 1), complement.Options{})
	if err != nil || len(r.Warnings) != 1 {
		t.Errorf("b down to −0.005: %+v, %v", r, err)
	}
}
