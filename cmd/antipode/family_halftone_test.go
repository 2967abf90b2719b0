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
	"github.com/antipode-color/antipode/colorimetry/specio"
	"github.com/antipode-color/antipode/mixing"
	"gonum.org/v1/gonum/floats/scalar"
)

// htCLIGrid is the grid of the CLI tests' synthetic charts.
var htCLIGrid = colorimetry.Grid{Start: 400, Step: 10, N: 31}

// htCLIPress is a synthetic three-ink press (invented ink bands, n = 1.7,
// dot gain e = 1 − (1 − a)^1.5): a known model from which chart files are
// written, not reference data.
func htCLIPress(t *testing.T) *mixing.Halftone {
	t.Helper()
	bands := [][3]float64{{630, 55, 0.9}, {535, 40, 0.8}, {440, 35, 0.75}}
	prim := make([]colorimetry.Spectrum, 8)
	for p := range prim {
		v := make([]float64, htCLIGrid.N)
		for j := range v {
			nm := htCLIGrid.Wavelength(j)
			a := 0.0
			for i, b := range bands {
				if p&(1<<i) != 0 {
					d := (nm - b[0]) / b[1]
					a += 0.03 + b[2]*math.Exp(-0.5*d*d)
				}
			}
			v[j] = 0.87 * math.Pow(10, -2*a)
		}
		var err error
		if prim[p], err = colorimetry.NewSpectrumOnGrid(htCLIGrid, v, colorimetry.Options{}); err != nil {
			t.Fatal(err)
		}
	}
	var nom, eff []float64
	for s := 0; s <= 20; s++ {
		a := float64(s) / 20
		nom, eff = append(nom, a), append(eff, 1-math.Pow(1-a, 1.5))
	}
	g, err := mixing.NewDotGain(nom, eff)
	if err != nil {
		t.Fatal(err)
	}
	m, err := mixing.NewHalftone(htCLIGrid, []string{"c", "m", "y"}, prim, []float64{1.7}, []mixing.DotGain{g, g, g}, 0)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// htCLIChart writes the press's chart in the rows layout (coverages in
// percent): every primary, ramps at 10 … 90 %, four overprint tints (two
// held out). edit may change a row's coverages or reflectance, or return
// false to drop it.
func htCLIChart(t *testing.T, m *mixing.Halftone, edit func(name string, cov []float64, r []float64) bool) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("name,c,m,y,heldout")
	for j := range htCLIGrid.N {
		fmt.Fprintf(&b, ",%g", htCLIGrid.Wavelength(j))
	}
	b.WriteString("\n")
	row := func(name string, cov []float64, held bool) {
		am := []mixing.Amount{{Name: "c", Value: cov[0]}, {Name: "m", Value: cov[1]}, {Name: "y", Value: cov[2]}}
		s, err := m.Reflectance(am)
		if err != nil {
			t.Fatal(err)
		}
		r := s.Values(nil)
		if edit != nil && !edit(name, cov, r) {
			return
		}
		h := "0"
		if held {
			h = "1"
		}
		fmt.Fprintf(&b, "%s,%g,%g,%g,%s", name, 100*cov[0], 100*cov[1], 100*cov[2], h)
		for _, v := range r {
			fmt.Fprintf(&b, ",%.6f", v)
		}
		b.WriteString("\n")
	}
	for p := range 8 {
		cov := []float64{float64(p & 1), float64(p >> 1 & 1), float64(p >> 2 & 1)}
		row(mixing.PrimaryName([]string{"c", "m", "y"}, p), cov, false)
	}
	for i, ink := range []string{"c", "m", "y"} {
		for l := 10; l <= 90; l += 10 {
			cov := make([]float64, 3)
			cov[i] = float64(l) / 100
			row(fmt.Sprintf("%s%d", ink, l), cov, false)
		}
	}
	for q, cov := range [][]float64{{0.4, 0.3, 0.3}, {0.2, 0.6, 0.1}, {0.7, 0.1, 0.5}, {0.5, 0.5, 0.2}} {
		row(fmt.Sprintf("mix%d", q+1), cov, q%2 == 1)
	}
	return writeTemp(t, "chart.csv", b.String())
}

// htCLIFitDemo fits the demo press into a temporary folder.
func htCLIFitDemo(t *testing.T, extra ...string) (string, string) {
	t.Helper()
	model := filepath.Join(t.TempDir(), "press.json")
	args := append([]string{"fit", "halftone", "demo/press_characterisation.csv", "--out", model}, extra...)
	code, out, errs := runCLI(t, "", args...)
	if code != 0 {
		t.Fatalf("fit: exit %d: %s", code, errs)
	}
	return model, out
}

// TestHalftoneCLIDemo runs the commands on the demo press. The demo chart
// is made by testdata/gen/make_press_demo.py from a known model (n = 1.65,
// dot gain e = 1 − (1 − a)^γ with γ = 1.55, 1.58, 1.50, 1.68) with seeded
// noise, so the fit must find those parameters back; the brick-red target
// was printed by the same model at c 12, m 78, y 85, k 6 %.
func TestHalftoneCLIDemo(t *testing.T) {
	t.Parallel()
	model, out := htCLIFitDemo(t, "--tac", "300")
	for _, want := range []string{"4 inks (c, m, y, k)", "Yule–Nielsen n = 1.6", "c+m+y+k", "Dot gain", "held out: 8 tints", "total area coverage limit 300 %"} {
		if !strings.Contains(out, want) {
			t.Errorf("fit output lacks %q:\n%s", want, out)
		}
	}
	_, out = htCLIFitDemo(t, "--json")
	var fit struct {
		N       []float64 `json:"n_factor"`
		SE      []float64 `json:"n_factor_se"`
		TAC     *float64  `json:"tac_percent"`
		InksFit []struct {
			Ink    string  `json:"ink"`
			Gain50 float64 `json:"dot_gain_50"`
		} `json:"inks_fit"`
		Primaries []struct {
			Name       string
			L, A, B    float64
			Replicates []string `json:"samples"`
		} `json:"primaries"`
		Fit mixing.FitReport `json:"fit"`
	}
	if err := json.Unmarshal([]byte(out), &fit); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	// n within 0.05 of the generator's 1.65 (its standard error is about
	// 0.005; 0.05 leaves room for the chart's noise).
	if len(fit.N) != 1 || math.Abs(fit.N[0]-1.65) > 0.05 || fit.TAC != nil {
		t.Errorf("n %v ± %v, tac %v", fit.N, fit.SE, fit.TAC)
	}
	gamma := map[string]float64{"c": 1.55, "m": 1.58, "y": 1.50, "k": 1.68}
	for _, f := range fit.InksFit {
		// The generator's gain at 50 %, 1 − 0.5^γ − 0.5, to a percentage
		// point (a tenth of the ramp's 10 % step: common practice (no
		// source)). It also lies within the 10–22 % that the printing
		// standards' tone-value-increase curves give at 50 % for offset
		// (ISO 12647-2; from memory).
		want := 0.5 - math.Pow(0.5, gamma[f.Ink])
		if math.Abs(f.Gain50-want) > 0.01 || f.Gain50 < 0.10 || f.Gain50 > 0.22 {
			t.Errorf("%s: dot gain at 50 %% %.4f, want %.4f", f.Ink, f.Gain50, want)
		}
	}
	// The paper near L* 95, as the standards' paper aims for coated stock
	// (ISO 12647-2:2013 paper type 1, L* 95: from memory).
	if p := fit.Primaries[0]; p.Name != "paper" || math.Abs(p.L-95) > 2 || len(p.Replicates) != 2 {
		t.Errorf("paper %+v", p)
	}
	if fit.Fit.HeldOut == nil || fit.Fit.HeldOut.Mean > 0.5 || fit.Fit.Illuminant != "D50" {
		t.Errorf("report %+v", fit.Fit)
	}

	// Solve the brick red: the closest-spectrum recipe finds the
	// generator's coverages to within 1.5 % (the target carries noise).
	code, out, errs := runCLI(t, "", "solve", model, "--target", "demo/press_target.csv:poster-brick", "--json")
	if code != 0 {
		t.Fatalf("solve: exit %d: %s", code, errs)
	}
	var sol struct {
		Recipes []map[string]any `json:"recipes"`
	}
	if err := json.Unmarshal([]byte(out), &sol); err != nil {
		t.Fatal(err)
	}
	r := sol.Recipes[0]
	// The keys of the one solve JSON shape, and the family's own.
	for _, k := range []string{"amounts", "dE00", "reachable", "warnings", "choice", "tac_percent", "tac_limit_percent", "effective", "L", "a", "b", "spectral_rms"} {
		if _, ok := r[k]; !ok {
			t.Errorf("solve JSON lacks %q", k)
		}
	}
	made := map[string]float64{"c": 0.12, "m": 0.78, "y": 0.85, "k": 0.06}
	am := r["amounts"].(map[string]any)
	for ink, want := range made {
		if got := am[ink].(float64); math.Abs(got-want) > 0.015 {
			t.Errorf("brick: %s = %.4f, printed with %.2f", ink, got, want)
		}
	}
	if r["reachable"] != true || r["dE00"].(float64) > 0.5 || r["tac_limit_percent"].(float64) != 300 {
		t.Errorf("brick: %v", r)
	}

	// The signal green is out of gamut: exit 0, the nearest printable
	// colour, not reachable.
	code, out, errs = runCLI(t, "", "solve", model, "--target", "demo/press_target.csv:signal-green")
	if code != 0 || !strings.Contains(out, "no") || !strings.Contains(out, "nearest printable colour") {
		t.Errorf("green: exit %d %s\n%s", code, errs, out)
	}

	// The grey balance, relative to the paper: every reached row within
	// 0.5 of its aim in a* and b* (the acceptance level), and the
	// curve written.
	curve := filepath.Join(filepath.Dir(model), "curve.csv")
	code, out, errs = runCLI(t, "", "greybalance", model, "--relative", "--steps", "7", "--json", "--out", curve)
	if code != 0 {
		t.Fatalf("greybalance: exit %d: %s", code, errs)
	}
	var gb struct {
		Inks  []string `json:"inks"`
		Aim   string   `json:"aim"`
		Steps []struct {
			Aim       map[string]float64 `json:"aim"`
			Lab       map[string]float64 `json:"lab"`
			Amounts   map[string]float64 `json:"amounts"`
			Reachable bool               `json:"reachable"`
		} `json:"steps"`
		Curve    []map[string]float64 `json:"curve"`
		DarkestL *float64             `json:"darkest_L"`
		Limit    *float64             `json:"tac_limit_percent"`
	}
	if err := json.Unmarshal([]byte(out), &gb); err != nil {
		t.Fatal(err)
	}
	if len(gb.Steps) != 7 || gb.Aim != "relative" || gb.DarkestL == nil || gb.Limit == nil || *gb.Limit != 300 || len(gb.Curve) < 10 {
		t.Fatalf("grey balance: %+v", gb)
	}
	for s, st := range gb.Steps {
		if !st.Reachable {
			t.Errorf("row %d not reached", s)
			continue
		}
		if math.Abs(st.Lab["a"]-st.Aim["a"]) >= 0.5 || math.Abs(st.Lab["b"]-st.Aim["b"]) >= 0.5 {
			t.Errorf("row %d: printed %v for aim %v", s, st.Lab, st.Aim)
		}
	}
	b, err := os.ReadFile(curve)
	if err != nil || !strings.HasPrefix(string(b), "L*,c %,m %,y %\n") {
		t.Errorf("curve file: %v\n%s", err, b)
	}
	code, out, _ = runCLI(t, "", "greybalance", model)
	if code != 0 || !strings.Contains(out, "absolute neutral aim") || !strings.Contains(out, "darkest neutral") {
		t.Errorf("greybalance text: exit %d\n%s", code, out)
	}
}

// TestHalftoneCLIMixLinear checks mix on a one-ink Murray–Davies model
// (n = 1, no dot gain): its reflectance is linear in the coverage, and
// tristimulus values are linear in reflectance (CIE 015:2018 §7, the
// weighted sum), so Y of a tint is (1 − a)·Y_paper + a·Y_solid.
func TestHalftoneCLIMixLinear(t *testing.T) {
	t.Parallel()
	g := htCLIGrid
	paper, solid := make([]float64, g.N), make([]float64, g.N)
	for j := range paper {
		nm := g.Wavelength(j)
		paper[j] = 0.85 + 0.0002*(nm-400)
		solid[j] = 0.05 + 0.8*math.Exp(-0.5*math.Pow((nm-600)/50, 2))
	}
	ps, _ := colorimetry.NewSpectrumOnGrid(g, paper, colorimetry.Options{})
	ss, _ := colorimetry.NewSpectrumOnGrid(g, solid, colorimetry.Options{})
	m, err := mixing.NewHalftone(g, []string{"orange"}, []colorimetry.Spectrum{ps, ss}, []float64{1}, nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := mixing.Save(&buf, m); err != nil {
		t.Fatal(err)
	}
	model := writeTemp(t, "orange.json", buf.String())
	w, err := colorimetry.NewObjectWeights(cie.CIE1931(), cie.D50(), colorimetry.ComputationGrid(g))
	if err != nil {
		t.Fatal(err)
	}
	yp, _ := w.XYZ(ps)
	ys, _ := w.XYZ(ss)
	outCSV := filepath.Join(filepath.Dir(model), "tint.csv")
	for _, a := range []float64{0, 0.25, 0.6, 1} {
		code, out, errs := runCLI(t, "", "mix", model, "--amounts", fmt.Sprintf("orange=%g", a), "--json", "--out", outCSV)
		if code != 0 {
			t.Fatalf("a %g: exit %d: %s", a, code, errs)
		}
		var r struct {
			Y, L      float64
			TAC       float64            `json:"tac_percent"`
			Effective map[string]float64 `json:"effective"`
		}
		if err := json.Unmarshal([]byte(out), &r); err != nil {
			t.Fatal(err)
		}
		want := (1-a)*yp.Y + a*ys.Y
		// 1e-9 relative: summation rounding (Sprague interpolation of the
		// 10 nm data is linear in the data too).
		if !scalar.EqualWithinAbsOrRel(r.Y, want, 1e-9, 1e-9) || r.TAC != 100*a || r.Effective["orange"] != a {
			t.Errorf("a %g: Y %.10g (want %.10g), tac %v, effective %v", a, r.Y, want, r.TAC, r.Effective)
		}
		list, err := specio.ReadFile(outCSV)
		if err != nil {
			t.Fatal(err)
		}
		if got := list[0].Spectrum.At(600); !scalar.EqualWithinAbsOrRel(got, (1-a)*ps.At(600)+a*ss.At(600), 1e-12, 1e-12) {
			t.Errorf("a %g: --out R(600) = %v", a, got)
		}
	}
	code, out, _ := runCLI(t, "", "mix", model, "--amounts", "orange=0.5")
	if code != 0 || !strings.Contains(out, "effective %") || !strings.Contains(out, "L*") {
		t.Errorf("mix text:\n%s", out)
	}
	// Grey balance needs three inks.
	code, _, errs := runCLI(t, "", "greybalance", model)
	if code != 2 || !strings.Contains(errs, "three inks") {
		t.Errorf("greybalance of one ink: exit %d %s", code, errs)
	}
}

// TestHalftoneCLIRoundTrip fits a synthetic three-ink chart and solves a
// target the same press printed: the fitted model finds its coverages to
// 0.01 (the chart is noise-free; the dot-gain curve is interpolated
// between 10 % knots).
func TestHalftoneCLIRoundTrip(t *testing.T) {
	t.Parallel()
	press := htCLIPress(t)
	chart := htCLIChart(t, press, nil)
	model := filepath.Join(filepath.Dir(chart), "print.json")
	code, out, errs := runCLI(t, "", "fit", "halftone", chart, "--out", model)
	if code != 0 {
		t.Fatalf("fit: exit %d %s", code, errs)
	}
	if !strings.Contains(out, "n = 1.700") {
		t.Errorf("fit did not find n = 1.7:\n%s", out)
	}
	want := []float64{0.35, 0.55, 0.2}
	s, err := press.Reflectance([]mixing.Amount{{Name: "c", Value: want[0]}, {Name: "m", Value: want[1]}, {Name: "y", Value: want[2]}})
	if err != nil {
		t.Fatal(err)
	}
	tp := writeTemp(t, "target.csv", columnsCSV(htCLIGrid, []string{"wanted"}, func(_ int, nm float64) float64 { return s.At(nm) }))
	code, out, errs = runCLI(t, "", "solve", model, "--target", tp, "--json")
	if code != 0 {
		t.Fatalf("solve: exit %d %s", code, errs)
	}
	var sol struct {
		Recipes []struct {
			Amounts   map[string]float64 `json:"amounts"`
			DE00      float64            `json:"dE00"`
			Reachable bool               `json:"reachable"`
		} `json:"recipes"`
	}
	if err := json.Unmarshal([]byte(out), &sol); err != nil {
		t.Fatal(err)
	}
	r := sol.Recipes[0]
	for i, ink := range []string{"c", "m", "y"} {
		if math.Abs(r.Amounts[ink]-want[i]) > 0.01 {
			t.Errorf("%s = %.4f, want %.2f", ink, r.Amounts[ink], want[i])
		}
	}
	if !r.Reachable || r.DE00 > 0.1 {
		t.Errorf("recipe %+v", r)
	}
	// A limit below the target's 110 %: the sum stays within it.
	code, out, _ = runCLI(t, "", "solve", model, "--target", tp, "--tac", "90", "--json")
	if code != 0 || !strings.Contains(out, `"tac_limit_percent": 90`) || !strings.Contains(out, "at the limit of 90 %") {
		t.Errorf("--tac 90: exit %d\n%s", code, out)
	}
}

// TestHalftoneCLIBadInput checks that bad charts and flags give one line
// on stderr naming what and where, and exit 2.
func TestHalftoneCLIBadInput(t *testing.T) {
	t.Parallel()
	press := htCLIPress(t)
	missing := htCLIChart(t, press, func(name string, _, _ []float64) bool { return name != "c+m" && name != "c+m+y" })
	notMonotone := htCLIChart(t, press, func(name string, cov, r []float64) bool {
		if name == "m60" {
			// Printed as light as the 20 % patch.
			s, _ := press.Reflectance([]mixing.Amount{{Name: "m", Value: 0.2}})
			copy(r, s.Values(nil))
		}
		return true
	})
	tooMuch := htCLIChart(t, press, func(name string, cov, _ []float64) bool {
		if name == "y40" {
			cov[2] = 1.2
		}
		return true
	})
	good := htCLIChart(t, press, nil)
	model := filepath.Join(filepath.Dir(good), "print.json")
	if code, _, errs := runCLI(t, "", "fit", "halftone", good, "--out", model); code != 0 {
		t.Fatal(errs)
	}
	for _, c := range []struct {
		args []string
		want []string
	}{
		{[]string{"fit", "halftone", missing, "--out", model + "2"}, []string{"missing primaries: c+m, c+m+y"}},
		{[]string{"fit", "halftone", notMonotone, "--out", model + "2"}, []string{`ramp of ink "m" is not monotone`, "m 60 %", `patch "m60"`}},
		{[]string{"fit", "halftone", tooMuch, "--out", model + "2"}, []string{"chart.csv:", "field y", "outside 0–100 %"}},
		{[]string{"fit", "halftone", good, "--out", good}, []string{"would replace the input"}},
		{[]string{"fit", "halftone", good, "--out", model + "2", "--n", "0.5"}, []string{"--n 0.5"}},
		{[]string{"fit", "halftone", good, "--out", model + "2", "--n", "2", "--per-ink-n"}, []string{"exclude each other"}},
		{[]string{"fit", "halftone", "demo/press_target.csv", "--out", model + "2"}, []string{"rows layout"}},
		{[]string{"solve", model}, []string{"give one target"}},
		{[]string{"solve", model, "--lab", "50,0,0", "--ink-max", "c=95"}, []string{"0.95"}},
		{[]string{"solve", model, "--lab", "50,0,0", "--fix", "k=0.1"}, []string{"no such ink", `"k"`}},
		{[]string{"solve", model, "--lab", "50,0,0", "--tac", "-5"}, []string{"--tac -5"}},
		{[]string{"mix", model, "--amounts", "c=40"}, []string{"0–1"}},
		{[]string{"greybalance", model, "--steps", "1"}, []string{"--steps 1"}},
		{[]string{"greybalance", model, "--inks", "c,m,z"}, []string{"--inks", `"z"`}},
		{[]string{"greybalance", "demo/press_target.csv"}, []string{"press_target.csv"}},
	} {
		code, _, errs := runCLI(t, "", c.args...)
		if code != 2 || strings.Count(strings.TrimSpace(errs), "\n") > 0 {
			t.Errorf("%v: exit %d, stderr %q", c.args, code, errs)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(errs, w) {
				t.Errorf("%v: stderr %q lacks %q", c.args, errs, w)
			}
		}
	}
}

// TestHalftoneCLIHelp checks that each command's help shows the layout
// and a worked example.
func TestHalftoneCLIHelp(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		args []string
		want []string
	}{
		{[]string{"fit", "halftone", "--help"}, []string{"PERCENT", "ink:NAME", "heldout", "Example", "antipode fit halftone", "--tac"}},
		{[]string{"greybalance", "--help"}, []string{"--relative", "from memory", "Example", "antipode greybalance"}},
		{[]string{"help", "greybalance"}, []string{"Example"}},
	} {
		code, out, _ := runCLI(t, "", c.args...)
		if code != 0 {
			t.Errorf("%v: exit %d", c.args, code)
		}
		for _, w := range c.want {
			if !strings.Contains(out, w) {
				t.Errorf("%v: help lacks %q", c.args, w)
			}
		}
	}
	model, _ := htCLIFitDemo(t)
	for _, cmd := range []string{"solve", "mix"} {
		code, out, _ := runCLI(t, "", cmd, model, "--help")
		if code != 0 || !strings.Contains(out, "Example") || !strings.Contains(out, "antipode "+cmd+" press.json") {
			t.Errorf("%s --help: exit %d\n%s", cmd, code, out)
		}
	}
}
