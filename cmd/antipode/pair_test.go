package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/colorimetry/specio"
)

// TestPairJSONKeys checks the keys the complement issue names (a contract)
// and that keys of the other mode are null.
func TestPairJSONKeys(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		args     []string
		verdict  string
		nullKeys []string
	}{
		// The demo's amber and cyan LED channels were made as metameric
		// complements of D65 (testdata/gen/make_demo.py).
		{[]string{"pair", "demo/lamps.csv:wash-amber", "demo/lamps.csv:wash-cyan", "--also", "A", "--uncertainty", "0.001", "--json"}, "metameric", []string{"stack_Y", "stack_chroma"}},
		{[]string{"pair", "demo/filters.csv:gel-deep-amber", "demo/filters.csv:gel-cyan", "--mode", "subtractive", "--json"}, "black", []string{"spectral_rms", "scale", "ratio_luminance", "line_distance_uv_prime", "confidence"}},
		{[]string{"pair", "demo/filters.csv:gel-straw", "demo/filters.csv:gel-steel-blue", "--mode", "subtractive", "--json"}, "none", nil},
	} {
		code, out, errs := runCLI(t, "", tc.args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", tc.args, code, errs)
		}
		var r map[string]any
		if err := json.Unmarshal([]byte(out), &r); err != nil {
			t.Fatal(err)
		}
		for _, k := range []string{"verdict", "delta_uv_prime", "spectral_rms", "scale", "ratio_luminance", "line_distance_uv_prime", "stack_Y", "stack_chroma", "robustness", "confidence", "warnings"} {
			if _, ok := r[k]; !ok {
				t.Errorf("%v: key %q missing", tc.args, k)
			}
		}
		if r["verdict"] != tc.verdict {
			t.Errorf("%v: verdict %v, want %s", tc.args, r["verdict"], tc.verdict)
		}
		for _, k := range tc.nullKeys {
			if r[k] != nil {
				t.Errorf("%v: %s = %v, want null", tc.args, k, r[k])
			}
		}
	}
}

func TestPairStrict(t *testing.T) {
	t.Parallel()
	code, _, errs := runCLI(t, "", "pair", "demo/filters.csv:gel-straw", "demo/filters.csv:gel-steel-blue", "--mode", "subtractive", "--strict")
	if code != exitStrict || !strings.Contains(errs, "not complements") {
		t.Errorf("--strict on a failed check: exit %d, %q", code, errs)
	}
	code, _, _ = runCLI(t, "", "pair", "demo/filters.csv:gel-deep-amber", "demo/filters.csv:gel-cyan", "--mode", "subtractive", "--strict")
	if code != 0 {
		t.Errorf("--strict on a passed check: exit %d", code)
	}
	code, _, errs = runCLI(t, "", "pair", "demo/filters.csv", "demo/filters.csv:gel-cyan", "--mode", "subtractive")
	if code != exitBad || !strings.Contains(errs, "FILE:NAME") {
		t.Errorf("file of many spectra as A: exit %d, %q", code, errs)
	}
}

// TestComplementReflectance checks that a reflectance and its derived
// complement sum to the perfect white: r + (1 − r) = 1 at every
// wavelength (Grassmann additivity; the identity behind the beam-splitter
// picture), read back from the --out file.
func TestComplementReflectance(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "c.csv")
	code, js, errs := runCLI(t, "", "complement", "demo/paints.csv:ky-ochre", "--as", "reflectance", "--out", out, "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var r map[string]any
	if err := json.Unmarshal([]byte(js), &r); err != nil {
		t.Fatal(err)
	}
	if _, ok := r["complementary_wavelength_nm"]; !ok {
		t.Error("complementary_wavelength_nm missing")
	}
	got, err := specio.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	paints, _ := demoData("paints.csv")
	var ochre = paints[0].s
	for _, p := range paints {
		if p.name == "ky-ochre" {
			ochre = p.s
		}
	}
	c := got[0].Spectrum
	for i := 0; i < c.Len(); i++ {
		if s := c.Value(i) + ochre.Value(i); math.Abs(s-1) > 1e-12 {
			t.Fatalf("sample %d: r + complement = %g", i, s)
		}
	}
	if _, err := os.Stat(out); err != nil {
		t.Fatal(err)
	}
}

func TestPartnerRanksComplementFirst(t *testing.T) {
	t.Parallel()
	code, out, errs := runCLI(t, "", "partner", "demo/filters.csv:gel-deep-amber", "demo/filters.csv", "--mode", "subtractive", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var ranked []map[string]any
	if err := json.Unmarshal([]byte(out), &ranked); err != nil {
		t.Fatal(err)
	}
	if len(ranked) == 0 || ranked[0]["name"] != "gel-cyan" || ranked[0]["verdict"] != "black" {
		t.Errorf("best partner: %v", ranked[0])
	}
	for _, k := range []string{"name", "delta_uv_prime", "line_distance_uv_prime", "stack_Y", "verdict"} {
		if _, ok := ranked[0][k]; !ok {
			t.Errorf("key %q missing", k)
		}
	}
}
