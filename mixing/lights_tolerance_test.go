package mixing

import (
	"fmt"
	"math"
	"reflect"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// The tests of SolveQualityWithin recompute everything they check
// independently of the solve: the light of a recipe from the model's
// spectra (ltTotal, ltXYZ), its quality by package rendering and
// colorimetry (lqValue), its CCT and Duv by colorimetry's Planckian table.

// ttLanded returns the u′v′ and the CCT (Ohno) of the whole light of
// recipe r with the added light (or dark spectrum) add, computed from the
// spectrum.
func ttLanded(t *testing.T, m *Lights, r Recipe, add colorimetry.Spectrum) (colorimetry.UVPrime, colorimetry.CCT, error) {
	t.Helper()
	c := ltXYZ(t, m, ltTotal(t, m, r, add))
	uv, err := c.UVPrime()
	if err != nil {
		t.Fatal(err)
	}
	tab, err := colorimetry.NewPlanckianTable(cie.CIE1931(), colorimetry.C2)
	if err != nil {
		t.Fatal(err)
	}
	cct, err := tab.CCT(uv.UV(), colorimetry.CCTOhno)
	return uv, cct, err
}

// TestSolveQualityWithinZero checks that a zero tolerance is the exact
// solve: SolveQualityWithin gives the recipes of SolveQuality, with the
// tolerance keys null (DESIGN.md: keys that do not apply are null, never
// absent); common practice (no source): a new option at its default
// leaves the old result unchanged. (The old result itself is pinned by
// TestSolveQualityOptimal and ExampleLights_SolveQuality.)
func TestSolveQualityWithinZero(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, colorimetry.Spectrum{})
	xy, err := LightTargetCCT(cie.CIE1931(), 4000, 0)
	if err != nil {
		t.Fatal(err)
	}
	for _, g := range []LightGoal{GoalNone, GoalMaxRa, GoalMaxEfficacy} {
		want, err := m.SolveQuality(LightTarget{XY: xy}, g, LightSolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		got, err := m.SolveQualityWithin(LightTarget{XY: xy}, g, LightTolerance{}, LightSolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%v: zero tolerance differs from SolveQuality", g)
		}
		for _, r := range got.Recipes {
			for _, k := range []string{keyTolerance, keyToleranceTrade} {
				if v, ok := r.Extra[k]; !ok || v != nil {
					t.Errorf("%v: recipe %v key %q = %v (present %v), want null", g, r.Extra["strategy"], k, v, ok)
				}
			}
		}
	}
}

// TestSolveQualityWithinGains checks every goal under a Δu′v′ tolerance of
// 0.002, on the five-channel rig with a chromaticity target, with a dark
// spectrum, with a luminance target and with an added light: the goal's
// recipe lands within the tolerance (Δu′v′ ≤ tol + 1e-9, recomputed from
// its spectrum), meets a luminance target exactly (to 1e-6 of Y, as
// TestSolveQualityOptimal), is at least as good by its goal as the exact
// optimum of SolveQuality (to 1e-9 of the value: the exact optimum seeds
// the search, and the sets are nested), and its tolerance trade-off has
// three points, none worse than the one before, the first being the exact
// optimum and the last the recipe itself (common practice (no source): an
// optimum over a larger set is no worse).
func TestSolveQualityWithinGains(t *testing.T) {
	t.Parallel()
	const tol = 0.002
	dark := ltGauss(t, 600, 150, 0.004) // a dim, warm stray light
	cases := []struct {
		name  string
		dark  colorimetry.Spectrum
		add   colorimetry.Spectrum
		cct   float64
		y     float64
		goals []LightGoal
	}{
		{"chromaticity", colorimetry.Spectrum{}, colorimetry.Spectrum{}, 4000, 0,
			[]LightGoal{GoalMaxRa, GoalMaxRf, GoalMaxR9, GoalMaxEfficacy, GoalMaxMelanopic, GoalMinMelanopic}},
		{"dark", dark, colorimetry.Spectrum{}, 3200, 0, []LightGoal{GoalMaxRa, GoalMaxEfficacy, GoalMaxMelanopic}},
		{"luminance", colorimetry.Spectrum{}, colorimetry.Spectrum{}, 3000, 30, []LightGoal{GoalMaxRa, GoalMaxEfficacy, GoalMinMelanopic}},
		{"added light", colorimetry.Spectrum{}, ltGauss(t, 600, 80, 0.3), 4500, 0, []LightGoal{GoalMaxRa, GoalMaxEfficacy, GoalMaxMelanopic}},
	}
	for _, c := range cases {
		m := ltRig(t, ltRGBAL, nil, c.dark)
		xy, err := LightTargetCCT(cie.CIE1931(), c.cct, 0)
		if err != nil {
			t.Fatal(err)
		}
		target := LightTarget{XY: xy, Y: c.y}
		opt := LightSolveOptions{Add: c.add}
		extra := c.add // the light beside the channels, for lqValue and ttLanded
		if !c.dark.IsZero() {
			extra = c.dark
		}
		for _, g := range c.goals {
			t.Run(fmt.Sprintf("%s/%v", c.name, g), func(t *testing.T) {
				t.Parallel()
				exact, err := m.SolveQuality(target, g, opt)
				if err != nil {
					t.Fatal(err)
				}
				sol, err := m.SolveQualityWithin(target, g, LightTolerance{UVPrime: tol}, opt)
				if err != nil {
					t.Fatal(err)
				}
				r := sol.Recipes[0]
				if !r.Reachable || !strings.HasPrefix(r.Extra["strategy"].(string), g.String()) {
					t.Fatalf("first recipe %v (reachable %v), want the goal's", r.Extra["strategy"], r.Reachable)
				}
				uv, _, _ := ttLanded(t, m, r, c.add)
				d := colorimetry.DeltaUVPrime(uv, xy.UVPrime())
				if d > tol+1e-9 {
					t.Errorf("landed Δu′v′ %g, more than the tolerance %g", d, tol)
				}
				if rd := r.Extra["delta_uv_prime"].(float64); math.Abs(rd-d) > 1e-9 {
					t.Errorf("recipe says Δu′v′ %g, recomputed %g", rd, d)
				}
				if c.y > 0 && math.Abs(r.Extra["Y"].(float64)-c.y) > 1e-6*c.y {
					t.Errorf("Y %g, want %g", r.Extra["Y"], c.y)
				}
				sign := lqSign(g)
				got, ok := lqValue(t, m, g, ltOutputs(t, m, r), extra)
				if !ok {
					t.Fatal("the goal's recipe has no value")
				}
				ex, ok := lqValue(t, m, g, ltOutputs(t, m, exact.Recipes[0]), extra)
				if !ok {
					t.Fatal("the exact recipe has no value")
				}
				if sign*got < sign*ex-1e-9*math.Abs(ex) {
					t.Errorf("within the tolerance %g, worse than the exact %g", got, ex)
				}
				pts, ok := r.Extra[keyToleranceTrade].([]map[string]any)
				if !ok || len(pts) != len(toleranceFractions) {
					t.Fatalf("tolerance_trade_off %v", r.Extra[keyToleranceTrade])
				}
				key := map[LightGoal]string{GoalMaxRa: keyRa, GoalMaxRf: keyRf, GoalMaxR9: keyR9, GoalMaxEfficacy: "efficacy_lm_per_w", GoalMaxMelanopic: keyDER, GoalMinMelanopic: keyDER}[g]
				for k, p := range pts {
					v, ok := p[key].(float64)
					if !ok {
						t.Fatalf("point %d has no %s: %v", k+1, key, p)
					}
					if p["delta_uv_prime"].(float64) > tol*p["fraction"].(float64)+1e-9 {
						t.Errorf("point %d: Δu′v′ %g beyond %g of the tolerance", k+1, p["delta_uv_prime"], p["fraction"])
					}
					if k > 0 && sign*v < sign*pts[k-1][key].(float64)-1e-9*math.Abs(v) {
						t.Errorf("point %d: %s %g falls from %g", k+1, key, v, pts[k-1][key])
					}
				}
				if first := pts[0][key].(float64); math.Abs(first-exact.Recipes[0].Extra[key].(float64)) > 1e-9*math.Abs(first) {
					t.Errorf("point 1 has %s %g, the exact optimum %g", key, first, exact.Recipes[0].Extra[key])
				}
				if last := pts[len(pts)-1][key].(float64); math.Abs(last-r.Extra[key].(float64)) > 1e-9*math.Abs(last) {
					t.Errorf("last point has %s %g, the recipe %g", key, last, r.Extra[key])
				}
				for _, pr := range sol.Recipes[1:] {
					if pr.Extra[keyTolerance] != nil || pr.Extra[keyToleranceTrade] != nil {
						t.Errorf("plain recipe %v carries tolerance keys", pr.Extra["strategy"])
					}
					if pd := pr.Extra["delta_uv_prime"].(float64); pd > 1e-6 {
						t.Errorf("plain recipe %v moved off the target: Δu′v′ %g", pr.Extra["strategy"], pd)
					}
				}
			})
		}
	}
}

// ttRows returns the equations A·w = c of the mixes of channels of
// tristimulus values ch (plus the fixed light off) that have chromaticity
// xy (two rows) and, for y > 0, luminance y (three rows: X, Y, Z), built
// from values computed independently of the solve.
func ttRows(ch []colorimetry.XYZ, off colorimetry.XYZ, xy colorimetry.XY, y float64) ([][]float64, []float64) {
	n := len(ch)
	if y > 0 {
		tg, _ := xy.XYZ(y)
		a := [][]float64{make([]float64, n), make([]float64, n), make([]float64, n)}
		for i, c := range ch {
			a[0][i], a[1][i], a[2][i] = c.X, c.Y, c.Z
		}
		return a, []float64{tg.X - off.X, tg.Y - off.Y, tg.Z - off.Z}
	}
	x, yy := xy.X, xy.Y
	z := 1 - x - yy
	a := [][]float64{make([]float64, n), make([]float64, n)}
	for i, c := range ch {
		a[0][i] = yy*c.X - x*c.Y
		a[1][i] = yy*c.Z - z*c.Y
	}
	return a, []float64{-(yy*off.X - x*off.Y), -(yy*off.Z - z*off.Y)}
}

// TestSolveQualityWithinBruteForce checks the optimum under a Δu′v′
// tolerance of 0.004 against brute force on a four-channel rig (red,
// green, blue, lime): common practice (no source): an optimum is checked
// against exhaustive search on a small problem. Two searches:
//
//   - a grid over the drives, 25 levels per channel, keeping the mixes
//     within the disc (chromaticity target, no dark: every goal is
//     scale-free there, so the grid's level does not matter);
//   - the mixes at chromaticities on a polar grid of the disc (centre, half
//     and full radius, 16 directions), the outputs of all but two (or
//     three) channels on a grid and those solved for, as lqGrid does: with
//     a chromaticity target, a luminance target and an added light.
//
// Neither may beat the solve by more than: 1e-9 of the value for the
// ratios (efficacy, melanopic DER), whose optimum the solve finds at an
// extreme point of the set; 1e-6 for Ra (the search stops when its simplex
// is smaller than 1e-7, as in TestSolveQualityOptimal); and, with an added
// light, the goal's give-up for brightness (LightGoal.tolerance: 0.05 for
// Ra and efficacy, 5e-4 for the DER).
func TestSolveQualityWithinBruteForce(t *testing.T) {
	t.Parallel()
	const tol = 0.004
	bands := []ltBand{ltRGBAL[0], ltRGBAL[1], ltRGBAL[2], ltRGBAL[4]}
	m := ltRig(t, bands, nil, colorimetry.Spectrum{})
	ch := make([]colorimetry.XYZ, m.Len())
	for i := range ch {
		ch[i] = ltXYZ(t, m, m.Channel(i).Spectrum)
	}
	goals := []LightGoal{GoalMaxRa, GoalMaxEfficacy, GoalMaxMelanopic, GoalMinMelanopic}
	for _, c := range []struct {
		name     string
		cct, y   float64
		add      colorimetry.Spectrum
		driveGrd bool
	}{
		{"chromaticity", 4000, 0, colorimetry.Spectrum{}, true},
		{"luminance", 3500, 40, colorimetry.Spectrum{}, false},
		{"added light", 4500, 0, ltGauss(t, 600, 80, 0.3), false},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			xy, err := LightTargetCCT(cie.CIE1931(), c.cct, 0)
			if err != nil {
				t.Fatal(err)
			}
			tuv := xy.UVPrime()
			var off colorimetry.XYZ
			if !c.add.IsZero() {
				a, err := c.add.WithExtrap(colorimetry.ExtrapZero).Resample(m.Grid())
				if err != nil {
					t.Fatal(err)
				}
				off = ltXYZ(t, m, a)
			}
			best := map[LightGoal]float64{}
			for _, g := range goals {
				best[g] = math.Inf(-1)
			}
			found := 0
			visit := func(w []float64) {
				mix := off
				for i, x := range w {
					mix = mix.Add(ch[i].Scale(x))
				}
				uv, err := mix.UVPrime()
				if err != nil || colorimetry.DeltaUVPrime(uv, tuv) > tol {
					return
				}
				if c.y > 0 && math.Abs(mix.Y-c.y) > 1e-9*c.y {
					return
				}
				found++
				for _, g := range goals {
					if v, ok := lqValue(t, m, g, w, c.add); ok {
						best[g] = math.Max(best[g], lqSign(g)*v)
					}
				}
			}
			if c.driveGrd {
				const steps = 24
				w := make([]float64, m.Len())
				var walk func(i int)
				walk = func(i int) {
					if i == len(w) {
						visit(w)
						return
					}
					for k := 0; k <= steps; k++ {
						w[i] = float64(k) / steps
						walk(i + 1)
					}
				}
				walk(0)
				if found < 20 {
					t.Fatalf("the drive grid has only %d mixes within the disc", found)
				}
			}
			dirs := []float64{0}
			for k := range 16 {
				dirs = append(dirs, 2*math.Pi*float64(k)/16)
			}
			for _, rad := range []float64{0, 0.5, 1} {
				for k, th := range dirs {
					if (rad == 0) != (k == 0) {
						continue
					}
					// Just inside the disc, for the rounding of the rows.
					uv := colorimetry.UVPrime{U: tuv.U + rad*tol*(1-1e-9)*math.Cos(th), V: tuv.V + rad*tol*(1-1e-9)*math.Sin(th)}
					a, rhs := ttRows(ch, off, uv.XY(), c.y)
					steps := 24
					if c.y > 0 {
						steps = 400 // one free output
					}
					lqGrid(t, a, rhs, steps, visit)
				}
			}
			for _, g := range goals {
				sol, err := m.SolveQualityWithin(LightTarget{XY: xy, Y: c.y}, g, LightTolerance{UVPrime: tol}, LightSolveOptions{Add: c.add})
				if err != nil {
					t.Fatal(err)
				}
				got, ok := lqValue(t, m, g, ltOutputs(t, m, sol.Recipes[0]), c.add)
				if !ok {
					t.Fatalf("%v: the goal's recipe has no value", g)
				}
				got *= lqSign(g)
				slack := 1e-9 * math.Abs(got)
				if g.searched() {
					slack = 1e-6 * math.Abs(got)
				}
				if !c.add.IsZero() {
					slack = g.tolerance()
				}
				if math.IsInf(best[g], -1) {
					t.Fatalf("%v: brute force found no mix", g)
				}
				if best[g] > got+slack {
					t.Errorf("%v: brute force finds %g, better than the solve's %g by more than %g", g, best[g], got, slack)
				}
			}
		})
	}
}

// TestSolveQualityWithinCCT checks CCT and Duv tolerances (LightTolerance
// doc): the recipe's CCT and Duv (Ohno 2014, recomputed from its
// spectrum) lie within the bounds (to 1e-9 of each), beside a Δu′v′ bound
// when one is given, and the goal is no worse than the exact optimum (as
// in TestSolveQualityWithinGains).
func TestSolveQualityWithinCCT(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, colorimetry.Spectrum{})
	const kelvin, duv = 3500, 0.001
	xy, err := LightTargetCCT(cie.CIE1931(), kelvin, duv)
	if err != nil {
		t.Fatal(err)
	}
	// The bounds are about the target's own CCT and Duv by Ohno's method,
	// which returns 3500 K only to its accuracy (1e-7 of the temperature).
	tab, err := colorimetry.NewPlanckianTable(cie.CIE1931(), colorimetry.C2)
	if err != nil {
		t.Fatal(err)
	}
	tc, err := tab.CCT(xy.UVPrime().UV(), colorimetry.CCTOhno)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(tc.Kelvin-kelvin) > 1e-7*kelvin || math.Abs(tc.Duv-duv) > 1e-9 {
		t.Fatalf("target CCT %v, want %v K, Duv %v", tc, kelvin, duv)
	}
	for _, c := range []struct {
		tol LightTolerance
		g   LightGoal
	}{
		{LightTolerance{CCT: 100, Duv: 0.002}, GoalMaxEfficacy},
		{LightTolerance{CCT: 100, Duv: 0.002}, GoalMaxRa},
		{LightTolerance{UVPrime: 0.003, CCT: 40}, GoalMaxMelanopic},
	} {
		exact, err := m.SolveQuality(LightTarget{XY: xy}, c.g, LightSolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		sol, err := m.SolveQualityWithin(LightTarget{XY: xy}, c.g, c.tol, LightSolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		r := sol.Recipes[0]
		uv, cct, err := ttLanded(t, m, r, colorimetry.Spectrum{})
		if err != nil {
			t.Fatalf("%v %v: landed CCT: %v", c.g, c.tol, err)
		}
		if c.tol.CCT > 0 && math.Abs(cct.Kelvin-tc.Kelvin) > c.tol.CCT*(1+1e-9) {
			t.Errorf("%v %v: CCT %g K", c.g, c.tol, cct.Kelvin)
		}
		if c.tol.Duv > 0 && math.Abs(cct.Duv-tc.Duv) > c.tol.Duv*(1+1e-9) {
			t.Errorf("%v %v: Duv %g", c.g, c.tol, cct.Duv)
		}
		if c.tol.UVPrime > 0 {
			if d := colorimetry.DeltaUVPrime(uv, xy.UVPrime()); d > c.tol.UVPrime+1e-9 {
				t.Errorf("%v %v: Δu′v′ %g", c.g, c.tol, d)
			}
		}
		got, _ := lqValue(t, m, c.g, ltOutputs(t, m, r), colorimetry.Spectrum{})
		ex, _ := lqValue(t, m, c.g, ltOutputs(t, m, exact.Recipes[0]), colorimetry.Spectrum{})
		if got < ex-1e-9*math.Abs(ex) {
			t.Errorf("%v %v: %g, worse than the exact %g", c.g, c.tol, got, ex)
		}
		tj := r.Extra[keyTolerance].(map[string]any)
		if tj["cct_kelvin"] != c.tol.CCT || (c.tol.UVPrime == 0) != (tj["uv_prime"] == nil) {
			t.Errorf("%v %v: tolerance key %v", c.g, c.tol, tj)
		}
	}
}

// TestSolveQualityWithinNear checks a target just beyond the rig's reach
// (Δu′v′ about 0.002 beyond the edge between its blue and green
// channels): with a tolerance wider than that gap the goal is searched and
// its recipe is reachable within the tolerance, its first trade-off point
// out of reach; with a narrower one the goal is not searched and a warning
// says so (Recipe.Reachable: "within what the model can make, to the
// solve's tolerance").
func TestSolveQualityWithinNear(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, colorimetry.Spectrum{})
	var uv [2]colorimetry.UVPrime
	for k, i := range []int{2, 1} { // blue, green
		c := ltXYZ(t, m, m.Channel(i).Spectrum)
		var err error
		if uv[k], err = c.UVPrime(); err != nil {
			t.Fatal(err)
		}
	}
	// The midpoint of the edge, moved 0.002 outwards (away from the red
	// channel's side).
	mid := colorimetry.UVPrime{U: (uv[0].U + uv[1].U) / 2, V: (uv[0].V + uv[1].V) / 2}
	du, dv := uv[1].U-uv[0].U, uv[1].V-uv[0].V
	nu, nv := dv, -du // a normal of the edge
	red, _ := ltXYZ(t, m, m.Channel(0).Spectrum).UVPrime()
	if (red.U-mid.U)*nu+(red.V-mid.V)*nv > 0 {
		nu, nv = -nu, -nv
	}
	l := math.Hypot(nu, nv)
	target := colorimetry.UVPrime{U: mid.U + 0.002*nu/l, V: mid.V + 0.002*nv/l}.XY()
	plain, err := m.SolveQuality(LightTarget{XY: target}, GoalNone, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	gap := plain.Recipes[0].Extra["delta_uv_prime"].(float64)
	if plain.Recipes[0].Reachable || gap < 0.0015 {
		t.Fatalf("the target should lie about 0.002 beyond reach: reachable %v, Δu′v′ %g", plain.Recipes[0].Reachable, gap)
	}
	for _, g := range []LightGoal{GoalMaxEfficacy, GoalMaxMelanopic} {
		sol, err := m.SolveQualityWithin(LightTarget{XY: target}, g, LightTolerance{UVPrime: 2 * gap}, LightSolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		r := sol.Recipes[0]
		if !r.Reachable || r.Extra["strategy"] != g.String() {
			t.Fatalf("%v: first recipe %v, reachable %v", g, r.Extra["strategy"], r.Reachable)
		}
		uv, _, _ := ttLanded(t, m, r, colorimetry.Spectrum{})
		if d := colorimetry.DeltaUVPrime(uv, target.UVPrime()); d > 2*gap+1e-9 {
			t.Errorf("%v: landed Δu′v′ %g beyond the tolerance %g", g, d, 2*gap)
		}
		pts := r.Extra[keyToleranceTrade].([]map[string]any)
		if pts[0]["reachable"] != false || pts[0][keyRa] != nil || pts[len(pts)-1]["reachable"] != true {
			t.Errorf("%v: trade-off reachability %v … %v", g, pts[0]["reachable"], pts[len(pts)-1]["reachable"])
		}
		// No mix is nearer the target than the nearest: the recipe is
		// not nearer (to rounding).
		if d := r.Extra["delta_uv_prime"].(float64); d < gap-1e-9 {
			t.Errorf("%v: recipe at Δu′v′ %g, nearer than the nearest mix %g", g, d, gap)
		}
		if !strings.Contains(strings.Join(r.Warnings, "; "), "out of reach") {
			t.Errorf("%v: no warning that the target itself is out of reach: %v", g, r.Warnings)
		}
	}
	sol, err := m.SolveQualityWithin(LightTarget{XY: target}, GoalMaxEfficacy, LightTolerance{UVPrime: gap / 2}, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r := sol.Recipes[0]; r.Reachable || !strings.Contains(strings.Join(r.Warnings, "; "), "not searched") {
		t.Errorf("narrow tolerance: recipe %v reachable %v warnings %v", r.Extra["strategy"], r.Reachable, r.Warnings)
	}
}

// TestSolveQualityWithinErrors checks that bad tolerances are errors,
// never panics (DESIGN.md: data problems are errors).
func TestSolveQualityWithinErrors(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, colorimetry.Spectrum{})
	xy, err := LightTargetCCT(cie.CIE1931(), 4000, 0)
	if err != nil {
		t.Fatal(err)
	}
	green := colorimetry.XY{X: 0.30, Y: 0.50} // no CCT (|Duv| > 0.05, CIE 015:2018)
	for _, c := range []struct {
		name string
		xy   colorimetry.XY
		g    LightGoal
		tol  LightTolerance
	}{
		{"negative", xy, GoalMaxRa, LightTolerance{UVPrime: -0.001}},
		{"NaN", xy, GoalMaxRa, LightTolerance{UVPrime: math.NaN()}},
		{"Inf", xy, GoalMaxRa, LightTolerance{CCT: math.Inf(1), Duv: 0.001}},
		{"CCT alone", xy, GoalMaxRa, LightTolerance{CCT: 100}},
		{"Duv alone", xy, GoalMaxEfficacy, LightTolerance{Duv: 0.002}},
		{"no goal", xy, GoalNone, LightTolerance{UVPrime: 0.002}},
		{"no CCT at the target", green, GoalMaxEfficacy, LightTolerance{CCT: 100, Duv: 0.002}},
	} {
		if _, err := m.SolveQualityWithin(LightTarget{XY: c.xy}, c.g, c.tol, LightSolveOptions{}); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
	// A Δu′v′ bound at a target without a CCT is fine for a goal that
	// needs none.
	if _, err := m.SolveQualityWithin(LightTarget{XY: green}, GoalMaxEfficacy, LightTolerance{UVPrime: 0.002}, LightSolveOptions{}); err != nil {
		t.Errorf("Δu′v′ tolerance at a green target: %v", err)
	}
}
