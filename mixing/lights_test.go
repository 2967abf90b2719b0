package mixing

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize/convex/lp"
)

// The tests build synthetic rigs of Gaussian emitters on 380–780 nm at
// 5 nm. Synthetic calibration data made from a known model plus seeded
// noise is how "the fit recovers known parameters" is checked.

var ltGrid = colorimetry.Grid{Start: 380, Step: 5, N: 81}

// ltGauss returns a Gaussian band of the given centre and full width at
// half maximum (nm), peak height peak.
func ltGauss(t *testing.T, centre, fwhm, peak float64) colorimetry.Spectrum {
	t.Helper()
	v := make([]float64, ltGrid.N)
	s := fwhm / 2.3548
	for k := range v {
		d := (ltGrid.Wavelength(k) - centre) / s
		v[k] = peak * math.Exp(-0.5*d*d)
	}
	sp, err := colorimetry.NewSpectrumOnGrid(ltGrid, v, colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return sp
}

// ltBand describes one synthetic emitter.
type ltBand struct {
	name               string
	centre, fwhm, peak float64
}

// ltRGBAL is a five-channel rig: red, green, blue, amber, lime.
var ltRGBAL = []ltBand{
	{"red", 630, 20, 1.0}, {"green", 525, 32, 0.8}, {"blue", 455, 22, 1.1},
	{"amber", 592, 16, 0.9}, {"lime", 560, 90, 0.7},
}

// ltRig returns a model of the bands with the given responses (linear
// when nil) and dark spectrum.
func ltRig(t *testing.T, bands []ltBand, resp []LightResponse, dark colorimetry.Spectrum) *Lights {
	t.Helper()
	var ch []LightChannel
	for i, b := range bands {
		c := LightChannel{Name: b.name, Spectrum: ltGauss(t, b.centre, b.fwhm, b.peak)}
		if resp != nil {
			c.Response = resp[i]
		}
		ch = append(ch, c)
	}
	m, err := NewLights(ch, dark, false)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// ltXYZ computes the tristimulus values of a spectrum independently of
// the model (colorimetry's light weights on the computation grid), on the
// model's scale.
func ltXYZ(t *testing.T, m *Lights, s colorimetry.Spectrum) colorimetry.XYZ {
	t.Helper()
	w, err := colorimetry.NewLightWeights(cie.CIE1931(), colorimetry.ComputationGrid(s.Grid()))
	if err != nil {
		t.Fatal(err)
	}
	c, err := w.XYZ(s)
	if err != nil {
		t.Fatal(err)
	}
	k, err := m.Scale(cie.CIE1931())
	if err != nil {
		t.Fatal(err)
	}
	return c.Scale(k)
}

// ltTotal returns the spectrum of a recipe plus the added light.
func ltTotal(t *testing.T, m *Lights, r Recipe, add colorimetry.Spectrum) colorimetry.Spectrum {
	t.Helper()
	s, err := m.Spectrum(r.Amounts)
	if err != nil {
		t.Fatal(err)
	}
	if !add.IsZero() {
		if s, err = colorimetry.Add(s, add); err != nil {
			t.Fatal(err)
		}
	}
	return s
}

// ltOutputs returns the relative outputs of a recipe.
func ltOutputs(t *testing.T, m *Lights, r Recipe) []float64 {
	t.Helper()
	w, err := m.Outputs(r.Amounts)
	if err != nil {
		t.Fatal(err)
	}
	return w
}

func TestDisplayMatrixSRGB(t *testing.T) {
	t.Parallel()
	// IEC 61966-2-1:1999 primaries and D65 white, and its RGB→XYZ matrix
	// as printed to 4 decimals (from memory). The standard rounds to 4
	// decimals, so the tolerance is half a unit in the 4th decimal.
	m, err := DisplayMatrix(colorimetry.XY{X: 0.64, Y: 0.33}, colorimetry.XY{X: 0.30, Y: 0.60},
		colorimetry.XY{X: 0.15, Y: 0.06}, colorimetry.XY{X: 0.3127, Y: 0.3290}, 1)
	if err != nil {
		t.Fatal(err)
	}
	want := [3][3]float64{
		{0.4124, 0.3576, 0.1805},
		{0.2126, 0.7152, 0.0722},
		{0.0193, 0.1192, 0.9505},
	}
	for i := range 3 {
		for j := range 3 {
			if !scalar.EqualWithinAbsOrRel(m[i][j], want[i][j], 5e-5, 0) {
				t.Errorf("M[%d][%d] = %.6f, want %.4f", i, j, m[i][j], want[i][j])
			}
		}
	}
	// Mathematical invariant: R = G = B = 1 gives the white at Y = 1.
	w, _ := colorimetry.XY{X: 0.3127, Y: 0.3290}.XYZ(1)
	sum := [3]float64{m[0][0] + m[0][1] + m[0][2], m[1][0] + m[1][1] + m[1][2], m[2][0] + m[2][1] + m[2][2]}
	for i, v := range []float64{w.X, w.Y, w.Z} {
		if !scalar.EqualWithinAbsOrRel(sum[i], v, 1e-14, 1e-14) {
			t.Errorf("row %d sums to %v, white %v", i, sum[i], v)
		}
	}
	if _, err := DisplayMatrix(colorimetry.XY{X: 0.2, Y: 0.2}, colorimetry.XY{X: 0.3, Y: 0.3},
		colorimetry.XY{X: 0.4, Y: 0.4}, colorimetry.XY{X: 0.3127, Y: 0.3290}, 1); !errors.Is(err, ErrSingularPrimaries) {
		t.Errorf("collinear primaries: %v", err)
	}
}

func TestDisplayWhiteBalanceGains(t *testing.T) {
	t.Parallel()
	d65 := colorimetry.XY{X: 0.3127, Y: 0.3290}
	m, err := DisplayMatrix(colorimetry.XY{X: 0.64, Y: 0.33}, colorimetry.XY{X: 0.30, Y: 0.60},
		colorimetry.XY{X: 0.15, Y: 0.06}, d65, 100)
	if err != nil {
		t.Fatal(err)
	}
	d50, err := cie.DaylightChromaticity(5000 * cie.C2Ratio)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name      string
		target    colorimetry.XY
		reachable bool
		tol       float64
	}{
		// Mathematical invariants of the construction, to rounding (1e-12).
		{"native white", d65, true, 1e-12},
		{"D50 (CIE 015 daylight locus)", d50, true, 1e-12},
		{"beyond the red primary", colorimetry.XY{X: 0.70, Y: 0.29}, false, 0},
	} {
		wb, err := WhiteBalanceGains(m, tc.target)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if wb.Reachable != tc.reachable {
			t.Errorf("%s: reachable %v", tc.name, wb.Reachable)
			continue
		}
		if !tc.reachable {
			if !(wb.DeltaUVPrime > 0.01) {
				t.Errorf("%s: Δu′v′ %g, want the distance to the gamut", tc.name, wb.DeltaUVPrime)
			}
			continue
		}
		top := math.Max(wb.Gains[0], math.Max(wb.Gains[1], wb.Gains[2]))
		if top != 1 || wb.DeltaUVPrime > tc.tol {
			t.Errorf("%s: gains %v, Δu′v′ %g", tc.name, wb.Gains, wb.DeltaUVPrime)
		}
		if tc.name == "native white" {
			for _, g := range wb.Gains {
				if !scalar.EqualWithinAbsOrRel(g, 1, tc.tol, tc.tol) {
					t.Errorf("native white: gains %v, want 1 1 1", wb.Gains)
				}
			}
			if !scalar.EqualWithinAbsOrRel(wb.Y, 100, 1e-12, 1e-12) {
				t.Errorf("native white Y %g, want 100", wb.Y)
			}
		}
	}
}

func TestLightsResponseInverse(t *testing.T) {
	t.Parallel()
	pw, err := PowerResponse(2.2)
	if err != nil {
		t.Fatal(err)
	}
	mono, err := MonotoneResponse([]float64{0, 0.25, 0.5, 0.8, 0.9, 1}, []float64{0, 0.04, 0.2, 0.6, 1, 1})
	if err != nil {
		t.Fatal(err)
	}
	// Mathematical invariant: Drive is the inverse of Output where the
	// curve rises; tolerance from the bisection (1e-12) times the slope.
	for _, tc := range []struct {
		r   LightResponse
		tol float64
	}{{pw, 1e-12}, {mono, 1e-10}, {LightResponse{}, 1e-15}} {
		for d := 0.0; d <= 0.9; d += 0.01 {
			if got := tc.r.Drive(tc.r.Output(d)); !scalar.EqualWithinAbsOrRel(got, d, tc.tol, 0) {
				t.Errorf("%s: Drive(Output(%g)) = %g", tc.r.Kind(), d, got)
			}
		}
	}
	// A saturated curve returns the lowest drive of the flat part. The
	// curve meets the flat part with zero slope, Output(0.9 − h) = 1 − O(h²),
	// so float64 resolves the drive only to about √ε ≈ 1e-8.
	if d := mono.Drive(1); !scalar.EqualWithinAbsOrRel(d, 0.9, 1e-7, 0) {
		t.Errorf("saturated: Drive(1) = %g, want 0.9", d)
	}
	// Fritsch–Butland keeps monotone data monotone (Fritsch & Butland 1984).
	prev := -1.0
	for d := 0.0; d <= 1; d += 0.001 {
		if o := mono.Output(d); o < prev {
			t.Fatalf("monotone response falls at drive %g", d)
		} else {
			prev = o
		}
	}
	for _, bad := range []struct{ d, o []float64 }{
		{[]float64{0, 0.5, 1}, []float64{0, 0.6, 0.5}},
		{[]float64{0, 0.5, 0.5, 1}, []float64{0, 0.2, 0.3, 1}},
		{[]float64{0.1, 1}, []float64{0, 1}},
	} {
		if _, err := MonotoneResponse(bad.d, bad.o); err == nil {
			t.Errorf("MonotoneResponse(%v, %v) accepted", bad.d, bad.o)
		}
	}
}

// TestSolveThreeChannelExact: three independent channels and a target
// inside their reach have exactly one solution (mathematical invariant:
// a non-singular 3×3 system), reproduced to 1e-9 relative in XYZ.
func TestLightsSolveThreeChannelExact(t *testing.T) {
	t.Parallel()
	g22, _ := PowerResponse(2.2)
	g18, _ := PowerResponse(1.8)
	mono, _ := MonotoneResponse([]float64{0, 0.3, 0.7, 1}, []float64{0, 0.05, 0.45, 1})
	dark := ltGauss(t, 580, 200, 0.002)
	for _, tc := range []struct {
		name  string
		resp  []LightResponse
		dark  colorimetry.Spectrum
		drive []float64
		tol   float64
	}{
		{"linear", nil, colorimetry.Spectrum{}, []float64{0.3, 0.6, 0.45}, 1e-9},
		{"power and monotone with dark", []LightResponse{g22, g18, mono}, dark, []float64{0.8, 0.35, 0.5}, 1e-9},
	} {
		m := ltRig(t, ltRGBAL[:3], tc.resp, tc.dark)
		am := []Amount{{"red", tc.drive[0]}, {"green", tc.drive[1]}, {"blue", tc.drive[2]}}
		s, err := m.Spectrum(am)
		if err != nil {
			t.Fatal(err)
		}
		want := ltXYZ(t, m, s)
		xy, _ := want.XY()
		sol, err := m.Solve(LightTarget{XY: xy, Y: want.Y}, LightSolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		r := sol.Recipes[0]
		if !r.Reachable || len(sol.Recipes) != 1 || r.Extra["strategy"] != StrategyExact {
			t.Fatalf("%s: %d recipes, first %+v", tc.name, len(sol.Recipes), r)
		}
		got := ltXYZ(t, m, ltTotal(t, m, r, colorimetry.Spectrum{}))
		for _, p := range [][2]float64{{got.X, want.X}, {got.Y, want.Y}, {got.Z, want.Z}} {
			if !scalar.EqualWithinAbsOrRel(p[0], p[1], 0, tc.tol) {
				t.Errorf("%s: XYZ %v, want %v", tc.name, got, want)
			}
		}
		for i, a := range r.Amounts {
			// Drives: the inverse response amplifies the 1e-15 output error by
			// at most 1/slope; 1e-8 covers the flattest part used here.
			if !scalar.EqualWithinAbsOrRel(a.Value, tc.drive[i], 1e-8, 0) {
				t.Errorf("%s: %s drive %g, want %g", tc.name, a.Name, a.Value, tc.drive[i])
			}
		}
		if r.DE00 > 1e-6 || r.Extra["delta_uv_prime"].(float64) > 1e-9 {
			t.Errorf("%s: ΔE00 %g Δu′v′ %g", tc.name, r.DE00, r.Extra["delta_uv_prime"])
		}
	}
}

// ltNull parametrises the solutions of the equations A·w = c of a
// five-channel problem: for every grid value of the free outputs, the
// remaining ones are solved for (mat.Dense.Solve, a factorisation other
// than the solve's own), and feasible points (all outputs in [0, 1]) are
// passed to visit. It is the brute-force grid the optimality tests compare
// against.
func ltNull(a [][]float64, c []float64, steps int, visit func(w []float64)) {
	m, n := len(a), len(a[0])
	free := n - m
	idx := make([]int, free)
	blk := mat.NewDense(m, m, nil)
	for r := range m {
		for q := range m {
			blk.Set(r, q, a[r][q])
		}
	}
	var lu mat.LU
	lu.Factorize(blk)
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
				if w[q] < 0 || w[q] > 1 {
					ok = false
				}
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

// TestSolveFiveChannelsOptimal checks that with more than three channels
// the chosen mix meets the target and is optimal, against a brute-force
// grid of the solution set and against gonum's simplex method (lp.Simplex,
// a general-purpose reference implementation).
func TestLightsSolveFiveChannelsOptimal(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, colorimetry.Spectrum{})
	obs := cie.CIE1931()
	b, err := m.basis(obs)
	if err != nil {
		t.Fatal(err)
	}
	// A warm-white chromaticity (3500 K on the Planckian locus).
	xy, err := LightTargetCCT(obs, 3500, 0)
	if err != nil {
		t.Fatal(err)
	}
	sol, err := m.Solve(LightTarget{XY: xy}, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	byStrategy := map[string]Recipe{}
	for _, r := range sol.Recipes {
		for _, s := range strings.Split(r.Extra["strategy"].(string), "; ") {
			byStrategy[s] = r
		}
		if !r.Reachable || r.Extra["delta_uv_prime"].(float64) > 1e-9 {
			t.Errorf("%v: reachable %v Δu′v′ %g", r.Extra["strategy"], r.Reachable, r.Extra["delta_uv_prime"])
		}
	}
	maxY, ok1 := byStrategy[StrategyMaxLuminance]
	eff, ok2 := byStrategy[StrategyMaxEfficacy]
	ref, ok3 := byStrategy[StrategyReference]
	if !ok1 || !ok2 || !ok3 {
		t.Fatalf("strategies: %v", sol.Recipes)
	}
	p := &lightProblem{m: m, b: b, obs: obs, n: m.Len()}
	a, c := p.chromaRows(xy, colorimetry.XYZ{})
	yOf := func(w []float64) (y, pw float64) {
		for i, x := range w {
			y += x * b.ch[i].Y
			pw += x * b.power[i]
		}
		return y, pw
	}
	gotY, _ := yOf(ltOutputs(t, m, maxY))
	gy, gp := yOf(ltOutputs(t, m, eff))
	gotEff := gy / gp
	var gridY, gridEff float64
	ltNull(a, c, 60, func(w []float64) {
		y, pw := yOf(w)
		gridY = math.Max(gridY, y)
		if pw > 0 {
			gridEff = math.Max(gridEff, y/pw)
		}
	})
	// The grid cannot beat the exact optimum (beyond rounding, 1e-12) and
	// comes within its resolution (1/60 of the range: 3 % of the optimum
	// here, a loose bound for a grid of that step).
	for _, tc := range []struct {
		name      string
		got, grid float64
		tol       float64
	}{{"max luminance", gotY, gridY, 0.03}, {"max efficacy", gotEff, gridEff, 0.03}} {
		if tc.grid > tc.got*(1+1e-12) || tc.grid < tc.got*(1-tc.tol) {
			t.Errorf("%s: solve %g, grid %g", tc.name, tc.got, tc.grid)
		}
	}
	// gonum's simplex on the same LP in standard form: maximise Y subject to
	// the chromaticity rows and w + s = 1, w, s ≥ 0.
	n := m.Len()
	A := mat.NewDense(2+n, 2*n, nil)
	bb := make([]float64, 2+n)
	cost := make([]float64, 2*n)
	for i := range n {
		A.Set(0, i, a[0][i])
		A.Set(1, i, a[1][i])
		A.Set(2+i, i, 1)
		A.Set(2+i, n+i, 1)
		bb[2+i] = 1
		cost[i] = -b.ch[i].Y
	}
	opt, _, err := lp.Simplex(cost, A, bb, 1e-12, nil)
	if err != nil {
		t.Fatal(err)
	}
	// Same optimum to 1e-9 relative (the simplex's own tolerance).
	if !scalar.EqualWithinAbsOrRel(-opt, gotY, 0, 1e-9) {
		t.Errorf("max luminance: solve %g, lp.Simplex %g", gotY, -opt)
	}
	// Closest to reference: at the luminance it chose, no grid point of
	// the exact solutions is closer to the reference (3500 K blackbody).
	wref := ltOutputs(t, m, ref)
	yref, _ := yOf(wref)
	target, _ := xy.XYZ(yref)
	p.t = LightTarget{XY: xy}
	p.ref, _ = p.reference()
	got := p.refDistance(p.ref, wref)
	if want := ref.Extra["reference_distance"].(float64); !scalar.EqualWithinAbsOrRel(got, want, 1e-12, 1e-9) {
		t.Errorf("reference distance %g, reported %g", got, want)
	}
	ax, cx := p.xyzRows(target)
	best := math.Inf(1)
	ltNull(ax, cx, 400, func(w []float64) { best = math.Min(best, p.refDistance(p.ref, w)) })
	// Rounding of the penalty method and the exact correction (1e-6
	// relative) — the grid must not do better than that.
	if best < got*(1-1e-6) {
		t.Errorf("closest to reference: solve %g, grid %g", got, best)
	}
	if best > got*1.05 {
		t.Errorf("closest to reference: the grid (%g) is far from the solve (%g): the grid is too coarse to judge", best, got)
	}
	if ref.Extra["reference"] != "Planckian 3500 K" {
		t.Errorf("reference %v", ref.Extra["reference"])
	}
}

// TestSolveOutOfGamut: a target outside the channels' reach gives
// Reachable false with the nearest mix, not an error, and no mix of a
// dense grid comes nearer.
func TestLightsSolveOutOfGamut(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL[:3], nil, colorimetry.Spectrum{})
	for _, tc := range []struct {
		name   string
		target LightTarget
	}{
		{"saturated cyan", LightTarget{XY: colorimetry.XY{X: 0.05, Y: 0.40}}},
		{"spectral green with luminance", LightTarget{XY: colorimetry.XY{X: 0.15, Y: 0.80}, Y: 20}},
	} {
		sol, err := m.Solve(tc.target, LightSolveOptions{})
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		r := sol.Recipes[0]
		duv := r.Extra["delta_uv_prime"].(float64)
		if r.Reachable || len(sol.Recipes) != 1 || !(duv > 1e-3) || len(r.Warnings) == 0 {
			t.Fatalf("%s: %+v", tc.name, r)
		}
		// Brute force: every mix on a 0.025 grid of outputs.
		tuv := tc.target.XY.UVPrime()
		b, _ := m.basis(cie.CIE1931())
		best := math.Inf(1)
		const steps = 40
		for i := 0; i <= steps; i++ {
			for j := 0; j <= steps; j++ {
				for k := 0; k <= steps; k++ {
					c := b.mixXYZ([]float64{float64(i) / steps, float64(j) / steps, float64(k) / steps}, colorimetry.XYZ{})
					if uv, err := c.UVPrime(); err == nil {
						best = math.Min(best, colorimetry.DeltaUVPrime(uv, tuv))
					}
				}
			}
		}
		// The hull's nearest point is exact: the grid may only match it
		// (to rounding) or fall short by its resolution.
		if best < duv-1e-12 || best > duv+0.005 {
			t.Errorf("%s: Δu′v′ %g, grid %g", tc.name, duv, best)
		}
		// The reported Δu′v′ is that of the recipe's light, recomputed.
		got := ltXYZ(t, m, ltTotal(t, m, r, colorimetry.Spectrum{}))
		uv, _ := got.UVPrime()
		if d := colorimetry.DeltaUVPrime(uv, tuv); !scalar.EqualWithinAbsOrRel(d, duv, 1e-9, 1e-9) {
			t.Errorf("%s: recomputed Δu′v′ %g, reported %g", tc.name, d, duv)
		}
	}
	// Only the luminance out of reach: the chromaticity is met.
	xy, _ := LightTargetCCT(cie.CIE1931(), 4000, 0)
	sol, err := m.Solve(LightTarget{XY: xy, Y: 500}, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r := sol.Recipes[0]; r.Reachable || r.Extra["delta_uv_prime"].(float64) > 1e-9 || r.Extra["Y"].(float64) >= 100 {
		t.Errorf("too bright: %+v", r)
	}
}

// TestSolveSingular: two identical channels make the 3×3 system
// singular. Decision (documented on Solve): a warning and a valid recipe.
func TestLightsSolveSingular(t *testing.T) {
	t.Parallel()
	bands := []ltBand{{"red", 630, 20, 1}, {"red-2", 630, 20, 1}, {"blue", 455, 22, 1}}
	m := ltRig(t, bands, nil, colorimetry.Spectrum{})
	b, _ := m.basis(cie.CIE1931())
	// On the line between red and blue: reachable.
	mid := b.mixXYZ([]float64{0.3, 0.2, 0.4}, colorimetry.XYZ{})
	xy, _ := mid.XY()
	sol, err := m.Solve(LightTarget{XY: xy}, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	r := sol.Recipes[0]
	if !r.Reachable || r.Extra["delta_uv_prime"].(float64) > 1e-9 || !strings.Contains(strings.Join(r.Warnings, " "), "same chromaticity") {
		t.Errorf("on the line: %+v", r)
	}
	// The same target with a luminance (three equations, rank 2).
	sol, err = m.Solve(LightTarget{XY: xy, Y: mid.Y * b.scale}, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r := sol.Recipes[0]; r.Extra["delta_uv_prime"].(float64) > 1e-9 || !scalar.EqualWithinAbsOrRel(r.Extra["Y"].(float64), mid.Y*b.scale, 1e-9, 1e-9) {
		t.Errorf("with luminance: %+v", r)
	}
	// Off the line: not reachable, nearest on the line.
	sol, err = m.Solve(LightTarget{XY: colorimetry.XY{X: 0.3, Y: 0.4}}, LightSolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r := sol.Recipes[0]; r.Reachable || !(r.Extra["delta_uv_prime"].(float64) > 0) {
		t.Errorf("off the line: %+v", r)
	}
}

// ltFiltered is a warm lamp behind an amber filter: Planck's law at
// 3200 K times a logistic edge, scaled by k.
func ltFiltered(t *testing.T, k float64) colorimetry.Spectrum {
	t.Helper()
	bb, err := colorimetry.Blackbody(3200, ltGrid, colorimetry.C2)
	if err != nil {
		t.Fatal(err)
	}
	peak, _ := bb.Max()
	s, err := bb.Map(func(nm, v float64) float64 { return k * v / peak * (0.02 + 0.9/(1+math.Exp(-(nm-575)/10))) })
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// TestComplementToWhite: the channel mix added to a coloured light lands
// on the target white (Δu′v′ < 1e-6), checked by recomputing the sum of
// the spectra and its CCT independently (colorimetry's weights and Ohno's
// method).
func TestLightsComplementToWhite(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL, nil, ltGauss(t, 550, 300, 0.001))
	obs := cie.CIE1931()
	xy, err := LightTargetCCT(obs, 4000, 0)
	if err != nil {
		t.Fatal(err)
	}
	add := ltFiltered(t, 0.5)
	sol, err := m.Solve(LightTarget{XY: xy}, LightSolveOptions{Add: add})
	if err != nil {
		t.Fatal(err)
	}
	if sol.Recipes[0].Extra["strategy"] != StrategyLeastAdded {
		t.Errorf("first strategy %v", sol.Recipes[0].Extra["strategy"])
	}
	tab, _ := colorimetry.NewPlanckianTable(obs, colorimetry.C2)
	var lastY float64
	for k, r := range sol.Recipes {
		if !r.Reachable {
			t.Fatalf("recipe %d not reachable: %+v", k, r)
		}
		c := ltXYZ(t, m, ltTotal(t, m, r, add))
		uv, _ := c.UVPrime()
		// Δu′v′ < 1e-6 is the criterion for "lands on the target".
		if d := colorimetry.DeltaUVPrime(uv, xy.UVPrime()); d > 1e-6 {
			t.Errorf("%v: Δu′v′ %g", r.Extra["strategy"], d)
		}
		cuv, _ := c.UV()
		cct, err := tab.CCT(cuv, colorimetry.CCTOhno)
		if err != nil || math.Abs(cct.Kelvin-4000) > 0.01 || math.Abs(cct.Duv) > 1e-7 {
			t.Errorf("%v: CCT %+v %v", r.Extra["strategy"], cct, err)
		}
		if k == 0 {
			lastY = c.Y
		}
	}
	// The least added power is also the dimmest; max luminance is brighter.
	for _, r := range sol.Recipes[1:] {
		if r.Extra["strategy"] == StrategyMaxLuminance && !(r.Extra["Y"].(float64) > lastY) {
			t.Errorf("max luminance Y %v not above least-power Y %g", r.Extra["Y"], lastY)
		}
	}
	// A coloured light far brighter than the rig: not reachable, with the
	// fraction at which it would be. Mathematical invariant: at that
	// fraction (less 1 %; the warning prints 4 digits) the target is
	// reachable, above it (plus 1 %) not.
	strong := ltFiltered(t, 40)
	sol, err = m.Solve(LightTarget{XY: xy}, LightSolveOptions{Add: strong})
	if err != nil {
		t.Fatal(err)
	}
	r := sol.Recipes[0]
	if r.Reachable || !strings.Contains(strings.Join(r.Warnings, " "), "brighter than the channels can balance") {
		t.Fatalf("strong light: %+v", r)
	}
	var pct float64
	for _, w := range r.Warnings {
		if i := strings.Index(w, "dimmed to "); i >= 0 {
			if _, err := fmt.Sscan(w[i+len("dimmed to "):], &pct); err != nil {
				t.Fatal(err)
			}
		}
	}
	for _, tc := range []struct {
		f    float64
		want bool
	}{{pct / 100 * 0.99, true}, {pct / 100 * 1.01, false}} {
		sol, err := m.Solve(LightTarget{XY: xy}, LightSolveOptions{Add: ltFiltered(t, 40*tc.f)})
		if err != nil {
			t.Fatal(err)
		}
		if sol.Recipes[0].Reachable != tc.want {
			t.Errorf("at %.4g of the light: reachable %v, want %v", tc.f, sol.Recipes[0].Reachable, tc.want)
		}
	}
}

// ltRamps makes synthetic ramp measurements: each band's spectrum times
// d^γ plus a dark spectrum, with Gaussian noise of standard deviation
// sigma (seeded), at drives 0.1 … 1 in steps of 0.1, reps times each.
func ltRamps(t *testing.T, bands []ltBand, gammas []float64, dark colorimetry.Spectrum, sigma float64, reps int, seed uint64) []RampSample {
	t.Helper()
	rnd := rand.New(rand.NewPCG(seed, seed))
	noisy := func(f func(k int) float64) colorimetry.Spectrum {
		v := make([]float64, ltGrid.N)
		for k := range v {
			v[k] = f(k) + sigma*rnd.NormFloat64()
		}
		s, err := colorimetry.NewSpectrumOnGrid(ltGrid, v, colorimetry.Options{})
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	var out []RampSample
	for range reps {
		out = append(out, RampSample{Name: "dark", Channel: DarkChannel, Spectrum: noisy(func(k int) float64 { return dark.Value(k) })})
	}
	for i, b := range bands {
		s := ltGauss(t, b.centre, b.fwhm, b.peak)
		for step := 1; step <= 10; step++ {
			d := float64(step) / 10
			for range reps {
				w := math.Pow(d, gammas[i])
				out = append(out, RampSample{Name: b.name, Channel: b.name, Drive: d,
					Spectrum: noisy(func(k int) float64 { return dark.Value(k) + w*s.Value(k) })})
			}
		}
	}
	return out
}

// TestFitRecoversGamma: the power-law fit recovers the gammas of
// synthetic ramps within three of its standard errors, and the spectra
// within the noise of a mean.
func TestLightsFitRecoversGamma(t *testing.T) {
	t.Parallel()
	bands := ltRGBAL[:3]
	gammas := []float64{2.2, 1.8, 2.4}
	dark := ltGauss(t, 560, 300, 0.003)
	const sigma, reps = 0.002, 2
	samples := ltRamps(t, bands, gammas, dark, sigma, reps, 1)
	m, err := FitLights(samples, LightsFitOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for i, b := range bands {
		g, se := m.Channel(i).Response.Gamma()
		if !(se > 0) || math.Abs(g-gammas[i]) > 3*se {
			t.Errorf("%s: γ = %.4f ± %.4f, want %g within 3 standard errors", b.name, g, se, gammas[i])
		}
		// The fitted spectrum is the mean of reps full-drive spectra less the
		// mean of reps dark spectra: its noise has standard deviation
		// σ·√(2/reps) at each wavelength, so its RMS error over 81
		// wavelengths stays below 1.5 times that (a χ with 81 degrees of
		// freedom exceeds 1.5 times its scale with probability < 1e-6).
		truth := ltGauss(t, b.centre, b.fwhm, b.peak)
		rms, _, err := Residual(truth, m.Channel(i).Spectrum)
		if err != nil {
			t.Fatal(err)
		}
		if lim := 1.5 * sigma * math.Sqrt(2.0/reps); rms > lim {
			t.Errorf("%s: spectrum RMS error %g, above %g", b.name, rms, lim)
		}
	}
	rep := m.Report()
	if rep == nil || len(rep.Samples) != 3*10*reps || rep.HeldOut != nil {
		t.Fatalf("report: %+v", rep)
	}
	for _, w := range rep.Warnings {
		t.Errorf("unexpected warning: %s", w)
	}
	// Monotone fit of the same data: the curve passes within 4 standard
	// errors of d^γ at the measured drives (σ_w ≈ σ/‖S‖/√reps).
	mono, err := FitLights(samples, LightsFitOptions{Response: ResponseMonotone, HoldOut: 0.2})
	if err != nil {
		t.Fatal(err)
	}
	for i, b := range bands {
		s := ltGauss(t, b.centre, b.fwhm, b.peak)
		var ss float64
		for k := 0; k < s.Len(); k++ {
			ss += s.Value(k) * s.Value(k)
		}
		sw := sigma / math.Sqrt(ss) * math.Sqrt(2.0/reps)
		r := mono.Channel(i).Response
		if r.Kind() != ResponseMonotone {
			t.Fatalf("kind %s", r.Kind())
		}
		for step := 1; step < 10; step++ {
			d := float64(step) / 10
			if got, want := r.Output(d), math.Pow(d, gammas[i]); math.Abs(got-want) > 4*sw+0.01*want {
				t.Errorf("%s monotone: output %g at drive %g, want %g", b.name, got, d, want)
			}
		}
	}
	if mono.Report().HeldOut == nil || mono.Report().HeldOut.N == 0 {
		t.Error("hold-out 0.2 held nothing out")
	}
}

// TestFitShapeWarning: a channel whose peak moves with drive is
// reported; the steady channels are not.
func TestLightsFitShapeWarning(t *testing.T) {
	t.Parallel()
	bands := ltRGBAL[:2]
	samples := ltRamps(t, bands, []float64{2, 2}, ltGauss(t, 560, 300, 0.001), 0.0005, 1, 2)
	// Replace red's ramp by one whose peak moves 1 nm per 0.1 of drive
	// below full drive (an LED running cooler at low current).
	for k, s := range samples {
		if s.Channel != "red" || s.Drive == 1 {
			continue
		}
		shift := 10 * (1 - s.Drive)
		g := ltGauss(t, 630-shift, 20, 1)
		samples[k].Spectrum = g.Scale(math.Pow(s.Drive, 2))
	}
	m, err := FitLights(samples, LightsFitOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var hits []string
	for _, w := range m.Report().Warnings {
		if strings.Contains(w, "changes shape") {
			hits = append(hits, w)
		}
	}
	if len(hits) != 1 || !strings.Contains(hits[0], "channel red") {
		t.Errorf("shape warnings: %q", hits)
	}
}

func TestLightsFitErrors(t *testing.T) {
	t.Parallel()
	bands := ltRGBAL[:2]
	base := func() []RampSample {
		return ltRamps(t, bands, []float64{2, 2}, ltGauss(t, 560, 300, 0.001), 0.0005, 1, 3)
	}
	for _, tc := range []struct {
		name   string
		edit   func(s []RampSample) []RampSample
		wanted []string
	}{
		{"non-monotone ramp", func(s []RampSample) []RampSample {
			for k := range s {
				if s[k].Channel == "green" && s[k].Drive == 0.7 {
					s[k].Spectrum = s[k].Spectrum.Scale(0.5)
					s[k].Where = "ramps.csv:17"
				}
			}
			return s
		}, []string{"green", "drive 0.7", "not monotone", "ramps.csv:17"}},
		{"no full drive", func(s []RampSample) []RampSample {
			var out []RampSample
			for _, x := range s {
				if !(x.Channel == "red" && x.Drive == 1) {
					out = append(out, x)
				}
			}
			return out
		}, []string{"red", "full drive"}},
		{"dark with a drive", func(s []RampSample) []RampSample {
			s[0].Drive = 0.5
			s[0].Where = "ramps.csv:3"
			return s
		}, []string{"ramps.csv:3", "dark"}},
	} {
		_, err := FitLights(tc.edit(base()), LightsFitOptions{})
		if err == nil {
			t.Errorf("%s: no error", tc.name)
			continue
		}
		for _, w := range tc.wanted {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q lacks %q", tc.name, err, w)
			}
		}
	}
}

func TestLightsRampsFromFile(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, csv string
		wanted    []string // substrings of the error; none: must succeed
	}{
		{"good", "name,channel,drive,heldout,400,500,600\nr1,red,0.5,yes,0,0.1,0.5\nr2,red,1,,0,0.2,1\nd,dark,0,0,0,0,0\n", nil},
		{"no drive column", "name,channel,level,400,500,600\nr1,red,0.5,0,0.1,0.5\n", []string{"ramps.csv:2", `"drive"`}},
		{"no channel column", "name,drive,400,500,600\nr1,0.5,0,0.1,0.5\n", []string{"ramps.csv:2", `"channel"`}},
		{"drive not a number", "name,channel,drive,400,500,600\nr1,red,half,0,0.1,0.5\n", []string{"ramps.csv:2", "drive"}},
		{"drive beyond 1", "name,channel,drive,400,500,600\nr1,red,1.5,0,0.1,0.5\n", []string{"ramps.csv:2", "1.5"}},
		{"bad flag", "name,channel,drive,heldout,400,500,600\nr1,red,0.5,maybe,0,0.1,0.5\n", []string{"ramps.csv:2", "maybe"}},
	} {
		list, err := specio.NewReader(strings.NewReader(tc.csv), "ramps.csv").ReadAll()
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		got, err := LightRampsFromNamed(list, "ramps.csv")
		if tc.wanted == nil {
			if err != nil || len(got) != 3 || !got[0].HeldOut || got[1].HeldOut || got[2].Channel != "dark" || got[0].Drive != 0.5 {
				t.Errorf("%s: %+v %v", tc.name, got, err)
			}
			continue
		}
		if err == nil {
			t.Errorf("%s: no error", tc.name)
			continue
		}
		for _, w := range tc.wanted {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q lacks %q", tc.name, err, w)
			}
		}
	}
}

// TestLightsSaveLoad: a saved model loads back with the same forward
// predictions (round trip), and load validates.
func TestLightsSaveLoad(t *testing.T) {
	t.Parallel()
	samples := ltRamps(t, ltRGBAL[:3], []float64{2.2, 2, 2.4}, ltGauss(t, 560, 300, 0.002), 0.001, 1, 4)
	for _, kind := range []string{ResponsePower, ResponseMonotone} {
		m, err := FitLights(samples, LightsFitOptions{Response: kind})
		if err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		if err := Save(&buf, m); err != nil {
			t.Fatal(err)
		}
		text := buf.String()
		back, err := Load(strings.NewReader(text))
		if err != nil {
			t.Fatal(err)
		}
		l, ok := back.(*Lights)
		if !ok {
			t.Fatalf("loaded %T", back)
		}
		am := []Amount{{"red", 0.7}, {"green", 0.33}, {"blue", 0.1}}
		a, err := m.Colour(am, cie.CIE1931())
		if err != nil {
			t.Fatal(err)
		}
		b, err := l.Colour(am, cie.CIE1931())
		if err != nil {
			t.Fatal(err)
		}
		// JSON keeps float64 exactly (shortest round-trip form), so the
		// prediction is identical.
		if a.XYZ != b.XYZ || l.Report() == nil || len(l.Report().Samples) != len(m.Report().Samples) {
			t.Errorf("%s: round trip %v → %v", kind, a.XYZ, b.XYZ)
		}
		for _, bad := range []struct{ from, to string }{
			{`"units": "relative"`, `"units": "furlongs"`},
			{`"start_nm": 380`, `"start_nm": -5`},
			{`"kind": "` + kind + `"`, `"kind": "sigmoid"`},
		} {
			if !strings.Contains(text, bad.from) {
				t.Fatalf("%s: model file lacks %s", kind, bad.from)
			}
			if _, err := Load(strings.NewReader(strings.Replace(text, bad.from, bad.to, 1))); err == nil {
				t.Errorf("%s: %s accepted", kind, bad.to)
			}
		}
	}
	if _, err := Load(strings.NewReader(`{"schema":"antipode-model/1","kind":"lights","model":{"grid":{"start_nm":380,"step_nm":5,"n":3},"units":"relative","channels":[{"name":"a","response":{"kind":"power","gamma":-1,"gamma_se":0,"drive":null,"output":null},"spectrum":[1,2,3]}],"dark":null,"fit":null}}`)); err == nil || !strings.Contains(err.Error(), "gamma") {
		t.Errorf("negative gamma: %v", err)
	}
	if _, err := Load(strings.NewReader(`{"schema":"antipode-model/1","kind":"lights","model":{"grid":{"start_nm":380,"step_nm":5,"n":3},"units":"relative","channels":[{"name":"a","response":{"kind":"power","gamma":2,"gamma_se":0,"drive":null,"output":null},"spectrum":[1,2]}],"dark":null,"fit":null}}`)); err == nil {
		t.Error("short spectrum accepted")
	}
}

func TestLightsOutputsErrors(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL[:3], nil, colorimetry.Spectrum{})
	for _, am := range [][]Amount{
		{{"purple", 0.5}},
		{{"red", 1.2}},
		{{"red", math.NaN()}},
		{{"red", 0.2}, {"RED", 0.3}},
	} {
		if _, err := m.Outputs(am); err == nil {
			t.Errorf("%v accepted", am)
		}
	}
	// Relative scale: every channel at full drive gives Y = 100 (the
	// model's documented convention).
	c, err := m.Colour([]Amount{{"red", 1}, {"green", 1}, {"blue", 1}}, cie.CIE1931())
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbsOrRel(c.XYZ.Y, 100, 1e-12, 1e-12) {
		t.Errorf("full rig Y = %g, want 100", c.XYZ.Y)
	}
}

// TestLightsAbsolute: an absolute model reports the Km-weighted sums
// themselves (colorimetry's light weights, CIE 015:2018 §7.1 with
// Km = 683.002 lm/W), a relative one scales them to Y = 100 for the whole
// rig; both give the same chromaticity.
func TestLightsAbsolute(t *testing.T) {
	t.Parallel()
	var ch []LightChannel
	for _, b := range ltRGBAL[:3] {
		ch = append(ch, LightChannel{Name: b.name, Spectrum: ltGauss(t, b.centre, b.fwhm, b.peak)})
	}
	abs, err := NewLights(ch, colorimetry.Spectrum{}, true)
	if err != nil {
		t.Fatal(err)
	}
	rel := ltRig(t, ltRGBAL[:3], nil, colorimetry.Spectrum{})
	am := []Amount{{"red", 0.5}, {"green", 0.25}, {"blue", 1}}
	s, _ := abs.Spectrum(am)
	w, _ := colorimetry.NewLightWeights(cie.CIE1931(), colorimetry.Grid5nm)
	want, _ := w.XYZ(s)
	a, err := abs.Colour(am, cie.CIE1931())
	if err != nil {
		t.Fatal(err)
	}
	r, err := rel.Colour(am, cie.CIE1931())
	if err != nil {
		t.Fatal(err)
	}
	// Same sums, so equal to rounding (1e-12 relative).
	if !scalar.EqualWithinAbsOrRel(a.XYZ.Y, want.Y, 0, 1e-12) || !scalar.EqualWithinAbsOrRel(a.XY.X, r.XY.X, 0, 1e-12) || !scalar.EqualWithinAbsOrRel(a.XY.Y, r.XY.Y, 0, 1e-12) {
		t.Errorf("absolute %v (want Y %g), relative %v", a.XYZ, want.Y, r.XYZ)
	}
	if !abs.Absolute() || rel.Absolute() {
		t.Error("Absolute flags")
	}
}

func TestLightsSolveRejects(t *testing.T) {
	t.Parallel()
	m := ltRig(t, ltRGBAL[:3], nil, colorimetry.Spectrum{})
	for _, tc := range []LightTarget{
		{XY: colorimetry.XY{X: 0.6, Y: 0.5}},
		{XY: colorimetry.XY{X: math.NaN(), Y: 0.3}},
		{XY: colorimetry.XY{X: 0.3, Y: 0.3}, Y: -1},
		{XY: colorimetry.XY{X: 0.3, Y: 0.3}, Y: math.Inf(1)},
	} {
		if _, err := m.Solve(tc, LightSolveOptions{}); err == nil {
			t.Errorf("%+v accepted", tc)
		}
	}
}

// TestLightTargetCCTOutsideLocus checks that a CCT and Duv inside the
// range of CIE 015:2018 (1000–100 000 K, |Duv| ≤ 0.05) but off the chart
// is refused: at 1000 K the Planckian locus, at (x, y) ≈ (0.653, 0.344)
// (from memory), runs close to the red end of the spectrum locus, so Duv
// +0.05 leaves the chart, while Duv 0 and −0.05 stay inside.
func TestLightTargetCCTOutsideLocus(t *testing.T) {
	t.Parallel()
	obs := cie.CIE1931()
	if _, err := LightTargetCCT(obs, 1000, 0.05); !errors.Is(err, colorimetry.ErrOutOfGamut) {
		t.Errorf("1000 K, Duv +0.05: error %v, want ErrOutOfGamut", err)
	}
	for _, duv := range []float64{0, -0.05} {
		if _, err := LightTargetCCT(obs, 1000, duv); err != nil {
			t.Errorf("1000 K, Duv %+g: %v", duv, err)
		}
	}
}

// TestDisplayMatrixWhiteOutside checks that a white outside the primaries'
// triangle is reported as such, not as collinear primaries.
func TestDisplayMatrixWhiteOutside(t *testing.T) {
	t.Parallel()
	_, err := DisplayMatrix(colorimetry.XY{X: 0.64, Y: 0.33}, colorimetry.XY{X: 0.30, Y: 0.60},
		colorimetry.XY{X: 0.15, Y: 0.06}, colorimetry.XY{X: 0.7, Y: 0.25}, 1)
	if !errors.Is(err, ErrWhiteOutsidePrimaries) || errors.Is(err, ErrSingularPrimaries) {
		t.Errorf("white outside the triangle: %v", err)
	}
}
