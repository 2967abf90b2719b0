package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
	"github.com/antipode-color/antipode/mixing"
	"gonum.org/v1/gonum/floats/scalar"
)

// The lights tests drive the commands in process on the demo rig. Its
// ramps are synthetic calibration data made by
// testdata/gen/make_rig_demo.py from a known model (power laws with the
// gammas below, 0.0005 noise, seeded), so the fit must recover that model.

// lightsFitDemo fits the demo rig into a temporary model file.
func lightsFitDemo(t *testing.T, extra ...string) (string, map[string]any) {
	t.Helper()
	out := filepath.Join(t.TempDir(), "rig.json")
	args := append([]string{"fit", "lights", "demo/rig_ramps.csv", "--out", out, "--json"}, extra...)
	code, stdout, errs := runCLI(t, "", args...)
	if code != 0 {
		t.Fatalf("fit lights: exit %d: %s", code, errs)
	}
	var rep map[string]any
	if err := json.Unmarshal([]byte(stdout), &rep); err != nil {
		t.Fatalf("fit lights --json: %v\n%s", err, stdout)
	}
	return out, rep
}

// solveRecipes runs a solve command (args include --json) that must
// succeed and returns its ranked recipes.
func solveRecipes(t *testing.T, args ...string) []map[string]any {
	t.Helper()
	code, out, errs := runCLI(t, "", args...)
	if code != 0 {
		t.Fatalf("%v: exit %d: %s", args, code, errs)
	}
	var sol struct {
		Recipes []map[string]any `json:"recipes"`
	}
	if err := json.Unmarshal([]byte(out), &sol); err != nil {
		t.Fatal(err)
	}
	return sol.Recipes
}

func TestLightsFitDemo(t *testing.T) {
	t.Parallel()
	_, rep := lightsFitDemo(t)
	// The generator's gammas (make_rig_demo.py CHANNELS). wash-amber's
	// spectrum moves with drive on purpose, so its power law is biased and
	// only its warning is checked.
	want := map[string]float64{"wash-red": 2.2, "wash-green": 2.0, "wash-blue": 2.4, "wash-lime": 2.1}
	chans := rep["channels"].([]any)
	if len(chans) != 5 {
		t.Fatalf("%d channels", len(chans))
	}
	for _, c := range chans {
		c := c.(map[string]any)
		g, ok := want[c["name"].(string)]
		if !ok {
			continue
		}
		got, se := c["gamma"].(float64), c["gamma_se"].(float64)
		// Within three standard errors of the fit.
		if math.Abs(got-g) > 3*se {
			t.Errorf("%s: γ %.4f ± %.4f, generator %g", c["name"], got, se, g)
		}
	}
	fit := rep["fit"].(map[string]any)
	warns := fit["warnings"].([]any)
	if len(warns) != 1 || !strings.Contains(warns[0].(string), "wash-amber") || !strings.Contains(warns[0].(string), "changes shape") {
		t.Errorf("warnings %v, want the amber shape change only", warns)
	}
	// The held-out rows (heldout = 1, one per channel).
	if ho, ok := fit["held_out"].(map[string]any); !ok || ho["n"].(float64) != 5 {
		t.Errorf("held out: %v", fit["held_out"])
	}
}

// TestLightsMixAgreesWithLibrary: the CLI's numbers are the library's,
// and --out writes the spectrum that reads back unchanged.
func TestLightsMixAgreesWithLibrary(t *testing.T) {
	t.Parallel()
	model, _ := lightsFitDemo(t)
	spec := filepath.Join(t.TempDir(), "mix.csv")
	code, out, errs := runCLI(t, "", "mix", model, "--amounts", "wash-red=0.8,wash-green=0.35,wash-blue=0.2", "--out", spec, "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var got map[string]any
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	mm, err := loadModel(model)
	if err != nil {
		t.Fatal(err)
	}
	m := mm.(*mixing.Lights)
	am := []mixing.Amount{{Name: "wash-red", Value: 0.8}, {Name: "wash-green", Value: 0.35}, {Name: "wash-blue", Value: 0.2}}
	col, err := m.Colour(am, cie.CIE1931())
	if err != nil {
		t.Fatal(err)
	}
	for k, v := range map[string]float64{"X": col.XYZ.X, "Y": col.XYZ.Y, "Z": col.XYZ.Z, "x": col.XY.X, "y": col.XY.Y, "cct_kelvin": col.CCT.Kelvin, "duv": col.CCT.Duv} {
		if g, ok := got[k].(float64); !ok || g != v {
			t.Errorf("%s: CLI %v, library %v", k, got[k], v)
		}
	}
	if got["units"] != "relative" {
		t.Errorf("units %v", got["units"])
	}
	back, err := specio.ReadFile(spec)
	if err != nil {
		t.Fatal(err)
	}
	want, _ := m.Spectrum(am)
	for i := 0; i < want.Len(); i++ {
		if back[0].Spectrum.Value(i) != want.Value(i) {
			t.Fatalf("--out sample %d: %v, want %v", i, back[0].Spectrum.Value(i), want.Value(i))
		}
	}
	// Blue alone lies beyond the CCT range of CIE 015:2018: null and a
	// warning.
	code, out, errs = runCLI(t, "", "mix", model, "--amounts", "wash-blue=1", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	got = nil
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	if got["cct_kelvin"] != nil || got["duv"] != nil || len(got["warnings"].([]any)) == 0 {
		t.Errorf("blue alone: cct %v duv %v warnings %v", got["cct_kelvin"], got["duv"], got["warnings"])
	}
}

// TestLightsComplementDemo is the demo step: the channel mix that
// complements the filtered tungsten lamp to a 4000 K white. The sum of
// the two spectra, recomputed here with colorimetry's weights and Ohno's
// CCT, must land on 4000 K, Duv 0 (Δu′v′ < 1e-6 from the target, the
// issue's criterion).
func TestLightsComplementDemo(t *testing.T) {
	t.Parallel()
	model, _ := lightsFitDemo(t)
	recipes := solveRecipes(t, "solve", model, "--cct", "4000", "--add", "demo/rig_filtered.csv", "--json")
	if len(recipes) < 2 {
		t.Fatalf("%d recipes", len(recipes))
	}
	for _, k := range []string{"amounts", "dE00", "reachable", "warnings", "x", "y", "delta_uv_prime", "cct_kelvin", "duv", "efficacy_lm_per_w", "strategy"} {
		if _, ok := recipes[0][k]; !ok {
			t.Errorf("key %q missing", k)
		}
	}
	mm, err := loadModel(model)
	if err != nil {
		t.Fatal(err)
	}
	m := mm.(*mixing.Lights)
	filtered, err := demoData("rig_filtered.csv")
	if err != nil {
		t.Fatal(err)
	}
	obs := cie.CIE1931()
	tab, _ := colorimetry.NewPlanckianTable(obs, colorimetry.C2)
	target, _ := tab.UV(4000, 0)
	w, _ := colorimetry.NewLightWeights(obs, colorimetry.Grid5nm)
	for _, r := range recipes {
		if r["reachable"] != true {
			t.Fatalf("%v: not reachable", r["strategy"])
		}
		var am []mixing.Amount
		for n, v := range r["amounts"].(map[string]any) {
			am = append(am, mixing.Amount{Name: n, Value: v.(float64)})
		}
		s, err := m.Spectrum(am)
		if err != nil {
			t.Fatal(err)
		}
		total, err := colorimetry.Add(s, filtered[0].s)
		if err != nil {
			t.Fatal(err)
		}
		c, _ := w.XYZ(total)
		uv, _ := c.UV()
		if d := colorimetry.DeltaUVPrime(uv.UVPrime(), target.UVPrime()); d > 1e-6 {
			t.Errorf("%v: Δu′v′ %g from 4000 K", r["strategy"], d)
		}
		cct, err := tab.CCT(uv, colorimetry.CCTOhno)
		// Ohno's method is exact to 1e-7 of the temperature (cct.go).
		if err != nil || !scalar.EqualWithinAbsOrRel(cct.Kelvin, 4000, 0, 1e-6) || math.Abs(cct.Duv) > 1e-6 {
			t.Errorf("%v: CCT %+v %v", r["strategy"], cct, err)
		}
	}
	if recipes[0]["strategy"] != mixing.StrategyLeastAdded {
		t.Errorf("first recipe %v", recipes[0]["strategy"])
	}
}

func TestLightsSolveText(t *testing.T) {
	t.Parallel()
	model, _ := lightsFitDemo(t)
	code, out, errs := runCLI(t, "", "solve", model, "--xy", "0.70,0.29")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"nearest reachable", "reachable", "no", "outside what the channels can reach"} {
		if !strings.Contains(out, want) {
			t.Errorf("unreachable target: output lacks %q:\n%s", want, out)
		}
	}
	code, out, errs = runCLI(t, "", "solve", model, "--cct", "6500", "--level", "40", "--prefer", "reference")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "1 closest to reference") || !strings.Contains(out, "CIE daylight 6500 K") {
		t.Errorf("--prefer reference:\n%s", out)
	}
}

func TestLightsHelp(t *testing.T) {
	t.Parallel()
	model, _ := lightsFitDemo(t)
	for _, args := range [][]string{
		{"fit", "lights", "--help"},
		{"mix", model, "--help"},
		{"solve", model, "--help"},
	} {
		code, out, _ := runCLI(t, "", args...)
		if code != 0 || !strings.Contains(out, "Example") || !strings.Contains(out, "antipode "+args[0]) {
			t.Errorf("%v: exit %d\n%s", args, code, out)
		}
	}
	_, out, _ := runCLI(t, "", "fit", "lights", "--help")
	for _, want := range []string{"name,channel,drive,heldout", "dark", "--response"} {
		if !strings.Contains(out, want) {
			t.Errorf("fit lights --help lacks %q", want)
		}
	}
}

func TestLightsBadInput(t *testing.T) {
	t.Parallel()
	model, _ := lightsFitDemo(t)
	noDrive := writeTemp(t, "nodrive.csv", "name,channel,level,400,500,600,700\nr1,red,0.5,0,0.1,0.5,0.1\nr2,red,1,0,0.2,1,0.2\n")
	falling := writeTemp(t, "falling.csv", "name,channel,drive,400,500,600,700\n"+
		"d,dark,0,0,0,0,0\nr1,red,0.3,0,0.05,0.25,0.05\nr2,red,0.6,0,0.02,0.1,0.02\nr3,red,1,0,0.2,1,0.2\n")
	out := filepath.Join(t.TempDir(), "m.json")
	for _, tc := range []struct {
		args []string
		want []string
	}{
		{[]string{"fit", "lights", noDrive, "--out", out}, []string{"nodrive.csv:2", `"drive"`}},
		{[]string{"fit", "lights", falling, "--out", out}, []string{"falling.csv:4", "red", "drive 0.6", "not monotone"}},
		{[]string{"fit", "lights", "demo/rig_ramps.csv"}, []string{"--out"}},
		{[]string{"fit", "lights", "demo/rig_ramps.csv", "--out", out, "--response", "cubic"}, []string{"--response cubic"}},
		{[]string{"mix", model, "--amounts", "wash-violet=0.5"}, []string{"wash-violet", "wash-red"}},
		{[]string{"mix", model, "--amounts", "wash-red=1.5"}, []string{"wash-red", "0–1"}},
		{[]string{"solve", model}, []string{"--target FILE, --xy x,y or --cct K"}},
		{[]string{"solve", model, "--xy", "0.9,0.3"}, []string{"--xy 0.9,0.3"}},
		{[]string{"solve", model, "--cct", "4000", "--duv", "0.2"}, []string{"--cct 4000"}},
		{[]string{"solve", model, "--cct", "4000", "--add", "demo/lamps.csv"}, []string{"name one as FILE:NAME"}},
	} {
		code, _, errs := runCLI(t, "", tc.args...)
		if code != exitBad {
			t.Errorf("%v: exit %d, want %d", tc.args, code, exitBad)
		}
		if strings.Count(strings.TrimRight(errs, "\n"), "\n") != 0 {
			t.Errorf("%v: error is not one line: %q", tc.args, errs)
		}
		for _, w := range tc.want {
			if !strings.Contains(errs, w) {
				t.Errorf("%v: error %q lacks %q", tc.args, errs, w)
			}
		}
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("a failed fit wrote a model file")
	}
}

// TestLightsSolveRoundTrip: a light the rig made is reachable
// (mathematical invariant), so solving for its spectrum with
// --level target gives back its chromaticity and luminance.
func TestLightsSolveRoundTrip(t *testing.T) {
	t.Parallel()
	model, _ := lightsFitDemo(t)
	spec := filepath.Join(t.TempDir(), "made.csv")
	code, out, errs := runCLI(t, "", "mix", model, "--amounts", "wash-red=0.6,wash-blue=0.7,wash-lime=0.5,wash-amber=0.3", "--out", spec, "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var made map[string]any
	if err := json.Unmarshal([]byte(out), &made); err != nil {
		t.Fatal(err)
	}
	code, out, errs = runCLI(t, "", "solve", model, "--target", spec, "--level", "target", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var sol struct {
		Recipes []map[string]any `json:"recipes"`
	}
	if err := json.Unmarshal([]byte(out), &sol); err != nil {
		t.Fatal(err)
	}
	if len(sol.Recipes) != 2 {
		t.Fatalf("%d recipes, want max efficacy and closest to reference", len(sol.Recipes))
	}
	for _, r := range sol.Recipes {
		// The target's luminance and chromaticity to 1e-9 relative (the
		// vertex tolerance of the solve).
		if r["reachable"] != true || r["delta_uv_prime"].(float64) > 1e-9 ||
			!scalar.EqualWithinAbsOrRel(r["Y"].(float64), made["Y"].(float64), 0, 1e-9) {
			t.Errorf("%v: reachable %v Δu′v′ %v Y %v (made Y %v)", r["strategy"], r["reachable"], r["delta_uv_prime"], r["Y"], made["Y"])
		}
	}
}
