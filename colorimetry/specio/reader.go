package specio

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
)

// Layout is the arrangement of spectra in a CSV file.
type Layout int

const (
	// LayoutAuto detects the layout from the file's content (see the
	// package documentation).
	LayoutAuto Layout = iota
	// LayoutColumns has wavelengths (nm) in the first column and one
	// spectrum per further column, with an optional header row of names.
	LayoutColumns
	// LayoutRows has a header row of wavelengths and one spectrum per
	// line, its name in the first column.
	LayoutRows
)

// String returns "auto", "columns" or "rows".
func (l Layout) String() string {
	switch l {
	case LayoutAuto:
		return "auto"
	case LayoutColumns:
		return "columns"
	case LayoutRows:
		return "rows"
	}
	return "Layout(" + strconv.Itoa(int(l)) + ")"
}

// Defaults of the Reader's limits.
const (
	// DefaultMaxLineBytes is the default longest line, 16 MiB: room for a
	// million spectral values on one line.
	DefaultMaxLineBytes = 16 << 20
	// DefaultMaxSamples is the default largest grid onto which irregular
	// wavelengths are resampled, 2¹⁶ samples: 360 nm to 65 µm at 1 nm.
	DefaultMaxSamples = 1 << 16
	// DefaultMaxColumns is the default largest number of fields on one
	// line, 2¹⁶: 360–830 nm at 0.01 nm is 47 001 wavelength columns.
	DefaultMaxColumns = 1 << 16
	// DefaultMaxRows is the default largest number of data rows (one per
	// wavelength) of a columns-layout table, 2¹⁶. The rows layout streams
	// one spectrum per line and has no row limit.
	DefaultMaxRows = 1 << 16
	// DefaultMaxValues is the default largest number of values a
	// columns-layout table holds in memory, 2²⁵ (256 MiB of float64):
	// 4096 spectra of 8192 samples.
	DefaultMaxValues = 1 << 25
)

// Named is one spectrum read from a file, with its name and place.
type Named struct {
	// Name is the spectrum's name: the header cell of its column in the
	// columns layout, the first field of its line in the rows layout. An
	// empty name is replaced by "column N" or "line N".
	Name string
	// Spectrum holds the values as written in the file (no rescaling of
	// percent), in nm.
	Spectrum colorimetry.Spectrum
	// Line is the 1-based line where the spectrum starts: its own line in
	// the rows layout, the header line (or first data line when there is
	// no header) in the columns layout.
	Line int
	// Column is the 1-based field number of the spectrum's column in the
	// columns layout, and 1 in the rows layout.
	Column int
	// MaxStep is the largest spacing between adjacent wavelengths of the
	// file, nm: the grid step for evenly spaced data; for irregular data,
	// which Spectrum holds resampled onto a finer grid, the widest gap the
	// measurement left.
	MaxStep float64
	// Fields holds the extra (non-wavelength) fields of a line in the rows
	// layout, keyed by header text ("column N" for an empty header cell),
	// as written (unquoted fields trimmed of white space). It is nil when
	// there are none. See Number.
	Fields map[string]string

	src *source // where the extra fields came from, for Number
}

// source describes the file and header a rows-layout record came from.
type source struct {
	file         string
	decimalComma bool
	extra        map[string]int // extra field name → 1-based column
}

// Number returns the extra field key of a rows-layout record read as a
// number, by the same rules as the spectral values (a decimal comma is
// accepted when the file's separator is not a comma). It returns a
// *ParseError naming the file, line and column, wrapping ErrNoField when
// the record has no such field, and ErrEmpty, ErrNotNumber or
// colorimetry.ErrNotFinite when its text is not a finite number.
func (n Named) Number(key string) (float64, error) {
	v, ok := n.Fields[key]
	if !ok || n.src == nil {
		file := ""
		if n.src != nil {
			file = n.src.file
		}
		return 0, &ParseError{File: file, Line: n.Line, Field: key, Err: ErrNoField}
	}
	x, err := parseNumber(v, n.src.decimalComma)
	if err != nil {
		return 0, &ParseError{File: n.src.file, Line: n.Line, Column: n.src.extra[key], Field: key, Err: err}
	}
	return x, nil
}

// Reader reads spectra from spectral CSV in either layout. Its exported
// fields may be changed after NewReader and before the first call to Next
// or ReadAll. A Reader is not safe for concurrent use.
type Reader struct {
	// Layout selects the layout; LayoutAuto (the default) detects it.
	Layout Layout
	// Comma is the field separator: ',', ';' or '\t'. Zero (the default)
	// detects it from the first record.
	Comma rune
	// Options control how each spectrum is built (interpolation,
	// extrapolation, grid step for irregular wavelengths); the zero value
	// gives colorimetry's defaults.
	Options colorimetry.Options
	// MaxLineBytes is the longest line accepted, in bytes without the line
	// ending; zero means DefaultMaxLineBytes.
	MaxLineBytes int
	// MaxSamples is the largest grid, in samples, onto which irregularly
	// spaced wavelengths may be resampled; zero means DefaultMaxSamples.
	MaxSamples int
	// MaxColumns is the largest number of fields on one line (in CGATS,
	// of fields in a data format); zero means DefaultMaxColumns.
	MaxColumns int
	// MaxRows is the largest number of data rows of a columns-layout
	// table, which is read whole; zero means DefaultMaxRows.
	MaxRows int
	// MaxValues is the largest number of values of a columns-layout
	// table (data rows × spectrum columns); zero means DefaultMaxValues.
	MaxValues int

	file    string
	br      *bufio.Reader
	line    int    // number of physical lines read
	buf     []byte // accumulates a line longer than br's buffer
	fields  []string
	started bool
	err     error // sticky error, io.EOF at the end

	sep          byte
	decimalComma bool
	layout       Layout
	peeked       bool   // a record is waiting in peek
	peek         record // a record read ahead during detection

	// rows layout
	hdr   *rowsHeader
	vals  []float64
	nRows int

	// columns layout
	table []Named

	cgats *CGATSReader // set by start when the input is CGATS.17 text (cgats.go)
}

// record is one non-blank, non-comment line split into fields.
type record struct {
	line   int
	fields []string
}

// rowsHeader is the parsed header of a rows-layout file.
type rowsHeader struct {
	line      int
	cells     []string  // header text per column
	wlCols    []int     // 0-based columns holding samples
	wl        []float64 // their wavelengths, nm
	extraCols []int     // 0-based columns holding extra fields
	src       *source
}

// NewReader returns a Reader that reads from r. The file name is used in
// error messages; "-" stands for standard input and appears as <stdin>.
// Under LayoutAuto, input that is CGATS.17 text (a first line starting
// with "CGATS", or a line starting with BEGIN_DATA_FORMAT, within the first
// 64 KiB) is read by the rules of NewCGATSReader with NeedSpectra set.
func NewReader(r io.Reader, file string) *Reader {
	return &Reader{
		file: file,
		br:   bufio.NewReaderSize(r, 64<<10),
	}
}

// ReadFile reads every spectrum in the named file; "-" reads standard
// input. See Reader.ReadAll.
func ReadFile(path string) ([]Named, error) {
	if path == "-" {
		return NewReader(os.Stdin, "-").ReadAll()
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return NewReader(f, path).ReadAll()
}

// ReadAll reads the remaining spectra. It returns the spectra read before
// the first error together with that error; reaching the end is not an
// error.
func (r *Reader) ReadAll() ([]Named, error) {
	var out []Named
	limit := r.MaxValues
	if limit <= 0 {
		limit = DefaultMaxValues
	}
	total := 0
	for {
		n, err := r.Next()
		if err == io.EOF {
			return out, nil
		}
		if err != nil {
			return out, err
		}
		// Everything read is held in memory: bound it as a columns table is.
		if total += n.Spectrum.Len(); total > limit {
			return out, fmt.Errorf("%s:%d: %w: more than %d values in all; stream the file with Next instead", r.file, n.Line, ErrTooBig, limit)
		}
		out = append(out, n)
	}
}

// Next returns the next spectrum, or io.EOF after the last one.
//
// In the rows layout each call reads one line, so a file of any length
// streams in constant memory. A problem with one line's data (a bad value,
// a wrong number of fields) is returned as a *ParseError and the next call
// goes on with the following line. In the columns layout the first call
// reads the whole table, and any problem is returned by every later call.
// Problems with the file as a whole (no data, a bad header, a line too
// long, a read error) are returned by every later call as well.
func (r *Reader) Next() (Named, error) {
	if r.err != nil {
		return Named{}, r.err
	}
	if !r.started {
		r.started = true
		if err := r.start(); err != nil {
			r.err = err
			return Named{}, err
		}
	}
	if r.cgats != nil {
		return r.cgats.Next()
	}
	if r.layout == LayoutRows {
		return r.nextRow()
	}
	if len(r.table) == 0 {
		r.err = io.EOF
		return Named{}, io.EOF
	}
	n := r.table[0]
	r.table[0] = Named{}
	r.table = r.table[1:]
	return n, nil
}

// orDefault returns v, or def when v is zero.
func orDefault(v, def int) int {
	if v == 0 {
		return def
	}
	return v
}

// checkLimits returns an error when a limit is negative.
func checkLimits(v ...int) error {
	for _, x := range v {
		if x < 0 {
			return errors.New("specio: negative MaxLineBytes, MaxSamples, MaxColumns, MaxRows or MaxValues")
		}
	}
	return nil
}

// errorf returns a *ParseError at the given place.
func (r *Reader) errorf(line, col int, field string, err error) *ParseError {
	return &ParseError{File: r.file, Line: line, Column: col, Field: field, Err: err}
}

// start checks the settings, reads the first record, decides the layout and
// reads the header (rows) or the whole table (columns).
func (r *Reader) start() error {
	switch r.Comma {
	case 0, ',', ';', '\t':
		r.sep = byte(r.Comma)
	default:
		return fmt.Errorf("specio: unsupported separator %q (want ',', ';' or tab)", r.Comma)
	}
	if r.Layout < LayoutAuto || r.Layout > LayoutRows {
		return fmt.Errorf("specio: unknown layout %v", r.Layout)
	}
	if err := checkLimits(r.MaxLineBytes, r.MaxSamples, r.MaxColumns, r.MaxRows, r.MaxValues); err != nil {
		return err
	}
	if r.Layout == LayoutAuto && r.startCGATS() {
		return nil
	}
	first, err := r.readRecord()
	if err == io.EOF {
		return r.errorf(max(r.line, 1), 1, "", fmt.Errorf("file is empty: %w", ErrNoData))
	}
	if err != nil {
		return err
	}
	first = r.keep(first)
	trimTrailing(&first.fields, 1)
	layout := r.Layout
	if layout == LayoutAuto {
		if layout, err = r.detect(first); err != nil {
			return err
		}
	}
	r.layout = layout
	if layout == LayoutRows {
		return r.readRowsHeader(first)
	}
	return r.readTable(first)
}

// keep returns rec with its own copy of the fields slice, so that a later
// readRecord does not overwrite it. The strings themselves are immutable.
func (r *Reader) keep(rec record) record {
	rec.fields = append([]string(nil), rec.fields...)
	return rec
}

// detect decides the layout from the first record (see the package
// documentation), reading one more record ahead when it must.
func (r *Reader) detect(first record) (Layout, error) {
	f := first.fields
	if isNumber(f[0], r.decimalComma) {
		return LayoutColumns, nil
	}
	wl := 0
	for _, c := range f[1:] {
		if _, ok := parseWavelength(c, r.decimalComma); ok {
			wl++
		}
	}
	rest := len(f) - 1
	label := isWavelengthLabel(f[0])
	switch {
	case wl == 0:
		return LayoutColumns, nil
	case wl == rest && (label || wl < 3):
		// "nm,1,2,3": spectra named by numbers, or a rows header whose
		// name column is labelled nm; "name,400,410": a rows header with
		// too few wavelengths, or two spectra named by numbers. The next
		// record decides.
	case !label && wl >= 3 && 2*wl >= rest:
		return LayoutRows, nil
	default:
		return LayoutColumns, nil
	}
	next, err := r.readRecord()
	if err == io.EOF {
		return LayoutColumns, nil
	}
	if err != nil {
		return 0, err
	}
	r.peek, r.peeked = r.keep(next), true
	if len(next.fields) > 0 && isNumber(next.fields[0], r.decimalComma) {
		return LayoutColumns, nil
	}
	return LayoutRows, nil
}

// trimTrailing drops empty fields from the end of *fields while more than
// width remain.
func trimTrailing(fields *[]string, width int) {
	f := *fields
	for len(f) > width && f[len(f)-1] == "" {
		f = f[:len(f)-1]
	}
	*fields = f
}

// readRecord returns the next record that is neither blank nor a comment.
// The fields slice is reused by the next call.
func (r *Reader) readRecord() (record, error) {
	if r.peeked {
		r.peeked = false
		return r.peek, nil
	}
	for {
		line, err := r.readLine()
		if err != nil {
			return record{}, err
		}
		t := strings.TrimLeft(line, " \t")
		if t == "" || t[0] == '#' {
			continue
		}
		if r.sep == 0 {
			r.sep = detectSeparator(line)
		}
		r.decimalComma = r.sep != ',' // a decimal comma only where it cannot separate fields
		fields, err := splitFields(r.fields, line, r.sep, orDefault(r.MaxColumns, DefaultMaxColumns))
		r.fields = fields
		if err != nil {
			var qe *quoteError
			if errors.As(err, &qe) {
				return record{line: r.line}, r.errorf(r.line, qe.column, "", ErrQuote)
			}
			var we *wideError
			if errors.As(err, &we) {
				r.err = r.errorf(r.line, we.max+1, "", fmt.Errorf("%w: more than %d fields on a line (MaxColumns)", ErrTooBig, we.max))
				return record{line: r.line}, r.err
			}
			return record{line: r.line}, r.errorf(r.line, 0, "", err)
		}
		if allEmpty(fields) {
			continue
		}
		return record{line: r.line, fields: fields}, nil
	}
}

// readLine returns the next line without its line ending (LF or CRLF), as
// a fresh string, with a byte order mark removed from the first line. It
// returns io.EOF at the end of the input, and a sticky *ParseError for a
// read error or a line beyond MaxLineBytes (ErrLineTooLong), so that a
// file without line breaks cannot exhaust memory.
func (r *Reader) readLine() (string, error) {
	limit := r.MaxLineBytes
	if limit == 0 {
		limit = DefaultMaxLineBytes
	}
	tooLong := func() error {
		r.err = r.errorf(r.line+1, 0, "", fmt.Errorf("%w (longer than %d bytes)", ErrLineTooLong, limit))
		return r.err
	}
	r.buf = r.buf[:0]
	var line []byte
	for {
		chunk, err := r.br.ReadSlice('\n')
		if e := r.checkText(chunk, len(r.buf) == 0); e != nil {
			return "", e
		}
		if err == bufio.ErrBufferFull {
			r.buf = append(r.buf, chunk...)
			if len(r.buf) > limit+2 { // +2 leaves room for "\r\n"
				return "", tooLong()
			}
			continue
		}
		line = chunk
		if len(r.buf) > 0 {
			r.buf = append(r.buf, chunk...)
			line = r.buf
		}
		if err == io.EOF && len(line) == 0 {
			return "", io.EOF
		}
		if err != nil && err != io.EOF {
			r.err = r.errorf(r.line+1, 0, "", fmt.Errorf("read: %w", err))
			return "", r.err
		}
		break
	}
	line = bytes.TrimSuffix(line, []byte{'\n'})
	line = bytes.TrimSuffix(line, []byte{'\r'})
	if bytes.IndexByte(line, '\r') >= 0 {
		r.err = r.errorf(r.line+1, 0, "", ErrLineEnding)
		return "", r.err
	}
	if len(line) > limit {
		return "", tooLong()
	}
	r.line++
	if r.line == 1 {
		line = bytes.TrimPrefix(line, []byte(bom))
	}
	return string(line), nil
}

// checkText returns a sticky *ParseError for a chunk of the next line
// that is not UTF-8 or ASCII text with LF or CRLF line endings: a UTF-16
// byte order mark at the start of the file (FF FE or FE FF, Unicode
// Standard §23.8, from memory), a NUL byte anywhere (UTF-16 text, or a
// binary file), or a carriage return followed by anything but a line feed
// (CR-only line endings). A CR at the very end of the chunk is left for
// readLine to judge on the whole line. lineStart says whether chunk
// starts a line.
func (r *Reader) checkText(chunk []byte, lineStart bool) error {
	if lineStart && r.line == 0 && (bytes.HasPrefix(chunk, []byte{0xff, 0xfe}) || bytes.HasPrefix(chunk, []byte{0xfe, 0xff})) {
		r.err = r.errorf(1, 0, "", fmt.Errorf("UTF-16 byte order mark: %w", ErrEncoding))
		return r.err
	}
	if bytes.IndexByte(chunk, 0) >= 0 {
		r.err = r.errorf(r.line+1, 0, "", fmt.Errorf("NUL byte (binary data or UTF-16 text): %w", ErrEncoding))
		return r.err
	}
	for i := bytes.IndexByte(chunk, '\r'); i >= 0 && i+1 < len(chunk); {
		if chunk[i+1] != '\n' {
			r.err = r.errorf(r.line+1, 0, "", ErrLineEnding)
			return r.err
		}
		j := bytes.IndexByte(chunk[i+1:], '\r')
		if j < 0 {
			break
		}
		i += 1 + j
	}
	return nil
}

// readRowsHeader reads the header of the rows layout: the name column, then
// wavelength columns and extra fields.
func (r *Reader) readRowsHeader(first record) error {
	if isNumber(first.fields[0], r.decimalComma) {
		return r.errorf(first.line, 1, "", fmt.Errorf("%w: header missing: the first record starts with the number %q, not a name column heading", ErrHeader, first.fields[0]))
	}
	h := &rowsHeader{line: first.line, src: &source{file: r.file, decimalComma: r.decimalComma}}
	h.cells = make([]string, len(first.fields))
	for c, s := range first.fields {
		h.cells[c] = strings.Clone(s)
	}
	for c := 1; c < len(h.cells); c++ {
		s := h.cells[c]
		if nm, ok := parseWavelength(s, r.decimalComma); ok {
			if nm <= 0 {
				return r.errorf(h.line, c+1, s, fmt.Errorf("%g nm: %w", nm, ErrWavelength))
			}
			if k := len(h.wl); k > 0 {
				prev := h.wl[k-1]
				switch {
				case nm == prev:
					return r.errorf(h.line, c+1, s, fmt.Errorf("%g nm, as in column %d: %w", nm, h.wlCols[k-1]+1, colorimetry.ErrDuplicate))
				case nm < prev:
					return r.errorf(h.line, c+1, s, fmt.Errorf("%w (%g nm follows %g nm)", colorimetry.ErrUnsorted, nm, prev))
				}
			}
			h.wlCols = append(h.wlCols, c)
			h.wl = append(h.wl, nm)
			continue
		}
		if s == "" {
			s = "column " + strconv.Itoa(c+1)
			h.cells[c] = s
		}
		if h.src.extra == nil {
			h.src.extra = make(map[string]int)
		}
		if prev, dup := h.src.extra[s]; dup {
			return r.errorf(h.line, c+1, s, fmt.Errorf("%w: column name appears twice (columns %d and %d)", ErrHeader, prev, c+1))
		}
		h.src.extra[s] = c + 1
		h.extraCols = append(h.extraCols, c)
	}
	if len(h.wl) == 0 {
		return r.errorf(h.line, 1, "", fmt.Errorf("%w: header missing: no header cell after the first reads as a wavelength", ErrHeader))
	}
	if len(h.wl) < 3 {
		c := h.wlCols[0]
		return r.errorf(h.line, c+1, h.cells[c], fmt.Errorf("%d wavelength columns: %w", len(h.wl), colorimetry.ErrTooFew))
	}
	if err := r.checkSpan(h.wl); err != nil {
		c := h.wlCols[0]
		return r.errorf(h.line, c+1, h.cells[c], err)
	}
	r.vals = make([]float64, len(h.wl))
	// Problems of the wavelengths alone (an irregular span too short for
	// the resampling grid) are reported once, here, rather than per line.
	if _, err := r.spectrum(h.wl, r.vals); err != nil {
		c := h.wlCols[0]
		return r.errorf(h.line, c+1, h.cells[c], err)
	}
	r.hdr = h
	return nil
}

// nextRow reads one line of the rows layout.
func (r *Reader) nextRow() (Named, error) {
	h := r.hdr
	rec, err := r.readRecord()
	if err == io.EOF {
		if r.nRows == 0 {
			r.err = r.errorf(h.line, 1, "", fmt.Errorf("header but no data rows: %w", ErrNoData))
			return Named{}, r.err
		}
		r.err = io.EOF
		return Named{}, io.EOF
	}
	r.nRows++
	if err != nil {
		return Named{}, err
	}
	f := rec.fields
	trimTrailing(&f, len(h.cells))
	if err := r.checkCount(rec.line, len(f), len(h.cells)); err != nil {
		return Named{}, err
	}
	for j, c := range h.wlCols {
		v, err := parseNumber(f[c], r.decimalComma)
		if err != nil {
			return Named{}, r.errorf(rec.line, c+1, h.cells[c], err)
		}
		r.vals[j] = v
	}
	s, err := r.spectrum(h.wl, r.vals)
	if err != nil {
		// A sample index is a wavelength column.
		return Named{}, r.sampleError(err, len(h.wl), rec.line, 1, "", func(i int) (int, int, string) {
			return rec.line, h.wlCols[i] + 1, h.cells[h.wlCols[i]]
		})
	}
	n := Named{Name: strings.Clone(f[0]), Spectrum: s, Line: rec.line, Column: 1, MaxStep: maxStep(h.wl), src: h.src}
	if n.Name == "" {
		n.Name = "line " + strconv.Itoa(rec.line)
	}
	if len(h.extraCols) > 0 {
		n.Fields = make(map[string]string, len(h.extraCols))
		for _, c := range h.extraCols {
			n.Fields[h.cells[c]] = strings.Clone(f[c])
		}
	}
	return n, nil
}

// checkCount returns a *ParseError wrapping ErrFieldCount unless a line
// has want fields.
func (r *Reader) checkCount(line, got, want int) error {
	switch {
	case got < want:
		return r.errorf(line, got+1, "", fmt.Errorf("%w: %d fields, the first record has %d", ErrFieldCount, got, want))
	case got > want:
		return r.errorf(line, want+1, "", fmt.Errorf("%w: %d fields, the first record has %d", ErrFieldCount, got, want))
	}
	return nil
}

// readTable reads the whole columns layout and fills r.table.
func (r *Reader) readTable(first record) error {
	width := len(first.fields)
	if width < 2 {
		return r.errorf(first.line, 1, "", fmt.Errorf("%w: a single column, no spectrum columns (separator %q)", ErrHeader, r.sep))
	}
	names := make([]string, width)      // spectrum names
	fieldNames := make([]string, width) // header text per column, for errors
	startLine := first.line
	headerless := isNumber(first.fields[0], r.decimalComma)
	fieldNames[0] = "wavelength"
	if !headerless && first.fields[0] != "" {
		fieldNames[0] = strings.Clone(first.fields[0])
	}
	seen := make(map[string]int, width)
	for c := 1; c < width; c++ {
		names[c] = "column " + strconv.Itoa(c+1)
		if !headerless && first.fields[c] != "" {
			names[c] = strings.Clone(first.fields[c])
		}
		fieldNames[c] = names[c]
		if prev, dup := seen[names[c]]; dup {
			return r.errorf(first.line, c+1, names[c], fmt.Errorf("%w: spectrum name appears twice (columns %d and %d)", ErrHeader, prev, c+1))
		}
		seen[names[c]] = c + 1
	}
	maxRows := min(orDefault(r.MaxRows, DefaultMaxRows), orDefault(r.MaxValues, DefaultMaxValues)/(width-1))
	var nm []float64
	var lines []int
	cols := make([][]float64, width)
	add := func(rec record) error {
		f := rec.fields
		trimTrailing(&f, width)
		if err := r.checkCount(rec.line, len(f), width); err != nil {
			return err
		}
		w, err := parseNumber(f[0], r.decimalComma)
		if err != nil {
			return r.errorf(rec.line, 1, fieldNames[0], err)
		}
		if w <= 0 {
			return r.errorf(rec.line, 1, fieldNames[0], fmt.Errorf("%g nm: %w", w, ErrWavelength))
		}
		if len(nm) >= maxRows {
			return r.errorf(rec.line, 0, "", fmt.Errorf("%w: more than %d data rows of %d spectra (MaxRows %d, MaxValues %d)",
				ErrTooBig, maxRows, width-1, orDefault(r.MaxRows, DefaultMaxRows), orDefault(r.MaxValues, DefaultMaxValues)))
		}
		for c := 1; c < width; c++ {
			v, err := parseNumber(f[c], r.decimalComma)
			if err != nil {
				return r.errorf(rec.line, c+1, fieldNames[c], err)
			}
			cols[c] = append(cols[c], v)
		}
		nm = append(nm, w)
		lines = append(lines, rec.line)
		return nil
	}
	if headerless {
		if err := add(first); err != nil {
			return err
		}
	}
	for {
		rec, err := r.readRecord()
		if err == io.EOF {
			break
		}
		if err != nil {
			return err
		}
		if err := add(rec); err != nil {
			return err
		}
	}
	if len(nm) == 0 {
		return r.errorf(startLine, 1, "", fmt.Errorf("header but no data rows: %w", ErrNoData))
	}
	if len(nm) < 3 {
		return r.errorf(lines[len(lines)-1], 1, fieldNames[0], fmt.Errorf("%d data rows: %w", len(nm), colorimetry.ErrTooFew))
	}
	if err := r.checkSpan(nm); err != nil {
		return r.errorf(lines[0], 1, fieldNames[0], err)
	}
	r.table = make([]Named, 0, width-1)
	for c := 1; c < width; c++ {
		s, err := r.spectrum(nm, cols[c])
		if err != nil {
			// A sample index is a data line; wavelength order is a
			// problem of the first column, anything else of this one.
			return r.sampleError(err, len(nm), startLine, c+1, fieldNames[c], func(i int) (int, int, string) {
				if errors.Is(err, colorimetry.ErrUnsorted) || errors.Is(err, colorimetry.ErrDuplicate) {
					return lines[i], 1, fieldNames[0]
				}
				return lines[i], c + 1, fieldNames[c]
			})
		}
		r.table = append(r.table, Named{Name: names[c], Spectrum: s, Line: startLine, Column: c + 1, MaxStep: maxStep(nm)})
		cols[c] = nil
	}
	return nil
}

// maxStep returns the largest spacing between adjacent wavelengths of nm.
func maxStep(nm []float64) float64 {
	var m float64
	for i := 1; i < len(nm); i++ {
		m = max(m, nm[i]-nm[i-1])
	}
	return m
}

// spectrum builds a spectrum from wavelengths and values with r.Options
// and checks that resampling kept every value finite.
func (r *Reader) spectrum(nm, v []float64) (colorimetry.Spectrum, error) {
	s, err := colorimetry.NewSpectrumWith(nm, v, r.Options)
	if err != nil {
		return s, err
	}
	for i := range s.Len() {
		if x := s.Value(i); math.IsNaN(x) || math.IsInf(x, 0) {
			return colorimetry.Spectrum{}, fmt.Errorf("resampling the irregular wavelengths onto %v gave %g at %g nm: %w",
				s.Grid(), x, s.Grid().Wavelength(i), colorimetry.ErrNotFinite)
		}
	}
	return s, nil
}

// sampleError maps an error from building a spectrum of n input samples
// to a place in the file. A *colorimetry.SampleError is placed by
// at(index); anything else at (line, col, field).
func (r *Reader) sampleError(err error, n, line, col int, field string, at func(i int) (int, int, string)) error {
	var se *colorimetry.SampleError
	if errors.As(err, &se) && se.Index >= 0 && se.Index < n {
		l, c, f := at(se.Index)
		return r.errorf(l, c, f, fmt.Errorf("%g nm: %w", se.Wavelength, se.Err))
	}
	return r.errorf(line, col, field, err)
}

// checkSpan returns an error wrapping ErrTooWide when the wavelengths nm
// are strictly increasing but irregular and their span would be resampled
// onto a grid of more than MaxSamples samples. Uniform data keep their own
// grid and pass; so do unsorted data, which NewSpectrumWith reports.
func (r *Reader) checkSpan(nm []float64) error {
	n := len(nm)
	for i := 1; i < n; i++ {
		if !(nm[i] > nm[i-1]) {
			return nil
		}
	}
	if n < 2 {
		return nil
	}
	if _, uniform := colorimetry.UniformStep(nm); uniform {
		return nil
	}
	limit := r.MaxSamples
	if limit == 0 {
		limit = DefaultMaxSamples
	}
	st := r.Options.Step
	if st == 0 {
		st = 1
	}
	if !(st > 0) || math.IsInf(st, 0) {
		return nil // NewSpectrumWith reports the bad step
	}
	if span := (nm[n-1] - nm[0]) / st; !(span < float64(limit)) {
		return fmt.Errorf("%w: irregular wavelengths from %g to %g nm at a %g nm step need more than %d samples",
			ErrTooWide, nm[0], nm[n-1], st, limit)
	}
	return nil
}
