package mixing

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestHalftoneOneInk checks the one-ink equations against identities
// that hold by their definitions and against the limits of the power mean.
func TestHalftoneOneInk(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name             string
		got, want, tol   float64
		source           string
		absolute, strict bool
	}{
		// n = 1 reduces Yule–Nielsen to Murray–Davies (Yule & Nielsen 1951,
		// by the equation; to rounding of the powers).
		{name: "n=1 a=0.3", got: YuleNielsen(0.85, 0.05, 0.3, 1), want: MurrayDavies(0.85, 0.05, 0.3), tol: 1e-15},
		{name: "n=1 a=0.77", got: YuleNielsen(0.9, 0.12, 0.77, 1), want: MurrayDavies(0.9, 0.12, 0.77), tol: 1e-15},
		// The ends give paper and solid exactly (Murray 1936, the equation).
		{name: "a=0", got: YuleNielsen(0.85, 0.05, 0, 2.3), want: 0.85, tol: 0},
		{name: "a=1", got: YuleNielsen(0.85, 0.05, 1, 2.3), want: 0.05, tol: 0},
		{name: "MD a=0", got: MurrayDavies(0.85, 0.05, 0), want: 0.85, tol: 0},
		{name: "MD a=1", got: MurrayDavies(0.85, 0.05, 1), want: 0.05, tol: 0},
		// n → ∞: the power mean tends to the geometric mean,
		// paper^(1−a)·solid^a (Hardy, Littlewood and Pólya, Inequalities,
		// 1934, §2.3: from memory); the error is O(1/n), 1e-5 at n = 1e6.
		{name: "n→∞", got: YuleNielsen(0.85, 0.05, 0.4, 1e6), want: math.Pow(0.85, 0.6) * math.Pow(0.05, 0.4), tol: 1e-5},
		// Worked by hand from the equation: [(0.5·0.81^(1/2) + 0.5·0.01^(1/2)]²
		// = (0.45 + 0.05)² = 0.25.
		{name: "n=2 by hand", got: YuleNielsen(0.81, 0.01, 0.5, 2), want: 0.25, tol: 1e-15},
	} {
		if !scalar.EqualWithinAbsOrRel(c.got, c.want, c.tol, c.tol) {
			t.Errorf("%s: got %.17g, want %.17g (tol %g)", c.name, c.got, c.want, c.tol)
		}
	}
	// The power mean falls as its exponent 1/n falls (power-mean
	// inequality, Hardy, Littlewood and Pólya 1934, §2.9: from memory), so
	// the Yule–Nielsen reflectance falls as n rises.
	prev := math.Inf(1)
	for _, n := range []float64{1, 1.2, 1.7, 2.5, 4, 7, 10} {
		r := YuleNielsen(0.88, 0.03, 0.45, n)
		if !(r < prev) {
			t.Errorf("n %g: R %g not below %g", n, r, prev)
		}
		prev = r
	}
}

// TestToneValueDensityForm checks YuleNielsenCoverage with n = 1 against
// the Murray–Davies tone value written with densities relative to the
// paper, a = (1 − 10^−Dt)/(1 − 10^−Ds) (ISO 12647-1; from memory). The
// reflectances are 10^−D on a paper of reflectance 1 and, scaled, on a
// paper of 0.87 (the relative densities do not change).
func TestToneValueDensityForm(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		dt, ds, paper float64
		tol           float64
	}{
		{0.5, 1.5, 1, 1e-14},
		{0.2, 1.4, 0.87, 1e-14},
		{0.05, 1.8, 0.9, 1e-13},
		{1.2, 1.6, 0.8, 1e-14},
	} {
		want := (1 - math.Pow(10, -c.dt)) / (1 - math.Pow(10, -c.ds))
		got, err := YuleNielsenCoverage(c.paper, c.paper*math.Pow(10, -c.ds), c.paper*math.Pow(10, -c.dt), 1)
		if err != nil || !scalar.EqualWithinAbsOrRel(got, want, c.tol, c.tol) {
			t.Errorf("Dt %g Ds %g: %v %v, want %.15g", c.dt, c.ds, got, err, want)
		}
	}
	// 0.5 and 1.5 give 0.70610 (the formula, to 5 decimals).
	got, _ := YuleNielsenCoverage(1, math.Pow(10, -1.5), math.Pow(10, -0.5), 1)
	if math.Abs(got-0.70610) > 5e-6 {
		t.Errorf("tone value %v, want 0.70610", got)
	}
	// Round trip through YuleNielsen for several n (the inverse by
	// algebra; 1e-12 for the powers' rounding).
	for _, n := range []float64{1, 1.6, 3, 9.5} {
		for _, a := range []float64{0, 0.05, 0.5, 0.93, 1} {
			r := YuleNielsen(0.86, 0.04, a, n)
			back, err := YuleNielsenCoverage(0.86, 0.04, r, n)
			if err != nil || math.Abs(back-a) > 1e-12 {
				t.Errorf("n %g a %g: back %v %v", n, a, back, err)
			}
		}
	}
	for _, bad := range [][4]float64{{0.5, 0.5, 0.4, 1}, {0.9, -0.1, 0.4, 1}, {0.9, 0.1, math.NaN(), 1}, {0.9, 0.1, 0.4, 0.5}, {0.9, 0.1, 0.4, 11}} {
		if _, err := YuleNielsenCoverage(bad[0], bad[1], bad[2], bad[3]); err == nil {
			t.Errorf("%v: no error", bad)
		}
	}
}

// TestDemichel checks the Demichel weights: they are the terms of the
// expansion of Πᵢ((1 − aᵢ) + aᵢ) = 1 and so sum to 1 (mathematical
// invariant); the two-ink case is written out as Demichel wrote it
// (paper (1−a₁)(1−a₂), ink 1 a₁(1−a₂), ink 2 (1−a₁)a₂, overprint a₁a₂;
// Wyble and Berns, Color Res. Appl. 25(1), 4–19, 2000: from memory).
func TestDemichel(t *testing.T) {
	t.Parallel()
	w := DemichelTo(make([]float64, 4), []float64{0.3, 0.6})
	want := []float64{0.7 * 0.4, 0.3 * 0.4, 0.7 * 0.6, 0.3 * 0.6}
	for p := range w {
		if !scalar.EqualWithinAbsOrRel(w[p], want[p], 1e-16, 1e-15) {
			t.Errorf("two inks: w[%d] = %v, want %v", p, w[p], want[p])
		}
	}
	rng := rand.New(rand.NewPCG(1, 1))
	for k := 1; k <= 6; k++ {
		for range 50 {
			a := make([]float64, k)
			for i := range a {
				a[i] = rng.Float64()
			}
			w := DemichelTo(make([]float64, 1<<k), a)
			var sum float64
			for p, v := range w {
				sum += v
				// Each weight against its definition.
				prod := 1.0
				for i := range k {
					if p&(1<<i) != 0 {
						prod *= a[i]
					} else {
						prod *= 1 - a[i]
					}
				}
				if !scalar.EqualWithinAbsOrRel(v, prod, 1e-15, 1e-13) {
					t.Fatalf("k %d: w[%d] = %v, product %v", k, p, v, prod)
				}
			}
			// 1e-14: summation of 64 terms in float64.
			if math.Abs(sum-1) > 1e-14 {
				t.Errorf("k %d: weights sum to %.17g", k, sum)
			}
		}
	}
	defer func() {
		if recover() == nil {
			t.Error("wrong dst length did not panic")
		}
	}()
	DemichelTo(make([]float64, 3), []float64{0.1, 0.2})
}

// TestHalftoneForwardEnds checks that the model gives the measured
// primaries exactly at coverages 0 and 1 (the Demichel weights are then
// 0 or 1, by the equations), and that one ink at n = 1 without dot gain is
// Murray–Davies at every wavelength.
func TestHalftoneForwardEnds(t *testing.T) {
	t.Parallel()
	inks := []string{"c", "m", "y"}
	prim := htPrimaries(t, inks)
	for _, c := range []struct {
		name string
		n    []float64
		tol  float64 // powers x^(1/n)^n round to a few ulp
	}{
		{"one n", []float64{1.7}, 1e-14},
		{"per ink", []float64{1.4, 2.1, 3.3}, 1e-14},
		{"Neugebauer", []float64{1}, 0},
	} {
		gains := []DotGain{htTrueGain(t, 1.5), htTrueGain(t, 1.6), htTrueGain(t, 1.4)}
		m, err := NewHalftone(htGrid, inks, prim, c.n, gains, 0)
		if err != nil {
			t.Fatal(err)
		}
		for mask := range prim {
			nom := make([]float64, 3)
			for i := range nom {
				if mask&(1<<i) != 0 {
					nom[i] = 1
				}
			}
			r := m.ReflectanceTo(make([]float64, htGrid.N), nom)
			for j, v := range r {
				if want := prim[mask].Value(j); !scalar.EqualWithinAbsOrRel(v, want, c.tol, c.tol) {
					t.Errorf("%s: primary %s at %g nm: %.17g, want %.17g", c.name, PrimaryName(inks, mask), htGrid.Wavelength(j), v, want)
					break
				}
			}
		}
	}
	one, err := NewHalftone(htGrid, []string{"y"}, htPrimaries(t, []string{"y"}), []float64{1}, nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	p := one.Primaries()
	s, err := one.Reflectance([]Amount{{Name: "y", Value: 0.37}})
	if err != nil {
		t.Fatal(err)
	}
	for j := range htGrid.N {
		want := MurrayDavies(p[0].Value(j), p[1].Value(j), 0.37)
		if !scalar.EqualWithinAbsOrRel(s.Value(j), want, 1e-15, 1e-15) {
			t.Errorf("%g nm: %v, Murray–Davies %v", htGrid.Wavelength(j), s.Value(j), want)
		}
	}
	if _, err := one.Reflectance([]Amount{{Name: "y", Value: 40}}); err == nil || !strings.Contains(err.Error(), "0.4") {
		t.Errorf("coverage 40: %v", err)
	}
	if _, err := one.Reflectance([]Amount{{Name: "z", Value: 0.1}}); !errors.Is(err, ErrUnknownInk) {
		t.Errorf("unknown ink: %v", err)
	}
}

// TestDotGainCurve checks the curve's ends, monotonicity, inverse and
// validation.
func TestDotGainCurve(t *testing.T) {
	t.Parallel()
	d, err := NewDotGain([]float64{0, 0.25, 0.5, 0.75, 1}, []float64{0, 0.36, 0.67, 0.88, 1})
	if err != nil {
		t.Fatal(err)
	}
	// Through its knots exactly: a Fritsch–Butland curve interpolates
	// (Fritsch and Butland 1984; 1e-15 for rounding).
	for _, c := range [][2]float64{{0, 0}, {0.25, 0.36}, {0.5, 0.67}, {0.75, 0.88}, {1, 1}} {
		if got := d.Effective(c[0]); math.Abs(got-c[1]) > 1e-15 {
			t.Errorf("Effective(%g) = %v, want %v", c[0], got, c[1])
		}
	}
	if g := d.Gain(0.5); math.Abs(g-0.17) > 1e-15 {
		t.Errorf("gain at 50 %% %v, want 0.17", g)
	}
	// Monotone between the knots (Fritsch and Butland 1984, the method's
	// purpose).
	prev := -1.0
	for s := 0; s <= 1000; s++ {
		a := float64(s) / 1000
		e := d.Effective(a)
		if e < prev {
			t.Fatalf("not monotone at %g", a)
		}
		prev = e
		// The inverse to 1e-9 (bisection to 1e-12 in nominal; slope ≤ ~2).
		if back := d.Nominal(e); math.Abs(back-a) > 1e-9 {
			t.Fatalf("Nominal(Effective(%g)) = %v", a, back)
		}
	}
	var zero DotGain
	if zero.Effective(0.3) != 0.3 || zero.Nominal(0.3) != 0.3 || zero.Gain(0.3) != 0 {
		t.Error("zero DotGain is not the identity")
	}
	for _, bad := range [][2][]float64{
		{{0, 0.5, 1}, {0, 0.6}},
		{{0, 0.5, 0.5, 1}, {0, 0.6, 0.6, 1}},
		{{0, 0.5, 1}, {0, 0.6, 0.9}},
		{{0, 0.4, 0.6, 1}, {0, 0.6, 0.5, 1}},
		{{0.1, 0.5, 1}, {0, 0.6, 1}},
		{{0, math.NaN(), 1}, {0, 0.5, 1}},
	} {
		if _, err := NewDotGain(bad[0], bad[1]); err == nil {
			t.Errorf("%v: no error", bad)
		}
	}
}

// TestHalftoneFitRecovers checks that the fit recovers the n and the
// dot-gain curves that synthetic charts were made with (seeded noise):
// n within 0.1 as the issue asks, and the effective coverage at each ramp
// level within 0.01 (a tenth of the 10 % step of a ramp: common practice
// (no source)); held-out overprint tints within ΔE00 1 on average (the
// model is exact for these data, so only the noise is left).
func TestHalftoneFitRecovers(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name   string
		inks   []string
		n      []float64
		gammas []float64
		sigma  float64
		perInk bool
		nTol   float64
	}{
		{"cmyk n 1.8", []string{"c", "m", "y", "k"}, []float64{1.8}, []float64{1.52, 1.56, 1.45, 1.62}, 0.002, false, 0.1},
		{"cmy n 2.6", []string{"c", "m", "y"}, []float64{2.6}, []float64{1.3, 1.7, 1.5}, 0.002, false, 0.1},
		{"spot pair n 1.3", []string{"m", "orange"}, []float64{1.3}, []float64{1.4, 1.5}, 0.001, false, 0.1},
		{"per ink", []string{"c", "m", "y"}, []float64{1.5, 2.0, 2.6}, []float64{1.5, 1.5, 1.5}, 0.001, true, 0.1},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			press := htNewPress(t, c.inks, c.n, c.gammas, 0)
			chart := press.chart(t, c.sigma, 42)
			m, err := FitHalftone(c.inks, chart, HalftoneFitSettings{PerInk: c.perInk})
			if err != nil {
				t.Fatal(err)
			}
			n, se := m.NFactor()
			if len(n) != len(c.n) {
				t.Fatalf("%d factors, want %d", len(n), len(c.n))
			}
			for i := range n {
				if math.Abs(n[i]-c.n[i]) > c.nTol {
					t.Errorf("n[%d] = %.4f ± %.4f, want %g", i, n[i], se[i], c.n[i])
				}
				if !(se[i] > 0) {
					t.Errorf("n[%d]: no standard error", i)
				}
			}
			for i, d := range m.DotGains() {
				for _, l := range htLevelsPct {
					a := l / 100
					if got, want := d.Effective(a), htTrueEffective(c.gammas[i], a); math.Abs(got-want) > 0.01 {
						t.Errorf("%s at %g %%: effective %.4f, want %.4f", c.inks[i], l, got, want)
					}
				}
			}
			// The fitted model against the true one on the held-out
			// coverages: within ΔE00 0.5, the solve's tolerance (below what
			// most observers see side by side: common practice (no
			// source)).
			sc := NewScorer(cie.CIE1931(), cie.D50(), "D50")
			for _, s := range chart {
				if !s.HeldOut {
					continue
				}
				truth, err := press.model.Reflectance(s.Coverages)
				if err != nil {
					t.Fatal(err)
				}
				fit, err := m.Reflectance(s.Coverages)
				if err != nil {
					t.Fatal(err)
				}
				if de, _ := sc.ObjectDE00(truth, fit); de > 0.5 {
					t.Errorf("held-out %s: fitted model ΔE00 %.3f from the true one", s.Name, de)
				}
			}
			r := m.Report()
			if r.Illuminant != "D50" {
				t.Errorf("report under %q, want D50 by default", r.Illuminant)
			}
			if len(c.inks) > 1 && (r.HeldOut == nil || r.HeldOut.Mean > 1) {
				t.Errorf("held out: %+v", r.HeldOut)
			}
			if r.Training.Mean > 1 {
				t.Errorf("training ΔE00 mean %.3f", r.Training.Mean)
			}
			if len(m.PrimaryFits()) != 1<<len(c.inks) || len(m.InkFits()) != len(c.inks) {
				t.Errorf("summaries: %d primaries, %d inks", len(m.PrimaryFits()), len(m.InkFits()))
			}
			for _, w := range r.Warnings {
				t.Logf("warning: %s", w)
			}
		})
	}
}

// TestHalftoneNStdErr checks that the standard error of the fitted n is
// honest: over eight noise seeds the error of n stays within three
// standard errors (a normal error exceeds 3σ 0.3 % of the time), and the
// RMS of the errors in standard errors lies between 0.4 and 2 (the
// standard error comes from 24 simulated draws, good to about ±30 % at
// 95 %, χ² with 24 degrees of freedom; the rest of the margin for the
// eight seeds' own scatter).
func TestHalftoneNStdErr(t *testing.T) {
	t.Parallel()
	inks := []string{"c", "m", "y"}
	const n = 2.2
	press := htNewPress(t, inks, []float64{n}, []float64{1.3, 1.7, 1.5}, 0)
	var ss float64
	for seed := uint64(1); seed <= 8; seed++ {
		m, err := FitHalftone(inks, press.chart(t, 0.002, seed), HalftoneFitSettings{})
		if err != nil {
			t.Fatal(err)
		}
		nf, se := m.NFactor()
		z := (nf[0] - n) / se[0]
		if math.Abs(z) > 3 {
			t.Errorf("seed %d: n %.4f ± %.4f is %.1f standard errors from %g", seed, nf[0], se[0], z, n)
		}
		ss += z * z
	}
	if rms := math.Sqrt(ss / 8); rms < 0.4 || rms > 2 {
		t.Errorf("RMS error %.2f standard errors", rms)
	}
}

// TestHalftoneFitFixedN checks that a fixed n = 1 gives the spectral
// Neugebauer model, whose ramps then need more effective coverage than
// the truth of an n = 2 press (Murray–Davies overstates dot gain where
// light scatters under the dots: Yule and Nielsen 1951; mathematically,
// the power mean falls with n).
func TestHalftoneFitFixedN(t *testing.T) {
	t.Parallel()
	inks := []string{"c", "m"}
	press := htNewPress(t, inks, []float64{2}, []float64{1.5, 1.5}, 0)
	m, err := FitHalftone(inks, press.chart(t, 0, 1), HalftoneFitSettings{NFactor: 1})
	if err != nil {
		t.Fatal(err)
	}
	n, se := m.NFactor()
	if n[0] != 1 || se[0] != 0 {
		t.Errorf("n %v ± %v", n, se)
	}
	for i, d := range m.DotGains() {
		if d.Effective(0.5) <= htTrueEffective(1.5, 0.5) {
			t.Errorf("%s: effective at 50 %% %v not above the truth %v", inks[i], d.Effective(0.5), htTrueEffective(1.5, 0.5))
		}
	}
	if _, err := FitHalftone(inks, press.chart(t, 0, 1), HalftoneFitSettings{NFactor: 1, PerInk: true}); err == nil {
		t.Error("fixed n with per-ink n: no error")
	}
}

// TestHalftoneFitFlatInk checks the warning for a factor the data cannot
// determine: with a spectrally flat ink (the synthetic black) paper and
// solid differ by one factor at every wavelength, so any n reproduces the
// ramp with other effective coverages (YuleNielsen is monotone in a for
// every n: its ramp alone cannot tell n from dot gain).
func TestHalftoneFitFlatInk(t *testing.T) {
	t.Parallel()
	inks := []string{"c", "k"}
	press := htNewPress(t, inks, []float64{1.8, 1.8}, []float64{1.5, 1.6}, 0)
	m, err := FitHalftone(inks, press.chart(t, 0.002, 4), HalftoneFitSettings{PerInk: true})
	if err != nil {
		t.Fatal(err)
	}
	var k, c bool
	for _, w := range m.Report().Warnings {
		k = k || strings.Contains(w, `ink "k"`) && strings.Contains(w, "spectrally flat")
		c = c || strings.Contains(w, `ink "c"`)
	}
	if !k || c {
		t.Errorf("warnings %v", m.Report().Warnings)
	}
}

// TestHalftoneFitHoldOut checks the deterministic hold-out.
func TestHalftoneFitHoldOut(t *testing.T) {
	t.Parallel()
	inks := []string{"c", "m", "y"}
	press := htNewPress(t, inks, []float64{1.8}, []float64{1.5, 1.5, 1.5}, 0)
	m, err := FitHalftone(inks, press.chart(t, 0.001, 3), HalftoneFitSettings{HoldOut: 0.2})
	if err != nil {
		t.Fatal(err)
	}
	r := m.Report()
	// 8 primaries + 33 ramp tints + 8 mixes = 49 patches; 0.2 of them is
	// 10, on top of the 4 mixes marked.
	if r.HeldOut == nil || r.HeldOut.N != 14 {
		t.Fatalf("held out %+v, want 14", r.HeldOut)
	}
	for _, f := range m.InkFits() {
		if f.Levels < 5 {
			t.Errorf("%s: %d levels left", f.Ink, f.Levels)
		}
	}
}

// htReplace returns the chart with patch i's reflectance replaced.
func htReplace(t *testing.T, chart []HalftoneSample, name string, f func(nm, v float64) float64) []HalftoneSample {
	t.Helper()
	out := append([]HalftoneSample(nil), chart...)
	for i, s := range out {
		if s.Name == name {
			r, err := s.Reflectance.Map(f)
			if err != nil {
				t.Fatal(err)
			}
			out[i].Reflectance = r
			return out
		}
	}
	t.Fatalf("no patch %q", name)
	return nil
}

// TestHalftoneFitErrors checks that bad calibrations are reported with
// what and where.
func TestHalftoneFitErrors(t *testing.T) {
	t.Parallel()
	inks := []string{"c", "m", "y"}
	press := htNewPress(t, inks, []float64{1.8}, []float64{1.5, 1.5, 1.5}, 0)
	chart := press.chart(t, 0, 5)
	drop := func(names ...string) []HalftoneSample {
		var out []HalftoneSample
		for _, s := range chart {
			keep := true
			for _, n := range names {
				if s.Name == n {
					keep = false
				}
			}
			if keep {
				out = append(out, s)
			}
		}
		return out
	}
	held := append([]HalftoneSample(nil), chart...)
	held[1].HeldOut = true
	cover := append([]HalftoneSample(nil), chart...)
	cover[9].Coverages = []Amount{{Name: "c", Value: 1.2}}
	unknown := append([]HalftoneSample(nil), chart...)
	unknown[9].Coverages = []Amount{{Name: "k", Value: 0.2}}
	for _, c := range []struct {
		name    string
		samples []HalftoneSample
		want    []string
	}{
		{"missing overprints", drop("c+m", "c+m+y"), []string{"missing primaries", "c+m, c+m+y"}},
		{"missing paper", drop("paper"), []string{"missing primaries: paper"}},
		{"no ramp", drop("m5", "m10", "m20", "m30", "m40", "m50", "m60", "m70", "m80", "m90", "m95"), []string{`ink "m" has no tint ramp`}},
		// The 60 % cyan patch printed as light as a 20 % one.
		{"not monotone", htReplace(t, chart, "c60", func(nm, v float64) float64 {
			r, _ := press.model.Reflectance([]Amount{{Name: "c", Value: 0.2}})
			return r.At(nm)
		}), []string{`ramp of ink "c" is not monotone`, `c 60 % (synthetic:`, `patch "c60"`}},
		{"primary held out", held, []string{"primary c is held out", "synthetic:2"}},
		{"coverage", cover, []string{"outside 0–1", "synthetic:10"}},
		{"unknown ink", unknown, []string{"no such ink", `"k"`}},
		{"percent reflectance", htReplace(t, chart, "y50", func(_, v float64) float64 { return 100 * v }), []string{"not percent", `patch "y50"`}},
		{"negative", htReplace(t, chart, "m50", func(nm, v float64) float64 {
			if nm == 500 {
				return -0.2
			}
			return v
		}), []string{"500 nm", `patch "m50"`}},
	} {
		_, err := FitHalftone(inks, c.samples, HalftoneFitSettings{})
		if err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q lacks %q", c.name, err, w)
			}
		}
	}
	if _, err := FitHalftone([]string{"c", "c"}, chart, HalftoneFitSettings{}); err == nil {
		t.Error("duplicate inks: no error")
	}
	if _, err := FitHalftone(inks, chart, HalftoneFitSettings{NFactor: 12}); err == nil {
		t.Error("n 12: no error")
	}
}

// TestHalftoneSolveRoundTrip prints known coverages with a model and
// solves them back (the model is its own reference: an exact target must
// be met to ΔE00 0.01 and, for a spectral target, at the coverages it was
// made with to 0.005; tolerances from the optimiser's convergence, common
// practice (no source)). Four inks can print most colours in many ways:
// the spectral tie-break finds the coverages the target was made with,
// and the least-ink alternative uses less ink for the same colour.
func TestHalftoneSolveRoundTrip(t *testing.T) {
	t.Parallel()
	cmy := htNewPress(t, []string{"c", "m", "y"}, []float64{1.8}, []float64{1.5, 1.6, 1.4}, 0).model
	cmyk := htNewPress(t, []string{"c", "m", "y", "k"}, []float64{1.8}, []float64{1.5, 1.6, 1.4, 1.6}, 0).model
	for _, c := range []struct {
		name      string
		m         *Halftone
		nom       []float64
		fixed     []Amount
		leastInk  bool // a least-ink alternative must follow
		labUnique bool // the CIELAB solve must find the same coverages
	}{
		{"cmy brick", cmy, []float64{0.15, 0.7, 0.8}, nil, false, true},
		{"cmy sky", cmy, []float64{0.6, 0.2, 0.05}, nil, false, true},
		{"cmy dark", cmy, []float64{0.85, 0.75, 0.7}, nil, false, true},
		{"cmyk k fixed", cmyk, []float64{0.3, 0.45, 0.2, 0.25}, []Amount{{Name: "k", Value: 0.25}}, false, true},
		{"cmyk free", cmyk, []float64{0.3, 0.45, 0.6, 0.1}, nil, true, false},
	} {
		target := c.m.spectrumOf(c.m.ReflectanceTo(make([]float64, htGrid.N), c.nom))
		sol, err := c.m.Solve(target, HalftoneSolveSettings{Fixed: c.fixed})
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		r := sol.Recipes[0]
		if r.DE00 > 0.01 || !r.Reachable || r.Extra["choice"] != "closest spectrum" {
			t.Errorf("%s: ΔE00 %.4f reachable %v choice %v", c.name, r.DE00, r.Reachable, r.Extra["choice"])
		}
		var sum, trueSum float64
		for i, a := range r.Amounts {
			sum += a.Value
			trueSum += c.nom[i]
			if math.Abs(a.Value-c.nom[i]) > 0.005 {
				t.Errorf("%s: %s = %.4f, want %.4f", c.name, a.Name, a.Value, c.nom[i])
			}
		}
		if tp := r.Extra["tac_percent"].(float64); math.Abs(tp-100*sum) > 1e-9 {
			t.Errorf("%s: tac_percent %v, sum %v", c.name, tp, 100*sum)
		}
		for _, key := range []string{"tac_limit_percent", "effective", "L", "a", "b", "spectral_rms"} {
			if _, ok := r.Extra[key]; !ok {
				t.Errorf("%s: Extra lacks %q", c.name, key)
			}
		}
		if got := len(sol.Recipes) == 2; got != c.leastInk {
			t.Errorf("%s: %d recipes", c.name, len(sol.Recipes))
		} else if got {
			l := sol.Recipes[1]
			if l.Extra["choice"] != "least ink" || l.DE00 > 0.01 || l.Extra["tac_percent"].(float64) >= 100*trueSum-1 {
				t.Errorf("%s: least-ink alternative %+v", c.name, l)
			}
		}
		// The same colour as a CIELAB target: the least-ink match.
		lab := colorimetry.Lab{L: r.Extra["L"].(float64), A: r.Extra["a"].(float64), B: r.Extra["b"].(float64)}
		sl, err := c.m.SolveLab(lab, HalftoneSolveSettings{Fixed: c.fixed})
		if err != nil {
			t.Fatal(err)
		}
		rl := sl.Recipes[0]
		if rl.DE00 > 0.01 || rl.Extra["spectral_rms"] != nil || rl.Extra["choice"] != "least ink" {
			t.Errorf("%s: CIELAB solve %+v", c.name, rl)
		}
		for i, a := range rl.Amounts {
			if c.labUnique && math.Abs(a.Value-c.nom[i]) > 0.005 {
				t.Errorf("%s: CIELAB solve %s = %.4f, want %.4f", c.name, a.Name, a.Value, c.nom[i])
			}
		}
	}
}

// TestHalftoneSolveLimits checks the total area coverage limit, per-ink
// limits and a target outside the gamut (not an error: the nearest
// printable colour, Reachable false).
func TestHalftoneSolveLimits(t *testing.T) {
	t.Parallel()
	m := htNewPress(t, []string{"c", "m", "y", "k"}, []float64{1.8}, []float64{1.5, 1.6, 1.4, 1.6}, 260).model
	dark := m.spectrumOf(m.ReflectanceTo(make([]float64, htGrid.N), []float64{1, 1, 0.95, 0.9}))
	for _, c := range []struct {
		name  string
		set   HalftoneSolveSettings
		limit float64
	}{
		{"model's 260 %", HalftoneSolveSettings{}, 260},
		{"--tac 200", HalftoneSolveSettings{TAC: 200}, 200},
		{"--tac 320", HalftoneSolveSettings{TAC: 320}, 320},
	} {
		sol, err := m.Solve(dark, c.set)
		if err != nil {
			t.Fatal(err)
		}
		r := sol.Recipes[0]
		tac := r.Extra["tac_percent"].(float64)
		// 1e-6: the projection's bisection.
		if tac > c.limit+1e-6 {
			t.Errorf("%s: coverage %.4f %%", c.name, tac)
		}
		if r.Extra["tac_limit_percent"] != c.limit {
			t.Errorf("%s: limit %v", c.name, r.Extra["tac_limit_percent"])
		}
		if !hasWarning(r.Warnings, "total area coverage at the limit") || r.Reachable != (r.DE00 <= DefaultHalftoneTolerance) ||
			r.Reachable == hasWarning(r.Warnings, "nearest printable colour") {
			t.Errorf("%s: ΔE00 %.3f reachable %v warnings %v", c.name, r.DE00, r.Reachable, r.Warnings)
		}
		// A 200 % limit cannot print a shadow made with 385 %: more ink
		// prints darker shadows, which is why presses limit it (common
		// practice (no source)).
		if c.limit == 200 && r.Reachable {
			t.Errorf("%s: the 385 %% shadow reached within 200 %%: ΔE00 %.3f", c.name, r.DE00)
		}
	}
	// A pure spectral green brighter than any ink can print.
	green, err := colorimetry.NewSpectrumOnGrid(htGrid, func() []float64 {
		v := make([]float64, htGrid.N)
		for j := range v {
			d := (htGrid.Wavelength(j) - 530) / 25
			v[j] = 0.02 + 0.85*math.Exp(-0.5*d*d)
		}
		return v
	}(), colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	sol, err := m.Solve(green, HalftoneSolveSettings{MaxCoverage: []Amount{{Name: "y", Value: 0.9}}})
	if err != nil {
		t.Fatal(err)
	}
	// A target out of gamut is not an error (the issue): the nearest
	// colour, not reachable, the per-ink limit kept.
	r := sol.Recipes[0]
	if r.Reachable || r.DE00 <= DefaultHalftoneTolerance {
		t.Errorf("green: ΔE00 %.2f reachable %v", r.DE00, r.Reachable)
	}
	if y := r.Amounts[2].Value; y > 0.9+1e-9 {
		t.Errorf("y %v above its limit 0.9", y)
	}
	for _, bad := range []HalftoneSolveSettings{
		{Fixed: []Amount{{Name: "k", Value: 1}, {Name: "c", Value: 1}, {Name: "m", Value: 0.7}}},
		{MaxCoverage: []Amount{{Name: "x", Value: 0.5}}},
		{Fixed: []Amount{{Name: "k", Value: 1.5}}},
		{TAC: math.NaN()},
		{Tolerance: -1},
	} {
		if _, err := m.SolveLab(colorimetry.Lab{L: 50}, bad); err == nil {
			t.Errorf("%+v: no error", bad)
		}
	}
}

// TestHalftoneGreyBalance checks that the grey balance of a synthetic
// press reaches |a*|, |b*| < 0.5 (the acceptance level) on every
// reachable row, absolute and relative to the paper, that coverages grow
// as the grey darkens, and that the curve between rows stays near
// neutral.
func TestHalftoneGreyBalance(t *testing.T) {
	t.Parallel()
	m := htNewPress(t, []string{"c", "m", "y", "k"}, []float64{1.8}, []float64{1.5, 1.6, 1.4, 1.6}, 300).model
	for _, relative := range []bool{false, true} {
		gb, err := m.GreyBalance(GreyBalanceSettings{Relative: relative, Steps: 9})
		if err != nil {
			t.Fatal(err)
		}
		if len(gb.Steps) != 9 || gb.Inks[0] != "c" || gb.Inks[2] != "y" {
			t.Fatalf("relative %v: %d steps, inks %v", relative, len(gb.Steps), gb.Inks)
		}
		// The darkest neutral is no darker than the three-ink overprint
		// (the darkest of the grey's primaries at every wavelength here,
		// and a Yule–Nielsen print is a power mean of its primaries, never
		// below the smallest: Hardy, Littlewood and Pólya 1934, §2.3, from
		// memory), and reaches below L* 40: a grey balance that stops above
		// mid-grey would be useless to a printer (common practice (no
		// source)).
		if !(gb.DarkestL > gb.Black.L && gb.DarkestL < 40) {
			t.Errorf("relative %v: darkest neutral L* %.2f (three-ink black %.2f)", relative, gb.DarkestL, gb.Black.L)
		}
		reached := 0
		for s, st := range gb.Steps {
			if !st.Reachable {
				continue
			}
			reached++
			if math.Abs(st.Lab.A-st.Target.A) >= 0.5 || math.Abs(st.Lab.B-st.Target.B) >= 0.5 {
				t.Errorf("relative %v row %d: printed %v for aim %v", relative, s, st.Lab, st.Target)
			}
			if s > 0 && gb.Steps[s-1].Reachable {
				for i := range st.Coverages {
					if st.Coverages[i].Value < gb.Steps[s-1].Coverages[i].Value-1e-3 {
						t.Errorf("relative %v row %d: %s falls as the grey darkens", relative, s, st.Coverages[i].Name)
					}
				}
			}
		}
		// The absolute aim may miss the lightest row (a tinted paper) and
		// the darkest sits on the boundary of what is reachable: at least
		// 7 of 9 rows (common practice (no source)).
		if reached < 7 {
			t.Errorf("relative %v: only %d of 9 rows reached", relative, reached)
		}
		if relative {
			// The paper row is the paper itself.
			st := gb.Steps[0]
			if !st.Reachable || st.TACPercent > 0.1 {
				t.Errorf("relative paper row: %+v", st)
			}
		}
		// The curve between the rows: within ΔE00 1 of the aim, about
		// what a press check accepts (common practice (no source)).
		for _, frac := range []float64{0.3, 0.55, 0.8} {
			L := gb.Steps[len(gb.Steps)-1].Target.L + frac*(gb.Steps[0].Target.L-gb.Steps[len(gb.Steps)-1].Target.L)
			cov, err := gb.At(L)
			if err != nil {
				t.Fatal(err)
			}
			am := append([]Amount(nil), cov...)
			r, err := m.Reflectance(am)
			if err != nil {
				t.Fatal(err)
			}
			sc := NewScorer(cie.CIE1931(), cie.D50(), "D50")
			lab, _ := sc.ObjectLab(r)
			aim := colorimetry.Lab{L: L}
			if relative {
				f := (gb.Paper.L - L) / (gb.Paper.L - gb.Black.L)
				aim.A, aim.B = gb.Paper.A*(1-f), gb.Paper.B*(1-f)
			}
			if de := colorimetry.DeltaE2000(aim, lab); de > 1 {
				t.Errorf("relative %v: curve at L* %.2f prints %v, ΔE00 %.2f from %v", relative, L, lab, de, aim)
			}
		}
		if _, err := gb.At(gb.Paper.L + 5); err == nil {
			t.Error("At beyond the paper: no error")
		}
	}
	if _, err := m.GreyBalance(GreyBalanceSettings{Inks: []string{"c", "m"}}); err == nil {
		t.Error("two inks: no error")
	}
	if _, err := m.GreyBalance(GreyBalanceSettings{Steps: 1}); err == nil {
		t.Error("one step: no error")
	}
}

// TestHalftoneSaveLoad checks the model file round trip and its
// validation.
func TestHalftoneSaveLoad(t *testing.T) {
	t.Parallel()
	inks := []string{"c", "m", "y"}
	press := htNewPress(t, inks, []float64{1.8}, []float64{1.5, 1.6, 1.4}, 0)
	m, err := FitHalftone(inks, press.chart(t, 0.001, 9), HalftoneFitSettings{TAC: 280, PerInk: true})
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := Save(&b, m); err != nil {
		t.Fatal(err)
	}
	text := b.String()
	loaded, err := Load(strings.NewReader(text))
	if err != nil {
		t.Fatal(err)
	}
	h, ok := loaded.(*Halftone)
	if !ok {
		t.Fatalf("loaded %T", loaded)
	}
	nom := []float64{0.33, 0.51, 0.12}
	a := m.ReflectanceTo(make([]float64, htGrid.N), nom)
	c := h.ReflectanceTo(make([]float64, htGrid.N), nom)
	for j := range a {
		// JSON keeps float64 exactly: encoding/json writes the shortest
		// form that reads back to the same float64 (strconv.FormatFloat
		// with precision −1), so the loaded model computes bit for bit.
		if a[j] != c[j] {
			t.Fatalf("%g nm: %v after load, %v before", htGrid.Wavelength(j), c[j], a[j])
		}
	}
	if h.TAC() != 280 || len(h.InkFits()) != 3 || h.Report().Training.N != m.Report().Training.N {
		t.Errorf("loaded TAC %v, %d ink fits, report %+v", h.TAC(), len(h.InkFits()), h.Report().Training)
	}
	n1, _ := m.NFactor()
	n2, _ := h.NFactor()
	if len(n2) != 3 || n1[1] != n2[1] {
		t.Errorf("n %v after load, %v before", n2, n1)
	}
	for _, c := range []struct{ old, new, want string }{
		{`"name": "c+m"`, `"name": "m+c"`, `want "c+m"`},
		{`"tac_percent": 280`, `"tac_percent": -5`, "not positive"},
		{`"inks": [`, `"inks": ["k", `, "primaries for 4 inks"},
	} {
		if !strings.Contains(text, c.old) {
			t.Fatalf("model file lacks %q", c.old)
		}
		_, err := Load(strings.NewReader(strings.Replace(text, c.old, c.new, 1)))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s → %s: %v", c.old, c.new, err)
		}
	}
	var raw map[string]any
	if err := json.Unmarshal(b.Bytes(), &raw); err != nil || raw["kind"] != "halftone" {
		t.Errorf("kind %v %v", raw["kind"], err)
	}
}

// htCSV writes a rows-layout file of flat reflectances on 400–700 nm at
// 100 nm steps: header fields, then one row per patch (fields, value).
func htCSV(header string, rows ...string) string {
	var b strings.Builder
	b.WriteString("name," + header + ",400,500,600,700\n")
	for _, r := range rows {
		cells := strings.Split(r, "|")
		b.WriteString(cells[0] + "," + cells[1])
		for range 4 {
			b.WriteString("," + cells[2])
		}
		b.WriteString("\n")
	}
	return b.String()
}

// TestHalftoneSamplesFile checks the calibration file layout: percent
// and fraction columns, spot inks, held-out marks, and errors that name
// the file, line and column.
func TestHalftoneSamplesFile(t *testing.T) {
	t.Parallel()
	read := func(text string) ([]HalftoneSample, []string, error) {
		recs, err := specio.NewReader(strings.NewReader(text), "press.csv").ReadAll()
		if err != nil {
			return nil, nil, err
		}
		return HalftoneSamples(recs, "press.csv")
	}
	samples, inks, err := read(htCSV("ink:Orange (%),Y,c %,heldout", "paper|0,0,0,0|0.9", "o50|50,0,0,1|0.5", "y40|0,40,0,0|0.7", "c25|0,0,25,0|0.75"))
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(inks, " ") != "c y Orange" {
		t.Errorf("inks %v, want process inks first (c, y) then the spot ink", inks)
	}
	if !samples[1].HeldOut || samples[0].HeldOut || samples[1].Coverages[2] != (Amount{Name: "Orange", Value: 0.5}) ||
		samples[2].Coverages[1] != (Amount{Name: "y", Value: 0.4}) || samples[3].Place != "press.csv:5" {
		t.Errorf("samples %+v", samples)
	}
	blank, _, err := read(htCSV("c,m", "paper|,|0.9", "m50|,50|0.5"))
	if err != nil || blank[1].Coverages[0].Value != 0 || blank[1].Coverages[1].Value != 0.5 {
		t.Errorf("empty cells: %v %+v", err, blank)
	}
	fr, _, err := read(htCSV("m (fraction)", "paper|0|0.9", "m1|1|0.1", "m.35|0.35|0.5"))
	if err != nil || fr[2].Coverages[0].Value != 0.35 {
		t.Errorf("fraction column: %v %+v", err, fr)
	}
	for _, c := range []struct {
		text string
		want []string
	}{
		{htCSV("c,date", "paper|0,x|0.9"), []string{"press.csv", `column "date"`, "ink:NAME"}},
		{htCSV("c,m", "paper|0,0|0.9", "bad|120,0|0.5"), []string{"press.csv:3", "field c", "outside 0–100 %"}},
		{htCSV("c,m", "paper|0,0|0.9", "c|1,0|0.1", "half|0.5,0|0.5"), []string{"press.csv:", "within 0–1", `"c (fraction)"`}},
		{htCSV("c,m", "paper|0,0|0.9", "paper|0,0|0.9"), []string{"press.csv:3", "used twice"}},
		{htCSV("c,heldout", "paper|0,maybe|0.9"), []string{"press.csv:2", "field heldout"}},
		{htCSV("c,C (%)", "paper|0,0|0.9"), []string{"two columns"}},
		{htCSV("heldout", "paper|0|0.9"), []string{"no ink columns"}},
		{htCSV("c,m", "paper|0,zero|0.9"), []string{"press.csv:2", "m"}},
	} {
		_, _, err := read(c.text)
		if err == nil {
			t.Errorf("%q: no error", c.text)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("error %q lacks %q", err, w)
			}
		}
	}
}
