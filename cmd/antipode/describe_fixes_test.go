package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// describeJSON runs describe with --json and returns its rows; it fails
// the test unless describe exits 0.
func describeJSON(t *testing.T, args ...string) []map[string]any {
	t.Helper()
	code, out, errs := runCLI(t, "", append(append([]string{"describe"}, args...), "--json")...)
	if code != exitOK {
		t.Fatalf("describe %v: exit %d: %s", args, code, errs)
	}
	var rows []map[string]any
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatalf("describe %v: %v", args, err)
	}
	return rows
}

// describeRowWarnings returns the warnings of one describe JSON row.
func describeRowWarnings(t *testing.T, row map[string]any) []string {
	t.Helper()
	list, ok := row["warnings"].([]any)
	if !ok {
		t.Fatalf("warnings is %T, want an array", row["warnings"])
	}
	var out []string
	for _, w := range list {
		out = append(out, w.(string))
	}
	return out
}

// describeHasWarning reports whether any warning contains every one of parts.
func describeHasWarning(warns []string, parts ...string) bool {
	for _, w := range warns {
		all := true
		for _, p := range parts {
			all = all && strings.Contains(w, p)
		}
		if all {
			return true
		}
	}
	return false
}

// describeRefused checks a run that must be refused: exit 2, nothing on
// stdout, one line on stderr holding every one of want.
func describeRefused(t *testing.T, args []string, want ...string) {
	t.Helper()
	code, out, errs := runCLI(t, "", args...)
	if code != exitBad {
		t.Errorf("%v: exit %d, want %d; stderr %q", args, code, exitBad, errs)
	}
	if out != "" {
		t.Errorf("%v: printed %q on stdout", args, out)
	}
	if strings.Count(errs, "\n") != 1 {
		t.Errorf("%v: stderr is not one line: %q", args, errs)
	}
	for _, w := range want {
		if !strings.Contains(errs, w) {
			t.Errorf("%v: %q does not say %q", args, errs, w)
		}
	}
}

// describeConstCSV writes spectra with constant values in the columns layout on
// 380–780 nm at 10 nm.
func describeConstCSV(t *testing.T, name string, names []string, values []float64) string {
	t.Helper()
	g, err := colorimetry.NewGrid(380, 780, 10)
	if err != nil {
		t.Fatal(err)
	}
	return writeTemp(t, name, columnsCSV(g, names, func(j int, _ float64) float64 { return values[j] }))
}

// TestDescribeAboveOne checks finding 2: a dark sample of a percent file
// (here at 1.17 %, read as a fraction since its maximum is below 1.5)
// gets a warning naming its maximum and --scale percent, while a
// fluorescent-like 1.03 gets none (the threshold is 1.05, common practice
// (no source)). With --scale percent the dark sample is Y = 1.17 (the
// perfect diffuser has Y = 100, so a flat reflectance ρ gives Y = 100ρ:
// CIE 015 definition, from memory).
func TestDescribeAboveOne(t *testing.T) {
	t.Parallel()
	path := describeConstCSV(t, "pct.csv", []string{"white", "black", "bright"}, []float64{90, 1.17, 1.03})
	rows := describeJSON(t, path)
	if len(rows) != 3 {
		t.Fatalf("%d rows, want 3", len(rows))
	}
	if w := describeRowWarnings(t, rows[1]); !describeHasWarning(w, "reflectance reaches 1.17", "above 1", "--scale percent") {
		t.Errorf("black at 1.17 read as a fraction: warnings %q lack the above-1 warning", w)
	}
	if w := describeRowWarnings(t, rows[2]); describeHasWarning(w, "above 1") {
		t.Errorf("1.03 is within the fluorescent allowance, got %q", w)
	}
	if w := describeRowWarnings(t, rows[0]); describeHasWarning(w, "above 1") {
		t.Errorf("90 %% white got %q", w)
	}
	code, out, errs := runCLI(t, "", "describe", path, "--json", "--scale", "percent", "--column", "black")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var pct []map[string]any
	if err := json.Unmarshal([]byte(out), &pct); err != nil {
		t.Fatal(err)
	}
	if y := pct[0]["Y"].(float64); y < 1.17-1e-9 || y > 1.17+1e-9 {
		t.Errorf("--scale percent: Y = %g, want 1.17", y)
	}
	if w := describeRowWarnings(t, pct[0]); describeHasWarning(w, "above 1") {
		t.Errorf("--scale percent: got %q", w)
	}
	// Transmittance too, and the table shows the warning.
	code, out, _ = runCLI(t, "", "describe", path, "--as", "transmittance", "--column", "black")
	if code != exitOK || !strings.Contains(out, "transmittance reaches 1.17") {
		t.Errorf("transmittance table: exit %d, output lacks the warning:\n%s", code, out)
	}
}

// TestDescribeRefusesHugeValues checks finding 4: a reflectance or
// transmittance above 100 after scaling is no reflectance factor; it is
// refused with the file, data line, column and field, and the message
// prints no long run of digits.
func TestDescribeRefusesHugeValues(t *testing.T) {
	t.Parallel()
	body := "# two comment lines, then\n# the header\nnm,a,b\n"
	for nm := 380; nm <= 780; nm += 10 {
		v := "0.5"
		if nm == 430 {
			v = "1e308"
		}
		body += fmt.Sprintf("%d,0.4,%s\n", nm, v)
	}
	path := writeTemp(t, "huge.csv", body)
	for _, as := range []string{"reflectance", "transmittance"} {
		args := []string{"describe", path, "--as", as}
		// 430 nm is the 6th data line after the header on line 3.
		describeRefused(t, args, path+":9:3 (field b)", "430 nm", "1e+308", "not a "+as+" factor")
		_, _, errs := runCLI(t, "", args...)
		if regexp.MustCompile(`\d{20}`).MatchString(errs) {
			t.Errorf("%s: long number in %q", as, errs)
		}
	}
	// 150 given as a fraction is refused too; as percent it is 1.5 and only
	// warned about.
	describeRefused(t, []string{"describe", describeConstCSV(t, "f150.csv", []string{"a"}, []float64{150}), "--scale", "fraction"}, "value 150", "not a reflectance factor")
	rows := describeJSON(t, describeConstCSV(t, "p150.csv", []string{"a"}, []float64{150}))
	if w := describeRowWarnings(t, rows[0]); !describeHasWarning(w, "reaches 1.5", "above 1") || describeHasWarning(w, "--scale percent") {
		t.Errorf("150 %%: warnings %q, want the above-1 warning without the percent hint", w)
	}
}

// TestDescribeCoverage checks finding 3: data that miss 380–780 nm are
// refused naming their range; partial coverage of 400–700 nm and steps
// coarser than 20 nm are warned about with the measured range; the footer
// and JSON state the data's range beside the computation grid.
func TestDescribeCoverage(t *testing.T) {
	t.Parallel()
	write := func(name string, nm []float64, v float64) string {
		var b strings.Builder
		b.WriteString("nm,s\n")
		for _, w := range nm {
			fmt.Fprintf(&b, "%g,%g\n", w, v*w/nm[len(nm)-1]) // a slope: not neutral
		}
		return writeTemp(t, name, b.String())
	}
	span := func(lo, hi, step float64) []float64 {
		var out []float64
		for w := lo; w <= hi+step/2; w += step {
			out = append(out, w)
		}
		return out
	}
	um := write("um.csv", span(0.38, 0.78, 0.01), 0.2)
	describeRefused(t, []string{"describe", um}, um+":1: spectrum \"s\"", "0.38–0.78 nm", "µm")
	far := write("far.csv", span(1000, 1100, 10), 0.2)
	describeRefused(t, []string{"describe", far}, "1000–1100 nm", "380–780 nm")
	describeRefused(t, []string{"describe", far, "--as", "light"}, "1000–1100 nm")
	// Touching 780 nm at one end is no overlap either.
	describeRefused(t, []string{"describe", write("edge.csv", span(780, 900, 10), 0.2)}, "780–900 nm")

	narrow := write("narrow.csv", span(500, 600, 10), 0.2)
	rows := describeJSON(t, narrow)
	if w := describeRowWarnings(t, rows[0]); !describeHasWarning(w, "cover only 500–600 nm", "end values") {
		t.Errorf("500–600 nm: warnings %q", w)
	}
	if g := rows[0]["data_grid"]; g != "500–600 nm at 10 nm" {
		t.Errorf("data_grid = %v", g)
	}
	if g := rows[0]["grid"]; g != "360–830 nm at 1 nm" {
		t.Errorf("grid = %v (the computation grid must stay)", g)
	}
	rows = describeJSON(t, narrow, "--as", "light")
	if w := describeRowWarnings(t, rows[0]); !describeHasWarning(w, "cover only 500–600 nm", "zero") {
		t.Errorf("light 500–600 nm: warnings %q", w)
	}
	coarse := write("coarse.csv", span(400, 700, 100), 0.2)
	rows = describeJSON(t, coarse)
	if w := describeRowWarnings(t, rows[0]); !describeHasWarning(w, "every 100 nm", "400–700 nm") {
		t.Errorf("100 nm steps: warnings %q", w)
	}
	// 400–700 nm at 20 nm is what many instruments give: no warning.
	rows = describeJSON(t, write("ok.csv", span(400, 700, 20), 0.2))
	if w := describeRowWarnings(t, rows[0]); len(w) != 0 {
		t.Errorf("400–700 nm at 20 nm: warnings %q, want none", w)
	}
	code, out, errs := runCLI(t, "", "describe", narrow, coarse)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "\ndata: 500–600 nm at 10 nm; 400–700 nm at 100 nm\ngrid: 360–830 nm at 1 nm\n") {
		t.Errorf("footer does not state the data's ranges:\n%s", out)
	}
}

// TestCoverageCore checks the premise of checkCoverage's 400–700 nm: the
// CIE 1931 colour-matching functions (cie tables, CIE 015:2018 Table 1)
// carry under 1 % of each sum outside 400–700 nm, while 500–600 nm alone
// leaves far more out.
func TestCoverageCore(t *testing.T) {
	t.Parallel()
	outside := func(cmf colorimetry.Spectrum, lo, hi float64) float64 {
		var in, all float64
		g := cmf.Grid()
		for i := range cmf.Len() {
			v := cmf.Value(i)
			all += v
			if w := g.Wavelength(i); w >= lo && w <= hi {
				in += v
			}
		}
		return (all - in) / all
	}
	x, y, z := cie.CIE1931().CMF()
	for i, c := range []colorimetry.Spectrum{x, y, z} {
		if f := outside(c, coreLo, coreHi); f >= 0.01 {
			t.Errorf("CMF %d: %.4f of the sum lies outside %g–%g nm, want under 0.01", i, f, coreLo, coreHi)
		}
		if f := outside(c, 500, 600); f < 0.2 {
			t.Errorf("CMF %d: only %.4f lies outside 500–600 nm", i, f)
		}
	}
}

// TestDescribePlotCheckedFirst checks finding 7: a bad --plot (wrong
// extension, missing directory) is refused before anything is printed; a
// good one is written.
func TestDescribePlotCheckedFirst(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	describeRefused(t, []string{"describe", "demo/paints.csv", "--plot", filepath.Join(dir, "p.txt")}, "--plot", ".svg or .png")
	missing := filepath.Join(dir, "missing", "x.svg")
	describeRefused(t, []string{"describe", "demo/paints.csv", "--plot", missing}, "--plot "+missing, "does not exist")
	describeRefused(t, []string{"describe", "demo/paints.csv", "--json", "--plot", missing}, "does not exist")
	good := filepath.Join(dir, "p.svg")
	code, out, errs := runCLI(t, "", "describe", "demo/paints.csv", "--plot", good)
	if code != exitOK || out == "" {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if fi, err := os.Stat(good); err != nil || fi.Size() == 0 {
		t.Errorf("plot not written: %v", err)
	}
	left, _ := filepath.Glob(filepath.Join(dir, ".*tmp*"))
	if len(left) != 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

// TestDescribeFileColonName checks finding 12: FILE:NAME picks one
// spectrum, as in the other commands; together with --column it is
// refused, and an unknown name lists the file's names.
func TestDescribeFileColonName(t *testing.T) {
	t.Parallel()
	rows := describeJSON(t, "demo/paints.csv:ky-sage", "demo/filters.csv:gel-cyan")
	if len(rows) != 2 || rows[0]["name"] != "ky-sage" || rows[1]["name"] != "gel-cyan" {
		t.Fatalf("got %d rows: %v", len(rows), rows)
	}
	want := describeJSON(t, "demo/paints.csv", "--column", "ky-sage")
	if rows[0]["Y"] != want[0]["Y"] || rows[0]["file"] != "demo/paints.csv" {
		t.Errorf("FILE:NAME gave Y %v file %v, --column Y %v", rows[0]["Y"], rows[0]["file"], want[0]["Y"])
	}
	describeRefused(t, []string{"describe", "demo/paints.csv:ky-sage", "--column", "ky-teal"}, "demo/paints.csv:ky-sage", "--column ky-teal")
	describeRefused(t, []string{"describe", "demo/paints.csv:nope"}, `no spectrum named "nope"`, "ky-sage")
}

// TestDescribeMissingNameListsAll checks finding 13: the names listed
// with an unknown --column name include the ones that matched.
func TestDescribeMissingNameListsAll(t *testing.T) {
	t.Parallel()
	code, _, errs := runCLI(t, "", "describe", "demo/lamps.csv", "--as", "light", "--column", "wash-red,nope")
	if code != exitBad {
		t.Fatalf("exit %d", code)
	}
	for _, n := range []string{"tungsten-3200", "wash-red", "wash-green", "wash-blue", "wash-amber", "wash-cyan", "wash-lime", "batten-cool-white"} {
		if !strings.Contains(errs, n) {
			t.Errorf("%q does not list %s", errs, n)
		}
	}
	// The first name not found is the one reported, whatever the order.
	_, _, errs = runCLI(t, "", "describe", "demo/paints.csv", "--column", "zzz,aaa")
	if !strings.Contains(errs, `"zzz"`) {
		t.Errorf("%q does not report the first missing name", errs)
	}
}

// TestDescribePerfectBlack checks finding 16: an all-zero reflectance is
// L* = a* = b* = 0 with sRGB #000000, as compare and limits --check
// give it (CIE 015: L* = 116 f(Y/Yn) − 16 with f linear near 0, so Y = 0
// gives L* = 0: from memory); chromaticity and dominant wavelength stay
// null.
func TestDescribePerfectBlack(t *testing.T) {
	t.Parallel()
	path := describeConstCSV(t, "zero.csv", []string{"z"}, []float64{0})
	rows := describeJSON(t, path)
	r := rows[0]
	for _, k := range []string{"L", "a", "b", "C"} {
		if v, ok := r[k].(float64); !ok || v != 0 {
			t.Errorf("%s = %v, want 0", k, r[k])
		}
	}
	for _, k := range []string{"x", "y", "u_prime", "v_prime", "dominant_wavelength_nm", "complementary_wavelength_nm", "excitation_purity"} {
		if r[k] != nil {
			t.Errorf("%s = %v, want null", k, r[k])
		}
	}
	if r["srgb"] != "#000000" {
		t.Errorf("srgb = %v, want #000000", r["srgb"])
	}
	code, out, errs := runCLI(t, "", "compare", path, "demo/paints.csv:ky-lamp-black", "--json")
	if code != exitOK {
		t.Fatalf("compare: exit %d: %s", code, errs)
	}
	var cmp []struct {
		Lab []float64 `json:"lab_standard"`
	}
	if err := json.Unmarshal([]byte(out), &cmp); err != nil || len(cmp) != 1 || len(cmp[0].Lab) != 3 {
		t.Fatalf("compare JSON: %v %s", err, out)
	}
	for i, v := range cmp[0].Lab {
		if v != 0 {
			t.Errorf("compare: lab_standard[%d] = %g, describe gives 0", i, v)
		}
	}
	code, out, errs = runCLI(t, "", "limits", "--check", path, "--json")
	if code != exitOK {
		t.Fatalf("limits: exit %d: %s", code, errs)
	}
	var lim []map[string]any
	if err := json.Unmarshal([]byte(out), &lim); err != nil || len(lim) != 1 {
		t.Fatalf("limits JSON: %v %s", err, out)
	}
	if lim[0]["L"] != 0.0 {
		t.Errorf("limits: L = %v, describe gives 0", lim[0]["L"])
	}
	code, out, _ = runCLI(t, "", "describe", path)
	if code != exitOK || !regexp.MustCompile(`z +0\.0000 +0\.0000 +0\.0000 +— +— +0\.00 +0\.00 +0\.00 `).MatchString(out) {
		t.Errorf("table row of a black:\n%s", out)
	}
}

// TestIlluminantOutOfRange checks finding 22: daylight:K and planck:K
// outside their ranges (those 'antipode illuminants' lists: CIE 015:2018
// for the D series, 4000–25000 K; 500–1e6 K for Planck, this project's
// choice) say so, and a temperature that is not a number says that.
func TestIlluminantOutOfRange(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		want []string
	}{
		{"daylight:3000", []string{"3000 K is out of range", "4000–25000 K"}},
		{"planck:100", []string{"100 K is out of range", "500–1000000 K"}},
		{"Planck:2e6", []string{"2000000 K is out of range"}},
		{"daylight:warm", []string{`"warm" is not a number`}},
	} {
		describeRefused(t, []string{"describe", "demo/paints.csv", "--illuminant", tc.name}, append([]string{"--illuminant " + tc.name}, tc.want...)...)
	}
	// The other commands share the flag.
	describeRefused(t, []string{"compare", "demo/paints.csv:ky-sage", "demo/paints.csv:ky-sage-touchup", "--illuminant", "daylight:3000"}, "out of range")
	describeRefused(t, []string{"describe", "demo/paints.csv", "--illuminant", "D66"}, "not a known illuminant")
}

// TestDescribeNegativeLine checks the line-number item of finding 23: a
// negative value is placed at its data line, column and field (comment
// and blank lines counted as the reader counts them), with one kind of
// minus sign; percent data report the value as written.
func TestDescribeNegativeLine(t *testing.T) {
	t.Parallel()
	body := "# gels\nnm,a,b\n380,0.5,0.5\n\n# a remark inside the data\n390,0.5,0.5\n400,0.5,-0.5\n"
	for nm := 410; nm <= 780; nm += 10 {
		body += fmt.Sprintf("%d,0.5,0.5\n", nm)
	}
	path := writeTemp(t, "neg.csv", body)
	describeRefused(t, []string{"describe", path, "--as", "transmittance"}, path+":7:3 (field b), 400 nm", "negative value -0.5", "-0.01")
	_, _, errs := runCLI(t, "", "describe", path)
	if strings.Contains(errs, "−") {
		t.Errorf("mixed minus signs in %q", errs)
	}
	pct := writeTemp(t, "negpct.csv", strings.ReplaceAll(strings.ReplaceAll(body, "0.5", "50"), "-50", "-5"))
	describeRefused(t, []string{"describe", pct, "--scale", "percent"}, pct+":7:3 (field b)", "negative value -5 %", "-1 %")
	// The rows layout names the spectrum's own line.
	rows := "name,400,500,600,700\nok,0.5,0.5,0.5,0.5\nbad,0.5,-0.2,0.5,0.5\n"
	rp := writeTemp(t, "negrows.csv", rows)
	describeRefused(t, []string{"describe", rp}, rp+`:3: spectrum "bad", 500 nm`, "negative value -0.2")
	// Standard input cannot be read twice: the column is named instead.
	code, out, errs := runCLI(t, body, "describe", "-")
	if code != exitBad || out != "" || !strings.Contains(errs, `-: spectrum "b" (column 3), 400 nm`) {
		t.Errorf("stdin: exit %d, stderr %q", code, errs)
	}
}

// TestDescribeDominantRounded checks the raw-float item of finding 23: a
// neutral grey's dominant-wavelength warning gives its chromaticity to
// four decimals, as the table does.
func TestDescribeDominantRounded(t *testing.T) {
	t.Parallel()
	path := describeConstCSV(t, "grey.csv", []string{"grey"}, []float64{0.2})
	rows := describeJSON(t, path)
	w := describeRowWarnings(t, rows[0])
	if !describeHasWarning(w, "dominant wavelength undefined at x 0.3127, y 0.3290", "white point") {
		t.Errorf("warnings %q", w)
	}
	for _, s := range w {
		if regexp.MustCompile(`\d\.\d{6}`).MatchString(s) {
			t.Errorf("raw float in %q", s)
		}
	}
}

// TestDescribeUncertaintyNotNumber checks finding 24's --uncertainty
// item: a value that is neither a number nor a file says so.
func TestDescribeUncertaintyNotNumber(t *testing.T) {
	t.Parallel()
	describeRefused(t, []string{"describe", "demo/paints.csv", "--uncertainty", "abc"}, "--uncertainty abc: not a number and not a file")
	describeRefused(t, []string{"describe", "demo/paints.csv", "--uncertainty", "-1"}, "non-negative")
}
