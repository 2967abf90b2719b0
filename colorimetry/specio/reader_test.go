package specio_test

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/iotest"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
)

// want describes one spectrum expected from a file.
type want struct {
	name   string
	line   int
	column int
	start  float64 // grid start, nm
	step   float64 // grid step, nm
	values []float64
	fields map[string]string
}

// readInput returns a reader over a test case's text, or over the file in
// testdata when file is set.
func readInput(t *testing.T, file, text string) (io.Reader, string) {
	t.Helper()
	if file == "" {
		return strings.NewReader(text), "test.csv"
	}
	b, err := os.ReadFile(filepath.Join("testdata", file))
	if err != nil {
		t.Fatal(err)
	}
	return strings.NewReader(string(b)), file
}

// checkSpectra compares what was read with the expectations. Values are
// compared exactly (tol 0): the expected numbers are the decimal literals
// of the input, and strconv.ParseFloat rounds correctly (Go strconv
// documentation), so reading may not change a single bit.
func checkSpectra(t *testing.T, label string, got []specio.Named, wants []want) {
	t.Helper()
	if len(got) != len(wants) {
		t.Fatalf("%s: read %d spectra, want %d", label, len(got), len(wants))
	}
	for k, w := range wants {
		g := got[k]
		if g.Name != w.name || g.Line != w.line || g.Column != w.column {
			t.Errorf("%s: spectrum %d is %q at %d:%d, want %q at %d:%d", label, k, g.Name, g.Line, g.Column, w.name, w.line, w.column)
		}
		grid := g.Spectrum.Grid()
		if grid.N != len(w.values) || !scalar.EqualWithinAbsOrRel(grid.Start, w.start, 1e-9, 1e-12) ||
			!scalar.EqualWithinAbsOrRel(grid.Step, w.step, 1e-9, 1e-12) {
			t.Errorf("%s: %q on %v (N=%d), want start %g step %g N=%d", label, g.Name, grid, grid.N, w.start, w.step, len(w.values))
			continue
		}
		for i, v := range w.values {
			if got := g.Spectrum.Value(i); !scalar.EqualWithinAbsOrRel(got, v, 0, 0) {
				t.Errorf("%s: %q sample %d = %v, want %v", label, g.Name, i, got, v)
			}
		}
		if len(g.Fields) != len(w.fields) {
			t.Errorf("%s: %q fields %v, want %v", label, g.Name, g.Fields, w.fields)
		}
		for key, v := range w.fields {
			if g.Fields[key] != v {
				t.Errorf("%s: %q field %q = %q, want %q", label, g.Name, key, g.Fields[key], v)
			}
		}
	}
}

func TestReadGood(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name   string
		file   string // in testdata; else text
		text   string
		layout specio.Layout
		comma  rune
		want   []want
	}{
		{
			// Comma, header with a quoted name holding the separator
			// (RFC 4180 §2 rule 6), comments, a blank line.
			name: "columns file", file: "lamps_columns.csv",
			want: []want{
				{name: "warm wash", line: 3, column: 2, start: 400, step: 50, values: []float64{0.12, 0.35, 0.58, 0.80, 0.95, 1.00, 0.97}},
				{name: "teal gel, double", line: 3, column: 3, start: 400, step: 50, values: []float64{0.30, 0.91, 1.00, 0.62, 0.18, 0.05, 0.03}},
				{name: "amber gel", line: 3, column: 4, start: 400, step: 50, values: []float64{0.02, 0.05, 0.21, 0.74, 1.00, 0.93, 0.81}},
			},
		},
		{
			// UTF-8 byte order mark, CRLF (RFC 4180 §2 rule 1), semicolons,
			// decimal commas, quoted names with doubled quotes (rule 7),
			// tolerant wavelength headers, extra fields before and after.
			name: "rows file", file: "inks_rows_semicolon.csv",
			want: []want{
				{name: "Harbour teal; batch 7", line: 3, column: 1, start: 380, step: 50, values: []float64{12.5, 48.0, 71.25, 40.0, 9.75},
					fields: map[string]string{"id": "T-07", "drive": "0,85"}},
				{name: "Quince yellow", line: 4, column: 1, start: 380, step: 50, values: []float64{3.0, 4.5, 60.0, 88.0, 91.5},
					fields: map[string]string{"id": "Y-02", "drive": "1"}},
				{name: `Soot "deep" black`, line: 5, column: 1, start: 380, step: 50, values: []float64{1.25, 1.0, 1.0, 1.125, 1.5},
					fields: map[string]string{"id": "K-01", "drive": "0,5"}},
			},
		},
		{
			name: "headerless tabs", file: "filters_headerless.tsv",
			want: []want{
				{name: "column 2", line: 1, column: 2, start: 380, step: 20, values: []float64{0.05, 0.06, 0.08, 0.11}},
				{name: "column 3", line: 1, column: 3, start: 380, step: 20, values: []float64{0.50, 0.52, 0.55, 0.57}},
			},
		},
		{
			name: "columns semicolon decimal comma",
			text: "Wellenlänge;rot;blau\n400;0,5;0,25\n410;0,75;0,125\n420;1;2,5e-1\n",
			want: []want{
				{name: "rot", line: 1, column: 2, start: 400, step: 10, values: []float64{0.5, 0.75, 1}},
				{name: "blau", line: 1, column: 3, start: 400, step: 10, values: []float64{0.25, 0.125, 0.25}},
			},
		},
		{
			name: "columns tab decimal comma CRLF",
			text: "nm\tA\r\n400\t0,5\r\n410\t0,75\r\n420\t1\r\n",
			want: []want{{name: "A", line: 1, column: 2, start: 400, step: 10, values: []float64{0.5, 0.75, 1}}},
		},
		{
			name: "rows tolerant headers",
			text: "sample,380nm,nm385,390 nm,λ395\nslate,1,2,3,4\n",
			want: []want{{name: "slate", line: 2, column: 1, start: 380, step: 5, values: []float64{1, 2, 3, 4}}},
		},
		{
			name: "rows tabs with empty corner and empty name",
			text: "\t400\t410\t420\n\t1\t2\t3\nmoss\t4\t5\t6\n",
			want: []want{
				{name: "line 2", line: 2, column: 1, start: 400, step: 10, values: []float64{1, 2, 3}},
				{name: "moss", line: 3, column: 1, start: 400, step: 10, values: []float64{4, 5, 6}},
			},
		},
		{
			// Spreadsheets write trailing separators and rows of empty cells.
			name: "trailing separators and empty rows",
			text: "nm,A,,\n400,1,,\n,,,\n410,2\n420,3,\n",
			want: []want{{name: "A", line: 1, column: 2, start: 400, step: 10, values: []float64{1, 2, 3}}},
		},
		{
			// Numeric spectrum names after a wavelength label: the next
			// record's number says columns.
			name: "numeric names columns",
			text: "nm,1,2,3\n400,0.1,0.2,0.3\n410,0.4,0.5,0.6\n420,0.7,0.8,0.9\n",
			want: []want{
				{name: "1", line: 1, column: 2, start: 400, step: 10, values: []float64{0.1, 0.4, 0.7}},
				{name: "2", line: 1, column: 3, start: 400, step: 10, values: []float64{0.2, 0.5, 0.8}},
				{name: "3", line: 1, column: 4, start: 400, step: 10, values: []float64{0.3, 0.6, 0.9}},
			},
		},
		{
			// Two spectra named by numbers, without a wavelength label.
			name: "two numeric names columns",
			text: "Wellenlänge,1,2\n400,0.1,0.2\n410,0.4,0.5\n420,0.7,0.8\n",
			want: []want{
				{name: "1", line: 1, column: 2, start: 400, step: 10, values: []float64{0.1, 0.4, 0.7}},
				{name: "2", line: 1, column: 3, start: 400, step: 10, values: []float64{0.2, 0.5, 0.8}},
			},
		},
		{
			// A rows header whose name column is labelled nm: the next
			// record's name says rows.
			name: "nm-labelled rows",
			text: "nm,400,410,420\n# comment between header and data\nreed lamp,1,2,3\n",
			want: []want{{name: "reed lamp", line: 3, column: 1, start: 400, step: 10, values: []float64{1, 2, 3}}},
		},
		{
			// Rows with numeric names, as a numbered chip library.
			name: "numeric names rows",
			text: "chip,400,410,420,430\n1,0.1,0.2,0.3,0.4\n2,0.5,0.6,0.7,0.8\n",
			want: []want{
				{name: "1", line: 2, column: 1, start: 400, step: 10, values: []float64{0.1, 0.2, 0.3, 0.4}},
				{name: "2", line: 3, column: 1, start: 400, step: 10, values: []float64{0.5, 0.6, 0.7, 0.8}},
			},
		},
		{
			name:   "forced rows",
			layout: specio.LayoutRows,
			text:   "name,400,410,420,note\nfern,1,2,3,ok\n",
			want: []want{{name: "fern", line: 2, column: 1, start: 400, step: 10, values: []float64{1, 2, 3},
				fields: map[string]string{"note": "ok"}}},
		},
		{
			// Three wavelength headers among four extra fields: fewer than
			// half, so detection says columns; forcing rows reads them.
			name:   "forced rows with many extra fields",
			layout: specio.LayoutRows,
			text:   "name,a,b,c,d,400,410,420\nfern,x,y,,w,1,2,3\n",
			want: []want{{name: "fern", line: 2, column: 1, start: 400, step: 10, values: []float64{1, 2, 3},
				fields: map[string]string{"a": "x", "b": "y", "c": "", "d": "w"}}},
		},
		{
			name:   "forced columns",
			layout: specio.LayoutColumns,
			text:   "nm,400,410,420\n500,1,2,3\n510,4,5,6\n520,7,8,9\n",
			want: []want{
				{name: "400", line: 1, column: 2, start: 500, step: 10, values: []float64{1, 4, 7}},
				{name: "410", line: 1, column: 3, start: 500, step: 10, values: []float64{2, 5, 8}},
				{name: "420", line: 1, column: 4, start: 500, step: 10, values: []float64{3, 6, 9}},
			},
		},
		{
			// A fixed separator overrides detection: the semicolons here
			// would win it.
			name:  "fixed comma",
			comma: ',',
			text:  "nm,a;b;c\n400,1\n410,2\n420,3\n",
			want:  []want{{name: "a;b;c", line: 1, column: 2, start: 400, step: 10, values: []float64{1, 2, 3}}},
		},
		{
			name: "percent values kept",
			text: "nm,T%\n400,12.5\n410,50\n420,100\n",
			want: []want{{name: "T%", line: 1, column: 2, start: 400, step: 10, values: []float64{12.5, 50, 100}}},
		},
	} {
		in, file := readInput(t, tc.file, tc.text)
		r := specio.NewReader(in, file)
		r.Layout = tc.layout
		r.Comma = tc.comma
		got, err := r.ReadAll()
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		checkSpectra(t, tc.name, got, tc.want)
	}
}

func TestReadErrors(t *testing.T) {
	t.Parallel()
	// Places are counted by hand in each input; Column is the 1-based field.
	for _, tc := range []struct {
		name     string
		file     string // in testdata; else text, read as "test.csv"
		text     string
		layout   specio.Layout
		maxLine  int
		at       string // "file:line:col" or "file:line" the message starts with
		field    string // "(field …)" expected in the message, if any
		sentinel error
		full     string // whole message, where pinned
	}{
		{name: "not a number", file: "bad_not_number.csv", at: "bad_not_number.csv:2:4", field: "500", sentinel: specio.ErrNotNumber,
			full: `bad_not_number.csv:2:4 (field 500): value "abc" is not a number`},
		{name: "NaN", file: "bad_nan.csv", at: "bad_nan.csv:2:5", field: "550", sentinel: colorimetry.ErrNotFinite},
		{name: "Inf in columns", text: "nm,a\n400,1\n410,-Inf\n420,1\n", at: "test.csv:3:2", field: "a", sentinel: colorimetry.ErrNotFinite},
		{name: "beyond float64", text: "name,400,410,420\nx,1,1e999,1\n", at: "test.csv:2:3", field: "410", sentinel: colorimetry.ErrNotFinite},
		{name: "NaN wavelength", text: "nm,a\n400,1\nnan,1\n420,1\n", at: "test.csv:3:1", field: "nm", sentinel: colorimetry.ErrNotFinite},
		{name: "wavelength not a number", text: "nm,a\n4OO,1\n410,1\n420,1\n", at: "test.csv:2:1", field: "nm", sentinel: specio.ErrNotNumber},
		{name: "empty input", text: "", at: "test.csv:1:1", sentinel: specio.ErrNoData},
		{name: "BOM only", text: "\xef\xbb\xbf", at: "test.csv:1:1", sentinel: specio.ErrNoData},
		{name: "comments only", file: "bad_empty.csv", at: "bad_empty.csv:2:1", sentinel: specio.ErrNoData},
		{name: "rows header only", file: "bad_header_only.csv", at: "bad_header_only.csv:2:1", sentinel: specio.ErrNoData},
		{name: "columns header only", text: "nm,a,b\n", at: "test.csv:1:1", sentinel: specio.ErrNoData},
		{name: "header missing", layout: specio.LayoutRows, text: "400,1,2,3\n410,4,5,6\n", at: "test.csv:1:1", sentinel: specio.ErrHeader},
		{name: "no wavelength header", layout: specio.LayoutRows, text: "name,a,b\nx,1,2\n", at: "test.csv:1:1", sentinel: specio.ErrHeader},
		{name: "single column", text: "nm\n400\n410\n420\n", at: "test.csv:1:1", sentinel: specio.ErrHeader},
		{name: "extra field twice", text: "name,id,400,410,420,id\nx,1,2,3,4,5\n", at: "test.csv:1:6", field: "id", sentinel: specio.ErrHeader},
		{name: "unsorted columns", file: "bad_unsorted.csv", at: "bad_unsorted.csv:4:1", field: "nm", sentinel: colorimetry.ErrUnsorted},
		{name: "unsorted rows header", text: "name,400,390,410\nx,1,2,3\n", at: "test.csv:1:3", field: "390", sentinel: colorimetry.ErrUnsorted},
		{name: "duplicate rows header", file: "bad_duplicate_header.csv", at: "bad_duplicate_header.csv:1:4", field: "450", sentinel: colorimetry.ErrDuplicate},
		{name: "duplicate columns", text: "nm,a\n400,1\n400,2\n410,3\n", at: "test.csv:3:1", field: "nm", sentinel: colorimetry.ErrDuplicate},
		{name: "zero wavelength", text: "nm,a\n0,1\n10,2\n20,3\n", at: "test.csv:2:1", sentinel: specio.ErrWavelength},
		{name: "negative wavelength header", text: "name,-10,0,10\nx,1,2,3\n", layout: specio.LayoutRows, at: "test.csv:1:2", field: "-10", sentinel: specio.ErrWavelength},
		{name: "too few fields", file: "bad_ragged.csv", at: "bad_ragged.csv:3:3", sentinel: specio.ErrFieldCount},
		{name: "too many fields", text: "name,400,410,420\nx,1,2,3,4\n", at: "test.csv:2:5", sentinel: specio.ErrFieldCount},
		{name: "too few samples rows", text: "name,400,410\nx,1,2\n", layout: specio.LayoutRows, at: "test.csv:1:2", field: "400", sentinel: colorimetry.ErrTooFew},
		{name: "too few samples rows detected", text: "name,400,410\nx,1,2\n", at: "test.csv:1:2", field: "400", sentinel: colorimetry.ErrTooFew},
		{name: "too few samples columns", text: "nm,a\n400,1\n# two rows only\n410,2\n", at: "test.csv:4:1", sentinel: colorimetry.ErrTooFew},
		{name: "empty cell rows", text: "name,400,410,420\nx,1,,3\n", at: "test.csv:2:3", field: "410", sentinel: specio.ErrEmpty},
		{name: "empty cell columns", text: "nm,a,b\n400,1,\n410,2,2\n420,3,3\n", at: "test.csv:2:3", field: "b", sentinel: specio.ErrEmpty},
		{name: "unclosed quote", text: "nm,\"a\n400,1\n", at: "test.csv:1:2", sentinel: specio.ErrQuote},
		{name: "line too long", text: "nm,a\n400,1.000000000000000000000\n", maxLine: 16, at: "test.csv:2", sentinel: specio.ErrLineTooLong},
		// 400.2–400.9 nm holds no whole 1 nm grid of 3 points (colorimetry.NewGrid).
		{name: "irregular span too short", text: "name,400.2,400.5,400.9\nx,1,2,3\n", at: "test.csv:1:2", field: "400.2", sentinel: colorimetry.ErrBadGrid},
		// A natural cubic spline through alternating ±1e308 overflows
		// between the samples; the resampled values are checked.
		{name: "resampling overflow rows", text: "name,400,401,403,406\nx,1e308,-1e308,1e308,-1e308\n", at: "test.csv:2:1", sentinel: colorimetry.ErrNotFinite},
		{name: "resampling overflow columns", text: "nm,a\n400,1.7e308\n401,-1.7e308\n403,1.7e308\n406,-1.7e308\n", at: "test.csv:1:2", field: "a", sentinel: colorimetry.ErrNotFinite},
		{name: "irregular span too wide", text: "name,1,2,1e9\nx,1,2,3\n", at: "test.csv:1:2", field: "1", sentinel: specio.ErrTooWide},
	} {
		in, file := readInput(t, tc.file, tc.text)
		r := specio.NewReader(in, file)
		r.Layout = tc.layout
		r.MaxLineBytes = tc.maxLine
		_, err := r.ReadAll()
		if err == nil {
			t.Errorf("%s: no error", tc.name)
			continue
		}
		var pe *specio.ParseError
		if !errors.As(err, &pe) {
			t.Errorf("%s: error %T %v, want *ParseError", tc.name, err, err)
		}
		msg := err.Error()
		if !errors.Is(err, tc.sentinel) {
			t.Errorf("%s: %q does not wrap %q", tc.name, msg, tc.sentinel)
		}
		if !strings.HasPrefix(msg, tc.at+" (field ") && !strings.HasPrefix(msg, tc.at+": ") {
			t.Errorf("%s: %q does not start with the place %q", tc.name, msg, tc.at)
		}
		if tc.field != "" && !strings.Contains(msg, "(field "+tc.field+")") {
			t.Errorf("%s: %q does not name field %q", tc.name, msg, tc.field)
		}
		if tc.full != "" && msg != tc.full {
			t.Errorf("%s: message %q, want %q", tc.name, msg, tc.full)
		}
		if strings.Contains(msg, "\n") {
			t.Errorf("%s: message %q is not one line", tc.name, msg)
		}
		// The error is sticky: another call gives it again, or goes on
		// past one bad line of the rows layout.
		if _, err2 := r.Next(); err2 == nil {
			// Only a row-level problem in the rows layout may let reading go on.
			if !errors.Is(err, specio.ErrNotNumber) && !errors.Is(err, colorimetry.ErrNotFinite) &&
				!errors.Is(err, specio.ErrFieldCount) && !errors.Is(err, specio.ErrEmpty) {
				t.Errorf("%s: reading went on after %v", tc.name, err)
			}
		}
	}
}

func TestReaderSettings(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name  string
		setup func(r *specio.Reader)
	}{
		{"separator", func(r *specio.Reader) { r.Comma = '|' }},
		{"layout", func(r *specio.Reader) { r.Layout = specio.Layout(7) }},
		{"line limit", func(r *specio.Reader) { r.MaxLineBytes = -1 }},
	} {
		r := specio.NewReader(strings.NewReader("nm,a\n400,1\n410,2\n420,3\n"), "x.csv")
		tc.setup(r)
		if _, err := r.Next(); err == nil || !strings.HasPrefix(err.Error(), "specio: ") {
			t.Errorf("%s: error %v, want a specio: settings error", tc.name, err)
		}
	}
}

func TestIrregularWavelengths(t *testing.T) {
	t.Parallel()
	// Irregular samples of a straight line, 1/1000 of the wavelength. A
	// natural cubic spline reproduces a straight line exactly, its second
	// derivative being zero throughout (de Boor, A Practical Guide to
	// Splines, ch. IV; from memory), so the 1 nm resampling made by
	// colorimetry.NewSpectrumWith must give nm/1000 up to round-off. The
	// tolerance 1e-12 allows for round-off in the spline solve.
	// MaxStep keeps the widest gap of the file's own wavelengths.
	for _, tc := range []struct {
		name    string
		text    string
		step    float64
		lo      float64
		n       int
		maxStep float64
	}{
		{name: "columns", text: "nm,line\n400,0.4\n410,0.41\n425,0.425\n440,0.44\n460.5,0.4605\n", step: 1, lo: 400, n: 61, maxStep: 20.5},
		{name: "rows", text: "name,400.5,410,425,440,460\nline,0.4005,0.41,0.425,0.44,0.46\n", step: 1, lo: 401, n: 60, maxStep: 20},
		{name: "rows 5 nm", text: "name,400,410,425,440,460\nline,0.4,0.41,0.425,0.44,0.46\n", step: 5, lo: 400, n: 13, maxStep: 20},
	} {
		r := specio.NewReader(strings.NewReader(tc.text), "irregular.csv")
		r.Options.Step = tc.step
		got, err := r.ReadAll()
		if err != nil || len(got) != 1 {
			t.Errorf("%s: %d spectra, %v", tc.name, len(got), err)
			continue
		}
		if got[0].MaxStep != tc.maxStep {
			t.Errorf("%s: MaxStep %g, want %g", tc.name, got[0].MaxStep, tc.maxStep)
		}
		s := got[0].Spectrum
		g := s.Grid()
		if g.Start != tc.lo || g.Step != tc.step || g.N != tc.n {
			t.Errorf("%s: grid %v N=%d, want %g nm at %g nm, N=%d", tc.name, g, g.N, tc.lo, tc.step, tc.n)
			continue
		}
		for i := range g.N {
			nm := g.Wavelength(i)
			if v := s.Value(i); !scalar.EqualWithinAbsOrRel(v, nm/1000, 1e-12, 1e-12) {
				t.Errorf("%s: value at %g nm = %v, want %v", tc.name, nm, v, nm/1000)
			}
		}
	}
}

// TestMaxStepEven checks MaxStep for evenly spaced data in the three
// layouts: the grid's own step.
func TestMaxStepEven(t *testing.T) {
	t.Parallel()
	for name, text := range map[string]string{
		"columns": "nm,a\n400,0.4\n410,0.41\n420,0.42\n",
		"rows":    "name,400,410,420\na,0.4,0.41,0.42\n",
		"cgats":   "CGATS.17\nNUMBER_OF_FIELDS 4\nBEGIN_DATA_FORMAT\nSAMPLE_ID SPECTRAL_NM400 SPECTRAL_NM410 SPECTRAL_NM420\nEND_DATA_FORMAT\nNUMBER_OF_SETS 1\nBEGIN_DATA\na 0.4 0.41 0.42\nEND_DATA\n",
	} {
		got, err := specio.NewReader(strings.NewReader(text), name).ReadAll()
		if err != nil || len(got) != 1 {
			t.Errorf("%s: %d spectra, %v", name, len(got), err)
			continue
		}
		if got[0].MaxStep != 10 || got[0].Spectrum.Grid().Step != 10 {
			t.Errorf("%s: MaxStep %g, grid %v; want 10 and a 10 nm grid", name, got[0].MaxStep, got[0].Spectrum.Grid())
		}
	}
}

func TestOptionsPassedOn(t *testing.T) {
	t.Parallel()
	r := specio.NewReader(strings.NewReader("nm,f\n400,1\n410,2\n420,3\n"), "x.csv")
	r.Options = colorimetry.Options{Interp: colorimetry.InterpLinear, Extrap: colorimetry.ExtrapZero}
	got, err := r.ReadAll()
	if err != nil || len(got) != 1 {
		t.Fatalf("%d spectra, %v", len(got), err)
	}
	if s := got[0].Spectrum; s.Interp() != colorimetry.InterpLinear || s.Extrap() != colorimetry.ExtrapZero {
		t.Errorf("spectrum interpolates %v, extrapolates %v; want linear, zero", s.Interp(), s.Extrap())
	}
}

func TestNumberField(t *testing.T) {
	t.Parallel()
	in, file := readInput(t, "inks_rows_semicolon.csv", "")
	got, err := specio.NewReader(in, file).ReadAll()
	if err != nil || len(got) != 3 {
		t.Fatalf("%d spectra, %v", len(got), err)
	}
	// The drive amounts as written in the file, read with its decimal comma.
	for k, wantDrive := range []float64{0.85, 1, 0.5} {
		v, err := got[k].Number("drive")
		if err != nil || v != wantDrive {
			t.Errorf("%q drive = %v, %v; want %v", got[k].Name, v, err, wantDrive)
		}
	}
	for _, tc := range []struct {
		key      string
		at       string
		sentinel error
	}{
		{key: "id", at: "inks_rows_semicolon.csv:3:2 (field id): ", sentinel: specio.ErrNotNumber},
		{key: "coverage", at: "inks_rows_semicolon.csv:3 (field coverage): ", sentinel: specio.ErrNoField},
	} {
		_, err := got[0].Number(tc.key)
		if !errors.Is(err, tc.sentinel) || err == nil || !strings.HasPrefix(err.Error(), tc.at) {
			t.Errorf("Number(%q) error %v, want %q… wrapping %v", tc.key, err, tc.at, tc.sentinel)
		}
	}
}

// rowSource is an endless rows-layout file: a header, then numbered
// lines of three values. Reading it to the end would never finish.
type rowSource struct {
	pending []byte
	n       int
}

func (s *rowSource) Read(p []byte) (int, error) {
	if len(s.pending) == 0 {
		if s.n == 0 {
			s.pending = []byte("name,400,410,420\n")
		} else {
			s.pending = fmt.Appendf(nil, "s%d,%d,1,2\n", s.n, s.n)
		}
		s.n++
	}
	k := copy(p, s.pending)
	s.pending = s.pending[k:]
	return k, nil
}

func TestRowsStream(t *testing.T) {
	t.Parallel()
	// Each Next reads one line: an endless source still yields spectra.
	r := specio.NewReader(&rowSource{}, "endless.csv")
	for k := 1; k <= 2000; k++ {
		n, err := r.Next()
		if err != nil {
			t.Fatalf("spectrum %d: %v", k, err)
		}
		if want := fmt.Sprintf("s%d", k); n.Name != want || n.Line != k+1 || n.Spectrum.Value(0) != float64(k) {
			t.Fatalf("spectrum %d: %q line %d value %v, want %q line %d value %d", k, n.Name, n.Line, n.Spectrum.Value(0), want, k+1, k)
		}
	}
}

// endlessLine is a source with no line break at all.
type endlessLine struct{}

func (endlessLine) Read(p []byte) (int, error) {
	for i := range p {
		p[i] = '7'
	}
	return len(p), nil
}

func TestLineLimit(t *testing.T) {
	t.Parallel()
	// A file without line breaks must end in an error, not exhaust memory.
	for _, limit := range []int{1, 1000, 1 << 17} {
		r := specio.NewReader(endlessLine{}, "flat.csv")
		r.MaxLineBytes = limit
		_, err := r.Next()
		if !errors.Is(err, specio.ErrLineTooLong) || !strings.HasPrefix(err.Error(), "flat.csv:1: ") {
			t.Errorf("limit %d: error %v, want flat.csv:1: … line too long", limit, err)
		}
	}
	// A line of exactly the limit passes, with or without CR.
	for _, text := range []string{"nm,a\n400,1\n410,2\n420,3\n", "nm,a\r\n400,1\r\n410,2\r\n420,3\r\n"} {
		r := specio.NewReader(strings.NewReader(text), "edge.csv")
		r.MaxLineBytes = 5
		if got, err := r.ReadAll(); err != nil || len(got) != 1 {
			t.Errorf("%q at limit 5: %d spectra, %v", text, len(got), err)
		}
	}
}

func TestRowsGoOnAfterBadLine(t *testing.T) {
	t.Parallel()
	text := "name,400,410,420\nfirst,1,2,3\nbad,1,x,3\nshort,1,2\nlast,4,5,6\n"
	r := specio.NewReader(strings.NewReader(text), "lib.csv")
	var names, errs []string
	for {
		n, err := r.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			errs = append(errs, err.Error())
			if len(errs) > 5 {
				t.Fatal("errors do not end")
			}
			continue
		}
		names = append(names, n.Name)
	}
	if strings.Join(names, "|") != "first|last" || len(errs) != 2 ||
		!strings.HasPrefix(errs[0], "lib.csv:3:3 (field 410): ") || !strings.HasPrefix(errs[1], "lib.csv:4:4: ") {
		t.Errorf("names %q, errors %q; want first, last and errors at 3:3 and 4:4", names, errs)
	}
}

func TestReaderSources(t *testing.T) {
	t.Parallel()
	b, err := os.ReadFile(filepath.Join("testdata", "inks_rows_semicolon.csv"))
	if err != nil {
		t.Fatal(err)
	}
	ref, err := specio.NewReader(strings.NewReader(string(b)), "-").ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	// Readers that deliver little at a time, as a pipe or terminal does.
	for _, tc := range []struct {
		name string
		r    io.Reader
	}{
		{"one byte", iotest.OneByteReader(strings.NewReader(string(b)))},
		{"half", iotest.HalfReader(strings.NewReader(string(b)))},
		{"data with EOF", iotest.DataErrReader(strings.NewReader(string(b)))},
	} {
		got, err := specio.NewReader(tc.r, "-").ReadAll()
		if err != nil || len(got) != len(ref) {
			t.Errorf("%s: %d spectra, %v", tc.name, len(got), err)
			continue
		}
		for k := range ref {
			if got[k].Name != ref[k].Name || got[k].Line != ref[k].Line ||
				!slicesEqual(got[k].Spectrum.Values(nil), ref[k].Spectrum.Values(nil)) {
				t.Errorf("%s: spectrum %d differs", tc.name, k)
			}
		}
	}
	// A failing source: the read error is wrapped with the place.
	disk := errors.New("device gone")
	r := specio.NewReader(io.MultiReader(strings.NewReader("nm,a\n400,1\n"), iotest.ErrReader(disk)), "-")
	_, err = r.ReadAll()
	if !errors.Is(err, disk) || !strings.HasPrefix(err.Error(), "<stdin>:3: ") {
		t.Errorf("error %v, want <stdin>:3: … device gone", err)
	}
}

func slicesEqual(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// TestReadFileStdin swaps os.Stdin, so it does not run in parallel; the
// parallel tests of this package wait until it is done.
func TestReadFileStdin(t *testing.T) {
	f, err := os.Open(filepath.Join("testdata", "lamps_columns.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	saved := os.Stdin
	os.Stdin = f
	defer func() { os.Stdin = saved }()
	got, err := specio.ReadFile("-")
	if err != nil || len(got) != 3 || got[1].Name != "teal gel, double" {
		t.Errorf("ReadFile(-): %d spectra, %v", len(got), err)
	}
}

func TestReadFile(t *testing.T) {
	t.Parallel()
	got, err := specio.ReadFile(filepath.Join("testdata", "filters_headerless.tsv"))
	if err != nil || len(got) != 2 {
		t.Errorf("ReadFile: %d spectra, %v", len(got), err)
	}
	_, err = specio.ReadFile(filepath.Join("testdata", "no such file.csv"))
	if !errors.Is(err, os.ErrNotExist) {
		t.Errorf("missing file: %v, want os.ErrNotExist", err)
	}
	_, err = specio.ReadFile(filepath.Join("testdata", "bad_nan.csv"))
	if !errors.Is(err, colorimetry.ErrNotFinite) || !strings.HasPrefix(err.Error(), filepath.Join("testdata", "bad_nan.csv")+":2:5 ") {
		t.Errorf("bad file: %v", err)
	}
}

func TestParseErrorText(t *testing.T) {
	t.Parallel()
	inner := errors.New("boom")
	for _, tc := range []struct {
		e    specio.ParseError
		want string
	}{
		{specio.ParseError{File: "a.csv", Line: 12, Column: 4, Field: "455", Err: inner}, "a.csv:12:4 (field 455): boom"},
		{specio.ParseError{File: "a.csv", Line: 12, Err: inner}, "a.csv:12: boom"},
		{specio.ParseError{File: "-", Line: 1, Column: 1, Err: inner}, "<stdin>:1:1: boom"},
		{specio.ParseError{Line: 2, Column: 3, Err: inner}, "<input>:2:3: boom"},
		{specio.ParseError{File: "a.csv", Line: 1, Column: 2, Field: "x\ny", Err: inner}, `a.csv:1:2 (field "x\ny"): boom`},
		{specio.ParseError{File: "a.csv"}, "a.csv: unknown error"},
	} {
		if got := tc.e.Error(); got != tc.want {
			t.Errorf("Error() = %q, want %q", got, tc.want)
		}
	}
	if !errors.Is(&specio.ParseError{Err: inner}, inner) {
		t.Error("ParseError does not unwrap")
	}
}
