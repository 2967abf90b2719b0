package mixing

import (
	"fmt"
	"math"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
)

// Correction is the result of Pigments.Correct.
type Correction struct {
	// Recipe is the corrected recipe: the same colorants, new mass
	// fractions summing to 1. Its DE00 is what the corrected model
	// predicts against the target; Extra and Warnings as for Recipe.
	Recipe Recipe
	// TrialDE00 is ΔE00 between the measured trial and the target under
	// the primary illuminant.
	TrialDE00 float64
	// ModelDE00 is ΔE00 between the measured trial and the model's
	// prediction of the recipe it was mixed from: how far off the model
	// was.
	ModelDE00 float64
	// Additions are the amounts to add to the trial batch to bring it to
	// the corrected recipe, per unit mass of the batch (the corrected
	// recipe scaled up until no colorant would have to be taken out). Nil
	// when the corrected recipe drops a colorant the batch already holds
	// (it cannot be reached by adding), with a warning.
	Additions []Amount
}

// Correct returns the corrected recipe from a recipe, the measured
// reflectance of a trial mixed from it and the target reflectance (both
// fractions 0–1, measured like the calibration). The model is corrected by
// the trial's deviation in K/S: at each wavelength the film's K/S is
// multiplied by q_trial / q_model(recipe), the ratio between what the
// trial shows and what the model predicted for it, and the recipe is
// solved again with the same colorants, from the recipe as start point,
// under the options' illuminant and observer (opt.Colorants and opt.Only
// are ignored). Repeated with each new trial, this converges on the target
// even when the model's K and S are off by several percent.
//
// A corrected recipe that cannot reach the target comes back with
// Reachable false, as for Recipe; non-convergence returns the Correction
// with a *RecipeConvergenceError.
func (p *Pigments) Correct(recipe []Amount, trial, target colorimetry.Spectrum, opt RecipeOptions) (Correction, error) {
	pr, err := p.prepare(opt)
	if err != nil {
		return Correction{}, err
	}
	c0, err := p.amountVector(recipe)
	if err != nil {
		return Correction{}, fmt.Errorf("recipe: %w", err)
	}
	var sum float64
	for _, v := range c0 {
		sum += v
	}
	if math.Abs(sum-1) > 1e-6 {
		pr.warns = append(pr.warns, fmt.Sprintf("the recipe's mass fractions sum to %.6g; taken as proportions", sum))
	}
	for i := range c0 {
		c0[i] /= sum
	}
	if err := trial.CheckFraction(0.01); err != nil {
		return Correction{}, fmt.Errorf("trial: %w", err)
	}
	if err := pr.setTarget(target); err != nil {
		return Correction{}, err
	}
	rtr, w, err := p.onGrid(trial, "trial")
	if err != nil {
		return Correction{}, err
	}
	pr.warns = append(pr.warns, w...)
	qtr, cw := p.internalKS(rtr, "trial")
	pr.warns = append(pr.warns, cw...)

	// The combination: the white and the recipe's other colorants.
	cols := []int{pr.white}
	x0 := []float64{}
	for i, v := range c0 {
		if i != pr.white && v > 0 {
			cols = append(cols, i)
			x0 = append(x0, v)
		}
	}
	if len(cols) == 1 {
		return Correction{}, fmt.Errorf("recipe: only the white %q; there is nothing to correct with", p.White)
	}
	wk := pr.newWork(cols)
	pr.forward(wk, x0, false)
	pred := append([]float64(nil), wk.rm...)
	qm, _ := p.internalKS(pred, "model")
	pr.rho = make([]float64, pr.n)
	pr.delta = make([]float64, pr.n)
	for l := range pr.n {
		switch {
		case qm[l] > 0:
			pr.rho[l] = qtr[l] / qm[l]
		default:
			// A film the model calls perfectly white: shift instead.
			pr.rho[l] = 1
			pr.delta[l] = qtr[l]
		}
	}
	out := Correction{
		TrialDE00: colorimetry.DeltaE2000(pr.labT, pr.prim.lab(rtr)),
		ModelDE00: colorimetry.DeltaE2000(pr.prim.lab(rtr), pr.prim.lab(pred)),
	}
	r := pr.solveCombo(cols, x0)
	var cerr error
	sol, err := pr.rank([]kmResult{r}, RecipeOptions{Alternatives: 1})
	if err != nil {
		if _, ok := err.(*RecipeConvergenceError); !ok {
			return Correction{}, err
		}
		cerr = err
	}
	out.Recipe = sol.Recipes[0]
	out.Additions, w = additions(p, c0, r)
	out.Recipe.Warnings = append(out.Recipe.Warnings, w...)
	if cerr != nil {
		return out, &RecipeConvergenceError{Iterations: pr.maxIter, Best: Solution{Recipes: []Recipe{out.Recipe}}}
	}
	return out, nil
}

// additions returns what to add, per unit mass of a batch mixed to c0,
// to reach the fractions of r.
func additions(p *Pigments, c0 []float64, r kmResult) ([]Amount, []string) {
	c1 := make([]float64, len(c0))
	for i, ci := range r.cols {
		c1[ci] = r.c[i]
	}
	scale := 1.0
	var dropped []string
	for i := range c0 {
		if c0[i] == 0 {
			continue
		}
		if c1[i] == 0 {
			dropped = append(dropped, p.Colorants[i].Name)
			continue
		}
		scale = math.Max(scale, c0[i]/c1[i])
	}
	if len(dropped) > 0 {
		return nil, []string{fmt.Sprintf("the corrected recipe leaves out %s, already in the trial batch: mix a new batch rather than adding", strings.Join(dropped, ", "))}
	}
	var out []Amount
	for i := range c0 {
		if add := scale*c1[i] - c0[i]; add > 1e-12 {
			out = append(out, Amount{Name: p.Colorants[i].Name, Value: add})
		}
	}
	return out, nil
}
