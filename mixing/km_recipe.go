package mixing

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/mat"
)

// RecipeOptions control the recipe solves of a Pigments model (Recipe,
// RecipeLab, Correct). The zero value matches colour under D65 for the CIE
// 1931 observer with up to three chromatic colorants besides the white.
type RecipeOptions struct {
	// Colorants is the largest number of chromatic colorants in a recipe,
	// besides the white; 0 means 3. Every combination of that many of the
	// library's chromatic colorants is searched.
	Colorants int
	// Only restricts the search to these colorants (by name; the white
	// is always used); nil uses the whole library.
	Only []string
	// Observer is the standard observer; nil means CIE 1931 2°.
	Observer *colorimetry.Observer
	// Illuminant is the primary illuminant, under which ΔE00 is
	// minimised; the zero value means D65.
	Illuminant colorimetry.NamedIlluminant
	// Also lists secondary illuminants. For a reflectance target each
	// recipe reports its special metamerism index under each
	// (colorimetry.MetamerismIndex, CIEDE2000) in Extra["metamerism"].
	Also []colorimetry.NamedIlluminant
	// MetamerismWeight adds the metamerism indices to the objective:
	// J = ΔE00² + MetamerismWeight·Σ MI² (+ the spectral tie-break). 0
	// reports the indices without steering by them.
	MetamerismWeight float64
	// MetamerismLimit, when > 0, is a constraint: a recipe whose largest
	// metamerism index exceeds it is re-solved with a growing weight on
	// the indices, and ranked after every recipe that meets it (with a
	// warning) if it still does not.
	MetamerismLimit float64
	// Spectral selects spectral matching for a reflectance target: the
	// recipe minimises the weighted RMS difference of measured
	// reflectance, Σ wᵢ·(R − R_target)² / Σ wᵢ, instead of ΔE00.
	Spectral bool
	// SpectralWeights are the weights wᵢ of spectral matching, one per
	// band of the model's grid; nil weighs every band alike.
	SpectralWeights []float64
	// Tolerance is the ΔE00 within which a target counts as reachable;
	// 0 means DefaultPigmentTolerance.
	Tolerance float64
	// Alternatives is the number of ranked recipes returned (distinct
	// colorant sets); 0 means 5.
	Alternatives int
	// MaxIterations caps the Levenberg–Marquardt iterations per colorant
	// combination; 0 means 100.
	MaxIterations int
}

// DefaultPigmentTolerance is the default ΔE00 within which a recipe
// reaches its target: half a unit, below what most observers see between
// two paint swatches side by side (common practice, no source).
const DefaultPigmentTolerance = 0.5

// retryDE00 is the ΔE00 above which a promising combination gets a second
// start point: anything that is not an essentially exact match.
const retryDE00 = 1e-3

// RecipeConvergenceError reports a recipe solve whose best recipe was
// still improving when its iteration cap ran out. Best holds the recipes
// found, best first; they are usable but may not be optimal.
type RecipeConvergenceError struct {
	Iterations int      // the cap that was reached
	Best       Solution // the ranked recipes found
}

// Error implements the error interface.
func (e *RecipeConvergenceError) Error() string {
	r := e.Best.Recipes[0]
	parts := make([]string, len(r.Amounts))
	for i, a := range r.Amounts {
		parts[i] = fmt.Sprintf("%s=%.5f", a.Name, a.Value)
	}
	return fmt.Sprintf("recipe solve did not converge in %d iterations; best recipe %s reaches ΔE00 %.3g", e.Iterations, strings.Join(parts, ","), r.DE00)
}

// spectralTie is α in J = ΔE00² + α·(100·RMS)²: a small spectral term
// that ranks recipes of equal ΔE00 by how closely their spectra follow the
// target, which prefers the least metameric recipe (a recipe 0.01 worse in
// RMS reflectance costs as much as 0.01 ΔE00). Common practice (no
// source) for breaking ties between metameric recipes.
const spectralTie = 1e-4

// kmProblem is one target prepared for solving.
type kmProblem struct {
	p        *Pigments
	n        int
	white    int
	chrom    []int // candidate chromatic colorants
	prim     *effWeights
	also     []*effWeights
	rt       []float64 // target measured reflectance on the grid; nil for a Lab target
	qt       []float64 // target K/S (for start points)
	labT     colorimetry.Lab
	uT       [3][3]float64
	labTA    []colorimetry.Lab
	uTA      [][3][3]float64
	spectral bool
	specW    []float64 // spectral weights, normalised to sum 1
	wMeta    float64
	tol      float64
	maxIter  int
	// K/S correction q' = rho·q + delta per band (Correct); nil for none.
	rho, delta []float64
	warns      []string
	obs        *colorimetry.Observer
	primIll    colorimetry.NamedIlluminant
	alsoIll    []colorimetry.NamedIlluminant
}

// kmResult is the solved recipe of one colorant combination.
type kmResult struct {
	cols      []int     // colorant indices: white first
	c         []float64 // mass fractions, same order, summing to 1
	de        float64   // ΔE00 under the primary illuminant
	rms       float64   // RMS difference of measured reflectance (NaN-free: 0 without a spectrum)
	wrms      float64   // weighted RMS (spectral matching)
	mi        []float64 // metamerism indices (internal, for the objective)
	cost      float64   // ranking objective
	converged bool
	iters     int
	lab       colorimetry.Lab
	rm        []float64 // measured reflectance of the mix on the model grid
}

// prepare validates the model and options and builds the solver's tables.
func (p *Pigments) prepare(opt RecipeOptions) (*kmProblem, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	obs := opt.Observer
	if obs == nil {
		obs = cie.CIE1931()
	}
	ill := opt.Illuminant
	if ill.Spectrum.IsZero() {
		ill = colorimetry.NamedIlluminant{Name: "D65", Spectrum: cie.D65()}
	}
	pr := &kmProblem{p: p, n: p.Grid.N, white: p.whiteIndex(), spectral: opt.Spectral, wMeta: opt.MetamerismWeight, tol: opt.Tolerance, maxIter: opt.MaxIterations,
		obs: obs, primIll: ill, alsoIll: opt.Also}
	if pr.tol == 0 {
		pr.tol = DefaultPigmentTolerance
	}
	if !(pr.tol > 0) {
		return nil, fmt.Errorf("tolerance %g: want a ΔE00 > 0", opt.Tolerance)
	}
	if pr.maxIter == 0 {
		pr.maxIter = 100
	}
	if pr.maxIter < 0 {
		return nil, fmt.Errorf("MaxIterations %d: want ≥ 0", opt.MaxIterations)
	}
	if !(pr.wMeta >= 0) || math.IsInf(pr.wMeta, 0) || !(opt.MetamerismLimit >= 0) {
		return nil, fmt.Errorf("metamerism weight %g and limit %g: want finite values ≥ 0", opt.MetamerismWeight, opt.MetamerismLimit)
	}
	var err error
	if pr.prim, err = newEffWeights(obs, ill, p.Grid); err != nil {
		return nil, err
	}
	for _, a := range opt.Also {
		e, err := newEffWeights(obs, a, p.Grid)
		if err != nil {
			return nil, err
		}
		pr.also = append(pr.also, e)
	}
	if opt.Only != nil {
		for _, name := range opt.Only {
			i := p.index(name)
			if i < 0 {
				return nil, fmt.Errorf("no colorant %q in the model (it has %s)", name, strings.Join(p.Names(), ", "))
			}
			if i != pr.white && !containsInt(pr.chrom, i) {
				pr.chrom = append(pr.chrom, i)
			}
		}
	} else {
		for i := range p.Colorants {
			if i != pr.white {
				pr.chrom = append(pr.chrom, i)
			}
		}
	}
	if len(pr.chrom) == 0 {
		return nil, fmt.Errorf("no chromatic colorant to use besides the white %q", p.White)
	}
	if opt.SpectralWeights != nil {
		if len(opt.SpectralWeights) != pr.n {
			return nil, fmt.Errorf("%d spectral weights for %d wavelengths", len(opt.SpectralWeights), pr.n)
		}
		var sum float64
		for i, w := range opt.SpectralWeights {
			if !(w >= 0) || math.IsInf(w, 0) {
				return nil, fmt.Errorf("spectral weight at %g nm = %g: want a finite value ≥ 0", p.Grid.Wavelength(i), w)
			}
			sum += w
		}
		if sum == 0 {
			return nil, fmt.Errorf("spectral weights are all zero")
		}
		pr.specW = make([]float64, pr.n)
		for i, w := range opt.SpectralWeights {
			pr.specW[i] = w / sum
		}
	} else {
		pr.specW = make([]float64, pr.n)
		for i := range pr.specW {
			pr.specW[i] = 1 / float64(pr.n)
		}
	}
	return pr, nil
}

func containsInt(s []int, v int) bool {
	for _, x := range s {
		if x == v {
			return true
		}
	}
	return false
}

// setTarget sets a reflectance target.
func (pr *kmProblem) setTarget(target colorimetry.Spectrum) error {
	if err := target.CheckFraction(0.01); err != nil {
		return fmt.Errorf("target: %w", err)
	}
	rt, w, err := pr.p.onGrid(target, "target")
	if err != nil {
		return err
	}
	pr.warns = append(pr.warns, w...)
	pr.rt = rt
	var cw []string
	pr.qt, cw = pr.p.internalKS(rt, "target")
	pr.warns = append(pr.warns, cw...)
	pr.labT = pr.prim.lab(rt)
	pr.uT = de00Metric(pr.labT)
	for _, a := range pr.also {
		l := a.lab(rt)
		pr.labTA = append(pr.labTA, l)
		pr.uTA = append(pr.uTA, de00Metric(l))
	}
	return nil
}

// setLab sets a CIELAB target under the primary illuminant.
func (pr *kmProblem) setLab(t colorimetry.Lab) error {
	if !t.Finite() {
		return fmt.Errorf("target %v: %w", t, colorimetry.ErrNotFinite)
	}
	if pr.spectral {
		return fmt.Errorf("spectral matching needs a target reflectance, not CIELAB")
	}
	pr.labT = t
	pr.uT = de00Metric(t)
	if len(pr.also) > 0 {
		pr.warns = append(pr.warns, "a CIELAB target has no spectrum: metamerism indices are not defined")
		pr.also, pr.alsoIll = nil, nil
	}
	pr.wMeta = 0
	return nil
}

// kmWork holds the scratch space of one combination's solve.
type kmWork struct {
	m       int // number of chromatic variables
	cols    []int
	dk, ds  [][]float64 // K_j − K_w, S_j − S_w per variable
	rm      []float64   // measured reflectance of the mix
	g       [][]float64 // dRm/dx_j per band
	res     []float64   // residual vector
	jac     [][]float64 // residual Jacobian, rows × m
	lab     colorimetry.Lab
	labA    []colorimetry.Lab
	rows    int
	scratch []float64
}

// newWork allocates the scratch space for a combination.
func (pr *kmProblem) newWork(cols []int) *kmWork {
	m := len(cols) - 1
	w := &kmWork{m: m, cols: cols}
	wk := pr.p.Colorants[pr.white]
	w.dk = make([][]float64, m)
	w.ds = make([][]float64, m)
	for j := range m {
		c := pr.p.Colorants[cols[j+1]]
		w.dk[j] = make([]float64, pr.n)
		w.ds[j] = make([]float64, pr.n)
		for l := range pr.n {
			w.dk[j][l] = c.K[l] - wk.K[l]
			w.ds[j][l] = c.S[l] - wk.S[l]
		}
	}
	w.rm = make([]float64, pr.n)
	w.g = make([][]float64, pr.n)
	for l := range w.g {
		w.g[l] = make([]float64, m)
	}
	switch {
	case pr.spectral:
		w.rows = pr.n
	case pr.rt == nil:
		w.rows = 3
	default:
		w.rows = 3 + pr.n
		if pr.wMeta > 0 {
			w.rows += 3 * len(pr.also)
		}
	}
	w.res = make([]float64, w.rows)
	w.jac = make([][]float64, w.rows)
	for i := range w.jac {
		w.jac[i] = make([]float64, m)
	}
	w.labA = make([]colorimetry.Lab, len(pr.also))
	w.scratch = make([]float64, 3*m)
	return w
}

// forward fills w.rm (and w.g when grad) for the chromatic fractions x.
func (pr *kmProblem) forward(w *kmWork, x []float64, grad bool) {
	wk := pr.p.Colorants[pr.white]
	for l := range pr.n {
		k, s := wk.K[l], wk.S[l]
		for j, xj := range x {
			k += xj * w.dk[j][l]
			s += xj * w.ds[j][l]
		}
		if s < 1e-12 {
			s = 1e-12
		}
		q := k / s
		if q < 0 {
			q = 0
		}
		rho := 1.0
		if pr.rho != nil {
			rho = pr.rho[l]
			q = rho*q + pr.delta[l]
			if q < 0 {
				q = 0
			}
		}
		r, dr := rInfSlope(q)
		rm, dm := pr.p.Surface.measuredSlope(r)
		w.rm[l] = rm
		if grad {
			f := rho * dr * dm / s
			for j := range x {
				w.g[l][j] = f * (w.dk[j][l] - (k/s)*w.ds[j][l])
			}
		}
	}
}

// colourRows writes U·(Lab(rm) − labT) under the weights e into res[0:3]
// and, when grad, its Jacobian into jac[0:3]; it returns the Lab.
func colourRows(e *effWeights, u *[3][3]float64, labT colorimetry.Lab, w *kmWork, res []float64, jac [][]float64, grad bool, scale float64) colorimetry.Lab {
	c := e.xyz(w.rm)
	lab := labOf(c, e.white)
	d := [3]float64{lab.L - labT.L, lab.A - labT.A, lab.B - labT.B}
	for i := range 3 {
		var v float64
		for k := i; k < 3; k++ {
			v += u[i][k] * d[k]
		}
		res[i] = scale * v
	}
	if !grad {
		return lab
	}
	jl := labJac(c, e.white)
	// dXYZ/dx_j, then dLab/dx_j, then U·dLab.
	for j := 0; j < w.m; j++ {
		var dx, dy, dz float64
		for l, gl := range w.g {
			dx += gl[j] * e.x[l]
			dy += gl[j] * e.y[l]
			dz += gl[j] * e.z[l]
		}
		var dl [3]float64
		for i := range 3 {
			dl[i] = jl[i][0]*dx + jl[i][1]*dy + jl[i][2]*dz
		}
		for i := range 3 {
			var v float64
			for k := i; k < 3; k++ {
				v += u[i][k] * dl[k]
			}
			jac[i][j] = scale * v
		}
	}
	return lab
}

// residuals fills w.res (and w.jac when grad) at x and returns ½‖res‖².
func (pr *kmProblem) residuals(w *kmWork, x []float64, grad bool) float64 {
	pr.forward(w, x, grad)
	row := 0
	if pr.spectral {
		for l := range pr.n {
			f := 100 * math.Sqrt(pr.specW[l])
			w.res[l] = f * (w.rm[l] - pr.rt[l])
			if grad {
				for j := range w.m {
					w.jac[l][j] = f * w.g[l][j]
				}
			}
		}
		w.lab = labOf(pr.prim.xyz(w.rm), pr.prim.white)
	} else {
		w.lab = colourRows(pr.prim, &pr.uT, pr.labT, w, w.res[0:3], w.jac[0:3], grad, 1)
		row = 3
		if pr.rt != nil {
			f := 100 * math.Sqrt(spectralTie/float64(pr.n))
			for l := range pr.n {
				w.res[row+l] = f * (w.rm[l] - pr.rt[l])
				if grad {
					for j := range w.m {
						w.jac[row+l][j] = f * w.g[l][j]
					}
				}
			}
			row += pr.n
		}
		if pr.wMeta > 0 {
			sw := math.Sqrt(pr.wMeta)
			d0 := [3]float64{w.lab.L - pr.labT.L, w.lab.A - pr.labT.A, w.lab.B - pr.labT.B}
			// The primary Lab Jacobian, recomputed unscaled.
			var j0 [3][]float64
			if grad {
				ident := [3][3]float64{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
				tmp := [3]float64{}
				jj := [][]float64{make([]float64, w.m), make([]float64, w.m), make([]float64, w.m)}
				colourRows(pr.prim, &ident, pr.labT, w, tmp[:], jj, true, 1)
				j0 = [3][]float64{jj[0], jj[1], jj[2]}
			}
			for a, e := range pr.also {
				ident := [3][3]float64{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
				var dr [3]float64
				ja := [][]float64{w.scratch[0:w.m], w.scratch[w.m : 2*w.m], w.scratch[2*w.m : 3*w.m]}
				w.labA[a] = colourRows(e, &ident, pr.labTA[a], w, dr[:], ja, grad, 1)
				u := &pr.uTA[a]
				for i := range 3 {
					var v float64
					for k := i; k < 3; k++ {
						v += u[i][k] * (dr[k] - d0[k])
					}
					w.res[row+i] = sw * v
					if grad {
						for j := range w.m {
							var dv float64
							for k := i; k < 3; k++ {
								dv += u[i][k] * (ja[k][j] - j0[k][j])
							}
							w.jac[row+i][j] = sw * dv
						}
					}
				}
				row += 3
			}
		}
	}
	var c float64
	for _, r := range w.res {
		c += r * r
	}
	return 0.5 * c
}

// projectSimplex puts x onto {x ≥ 0, Σx ≤ 1} (Euclidean projection).
func projectSimplex(x []float64) {
	var sum float64
	for i, v := range x {
		if v < 0 {
			x[i] = 0
		}
		sum += x[i]
	}
	if sum <= 1 {
		return
	}
	// Projection onto the face Σx = 1, x ≥ 0 (sort-based, Held et al.
	// 1974 / Duchi et al. 2008; from memory).
	u := append([]float64(nil), x...)
	sort.Sort(sort.Reverse(sort.Float64Slice(u)))
	var cum, theta float64
	for i, v := range u {
		cum += v
		t := (cum - 1) / float64(i+1)
		if v-t > 0 {
			theta = t
		}
	}
	for i := range x {
		x[i] = math.Max(x[i]-theta, 0)
	}
}

// lm minimises ½‖res(x)‖² over {x ≥ 0, Σx ≤ 1} by a projected
// Levenberg–Marquardt method and returns the final cost, the iterations
// used and whether it converged. x is updated in place.
func (pr *kmProblem) lm(w *kmWork, x []float64) (float64, int, bool) {
	m := w.m
	cost := pr.residuals(w, x, true)
	lambda := 1e-3
	xn := make([]float64, m)
	h := make([]float64, m*m)
	g := make([]float64, m)
	step := make([]float64, m)
	var freeIdx []int
	for it := 1; it <= pr.maxIter; it++ {
		if cost < 1e-26 {
			return cost, it - 1, true
		}
		// Gradient and Gauss–Newton matrix.
		for j := range m {
			g[j] = 0
			for i := range w.rows {
				g[j] += w.jac[i][j] * w.res[i]
			}
			for k := range m {
				var s float64
				for i := range w.rows {
					s += w.jac[i][j] * w.jac[i][k]
				}
				h[j*m+k] = s
			}
		}
		// Variables held at a bound: x_j = 0 with the gradient pushing
		// below zero; on the face Σx = 1 the white is at 0 and a step that
		// raises Σx is cut by the projection.
		freeIdx = freeIdx[:0]
		var pg float64
		for j := range m {
			if x[j] <= 0 && g[j] > 0 {
				continue
			}
			freeIdx = append(freeIdx, j)
			pg = math.Max(pg, math.Abs(g[j]))
		}
		if pg <= 1e-15*(1+cost) {
			return cost, it - 1, true
		}
		improved := false
		for !improved {
			if !solveDamped(h, g, m, freeIdx, lambda, step) {
				lambda *= 10
				if lambda > 1e16 {
					return cost, it, true
				}
				continue
			}
			for j := range m {
				xn[j] = x[j] + step[j]
			}
			projectSimplex(xn)
			c := pr.residuals(w, xn, false)
			if c < cost {
				improved = true
				var dx float64
				for j := range m {
					dx = math.Max(dx, math.Abs(xn[j]-x[j]))
				}
				copy(x, xn)
				rel := (cost - c) / cost
				cost = pr.residuals(w, x, true)
				lambda = math.Max(lambda/5, 1e-12)
				// A relative decrease below 1e-10 ends the solve:
				// reachable targets converge quadratically to a cost
				// near 0 and stop above, and far-off combinations that
				// creep along a valley are not worth the iterations.
				if rel < 1e-10 || dx < 1e-15 {
					return cost, it, true
				}
			} else {
				lambda *= 8
				if lambda > 1e16 {
					// No descent left at machine precision: a
					// stationary point.
					pr.residuals(w, x, true)
					return cost, it, true
				}
			}
		}
	}
	return cost, pr.maxIter, false
}

// solveDamped solves (H + λ·diag(H) + λ·1e-12·I)·δ = −g on the free
// variables (δ = 0 elsewhere) by Cholesky; false when not positive
// definite.
func solveDamped(h, g []float64, m int, freeIdx []int, lambda float64, step []float64) bool {
	for j := range step {
		step[j] = 0
	}
	k := len(freeIdx)
	if k == 0 {
		return true
	}
	var a [64]float64
	var b [8]float64
	if k > 8 {
		return solveDampedLarge(h, g, m, freeIdx, lambda, step)
	}
	for r, i := range freeIdx {
		for c, j := range freeIdx {
			a[r*k+c] = h[i*m+j]
		}
		a[r*k+r] += lambda*h[i*m+i] + lambda*1e-12 + 1e-300
		b[r] = -g[i]
	}
	// Cholesky in place.
	for j := range k {
		s := a[j*k+j]
		for p := range j {
			s -= a[j*k+p] * a[j*k+p]
		}
		if !(s > 0) {
			return false
		}
		d := math.Sqrt(s)
		a[j*k+j] = d
		for i := j + 1; i < k; i++ {
			v := a[i*k+j]
			for p := range j {
				v -= a[i*k+p] * a[j*k+p]
			}
			a[i*k+j] = v / d
		}
	}
	for i := range k {
		v := b[i]
		for p := range i {
			v -= a[i*k+p] * b[p]
		}
		b[i] = v / a[i*k+i]
	}
	for i := k - 1; i >= 0; i-- {
		v := b[i]
		for p := i + 1; p < k; p++ {
			v -= a[p*k+i] * b[p]
		}
		b[i] = v / a[i*k+i]
	}
	for r, i := range freeIdx {
		step[i] = b[r]
	}
	return true
}

// solveDampedLarge is solveDamped for more than 8 free variables, with
// gonum.
func solveDampedLarge(h, g []float64, m int, freeIdx []int, lambda float64, step []float64) bool {
	k := len(freeIdx)
	a := mat.NewSymDense(k, nil)
	b := mat.NewVecDense(k, nil)
	for r, i := range freeIdx {
		for c, j := range freeIdx {
			if c >= r {
				a.SetSym(r, c, h[i*m+j])
			}
		}
		a.SetSym(r, r, h[i*m+i]*(1+lambda)+lambda*1e-12+1e-300)
		b.SetVec(r, -g[i])
	}
	var ch mat.Cholesky
	if !ch.Factorize(a) {
		return false
	}
	var x mat.VecDense
	if err := ch.SolveVecTo(&x, b); err != nil {
		return false
	}
	for r, i := range freeIdx {
		step[i] = x.AtVec(r)
	}
	return true
}

// start returns a start point for the combination: the linearised
// two-constant equations Σ cᵢ·(Kᵢ − q_t·Sᵢ) = 0 per band, weighted by
// |dRm/dq| at the target, with a heavily weighted Σ cᵢ = 1 row, solved by
// NNLS (Allen-type start). Without a target spectrum, or when NNLS finds
// nothing, 0.7 white and the rest shared equally.
func (pr *kmProblem) start(cols []int) []float64 {
	m := len(cols) - 1
	x := make([]float64, m)
	fixed := func() []float64 {
		for j := range x {
			x[j] = 0.3 / float64(m)
		}
		return x
	}
	if pr.qt == nil {
		return fixed()
	}
	a := mat.NewDense(pr.n+1, len(cols), nil)
	b := make([]float64, pr.n+1)
	var amax float64
	for l := range pr.n {
		q := pr.qt[l]
		if pr.rho != nil {
			// The corrected model's q' = ρ·q + δ: solve for q = (q_t − δ)/ρ.
			q = math.Max((q-pr.delta[l])/pr.rho[l], 0)
		}
		_, dr := rInfSlope(q)
		r := ReflectanceInf(q)
		_, dm := pr.p.Surface.measuredSlope(r)
		wt := math.Abs(dr * dm)
		for k, ci := range cols {
			c := pr.p.Colorants[ci]
			v := wt * (c.K[l] - q*c.S[l])
			a.Set(l, k, v)
			amax = math.Max(amax, math.Abs(v))
		}
	}
	big := 1e3 * math.Max(1, amax)
	for k := range cols {
		a.Set(pr.n, k, big)
	}
	b[pr.n] = big
	c, _, err := NNLS(a, b)
	if err != nil {
		return fixed()
	}
	var sum float64
	for _, v := range c {
		sum += v
	}
	if !(sum > 0) {
		return fixed()
	}
	for j := range m {
		x[j] = c[j+1] / sum
	}
	projectSimplex(x)
	return x
}

// solveCombo solves one colorant combination from the given start (nil:
// the NNLS start).
func (pr *kmProblem) solveCombo(cols []int, x0 []float64) kmResult {
	w := pr.newWork(cols)
	x := x0
	if x == nil {
		x = pr.start(cols)
	}
	x = append([]float64(nil), x...)
	cost, it, ok := pr.lm(w, x)
	return pr.finish(w, x, it, ok, cost)
}

// retry solves a combination again from a second start, mostly white with
// the rest shared equally, and returns the better of the two results.
func (pr *kmProblem) retry(r kmResult) kmResult {
	y := make([]float64, len(r.cols)-1)
	for j := range y {
		y[j] = 0.1 / float64(len(y))
	}
	t := pr.solveCombo(r.cols, y)
	t.iters += r.iters
	if t.cost < r.cost {
		return t
	}
	r.iters = t.iters
	return r
}

// finish turns the solved fractions into a kmResult with the true ΔE00
// and the ranking objective.
func (pr *kmProblem) finish(w *kmWork, x []float64, iters int, ok bool, _ float64) kmResult {
	pr.forward(w, x, false)
	r := kmResult{cols: w.cols, converged: ok, iters: iters}
	r.c = make([]float64, len(w.cols))
	var sum float64
	for j, v := range x {
		r.c[j+1] = v
		sum += v
	}
	r.c[0] = math.Max(1-sum, 0)
	r.rm = append([]float64(nil), w.rm...)
	r.lab = pr.prim.lab(w.rm)
	r.de = colorimetry.DeltaE2000(pr.labT, r.lab)
	if pr.rt != nil {
		var ss, ws float64
		for l := range pr.n {
			d := w.rm[l] - pr.rt[l]
			ss += d * d
			ws += pr.specW[l] * d * d
		}
		r.rms = math.Sqrt(ss / float64(pr.n))
		r.wrms = math.Sqrt(ws)
	}
	var mi2 float64
	if pr.rt != nil && len(pr.also) > 0 {
		r.mi = make([]float64, len(pr.also))
		d0 := [3]float64{r.lab.L - pr.labT.L, r.lab.A - pr.labT.A, r.lab.B - pr.labT.B}
		for a, e := range pr.also {
			la := e.lab(w.rm)
			t := pr.labTA[a]
			corr := colorimetry.Lab{L: la.L - d0[0], A: la.A - d0[1], B: la.B - d0[2]}
			r.mi[a] = colorimetry.DeltaE2000(t, corr)
			mi2 += r.mi[a] * r.mi[a]
		}
	}
	switch {
	case pr.spectral:
		r.cost = (100 * r.wrms) * (100 * r.wrms)
	default:
		r.cost = r.de*r.de + spectralTie*(100*r.rms)*(100*r.rms) + pr.wMeta*mi2
	}
	return r
}

// combinations calls f with every k-subset of s (in lexicographic order).
func combinations(s []int, k int, f func([]int)) {
	if k > len(s) {
		k = len(s)
	}
	idx := make([]int, k)
	for i := range idx {
		idx[i] = i
	}
	sub := make([]int, k)
	for {
		for i, j := range idx {
			sub[i] = s[j]
		}
		f(sub)
		i := k - 1
		for i >= 0 && idx[i] == len(s)-k+i {
			i--
		}
		if i < 0 {
			return
		}
		idx[i]++
		for j := i + 1; j < k; j++ {
			idx[j] = idx[j-1] + 1
		}
	}
}

// Recipe finds recipes that reproduce the measured reflectance target
// (fraction 0–1, measured like the model's calibration) as an opaque film:
// the white plus up to opt.Colorants chromatic colorants, with mass
// fractions summing to 1. Every combination of chromatic colorants is
// solved by a projected Levenberg–Marquardt method on the CIELAB
// residuals (scaled by the local CIEDE2000 metric at the target, so the
// objective is ΔE00 to first order) with the white's fraction
// 1 − Σ others, all ≥ 0, started from the linearised Kubelka–Munk
// equations solved by NNLS. The objective adds a small spectral term that
// prefers the least metameric of equally good recipes, and, with
// opt.MetamerismWeight, the metamerism indices under opt.Also; with
// opt.Spectral it is the weighted spectral difference instead.
//
// The recipes are ranked best first, one per distinct set of colorants
// (a colorant at a fraction below 1e-9 counts as absent), at most
// opt.Alternatives of them. Each carries ΔE00 under the primary
// illuminant, Reachable (ΔE00 ≤ opt.Tolerance) and in Extra:
// "metamerism" (map from each opt.Also illuminant's name to the special
// metamerism index, CIEDE2000, per colorimetry.MetamerismIndex; nil when
// opt.Also is empty), "rms_spectral" (RMS difference of measured
// reflectance), "lab" (the recipe's CIELAB under the primary illuminant,
// keys L, a, b) and "match" ("colour" or "spectral").
//
// A target no mix can reach is not an error: the nearest recipe comes
// back with Reachable false and a warning. When the best recipe's solve
// ran out of iterations, the Solution is returned together with a
// *RecipeConvergenceError that carries it.
func (p *Pigments) Recipe(target colorimetry.Spectrum, opt RecipeOptions) (Solution, error) {
	pr, err := p.prepare(opt)
	if err != nil {
		return Solution{}, err
	}
	if err := pr.setTarget(target); err != nil {
		return Solution{}, err
	}
	return pr.search(opt)
}

// RecipeLab is Recipe for a CIELAB target under opt.Illuminant (and
// opt.Observer), relative to the illuminant's perfect-diffuser white.
// Without a target spectrum there is no spectral term, no spectral
// matching and no metamerism index (Extra "metamerism" is nil, with a
// warning when opt.Also was given; "rms_spectral" is nil).
func (p *Pigments) RecipeLab(target colorimetry.Lab, opt RecipeOptions) (Solution, error) {
	pr, err := p.prepare(opt)
	if err != nil {
		return Solution{}, err
	}
	if err := pr.setLab(target); err != nil {
		return Solution{}, err
	}
	return pr.search(opt)
}

// search solves every combination and ranks the results.
func (pr *kmProblem) search(opt RecipeOptions) (Solution, error) {
	if pr.spectral && pr.rt == nil {
		return Solution{}, fmt.Errorf("spectral matching needs a target reflectance")
	}
	k := opt.Colorants
	if k == 0 {
		k = 3
	}
	if k < 0 {
		return Solution{}, fmt.Errorf("colorants %d: want ≥ 1", opt.Colorants)
	}
	var results []kmResult
	combinations(pr.chrom, k, func(sub []int) {
		cols := append([]int{pr.white}, sub...)
		results = append(results, pr.solveCombo(cols, nil))
	})
	// The most promising combinations that did not reach the target get
	// a second start, in case the first led to a local minimum.
	sort.SliceStable(results, func(i, j int) bool { return results[i].cost < results[j].cost })
	na := opt.Alternatives
	if na <= 0 {
		na = 5
	}
	for i := range min(len(results), na+3) {
		if results[i].de > retryDE00 {
			results[i] = pr.retry(results[i])
		}
	}
	if opt.MetamerismLimit > 0 && pr.rt != nil && len(pr.also) > 0 {
		for i := range results {
			if maxOf(results[i].mi) > opt.MetamerismLimit {
				results[i] = pr.constrain(results[i].cols, results[i], opt.MetamerismLimit)
			}
		}
	}
	return pr.rank(results, opt)
}

// constrain re-solves a combination with growing weight on the
// metamerism indices until the largest is within limit.
func (pr *kmProblem) constrain(cols []int, r kmResult, limit float64) kmResult {
	saved := pr.wMeta
	defer func() { pr.wMeta = saved }()
	best := r
	for _, wt := range []float64{1, 10, 100, 1000} {
		if wt <= saved {
			continue
		}
		pr.wMeta = wt
		x0 := append([]float64(nil), best.c[1:]...)
		t := pr.solveCombo(cols, x0)
		pr.wMeta = saved
		// Re-score with the caller's objective.
		t.cost = t.de*t.de + spectralTie*(100*t.rms)*(100*t.rms) + saved*sumSq(t.mi)
		t.iters += best.iters
		best = t
		if maxOf(t.mi) <= limit {
			break
		}
	}
	return best
}

func maxOf(v []float64) float64 {
	var m float64
	for _, x := range v {
		m = math.Max(m, x)
	}
	return m
}

func sumSq(v []float64) float64 {
	var s float64
	for _, x := range v {
		s += x * x
	}
	return s
}

// rank dedups results by colorant set, ranks them and builds the
// Solution.
func (pr *kmProblem) rank(results []kmResult, opt RecipeOptions) (Solution, error) {
	type entry struct {
		r   kmResult
		bad bool // violates the metamerism limit
	}
	bySet := map[string]int{}
	var list []entry
	for _, r := range results {
		var key []string
		for i, ci := range r.cols {
			if r.c[i] < 1e-9 {
				r.c[i] = 0
				continue
			}
			key = append(key, fmt.Sprint(ci))
		}
		ks := strings.Join(key, ",")
		e := entry{r: r, bad: opt.MetamerismLimit > 0 && maxOf(r.mi) > opt.MetamerismLimit}
		if j, ok := bySet[ks]; ok {
			if better(e.r, e.bad, list[j].r, list[j].bad) {
				list[j] = e
			}
			continue
		}
		bySet[ks] = len(list)
		list = append(list, e)
	}
	sort.SliceStable(list, func(i, j int) bool { return better(list[i].r, list[i].bad, list[j].r, list[j].bad) })
	na := opt.Alternatives
	if na <= 0 {
		na = 5
	}
	if len(list) > na {
		list = list[:na]
	}
	sol := Solution{}
	for _, e := range list {
		rec, err := pr.recipe(e.r, e.bad, opt)
		if err != nil {
			return Solution{}, err
		}
		sol.Recipes = append(sol.Recipes, rec)
	}
	if !list[0].r.converged {
		return sol, &RecipeConvergenceError{Iterations: pr.maxIter, Best: sol}
	}
	return sol, nil
}

// better orders results: those within the metamerism limit first, then
// by objective.
func better(a kmResult, aBad bool, b kmResult, bBad bool) bool {
	if aBad != bBad {
		return !aBad
	}
	return a.cost < b.cost
}

// recipe builds the public Recipe of a result.
func (pr *kmProblem) recipe(r kmResult, bad bool, opt RecipeOptions) (Recipe, error) {
	rec := Recipe{DE00: r.de, Reachable: r.de <= pr.tol, Extra: map[string]any{}}
	for i, ci := range r.cols {
		if i > 0 && r.c[i] == 0 {
			continue
		}
		rec.Amounts = append(rec.Amounts, Amount{Name: pr.p.Colorants[ci].Name, Value: r.c[i]})
	}
	rec.Warnings = append(rec.Warnings, pr.warns...)
	if !rec.Reachable {
		rec.Warnings = append(rec.Warnings, fmt.Sprintf("target not reachable with these colorants: the nearest mix is ΔE00 %.3g away (tolerance %g)", r.de, pr.tol))
	}
	if !r.converged {
		rec.Warnings = append(rec.Warnings, fmt.Sprintf("the solve stopped at its cap of %d iterations", pr.maxIter))
	}
	rec.Extra["lab"] = map[string]float64{"L": r.lab.L, "a": r.lab.A, "b": r.lab.B}
	rec.Extra["match"] = "colour"
	if pr.spectral {
		rec.Extra["match"] = "spectral"
	}
	rec.Extra["rms_spectral"] = nil
	rec.Extra["metamerism"] = nil
	if pr.rt == nil {
		return rec, nil
	}
	rec.Extra["rms_spectral"] = r.rms
	if len(pr.also) > 0 {
		mi, err := pr.metamerism(r)
		if err != nil {
			return Recipe{}, err
		}
		rec.Extra["metamerism"] = mi
		if bad {
			rec.Warnings = append(rec.Warnings, fmt.Sprintf("metamerism index %.3g exceeds the limit %g", maxOf(r.mi), opt.MetamerismLimit))
		}
	}
	return rec, nil
}

// metamerism returns the special metamerism indices of a recipe against
// the target, by colorimetry.MetamerismIndex on the computation grid of
// the model's grid.
func (pr *kmProblem) metamerism(r kmResult) (map[string]float64, error) {
	trial, err := colorimetry.NewSpectrumOnGrid(pr.p.Grid, r.rm, colorimetry.Options{})
	if err != nil {
		return nil, err
	}
	std, err := colorimetry.NewSpectrumOnGrid(pr.p.Grid, pr.rt, colorimetry.Options{})
	if err != nil {
		return nil, err
	}
	res, err := colorimetry.MetamerismIndex(std, trial, pr.obs, pr.primIll.Spectrum, pr.alsoIll, colorimetry.ComputationGrid(pr.p.Grid))
	if err != nil {
		return nil, err
	}
	out := map[string]float64{}
	for _, m := range res {
		out[m.Illuminant] = m.Index
	}
	return out, nil
}
