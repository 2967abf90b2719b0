package complement_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// TestWithinProbabilityRayleigh checks the isotropic, centred case against
// the Rayleigh distribution: for d ~ N(0, σ²I), P(‖d‖ ≤ r) =
// 1 − exp(−r²/(2σ²)) exactly (any text on the Rayleigh distribution, e.g.
// Papoulis, Probability, Random Variables and Stochastic Processes; from
// memory).
func TestWithinProbabilityRayleigh(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ sigma, r float64 }{
		{0.001, 0.001}, {0.0005, 0.001}, {0.002, 0.001}, {1e-6, 0.001},
	} {
		cov := colorimetry.Cov2{{tc.sigma * tc.sigma, 0}, {0, tc.sigma * tc.sigma}}
		got, err := complement.WithinProbability(colorimetry.UVPrime{}, cov, tc.r)
		if err != nil {
			t.Fatal(err)
		}
		want := -math.Expm1(-tc.r * tc.r / (2 * tc.sigma * tc.sigma))
		if math.Abs(got-want) > 1e-9 {
			t.Errorf("σ %g r %g: got %.12f want %.12f", tc.sigma, tc.r, got, want)
		}
	}
}

// TestWithinProbabilityMonteCarlo checks correlated, off-centre and singular
// cases against a Monte Carlo estimate (JCGM 101:2008: the probability is
// the fraction of draws inside the disc); the tolerance is 4 binomial
// standard errors of 200 000 draws.
func TestWithinProbabilityMonteCarlo(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(1, 1))
	for _, tc := range []struct {
		mean colorimetry.UVPrime
		cov  colorimetry.Cov2
	}{
		{colorimetry.UVPrime{U: 0.0004, V: -0.0002}, colorimetry.Cov2{{4e-7, 1.5e-7}, {1.5e-7, 1e-7}}},
		{colorimetry.UVPrime{U: 0.0015, V: 0}, colorimetry.Cov2{{2.5e-7, 0}, {0, 2.5e-7}}},
		{colorimetry.UVPrime{U: 0.0002, V: 0.0001}, colorimetry.Cov2{{1e-6, 1e-6}, {1e-6, 1e-6}}}, // singular
	} {
		got, err := complement.WithinProbability(tc.mean, tc.cov, 0.001)
		if err != nil {
			t.Fatal(err)
		}
		// Draw with a Cholesky-free factor: the 2×2 square root.
		a, b, c := tc.cov[0][0], tc.cov[0][1], tc.cov[1][1]
		s := math.Sqrt(a*c - b*b)
		tt := math.Sqrt(a + c + 2*s)
		f := [2][2]float64{{(a + s) / tt, b / tt}, {b / tt, (c + s) / tt}}
		const n = 200000
		in := 0
		for range n {
			z1, z2 := rng.NormFloat64(), rng.NormFloat64()
			du := tc.mean.U + f[0][0]*z1 + f[0][1]*z2
			dv := tc.mean.V + f[1][0]*z1 + f[1][1]*z2
			if du*du+dv*dv <= 1e-6 {
				in++
			}
		}
		p := float64(in) / n
		se := math.Sqrt(p*(1-p)/n) + 1e-6
		if math.Abs(got-p) > 4*se {
			t.Errorf("mean %v cov %v: got %.5f, Monte Carlo %.5f ± %.5f", tc.mean, tc.cov, got, p, se)
		}
	}
}

func TestWithinProbabilityEdges(t *testing.T) {
	t.Parallel()
	zero := colorimetry.Cov2{}
	if p, _ := complement.WithinProbability(colorimetry.UVPrime{U: 0.0005}, zero, 0.001); p != 1 {
		t.Errorf("exact inside: %g", p)
	}
	if p, _ := complement.WithinProbability(colorimetry.UVPrime{U: 0.002}, zero, 0.001); p != 0 {
		t.Errorf("exact outside: %g", p)
	}
	for _, bad := range []colorimetry.Cov2{{{-1e-6, 0}, {0, 1e-6}}, {{1e-6, 2e-6}, {2e-6, 1e-6}}, {{math.NaN(), 0}, {0, 1}}} {
		if _, err := complement.WithinProbability(colorimetry.UVPrime{}, bad, 0.001); err == nil {
			t.Errorf("covariance %v accepted", bad)
		}
	}
	if _, err := complement.WithinProbability(colorimetry.UVPrime{}, zero, 0); err == nil {
		t.Error("zero radius accepted")
	}
}

// TestConfidenceComplements checks the end-to-end confidence of an exact
// spectral complement pair (r and 1 − r under D65, which sum to the
// white, Grassmann additivity): with tiny uncertainties it is certain,
// with large ones it falls, and it never leaves [0, 1].
func TestConfidenceComplements(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	r := band(t, colorimetry.Grid5nm, 480, 580)
	d, err := complement.ReflectanceComplement(r)
	if err != nil {
		t.Fatal(err)
	}
	rc := d.Spectrum
	prev := 1.0
	for _, u := range []float64{1e-6, 0.003, 0.01, 0.03} {
		ua := uniformU(t, r, u)
		ub := uniformU(t, rc, u)
		p, err := c.Confidence(r, rc, ua, ub, complement.Surfaces, 0.001)
		if err != nil {
			t.Fatal(err)
		}
		if p < 0 || p > 1 || p > prev+1e-12 {
			t.Errorf("u %g: confidence %g (previous %g)", u, p, prev)
		}
		if u == 1e-6 && p < 0.999999 {
			t.Errorf("u %g: confidence %g, want 1", u, p)
		}
		prev = p
	}
	if prev > 0.9 {
		t.Errorf("u 0.03: confidence %g should have fallen well below 1", prev)
	}
}

func uniformU(t *testing.T, s colorimetry.Spectrum, u float64) colorimetry.SpectrumUncertainty {
	t.Helper()
	v := make([]float64, s.Len())
	for i := range v {
		v[i] = u
	}
	su, err := colorimetry.NewSpectrumUncertainty(s.Grid(), v)
	if err != nil {
		t.Fatal(err)
	}
	return su
}
