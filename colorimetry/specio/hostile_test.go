package specio_test

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"
	"testing"
	"unicode/utf16"

	"github.com/antipode-color/antipode/colorimetry/specio"
)

// utf16Text encodes s as UTF-16 with the given byte order and, when bom is
// set, a byte order mark (U+FEFF written in that order; Unicode Standard
// §23.8, from memory).
func utf16Text(s string, bigEndian, bom bool) []byte {
	units := utf16.Encode([]rune(s))
	if bom {
		units = append([]uint16{0xfeff}, units...)
	}
	var b bytes.Buffer
	for _, u := range units {
		if bigEndian {
			b.WriteByte(byte(u >> 8))
			b.WriteByte(byte(u))
		} else {
			b.WriteByte(byte(u))
			b.WriteByte(byte(u >> 8))
		}
	}
	return b.Bytes()
}

// binaryJunk returns every byte value in turn, 40 times over.
func binaryJunk() []byte {
	var b []byte
	for range 40 {
		for c := range 256 {
			b = append(b, byte(c))
		}
	}
	return b
}

// limits are the size limits of one hostile case; zero means the default.
type limits struct{ line, cols, rows, values int }

// TestHostileFiles feeds files that instruments, spreadsheets and scripts
// produce when something goes wrong, under both readers. Every one must
// give a one-line *ParseError naming the file and line and wrapping the
// sentinel for the problem; none may panic or read a spectrum. The
// expected places and sentinels are this package's documented contract:
// common practice (no source).
func TestHostileFiles(t *testing.T) {
	t.Parallel()
	const csv = "nm,a\n400,0.5\n410,0.6\n420,0.7\n"
	const cgats = "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm400 nm410 nm420\nEND_DATA_FORMAT\nBEGIN_DATA\n1 0.5 0.6 0.7\nEND_DATA\n"
	wide := "nm," + strings.Repeat("a,", 99) + "a\n"
	for _, tc := range []struct {
		name     string
		data     []byte
		lim      limits
		cgats    bool // read with NewCGATSReader
		at       string
		field    string
		sentinel error
	}{
		{name: "UTF-16 LE with BOM", data: utf16Text(csv, false, true), at: "hostile:1", sentinel: specio.ErrEncoding},
		{name: "UTF-16 BE with BOM", data: utf16Text(csv, true, true), at: "hostile:1", sentinel: specio.ErrEncoding},
		{name: "UTF-16 LE without BOM", data: utf16Text(csv, false, false), at: "hostile:1", sentinel: specio.ErrEncoding},
		{name: "UTF-16 CGATS", data: utf16Text(cgats, false, true), cgats: true, at: "hostile:1", sentinel: specio.ErrEncoding},
		{name: "NUL byte in line 3", data: []byte("nm,a\n400,0.5\n410,0\x00.6\n420,0.7\n"), at: "hostile:3", sentinel: specio.ErrEncoding},
		// A PNG signature: its first line holds no NUL, so the header is
		// what fails.
		{name: "PNG file", data: []byte("\x89PNG\r\n\x1a\n\x00\x00\x00\rIHDR"), at: "hostile:1:1", sentinel: specio.ErrHeader},
		{name: "binary with NUL", data: binaryJunk(), at: "hostile:1", sentinel: specio.ErrEncoding},
		{name: "CR-only line endings", data: []byte(strings.ReplaceAll(csv, "\n", "\r")), at: "hostile:1", sentinel: specio.ErrLineEnding},
		{name: "CR-only CGATS", data: []byte(strings.ReplaceAll(cgats, "\n", "\r")), cgats: true, at: "hostile:1", sentinel: specio.ErrLineEnding},
		{name: "CR-only beyond the read buffer", data: []byte(strings.Repeat("400,0.5\r", 20000)), at: "hostile:1", sentinel: specio.ErrLineEnding},
		{name: "stray CR in line 2", data: []byte("nm,a\n400,0.5\r410,0.6\n420,0.7\n"), at: "hostile:2", sentinel: specio.ErrLineEnding},
		{name: "very long line", data: []byte("nm,a\n400," + strings.Repeat("5", 300000) + "\n"), lim: limits{line: 1 << 16}, at: "hostile:2", sentinel: specio.ErrLineTooLong},
		{name: "too many columns", data: []byte(wide), lim: limits{cols: 50}, at: "hostile:1:51", sentinel: specio.ErrTooBig},
		{name: "too many CGATS fields", data: []byte("CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm400 nm410 nm420\nEND_DATA_FORMAT\n"), lim: limits{cols: 3}, cgats: true, at: "hostile:3:4", sentinel: specio.ErrTooBig},
		{name: "too many rows", data: []byte(csv + "430,0.8\n440,0.9\n"), lim: limits{rows: 4}, at: "hostile:6", sentinel: specio.ErrTooBig},
		// 3 spectra × 3 rows = 9 values > 8.
		{name: "too many values", data: []byte("nm,a,b,c\n400,1,2,3\n410,1,2,3\n420,1,2,3\n"), lim: limits{values: 8}, at: "hostile:4", sentinel: specio.ErrTooBig},
		{name: "duplicate spectrum names", data: []byte("nm,a,b,a\n400,1,2,3\n410,1,2,3\n420,1,2,3\n"), at: "hostile:1:4", field: "a", sentinel: specio.ErrHeader},
		{name: "duplicate extra fields", data: []byte("name,id,400,410,420,id\nx,1,2,3,4,5\n"), at: "hostile:1:6", field: "id", sentinel: specio.ErrHeader},
		{name: "empty column", data: []byte("nm,a,,b\n400,1,,3\n410,1,,3\n420,1,,3\n"), at: "hostile:2:3", field: "column 3", sentinel: specio.ErrEmpty},
		{name: "Inf value", data: []byte("nm,a\n400,Inf\n410,1\n420,1\n"), at: "hostile:2:2", field: "a"},
		{name: "beyond float64", data: []byte("nm,a\n400,1e309\n410,1\n420,1\n"), at: "hostile:2:2", field: "a"},
	} {
		var err error
		var got int
		if tc.cgats {
			r := specio.NewCGATSReader(bytes.NewReader(tc.data), "hostile")
			r.MaxLineBytes, r.MaxColumns = tc.lim.line, tc.lim.cols
			got, err = drainAll(r.Next)
		} else {
			r := specio.NewReader(bytes.NewReader(tc.data), "hostile")
			r.MaxLineBytes, r.MaxColumns, r.MaxRows, r.MaxValues = tc.lim.line, tc.lim.cols, tc.lim.rows, tc.lim.values
			got, err = drainAll(r.Next)
		}
		if got != 0 {
			t.Errorf("%s: read %d spectra, want none", tc.name, got)
		}
		var pe *specio.ParseError
		if !errors.As(err, &pe) {
			t.Errorf("%s: error %v (%T), want a *ParseError", tc.name, err, err)
			continue
		}
		msg := err.Error()
		if !strings.HasPrefix(msg, tc.at+":") && !strings.HasPrefix(msg, tc.at+" ") {
			t.Errorf("%s: %q, want it placed at %s", tc.name, msg, tc.at)
		}
		if pe.Field != tc.field {
			t.Errorf("%s: field %q, want %q", tc.name, pe.Field, tc.field)
		}
		if tc.sentinel != nil && !errors.Is(err, tc.sentinel) {
			t.Errorf("%s: %v, want %v", tc.name, err, tc.sentinel)
		}
		if strings.ContainsAny(msg, "\r\n") || len(msg) > 300 {
			t.Errorf("%s: message is not one short line: %q", tc.name, msg)
		}
	}
}

// drainAll reads until io.EOF or an error and returns the number of
// spectra read and the error (nil at io.EOF).
func drainAll(next func() (specio.Named, error)) (int, error) {
	n := 0
	for {
		_, err := next()
		if err == io.EOF {
			return n, nil
		}
		if err != nil {
			return n, err
		}
		n++
	}
}

// TestHostileButValid checks inputs at the edges that are valid data and
// must read: -0, ±1e308 that need no resampling, a UTF-8 BOM, a CRLF whose
// CR and LF fall on either side of the 64 KiB read buffer, and a line just
// within the column limit. Expected values are the decimal literals of the
// input, which strconv.ParseFloat reads exactly (Go strconv
// documentation).
func TestHostileButValid(t *testing.T) {
	t.Parallel()
	// A rows-layout line padded so that its CR is the last byte of the
	// first 64 KiB buffer fill (bufio.Reader of NewReader, 64 KiB).
	head := "name,400,410,420\n"
	pad := (64 << 10) - len(head) - len("x,1,2,3") - 1
	straddle := head + "x,1,2,3" + strings.Repeat(" ", pad) + "\r\ny,4,5,6\r\n"
	for _, tc := range []struct {
		name   string
		text   string
		cols   int
		values [][]float64
	}{
		{name: "negative zero", text: "nm,a\n400,-0\n410,-0\n420,-0\n", values: [][]float64{{0, 0, 0}}},
		{name: "1e308", text: "nm,a\n400,1e308\n410,-1e308\n420,1.7976931348623157e308\n", values: [][]float64{{1e308, -1e308, math.MaxFloat64}}},
		{name: "UTF-8 BOM", text: "\ufeffnm,a\n400,1\n410,2\n420,3\n", values: [][]float64{{1, 2, 3}}},
		{name: "CRLF across the buffer", text: straddle, values: [][]float64{{1, 2, 3}, {4, 5, 6}}},
		{name: "columns at the limit", text: "name,400,410,420\nx,1,2,3\n", cols: 4, values: [][]float64{{1, 2, 3}}},
	} {
		r := specio.NewReader(strings.NewReader(tc.text), "edge.csv")
		r.MaxColumns = tc.cols
		got, err := r.ReadAll()
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		if len(got) != len(tc.values) {
			t.Errorf("%s: %d spectra, want %d", tc.name, len(got), len(tc.values))
			continue
		}
		for k, want := range tc.values {
			s := got[k].Spectrum
			for i, v := range want {
				if s.Value(i) != v {
					t.Errorf("%s: spectrum %d sample %d = %v, want %v", tc.name, k, i, s.Value(i), v)
				}
			}
		}
		if tc.name == "negative zero" && !math.Signbit(got[0].Spectrum.Value(0)) {
			t.Errorf("%s: the sign of -0 was lost", tc.name)
		}
	}
}

// TestNegativeLimits checks that a negative limit is refused before
// anything is read: common practice (no source).
func TestNegativeLimits(t *testing.T) {
	t.Parallel()
	for _, set := range []func(r *specio.Reader){
		func(r *specio.Reader) { r.MaxColumns = -1 },
		func(r *specio.Reader) { r.MaxRows = -1 },
		func(r *specio.Reader) { r.MaxValues = -1 },
	} {
		r := specio.NewReader(strings.NewReader("nm,a\n400,1\n410,2\n420,3\n"), "neg.csv")
		set(r)
		if _, err := r.Next(); err == nil {
			t.Errorf("negative limit accepted")
		}
	}
	c := specio.NewCGATSReader(strings.NewReader("CGATS.17\n"), "neg.txt")
	c.MaxColumns = -1
	if _, err := c.Next(); err == nil {
		t.Errorf("CGATS: negative MaxColumns accepted")
	}
}

// TestReadAllBounded checks that ReadAll, which holds every spectrum in
// memory, stops at MaxValues values in the rows layout as well.
func TestReadAllBounded(t *testing.T) {
	t.Parallel()
	var b strings.Builder
	b.WriteString("name,400,500,600\n")
	for i := range 20 {
		fmt.Fprintf(&b, "s%d,0.1,0.2,0.3\n", i)
	}
	r := specio.NewReader(strings.NewReader(b.String()), "big.csv")
	r.MaxValues = 30
	list, err := r.ReadAll()
	if !errors.Is(err, specio.ErrTooBig) || len(list) != 10 || !strings.Contains(err.Error(), "big.csv:12") {
		t.Errorf("got %d spectra, %v; want 10 and specio.ErrTooBig at big.csv:12", len(list), err)
	}
	r = specio.NewReader(strings.NewReader(b.String()), "big.csv")
	if list, err := r.ReadAll(); err != nil || len(list) != 20 {
		t.Errorf("default limit: %d spectra, %v", len(list), err)
	}
}
