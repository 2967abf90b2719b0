package mixing

import (
	"bytes"
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/floats/scalar"
)

// checkFound checks a solve against a known recipe: ΔE00 below 0.01 (the
// issue's acceptance level for noise-free targets) and the true colorants
// found; a superset is accepted when every extra colorant's fraction is
// below 0.001.
func checkFound(t *testing.T, label string, sol Solution, truth map[string]float64) {
	t.Helper()
	r := sol.Recipes[0]
	if r.DE00 >= 0.01 || !r.Reachable {
		t.Errorf("%s: ΔE00 %.3g, reachable %v", label, r.DE00, r.Reachable)
	}
	got := map[string]float64{}
	var sum float64
	for _, a := range r.Amounts {
		got[a.Name] = a.Value
		sum += a.Value
	}
	// Mass fractions sum to 1 (round-off of the white's 1 − Σ others).
	if math.Abs(sum-1) > 1e-12 {
		t.Errorf("%s: fractions sum to %.15g", label, sum)
	}
	for name, v := range truth {
		if v > 0 && got[name] == 0 {
			t.Errorf("%s: %s (true fraction %.4g) missing from %v", label, name, v, r.Amounts)
		}
	}
	for name, v := range got {
		if truth[name] == 0 && v >= 0.001 {
			t.Errorf("%s: %s at %.4g is not in the true recipe %v", label, name, v, truth)
		}
	}
}

// TestRecipeBench solves the 200 targets of the shared benchmark
// (shared/bench/data, made by km_recipe.py's model from the true recipes
// in km_truth.json): every target to ΔE00 < 0.01 with the true colorants.
// The Python reference reached a median ΔE00 of 7e-11 and found every
// true set (shared/bench/README.md, Results).
func TestRecipeBench(t *testing.T) {
	t.Parallel()
	d := loadBench(t)
	var worst float64
	for i, tgt := range d.targets {
		sol, err := d.model.Recipe(tgt, RecipeOptions{})
		if err != nil {
			t.Fatalf("target %d: %v", i, err)
		}
		truth := map[string]float64{}
		for j, c := range d.truth[i] {
			truth[d.model.Colorants[j].Name] = c
		}
		checkFound(t, "bench target "+itoa(i), sol, truth)
		worst = math.Max(worst, sol.Recipes[0].DE00)
	}
	t.Logf("largest ΔE00 over %d targets: %.3g", len(d.targets), worst)
}

func itoa(i int) string { return strconv.Itoa(i) }

// TestRecipeSynthetic is the self-contained version: 40 targets mixed by
// the synthetic 8-colorant model from random recipes of the white and 1–3
// others (seeded), solved back to ΔE00 < 0.01 with the true colorants.
func TestRecipeSynthetic(t *testing.T) {
	t.Parallel()
	p := synthModel(8)
	rng := rand.New(rand.NewPCG(3, 4))
	for i := range 40 {
		rec := randomRecipe(rng, p, 1+i%3)
		truth := map[string]float64{}
		for _, a := range rec {
			truth[a.Name] = a.Value
		}
		sol, err := p.Recipe(mustReflectance(t, p, rec), RecipeOptions{})
		if err != nil {
			t.Fatalf("target %d: %v", i, err)
		}
		checkFound(t, "synthetic target "+itoa(i), sol, truth)
		if len(sol.Recipes) < 2 {
			t.Errorf("target %d: %d recipes; want ranked alternatives", i, len(sol.Recipes))
		}
		for k := 1; k < len(sol.Recipes); k++ {
			// Alternatives are distinct colorant sets.
			if sameSet(sol.Recipes[k].Amounts, sol.Recipes[0].Amounts) {
				t.Errorf("target %d: alternative %d repeats the first set", i, k)
			}
		}
	}
}

func sameSet(a, b []Amount) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].Name != b[i].Name {
			return false
		}
	}
	return true
}

// TestRecipeLab solves a CIELAB target (the Lab under D65 of a known
// mix): ΔE00 < 0.01 and no metamerism or spectral keys (null).
func TestRecipeLab(t *testing.T) {
	t.Parallel()
	p := synthModel(6)
	r := mustReflectance(t, p, []Amount{{"white", 0.9}, {"amber", 0.06}, {"ultramarine", 0.04}})
	sc := NewScorer(cie.CIE1931(), cie.D65(), "D65")
	lab, err := sc.ObjectLab(r)
	if err != nil {
		t.Fatal(err)
	}
	sol, err := p.RecipeLab(lab, RecipeOptions{Also: []colorimetry.NamedIlluminant{{Name: "A", Spectrum: cie.A()}}})
	if err != nil {
		t.Fatal(err)
	}
	rec := sol.Recipes[0]
	if rec.DE00 >= 0.01 {
		t.Errorf("ΔE00 %g", rec.DE00)
	}
	// The reported ΔE00 is the library's: recompute from the recipe.
	got, err := sc.ObjectLab(mustReflectance(t, p, rec.Amounts))
	if err != nil {
		t.Fatal(err)
	}
	if de := colorimetry.DeltaE2000(lab, got); !scalar.EqualWithinAbsOrRel(de, rec.DE00, 1e-9, 1e-6) {
		t.Errorf("reported ΔE00 %g, recomputed %g", rec.DE00, de)
	}
	if rec.Extra["metamerism"] != nil || rec.Extra["rms_spectral"] != nil {
		t.Errorf("Lab target: extra %v", rec.Extra)
	}
	if !hasWarning(rec.Warnings, "metamerism") {
		t.Errorf("no warning that metamerism is undefined: %q", rec.Warnings)
	}
}

// TestRecipeUnreachable asks for a colour no mix of the library can make
// (a spectrally pure, very saturated green brighter than the white): not
// an error but the nearest recipe, Reachable false, with a warning.
func TestRecipeUnreachable(t *testing.T) {
	t.Parallel()
	p := synthModel(4) // lemon, amber, vermilion, rose: no green, no blue
	v := make([]float64, gridKM.N)
	for i := range v {
		nm := gridKM.Wavelength(i)
		v[i] = 0.05 + 0.9*math.Exp(-0.5*math.Pow((nm-520)/20, 2))
	}
	target, _ := colorimetry.NewSpectrumOnGrid(gridKM, v, colorimetry.Options{})
	sol, err := p.Recipe(target, RecipeOptions{})
	if err != nil {
		t.Fatal(err)
	}
	r := sol.Recipes[0]
	if r.Reachable || r.DE00 < 5 || !hasWarning(r.Warnings, "not reachable") {
		t.Errorf("unreachable target: reachable %v, ΔE00 %g, warnings %q", r.Reachable, r.DE00, r.Warnings)
	}
	// The nearest: no alternative is nearer by more than the spectral
	// tie-break can account for.
	for _, a := range sol.Recipes[1:] {
		if a.DE00 < r.DE00-0.5 {
			t.Errorf("alternative %v is nearer (%g) than the first (%g)", a.Amounts, a.DE00, r.DE00)
		}
	}
}

// TestRecipeClampedTarget gives a target measured as 0 and as 1 at some
// wavelengths (a dead detector pixel, a saturated one): K/S would be
// infinite or zero there; the solve clamps, warns and still answers.
func TestRecipeClampedTarget(t *testing.T) {
	t.Parallel()
	p := synthModel(4)
	v := mustReflectance(t, p, []Amount{{"white", 0.9}, {"lemon", 0.1}}).Values(nil)
	v[0], v[30] = 0, 1
	target, _ := colorimetry.NewSpectrumOnGrid(gridKM, v, colorimetry.Options{})
	sol, err := p.Recipe(target, RecipeOptions{})
	if err != nil {
		t.Fatal(err)
	}
	r := sol.Recipes[0]
	if !hasWarning(r.Warnings, "clamped") || !hasWarning(r.Warnings, "400 nm") {
		t.Errorf("warnings %q", r.Warnings)
	}
	if math.IsNaN(r.DE00) || r.DE00 > 5 {
		t.Errorf("ΔE00 %g", r.DE00)
	}
}

// TestRecipeNonConvergence caps the iterations at 1: the solve returns
// an error carrying the best recipe found.
func TestRecipeNonConvergence(t *testing.T) {
	t.Parallel()
	p := synthModel(6)
	target := mustReflectance(t, p, []Amount{{"white", 0.8}, {"lemon", 0.1}, {"rose", 0.05}, {"ultramarine", 0.05}})
	sol, err := p.Recipe(target, RecipeOptions{MaxIterations: 1})
	var ce *RecipeConvergenceError
	if !errors.As(err, &ce) {
		t.Fatalf("error %v, want *RecipeConvergenceError", err)
	}
	if len(ce.Best.Recipes) == 0 || len(sol.Recipes) == 0 || !strings.Contains(err.Error(), "white=") {
		t.Errorf("the error carries no recipe: %v", err)
	}
}

// TestRecipeMetamerism checks the metamerism output and constraint. The
// indices in Extra equal colorimetry.MetamerismIndex of the recipe's
// spectrum against the target (the library function the issue names), and
// a limit steers the solve to a less metameric recipe.
func TestRecipeMetamerism(t *testing.T) {
	t.Parallel()
	p := synthModel(8)
	// A target the library can only match metamerically: a flat grey-ish
	// beige with a smooth spectrum unlike any mix.
	v := make([]float64, gridKM.N)
	for i := range v {
		v[i] = 0.35 + 0.25*float64(i)/float64(gridKM.N-1)
	}
	target, _ := colorimetry.NewSpectrumOnGrid(gridKM, v, colorimetry.Options{})
	f11, err := cie.Illuminant("F11")
	if err != nil {
		t.Fatal(err)
	}
	also := []colorimetry.NamedIlluminant{{Name: "A", Spectrum: cie.A()}, {Name: "F11", Spectrum: f11}}
	sol, err := p.Recipe(target, RecipeOptions{Also: also})
	if err != nil {
		t.Fatal(err)
	}
	r := sol.Recipes[0]
	mi, ok := r.Extra["metamerism"].(map[string]float64)
	if !ok || len(mi) != 2 {
		t.Fatalf("metamerism %v", r.Extra["metamerism"])
	}
	want, err := colorimetry.MetamerismIndex(target, mustReflectance(t, p, r.Amounts), cie.CIE1931(), cie.D65(), also, colorimetry.ComputationGrid(gridKM))
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range want {
		// The recipe's amounts are rounded to nothing; round-off only.
		if !scalar.EqualWithinAbsOrRel(mi[w.Illuminant], w.Index, 1e-9, 1e-9) {
			t.Errorf("MI(%s) = %g, MetamerismIndex %g", w.Illuminant, mi[w.Illuminant], w.Index)
		}
	}
	worst := math.Max(mi["A"], mi["F11"])
	if worst < 0.3 {
		t.Skipf("the test target is not metameric enough (MI %g) to test the constraint", worst)
	}
	limit := 0.6 * worst
	con, err := p.Recipe(target, RecipeOptions{Also: also, MetamerismLimit: limit})
	if err != nil {
		t.Fatal(err)
	}
	cm := con.Recipes[0].Extra["metamerism"].(map[string]float64)
	cw := math.Max(cm["A"], cm["F11"])
	if cw > limit && !hasWarning(con.Recipes[0].Warnings, "exceeds the limit") {
		t.Errorf("limit %g: MI %g without a warning", limit, cw)
	}
	if cw >= worst {
		t.Errorf("the limit did not lower the metamerism index: %g → %g", worst, cw)
	}
	t.Logf("MI %.3g unconstrained (ΔE00 %.3g), %.3g with limit %.3g (ΔE00 %.3g)", worst, r.DE00, cw, limit, con.Recipes[0].DE00)
	// Without --also the key is present and null.
	plain, err := p.Recipe(target, RecipeOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if v, ok := plain.Recipes[0].Extra["metamerism"]; !ok || v != nil {
		t.Errorf("metamerism without secondary illuminants: %v, %v", v, ok)
	}
}

// TestRecipeSpectral checks spectral matching: a target mixed by the
// model is matched spectrally exactly (RMS < 1e-6) with its colorants.
func TestRecipeSpectral(t *testing.T) {
	t.Parallel()
	p := synthModel(7)
	truth := []Amount{{"white", 0.85}, {"amber", 0.1}, {"cyan", 0.05}}
	sol, err := p.Recipe(mustReflectance(t, p, truth), RecipeOptions{Spectral: true})
	if err != nil {
		t.Fatal(err)
	}
	r := sol.Recipes[0]
	if r.Extra["match"] != "spectral" || r.Extra["rms_spectral"].(float64) > 1e-6 {
		t.Errorf("spectral match: %v", r.Extra)
	}
	checkFound(t, "spectral", sol, map[string]float64{"white": 0.85, "amber": 0.1, "cyan": 0.05})
	if _, err := p.RecipeLab(colorimetry.Lab{L: 50}, RecipeOptions{Spectral: true}); err == nil {
		t.Error("spectral matching of a Lab target accepted")
	}
}

// TestCorrect checks the correction loop against a deliberately
// mis-calibrated model: the "paint shop" mixes with a true model whose K
// and S differ from the model's by up to 10 % per colorant (seeded), and
// the corrected recipe reaches ΔE00 < 0.5 within three rounds (the
// issue's acceptance level) on every target.
func TestCorrect(t *testing.T) {
	t.Parallel()
	model := synthModel(6)
	rng := rand.New(rand.NewPCG(11, 12))
	sc := NewScorer(cie.CIE1931(), cie.D65(), "D65")
	for i := range 12 {
		truthModel := perturbed(model, 0.10, uint64(100+i))
		target := mustReflectance(t, model, randomRecipe(rng, model, 1+i%3))
		sol, err := model.Recipe(target, RecipeOptions{})
		if err != nil {
			t.Fatal(err)
		}
		rec := sol.Recipes[0].Amounts
		first := -1.0
		var de float64
		for round := 0; round <= 3; round++ {
			trial := mustReflectance(t, truthModel, rec)
			if de, err = sc.ObjectDE00(target, trial); err != nil {
				t.Fatal(err)
			}
			if round == 0 {
				first = de
			}
			if de < 0.5 || round == 3 {
				break
			}
			c, err := model.Correct(rec, trial, target, RecipeOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if !scalar.EqualWithinAbsOrRel(c.TrialDE00, de, 1e-6, 1e-6) {
				t.Errorf("target %d: TrialDE00 %g, measured %g", i, c.TrialDE00, de)
			}
			rec = c.Recipe.Amounts
		}
		if de >= 0.5 {
			t.Errorf("target %d: ΔE00 %.3g after three corrections (first trial %.3g)", i, de, first)
		}
	}
}

// TestCorrectAdditions checks the additions to a trial batch: the batch
// plus the additions has the corrected recipe's proportions (arithmetic).
func TestCorrectAdditions(t *testing.T) {
	t.Parallel()
	model := synthModel(4)
	truthModel := perturbed(model, 0.1, 5)
	rec := []Amount{{"white", 0.9}, {"lemon", 0.06}, {"rose", 0.04}}
	target := mustReflectance(t, model, rec)
	c, err := model.Correct(rec, mustReflectance(t, truthModel, rec), target, RecipeOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if c.Additions == nil {
		t.Skipf("correction drops a colorant: %q", c.Recipe.Warnings)
	}
	total := map[string]float64{}
	var mass float64
	for _, a := range rec {
		total[a.Name] += a.Value
		mass += a.Value
	}
	for _, a := range c.Additions {
		if a.Value < 0 {
			t.Errorf("negative addition %v", a)
		}
		total[a.Name] += a.Value
		mass += a.Value
	}
	for _, a := range c.Recipe.Amounts {
		if !scalar.EqualWithinAbsOrRel(total[a.Name]/mass, a.Value, 1e-12, 1e-9) {
			t.Errorf("%s: batch + additions %g, corrected %g", a.Name, total[a.Name]/mass, a.Value)
		}
	}
}

// TestNeutralise builds a colorant whose absorption complements the
// paint's so that their 1:1 mix has the same K and S at every wavelength:
// a spectrally flat film, which has a* = b* = 0 by the definition of
// CIELAB relative to the illuminant's white (ISO/CIE 11664-4). The
// neutraliser search must find it, at fraction 0.5, with residual chroma
// ~0.
func TestNeutralise(t *testing.T) {
	t.Parallel()
	p := synthModel(3)
	paint := p.Colorants[2] // amber
	comp := Colorant{Name: "complement", K: make([]float64, gridKM.N), S: make([]float64, gridKM.N)}
	var kmax float64
	for _, k := range paint.K {
		kmax = math.Max(kmax, k)
	}
	for l := range comp.K {
		comp.K[l] = kmax + 0.5 - paint.K[l]
		comp.S[l] = 0.6 - paint.S[l]
	}
	p.Colorants = append(p.Colorants, comp)
	res, err := p.Neutralise("amber", NeutralOptions{})
	if err != nil {
		t.Fatal(err)
	}
	best := res.Candidates[0]
	// Golden section to 1e-12 in t around a minimum where chroma is
	// linear in |t − 0.5|: tol 1e-6 on t, 1e-4 on C*ab.
	if best.Colorant != "complement" || math.Abs(best.Fraction-0.5) > 1e-6 || best.Chroma > 1e-4 || !best.Interior {
		t.Errorf("best neutraliser %+v", best)
	}
	if !scalar.EqualWithinAbsOrRel(best.Ratio, 1, 1e-5, 1e-5) {
		t.Errorf("ratio %g, want 1", best.Ratio)
	}
	if res.PaintChroma < 20 {
		t.Errorf("paint chroma %g", res.PaintChroma)
	}
	// A measured paint: the same amber, as a spectrum.
	ms, err := p.NeutraliseSpectrum("sample", mustReflectance(t, p, []Amount{{"amber", 1}}), NeutralOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if ms.Candidates[0].Colorant != "complement" || ms.Candidates[0].Chroma > 0.05 || ms.Recipe == nil {
		t.Errorf("measured paint: %+v (recipe %v)", ms.Candidates[0], ms.Recipe)
	}
	if _, err := p.Neutralise("nope", NeutralOptions{}); err == nil || !strings.Contains(err.Error(), "nope") {
		t.Errorf("unknown paint: %v", err)
	}
}

// TestPigmentsFile round-trips a model through Save and Load and checks
// that Load validates.
func TestPigmentsFile(t *testing.T) {
	t.Parallel()
	p := synthModel(3)
	fit, err := FitPigments(synthLadders(t, p, ladderFractions, 0.001, 9, true), FitOptions{Surface: p.Surface})
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := Save(&b, fit.Model); err != nil {
		t.Fatal(err)
	}
	m, err := Load(bytes.NewReader(b.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	q, ok := m.(*Pigments)
	if !ok || q.Kind() != "pigments" {
		t.Fatalf("loaded %T", m)
	}
	if q.White != "white" || q.Surface != fit.Model.Surface || !q.Grid.Equal(p.Grid) || q.Fit == nil || q.Fit.HeldOut == nil {
		t.Errorf("round trip: %+v", q)
	}
	for i, c := range q.Colorants {
		for l := range c.K {
			if c.K[l] != fit.Model.Colorants[i].K[l] || c.S[l] != fit.Model.Colorants[i].S[l] {
				t.Fatalf("%s at %d: K, S changed in the round trip", c.Name, l)
			}
		}
	}
	for _, bad := range []struct{ from, to, want string }{
		{`"white": "white"`, `"white": "chalk"`, "chalk"},
		{`"specular": "included"`, `"specular": "sideways"`, "sideways"},
		{`"k2": 0.6`, `"k2": 1.6`, "k2"},
		{`"n": 31`, `"n": 30`, "30 wavelengths"},
	} {
		s := strings.Replace(b.String(), bad.from, bad.to, 1)
		if s == b.String() {
			t.Fatalf("%q not in the file", bad.from)
		}
		if _, err := Load(strings.NewReader(s)); err == nil || !strings.Contains(err.Error(), bad.want) {
			t.Errorf("%s: error %v", bad.to, err)
		}
	}
	neg := synthModel(2)
	neg.Colorants[1].K[3] = -0.1
	if err := neg.Validate(); !errors.Is(err, ErrPigments) || !strings.Contains(err.Error(), "430 nm") {
		t.Errorf("negative K: %v", err)
	}
}

// benchmarkLibrary returns a library of the white and 12 chromatic
// colorants with targets: the shared benchmark's 6 chromatic colorants
// plus 6 synthetic ones when the shared data are present, else the 12
// synthetic colorants with synthetic targets.
func benchmarkLibrary(tb testing.TB) (*Pigments, []colorimetry.Spectrum, string) {
	if d := loadBenchQuiet(); d != nil {
		p := *d.model
		p.Colorants = append([]Colorant(nil), d.model.Colorants...)
		for _, s := range synthShapes[:6] {
			p.Colorants = append(p.Colorants, s.colorant(p.Grid))
		}
		return &p, d.targets[:20], "shared"
	}
	p := synthModel(12)
	rng := rand.New(rand.NewPCG(1, 1))
	var ts []colorimetry.Spectrum
	for i := range 20 {
		ts = append(ts, mustReflectance(tb, p, randomRecipe(rng, p, 1+i%3)))
	}
	return p, ts, "synthetic"
}

// BenchmarkRecipe times one recipe search of the white + 3 from a library
// of 12 chromatic colorants (C(12, 3) = 220 combinations); the issue's
// budget is 50 ms per target on one core. It reports ms/target.
func BenchmarkRecipe(b *testing.B) {
	p, targets, _ := benchmarkLibrary(b)
	b.ReportAllocs()
	b.ResetTimer()
	n := 0
	for range b.N {
		sol, err := p.Recipe(targets[n%len(targets)], RecipeOptions{})
		if err != nil {
			b.Fatal(err)
		}
		sinkDE = sol.Recipes[0].DE00
		n++
	}
	b.ReportMetric(float64(b.Elapsed().Milliseconds())/float64(b.N), "ms/target")
}

var sinkDE float64
