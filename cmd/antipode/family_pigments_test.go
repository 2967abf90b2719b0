package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// fitDemoPigments fits the demo ladders into a temporary model file.
func fitDemoPigments(t *testing.T) string {
	t.Helper()
	model := filepath.Join(t.TempDir(), "paints.json")
	code, out, errs := runCLI(t, "", "fit", "pigments", "demo/paint_ladders.csv", "--out", model)
	if code != 0 {
		t.Fatalf("fit pigments: exit %d: %s", code, errs)
	}
	for _, want := range []string{"ky-deep-sea", "held out: 6 films", "wrote " + model} {
		if !strings.Contains(out, want) {
			t.Errorf("fit output lacks %q", want)
		}
	}
	return model
}

// TestPigmentsDemoRoundTrip runs the demo as a new user would: fit the
// ladders, solve the target, and check that the solve finds the recipe
// the demo generator mixed the target from (testdata/gen/make_paint_demo.py:
// white 0.86, ky-sunflower 0.075, ky-brick 0.045, ky-deep-sea 0.02). This
// is a round trip through invented demo data, not an outside check: the
// target was perturbed (1 % tilt, noise 0.0015) and the model refitted
// from noisy ladders, so the fractions may differ by a few thousandths
// (tol 0.005, judged from the noise; common practice, no source).
func TestPigmentsDemoRoundTrip(t *testing.T) {
	t.Parallel()
	model := fitDemoPigments(t)
	code, out, errs := runCLI(t, "", "solve", model, "--target", "demo/paint_target.csv", "--also", "A,F11", "--json")
	if code != 0 {
		t.Fatalf("solve: exit %d: %s", code, errs)
	}
	var sol struct {
		Recipes []struct {
			Amounts    map[string]float64  `json:"amounts"`
			DE00       float64             `json:"dE00"`
			Reachable  bool                `json:"reachable"`
			Warnings   []string            `json:"warnings"`
			Metamerism map[string]*float64 `json:"metamerism"`
			RMS        *float64            `json:"rms_spectral"`
		} `json:"recipes"`
	}
	if err := json.Unmarshal([]byte(out), &sol); err != nil {
		t.Fatal(err)
	}
	if len(sol.Recipes) < 2 {
		t.Fatalf("%d recipes", len(sol.Recipes))
	}
	r := sol.Recipes[0]
	want := map[string]float64{"ky-scenic-white": 0.86, "ky-sunflower": 0.075, "ky-brick": 0.045, "ky-deep-sea": 0.02}
	var sum float64
	for name, v := range r.Amounts {
		sum += v
		if math.Abs(v-want[name]) > 0.005 {
			t.Errorf("%s = %.4f, the generator used %.3f", name, v, want[name])
		}
	}
	// Mass fractions sum to 1 (round-off).
	if math.Abs(sum-1) > 1e-9 || len(r.Amounts) != 4 {
		t.Errorf("amounts %v sum to %g", r.Amounts, sum)
	}
	if !r.Reachable || r.DE00 > 0.5 || r.Warnings == nil || r.RMS == nil {
		t.Errorf("recipe: %+v", r)
	}
	if len(r.Metamerism) != 2 || r.Metamerism["A"] == nil || r.Metamerism["F11"] == nil {
		t.Errorf("metamerism keyed by --also: %v", r.Metamerism)
	}
	// Without --also, "metamerism" is present and null.
	_, out, _ = runCLI(t, "", "solve", model, "--target", "demo/paint_target.csv", "--json")
	var raw struct{ Recipes []map[string]any }
	if err := json.Unmarshal([]byte(out), &raw); err != nil {
		t.Fatal(err)
	}
	if v, ok := raw.Recipes[0]["metamerism"]; !ok || v != nil {
		t.Errorf("metamerism without --also: %v (present %v)", v, ok)
	}
	// The human output names the colorants and says reachable.
	_, out, _ = runCLI(t, "", "solve", model, "--target", "demo/paint_target.csv")
	for _, w := range []string{"1. ΔE00", "reachable", "ky-brick"} {
		if !strings.Contains(out, w) {
			t.Errorf("solve output lacks %q:\n%s", w, out)
		}
	}
}

// TestPigmentsCorrectChain corrects the demo trial with the solve's JSON
// and with a plain {"amounts"} file, and feeds the correct output back in
// (rounds chain). The demo trial was mixed with ky-brick 12 % stronger than
// the calibration (make_paint_demo.py), so the correction must lower
// ky-brick's share.
func TestPigmentsCorrectChain(t *testing.T) {
	t.Parallel()
	model := fitDemoPigments(t)
	dir := t.TempDir()
	_, out, errs := runCLI(t, "", "solve", model, "--target", "demo/paint_target.csv", "--json")
	recipe := filepath.Join(dir, "recipe.json")
	if err := os.WriteFile(recipe, []byte(out), 0o644); err != nil {
		t.Fatal(err)
	}
	var before struct {
		Recipes []struct{ Amounts map[string]float64 }
	}
	if err := json.Unmarshal([]byte(out), &before); err != nil {
		t.Fatal(err, errs)
	}
	code, out, errs := runCLI(t, "", "correct", model, "--recipe", recipe, "--trial", "demo/paint_trial.csv", "--target", "demo/paint_target.csv", "--json")
	if code != 0 {
		t.Fatalf("correct: exit %d: %s", code, errs)
	}
	var after struct {
		Recipes []struct {
			Amounts   map[string]float64 `json:"amounts"`
			TrialDE00 float64            `json:"trial_dE00"`
			Additions map[string]float64 `json:"additions_per_unit_batch"`
		}
	}
	if err := json.Unmarshal([]byte(out), &after); err != nil {
		t.Fatal(err)
	}
	a := after.Recipes[0]
	if !(a.TrialDE00 > 0.3) {
		t.Errorf("trial ΔE00 %g: the demo trial is visibly off", a.TrialDE00)
	}
	if !(a.Amounts["ky-brick"] < before.Recipes[0].Amounts["ky-brick"]) {
		t.Errorf("ky-brick %g → %g: the correction must reduce the over-strong colorant", before.Recipes[0].Amounts["ky-brick"], a.Amounts["ky-brick"])
	}
	if _, ok := a.Additions["ky-brick"]; ok {
		t.Errorf("additions include the colorant to reduce: %v", a.Additions)
	}
	// Chain: the correct output is a valid --recipe.
	next := filepath.Join(dir, "next.json")
	if err := os.WriteFile(next, []byte(out), 0o644); err != nil {
		t.Fatal(err)
	}
	plain := writeTemp(t, "plain.json", `{"amounts":{"ky-scenic-white":0.86,"ky-sunflower":0.075,"ky-brick":0.045,"ky-deep-sea":0.02}}`)
	for _, r := range []string{next, plain} {
		if code, out, errs := runCLI(t, "", "correct", model, "--recipe", r, "--trial", "demo/paint_trial.csv", "--target", "demo/paint_target.csv"); code != 0 || !strings.Contains(out, "corrected recipe") {
			t.Errorf("correct --recipe %s: exit %d: %s%s", r, code, out, errs)
		}
	}
}

// TestPigmentsNeutralizeAndMix checks the neutralize and mix commands on
// the demo model: ky-brick (a red) is neutralised best by a blue or a
// green, not by its neighbours in hue (common practice, no source: a
// complement lies across the hue circle), and mix prints CIELAB.
func TestPigmentsNeutralizeAndMix(t *testing.T) {
	t.Parallel()
	model := fitDemoPigments(t)
	code, out, errs := runCLI(t, "", "neutralize", model, "--paint", "ky-brick", "--json")
	if code != 0 {
		t.Fatalf("neutralize: exit %d: %s", code, errs)
	}
	var res struct {
		PaintChroma float64 `json:"paint_chroma"`
		Candidates  []struct {
			Colorant string  `json:"colorant"`
			Fraction float64 `json:"fraction"`
			Chroma   float64 `json:"residual_chroma"`
		} `json:"candidates"`
		Warnings []string `json:"warnings"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatal(err)
	}
	best := res.Candidates[0]
	if best.Colorant != "ky-deep-sea" && best.Colorant != "ky-moss" {
		t.Errorf("best neutraliser of ky-brick: %+v", best)
	}
	if !(best.Chroma < res.PaintChroma/3) || !(best.Fraction > 0 && best.Fraction < 1) {
		t.Errorf("residual chroma %g of paint chroma %g at fraction %g", best.Chroma, res.PaintChroma, best.Fraction)
	}
	if code, out, errs := runCLI(t, "", "neutralize", model, "--paint", "demo/paint_target.csv"); code != 0 || !strings.Contains(out, "matching recipe") {
		t.Errorf("neutralize a measured paint: exit %d: %s%s", code, out, errs)
	}
	code, out, errs = runCLI(t, "", "mix", model, "--amounts", "ky-scenic-white=0.9,ky-brick=0.1", "--json")
	if code != 0 {
		t.Fatalf("mix: exit %d: %s", code, errs)
	}
	var mx map[string]any
	if err := json.Unmarshal([]byte(out), &mx); err != nil {
		t.Fatal(err)
	}
	if a, ok := mx["a"].(float64); !ok || a <= 5 {
		t.Errorf("a tint of a red has a* = %v", mx["a"])
	}
}

// TestPigmentsHelpAndErrors checks the safety line at the end of every
// pigments help and that bad input gives one-line errors with exit 2.
func TestPigmentsHelpAndErrors(t *testing.T) {
	t.Parallel()
	model := fitDemoPigments(t)
	for _, args := range [][]string{
		{"fit", "pigments", "--help"},
		{"solve", model, "--help"},
		{"correct", "--help"},
		{"neutralize", "--help"},
		{"mix", model, "--help"},
	} {
		code, out, _ := runCLI(t, "", args...)
		lines := strings.Split(strings.TrimRight(out, "\n"), "\n")
		if code != 0 || !strings.Contains(lines[len(lines)-1], "antipode help cautions") || !strings.Contains(out, "Example") {
			t.Errorf("%v: exit %d, last line %q", args, code, lines[len(lines)-1])
		}
	}
	// A ladder of one point: colorant "ky-odd" measured at one fraction.
	one := writeTemp(t, "one.csv", "name,colorant,fraction,400,410,420\nw,white,1,0.8,0.8,0.8\nodd,ky-odd,0.1,0.3,0.4,0.5\n")
	bad := writeTemp(t, "bad.csv", "name,colorant,fraction,400,410,420\nw,white,1,0.8,0.8,0.8\nodd,ky-odd,lots,0.3,0.4,0.5\n")
	cols := writeTemp(t, "cols.csv", "nm,a\n400,0.1\n410,0.2\n420,0.3\n")
	for _, tc := range []struct {
		args []string
		want []string
	}{
		{[]string{"fit", "pigments", one, "--out", filepath.Join(t.TempDir(), "m.json")}, []string{"one.csv:3", "ky-odd", "one mass fraction"}},
		{[]string{"fit", "pigments", bad, "--out", filepath.Join(t.TempDir(), "m.json")}, []string{"bad.csv:3", "fraction"}},
		{[]string{"fit", "pigments", cols, "--out", filepath.Join(t.TempDir(), "m.json")}, []string{"rows layout"}},
		{[]string{"fit", "pigments", one}, []string{"--out"}},
		{[]string{"solve", model, "--lab", "62,18"}, []string{"--lab"}},
		{[]string{"solve", model}, []string{"--target"}},
		{[]string{"solve", model, "--target", "demo/paint_ladders.csv"}, []string{"48 spectra", "FILE:NAME"}},
		{[]string{"solve", model, "--lab", "60,10,10", "--metamerism-limit", "1"}, []string{"--also"}},
		{[]string{"mix", model, "--amounts", "chalk=1"}, []string{"chalk"}},
		{[]string{"neutralize", model, "--paint", "nothing-like-it"}, []string{"nothing-like-it"}},
		{[]string{"correct", model, "--recipe", one, "--trial", "demo/paint_trial.csv", "--target", "demo/paint_target.csv"}, []string{"one.csv"}},
		{[]string{"fit", "pigments", "demo/paint_ladders.csv", "--out", filepath.Join(t.TempDir(), "m.json"), "--k1", "0.04", "--refractive-index", "1.5"}, []string{"--k1"}},
	} {
		code, _, errs := runCLI(t, "", tc.args...)
		if code != exitBad || strings.Count(strings.TrimRight(errs, "\n"), "\n") != 0 {
			t.Errorf("%v: exit %d, stderr %q", tc.args, code, errs)
		}
		for _, w := range tc.want {
			if !strings.Contains(errs, w) {
				t.Errorf("%v: error %q lacks %q", tc.args, errs, w)
			}
		}
	}
}
