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

// FuzzReadCSV feeds arbitrary bytes to the reader under every layout and
// separator setting. It asserts that nothing panics, that every error is a
// one-line *ParseError with a place, that a spectrum read without error
// has at least 3 finite samples on a valid grid, and that spectra sharing
// a grid survive a round trip through WriteColumns unchanged.
func FuzzReadCSV(f *testing.F) {
	files, err := filepath.Glob(filepath.Join("testdata", "*.*sv"))
	if err != nil {
		f.Fatal(err)
	}
	for _, name := range files {
		b, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b, uint8(0), uint8(0))
	}
	for _, s := range []string{
		"nm,a\n400,1\n410,2\n420,3\n",
		"name,400,410,420,drive\nx,1,2,3,0.5\n",
		"nm;a\r\n400;0,5\r\n410;1\r\n420;1,5\r\n",
		"\ufeffnm\t\"q\"\"x\"\n400\t1\n410\t2\n420\t3\n",
		"nm,1,2,3\n400,1,2,3\n",
		"nm,400,410,420\nlamp,1,2,3\n",
		"name,400,401,1e300\nx,1,1e308,-1e308\n",
		"name,400.5,410,425,440\nx,1e308,-1e308,1e308,-1e308\n",
		"nm,a\n400,1\n400,2\n",
		"nm,\"a\n",
		",,,\n#\n",
		"",
	} {
		f.Add([]byte(s), uint8(0), uint8(0))
		f.Add([]byte(s), uint8(2), uint8(1))
	}
	f.Fuzz(func(t *testing.T, data []byte, layout, comma uint8) {
		r := specio.NewReader(bytes.NewReader(data), "fuzz.csv")
		r.Layout = specio.Layout(layout % 3)
		r.Comma = []rune{0, ',', ';', '\t'}[comma%4]
		// Irregular wavelengths are resampled onto up to MaxSamples points
		// per spectrum, so a short line can become a large spectrum; a
		// small limit keeps each run fast, through the same code paths.
		r.MaxSamples = 1 << 12
		var got []specio.Named
		var last error
		for range 10000 {
			n, err := r.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				var pe *specio.ParseError
				msg := err.Error()
				if !errors.As(err, &pe) || pe.File != "fuzz.csv" || pe.Line < 1 ||
					!strings.HasPrefix(msg, "fuzz.csv:") || strings.ContainsAny(msg, "\r\n") {
					t.Fatalf("error %T %q lacks a proper place", err, msg)
				}
				if err == last {
					break // sticky
				}
				last = err
				continue
			}
			s := n.Spectrum
			g := s.Grid()
			if s.Len() < 3 || !g.Valid() || g.N != s.Len() || n.Name == "" || n.Line < 1 || n.Column < 1 {
				t.Fatalf("spectrum %q at %d:%d on %+v with %d samples", n.Name, n.Line, n.Column, g, s.Len())
			}
			for i := range s.Len() {
				if v := s.Value(i); math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("spectrum %q sample %d = %v", n.Name, i, v)
				}
			}
			if len(got) < 100 {
				got = append(got, n)
			}
		}
		roundTrip(t, got)
	})
}

// roundTrip writes spectra that share a moderate grid and checks that
// they read back with the same names and values.
func roundTrip(t *testing.T, spectra []specio.Named) {
	if len(spectra) == 0 {
		return
	}
	g := spectra[0].Spectrum.Grid()
	if g.Start <= 0 || g.End() > 1e6 || g.Step < 1e-3 {
		return // extreme grids need not rebuild to within Grid.Equal's 1e-9 nm
	}
	var b bytes.Buffer
	err := specio.WriteColumns(&b, spectra)
	if errors.Is(err, specio.ErrGrid) || errors.Is(err, specio.ErrName) {
		return
	}
	if err != nil {
		t.Fatal(err)
	}
	back, err := specio.NewReader(&b, "back.csv").ReadAll()
	if err != nil || len(back) != len(spectra) {
		t.Fatalf("reading back %d spectra: %d, %v\n%s", len(spectra), len(back), err, b.String())
	}
	for j, n := range spectra {
		m := back[j]
		if m.Name != n.Name || !m.Spectrum.Grid().Equal(g) {
			t.Fatalf("spectrum %q on %v read back as %q on %v", n.Name, g, m.Name, m.Spectrum.Grid())
		}
		for i := range g.N {
			if a, c := n.Spectrum.Value(i), m.Spectrum.Value(i); a != c {
				t.Fatalf("%q sample %d: %v read back as %v", n.Name, i, a, c)
			}
		}
	}
}
