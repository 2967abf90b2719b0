package complement_test

import (
	"encoding/json"
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// White points of the CIE 1931 observer, CIE 15:2004 Table T.3 (from
// memory, as recorded in shared/reference/white_points.csv), and the
// equal-energy white E (by definition).
var (
	whiteD65 = colorimetry.XY{X: 0.31272, Y: 0.32903}
	whiteC   = colorimetry.XY{X: 0.31006, Y: 0.31616}
	whiteE   = colorimetry.XY{X: 1.0 / 3, Y: 1.0 / 3}
)

// cmfAt returns x̄, ȳ, z̄ of obs at nm as tristimulus values.
func cmfAt(obs *colorimetry.Observer, nm float64) colorimetry.XYZ {
	x, y, z := obs.At(nm)
	return colorimetry.XYZ{X: x, Y: y, Z: z}
}

// TestComplementaryPairPublished checks complementary wavelengths relative
// to D65 for the CIE 1931 observer against the textbook pairs blue
// 480 nm ↔ yellow 580 nm and orange 600 nm ↔ blue-green 490 nm (from
// memory; textbooks print them rounded to 10 nm, so tol 2.5 nm), and the
// ends of the green range without a spectral complement, about 493 nm
// and 567 nm, where the complements of the ends of the spectrum locus fall
// (textbook CIE 1931 chromaticity diagrams, from memory; tol 1.5 nm, the
// precision of reading a diagram). Greens between them have none (CIE
// 015:2018 §9.1: their complement is a purple).
func TestComplementaryPairPublished(t *testing.T) {
	t.Parallel()
	obs := cie.CIE1931()
	for _, tc := range []struct {
		nm, want, tol float64
	}{
		{480, 580, 2.5},
		{580, 480, 2.5},
		{600, 490, 2.5},
		{490, 600, 2.5},
		{380, 567, 1.5},
		{699, 493, 1.5},
	} {
		p, err := complement.ComplementaryPair(obs, whiteD65, tc.nm)
		if err != nil {
			t.Errorf("%g nm: %v", tc.nm, err)
			continue
		}
		if !p.HasComplement || !scalar.EqualWithinAbsOrRel(p.ComplementNm, tc.want, tc.tol, 0) {
			t.Errorf("%g nm: complement %.2f nm (%v), want about %g nm", tc.nm, p.ComplementNm, p.HasComplement, tc.want)
		}
	}
	for _, white := range []colorimetry.XY{whiteD65, whiteC, whiteE} {
		for nm := 500.0; nm <= 560; nm += 10 {
			p, err := complement.ComplementaryPair(obs, white, nm)
			if err != nil {
				t.Fatal(err)
			}
			if p.HasComplement || p.ComplementNm != 0 || p.PowerRatio != 0 || p.LuminanceRatio != 0 {
				t.Errorf("white %v, green %g nm: got complement %+v, want none", white, nm, p)
			}
		}
	}
}

// TestComplementaryPairInvariants checks, over 380–690 nm at 5 nm for
// both CIE observers and three whites, the properties that define the
// table (mathematical invariants):
//   - the mixture XYZ(λ) + PowerRatio·XYZ(λc), with XYZ the observer's
//     functions, has the white's chromaticity to 1e-9 in x and y (the
//     solution is exact up to round-off);
//   - the relation is an involution: the complement of λc is λ again, to
//     1e-6 nm (the wavelength is refined by bisection to about 1e-9 nm);
//   - the power ratios of λ and λc are reciprocal, to 1e-7 relative (the
//     same mixture seen from either end);
//   - LuminanceRatio = PowerRatio·ȳ(λc)/ȳ(λ), to 1e-12 relative.
//
// It also checks λc against the spectrum-locus helper of package
// colorimetry, which interpolates linearly between the 1 nm rows, to
// 0.05 nm (a consistency check between the two routes, not an outside
// value).
func TestComplementaryPairInvariants(t *testing.T) {
	t.Parallel()
	for _, obs := range []*colorimetry.Observer{cie.CIE1931(), cie.CIE1964()} {
		locus, err := colorimetry.NewSpectrumLocus(obs)
		if err != nil {
			t.Fatal(err)
		}
		for _, white := range []colorimetry.XY{whiteD65, whiteC, whiteE} {
			some := false
			for nm := 380.0; nm <= 690; nm += 5 {
				p, err := complement.ComplementaryPair(obs, white, nm)
				if err != nil {
					t.Fatalf("%s, white %v, %g nm: %v", obs.Name(), white, nm, err)
				}
				if !p.HasComplement {
					continue
				}
				some = true
				a, b := cmfAt(obs, nm), cmfAt(obs, p.ComplementNm)
				mix, err := a.Add(b.Scale(p.PowerRatio)).XY()
				if err != nil {
					t.Fatal(err)
				}
				if d := math.Hypot(mix.X-white.X, mix.Y-white.Y); d > 1e-9 || !(p.PowerRatio > 0) {
					t.Errorf("%s, white %v, %g nm: mixture with %g × %.6f nm at (%g, %g), %g from the white",
						obs.Name(), white, nm, p.PowerRatio, p.ComplementNm, mix.X, mix.Y, d)
				}
				back, err := complement.ComplementaryPair(obs, white, p.ComplementNm)
				if err != nil {
					t.Fatal(err)
				}
				if !back.HasComplement || !scalar.EqualWithinAbsOrRel(back.ComplementNm, nm, 1e-6, 0) {
					t.Errorf("%s, white %v: %g nm → %.9f nm → %.9f nm", obs.Name(), white, nm, p.ComplementNm, back.ComplementNm)
				}
				if !scalar.EqualWithinAbsOrRel(p.PowerRatio*back.PowerRatio, 1, 0, 1e-7) {
					t.Errorf("%s, white %v, %g nm: power ratios %g and %g are not reciprocal", obs.Name(), white, nm, p.PowerRatio, back.PowerRatio)
				}
				if want := p.PowerRatio * b.Y / a.Y; !scalar.EqualWithinAbsOrRel(p.LuminanceRatio, want, 0, 1e-12) {
					t.Errorf("%s, white %v, %g nm: luminance ratio %g, want %g", obs.Name(), white, nm, p.LuminanceRatio, want)
				}
				lc, ok, err := locus.Complementary(nm, white)
				if err != nil || !ok {
					t.Errorf("%s, white %v, %g nm: locus helper: %v, %v", obs.Name(), white, nm, ok, err)
				} else if !scalar.EqualWithinAbsOrRel(p.ComplementNm, lc, 0.05, 0) {
					t.Errorf("%s, white %v, %g nm: complement %.4f nm, locus helper %.4f nm", obs.Name(), white, nm, p.ComplementNm, lc)
				}
			}
			if !some {
				t.Errorf("%s, white %v: no wavelength has a complement", obs.Name(), white)
			}
		}
	}
}

// TestComplementaryWavelengthsTable checks that the table has one row per
// grid wavelength, each equal to the single-wavelength result, and that
// the rows without a complement form one run of greens (the purple line
// subtends one range of the locus as seen from the white; CIE 015:2018
// §9.1).
func TestComplementaryWavelengthsTable(t *testing.T) {
	t.Parallel()
	obs := cie.CIE1931()
	g := colorimetry.Grid5nm
	rows, err := complement.ComplementaryWavelengths(obs, whiteD65, g)
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != g.N {
		t.Fatalf("%d rows, want %d", len(rows), g.N)
	}
	runs := 0
	for i, r := range rows {
		want, err := complement.ComplementaryPair(obs, whiteD65, g.Wavelength(i))
		if err != nil {
			t.Fatal(err)
		}
		if r != want {
			t.Errorf("row %d: %+v, single wavelength gives %+v", i, r, want)
		}
		if !r.HasComplement && (i == 0 || rows[i-1].HasComplement) {
			runs++
			if r.Nm < 490 || r.Nm > 500 {
				t.Errorf("run of greens without a complement starts at %g nm, want 490–500 nm", r.Nm)
			}
		}
	}
	if runs != 1 {
		t.Errorf("%d runs of wavelengths without a complement, want 1", runs)
	}
}

// TestWavelengthPairJSON checks the JSON convention of DESIGN.md: keys
// that do not apply are null, never absent; the others carry the fields'
// values.
func TestWavelengthPairJSON(t *testing.T) {
	t.Parallel()
	for _, nm := range []float64{450, 520} {
		p, err := complement.ComplementaryPair(cie.CIE1931(), whiteD65, nm)
		if err != nil {
			t.Fatal(err)
		}
		b, err := json.Marshal(p)
		if err != nil {
			t.Fatal(err)
		}
		var got map[string]any
		if err := json.Unmarshal(b, &got); err != nil {
			t.Fatal(err)
		}
		want := map[string]any{"wavelength_nm": nm, "complement_nm": nil, "power_ratio": nil, "luminance_ratio": nil}
		if p.HasComplement {
			want["complement_nm"], want["power_ratio"], want["luminance_ratio"] = p.ComplementNm, p.PowerRatio, p.LuminanceRatio
		}
		if len(got) != len(want) {
			t.Errorf("%g nm: JSON %s has %d keys, want %d", nm, b, len(got), len(want))
		}
		for k, w := range want {
			if v, ok := got[k]; !ok || v != w {
				t.Errorf("%g nm: JSON %s: %s = %v, want %v", nm, b, k, v, w)
			}
		}
	}
}

// TestComplementaryWavelengthErrors checks that bad input is reported as
// an error that says what is wrong.
func TestComplementaryWavelengthErrors(t *testing.T) {
	t.Parallel()
	obs := cie.CIE1931()
	for _, tc := range []struct {
		name  string
		obs   *colorimetry.Observer
		white colorimetry.XY
		nm    float64
		want  error
	}{
		{"below the table", obs, whiteD65, 300, colorimetry.ErrCoverage},
		{"above the table", obs, whiteD65, 900, colorimetry.ErrCoverage},
		{"NaN wavelength", obs, whiteD65, math.NaN(), colorimetry.ErrNotFinite},
		{"NaN white", obs, colorimetry.XY{X: math.NaN(), Y: 0.3}, 500, colorimetry.ErrNotFinite},
		{"white with y = 0", obs, colorimetry.XY{X: 0.3, Y: 0}, 500, colorimetry.ErrOutOfGamut},
		{"white outside the locus", obs, colorimetry.XY{X: 0.7, Y: 0.6}, 450, colorimetry.ErrOutOfGamut},
		{"nil observer", nil, whiteD65, 500, nil},
	} {
		_, err := complement.ComplementaryPair(tc.obs, tc.white, tc.nm)
		if err == nil || tc.want != nil && !errors.Is(err, tc.want) {
			t.Errorf("%s: got %v, want %v", tc.name, err, tc.want)
		}
	}
	if _, err := complement.ComplementaryWavelengths(obs, whiteD65, colorimetry.Grid{Start: 300, Step: 10, N: 20}); !errors.Is(err, colorimetry.ErrCoverage) {
		t.Errorf("grid below the table: got %v, want ErrCoverage", err)
	}
	if _, err := complement.ComplementaryWavelengths(obs, whiteD65, colorimetry.Grid{}); !errors.Is(err, colorimetry.ErrBadGrid) {
		t.Errorf("zero grid: got %v, want ErrBadGrid", err)
	}
}
