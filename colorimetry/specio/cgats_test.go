package specio_test

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"maps"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
)

// cgatsGood lists the well-formed CGATS files in testdata.
var cgatsGood = []string{"cgats_export_tabs.txt", "cgats_export_spaces.txt", "cgats_standard_layout.txt"}

// cgatsSpectrum is a sample expected from a CGATS file: its name, set and
// a few values at given wavelengths (nm), as written in the file.
type cgatsSpectrum struct {
	name string
	set  string
	line int
	at   map[float64]float64
}

// TestCGATSExports reads two invented instrument exports of the same four
// measurements, laid out differently: export A with tabs, CRLF, a byte
// order mark, quoted names, SPECTRAL_NM_380 fields and NUMBER_OF_SETS;
// export B with runs of spaces, SPECTRAL_NM380 fields wrapped over two
// format lines, no NUMBER_OF_SETS and two data sets, the second with its
// fields in descending wavelength order. Both must give the same spectra
// (common practice (no source): a file's layout must not change its data).
func TestCGATSExports(t *testing.T) {
	t.Parallel()
	// Values as printed in the files (testdata, invented demo data).
	wants := map[string][]cgatsSpectrum{
		"cgats_export_tabs.txt": {
			{name: "harbour teal", set: "1", line: 16, at: map[float64]float64{380: 0.0688, 490: 0.54, 730: 0.06}},
			{name: "quince yellow", set: "1", line: 17, at: map[float64]float64{380: 0.05, 520: 0.45}},
			{name: `soot "deep" black`, set: "1", line: 18, at: map[float64]float64{380: 0.031}},
			{name: "madder rose", set: "1", line: 19, at: map[float64]float64{600: 0.38}},
		},
		"cgats_export_spaces.txt": {
			{name: "harbour teal", set: "1", line: 11, at: map[float64]float64{380: 0.0688, 490: 0.54, 730: 0.06}},
			{name: "quince yellow", set: "1", line: 12, at: map[float64]float64{380: 0.05, 520: 0.45}},
			{name: `soot "deep" black`, set: "2", line: 25, at: map[float64]float64{380: 0.031}},
			{name: "madder rose", set: "2", line: 26, at: map[float64]float64{600: 0.38}},
		},
	}
	var first []specio.Named
	for _, file := range []string{"cgats_export_tabs.txt", "cgats_export_spaces.txt"} {
		got, err := specio.ReadFile(filepath.Join("testdata", file))
		if err != nil {
			t.Fatalf("%s: %v", file, err)
		}
		w := wants[file]
		if len(got) != len(w) {
			t.Fatalf("%s: %d spectra, want %d", file, len(got), len(w))
		}
		for k, n := range got {
			if n.Name != w[k].name || n.Fields[specio.CGATSSetKey] != w[k].set || n.Line != w[k].line || n.Column != 1 {
				t.Errorf("%s: sample %d is %q, set %q, at %d:%d; want %q, set %q, line %d", file, k, n.Name, n.Fields[specio.CGATSSetKey], n.Line, n.Column, w[k].name, w[k].set, w[k].line)
			}
			if g := n.Spectrum.Grid(); !g.Equal(colorimetry.Grid{Start: 380, Step: 10, N: 36}) {
				t.Errorf("%s: %q on %v, want 380–730 nm at 10 nm", file, n.Name, g)
			}
			for nm, v := range w[k].at {
				// The values are decimal literals of the file, read by a
				// correctly rounding strconv.ParseFloat (Go documentation):
				// exact, tol 0.
				if got := n.Spectrum.At(nm); !scalar.EqualWithinAbsOrRel(got, v, 0, 0) {
					t.Errorf("%s: %q at %g nm = %v, want %v", file, n.Name, nm, got, v)
				}
			}
		}
		if first == nil {
			first = got
			continue
		}
		for k := range got {
			a, b := first[k].Spectrum, got[k].Spectrum
			if !slices.Equal(a.Values(nil), b.Values(nil)) || !a.Grid().Equal(b.Grid()) {
				t.Errorf("%q differs between the exports:\n%v\n%v", got[k].Name, a.Values(nil), b.Values(nil))
			}
		}
	}
}

// TestCGATSHeaders checks the metadata kept from each file's header,
// against the files' own text (testdata).
func TestCGATSHeaders(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		file     string
		ident    string
		sets     int
		keywords [][]specio.Keyword
		format0  []string // first fields of set 1
		nFormat  int
	}{
		{
			file: "cgats_export_tabs.txt", ident: "CGATS.17", sets: 1,
			keywords: [][]specio.Keyword{{
				{Name: "ORIGINATOR", Value: "Kettle Row bench spectrometer, export A (invented)"},
				{Name: "DESCRIPTOR", Value: "Ink drawdowns, reflectance factor"},
				{Name: "CREATED", Value: "2025-03-14"},
				{Name: "INSTRUMENTATION", Value: "KR bench unit 2 (invented)"},
				{Name: "MEASUREMENT_SOURCE", Value: "Illumination=D50 ObserverAngle=2"},
				{Name: "BENCH_OPERATOR", Value: "night shift"},
			}},
			format0: []string{"SAMPLE_ID", "SAMPLE_NAME", "SPECTRAL_NM_380"}, nFormat: 38,
		},
		{
			file: "cgats_export_spaces.txt", ident: "KR-SPECTRA 2", sets: 2,
			keywords: [][]specio.Keyword{{
				{Name: "ORIGINATOR", Value: "Kettle Row second bench (invented)"},
				{Name: "DESCRIPTOR", Value: "Ink drawdowns, part 1 of 2"},
				{Name: "SAMPLE_BACKING", Value: "white"},
			}, {
				{Name: "ORIGINATOR", Value: "Kettle Row second bench (invented)"},
				{Name: "DESCRIPTOR", Value: "Ink drawdowns, part 2 of 2"},
				{Name: "SAMPLE_BACKING", Value: "white"},
			}},
			format0: []string{"SAMPLE_ID", "SAMPLE_NAME", "SPECTRAL_NM380"}, nFormat: 38,
		},
		{
			file: "cgats_standard_layout.txt", ident: "CGATS.17", sets: 1,
			keywords: [][]specio.Keyword{{
				{Name: "ORIGINATOR", Value: "antipode test data (invented values)"},
				{Name: "DESCRIPTOR", Value: "Layout after the CGATS.17 example, from memory"},
				{Name: "CREATED", Value: "2025-03-14"},
				{Name: "MANUFACTURER", Value: "Kettle Row press room (invented)"},
				{Name: "PROD_DATE", Value: "2025-03"},
				{Name: "SERIAL", Value: "0007"},
				{Name: "MATERIAL", Value: "coated stock"},
				{Name: "INSTRUMENTATION", Value: "invented"},
				{Name: "MEASUREMENT_SOURCE", Value: "Illumination=D50\tObserverAngle=2"},
				{Name: "PRINT_CONDITIONS", Value: "offset, invented"},
			}},
			format0: []string{"SAMPLE_ID", "CMYK_C", "CMYK_M", "CMYK_Y", "CMYK_K", "XYZ_X", "XYZ_Y", "XYZ_Z", "LAB_L", "LAB_A", "LAB_B"}, nFormat: 11,
		},
	} {
		sets, err := specio.ReadCGATSFile(filepath.Join("testdata", c.file))
		if err != nil {
			t.Fatalf("%s: %v", c.file, err)
		}
		if len(sets) != c.sets {
			t.Fatalf("%s: %d sets, want %d", c.file, len(sets), c.sets)
		}
		for k, s := range sets {
			if s.Identifier != c.ident || s.Set != k+1 {
				t.Errorf("%s: set %d identifier %q, index %d; want %q, %d", c.file, k+1, s.Identifier, s.Set, c.ident, k+1)
			}
			if !slices.Equal(s.Keywords, c.keywords[k]) {
				t.Errorf("%s: set %d keywords\n%q\nwant\n%q", c.file, k+1, s.Keywords, c.keywords[k])
			}
			if len(s.Format) != c.nFormat || k == 0 && !slices.Equal(s.Format[:len(c.format0)], c.format0) {
				t.Errorf("%s: set %d format %q", c.file, k+1, s.Format)
			}
		}
		if v, ok := sets[0].Value("ORIGINATOR"); !ok || v != c.keywords[0][0].Value {
			t.Errorf("%s: Value(ORIGINATOR) = %q, %v", c.file, v, ok)
		}
		if _, ok := sets[0].Value("NUMBER_OF_FIELDS"); ok {
			t.Errorf("%s: NUMBER_OF_FIELDS kept among the keywords; WriteCGATS derives it", c.file)
		}
	}
}

// TestCGATSStandardLayout reads a colorimetric file laid out like the
// example in CGATS.17 (from memory: identifier, descriptive keywords,
// NUMBER_OF_FIELDS, the data format of SAMPLE_ID, CMYK, XYZ and LAB
// fields, NUMBER_OF_SETS, the data; the values are invented). Its samples
// have no spectrum; XYZ and Lab come from their fields, and a Reader, which
// needs spectra, refuses the file with its name and line.
func TestCGATSStandardLayout(t *testing.T) {
	t.Parallel()
	path := filepath.Join("testdata", "cgats_standard_layout.txt")
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := specio.NewCGATSReader(f, path)
	// D50 white of ISO 13655 / ICC, X = 96.422, Z = 82.521 (from memory);
	// the file's XYZ were computed from its Lab with CIE 015:2018 §8.2.1
	// and printed to 4 decimals, so Lab from XYZ must agree with the
	// printed Lab to 0.01 (0.5e-4 in XYZ moves L* by < 0.001 near
	// black, where dL*/dY = 903.3/100 per CIE 015 §8.2.1).
	white := colorimetry.XYZ{X: 96.422, Y: 100, Z: 82.521}
	ids := []string{"A1", "A2", "A3", "A4", "A5", "A6"}
	for k := 0; ; k++ {
		n, err := r.Next()
		if err == io.EOF {
			if k != len(ids) {
				t.Fatalf("%d samples, want %d", k, len(ids))
			}
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		if n.Name != ids[k] || n.Line != 18+k || !n.Spectrum.IsZero() {
			t.Errorf("sample %d: %q at line %d, spectrum %v", k, n.Name, n.Line, n.Spectrum.Grid())
		}
		xyz, err := n.XYZ()
		if err != nil {
			t.Fatal(err)
		}
		lab, err := n.Lab()
		if err != nil {
			t.Fatal(err)
		}
		fromXYZ, err := xyz.Lab(white)
		if err != nil {
			t.Fatal(err)
		}
		for i, p := range [][2]float64{{fromXYZ.L, lab.L}, {fromXYZ.A, lab.A}, {fromXYZ.B, lab.B}} {
			if !scalar.EqualWithinAbs(p[0], p[1], 0.01) {
				t.Errorf("%s: Lab component %d from XYZ %v is %.4f, the file has %.2f", n.Name, i, xyz, p[0], p[1])
			}
		}
		if c, err := n.Number("CMYK_C"); err != nil || c != []float64{0, 100, 0, 0, 0, 40}[k] {
			t.Errorf("%s: CMYK_C = %v, %v", n.Name, c, err)
		}
		if h, ok := r.Header(); !ok || h.Format[5] != "XYZ_X" {
			t.Errorf("Header() = %+v, %v", h, ok)
		}
	}
	_, err = specio.ReadFile(path)
	checkParseError(t, "Reader", err, path, 13, 0, "", specio.ErrNoSpectrum)
}

// checkParseError checks that err is a one-line *ParseError at the given
// place that wraps sentinel.
func checkParseError(t *testing.T, label string, err error, file string, line, col int, field string, sentinel error) {
	t.Helper()
	var pe *specio.ParseError
	if !errors.As(err, &pe) {
		t.Errorf("%s: error %v (%T), want a *ParseError", label, err, err)
		return
	}
	if pe.File != file || pe.Line != line || pe.Column != col || pe.Field != field || !errors.Is(err, sentinel) {
		t.Errorf("%s: error %q at %s:%d:%d field %q; want %s:%d:%d field %q wrapping %q",
			label, err, pe.File, pe.Line, pe.Column, pe.Field, file, line, col, field, sentinel)
	}
	if msg := err.Error(); strings.ContainsAny(msg, "\r\n") || !strings.HasPrefix(msg, file+":") {
		t.Errorf("%s: message %q is not one line starting with the file name", label, msg)
	}
}

// TestCGATSErrors checks that data problems are errors naming the file,
// line, column (1-based field of the data format, 0 for a whole line) and
// field, wrapping the right sentinel, both from the CGATS reader and from
// a Reader that detected CGATS by content. The expected places are read
// off the inputs (common practice (no source)).
func TestCGATSErrors(t *testing.T) {
	t.Parallel()
	const (
		format3 = "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID SPECTRAL_NM400 SPECTRAL_NM450 SPECTRAL_NM500\nEND_DATA_FORMAT\n"
	)
	for _, c := range []struct {
		name, file, text string
		line, col        int
		field            string
		err              error
	}{
		{name: "bad number", file: "cgats_bad_number.txt", line: 10, col: 3, field: "SPECTRAL_NM450", err: specio.ErrNotNumber},
		{name: "short data line", file: "cgats_bad_field_count.txt", line: 9, col: 5, field: "SPECTRAL_NM550", err: specio.ErrFieldCount},
		{name: "NUMBER_OF_FIELDS disagrees", file: "cgats_bad_number_of_fields.txt", line: 2, col: 2, field: "NUMBER_OF_FIELDS", err: specio.ErrFieldCount},
		{name: "missing END_DATA", file: "cgats_bad_no_end_data.txt", line: 7, field: "END_DATA", err: specio.ErrStructure},
		{name: "duplicate field", file: "cgats_bad_duplicate_field.txt", line: 3, col: 3, field: "SAMPLE_ID", err: specio.ErrHeader},
		{name: "NaN", file: "cgats_bad_nan.txt", line: 6, col: 3, field: "nm450", err: colorimetry.ErrNotFinite},
		{name: "duplicate wavelength", file: "cgats_bad_duplicate_wavelength.txt", line: 3, col: 4, field: "SPECTRAL_NM_400", err: colorimetry.ErrDuplicate},
		{name: "data before format", file: "cgats_bad_structure.txt", line: 3, field: "BEGIN_DATA", err: specio.ErrStructure},
		{name: "NUMBER_OF_SETS disagrees", file: "cgats_bad_number_of_sets.txt", line: 9, field: "NUMBER_OF_SETS", err: specio.ErrSetCount},
		{name: "long data line", text: format3 + "BEGIN_DATA\n1 0.1 0.2 0.3 0.4\nEND_DATA\n", line: 6, col: 5, err: specio.ErrFieldCount},
		{name: "infinity", text: format3 + "BEGIN_DATA\n1 0.1 +Inf 0.3\nEND_DATA\n", line: 6, col: 3, field: "SPECTRAL_NM450", err: colorimetry.ErrNotFinite},
		{name: "beyond float64", text: format3 + "BEGIN_DATA\n1 0.1 1e999 0.3\nEND_DATA\n", line: 6, col: 3, field: "SPECTRAL_NM450", err: colorimetry.ErrNotFinite},
		{name: "unclosed quote", text: format3 + "BEGIN_DATA\n\"1 0.1 0.2 0.3\nEND_DATA\n", line: 6, col: 1, field: "SAMPLE_ID", err: specio.ErrQuote},
		{name: "XYZ not a number", text: "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID XYZ_X XYZ_Y XYZ_Z nm400 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\n1 abc 2 3 0.1 0.2 0.3\nEND_DATA\n", line: 6, col: 2, field: "XYZ_X", err: specio.ErrNotNumber},
		{name: "empty file", text: "", line: 1, err: specio.ErrNoData},
		{name: "identifier only", text: "CGATS.17\n# nothing else\n", line: 2, err: specio.ErrNoData},
		{name: "no samples", text: format3 + "BEGIN_DATA\nEND_DATA\n", line: 6, err: specio.ErrNoData},
		{name: "keywords without format", text: "CGATS.17\nORIGINATOR \"x\"\nDESCRIPTOR \"y\"\n", line: 2, field: "BEGIN_DATA_FORMAT", err: specio.ErrStructure},
		{name: "END_DATA_FORMAT missing", text: "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm400 nm450 nm500\nBEGIN_DATA\n", line: 4, col: 5, field: "BEGIN_DATA", err: specio.ErrStructure},
		{name: "format never closed", text: "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm400 nm450 nm500\n", line: 3, field: "END_DATA_FORMAT", err: specio.ErrStructure},
		{name: "no BEGIN_DATA", text: "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm400 nm450 nm500\nEND_DATA_FORMAT\n", line: 4, field: "BEGIN_DATA", err: specio.ErrStructure},
		{name: "END_DATA alone", text: "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm400 nm450 nm500\nEND_DATA_FORMAT\nEND_DATA\n", line: 5, field: "END_DATA", err: specio.ErrStructure},
		{name: "second format", text: format3 + "BEGIN_DATA_FORMAT\n", line: 5, field: "BEGIN_DATA_FORMAT", err: specio.ErrStructure},
		{name: "NUMBER_OF_FIELDS twice", text: "CGATS.17\nNUMBER_OF_FIELDS 4\nNUMBER_OF_FIELDS 4\n", line: 3, field: "NUMBER_OF_FIELDS", err: specio.ErrStructure},
		{name: "NUMBER_OF_SETS not a count", text: "CGATS.17\nNUMBER_OF_SETS \"two\"\n", line: 2, col: 2, field: "NUMBER_OF_SETS", err: specio.ErrNotNumber},
		{name: "header line of a number", text: "CGATS.17\n12 \"x\"\n" + format3[9:], line: 2, col: 1, err: specio.ErrStructure},
		{name: "text after END_DATA", text: format3 + "BEGIN_DATA\n1 0.1 0.2 0.3\nEND_DATA 7\n", line: 7, field: "END_DATA", err: specio.ErrStructure},
		{name: "two spectral fields", text: "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm400 nm450\nEND_DATA_FORMAT\nBEGIN_DATA\n", line: 3, col: 2, field: "nm400", err: colorimetry.ErrTooFew},
		{name: "zero wavelength", text: "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm0 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\n", line: 3, col: 2, field: "nm0", err: specio.ErrWavelength},
		{name: "empty format", text: "CGATS.17\nBEGIN_DATA_FORMAT\nEND_DATA_FORMAT\nBEGIN_DATA\n", line: 2, field: "BEGIN_DATA_FORMAT", err: specio.ErrHeader},
		{name: "field name not a token", text: "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID \"two words\" nm400 nm450 nm500\nEND_DATA_FORMAT\n", line: 3, col: 2, field: "two words", err: specio.ErrHeader},
		{name: "colorimetric only", text: "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID XYZ_X XYZ_Y XYZ_Z\nEND_DATA_FORMAT\nBEGIN_DATA\n1 1 2 3\nEND_DATA\n", line: 2, err: specio.ErrNoSpectrum},
	} {
		text, file := c.text, "test.txt"
		if c.file != "" {
			b, err := os.ReadFile(filepath.Join("testdata", c.file))
			if err != nil {
				t.Fatal(err)
			}
			text, file = string(b), c.file
		}
		_, err := specio.NewReader(strings.NewReader(text), file).ReadAll()
		if c.name == "empty file" {
			// Not CGATS by content: the CSV reader reports it.
			if !errors.Is(err, specio.ErrNoData) {
				t.Errorf("%s: Reader: %v, want ErrNoData", c.name, err)
			}
		} else {
			checkParseError(t, c.name+": Reader", err, file, c.line, c.col, c.field, c.err)
		}
		cr := specio.NewCGATSReader(strings.NewReader(text), file)
		cr.NeedSpectra = true
		for {
			if _, err = cr.Next(); err != nil {
				break
			}
		}
		checkParseError(t, c.name+": CGATSReader", err, file, c.line, c.col, c.field, c.err)
	}
}

// TestCGATSGoesOn checks which errors end the reading: a bad data line is
// reported and the next call reads on; a NUMBER_OF_SETS that disagrees
// is reported at END_DATA and the next set is read; a structural problem
// is returned again by every later call (as documented on Next; common
// practice (no source), like encoding/csv's per-record errors).
func TestCGATSGoesOn(t *testing.T) {
	t.Parallel()
	const text = "CGATS.17\n" +
		"NUMBER_OF_SETS 3\nBEGIN_DATA_FORMAT\nSAMPLE_NAME nm400 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\n" +
		"a 1 2 3\nb 1 x 3\nc 1 2\nd 4 5 6\nEND_DATA\n" + // lines 7–11: NUMBER_OF_SETS says 3, there are 4
		"BEGIN_DATA_FORMAT\nSAMPLE_NAME nm400 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\ne 7 8 9\n" // no END_DATA
	r := specio.NewReader(strings.NewReader(text), "t.txt")
	var got []string
	for range 20 {
		n, err := r.Next()
		if err == io.EOF {
			t.Fatal("io.EOF after a structural error")
		}
		if err != nil {
			var pe *specio.ParseError
			errors.As(err, &pe)
			got = append(got, fmt.Sprintf("error %d %v", pe.Line, errors.Is(err, specio.ErrStructure)))
			if errors.Is(err, specio.ErrStructure) {
				if _, again := r.Next(); again != err {
					t.Errorf("structural error not repeated: %v then %v", err, again)
				}
				break
			}
			continue
		}
		got = append(got, fmt.Sprintf("%s %d %s", n.Name, n.Line, n.Fields[specio.CGATSSetKey]))
	}
	want := []string{"a 7 1", "error 8 false", "error 9 false", "d 10 1", "error 11 false", "e 16 2", "error 16 true"}
	if !slices.Equal(got, want) {
		t.Errorf("got  %q\nwant %q", got, want)
	}
}

// TestCGATSTolerance reads one spectrum written in the ways instruments
// and editors write CGATS; every variant must give the same values on the
// same grid (common practice (no source)).
func TestCGATSTolerance(t *testing.T) {
	t.Parallel()
	want := []float64{0.25, 0.5, 0.75}
	for _, c := range []struct{ name, text string }{
		{"tabs, LF", "CGATS.17\nNUMBER_OF_FIELDS\t4\nBEGIN_DATA_FORMAT\nSAMPLE_NAME\tSPECTRAL_NM400\tSPECTRAL_NM450\tSPECTRAL_NM500\nEND_DATA_FORMAT\nNUMBER_OF_SETS\t1\nBEGIN_DATA\nchip\t0.25\t0.5\t0.75\nEND_DATA\n"},
		{"spaces, CRLF", "CGATS.17\r\nBEGIN_DATA_FORMAT\r\nSAMPLE_NAME   SPECTRAL_NM_400  SPECTRAL_NM_450  SPECTRAL_NM_500\r\nEND_DATA_FORMAT\r\nBEGIN_DATA\r\n  chip   0.25   0.5   0.75  \r\nEND_DATA\r\n"},
		{"lower case nm, descending", "CGATS.17\nBEGIN_DATA_FORMAT\nnm500 nm450 nm400 SAMPLE_NAME\nEND_DATA_FORMAT\nBEGIN_DATA\n0.75 0.5 0.25 chip\nEND_DATA\n"},
		{"SPECTRAL_ and NM_", "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_NAME SPECTRAL_400 NM_450 spectral_nm500\nEND_DATA_FORMAT\nBEGIN_DATA\nchip 0.25 0.5 0.75\nEND_DATA\n"},
		{"decimal comma, quoted values", "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_NAME nm400 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\n\"chip\" 0,25 \"0,5\" 0.75\nEND_DATA\n"},
		{"comments, blank lines", "# exported\nCGATS.17 # identifier\n\n# header\nBEGIN_DATA_FORMAT # fields follow\nSAMPLE_NAME nm400 # first\nnm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\n# one sample\nchip 0.25 0.5 0.75 # last\n\nEND_DATA\n"},
		{"no identifier, lower-case structure", "ORIGINATOR \"bench\"\nbegin_data_format\nSAMPLE_NAME nm400 nm450 nm500\nend_data_format\nbegin_data\nchip 0.25 0.5 0.75\nend_data\n"},
		{"format on the BEGIN line", "CGATS.17\nBEGIN_DATA_FORMAT SAMPLE_NAME nm400 nm450 nm500 END_DATA_FORMAT\nBEGIN_DATA\nchip 0.25 0.5 0.75\nEND_DATA\n"},
		{"SampleID spelling", "CGATS.17\nBEGIN_DATA_FORMAT\nSampleID nm400 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\nchip 0.25 0.5 0.75\nEND_DATA\n"},
		{"byte order mark, trailing blanks", "\ufeffCGATS.17  \nBEGIN_DATA_FORMAT\t\nSAMPLE_NAME nm400 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\nchip 0.25 0.5 0.75\t\nEND_DATA  \n"},
	} {
		got, err := specio.NewReader(strings.NewReader(c.text), "t.txt").ReadAll()
		if err != nil || len(got) != 1 {
			t.Errorf("%s: %d spectra, %v", c.name, len(got), err)
			continue
		}
		n := got[0]
		if n.Name != "chip" || !n.Spectrum.Grid().Equal(colorimetry.Grid{Start: 400, Step: 50, N: 3}) || !slices.Equal(n.Spectrum.Values(nil), want) {
			t.Errorf("%s: %q on %v = %v", c.name, n.Name, n.Spectrum.Grid(), n.Spectrum.Values(nil))
		}
	}
	// A quoted END_DATA in the first column is a sample name, not the end.
	got, err := specio.NewReader(strings.NewReader("CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_NAME nm400 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\n\"END_DATA\" 1 2 3\nEND_DATA\n"), "t.txt").ReadAll()
	if err != nil || len(got) != 1 || got[0].Name != "END_DATA" {
		t.Errorf("quoted END_DATA: %v, %v", got, err)
	}
}

// TestCGATSByContent checks that Reader and ReadFile tell CGATS from CSV
// by content, not by file name (DESIGN.md: every command reads CSV or
// CGATS by content).
func TestCGATSByContent(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	cgats, err := os.ReadFile(filepath.Join("testdata", "cgats_export_tabs.txt"))
	if err != nil {
		t.Fatal(err)
	}
	csv, err := os.ReadFile(filepath.Join("testdata", "lamps_columns.csv"))
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		file  string
		data  []byte
		n     int
		first string
	}{
		{"measurements.csv", cgats, 4, "harbour teal"}, // CGATS under a CSV name
		{"lamps.txt", csv, 3, "warm wash"},             // CSV under a text name
		// A CSV header whose first cell starts with CGATS is still CSV.
		{"cgats-like.csv", []byte("CGATS chip,400,450,500\nx,1,2,3\n"), 1, "x"},
	} {
		path := filepath.Join(dir, c.file)
		if err := os.WriteFile(path, c.data, 0o644); err != nil {
			t.Fatal(err)
		}
		got, err := specio.ReadFile(path)
		if err != nil || len(got) != c.n || got[0].Name != c.first {
			t.Errorf("%s: %d spectra, %v", c.file, len(got), err)
		}
	}
	// A layout set by the caller is a CSV layout: no CGATS detection.
	r := specio.NewReader(bytes.NewReader(cgats), "forced.csv")
	r.Layout = specio.LayoutRows
	if got, err := r.ReadAll(); err == nil {
		t.Errorf("LayoutRows on CGATS text read %d spectra without error", len(got))
	}
}

// spectralName matches the spectral field names the reader accepts
// (NewCGATSReader's documentation).
var spectralName = regexp.MustCompile(`(?i)^(spectral_(nm)?|nm)_?([0-9]+\.?[0-9]*|\.[0-9]+)$`)

// cgatsNormal returns a set's format with its spectral fields replaced by
// one "<spectral>" marker at the place of the first, for comparing
// formats across a round trip that respells them.
func cgatsNormal(format []string) []string {
	var out []string
	marked := false
	for _, f := range format {
		if spectralName.MatchString(f) {
			if !marked {
				out = append(out, "<spectral>")
				marked = true
			}
			continue
		}
		out = append(out, f)
	}
	return out
}

// compareSets reports how b, read back after writing a, differs from it.
// Identifiers compare with "" standing for the default, formats after
// cgatsNormal; samples by name, fields, grid (Grid.Equal) and values
// (exactly: WriteCGATS writes the shortest form that reads back to the
// same float64, per strconv.FormatFloat's documentation).
func compareSets(a, b []specio.CGATSSet) error {
	if len(a) != len(b) {
		return fmt.Errorf("%d sets read back as %d", len(a), len(b))
	}
	for k := range a {
		x, y := a[k], b[k]
		id := x.Identifier
		if id == "" {
			id = specio.DefaultCGATSIdentifier
		}
		if k == 0 && y.Identifier != id {
			return fmt.Errorf("identifier %q read back as %q", x.Identifier, y.Identifier)
		}
		if !slices.Equal(x.Keywords, y.Keywords) {
			return fmt.Errorf("set %d keywords %q read back as %q", k+1, x.Keywords, y.Keywords)
		}
		if !slices.Equal(cgatsNormal(x.Format), cgatsNormal(y.Format)) {
			return fmt.Errorf("set %d format %q read back as %q", k+1, x.Format, y.Format)
		}
		if len(x.Samples) != len(y.Samples) {
			return fmt.Errorf("set %d: %d samples read back as %d", k+1, len(x.Samples), len(y.Samples))
		}
		for i, s := range x.Samples {
			u := y.Samples[i]
			if s.Name != u.Name || !maps.Equal(s.Fields, u.Fields) {
				return fmt.Errorf("set %d sample %d: %q %q read back as %q %q", k+1, i+1, s.Name, s.Fields, u.Name, u.Fields)
			}
			if s.Spectrum.IsZero() != u.Spectrum.IsZero() {
				return fmt.Errorf("set %d sample %d: spectrum lost or gained", k+1, i+1)
			}
			if s.Spectrum.IsZero() {
				continue
			}
			if !s.Spectrum.Grid().Equal(u.Spectrum.Grid()) || !slices.Equal(s.Spectrum.Values(nil), u.Spectrum.Values(nil)) {
				return fmt.Errorf("set %d sample %q: %v %v read back as %v %v", k+1, s.Name,
					s.Spectrum.Grid(), s.Spectrum.Values(nil), u.Spectrum.Grid(), u.Spectrum.Values(nil))
			}
		}
	}
	return nil
}

// TestCGATSRoundTrip reads each good file, writes it and reads it back:
// identifier, keywords, data-format order, names, other fields and spectra
// must survive; writing what was read back gives the same text again
// (common practice (no source): read → write → read is the identity).
func TestCGATSRoundTrip(t *testing.T) {
	t.Parallel()
	for _, file := range cgatsGood {
		sets, err := specio.ReadCGATSFile(filepath.Join("testdata", file))
		if err != nil {
			t.Fatalf("%s: %v", file, err)
		}
		var once bytes.Buffer
		if err := specio.WriteCGATS(&once, sets...); err != nil {
			t.Fatalf("%s: %v", file, err)
		}
		back, err := specio.ReadCGATS(bytes.NewReader(once.Bytes()), "back.txt")
		if err != nil {
			t.Fatalf("%s: reading back: %v\n%s", file, err, once.String())
		}
		if err := compareSets(sets, back); err != nil {
			t.Errorf("%s: %v", file, err)
		}
		var twice bytes.Buffer
		if err := specio.WriteCGATS(&twice, back...); err != nil {
			t.Fatal(err)
		}
		if once.String() != twice.String() {
			t.Errorf("%s: second write differs:\n%s\n---\n%s", file, once.String(), twice.String())
		}
	}
}

// TestWriteCGATS checks the written text of a small set against the
// CGATS.17 layout (from memory): identifier, keywords with private ones
// declared by KEYWORD, NUMBER_OF_FIELDS, the format with spectral fields
// spelt SPECTRAL_NM followed by the wavelength (the CGATS.17 spelling,
// from memory), NUMBER_OF_SETS, the data.
func TestWriteCGATS(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid{Start: 400, Step: 50, N: 3}
	mk := func(v ...float64) colorimetry.Spectrum {
		s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	samples := []specio.Named{
		{Name: "harbour teal", Spectrum: mk(0.2, 0.5, 0.125), Fields: map[string]string{"drive": "0.85"}},
		{Name: `soot "deep"`, Spectrum: mk(0.03, 0.031, 1.0/3), Fields: map[string]string{"drive": "1"}},
	}
	set := specio.NewCGATSSet(samples, "Kettle Row bench", time.Date(2025, 3, 14, 0, 0, 0, 0, time.UTC),
		specio.Keyword{Name: "DESCRIPTOR", Value: "ink drawdowns"}, specio.Keyword{Name: "BENCH_SHIFT", Value: "2"})
	var b bytes.Buffer
	if err := specio.WriteCGATS(&b, set); err != nil {
		t.Fatal(err)
	}
	want := "CGATS.17\n" +
		"ORIGINATOR\t\"Kettle Row bench\"\n" +
		"CREATED\t\"2025-03-14\"\n" +
		"DESCRIPTOR\t\"ink drawdowns\"\n" +
		"KEYWORD\t\"BENCH_SHIFT\"\n" +
		"BENCH_SHIFT\t2\n" +
		"NUMBER_OF_FIELDS\t6\n" +
		"BEGIN_DATA_FORMAT\n" +
		"SAMPLE_ID\tSAMPLE_NAME\tdrive\tSPECTRAL_NM400\tSPECTRAL_NM450\tSPECTRAL_NM500\n" +
		"END_DATA_FORMAT\n" +
		"NUMBER_OF_SETS\t2\n" +
		"BEGIN_DATA\n" +
		"1\t\"harbour teal\"\t0.85\t0.2\t0.5\t0.125\n" +
		"2\t\"soot \"\"deep\"\"\"\t1\t0.03\t0.031\t0.3333333333333333\n" +
		"END_DATA\n"
	if b.String() != want {
		t.Errorf("wrote\n%s\nwant\n%s", b.String(), want)
	}
	// CREATED with a time of day keeps it, with its offset (ISO 8601).
	at := specio.NewCGATSSet(nil, "", time.Date(2025, 3, 14, 9, 30, 0, 0, time.FixedZone("", 3600)))
	if v, _ := at.Value("CREATED"); v != "2025-03-14T09:30:00+01:00" {
		t.Errorf("CREATED = %q", v)
	}
	// Spectra read from CSV convert to CGATS and back (common practice (no
	// source)): same names, values and extra fields.
	csv, err := specio.ReadFile(filepath.Join("testdata", "inks_rows_semicolon.csv"))
	if err != nil {
		t.Fatal(err)
	}
	b.Reset()
	if err := specio.WriteCGATS(&b, specio.NewCGATSSet(csv, "antipode", time.Time{})); err != nil {
		t.Fatal(err)
	}
	back, err := specio.NewReader(&b, "inks.txt").ReadAll()
	if err != nil || len(back) != len(csv) {
		t.Fatalf("CSV → CGATS → %d spectra, %v", len(back), err)
	}
	for i, n := range csv {
		m := back[i]
		if m.Name != n.Name || m.Fields["drive"] != n.Fields["drive"] || m.Fields["id"] != n.Fields["id"] ||
			!slices.Equal(m.Spectrum.Values(nil), n.Spectrum.Values(nil)) || !m.Spectrum.Grid().Equal(n.Spectrum.Grid()) {
			t.Errorf("%q %v %v came back as %q %v %v", n.Name, n.Fields, n.Spectrum.Values(nil), m.Name, m.Fields, m.Spectrum.Values(nil))
		}
	}
}

// TestWriteCGATSErrors checks that WriteCGATS refuses what would not read
// back unchanged, with the right sentinel, and writes nothing then
// (common practice (no source)).
func TestWriteCGATSErrors(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid{Start: 400, Step: 50, N: 3}
	s1, _ := colorimetry.NewSpectrumOnGrid(g, []float64{1, 2, 3}, colorimetry.Options{})
	s2, _ := colorimetry.NewSpectrumOnGrid(colorimetry.Grid{Start: 400, Step: 10, N: 3}, []float64{1, 2, 3}, colorimetry.Options{})
	ok := specio.Named{Name: "a", Spectrum: s1}
	set := func(kw []specio.Keyword, format []string, samples ...specio.Named) specio.CGATSSet {
		return specio.CGATSSet{CGATSHeader: specio.CGATSHeader{Keywords: kw, Format: format}, Samples: samples}
	}
	for _, c := range []struct {
		name string
		sets []specio.CGATSSet
		err  error
	}{
		{"no set", nil, specio.ErrNoData},
		{"some without spectrum", []specio.CGATSSet{set(nil, nil, ok, specio.Named{Name: "b"})}, specio.ErrGrid},
		{"two grids", []specio.CGATSSet{set(nil, nil, ok, specio.Named{Name: "b", Spectrum: s2})}, specio.ErrGrid},
		{"spectral format, no spectra", []specio.CGATSSet{set(nil, []string{"SAMPLE_ID", "nm400"}, specio.Named{Name: "b"})}, specio.ErrGrid},
		{"missing field", []specio.CGATSSet{set(nil, []string{"SAMPLE_NAME", "LAB_L"}, ok)}, specio.ErrNoField},
		{"keyword with a space", []specio.CGATSSet{set([]specio.Keyword{{Name: "MY KEY", Value: "x"}}, nil, ok)}, specio.ErrUnwritable},
		{"structural keyword", []specio.CGATSSet{set([]specio.Keyword{{Name: "NUMBER_OF_SETS", Value: "3"}}, nil, ok)}, specio.ErrUnwritable},
		{"line break in a value", []specio.CGATSSet{set([]specio.Keyword{{Name: "DESCRIPTOR", Value: "a\nb"}}, nil, ok)}, specio.ErrUnwritable},
		{"line break in a name", []specio.CGATSSet{set(nil, nil, specio.Named{Name: "a\r\nb", Spectrum: s1})}, specio.ErrUnwritable},
		// The reader takes a NUL byte for UTF-16 text, so the writer
		// writes none: common practice (no source).
		{"NUL in a name", []specio.CGATSSet{set(nil, nil, specio.Named{Name: "a\x00b", Spectrum: s1})}, specio.ErrUnwritable},
		{"NUL in a value", []specio.CGATSSet{set([]specio.Keyword{{Name: "DESCRIPTOR", Value: "a\x00b"}}, nil, ok)}, specio.ErrUnwritable},
		{"XYZ not a number", []specio.CGATSSet{set(nil, []string{"XYZ_X"}, specio.Named{Name: "a", Fields: map[string]string{"XYZ_X": "high"}})}, specio.ErrUnwritable},
		{"field twice", []specio.CGATSSet{set(nil, []string{"SAMPLE_NAME", "SAMPLE_NAME"}, ok)}, specio.ErrUnwritable},
		{"field name with a space", []specio.CGATSSet{set(nil, nil, specio.Named{Name: "a", Spectrum: s1, Fields: map[string]string{"coverage %": "5"}})}, specio.ErrUnwritable},
		{"identifier is a keyword", []specio.CGATSSet{{CGATSHeader: specio.CGATSHeader{Identifier: "ORIGINATOR x"}, Samples: []specio.Named{ok}}}, specio.ErrUnwritable},
		{"identifier is a comment", []specio.CGATSSet{{CGATSHeader: specio.CGATSHeader{Identifier: "# x"}, Samples: []specio.Named{ok}}}, specio.ErrUnwritable},
	} {
		var b bytes.Buffer
		err := specio.WriteCGATS(&b, c.sets...)
		if !errors.Is(err, c.err) {
			t.Errorf("%s: %v, want %v", c.name, err, c.err)
		}
		if b.Len() != 0 {
			t.Errorf("%s: wrote %d bytes despite the error", c.name, b.Len())
		}
	}
}

// TestNamedXYZErrors checks that XYZ and Lab name the file, line and
// field of a missing or bad value (common practice (no source)).
func TestNamedXYZErrors(t *testing.T) {
	t.Parallel()
	const text = "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID XYZ_X XYZ_Y LAB_L LAB_A LAB_B\nEND_DATA_FORMAT\nBEGIN_DATA\n1 1 2 50 \"\" 3\nEND_DATA\n"
	sets, err := specio.ReadCGATS(strings.NewReader(text), "xyz.txt")
	if err == nil {
		t.Fatalf("an empty LAB_A value was accepted: %+v", sets)
	}
	checkParseError(t, "empty LAB_A", err, "xyz.txt", 6, 5, "LAB_A", specio.ErrEmpty)
	sets, err = specio.ReadCGATS(strings.NewReader(strings.Replace(text, `""`, "4", 1)), "xyz.txt")
	if err != nil {
		t.Fatal(err)
	}
	n := sets[0].Samples[0]
	_, err = n.XYZ()
	checkParseError(t, "missing XYZ_Z", err, "xyz.txt", 6, 0, "XYZ_Z", specio.ErrNoField)
	lab, err := n.Lab()
	if err != nil || lab != (colorimetry.Lab{L: 50, A: 4, B: 3}) {
		t.Errorf("Lab() = %v, %v", lab, err)
	}
	if set, err := n.Number(specio.CGATSSetKey); err != nil || set != 1 {
		t.Errorf("set index %v, %v", set, err)
	}
}

// cgatsSource generates a CGATS file of n samples × 31 bands (400–700 nm
// at 10 nm) as it is read, without holding it in memory.
type cgatsSource struct {
	n, i  int
	buf   []byte
	off   int
	rnd   *rand.Rand
	bytes int64
}

func (s *cgatsSource) Read(p []byte) (int, error) {
	for s.off == len(s.buf) {
		s.buf, s.off = s.buf[:0], 0
		switch {
		case s.i == 0:
			s.buf = append(s.buf, "CGATS.17\nORIGINATOR \"generator\"\nBEGIN_DATA_FORMAT\nSAMPLE_ID SAMPLE_NAME"...)
			for nm := 400; nm <= 700; nm += 10 {
				s.buf = append(s.buf, " SPECTRAL_NM"...)
				s.buf = strconv.AppendInt(s.buf, int64(nm), 10)
			}
			s.buf = append(s.buf, "\nEND_DATA_FORMAT\nBEGIN_DATA\n"...)
		case s.i <= s.n:
			s.buf = strconv.AppendInt(s.buf, int64(s.i), 10)
			s.buf = append(s.buf, " \"chip "...)
			s.buf = strconv.AppendInt(s.buf, int64(s.i), 10)
			s.buf = append(s.buf, '"')
			for range 31 {
				s.buf = append(s.buf, ' ')
				s.buf = strconv.AppendFloat(s.buf, s.rnd.Float64(), 'f', 4, 64)
			}
			s.buf = append(s.buf, '\n')
		case s.i == s.n+1:
			s.buf = append(s.buf, "END_DATA\n"...)
		default:
			return 0, io.EOF
		}
		s.i++
	}
	k := copy(p, s.buf[s.off:])
	s.off += k
	s.bytes += int64(k)
	return k, nil
}

// TestCGATSConstantMemory streams 200 000 samples (about 45 MB) from a
// generator and checks that the live heap stays within 8 MiB of where it
// started: the reader keeps nothing per sample (common practice (no
// source) for streaming readers; the bound is generous against the GC's
// own bookkeeping). It does not call t.Parallel: heap figures taken while
// other tests run would measure them too. Top-level sequential tests run
// before the parallel ones are released (testing package documentation).
func TestCGATSConstantMemory(t *testing.T) {
	n := 200000
	if testing.Short() {
		n = 20000
	}
	src := &cgatsSource{n: n, rnd: rand.New(rand.NewPCG(1, 1))}
	r := specio.NewReader(src, "generated.txt")
	var ms runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&ms)
	base := ms.HeapAlloc
	var peak uint64
	k := 0
	for {
		s, err := r.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		k++
		if k%20000 == 0 {
			runtime.GC()
			runtime.ReadMemStats(&ms)
			peak = max(peak, ms.HeapAlloc)
			if s.Spectrum.Len() != 31 {
				t.Fatalf("sample %d has %d values", k, s.Spectrum.Len())
			}
		}
	}
	if k != n {
		t.Fatalf("read %d samples, want %d", k, n)
	}
	const bound = 8 << 20
	if peak > base+bound {
		t.Errorf("heap grew from %d to %d bytes while streaming %d bytes", base, peak, src.bytes)
	}
	t.Logf("streamed %d samples, %.1f MB; heap %d → peak %d bytes", n, float64(src.bytes)/1e6, base, peak)
}

// cgatsFile returns a synthetic CGATS file of n samples on the 380–780 nm,
// 5 nm grid (81 bands), with values like reflectances.
func cgatsFile(n int) []byte {
	src := &cgatsSource{n: n, rnd: rand.New(rand.NewPCG(1, 1))}
	var b bytes.Buffer
	b.WriteString("CGATS.17\nORIGINATOR \"benchmark\"\nNUMBER_OF_FIELDS 83\nBEGIN_DATA_FORMAT\nSAMPLE_ID\tSAMPLE_NAME")
	for nm := 380; nm <= 780; nm += 5 {
		b.WriteString("\tSPECTRAL_NM")
		b.WriteString(strconv.Itoa(nm))
	}
	b.WriteString("\nEND_DATA_FORMAT\nNUMBER_OF_SETS ")
	b.WriteString(strconv.Itoa(n))
	b.WriteString("\nBEGIN_DATA\n")
	buf := make([]byte, 0, 32)
	for i := range n {
		b.WriteString(strconv.Itoa(i + 1))
		b.WriteString("\t\"chip ")
		b.WriteString(strconv.Itoa(i + 1))
		b.WriteByte('"')
		for range 81 {
			b.WriteByte('\t')
			b.Write(strconv.AppendFloat(buf[:0], src.rnd.Float64(), 'f', 4, 64))
		}
		b.WriteByte('\n')
	}
	b.WriteString("END_DATA\n")
	return b.Bytes()
}

// BenchmarkReadCGATS streams 10 000 samples × 81 bands of CGATS text
// through a Reader (content detection included) and reports MB/s.
func BenchmarkReadCGATS(b *testing.B) { benchmarkRead(b, cgatsFile(10000), 10000) }

// BenchmarkWriteCGATS writes 10 000 samples × 81 bands and reports MB/s of
// output.
func BenchmarkWriteCGATS(b *testing.B) {
	sets, err := specio.ReadCGATS(bytes.NewReader(cgatsFile(10000)), "bench.txt")
	if err != nil {
		b.Fatal(err)
	}
	var out bytes.Buffer
	if err := specio.WriteCGATS(&out, sets...); err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(out.Len()))
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		out.Reset()
		if err := specio.WriteCGATS(&out, sets...); err != nil {
			b.Fatal(err)
		}
	}
}

// TestCGATSIrregular checks that irregular spectral fields are resampled
// with the reader's Options, by a Reader and by a CGATSReader alike:
// linear interpolation of 1, 2 and 3.5 at 400, 410 and 425 nm gives 1.5,
// 2.5 and 3 at 405, 415 and 420 nm (plain arithmetic, common practice (no
// source)).
func TestCGATSIrregular(t *testing.T) {
	t.Parallel()
	const text = "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_NAME nm425 nm400 nm410\nEND_DATA_FORMAT\nBEGIN_DATA\nx 3.5 1 2\nEND_DATA\n"
	opt := colorimetry.Options{Interp: colorimetry.InterpLinear, Step: 5}
	want := []float64{1, 1.5, 2, 2.5, 3, 3.5}
	r := specio.NewReader(strings.NewReader(text), "t.txt")
	r.Options = opt
	a, errA := r.Next()
	cr := specio.NewCGATSReader(strings.NewReader(text), "t.txt")
	cr.Options = opt
	b, errB := cr.Next()
	for _, c := range []struct {
		label string
		n     specio.Named
		err   error
	}{{"Reader", a, errA}, {"CGATSReader", b, errB}} {
		if c.err != nil {
			t.Fatalf("%s: %v", c.label, c.err)
		}
		g := c.n.Spectrum.Grid()
		if !g.Equal(colorimetry.Grid{Start: 400, Step: 5, N: 6}) {
			t.Errorf("%s: grid %v", c.label, g)
			continue
		}
		for i, v := range want {
			// Linear interpolation in float64: within 1e-12 (common
			// practice (no source)).
			if got := c.n.Spectrum.Value(i); !scalar.EqualWithinAbsOrRel(got, v, 1e-12, 1e-12) {
				t.Errorf("%s: %g nm = %v, want %v", c.label, g.Wavelength(i), got, v)
			}
		}
	}
}
