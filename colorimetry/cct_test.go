package colorimetry_test

import (
	"encoding/csv"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"pgregory.net/rapid"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// planckianTable returns the cached table for obs and c2 or stops the test.
func planckianTable(t testing.TB, obs *colorimetry.Observer, c2 float64) *colorimetry.PlanckianTable {
	t.Helper()
	tb, err := colorimetry.NewPlanckianTable(obs, c2)
	if err != nil {
		t.Fatal(err)
	}
	return tb
}

// lightUV returns the CIE 1960 chromaticity of the light s seen by obs,
// summed on grid g with light weights.
func lightUV(t testing.TB, obs *colorimetry.Observer, s colorimetry.Spectrum, g colorimetry.Grid) colorimetry.UV {
	t.Helper()
	w, err := colorimetry.NewLightWeights(obs, g)
	if err != nil {
		t.Fatal(err)
	}
	c, err := w.XYZ(s)
	if err != nil {
		t.Fatal(err)
	}
	uv, err := c.UV()
	if err != nil {
		t.Fatal(err)
	}
	return uv
}

// TestCCTBlackbody checks the definition of correlated colour temperature
// (CIE 015:2018 §9.5): a Planckian radiator at T has CCT T and Duv 0. The
// radiators are computed by Planck's law (colorimetry.Blackbody) on
// Grid1nm with light weights, with the same observer and c2 as the table.
// Tolerances: 0.5 K and |Duv| < 1e-5 for Ohno's method, as the issue asks
// (measured: below 1e-6 K and 1e-11). Robertson's method interpolates
// between rows 10–25 MK⁻¹ apart and is good to a few kelvin, not to 0.5
// K; it is held to 0.06 MK⁻¹ and |Duv| ≤ 2e-4 (measured, 1700–20 000 K:
// 0.045 MK⁻¹, which is 13.7 K at 20 000 K, and |Duv| ≤ 1e-4).
func TestCCTBlackbody(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name      string
		obs       *colorimetry.Observer
		c2        float64
		robertson bool
	}{
		{"CIE 1931, c2 CIE", cie.CIE1931(), colorimetry.C2, true},
		{"CIE 1931, c2 CODATA", cie.CIE1931(), colorimetry.C2CODATA, true},
		{"CIE 1964, c2 CIE", cie.CIE1964(), colorimetry.C2, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			tb := planckianTable(t, tc.obs, tc.c2)
			var maxT, maxDuv, maxMired, maxRobK, maxRobDuv float64
			for k := 1000.0; k <= 20000; k += 250 {
				s, err := colorimetry.Blackbody(k, colorimetry.Grid1nm, tc.c2)
				if err != nil {
					t.Fatal(err)
				}
				uv := lightUV(t, tc.obs, s, colorimetry.Grid1nm)
				got, err := tb.CCT(uv, colorimetry.CCTOhno)
				if err != nil {
					t.Fatalf("%g K: %v", k, err)
				}
				if !scalar.EqualWithinAbsOrRel(got.Kelvin, k, 0.5, 0) || math.Abs(got.Duv) >= 1e-5 {
					t.Errorf("Ohno at %g K: got %.4f K, Duv %.2g", k, got.Kelvin, got.Duv)
				}
				maxT = math.Max(maxT, math.Abs(got.Kelvin-k))
				maxDuv = math.Max(maxDuv, math.Abs(got.Duv))
				if !tc.robertson || k < 1700 {
					continue // Robertson's table ends at 600 MK⁻¹ (1667 K)
				}
				r, err := tb.CCT(uv, colorimetry.CCTRobertson)
				if err != nil {
					t.Fatalf("Robertson at %g K: %v", k, err)
				}
				dm := math.Abs(1e6/r.Kelvin - 1e6/k)
				if dm > 0.06 || math.Abs(r.Duv) > 2e-4 {
					t.Errorf("Robertson at %g K: got %.2f K (%.3f MK⁻¹ off), Duv %.2g", k, r.Kelvin, dm, r.Duv)
				}
				maxMired = math.Max(maxMired, dm)
				maxRobK = math.Max(maxRobK, math.Abs(r.Kelvin-k))
				maxRobDuv = math.Max(maxRobDuv, math.Abs(r.Duv))
			}
			t.Logf("Ohno: max |ΔT| %.2g K, max |Duv| %.2g; Robertson: max %.3g MK⁻¹, %.3g K, |Duv| %.2g",
				maxT, maxDuv, maxMired, maxRobK, maxRobDuv)
		})
	}
}

// TestCCTIlluminants checks standard illuminants.
//
//   - A is Planck's law at 2848 K with c2 = 1.435×10⁻² m·K (ISO/CIE
//     11664-2:2022), so with c2 = 1.4388×10⁻² its CCT is exactly
//     2848·1.4388/1.435 = 2855.54 K and its Duv 0 (CIE 015:2018 quotes
//     about 2856 K, from memory). Tolerance 0.5 K, as the issue asks
//     (measured: 0.001 K).
//   - D65 (the CIE 1 nm table, ISO/CIE 11664-2:2022 Table B.1): CCT about
//     6504 K and Duv about +0.0032 (CIE 015:2018 and Ohno 2014, from
//     memory; 6504 K is the nominal 6500·1.4388/1.4380). Measured: 6502.71
//     K, +0.00321 on 360–830 nm at 1 nm; 6503.00 K on 380–780 nm at 5 nm.
//     Tolerance 1.5 K and 0.0002, as the issue asks: the published 6504 K
//     is the nominal temperature, and the grid alone moves the result by
//     about 1 K.
//   - D50 (CIE 015:2018, from memory: CCT 5003 K, the nominal
//     5000·1.4388/1.4380 = 5002.8 K), on its 5 nm grid. Measured:
//     5001.69 K, Duv +0.00321. Same tolerances as D65.
func TestCCTIlluminants(t *testing.T) {
	t.Parallel()
	obs := cie.CIE1931()
	tb := planckianTable(t, obs, colorimetry.C2)
	formulaA, err := colorimetry.Blackbody(2848, colorimetry.Grid1nm, 1.435e-2)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name          string
		s             colorimetry.Spectrum
		g             colorimetry.Grid
		kelvin, tolK  float64
		duv, tolDuv   float64
		robertsonTolK float64
	}{
		{"A by Planck's law", formulaA, colorimetry.Grid1nm, 2848 * 1.4388 / 1.435, 0.5, 0, 1e-5, 0.5},
		{"A from package cie", cie.A(), colorimetry.Grid1nm, 2848 * 1.4388 / 1.435, 0.5, 0, 1e-5, 0.5},
		{"D65, 1 nm 360–830", cie.D65(), colorimetry.Grid1nm, 6504, 1.5, 0.0032, 0.0002, 3},
		{"D65, 5 nm 380–780", cie.D65(), colorimetry.Grid5nm, 6504, 1.5, 0.0032, 0.0002, 3},
		{"D50, 5 nm 380–780", cie.D50(), colorimetry.Grid5nm, 5003, 1.5, 0.0032, 0.0002, 3},
	} {
		uv := lightUV(t, obs, tc.s, tc.g)
		got, err := tb.CCT(uv, colorimetry.CCTOhno)
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		if !scalar.EqualWithinAbsOrRel(got.Kelvin, tc.kelvin, tc.tolK, 0) ||
			!scalar.EqualWithinAbsOrRel(got.Duv, tc.duv, tc.tolDuv, 0) {
			t.Errorf("%s: got %.3f K, Duv %.5f; want %.2f ± %g K, Duv %.4f ± %g",
				tc.name, got.Kelvin, got.Duv, tc.kelvin, tc.tolK, tc.duv, tc.tolDuv)
		}
		// Robertson's method agrees with Ohno's within its own accuracy
		// (a few kelvin; measured 0.07 K for A, 0.64 K for D65).
		r, err := tb.CCT(uv, colorimetry.CCTRobertson)
		if err != nil {
			t.Errorf("%s, Robertson: %v", tc.name, err)
			continue
		}
		if !scalar.EqualWithinAbsOrRel(r.Kelvin, got.Kelvin, tc.robertsonTolK, 0) {
			t.Errorf("%s: Robertson %.3f K, Ohno %.3f K", tc.name, r.Kelvin, got.Kelvin)
		}
		t.Logf("%s: Ohno %.3f K, Duv %+.5f; Robertson %.3f K, Duv %+.5f", tc.name, got.Kelvin, got.Duv, r.Kelvin, r.Duv)
	}
}

// TestCCTRadiationConstant checks that the choice of c2 only rescales the
// temperature: Planck's law depends on λT/c2 alone, so a chromaticity has
// CCT·c2′/c2 under c2′ and the same Duv. Tolerance 1e-7 relative and 1e-9
// in Duv, the accuracy of the method (see TestCCTRoundTrip).
func TestCCTRadiationConstant(t *testing.T) {
	t.Parallel()
	obs := cie.CIE1931()
	cie2 := planckianTable(t, obs, colorimetry.C2)
	codata := planckianTable(t, obs, colorimetry.C2CODATA)
	for _, tc := range []struct{ kelvin, duv float64 }{
		{1200, 0.01}, {2855.54, 0}, {4000, -0.003}, {6504, 0.0032}, {25000, -0.04}, {90000, 0.001},
	} {
		uv, err := cie2.UV(tc.kelvin, tc.duv)
		if err != nil {
			t.Fatal(err)
		}
		a, errA := cie2.CCT(uv, colorimetry.CCTOhno)
		b, errB := codata.CCT(uv, colorimetry.CCTOhno)
		if errA != nil || errB != nil {
			t.Fatalf("%g K: %v, %v", tc.kelvin, errA, errB)
		}
		want := a.Kelvin * colorimetry.C2CODATA / colorimetry.C2
		if !scalar.EqualWithinAbsOrRel(b.Kelvin, want, 0, 1e-7) || !scalar.EqualWithinAbsOrRel(b.Duv, a.Duv, 1e-9, 0) {
			t.Errorf("%g K: CODATA gives %.5f K, Duv %.7f; want %.5f K, Duv %.7f", tc.kelvin, b.Kelvin, b.Duv, want, a.Duv)
		}
	}
}

// drawKelvin draws a temperature spread evenly in ln T over lo–hi K.
func drawKelvin(t *rapid.T, lo, hi float64) float64 {
	return math.Exp(rapid.Float64Range(math.Log(lo), math.Log(hi)).Draw(t, "lnT"))
}

// TestCCTRoundTrip checks that CCT inverts UV: the point at T and Duv on
// the normal to the Planckian locus (the definition of Duv, Ohno 2014)
// comes back as T and Duv. Tolerance 1e-6 relative in T (0.1 K at 100 000
// K, a fifth of the 0.5 K the issue asks; measured: 6e-8) and 1e-8 in Duv
// (measured: 1e-11).
func TestCCTRoundTrip(t *testing.T) {
	t.Parallel()
	for _, obs := range []*colorimetry.Observer{cie.CIE1931(), cie.CIE1964()} {
		tb := planckianTable(t, obs, colorimetry.C2)
		rapid.Check(t, func(t *rapid.T) {
			k := drawKelvin(t, colorimetry.CCTMin, colorimetry.CCTMax)
			duv := rapid.Float64Range(-colorimetry.DuvMax, colorimetry.DuvMax).Draw(t, "duv")
			uv, err := tb.UV(k, duv)
			if err != nil {
				t.Fatal(err)
			}
			got, err := tb.CCT(uv, colorimetry.CCTOhno)
			if err != nil {
				t.Fatal(err)
			}
			if !scalar.EqualWithinAbsOrRel(got.Kelvin, k, 0, 1e-6) || !scalar.EqualWithinAbsOrRel(got.Duv, duv, 1e-8, 0) {
				t.Fatalf("%s: (%.6f K, %.7f) came back as (%.6f K, %.7f)", obs.Name(), k, duv, got.Kelvin, got.Duv)
			}
		})
	}
}

// TestCCTSwitchContinuity checks that the CCT does not jump where Ohno's
// combined method changes from the triangular to the parabolic solution
// (|Duv| = 0.002, Ohno 2014). Two points on one normal of the locus, just
// either side of the switch, must agree within 0.05 K: a tenth of the
// 0.5 K accuracy the issue asks (measured: below 0.01 K).
func TestCCTSwitchContinuity(t *testing.T) {
	t.Parallel()
	tb := planckianTable(t, cie.CIE1931(), colorimetry.C2)
	rapid.Check(t, func(t *rapid.T) {
		k := drawKelvin(t, colorimetry.CCTMin, colorimetry.CCTMax)
		sign := float64(rapid.SampledFrom([]float64{-1, 1}).Draw(t, "sign"))
		eps := rapid.Float64Range(1e-9, 1e-6).Draw(t, "eps")
		var got [2]colorimetry.CCT
		for i, duv := range [2]float64{sign * (0.002 - eps), sign * (0.002 + eps)} {
			uv, err := tb.UV(k, duv)
			if err != nil {
				t.Fatal(err)
			}
			if got[i], err = tb.CCT(uv, colorimetry.CCTOhno); err != nil {
				t.Fatal(err)
			}
		}
		if d := math.Abs(got[1].Kelvin - got[0].Kelvin); d > 0.05 {
			t.Fatalf("at %.3f K, Duv ±0.002: jump of %.4f K (%.4f → %.4f)", k, d, got[0].Kelvin, got[1].Kelvin)
		}
	})
}

// TestCCTOutOfRange checks the limits of CIE 015:2018 §9.5 (1000–100 000
// K, |Duv| ≤ 0.05): outside them CCT returns a *CCTRangeError that carries
// the value computed anyway, within 1 % of the temperature used to build
// the chromaticity and 1e-4 of its Duv (a warning needs no more).
func TestCCTOutOfRange(t *testing.T) {
	t.Parallel()
	obs := cie.CIE1931()
	tb := planckianTable(t, obs, colorimetry.C2)
	blackbody := func(k float64) colorimetry.UV {
		s, err := colorimetry.Blackbody(k, colorimetry.Grid1nm, colorimetry.C2)
		if err != nil {
			t.Fatal(err)
		}
		return lightUV(t, obs, s, colorimetry.Grid1nm)
	}
	// offLocus extrapolates along the normal at k to Duv duv, beyond
	// what UV accepts.
	offLocus := func(k, duv float64) colorimetry.UV {
		p0, err0 := tb.UV(k, 0)
		p1, err1 := tb.UV(k, 0.05)
		if err0 != nil || err1 != nil {
			t.Fatal(err0, err1)
		}
		f := duv / 0.05
		return colorimetry.UV{U: p0.U + f*(p1.U-p0.U), V: p0.V + f*(p1.V-p0.V)}
	}
	for _, tc := range []struct {
		name        string
		uv          colorimetry.UV
		kelvin, duv float64
	}{
		{"900 K", blackbody(900), 900, 0},
		{"200 000 K", blackbody(200000), 200000, 0},
		{"Duv +0.06", offLocus(5000, 0.06), 5000, 0.06},
		{"Duv −0.06", offLocus(3000, -0.06), 3000, -0.06},
	} {
		_, err := tb.CCT(tc.uv, colorimetry.CCTOhno)
		var re *colorimetry.CCTRangeError
		if !errors.Is(err, colorimetry.ErrCCTRange) || !errors.As(err, &re) {
			t.Errorf("%s: got error %v, want a *CCTRangeError", tc.name, err)
			continue
		}
		if re.Beyond || !scalar.EqualWithinAbsOrRel(re.CCT.Kelvin, tc.kelvin, 0, 0.01) || !scalar.EqualWithinAbsOrRel(re.CCT.Duv, tc.duv, 1e-4, 0) {
			t.Errorf("%s: error carries %+v (beyond %v)", tc.name, re.CCT, re.Beyond)
		}
	}

	// Beyond the table's ends the value is only a bound.
	_, err := tb.CCT(blackbody(400), colorimetry.CCTOhno)
	var re *colorimetry.CCTRangeError
	if !errors.As(err, &re) || !re.Beyond || re.CCT.Kelvin > 500 {
		t.Errorf("400 K: got %v", err)
	}

	// Robertson's table ends at 600 MK⁻¹ (1667 K; Robertson 1968 Table 1).
	if _, err := tb.CCT(blackbody(1500), colorimetry.CCTRobertson); !errors.Is(err, colorimetry.ErrCCTRange) {
		t.Errorf("Robertson at 1500 K: got %v, want ErrCCTRange", err)
	}
	// Robertson's table is for the CIE 1931 observer only.
	tb64 := planckianTable(t, cie.CIE1964(), colorimetry.C2)
	if _, err := tb64.CCT(colorimetry.UV{U: 0.2, V: 0.31}, colorimetry.CCTRobertson); !errors.Is(err, colorimetry.ErrRobertsonObserver) {
		t.Errorf("Robertson with CIE 1964: got %v, want ErrRobertsonObserver", err)
	}

	for _, tc := range []struct {
		name   string
		k, duv float64
		want   error
	}{
		{"UV below 1000 K", 900, 0, colorimetry.ErrCCTRange},
		{"UV above 100 000 K", 200000, 0, colorimetry.ErrCCTRange},
		{"UV at Duv 0.06", 5000, 0.06, colorimetry.ErrCCTRange},
		{"UV at NaN", math.NaN(), 0, colorimetry.ErrNotFinite},
	} {
		if _, err := tb.UV(tc.k, tc.duv); !errors.Is(err, tc.want) {
			t.Errorf("%s: got %v, want %v", tc.name, err, tc.want)
		}
	}
	if _, err := tb.CCT(colorimetry.UV{U: math.NaN(), V: 0.3}, colorimetry.CCTOhno); !errors.Is(err, colorimetry.ErrNotFinite) {
		t.Errorf("CCT of NaN: got %v, want ErrNotFinite", err)
	}
	if _, err := colorimetry.NewPlanckianTable(obs, -1); err == nil {
		t.Error("NewPlanckianTable with c2 < 0: no error")
	}
}

// TestRobertsonRows checks the isotemperature lines typed into the code
// against /work/shared/reference/robertson_1968_isotemperature.csv
// (Robertson 1968 Table 1; Wyszecki & Stiles Table 1(3.11)): a point on
// row i's line, 0.01 from the locus, must give exactly row i's reciprocal
// temperature and |Duv| = 0.01. A digit wrong in u, v or t moves the line
// by at least 1e-5 and the temperature by more than 0.01 MK⁻¹; the
// tolerance, 1e-9 relative, is float round-off.
func TestRobertsonRows(t *testing.T) {
	t.Parallel()
	f, err := os.Open("../../shared/reference/robertson_1968_isotemperature.csv")
	if err != nil {
		t.Skipf("reference data absent: %v", err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 32 {
		t.Fatalf("got %d lines, want a header and 31 rows", len(rows))
	}
	tb := planckianTable(t, cie.CIE1931(), colorimetry.C2)
	for _, r := range rows[1:] {
		var v [4]float64
		for j := range v {
			if v[j], err = strconv.ParseFloat(r[j], 64); err != nil {
				t.Fatal(err)
			}
		}
		mired, u0, v0, slope := v[0], v[1], v[2], v[3]
		if mired < 10 {
			continue // T = ∞, outside every range
		}
		for _, side := range []float64{-1, 1} {
			n := side * 0.01 / math.Sqrt(1+slope*slope)
			got, err := tb.CCT(colorimetry.UV{U: u0 + n, V: v0 + n*slope}, colorimetry.CCTRobertson)
			if err != nil {
				t.Errorf("%g MK⁻¹: %v", mired, err)
				continue
			}
			if !scalar.EqualWithinAbsOrRel(1e6/got.Kelvin, mired, 0, 1e-9) || !scalar.EqualWithinAbsOrRel(math.Abs(got.Duv), 0.01, 1e-9, 0) {
				t.Errorf("%g MK⁻¹, side %g: got %.6f MK⁻¹, Duv %.6f", mired, side, 1e6/got.Kelvin, got.Duv)
			}
		}
	}
}

// TestRobertsonLocus checks Robertson's rows against Planck's law: at each
// row's temperature the Planckian point (PlanckianTable.UV with Duv 0)
// must give that temperature back by Robertson's method. The rows are
// printed to 5 decimals (Robertson 1968 Table 1), so a row may sit up to
// √2·5e-6 from the locus; the tolerance is that distance divided by the
// local speed of the locus per MK⁻¹ (0.1 MK⁻¹ near 10 MK⁻¹, 0.01 MK⁻¹
// near 500 MK⁻¹).
func TestRobertsonLocus(t *testing.T) {
	t.Parallel()
	tb := planckianTable(t, cie.CIE1931(), colorimetry.C2)
	uvAt := func(mired float64) colorimetry.UV {
		uv, err := tb.UV(1e6/mired, 0)
		if err != nil {
			t.Fatal(err)
		}
		return uv
	}
	for _, mired := range []float64{10, 20, 50, 100, 150, 200, 250, 300, 350, 400, 450, 500, 550, 575} {
		a, b := uvAt(mired), uvAt(mired+1)
		tol := math.Sqrt2 * 5e-6 / math.Hypot(b.U-a.U, b.V-a.V)
		got, err := tb.CCT(uvAt(mired), colorimetry.CCTRobertson)
		if err != nil {
			t.Fatalf("%g MK⁻¹: %v", mired, err)
		}
		if d := math.Abs(1e6/got.Kelvin - mired); d > tol || math.Abs(got.Duv) > 1e-5 {
			t.Errorf("%g MK⁻¹: got %.4f MK⁻¹ (tolerance %.4f), Duv %.2g", mired, 1e6/got.Kelvin, tol, got.Duv)
		}
	}
}

// sinkCCT keeps the benchmark's result alive.
var sinkCCT colorimetry.CCT

func BenchmarkCCT(b *testing.B) {
	tb := planckianTable(b, cie.CIE1931(), colorimetry.C2)
	rng := rand.New(rand.NewPCG(1, 1))
	pts := make([]colorimetry.UV, 1024)
	for i := range pts {
		k := math.Exp(math.Log(1000) + rng.Float64()*math.Log(100))
		uv, err := tb.UV(k, 0.1*rng.Float64()-0.05)
		if err != nil {
			b.Fatal(err)
		}
		pts[i] = uv
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := range b.N {
		c, err := tb.CCT(pts[i%len(pts)], colorimetry.CCTOhno)
		if err != nil {
			b.Fatal(err)
		}
		sinkCCT = c
	}
}

// TestRobertsonTableFromPlanck reproduces u, v of the Robertson (1968)
// table typed into the library from Planck's law and the 1931 observer
// (1 nm, 360–830 nm, light weights, XYZ → u, v) to the printed 5 decimals
// (half a unit, 5e-6). Row 0 MK⁻¹ is the limit T → ∞, where the spectral
// power goes as λ⁻⁴.
func TestRobertsonTableFromPlanck(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid1nm
	var du, dv float64
	for _, r := range colorimetry.RobertsonRows() {
		var s colorimetry.Spectrum
		var err error
		if r[0] == 0 {
			v := make([]float64, g.N)
			for i := range v {
				v[i] = math.Pow(g.Wavelength(i)/560, -4)
			}
			s, err = colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
		} else {
			s, err = colorimetry.Blackbody(1e6/r[0], g, colorimetry.C2)
		}
		if err != nil {
			t.Fatal(err)
		}
		uv := lightUV(t, cie.CIE1931(), s, g)
		du, dv = math.Max(du, math.Abs(uv.U-r[1])), math.Max(dv, math.Abs(uv.V-r[2]))
		if !scalar.EqualWithinAbs(uv.U, r[1], 5e-6) || !scalar.EqualWithinAbs(uv.V, r[2], 5e-6) {
			t.Errorf("%g MK⁻¹: u, v = %.6f, %.6f, Robertson (1968) %.5f, %.5f", r[0], uv.U, uv.V, r[1], r[2])
		}
	}
	t.Logf("Robertson (1968) u, v: largest |Δu| %.2g, |Δv| %.2g", du, dv)
}
