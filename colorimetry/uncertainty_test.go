package colorimetry_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distmv"
	"pgregory.net/rapid"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// uRamp returns the standard uncertainties used with the reference script
// (see metamerism_test.go): u(λ) = 0.002 + 0.003·(λ − 380 nm)/400 nm, a
// plausible spectrophotometer figure that grows towards the red (invented
// for the test; the same numbers in the script).
func uRamp(g colorimetry.Grid) []float64 {
	u := make([]float64, g.N)
	for i := range u {
		u[i] = 0.002 + 0.003*(g.Wavelength(i)-380)/400
	}
	return u
}

// corrCov returns the correlated covariance used with the reference
// script: diag(u²) plus a fully correlated term of 0.003 (an offset common
// to all wavelengths) plus 0.002²·exp(−|λi − λj|/30 nm) (a smooth error of
// the baseline). Invented for the test, the same in the script.
func corrCov(g colorimetry.Grid, u []float64) *mat.SymDense {
	c := mat.NewSymDense(g.N, nil)
	for i := range g.N {
		for j := i; j < g.N; j++ {
			v := 0.003*0.003 + 0.002*0.002*math.Exp(-math.Abs(g.Wavelength(i)-g.Wavelength(j))/30)
			if i == j {
				v += u[i] * u[i]
			}
			c.SetSym(i, j, v)
		}
	}
	return c
}

// fataler is what the helpers below need of a *testing.T or a *rapid.T.
type fataler interface {
	Helper()
	Fatal(args ...any)
}

func mustUncertainty(t fataler, g colorimetry.Grid, u []float64) colorimetry.SpectrumUncertainty {
	t.Helper()
	su, err := colorimetry.NewSpectrumUncertainty(g, u)
	if err != nil {
		t.Fatal(err)
	}
	return su
}

func mustCovariance(t testing.TB, g colorimetry.Grid, c mat.Matrix) colorimetry.SpectrumUncertainty {
	t.Helper()
	su, err := colorimetry.NewSpectrumCovariance(g, c)
	if err != nil {
		t.Fatal(err)
	}
	return su
}

func mustXYZCov(t fataler, w *colorimetry.Weights, s colorimetry.Spectrum, u colorimetry.SpectrumUncertainty) colorimetry.UncertainXYZ {
	t.Helper()
	x, err := w.XYZCov(s, u)
	if err != nil {
		t.Fatal(err)
	}
	return x
}

// upper3 returns the upper triangle of c row by row.
func upper3(c colorimetry.Cov3) []float64 {
	return []float64{c[0][0], c[0][1], c[0][2], c[1][1], c[1][2], c[2][2]}
}

// upper2 returns the upper triangle of c row by row.
func upper2(c colorimetry.Cov2) []float64 { return []float64{c[0][0], c[0][1], c[1][1]} }

func TestPropagationReference(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid5nm
	w := mustWeights(t, cie.CIE1931(), cie.D65(), g)
	s := tcsOn5nm(t, 5)
	u := uRamp(g)
	// Reference script: XYZ and their covariance by summing 81 independent
	// uncertain reflectances, then x, y, u′, v′, L*, a*, b*, C*ab, h_ab by
	// the 'uncertainties' package's automatic differentiation. The largest
	// deviation measured is 1e-14 relative for the values and 3e-14 for the
	// covariances; refTol covers double-precision round-off.
	type ref struct {
		xyz, covXYZ []float64
		xy, covXY   []float64
		uv, covUV   []float64
		lab, covLab []float64
		c, uc       float64
		h, uh       float64
	}
	for _, tc := range []struct {
		name string
		u    colorimetry.SpectrumUncertainty
		want ref
		tol  float64
	}{
		{
			name: "independent",
			u:    mustUncertainty(t, g, u),
			want: ref{ // reference script, rows tcs05
				xyz:    []float64{24.985163084918845, 30.844189734183974, 40.35243170615055},
				covXYZ: []float64{0.0034260632665904663, 0.0027680274264699494, 0.0008748126431356528, 0.0037963410409278244, 0.00036428666488017995, 0.004900369250213382},
				xy:     []float64{0.259770217492261, 0.32068639489721223},
				covXY:  []float64{1.2024082436707554e-07, 4.0944890219603256e-08, 1.5386306032353581e-07},
				uv:     []float64{0.16418561107887097, 0.4560461452937996},
				covUV:  []float64{5.371979686608772e-08, -1.0751269248486388e-09, 5.68754374602109e-08},
				lab:    []float64{62.375882607700504, -17.526735928095395, -8.529584876091745},
				covLab: []float64{0.0027235845862835484, -0.001720870216306956, 0.00432967013569445, 0.02679435787893009, -0.005824960052417867, 0.013734773401895958},
				c:      19.492057111850535, uc: 0.14039122428102074,
				h: 205.95039624385615, uh: 0.4241304285737454,
			},
			tol: refTol,
		},
		{
			name: "correlated",
			u:    mustCovariance(t, g, corrCov(g, u)),
			want: ref{ // reference script, rows tcs05corr
				xyz:    []float64{24.985163084918845, 30.844189734183974, 40.35243170615055},
				covXYZ: []float64{0.0951611123147878, 0.09833842006838284, 0.09897740183999915, 0.10758958174564033, 0.10245941682001468, 0.1356961418045221},
				xy:     []float64{0.259770217492261, 0.32068639489721223},
				covXY:  []float64{7.030757132334872e-07, 2.7833231534729437e-07, 6.768726055301472e-07},
				uv:     []float64{0.16418561107887097, 0.4560461452937996},
				covUV:  []float64{2.759459252062465e-07, 4.546320911284811e-08, 2.6960005958099894e-07},
				lab:    []float64{62.375882607700504, -17.526735928095395, -8.529584876091745},
				covLab: []float64{0.0771873030710391, 0.023226450019272305, 0.030093738230089696, 0.10337400381509822, -0.017963310995585593, 0.06542016620411631},
				c:      19.492057111850535, uc: 0.2863043945114545,
				h: 205.95039624385615, uh: 0.8661333504691003,
			},
			tol: refTol,
		},
	} {
		x := mustXYZCov(t, w, s, tc.u)
		r, err := colorimetry.PropagateColour(x, w.White(), colorimetry.MonteCarlo{})
		if err != nil {
			t.Fatal(err)
		}
		check := func(what string, got, want []float64) {
			t.Helper()
			for i := range want {
				if !scalar.EqualWithinAbsOrRel(got[i], want[i], tc.tol*math.Abs(want[i]), tc.tol) {
					t.Errorf("%s: %s[%d] = %.15g, want %.15g", tc.name, what, i, got[i], want[i])
				}
			}
		}
		check("XYZ", []float64{r.XYZ.Value.X, r.XYZ.Value.Y, r.XYZ.Value.Z}, tc.want.xyz)
		check("cov XYZ", upper3(r.XYZ.Cov), tc.want.covXYZ)
		check("xy", []float64{r.XY.Value.X, r.XY.Value.Y}, tc.want.xy)
		check("cov xy", upper2(r.XY.Cov), tc.want.covXY)
		check("u′v′", []float64{r.UVPrime.Value.U, r.UVPrime.Value.V}, tc.want.uv)
		check("cov u′v′", upper2(r.UVPrime.Cov), tc.want.covUV)
		check("Lab", []float64{r.Lab.Value.L, r.Lab.Value.A, r.Lab.Value.B}, tc.want.lab)
		check("cov Lab", upper3(r.Lab.Cov), tc.want.covLab)
		check("C, u(C), h, u(h)", []float64{r.LCh.C.Value, r.LCh.C.U, r.LCh.H.Value, r.LCh.H.U}, []float64{tc.want.c, tc.want.uc, tc.want.h, tc.want.uh})
		check("L, u(L)", []float64{r.LCh.L.Value, r.LCh.L.U}, []float64{tc.want.lab[0], math.Sqrt(tc.want.covLab[0])})
		for _, q := range []colorimetry.Uncertain{r.LCh.L, r.LCh.C, r.LCh.H} {
			if q.Method != (colorimetry.Propagation{}) {
				t.Errorf("%s: %v used for a chroma of %g CIE units", tc.name, q.Method, r.LCh.C.Value)
			}
		}
		// The standard uncertainties are the square roots of the variances
		// (JCGM 100:2008 §5.1.2).
		if got, want := r.XYZ.U().Y, math.Sqrt(tc.want.covXYZ[3]); !scalar.EqualWithinAbsOrRel(got, want, 0, tc.tol) {
			t.Errorf("%s: u(Y) %g, want %g", tc.name, got, want)
		}
		if got, want := r.UVPrime.U().V, math.Sqrt(tc.want.covUV[2]); !scalar.EqualWithinAbsOrRel(got, want, 0, tc.tol) {
			t.Errorf("%s: u(v′) %g, want %g", tc.name, got, want)
		}
	}
}

func TestPropagateDeltaE2000Reference(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid5nm
	w := mustWeights(t, cie.CIE1931(), cie.D65(), g)
	s := tcsOn5nm(t, 5)
	su := mustUncertainty(t, g, uRamp(g))
	// Reference script: CIEDE2000 transcribed from Sharma, Wu & Dalal
	// (2005) onto uncertain numbers (its value checked against colormath's
	// delta_e_cie2000 to 1e-9), first-order u(ΔE00) by automatic
	// differentiation. Here the gradient is taken by central differences of
	// step 1e-5, good to about 1e-6 relative (see deStep in
	// uncertainty.go); the largest deviation measured is 6e-10 relative,
	// and 3e-14 for ΔE00 itself.
	for _, tc := range []struct {
		name    string
		b       colorimetry.Spectrum
		want, u float64
		tolV    float64
		tolU    float64
	}{
		{"TCS05–TCS06", tcsOn5nm(t, 6), 17.349167785303315, 0.13587083179545556, refTol, 1e-6},
		{"TCS05–(TCS05+0.01)", offset(t, s, 0.01), 0.7565838037353794, 0.07041333984123005, refTol, 1e-6},
	} {
		got, err := w.DeltaE2000Uncertainty(s, tc.b, su, su, colorimetry.MonteCarlo{})
		if err != nil {
			t.Fatal(err)
		}
		if !scalar.EqualWithinAbsOrRel(got.Value, tc.want, tc.tolV, tc.tolV) {
			t.Errorf("%s: ΔE00 %.15g, want %.15g", tc.name, got.Value, tc.want)
		}
		if !scalar.EqualWithinAbsOrRel(got.U, tc.u, 0, tc.tolU) {
			t.Errorf("%s: u(ΔE00) %.15g, want %.15g", tc.name, got.U, tc.u)
		}
		if got.Method != (colorimetry.Propagation{}) || got.Mean != got.Value {
			t.Errorf("%s: ΔE00 %g ± %g evaluated by %v, want GUM first order", tc.name, got.Value, got.U, got.Method)
		}
		// The 95 % interval of a normal distribution is ±1.960 u
		// (JCGM 100:2008 Table G.1, k = 1.960 for p = 95 %).
		if !scalar.EqualWithinAbsOrRel(got.High-got.Value, 1.960*got.U, 0, 1e-4) || !scalar.EqualWithinAbsOrRel(got.Value-got.Low, 1.960*got.U, 0, 1e-4) {
			t.Errorf("%s: interval [%g, %g] around %g ± %g", tc.name, got.Low, got.High, got.Value, got.U)
		}
	}
}

// sampleXYZ draws n spectra around s (on w's grid) with independent normal
// errors of standard deviation u, or from cov when it is not nil (gonum's
// distmv.Normal, its own Cholesky factor), and returns their tristimulus
// values computed by Weights.XYZBatchTo, as an n×3 matrix.
func sampleXYZ(t testing.TB, w *colorimetry.Weights, s colorimetry.Spectrum, u []float64, cov *mat.SymDense, n int, seed uint64) *mat.Dense {
	t.Helper()
	src := rand.NewPCG(seed, seed)
	r := rand.New(src)
	mean := s.Values(nil)
	k := len(mean)
	var mvn *distmv.Normal
	if cov != nil {
		var ok bool
		mvn, ok = distmv.NewNormal(mean, cov, src)
		if !ok {
			t.Fatal("covariance is not positive definite")
		}
	}
	vals := make([]float64, n*k)
	for d := range n {
		row := vals[d*k : (d+1)*k]
		if mvn != nil {
			mvn.Rand(row)
			continue
		}
		for i := range row {
			row[i] = mean[i] + u[i]*r.NormFloat64()
		}
	}
	out := make([]float64, 3*n)
	w.XYZBatchTo(out, vals)
	return mat.NewDense(n, 3, out)
}

func TestXYZCovMonteCarlo(t *testing.T) {
	t.Parallel()
	// JCGM 101:2008 §8 (validation of the GUM uncertainty framework by a
	// Monte Carlo method): the exact covariance of X, Y, Z must agree with
	// the sample covariance of M = 20 000 Monte Carlo trials to within their
	// sampling error. The standard error of a sample covariance of normal
	// variables is √((σ_ii σ_jj + σ_ij²)/M) (Anderson, An Introduction to
	// Multivariate Statistical Analysis, 3rd ed., §3.3; from memory): about
	// 1 % of a variance for M = 20 000. The tolerance is 5 standard errors.
	const m = 20000
	g := colorimetry.Grid5nm
	w := mustWeights(t, cie.CIE1931(), cie.D65(), g)
	s := tcsOn5nm(t, 5)
	u := uRamp(g)
	cov := corrCov(g, u)
	for _, tc := range []struct {
		name string
		u    colorimetry.SpectrumUncertainty
		cov  *mat.SymDense
		seed uint64
	}{
		{"independent", mustUncertainty(t, g, u), nil, 1},
		{"correlated", mustCovariance(t, g, cov), cov, 2},
	} {
		x := mustXYZCov(t, w, s, tc.u)
		draws := sampleXYZ(t, w, s, u, tc.cov, m, tc.seed)
		var est mat.SymDense
		stat.CovarianceMatrix(&est, draws, nil)
		for i := range 3 {
			for j := range 3 {
				exact := x.Cov[i][j]
				se := math.Sqrt((x.Cov[i][i]*x.Cov[j][j] + exact*exact) / m)
				if d := math.Abs(est.At(i, j) - exact); d > 5*se {
					t.Errorf("%s: cov[%d][%d] exact %g, Monte Carlo %g (%.1f standard errors)", tc.name, i, j, exact, est.At(i, j), d/se)
				}
			}
		}
	}
}

func TestXYZCovResampled(t *testing.T) {
	t.Parallel()
	// A spectrum at 10 nm summed with 5 nm and 1 nm weights: its
	// uncertainty goes through the interpolation matrix. Resampling is
	// linear, so for an uncertainty at one wavelength λj only, u(Y) must be
	// u(λj)·|Y(e_j)|, with Y(e_j) the Y of the unit spectrum at λj resampled
	// by the spectrum's own rule (Sprague, CIE 167:2005) — computed here
	// through Spectrum.Resample and Weights.XYZ. Same arithmetic in another
	// order: round-off only (tolerance 1e-12 relative).
	src := tcsOn5nm(t, 5)
	g10 := colorimetry.Grid{Start: 380, Step: 10, N: 41}
	v := make([]float64, g10.N)
	for i := range v {
		v[i] = src.Value(2 * i)
	}
	s, err := colorimetry.NewSpectrumOnGrid(g10, v, colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, g := range []colorimetry.Grid{colorimetry.Grid5nm, colorimetry.Grid1nm} {
		w := mustWeights(t, cie.CIE1931(), cie.D65(), g)
		for _, j := range []int{0, 7, 20, 33, 40} {
			u := make([]float64, g10.N)
			u[j] = 0.01
			x := mustXYZCov(t, w, s, mustUncertainty(t, g10, u))
			e := make([]float64, g10.N)
			e[j] = 1
			ej, err := colorimetry.NewSpectrumOnGrid(g10, e, colorimetry.Options{})
			if err != nil {
				t.Fatal(err)
			}
			c, err := w.XYZ(ej)
			if err != nil {
				t.Fatal(err)
			}
			want := [3]float64{c.X, c.Y, c.Z}
			for p := range 3 {
				for q := range 3 {
					if wv := 1e-4 * want[p] * want[q]; !scalar.EqualWithinAbsOrRel(x.Cov[p][q], wv, 1e-12*math.Abs(wv)+1e-300, 1e-12) {
						t.Errorf("%v, u at %g nm: cov[%d][%d] %g, want %g", g, g10.Wavelength(j), p, q, x.Cov[p][q], wv)
					}
				}
			}
		}
		// JCGM 101 §8 check of the whole matrix: draw 10 nm spectra and sum
		// them through Weights.XYZ (which resamples each draw), 5 standard
		// errors as in TestXYZCovMonteCarlo.
		const m = 5000
		uu := uRamp(g10)
		x := mustXYZCov(t, w, s, mustUncertainty(t, g10, uu))
		r := rand.New(rand.NewPCG(3, 3))
		draws := mat.NewDense(m, 3, nil)
		buf := make([]float64, g10.N)
		for d := range m {
			for i := range buf {
				buf[i] = v[i] + uu[i]*r.NormFloat64()
			}
			sd, err := colorimetry.NewSpectrumOnGrid(g10, buf, colorimetry.Options{})
			if err != nil {
				t.Fatal(err)
			}
			c, err := w.XYZ(sd)
			if err != nil {
				t.Fatal(err)
			}
			draws.SetRow(d, []float64{c.X, c.Y, c.Z})
		}
		var est mat.SymDense
		stat.CovarianceMatrix(&est, draws, nil)
		for i := range 3 {
			for j := range 3 {
				exact := x.Cov[i][j]
				se := math.Sqrt((x.Cov[i][i]*x.Cov[j][j] + exact*exact) / m)
				if d := math.Abs(est.At(i, j) - exact); d > 5*se {
					t.Errorf("%v: cov[%d][%d] exact %g, Monte Carlo %g (%.1f standard errors)", g, i, j, exact, est.At(i, j), d/se)
				}
			}
		}
	}
}

func TestFirstOrderMonteCarlo(t *testing.T) {
	t.Parallel()
	// JCGM 101:2008 §8: for small uncertainties the first-order standard
	// uncertainties of x, y, u′, v′ and L*, a*, b* must agree with the
	// standard deviations of M = 20 000 Monte Carlo trials of whole spectra
	// (computed through Weights.XYZBatchTo, XYZ.XY, XYZ.UVPrime, XYZ.Lab).
	// The relative standard error of a standard deviation from M normal
	// draws is 1/√(2M) = 0.5 % (from memory); the tolerance, 3 %, is 6 of
	// them and leaves room for the tiny non-linearity at u = 0.002–0.005.
	const m, tol = 20000, 0.03
	g := colorimetry.Grid5nm
	for _, tc := range []struct {
		name string
		ill  colorimetry.Spectrum
		tcs  int
		seed uint64
	}{
		{"TCS05 D65", cie.D65(), 5, 4},
		{"TCS01 A", cie.A(), 1, 5},
		{"TCS12 FL11", mustFluorescent(t, 11), 12, 6},
	} {
		w := mustWeights(t, cie.CIE1931(), tc.ill, g)
		s := tcsOn5nm(t, tc.tcs)
		u := uRamp(g)
		x := mustXYZCov(t, w, s, mustUncertainty(t, g, u))
		r, err := colorimetry.PropagateColour(x, w.White(), colorimetry.MonteCarlo{})
		if err != nil {
			t.Fatal(err)
		}
		draws := sampleXYZ(t, w, s, u, nil, m, tc.seed)
		q := make([][]float64, 7)
		for d := range m {
			c := colorimetry.XYZ{X: draws.At(d, 0), Y: draws.At(d, 1), Z: draws.At(d, 2)}
			xy, err := c.XY()
			if err != nil {
				t.Fatal(err)
			}
			uv, err := c.UVPrime()
			if err != nil {
				t.Fatal(err)
			}
			lab, err := c.Lab(w.White())
			if err != nil {
				t.Fatal(err)
			}
			for k, v := range []float64{xy.X, xy.Y, uv.U, uv.V, lab.L, lab.A, lab.B} {
				q[k] = append(q[k], v)
			}
		}
		first := []float64{r.XY.U().X, r.XY.U().Y, r.UVPrime.U().U, r.UVPrime.U().V, r.Lab.U().L, r.Lab.U().A, r.Lab.U().B}
		for k, name := range []string{"x", "y", "u′", "v′", "L*", "a*", "b*"} {
			mc := stat.StdDev(q[k], nil)
			if !scalar.EqualWithinAbsOrRel(first[k], mc, 0, tol) {
				t.Errorf("%s: u(%s) first order %g, Monte Carlo %g", tc.name, name, first[k], mc)
			}
		}
	}
}

func TestMonteCarloAgreesWithFirstOrder(t *testing.T) {
	t.Parallel()
	// JCGM 101:2008 §8 again, now with the package's own Monte Carlo
	// (MonteCarlo.Always) for C*ab, h_ab and ΔE00 where first order holds
	// (chroma 19.5 ± 0.14, ΔE00 17.3 ± 0.14): standard uncertainties within
	// 3 % (6 standard errors of a standard deviation from 20 000 draws) and
	// the 95 % interval within 3 % of its half-width 1.96 u.
	const m, tol = 20000, 0.03
	g := colorimetry.Grid5nm
	w := mustWeights(t, cie.CIE1931(), cie.D65(), g)
	su := mustUncertainty(t, g, uRamp(g))
	a, b := tcsOn5nm(t, 5), tcsOn5nm(t, 6)
	xa := mustXYZCov(t, w, a, su)
	mc := colorimetry.MonteCarlo{Draws: m, Seed: 7, Always: true}
	gl, err := colorimetry.PropagateLCh(xa, w.White(), colorimetry.MonteCarlo{})
	if err != nil {
		t.Fatal(err)
	}
	ml, err := colorimetry.PropagateLCh(xa, w.White(), mc)
	if err != nil {
		t.Fatal(err)
	}
	gd, err := w.DeltaE2000Uncertainty(a, b, su, su, colorimetry.MonteCarlo{})
	if err != nil {
		t.Fatal(err)
	}
	md, err := w.DeltaE2000Uncertainty(a, b, su, su, mc)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name   string
		gum, m colorimetry.Uncertain
	}{
		{"C*ab", gl.C, ml.C},
		{"h_ab", gl.H, ml.H},
		{"ΔE00", gd, md},
	} {
		if c.gum.Method.Draws != 0 || c.m.Method != (colorimetry.Propagation{Draws: m, Seed: 7}) {
			t.Errorf("%s: methods %v and %v", c.name, c.gum.Method, c.m.Method)
		}
		if c.m.Value != c.gum.Value {
			t.Errorf("%s: value %g under Monte Carlo, %g under GUM", c.name, c.m.Value, c.gum.Value)
		}
		if !scalar.EqualWithinAbsOrRel(c.m.U, c.gum.U, 0, tol) {
			t.Errorf("%s: u Monte Carlo %g, first order %g", c.name, c.m.U, c.gum.U)
		}
		half := 1.96 * c.gum.U
		if math.Abs(c.m.High-c.gum.High) > tol*half || math.Abs(c.m.Low-c.gum.Low) > tol*half {
			t.Errorf("%s: interval Monte Carlo [%g, %g], first order [%g, %g]", c.name, c.m.Low, c.m.High, c.gum.Low, c.gum.High)
		}
	}
}

func TestMonteCarloNearZero(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid5nm
	w := mustWeights(t, cie.CIE1931(), cie.D65(), g)
	u := uRamp(g)
	su := mustUncertainty(t, g, u)
	s := tcsOn5nm(t, 5)
	const m = 20000
	mc := colorimetry.MonteCarlo{Draws: m, Seed: 11}

	// ΔE00 of a spectrum with itself: zero, not differentiable there, so
	// the rule (ΔE00 ≤ 3 u) must choose Monte Carlo, whose mean is then
	// positive (ΔE00 ≥ 0 for every draw; common practice, no source).
	d, err := w.DeltaE2000Uncertainty(s, s, su, su, mc)
	if err != nil {
		t.Fatal(err)
	}
	if d.Method != (colorimetry.Propagation{Draws: m, Seed: 11}) {
		t.Fatalf("ΔE00 of a pair with itself evaluated by %v", d.Method)
	}
	if d.Value != 0 || !(d.Mean > 0) || !(d.U > 0) || d.Low < 0 || !(d.High > d.Low) {
		t.Errorf("ΔE00 of a pair with itself: %+v", d)
	}
	// Reproducible with the same seed, different with another.
	if again, _ := w.DeltaE2000Uncertainty(s, s, su, su, mc); again != d {
		t.Errorf("same seed, different result: %+v and %+v", d, again)
	}
	other, _ := w.DeltaE2000Uncertainty(s, s, su, su, colorimetry.MonteCarlo{Draws: m, Seed: 12})
	if other.Mean == d.Mean {
		t.Errorf("seeds 11 and 12 gave the same mean %g", d.Mean)
	}
	// The package draws X, Y, Z from their exact normal distribution; an
	// independent Monte Carlo of whole spectra (JCGM 101 §6, drawing each
	// input) must give the same distribution of ΔE00: mean and standard
	// deviation within 5 standard errors (σ/√M for the mean, σ/√(2M) for the
	// standard deviation; the second is only approximate for a skewed
	// distribution, from memory).
	da := sampleXYZ(t, w, s, u, nil, m, 21)
	db := sampleXYZ(t, w, s, u, nil, m, 22)
	v := make([]float64, m)
	for i := range m {
		la, err := colorimetry.XYZ{X: da.At(i, 0), Y: da.At(i, 1), Z: da.At(i, 2)}.Lab(w.White())
		if err != nil {
			t.Fatal(err)
		}
		lb, err := colorimetry.XYZ{X: db.At(i, 0), Y: db.At(i, 1), Z: db.At(i, 2)}.Lab(w.White())
		if err != nil {
			t.Fatal(err)
		}
		v[i] = colorimetry.DeltaE2000(la, lb)
	}
	mean, sd := stat.MeanStdDev(v, nil)
	if se := sd / math.Sqrt(m); math.Abs(mean-d.Mean) > 5*math.Sqrt2*se {
		t.Errorf("ΔE00 mean: package %g, spectra %g (standard error %g each)", d.Mean, mean, se)
	}
	if se := sd / math.Sqrt(2*m); math.Abs(sd-d.U) > 5*math.Sqrt2*se {
		t.Errorf("ΔE00 standard deviation: package %g, spectra %g", d.U, sd)
	}

	// A non-selective grey under D65 lies on the neutral axis: its chroma
	// is 0 to round-off and its hue is undefined, so C*ab and h_ab must go
	// to Monte Carlo; L* stays first order.
	grey := make([]float64, g.N)
	for i := range grey {
		grey[i] = 0.5
	}
	gs, err := colorimetry.NewSpectrumOnGrid(g, grey, colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	lch, err := colorimetry.PropagateLCh(mustXYZCov(t, w, gs, su), w.White(), mc)
	if err != nil {
		t.Fatal(err)
	}
	if lch.C.Method.Draws != m || lch.H.Method.Draws != m || lch.L.Method.Draws != 0 {
		t.Errorf("grey: methods L* %v, C*ab %v, h_ab %v", lch.L.Method, lch.C.Method, lch.H.Method)
	}
	// The hue of a colour on the neutral axis spreads over the whole
	// circle: a uniform angle has a standard deviation of 360°/√12 = 104°
	// (common practice, no source); anything above 60° shows the spread.
	if !(lch.C.Mean > 0) || !(lch.H.U > 60) {
		t.Errorf("grey: C*ab %+v, h_ab %+v", lch.C, lch.H)
	}
}

func TestUncertaintyZero(t *testing.T) {
	t.Parallel()
	// With no uncertainty in the input, every uncertainty is zero and no
	// Monte Carlo is run (common practice, no source).
	g := colorimetry.Grid5nm
	w := mustWeights(t, cie.CIE1931(), cie.D65(), g)
	for _, su := range []colorimetry.SpectrumUncertainty{
		mustUncertainty(t, g, make([]float64, g.N)),
		mustCovariance(t, g, mat.NewSymDense(g.N, nil)),
	} {
		for _, n := range []int{5, 9} {
			s := tcsOn5nm(t, n)
			x := mustXYZCov(t, w, s, su)
			c, err := w.XYZ(s)
			if err != nil {
				t.Fatal(err)
			}
			if x.Value != c || x.Cov != (colorimetry.Cov3{}) {
				t.Errorf("TCS%02d: %+v, want %v with zero covariance", n, x, c)
			}
			r, err := colorimetry.PropagateColour(x, w.White(), colorimetry.MonteCarlo{})
			if err != nil {
				t.Fatal(err)
			}
			if r.XY.Cov != (colorimetry.Cov2{}) || r.UVPrime.Cov != (colorimetry.Cov2{}) || r.Lab.Cov != (colorimetry.Cov3{}) {
				t.Errorf("TCS%02d: non-zero covariance %+v", n, r)
			}
			for _, q := range []colorimetry.Uncertain{r.LCh.L, r.LCh.C, r.LCh.H} {
				if q.U != 0 || q.Method.Draws != 0 || q.Low != q.Value || q.High != q.Value {
					t.Errorf("TCS%02d: %+v", n, q)
				}
			}
		}
		d, err := w.DeltaE2000Uncertainty(tcsOn5nm(t, 5), tcsOn5nm(t, 5), su, su, colorimetry.MonteCarlo{})
		if err != nil {
			t.Fatal(err)
		}
		if d != (colorimetry.Uncertain{}) {
			t.Errorf("ΔE00 of identical exact spectra: %+v", d)
		}
	}
}

func TestUncertaintyScaling(t *testing.T) {
	t.Parallel()
	// The law of propagation is linear in the input uncertainties: scaling
	// every u(λ) by k scales the XYZ covariance by k² and every first-order
	// standard uncertainty by k (JCGM 100:2008 eq. 10 and 13); independent
	// variances add (eq. 10). Property test over random u(λ) and k.
	g := colorimetry.Grid5nm
	w := mustWeights(t, cie.CIE1931(), cie.D65(), g)
	a, b := tcsOn5nm(t, 5), tcsOn5nm(t, 6)
	rapid.Check(t, func(rt *rapid.T) {
		u1 := rapid.SliceOfN(rapid.Float64Range(0, 0.01), g.N, g.N).Draw(rt, "u1")
		u2 := rapid.SliceOfN(rapid.Float64Range(0, 0.01), g.N, g.N).Draw(rt, "u2")
		k := rapid.Float64Range(0.1, 10).Draw(rt, "k")
		uk, us := make([]float64, g.N), make([]float64, g.N)
		for i := range u1 {
			uk[i] = k * u1[i]
			us[i] = math.Hypot(u1[i], u2[i])
		}
		x1 := mustXYZCov(rt, w, a, mustUncertainty(rt, g, u1))
		x2 := mustXYZCov(rt, w, a, mustUncertainty(rt, g, u2))
		xk := mustXYZCov(rt, w, a, mustUncertainty(rt, g, uk))
		xs := mustXYZCov(rt, w, a, mustUncertainty(rt, g, us))
		// Sums of 81 non-negative terms in another order: round-off only.
		const tol = 1e-12
		want := x1.Cov.Scale(k)
		sum := x1.Cov.Add(x2.Cov)
		for p := range 3 {
			for q := range 3 {
				if !scalar.EqualWithinAbsOrRel(xk.Cov[p][q], want[p][q], 1e-20, tol) {
					rt.Fatalf("k = %g: cov[%d][%d] %g, want %g", k, p, q, xk.Cov[p][q], want[p][q])
				}
				if !scalar.EqualWithinAbsOrRel(xs.Cov[p][q], sum[p][q], 1e-20, tol) {
					rt.Fatalf("sum: cov[%d][%d] %g, want %g", p, q, xs.Cov[p][q], sum[p][q])
				}
			}
		}
		r1, err := colorimetry.PropagateColour(x1, w.White(), colorimetry.MonteCarlo{})
		if err != nil {
			rt.Fatal(err)
		}
		rk, err := colorimetry.PropagateColour(xk, w.White(), colorimetry.MonteCarlo{})
		if err != nil {
			rt.Fatal(err)
		}
		if r1.LCh.C.Method.Draws != 0 || rk.LCh.C.Method.Draws != 0 {
			rt.Skip("chroma near its uncertainty: not a first-order case")
		}
		one := []float64{r1.XY.U().X, r1.XY.U().Y, r1.UVPrime.U().U, r1.UVPrime.U().V, r1.Lab.U().L, r1.Lab.U().A, r1.Lab.U().B, r1.LCh.C.U, r1.LCh.H.U}
		kk := []float64{rk.XY.U().X, rk.XY.U().Y, rk.UVPrime.U().U, rk.UVPrime.U().V, rk.Lab.U().L, rk.Lab.U().A, rk.Lab.U().B, rk.LCh.C.U, rk.LCh.H.U}
		for i := range one {
			if !scalar.EqualWithinAbsOrRel(kk[i], k*one[i], 1e-15, 1e-9) {
				rt.Fatalf("k = %g: quantity %d u %g, want %g", k, i, kk[i], k*one[i])
			}
		}
		su1, suk := mustUncertainty(rt, g, u1), mustUncertainty(rt, g, uk)
		d1, err := w.DeltaE2000Uncertainty(a, b, su1, su1, colorimetry.MonteCarlo{})
		if err != nil {
			rt.Fatal(err)
		}
		dk, err := w.DeltaE2000Uncertainty(a, b, suk, suk, colorimetry.MonteCarlo{})
		if err != nil {
			rt.Fatal(err)
		}
		// ΔE00 of TCS05 and TCS06 is 17.3; u(ΔE00) ≤ 1.4 here, so both
		// stay first order.
		if d1.Method.Draws != 0 || dk.Method.Draws != 0 {
			rt.Fatalf("ΔE00 %g ± %g went to Monte Carlo", dk.Value, dk.U)
		}
		if !scalar.EqualWithinAbsOrRel(dk.U, k*d1.U, 1e-15, 1e-9) {
			rt.Fatalf("k = %g: u(ΔE00) %g, want %g", k, dk.U, k*d1.U)
		}
	})
}

func TestUncertaintySumOfLights(t *testing.T) {
	t.Parallel()
	// Tristimulus values are additive (Grassmann's law; CIE 015:2018 §7):
	// the XYZ of a sum of two independent spectra, with its covariance,
	// equals UncertainXYZ.Add of the two. The u′v′ covariance of the sum
	// follows from the same Cov3. Sums in another order: round-off only.
	g := colorimetry.Grid5nm
	w, err := colorimetry.NewLightWeights(cie.CIE1931(), g)
	if err != nil {
		t.Fatal(err)
	}
	a, b := mustFluorescent(t, 2), mustFluorescent(t, 11)
	ua, ub := uRamp(g), make([]float64, g.N)
	for i := range ub {
		ub[i] = 0.01 * b.Value(i)
	}
	us := make([]float64, g.N)
	for i := range us {
		us[i] = math.Hypot(ua[i], ub[i])
	}
	sum, err := colorimetry.Add(a, b)
	if err != nil {
		t.Fatal(err)
	}
	direct := mustXYZCov(t, w, sum, mustUncertainty(t, g, us))
	added := mustXYZCov(t, w, a, mustUncertainty(t, g, ua)).Add(mustXYZCov(t, w, b, mustUncertainty(t, g, ub)))
	uvd, err := colorimetry.PropagateUVPrime(direct)
	if err != nil {
		t.Fatal(err)
	}
	uva, err := colorimetry.PropagateUVPrime(added)
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-12
	got := append(append(upper3(direct.Cov), upper2(uvd.Cov)...), direct.Value.X, direct.Value.Y, direct.Value.Z)
	want := append(append(upper3(added.Cov), upper2(uva.Cov)...), added.Value.X, added.Value.Y, added.Value.Z)
	for i := range want {
		if !scalar.EqualWithinAbsOrRel(got[i], want[i], tol*math.Abs(want[i])+1e-300, tol) {
			t.Errorf("entry %d: sum %g, Add %g", i, got[i], want[i])
		}
	}
	// Lights have no white: Lab is refused, chromaticity is not.
	if _, err := colorimetry.PropagateColour(direct, w.White(), colorimetry.MonteCarlo{}); !errors.Is(err, colorimetry.ErrWhitePoint) {
		t.Errorf("CIELAB of a light: error %v, want %v", err, colorimetry.ErrWhitePoint)
	}
}

func TestLabJacobianDifferences(t *testing.T) {
	t.Parallel()
	// The analytic first-order CIELAB covariance against the Jacobian by
	// central differences of XYZ.Lab (step 1e-4 of the white's Y; error
	// about 1e-8 relative for these colours), on both branches of the CIE
	// function f (CIE 015:2018 eq. 8.9–8.11): t above and below (6/29)³.
	white := colorimetry.XYZ{X: 95.047, Y: 100, Z: 108.883} // ASTM E308 D65, 2° (from memory, as in lab_test.go)
	cov := colorimetry.Cov3{{0.04, 0.03, 0.01}, {0.03, 0.05, 0.02}, {0.01, 0.02, 0.06}}
	for _, tc := range []struct {
		name string
		c    colorimetry.XYZ
		tol  float64
	}{
		{"red", colorimetry.XYZ{X: 41.24, Y: 21.26, Z: 1.93}, 1e-6},
		{"dark", colorimetry.XYZ{X: 0.4, Y: 0.6, Z: 0.5}, 1e-6},  // t < (6/29)³: linear branch
		{"mixed", colorimetry.XYZ{X: 30, Y: 20, Z: 0.3}, 1e-6},   // Z on the linear branch only
		{"bright", colorimetry.XYZ{X: 90, Y: 95, Z: 100}, 1e-6},  // near the white
		{"negative", colorimetry.XYZ{X: -0.2, Y: 1, Z: 2}, 1e-6}, // outside the gamut: linear branch
	} {
		got, err := colorimetry.PropagateLab(colorimetry.UncertainXYZ{Value: tc.c, Cov: cov}, white)
		if err != nil {
			t.Fatal(err)
		}
		const h = 1e-4
		var j [3][3]float64
		for k := range 3 {
			p, m := tc.c, tc.c
			switch k {
			case 0:
				p.X += h
				m.X -= h
			case 1:
				p.Y += h
				m.Y -= h
			default:
				p.Z += h
				m.Z -= h
			}
			lp, _ := p.Lab(white)
			lm, _ := m.Lab(white)
			j[0][k] = (lp.L - lm.L) / (2 * h)
			j[1][k] = (lp.A - lm.A) / (2 * h)
			j[2][k] = (lp.B - lm.B) / (2 * h)
		}
		for p := range 3 {
			for q := range 3 {
				var want float64
				for k := range 3 {
					for l := range 3 {
						want += j[p][k] * cov[k][l] * j[q][l]
					}
				}
				if !scalar.EqualWithinAbsOrRel(got.Cov[p][q], want, tc.tol*math.Sqrt(got.Cov[p][p]*got.Cov[q][q]), tc.tol) {
					t.Errorf("%s: cov Lab[%d][%d] %g, differences %g", tc.name, p, q, got.Cov[p][q], want)
				}
			}
		}
	}
}

func TestUncertaintyErrors(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid5nm
	ok := uRamp(g)
	neg := append([]float64(nil), ok...)
	neg[10] = -0.001
	nan := append([]float64(nil), ok...)
	nan[20] = math.NaN()
	for _, tc := range []struct {
		name  string
		g     colorimetry.Grid
		u     []float64
		want  error
		index int // sample named by the *SampleError, or −1
	}{
		{"negative", g, neg, colorimetry.ErrCovariance, 10},
		{"NaN", g, nan, colorimetry.ErrNotFinite, 20},
		{"short", g, ok[:80], colorimetry.ErrLength, -1},
		{"bad grid", colorimetry.Grid{}, ok, colorimetry.ErrBadGrid, -1},
	} {
		_, err := colorimetry.NewSpectrumUncertainty(tc.g, tc.u)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: error %v, want %v", tc.name, err, tc.want)
		}
		var se *colorimetry.SampleError
		if tc.index >= 0 && (!errors.As(err, &se) || se.Index != tc.index) {
			t.Errorf("%s: error %v does not name sample %d", tc.name, err, tc.index)
		}
	}

	good := corrCov(g, ok)
	asym := mat.DenseCopyOf(good)
	asym.Set(3, 4, asym.At(3, 4)*1.01)
	notPSD := mat.DenseCopyOf(good)
	// Correlation above 1 between two neighbours: no covariance matrix.
	notPSD.Set(3, 4, 2*math.Sqrt(good.At(3, 3)*good.At(4, 4)))
	notPSD.Set(4, 3, notPSD.At(3, 4))
	negVar := mat.DenseCopyOf(good)
	negVar.Set(5, 5, -1e-6)
	nanCov := mat.DenseCopyOf(good)
	nanCov.Set(6, 7, math.Inf(1))
	for _, tc := range []struct {
		name string
		c    mat.Matrix
		want error
	}{
		{"asymmetric", asym, colorimetry.ErrCovariance},
		{"not PSD", notPSD, colorimetry.ErrCovariance},
		{"negative variance", negVar, colorimetry.ErrCovariance},
		{"infinite", nanCov, colorimetry.ErrNotFinite},
		{"wrong size", mat.NewDense(80, 80, nil), colorimetry.ErrLength},
	} {
		if _, err := colorimetry.NewSpectrumCovariance(g, tc.c); !errors.Is(err, tc.want) {
			t.Errorf("%s: error %v, want %v", tc.name, err, tc.want)
		}
	}
	// A covariance written to 6 significant digits is accepted: rounding
	// stays within the tolerance of NewSpectrumCovariance.
	rounded := mat.NewDense(g.N, g.N, nil)
	for i := range g.N {
		for j := range g.N {
			v := good.At(i, j)
			e := math.Pow(10, math.Floor(math.Log10(v))-5)
			rounded.Set(i, j, math.Round(v/e)*e)
		}
	}
	if _, err := colorimetry.NewSpectrumCovariance(g, rounded); err != nil {
		t.Errorf("covariance rounded to 6 digits: %v", err)
	}

	w := mustWeights(t, cie.CIE1931(), cie.D65(), g)
	s := tcsOn5nm(t, 5)
	other := mustUncertainty(t, colorimetry.Grid{Start: 380, Step: 10, N: 41}, make([]float64, 41))
	for _, tc := range []struct {
		name string
		u    colorimetry.SpectrumUncertainty
	}{
		{"zero value", colorimetry.SpectrumUncertainty{}},
		{"other grid", other},
	} {
		if _, err := w.XYZCov(s, tc.u); !errors.Is(err, colorimetry.ErrBadGrid) {
			t.Errorf("XYZCov, %s: error %v, want %v", tc.name, err, colorimetry.ErrBadGrid)
		}
	}

	white := w.White()
	val := colorimetry.XYZ{X: 20, Y: 30, Z: 40}
	cov := colorimetry.Cov3{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	for _, tc := range []struct {
		name string
		x    colorimetry.UncertainXYZ
		want error
	}{
		{"black", colorimetry.UncertainXYZ{Cov: cov}, colorimetry.ErrZeroLuminance},
		{"NaN value", colorimetry.UncertainXYZ{Value: colorimetry.XYZ{X: math.NaN(), Y: 1, Z: 1}, Cov: cov}, colorimetry.ErrNotFinite},
		{"NaN covariance", colorimetry.UncertainXYZ{Value: val, Cov: colorimetry.Cov3{{math.NaN()}}}, colorimetry.ErrNotFinite},
		{"asymmetric", colorimetry.UncertainXYZ{Value: val, Cov: colorimetry.Cov3{{1, 0.5, 0}, {0, 1, 0}, {0, 0, 1}}}, colorimetry.ErrCovariance},
		{"negative variance", colorimetry.UncertainXYZ{Value: val, Cov: colorimetry.Cov3{{1, 0, 0}, {0, -1, 0}, {0, 0, 1}}}, colorimetry.ErrCovariance},
		{"not PSD", colorimetry.UncertainXYZ{Value: val, Cov: colorimetry.Cov3{{1, 2, 0}, {2, 1, 0}, {0, 0, 1}}}, colorimetry.ErrCovariance},
	} {
		_, e1 := colorimetry.PropagateXY(tc.x)
		_, e2 := colorimetry.PropagateUVPrime(tc.x)
		_, e3 := colorimetry.PropagateColour(tc.x, white, colorimetry.MonteCarlo{})
		_, e4 := colorimetry.PropagateDeltaE2000(tc.x, tc.x, white, colorimetry.MonteCarlo{})
		for i, err := range []error{e1, e2, e3, e4} {
			if tc.name == "black" && i == 3 {
				continue // a black has Lab (0, 0, 0): no error there
			}
			if !errors.Is(err, tc.want) {
				t.Errorf("%s, function %d: error %v, want %v", tc.name, i+1, err, tc.want)
			}
		}
	}
	if _, err := colorimetry.PropagateLab(colorimetry.UncertainXYZ{Value: val, Cov: cov}, colorimetry.XYZ{}); !errors.Is(err, colorimetry.ErrWhitePoint) {
		t.Errorf("zero white: error %v, want %v", err, colorimetry.ErrWhitePoint)
	}
}

func TestSpectrumUncertaintyAccessors(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid5nm
	u := uRamp(g)
	ind := mustUncertainty(t, g, u)
	cor := mustCovariance(t, g, corrCov(g, u))
	if ind.Correlated() || !cor.Correlated() || ind.Grid() != g || cor.Grid() != g {
		t.Errorf("accessors: %v %v %v %v", ind.Correlated(), cor.Correlated(), ind.Grid(), cor.Grid())
	}
	si, sc := ind.StdDev(nil), cor.StdDev(nil)
	for i := range u {
		// The variance of the correlated model is u² + 0.003² + 0.002²
		// (corrCov at zero distance).
		want := math.Sqrt(u[i]*u[i] + 0.003*0.003 + 0.002*0.002)
		if si[i] != u[i] || !scalar.EqualWithinAbsOrRel(sc[i], want, 0, 1e-15) {
			t.Errorf("sample %d: %g and %g, want %g and %g", i, si[i], sc[i], u[i], want)
		}
	}
	if s := (colorimetry.Propagation{}).String(); s != "GUM first order" {
		t.Errorf("Propagation{}: %q", s)
	}
	if s := (colorimetry.Propagation{Draws: 1000, Seed: 3}).String(); !strings.HasPrefix(s, "Monte Carlo (JCGM 101)") || !strings.Contains(s, "1000 draws") || !strings.Contains(s, "seed 3") {
		t.Errorf("Monte Carlo description %q", s)
	}
}
