package specio

import (
	"errors"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Sentinel errors of the spectral CSV reader and writer. A *ParseError
// wraps one of them, or one of colorimetry's sentinels; test with
// errors.Is.
var (
	// ErrNotNumber reports a value or wavelength that is not a decimal
	// number.
	ErrNotNumber = errors.New("not a number")
	// ErrEmpty reports an empty value cell.
	ErrEmpty = errors.New("value is empty")
	// ErrWavelength reports a wavelength that is zero or negative.
	ErrWavelength = errors.New("wavelength is not positive")
	// ErrFieldCount reports a line with more or fewer fields than the
	// first record.
	ErrFieldCount = errors.New("wrong number of fields")
	// ErrNoData reports an empty file, or a header with no data after it.
	ErrNoData = errors.New("no data")
	// ErrHeader reports a header that is missing or unusable: no
	// wavelength columns in the rows layout, no spectrum columns in the
	// columns layout, an extra field named twice.
	ErrHeader = errors.New("bad header")
	// ErrQuote reports a quoted field that is not closed on its line.
	ErrQuote = errors.New("quoted field not closed before the end of the line")
	// ErrLineTooLong reports a line longer than Reader.MaxLineBytes.
	ErrLineTooLong = errors.New("line too long")
	// ErrTooWide reports irregular wavelengths whose span would need an
	// unreasonably large grid (see Reader.MaxSamples).
	ErrTooWide = errors.New("wavelength span too wide for the resampling grid")
	// ErrNoField reports a request for an extra field the record lacks.
	ErrNoField = errors.New("no such field")
	// ErrGrid reports spectra that WriteColumns cannot put in one table:
	// none at all, an empty spectrum, or spectra on different grids.
	ErrGrid = errors.New("spectra do not share one grid")
	// ErrName reports a spectrum name that WriteColumns cannot write
	// because it contains a line break or a NUL byte, or is given twice.
	ErrName = errors.New("name cannot be written (a line break or NUL byte, or a name given twice)")
	// ErrEncoding reports text that is not UTF-8 or ASCII: a UTF-16 byte
	// order mark or a NUL byte (UTF-16 text, or a binary file).
	ErrEncoding = errors.New("UTF-16 is not supported; save as UTF-8")
	// ErrLineEnding reports a carriage return inside a line: a file with
	// CR-only line endings (as written by Mac OS before version X).
	ErrLineEnding = errors.New("CR-only line endings are not supported; save with LF or CRLF line endings")
	// ErrTooBig reports a file beyond one of the Reader's size limits
	// (MaxColumns, MaxRows, MaxValues).
	ErrTooBig = errors.New("file exceeds a size limit")
)

// ParseError locates a data problem in a spectral file. Line and Column
// are 1-based; Column counts fields (spreadsheet columns), not bytes, and
// is 0 when the problem concerns a whole line. Field is the header text of
// the column (a wavelength such as "455" in the rows layout, a spectrum
// name in the columns layout), or empty.
type ParseError struct {
	File   string // file name as given to NewReader; "-" is shown as <stdin>
	Line   int    // 1-based line number, 0 if unknown
	Column int    // 1-based field number, 0 for the whole line
	Field  string // header text of the column, if any
	Err    error  // the underlying error, wrapping a sentinel
}

// Error returns one line: "lamps.csv:12:4 (field 455): value "abc" is not
// a number".
func (e *ParseError) Error() string {
	var b strings.Builder
	b.WriteString(displayName(e.File))
	if e.Line > 0 {
		b.WriteByte(':')
		b.WriteString(strconv.Itoa(e.Line))
		if e.Column > 0 {
			b.WriteByte(':')
			b.WriteString(strconv.Itoa(e.Column))
		}
	}
	if e.Field != "" {
		b.WriteString(" (field ")
		b.WriteString(printable(e.Field))
		b.WriteByte(')')
	}
	b.WriteString(": ")
	if e.Err != nil {
		b.WriteString(e.Err.Error())
	} else {
		b.WriteString("unknown error")
	}
	return b.String()
}

// Unwrap returns the underlying error.
func (e *ParseError) Unwrap() error { return e.Err }

// printable returns s as it is when every rune prints, and quoted with Go
// escapes otherwise, so that a message stays on one line.
func printable(s string) string {
	if !utf8.ValidString(s) || strings.ContainsFunc(s, func(r rune) bool { return !unicode.IsPrint(r) }) {
		return strconv.Quote(s)
	}
	return s
}

// displayName returns the name under which file appears in messages.
func displayName(file string) string {
	switch file {
	case "-":
		return "<stdin>"
	case "":
		return "<input>"
	}
	return file
}
