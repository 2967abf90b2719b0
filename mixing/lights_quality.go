package mixing

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/rendering"
	"gonum.org/v1/gonum/mat"
)

// LightGoal is a lighting-quality objective of a lights solve: which of
// the mixes that reach the target white SolveQuality ranks first.
type LightGoal int

const (
	// GoalNone runs the plain solve (Solve) and adds the quality keys to
	// its recipes.
	GoalNone LightGoal = iota
	// GoalMaxRa maximises the general colour rendering index Ra (CIE 13.3).
	GoalMaxRa
	// GoalMaxRf maximises the colour fidelity index Rf (CIE 224:2017).
	GoalMaxRf
	// GoalMaxR9 maximises the special colour rendering index R9 (CIE 13.3,
	// the saturated red TCS09).
	GoalMaxR9
	// GoalMaxEfficacy maximises the luminous efficacy of radiation of the
	// channels' light (lm per radiant W).
	GoalMaxEfficacy
	// GoalMaxMelanopic maximises the melanopic daylight efficacy ratio
	// (CIE S 026) of the whole light: the most circadian stimulus per lux.
	GoalMaxMelanopic
	// GoalMinMelanopic minimises it: the least circadian stimulus per lux.
	GoalMinMelanopic
)

// Strategies of the quality objectives, the "strategy" key of Recipe.Extra.
const (
	StrategyMaxRa        = "max Ra"
	StrategyMaxRf        = "max Rf"
	StrategyMaxR9        = "max R9"
	StrategyMaxMelanopic = "max melanopic DER"
	StrategyMinMelanopic = "min melanopic DER"
)

// String returns the goal's strategy name ("max Ra" …; "none").
func (g LightGoal) String() string {
	switch g {
	case GoalNone:
		return "none"
	case GoalMaxRa:
		return StrategyMaxRa
	case GoalMaxRf:
		return StrategyMaxRf
	case GoalMaxR9:
		return StrategyMaxR9
	case GoalMaxEfficacy:
		return StrategyMaxEfficacy
	case GoalMaxMelanopic:
		return StrategyMaxMelanopic
	case GoalMinMelanopic:
		return StrategyMinMelanopic
	}
	return fmt.Sprintf("LightGoal(%d)", int(g))
}

// Quality keys added to every recipe of SolveQuality.
const (
	keyRa  = "ra"
	keyR9  = "r9"
	keyRf  = "rf"
	keyDER = "melanopic_der"
)

// tradeOffPoints is the number of points of the trade-off curve, ends
// included.
const tradeOffPoints = 5

// SolveQuality solves for the target as Solve does and, for a goal other
// than GoalNone, adds first the recipe that is best by the goal among all
// the mixes that reach the target exactly: the set {w ∈ [0, 1]ⁿ : the
// target's chromaticity (and luminance, when t.Y > 0) is met}, a polytope.
// The rest are the recipes of Solve. Every recipe gets the Extra keys "ra"
// and "r9" (CIE 13.3), "rf" (CIE 224:2017) and "melanopic_der" (CIE S 026)
// of the whole light (dark and added light included; null where the index
// is not defined, e.g. at a target whose CCT is not), beside Solve's
// "efficacy_lm_per_w" of the channels' light.
//
// Method. Efficacy and the melanopic DER are ratios of two linear forms of
// the outputs, so their optimum lies at a vertex of the polytope, and the
// vertices are visited exactly, as in Solve. Ra, R9 and Rf are not: they
// are maximised by Nelder–Mead over the polytope's affine hull (the null
// space of the target equations, through the mean of the vertices), each
// point drawn back onto the polytope along the ray to that centre, from
// several starts (the best vertices, the centre and Solve's recipes),
// keeping the best point seen.
//
// Level. Without a luminance target or an added light the channels' mix
// is scale-free, so the search runs over its shapes (a cross-section of
// fixed luminance) and scores each as bright as the drives allow,
// corrected onto the target for the dark spectrum if there is one. With an
// added light and no luminance target the level matters (the added
// light's share changes with it), so the search runs over all levels, and
// the best mix found is then made as bright as it can be, along the
// segment to the same mix at full drive, while the goal's quantity stays
// within half a unit of the digit the standards report (0.05 for Ra, R9,
// Rf and efficacy, 5×10⁻⁴ for the DER).
//
// The result is at least as good as every recipe of Solve, each scored at
// its own level, and every vertex (to the tolerance above where it was
// brightened); it is a local search, not a proof of the global optimum.
//
// The goal's recipe also carries "trade_off": tradeOffPoints points from
// the mix of highest efficacy to the optimum (for GoalMaxEfficacy, from the
// mix of highest Ra), each the most efficient mix found whose goal
// quantity reaches a level evenly spaced between the two ends (for
// GoalMaxEfficacy, the highest Ra found at each level of efficacy). Each
// point holds "ra", "r9", "rf", "efficacy_lm_per_w" and "melanopic_der"
// (null where not defined); the other recipes hold "trade_off": null. A
// target the rig cannot reach gets Solve's nearest recipe with a warning
// that the goal was not searched.
//
// SolveQuality is SolveQualityWithin with a zero tolerance: the goal's
// recipe reaches the target exactly, and every recipe holds the keys
// "tolerance" and "tolerance_trade_off" null.
func (m *Lights) SolveQuality(t LightTarget, goal LightGoal, opt LightSolveOptions) (Solution, error) {
	return m.SolveQualityWithin(t, goal, LightTolerance{}, opt)
}

// lightQuality evaluates the lighting quality of mixes of one rig for one
// target.
type lightQuality struct {
	p     *lightProblem
	fixed []float64 // dark + added light on the model's grid
	// Melanopic DER = (Σ wᵢ·melᵢ + mel0) / (Σ wᵢ·lumᵢ + lum0) / K_mel,v^D65.
	mel, lum   []float64
	mel0, lum0 float64
	kD65       float64
}

// newQuality prepares the quality evaluation of a solve for t (which
// Solve has accepted).
func (m *Lights) newQuality(t LightTarget, opt LightSolveOptions) (*lightQuality, error) {
	obs := opt.Observer
	if obs == nil {
		obs = cie.CIE1931()
	}
	b, err := m.basis(obs)
	if err != nil {
		return nil, fmt.Errorf("lights solve: %w", err)
	}
	p := &lightProblem{m: m, b: b, obs: obs, t: t, opt: opt, n: m.Len()}
	if !opt.Add.IsZero() {
		add := opt.Add.WithExtrap(colorimetry.ExtrapZero)
		if p.addSpec, err = add.Resample(m.grid); err != nil {
			return nil, fmt.Errorf("lights solve: added light onto %v: %w", m.grid, err)
		}
		if p.add, err = b.w.XYZ(add); err != nil {
			return nil, fmt.Errorf("lights solve: added light: %w", err)
		}
	}
	p.off = b.dark.Add(p.add)
	p.ref, p.refWarn = p.reference()
	q := &lightQuality{p: p, fixed: p.fixedSpectrum()}
	v := colorimetry.Efficiency{V: cie.PhotopicV(), K: colorimetry.Km}
	act, err := cie.AlphaOpicAction(cie.Melanopic)
	if err != nil {
		return nil, err
	}
	ao, err := colorimetry.NewAlphaOpic(act, v, cie.D65())
	if err != nil {
		return nil, err
	}
	q.kD65 = ao.D65Efficacy()
	integ := func(s colorimetry.Spectrum) (float64, float64, error) {
		e, err := ao.Irradiance(s)
		if err != nil {
			return 0, 0, err
		}
		l, err := v.Integral(s)
		return e, l, err
	}
	for i, s := range m.spectra {
		e, l, err := integ(s)
		if err != nil {
			return nil, fmt.Errorf("lights solve: channel %q: %w", m.names[i], err)
		}
		q.mel, q.lum = append(q.mel, e), append(q.lum, l)
	}
	if fs, err := colorimetry.NewSpectrumOnGrid(m.grid, q.fixed, colorimetry.Options{Interp: colorimetry.InterpLinear, Extrap: colorimetry.ExtrapZero}); err == nil {
		if q.mel0, q.lum0, err = integ(fs); err != nil {
			return nil, fmt.Errorf("lights solve: dark and added light: %w", err)
		}
	}
	return q, nil
}

// spectrum returns the whole light of outputs w on the model's grid.
func (q *lightQuality) spectrum(w []float64) (colorimetry.Spectrum, error) {
	v := append([]float64(nil), q.fixed...)
	for i, s := range q.p.m.spectra {
		if w[i] == 0 {
			continue
		}
		for k := range v {
			v[k] += w[i] * s.Value(k)
		}
	}
	return colorimetry.NewSpectrumOnGrid(q.p.m.grid, v, colorimetry.Options{Interp: colorimetry.InterpLinear, Extrap: colorimetry.ExtrapZero})
}

// efficacy returns the luminous efficacy of radiation of the channels'
// light (as Solve's "efficacy_lm_per_w"), or false when it gives none.
func (q *lightQuality) efficacy(w []float64) (float64, bool) {
	var y, pw float64
	for i, x := range w {
		y += x * q.p.b.ch[i].Y
		pw += x * q.p.b.power[i]
	}
	if !(pw > 0) {
		return 0, false
	}
	return y / pw, true
}

// der returns the melanopic DER of the whole light, or false when it has
// no luminance.
func (q *lightQuality) der(w []float64) (float64, bool) {
	e, l := q.mel0, q.lum0
	for i, x := range w {
		e += x * q.mel[i]
		l += x * q.lum[i]
	}
	if !(l > 0) {
		return 0, false
	}
	return e / l / q.kD65, true
}

// value returns the goal's quantity for outputs w, or false where it is
// not defined.
func (q *lightQuality) value(g LightGoal, w []float64) (float64, bool) {
	switch g {
	case GoalMaxEfficacy:
		return q.efficacy(w)
	case GoalMaxMelanopic, GoalMinMelanopic:
		return q.der(w)
	}
	s, err := q.spectrum(w)
	if err != nil {
		return 0, false
	}
	if g == GoalMaxRf {
		f, err := rendering.ColourFidelity(s)
		return f.Rf, err == nil
	}
	c, err := rendering.ColourRendering(s)
	if err != nil {
		return 0, false
	}
	if g == GoalMaxR9 {
		return c.R[8], true
	}
	return c.Ra, true
}

// annotate adds the quality keys of outputs w to r.
func (q *lightQuality) annotate(r *Recipe, w []float64) {
	ex := r.Extra
	ex[keyRa], ex[keyR9], ex[keyRf], ex[keyDER] = nil, nil, nil, nil
	if d, ok := q.der(w); ok {
		ex[keyDER] = d
	}
	s, err := q.spectrum(w)
	if err != nil {
		return
	}
	c, errRa := rendering.ColourRendering(s)
	if errRa == nil {
		ex[keyRa], ex[keyR9] = c.Ra, c.R[8]
		r.Warnings = append(r.Warnings, c.Warnings...)
	}
	f, errRf := rendering.ColourFidelity(s)
	if errRf == nil {
		ex[keyRf] = f.Rf
	}
	if errRa != nil || errRf != nil {
		err := errRa
		if err == nil {
			err = errRf
		}
		msg := "lighting quality indices not computed: " + err.Error()
		if errors.Is(err, colorimetry.ErrCCTRange) {
			// The CCT warning already gives the figures.
			msg = "lighting quality indices not computed: they need a correlated colour temperature"
		}
		r.Warnings = append(r.Warnings, msg)
	}
}

// searchSpace is the set of mixes that reach the target, in the
// coordinates of a Nelder–Mead search: the polytope of mixes that reach it
// exactly or, under a tolerance, the mixes whose chromaticity lies in the
// tolerance region (with the level equations, if any, still exact).
type searchSpace struct {
	vertices [][]float64
	centre   []float64   // mean of the vertices of the exact polytope
	basis    [][]float64 // orthonormal null-space vectors (each len n)
	scaleUp  bool        // scale the result to full brightness
	// Under a tolerance (region non-nil): a point w of the space has the
	// chromaticity of base + Σ wᵢ·chᵢ within region.
	region *lightRegion
	base   colorimetry.XYZ
	ch     []colorimetry.XYZ
}

// space returns the search space of the solve: the chromaticity (and
// luminance) equations of the target within [0, 1]ⁿ. Without dark, added
// light or luminance target it is the cross-section at a small luminance,
// which holds every mix up to its level.
func (q *lightQuality) space() (*searchSpace, error) {
	return q.spaceAt(q.p.t.XY, true)
}

// spaceAt returns the search space of the solve with its target
// chromaticity moved to xy (its level equation, if any, unchanged); its
// null-space basis only when basis is true.
func (q *lightQuality) spaceAt(xy colorimetry.XY, basis bool) (*searchSpace, error) {
	p := q.p
	var a [][]float64
	var c []float64
	sp := &searchSpace{}
	switch {
	case p.t.Y > 0:
		target, _ := xy.XYZ(p.t.Y / p.b.scale)
		a, c = p.xyzRows(target)
	case p.addSpec.IsZero():
		// The channels alone are scale-free: search their shapes on the
		// cross-section at the smallest channel luminance, at which no
		// output can exceed 1, and evaluate each at full drive (where the
		// dark, if any, is corrected for; see lightQuality.full).
		a, c = p.chromaRows(xy, colorimetry.XYZ{})
		row, y0, err := q.sectionRow()
		if err != nil {
			return nil, err
		}
		a = append(a, row)
		c = append(c, y0)
		sp.scaleUp = true
	default:
		a, c = p.chromaRows(xy, p.off)
	}
	dim := 1e-9 * p.b.fullY()
	lightVertices(a, c, p.n, func(w []float64) {
		if tot := p.b.mixXYZ(w, p.add); !(tot.X+tot.Y+tot.Z > dim) {
			return
		}
		for _, v := range sp.vertices {
			if lightSameW(v, w) {
				return
			}
		}
		sp.vertices = append(sp.vertices, append([]float64(nil), w...))
	})
	if len(sp.vertices) == 0 {
		return nil, errors.New("lights solve: no mix reaches the target")
	}
	sp.centre = make([]float64, p.n)
	for _, v := range sp.vertices {
		for i, x := range v {
			sp.centre[i] += x / float64(len(sp.vertices))
		}
	}
	if !basis {
		return sp, nil
	}
	var err error
	if sp.basis, err = nullSpace(a, p.n); err != nil {
		return nil, err
	}
	return sp, nil
}

// sectionRow returns the cross-section equation of a scale-free solve:
// the channels' luminance Σ wᵢ·Yᵢ = y0, the smallest channel luminance.
func (q *lightQuality) sectionRow() ([]float64, float64, error) {
	y0 := math.Inf(1)
	row := make([]float64, q.p.n)
	for i, ch := range q.p.b.ch {
		row[i] = ch.Y
		if ch.Y > 0 {
			y0 = math.Min(y0, ch.Y)
		}
	}
	if math.IsInf(y0, 1) {
		return nil, 0, errors.New("lights solve: no channel gives light")
	}
	return row, y0, nil
}

// nullSpace returns an orthonormal basis of the null space of the rows a
// (each of length n) by SVD: the right singular vectors of the zero
// singular values. Without rows it is the unit vectors.
func nullSpace(a [][]float64, n int) ([][]float64, error) {
	if len(a) == 0 {
		out := make([][]float64, n)
		for j := range out {
			out[j] = make([]float64, n)
			out[j][j] = 1
		}
		return out, nil
	}
	am := mat.NewDense(len(a), n, nil)
	for r := range a {
		am.SetRow(r, a[r])
	}
	var svd mat.SVD
	if !svd.Factorize(am, mat.SVDFull) {
		return nil, errors.New("lights solve: SVD of the target equations failed")
	}
	sv := svd.Values(nil)
	var vm mat.Dense
	svd.VTo(&vm)
	rank := 0
	for _, s := range sv {
		if s > 1e-10*sv[0] {
			rank++
		}
	}
	var out [][]float64
	for j := rank; j < n; j++ {
		out = append(out, mat.Col(nil, j, &vm))
	}
	return out, nil
}

// toZ returns the search coordinates of outputs w (projected onto the
// affine hull).
func (sp *searchSpace) toZ(w []float64) []float64 {
	z := make([]float64, len(sp.basis))
	for j, b := range sp.basis {
		for i := range w {
			z[j] += b[i] * (w[i] - sp.centre[i])
		}
	}
	return z
}

// fromZ returns the outputs at search coordinates z, drawn back onto the
// polytope along the ray to the centre, and how far they were drawn (0
// inside; the length of the part of the step cut off, in output units).
func (sp *searchSpace) fromZ(z []float64) ([]float64, float64) {
	n := len(sp.centre)
	d := make([]float64, n)
	for j, b := range sp.basis {
		for i := range d {
			d[i] += z[j] * b[i]
		}
	}
	t := 1.0
	for i, x := range d {
		c := sp.centre[i]
		switch {
		case c+x > 1:
			t = math.Min(t, (1-c)/x)
		case c+x < 0:
			t = math.Min(t, c/-x)
		}
	}
	t = math.Max(t, 0)
	w := make([]float64, n)
	at := func(t float64) []float64 {
		for i, x := range d {
			w[i] = math.Min(math.Max(sp.centre[i]+t*x, 0), 1)
		}
		return w
	}
	if sp.region != nil && !sp.inside(at(t)) {
		// Under a tolerance: the last point of the ray within the region
		// (the centre is inside it; the region is star-shaped about the
		// target, so the ray leaves it once), by bisection.
		lo, hi := 0.0, t
		for range 32 {
			mid := (lo + hi) / 2
			if sp.inside(at(mid)) {
				lo = mid
			} else {
				hi = mid
			}
		}
		t = lo
	}
	at(t)
	var norm float64
	for _, x := range d {
		norm += x * x
	}
	return w, (1 - t) * math.Sqrt(norm)
}

// inside reports whether the point w of the space lies within its
// tolerance region (always, without one).
func (sp *searchSpace) inside(w []float64) bool {
	if sp.region == nil {
		return true
	}
	c := sp.base
	for i, x := range w {
		c = c.Add(sp.ch[i].Scale(x))
	}
	uv, err := c.UVPrime()
	return err == nil && sp.region.contains(uv)
}

// full returns the mix that a point w of the search space stands for: w
// itself, or on a cross-section the mix of that shape at full drive,
// corrected onto the target for the dark (nil if that fails).
//
// Under a tolerance the mix at full drive is corrected onto the
// chromaticity of the channels' light of w (which lies in the region),
// not onto the target.
func (q *lightQuality) full(sp *searchSpace, w []float64) []float64 {
	if !sp.scaleUp || w == nil {
		return w
	}
	if sp.region == nil {
		return q.scaled(w)
	}
	var c colorimetry.XYZ
	for i, x := range w {
		c = c.Add(q.p.b.ch[i].Scale(x))
	}
	xy, err := c.XY()
	if err != nil {
		return nil
	}
	return q.scaledTo(w, xy)
}

// lift returns f evaluated at the mix a point of the search space stands
// for (see full).
func (q *lightQuality) lift(sp *searchSpace, f func(w []float64) (float64, bool)) func(w []float64) (float64, bool) {
	if !sp.scaleUp {
		return f
	}
	return func(w []float64) (float64, bool) {
		x := q.full(sp, w)
		if x == nil {
			return 0, false
		}
		return f(x)
	}
}

// section returns the mix w (at any level) on the cross-section, for a
// start point.
func (q *lightQuality) section(sp *searchSpace, w []float64) []float64 {
	if !sp.scaleUp {
		return w
	}
	var y, y0 float64
	for i, x := range w {
		y += x * q.p.b.ch[i].Y
	}
	y0 = math.Inf(1)
	for _, ch := range q.p.b.ch {
		if ch.Y > 0 {
			y0 = math.Min(y0, ch.Y)
		}
	}
	if !(y > 0) {
		return nil
	}
	out := make([]float64, len(w))
	for i, x := range w {
		out[i] = x * y0 / y
	}
	return out
}

// optimum returns the recipe of goal g (its Extra still holding
// "outputs_w"), given the outputs of Solve's recipes.
func (q *lightQuality) optimum(g LightGoal, plain [][]float64) (Recipe, error) {
	sp, err := q.space()
	if err != nil {
		return Recipe{}, err
	}
	w, best, err := q.search(sp, g, plain, nil)
	if err != nil {
		return Recipe{}, err
	}
	rec := q.p.recipe(w, g.String(), true, nil)
	rec.Extra["trade_off"] = q.tradeOff(sp, g, best, nil)
	return rec, nil
}

// search returns the best mix of goal g over the search space sp (at full
// level) and the point of sp it stands for, given the outputs of Solve's
// recipes and further mixes of sp at full level (seeds) that it must not
// fall behind.
func (q *lightQuality) search(sp *searchSpace, g LightGoal, plain, seeds [][]float64) ([]float64, []float64, error) {
	extra := plain
	if len(seeds) > 0 {
		extra = append(append([][]float64(nil), plain...), seeds...)
	}
	f := q.objective(sp, g)
	best := q.maximise(sp, q.lift(sp, f), extra, g.searched(), 4)
	w := q.full(sp, best)
	if w == nil {
		return nil, nil, fmt.Errorf("lights solve: %v is not defined for any mix that reaches the target (is its CCT defined?)", g)
	}
	if !sp.scaleUp && q.p.t.Y == 0 {
		// The level is free but matters (an added light): keep the best,
		// made as bright as it can be within the goal's tolerance.
		w = q.brighten(sp, g, w, plain)
		best = w
	}
	// Never worse than a recipe of the plain solve (or a seed), at its own
	// level (on a cross-section with dark, a dimmer mix can gain from the
	// dark).
	if v, ok := f(w); ok {
		for _, x := range extra {
			if u, ok := f(x); ok && u > v {
				w, v = x, u
				best = q.section(sp, x)
			}
		}
	}
	return w, best, nil
}

// objective returns the goal's quantity signed so that larger is better,
// defined only for mixes (at full level) whose whole light lies in the
// space's tolerance region.
func (q *lightQuality) objective(sp *searchSpace, g LightGoal) func(w []float64) (float64, bool) {
	f := q.signed(g)
	if sp.region == nil {
		return f
	}
	return func(w []float64) (float64, bool) {
		if !q.wholeInside(sp.region, w) {
			return 0, false
		}
		return f(w)
	}
}

// wholeInside reports whether the whole light of outputs w (dark and
// added light included) has its chromaticity in region r.
func (q *lightQuality) wholeInside(r *lightRegion, w []float64) bool {
	uv, err := q.p.b.mixXYZ(w, q.p.add).UVPrime()
	return err == nil && r.contains(uv)
}

// scaled returns w scaled so that its largest output is 1 and then moved
// back onto the target chromaticity by the least change of the outputs
// strictly inside (0, 1) (the dark and added light shift it a little when
// the channels are scaled), or nil when that fails.
func (q *lightQuality) scaled(w []float64) []float64 {
	return q.scaledTo(w, q.p.t.XY)
}

// scaledTo is scaled with the chromaticity xy of the whole light in place
// of the target's.
func (q *lightQuality) scaledTo(w []float64, xy colorimetry.XY) []float64 {
	var top float64
	for _, x := range w {
		top = math.Max(top, x)
	}
	if !(top > 0) {
		return nil
	}
	x := make([]float64, len(w))
	for i, o := range w {
		x[i] = o / top
	}
	a, c := q.p.chromaRows(xy, q.p.off)
	for range 20 {
		if lightResidualOK(a, c, x) {
			return x
		}
		var free []int
		for i, o := range x {
			if o > 1e-12 && o < 1-1e-12 {
				free = append(free, i)
			}
		}
		if len(free) < len(a) {
			return nil
		}
		// Minimum-norm change: Δ = A_Fᵀ (A_F A_Fᵀ)⁻¹ r.
		r := make([]float64, len(a))
		for k := range a {
			r[k] = c[k]
			for i, v := range a[k] {
				r[k] -= v * x[i]
			}
		}
		g := make([][]float64, len(a))
		for k := range a {
			g[k] = make([]float64, len(a))
			for l := range a {
				for _, i := range free {
					g[k][l] += a[k][i] * a[l][i]
				}
			}
		}
		if lightDet(g) == 0 {
			return nil
		}
		y := make([]float64, len(a))
		lightSolveSmall(g, r, y)
		for _, i := range free {
			for k := range a {
				x[i] += a[k][i] * y[k]
			}
			x[i] = math.Min(math.Max(x[i], 0), 1)
		}
	}
	return nil
}

// tolerance returns how much of the goal's quantity SolveQuality gives up
// for brightness: half a unit of the decimal the standards report (Ra and
// R9 as integers in CIE 13.3, Rf to one decimal in CIE 224:2017), and
// half a unit of the printed digits for efficacy (lm/W) and the DER.
func (g LightGoal) tolerance() float64 {
	if g == GoalMaxMelanopic || g == GoalMinMelanopic {
		return 5e-4
	}
	return 0.05
}

// brighten returns the brightest mix on the segment from w to the
// brightest recipe of the plain solve whose goal quantity is within the
// goal's tolerance of w's (every mix on the segment reaches the target,
// the set being convex; under a tolerance region each is checked).
func (q *lightQuality) brighten(sp *searchSpace, g LightGoal, w []float64, plain [][]float64) []float64 {
	f := q.objective(sp, g)
	v0, ok := f(w)
	if !ok {
		return w
	}
	lum := func(x []float64) float64 {
		var y float64
		for i, o := range x {
			y += o * q.p.b.ch[i].Y
		}
		return y
	}
	// The bright end: the same mix scaled to full drive, corrected back
	// onto the target; failing that, the brightest plain recipe.
	var bright []float64
	if sp.region == nil {
		bright = q.scaled(w)
	} else if xy, err := q.p.b.mixXYZ(w, q.p.add).XY(); err == nil {
		bright = q.scaledTo(w, xy)
	}
	if bright == nil {
		for _, x := range plain {
			if bright == nil || lum(x) > lum(bright) {
				bright = x
			}
		}
	}
	if bright == nil || lum(bright) <= lum(w) {
		return w
	}
	level := v0 - g.tolerance()
	at := func(s float64) []float64 {
		x := make([]float64, len(w))
		for i := range x {
			x[i] = (1-s)*w[i] + s*bright[i]
		}
		return x
	}
	okAt := func(s float64) bool { v, ok := f(at(s)); return ok && v >= level }
	// Scan down from the bright end, then bisect between the first step
	// that meets the level and the one above it.
	const steps = 16
	for k := steps; k > 0; k-- {
		s := float64(k) / steps
		if !okAt(s) {
			continue
		}
		if k == steps {
			return at(1)
		}
		lo, hi := s, float64(k+1)/steps
		for range 30 {
			mid := (lo + hi) / 2
			if okAt(mid) {
				lo = mid
			} else {
				hi = mid
			}
		}
		return at(lo)
	}
	return w
}

// searched reports whether the goal needs a search: Ra, R9 and Rf are not
// ratios of linear forms, so their optimum need not be a vertex.
func (g LightGoal) searched() bool {
	return g == GoalMaxRa || g == GoalMaxRf || g == GoalMaxR9
}

// signed returns the goal's quantity signed so that larger is better.
func (q *lightQuality) signed(g LightGoal) func(w []float64) (float64, bool) {
	sign := 1.0
	if g == GoalMinMelanopic {
		sign = -1
	}
	return func(w []float64) (float64, bool) {
		v, ok := q.value(g, w)
		return sign * v, ok
	}
}

// maximise returns the best point of f over the search space (nil when f
// is defined nowhere): the best vertex and, when search is true, the best
// point that Nelder–Mead searches find from the best starts of the
// vertices, the centre and the mixes in extra (at any level). Under a
// tolerance the vertices include the best of those on the edge of the
// region (see edgeCandidates).
func (q *lightQuality) maximise(sp *searchSpace, f func(w []float64) (float64, bool), extra [][]float64, search bool, starts int) []float64 {
	type cand struct {
		w []float64
		v float64
	}
	var cands []cand
	offer := func(w []float64) {
		if w == nil {
			return
		}
		if v, ok := f(w); ok {
			cands = append(cands, cand{append([]float64(nil), w...), v})
		}
	}
	for _, v := range sp.vertices {
		offer(v)
	}
	offer(sp.centre)
	for _, w := range extra {
		offer(q.section(sp, w))
	}
	if sp.region != nil {
		// Under a tolerance the extreme points of the space also lie on
		// the edge of its region: the best vertices there.
		for _, w := range q.edgeCandidates(sp, f, !search) {
			offer(w)
		}
	}
	if len(cands) == 0 {
		return nil
	}
	sort.SliceStable(cands, func(i, j int) bool { return cands[i].v > cands[j].v })
	best := cands[0]
	if !search || len(sp.basis) == 0 {
		return best.w
	}
	// Penalty for points drawn back onto the polytope, in the objective's
	// units per unit of output: keeps the simplex near the polytope.
	const penalty = 10
	obj := func(z []float64) float64 {
		w, cut := sp.fromZ(z)
		v, ok := f(w)
		if !ok {
			return math.Inf(-1)
		}
		return v - penalty*cut
	}
	for k, c := range cands {
		if k == starts {
			break
		}
		z, _ := nelderMead(obj, sp.toZ(c.w), 0.05, 60*(len(sp.basis)+1))
		// The point drawn onto the polytope is a mix that reaches the
		// target, whatever the penalty.
		w, _ := sp.fromZ(z)
		if v, ok := f(w); ok && v > best.v {
			best = cand{w, v}
		}
	}
	return best.w
}

// tradeOff returns the trade-off curve of goal g, whose optimum is opt on
// the search space: from the best mix by the secondary quantity
// (efficacy; for the efficacy goal, Ra) to opt, the best mix found by the
// secondary quantity whose goal quantity reaches each of tradeOffPoints
// evenly spaced levels. Each point holds "ra", "r9", "rf",
// "efficacy_lm_per_w" and "melanopic_der" of the mix at full level.
// Under a tolerance, also (non-nil) is the exact space within sp, searched
// as well at each level (its mixes belong to sp), so that the curve is
// never worse than the exact one.
func (q *lightQuality) tradeOff(sp *searchSpace, g LightGoal, opt []float64, also *searchSpace) []map[string]any {
	prim := q.lift(sp, q.objective(sp, g))
	sg := GoalMaxEfficacy
	if g == GoalMaxEfficacy {
		sg = GoalMaxRa
	}
	sec := q.lift(sp, q.objective(sp, sg))
	other := q.maximise(sp, sec, nil, sg.searched(), 2)
	if other == nil {
		return nil
	}
	hi, ok1 := prim(opt)
	lo, ok2 := prim(other)
	if !ok1 || !ok2 {
		return nil
	}
	out := []map[string]any{q.point(q.full(sp, other))}
	if hi-lo <= 1e-9*math.Abs(hi) {
		return out // the two ends coincide in the goal's quantity
	}
	secScale := 1.0
	if v, ok := sec(other); ok && v != 0 {
		secScale = math.Abs(v)
	}
	for k := 1; k < tradeOffPoints-1; k++ {
		level := lo + (hi-lo)*float64(k)/float64(tradeOffPoints-1)
		// The best mix by the secondary quantity with the goal's at least
		// level: a steep penalty on the shortfall, from both ends.
		f := func(w []float64) (float64, bool) {
			s, ok := sec(w)
			if !ok {
				return 0, false
			}
			v, ok := prim(w)
			if !ok {
				return 0, false
			}
			return s/secScale - 100*math.Max(0, level-v)/(hi-lo), true
		}
		ends := [][]float64{q.full(sp, opt), q.full(sp, other)}
		w := q.maximise(sp, f, ends, true, 2)
		if also != nil {
			if x := q.maximise(also, f, ends, true, 2); x != nil {
				u, okx := f(x)
				if v, ok := f(w); w == nil || !ok || (okx && u > v) {
					w = x
				}
			}
		}
		if v, ok := prim(w); w == nil || !ok || v < level-1e-9*math.Abs(level) {
			// The penalty left a shortfall: take the blend of the two ends
			// that reaches the level instead (every blend reaches the
			// target, the set being convex).
			if w = blendAt(opt, other, level, prim); w == nil {
				continue
			}
		}
		out = append(out, q.point(q.full(sp, w)))
	}
	return append(out, q.point(q.full(sp, opt)))
}

// point returns the quality keys of outputs w for the trade-off curve.
func (q *lightQuality) point(w []float64) map[string]any {
	r := Recipe{Extra: map[string]any{}}
	if w == nil {
		return map[string]any{keyRa: nil, keyR9: nil, keyRf: nil, keyDER: nil, "efficacy_lm_per_w": nil}
	}
	q.annotate(&r, w)
	r.Extra["efficacy_lm_per_w"] = nil
	if v, ok := q.efficacy(w); ok {
		r.Extra["efficacy_lm_per_w"] = v
	}
	return r.Extra
}

// blendAt returns the mix (1 − s)·lo + s·hi with the smallest s whose
// quantity idxOf reaches level (bisection; both ends meet the target, so
// every blend does), or nil.
func blendAt(hi, lo []float64, level float64, idxOf func([]float64) (float64, bool)) []float64 {
	mix := func(s float64) []float64 {
		w := make([]float64, len(hi))
		for i := range w {
			w[i] = (1-s)*lo[i] + s*hi[i]
		}
		return w
	}
	a, b := 0.0, 1.0
	for range 40 {
		m := (a + b) / 2
		if v, ok := idxOf(mix(m)); ok && v >= level {
			b = m
		} else {
			a = m
		}
	}
	if v, ok := idxOf(mix(b)); !ok || v < level-1e-9*math.Abs(level) {
		return nil
	}
	return mix(b)
}

// nelderMead maximises f from x0 with an initial simplex of edge h, within
// maxEval evaluations, and returns the best point and value (Nelder & Mead
// 1965, with the standard coefficients: reflection 1, expansion 2,
// contraction ½, shrink ½).
func nelderMead(f func([]float64) float64, x0 []float64, h float64, maxEval int) ([]float64, float64) {
	k := len(x0)
	pts := make([][]float64, k+1)
	val := make([]float64, k+1)
	for i := range pts {
		pts[i] = append([]float64(nil), x0...)
		if i > 0 {
			pts[i][i-1] += h
		}
		val[i] = f(pts[i])
	}
	evals := k + 1
	at := func(c []float64, x []float64, s float64) []float64 {
		y := make([]float64, k)
		for j := range y {
			y[j] = c[j] + s*(x[j]-c[j])
		}
		return y
	}
	for evals < maxEval {
		// Order best (largest) first.
		idx := make([]int, k+1)
		for i := range idx {
			idx[i] = i
		}
		sort.Slice(idx, func(a, b int) bool { return val[idx[a]] > val[idx[b]] })
		p2, v2 := make([][]float64, k+1), make([]float64, k+1)
		for i, j := range idx {
			p2[i], v2[i] = pts[j], val[j]
		}
		pts, val = p2, v2
		// Converged: values and size both tiny.
		var size float64
		for i := 1; i <= k; i++ {
			for j := range k {
				size = math.Max(size, math.Abs(pts[i][j]-pts[0][j]))
			}
		}
		if size < 1e-7 || (math.Abs(val[0]-val[k]) < 1e-9*(1+math.Abs(val[0])) && size < 1e-4) {
			break
		}
		c := make([]float64, k)
		for i := range k {
			for j := range c {
				c[j] += pts[i][j] / float64(k)
			}
		}
		worst := pts[k]
		r := at(c, worst, -1)
		fr := f(r)
		evals++
		switch {
		case fr > val[0]:
			e := at(c, worst, -2)
			fe := f(e)
			evals++
			if fe > fr {
				pts[k], val[k] = e, fe
			} else {
				pts[k], val[k] = r, fr
			}
		case fr > val[k-1]:
			pts[k], val[k] = r, fr
		default:
			var ct []float64
			if fr > val[k] {
				ct = at(c, worst, -0.5) // outside contraction
			} else {
				ct = at(c, worst, 0.5) // inside contraction
			}
			fc := f(ct)
			evals++
			if fc > math.Max(fr, val[k]) {
				pts[k], val[k] = ct, fc
			} else {
				for i := 1; i <= k; i++ {
					pts[i] = at(pts[0], pts[i], 0.5)
					val[i] = f(pts[i])
				}
				evals += k
			}
		}
	}
	b := 0
	for i := range val {
		if val[i] > val[b] {
			b = i
		}
	}
	return pts[b], val[b]
}
