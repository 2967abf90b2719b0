package mixing

import (
	"math"
	"sync"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/rendering"
	"gonum.org/v1/gonum/mat"
)

// lqGrid visits a grid of the mixes w ∈ [0, 1]ⁿ that satisfy A·w = c
// exactly (m ≤ n equations): the last n − m outputs run over steps + 1
// levels each, the first m are solved for, and mixes outside [0, 1] are
// skipped. It is the brute force against which the search is checked.
func lqGrid(t *testing.T, a [][]float64, c []float64, steps int, visit func(w []float64)) {
	t.Helper()
	m, n := len(a), len(a[0])
	blk := mat.NewDense(m, m, nil)
	for r := range m {
		for q := range m {
			blk.Set(r, q, a[r][q])
		}
	}
	var lu mat.LU
	lu.Factorize(blk)
	if lu.Det() == 0 {
		t.Fatal("grid: the first channels do not span the target equations")
	}
	free := n - m
	idx := make([]int, free)
	w := make([]float64, n)
	for {
		rhs := mat.NewVecDense(m, nil)
		for r := range m {
			v := c[r]
			for k := range free {
				x := float64(idx[k]) / float64(steps)
				w[m+k] = x
				v -= a[r][m+k] * x
			}
			rhs.SetVec(r, v)
		}
		var sol mat.VecDense
		if err := lu.SolveVecTo(&sol, false, rhs); err == nil {
			ok := true
			for q := range m {
				w[q] = sol.AtVec(q)
				ok = ok && w[q] >= 0 && w[q] <= 1
			}
			if ok {
				visit(w)
			}
		}
		k := 0
		for k < free && idx[k] == steps {
			idx[k] = 0
			k++
		}
		if k == free {
			return
		}
		idx[k]++
	}
}

// The melanopic weighting of lqValue, built once (it is immutable, so
// the parallel tests may share it).
var (
	lqMelOnce sync.Once
	lqMel     colorimetry.AlphaOpic
	lqMelErr  error
)

// lqValue computes a goal's quantity of outputs w independently of the
// solve: the whole light from the model's spectra, then package rendering
// and package colorimetry's photometry.
func lqValue(t *testing.T, m *Lights, g LightGoal, w []float64, add colorimetry.Spectrum) (float64, bool) {
	t.Helper()
	v := make([]float64, m.Grid().N)
	for i := range w {
		for k := range v {
			v[k] += w[i] * m.Channel(i).Spectrum.Value(k)
		}
	}
	if !add.IsZero() {
		a, err := add.WithExtrap(colorimetry.ExtrapZero).Resample(m.Grid())
		if err != nil {
			t.Fatal(err)
		}
		for k := range v {
			v[k] += a.Value(k)
		}
	}
	s, err := colorimetry.NewSpectrumOnGrid(m.Grid(), v, colorimetry.Options{Extrap: colorimetry.ExtrapZero})
	if err != nil {
		return 0, false
	}
	ph := colorimetry.Efficiency{V: cie.PhotopicV(), K: colorimetry.Km}
	switch g {
	case GoalMaxRa, GoalMaxR9:
		c, err := rendering.ColourRendering(s)
		if err != nil {
			return 0, false
		}
		if g == GoalMaxR9 {
			return c.R[8], true
		}
		return c.Ra, true
	case GoalMaxRf:
		f, err := rendering.ColourFidelity(s)
		return f.Rf, err == nil
	case GoalMaxMelanopic, GoalMinMelanopic:
		lqMelOnce.Do(func() {
			act, err := cie.AlphaOpicAction(cie.Melanopic)
			if err != nil {
				lqMelErr = err
				return
			}
			lqMel, lqMelErr = colorimetry.NewAlphaOpic(act, ph, cie.D65())
		})
		if lqMelErr != nil {
			t.Fatal(lqMelErr)
		}
		d, err := lqMel.DER(s)
		return d, err == nil
	}
	// Efficacy of the channels' light only (as Solve reports it).
	ch := make([]float64, m.Grid().N)
	for i := range w {
		for k := range ch {
			ch[k] += w[i] * m.Channel(i).Spectrum.Value(k)
		}
	}
	cs, err := colorimetry.NewSpectrumOnGrid(m.Grid(), ch, colorimetry.Options{Extrap: colorimetry.ExtrapZero})
	if err != nil {
		return 0, false
	}
	e, err := colorimetry.EfficacyOfRadiation(cs, ph)
	return e, err == nil
}

// TestSolveQualityOptimal checks each goal on the five-channel rig: the
// goal's recipe reaches the target exactly, is at least as good as every
// recipe of the plain solve (the goal's quantity recomputed independently)
// and at least as good as a brute-force grid over the set of mixes that
// reach the target (common practice (no source): an optimum is checked
// against exhaustive search on a small problem). Tolerance 1e-6 of the
// index: the search stops when its simplex is smaller than 1e-7.
func TestSolveQualityOptimal(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, colorimetry.Spectrum{})
	obs := cie.CIE1931()
	for _, c := range []struct {
		name  string
		cct   float64
		y     float64 // luminance target; 0: chromaticity only
		steps int     // grid steps per free output
	}{
		{"4000 K", 4000, 0, 10},
		{"3000 K at Y 30", 3000, 30, 40},
	} {
		xy, err := LightTargetCCT(obs, c.cct, 0)
		if err != nil {
			t.Fatal(err)
		}
		target := LightTarget{XY: xy, Y: c.y}
		b, err := m.basis(obs)
		if err != nil {
			t.Fatal(err)
		}
		p := &lightProblem{m: m, b: b, obs: obs, t: target, n: m.Len()}
		var a [][]float64
		var rhs []float64
		if c.y > 0 {
			txyz, _ := xy.XYZ(c.y / b.scale)
			a, rhs = p.xyzRows(txyz)
		} else {
			a, rhs = p.chromaRows(xy, colorimetry.XYZ{})
		}
		goals := []LightGoal{GoalMaxRa, GoalMaxRf, GoalMaxR9, GoalMaxEfficacy, GoalMaxMelanopic, GoalMinMelanopic}
		// The brute force, once for every goal (signed: larger is better).
		gridBest := map[LightGoal]float64{}
		for _, g := range goals {
			gridBest[g] = math.Inf(-1)
		}
		lqGrid(t, a, rhs, c.steps, func(w []float64) {
			for _, g := range goals {
				if v, ok := lqValue(t, m, g, w, colorimetry.Spectrum{}); ok {
					gridBest[g] = math.Max(gridBest[g], lqSign(g)*v)
				}
			}
		})
		for _, g := range goals {
			sol, err := m.SolveQuality(target, g, LightSolveOptions{})
			if err != nil {
				t.Fatalf("%s %v: %v", c.name, g, err)
			}
			r := sol.Recipes[0]
			if !r.Reachable || r.Extra["strategy"] == nil {
				t.Fatalf("%s %v: first recipe %+v", c.name, g, r)
			}
			if d := r.Extra["delta_uv_prime"].(float64); d > 1e-6 {
				t.Errorf("%s %v: Δu′v′ to the target %g", c.name, g, d)
			}
			if c.y > 0 && math.Abs(r.Extra["Y"].(float64)-c.y) > 1e-6*c.y {
				t.Errorf("%s %v: Y %g, want %g", c.name, g, r.Extra["Y"], c.y)
			}
			sign := lqSign(g)
			got, ok := lqValue(t, m, g, ltOutputs(t, m, r), colorimetry.Spectrum{})
			if !ok {
				t.Fatalf("%s %v: the goal's recipe has no value", c.name, g)
			}
			got *= sign
			for k, pr := range sol.Recipes[1:] {
				if v, ok := lqValue(t, m, g, ltOutputs(t, m, pr), colorimetry.Spectrum{}); ok && sign*v > got+1e-6*math.Abs(got) {
					t.Errorf("%s %v: plain recipe %d (%v) scores %g, better than the goal's %g", c.name, g, k+2, pr.Extra["strategy"], sign*v, got)
				}
			}
			if math.IsInf(gridBest[g], -1) {
				t.Fatalf("%s %v: the grid found no mix", c.name, g)
			}
			if gridBest[g] > got+1e-6*math.Abs(got) {
				t.Errorf("%s %v: grid search finds %g, better than the goal's %g", c.name, g, gridBest[g], got)
			}
		}
	}
}

// lqSign is +1 for the goals that maximise and −1 for the one that
// minimises.
func lqSign(g LightGoal) float64 {
	if g == GoalMinMelanopic {
		return -1
	}
	return 1
}

// TestSolveQualityTradeOff checks the trade-off curve of max Ra: it runs
// from the highest-efficacy mix (the plain solve's "max efficacy" recipe,
// exact) to the optimum, with Ra rising (each point meets a higher level)
// and never beyond the optimum (common practice (no source): a trade-off
// curve is monotone in the quantity it steps through).
func TestSolveQualityTradeOff(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, colorimetry.Spectrum{})
	xy, err := LightTargetCCT(cie.CIE1931(), 4000, 0)
	if err != nil {
		t.Fatal(err)
	}
	sol, err := m.SolveQuality(LightTarget{XY: xy}, GoalMaxRa, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	curve, ok := sol.Recipes[0].Extra["trade_off"].([]map[string]any)
	if !ok || len(curve) != tradeOffPoints {
		t.Fatalf("trade_off %v, want %d points", sol.Recipes[0].Extra["trade_off"], tradeOffPoints)
	}
	var maxEff float64
	for _, r := range sol.Recipes[1:] {
		if r.Extra["strategy"] == StrategyMaxEfficacy {
			maxEff = r.Extra["efficacy_lm_per_w"].(float64)
		}
	}
	first, last := curve[0], curve[len(curve)-1]
	if math.Abs(first["efficacy_lm_per_w"].(float64)-maxEff) > 1e-9*maxEff {
		t.Errorf("trade-off starts at %g lm/W, the max efficacy recipe has %g", first["efficacy_lm_per_w"], maxEff)
	}
	if math.Abs(last["ra"].(float64)-sol.Recipes[0].Extra["ra"].(float64)) > 1e-9 {
		t.Errorf("trade-off ends at Ra %g, the optimum has %g", last["ra"], sol.Recipes[0].Extra["ra"])
	}
	for k := 1; k < len(curve); k++ {
		if curve[k]["ra"].(float64) < curve[k-1]["ra"].(float64)-1e-6 {
			t.Errorf("trade-off Ra falls from %g to %g at point %d", curve[k-1]["ra"], curve[k]["ra"], k+1)
		}
	}
}

// TestSolveQualityAddedLight checks a goal with an added light (the solve
// is then not scale-free): the recipe, added light included, reaches the
// target and scores at least as well as every plain recipe (as in
// TestSolveQualityOptimal).
func TestSolveQualityAddedLight(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, colorimetry.Spectrum{})
	add := ltGauss(t, 600, 80, 0.3) // a warm wash to complement
	xy, err := LightTargetCCT(cie.CIE1931(), 4500, 0)
	if err != nil {
		t.Fatal(err)
	}
	opt := LightSolveOptions{Add: add}
	sol, err := m.SolveQuality(LightTarget{XY: xy}, GoalMaxRa, opt)
	if err != nil {
		t.Fatal(err)
	}
	r := sol.Recipes[0]
	if r.Extra["strategy"] != StrategyMaxRa || !r.Reachable {
		t.Fatalf("first recipe %v (reachable %v), want max Ra", r.Extra["strategy"], r.Reachable)
	}
	tot := ltXYZ(t, m, ltTotal(t, m, r, add))
	uv, _ := tot.UVPrime()
	if d := colorimetry.DeltaUVPrime(uv, xy.UVPrime()); d > 1e-6 {
		t.Errorf("with the added light Δu′v′ to the target is %g", d)
	}
	got, _ := lqValue(t, m, GoalMaxRa, ltOutputs(t, m, r), add)
	if math.Abs(got-r.Extra["ra"].(float64)) > 1e-9 {
		t.Errorf("recipe says Ra %g, recomputed %g", r.Extra["ra"], got)
	}
	for _, pr := range sol.Recipes[1:] {
		if v, ok := lqValue(t, m, GoalMaxRa, ltOutputs(t, m, pr), add); ok && v > got+1e-6 {
			t.Errorf("plain recipe %v has Ra %g, better than the goal's %g", pr.Extra["strategy"], v, got)
		}
	}
}

// TestSolveQualityKeys checks that every recipe carries the quality keys,
// null where they cannot be computed (DESIGN.md: keys that do not apply
// are null, never absent), and that a goal that is not defined at the
// target is an error, not a panic: a green target, whose CCT is not
// defined (CIE 015:2018, |Duv| > 0.05), has no Ra.
func TestSolveQualityKeys(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, colorimetry.Spectrum{})
	green := LightTarget{XY: colorimetry.XY{X: 0.30, Y: 0.50}}
	sol, err := m.SolveQuality(green, GoalNone, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range sol.Recipes {
		for _, k := range []string{keyRa, keyR9, keyRf, keyDER, "trade_off"} {
			v, ok := r.Extra[k]
			if !ok {
				t.Errorf("%v: key %q missing", r.Extra["strategy"], k)
			}
			if k != keyDER && v != nil {
				t.Errorf("%v: key %q = %v, want null at a target without a CCT", r.Extra["strategy"], k, v)
			}
		}
		if r.Extra[keyDER] == nil {
			t.Errorf("%v: melanopic DER is defined for any light", r.Extra["strategy"])
		}
	}
	if _, err := m.SolveQuality(green, GoalMaxRa, LightSolveOptions{}); err == nil {
		t.Error("max Ra at a target without a CCT: no error")
	}
	if _, err := m.SolveQuality(green, LightGoal(99), LightSolveOptions{}); err == nil {
		t.Error("unknown goal: no error")
	}
	// Out of reach: the nearest recipe, with a warning, not an error.
	far := LightTarget{XY: colorimetry.XY{X: 0.03, Y: 0.3}} // beyond the blue–green edge of the rig
	sol, err = m.SolveQuality(far, GoalMaxRa, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if sol.Recipes[0].Reachable || len(sol.Recipes[0].Warnings) == 0 {
		t.Errorf("unreachable target: recipe %+v", sol.Recipes[0])
	}
}

func BenchmarkSolveQualityRf(b *testing.B) {
	var ch []LightChannel
	for _, band := range ltRGBAL {
		v := make([]float64, ltGrid.N)
		for k := range v {
			d := (ltGrid.Wavelength(k) - band.centre) / (band.fwhm / 2.3548)
			v[k] = band.peak * math.Exp(-0.5*d*d)
		}
		s, err := colorimetry.NewSpectrumOnGrid(ltGrid, v, colorimetry.Options{})
		if err != nil {
			b.Fatal(err)
		}
		ch = append(ch, LightChannel{Name: band.name, Spectrum: s})
	}
	m, err := NewLights(ch, colorimetry.Spectrum{}, false)
	if err != nil {
		b.Fatal(err)
	}
	xy, err := LightTargetCCT(cie.CIE1931(), 4000, 0)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		if _, err := m.SolveQuality(LightTarget{XY: xy}, GoalMaxRf, LightSolveOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// TestSolveQualityDark checks a rig with a dark spectrum and a
// chromaticity target: the goal's mix is scored as bright as the drives
// allow (its largest output is 1), reaches the target with the dark
// included, and is at least as good as every plain recipe (as in
// TestSolveQualityOptimal).
func TestSolveQualityDark(t *testing.T) {
	t.Parallel()
	dark := ltGauss(t, 600, 150, 0.004) // a dim, warm stray light
	m := ltRig(t, ltRGBAL, nil, dark)
	xy, err := LightTargetCCT(cie.CIE1931(), 3200, 0)
	if err != nil {
		t.Fatal(err)
	}
	for _, g := range []LightGoal{GoalMaxRa, GoalMaxMelanopic} {
		sol, err := m.SolveQuality(LightTarget{XY: xy}, g, LightSolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		r := sol.Recipes[0]
		w := ltOutputs(t, m, r)
		var top float64
		for _, x := range w {
			top = math.Max(top, x)
		}
		if math.Abs(top-1) > 1e-9 {
			t.Errorf("%v: largest output %g, want 1 (as bright as the drives allow)", g, top)
		}
		tot := ltXYZ(t, m, ltTotal(t, m, r, colorimetry.Spectrum{}))
		uv, _ := tot.UVPrime()
		if d := colorimetry.DeltaUVPrime(uv, xy.UVPrime()); d > 1e-6 {
			t.Errorf("%v: with the dark Δu′v′ to the target is %g", g, d)
		}
		got, _ := lqValue(t, m, g, w, dark)
		for _, pr := range sol.Recipes[1:] {
			if v, ok := lqValue(t, m, g, ltOutputs(t, m, pr), dark); ok && v > got+1e-9 {
				t.Errorf("%v: plain recipe %v scores %g, better than the goal's %g", g, pr.Extra["strategy"], v, got)
			}
		}
	}
}
