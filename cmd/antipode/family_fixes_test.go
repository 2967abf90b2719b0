package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/mixing"
	"gonum.org/v1/gonum/floats/scalar"
)

// Tests for the fixes to the model commands after the new user's review:
// percent transmittance in fit dyes, the units of the halftone coverage
// flags, correct's recipe checks, neutralize's criterion, the wording of
// solve, and the generic help of mix, solve and plot.

// percentCopy writes a copy of the rows-layout CSV at path with every
// wavelength column multiplied by 100 (percent), the other columns and
// the comment lines as they are.
func percentCopy(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var out strings.Builder
	var spectral []bool
	for line := range strings.SplitSeq(strings.TrimRight(string(b), "\n"), "\n") {
		if strings.HasPrefix(line, "#") {
			out.WriteString(line + "\n")
			continue
		}
		f := strings.Split(line, ",")
		if spectral == nil {
			spectral = make([]bool, len(f))
			for i, h := range f {
				_, err := strconv.ParseFloat(h, 64)
				spectral[i] = err == nil
			}
			out.WriteString(line + "\n")
			continue
		}
		for i := range f {
			if spectral[i] {
				v, err := strconv.ParseFloat(f[i], 64)
				if err != nil {
					t.Fatalf("%s: %q: %v", path, f[i], err)
				}
				f[i] = strconv.FormatFloat(100*v, 'g', -1, 64)
			}
		}
		out.WriteString(strings.Join(f, ",") + "\n")
	}
	return writeTemp(t, "pct-"+filepath.Base(path), out.String())
}

// modelNumbers flattens the "model" object of a model file into path →
// number (strings and booleans as text), to compare two models.
func modelNumbers(t *testing.T, path string) map[string]any {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	flat := map[string]any{}
	var walk func(at string, v any)
	walk = func(at string, v any) {
		switch x := v.(type) {
		case map[string]any:
			for k, y := range x {
				walk(at+"."+k, y)
			}
		case []any:
			for i, y := range x {
				walk(fmt.Sprintf("%s[%d]", at, i), y)
			}
		default:
			flat[at] = x
		}
	}
	walk("model", doc["model"])
	return flat
}

// TestFitDyesPercent checks finding 1: fit dyes on the demo dilutions in
// percent transmittance must give the model of the fraction original,
// whether the scale is detected or given, and say so. The reference is
// the fit of the original file: ×100 then ×0.01 changes a value by at most
// an ulp or two, which the least-squares fit carries to about 1e-12
// relative (seen: 2e-12 on a ΔE00), so 1e-9 relative (1e-12 absolute for
// values near 0) leaves room and still catches any scale error.
func TestFitDyesPercent(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	pct := percentCopy(t, "demo/dyes_dilutions.csv")
	ref := filepath.Join(dir, "ref.json")
	if code, _, errs := runCLI(t, "", "fit", "dyes", "demo/dyes_dilutions.csv", "--out", ref); code != 0 {
		t.Fatalf("fit the original: exit %d: %s", code, errs)
	}
	want := modelNumbers(t, ref)
	for _, tc := range []struct {
		name      string
		extra     []string
		warnsPct  bool
		sameModel bool
	}{
		{"detected", nil, true, true},
		{"--scale percent", []string{"--scale", "percent"}, false, true},
		{"--scale fraction", []string{"--scale", "fraction"}, false, false},
	} {
		out := filepath.Join(dir, strings.NewReplacer(" ", "", "-", "").Replace(tc.name)+".json")
		args := append([]string{"fit", "dyes", pct, "--out", out, "--json"}, tc.extra...)
		code, stdout, errs := runCLI(t, "", args...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tc.name, code, errs)
		}
		var rep struct {
			Fit struct {
				Warnings []string `json:"warnings"`
			} `json:"fit"`
		}
		if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		warned := false
		for _, w := range rep.Fit.Warnings {
			// The wording of fit pigments and fit halftone (recordsScale).
			if strings.HasPrefix(w, "transmittance taken as percent (line 4 reaches ") && strings.HasSuffix(w, " > 1.5); say --scale to choose") {
				warned = true
			}
		}
		if warned != tc.warnsPct {
			t.Errorf("%s: percent warning %v, want %v: %q", tc.name, warned, tc.warnsPct, rep.Fit.Warnings)
		}
		got := modelNumbers(t, out)
		diffs := 0
		for k, w := range want {
			wf, okw := w.(float64)
			gf, okg := got[k].(float64)
			same := got[k] == w
			if okw && okg {
				same = scalar.EqualWithinAbsOrRel(gf, wf, 1e-12, 1e-9)
			}
			if !same {
				diffs++
				if tc.sameModel && diffs <= 3 {
					t.Errorf("%s: %s = %v, the fraction file's fit gives %v", tc.name, k, got[k], w)
				}
			}
		}
		if !tc.sameModel && diffs == 0 {
			t.Errorf("%s: percent values read as fractions gave the fraction model", tc.name)
		}
	}
	code, _, errs := runCLI(t, "", "fit", "dyes", pct, "--out", filepath.Join(dir, "x.json"), "--scale", "pct")
	if code != exitBad || !strings.Contains(errs, "--scale pct: want fraction or percent") {
		t.Errorf("--scale pct: exit %d, %q", code, errs)
	}
}

// TestSolveDyesPercent checks that solve on a dyes model gives the same
// recipe for the demo target in fraction and in percent (with the percent
// warning), and that the model fitted on percent data solves like the
// original: the review saw 0.245 g/L of amber from the model fitted on
// percent read as fractions, where the right model gives 0.036. Both
// solves run the same code on inputs equal to an ulp, so 1e-9 relative.
func TestSolveDyesPercent(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	ref, fromPct := filepath.Join(dir, "ref.json"), filepath.Join(dir, "pct.json")
	if code, _, errs := runCLI(t, "", "fit", "dyes", "demo/dyes_dilutions.csv", "--out", ref); code != 0 {
		t.Fatalf("fit: exit %d: %s", code, errs)
	}
	if code, _, errs := runCLI(t, "", "fit", "dyes", percentCopy(t, "demo/dyes_dilutions.csv"), "--out", fromPct); code != 0 {
		t.Fatalf("fit percent: exit %d: %s", code, errs)
	}
	targetPct := writeTemp(t, "target.csv", columnsFromTarget(t))
	type sol struct {
		Recipes []struct {
			Amounts  map[string]float64 `json:"amounts"`
			Warnings []string           `json:"warnings"`
		} `json:"recipes"`
	}
	solve := func(model, target string) sol {
		t.Helper()
		code, out, errs := runCLI(t, "", "solve", model, "--target", target, "--json")
		if code != 0 {
			t.Fatalf("solve %s %s: exit %d: %s", model, target, code, errs)
		}
		var s sol
		if err := json.Unmarshal([]byte(out), &s); err != nil {
			t.Fatal(err)
		}
		return s
	}
	want := solve(ref, "demo/dyes_target.csv")
	if a := want.Recipes[0].Amounts["kestrel-amber-dye"]; !(a > 0.03 && a < 0.04) {
		t.Fatalf("amber %g g/L for the demo target; the demo generator used about 0.036", a)
	}
	for _, tc := range []struct {
		name, model, target, warn string
	}{
		{"percent model", fromPct, "demo/dyes_target.csv", ""},
		{"percent target", ref, targetPct, "values taken as percent"},
	} {
		got := solve(tc.model, tc.target)
		for n, w := range want.Recipes[0].Amounts {
			if g := got.Recipes[0].Amounts[n]; !scalar.EqualWithinAbsOrRel(g, w, 1e-12, 1e-9) {
				t.Errorf("%s: %s = %g, want %g", tc.name, n, g, w)
			}
		}
		if tc.warn != "" && !strings.Contains(strings.Join(got.Recipes[0].Warnings, "\n"), tc.warn) {
			t.Errorf("%s: warnings %q lack %q", tc.name, got.Recipes[0].Warnings, tc.warn)
		}
	}
}

// columnsFromTarget returns the demo dyes target (columns layout) in
// percent.
func columnsFromTarget(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile("demo/dyes_target.csv")
	if err != nil {
		t.Fatal(err)
	}
	var out strings.Builder
	for line := range strings.SplitSeq(strings.TrimRight(string(b), "\n"), "\n") {
		f := strings.Split(line, ",")
		if v, err := strconv.ParseFloat(f[len(f)-1], 64); err == nil && !strings.HasPrefix(line, "#") && len(f) == 2 {
			f[1] = strconv.FormatFloat(100*v, 'g', -1, 64)
		}
		out.WriteString(strings.Join(f, ",") + "\n")
	}
	return out.String()
}

// TestHalftoneCoverageUnits checks finding 10: the coverage flags say
// "fractions 0–1" in their help, and a value that looks like percent is
// refused with its conversion.
func TestHalftoneCoverageUnits(t *testing.T) {
	t.Parallel()
	model, _ := htCLIFitDemo(t)
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"mix", model, "--amounts", "c=12.2,m=0.3"}, "--amounts: c=12.2 is above 1: coverages are fractions 0–1 (12.2 % is 0.122)"},
		{[]string{"solve", model, "--lab", "50,0,0", "--fix", "k=50"}, "--fix: k=50 is above 1: coverages are fractions 0–1 (50 % is 0.5)"},
		{[]string{"solve", model, "--lab", "50,0,0", "--ink-max", "c=95"}, "--ink-max: c=95 is above 1: coverages are fractions 0–1 (95 % is 0.95)"},
		{[]string{"solve", model, "--lab", "50,0,0", "--fix", "k=-0.1"}, "--fix: k=-0.1 is outside 0–1: coverages are fractions 0–1"},
		{[]string{"solve", model, "--lab", "50,0,0", "--ink-max", "c=250"}, "--ink-max: c=250 is outside 0–1: coverages are fractions 0–1"},
	} {
		code, _, errs := runCLI(t, "", tc.args...)
		if code != exitBad || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: exit %d, %q; want %q", tc.args, code, errs, tc.want)
		}
	}
	// The same amounts as fractions are taken.
	if code, _, errs := runCLI(t, "", "mix", model, "--amounts", "c=0.122,m=0.3"); code != 0 {
		t.Errorf("mix c=0.122: exit %d: %s", code, errs)
	}
	for _, tc := range []struct {
		args []string
		flag string
	}{
		{[]string{"mix", model, "--help"}, "--amounts"},
		{[]string{"solve", model, "--help"}, "--fix"},
		{[]string{"solve", model, "--help"}, "--ink-max"},
	} {
		_, out, _ := runCLI(t, "", tc.args...)
		i := strings.Index(out, "  "+tc.flag+" ")
		if i < 0 {
			t.Fatalf("%v: no %s in\n%s", tc.args, tc.flag, out)
		}
		entry, _, _ := strings.Cut(out[i+3:], "\n  -")
		if !strings.Contains(entry, "fractions 0–1") {
			t.Errorf("%v: %s help %q does not say fractions 0–1", tc.args, tc.flag, entry)
		}
	}
}

// TestCorrectRecipeChecks checks finding 20: a recipe whose fractions do
// not sum to 1 is warned about and shown as the proportions used, and an
// unknown colorant is reported against the recipe file.
func TestCorrectRecipeChecks(t *testing.T) {
	t.Parallel()
	model := fitDemoPigments(t)
	short := writeTemp(t, "short.json", `{"amounts":{"ky-brick":0.1,"ky-scenic-white":0.2}}`)
	whole := writeTemp(t, "whole.json", `{"amounts":{"ky-brick":0.333333333333,"ky-scenic-white":0.666666666667}}`)
	run := func(recipe string, extra ...string) (int, string, string) {
		args := append([]string{"correct", model, "--recipe", recipe, "--trial", "demo/paint_trial.csv", "--target", "demo/paint_target.csv"}, extra...)
		return runCLI(t, "", args...)
	}
	code, out, errs := run(short)
	if code != 0 {
		t.Fatalf("correct: exit %d: %s", code, errs)
	}
	// Said once, in the header (the JSON keeps the library's warning).
	if want := `(the mass fractions sum to 0.3; taken as proportions, which "was" below shows)`; !strings.Contains(out, want) {
		t.Errorf("output lacks %q:\n%s", want, out)
	}
	if strings.Count(out, "sum to 0.3") != 1 {
		t.Errorf("the sum note is not said exactly once:\n%s", out)
	}
	if _, js, _ := run(short, "--json"); !strings.Contains(js, "the recipe's mass fractions sum to 0.3; taken as proportions") {
		t.Errorf("JSON lacks the sum warning:\n%s", js)
	}
	// "was" holds the proportions 1/3 and 2/3, and the corrected recipe
	// is the one of the same recipe given as fractions summing to 1 (an
	// opaque film depends only on the ratios).
	_, outWhole, _ := run(whole)
	rowOf := func(text, name string) []string {
		for line := range strings.SplitSeq(text, "\n") {
			if f := strings.Fields(line); len(f) == 4 && f[0] == name {
				return f
			}
		}
		t.Fatalf("no row %s in\n%s", name, text)
		return nil
	}
	for _, n := range []string{"ky-brick", "ky-scenic-white"} {
		a, b := rowOf(out, n), rowOf(outWhole, n)
		if a[1] != b[1] || a[2] != b[2] || a[3] != b[3] {
			t.Errorf("%s: sum 0.3 gives %v, sum 1 gives %v", n, a, b)
		}
	}
	if r := rowOf(out, "ky-brick"); r[1] != "0.33333" {
		t.Errorf("ky-brick was %s, want 0.33333", r[1])
	}
	_, js, _ := run(short, "--json")
	if !strings.Contains(js, "sum to 0.3; taken as proportions") {
		t.Errorf("JSON lacks the sum warning:\n%s", js)
	}

	bad := writeTemp(t, "bad.json", `{"amounts":{"ky-nope":0.1,"ky-scenic-white":0.9}}`)
	code, _, errs = run(bad)
	if code != exitBad || !strings.HasPrefix(errs, "antipode correct: "+bad+`: no colorant "ky-nope" in the model (it has `) || strings.Contains(errs, "paint_trial") {
		t.Errorf("unknown colorant: exit %d, %q", code, errs)
	}
	white := writeTemp(t, "white.json", `{"amounts":{"ky-scenic-white":1}}`)
	if code, _, errs = run(white); code != exitBad || !strings.Contains(errs, white+`: only the white`) {
		t.Errorf("white only: exit %d, %q", code, errs)
	}
}

// TestNeutraliseCriterion checks finding 21 on the demo paints: ky-sunflower
// dips ky-barn-red's chroma only from 57.5 to about 57.3 and ky-brick
// barely touches ky-scenic-white's 1.8, so neither is a neutraliser; a
// complement across the hue circle is (common practice, no source).
func TestNeutraliseCriterion(t *testing.T) {
	t.Parallel()
	model := fitDemoPigments(t)
	type cand struct {
		Colorant    string  `json:"colorant"`
		Chroma      float64 `json:"residual_chroma"`
		Interior    bool    `json:"interior"`
		Neutralises bool    `json:"neutralises"`
	}
	for _, tc := range []struct {
		paint    string
		not, yes []string
	}{
		{"demo/paints.csv:ky-barn-red", []string{"ky-sunflower", "ky-brick"}, []string{"ky-deep-sea"}},
		{"ky-scenic-white", []string{"ky-brick"}, nil},
		{"ky-brick", []string{"ky-sunflower"}, []string{"ky-deep-sea", "ky-moss"}},
	} {
		code, out, errs := runCLI(t, "", "neutralize", model, "--paint", tc.paint, "--json")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tc.paint, code, errs)
		}
		var res struct {
			PaintChroma float64 `json:"paint_chroma"`
			Candidates  []cand  `json:"candidates"`
		}
		if err := json.Unmarshal([]byte(out), &res); err != nil {
			t.Fatal(err)
		}
		by := map[string]cand{}
		for _, c := range res.Candidates {
			by[c.Colorant] = c
			drop := res.PaintChroma - c.Chroma
			if c.Neutralises != (c.Interior && drop >= 1 && drop >= 0.1*res.PaintChroma) {
				t.Errorf("%s: %+v against paint chroma %g", tc.paint, c, res.PaintChroma)
			}
		}
		_, text, _ := runCLI(t, "", "neutralize", model, "--paint", tc.paint)
		noLine := ""
		for line := range strings.SplitSeq(text, "\n") {
			if strings.HasPrefix(line, "no neutral crossing") {
				noLine = line
			}
		}
		for _, n := range tc.not {
			if by[n].Neutralises {
				t.Errorf("%s: %s listed as a neutraliser: %+v (paint chroma %g)", tc.paint, n, by[n], res.PaintChroma)
			}
			if !strings.Contains(noLine, n) || strings.Contains(text, "\n"+n+" ") {
				t.Errorf("%s: %s should be on the no-crossing line only:\n%s", tc.paint, n, text)
			}
		}
		for _, n := range tc.yes {
			if !by[n].Neutralises || strings.Contains(noLine, n) || !strings.Contains(text, "\n"+n+" ") {
				t.Errorf("%s: %s should be a neutraliser: %+v\n%s", tc.paint, n, by[n], text)
			}
		}
	}
}

// TestSolveWording checks finding 25: the colorant count is not above
// what the model has, and solve without a target asks for one.
func TestSolveWording(t *testing.T) {
	t.Parallel()
	model := fitDemoPigments(t)
	for _, tc := range []struct {
		extra []string
		want  string
	}{
		{[]string{"--colorants", "7"}, "the white ky-scenic-white and any of the 6 colorants;"},
		{[]string{"--colorants", "6"}, "the white ky-scenic-white and any of the 6 colorants;"},
		{[]string{"--colorants", "2"}, "the white ky-scenic-white and up to 2 of 6 colorants;"},
		{[]string{"--colorants", "3", "--only", "ky-brick,ky-moss"}, "the white ky-scenic-white and any of the 2 colorants;"},
	} {
		args := append([]string{"solve", model, "--lab", "50,0,0"}, tc.extra...)
		code, out, errs := runCLI(t, "", args...)
		if code != 0 || !strings.Contains(out, tc.want) {
			t.Errorf("%v: exit %d, %s%s; want %q", tc.extra, code, out, errs, tc.want)
		}
	}
	rig, _ := lightsFitDemo(t)
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"solve", rig}, "give a target: --target FILE, --xy x,y or --cct K"},
		{[]string{"solve", rig, "--cct", "4000", "--xy", "0.3,0.3"}, "give one target only:"},
	} {
		code, _, errs := runCLI(t, "", tc.args...)
		if code != exitBad || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: exit %d, %q; want %q", tc.args, code, errs, tc.want)
		}
	}
}

// TestGenericHelpExamples checks finding 26: every example line of the
// generic help of fit, mix and solve runs on the demo files (the paths
// under cmd/antipode/demo/ are taken from the package's demo folder, the
// model files written to a temporary folder).
func TestGenericHelpExamples(t *testing.T) {
	t.Parallel()
	demo, err := filepath.Abs("demo")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	for _, cmd := range []string{"fit", "mix", "solve"} {
		_, help, _ := runCLI(t, "", cmd, "--help")
		_, ex, ok := strings.Cut(help, "\nExample:\n")
		if !ok {
			t.Fatalf("%s --help has no example:\n%s", cmd, help)
		}
		n := 0
		for line := range strings.SplitSeq(ex, "\n") {
			line = strings.TrimSpace(line)
			if !strings.HasPrefix(line, "$ antipode ") {
				continue
			}
			n++
			var args []string
			for _, f := range strings.Fields(strings.TrimPrefix(line, "$ antipode ")) {
				switch {
				case strings.HasPrefix(f, "cmd/antipode/demo/"):
					f = filepath.Join(demo, strings.TrimPrefix(f, "cmd/antipode/demo/"))
				case strings.HasSuffix(f, ".json"):
					f = filepath.Join(dir, f)
				}
				args = append(args, f)
			}
			if code, _, errs := runCLI(t, "", args...); code != 0 {
				t.Errorf("%s --help example %q: exit %d: %s", cmd, line, code, errs)
			}
		}
		if n == 0 {
			t.Errorf("%s --help: no example command", cmd)
		}
	}
}

// TestPlotHelpNamesSolve checks finding 27: plot --help names the commands
// that take --plot, and it is right about solve: the dyes, pigments and
// halftone solves have the flag, the lights solve does not.
func TestPlotHelpNamesSolve(t *testing.T) {
	t.Parallel()
	_, help, _ := runCLI(t, "", "plot", "--help")
	if !strings.Contains(help, "describe, pair, complement and solve (for dyes, pigments and halftone models)\ntake --plot FILE") {
		t.Errorf("plot --help:\n%s", help)
	}
	dir := t.TempDir()
	dyes := filepath.Join(dir, "dyes.json")
	if code, _, errs := runCLI(t, "", "fit", "dyes", "demo/dyes_dilutions.csv", "--out", dyes); code != 0 {
		t.Fatalf("fit dyes: exit %d: %s", code, errs)
	}
	press, _ := htCLIFitDemo(t)
	rig, _ := lightsFitDemo(t)
	for _, tc := range []struct {
		model string
		has   bool
	}{{dyes, true}, {fitDemoPigments(t), true}, {press, true}, {rig, false}} {
		_, out, _ := runCLI(t, "", "solve", tc.model, "--help")
		if got := strings.Contains(out, "\n  --plot "); got != tc.has {
			t.Errorf("solve %s --help lists --plot: %v, want %v", tc.model, got, tc.has)
		}
	}
}

// TestNeutralisesThreshold checks the criterion's edges: both floors must
// be met, and a colorant alone greyest (not interior) never counts.
func TestNeutralisesThreshold(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		paint, residual float64
		interior, want  bool
	}{
		{57.5, 57.26, true, false}, // the review's ky-sunflower in ky-barn-red
		{57.5, 52, true, false},    // 5.5 down: over 1 but under 10 % (5.75)
		{57.5, 51, true, true},     // 6.5 down, 11 %
		{1.8, 1.0, true, false},    // 44 % down but under 1 C*ab
		{2, 1, true, true},         // exactly 1 C*ab, 50 %
		{30, 2, false, false},      // the colorant alone is the greyest
	} {
		n := mixing.Neutraliser{Colorant: "x", Chroma: tc.residual, Interior: tc.interior}
		if got := neutralises(n, tc.paint); got != tc.want {
			t.Errorf("paint %g, residual %g, interior %v: %v, want %v", tc.paint, tc.residual, tc.interior, got, tc.want)
		}
	}
}
