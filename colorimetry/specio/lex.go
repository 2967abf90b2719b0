package specio

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
)

// bom is the UTF-8 encoding of U+FEFF, the byte order mark some editors
// write at the start of a file (Unicode Standard §23.8, from memory).
const bom = "\xef\xbb\xbf"

// quoteError is returned by splitFields for a quoted field that is not
// closed on its line; column is the field's 1-based number.
type quoteError struct{ column int }

func (e *quoteError) Error() string { return fmt.Sprintf("field %d: %v", e.column, ErrQuote) }

// wideError is returned by splitFields for a line of more than max
// fields.
type wideError struct{ max int }

func (e *wideError) Error() string { return fmt.Sprintf("more than %d fields", e.max) }

// isBlank reports whether c is a space or tab other than the separator.
func isBlank(c, sep byte) bool { return (c == ' ' || c == '\t') && c != sep }

// splitFields splits one line (without its line ending) at sep into dst,
// which it reslices and returns. Unquoted fields are trimmed of white
// space. A field whose first non-blank character is a double quote runs to
// the next quote that is followed, after optional blanks, by sep or the
// end of the line; a doubled quote inside it stands for one quote
// (RFC 4180 §2 rule 7), and any other quote is kept as it is. Quotes
// inside unquoted fields are kept as they are. The fields are substrings
// of line except where a doubled quote had to be collapsed. A line of more
// than maxFields fields gives a *wideError.
func splitFields(dst []string, line string, sep byte, maxFields int) ([]string, error) {
	dst = dst[:0]
	i := 0
	for {
		if len(dst) >= maxFields {
			return dst, &wideError{max: maxFields}
		}
		j := i
		for j < len(line) && isBlank(line[j], sep) {
			j++
		}
		if j < len(line) && line[j] == '"' {
			field, next, ok := quotedField(line, j+1, sep)
			if !ok {
				return dst, &quoteError{column: len(dst) + 1}
			}
			dst = append(dst, field)
			if next >= len(line) {
				return dst, nil
			}
			i = next + 1 // skip the separator
			continue
		}
		k := strings.IndexByte(line[i:], sep)
		if k < 0 {
			return append(dst, strings.TrimSpace(line[i:])), nil
		}
		dst = append(dst, strings.TrimSpace(line[i:i+k]))
		i += k + 1
	}
}

// quotedField reads a quoted field whose content starts at line[start]. It
// returns the content, the index of the separator that ends the field (or
// len(line)) and whether the field was closed.
func quotedField(line string, start int, sep byte) (string, int, bool) {
	var b strings.Builder
	from := start
	for k := start; k < len(line); k++ {
		if line[k] != '"' {
			continue
		}
		if k+1 < len(line) && line[k+1] == '"' {
			b.WriteString(line[from : k+1])
			k++
			from = k + 1
			continue
		}
		m := k + 1
		for m < len(line) && isBlank(line[m], sep) {
			m++
		}
		if m == len(line) || line[m] == sep {
			if b.Len() == 0 {
				return line[from:k], m, true
			}
			b.WriteString(line[from:k])
			return b.String(), m, true
		}
		// A lone quote inside a quoted field is kept as it is.
	}
	return "", len(line), false
}

// detectSeparator returns the separator of a header line: the one of tab,
// semicolon and comma that occurs most often outside double quotes, ties
// going to tab, then semicolon, then comma. A line with none of them gives
// a comma.
func detectSeparator(line string) byte {
	var tabs, semis, commas int
	quoted := false
	for i := 0; i < len(line); i++ {
		switch c := line[i]; {
		case c == '"':
			quoted = !quoted
		case quoted:
		case c == '\t':
			tabs++
		case c == ';':
			semis++
		case c == ',':
			commas++
		}
	}
	switch {
	case tabs > 0 && tabs >= semis && tabs >= commas:
		return '\t'
	case semis > 0 && semis >= commas:
		return ';'
	}
	return ','
}

// parseNumber reads a plain decimal number (digits, an optional sign,
// point and exponent; a decimal comma instead of the point when
// decimalComma is set). It returns an error wrapping ErrEmpty for an empty
// string, colorimetry's ErrNotFinite for NaN, infinities and values beyond
// the float64 range, and ErrNotNumber otherwise. The error text quotes the
// value, "value "abc" is not a number".
func parseNumber(s string, decimalComma bool) (float64, error) {
	if s == "" {
		return 0, ErrEmpty
	}
	if decimalComma && strings.IndexByte(s, ',') >= 0 {
		if strings.IndexByte(s, '.') >= 0 {
			return 0, fmt.Errorf("value %q is %w", s, ErrNotNumber)
		}
		s = strings.Replace(s, ",", ".", 1)
	}
	digits := false
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case c >= '0' && c <= '9':
			digits = true
		case c == '.' || c == '+' || c == '-' || c == 'e' || c == 'E':
		default:
			if isNonFiniteWord(s) {
				return math.NaN(), fmt.Errorf("value %q: %w", s, colorimetry.ErrNotFinite)
			}
			return 0, fmt.Errorf("value %q is %w", s, ErrNotNumber)
		}
	}
	if !digits {
		return 0, fmt.Errorf("value %q is %w", s, ErrNotNumber)
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		if math.IsInf(v, 0) {
			return v, fmt.Errorf("value %q is beyond the float64 range: %w", s, colorimetry.ErrNotFinite)
		}
		return 0, fmt.Errorf("value %q is %w", s, ErrNotNumber)
	}
	return v, nil
}

// isNonFiniteWord reports whether s spells NaN or an infinity, as
// strconv.ParseFloat would accept it.
func isNonFiniteWord(s string) bool {
	t := strings.TrimLeft(s, "+-")
	if len(s)-len(t) > 1 {
		return false
	}
	switch strings.ToLower(t) {
	case "nan", "inf", "infinity":
		return true
	}
	return false
}

// wavelengthAffixes are the unit and symbol spellings stripped from a
// header cell before it is read as a wavelength: "nm380", "λ380",
// "380 nm", "380_nm".
var (
	wavelengthPrefixes = []string{"wavelength", "lambda", "nm", "λ", "wl"}
	wavelengthSuffixes = []string{"nm"}
)

// parseWavelength reads a header cell as a wavelength in nm, tolerating a
// unit or symbol before or after the number ("380", "380nm", "380 nm",
// "nm380", "nm_380", "λ380"). It reports false when the cell, so
// stripped, is not a finite number.
func parseWavelength(s string, decimalComma bool) (float64, bool) {
	t := strings.ToLower(strings.TrimSpace(s))
	for _, p := range wavelengthPrefixes {
		if strings.HasPrefix(t, p) {
			t = strings.TrimLeft(t[len(p):], " _-:=")
			break
		}
	}
	for _, p := range wavelengthSuffixes {
		if strings.HasSuffix(t, p) {
			t = strings.TrimRight(t[:len(t)-len(p)], " _-")
			break
		}
	}
	v, err := parseNumber(t, decimalComma)
	if err != nil {
		return 0, false
	}
	return v, true
}

// isWavelengthLabel reports whether a header cell names a wavelength
// column: "nm", "wl", "wavelength", "Wavelength (nm)", "wavelength_nm",
// "λ", "lambda [nm]" and the like.
func isWavelengthLabel(s string) bool {
	t := strings.ToLower(strings.TrimSpace(s))
	for _, p := range []string{"wavelength", "lambda", "λ"} {
		if strings.HasPrefix(t, p) {
			return true
		}
	}
	switch t {
	case "nm", "wl", "nanometre", "nanometres", "nanometer", "nanometers":
		return true
	}
	return false
}

// isNumber reports whether s reads as a finite number.
func isNumber(s string, decimalComma bool) bool {
	_, err := parseNumber(s, decimalComma)
	return err == nil
}

// allEmpty reports whether every field is empty.
func allEmpty(fields []string) bool {
	for _, f := range fields {
		if f != "" {
			return false
		}
	}
	return true
}
