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

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
	"github.com/antipode-color/antipode/mixing"
	"gonum.org/v1/gonum/floats/scalar"
)

// dyeCLIBands are synthetic absorptivities (per g/L) for the CLI tests: a
// known model from which calibration files are written, not reference data.
var dyeCLIBands = []struct {
	name              string
	peak, width, high float64
}{
	{"straw", 445, 35, 10},
	{"sky", 615, 45, 8},
	{"heather", 540, 30, 9},
}

// dyeCLIAbsorbance returns the absorbance at nm of the concentrations c
// over a base of 0.02.
func dyeCLIAbsorbance(c []float64, nm float64) float64 {
	a := 0.02
	for i, b := range dyeCLIBands {
		d := (nm - b.peak) / b.width
		a += c[i] * (0.04 + b.high*math.Exp(-0.5*d*d))
	}
	return a
}

// dyeCLISeries writes a noise-free dilution series in the rows layout.
func dyeCLISeries(t *testing.T) string {
	t.Helper()
	g := colorimetry.Grid5nm
	var b strings.Builder
	b.WriteString("name,dye,concentration (g/L),heldout")
	for j := range g.N {
		fmt.Fprintf(&b, ",%g", g.Wavelength(j))
	}
	b.WriteString("\n")
	row := func(name, dye, conc, held string, c []float64) {
		b.WriteString(name + "," + dye + "," + conc + "," + held)
		for j := range g.N {
			fmt.Fprintf(&b, ",%.17g", math.Pow(10, -dyeCLIAbsorbance(c, g.Wavelength(j))))
		}
		b.WriteString("\n")
	}
	row("blank", "base", "0", "0", []float64{0, 0, 0})
	for i, d := range dyeCLIBands {
		for _, v := range []float64{0.01, 0.03, 0.05, 0.08} {
			c := []float64{0, 0, 0}
			c[i] = v
			row(fmt.Sprintf("%s-%g", d.name, v), d.name, fmt.Sprint(v), "0", c)
		}
	}
	row("mix", "straw=0.02+heather=0.01", "", "1", []float64{0.02, 0, 0.01})
	return writeTemp(t, "series.csv", b.String())
}

func TestDyesCLIRoundTrip(t *testing.T) {
	t.Parallel()
	series := dyeCLISeries(t)
	model := filepath.Join(filepath.Dir(series), "dyes.json")
	code, out, errs := runCLI(t, "", "fit", "dyes", series, "--out", model)
	if code != 0 {
		t.Fatalf("fit: exit %d: %s", code, errs)
	}
	for _, want := range []string{"straw", "R² at peak", "held out: 1 samples", "wrote " + model} {
		if !strings.Contains(out, want) {
			t.Errorf("fit output lacks %q:\n%s", want, out)
		}
	}
	// A target made by the same law from known concentrations is solved
	// back to them (round trip of noise-free Beer–Lambert data; 1e-6
	// relative, the brief's acceptance level, common practice (no
	// source)).
	want := []float64{0.025, 0.012, 0.04}
	g := colorimetry.Grid5nm
	target := columnsCSV(g, []string{"wanted"}, func(_ int, nm float64) float64 {
		return math.Pow(10, -dyeCLIAbsorbance(want, nm))
	})
	tp := filepath.Join(filepath.Dir(series), "target.csv")
	if err := os.WriteFile(tp, []byte(target), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs = runCLI(t, "", "solve", model, "--target", tp, "--json")
	if code != 0 {
		t.Fatalf("solve: exit %d: %s", code, errs)
	}
	var sol struct {
		Recipes []struct {
			Amounts   map[string]float64 `json:"amounts"`
			DE00      float64            `json:"dE00"`
			Reachable bool               `json:"reachable"`
			Warnings  []string           `json:"warnings"`
			Y         float64            `json:"transmittance_Y"`
			Path      float64            `json:"path_length"`
			Unit      string             `json:"unit"`
		} `json:"recipes"`
	}
	if err := json.Unmarshal([]byte(out), &sol); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	r := sol.Recipes[0]
	if r.DE00 >= 0.01 || !r.Reachable || r.Warnings == nil || r.Path != 1 || r.Unit != "g/L" {
		t.Errorf("recipe %+v", r)
	}
	for i, d := range dyeCLIBands {
		if got := r.Amounts[d.name]; !scalar.EqualWithinAbsOrRel(got, want[i], 1e-9, 1e-6) {
			t.Errorf("%s = %.10g, want %g", d.name, got, want[i])
		}
	}

	// Human output of the same solve.
	code, out, errs = runCLI(t, "", "solve", model, "--target", tp)
	if code != 0 || !strings.Contains(out, "reachable") || !strings.Contains(out, "straw (g/L)") {
		t.Errorf("solve text: exit %d %s\n%s", code, errs, out)
	}
}

// TestDyesCLIMixNeutral checks mix on a neutral filter: a flat
// transmittance T has Y = 100·T under every illuminant (CIE 015:2018 §7,
// the normalisation k = 100/ΣSȳΔλ) and L* = 116·(Y/100)^(1/3) − 16
// (CIE 015:2018 eq. 8.1). A = 1 gives T = 0.1: Y = 10, L* = 37.84243;
// A = 2 gives Y = 1, L* = 8.99144 (computed from the formula).
func TestDyesCLIMixNeutral(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid5nm
	flat := make([]float64, g.N)
	for i := range flat {
		flat[i] = 1
	}
	m, err := mixing.NewDyes(g, "g/L", make([]float64, g.N), []mixing.Dye{{Name: "grey", Absorptivity: flat, CalibratedMax: 1}})
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := mixing.Save(&b, m); err != nil {
		t.Fatal(err)
	}
	model := writeTemp(t, "grey.json", b.String())
	outCSV := filepath.Join(filepath.Dir(model), "grey.csv")
	for _, c := range []struct {
		amounts, path, ill string
		wantY, wantL       float64
		warn               bool
	}{
		{"grey=0.5", "2", "D65", 10, 37.84243, false},
		{"grey=1", "1", "A", 10, 37.84243, false},
		{"grey=2", "1", "D65", 1, 8.99144, true}, // beyond the calibrated 1 g/L
		{"grey=0", "1", "D65", 100, 100, false},
	} {
		code, out, errs := runCLI(t, "", "mix", model, "--amounts", c.amounts, "--path-length", c.path, "--illuminant", c.ill, "--json", "--out", outCSV)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", c.amounts, code, errs)
		}
		var r struct {
			Y, L, A, B float64
			TY         float64  `json:"transmittance_Y"`
			Warnings   []string `json:"warnings"`
		}
		if err := json.Unmarshal([]byte(out), &r); err != nil {
			t.Fatal(err)
		}
		// 1e-9 on Y: summation rounding; L* to the 5 decimals computed.
		if !scalar.EqualWithinAbsOrRel(r.Y, c.wantY, 1e-9, 1e-9) || r.TY != r.Y ||
			!scalar.EqualWithinAbsOrRel(r.L, c.wantL, 5e-6, 0) || math.Abs(r.A) > 1e-9 || math.Abs(r.B) > 1e-9 {
			t.Errorf("%s under %s: %+v, want Y %g, L* %g, a* = b* = 0", c.amounts, c.ill, r, c.wantY, c.wantL)
		}
		if (len(r.Warnings) > 0) != c.warn {
			t.Errorf("%s: warnings %v", c.amounts, r.Warnings)
		}
		list, err := specio.ReadFile(outCSV)
		if err != nil {
			t.Fatal(err)
		}
		if got := list[0].Spectrum.At(550); !scalar.EqualWithinAbsOrRel(got, c.wantY/100, 1e-15, 1e-12) {
			t.Errorf("%s: --out file has T(550) = %v, want %v", c.amounts, got, c.wantY/100)
		}
	}
	code, out, _ := runCLI(t, "", "mix", model, "--amounts", "grey=0.25")
	if code != 0 || !strings.Contains(out, "luminous transmittance Y") || !strings.Contains(out, "L*") {
		t.Errorf("mix text output:\n%s", out)
	}
}

func TestDyesCLIDemo(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	model := filepath.Join(dir, "dyes.json")
	code, out, errs := runCLI(t, "", "fit", "dyes", "demo/dyes_dilutions.csv", "--out", model)
	if code != 0 {
		t.Fatalf("fit: exit %d: %s", code, errs)
	}
	// The demo's strongest amber sample is made to break the law (see
	// testdata/gen/make_dyes_demo.py); the report must flag it.
	if !strings.Contains(out, "Flagged samples") || !strings.Contains(out, "amber-0.1 ") {
		t.Errorf("demo fit does not flag amber-0.1:\n%s", out)
	}
	code, out, errs = runCLI(t, "", "fit", "dyes", "demo/dyes_dilutions.csv", "--out", filepath.Join(dir, "d2.json"), "--json", "--holdout", "0.1")
	if code != 0 {
		t.Fatalf("fit --json: exit %d: %s", code, errs)
	}
	var rep map[string]any
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"fit", "linearity", "breakdowns", "unit", "dyes"} {
		if _, ok := rep[k]; !ok {
			t.Errorf("fit --json lacks %q", k)
		}
	}
	code, out, errs = runCLI(t, "", "solve", model, "--target", "demo/dyes_target.csv")
	if code != 0 || !strings.Contains(out, "kestrel-amber-dye (g/L)") {
		t.Errorf("solve demo: exit %d %s\n%s", code, errs, out)
	}
}

func TestDyesCLIErrors(t *testing.T) {
	t.Parallel()
	series := dyeCLISeries(t)
	dir := filepath.Dir(series)
	model := filepath.Join(dir, "m.json")
	if code, _, errs := runCLI(t, "", "fit", "dyes", series, "--out", model); code != 0 {
		t.Fatal(errs)
	}
	body, err := os.ReadFile(series)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(body), "\n")
	noConc := strings.Replace(string(body), "concentration (g/L)", "amount", 1)
	single := strings.Join(append(append([]string{}, lines[:2]...), lines[4:]...), "\n") // straw only at 0.05, 0.08
	single = strings.Replace(single, "straw-0.05", "straw-x", 1)
	single = strings.Replace(single, ",straw,0.08,", ",straw,0.05,", 1)
	dupName := strings.Replace(string(body), "sky-0.03", "sky-0.01", 1)
	for _, c := range []struct {
		name string
		args []string
		file string // content of the measurement file, if any
		want []string
	}{
		{"missing concentration column", []string{"fit", "dyes", "FILE", "--out", filepath.Join(dir, "x.json")}, noConc,
			[]string{`no "concentration" column`, "amount, dye, heldout"}},
		{"single concentration", []string{"fit", "dyes", "FILE", "--out", filepath.Join(dir, "x.json")}, single,
			[]string{`dye "straw" has a single concentration`}},
		{"duplicate names", []string{"fit", "dyes", "FILE", "--out", filepath.Join(dir, "x.json")}, dupName,
			[]string{`"sky-0.01" used twice`}},
		{"no --out", []string{"fit", "dyes", series}, "", []string{"--out"}},
		{"--out over the input", []string{"fit", "dyes", series, "--out", series}, "", []string{"would replace the input"}},
		{"holdout 1", []string{"fit", "dyes", series, "--out", filepath.Join(dir, "x.json"), "--holdout", "1"}, "", []string{"--holdout"}},
		{"unknown dye", []string{"mix", model, "--amounts", "indigo=1"}, "", []string{`"indigo"`, "straw, sky, heather"}},
		{"negative amount", []string{"mix", model, "--amounts", "sky=-1"}, "", []string{"sky"}},
		{"no amounts", []string{"mix", model}, "", []string{"--amounts"}},
		{"target with two spectra", []string{"solve", model, "--target", "FILE"}, "nm,a,b\n400,0.5,0.5\n500,0.5,0.5\n600,0.5,0.5\n", []string{"FILE:NAME"}},
		{"no target", []string{"solve", model}, "", []string{"--target"}},
	} {
		args := append([]string(nil), c.args...)
		if c.file != "" {
			p := filepath.Join(t.TempDir(), "in.csv")
			if err := os.WriteFile(p, []byte(c.file), 0o644); err != nil {
				t.Fatal(err)
			}
			for i, a := range args {
				if a == "FILE" {
					args[i] = p
				}
			}
		}
		code, _, errs := runCLI(t, "", args...)
		if code != 2 {
			t.Errorf("%s: exit %d, want 2 (stderr %q)", c.name, code, errs)
			continue
		}
		if strings.Count(strings.TrimSpace(errs), "\n") != 0 {
			t.Errorf("%s: error is not one line: %q", c.name, errs)
		}
		for _, w := range c.want {
			if !strings.Contains(errs, w) {
				t.Errorf("%s: stderr %q lacks %q", c.name, errs, w)
			}
		}
	}
}

func TestDyesCLIHelp(t *testing.T) {
	t.Parallel()
	series := dyeCLISeries(t)
	model := filepath.Join(filepath.Dir(series), "h.json")
	if code, _, errs := runCLI(t, "", "fit", "dyes", series, "--out", model); code != 0 {
		t.Fatal(errs)
	}
	for _, args := range [][]string{
		{"fit", "dyes", "--help"},
		{"mix", model, "--help"},
		{"solve", model, "--help"},
	} {
		code, out, _ := runCLI(t, "", args...)
		if code != 0 || !strings.Contains(out, "Example:") || !strings.Contains(out, "$ antipode "+args[0]) {
			t.Errorf("%v: exit %d, help without a worked example:\n%s", args, code, out)
		}
	}
	_, out, _ := runCLI(t, "", "fit", "dyes", "--help")
	if !strings.Contains(out, "concentration (g/L)") || !strings.Contains(out, "heldout") {
		t.Errorf("fit dyes help does not document the layout:\n%s", out)
	}
}
