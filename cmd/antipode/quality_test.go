package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// qualityRow is the part of describe's JSON that quality.go fills.
type qualityRow struct {
	Name     string    `json:"name"`
	Ra       *float64  `json:"ra"`
	R        []float64 `json:"r"`
	Rf       *float64  `json:"rf"`
	RfI      []float64 `json:"rf_i"`
	Efficacy *float64  `json:"efficacy_lm_per_w"`
	SP       *float64  `json:"sp_ratio"`
	MelDER   *float64  `json:"melanopic_der"`
	Warnings []string  `json:"warnings"`
}

// describeQuality runs describe on a CSV and returns its rows and raw keys.
func describeQuality(t *testing.T, csv string, args ...string) ([]qualityRow, []map[string]any) {
	t.Helper()
	p := writeTemp(t, "lights.csv", csv)
	code, out, errs := runCLI(t, "", append([]string{"describe", p, "--json"}, args...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var rows []qualityRow
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatal(err)
	}
	var raw []map[string]any
	if err := json.Unmarshal([]byte(out), &raw); err != nil {
		t.Fatal(err)
	}
	return rows, raw
}

// TestDescribeLightQuality runs describe --as light on CIE illuminants
// written out as a file and checks the lighting-quality keys against the
// library's sources:
//   - FL2 and FL1: Ra 64.2 and 75.8 (shared/reference PROVENANCE Checks
//     10, one decimal; tolerance half a unit plus 0.01 for the CCT method);
//     FL1's Duv of +0.0071 is beyond CIE 13.3's 0.0054, so it warns;
//   - D65 at 1 nm: S/P 2.4646 (PROVENANCE Checks A1; tolerance half a unit
//     of the fourth decimal plus the 10-digit rounding of the file) and
//     melanopic DER 1, by definition (CIE S 026/E:2018).
func TestDescribeLightQuality(t *testing.T) {
	t.Parallel()
	fl1, err := cie.Fluorescent(1)
	if err != nil {
		t.Fatal(err)
	}
	fl2, err := cie.Fluorescent(2)
	if err != nil {
		t.Fatal(err)
	}
	csv := columnsCSV(colorimetry.Grid5nm, []string{"fl1", "fl2"}, func(j int, nm float64) float64 {
		return []colorimetry.Spectrum{fl1, fl2}[j].At(nm)
	})
	rows, _ := describeQuality(t, csv, "--as", "light")
	for i, want := range []float64{75.8, 64.2} {
		r := rows[i]
		if r.Ra == nil || math.Abs(*r.Ra-want) > 0.06 {
			t.Errorf("%s: ra %v, want %.1f (PROVENANCE Checks 10)", r.Name, r.Ra, want)
		}
		if len(r.R) != 14 || r.Rf == nil || len(r.RfI) != 99 || r.Efficacy == nil || r.SP == nil || r.MelDER == nil {
			t.Errorf("%s: missing quality values: r %d values, rf %v, rf_i %d values, efficacy %v, S/P %v, DER %v", r.Name, len(r.R), r.Rf, len(r.RfI), r.Efficacy, r.SP, r.MelDER)
		}
		// Ra is the mean of R1–R8 (CIE 13.3).
		if len(r.R) == 14 && r.Ra != nil {
			var s float64
			for _, v := range r.R[:8] {
				s += v
			}
			if math.Abs(s/8-*r.Ra) > 1e-9 {
				t.Errorf("%s: ra %g is not the mean of r[0:8] (%g)", r.Name, *r.Ra, s/8)
			}
		}
	}
	warned := func(r qualityRow) bool {
		for _, w := range r.Warnings {
			if strings.Contains(w, "0.0054") {
				return true
			}
		}
		return false
	}
	if !warned(rows[0]) || warned(rows[1]) {
		t.Errorf("Duv warnings: FL1 %q, FL2 %q; want one for FL1 (Duv +0.0071) only", rows[0].Warnings, rows[1].Warnings)
	}

	d65 := cie.D65()
	csv = columnsCSV(colorimetry.Grid1nm, []string{"d65"}, func(_ int, nm float64) float64 { return d65.At(nm) })
	rows, _ = describeQuality(t, csv, "--as", "light")
	r := rows[0]
	if r.SP == nil || math.Abs(*r.SP-2.4646) > 6e-5 {
		t.Errorf("D65: sp_ratio %v, want 2.4646 (PROVENANCE Checks A1)", r.SP)
	}
	if r.MelDER == nil || math.Abs(*r.MelDER-1) > 1e-6 {
		t.Errorf("D65: melanopic_der %v, want 1 (CIE S 026 definition)", r.MelDER)
	}
	// D65 is daylight of about 6504 K: Ra and Rf near 100 (CIE 13.3 and
	// CIE 224: the reference of a daylight source is daylight); 0.05 allows
	// for the tabulated D65 differing from the D series computed at its
	// CCT (common practice (no source)).
	if r.Ra == nil || math.Abs(*r.Ra-100) > 0.05 || r.Rf == nil || math.Abs(*r.Rf-100) > 0.05 {
		t.Errorf("D65: ra %v, rf %v; want about 100", r.Ra, r.Rf)
	}
}

// TestDescribeQualityNull checks that the quality keys are present and null
// where they do not apply or cannot be computed (DESIGN.md: keys that do not
// apply are null, never absent): for reflectances, and for a saturated green
// light, whose CCT is not defined (CIE 015:2018: |Duv| > 0.05).
func TestDescribeQualityNull(t *testing.T) {
	t.Parallel()
	keys := []string{"ra", "r", "rf", "rf_i", "efficacy_lm_per_w", "sp_ratio", "melanopic_der"}
	g := colorimetry.Grid{Start: 380, Step: 5, N: 81}
	refl := columnsCSV(g, []string{"grey"}, func(int, float64) float64 { return 0.5 })
	_, raw := describeQuality(t, refl)
	for _, k := range keys {
		v, ok := raw[0][k]
		if !ok || v != nil {
			t.Errorf("reflectance: key %q = %v (present %v), want null", k, v, ok)
		}
	}
	green := columnsCSV(g, []string{"green"}, func(_ int, nm float64) float64 { return math.Exp(-(nm - 530) * (nm - 530) / 200) })
	rows, raw := describeQuality(t, green, "--as", "light")
	for _, k := range []string{"ra", "r", "rf", "rf_i"} {
		if v, ok := raw[0][k]; !ok || v != nil {
			t.Errorf("green light: key %q = %v (present %v), want null", k, v, ok)
		}
	}
	if rows[0].Efficacy == nil || rows[0].MelDER == nil {
		t.Errorf("green light: efficacy %v and melanopic DER %v should still be computed", rows[0].Efficacy, rows[0].MelDER)
	}
	found := false
	for _, w := range rows[0].Warnings {
		found = found || strings.HasPrefix(w, "Ra and Rf not computed")
	}
	if !found {
		t.Errorf("green light: warnings %q, want one saying why Ra and Rf are missing", rows[0].Warnings)
	}
}

// TestDescribeQualityTable checks the human table of describe --as light:
// Ra and Rf columns, the note that explains them, and a help text that
// points to the cautions for the circadian quantity (house rules).
func TestDescribeQualityTable(t *testing.T) {
	t.Parallel()
	code, out, errs := runCLI(t, "", "describe", "demo/lamps.csv", "--as", "light")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	lines := strings.Split(out, "\n")
	var head string
	for _, l := range lines {
		if strings.HasPrefix(l, "name ") {
			head = l
			break
		}
	}
	f := strings.Fields(head)
	if len(f) < 2 || f[len(f)-2] != "Ra" || f[len(f)-1] != "Rf" {
		t.Errorf("table header %q, want Ra and Rf as the last columns", head)
	}
	if !strings.Contains(out, "Ra: CIE 13.3 general colour rendering index") {
		t.Errorf("no note explaining Ra and Rf:\n%s", out)
	}
	code, help, _ := runCLI(t, "", "describe", "--help")
	if code != 0 || !strings.Contains(help, "melanopic") || !strings.Contains(help, "antipode help cautions") {
		t.Errorf("describe --help should explain the quality keys and point to 'antipode help cautions':\n%s", help)
	}
}

// TestSolveQualityGoals runs solve --maximize and --minimize on the demo
// rig: the goal's recipe comes first, reaches the target (Δu′v′ below
// 1e-6, common practice (no source) for an exact solve), carries the
// quality keys and a trade-off curve, and is at least as good by its goal
// as every other recipe (mixing's SolveQuality guarantees it; checked here
// on the CLI's JSON).
func TestSolveQualityGoals(t *testing.T) {
	t.Parallel()
	model, _ := lightsFitDemo(t)
	for _, c := range []struct {
		flag, value, key string
		sign             float64
	}{
		{"--maximize", "ra", "ra", 1},
		{"--maximize", "rf", "rf", 1},
		{"--maximize", "r9", "r9", 1},
		{"--maximize", "efficacy", "efficacy_lm_per_w", 1},
		{"--maximize", "melanopic", "melanopic_der", 1},
		{"--minimize", "melanopic", "melanopic_der", -1},
	} {
		code, out, errs := runCLI(t, "", "solve", model, "--cct", "3500", c.flag, c.value, "--json")
		if code != 0 {
			t.Fatalf("%s %s: exit %d: %s", c.flag, c.value, code, errs)
		}
		var sol struct {
			Recipes []map[string]any `json:"recipes"`
		}
		if err := json.Unmarshal([]byte(out), &sol); err != nil {
			t.Fatal(err)
		}
		first := sol.Recipes[0]
		if d, _ := first["delta_uv_prime"].(float64); d > 1e-6 {
			t.Errorf("%s %s: Δu′v′ %g", c.flag, c.value, d)
		}
		best, ok := first[c.key].(float64)
		if !ok {
			t.Fatalf("%s %s: first recipe %v has no %s", c.flag, c.value, first["strategy"], c.key)
		}
		// One point when the optimum is also the other end (least melanopic
		// is here also most efficient), more otherwise.
		if curve, ok := first["trade_off"].([]any); !ok || len(curve) < 1 {
			t.Errorf("%s %s: trade_off %v", c.flag, c.value, first["trade_off"])
		}
		for _, r := range sol.Recipes {
			for _, k := range []string{"ra", "r9", "rf", "efficacy_lm_per_w", "melanopic_der", "trade_off"} {
				if _, ok := r[k]; !ok {
					t.Errorf("%s %s: recipe %v lacks key %q", c.flag, c.value, r["strategy"], k)
				}
			}
			if v, ok := r[c.key].(float64); ok && c.sign*v > c.sign*best+1e-9 {
				t.Errorf("%s %s: recipe %v has %s %g, better than the first's %g", c.flag, c.value, r["strategy"], c.key, v, best)
			}
		}
	}
	code, out, _ := runCLI(t, "", "solve", model, "--cct", "3500", "--maximize", "ra")
	if code != 0 || !strings.Contains(out, "trade-off of recipe 1 (max Ra)") || !strings.Contains(out, "melanopic DER") {
		t.Errorf("table output lacks the quality rows or the trade-off:\n%s", out)
	}
	for _, bad := range [][]string{{"--maximize", "lumens"}, {"--minimize", "ra"}, {"--maximize", "ra", "--minimize", "melanopic"}} {
		if code, _, _ := runCLI(t, "", append([]string{"solve", model, "--cct", "3500"}, bad...)...); code != 2 {
			t.Errorf("%v: exit %d, want 2 (usage)", bad, code)
		}
	}
	code, help, _ := runCLI(t, "", "solve", model, "--help")
	if code != 0 || !strings.Contains(help, "--maximize") || !strings.Contains(help, "antipode help cautions") {
		t.Errorf("solve --help on a lights model should explain --maximize and point to the cautions:\n%s", help)
	}
}
