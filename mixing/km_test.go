package mixing

import (
	"math"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestKSInverse checks that K/S = (1 − R)²/(2R) and
// R∞ = 1 + K/S − √((K/S)² + 2K/S) are inverse functions (a mathematical
// invariant of the Kubelka–Munk formulas) and the special value
// K/S = 1 ⇒ R∞ = 2 − √3 (solve (1 − R)² = 2R).
func TestKSInverse(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		r   float64
		tol float64 // relative; round-off of a few operations
	}{
		{1e-4, 1e-12}, {0.01, 1e-13}, {0.1, 1e-14}, {0.2679, 1e-14}, {0.5, 1e-14}, {0.9, 1e-14}, {0.999, 1e-12}, {1, 0},
	} {
		q := KS(tc.r)
		if got := ReflectanceInf(q); !scalar.EqualWithinAbsOrRel(got, tc.r, tc.tol, tc.tol) {
			t.Errorf("R∞(KS(%g)) = %.17g", tc.r, got)
		}
		// And the other way, in the straightforward form of the issue.
		direct := 1 + q - math.Sqrt(q*q+2*q)
		if !scalar.EqualWithinAbsOrRel(direct, tc.r, 1e-9, 1e-9) {
			t.Errorf("1 + q − √(q² + 2q) at q = KS(%g): %.17g", tc.r, direct)
		}
	}
	for _, q := range []float64{0, 1e-9, 0.25, 1, 4.05, 50, 1e6} {
		if got := KS(ReflectanceInf(q)); !scalar.EqualWithinAbsOrRel(got, q, 1e-12, 1e-9) {
			t.Errorf("KS(R∞(%g)) = %.17g", q, got)
		}
	}
	if got, want := ReflectanceInf(1), 2-math.Sqrt(3); !scalar.EqualWithinAbsOrRel(got, want, 1e-15, 1e-15) {
		t.Errorf("R∞(1) = %.17g, want 2 − √3 = %.17g", got, want)
	}
	// Special cases stated in the doc comments.
	if !math.IsInf(KS(0), 1) || KS(1) != 0 || ReflectanceInf(0) != 1 || ReflectanceInf(math.Inf(1)) != 0 || !math.IsNaN(ReflectanceInf(-1)) {
		t.Error("special cases of KS / ReflectanceInf")
	}
	if q, c := KSClamped(0); !c || !(q > 4000 && q < 6000) {
		t.Errorf("KSClamped(0) = %g, %v: want the 1e-4 clamp (≈ 5000) and a flag", q, c)
	}
	if q, c := KSClamped(1.02); !c || q != 0 {
		t.Errorf("KSClamped(1.02) = %g, %v", q, c)
	}
}

// TestKSTable checks the Kubelka–Munk function against rounded tabulated
// values of K/S for R∞ = 0.01, 0.05, 0.10, 0.20, 0.50, 0.80 (the kind of
// table printed in colour-technology textbooks, e.g. Judd & Wyszecki,
// "Color in Business, Science and Industry"; values from memory, 3
// significant figures, so tol is half a unit of the last digit).
func TestKSTable(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ r, ks, tol float64 }{
		{0.01, 49.0, 0.05},
		{0.05, 9.025, 0.0005},
		{0.10, 4.05, 0.005},
		{0.20, 1.60, 0.005},
		{0.50, 0.250, 0.0005},
		{0.80, 0.0250, 0.00005},
	} {
		if got := KS(tc.r); math.Abs(got-tc.ks) > tc.tol {
			t.Errorf("K/S at R∞ = %g: %.5g, table %g", tc.r, got, tc.ks)
		}
	}
}

// kmODE integrates the Kubelka–Munk two-flux equations through a film of
// thickness x over a backing rg, by classical Runge–Kutta (4th order) with
// n steps. With i the downward and j the upward diffuse flux and z the
// depth:
//
//	di/dz = −(K + S)·i + S·j,   dj/dz = (K + S)·j − S·i
//
// (Kubelka & Munk 1931). It shoots from the backing (j = rg·i at z = x,
// with i = 1 there) up to the surface and returns R = j/i and T = i(x)/i(0)
// at the surface.
func kmODE(k, s, x, rg float64, n int) (r, tr float64) {
	// Integrate upwards in u = x − z: di/du = (K+S)·i − S·j, dj/du = −(K+S)·j + S·i.
	f := func(i, j float64) (float64, float64) {
		return (k+s)*i - s*j, -(k+s)*j + s*i
	}
	i, j := 1.0, rg
	h := x / float64(n)
	for range n {
		a1, b1 := f(i, j)
		a2, b2 := f(i+h/2*a1, j+h/2*b1)
		a3, b3 := f(i+h/2*a2, j+h/2*b2)
		a4, b4 := f(i+h*a3, j+h*b3)
		i += h / 6 * (a1 + 2*a2 + 2*a3 + a4)
		j += h / 6 * (b1 + 2*b2 + 2*b3 + b4)
	}
	return j / i, 1 / i
}

// TestLayerODE checks Kubelka's hyperbolic solution against a numerical
// integration of the two-flux differential equations it solves (a
// mathematical check, independent of the closed form). RK4 with 20000
// steps has a global error far below the 1e-9 tolerance for these
// optical thicknesses (error ~ (h·(K+S))⁴).
func TestLayerODE(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ k, s, x, rg float64 }{
		{0.25, 1, 1, 0},   // the worked example below
		{0.25, 1, 1, 0.8}, // over white
		{2, 0.5, 0.3, 0.6},
		{0.01, 3, 2, 0.2},
		{5, 0.2, 0.05, 0.9},
		{0, 1, 0.7, 0.3}, // no absorption
	} {
		r, tr := kmODE(tc.k, tc.s, tc.x, tc.rg, 20000)
		if got := LayerReflectance(tc.k, tc.s, tc.x, tc.rg); !scalar.EqualWithinAbsOrRel(got, r, 1e-9, 1e-9) {
			t.Errorf("R(K=%g, S=%g, X=%g, Rg=%g) = %.12g, ODE %.12g", tc.k, tc.s, tc.x, tc.rg, got, r)
		}
		if tc.rg == 0 {
			if got := LayerTransmittance(tc.k, tc.s, tc.x); !scalar.EqualWithinAbsOrRel(got, tr, 1e-9, 1e-9) {
				t.Errorf("T(K=%g, S=%g, X=%g) = %.12g, ODE %.12g", tc.k, tc.s, tc.x, got, tr)
			}
		}
	}
}

// TestLayerWorkedExample follows a worked example of Kubelka's formulas:
// a film with K/S = 0.25 has a = 1.25, b = 0.75 and R∞ = a − b = 0.5; at
// S·X = 1 it reflects R0 = 1/(a + b·coth b) = 0.41138 over black and
// transmits T = b/(a·sinh b + b·cosh b) = 0.37520 (Kubelka 1948,
// J. Opt. Soc. Am. 38, 448, the relations a = (1 + R0² − T²)/(2R0) and
// R∞ = a − b; numbers worked by hand from memory of the paper's
// formulas, 5 decimals).
func TestLayerWorkedExample(t *testing.T) {
	t.Parallel()
	r0 := LayerReflectance(0.25, 1, 1, 0)
	tr := LayerTransmittance(0.25, 1, 1)
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"R∞", ReflectanceInf(0.25), 0.5},
		{"R0", r0, 0.41138},
		{"T", tr, 0.37520},
		{"a from R0, T", (1 + r0*r0 - tr*tr) / (2 * r0), 1.25},
	} {
		// 5 decimals printed: half a unit of the last.
		if math.Abs(c.got-c.want) > 5e-6 {
			t.Errorf("%s = %.7f, want %.5f", c.what, c.got, c.want)
		}
	}
}

// TestLayerLimits checks the finite-layer formula's limits: it tends to
// R∞ as the film thickens and to the backing as it vanishes (the issue's
// stated invariants), and the closed forms without absorption
// (R = (S·X·(1 − Rg) + Rg)/(1 + S·X·(1 − Rg)), Kubelka 1948, from memory)
// and without scattering (Beer–Lambert–Bouguer, R = Rg·e^(−2KX)).
func TestLayerLimits(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ k, s, rg float64 }{{0.25, 1, 0}, {0.25, 1, 0.85}, {3, 0.1, 0.5}, {0.01, 2, 0.9}} {
		rInf := ReflectanceInf(tc.k / tc.s)
		if got := LayerReflectance(tc.k, tc.s, 1e4, tc.rg); !scalar.EqualWithinAbsOrRel(got, rInf, 1e-12, 1e-12) {
			t.Errorf("thick film (K=%g S=%g Rg=%g): %.15g, want R∞ %.15g", tc.k, tc.s, tc.rg, got, rInf)
		}
		if got := LayerReflectance(tc.k, tc.s, 1e-9, tc.rg); !scalar.EqualWithinAbsOrRel(got, tc.rg, 1e-8, 1e-8) {
			t.Errorf("vanishing film (K=%g S=%g): %.15g, want the backing %g", tc.k, tc.s, got, tc.rg)
		}
		if got := LayerReflectance(tc.k, tc.s, 0, tc.rg); got != tc.rg {
			t.Errorf("X = 0: %g", got)
		}
	}
	for _, tc := range []struct{ s, x, rg float64 }{{1, 0.5, 0}, {2, 1, 0.4}} {
		want := (tc.s*tc.x*(1-tc.rg) + tc.rg) / (1 + tc.s*tc.x*(1-tc.rg))
		if got := LayerReflectance(0, tc.s, tc.x, tc.rg); !scalar.EqualWithinAbsOrRel(got, want, 1e-12, 1e-12) {
			t.Errorf("K = 0: %.15g, want %.15g", got, want)
		}
		if got := LayerTransmittance(0, tc.s, tc.x); !scalar.EqualWithinAbsOrRel(got, 1/(1+tc.s*tc.x), 1e-12, 1e-12) {
			t.Errorf("T at K = 0: %g", got)
		}
	}
	if got := LayerReflectance(0.7, 0, 0.5, 0.8); !scalar.EqualWithinAbsOrRel(got, 0.8*math.Exp(-0.7), 1e-15, 1e-15) {
		t.Errorf("S = 0: %g", got)
	}
	if got := LayerTransmittance(1, 1, 1e6); got != 0 {
		t.Errorf("T of a very thick film = %g, want 0 (not NaN)", got)
	}
}

// TestHiding checks the contrast ratio and the hiding thickness: the
// ratio rises from 0 towards 1 with thickness (Kubelka 1948; common
// practice, no source, for the 0.98 criterion) and HidingThickness
// inverts it.
func TestHiding(t *testing.T) {
	t.Parallel()
	k, s, rw := 0.05, 2.0, 0.8
	prev := 0.0
	for _, x := range []float64{0.01, 0.1, 0.5, 1, 2, 5, 20} {
		cr := ContrastRatio(k, s, x, rw)
		if !(cr > prev && cr <= 1) {
			t.Errorf("contrast ratio %g at X = %g after %g", cr, x, prev)
		}
		prev = cr
	}
	x, err := HidingThickness(k, s, rw, 0.98)
	if err != nil {
		t.Fatal(err)
	}
	// Bisection to 1e-13 relative in X; the ratio's slope is < 1.
	if got := ContrastRatio(k, s, x, rw); math.Abs(got-0.98) > 1e-10 {
		t.Errorf("contrast ratio at the hiding thickness %g: %.12g", x, got)
	}
	if _, err := HidingThickness(0, 0, rw, 0.98); err == nil {
		t.Error("a film with K = S = 0 cannot hide")
	}
	if _, err := HidingThickness(k, s, rw, 1); err == nil {
		t.Error("cr = 1 accepted")
	}
}

// TestFilmFromBackings round-trips Kubelka's formulas: a film computed
// over two backings gives back its R∞, S·X, R0 and T (mathematical
// invariant), and a film darker over white than over black is an error.
func TestFilmFromBackings(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ k, s, x, gb, gw float64 }{
		{0.25, 1, 1, 0, 0.8},
		{0.25, 1, 1, 0.03, 0.8},
		{2, 0.3, 0.4, 0.01, 0.85},
		{0.02, 1, 0.3, 0.05, 0.9},
	} {
		rb := LayerReflectance(tc.k, tc.s, tc.x, tc.gb)
		rw := LayerReflectance(tc.k, tc.s, tc.x, tc.gw)
		f, err := FilmFromBackings(rb, rw, tc.gb, tc.gw, 0.01)
		if err != nil {
			t.Fatal(err)
		}
		// Round-off only: tol 1e-10.
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"R∞", f.RInf, ReflectanceInf(tc.k / tc.s)},
			{"S·X", f.SX, tc.s * tc.x},
			{"R0", f.R0, LayerReflectance(tc.k, tc.s, tc.x, 0)},
			{"T", f.T, LayerTransmittance(tc.k, tc.s, tc.x)},
		} {
			if !scalar.EqualWithinAbsOrRel(c.got, c.want, 1e-10, 1e-10) {
				t.Errorf("%+v: %s = %.12g, want %.12g", tc, c.what, c.got, c.want)
			}
		}
	}
	f, err := FilmFromBackings(0.3, 0.3, 0, 0.8, 0.01)
	if err != nil || math.Abs(f.RInf-0.3) > 1e-15 || !math.IsInf(f.SX, 1) {
		t.Errorf("a hiding film: %+v, %v", f, err)
	}
	if _, err := FilmFromBackings(0.3, 0.2, 0, 0.8, 0.01); err == nil {
		t.Error("darker over white than over black accepted")
	}
}

// TestSaunderson checks the Saunderson correction: k1 = ((n − 1)/(n + 1))²
// = 0.04 for n = 1.5 (Fresnel at normal incidence; the value of the shared
// benchmark, shared/bench/README.md), Measured and Internal are inverse
// (mathematical invariant), a perfect internal white measures 1 and an
// internal black measures k1 with the specular component included and 0
// without (from the formula, Saunderson 1942).
func TestSaunderson(t *testing.T) {
	t.Parallel()
	s, err := SaundersonFromIndex(1.5, 0.6, false)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbsOrRel(s.K1, 0.04, 1e-16, 1e-15) {
		t.Errorf("k1(1.5) = %.17g", s.K1)
	}
	x := Saunderson{K1: 0.04, K2: 0.6, SpecularExcluded: true}
	for _, sd := range []Saunderson{s, x, {}} {
		for _, r := range []float64{0, 0.01, 0.3, 0.7, 1} {
			if got := sd.Internal(sd.Measured(r)); !scalar.EqualWithinAbsOrRel(got, r, 1e-15, 1e-14) {
				t.Errorf("%+v: Internal(Measured(%g)) = %.17g", sd, r, got)
			}
		}
	}
	if got := s.Measured(1); !scalar.EqualWithinAbsOrRel(got, 1, 1e-15, 1e-15) {
		t.Errorf("Measured(1) = %g", got)
	}
	if math.Abs(s.Measured(0)-0.04) > 1e-16 || x.Measured(0) != 0 {
		t.Errorf("Measured(0): included %g, excluded %g", s.Measured(0), x.Measured(0))
	}
	// The derivative used by the solver, against a central difference
	// (h = 1e-6: error ~h², tol 1e-8).
	for _, r := range []float64{0.05, 0.5, 0.95} {
		_, d := s.measuredSlope(r)
		fd := (s.Measured(r+1e-6) - s.Measured(r-1e-6)) / 2e-6
		if !scalar.EqualWithinAbsOrRel(d, fd, 1e-8, 1e-8) {
			t.Errorf("dRm/dR at %g: %g, difference %g", r, d, fd)
		}
	}
	if _, err := SaundersonFromIndex(0.5, 0.6, false); err == nil {
		t.Error("n < 1 accepted")
	}
	if err := (Saunderson{K2: 1}).Validate(); err == nil {
		t.Error("k2 = 1 accepted")
	}
}

// TestForwardMatchesBench checks the forward model against the shared
// benchmark's reference implementation (shared/bench/refcolor.py, km_mix:
// two-constant Kubelka–Munk with Saunderson, specular included): the true
// recipes of km_truth.json must reproduce km_targets.json. The targets
// were written with 17 significant digits; tol 1e-12 covers round-off.
func TestForwardMatchesBench(t *testing.T) {
	t.Parallel()
	d := loadBench(t)
	var worst float64
	for i, tr := range d.truth {
		var am []Amount
		for j, c := range tr {
			am = append(am, Amount{Name: d.model.Colorants[j].Name, Value: c})
		}
		r := mustReflectance(t, d.model, am)
		for l := range r.Len() {
			worst = math.Max(worst, math.Abs(r.Value(l)-d.targets[i].Value(l)))
		}
	}
	if worst > 1e-12 {
		t.Errorf("largest |ΔR| against the reference implementation: %g", worst)
	}
}

// TestEffWeights checks the folded weighting table against the library's
// own path, Weights.XYZ of the spectrum resampled to the computation grid
// (fast versus reference; interpolation is linear in the data, so they
// agree to round-off: tol 1e-10 on Y = 100).
func TestEffWeights(t *testing.T) {
	t.Parallel()
	p := synthModel(4)
	for _, ill := range []colorimetry.NamedIlluminant{d65(), {Name: "A", Spectrum: cie.A()}} {
		e, err := newEffWeights(cie.CIE1931(), ill, p.Grid)
		if err != nil {
			t.Fatal(err)
		}
		r := mustReflectance(t, p, []Amount{{"white", 0.9}, {"amber", 0.06}, {"rose", 0.04}})
		want, err := e.full.XYZ(r)
		if err != nil {
			t.Fatal(err)
		}
		got := e.xyz(r.Values(nil))
		if !scalar.EqualWithinAbsOrRel(got.X, want.X, 1e-10, 1e-10) || !scalar.EqualWithinAbsOrRel(got.Y, want.Y, 1e-10, 1e-10) || !scalar.EqualWithinAbsOrRel(got.Z, want.Z, 1e-10, 1e-10) {
			t.Errorf("%s: folded %v, reference %v", ill.Name, got, want)
		}
		// labOf against XYZ.Lab of package colorimetry.
		l1 := labOf(want, e.white)
		l2, err := want.Lab(e.white)
		if err != nil || colorimetry.DeltaEab(l1, l2) > 1e-12 {
			t.Errorf("labOf %v, XYZ.Lab %v", l1, l2)
		}
	}
}

// TestDE00Metric checks the local CIEDE2000 metric: for small differences
// ‖U·d‖ approximates ΔE00 (to first order; at |d| = 0.05 the relative
// error of the quadratic form is below 1 %, from the smoothness of
// CIEDE2000 away from C = 0).
func TestDE00Metric(t *testing.T) {
	t.Parallel()
	for _, lab := range []colorimetry.Lab{{L: 50, A: 20, B: -30}, {L: 80, A: -5, B: 60}, {L: 30, A: 40, B: 10}, {L: 60, A: 0.5, B: 0.5}} {
		u := de00Metric(lab)
		for _, d := range [][3]float64{{0.05, 0, 0}, {0, 0.03, 0.04}, {0.02, -0.03, 0.01}} {
			var n float64
			for i := range 3 {
				var v float64
				for k := i; k < 3; k++ {
					v += u[i][k] * d[k]
				}
				n += v * v
			}
			want := colorimetry.DeltaE2000(lab, colorimetry.Lab{L: lab.L + d[0], A: lab.A + d[1], B: lab.B + d[2]})
			if !scalar.EqualWithinAbsOrRel(math.Sqrt(n), want, 1e-12, 0.01) {
				t.Errorf("%v + %v: metric %g, ΔE00 %g", lab, d, math.Sqrt(n), want)
			}
		}
	}
}

// TestSingleConstant checks the single-constant model against the
// two-constant one: when every colorant scatters alike (S equal), the
// mix's K/S = Σ cᵢKᵢ / Σ cᵢS reduces to the K/S additivity of the
// single-constant model (a mathematical identity of the two models).
func TestSingleConstant(t *testing.T) {
	t.Parallel()
	k := []float64{0.02, 5, 0.8} // substrate/white, two colorants; S = 0.5 for all
	const s = 0.5
	for _, c := range [][]float64{{1, 0, 0}, {0.9, 0.1, 0}, {0.7, 0.2, 0.1}} {
		var km, sm float64
		for i := range k {
			km += c[i] * k[i]
			sm += c[i] * s
		}
		two := ReflectanceInf(km / sm)
		// Single-constant with the white's K/S as substrate and the unit
		// K/S of each colorant relative to it, per unit of total amount.
		one := SingleConstant(c[0]*k[0]/sm, []float64{k[1] / sm, k[2] / sm}, c[1:])
		if !scalar.EqualWithinAbsOrRel(one, two, 1e-15, 1e-14) {
			t.Errorf("c = %v: single-constant %.17g, two-constant %.17g", c, one, two)
		}
	}
	if !math.IsNaN(SingleConstant(0.1, []float64{1}, []float64{-1})) {
		t.Error("negative amount accepted")
	}
}
