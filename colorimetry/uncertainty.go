package colorimetry

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// Measurement uncertainty, after the Guide to the expression of uncertainty
// in measurement (GUM, JCGM 100:2008) and its Supplement 1 on the Monte
// Carlo method (JCGM 101:2008).
//
// The tristimulus values are linear in the spectrum, so the law of
// propagation of uncertainty (JCGM 100:2008 §5.2) gives their covariance
// exactly: Σ_XYZ = A Σ_λ Aᵀ, with A the 3×n matrix that turns the samples
// of the spectrum into X, Y, Z. Everything computed from X, Y, Z (x, y,
// u′, v′, L*, a*, b*, C*ab, h_ab, ΔE00) is non-linear; its uncertainty is
// propagated to first order (JCGM 100:2008 §5.1.2 and §5.2.2) with the
// Jacobians written out beside each function, or by the Monte Carlo method
// of JCGM 101:2008 where first order is known to fail.
//
// A normal distribution stays normal under a linear map, so when the
// spectrum is taken to be normal with covariance Σ_λ, its tristimulus
// values are exactly normal with covariance Σ_XYZ. The Monte Carlo method
// therefore draws X, Y, Z from that trivariate normal: this gives the same
// distribution of every derived quantity as drawing whole spectra, at a
// fraction of the cost.

// ErrCovariance reports a covariance matrix that is not symmetric positive
// semi-definite, or a standard uncertainty that is negative.
var ErrCovariance = errors.New("covariance is not symmetric positive semi-definite")

// coverage95 is the coverage factor k = 1.959964 of a 95 % coverage
// interval for a normal distribution, the 0.975 quantile of the standard
// normal (JCGM 100:2008 Table G.1 prints 1.960).
const coverage95 = 1.959963984540054

// symTol is the relative asymmetry |c_ij − c_ji| / max c_ii that a
// covariance matrix read from a file may have; psdTol·n is the relative
// size, against the largest eigenvalue, of a negative eigenvalue that is
// accepted as round-off. Entries written to 6 significant digits are off
// by at most 5e-7 of the largest variance each, which moves any
// eigenvalue of an n×n matrix by at most n·5e-7 of the largest (Weyl's
// inequality; common practice, no source).
const (
	symTol = 1e-6
	psdTol = 1e-6
)

// SpectrumUncertainty holds the standard uncertainties of the samples of a
// spectrum: either independent standard uncertainties u(λ) or a full
// covariance matrix, on the spectrum's grid and in the squared units of the
// spectrum (for reflectance, fractions 0–1). It is immutable; the zero
// value is invalid.
type SpectrumUncertainty struct {
	grid Grid
	u    []float64     // standard uncertainties; nil when cov is set
	cov  *mat.SymDense // covariance; nil for independent samples
}

// NewSpectrumUncertainty returns uncorrelated standard uncertainties u of
// the samples of a spectrum on grid g, in the spectrum's units. It returns
// an error wrapping ErrBadGrid for an invalid grid, ErrLength when len(u)
// differs from g.N, and a *SampleError wrapping ErrNotFinite or
// ErrCovariance (negative) for a bad value. u is copied.
func NewSpectrumUncertainty(g Grid, u []float64) (SpectrumUncertainty, error) {
	if !g.Valid() {
		return SpectrumUncertainty{}, fmt.Errorf("%w: %+v", ErrBadGrid, g)
	}
	if len(u) != g.N {
		return SpectrumUncertainty{}, fmt.Errorf("%w: grid has %d wavelengths, %d standard uncertainties", ErrLength, g.N, len(u))
	}
	for i, v := range u {
		switch {
		case !isFinite(v):
			return SpectrumUncertainty{}, &SampleError{Index: i, Wavelength: g.Wavelength(i), Err: fmt.Errorf("standard uncertainty: %w", ErrNotFinite)}
		case v < 0:
			return SpectrumUncertainty{}, &SampleError{Index: i, Wavelength: g.Wavelength(i), Err: fmt.Errorf("standard uncertainty %g is negative: %w", v, ErrCovariance)}
		}
	}
	return SpectrumUncertainty{grid: g, u: slices.Clone(u)}, nil
}

// NewSpectrumCovariance returns the covariance matrix cov (g.N × g.N, in
// the squared units of the spectrum) of the samples of a spectrum on grid
// g. The matrix must be finite, symmetric and positive semi-definite,
// allowing for entries rounded to 6 significant digits: an asymmetry of up
// to 1e-6 of the largest variance, and negative eigenvalues down to
// −n·1e-6 of the largest. The symmetric part is kept (copied). It returns
// an error wrapping ErrBadGrid, ErrLength (wrong size), ErrNotFinite or
// ErrCovariance.
func NewSpectrumCovariance(g Grid, cov mat.Matrix) (SpectrumUncertainty, error) {
	if !g.Valid() {
		return SpectrumUncertainty{}, fmt.Errorf("%w: %+v", ErrBadGrid, g)
	}
	r, c := cov.Dims()
	if r != g.N || c != g.N {
		return SpectrumUncertainty{}, fmt.Errorf("%w: grid has %d wavelengths, covariance is %d×%d", ErrLength, g.N, r, c)
	}
	s, err := checkCov(r, cov.At, func(i int) string { return fmt.Sprintf("%g nm", g.Wavelength(i)) })
	if err != nil {
		return SpectrumUncertainty{}, err
	}
	return SpectrumUncertainty{grid: g, cov: s}, nil
}

// checkCov validates the n×n matrix given by at (finite, symmetric, positive
// semi-definite within symTol and psdTol) and returns its symmetric part.
// name labels row i in errors.
func checkCov(n int, at func(i, j int) float64, name func(i int) string) (*mat.SymDense, error) {
	var dmax float64
	for i := range n {
		for j := range n {
			if v := at(i, j); !isFinite(v) {
				return nil, fmt.Errorf("covariance at (%s, %s): %w", name(i), name(j), ErrNotFinite)
			}
		}
		d := at(i, i)
		if d < 0 {
			return nil, fmt.Errorf("variance %g at %s is negative: %w", d, name(i), ErrCovariance)
		}
		dmax = math.Max(dmax, d)
	}
	s := mat.NewSymDense(n, nil)
	for i := range n {
		for j := i; j < n; j++ {
			a, b := at(i, j), at(j, i)
			if math.Abs(a-b) > symTol*dmax {
				return nil, fmt.Errorf("covariance (%s, %s) = %g but (%s, %s) = %g: %w", name(i), name(j), a, name(j), name(i), b, ErrCovariance)
			}
			s.SetSym(i, j, (a+b)/2)
		}
	}
	if dmax == 0 {
		return s, nil
	}
	var eig mat.EigenSym
	if !eig.Factorize(s, false) {
		return nil, fmt.Errorf("eigenvalues of the covariance did not converge: %w", ErrCovariance)
	}
	ev := eig.RawValues() // ascending
	if lo, hi := ev[0], ev[n-1]; lo < -psdTol*float64(n)*hi {
		return nil, fmt.Errorf("covariance has eigenvalue %g (largest %g): %w", lo, hi, ErrCovariance)
	}
	return s, nil
}

// Grid returns the grid of the spectrum whose uncertainty u describes.
func (u SpectrumUncertainty) Grid() Grid { return u.grid }

// Correlated reports whether u holds a full covariance matrix rather than
// independent standard uncertainties.
func (u SpectrumUncertainty) Correlated() bool { return u.cov != nil }

// StdDev returns the standard uncertainty of each sample (the square roots
// of the variances) in dst, allocating when dst is nil, in the spectrum's
// units. It panics if dst is non-nil with a length other than Grid().N.
func (u SpectrumUncertainty) StdDev(dst []float64) []float64 {
	if dst == nil {
		dst = make([]float64, u.grid.N)
	}
	if len(dst) != u.grid.N {
		panic("colorimetry: dst length differs from grid size")
	}
	if u.cov == nil {
		copy(dst, u.u)
		return dst
	}
	for i := range dst {
		dst[i] = math.Sqrt(u.cov.At(i, i))
	}
	return dst
}

// Cov3 is the covariance matrix of three quantities, such as X, Y, Z or
// L*, a*, b*, in the squares of their units. It is symmetric.
type Cov3 [3][3]float64

// Cov2 is the covariance matrix of a chromaticity pair (x, y) or (u′, v′).
// It is symmetric.
type Cov2 [2][2]float64

// Add returns c + d, the covariance of the sum of two independent
// quantities.
func (c Cov3) Add(d Cov3) Cov3 {
	for i := range c {
		for j := range c[i] {
			c[i][j] += d[i][j]
		}
	}
	return c
}

// Scale returns k²·c, the covariance of k times the quantity.
func (c Cov3) Scale(k float64) Cov3 {
	for i := range c {
		for j := range c[i] {
			c[i][j] *= k * k
		}
	}
	return c
}

// check validates c as checkCov does and returns its symmetric part.
func (c Cov3) check() (Cov3, error) {
	s, err := checkCov(3, func(i, j int) float64 { return c[i][j] }, func(i int) string { return [3]string{"1st", "2nd", "3rd"}[i] })
	if err != nil {
		return Cov3{}, err
	}
	var r Cov3
	for i := range r {
		for j := range r[i] {
			r[i][j] = s.At(i, j)
		}
	}
	return r, nil
}

// transform returns J c Jᵀ for the Jacobian J (rows: outputs).
func (c Cov3) transform(j [3][3]float64) Cov3 {
	var r Cov3
	for p := range 3 {
		for q := p; q < 3; q++ {
			var s float64
			for k := range 3 {
				for l := range 3 {
					s += j[p][k] * c[k][l] * j[q][l]
				}
			}
			r[p][q], r[q][p] = s, s
		}
	}
	return r
}

// transform2 returns J c Jᵀ for a 2×3 Jacobian J.
func (c Cov3) transform2(j [2][3]float64) Cov2 {
	var r Cov2
	for p := range 2 {
		for q := p; q < 2; q++ {
			var s float64
			for k := range 3 {
				for l := range 3 {
					s += j[p][k] * c[k][l] * j[q][l]
				}
			}
			r[p][q], r[q][p] = s, s
		}
	}
	return r
}

// quad returns gᵀ c g.
func (c Cov3) quad(g [3]float64) float64 {
	var s float64
	for k := range 3 {
		for l := range 3 {
			s += g[k] * c[k][l] * g[l]
		}
	}
	return s
}

// isZero reports whether every entry of c is zero.
func (c Cov3) isZero() bool { return c == Cov3{} }

// sqrt0 returns √v, and 0 for v ≤ 0 (round-off below zero).
func sqrt0(v float64) float64 {
	if v <= 0 {
		return 0
	}
	return math.Sqrt(v)
}

// UncertainXYZ is a set of tristimulus values with their covariance matrix
// (on the scale of Value, e.g. white Y = 100 for object colours).
type UncertainXYZ struct {
	Value XYZ  // estimates of X, Y, Z
	Cov   Cov3 // covariance of X, Y, Z
}

// U returns the standard uncertainties u(X), u(Y), u(Z).
func (x UncertainXYZ) U() XYZ {
	return XYZ{sqrt0(x.Cov[0][0]), sqrt0(x.Cov[1][1]), sqrt0(x.Cov[2][2])}
}

// Add returns the tristimulus values of the sum of two independent
// colours, such as two lights added or two measurements summed: the values
// add and so do the covariances (JCGM 100:2008 eq. 13 with zero
// correlation between x and y).
func (x UncertainXYZ) Add(y UncertainXYZ) UncertainXYZ {
	return UncertainXYZ{Value: x.Value.Add(y.Value), Cov: x.Cov.Add(y.Cov)}
}

// Scale returns k·x: the values times k, the covariance times k².
func (x UncertainXYZ) Scale(k float64) UncertainXYZ {
	return UncertainXYZ{Value: x.Value.Scale(k), Cov: x.Cov.Scale(k)}
}

// check validates x: finite values and a valid covariance. It returns x
// with the symmetric part of its covariance.
func (x UncertainXYZ) check() (UncertainXYZ, error) {
	if !x.Value.Finite() {
		return UncertainXYZ{}, fmt.Errorf("%v: %w", x.Value, ErrNotFinite)
	}
	c, err := x.Cov.check()
	if err != nil {
		return UncertainXYZ{}, fmt.Errorf("covariance of %v: %w", x.Value, err)
	}
	return UncertainXYZ{Value: x.Value, Cov: c}, nil
}

// UncertainXY is a CIE 1931 chromaticity with its covariance matrix.
type UncertainXY struct {
	Value XY   // estimates of x, y
	Cov   Cov2 // covariance of x, y
}

// U returns the standard uncertainties u(x), u(y).
func (c UncertainXY) U() XY { return XY{sqrt0(c.Cov[0][0]), sqrt0(c.Cov[1][1])} }

// UncertainUVPrime is a CIE 1976 UCS chromaticity with its covariance
// matrix.
type UncertainUVPrime struct {
	Value UVPrime // estimates of u′, v′
	Cov   Cov2    // covariance of u′, v′
}

// U returns the standard uncertainties u(u′), u(v′).
func (c UncertainUVPrime) U() UVPrime {
	return UVPrime{sqrt0(c.Cov[0][0]), sqrt0(c.Cov[1][1])}
}

// UncertainLab is a CIELAB colour with its covariance matrix, in CIE units
// (squared).
type UncertainLab struct {
	Value Lab  // estimates of L*, a*, b*
	Cov   Cov3 // covariance of L*, a*, b*
}

// U returns the standard uncertainties u(L*), u(a*), u(b*).
func (c UncertainLab) U() Lab {
	return Lab{sqrt0(c.Cov[0][0]), sqrt0(c.Cov[1][1]), sqrt0(c.Cov[2][2])}
}

// Propagation says how an uncertainty was evaluated. The zero value is the
// GUM law of propagation to first order (JCGM 100:2008 §5); Draws > 0
// means the Monte Carlo method of JCGM 101:2008 with that many trials.
type Propagation struct {
	Draws int    // number of Monte Carlo trials M; 0 for GUM first order
	Seed  uint64 // seed of the generator, when Draws > 0
}

// String returns "GUM first order" or, for example,
// "Monte Carlo (JCGM 101), 100000 draws, seed 1".
func (p Propagation) String() string {
	if p.Draws == 0 {
		return "GUM first order"
	}
	return fmt.Sprintf("Monte Carlo (JCGM 101), %d draws, seed %d", p.Draws, p.Seed)
}

// Uncertain is a scalar output quantity with its standard uncertainty and
// a 95 % coverage interval, all in the quantity's unit.
//
// Under GUM first order, Mean equals Value and the interval is
// Value ± 1.96·U (the normal distribution, JCGM 100:2008 §G.2). Under the
// Monte Carlo method, Mean and U are the mean and the standard deviation of
// the M model values (JCGM 101:2008 §7.6) and the interval is the
// probabilistically symmetric 95 % coverage interval (§7.7). For a hue
// angle, Low and High are the ends of an arc around Value and may lie
// outside [0°, 360°) when it contains 0°.
type Uncertain struct {
	Value     float64     // the model evaluated at the input estimates
	Mean      float64     // the expectation; differs from Value under Monte Carlo
	U         float64     // standard uncertainty
	Low, High float64     // ends of the 95 % coverage interval
	Method    Propagation // how the uncertainty was evaluated
}

// gum returns the first-order result for value v with standard
// uncertainty u.
func gum(v, u float64) Uncertain {
	return Uncertain{Value: v, Mean: v, U: u, Low: v - coverage95*u, High: v + coverage95*u}
}

// UncertainLCh holds CIELAB lightness, chroma and hue angle with their
// uncertainties: L* and C*ab in CIE units, h_ab in degrees.
type UncertainLCh struct {
	L, C, H Uncertain
}

// MonteCarlo configures the Monte Carlo method of JCGM 101:2008 where a
// function falls back on it. The zero value gives DefaultDraws trials with
// seed 0 and lets the function choose the method.
type MonteCarlo struct {
	// Draws is the number of trials M; zero means DefaultDraws.
	Draws int
	// Seed seeds the generator, math/rand/v2 PCG with both words set to
	// Seed, so that results are reproducible. Zero is a valid seed.
	Seed uint64
	// Always makes the function use the Monte Carlo method whatever its
	// rule says, for instance to validate a first-order result
	// (JCGM 101:2008 §8).
	Always bool
}

// DefaultDraws is the number of Monte Carlo trials used when
// MonteCarlo.Draws is zero: 10⁵, enough for two significant digits of a
// standard uncertainty (the relative standard error of a standard deviation
// from M draws is about 1/√(2M) = 0.2 %) and of the ends of a 95 %
// coverage interval. JCGM 101:2008 §7.2.2 suggests M = 10⁶ (from memory);
// set Draws for that.
const DefaultDraws = 100000

// firstOrderRatio is the rule by which the functions below leave GUM first
// order for Monte Carlo: a chroma C*ab or a colour difference ΔE00 that is
// not larger than firstOrderRatio times its first-order standard
// uncertainty. Near zero such a quantity is a norm, not differentiable at
// zero and far from normally distributed; at 3 u the nearest zero is three
// standard deviations away, and first order is good to a few percent
// (common practice, no source).
const firstOrderRatio = 3

// rng returns the number of trials, the Propagation to report and the
// seeded generator of mc.
func (mc MonteCarlo) rng() (int, Propagation, *rand.Rand) {
	m := mc.Draws
	if m <= 0 {
		m = DefaultDraws
	}
	return m, Propagation{Draws: m, Seed: mc.Seed}, rand.New(rand.NewPCG(mc.Seed, mc.Seed))
}

// XYZCov returns the tristimulus values of s with their covariance matrix,
// given the uncertainty u of its samples (u on s's grid). The propagation is
// exact, since X, Y, Z are linear in the spectrum (JCGM 100:2008 §5.2,
// eq. 13 in matrix form): Σ_XYZ = A Σ_λ Aᵀ, where column j of A is
// ∂(X, Y, Z)/∂s(λ_j). On w's grid A is the weighting table itself. A
// spectrum on another grid is resampled by its own interpolation and
// extrapolation rules, which are linear in the samples too; then column j
// of A is the XYZ of the j-th unit spectrum resampled in the same way, so
// the covariance carries the interpolation matrix exactly.
//
// For object weights the scale is that of the perfect diffuser, Y = 100,
// and the white is taken as exact. It returns an error wrapping ErrBadGrid
// when u is not on s's grid (or is the zero value), and the errors of
// Weights.XYZ.
func (w *Weights) XYZCov(s Spectrum, u SpectrumUncertainty) (UncertainXYZ, error) {
	if !u.grid.Valid() {
		return UncertainXYZ{}, fmt.Errorf("%w: spectrum uncertainty has no grid", ErrBadGrid)
	}
	if !u.grid.Equal(s.grid) {
		return UncertainXYZ{}, fmt.Errorf("%w: uncertainty on %v, spectrum on %v", ErrBadGrid, u.grid, s.grid)
	}
	c, err := w.XYZ(s)
	if err != nil {
		return UncertainXYZ{}, err
	}
	a, err := w.sensitivity(s)
	if err != nil {
		return UncertainXYZ{}, err
	}
	var cov Cov3
	if u.cov == nil {
		for p := range 3 {
			for q := p; q < 3; q++ {
				var sum float64
				for i, ui := range u.u {
					sum += a[p][i] * a[q][i] * ui * ui
				}
				cov[p][q], cov[q][p] = sum, sum
			}
		}
	} else {
		var t mat.VecDense
		for p := range 3 {
			t.MulVec(u.cov, mat.NewVecDense(len(a[p]), a[p]))
			for q := p; q < 3; q++ {
				sum := mat.Dot(&t, mat.NewVecDense(len(a[q]), a[q]))
				cov[p][q], cov[q][p] = sum, sum
			}
		}
	}
	return UncertainXYZ{Value: c, Cov: cov}, nil
}

// sensitivity returns the rows of A, the 3×n matrix (n = s.Len()) with
// XYZ = A·s: the weights themselves when s is on w's grid, otherwise the
// weights applied to each resampled unit spectrum. The returned slices
// must not be modified.
func (w *Weights) sensitivity(s Spectrum) ([3][]float64, error) {
	if s.grid.Equal(w.grid) {
		return [3][]float64{w.wx, w.wy, w.wz}, nil
	}
	n := s.Len()
	a := [3][]float64{make([]float64, n), make([]float64, n), make([]float64, n)}
	e := make([]float64, n)
	out := make([]float64, w.grid.N)
	for j := range n {
		e[j] = 1
		if err := resample(out, s.grid, e, s.interp, s.extrap, w.grid); err != nil {
			return a, err
		}
		e[j] = 0
		c := w.dot(out)
		a[0][j], a[1][j], a[2][j] = c.X, c.Y, c.Z
	}
	return a, nil
}

// PropagateXY returns the chromaticity x, y of x.Value with its covariance
// to first order, J Σ_XYZ Jᵀ, with the analytic Jacobian (S = X + Y + Z):
//
//	∂x/∂X = (Y+Z)/S²   ∂x/∂Y = −X/S²      ∂x/∂Z = −X/S²
//	∂y/∂X = −Y/S²      ∂y/∂Y = (X+Z)/S²   ∂y/∂Z = −Y/S²
//
// It returns ErrZeroLuminance when S = 0, ErrNotFinite for non-finite
// values and ErrCovariance for an invalid covariance.
func PropagateXY(x UncertainXYZ) (UncertainXY, error) {
	x, err := x.check()
	if err != nil {
		return UncertainXY{}, err
	}
	v, err := x.Value.XY()
	if err != nil {
		return UncertainXY{}, err
	}
	c := x.Value
	s := c.X + c.Y + c.Z
	s2 := s * s
	j := [2][3]float64{
		{(c.Y + c.Z) / s2, -c.X / s2, -c.X / s2},
		{-c.Y / s2, (c.X + c.Z) / s2, -c.Y / s2},
	}
	return UncertainXY{Value: v, Cov: x.Cov.transform2(j)}, nil
}

// PropagateUVPrime returns the CIE 1976 chromaticity u′, v′ of x.Value with
// its covariance to first order, J Σ_XYZ Jᵀ, with the analytic Jacobian
// (D = X + 15Y + 3Z):
//
//	∂u′/∂X = 4(15Y+3Z)/D²   ∂u′/∂Y = −60X/D²        ∂u′/∂Z = −12X/D²
//	∂v′/∂X = −9Y/D²         ∂v′/∂Y = 9(X+3Z)/D²     ∂v′/∂Z = −27Y/D²
//
// Use it with UncertainXYZ.Add for the chromaticity of a sum of
// independent lights. It returns ErrZeroLuminance when D = 0, ErrNotFinite
// for non-finite values and ErrCovariance for an invalid covariance.
func PropagateUVPrime(x UncertainXYZ) (UncertainUVPrime, error) {
	x, err := x.check()
	if err != nil {
		return UncertainUVPrime{}, err
	}
	v, err := x.Value.UVPrime()
	if err != nil {
		return UncertainUVPrime{}, err
	}
	c := x.Value
	d := c.X + 15*c.Y + 3*c.Z
	d2 := d * d
	j := [2][3]float64{
		{4 * (15*c.Y + 3*c.Z) / d2, -60 * c.X / d2, -12 * c.X / d2},
		{-9 * c.Y / d2, 9 * (c.X + 3*c.Z) / d2, -27 * c.Y / d2},
	}
	return UncertainUVPrime{Value: v, Cov: x.Cov.transform2(j)}, nil
}

// labJacobian returns ∂(L*, a*, b*)/∂(X, Y, Z) at c relative to white,
// written out from CIE 015:2018 eq. 8.8–8.11: with f the CIE function and
// f′(t) = 1/(3 f(t)²) above (6/29)³ and 841/108 below,
//
//	∂L*/∂Y = 116 f′y/Yn
//	∂a*/∂X = 500 f′x/Xn   ∂a*/∂Y = −500 f′y/Yn
//	∂b*/∂Y = 200 f′y/Yn   ∂b*/∂Z = −200 f′z/Zn
//
// and the other entries zero. The two branches of f meet with equal slope,
// so the Jacobian is continuous.
func labJacobian(c, white XYZ) [3][3]float64 {
	df := func(t, n float64) float64 {
		if t > labEpsilon {
			f := math.Cbrt(t)
			return 1 / (3 * f * f * n)
		}
		return labSlope / n
	}
	dx := df(c.X/white.X, white.X)
	dy := df(c.Y/white.Y, white.Y)
	dz := df(c.Z/white.Z, white.Z)
	return [3][3]float64{
		{0, 116 * dy, 0},
		{500 * dx, -500 * dy, 0},
		{0, 200 * dy, -200 * dz},
	}
}

// PropagateLab returns the CIELAB coordinates of x.Value relative to white
// (on the same scale, white taken as exact) with their covariance to first
// order, J Σ_XYZ Jᵀ, with the analytic Jacobian of labJacobian:
// ∂L*/∂Y = 116 f′(Y/Yn)/Yn, ∂a*/∂X = 500 f′(X/Xn)/Xn,
// ∂a*/∂Y = −500 f′(Y/Yn)/Yn, ∂b*/∂Y = 200 f′(Y/Yn)/Yn,
// ∂b*/∂Z = −200 f′(Z/Zn)/Zn, where f′(t) = t^(−2/3)/3 above (6/29)³ and
// 841/108 below. It returns the errors of XYZ.Lab and ErrCovariance for an
// invalid covariance.
func PropagateLab(x UncertainXYZ, white XYZ) (UncertainLab, error) {
	x, err := x.check()
	if err != nil {
		return UncertainLab{}, err
	}
	v, err := x.Value.Lab(white)
	if err != nil {
		return UncertainLab{}, err
	}
	return UncertainLab{Value: v, Cov: x.Cov.transform(labJacobian(x.Value, white))}, nil
}

// PropagateLCh returns CIELAB lightness L*, chroma C*ab and hue angle h_ab
// (degrees) of x.Value relative to white, with uncertainties.
//
// L* is always propagated to first order. C*ab and h_ab are propagated to
// first order from the covariance of a*, b* (see PropagateLab), with
//
//	∂C/∂a* = a*/C   ∂C/∂b* = b*/C
//	∂h/∂a* = −b*/C² · 180/π   ∂h/∂b* = a*/C² · 180/π   (degrees)
//
// unless C*ab ≤ 3·u(C*ab) to first order (or mc.Always): near the neutral
// axis the chroma is not differentiable and the hue is undefined, so both
// are then evaluated by the Monte Carlo method (JCGM 101:2008), drawing
// X, Y, Z from the normal distribution with covariance x.Cov. The hue's
// Monte Carlo mean and interval are taken on the angle from the estimate,
// wrapped to (−180°, 180°]. With a zero covariance every uncertainty is
// zero. It returns the errors of PropagateLab.
func PropagateLCh(x UncertainXYZ, white XYZ, mc MonteCarlo) (UncertainLCh, error) {
	lab, err := PropagateLab(x, white)
	if err != nil {
		return UncertainLCh{}, err
	}
	x, _ = x.check() // checked by PropagateLab
	l := lab.Value
	r := UncertainLCh{L: gum(l.L, sqrt0(lab.Cov[0][0]))}
	c, h := polar(l.A, l.B)
	if lab.Cov.isZero() {
		r.C, r.H = gum(c, 0), gum(h, 0)
		return r, nil
	}
	var uc, uh float64
	if c > 0 {
		const deg = 180 / math.Pi
		// The L* entries of the gradients are zero, so only the a*, b*
		// block of the covariance counts.
		uc = sqrt0(lab.Cov.quad([3]float64{0, l.A / c, l.B / c}))
		uh = sqrt0(lab.Cov.quad([3]float64{0, -l.B / (c * c) * deg, l.A / (c * c) * deg}))
	}
	if !mc.Always && c > firstOrderRatio*uc {
		r.C, r.H = gum(c, uc), gum(h, uh)
		return r, nil
	}
	m, p, rng := mc.rng()
	d := newNormal3(x)
	cs, hs := make([]float64, m), make([]float64, m)
	for i := range m {
		li, err := d.draw(rng).Lab(white)
		if err != nil {
			return UncertainLCh{}, fmt.Errorf("trial %d of the Monte Carlo method: %w", i+1, err)
		}
		ci, hi := polar(li.A, li.B)
		cs[i] = ci
		dh := math.Mod(hi-h, 360)
		switch {
		case dh > 180:
			dh -= 360
		case dh <= -180:
			dh += 360
		}
		hs[i] = dh
	}
	r.C = summarize(cs, c, p)
	r.H = summarize(hs, 0, p)
	r.H.Value = h
	r.H.Mean += h
	r.H.Low += h
	r.H.High += h
	return r, nil
}

// ColourUncertainty gathers the colorimetric quantities of one colour with
// their uncertainties: see XYZCov, PropagateXY, PropagateUVPrime,
// PropagateLab and PropagateLCh.
type ColourUncertainty struct {
	XYZ     UncertainXYZ     // tristimulus values
	XY      UncertainXY      // CIE 1931 chromaticity
	UVPrime UncertainUVPrime // CIE 1976 UCS chromaticity
	Lab     UncertainLab     // CIELAB, relative to the white
	LCh     UncertainLCh     // L*, C*ab, h_ab (degrees)
}

// PropagateColour returns x with the chromaticities, CIELAB and CIELCh of
// x.Value relative to white (an object colour's perfect-diffuser white,
// Weights.White), each with its uncertainty, as the functions
// PropagateXY, PropagateUVPrime, PropagateLab and PropagateLCh compute
// them. For lights, which have no white, call PropagateXY and
// PropagateUVPrime. It returns the first error of those functions.
func PropagateColour(x UncertainXYZ, white XYZ, mc MonteCarlo) (ColourUncertainty, error) {
	xc, err := x.check()
	if err != nil {
		return ColourUncertainty{}, err
	}
	r := ColourUncertainty{XYZ: xc}
	if r.XY, err = PropagateXY(xc); err != nil {
		return ColourUncertainty{}, err
	}
	if r.UVPrime, err = PropagateUVPrime(xc); err != nil {
		return ColourUncertainty{}, err
	}
	if r.Lab, err = PropagateLab(xc, white); err != nil {
		return ColourUncertainty{}, err
	}
	if r.LCh, err = PropagateLCh(xc, white, mc); err != nil {
		return ColourUncertainty{}, err
	}
	return r, nil
}

// deStep is the step, in CIE units of L*, a* and b*, of the central
// differences that give the gradient of ΔE00. Their truncation error is
// about deStep²/ΔE² relative (ΔE00 behaves like a norm, whose third
// derivatives scale as 1/ΔE²) and their round-off about 1e-16·100/deStep;
// with 1e-5 both stay below 1e-6 for ΔE00 ≥ 0.01, and smaller differences
// go to Monte Carlo anyway (common practice, no source).
const deStep = 1e-5

// deGrad returns ∂ΔE00/∂(L*, a*, b*) of the first argument at (a, b) by
// central differences of step deStep.
func deGrad(a, b Lab) [3]float64 {
	var g [3]float64
	for k := range 3 {
		p, m := a, a
		switch k {
		case 0:
			p.L += deStep
			m.L -= deStep
		case 1:
			p.A += deStep
			m.A -= deStep
		default:
			p.B += deStep
			m.B -= deStep
		}
		g[k] = (DeltaE2000(p, b) - DeltaE2000(m, b)) / (2 * deStep)
	}
	return g
}

// PropagateDeltaE2000 returns the CIEDE2000 colour difference ΔE00 (CIE
// units) between the colours a and b, whose tristimulus values are
// independent, relative to white (both on the white's scale, the white
// taken as exact), with its uncertainty.
//
// To first order, u²(ΔE00) = g_aᵀ Σ_Lab,a g_a + g_bᵀ Σ_Lab,b g_b, where
// Σ_Lab is the first-order CIELAB covariance of each colour (PropagateLab)
// and g the gradient of ΔE00 with respect to that colour's L*, a*, b*,
// taken by central differences of step 1e-5 CIE units. ΔE00 is not
// differentiable where it is zero and far from normally distributed near
// it, so when ΔE00 ≤ 3·u(ΔE00) to first order (or mc.Always) the Monte
// Carlo method (JCGM 101:2008) is used instead, drawing both sets of
// tristimulus values from their normal distributions. With both
// covariances zero the uncertainty is zero. It returns the errors of
// PropagateLab.
func PropagateDeltaE2000(a, b UncertainXYZ, white XYZ, mc MonteCarlo) (Uncertain, error) {
	la, err := PropagateLab(a, white)
	if err != nil {
		return Uncertain{}, fmt.Errorf("first colour: %w", err)
	}
	lb, err := PropagateLab(b, white)
	if err != nil {
		return Uncertain{}, fmt.Errorf("second colour: %w", err)
	}
	de := DeltaE2000(la.Value, lb.Value)
	if la.Cov.isZero() && lb.Cov.isZero() {
		return gum(de, 0), nil
	}
	u := sqrt0(la.Cov.quad(deGrad(la.Value, lb.Value)) + lb.Cov.quad(deGrad(lb.Value, la.Value)))
	if !mc.Always && de > firstOrderRatio*u {
		return gum(de, u), nil
	}
	a, _ = a.check() // checked by PropagateLab
	b, _ = b.check()
	m, p, rng := mc.rng()
	da, db := newNormal3(a), newNormal3(b)
	v := make([]float64, m)
	for i := range m {
		ta, err := da.draw(rng).Lab(white)
		if err != nil {
			return Uncertain{}, fmt.Errorf("trial %d of the Monte Carlo method, first colour: %w", i+1, err)
		}
		tb, err := db.draw(rng).Lab(white)
		if err != nil {
			return Uncertain{}, fmt.Errorf("trial %d of the Monte Carlo method, second colour: %w", i+1, err)
		}
		v[i] = DeltaE2000(ta, tb)
	}
	return summarize(v, de, p), nil
}

// DeltaE2000Uncertainty returns ΔE00 between the object colours a and b
// (reflectance or transmittance, with the independent uncertainties ua and
// ub of their samples) under w's illuminant and observer, relative to
// w.White(), with its uncertainty: XYZCov for each, then
// PropagateDeltaE2000. It returns their errors; light weights, which have
// no white, give ErrWhitePoint.
func (w *Weights) DeltaE2000Uncertainty(a, b Spectrum, ua, ub SpectrumUncertainty, mc MonteCarlo) (Uncertain, error) {
	xa, err := w.XYZCov(a, ua)
	if err != nil {
		return Uncertain{}, fmt.Errorf("first spectrum: %w", err)
	}
	xb, err := w.XYZCov(b, ub)
	if err != nil {
		return Uncertain{}, fmt.Errorf("second spectrum: %w", err)
	}
	return PropagateDeltaE2000(xa, xb, w.White(), mc)
}

// normal3 draws from a trivariate normal distribution: mean + L·z with
// z standard normal and L Lᵀ the covariance.
type normal3 struct {
	mean XYZ
	l    [3][3]float64
}

// newNormal3 returns the normal distribution of x. L is V·√Λ from the
// eigendecomposition of the covariance, which, unlike a Cholesky factor,
// also exists for a singular covariance; eigenvalues below zero by
// round-off count as zero. The covariance must have passed check.
func newNormal3(x UncertainXYZ) normal3 {
	d := normal3{mean: x.Value}
	s := mat.NewSymDense(3, nil)
	for i := range 3 {
		for j := i; j < 3; j++ {
			s.SetSym(i, j, x.Cov[i][j])
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(s, true) {
		// A 3×3 symmetric matrix that passed check always factorizes.
		panic("colorimetry: eigendecomposition of a 3×3 covariance failed")
	}
	var vec mat.Dense
	eig.VectorsTo(&vec)
	ev := eig.RawValues()
	for i := range 3 {
		for k := range 3 {
			d.l[i][k] = vec.At(i, k) * sqrt0(ev[k])
		}
	}
	return d
}

// draw returns one sample.
func (d *normal3) draw(r *rand.Rand) XYZ {
	z0, z1, z2 := r.NormFloat64(), r.NormFloat64(), r.NormFloat64()
	l := &d.l
	return XYZ{
		X: d.mean.X + l[0][0]*z0 + l[0][1]*z1 + l[0][2]*z2,
		Y: d.mean.Y + l[1][0]*z0 + l[1][1]*z1 + l[1][2]*z2,
		Z: d.mean.Z + l[2][0]*z0 + l[2][1]*z1 + l[2][2]*z2,
	}
}

// summarize returns the Monte Carlo result for the model values v (sorted
// in place) of a quantity whose value at the estimates is value: mean and
// standard deviation (JCGM 101:2008 §7.6) and the probabilistically
// symmetric 95 % coverage interval [y_(r), y_(r+q)] with q = 0.95·M and
// r = (M − q)/2 rounded to integers (§7.7.1; 1-based order statistics).
func summarize(v []float64, value float64, p Propagation) Uncertain {
	m := len(v)
	var mean float64
	for _, x := range v {
		mean += x
	}
	mean /= float64(m)
	var ss float64
	for _, x := range v {
		ss += (x - mean) * (x - mean)
	}
	var sd float64
	if m > 1 {
		sd = math.Sqrt(ss / float64(m-1))
	}
	slices.Sort(v)
	q := int(math.Round(0.95 * float64(m)))
	r := max(int(math.Round(float64(m-q)/2)), 1)
	hi := min(r+q, m)
	return Uncertain{Value: value, Mean: mean, U: sd, Low: v[r-1], High: v[hi-1], Method: p}
}
