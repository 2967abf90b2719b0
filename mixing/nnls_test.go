package mixing

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"pgregory.net/rapid"
)

// lsRandProblem returns an m×n matrix and a right-hand side with entries
// uniform in [−1, 1).
func lsRandProblem(rnd *rand.Rand, m, n int) (*mat.Dense, []float64) {
	a := mat.NewDense(m, n, nil)
	for i := range m {
		for j := range n {
			a.Set(i, j, 2*rnd.Float64()-1)
		}
	}
	b := make([]float64, m)
	for i := range b {
		b[i] = 2*rnd.Float64() - 1
	}
	return a, b
}

// lsBrute solves min ‖A·x − b‖ subject to lo ≤ x ≤ hi by trying every
// assignment of each variable to its lower bound, its upper bound or free,
// solving the free part by QR (mat.Dense.Solve, a different factorisation
// from the one under test) and keeping the feasible assignment with the
// smallest residual. The optimum of a convex problem is one of them
// (mathematical invariant: the KKT point has each variable at a bound or
// interior with zero gradient).
func lsBrute(a *mat.Dense, b, lo, hi []float64) (x []float64, rnorm float64) {
	m, n := a.Dims()
	best := math.Inf(1)
	state := make([]int, n) // 0 lo, 1 hi, 2 free
	var rec func(j int)
	try := func() {
		cand := make([]float64, n)
		var freeCols []int
		for j := range n {
			switch state[j] {
			case 0:
				cand[j] = lo[j]
			case 1:
				cand[j] = hi[j]
			default:
				freeCols = append(freeCols, j)
			}
		}
		if len(freeCols) > m {
			return
		}
		rhs := mat.NewVecDense(m, append([]float64(nil), b...))
		for j := range n {
			if state[j] != 2 && cand[j] != 0 {
				for i := range m {
					rhs.SetVec(i, rhs.AtVec(i)-a.At(i, j)*cand[j])
				}
			}
		}
		if len(freeCols) > 0 {
			af := mat.NewDense(m, len(freeCols), nil)
			for k, j := range freeCols {
				for i := range m {
					af.Set(i, k, a.At(i, j))
				}
			}
			var z mat.VecDense
			if err := z.SolveVec(af, rhs); err != nil {
				return
			}
			for k, j := range freeCols {
				if z.AtVec(k) < lo[j] || z.AtVec(k) > hi[j] {
					return
				}
				cand[j] = z.AtVec(k)
			}
		}
		var ss float64
		for i := range m {
			d := b[i]
			for j := range n {
				d -= a.At(i, j) * cand[j]
			}
			ss += d * d
		}
		if r := math.Sqrt(ss); r < best {
			best, x = r, cand
		}
	}
	rec = func(j int) {
		if j == n {
			try()
			return
		}
		for st := range 3 {
			if st == 0 && math.IsInf(lo[j], -1) || st == 1 && math.IsInf(hi[j], 1) {
				continue
			}
			state[j] = st
			rec(j + 1)
		}
	}
	rec(0)
	return x, best
}

func TestNNLSBruteForce(t *testing.T) {
	t.Parallel()
	rnd := rand.New(rand.NewPCG(1, 1))
	for trial := range 400 {
		m, n := 2+rnd.IntN(7), 1+rnd.IntN(5)
		a, b := lsRandProblem(rnd, m, n)
		x, rnorm, err := NNLS(a, b)
		if err != nil {
			t.Fatalf("trial %d (%d×%d): %v", trial, m, n, err)
		}
		lo, hi := make([]float64, n), make([]float64, n)
		for j := range hi {
			hi[j] = math.Inf(1)
		}
		wantX, wantR := lsBrute(a, b, lo, hi)
		// Tolerance: the residuals agree to rounding of a well-scaled
		// problem, 1e-10 absolute on entries of order 1 (common practice
		// (no source)).
		if !scalar.EqualWithinAbsOrRel(rnorm, wantR, 1e-10, 1e-10) {
			t.Errorf("trial %d (%d×%d): rnorm %v, brute force %v", trial, m, n, rnorm, wantR)
		}
		if m < n {
			continue // x is not unique
		}
		for j := range n {
			if x[j] < 0 {
				t.Errorf("trial %d: x[%d] = %v < 0", trial, j, x[j])
			}
			// x is unique for full column rank; 1e-8 allows the
			// conditioning of random 2×1…8×5 matrices (κ below ~1e2).
			if !scalar.EqualWithinAbsOrRel(x[j], wantX[j], 1e-8, 1e-8) {
				t.Errorf("trial %d (%d×%d): x[%d] = %v, brute force %v", trial, m, n, j, x[j], wantX[j])
			}
		}
	}
}

func TestBoundedLSBruteForce(t *testing.T) {
	t.Parallel()
	rnd := rand.New(rand.NewPCG(1, 1))
	for trial := range 300 {
		m, n := 2+rnd.IntN(7), 1+rnd.IntN(4)
		a, b := lsRandProblem(rnd, m, n)
		lo, hi := make([]float64, n), make([]float64, n)
		for j := range n {
			l, h := rnd.Float64()-0.8, rnd.Float64()-0.2
			if l > h {
				l, h = h, l
			}
			switch rnd.IntN(5) {
			case 0:
				l = math.Inf(-1)
			case 1:
				h = math.Inf(1)
			case 2:
				l, h = math.Inf(-1), math.Inf(1)
			}
			lo[j], hi[j] = l, h
		}
		x, rnorm, err := BoundedLS(a, b, lo, hi)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		wantX, wantR := lsBrute(a, b, lo, hi)
		if wantX == nil {
			continue // brute force found no solvable assignment (m < free count everywhere)
		}
		if !scalar.EqualWithinAbsOrRel(rnorm, wantR, 1e-10, 1e-10) {
			t.Errorf("trial %d (%d×%d) lo %v hi %v: rnorm %v, brute force %v", trial, m, n, lo, hi, rnorm, wantR)
		}
		for j := range n {
			if x[j] < lo[j] || x[j] > hi[j] {
				t.Errorf("trial %d: x[%d] = %v outside [%v, %v]", trial, j, x[j], lo[j], hi[j])
			}
			if m >= n && !scalar.EqualWithinAbsOrRel(x[j], wantX[j], 1e-8, 1e-8) {
				t.Errorf("trial %d (%d×%d): x[%d] = %v, brute force %v", trial, m, n, j, x[j], wantX[j])
			}
		}
	}
}

// lsCheckKKT verifies the Karush–Kuhn–Tucker conditions of min ‖A·x − b‖
// subject to lo ≤ x ≤ hi (mathematical invariant; Lawson & Hanson 1974,
// ch. 23, theorem 23.4 for the non-negative case): with w = Aᵀ(b − A·x),
// w ≤ 0 where x is at its lower bound, w ≥ 0 at its upper bound and w ≈ 0
// in between. The tolerance follows the backward error of least squares
// by orthogonal factorisations (Higham 2002, "Accuracy and Stability of
// Numerical Algorithms", §20.2, from memory): a gradient error of order
// u·κ(A)·‖A‖·(‖A‖·‖x‖ + ‖b‖), times a safety factor of 1000 for the
// dimensions.
func lsCheckKKT(t *testing.T, label string, a *mat.Dense, b, lo, hi, x []float64) {
	t.Helper()
	m, n := a.Dims()
	r := make([]float64, m)
	for i := range m {
		r[i] = b[i]
		for j := range n {
			r[i] -= a.At(i, j) * x[j]
		}
	}
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDNone) {
		t.Fatalf("%s: SVD failed", label)
	}
	sv := svd.Values(nil)
	kappa := sv[0] / sv[len(sv)-1]
	if m < n || math.IsInf(kappa, 0) {
		kappa = 1 // the gradient condition does not involve inverting A
	}
	normA := sv[0]
	tol := 1000 * lsEps * kappa * normA * (normA*lsNorm(x) + lsNorm(b))
	for j := range n {
		w := lsColDot(a, j, r)
		switch {
		case x[j] < lo[j] || x[j] > hi[j]:
			t.Errorf("%s: x[%d] = %v outside [%v, %v]", label, j, x[j], lo[j], hi[j])
		case x[j] == lo[j] && x[j] == hi[j]:
		case x[j] == lo[j]:
			if w > tol {
				t.Errorf("%s: x[%d] at lower bound but w = %v > tol %v", label, j, w, tol)
			}
		case x[j] == hi[j]:
			if w < -tol {
				t.Errorf("%s: x[%d] at upper bound but w = %v < -tol %v", label, j, w, tol)
			}
		default:
			if math.Abs(w) > tol {
				t.Errorf("%s: x[%d] = %v interior but |w| = %v > tol %v", label, j, x[j], w, tol)
			}
		}
	}
}

func TestNNLSKKT(t *testing.T) {
	t.Parallel()
	rnd := rand.New(rand.NewPCG(1, 1))
	for trial := range 200 {
		m, n := 1+rnd.IntN(40), 1+rnd.IntN(15)
		a, b := lsRandProblem(rnd, m, n)
		x, _, err := NNLS(a, b)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		lo, hi := make([]float64, n), make([]float64, n)
		for j := range hi {
			hi[j] = math.Inf(1)
		}
		lsCheckKKT(t, "NNLS", a, b, lo, hi, x)
	}
}

func TestLeastSquaresReference(t *testing.T) {
	t.Parallel()
	inf := math.Inf(1)
	for _, c := range []struct {
		name    string
		a       [][]float64
		b       []float64
		lo, hi  []float64 // nil: NNLS
		want    []float64
		wantR   float64
		tol     float64
		comment string
	}{
		{
			// A 4×2 example whose unconstrained solution is (−2.5627,
			// 3.1108); the constrained one moves x₁ to 0 (from memory of a
			// textbook-style example; values confirmed with
			// scipy.optimize.nnls 1.10.1, printed to 16 digits).
			name: "4x2 one active",
			a:    [][]float64{{0.0372, 0.2869}, {0.6861, 0.7071}, {0.6233, 0.6245}, {0.6344, 0.6170}},
			b:    []float64{0.8587, 0.1781, 0.0747, 0.8405},
			want: []float64{0, 0.6929343971302934}, wantR: 0.9118420648683148, tol: 1e-13,
		},
		{
			// scipy.optimize.nnls 1.10.1 on this integer problem.
			name: "5x4 two active",
			a:    [][]float64{{1, 2, 0, 1}, {0, 1, 3, -1}, {2, -1, 1, 0}, {1, 1, 1, 1}, {-1, 0, 2, 3}},
			b:    []float64{1, -2, 3, 0.5, -1},
			want: []float64{1.2349397590361444, 0, 0, 0.144578313253012}, wantR: 2.1634978371993503, tol: 1e-13,
		},
		{
			// scipy.optimize.lsq_linear(method="bvls", tol=1e-14) 1.10.1:
			// x₁ at its upper bound, x₂ at its lower bound, x₃ and x₄ free.
			name: "5x4 bvls mixed bounds",
			a:    [][]float64{{1, 2, 0, 1}, {0, 1, 3, -1}, {2, -1, 1, 0}, {1, 1, 1, 1}, {-1, 0, 2, 3}},
			b:    []float64{1, -2, 3, 0.5, -1},
			lo:   []float64{-0.5, 0, -inf, -1}, hi: []float64{0.5, inf, 1, inf},
			want:  []float64{0.5, 0, -0.3902439024390243, 0.21341463414634157},
			wantR: 2.517015266870373, tol: 1e-13,
		},
	} {
		a := mat.NewDense(len(c.a), len(c.a[0]), nil)
		for i, row := range c.a {
			a.SetRow(i, row)
		}
		var x []float64
		var r float64
		var err error
		if c.lo == nil {
			x, r, err = NNLS(a, c.b)
		} else {
			x, r, err = BoundedLS(a, c.b, c.lo, c.hi)
		}
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		for j := range x {
			if !scalar.EqualWithinAbsOrRel(x[j], c.want[j], c.tol, c.tol) {
				t.Errorf("%s: x[%d] = %.17g, want %.17g", c.name, j, x[j], c.want[j])
			}
		}
		if !scalar.EqualWithinAbsOrRel(r, c.wantR, c.tol, c.tol) {
			t.Errorf("%s: rnorm = %.17g, want %.17g", c.name, r, c.wantR)
		}
	}
}

func TestNNLSRankDeficient(t *testing.T) {
	t.Parallel()
	rnd := rand.New(rand.NewPCG(1, 1))
	for trial := range 50 {
		// Columns 0 and 2 are equal and column 3 is the sum of columns 0
		// and 1, so A has rank 2 in 4 columns.
		base, b := lsRandProblem(rnd, 8, 2)
		a := mat.NewDense(8, 4, nil)
		for i := range 8 {
			a.Set(i, 0, base.At(i, 0))
			a.Set(i, 1, base.At(i, 1))
			a.Set(i, 2, base.At(i, 0))
			a.Set(i, 3, base.At(i, 0)+base.At(i, 1))
		}
		x, r, err := NNLS(a, b)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		// The residual equals that of the rank-2 problem on the cone of
		// the independent columns (mathematical invariant: both cones
		// are the same set), which is unique.
		_, want, err := NNLS(base, b)
		if err != nil {
			t.Fatal(err)
		}
		if !scalar.EqualWithinAbsOrRel(r, want, 1e-12, 1e-12) {
			t.Errorf("trial %d: rank-deficient rnorm %v, full-rank equivalent %v", trial, r, want)
		}
		lo, hi := make([]float64, 4), []float64{math.Inf(1), math.Inf(1), math.Inf(1), math.Inf(1)}
		lsCheckKKT(t, "rank-deficient", a, b, lo, hi, x)
	}
}

func TestLeastSquaresErrors(t *testing.T) {
	t.Parallel()
	a := mat.NewDense(2, 2, []float64{1, 0, 0, 1})
	inf := math.Inf(1)
	for _, c := range []struct {
		name   string
		a      *mat.Dense
		b      []float64
		lo, hi []float64
		finite bool // error wraps ErrNotFinite
	}{
		{name: "NaN in A", a: mat.NewDense(2, 2, []float64{1, math.NaN(), 0, 1}), b: []float64{1, 1}, finite: true},
		{name: "Inf in b", a: a, b: []float64{inf, 1}, finite: true},
		{name: "lo > hi", a: a, b: []float64{1, 1}, lo: []float64{0, 2}, hi: []float64{1, 1}},
		{name: "lo = +Inf", a: a, b: []float64{1, 1}, lo: []float64{0, inf}, hi: []float64{1, inf}, finite: true},
		{name: "NaN bound", a: a, b: []float64{1, 1}, lo: []float64{0, 0}, hi: []float64{math.NaN(), 1}, finite: true},
	} {
		var err error
		if c.lo == nil {
			_, _, err = NNLS(c.a, c.b)
		} else {
			_, _, err = BoundedLS(c.a, c.b, c.lo, c.hi)
		}
		if err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		if errors.Is(err, ErrNotFinite) != c.finite {
			t.Errorf("%s: %v (wraps ErrNotFinite: %v, want %v)", c.name, err, !c.finite, c.finite)
		}
	}
	for _, c := range []struct {
		name string
		f    func()
	}{
		{"short b", func() { _, _, _ = NNLS(a, []float64{1}) }},
		{"short bounds", func() { _, _, _ = BoundedLS(a, []float64{1, 1}, []float64{0}, []float64{1, 1}) }},
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s: no panic", c.name)
				}
			}()
			c.f()
		}()
	}
}

func TestNNLSConvergenceError(t *testing.T) {
	t.Parallel()
	// An identity system with b > 0 needs one subproblem per variable in
	// the Lawson–Hanson order, so a cap of 2 stops it early.
	a := mat.NewDense(4, 4, []float64{1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1})
	b := []float64{1, 2, 3, 4}
	lo, hi := make([]float64, 4), []float64{math.Inf(1), math.Inf(1), math.Inf(1), math.Inf(1)}
	_, _, err := boundedLS("NNLS", a, b, lo, hi, 2)
	var ce *ConvergenceError
	if !errors.As(err, &ce) {
		t.Fatalf("got %v, want *ConvergenceError", err)
	}
	if ce.Iterations != 2 || len(ce.Best) != 4 {
		t.Fatalf("ConvergenceError %+v", ce)
	}
	// The best point is feasible and no worse than the start x = 0.
	var ss float64
	for j, v := range ce.Best {
		if v < 0 {
			t.Errorf("Best[%d] = %v < 0", j, v)
		}
		ss += (b[j] - v) * (b[j] - v)
	}
	if !scalar.EqualWithinAbsOrRel(ce.Residual, math.Sqrt(ss), 1e-14, 1e-14) || ce.Residual >= lsNorm(b) {
		t.Errorf("Residual %v (recomputed %v, start %v)", ce.Residual, math.Sqrt(ss), lsNorm(b))
	}
}

// TestBoundedLSProperties checks, on rapid-generated problems, that the
// solution is feasible, satisfies the KKT conditions and is no worse than
// random feasible points (mathematical invariants of convex least squares).
func TestBoundedLSProperties(t *testing.T) {
	t.Parallel()
	rapid.Check(t, func(rt *rapid.T) {
		m := rapid.IntRange(1, 12).Draw(rt, "m")
		n := rapid.IntRange(1, 6).Draw(rt, "n")
		vals := rapid.SliceOfN(rapid.Float64Range(-10, 10), m*n, m*n).Draw(rt, "A")
		a := mat.NewDense(m, n, vals)
		b := rapid.SliceOfN(rapid.Float64Range(-10, 10), m, m).Draw(rt, "b")
		lo := make([]float64, n)
		hi := make([]float64, n)
		for j := range n {
			l := rapid.Float64Range(-5, 5).Draw(rt, "lo")
			w := rapid.Float64Range(0, 5).Draw(rt, "width")
			lo[j], hi[j] = l, l+w
			if rapid.Bool().Draw(rt, "open") {
				hi[j] = math.Inf(1)
			}
		}
		x, r, err := BoundedLS(a, b, lo, hi)
		if err != nil {
			rt.Fatal(err)
		}
		var svd mat.SVD
		svd.Factorize(a, mat.SVDNone)
		sv := svd.Values(nil)
		kappa := 1.0
		if m >= n && sv[len(sv)-1] > 0 {
			kappa = sv[0] / sv[len(sv)-1]
		}
		tol := 1000 * lsEps * kappa * sv[0] * (sv[0]*lsNorm(x) + lsNorm(b))
		res := make([]float64, m)
		for i := range m {
			res[i] = b[i]
			for j := range n {
				res[i] -= a.At(i, j) * x[j]
			}
		}
		for j := range n {
			w := lsColDot(a, j, res)
			if x[j] < lo[j] || x[j] > hi[j] {
				rt.Fatalf("x[%d] = %v outside [%v, %v]", j, x[j], lo[j], hi[j])
			}
			if x[j] > lo[j] && x[j] < hi[j] && math.Abs(w) > tol ||
				x[j] == lo[j] && x[j] < hi[j] && w > tol || x[j] == hi[j] && x[j] > lo[j] && w < -tol {
				rt.Fatalf("KKT fails at %d: x %v in [%v, %v], w %v, tol %v", j, x[j], lo[j], hi[j], w, tol)
			}
		}
		// No feasible point does better (1e-9 relative: rounding).
		y := make([]float64, n)
		for range 5 {
			for j := range n {
				h := hi[j]
				if math.IsInf(h, 1) {
					h = lo[j] + 10
				}
				y[j] = lo[j] + rapid.Float64Range(0, 1).Draw(rt, "t")*(h-lo[j])
			}
			var ss float64
			for i := range m {
				d := b[i]
				for j := range n {
					d -= a.At(i, j) * y[j]
				}
				ss += d * d
			}
			if math.Sqrt(ss) < r*(1-1e-9)-1e-12 {
				rt.Fatalf("feasible y %v has residual %v < %v at x %v", y, math.Sqrt(ss), r, x)
			}
		}
	})
}

var lsSinkX []float64

func benchmarkLSNNLS(b *testing.B, m, n int) {
	rnd := rand.New(rand.NewPCG(1, 1))
	a, rhs := lsRandProblem(rnd, m, n)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		x, _, err := NNLS(a, rhs)
		if err != nil {
			b.Fatal(err)
		}
		lsSinkX = x
	}
}

// BenchmarkNNLS81x12 is the size of a spectral fit: 81 wavelengths
// (380–780 nm at 5 nm) and 12 colorants.
func BenchmarkNNLS81x12(b *testing.B) { benchmarkLSNNLS(b, 81, 12) }
