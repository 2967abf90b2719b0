package mixing

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/optimize"
)

// DefaultHalftoneTolerance is the ΔE00 up to which a halftone solve counts
// as reaching its target: 0.5, as for the other models; a target within
// the press's gamut is met to a few hundredths: common practice (no
// source).
const DefaultHalftoneTolerance = 0.5

// htInkWeight is the weight of the total coverage in the solve's
// objective, ΔE00 per unit coverage (0.01: 100 % more ink costs 0.01
// ΔE00). ΔE00 grows like a norm from an exact match, so this small term
// never moves a match that can be made exactly; among equal matches (a
// black ink can replace a grey made of the other inks) it picks the one
// with least ink.
const htInkWeight = 0.01

// htSpectralWeight is the weight of the RMS spectral difference from a
// target reflectance in the objective of the "closest spectrum" recipe,
// ΔE00 per unit of RMS reflectance (2: an RMS of 0.01 costs 0.02 ΔE00).
// Like the ink term it only chooses among equally close colour matches:
// the one whose spectrum is closest to the target's, the least metameric.
const htSpectralWeight = 2

// HalftoneSolveSettings control Halftone.Solve and SolveLab. The zero
// value solves under D50 and the CIE 1931 observer, within the model's
// total area coverage limit (none if it has none), every ink free from 0
// to 100 %, with tolerance DefaultHalftoneTolerance.
type HalftoneSolveSettings struct {
	// Scorer gives the illuminant and observer of the colour match; nil
	// means D50 and the CIE 1931 2° observer, the graphic arts' viewing
	// condition (ISO 3664; from memory).
	Scorer *Scorer
	// TAC is the total area coverage limit, the largest sum of the
	// nominal coverages, in percent as the trade writes it (300 for
	// 300 %); 0 means the model's own limit, or none.
	TAC float64
	// MaxCoverage limits inks' nominal coverages (0–1, by ink name); inks
	// not named may go to 1.
	MaxCoverage []Amount
	// Fixed holds inks at the given nominal coverages (0–1, by ink name);
	// the others are solved for. Fixing the black ink, for instance, sets
	// how much of a grey it carries.
	Fixed []Amount
	// Tolerance is the ΔE00 up to which the target counts as reached; 0
	// means DefaultHalftoneTolerance.
	Tolerance float64
	// MaxEvaluations caps the model evaluations of each local refinement;
	// 0 means 4000.
	MaxEvaluations int
}

// htProblem is one inverse problem: bounds, fixed inks and a CIELAB
// target.
type htProblem struct {
	m       *Halftone
	ew      *effWeights
	free    []int     // inks solved for
	fixed   []float64 // nominal coverage of every ink (free ones overwritten)
	hi      []float64 // upper bound per ink
	budget  float64   // largest sum of the free coverages (+Inf: none)
	limit   float64   // TAC limit in percent (0: none)
	labT    colorimetry.Lab
	spec    []float64 // target reflectance on the grid (nil: CIELAB target)
	wSpec   float64   // weight of the spectral term
	tol     float64
	maxEval int
	// scratch
	nom, eff, w, r, u []float64
}

// newProblem validates the settings and prepares the problem for
// targets under the settings' scorer.
func (m *Halftone) newProblem(set HalftoneSolveSettings) (*htProblem, *Scorer, error) {
	scorer := set.Scorer
	if scorer == nil {
		scorer = NewScorer(cie.CIE1931(), cie.D50(), "D50")
	}
	tol := set.Tolerance
	if tol == 0 {
		tol = DefaultHalftoneTolerance
	}
	if !htFinite(tol) || tol < 0 {
		return nil, nil, fmt.Errorf("tolerance %v is not a finite non-negative ΔE00", tol)
	}
	limit := set.TAC
	if limit == 0 {
		limit = m.tac
	}
	if !htFinite(limit) || limit < 0 {
		return nil, nil, fmt.Errorf("total area coverage limit %v %% is not a finite non-negative number", set.TAC)
	}
	k := len(m.inks)
	pr := &htProblem{m: m, fixed: make([]float64, k), hi: make([]float64, k), limit: limit, tol: tol, maxEval: set.MaxEvaluations,
		nom: make([]float64, k), eff: make([]float64, k), w: make([]float64, len(m.prim)), r: make([]float64, m.grid.N)}
	if pr.maxEval <= 0 {
		pr.maxEval = 4000
	}
	for i := range pr.hi {
		pr.hi[i] = 1
	}
	seen := map[string]bool{}
	for _, a := range set.MaxCoverage {
		i := m.index(a.Name)
		switch {
		case i < 0:
			return nil, nil, fmt.Errorf("coverage limit: %w: %q (inks: %s)", ErrUnknownInk, a.Name, strings.Join(m.inks, ", "))
		case seen[a.Name]:
			return nil, nil, fmt.Errorf("coverage limit of ink %q given twice", a.Name)
		case !htFinite(a.Value) || a.Value < 0 || a.Value > 1:
			return nil, nil, fmt.Errorf("coverage limit of ink %q is %v, outside 0–1", a.Name, a.Value)
		}
		seen[a.Name] = true
		pr.hi[i] = a.Value
	}
	isFixed := make([]bool, k)
	var fixedSum float64
	for _, a := range set.Fixed {
		i := m.index(a.Name)
		switch {
		case i < 0:
			return nil, nil, fmt.Errorf("fixed coverage: %w: %q (inks: %s)", ErrUnknownInk, a.Name, strings.Join(m.inks, ", "))
		case isFixed[i]:
			return nil, nil, fmt.Errorf("fixed coverage of ink %q given twice", a.Name)
		case !htFinite(a.Value) || a.Value < 0 || a.Value > pr.hi[i]:
			return nil, nil, fmt.Errorf("fixed coverage of ink %q is %v, outside 0–%g", a.Name, a.Value, pr.hi[i])
		}
		isFixed[i] = true
		pr.fixed[i] = a.Value
		fixedSum += a.Value
	}
	for i := range k {
		if !isFixed[i] {
			pr.free = append(pr.free, i)
		}
	}
	pr.budget = math.Inf(1)
	if limit > 0 {
		pr.budget = limit/100 - fixedSum
		if pr.budget < -1e-12 {
			return nil, nil, fmt.Errorf("the fixed coverages add up to %.4g %%, above the total area coverage limit of %g %%", 100*fixedSum, limit)
		}
		pr.budget = math.Max(pr.budget, 0)
	}
	pr.u = make([]float64, len(pr.free))
	ew, err := newEffWeights(scorer.obs, colorimetry.NamedIlluminant{Name: scorer.name, Spectrum: scorer.ill}, m.grid)
	if err != nil {
		return nil, nil, err
	}
	pr.ew = ew
	return pr, scorer, nil
}

// full writes the free coverages x into pr.nom and returns it.
func (pr *htProblem) full(x []float64) []float64 {
	copy(pr.nom, pr.fixed)
	for t, i := range pr.free {
		pr.nom[i] = x[t]
	}
	return pr.nom
}

// lab returns the CIELAB printed at the nominal coverages nom (all inks).
func (pr *htProblem) lab(nom []float64) colorimetry.Lab {
	pr.m.EffectiveTo(pr.eff, nom)
	pr.m.effectiveReflectanceTo(pr.r, pr.eff, pr.w)
	return pr.ew.lab(pr.r)
}

// objective is ΔE00 to the target plus the small tie-breaking term (the
// spectral one when it has a weight, otherwise the ink one), for free
// coverages x (feasible).
func (pr *htProblem) objective(x []float64) (float64, float64) {
	de := colorimetry.DeltaE2000(pr.labT, pr.lab(pr.full(x)))
	var s float64
	for _, v := range x {
		s += v
	}
	if pr.wSpec > 0 {
		return de + pr.wSpec*htRMS(pr.r, pr.spec), de
	}
	return de + htInkWeight*s, de
}

// htRMS is the RMS difference of two spectra on one grid.
func htRMS(a, b []float64) float64 {
	var ss float64
	for j := range a {
		d := a[j] - b[j]
		ss += d * d
	}
	return math.Sqrt(ss / float64(len(a)))
}

// project writes into dst the point of the feasible set {0 ≤ xₜ ≤ hi,
// Σ xₜ ≤ budget} nearest to u (Euclidean), found by bisection on the
// multiplier of the sum constraint.
func (pr *htProblem) project(dst, u []float64) []float64 {
	clampAt := func(mu float64) float64 {
		var s float64
		for t, i := range pr.free {
			dst[t] = math.Min(math.Max(u[t]-mu, 0), pr.hi[i])
			s += dst[t]
		}
		return s
	}
	if clampAt(0) <= pr.budget {
		return dst
	}
	lo, hi := 0.0, 0.0
	for _, v := range u {
		hi = math.Max(hi, v)
	}
	for range 100 {
		mid := 0.5 * (lo + hi)
		if clampAt(mid) > pr.budget {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo < 1e-15 {
			break
		}
	}
	clampAt(hi)
	return dst
}

// htStart is a starting point of the local search and its objective.
type htStart struct {
	x []float64
	f float64
}

// solve minimises the objective: a grid over the feasible set gives
// starting points (with the extra starts given), each refined by
// Nelder–Mead on the projected problem. It returns the best free
// coverages and their ΔE00.
func (pr *htProblem) solve(extra [][]float64, levels int) ([]float64, float64, error) {
	nf := len(pr.free)
	if nf == 0 {
		x := []float64{}
		_, de := pr.objective(x)
		return x, de, nil
	}
	if levels == 0 {
		levels = [...]int{0, 41, 21, 11, 9}[nf]
	}
	var starts []htStart
	keep := func(x []float64) {
		f, _ := pr.objective(x)
		starts = append(starts, htStart{append([]float64(nil), x...), f})
	}
	x := make([]float64, nf)
	var walk func(t int, sum float64)
	walk = func(t int, sum float64) {
		if t == nf {
			keep(x)
			return
		}
		i := pr.free[t]
		for l := range levels {
			v := pr.hi[i] * float64(l) / float64(levels-1)
			if sum+v > pr.budget+1e-12 {
				break
			}
			x[t] = v
			walk(t+1, sum+v)
		}
	}
	walk(0, 0)
	for _, e := range extra {
		keep(pr.project(make([]float64, nf), e))
	}
	sort.SliceStable(starts, func(a, b int) bool { return starts[a].f < starts[b].f })
	// The three best starts at least 0.2 apart in every direction's sense
	// (Chebyshev distance), so the local searches do not repeat.
	var picked []htStart
	for _, s := range starts {
		far := true
		for _, p := range picked {
			var d float64
			for t := range s.x {
				d = math.Max(d, math.Abs(s.x[t]-p.x[t]))
			}
			if d < 0.2 {
				far = false
				break
			}
		}
		if far {
			picked = append(picked, s)
			if len(picked) == 3 {
				break
			}
		}
	}

	const penalty = 100 // ΔE00 per unit² of distance outside the feasible set
	proj := make([]float64, nf)
	var bestX []float64
	bestF, bestDE := math.Inf(1), math.Inf(1)
	converged := false
	evals := 0
	prob := optimize.Problem{Func: func(u []float64) float64 {
		pr.project(proj, u)
		f, de := pr.objective(proj)
		var d2 float64
		for t := range u {
			d := u[t] - proj[t]
			d2 += d * d
		}
		if f < bestF {
			bestF, bestDE = f, de
			bestX = append(bestX[:0], proj...)
		}
		return f + penalty*d2
	}}
	run := func(x0 []float64, size float64) {
		res, err := optimize.Minimize(prob, x0, &optimize.Settings{
			FuncEvaluations: pr.maxEval,
			Converger:       &optimize.FunctionConverge{Absolute: 1e-10, Relative: 1e-10, Iterations: 30 * nf},
		}, &optimize.NelderMead{SimplexSize: size})
		if res != nil {
			evals += res.FuncEvaluations
		}
		if err == nil && res.Status == optimize.FunctionConvergence {
			converged = true
		}
	}
	for _, s := range picked {
		run(s.x, 0.04)
	}
	// Nelder–Mead stalls in the narrow valleys of a colour match (a cone
	// of ΔE00 around a line of equal colours): restart it from the best
	// point with a fresh simplex until it gains no more.
	for range 8 {
		before := bestF
		run(append([]float64(nil), bestX...), 0.01)
		if before-bestF < 1e-9 {
			break
		}
	}
	if !converged {
		return bestX, bestDE, &ConvergenceError{Op: "halftone colour match", Iterations: evals, Best: append([]float64(nil), pr.full(bestX)...), Residual: bestDE}
	}
	return bestX, bestDE, nil
}

// Solve finds the nominal coverages (0–1) that print closest to the
// target reflectance (fraction 0–1; resampled onto the model's grid): the
// smallest ΔE00 under the settings' illuminant (D50 by default), within
// each ink's limit and the total area coverage limit. See SolveLab for the
// method and the recipe's keys.
//
// The first recipe ("choice": "closest spectrum") breaks ties between
// equally close colour matches by the spectral difference from the target
// (a small term, 0.02 ΔE00 per 0.01 of RMS reflectance): of the many ways
// four inks can print a colour it picks the least metameric, the one a
// printed sample was most likely made with. A second recipe ("least ink")
// follows when the least-ink match uses at least one percentage point
// less ink. Recipes are ranked by ΔE00 (within 0.05 ΔE00 they keep this
// order). Extra "spectral_rms" is the RMS reflectance difference from the
// target on the model's grid.
func (m *Halftone) Solve(target colorimetry.Spectrum, set HalftoneSolveSettings) (Solution, error) {
	if target.IsZero() {
		return Solution{}, fmt.Errorf("target: empty spectrum")
	}
	tt, err := target.Resample(m.grid)
	if err != nil {
		return Solution{}, fmt.Errorf("target on the model grid %v: %w", m.grid, err)
	}
	if err := tt.CheckFraction(htNegTol); err != nil {
		return Solution{}, fmt.Errorf("target: %w", err)
	}
	if v, nm := tt.Max(); v > htMaxReflectance {
		return Solution{}, fmt.Errorf("target: reflectance %g at %g nm is above %g: give reflectance as a fraction 0–1, not percent", v, nm, htMaxReflectance)
	}
	pr, scorer, err := m.newProblem(set)
	if err != nil {
		return Solution{}, err
	}
	lab, err := scorer.ObjectLab(tt)
	if err != nil {
		return Solution{}, fmt.Errorf("target: %w", err)
	}
	pr.labT = lab
	pr.spec = tt.Values(nil)
	pr.wSpec = htSpectralWeight
	xs, des, err := pr.solve(nil, 0)
	if err != nil {
		return Solution{}, err
	}
	spectral := pr.recipe(xs, des, "closest spectrum")
	pr.wSpec = 0
	xi, dei, err := pr.solve([][]float64{xs}, 0)
	if err != nil {
		return Solution{}, err
	}
	least := pr.recipe(xi, dei, "least ink")
	sol := Solution{Recipes: []Recipe{spectral}}
	if least.Extra["tac_percent"].(float64) < spectral.Extra["tac_percent"].(float64)-1 {
		sol.Recipes = append(sol.Recipes, least)
		if least.DE00 < spectral.DE00-0.05 {
			sol.Recipes[0], sol.Recipes[1] = least, spectral
		}
	}
	return sol, nil
}

// SolveLab finds the nominal coverages (0–1) whose print is closest to
// the CIELAB target (under the settings' illuminant, D50 by default): the
// smallest ΔE00, within each ink's limit and the total area coverage
// limit, with the least total coverage among equal matches (a small term,
// 0.01 ΔE00 per 100 % of ink, tips the balance; it never moves an exact
// match).
//
// A grid over the feasible coverages gives starting points; the best
// three (at least 20 % apart) are refined by Nelder–Mead on the problem
// projected onto the feasible set (the Euclidean projection onto the box
// and the total-coverage half-space, by bisection on its multiplier), and
// the search is restarted from the best point until it gains no more.
//
// The solution holds one recipe: Amounts are the nominal coverages in
// the model's ink order, DE00 the difference reached, Reachable whether it
// is within the tolerance. Extra holds "choice" ("least ink"),
// "tac_percent" (the sum of the nominal coverages, percent),
// "tac_limit_percent" (null for none),
// "effective" (the effective coverages by ink, 0–1, after dot gain), "L",
// "a", "b" of the print and "spectral_rms" (null for a CIELAB target).
// Warnings name the limits that bind.
//
// A target outside what the press can print is not an error: the recipe
// is the nearest printable colour, with Reachable false. Errors: settings
// out of range (naming the ink), and non-convergence (a
// *ConvergenceError whose Best holds the coverages found, model order).
func (m *Halftone) SolveLab(target colorimetry.Lab, set HalftoneSolveSettings) (Solution, error) {
	if !target.Finite() {
		return Solution{}, fmt.Errorf("target %v: %w", target, colorimetry.ErrNotFinite)
	}
	pr, _, err := m.newProblem(set)
	if err != nil {
		return Solution{}, err
	}
	pr.labT = target
	return pr.solution(nil, 0)
}

// solution solves and wraps the result as a one-recipe solution.
func (pr *htProblem) solution(extra [][]float64, levels int) (Solution, error) {
	x, de, err := pr.solve(extra, levels)
	if err != nil {
		return Solution{}, err
	}
	return Solution{Recipes: []Recipe{pr.recipe(x, de, "least ink")}}, nil
}

// recipe describes the free coverages x as a recipe chosen as choice.
func (pr *htProblem) recipe(x []float64, de float64, choice string) Recipe {
	m := pr.m
	nom := append([]float64(nil), pr.full(x)...)
	lab := pr.lab(nom)
	var sum float64
	eff := map[string]float64{}
	r := Recipe{DE00: de, Reachable: de <= pr.tol, Warnings: []string{}}
	for i, name := range m.inks {
		r.Amounts = append(r.Amounts, Amount{Name: name, Value: nom[i]})
		eff[name] = m.gain[i].Effective(nom[i])
		sum += nom[i]
	}
	var limit any
	if pr.limit > 0 {
		limit = pr.limit
	}
	var rms any
	if pr.spec != nil {
		rms = htRMS(pr.r, pr.spec)
	}
	r.Extra = map[string]any{"choice": choice, "tac_percent": 100 * sum, "tac_limit_percent": limit, "effective": eff,
		"L": lab.L, "a": lab.A, "b": lab.B, "spectral_rms": rms}
	const eps = 1e-6
	if pr.limit > 0 && len(pr.free) > 0 && 100*sum >= pr.limit-100*eps {
		r.Warnings = append(r.Warnings, fmt.Sprintf("total area coverage at the limit of %g %%", pr.limit))
	}
	for _, i := range pr.free {
		if pr.hi[i] < 1 && nom[i] >= pr.hi[i]-eps {
			r.Warnings = append(r.Warnings, fmt.Sprintf("%s at its limit of %g %%", m.inks[i], 100*pr.hi[i]))
		}
	}
	if !r.Reachable {
		r.Warnings = append(r.Warnings, fmt.Sprintf("target outside what the press prints within these limits: the nearest printable colour is ΔE00 %.2f away (tolerance %.2g)", de, pr.tol))
	}
	return r
}
