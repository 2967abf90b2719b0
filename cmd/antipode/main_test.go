package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// runCLI runs the tool in process and returns its exit code and streams.
func runCLI(t *testing.T, stdin string, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

// writeTemp writes content to a file in a fresh temporary directory.
func writeTemp(t *testing.T, name, content string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// columnsCSV writes spectra on a grid in the columns layout.
func columnsCSV(g colorimetry.Grid, names []string, f func(j int, nm float64) float64) string {
	var b strings.Builder
	b.WriteString("nm," + strings.Join(names, ",") + "\n")
	for i := 0; i < g.N; i++ {
		nm := g.Wavelength(i)
		fmt.Fprintf(&b, "%g", nm)
		for j := range names {
			fmt.Fprintf(&b, ",%.10g", f(j, nm))
		}
		b.WriteString("\n")
	}
	return b.String()
}

func TestDescribeJSONKeys(t *testing.T) {
	t.Parallel()
	code, out, errs := runCLI(t, "", "describe", "demo/paints.csv", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var rows []map[string]any
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatal(err)
	}
	if len(rows) != 9 {
		t.Fatalf("got %d rows, want the 9 demo paints", len(rows))
	}
	// The keys named in the foundation issue are a contract.
	for _, k := range []string{"name", "X", "Y", "Z", "x", "y", "u_prime", "v_prime", "warnings"} {
		if _, ok := rows[0][k]; !ok {
			t.Errorf("key %q missing", k)
		}
	}
	if w, ok := rows[0]["warnings"].([]any); !ok || w == nil {
		t.Errorf("warnings must be an array, got %v", rows[0]["warnings"])
	}
}

// TestDescribeD65Light checks the CLI pipeline end to end on the CIE D65
// table written out as a file: its chromaticity must be the D65 white point,
// x = 0.31273, y = 0.32902 (1 nm, 360–830 nm; shared/reference PROVENANCE
// Checks 3, computed there from the byte-verified CIE tables).
func TestDescribeD65Light(t *testing.T) {
	t.Parallel()
	d65 := cie.D65()
	g := colorimetry.Grid{Start: 360, Step: 1, N: 471}
	csv := columnsCSV(g, []string{"D65"}, func(_ int, nm float64) float64 { return d65.At(nm) })
	p := writeTemp(t, "d65.csv", csv)
	code, out, errs := runCLI(t, "", "describe", p, "--as", "light", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var rows []struct {
		Y  float64 `json:"Y"`
		XX float64 `json:"x"`
		YY float64 `json:"y"`
	}
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatal(err)
	}
	if math.Abs(rows[0].XX-0.31273) > 5e-6 || math.Abs(rows[0].YY-0.32902) > 5e-6 || rows[0].Y != 100 {
		t.Errorf("D65 as light: x %g y %g Y %g; want 0.31273 0.32902 100", rows[0].XX, rows[0].YY, rows[0].Y)
	}
}

// TestDescribePercent checks that percent data are recognised and give the
// same colour as the fractions.
func TestDescribePercent(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid{Start: 400, Step: 10, N: 31}
	f := func(nm float64) float64 { return 0.2 + 0.6/(1+math.Exp(-(nm-580)/15)) }
	frac := writeTemp(t, "frac.csv", columnsCSV(g, []string{"red"}, func(_ int, nm float64) float64 { return f(nm) }))
	pct := writeTemp(t, "pct.csv", columnsCSV(g, []string{"red"}, func(_ int, nm float64) float64 { return 100 * f(nm) }))
	var got [2]map[string]any
	for i, p := range []string{frac, pct} {
		code, out, errs := runCLI(t, "", "describe", p, "--json")
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		var rows []map[string]any
		if err := json.Unmarshal([]byte(out), &rows); err != nil {
			t.Fatal(err)
		}
		got[i] = rows[0]
	}
	if got[1]["scale"] != "percent" || got[0]["scale"] != "fraction" {
		t.Errorf("scales: %v, %v", got[0]["scale"], got[1]["scale"])
	}
	if w := got[1]["warnings"].([]any); len(w) != 1 || !strings.Contains(w[0].(string), "percent") {
		t.Errorf("percent warning missing: %v", w)
	}
	for _, k := range []string{"X", "Y", "Z"} {
		if a, b := got[0][k].(float64), got[1][k].(float64); math.Abs(a-b) > 1e-9*math.Abs(a) {
			t.Errorf("%s: fraction %g, percent %g", k, a, b)
		}
	}
}

// TestDescribeAgreesWithLibrary checks the table output against the
// library computed directly (the CLI must add nothing of its own).
func TestDescribeAgreesWithLibrary(t *testing.T) {
	t.Parallel()
	list, err := demoData("filters.csv")
	if err != nil {
		t.Fatal(err)
	}
	w, err := colorimetry.NewObjectWeights(cie.CIE1964(), cie.A(), colorimetry.Grid5nm)
	if err != nil {
		t.Fatal(err)
	}
	want, err := w.XYZ(list[1].s)
	if err != nil {
		t.Fatal(err)
	}
	code, out, errs := runCLI(t, "", "describe", "demo/filters.csv", "--as", "transmittance", "--illuminant", "a", "--observer", "1964", "--column", list[1].name)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var fields []string
	for _, line := range strings.Split(out, "\n") {
		if strings.HasPrefix(line, list[1].name+" ") {
			fields = strings.Fields(line)
		}
	}
	wantF := []string{fmt.Sprintf("%.4f", want.X), fmt.Sprintf("%.4f", want.Y), fmt.Sprintf("%.4f", want.Z)}
	if len(fields) < 4 || fields[1] != wantF[0] || fields[2] != wantF[1] || fields[3] != wantF[2] {
		t.Errorf("row %v, want X Y Z %v:\n%s", fields, wantF, out)
	}
}

func TestDescribeStdin(t *testing.T) {
	t.Parallel()
	code, out, errs := runCLI(t, "name;400;500;600;700\nwet sand;0,30;0,35;0,41;0,44\n", "describe", "-")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "wet sand") {
		t.Errorf("stdin spectrum missing:\n%s", out)
	}
}

func TestBadInput(t *testing.T) {
	t.Parallel()
	bad := writeTemp(t, "bad.csv", "nm,a\n400,0.1\n410,zz\n420,0.3\n")
	neg := writeTemp(t, "neg.csv", "nm,a\n400,0.1\n410,-0.2\n420,0.3\n")
	for _, tc := range []struct {
		args []string
		want []string // substrings of the one-line error
	}{
		{[]string{"describe", "/no/such/file.csv"}, []string{"/no/such/file.csv"}},
		{[]string{"describe", bad}, []string{"bad.csv:3", "zz"}},
		{[]string{"describe", neg}, []string{"neg.csv", "410 nm"}},
		{[]string{"describe", "demo/paints.csv", "--illuminant", "D66"}, []string{"--illuminant D66"}},
		{[]string{"describe", "demo/paints.csv", "--as", "paint"}, []string{"--as paint"}},
		{[]string{"describe", "demo/paints.csv", "--column", "nope"}, []string{"nope", "ky-teal"}},
		{[]string{"describe"}, []string{"name at least one"}},
		{[]string{"frobnicate"}, []string{"unknown command"}},
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
}

func TestHelpHasExamples(t *testing.T) {
	t.Parallel()
	for name := range commands {
		code, out, _ := runCLI(t, "", name, "--help")
		if code != 0 || !strings.Contains(out, "Example") || !strings.Contains(out, "antipode "+name) {
			t.Errorf("%s --help: exit %d, output:\n%s", name, code, out)
		}
	}
	for _, topic := range []string{"tolerances", "cautions"} {
		if code, out, _ := runCLI(t, "", "help", topic); code != 0 || len(out) < 200 {
			t.Errorf("help %s: exit %d", topic, code)
		}
	}
}

func TestDemo(t *testing.T) {
	t.Parallel()
	dir := filepath.Join(t.TempDir(), "out")
	code, out, errs := runCLI(t, "", "demo", "--out", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"tungsten-3200", "gel-magenta", "ky-barn-red"} {
		if !strings.Contains(out, want) {
			t.Errorf("demo output lacks %q", want)
		}
	}
	for _, f := range []string{"lamps.csv", "filters.csv", "paints.csv"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("demo --out: %v", err)
		}
	}
}

// TestSRGBSwatch checks the swatch against IEC 61966-2-1: the sRGB red
// primary, XYZ (41.24, 21.26, 1.93) at white Y = 100, encodes as #ff0000,
// and the D65 white as #ffffff.
func TestSRGBSwatch(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		c    colorimetry.XYZ
		want string
		in   bool
	}{
		{colorimetry.XYZ{X: 41.24, Y: 21.26, Z: 1.93}, "#ff0000", true},
		{d65sRGB, "#ffffff", true},
		{colorimetry.XYZ{X: 10, Y: 30, Z: 5}, "", false}, // a green beyond the sRGB primaries
	} {
		hex, in, err := srgbSwatch(tc.c, d65sRGB)
		if err != nil {
			t.Fatal(err)
		}
		if in != tc.in || (tc.want != "" && hex != tc.want) {
			t.Errorf("%v: %s (in gamut %v), want %s (%v)", tc.c, hex, in, tc.want, tc.in)
		}
	}
}

func TestCompareJSON(t *testing.T) {
	t.Parallel()
	code, out, errs := runCLI(t, "", "compare", "demo/paints.csv:ky-sage", "demo/paints.csv", "--also", "A,F11", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var rows []map[string]any
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatal(err)
	}
	if len(rows) != 9 {
		t.Fatalf("%d rows, want 9", len(rows))
	}
	// Keys named in the colour-quantities issue are a contract.
	for _, k := range []string{"dE76", "dE94", "dECMC", "dE00", "metamerism", "warnings"} {
		if _, ok := rows[0][k]; !ok {
			t.Errorf("key %q missing", k)
		}
	}
	// The library computed directly: ΔE00 of sage against teal under D65/2°.
	list, _ := demoData("paints.csv")
	var sage, teal colorimetry.Spectrum
	for _, s := range list {
		switch s.name {
		case "ky-sage":
			sage = s.s
		case "ky-teal":
			teal = s.s
		}
	}
	w, _ := colorimetry.NewObjectWeights(cie.CIE1931(), cie.D65(), colorimetry.Grid5nm)
	a, _ := w.XYZ(sage)
	b, _ := w.XYZ(teal)
	la, _ := a.Lab(w.White())
	lb, _ := b.Lab(w.White())
	want := colorimetry.DeltaE2000(la, lb)
	for _, r := range rows {
		m := r["metamerism"].(map[string]any)
		if _, ok := m["F11"]; !ok {
			t.Errorf("%v: metamerism lacks F11: %v", r["sample"], m)
		}
		switch r["sample"] {
		case "ky-teal":
			if got := r["dE00"].(float64); math.Abs(got-want) > 1e-12 {
				t.Errorf("dE00 %g, library %g", got, want)
			}
		case "ky-sage":
			if r["dE00"].(float64) != 0 || m["A"].(float64) != 0 {
				t.Errorf("identical pair: %v", r)
			}
		}
	}
}

// TestDescribeStreams checks describe on more rows than one printing block:
// the JSON is one valid array of every row, the table has one header and
// a line per spectrum.
func TestDescribeStreams(t *testing.T) {
	t.Parallel()
	var b strings.Builder
	b.WriteString("name,400,450,500,550,600,650,700\n")
	n := describeBlock*2 + 17
	for i := range n {
		fmt.Fprintf(&b, "swatch-%d,0.1,0.2,0.3,0.4,0.5,0.6,%.4f\n", i, 0.5+float64(i%100)/1000)
	}
	code, out, errs := runCLI(t, b.String(), "describe", "-", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var rows []map[string]any
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatal(err)
	}
	if len(rows) != n || rows[n-1]["name"] != fmt.Sprintf("swatch-%d", n-1) {
		t.Fatalf("%d rows, last %v", len(rows), rows[len(rows)-1]["name"])
	}
	code, out, errs = runCLI(t, b.String(), "describe", "-")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	headers, data := 0, 0
	for _, line := range strings.Split(out, "\n") {
		switch {
		case strings.HasPrefix(line, "name "):
			headers++
		case strings.HasPrefix(line, "swatch-"):
			data++
		}
	}
	if headers != 1 || data != n {
		t.Errorf("table: %d header lines, %d rows; want 1 and %d", headers, data, n)
	}
}

// TestDescribeMisplacedFlags checks that a flag the kind of spectrum makes
// meaningless is refused (exit 2, naming the flag) instead of being
// ignored, so that a mistyped --white cannot pass unnoticed; the same flags
// with the right kind work.
func TestDescribeMisplacedFlags(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		args []string
		flag string
	}{
		{[]string{"describe", "demo/paints.csv", "--white", "nope"}, "--white"},
		{[]string{"describe", "demo/paints.csv", "--cct-method", "robertson"}, "--cct-method"},
		{[]string{"describe", "demo/lamps.csv", "--as", "light", "--illuminant", "A"}, "--illuminant"},
	} {
		code, out, errs := runCLI(t, "", tc.args...)
		if code != 2 || out != "" || !strings.Contains(errs, tc.flag+" applies to") {
			t.Errorf("%v: exit %d, stdout %q, stderr %q", tc.args, code, out, errs)
		}
	}
	for _, args := range [][]string{
		{"describe", "demo/lamps.csv", "--as", "light", "--white", "D65", "--cct-method", "robertson"},
		{"describe", "demo/paints.csv", "--illuminant", "A"},
	} {
		if code, _, errs := runCLI(t, "", args...); code != 0 {
			t.Errorf("%v: exit %d, %s", args, code, errs)
		}
	}
}
