package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"
)

// TestScaleFlagOnCheckAndComplement checks the --scale flag of limits
// --check and complement --as reflectance on a flat 40 % grey written in
// percent: read as percent it is Y = 40, L* = 116·0.4^⅓ − 16 = 69.4695
// (CIE 015:2018 §8.2.1), and its additive complement 1 − r is the flat 60 %
// grey, Y = 60; read as fraction, a reflectance of 40 is not realisable and
// is flagged as above 1. The flag is refused where it does not apply.
// Tolerance 1e-9: a flat spectrum's Y is exact to round-off.
func TestScaleFlagOnCheckAndComplement(t *testing.T) {
	t.Parallel()
	f := flatCSV(t, "grey40.csv", map[string]float64{"grey40": 40}, "grey40")

	code, out, errs := runCLI(t, "", "limits", "--check", f, "--scale", "percent", "--json")
	if code != 0 {
		t.Fatalf("limits --check --scale percent: exit %d: %s", code, errs)
	}
	var rows []struct {
		L float64 `json:"L"`
	}
	if err := json.Unmarshal([]byte(out), &rows); err != nil || len(rows) != 1 {
		t.Fatalf("limits --check: %v %s", err, out)
	}
	if want := 116*math.Cbrt(0.4) - 16; math.Abs(rows[0].L-want) > 1e-9 {
		t.Errorf("limits --check: L* %.6f, want %.6f", rows[0].L, want)
	}

	code, out, errs = runCLI(t, "", "complement", f, "--as", "reflectance", "--scale", "percent", "--json")
	if code != 0 {
		t.Fatalf("complement --scale percent: exit %d: %s", code, errs)
	}
	var c map[string]any // a map: the keys Y and y differ only in case
	if err := json.Unmarshal([]byte(out), &c); err != nil {
		t.Fatal(err)
	}
	if y, _ := c["Y"].(float64); math.Abs(y-60) > 1e-9 {
		t.Errorf("complement of the 40 %% grey: Y %v, want 60", c["Y"])
	}

	code, out, _ = runCLI(t, "", "limits", "--check", f, "--scale", "fraction")
	if code != 0 || !strings.Contains(out, "reflectance reaches 40") || !strings.Contains(out, "NO") {
		t.Errorf("limits --check --scale fraction: exit %d\n%s", code, out)
	}
	for _, args := range [][]string{
		{"limits", "--scale", "percent"},
		{"limits", "--check", f, "--scale", "pct"},
		{"complement", f, "--scale", "percent"},
	} {
		if code, out, _ := runCLI(t, "", args...); code != 2 || out != "" {
			t.Errorf("%v: exit %d, stdout %q; want a refusal", args, code, out)
		}
	}
}

// TestAmbiguousName checks that FILE:NAME refuses a name that two spectra
// of a rows-layout file share (repeat measurements are allowed there),
// naming both lines, instead of taking one of them; and that the list of
// names in a "no spectrum named" message is cut after 12.
func TestAmbiguousName(t *testing.T) {
	t.Parallel()
	f := writeTemp(t, "dup.csv", "name,400,500,600,700\nred,0.1,0.1,0.5,0.6\nred,0.1,0.2,0.5,0.6\nblue,0.5,0.3,0.1,0.1\n")
	code, out, errs := runCLI(t, "", "pair", f+":red", f+":blue", "--as", "reflectance")
	if code != 2 || out != "" || !strings.Contains(errs, `2 spectra are named "red" (lines 2, 3)`) {
		t.Errorf("ambiguous name: exit %d, stdout %q, stderr %q", code, out, errs)
	}
	var b strings.Builder
	b.WriteString("name,400,500,600,700\n")
	for i := range 20 {
		fmt.Fprintf(&b, "s%02d,0.1,0.2,0.3,0.4\n", i)
	}
	g := writeTemp(t, "many.csv", b.String())
	_, _, errs = runCLI(t, "", "pair", g+":nope", g+":s01", "--as", "reflectance")
	if !strings.Contains(errs, "s11, and 8 more)") || strings.Contains(errs, "s12") {
		t.Errorf("names list not cut after 12: %q", errs)
	}
}

// TestDescribeNoSwatchSaysWhy checks that describe explains an empty sRGB
// column: under a deep-red LED as illuminant the Bradford adaptation to
// D65 has no positive cone response for the white, so there is no swatch.
func TestDescribeNoSwatchSaysWhy(t *testing.T) {
	t.Parallel()
	code, out, errs := runCLI(t, "", "describe", "demo/paints.csv", "--illuminant", "demo/lamps.csv:wash-red", "--column", "ky-sage", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var rows []map[string]any
	if err := json.Unmarshal([]byte(out), &rows); err != nil || len(rows) != 1 {
		t.Fatalf("%v %s", err, out)
	}
	if rows[0]["srgb"] != nil || !strings.Contains(fmt.Sprint(rows[0]["warnings"]), "no sRGB swatch") {
		t.Errorf("srgb %v, warnings %v", rows[0]["srgb"], rows[0]["warnings"])
	}
}

// TestIlluminantSpelling checks that a CIE illuminant typed in any case is
// shown in the CIE's spelling (D65, LED-B3, daylight:5000).
func TestIlluminantSpelling(t *testing.T) {
	t.Parallel()
	for typed, shown := range map[string]string{"d65": "under D65,", "led-b3": "under LED-B3,", "Daylight:5000": "under daylight:5000,"} {
		code, out, errs := runCLI(t, "", "describe", "demo/paints.csv", "--illuminant", typed, "--column", "ky-sage")
		if code != 0 || !strings.Contains(out, shown) {
			t.Errorf("--illuminant %s: exit %d, want %q in\n%s%s", typed, code, shown, out, errs)
		}
	}
}

// TestDescribeUnevenData checks that data with uneven wavelengths (resampled
// to 1 nm on reading) are reported with their widest gap, in the data line
// and the data_grid key, and warned when it exceeds 20 nm.
func TestDescribeUnevenData(t *testing.T) {
	t.Parallel()
	f := writeTemp(t, "gap.csv", "nm,s\n380,0.1\n381,0.1\n480,0.3\n580,0.5\n680,0.6\n780,0.6\n")
	code, out, errs := runCLI(t, "", "describe", f)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"data: 380–780 nm, uneven steps up to 100 nm (resampled at 1 nm)", "gaps of up to 100 nm"} {
		if !strings.Contains(out, want) {
			t.Errorf("no %q in\n%s", want, out)
		}
	}
}

// TestDescribeSharedWarningOnce checks that a warning several spectra share
// (here the percent scale of a whole file) is printed once, naming the
// first three spectra and how many more.
func TestDescribeSharedWarningOnce(t *testing.T) {
	t.Parallel()
	f := flatCSV(t, "pct.csv", map[string]float64{"a": 40, "b": 50, "c": 60, "d": 70, "e": 80}, "a", "b", "c", "d", "e")
	code, out, errs := runCLI(t, "", "describe", f)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var lines []string
	for _, l := range strings.Split(out, "\n") {
		if strings.Contains(l, "taken as percent") {
			lines = append(lines, l)
		}
	}
	if len(lines) != 1 || !strings.Contains(lines[0], "a, b, c and 2 more: ") {
		t.Errorf("percent warning lines %q", lines)
	}
}

// TestPartnerLeavesOutA checks that partner does not rank A against itself
// when the library holds it, from a file or from standard input, and that
// the other candidates keep their library indices.
func TestPartnerLeavesOutA(t *testing.T) {
	t.Parallel()
	lamps, err := os.ReadFile("demo/lamps.csv")
	if err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{
		{"partner", "demo/lamps.csv:wash-amber", "demo/lamps.csv", "--top", "0", "--json"},
		{"partner", "-:wash-amber", "demo/lamps.csv", "--top", "0", "--json"},
	} {
		code, out, errs := runCLI(t, string(lamps), args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, errs)
		}
		var rows []struct {
			Name  string `json:"name"`
			Index int    `json:"index"`
		}
		if err := json.Unmarshal([]byte(out), &rows); err != nil {
			t.Fatal(err)
		}
		if len(rows) != 7 {
			t.Errorf("%v: %d candidates, want the 7 other spectra", args, len(rows))
		}
		for _, r := range rows {
			if r.Name == "wash-amber" || (r.Name == "wash-cyan" && r.Index != 5) {
				t.Errorf("%v: row %+v", args, r)
			}
		}
	}
}
