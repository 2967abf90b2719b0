package complement

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
)

// confidenceSteps is the number of angles at which WithinProbability
// integrates. The radial integral is exact, so the error is that of the
// periodic trapezoidal rule in the angle, which converges geometrically for
// an ellipse that does not touch the mean; 2048 angles hold 1e-9 in the
// tests against the Rayleigh closed form.
const confidenceSteps = 2048

// WithinProbability returns the probability that a bivariate normal
// vector with mean mean and covariance cov lies within the disc of radius
// r around the origin: P(‖d‖ ≤ r) for d ~ N(mean, cov). A distance is not
// normally distributed, so the probability that a measured Δu′v′ is within
// tolerance is this integral of the bivariate normal of (Δu′, Δv′) over the
// tolerance disc (JCGM 101:2008 §5 for the distribution of a
// multivariate output quantity; the method here is exact in the radius and
// numerical in the angle).
//
// With d = mean + L·z, L·Lᵀ = cov (an eigen factor, so a singular
// covariance is fine) and z standard normal, the probability is
// (1/2π)∫ [exp(−r₁²/2) − exp(−r₂²/2)] dθ, where r₁ ≤ r₂ are the radii at
// which the ray z = ρ(cos θ, sin θ), ρ ≥ 0, enters and leaves the disc.
// It returns an error for a radius that is not positive, a covariance that
// is not symmetric positive semi-definite, or non-finite input.
func WithinProbability(mean colorimetry.UVPrime, cov colorimetry.Cov2, r float64) (float64, error) {
	if !(r > 0) || math.IsInf(r, 0) {
		return 0, fmt.Errorf("tolerance radius %g: must be positive and finite", r)
	}
	a, b, c := cov[0][0], cov[0][1], cov[1][1]
	for _, v := range []float64{mean.U, mean.V, a, b, c, cov[1][0]} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return 0, fmt.Errorf("probability within tolerance: %w", colorimetry.ErrNotFinite)
		}
	}
	scale := math.Max(math.Abs(a), math.Abs(c))
	if math.Abs(b-cov[1][0]) > 1e-9*scale || a < 0 || c < 0 {
		return 0, fmt.Errorf("probability within tolerance: covariance %v is not symmetric positive semi-definite", cov)
	}
	// Eigen decomposition of the symmetric 2×2 covariance.
	tr, det := a+c, a*c-b*b
	disc := math.Sqrt(math.Max(tr*tr/4-det, 0))
	l1, l2 := tr/2+disc, tr/2-disc
	if l2 < -1e-9*scale {
		return 0, fmt.Errorf("probability within tolerance: covariance %v is not positive semi-definite", cov)
	}
	l1, l2 = math.Max(l1, 0), math.Max(l2, 0)
	// Unit eigenvector of l1.
	var e1 [2]float64
	switch {
	case b != 0:
		e1 = [2]float64{l1 - c, b}
	case a >= c:
		e1 = [2]float64{1, 0}
	default:
		e1 = [2]float64{0, 1}
	}
	n := math.Hypot(e1[0], e1[1])
	e1[0], e1[1] = e1[0]/n, e1[1]/n
	e2 := [2]float64{-e1[1], e1[0]}
	s1, s2 := math.Sqrt(l1), math.Sqrt(l2)
	m2 := mean.U*mean.U + mean.V*mean.V
	if s1 == 0 {
		if m2 <= r*r {
			return 1, nil
		}
		return 0, nil
	}
	var sum float64
	for k := 0; k < confidenceSteps; k++ {
		th := 2 * math.Pi * (float64(k) + 0.5) / confidenceSteps
		ct, st := math.Cos(th), math.Sin(th)
		// Direction d = L·(cos θ, sin θ) in (Δu′, Δv′).
		dx := s1*ct*e1[0] + s2*st*e2[0]
		dy := s1*ct*e1[1] + s2*st*e2[1]
		// |mean + ρ d|² = r²: ρ²|d|² + 2ρ mean·d + |mean|² − r² = 0.
		qa := dx*dx + dy*dy
		qb := 2 * (mean.U*dx + mean.V*dy)
		qc := m2 - r*r
		if qa == 0 {
			if qc <= 0 {
				sum++ // the whole ray stays inside
			}
			continue
		}
		dd := qb*qb - 4*qa*qc
		if dd < 0 {
			continue
		}
		sq := math.Sqrt(dd)
		r1 := (-qb - sq) / (2 * qa)
		r2 := (-qb + sq) / (2 * qa)
		if r2 <= 0 {
			continue
		}
		r1 = math.Max(r1, 0)
		sum += math.Exp(-r1*r1/2) - math.Exp(-r2*r2/2)
	}
	p := sum / confidenceSteps
	return math.Min(math.Max(p, 0), 1), nil
}

// Confidence returns the probability that the true Δu′v′ between the
// additive mix of a and b and the white is within tol, given the standard
// uncertainties ua and ub of their samples (independent between a and b).
// The XYZ covariance of each is exact (colorimetry.Weights.XYZCov), the
// sum's u′v′ covariance is first order (colorimetry.PropagateUVPrime), the
// white is taken as exact, and the bivariate normal of (Δu′, Δv′) is
// integrated over the tolerance disc by WithinProbability. Mode is Lights
// or Surfaces; tol ≤ 0 means DefaultDeltaUVPrime.
func (c *Conditions) Confidence(a, b colorimetry.Spectrum, ua, ub colorimetry.SpectrumUncertainty, m Mode, tol float64) (float64, error) {
	if m != Lights && m != Surfaces {
		return 0, fmt.Errorf("%w: confidence is for additive checks (lights or surfaces), not %v", ErrMode, m)
	}
	if tol <= 0 {
		tol = DefaultDeltaUVPrime
	}
	w := c.weights(m)
	xa, err := w.XYZCov(a, ua)
	if err != nil {
		return 0, &InputError{Input: "a", Err: err}
	}
	xb, err := w.XYZCov(b, ub)
	if err != nil {
		return 0, &InputError{Input: "b", Err: err}
	}
	sum, err := colorimetry.PropagateUVPrime(xa.Add(xb))
	if err != nil {
		return 0, fmt.Errorf("chromaticity of a + b: %w", err)
	}
	white := c.wuv[whiteIndex(m)]
	d := colorimetry.UVPrime{U: sum.Value.U - white.U, V: sum.Value.V - white.V}
	return WithinProbability(d, sum.Cov, tol)
}
