package specio_test

import (
	"bytes"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/colorimetry/specio"
)

// FuzzReadCGATS feeds arbitrary bytes to a Reader (which detects CGATS by
// content), to a CGATSReader and to ReadCGATS. It asserts the invariants
// of FuzzReadCSV: nothing panics; every error is a one-line *ParseError
// with a place; a sample read without error has a name, a place and either
// no spectrum (a colorimetric set, CGATSReader only) or one of at least 3
// finite samples on a valid grid. And what ReadCGATS returns survives a
// round trip through WriteCGATS unchanged, unless WriteCGATS refuses it
// with ErrUnwritable (a line break or tab where it cannot write one).
func FuzzReadCGATS(f *testing.F) {
	files, err := filepath.Glob(filepath.Join("testdata", "cgats_*.txt"))
	if err != nil {
		f.Fatal(err)
	}
	for _, name := range files {
		b, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	for _, s := range []string{
		"CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm400 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\n1 1 2 3\nEND_DATA\n",
		"CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_NAME XYZ_X XYZ_Y XYZ_Z LAB_L LAB_A LAB_B\nEND_DATA_FORMAT\nBEGIN_DATA\n\"a b\" 1 2 3 4 5 6\nEND_DATA\n",
		"X\nBEGIN_DATA_FORMAT\nnm400.5 nm410 nm425 nm440\nEND_DATA_FORMAT\nBEGIN_DATA\n1e308 -1e308 1e308 -1e308\nEND_DATA\n",
		"X\nK \"v\" # c\nBEGIN_DATA_FORMAT\nSAMPLE_ID nm1 nm2 nm3\nEND_DATA_FORMAT\nBEGIN_DATA\n1 1 2 3\nEND_DATA\nX\nBEGIN_DATA_FORMAT\nnm3 nm2 nm1\nEND_DATA_FORMAT\nNUMBER_OF_SETS 0\nBEGIN_DATA\nEND_DATA\n",
		"CGATS.17\r\nNUMBER_OF_FIELDS 2\r\nBEGIN_DATA_FORMAT\r\nnm400 nm450 nm500\r\n",
		"CGATS\nBEGIN_DATA_FORMAT\nSAMPLE_ID\tnm400\tnm400\tnm500\nEND_DATA_FORMAT\n",
		"CGATS.17\nBEGIN_DATA_FORMAT\nA nm400 nm450 nm500\nEND_DATA_FORMAT\nBEGIN_DATA\n\"x\"y\" 0,1 NaN 3\n\"unclosed\nEND_DATA\n",
		"CGATS.17\nDESCRIPTOR a \"b\" \t c\nBEGIN_DATA_FORMAT SAMPLE_ID nm400 nm450 nm500 END_DATA_FORMAT\nBEGIN_DATA\n\"END_DATA\" 1 2 3\nEND_DATA\n",
		"",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		// Irregular wavelengths are resampled onto up to MaxSamples points;
		// a small limit keeps each run fast, through the same code paths.
		r := specio.NewReader(bytes.NewReader(data), "fuzz.txt")
		r.MaxSamples = 1 << 12
		drain(t, r.Next, true)
		cr := specio.NewCGATSReader(bytes.NewReader(data), "fuzz.txt")
		cr.MaxSamples = 1 << 12
		drain(t, cr.Next, false)

		sets, err := specio.ReadCGATS(bytes.NewReader(data), "fuzz.txt")
		if err != nil {
			checkFuzzError(t, err)
			return
		}
		for _, s := range sets {
			for _, n := range s.Samples {
				if g := n.Spectrum.Grid(); !n.Spectrum.IsZero() && (g.Start <= 0 || g.End() > 1e6 || g.Step < 1e-3 || g.N > 1<<12) {
					return // extreme grids need not rebuild to within Grid.Equal's 1e-9 nm
				}
			}
		}
		var b bytes.Buffer
		if err := specio.WriteCGATS(&b, sets...); err != nil {
			if errors.Is(err, specio.ErrUnwritable) {
				return
			}
			t.Fatalf("writing what was read: %v", err)
		}
		back, err := specio.ReadCGATS(bytes.NewReader(b.Bytes()), "back.txt")
		if err != nil {
			t.Fatalf("reading back: %v\n%s", err, b.String())
		}
		if err := compareSets(sets, back); err != nil {
			t.Fatalf("%v\n%s", err, b.String())
		}
	})
}

// drain reads samples with next until io.EOF or a repeated (sticky)
// error, checking each sample and error.
func drain(t *testing.T, next func() (specio.Named, error), needSpectra bool) {
	var last error
	for range 10000 {
		n, err := next()
		if err == io.EOF {
			return
		}
		if err != nil {
			checkFuzzError(t, err)
			if err == last {
				return // sticky
			}
			last = err
			continue
		}
		if n.Name == "" || n.Line < 1 || n.Column < 1 {
			t.Fatalf("sample %q at %d:%d", n.Name, n.Line, n.Column)
		}
		s := n.Spectrum
		if s.IsZero() {
			if needSpectra {
				t.Fatalf("sample %q at line %d has no spectrum", n.Name, n.Line)
			}
			continue
		}
		g := s.Grid()
		if s.Len() < 3 || !g.Valid() || g.N != s.Len() {
			t.Fatalf("spectrum %q on %+v with %d samples", n.Name, g, s.Len())
		}
		for i := range s.Len() {
			if v := s.Value(i); math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("spectrum %q sample %d = %v", n.Name, i, v)
			}
		}
	}
}

// checkFuzzError fails unless err is a one-line *ParseError placed in
// fuzz.txt.
func checkFuzzError(t *testing.T, err error) {
	var pe *specio.ParseError
	msg := err.Error()
	if !errors.As(err, &pe) || pe.File != "fuzz.txt" || pe.Line < 1 ||
		!strings.HasPrefix(msg, "fuzz.txt:") || strings.ContainsAny(msg, "\r\n") {
		t.Fatalf("error %T %q lacks a proper place", err, msg)
	}
}
