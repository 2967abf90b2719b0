package specio

import (
	"errors"
	"math"
	"slices"
	"testing"

	"github.com/antipode-color/antipode/colorimetry"
)

func TestSplitFields(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		line string
		sep  byte
		want []string
		bad  int // 1-based column of an unclosed quote, 0 for none
	}{
		// RFC 4180 §2 rule 4: fields separated by commas.
		{name: "plain", line: "aaa,bbb,ccc", sep: ',', want: []string{"aaa", "bbb", "ccc"}},
		// RFC 4180 §2 rule 6: a separator inside quotes belongs to the field.
		{name: "quoted comma", line: `"b,b",c`, sep: ',', want: []string{"b,b", "c"}},
		// RFC 4180 §2 rule 7: a doubled quote inside quotes is one quote.
		{name: "doubled quote", line: `"b""bb",c`, sep: ',', want: []string{`b"bb`, "c"}},
		{name: "doubled quote at ends", line: `"""x""",y`, sep: ',', want: []string{`"x"`, "y"}},
		// Trimming and blanks around quotes: this package's rule (doc.go).
		{name: "spaces trimmed", line: "  a , b\t,c ", sep: ',', want: []string{"a", "b", "c"}},
		{name: "spaces kept inside quotes", line: `  " a " ,b`, sep: ',', want: []string{" a ", "b"}},
		{name: "empty fields", line: ",,", sep: ',', want: []string{"", "", ""}},
		{name: "trailing separator", line: "a,", sep: ',', want: []string{"a", ""}},
		{name: "tab", line: "a b\tc\t d", sep: '\t', want: []string{"a b", "c", "d"}},
		{name: "semicolon keeps commas", line: "0,5;1,25", sep: ';', want: []string{"0,5", "1,25"}},
		{name: "quote inside unquoted field", line: `ab"c,d`, sep: ',', want: []string{`ab"c`, "d"}},
		{name: "lone quote inside quoted field", line: `"a"b",c`, sep: ',', want: []string{`a"b`, "c"}},
		{name: "unclosed", line: `a,"bc`, sep: ',', bad: 2},
		{name: "unclosed lone", line: `"`, sep: ',', bad: 1},
	} {
		got, err := splitFields(nil, tc.line, tc.sep, 1<<16)
		if tc.bad > 0 {
			var qe *quoteError
			if !errors.As(err, &qe) || qe.column != tc.bad {
				t.Errorf("%s: splitFields(%q) error %v, want unclosed quote in field %d", tc.name, tc.line, err, tc.bad)
			}
			continue
		}
		if err != nil || !slices.Equal(got, tc.want) {
			t.Errorf("%s: splitFields(%q) = %q, %v; want %q", tc.name, tc.line, got, err, tc.want)
		}
	}
}

func TestDetectSeparator(t *testing.T) {
	t.Parallel()
	// The rule is this package's own (doc.go); the cases pin its ties.
	for _, tc := range []struct {
		line string
		want byte
	}{
		{"nm,lamp A,lamp B", ','},
		{"nm;lamp A;lamp B", ';'},
		{"nm\tlamp A\tlamp B", '\t'},
		{"380;0,1;0,2", ';'},    // decimal comma: tie goes to semicolon
		{"380\t0,1\t0,2", '\t'}, // tie goes to tab
		{`nm,"a;b;c",d`, ','},   // separators inside quotes do not count
		{"nm", ','},
	} {
		if got := detectSeparator(tc.line); got != tc.want {
			t.Errorf("detectSeparator(%q) = %q, want %q", tc.line, got, tc.want)
		}
	}
}

func TestParseNumber(t *testing.T) {
	t.Parallel()
	// Expected values are the decimal literals themselves: strconv.ParseFloat
	// rounds correctly (Go strconv documentation), so equality is exact.
	for _, tc := range []struct {
		in       string
		comma    bool
		want     float64
		sentinel error
	}{
		{in: "0.125", want: 0.125},
		{in: "-3", want: -3},
		{in: "+2.5e-3", want: 2.5e-3},
		{in: "1E2", want: 100},
		{in: ".5", want: 0.5},
		{in: "1e-400", want: 0}, // underflows to zero, as strconv does
		{in: "0,125", comma: true, want: 0.125},
		{in: "12,5e1", comma: true, want: 125},
		{in: "0,125", sentinel: ErrNotNumber},                // comma not allowed with a comma separator
		{in: "1.000,5", comma: true, sentinel: ErrNotNumber}, // no thousands separators
		{in: "1,2,3", comma: true, sentinel: ErrNotNumber},
		{in: "0x10", sentinel: ErrNotNumber}, // strconv would read hexadecimal
		{in: "1_000", sentinel: ErrNotNumber},
		{in: "abc", sentinel: ErrNotNumber},
		{in: "-", sentinel: ErrNotNumber},
		{in: "e5", sentinel: ErrNotNumber},
		{in: "", sentinel: ErrEmpty},
		{in: "NaN", sentinel: colorimetry.ErrNotFinite},
		{in: "-inf", sentinel: colorimetry.ErrNotFinite},
		{in: "+Infinity", sentinel: colorimetry.ErrNotFinite},
		{in: "1e999", sentinel: colorimetry.ErrNotFinite},
		{in: "--inf", sentinel: ErrNotNumber},
	} {
		got, err := parseNumber(tc.in, tc.comma)
		if tc.sentinel != nil {
			if !errors.Is(err, tc.sentinel) {
				t.Errorf("parseNumber(%q, %v) error %v, want %v", tc.in, tc.comma, err, tc.sentinel)
			}
			continue
		}
		if err != nil || got != tc.want || math.Signbit(got) != math.Signbit(tc.want) {
			t.Errorf("parseNumber(%q, %v) = %v, %v; want %v", tc.in, tc.comma, got, err, tc.want)
		}
	}
}

func TestParseWavelength(t *testing.T) {
	t.Parallel()
	// Header spellings common in spectral tables: common practice (no source).
	for _, tc := range []struct {
		in    string
		comma bool
		want  float64
		ok    bool
	}{
		{in: "380", want: 380, ok: true},
		{in: "380nm", want: 380, ok: true},
		{in: "380 nm", want: 380, ok: true},
		{in: "380_NM", want: 380, ok: true},
		{in: "nm380", want: 380, ok: true},
		{in: "nm_380", want: 380, ok: true},
		{in: "λ380", want: 380, ok: true},
		{in: "WL 380.5", want: 380.5, ok: true},
		{in: "380,5", comma: true, want: 380.5, ok: true},
		{in: "id"},
		{in: "drive"},
		{in: "nm"},
		{in: "name"},
		{in: ""},
		{in: "NaN"},
	} {
		got, ok := parseWavelength(tc.in, tc.comma)
		if ok != tc.ok || (ok && got != tc.want) {
			t.Errorf("parseWavelength(%q) = %v, %v; want %v, %v", tc.in, got, ok, tc.want, tc.ok)
		}
	}
}

func TestIsWavelengthLabel(t *testing.T) {
	t.Parallel()
	// Column labels common in spectral tables: common practice (no source).
	for _, tc := range []struct {
		in   string
		want bool
	}{
		{"nm", true}, {"NM", true}, {"Wavelength", true}, {"wavelength (nm)", true},
		{"wavelength_nm", true}, {"λ", true}, {"lambda [nm]", true}, {"wl", true},
		{"name", false}, {"", false}, {"sample", false}, {"380", false},
	} {
		if got := isWavelengthLabel(tc.in); got != tc.want {
			t.Errorf("isWavelengthLabel(%q) = %v, want %v", tc.in, got, tc.want)
		}
	}
}
