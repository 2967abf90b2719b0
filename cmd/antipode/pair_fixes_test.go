package main

import (
	"encoding/json"
	"flag"
	"math"
	"os"
	"slices"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/colorimetry"
)

// The spectra in these tests are synthetic shapes that exercise the
// command line's behaviour (which spectrum a warning names, which flag an
// error names); no value here is checked against a reference.

// grid380 is 380–780 nm at 10 nm, the range and a spacing of common
// spectrophotometer exports: common practice (no source).
var grid380 = colorimetry.Grid{Start: 380, Step: 10, N: 41}

// sage is a smooth mid-green reflectance, 0.1–0.4.
func sage(nm float64) float64 { return 0.25 + 0.15*math.Cos((nm-530)/80) }

// TestCompareWarningNamesSpectrum: finding 5 of the CLI review. The
// percent warning names the spectrum it concerns, standard or sample, in
// the table and in every --json warning string; the standard's warning is
// printed once however many samples there are.
func TestCompareWarningNamesSpectrum(t *testing.T) {
	t.Parallel()
	pct := writeTemp(t, "pct.csv", columnsCSV(grid380, []string{"std-pct"}, func(_ int, nm float64) float64 { return 100 * sage(nm) }))
	frac := writeTemp(t, "frac.csv", columnsCSV(grid380, []string{"smp-a", "smp-b"}, func(j int, nm float64) float64 { return sage(nm) * (1 + 0.02*float64(j)) }))
	fracPct := writeTemp(t, "fracpct.csv", columnsCSV(grid380, []string{"smp-pct"}, func(_ int, nm float64) float64 { return 100 * sage(nm) }))
	oneFrac := writeTemp(t, "one.csv", columnsCSV(grid380, []string{"std-frac"}, func(_ int, nm float64) float64 { return sage(nm) }))

	for _, tc := range []struct {
		std, smp  string
		want      string // the one percent warning's start
		notPrefix string // no warning may start with this
	}{
		{pct, frac, "standard std-pct: values taken as percent", "sample "},
		{oneFrac, fracPct, "sample smp-pct: values taken as percent", "standard "},
	} {
		code, out, errs := runCLI(t, "", "compare", tc.std, tc.smp, "--json")
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		var rows []compareRow
		if err := json.Unmarshal([]byte(out), &rows); err != nil {
			t.Fatal(err)
		}
		for _, r := range rows {
			if !slices.ContainsFunc(r.Warnings, func(w string) bool { return strings.HasPrefix(w, tc.want) }) {
				t.Errorf("%s: warnings %q lack %q", r.Sample, r.Warnings, tc.want)
			}
			for _, w := range r.Warnings {
				if strings.HasPrefix(w, tc.notPrefix) || strings.HasPrefix(w, "values taken") {
					t.Errorf("%s: warning %q names the wrong spectrum or none", r.Sample, w)
				}
			}
		}
		code, out, errs = runCLI(t, "", "compare", tc.std, tc.smp)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		if n := strings.Count(out, tc.want); n != 1 {
			t.Errorf("table: %q appears %d times, want once:\n%s", tc.want, n, out)
		}
	}
}

// TestPairPartnerMixDeltaUVPrime: finding 6. partner's entries carry
// mix_delta_uv_prime equal to their delta_uv_prime (best ratio), and it
// equals pair's mix_delta_uv_prime for the same two spectra; pair's
// delta_uv_prime is of A + B as given and differs. Subtractive entries have
// mix_delta_uv_prime null. Help and tables say which mix a figure is of.
func TestPairPartnerMixDeltaUVPrime(t *testing.T) {
	t.Parallel()
	pairJSON := func(b string) map[string]any {
		code, out, errs := runCLI(t, "", "pair", "demo/lamps.csv:wash-amber", "demo/lamps.csv:"+b, "--json")
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		var r map[string]any
		if err := json.Unmarshal([]byte(out), &r); err != nil {
			t.Fatal(err)
		}
		return r
	}
	code, out, errs := runCLI(t, "", "partner", "demo/lamps.csv:wash-amber", "demo/lamps.csv", "--top", "0", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var ranked []map[string]any
	if err := json.Unmarshal([]byte(out), &ranked); err != nil {
		t.Fatal(err)
	}
	byName := map[string]map[string]any{}
	for _, p := range ranked {
		if p["mix_delta_uv_prime"] != p["delta_uv_prime"] {
			t.Errorf("%v: mix_delta_uv_prime %v differs from delta_uv_prime %v", p["name"], p["mix_delta_uv_prime"], p["delta_uv_prime"])
		}
		byName[p["name"].(string)] = p
	}
	for _, b := range []string{"wash-blue", "wash-cyan", "wash-green"} {
		r := pairJSON(b)
		got, want := byName[b]["mix_delta_uv_prime"].(float64), r["mix_delta_uv_prime"].(float64)
		// Both are the minimum of Δu′v′ over the mixing ratio, found by
		// two routes (pair: MixRatio on the spectra; partner: the library's
		// precomputed XYZ); 1e-6 is far below the 1e-3 tolerance.
		if math.Abs(got-want) > 1e-6 {
			t.Errorf("%s: partner mix_delta_uv_prime %.6g, pair %.6g", b, got, want)
		}
	}
	// wash-blue is far from its best ratio as given (review: 0.14169 as
	// given, 0.11430 at the best ratio).
	if r := pairJSON("wash-blue"); !(r["delta_uv_prime"].(float64) > r["mix_delta_uv_prime"].(float64)+0.01) {
		t.Errorf("pair wash-blue: delta_uv_prime %v, mix_delta_uv_prime %v", r["delta_uv_prime"], r["mix_delta_uv_prime"])
	}
	// wash-cyan is at its best ratio as given (ratio t = 1.000004): the
	// spectral RMS of the two commands then differs only by the grid it is
	// taken on (pair: the files' 5 nm grid; partner: 1 nm, 360–830 nm),
	// 1.5302 against 1.5224 when this was written; 1 % bounds that.
	rp, pp := pairJSON("wash-cyan")["spectral_rms"].(float64), byName["wash-cyan"]["spectral_rms"].(float64)
	if math.Abs(rp-pp) > 0.01*rp {
		t.Errorf("wash-cyan spectral RMS: pair %.5g, partner %.5g", rp, pp)
	}

	code, out, errs = runCLI(t, "", "partner", "demo/filters.csv:gel-deep-amber", "demo/filters.csv", "--mode", "subtractive", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	ranked = nil
	if err := json.Unmarshal([]byte(out), &ranked); err != nil {
		t.Fatal(err)
	}
	for _, p := range ranked {
		if v, ok := p["mix_delta_uv_prime"]; !ok || v != nil {
			t.Errorf("subtractive %v: mix_delta_uv_prime %v (present %v), want null", p["name"], v, ok)
		}
	}

	for _, tc := range []struct {
		args []string
		want []string
	}{
		{[]string{"pair", "--help"}, []string{"[delta_uv_prime]", "[mix_delta_uv_prime]", "as given", "best ratio"}},
		{[]string{"partner", "--help"}, []string{"[mix_delta_uv_prime", "spectral RMS", "as given", "best ratio"}},
		{[]string{"pair", "demo/lamps.csv:wash-amber", "demo/lamps.csv:wash-cyan"}, []string{"Δu′v′ of A + B as given", "spectral RMS residual, as given", "Δu′v′ at the best ratio"}},
		{[]string{"partner", "demo/lamps.csv:wash-amber", "demo/lamps.csv"}, []string{"Δu′v′ at best ratio", "spectral RMS at best ratio"}},
	} {
		_, out, _ := runCLI(t, "", tc.args...)
		for _, w := range tc.want {
			if !strings.Contains(out, w) {
				t.Errorf("%v: output lacks %q", tc.args, w)
			}
		}
	}
}

// TestPairOptionErrorsNameFlag: finding 11. Every bad tolerance or layer
// option is refused by its flag name, before any file is read (the
// spectra named here do not exist), by pair and by partner alike.
func TestPairOptionErrorsNameFlag(t *testing.T) {
	t.Parallel()
	fields := []string{"DeltaUVPrime", "SpectralRMS", "BlackY", "NeutralY", "NeutralChroma", "FactorA", "FactorB", "invalid option"}
	for _, tc := range []struct {
		flag, value, want string
	}{
		{"--tolerance-uv-prime", "-1", "--tolerance-uv-prime -1: want a positive"},
		{"--tolerance-uv-prime", "0", "--tolerance-uv-prime 0: want a positive"},
		{"--tolerance-spectral", "NaN", "--tolerance-spectral NaN: want a positive"},
		{"--black-y", "-0.5", "--black-y -0.5: want a positive"},
		{"--black-y", "150", "--black-y 150: want a luminous transmittance Y of at most 100"},
		{"--neutral-y", "0.5", "--neutral-y 0.5 is below --black-y 1"},
		{"--neutral-chroma", "-2", "--neutral-chroma -2: want a positive"},
		{"--factor-a", "Inf", "--factor-a +Inf: want a positive"},
		{"--factor-b", "-1", "--factor-b -1: want a positive"},
	} {
		for _, cmd := range []string{"pair", "partner"} {
			code, _, errs := runCLI(t, "", cmd, "no-such-a.csv:x", "no-such-b.csv", tc.flag, tc.value)
			if code != 2 || !strings.Contains(errs, tc.want) {
				t.Errorf("%s %s %s: exit %d, %q; want 2 and %q", cmd, tc.flag, tc.value, code, errs, tc.want)
			}
			for _, f := range fields {
				if strings.Contains(errs, f) {
					t.Errorf("%s %s %s: %q shows %q", cmd, tc.flag, tc.value, errs, f)
				}
			}
		}
	}
	// partner takes library entries as they are.
	code, _, errs := runCLI(t, "", "partner", "no-such-a.csv:x", "no-such-b.csv", "--factor-b", "2")
	if code != 2 || !strings.Contains(errs, "--factor-b 2: partner takes the library's spectra as they are") {
		t.Errorf("partner --factor-b 2: exit %d, %q", code, errs)
	}
	// --factor-b 2 is fine for pair (Beer–Lambert: twice the thickness).
	if code, _, errs := runCLI(t, "", "pair", "demo/filters.csv:gel-straw", "demo/filters.csv:gel-steel-blue", "--mode", "subtractive", "--factor-b", "2"); code != 0 {
		t.Errorf("pair --factor-b 2: exit %d, %s", code, errs)
	}
}

// TestStdinWithName: finding 14. -:NAME reads one spectrum of standard
// input wherever FILE:NAME works in compare, pair, partner and complement,
// with the same result as the file; the advice for "-" says -:NAME; two
// arguments cannot both read standard input.
func TestStdinWithName(t *testing.T) {
	t.Parallel()
	paints, err := os.ReadFile("demo/paints.csv")
	if err != nil {
		t.Fatal(err)
	}
	lamps, err := os.ReadFile("demo/lamps.csv")
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		stdin       []byte
		viaStdin    []string
		viaFile     []string
		sameExcept  string // the file name, which the output may show
		replacement string
	}{
		{paints, []string{"compare", "-:ky-sage", "demo/paints.csv:ky-teal", "--json"}, []string{"compare", "demo/paints.csv:ky-sage", "demo/paints.csv:ky-teal", "--json"}, "", ""},
		{paints, []string{"compare", "--json", "demo/paints.csv:ky-teal", "-:ky-sage"}, []string{"compare", "--json", "demo/paints.csv:ky-teal", "demo/paints.csv:ky-sage"}, "", ""},
		{lamps, []string{"pair", "--illuminant", "D65", "-:wash-amber", "demo/lamps.csv:wash-cyan", "--json"}, []string{"pair", "--illuminant", "D65", "demo/lamps.csv:wash-amber", "demo/lamps.csv:wash-cyan", "--json"}, "", ""},
		{lamps, []string{"partner", "-:wash-amber", "demo/lamps.csv", "--json"}, []string{"partner", "demo/lamps.csv:wash-amber", "demo/lamps.csv", "--json"}, "", ""},
		{lamps, []string{"partner", "demo/lamps.csv:wash-amber", "-", "--top", "3"}, []string{"partner", "demo/lamps.csv:wash-amber", "demo/lamps.csv", "--top", "3"}, "from demo/lamps.csv", "from -"},
		{lamps, []string{"complement", "-:wash-amber", "--json"}, []string{"complement", "demo/lamps.csv:wash-amber", "--json"}, "", ""},
	} {
		code, got, errs := runCLI(t, string(tc.stdin), tc.viaStdin...)
		if code != 0 {
			t.Errorf("%v: exit %d: %s", tc.viaStdin, code, errs)
			continue
		}
		_, want, _ := runCLI(t, "", tc.viaFile...)
		if tc.sameExcept != "" {
			want = strings.Replace(want, tc.sameExcept, tc.replacement, 1)
		}
		if got != want {
			t.Errorf("%v: output differs from %v:\n%s\nwant\n%s", tc.viaStdin, tc.viaFile, got, want)
		}
	}
	code, _, errs := runCLI(t, string(paints), "compare", "-", "demo/paints.csv:ky-teal")
	if code != 2 || !strings.Contains(errs, "holds 9 spectra; name one as -:NAME") {
		t.Errorf("compare -: exit %d, %q", code, errs)
	}
	code, _, errs = runCLI(t, string(paints), "pair", "-:ky-sage", "-:ky-teal", "--as", "reflectance")
	if code != 2 || !strings.Contains(errs, "can be read once") {
		t.Errorf("pair -:a -:b: exit %d, %q", code, errs)
	}
}

// TestStdinNames checks the argument rewrite behind -:NAME: "--" goes
// before a -:NAME argument unless it is the value of the flag before it.
func TestStdinNames(t *testing.T) {
	t.Parallel()
	fs := flag.NewFlagSet("x", flag.ContinueOnError)
	fs.String("illuminant", "", "")
	fs.Bool("json", false, "")
	for _, tc := range []struct{ in, want []string }{
		{[]string{"-:a", "b"}, []string{"--", "-:a", "b"}},
		{[]string{"--json", "-:a"}, []string{"--json", "--", "-:a"}},
		{[]string{"--illuminant", "-:a", "-:b"}, []string{"--illuminant", "-:a", "--", "-:b"}},
		{[]string{"-illuminant=x", "-:a"}, []string{"-illuminant=x", "--", "-:a"}},
		{[]string{"--", "-:a", "-:b"}, []string{"--", "-:a", "-:b"}},
		{[]string{"-", "-:"}, []string{"-", "-:"}},
	} {
		if got := stdinNames(fs, tc.in); !slices.Equal(got, tc.want) {
			t.Errorf("stdinNames(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// TestPairWarningsNameSpectrum: finding 30 and the ΔDuv wording of
// finding 23. Subtractive warnings name A or B with its name; two inputs
// that both exceed 1 are taken for lights; the missing ΔDuv is explained
// in one clause.
func TestPairWarningsNameSpectrum(t *testing.T) {
	t.Parallel()
	warnings := func(args ...string) []string {
		code, out, errs := runCLI(t, "", append(args, "--json")...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", args, code, errs)
		}
		var r pairResult
		if err := json.Unmarshal([]byte(out), &r); err != nil {
			t.Fatal(err)
		}
		return r.Warnings
	}
	// The review's case: two LED channels stacked. wash-cyan peaks at
	// 1.483, wash-amber at 0.958 (demo/lamps.csv).
	ws := warnings("pair", "demo/lamps.csv:wash-amber", "demo/lamps.csv:wash-cyan", "--mode", "subtractive")
	if len(ws) == 0 {
		t.Fatal("no warnings")
	}
	for _, w := range ws {
		if !strings.HasPrefix(w, "A (wash-amber)") && !strings.HasPrefix(w, "B (wash-cyan)") {
			t.Errorf("warning %q names no spectrum", w)
		}
	}
	// tungsten-3200 peaks at 184 (taken as percent: 1.84), wash-cyan at
	// 1.483: both above 1.
	ws = warnings("pair", "demo/lamps.csv:tungsten-3200", "demo/lamps.csv:wash-cyan", "--mode", "subtractive")
	if !slices.ContainsFunc(ws, func(w string) bool { return strings.Contains(w, "look like lights") }) {
		t.Errorf("no lights hint in %q", ws)
	}
	// Two gels (transmittances ≤ 1) get no such hint.
	ws = warnings("pair", "demo/filters.csv:gel-deep-amber", "demo/filters.csv:gel-cyan", "--mode", "subtractive")
	if slices.ContainsFunc(ws, func(w string) bool { return strings.Contains(w, "look like lights") }) {
		t.Errorf("lights hint for filters: %q", ws)
	}
	// Red + green is far above the Planckian locus (Duv 0.078 > 0.05).
	ws = warnings("pair", "demo/lamps.csv:wash-red", "demo/lamps.csv:wash-green")
	found := false
	for _, w := range ws {
		if strings.HasPrefix(w, "ΔDuv not given") {
			found = true
			if !strings.HasPrefix(w, "ΔDuv not given, as A + B has no correlated colour temperature: ") || strings.Count(w, ":") != 1 {
				t.Errorf("ΔDuv warning %q", w)
			}
		}
	}
	if !found {
		t.Errorf("no ΔDuv warning in %q", ws)
	}
}

// TestNameWarning checks each rewrite of the complement package's
// warnings (the strings in complement/additive.go and subtractive.go).
func TestNameWarning(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ in, want string }{
		{"b dips below zero within noise; taken as zero transmittance there", "B (y) dips below zero within noise; taken as zero transmittance there"},
		{"a dips below zero within noise; taken as zero transmittance there", "A (x) dips below zero within noise; taken as zero transmittance there"},
		{"a and b have the same chromaticity: every mix has it", "A (x) and B (y) have the same chromaticity: every mix has it"},
		{"the nearest mix is a alone: adding b only moves away from the white", "the nearest mix is A (x) alone: adding B (y) only moves away from the white"},
		{"the nearest mix is b alone: adding a only moves away from the white", "the nearest mix is B (y) alone: adding A (x) only moves away from the white"},
		{"ΔDuv not given: CCT of the sum: correlated colour temperature not defined: 5162.4 K", "ΔDuv not given, as A + B has no correlated colour temperature: 5162.4 K"},
		{"ΔDuv not given: CCT of the white: correlated colour temperature not defined: 900 K", "ΔDuv not given, as the white has no correlated colour temperature: 900 K"},
		{"spectral residual taken over 400–600 nm only", "spectral residual taken over 400–600 nm only"},
	} {
		if got := nameWarning(tc.in, "x", "y"); got != tc.want {
			t.Errorf("nameWarning(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// TestPairUncertaintyPercent: --uncertainty is in the files' units, also
// when percent was detected rather than given with --scale: a percent file
// with u = 1 gives the confidence of the fraction file with u = 0.01.
func TestPairUncertaintyPercent(t *testing.T) {
	t.Parallel()
	// A reflectance and its complement 1 − r, nudged so the sum is not
	// exactly white and the confidence is neither 0 nor 1.
	r := func(nm float64) float64 { return 0.5 + 0.3*math.Sin((nm-380)/60) }
	c := func(nm float64) float64 { return 1 - r(nm) + 0.004*math.Cos((nm-380)/90) }
	pair := func(scale float64) string {
		return writeTemp(t, "p.csv", columnsCSV(grid380, []string{"r", "c"}, func(j int, nm float64) float64 {
			if j == 0 {
				return scale * r(nm)
			}
			return scale * c(nm)
		}))
	}
	conf := func(file, u string) float64 {
		code, out, errs := runCLI(t, "", "pair", file+":r", file+":c", "--as", "reflectance", "--uncertainty", u, "--json")
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		var res pairResult
		if err := json.Unmarshal([]byte(out), &res); err != nil {
			t.Fatal(err)
		}
		if res.Confidence == nil {
			t.Fatal("no confidence")
		}
		return *res.Confidence
	}
	frac, pct := conf(pair(1), "0.01"), conf(pair(100), "1")
	if frac <= 0.01 || frac >= 0.99 {
		t.Fatalf("fraction file: confidence %g, want a case between 0 and 1", frac)
	}
	// The same computation on values scaled by 100 and back: 1e-9 allows
	// for rounding in the scaling.
	if math.Abs(frac-pct) > 1e-9 {
		t.Errorf("confidence: fraction file %g, percent file %g", frac, pct)
	}
}

// TestPluralArguments: finding 25's wording slips.
func TestPluralArguments(t *testing.T) {
	t.Parallel()
	one := writeTemp(t, "one.csv", columnsCSV(grid380, []string{"only"}, func(_ int, nm float64) float64 { return sage(nm) }))
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"pair", "x"}, "(got 1 argument)"},
		{[]string{"partner", "x"}, "(got 1 argument)"},
		{[]string{"compare", "x"}, "(got 1 argument)"},
		{[]string{"compare", "x", "y", "z"}, "(got 3 arguments)"},
		{[]string{"complement"}, "(got 0 arguments)"},
	} {
		code, _, errs := runCLI(t, "", tc.args...)
		if code != 2 || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: exit %d, %q; want %q", tc.args, code, errs, tc.want)
		}
	}
	code, out, errs := runCLI(t, "", "partner", one+":only", one, "--as", "reflectance")
	if code != 0 || !strings.Contains(out, "(1 candidate)") {
		t.Errorf("partner with one candidate: exit %d, %s%s", code, out, errs)
	}
}
