package mixing

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/mat"
)

// LightTarget is what a lights solve aims at: a chromaticity, and
// optionally a luminance.
type LightTarget struct {
	// XY is the target's CIE 1931 chromaticity.
	XY colorimetry.XY
	// Y is the target luminance on the model's scale (see Lights.Scale:
	// absolute photometric units, or Y = 100 for the whole rig at full
	// drive). Zero asks for the chromaticity alone: the brightest mix, or
	// with an added light the one that adds the least power.
	Y float64
}

// LightTargetCCT returns the chromaticity at correlated colour
// temperature kelvin (K) and distance duv from the Planckian locus (CIE
// 1960 UCS), on the Planckian locus of obs (Planck's law with
// c2 = colorimetry.C2). It returns the *colorimetry.CCTRangeError of
// PlanckianTable.UV outside 1000–100 000 K or |Duv| > 0.05, and an error
// wrapping colorimetry.ErrOutOfGamut when the point lies outside the
// spectrum locus (at low CCT a large positive Duv leaves it: no light has
// that colour).
func LightTargetCCT(obs *colorimetry.Observer, kelvin, duv float64) (colorimetry.XY, error) {
	t, err := colorimetry.NewPlanckianTable(obs, colorimetry.C2)
	if err != nil {
		return colorimetry.XY{}, err
	}
	uv, err := t.UV(kelvin, duv)
	if err != nil {
		return colorimetry.XY{}, err
	}
	xy := uv.UVPrime().XY()
	l, err := colorimetry.NewSpectrumLocus(obs)
	if err != nil {
		return colorimetry.XY{}, err
	}
	if !l.Contains(xy) {
		return colorimetry.XY{}, fmt.Errorf("%g K with Duv %+g is at (x, y) = (%.4f, %.4f) for %s: %w",
			kelvin, duv, xy.X, xy.Y, obs.Name(), colorimetry.ErrOutOfGamut)
	}
	return xy, nil
}

// LightPreference says which exact solution a solve ranks first when a
// rig has more than three channels and many mixes reach the target.
type LightPreference int

const (
	// PreferEfficacy ranks first the mix with the highest luminous
	// efficacy of radiation (least radiant power for the light it gives).
	PreferEfficacy LightPreference = iota
	// PreferReference ranks first the mix whose spectrum is closest to a
	// reference illuminant of the target's CCT.
	PreferReference
)

// LightSolveOptions control Lights.Solve. The zero value uses the CIE
// 1931 observer, adds no light and prefers efficacy.
type LightSolveOptions struct {
	// Observer for tristimulus values; nil means CIE 1931 2°.
	Observer *colorimetry.Observer
	// Add is a coloured light to complement (a lamp behind a filter), in
	// the units of the model's data; the solve finds the channel mix that,
	// added to it, reaches the target. The zero Spectrum adds nothing. It
	// is taken as zero outside its own range.
	Add colorimetry.Spectrum
	// Prefer ranks the alternatives of a rig with more than three
	// channels.
	Prefer LightPreference
	// Reference is the illuminant for the "closest to reference" recipe.
	// The zero Spectrum means the illuminant of the target's CCT: Planck's
	// law below 5000 K (cie.Planckian), CIE daylight from 5000 K to
	// 25 000 K (cie.Daylight).
	Reference colorimetry.Spectrum
}

// MaxSolveChannels is the largest number of channels Solve accepts: it
// finds optima exactly by visiting the vertices of the feasible set,
// C(n, 3)·2ⁿ⁻³ candidates (112 640 at 12 channels).
const MaxSolveChannels = 12

// Recipe strategies, the "strategy" key of Recipe.Extra.
const (
	StrategyExact        = "exact"
	StrategyMaxLuminance = "max luminance"
	StrategyMaxEfficacy  = "max efficacy"
	StrategyReference    = "closest to reference"
	StrategyLeastAdded   = "least added power"
	StrategyNearest      = "nearest reachable"
)

// Solve finds drive levels that reach the target and returns recipes
// ranked best first.
//
// The mix's tristimulus values are linear in the relative outputs w:
// XYZ = XYZ(dark) + XYZ(added) + Σ wᵢ·XYZᵢ. A chromaticity (x, y) is the
// pair of linear equations y·X − x·Y = 0 and y·Z − (1 − x − y)·Y = 0; a
// luminance adds Y = Y_target. With the bounds 0 ≤ w ≤ 1 the mixes that
// reach a target form a polytope, and every linear objective (luminance,
// radiant power) and the luminous efficacy (a ratio of two linear forms,
// quasi-linear) reach their optimum at one of its vertices. Solve visits
// every vertex: choose as many channels as equations to solve for, set the
// others to 0 or 1 in every combination, and keep the solutions within the
// bounds (to 1e-9). The optimum is exact, ties going to the first vertex
// visited.
//
// Recipes, by target:
//   - chromaticity only: "max luminance" (or, with an added light, "least
//     added power" first and then "max luminance");
//   - chromaticity and luminance: "exact" (the one solution of a
//     three-channel rig) or, with more channels, "max efficacy";
//   - with more than three channels also "max efficacy" and "closest to
//     reference", ordered by opt.Prefer after the first recipe. The
//     reference recipe minimises ‖E(λ) − k·R(λ)‖² (the whole light E, R the
//     reference at the same luminance) subject to the target exactly and
//     the bounds, by bounded least squares (BoundedLS) with the target
//     equations as heavily weighted rows, then corrected onto them exactly.
//     Without a luminance, the level is chosen too: without an added
//     light, the shape closest to the reference is made as bright as the
//     drives allow; with one, whose share of the light changes with the
//     level, the level in the reachable range that minimises the relative
//     spectral distance (eight levels, then golden section).
//
// Drive levels are the inverse of each channel's response at w. Each recipe
// carries ΔE00 against the target (at the target's luminance, or at the
// mix's own for a chromaticity target, as Scorer.LightDE00 computes it),
// and in Extra the keys "strategy", "x", "y", "delta_uv_prime" (to the
// target), "Y" (model scale), "cct_kelvin" and "duv" (null outside CIE
// 015's range), "efficacy_lm_per_w" (of the channels' light; see
// LightColour.Efficacy), "outputs" (w by channel), "reference" and
// "reference_distance" (relative RMS distance to the reference; null
// without one).
//
// A target the rig cannot reach is not an error: the single recipe is the
// nearest mix with Reachable false. When the chromaticity is reachable but
// the luminance is not, it is the mix at the target chromaticity with the
// luminance nearest the target; otherwise the mix whose chromaticity is
// nearest the target in the CIE 1976 UCS diagram (on the boundary of the
// reachable chromaticities, the convex hull of the 2ⁿ corner mixes). With
// an added light that the channels could balance if it were dimmer, a
// warning gives the largest fraction of it they can balance.
//
// Channels of equal chromaticity (Δu′v′ < 1e-4) make the system singular:
// colour cannot tell them apart. Solve still returns a valid recipe (one
// of the equal-colour splits) and warns.
//
// Errors: a target chromaticity that is not finite or not inside the
// triangle x > 0, y > 0, x + y < 1; a negative or non-finite luminance;
// more than MaxSolveChannels channels; an added light that cannot be
// placed on the model's grid.
func (m *Lights) Solve(t LightTarget, opt LightSolveOptions) (Solution, error) {
	if !lightFinite(t.XY.X) || !lightFinite(t.XY.Y) || !(t.XY.X > 0 && t.XY.Y > 0 && t.XY.X+t.XY.Y < 1) {
		return Solution{}, fmt.Errorf("lights solve: target chromaticity (%g, %g) is not a chromaticity of a light", t.XY.X, t.XY.Y)
	}
	if !(t.Y >= 0) || math.IsInf(t.Y, 0) {
		return Solution{}, fmt.Errorf("lights solve: target luminance %g must be zero (chromaticity only) or positive", t.Y)
	}
	n := m.Len()
	if n > MaxSolveChannels {
		return Solution{}, fmt.Errorf("lights solve: %d channels; the exact solve handles at most %d", n, MaxSolveChannels)
	}
	obs := opt.Observer
	if obs == nil {
		obs = cie.CIE1931()
	}
	b, err := m.basis(obs)
	if err != nil {
		return Solution{}, fmt.Errorf("lights solve: %w", err)
	}
	p := &lightProblem{m: m, b: b, obs: obs, t: t, opt: opt, n: n}
	if !opt.Add.IsZero() {
		add := opt.Add.WithExtrap(colorimetry.ExtrapZero)
		if p.addSpec, err = add.Resample(m.grid); err != nil {
			return Solution{}, fmt.Errorf("lights solve: added light onto %v: %w", m.grid, err)
		}
		if p.add, err = b.w.XYZ(add); err != nil {
			return Solution{}, fmt.Errorf("lights solve: added light: %w", err)
		}
		if !p.add.Finite() || p.add.Y < 0 {
			return Solution{}, fmt.Errorf("lights solve: the added light has no valid tristimulus values (%v)", p.add)
		}
	}
	p.off = b.dark.Add(p.add)
	p.warns = p.equalColourWarnings()
	return p.solve()
}

// lightProblem holds one solve.
type lightProblem struct {
	m       *Lights
	b       *lightBasis
	obs     *colorimetry.Observer
	t       LightTarget
	opt     LightSolveOptions
	n       int
	add     colorimetry.XYZ      // raw XYZ of the added light
	addSpec colorimetry.Spectrum // the added light on the model's grid
	off     colorimetry.XYZ      // raw XYZ of dark + added light
	warns   []string             // for every recipe
	ref     *lightRef            // reference illuminant, or nil
	refWarn string               // why there is no reference
}

// chromaRows returns the two chromaticity equations A·w = c for the
// target chromaticity xy: rows yXᵢ − xYᵢ and yZᵢ − (1−x−y)Yᵢ, right-hand
// sides minus the same forms of the offset.
func (p *lightProblem) chromaRows(xy colorimetry.XY, off colorimetry.XYZ) ([][]float64, []float64) {
	x, y := xy.X, xy.Y
	z := 1 - x - y
	a := [][]float64{make([]float64, p.n), make([]float64, p.n)}
	for i, c := range p.b.ch {
		a[0][i] = y*c.X - x*c.Y
		a[1][i] = y*c.Z - z*c.Y
	}
	return a, []float64{-(y*off.X - x*off.Y), -(y*off.Z - z*off.Y)}
}

// xyzRows returns the three equations M·w = T − off.
func (p *lightProblem) xyzRows(target colorimetry.XYZ) ([][]float64, []float64) {
	a := [][]float64{make([]float64, p.n), make([]float64, p.n), make([]float64, p.n)}
	for i, c := range p.b.ch {
		a[0][i], a[1][i], a[2][i] = c.X, c.Y, c.Z
	}
	r := target.Sub(p.off)
	return a, []float64{r.X, r.Y, r.Z}
}

// lightBest tracks the best vertex for one objective.
type lightBest struct {
	w   []float64
	val float64
}

func (lb *lightBest) offer(w []float64, v float64, larger bool) {
	if lb.w == nil || (larger && v > lb.val+1e-12*math.Abs(lb.val)) || (!larger && v < lb.val-1e-12*math.Abs(lb.val)) {
		lb.w = append(lb.w[:0], w...)
		lb.val = v
	}
}

// vertexStats visits the vertices of {A w = c, 0 ≤ w ≤ 1} and returns the
// vertices of largest and smallest luminance, least power and highest
// efficacy of the channels' light; found is false when there is none.
type lightVertexStats struct {
	found                 bool
	maxY, minY, minP, eff lightBest
}

func (p *lightProblem) vertexStats(a [][]float64, c []float64) lightVertexStats {
	var s lightVertexStats
	// A mix counts only when it gives light: with nothing but the channels
	// shining, all-off satisfies every chromaticity equation.
	dim := 1e-9 * p.b.fullY()
	lightVertices(a, c, p.n, func(w []float64) {
		var y, pw float64
		for i, x := range w {
			y += x * p.b.ch[i].Y
			pw += x * p.b.power[i]
		}
		if tot := p.b.mixXYZ(w, p.add); !(tot.X+tot.Y+tot.Z > dim) {
			return
		}
		s.found = true
		s.maxY.offer(w, y, true)
		s.minY.offer(w, y, false)
		s.minP.offer(w, pw, false)
		if pw > 0 {
			s.eff.offer(w, y/pw, true)
		}
	})
	return s
}

// solve runs the solve and assembles the recipes.
func (p *lightProblem) solve() (Solution, error) {
	n := p.n
	var recipes []Recipe
	add := func(w []float64, strategy string, reachable bool, warns []string) {
		for k := range recipes {
			if lightSameW(recipes[k].Extra["outputs_w"].([]float64), w) {
				recipes[k].Extra["strategy"] = recipes[k].Extra["strategy"].(string) + "; " + strategy
				return
			}
		}
		recipes = append(recipes, p.recipe(w, strategy, reachable, warns))
	}
	p.ref, p.refWarn = p.reference()
	ref, refWarn := p.ref, p.refWarn
	if p.t.Y == 0 {
		a, c := p.chromaRows(p.t.XY, p.off)
		s := p.vertexStats(a, c)
		if !s.found {
			return p.unreachable()
		}
		if !p.opt.Add.IsZero() {
			add(s.minP.w, StrategyLeastAdded, true, nil)
		}
		add(s.maxY.w, StrategyMaxLuminance, true, nil)
		if n > 3 {
			alts := []func(){func() {
				if s.eff.w != nil {
					add(s.eff.w, StrategyMaxEfficacy, true, nil)
				}
			}, func() {
				if ref == nil {
					return
				}
				w, warn := p.referenceChroma(ref, s)
				if w != nil {
					add(w, StrategyReference, true, warn)
				}
			}}
			if p.opt.Prefer == PreferReference {
				alts[0], alts[1] = alts[1], alts[0]
			}
			for _, f := range alts {
				f()
			}
		}
	} else {
		target, _ := p.t.XY.XYZ(p.t.Y / p.b.scale)
		a, c := p.xyzRows(target)
		s := p.vertexStats(a, c)
		if !s.found {
			return p.unreachable()
		}
		first := StrategyExact
		if n > 3 {
			first = StrategyMaxEfficacy
		}
		alts := []func(){func() { add(s.minP.w, first, true, nil) }, func() {
			if ref == nil || n <= 3 {
				return
			}
			w, warn, err := p.referenceAt(ref, target)
			if err == nil {
				add(w, StrategyReference, true, warn)
			}
		}}
		if p.opt.Prefer == PreferReference {
			alts[0], alts[1] = alts[1], alts[0]
		}
		for _, f := range alts {
			f()
		}
	}
	if refWarn != "" && n > 3 {
		for k := range recipes {
			recipes[k].Warnings = append(recipes[k].Warnings, refWarn)
		}
	}
	for k := range recipes {
		delete(recipes[k].Extra, "outputs_w")
	}
	return Solution{Recipes: recipes}, nil
}

// lightSameW reports whether two output vectors agree to 1e-9.
func lightSameW(a, b []float64) bool {
	for i := range a {
		if math.Abs(a[i]-b[i]) > 1e-9 {
			return false
		}
	}
	return true
}

// unreachable returns the single nearest recipe for a target the rig
// cannot reach.
func (p *lightProblem) unreachable() (Solution, error) {
	var warns []string
	a, c := p.chromaRows(p.t.XY, p.off)
	s := p.vertexStats(a, c)
	var w []float64
	if s.found {
		// Only the luminance is out of reach (a luminance target).
		lo, hi := s.minY.val*p.b.scale+p.off.Y*p.b.scale, s.maxY.val*p.b.scale+p.off.Y*p.b.scale
		switch {
		case p.t.Y > hi:
			w = s.maxY.w
			warns = append(warns, fmt.Sprintf("the target luminance Y = %.4g is more than the rig gives at this chromaticity (at most Y = %.4g)", p.t.Y, hi))
		case p.t.Y < lo:
			w = s.minY.w
			warns = append(warns, fmt.Sprintf("the target luminance Y = %.4g is less than the rig gives at this chromaticity (at least Y = %.4g: the dark and added light alone)", p.t.Y, lo))
		default:
			// Within the range but on its edge to rounding: the nearer end.
			w = s.maxY.w
			if p.t.Y-lo < hi-p.t.Y {
				w = s.minY.w
			}
			warns = append(warns, fmt.Sprintf("the target luminance Y = %.4g lies at the edge of what the rig gives at this chromaticity (Y = %.4g to %.4g) and was not met exactly", p.t.Y, lo, hi))
		}
	} else {
		var duv float64
		w, duv = p.nearestChroma()
		what := "the channels"
		if !p.opt.Add.IsZero() {
			what = "the channels with the added light"
		}
		warns = append(warns, fmt.Sprintf("the target chromaticity lies outside what %s can reach; the nearest reachable chromaticity is Δu′v′ = %.4f away", what, duv))
		if !p.opt.Add.IsZero() {
			if f, ok := p.balanceableFraction(); ok {
				warns = append(warns, fmt.Sprintf("the added light is brighter than the channels can balance: they reach the target with it dimmed to %.4g %% of its level or less", 100*f))
			}
		}
	}
	r := p.recipe(w, StrategyNearest, false, warns)
	delete(r.Extra, "outputs_w")
	return Solution{Recipes: []Recipe{r}}, nil
}

// nearestChroma returns the outputs whose chromaticity is nearest the
// target in u′v′, and that distance. The reachable chromaticities are the
// convex hull of the corner mixes w ∈ {0, 1}ⁿ (a projective image of the
// box); the nearest point lies on a hull edge between two corners, and the
// mix on the segment between them that gives it is returned. With no dark
// and no added light, the chromaticity does not change with scale, and the
// mix is scaled to the target luminance (or as bright as the drives allow).
func (p *lightProblem) nearestChroma() ([]float64, float64) {
	n := p.n
	type corner struct {
		uv  colorimetry.UVPrime
		d   float64 // X + 15Y + 3Z
		w   []float64
		xyz colorimetry.XYZ
	}
	var pts []corner
	for mask := 0; mask < 1<<n; mask++ {
		w := make([]float64, n)
		for i := range w {
			if mask&(1<<i) != 0 {
				w[i] = 1
			}
		}
		c := p.b.mixXYZ(w, p.add)
		d := c.X + 15*c.Y + 3*c.Z
		if !(d > 0) {
			continue
		}
		uv, err := c.UVPrime()
		if err != nil {
			continue
		}
		pts = append(pts, corner{uv, d, w, c})
	}
	tuv := p.t.XY.UVPrime()
	// Andrew's monotone chain convex hull.
	sort.Slice(pts, func(i, j int) bool {
		if pts[i].uv.U != pts[j].uv.U {
			return pts[i].uv.U < pts[j].uv.U
		}
		return pts[i].uv.V < pts[j].uv.V
	})
	cross := func(o, a, b colorimetry.UVPrime) float64 {
		return (a.U-o.U)*(b.V-o.V) - (a.V-o.V)*(b.U-o.U)
	}
	var hull []corner
	for pass := 0; pass < 2; pass++ {
		start := len(hull)
		for k := range pts {
			c := pts[k]
			if pass == 1 {
				c = pts[len(pts)-1-k]
			}
			for len(hull) >= start+2 && cross(hull[len(hull)-2].uv, hull[len(hull)-1].uv, c.uv) <= 0 {
				hull = hull[:len(hull)-1]
			}
			hull = append(hull, c)
		}
		hull = hull[:len(hull)-1]
	}
	if len(hull) == 0 {
		hull = pts[:1]
	}
	best := math.Inf(1)
	var w []float64
	for k := range hull {
		a, b := hull[k], hull[(k+1)%len(hull)]
		du, dv := b.uv.U-a.uv.U, b.uv.V-a.uv.V
		s := 0.0
		if l2 := du*du + dv*dv; l2 > 0 {
			s = math.Min(math.Max(((tuv.U-a.uv.U)*du+(tuv.V-a.uv.V)*dv)/l2, 0), 1)
		}
		q := colorimetry.UVPrime{U: a.uv.U + s*du, V: a.uv.V + s*dv}
		if d := colorimetry.DeltaUVPrime(q, tuv); d < best {
			best = d
			// The XYZ segment between the corners maps onto the u′v′ segment
			// with the parameter t = s·d_a / ((1 − s)·d_b + s·d_a).
			t := 0.0
			if den := (1-s)*b.d + s*a.d; den > 0 {
				t = s * a.d / den
			}
			w = make([]float64, n)
			for i := range w {
				w[i] = (1-t)*a.w[i] + t*b.w[i]
			}
		}
	}
	if p.off.X+p.off.Y+p.off.Z == 0 {
		var wmax, y float64
		for i, x := range w {
			wmax = math.Max(wmax, x)
			y += x * p.b.ch[i].Y
		}
		if wmax > 0 {
			k := 1 / wmax
			if p.t.Y > 0 && y > 0 {
				k = math.Min(k, p.t.Y/p.b.scale/y)
			}
			for i := range w {
				w[i] *= k
			}
		}
	}
	return w, best
}

// balanceableFraction returns the largest fraction f of the added light
// at which the target chromaticity is reachable, when it is reachable
// without the added light. The set of such fractions is an interval
// containing 0 (the projection of a polytope), so bisection finds its end.
func (p *lightProblem) balanceableFraction() (float64, bool) {
	feasible := func(f float64) bool {
		a, c := p.chromaRows(p.t.XY, p.b.dark.Add(p.add.Scale(f)))
		found := false
		dim := 1e-9 * p.b.fullY()
		lightVertices(a, c, p.n, func(w []float64) {
			if tot := p.b.mixXYZ(w, p.add.Scale(f)); tot.X+tot.Y+tot.Z > dim {
				found = true
			}
		})
		return found
	}
	if !feasible(0) {
		return 0, false
	}
	lo, hi := 0.0, 1.0
	for range 40 {
		mid := 0.5 * (lo + hi)
		if feasible(mid) {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo, true
}

// lightRef is the reference illuminant of a solve on the model's grid.
type lightRef struct {
	name string
	spec []float64 // on the model's grid
	y    float64   // raw Y
}

// reference returns the reference illuminant, or nil and a warning why
// there is none.
func (p *lightProblem) reference() (*lightRef, string) {
	ref, name := p.opt.Reference, "given reference"
	if ref.IsZero() {
		uv := p.t.XY.UVPrime().UV()
		tab, err := colorimetry.NewPlanckianTable(p.obs, colorimetry.C2)
		if err != nil {
			return nil, "no reference illuminant: " + err.Error()
		}
		cct, err := tab.CCT(uv, colorimetry.CCTOhno)
		if err != nil {
			return nil, "no reference illuminant for the target: " + err.Error()
		}
		if cct.Kelvin < 5000 {
			ref, err = cie.Planckian(cct.Kelvin)
			name = fmt.Sprintf("Planckian %.0f K", cct.Kelvin)
		} else {
			ref, err = cie.Daylight(cct.Kelvin)
			name = fmt.Sprintf("CIE daylight %.0f K", cct.Kelvin)
		}
		if err != nil {
			return nil, "no reference illuminant for the target: " + err.Error()
		}
	}
	r, err := ref.WithExtrap(colorimetry.ExtrapZero).Resample(p.m.grid)
	if err != nil {
		return nil, "no reference illuminant: " + err.Error()
	}
	c, err := p.b.w.XYZ(r)
	if err != nil || !(c.Y > 0) {
		return nil, "no reference illuminant: it has no luminance on the model's grid"
	}
	return &lightRef{name: name, spec: r.Values(nil), y: c.Y}, ""
}

// fixedSpectrum returns dark + added light on the model's grid.
func (p *lightProblem) fixedSpectrum() []float64 {
	v := make([]float64, p.m.grid.N)
	if !p.m.dark.IsZero() {
		p.m.dark.Values(v)
	}
	if !p.addSpec.IsZero() {
		for k := range v {
			v[k] += p.addSpec.Value(k)
		}
	}
	return v
}

// referenceAt returns the outputs within [0, 1] that reach the raw
// target XYZ exactly and bring the whole light nearest (least squares) to
// the reference at the same luminance.
func (p *lightProblem) referenceAt(ref *lightRef, target colorimetry.XYZ) ([]float64, []string, error) {
	return p.referenceBounded(ref, target, 1)
}

// referenceBounded is referenceAt with the upper bound hiBound on every
// output (+Inf while the level of a scale-free problem is sought).
func (p *lightProblem) referenceBounded(ref *lightRef, target colorimetry.XYZ, hiBound float64) ([]float64, []string, error) {
	n, g := p.n, p.m.grid.N
	k := target.Y / ref.y
	fixed := p.fixedSpectrum()
	rhs := make([]float64, g)
	var rr float64
	for j := range rhs {
		rhs[j] = k*ref.spec[j] - fixed[j]
		rr += k * ref.spec[j] * k * ref.spec[j]
	}
	sigma := math.Sqrt(rr / float64(g)) // RMS of the scaled reference
	if !(sigma > 0) {
		return nil, nil, errors.New("reference has no power")
	}
	a := mat.NewDense(g+3, n, nil)
	var colMax float64
	for i, s := range p.m.spectra {
		var cn float64
		for j := 0; j < g; j++ {
			v := s.Value(j) / sigma
			a.Set(j, i, v)
			cn += v * v
		}
		colMax = math.Max(colMax, math.Sqrt(cn))
	}
	b := make([]float64, g+3)
	for j := range rhs {
		b[j] = rhs[j] / sigma
	}
	// The target equations, each row scaled to norm λ·colMax with λ = 1e4:
	// the penalty leaves them violated by about 1e-8 of the spectral
	// residual before the exact correction below.
	const lambda = 1e4
	rows, c := p.xyzRows(target)
	for r := range rows {
		var rn float64
		for _, v := range rows[r] {
			rn += v * v
		}
		rn = math.Sqrt(rn)
		if rn == 0 {
			continue
		}
		f := lambda * colMax / rn
		for i, v := range rows[r] {
			a.Set(g+r, i, f*v)
		}
		b[g+r] = f * c[r]
	}
	lo, hi := make([]float64, n), make([]float64, n)
	for i := range hi {
		hi[i] = hiBound
	}
	w, _, err := BoundedLS(a, b, lo, hi)
	if err != nil {
		var ce *ConvergenceError
		if !errors.As(err, &ce) || ce.Best == nil {
			return nil, nil, err
		}
		w = ce.Best
	}
	var warns []string
	// Exact correction onto M·w = T − off: the minimum-norm change of the
	// outputs strictly inside their bounds.
	var free []int
	for i, x := range w {
		if x > 1e-9 && x < hiBound-1e-9 {
			free = append(free, i)
		}
	}
	res := make([]float64, 3)
	for r := range rows {
		res[r] = c[r]
		for i, v := range rows[r] {
			res[r] -= v * w[i]
		}
	}
	if len(free) > 0 {
		mf := mat.NewDense(3, len(free), nil)
		for r := range rows {
			for k, i := range free {
				mf.Set(r, k, rows[r][i])
			}
		}
		var dw mat.Dense
		if err := dw.Solve(mf, mat.NewVecDense(3, res)); err == nil {
			for k, i := range free {
				w[i] = math.Min(math.Max(w[i]+dw.At(k, 0), 0), hiBound)
			}
		}
	}
	var rn, tn float64
	for r := range rows {
		e := c[r]
		for i, v := range rows[r] {
			e -= v * w[i]
		}
		rn += e * e
	}
	tn = math.Sqrt(target.X*target.X + target.Y*target.Y + target.Z*target.Z)
	if math.Sqrt(rn) > 1e-9*tn {
		warns = append(warns, fmt.Sprintf("the closest-to-reference mix meets the target only to %.2g of its tristimulus values", math.Sqrt(rn)/tn))
	}
	return w, warns, nil
}

// referenceChroma returns the closest-to-reference outputs for a
// chromaticity target (see Solve), given the luminance range there.
func (p *lightProblem) referenceChroma(ref *lightRef, s lightVertexStats) ([]float64, []string) {
	yOf := func(w []float64) float64 {
		var y float64
		for i, x := range w {
			y += x * p.b.ch[i].Y
		}
		return y + p.off.Y
	}
	ymin, ymax := yOf(s.minY.w), yOf(s.maxY.w)
	at := func(y float64) colorimetry.XYZ { c, _ := p.t.XY.XYZ(y); return c }
	if p.opt.Add.IsZero() {
		// The shape closest to the reference, as bright as the drives
		// allow: solve without the upper bound, scale the channels' part
		// of the level down by the largest output, repeat (the dark alone
		// makes it more than one step), then solve once more within the
		// bounds at that level.
		y := ymax
		for range 8 {
			w, _, err := p.referenceBounded(ref, at(y), math.Inf(1))
			if err != nil {
				return nil, nil
			}
			var wmax float64
			for _, x := range w {
				wmax = math.Max(wmax, x)
			}
			if !(wmax > 1+1e-9) {
				break
			}
			y = p.off.Y + (y-p.off.Y)/wmax
		}
		w, warn, err := p.referenceAt(ref, at(y))
		if err != nil {
			return nil, nil
		}
		return w, warn
	}
	dist := func(y float64) (float64, []float64, []string) {
		w, warn, err := p.referenceAt(ref, at(y))
		if err != nil {
			return math.Inf(1), nil, nil
		}
		return p.refDistance(ref, w), w, warn
	}
	if ymax-ymin <= 1e-9*ymax {
		_, w, warn := dist(ymax)
		return w, warn
	}
	const levels = 8
	bestJ, bestD := 0, math.Inf(1)
	for j := range levels {
		y := ymin + (float64(j)+0.5)/levels*(ymax-ymin)
		if d, _, _ := dist(y); d < bestD {
			bestJ, bestD = j, d
		}
	}
	lo := ymin + math.Max(float64(bestJ)-0.5, 0)/levels*(ymax-ymin)
	hi := ymin + math.Min(float64(bestJ)+1.5, levels)/levels*(ymax-ymin)
	const phi = 0.6180339887498949 // golden section ratio (√5 − 1)/2
	x1, x2 := hi-phi*(hi-lo), lo+phi*(hi-lo)
	f1, _, _ := dist(x1)
	f2, _, _ := dist(x2)
	for range 30 {
		if f1 <= f2 {
			hi, x2, f2 = x2, x1, f1
			x1 = hi - phi*(hi-lo)
			f1, _, _ = dist(x1)
		} else {
			lo, x1, f1 = x1, x2, f2
			x2 = lo + phi*(hi-lo)
			f2, _, _ = dist(x2)
		}
	}
	_, w, warn := dist(0.5 * (lo + hi))
	return w, warn
}

// refDistance returns the relative RMS distance between the whole light
// of outputs w and the reference scaled to its luminance.
func (p *lightProblem) refDistance(ref *lightRef, w []float64) float64 {
	fixed := p.fixedSpectrum()
	c := p.b.mixXYZ(w, p.add)
	k := c.Y / ref.y
	var num, den float64
	for j := range fixed {
		e := fixed[j]
		for i, s := range p.m.spectra {
			e += w[i] * s.Value(j)
		}
		d := e - k*ref.spec[j]
		num += d * d
		den += k * ref.spec[j] * k * ref.spec[j]
	}
	if !(den > 0) {
		return math.Inf(1)
	}
	return math.Sqrt(num / den)
}

// recipe assembles one recipe from outputs w. Its Extra holds
// "outputs_w" for deduplication; solve removes it.
func (p *lightProblem) recipe(w []float64, strategy string, reachable bool, warns []string) Recipe {
	m, b := p.m, p.b
	r := Recipe{Reachable: reachable, Extra: map[string]any{}}
	outputs := map[string]float64{}
	for i, x := range w {
		x = math.Min(math.Max(x, 0), 1)
		r.Amounts = append(r.Amounts, Amount{Name: m.names[i], Value: m.resp[i].Drive(x)})
		outputs[m.names[i]] = x
	}
	col, _ := m.colourOf(b, p.obs, w, p.add)
	r.Warnings = append(append(append([]string{}, p.warns...), warns...), col.Warnings...)
	tuv := p.t.XY.UVPrime()
	duv := colorimetry.DeltaUVPrime(col.UV, tuv)
	targetY := p.t.Y
	if targetY == 0 {
		targetY = col.XYZ.Y
	}
	de := math.NaN()
	if target, err := p.t.XY.XYZ(targetY); err == nil && targetY > 0 {
		de = lightDE00XYZ(target, col.XYZ)
	}
	r.DE00 = de
	if math.IsNaN(de) {
		r.DE00 = 0
		r.Warnings = append(r.Warnings, "ΔE00 undefined: the mix gives no light")
	}
	ex := r.Extra
	ex["strategy"] = strategy
	ex["x"], ex["y"], ex["delta_uv_prime"] = col.XY.X, col.XY.Y, duv
	ex["Y"] = col.XYZ.Y
	ex["cct_kelvin"], ex["duv"] = nil, nil
	if col.CCT != nil {
		ex["cct_kelvin"], ex["duv"] = col.CCT.Kelvin, col.CCT.Duv
	}
	ex["efficacy_lm_per_w"] = nil
	if col.Efficacy > 0 {
		ex["efficacy_lm_per_w"] = col.Efficacy
	}
	ex["outputs"] = outputs
	ex["reference"], ex["reference_distance"] = nil, nil
	if ref := p.ref; ref != nil && col.XYZ.Y > 0 {
		ex["reference"] = ref.name
		ex["reference_distance"] = p.refDistance(ref, w)
	}
	ex["outputs_w"] = append([]float64(nil), w...)
	return r
}

// lightDE00XYZ returns ΔE00 between a target and a mix as
// Scorer.LightDE00 does: both scaled by the factor that brings the target
// to Y = 100, CIELAB against an equal-energy white of Y = 100.
func lightDE00XYZ(target, mix colorimetry.XYZ) float64 {
	k := 100 / target.Y
	white := colorimetry.XYZ{X: 100, Y: 100, Z: 100}
	la, err1 := target.Scale(k).Lab(white)
	lb, err2 := mix.Scale(k).Lab(white)
	if err1 != nil || err2 != nil {
		return math.NaN()
	}
	return colorimetry.DeltaE2000(la, lb)
}

// equalColourWarnings warns about channels of equal chromaticity.
func (p *lightProblem) equalColourWarnings() []string {
	var warns []string
	uv := make([]colorimetry.UVPrime, p.n)
	for i, c := range p.b.ch {
		uv[i], _ = c.UVPrime()
	}
	for i := 0; i < p.n; i++ {
		for j := i + 1; j < p.n; j++ {
			if d := colorimetry.DeltaUVPrime(uv[i], uv[j]); d < 1e-4 {
				warns = append(warns, fmt.Sprintf("channels %s and %s have the same chromaticity (Δu′v′ %.1e): colour cannot tell them apart, so their split is one choice among equals", p.m.names[i], p.m.names[j], d))
			}
		}
	}
	return warns
}

// lightVertices calls visit with every vertex of {w ∈ [0, 1]ⁿ : A·w = c}
// for the m×n matrix A (m ≤ 3). At a vertex the outputs strictly inside
// (0, 1) have linearly independent columns of A, so there are at most m of
// them: for every set B of k ≤ m channels with independent columns, and
// every assignment of the others to 0 or 1, the outputs of B are solved for
// (exactly for k = m, by least squares and a residual check for k < m,
// which covers degenerate vertices such as a target on the line between
// two channels) and kept when they lie in [0, 1] to 1e-9 (then clamped).
// A vertex may be visited more than once. visit must not keep w.
func lightVertices(a [][]float64, c []float64, n int, visit func(w []float64)) {
	m := len(a)
	colNorm := make([]float64, n)
	for i := range n {
		for r := range m {
			colNorm[i] += a[r][i] * a[r][i]
		}
		colNorm[i] = math.Sqrt(colNorm[i])
	}
	w := make([]float64, n)
	rest := make([]int, 0, n)
	rhs := make([]float64, m)
	sol := make([]float64, m)
	for k := 0; k <= min(m, n); k++ {
		basis := make([]int, k)
		for i := range basis {
			basis[i] = i
		}
		// blk is the k×k system: A_B itself for k = m, the normal
		// equations A_Bᵀ·A_B for k < m.
		blk := make([][]float64, k)
		for r := range blk {
			blk[r] = make([]float64, k)
		}
		for {
			rest = rest[:0]
			q := 0
			for i := range n {
				if q < k && basis[q] == i {
					q++
					continue
				}
				rest = append(rest, i)
			}
			scale := 1.0
			for r := range k {
				for q, i := range basis {
					if k == m {
						blk[r][q] = a[r][i]
					} else {
						var s float64
						for row := range m {
							s += a[row][basis[r]] * a[row][i]
						}
						blk[r][q] = s
					}
				}
			}
			for _, i := range basis {
				scale *= colNorm[i]
			}
			if k < m {
				scale *= scale
			}
			independent := k == 0 || (scale > 0 && math.Abs(lightDet(blk)) > 1e-12*scale)
			if independent {
				for mask := 0; mask < 1<<len(rest); mask++ {
					for r := range m {
						rhs[r] = c[r]
					}
					for q, i := range rest {
						v := float64((mask >> q) & 1)
						w[i] = v
						if v != 0 {
							for r := range m {
								rhs[r] -= a[r][i]
							}
						}
					}
					if k > 0 {
						if k == m {
							lightSolveSmall(blk, rhs, sol[:k])
						} else {
							atb := make([]float64, k)
							for q, i := range basis {
								for r := range m {
									atb[q] += a[r][i] * rhs[r]
								}
							}
							lightSolveSmall(blk, atb, sol[:k])
						}
					}
					ok := true
					for q, i := range basis {
						v := sol[q]
						if !(v >= -1e-9 && v <= 1+1e-9) {
							ok = false
							break
						}
						w[i] = math.Min(math.Max(v, 0), 1)
					}
					if ok && (k == m || lightResidualOK(a, c, w)) {
						visit(w)
					}
				}
			}
			// Next combination of k out of n.
			i := k - 1
			for i >= 0 && basis[i] == n-k+i {
				i--
			}
			if i < 0 {
				break
			}
			basis[i]++
			for j := i + 1; j < k; j++ {
				basis[j] = basis[j-1] + 1
			}
		}
	}
}

// lightResidualOK reports whether A·w = c to 1e-9 of the scale of A and c.
func lightResidualOK(a [][]float64, c, w []float64) bool {
	for r := range a {
		s, scale := c[r], math.Abs(c[r])
		for i, v := range a[r] {
			s -= v * w[i]
			scale += math.Abs(v)
		}
		if math.Abs(s) > 1e-9*scale {
			return false
		}
	}
	return true
}

// lightDet returns the determinant of a matrix of size up to 3×3.
func lightDet(a [][]float64) float64 {
	switch len(a) {
	case 0:
		return 1
	case 1:
		return a[0][0]
	}
	if len(a) == 2 {
		return a[0][0]*a[1][1] - a[0][1]*a[1][0]
	}
	return a[0][0]*(a[1][1]*a[2][2]-a[1][2]*a[2][1]) -
		a[0][1]*(a[1][0]*a[2][2]-a[1][2]*a[2][0]) +
		a[0][2]*(a[1][0]*a[2][1]-a[1][1]*a[2][0])
}

// lightSolveSmall solves the k×k system (k ≤ 3) a·x = b by Gaussian
// elimination with partial pivoting into x; a must be non-singular.
func lightSolveSmall(a [][]float64, b, x []float64) {
	m := len(a)
	var t [3][4]float64
	for r := range m {
		copy(t[r][:m], a[r])
		t[r][m] = b[r]
	}
	for col := range m {
		p := col
		for r := col + 1; r < m; r++ {
			if math.Abs(t[r][col]) > math.Abs(t[p][col]) {
				p = r
			}
		}
		t[col], t[p] = t[p], t[col]
		for r := col + 1; r < m; r++ {
			f := t[r][col] / t[col][col]
			for k := col; k <= m; k++ {
				t[r][k] -= f * t[col][k]
			}
		}
	}
	for r := m - 1; r >= 0; r-- {
		s := t[r][m]
		for k := r + 1; k < m; k++ {
			s -= t[r][k] * x[k]
		}
		x[r] = s / t[r][r]
	}
}
