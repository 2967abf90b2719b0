package mixing

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// ErrNotFinite reports a NaN or an infinity where a finite number is
// needed (a matrix or vector entry of a least-squares problem).
var ErrNotFinite = errors.New("value is not finite")

// ConvergenceError reports an iterative method that stopped at its
// iteration cap before it met its optimality conditions. Best holds the
// best point found, which satisfies the constraints; Residual is its
// objective value (for the least-squares solvers ‖A·x − b‖₂).
type ConvergenceError struct {
	Op         string    // the method, e.g. "NNLS"
	Iterations int       // iterations spent
	Best       []float64 // best feasible point found
	Residual   float64   // objective at Best
}

// Error implements the error interface.
func (e *ConvergenceError) Error() string {
	return fmt.Sprintf("%s did not converge in %d iterations (best residual %.6g)", e.Op, e.Iterations, e.Residual)
}

// NNLS returns x ≥ 0 minimising ‖A·x − b‖₂ (Lawson & Hanson 1974, "Solving
// Least Squares Problems", ch. 23), and rnorm = ‖A·x − b‖₂ at that x.
//
// It is the active-set method of Lawson and Hanson, run as the special
// case lo = 0, hi = +Inf of BoundedLS (the two algorithms coincide there).
// Columns of A that are linearly dependent are handled: the subproblems
// are solved by a rank-revealing SVD and a column enters the active set
// only while it lowers the residual.
//
// Errors: an entry of A or b that is NaN or infinite gives an error
// wrapping ErrNotFinite that names the entry; exceeding the iteration cap
// (10·n + 100 least-squares subproblems, far above the 3·n that Lawson and
// Hanson observed to suffice) gives a *ConvergenceError carrying the best
// feasible x found. It panics if len(b) differs from the number of rows of
// A.
func NNLS(a mat.Matrix, b []float64) (x []float64, rnorm float64, err error) {
	_, n := a.Dims()
	lo := make([]float64, n)
	hi := make([]float64, n)
	for j := range hi {
		hi[j] = math.Inf(1)
	}
	return boundedLS("NNLS", a, b, lo, hi, 0)
}

// BoundedLS returns lo ≤ x ≤ hi minimising ‖A·x − b‖₂ (Stark & Parker
// 1995, "Bounded-variable least-squares: an algorithm and applications",
// Computational Statistics 10, 129–141), and rnorm = ‖A·x − b‖₂ at that x.
// lo and hi may hold −Inf and +Inf (a variable with both infinite is free);
// lo[j] = hi[j] fixes x[j].
//
// Errors: NaN anywhere, an infinite entry in A or b, lo[j] = +Inf,
// hi[j] = −Inf or lo[j] > hi[j] give errors naming the entry (wrapping
// ErrNotFinite for non-finite values); exceeding the iteration cap gives a
// *ConvergenceError carrying the best feasible x found. It panics if
// len(b) differs from the number of rows of A or len(lo), len(hi) from its
// number of columns.
func BoundedLS(a mat.Matrix, b, lo, hi []float64) (x []float64, rnorm float64, err error) {
	return boundedLS("BoundedLS", a, b, lo, hi, 0)
}

// Variable states of the active-set method.
const (
	lsAtLo  int8 = iota // held at its lower bound
	lsAtHi              // held at its upper bound
	lsFree              // solved for
	lsFixed             // lo = hi
)

// boundedLS is the active-set method of Stark and Parker; maxIter ≤ 0
// selects the default cap 10·n + 100 subproblem solves.
func boundedLS(op string, a mat.Matrix, b, lo, hi []float64, maxIter int) ([]float64, float64, error) {
	m, n := a.Dims()
	if len(b) != m {
		panic("mixing: " + op + ": len(b) differs from the rows of A")
	}
	if len(lo) != n || len(hi) != n {
		panic("mixing: " + op + ": bounds length differs from the columns of A")
	}
	ad := mat.DenseCopyOf(a)
	for i := range m {
		for j := range n {
			if v := ad.At(i, j); math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, 0, fmt.Errorf("%s: A[%d,%d] = %v: %w", op, i, j, v, ErrNotFinite)
			}
		}
	}
	for i, v := range b {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, 0, fmt.Errorf("%s: b[%d] = %v: %w", op, i, v, ErrNotFinite)
		}
	}
	for j := range n {
		switch {
		case math.IsNaN(lo[j]) || math.IsInf(lo[j], 1):
			return nil, 0, fmt.Errorf("%s: lower bound lo[%d] = %v: %w", op, j, lo[j], ErrNotFinite)
		case math.IsNaN(hi[j]) || math.IsInf(hi[j], -1):
			return nil, 0, fmt.Errorf("%s: upper bound hi[%d] = %v: %w", op, j, hi[j], ErrNotFinite)
		case lo[j] > hi[j]:
			return nil, 0, fmt.Errorf("%s: lower bound lo[%d] = %v exceeds upper bound hi[%d] = %v", op, j, lo[j], j, hi[j])
		}
	}
	if maxIter <= 0 {
		maxIter = 10*n + 100
	}
	// With more rows than columns, solve the equivalent n-row problem:
	// the QR factorisation of [A | b] gives A = Q·R and Qᵀb = (c, ρ, 0…),
	// and ‖A·x − b‖² = ‖R·x − c‖² + ρ² for every x, since Q is orthogonal
	// (Lawson & Hanson 1974, ch. 23 and 25: the same reduction for
	// sequential processing). The subproblems then have n rows, not m.
	rows, rhs, rest2 := ad, b, 0.0
	if m > n {
		aug := mat.NewDense(m, n+1, nil)
		aug.Slice(0, m, 0, n).(*mat.Dense).Copy(ad)
		aug.SetCol(n, b)
		var qr mat.QR
		qr.Factorize(aug)
		var r mat.Dense
		qr.RTo(&r)
		rows = mat.DenseCopyOf(r.Slice(0, n, 0, n))
		rhs = make([]float64, n)
		for i := range rhs {
			rhs[i] = r.At(i, n)
		}
		rest2 = r.At(n, n) * r.At(n, n)
	}
	k, _ := rows.Dims()
	s := &lsActiveSet{op: op, a: rows, b: rhs, lo: lo, hi: hi, m: k, n: n, mTol: m, bNorm: lsNorm(b), maxIter: maxIter,
		x: make([]float64, n), state: make([]int8, n), r: make([]float64, k), w: make([]float64, n)}
	err := s.run()
	s.residual()
	rnorm := math.Sqrt(lsDot(s.r, s.r) + rest2)
	if err != nil {
		var ce *ConvergenceError
		if errors.As(err, &ce) {
			ce.Best = s.x
			ce.Residual = rnorm
		}
		return nil, 0, err
	}
	return s.x, rnorm, nil
}

// lsActiveSet holds the working state of boundedLS.
type lsActiveSet struct {
	op        string
	a         *mat.Dense // A, or R of its QR factorisation when A has more rows than columns
	b, lo, hi []float64  // b, or the first n entries of Qᵀb
	m, n      int        // rows and columns of a
	mTol      int        // rows of the caller's A, for the tolerances
	bNorm     float64    // ‖b‖ of the caller's b, for the tolerances
	maxIter   int
	iter      int
	x         []float64
	state     []int8
	r         []float64 // b − A·x
	w         []float64 // Aᵀ·r, the negative half-gradient of ‖A·x − b‖²
	normA     float64   // Frobenius norm of A
}

// run drives the outer loop: free the bound variable whose gradient most
// wants it inside, re-solve, repeat until the Kuhn–Tucker conditions hold.
func (s *lsActiveSet) run() error {
	s.normA = mat.Norm(s.a, 2)
	anyFree := false
	for j := range s.n {
		switch {
		case s.lo[j] == s.hi[j]:
			s.state[j], s.x[j] = lsFixed, s.lo[j]
		case !math.IsInf(s.lo[j], 0):
			s.state[j], s.x[j] = lsAtLo, s.lo[j]
		case !math.IsInf(s.hi[j], 0):
			s.state[j], s.x[j] = lsAtHi, s.hi[j]
		default:
			s.state[j], s.x[j] = lsFree, 0
			anyFree = true
		}
	}
	if anyFree {
		if _, err := s.inner(-1); err != nil {
			return err
		}
	}
	rejected := make([]bool, s.n)
	for {
		s.residual()
		for j := range s.n {
			s.w[j] = 0
			if s.state[j] == lsAtLo || s.state[j] == lsAtHi {
				s.w[j] = lsColDot(s.a, j, s.r)
			}
		}
		// Gradient tolerance: rounding in A·x and Aᵀ·r is of order
		// ε·‖A‖·(‖A‖·‖x‖ + ‖b‖) per entry, scaled by the problem size
		// (Lawson & Hanson ch. 23 leave the tolerance to the user; this
		// choice is common practice (no source)).
		tol := 10 * float64(max(s.mTol, s.n)) * lsEps * s.normA * (s.normA*lsNorm(s.x) + s.bNorm)
		t, best := -1, tol
		for j := range s.n {
			if rejected[j] {
				continue
			}
			var score float64
			switch s.state[j] {
			case lsAtLo:
				score = s.w[j]
			case lsAtHi:
				score = -s.w[j]
			default:
				continue
			}
			if score > best {
				t, best = j, score
			}
		}
		if t < 0 {
			return nil
		}
		ok, err := s.inner(t)
		if err != nil {
			return err
		}
		if !ok {
			// The subproblem moved the new variable back across the
			// bound it left: rounding made its gradient look positive
			// (Lawson & Hanson ch. 23, step 6 test). Try the next one.
			rejected[t] = true
			continue
		}
		clear(rejected)
	}
}

const lsEps = 0x1p-52

// inner frees variable t (t < 0: none) and solves the subproblem over the
// free variables, stepping back to the feasible set and binding variables
// that hit a bound until the free solution is feasible. It returns false,
// with x unchanged, if the first solve would move t outside the bound it
// left.
func (s *lsActiveSet) inner(t int) (bool, error) {
	var from int8
	if t >= 0 {
		from = s.state[t]
		s.state[t] = lsFree
	}
	first := true
	for {
		s.iter++
		if s.iter > s.maxIter {
			if t >= 0 && first {
				s.state[t] = from
			}
			return false, &ConvergenceError{Op: s.op, Iterations: s.iter - 1}
		}
		cols, z := s.solveFree()
		if first && t >= 0 {
			first = false
			var zt float64
			for k, j := range cols {
				if j == t {
					zt = z[k]
				}
			}
			if (from == lsAtLo && zt <= s.lo[t]) || (from == lsAtHi && zt >= s.hi[t]) {
				s.state[t] = from
				return false, nil
			}
		}
		first = false
		// Largest step α ∈ [0, 1] from x towards z that stays feasible.
		alpha, hit := 1.0, -1
		for k, j := range cols {
			var aj float64
			switch {
			case z[k] < s.lo[j]:
				aj = (s.x[j] - s.lo[j]) / (s.x[j] - z[k])
			case z[k] > s.hi[j]:
				aj = (s.hi[j] - s.x[j]) / (z[k] - s.x[j])
			default:
				continue
			}
			if aj < alpha || hit < 0 {
				alpha, hit = aj, j
			}
		}
		if hit < 0 {
			for k, j := range cols {
				s.x[j] = z[k]
			}
			return true, nil
		}
		alpha = math.Max(0, math.Min(alpha, 1))
		for k, j := range cols {
			s.x[j] += alpha * (z[k] - s.x[j])
		}
		for k, j := range cols {
			// Bind the limiting variable at the bound it crossed, and any
			// other that reached a bound (to rounding) on this step.
			near := 4 * lsEps * math.Max(1, math.Abs(s.x[j]))
			switch {
			case j == hit && z[k] < s.lo[j], j != hit && s.x[j] <= s.lo[j]+near:
				s.x[j], s.state[j] = s.lo[j], lsAtLo
			case j == hit, s.x[j] >= s.hi[j]-near:
				s.x[j], s.state[j] = s.hi[j], lsAtHi
			}
		}
	}
}

// solveFree solves min ‖A_F·z − (b − A_B·x_B)‖ over the free variables by
// SVD, dropping singular values below max(m, k)·ε·σ₁ (the minimum-norm
// solution on the numerical range of A_F). It returns the free columns and
// z in their order.
func (s *lsActiveSet) solveFree() ([]int, []float64) {
	var cols []int
	rhs := append([]float64(nil), s.b...)
	for j := range s.n {
		if s.state[j] == lsFree {
			cols = append(cols, j)
			continue
		}
		if s.x[j] != 0 {
			for i := range s.m {
				rhs[i] -= s.a.At(i, j) * s.x[j]
			}
		}
	}
	if len(cols) == 0 {
		return nil, nil
	}
	af := mat.NewDense(s.m, len(cols), nil)
	for k, j := range cols {
		for i := range s.m {
			af.Set(i, k, s.a.At(i, j))
		}
	}
	var svd mat.SVD
	z := make([]float64, len(cols))
	if !svd.Factorize(af, mat.SVDThin) {
		// The LAPACK SVD did not converge (not seen with finite input);
		// fall back to no movement.
		for k, j := range cols {
			z[k] = s.x[j]
		}
		return cols, z
	}
	vals := svd.Values(nil)
	rank := 0
	if len(vals) > 0 && vals[0] > 0 {
		cut := float64(max(s.mTol, len(cols))) * lsEps * vals[0]
		for _, v := range vals {
			if v > cut {
				rank++
			}
		}
	}
	if rank == 0 {
		return cols, z
	}
	var dst mat.Dense
	svd.SolveTo(&dst, mat.NewDense(s.m, 1, rhs), rank)
	for k := range cols {
		z[k] = dst.At(k, 0)
	}
	return cols, z
}

// residual sets r = b − A·x.
func (s *lsActiveSet) residual() {
	copy(s.r, s.b)
	for j := range s.n {
		if s.x[j] == 0 {
			continue
		}
		for i := range s.m {
			s.r[i] -= s.a.At(i, j) * s.x[j]
		}
	}
}

// colDot returns the dot product of column j of a with v.
func lsColDot(a *mat.Dense, j int, v []float64) float64 {
	var d float64
	for i, vi := range v {
		d += a.At(i, j) * vi
	}
	return d
}

func lsDot(u, v []float64) float64 {
	var d float64
	for i := range u {
		d += u[i] * v[i]
	}
	return d
}

func lsNorm(v []float64) float64 { return math.Sqrt(lsDot(v, v)) }
