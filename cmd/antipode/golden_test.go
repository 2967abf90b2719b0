package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// update rewrites the golden files: go test ./cmd/antipode -run Golden -update
var update = flag.Bool("update", false, "rewrite the golden files in testdata/golden")

// goldenCases are CLI runs on the demo data whose output is kept in
// testdata/golden. Human output must match to the byte; JSON must match
// in structure, strings and booleans exactly and in numbers to 1e-9
// relative, so that last-bit differences between platforms do not fail it.
var goldenCases = []struct {
	name string
	args []string
}{
	{"describe-paints.txt", []string{"describe", "demo/paints.csv"}},
	{"describe-lamps-light.txt", []string{"describe", "demo/lamps.csv", "--as", "light"}},
	{"describe-paints.json", []string{"describe", "demo/paints.csv", "--column", "ky-sage,ky-plum", "--json"}},
	{"pair-additive.txt", []string{"pair", "demo/lamps.csv:wash-amber", "demo/lamps.csv:wash-cyan", "--also", "A"}},
	{"pair-subtractive.json", []string{"pair", "demo/filters.csv:gel-deep-amber", "demo/filters.csv:gel-cyan", "--mode", "subtractive", "--json"}},
	{"compare-metamers.txt", []string{"compare", "demo/paints.csv:ky-sage", "demo/paints.csv:ky-sage-touchup", "--also", "A,F11"}},
	{"compare-metamers.json", []string{"compare", "demo/paints.csv:ky-sage", "demo/paints.csv:ky-sage-touchup", "--also", "A,F11", "--json"}},
	{"complement-amber.txt", []string{"complement", "demo/lamps.csv:wash-amber"}},
	{"partner-amber.json", []string{"partner", "demo/filters.csv:gel-deep-amber", "demo/filters.csv", "--mode", "subtractive", "--top", "3", "--json"}},
	{"wavelengths.txt", []string{"wavelengths", "--step", "20"}},
	{"limits.txt", []string{"limits", "--hues", "8"}},
	{"display-rig.txt", []string{"display", "demo/lamps.csv", "--channels", "wash-red,wash-green,wash-blue", "--balance", "D65"}},
}

func TestGolden(t *testing.T) {
	for _, tc := range goldenCases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			code, out, errs := runCLI(t, "", tc.args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errs)
			}
			path := filepath.Join("testdata", "golden", tc.name)
			if *update {
				if err := os.WriteFile(path, []byte(out), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run with -update to create it)", err)
			}
			if strings.HasSuffix(tc.name, ".json") {
				var g, w any
				if err := json.Unmarshal([]byte(out), &g); err != nil {
					t.Fatalf("output is not JSON: %v", err)
				}
				if err := json.Unmarshal(want, &w); err != nil {
					t.Fatal(err)
				}
				if d := jsonDiff("", g, w); d != "" {
					t.Errorf("antipode %s: %s", strings.Join(tc.args, " "), d)
				}
				return
			}
			if out != string(want) {
				t.Errorf("antipode %s: output differs from %s:\n%s", strings.Join(tc.args, " "), path, firstDiff(out, string(want)))
			}
		})
	}
}

// jsonDiff returns where got differs from want, or "".
func jsonDiff(at string, got, want any) string {
	switch w := want.(type) {
	case map[string]any:
		g, ok := got.(map[string]any)
		if !ok || len(g) != len(w) {
			return fmt.Sprintf("%s: got %v, want %v", at, got, want)
		}
		for k, wv := range w {
			gv, ok := g[k]
			if !ok {
				return fmt.Sprintf("%s.%s missing", at, k)
			}
			if d := jsonDiff(at+"."+k, gv, wv); d != "" {
				return d
			}
		}
	case []any:
		g, ok := got.([]any)
		if !ok || len(g) != len(w) {
			return fmt.Sprintf("%s: got %d elements, want %d", at, len(g), len(w))
		}
		for i := range w {
			if d := jsonDiff(fmt.Sprintf("%s[%d]", at, i), g[i], w[i]); d != "" {
				return d
			}
		}
	case float64:
		g, ok := got.(float64)
		if !ok || math.Abs(g-w) > 1e-9*math.Max(1, math.Abs(w)) {
			return fmt.Sprintf("%s: got %v, want %v", at, got, want)
		}
	default:
		if got != want {
			return fmt.Sprintf("%s: got %v, want %v", at, got, want)
		}
	}
	return ""
}

// firstDiff shows the first line where two texts differ.
func firstDiff(got, want string) string {
	g, w := strings.Split(got, "\n"), strings.Split(want, "\n")
	for i := 0; i < max(len(g), len(w)); i++ {
		var gl, wl string
		if i < len(g) {
			gl = g[i]
		}
		if i < len(w) {
			wl = w[i]
		}
		if gl != wl {
			return fmt.Sprintf("line %d:\n got:  %q\n want: %q", i+1, gl, wl)
		}
	}
	return ""
}
