package mixing

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
)

// LightTolerance is how far from the target white the recipe of a quality
// goal may land (Lights.SolveQualityWithin). It allows the chromaticities
// that meet every bound that is not zero:
//
//   - Δu′v′ to the target ≤ UVPrime (CIE 1976 UCS): a disc;
//   - |CCT − CCT of the target| ≤ CCT, in kelvin;
//   - |Duv − Duv of the target| ≤ Duv (CIE 1960 UCS);
//
// CCT and Duv by Ohno's method (colorimetry.CCTOhno) on the Planckian
// locus of the solve's observer; a chromaticity whose CCT is not defined
// (CIE 015:2018) meets no CCT or Duv bound. A zero bound is not imposed,
// and the zero value, every bound zero, asks for the target exactly. The
// region must be bounded, so a CCT bound needs a Duv bound beside it (or a
// Δu′v′ bound), and a Duv bound a CCT bound (or a Δu′v′ bound).
//
// The tolerance moves the chromaticity only: a luminance target
// (LightTarget.Y) is still met exactly.
type LightTolerance struct {
	UVPrime float64 // largest Δu′v′ to the target; 0: not bounded
	CCT     float64 // largest |ΔCCT|, K; 0: not bounded
	Duv     float64 // largest |ΔDuv|; 0: not bounded
}

// IsZero reports whether the tolerance asks for the target exactly.
func (t LightTolerance) IsZero() bool { return t.UVPrime == 0 && t.CCT == 0 && t.Duv == 0 }

// validate returns an error for a bound that is negative or not finite,
// and for an unbounded region.
func (t LightTolerance) validate() error {
	for _, b := range []struct {
		name string
		v    float64
	}{{"Δu′v′", t.UVPrime}, {"CCT", t.CCT}, {"Duv", t.Duv}} {
		if !(b.v >= 0) || math.IsInf(b.v, 0) {
			return fmt.Errorf("lights solve: %s tolerance %g must be zero or positive", b.name, b.v)
		}
	}
	if t.UVPrime == 0 && (t.CCT > 0) != (t.Duv > 0) {
		return errors.New("lights solve: a CCT tolerance needs a Duv tolerance beside it (or a Δu′v′ one), and a Duv tolerance a CCT one: alone it leaves the region unbounded")
	}
	return nil
}

// scaled returns every bound times f.
func (t LightTolerance) scaled(f float64) LightTolerance {
	return LightTolerance{UVPrime: f * t.UVPrime, CCT: f * t.CCT, Duv: f * t.Duv}
}

// json returns the bounds as the "tolerance" key: "uv_prime",
// "cct_kelvin" and "duv", null where not bounded.
func (t LightTolerance) json() map[string]any {
	opt := func(v float64) any {
		if v == 0 {
			return nil
		}
		return v
	}
	return map[string]any{"uv_prime": opt(t.UVPrime), "cct_kelvin": opt(t.CCT), "duv": opt(t.Duv)}
}

// String describes the bounds, e.g. "Δu′v′ ≤ 0.002, |ΔCCT| ≤ 100 K".
func (t LightTolerance) String() string {
	var p []string
	if t.UVPrime > 0 {
		p = append(p, fmt.Sprintf("Δu′v′ ≤ %g", t.UVPrime))
	}
	if t.CCT > 0 {
		p = append(p, fmt.Sprintf("|ΔCCT| ≤ %g K", t.CCT))
	}
	if t.Duv > 0 {
		p = append(p, fmt.Sprintf("|ΔDuv| ≤ %g", t.Duv))
	}
	if len(p) == 0 {
		return "exact"
	}
	return strings.Join(p, ", ")
}

// toleranceFractions are the points of the "tolerance_trade_off" key: the
// goal's optimum at these fractions of the tolerance, the last the
// recipe's own.
var toleranceFractions = []float64{0, 0.5, 1}

// SolveQualityWithin is SolveQuality with the goal's recipe allowed to
// land anywhere within tol of the target's chromaticity (see
// LightTolerance); the other recipes still reach the target exactly. With
// a zero tolerance it is SolveQuality.
//
// The set searched. The u′v′ of a mix is a projective function of the
// outputs: u′ = 4X/D, v′ = 9Y/D with D = X + 15Y + 3Z, each linear in w.
// The disc Δu′v′ ≤ r is then ‖(4X − u′₀D, 9Y − v′₀D)‖ ≤ r·D, a quadratic
// (second-order cone) constraint: the mixes within it form a convex set,
// though no longer a polytope. The CCT–Duv box is close to, but not
// exactly, convex; it is star-shaped about the target, which is all the
// search below needs.
//
// Method. Every mix of the set reaches some chromaticity c of the region
// exactly, so the set is the union of the polytopes of SolveQuality, one
// for each c. A ratio of linear forms (efficacy, melanopic DER) reaches
// its optimum at an extreme point of the set: a vertex of the bounds (and
// level equation) whose chromaticity lies inside the region, or a vertex
// of the polytope of a chromaticity on the region's edge. The first are
// listed; on the edge the best vertex is found at 48 directions from the
// target and refined by golden section about the two best. Ra, R9 and Rf
// are maximised by the Nelder–Mead search of SolveQuality, now over the
// outputs (less the level equation, if any), each point drawn back into
// the set along the ray to the exact polytope's centre (by bisection on
// the region's edge), with the penalty on the part drawn back; it starts
// from the best of those vertices (16 directions on the edge), the exact
// optimum and the plain recipes. The optimum is searched at the fractions
// 0, ½ and 1 of the tolerance in turn, each search seeded with the one
// before (the sets are nested), so the three values never fall; a wider
// fraction's optimum replaces the narrower one's only when it gains enough
// to show (see worthMoving), so a tolerance that buys nothing leaves the
// recipe on the target. Without a
// luminance target the level is chosen as SolveQuality chooses it, the
// mix at full drive corrected onto its own chromaticity.
//
// Keys. The goal's recipe also carries "tolerance" (the bounds:
// "uv_prime", "cct_kelvin", "duv", null where not bounded) and
// "tolerance_trade_off": for each fraction 0, ½, 1 of the tolerance the
// optimum's "fraction", "tolerance" (the bounds at that fraction),
// "delta_uv_prime" to the target, "x", "y", "Y", "cct_kelvin", "duv" and
// the quality keys of the trade-off points; its "delta_uv_prime" is the
// Δu′v′ it used, and its "trade_off" runs over the tolerance's set. Every
// other recipe has both keys null.
//
// A target the rig cannot reach exactly but whose nearest mix lies within
// the tolerance is searched too, around that mix: the goal's recipe is
// then Reachable (within tolerance), the fraction 0 of the trade-off
// reports "reachable" false with null values, and a warning says so.
//
// Errors, beyond those of SolveQuality: a bound that is negative or not
// finite; a CCT bound without a Duv bound or the reverse, with no Δu′v′
// bound; a CCT or Duv bound at a target whose CCT is not defined; a
// tolerance with GoalNone.
func (m *Lights) SolveQualityWithin(t LightTarget, goal LightGoal, tol LightTolerance, opt LightSolveOptions) (Solution, error) {
	if goal < GoalNone || goal > GoalMinMelanopic {
		return Solution{}, fmt.Errorf("lights solve: unknown goal %v", goal)
	}
	if err := tol.validate(); err != nil {
		return Solution{}, err
	}
	if goal == GoalNone && !tol.IsZero() {
		return Solution{}, errors.New("lights solve: a tolerance applies to the recipe of a goal; none was given")
	}
	sol, err := m.Solve(t, opt)
	if err != nil {
		return Solution{}, err
	}
	q, err := m.newQuality(t, opt)
	if err != nil {
		return Solution{}, err
	}
	var region *lightRegion
	if !tol.IsZero() {
		if region, err = q.newRegion(tol); err != nil {
			return Solution{}, err
		}
	}
	plain := make([][]float64, len(sol.Recipes))
	for k, r := range sol.Recipes {
		if plain[k], err = m.Outputs(r.Amounts); err != nil {
			return Solution{}, fmt.Errorf("lights solve: %w", err)
		}
	}
	if goal != GoalNone {
		var rec Recipe
		found := false
		switch {
		case sol.Recipes[0].Reachable && region == nil:
			if rec, err = q.optimum(goal, plain); err != nil {
				return Solution{}, err
			}
			found = true
		case sol.Recipes[0].Reachable:
			if rec, err = q.optimumWithin(goal, tol, plain); err != nil {
				return Solution{}, err
			}
			found = true
		case region != nil && q.wholeInside(region, plain[0]):
			if rec, err = q.optimumNear(goal, tol, plain[0]); err != nil {
				sol.Recipes[0].Warnings = append(sol.Recipes[0].Warnings, fmt.Sprintf("the goal %q was not searched: the target is out of reach, and within the tolerance (%v) %v", goal, tol, strings.TrimPrefix(err.Error(), "lights solve: ")))
			} else {
				found = true
			}
		case region != nil:
			sol.Recipes[0].Warnings = append(sol.Recipes[0].Warnings, fmt.Sprintf("the goal %q was not searched: the target is out of reach, even within the tolerance (%v)", goal, tol))
		default:
			sol.Recipes[0].Warnings = append(sol.Recipes[0].Warnings, fmt.Sprintf("the goal %q was not searched: the target is out of reach", goal))
		}
		if found {
			w := rec.Extra["outputs_w"].([]float64)
			merged := false
			for k := range sol.Recipes {
				if sol.Recipes[k].Reachable && lightSameW(plain[k], w) {
					// The same mix: name both strategies, the goal first.
					if st := sol.Recipes[k].Extra["strategy"].(string); !strings.Contains(st, goal.String()) {
						sol.Recipes[k].Extra["strategy"] = goal.String() + "; " + st
					}
					for _, key := range []string{"trade_off", keyTolerance, keyToleranceTrade} {
						if v, ok := rec.Extra[key]; ok {
							sol.Recipes[k].Extra[key] = v
						}
					}
					// Move it first, keeping the order of the others.
					r, x := sol.Recipes[k], plain[k]
					copy(sol.Recipes[1:k+1], sol.Recipes[:k])
					copy(plain[1:k+1], plain[:k])
					sol.Recipes[0], plain[0] = r, x
					merged = true
					break
				}
			}
			if !merged {
				delete(rec.Extra, "outputs_w")
				sol.Recipes = append([]Recipe{rec}, sol.Recipes...)
				plain = append([][]float64{w}, plain...)
			}
		}
	}
	for k := range sol.Recipes {
		q.annotate(&sol.Recipes[k], plain[k])
		for _, key := range []string{"trade_off", keyTolerance, keyToleranceTrade} {
			if _, ok := sol.Recipes[k].Extra[key]; !ok {
				sol.Recipes[k].Extra[key] = nil
			}
		}
	}
	return sol, nil
}

// Keys of a goal's recipe under a tolerance.
const (
	keyTolerance      = "tolerance"
	keyToleranceTrade = "tolerance_trade_off"
)

// lightRegion is the set of chromaticities a tolerance allows.
type lightRegion struct {
	tol    LightTolerance
	target colorimetry.UVPrime
	table  *colorimetry.PlanckianTable // for CCT and Duv bounds
	cct    colorimetry.CCT             // of the target
}

// newRegion returns the region of tol about the solve's target.
func (q *lightQuality) newRegion(tol LightTolerance) (*lightRegion, error) {
	r := &lightRegion{tol: tol, target: q.p.t.XY.UVPrime()}
	if tol.CCT > 0 || tol.Duv > 0 {
		tab, err := colorimetry.NewPlanckianTable(q.p.obs, colorimetry.C2)
		if err != nil {
			return nil, fmt.Errorf("lights solve: %w", err)
		}
		c, err := tab.CCT(r.target.UV(), colorimetry.CCTOhno)
		if err != nil {
			return nil, fmt.Errorf("lights solve: a CCT or Duv tolerance needs a target whose CCT is defined: %w", err)
		}
		r.table, r.cct = tab, c
	}
	return r, nil
}

// regionSlack is the relative slack of a bound that contains allows, for
// the rounding of points placed on the region's edge.
const regionSlack = 1e-9

// contains reports whether chromaticity uv meets every bound.
func (r *lightRegion) contains(uv colorimetry.UVPrime) bool {
	t := r.tol
	if t.UVPrime > 0 && !(colorimetry.DeltaUVPrime(uv, r.target) <= t.UVPrime*(1+regionSlack)) {
		return false
	}
	if t.CCT > 0 || t.Duv > 0 {
		c, err := r.table.CCT(uv.UV(), colorimetry.CCTOhno)
		if err != nil {
			return false
		}
		if t.CCT > 0 && !(math.Abs(c.Kelvin-r.cct.Kelvin) <= t.CCT*(1+regionSlack)) {
			return false
		}
		if t.Duv > 0 && !(math.Abs(c.Duv-r.cct.Duv) <= t.Duv*(1+regionSlack)) {
			return false
		}
	}
	return true
}

// edge returns the point of the region's edge in direction theta (radians,
// from the u′ axis) from the target: on the disc's circle, or found by
// bisection along the ray (the region being star-shaped about the
// target).
func (r *lightRegion) edge(theta float64) colorimetry.UVPrime {
	du, dv := math.Cos(theta), math.Sin(theta)
	at := func(s float64) colorimetry.UVPrime {
		return colorimetry.UVPrime{U: r.target.U + s*du, V: r.target.V + s*dv}
	}
	if r.tol.CCT == 0 && r.tol.Duv == 0 {
		return at(r.tol.UVPrime)
	}
	hi := r.tol.UVPrime
	if hi == 0 {
		// Grow a bound on the edge: the diagram is smaller than 1.
		for hi = 1e-4; hi < 1 && r.contains(at(hi)); hi *= 2 {
		}
	}
	if r.contains(at(hi)) {
		return at(hi)
	}
	lo := 0.0
	for range 50 {
		mid := (lo + hi) / 2
		if r.contains(at(mid)) {
			lo = mid
		} else {
			hi = mid
		}
	}
	return at(lo)
}

// toleranceSpace returns the search space of region about the exact one
// sp0: its level equation (a luminance target, or the cross-section of a
// scale-free solve) kept, the chromaticity equations replaced by the
// region, and sp0's centre (at the target) the centre of the retraction.
func (q *lightQuality) toleranceSpace(sp0 *searchSpace, region *lightRegion) (*searchSpace, error) {
	p := q.p
	sp := &searchSpace{centre: sp0.centre, scaleUp: sp0.scaleUp, region: region, ch: p.b.ch, base: p.off}
	eq, eqc, err := q.levelRows()
	if err != nil {
		return nil, err
	}
	if sp.scaleUp {
		sp.base = colorimetry.XYZ{}
	}
	if !sp.inside(sp.centre) {
		return nil, errors.New("lights solve: no mix that the rig reaches lies within the tolerance")
	}
	for _, v := range sp0.vertices {
		if sp.inside(v) {
			sp.vertices = append(sp.vertices, v)
		}
	}
	dim := 1e-9 * p.b.fullY()
	lightVertices(eq, eqc, p.n, func(w []float64) {
		if tot := p.b.mixXYZ(w, p.add); !(tot.X+tot.Y+tot.Z > dim) || !sp.inside(w) {
			return
		}
		for _, v := range sp.vertices {
			if lightSameW(v, w) {
				return
			}
		}
		sp.vertices = append(sp.vertices, append([]float64(nil), w...))
	})
	if sp.basis, err = nullSpace(eq, p.n); err != nil {
		return nil, err
	}
	return sp, nil
}

// levelRows returns the equations that a tolerance keeps: the luminance
// of a luminance target, or the cross-section of a scale-free solve
// (none with an added light and no luminance target).
func (q *lightQuality) levelRows() ([][]float64, []float64, error) {
	p := q.p
	switch {
	case p.t.Y > 0:
		row := make([]float64, p.n)
		for i, ch := range p.b.ch {
			row[i] = ch.Y
		}
		return [][]float64{row}, []float64{p.t.Y/p.b.scale - p.off.Y}, nil
	case p.addSpec.IsZero():
		row, y0, err := q.sectionRow()
		if err != nil {
			return nil, nil, err
		}
		return [][]float64{row}, []float64{y0}, nil
	}
	return nil, nil, nil
}

// edgeCandidates returns the best point of f (over the search space sp,
// under a tolerance) among the vertices of the exact polytopes of
// chromaticities on the region's edge, at evenly spaced directions from
// the target: 48 of them and, when refine is true, the best point found
// by golden section about the two best local maxima; 16 without.
func (q *lightQuality) edgeCandidates(sp *searchSpace, f func(w []float64) (float64, bool), refine bool) [][]float64 {
	dirs := 16
	if refine {
		dirs = 48
	}
	at := func(theta float64) ([]float64, float64) {
		xy := sp.region.edge(theta).XY()
		if !(xy.X > 0 && xy.Y > 0 && xy.X+xy.Y < 1) {
			return nil, math.Inf(-1)
		}
		spc, err := q.spaceAt(xy, false)
		if err != nil {
			return nil, math.Inf(-1)
		}
		var best []float64
		bv := math.Inf(-1)
		for _, x := range spc.vertices {
			if v, ok := f(x); ok && v > bv {
				best, bv = x, v
			}
		}
		return best, bv
	}
	step := 2 * math.Pi / float64(dirs)
	vals := make([]float64, dirs)
	var out [][]float64
	for k := range dirs {
		w, v := at(float64(k) * step)
		vals[k] = v
		if w != nil {
			out = append(out, w)
		}
	}
	if !refine {
		return out
	}
	// Local maxima of the samples (on the circle of directions), best
	// first.
	var peaks []int
	for k := range dirs {
		v := vals[k]
		if !math.IsInf(v, -1) && v >= vals[(k+dirs-1)%dirs] && v >= vals[(k+1)%dirs] {
			peaks = append(peaks, k)
		}
	}
	sort.SliceStable(peaks, func(i, j int) bool { return vals[peaks[i]] > vals[peaks[j]] })
	if len(peaks) > 2 {
		peaks = peaks[:2]
	}
	const phi = 0.6180339887498949 // golden section ratio (√5 − 1)/2
	for _, k := range peaks {
		lo, hi := float64(k-1)*step, float64(k+1)*step
		var bestW []float64
		bestV := math.Inf(-1)
		eval := func(theta float64) float64 {
			w, v := at(theta)
			if w != nil && v > bestV {
				bestW, bestV = w, v
			}
			return v
		}
		x1, x2 := hi-phi*(hi-lo), lo+phi*(hi-lo)
		f1, f2 := eval(x1), eval(x2)
		for range 30 {
			if f1 >= f2 {
				hi, x2, f2 = x2, x1, f1
				x1 = hi - phi*(hi-lo)
				f1 = eval(x1)
			} else {
				lo, x1, f1 = x1, x2, f2
				x2 = lo + phi*(hi-lo)
				f2 = eval(x2)
			}
		}
		if bestW != nil {
			out = append(out, bestW)
		}
	}
	return out
}

// optimumWithin returns the recipe of goal g under tolerance tol (its
// Extra still holding "outputs_w"), given the outputs of Solve's recipes:
// the optimum at each fraction of the tolerance in turn, each seeded with
// the one before.
func (q *lightQuality) optimumWithin(g LightGoal, tol LightTolerance, plain [][]float64) (Recipe, error) {
	sp0, err := q.space()
	if err != nil {
		return Recipe{}, err
	}
	w, best, err := q.search(sp0, g, plain, nil)
	if err != nil {
		return Recipe{}, err
	}
	return q.withinFrom(g, tol, plain, sp0, w, best, nil)
}

// withinFrom runs the searches of optimumWithin from the exact space sp0
// and its optimum w (best its point of sp0); w nil means the target is not
// reachable exactly (optimumNear), and the search starts from the seed
// mixes in seeds instead.
func (q *lightQuality) withinFrom(g LightGoal, tol LightTolerance, plain [][]float64, sp0 *searchSpace, w, best []float64, seeds [][]float64) (Recipe, error) {
	type step struct {
		frac float64
		w    []float64
	}
	steps := []step{{toleranceFractions[0], w}}
	prev := seeds
	if w != nil {
		prev = [][]float64{w}
	}
	var sp *searchSpace
	for _, frac := range toleranceFractions[1:] {
		region, err := q.newRegion(tol.scaled(frac))
		if err != nil {
			return Recipe{}, err
		}
		spf, err := q.toleranceSpace(sp0, region)
		if err != nil {
			return Recipe{}, err
		}
		wf, bf, err := q.search(spf, g, plain, prev)
		if err != nil {
			if w == nil && frac < 1 {
				// Not reachable at this fraction either.
				steps = append(steps, step{frac, nil})
				continue
			}
			return Recipe{}, err
		}
		if !q.wholeInside(region, wf) {
			return Recipe{}, fmt.Errorf("lights solve: the %v mix within %v left the tolerance (numerical trouble)", g, tol.scaled(frac))
		}
		if w != nil && !q.worthMoving(g, w, wf) {
			// The wider tolerance buys nothing that shows: stay with the
			// mix nearer the target (it lies in this region too, the
			// regions being nested).
			wf, bf = w, q.section(spf, w)
		}
		steps = append(steps, step{frac, wf})
		prev = [][]float64{wf}
		w, best, sp = wf, bf, spf
	}
	rec := q.p.recipe(w, g.String(), true, nil)
	rec.Extra["trade_off"] = q.tradeOff(sp, g, best, sp0)
	rec.Extra[keyTolerance] = tol.json()
	var trade []map[string]any
	for _, s := range steps {
		pt := q.point(s.w)
		pt["fraction"] = s.frac
		pt[keyTolerance] = tol.scaled(s.frac).json()
		pt["reachable"] = s.w != nil
		for _, k := range []string{"delta_uv_prime", "x", "y", "Y", "cct_kelvin", "duv"} {
			pt[k] = nil
		}
		if s.w != nil {
			r := q.p.recipe(s.w, "", true, nil)
			for _, k := range []string{"delta_uv_prime", "x", "y", "Y", "cct_kelvin", "duv"} {
				pt[k] = r.Extra[k]
			}
		}
		trade = append(trade, pt)
	}
	rec.Extra[keyToleranceTrade] = trade
	return rec, nil
}

// worthMoving reports whether the mix to, found with a wider tolerance,
// improves the goal over the mix from enough to be worth landing farther
// from the target: by at least 0.05 for Ra, R9 and Rf (half the 0.1 to
// which they are reported; CIE 13.3 and CIE 224 give them as whole or
// one-decimal numbers), or by a relative 1e-4 for the efficacy and the
// melanopic ratio (common practice (no source): below the repeatability
// of any measurement of them).
func (q *lightQuality) worthMoving(g LightGoal, from, to []float64) bool {
	f := q.signed(g)
	a, okA := f(from)
	b, okB := f(to)
	if !okA || !okB {
		return okB
	}
	if g.searched() {
		return b-a >= 0.05
	}
	return b-a >= 1e-4*math.Abs(a)
}

// optimumNear returns the recipe of goal g under tolerance tol for a
// target the rig cannot reach exactly, whose nearest mix near (Solve's
// recipe) lies within the tolerance: the search space is that of the
// region about the target, its retraction centred on near.
func (q *lightQuality) optimumNear(g LightGoal, tol LightTolerance, near []float64) (Recipe, error) {
	// An exact space at near's own chromaticity supplies the level
	// equation's centre; near is on the edge of what the rig reaches, so
	// its polytope is small, and every mix of it lies in the region.
	var xy colorimetry.XY
	var err error
	if q.p.addSpec.IsZero() && q.p.t.Y == 0 {
		var c colorimetry.XYZ
		for i, x := range near {
			c = c.Add(q.p.b.ch[i].Scale(x))
		}
		xy, err = c.XY()
	} else {
		xy, err = q.p.b.mixXYZ(near, q.p.add).XY()
	}
	if err != nil {
		return Recipe{}, fmt.Errorf("lights solve: the nearest mix gives no light")
	}
	sp0, err := q.spaceAt(xy, true)
	if err != nil {
		return Recipe{}, err
	}
	rec, err := q.withinFrom(g, tol, [][]float64{near}, sp0, nil, nil, [][]float64{near})
	if err != nil {
		return Recipe{}, err
	}
	rec.Warnings = append(rec.Warnings, fmt.Sprintf("the target itself is out of reach; this mix lies within the tolerance (%v)", tol))
	return rec, nil
}
