package main

import (
	"fmt"
	"path/filepath"
	"strings"
	"testing"
)

// TestSolveTolerance runs solve with a quality goal and a target-white
// tolerance on the demo rig: the goal's recipe lands within the tolerance
// (Δu′v′ ≤ tol + 1e-9; CCT and Duv within theirs), is no worse by its goal
// than the exact solve's (common practice (no source): an optimum over a
// larger set is no worse), and carries the tolerance and its three-point
// trade-off; the table shows what the tolerance buys; bad flags are usage
// errors (exit 2).
func TestSolveTolerance(t *testing.T) {
	t.Parallel()
	model, _ := lightsFitDemo(t)
	solve := func(args ...string) []map[string]any {
		t.Helper()
		return solveRecipes(t, append([]string{"solve", model, "--json"}, args...)...)
	}
	exact := solve("--cct", "4000", "--maximize", "efficacy")[0]
	for _, r := range solve("--cct", "4000", "--maximize", "efficacy") {
		if _, ok := r["tolerance_trade_off"]; !ok || r["tolerance_trade_off"] != nil || r["tolerance"] != nil {
			t.Errorf("exact solve: recipe %v: tolerance keys %v, %v, want null", r["strategy"], r["tolerance"], r["tolerance_trade_off"])
		}
	}
	got := solve("--cct", "4000", "--maximize", "efficacy", "--tolerance-uv-prime", "0.002")
	first := got[0]
	if d := first["delta_uv_prime"].(float64); d > 0.002+1e-9 {
		t.Errorf("Δu′v′ %g beyond the tolerance 0.002", d)
	}
	if e, x := first["efficacy_lm_per_w"].(float64), exact["efficacy_lm_per_w"].(float64); e < x-1e-9*x {
		t.Errorf("efficacy %g within the tolerance, worse than the exact %g", e, x)
	}
	if tol, ok := first["tolerance"].(map[string]any); !ok || tol["uv_prime"] != 0.002 || tol["cct_kelvin"] != nil {
		t.Errorf("tolerance key %v", first["tolerance"])
	}
	if pts, ok := first["tolerance_trade_off"].([]any); !ok || len(pts) != 3 {
		t.Errorf("tolerance_trade_off %v, want 3 points", first["tolerance_trade_off"])
	}
	for _, r := range got[1:] {
		if d := r["delta_uv_prime"].(float64); d > 1e-6 {
			t.Errorf("recipe %v moved off the target: Δu′v′ %g", r["strategy"], d)
		}
	}
	// CCT and Duv tolerances: about the target's own CCT and Duv (Ohno's
	// method; 1e-7 of the temperature, its stated accuracy).
	cb := solve("--cct", "3500", "--duv", "0.001", "--maximize", "melanopic", "--tolerance-cct", "100", "--tolerance-duv", "0.002")[0]
	if k := cb["cct_kelvin"].(float64); k < 3400-3500e-7 || k > 3600+3500e-7 {
		t.Errorf("CCT %g K beyond 3500 ± 100 K", k)
	}
	if d := cb["duv"].(float64); d < -0.001-1e-9 || d > 0.003+1e-9 {
		t.Errorf("Duv %g beyond 0.001 ± 0.002", d)
	}
	code, out, errs := runCLI(t, "", "solve", model, "--cct", "4000", "--maximize", "ra", "--tolerance-uv-prime", "0.002")
	if code != 0 || !strings.Contains(out, "what the tolerance buys (recipe 1, max Ra; tolerance Δu′v′ ≤ 0.002") {
		t.Errorf("exit %d, table output lacks the tolerance table:\n%s%s", code, out, errs)
	}
	for _, bad := range [][]string{
		{"--cct", "4000", "--maximize", "ra", "--tolerance-uv-prime", "-0.001"},
		{"--cct", "4000", "--tolerance-uv-prime", "0.002"},                                              // no goal
		{"--xy", "0.38,0.38", "--maximize", "ra", "--tolerance-cct", "100", "--tolerance-duv", "0.002"}, // not --cct
		{"--cct", "4000", "--maximize", "ra", "--tolerance-cct", "100"},                                 // CCT alone
		{"--cct", "4000", "--maximize", "ra", "--tolerance-duv", "NaN"},
	} {
		if code, _, _ := runCLI(t, "", append([]string{"solve", model}, bad...)...); code != 2 {
			t.Errorf("%v: exit %d, want 2 (usage)", bad, code)
		}
	}
	code, help, _ := runCLI(t, "", "solve", model, "--help")
	if code != 0 || !strings.Contains(help, "--tolerance-uv-prime") || !strings.Contains(help, "--tolerance-cct") {
		t.Errorf("solve --help on a lights model should explain the tolerances:\n%s", help)
	}
}

// TestSolveToleranceBuysNothing checks that a tolerance which buys no
// visible gain leaves the goal's recipe on the target: on the demo rig the
// Ra optimum at 4000 K gains less than 0.05 (half the reported 0.1) within
// Δu′v′ 0.002, so recipe 1 must reach the target exactly and every point of
// its trade-off report the same Ra.
func TestSolveToleranceBuysNothing(t *testing.T) {
	t.Parallel()
	model, _ := lightsFitDemo(t)
	first := solveRecipes(t, "solve", model, "--cct", "4000", "--maximize", "ra", "--tolerance-uv-prime", "0.002", "--json")[0]
	if d := first["delta_uv_prime"].(float64); d > 1e-9 {
		t.Errorf("Δu′v′ %g: the recipe left the target for a gain that does not show", d)
	}
	pts, _ := first["tolerance_trade_off"].([]any)
	if len(pts) != 3 {
		t.Fatalf("tolerance_trade_off %v", first["tolerance_trade_off"])
	}
	ra0 := pts[0].(map[string]any)["ra"]
	for _, p := range pts {
		if ra := p.(map[string]any)["ra"]; ra != ra0 {
			t.Errorf("trade-off Ra %v, at share 0 %v", ra, ra0)
		}
	}
}

// TestLightsFitDeltaUVSummary checks the Δu′v′ summary line of the text
// fit report against the per-measurement figures of the same fit's JSON:
// mean and maximum of the fitted and of the held-out measurements, as
// printed to 4 decimals.
func TestLightsFitDeltaUVSummary(t *testing.T) {
	t.Parallel()
	_, rep := lightsFitDemo(t)
	var sum, top [2]float64
	var n [2]int
	for _, s := range rep["fit"].(map[string]any)["samples"].([]any) {
		m := s.(map[string]any)
		d, ok := m["delta_uv_prime"].(float64)
		if !ok {
			continue
		}
		k := 0
		if m["held_out"].(bool) {
			k = 1
		}
		sum[k], top[k], n[k] = sum[k]+d, max(top[k], d), n[k]+1
	}
	if n[0] == 0 || n[1] == 0 {
		t.Fatalf("measurements with Δu′v′: %d fitted, %d held out", n[0], n[1])
	}
	code, out, errs := runCLI(t, "", "fit", "lights", "demo/rig_ramps.csv", "--out", filepath.Join(t.TempDir(), "rig.json"))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	want := fmt.Sprintf("Δu′v′:    fit mean %.4f, max %.4f; held out mean %.4f, max %.4f", sum[0]/float64(n[0]), top[0], sum[1]/float64(n[1]), top[1])
	if !strings.Contains(out, want) {
		t.Errorf("no line %q in the report", want)
	}
}
