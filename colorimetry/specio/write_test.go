package specio_test

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"pgregory.net/rapid"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
)

// onGrid returns a named spectrum on the regular grid start, step (nm).
func onGrid(t testing.TB, name string, start, step float64, values ...float64) specio.Named {
	t.Helper()
	g := colorimetry.Grid{Start: start, Step: step, N: len(values)}
	s, err := colorimetry.NewSpectrumOnGrid(g, values, colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return specio.Named{Name: name, Spectrum: s}
}

func TestWriteColumns(t *testing.T) {
	t.Parallel()
	// The expected text follows the format documented on WriteColumns,
	// with quoting after RFC 4180 §2 rules 6 and 7, and numbers in
	// strconv's shortest 'g' form (Go strconv documentation).
	for _, tc := range []struct {
		name    string
		spectra []specio.Named
		want    string
	}{
		{
			name: "plain",
			spectra: []specio.Named{
				onGrid(t, "ash lamp", 400, 10, 0.5, 0.25, 1e-7),
				onGrid(t, "reed lamp", 400, 10, 100, -0.125, 1e21),
			},
			want: "wavelength_nm,ash lamp,reed lamp\n400,0.5,100\n410,0.25,-0.125\n420,1e-07,1e+21\n",
		},
		{
			name: "quoted names",
			spectra: []specio.Named{
				onGrid(t, `teal "12", double`, 380.5, 0.5, 1, 2, 3),
				onGrid(t, " padded", 380.5, 0.5, 4, 5, 6),
				onGrid(t, "semi;colon", 380.5, 0.5, 7, 8, 9),
				onGrid(t, "", 380.5, 0.5, 0, 0, 0),
			},
			want: "wavelength_nm,\"teal \"\"12\"\", double\",\" padded\",\"semi;colon\",\"\"\n" +
				"380.5,1,4,7,0\n381,2,5,8,0\n381.5,3,6,9,0\n",
		},
	} {
		var b bytes.Buffer
		if err := specio.WriteColumns(&b, tc.spectra); err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		if b.String() != tc.want {
			t.Errorf("%s: wrote\n%s\nwant\n%s", tc.name, b.String(), tc.want)
		}
	}
}

func TestWriteColumnsErrors(t *testing.T) {
	t.Parallel()
	a := onGrid(t, "a", 400, 10, 1, 2, 3)
	for _, tc := range []struct {
		name     string
		spectra  []specio.Named
		sentinel error
	}{
		{name: "none", sentinel: specio.ErrGrid},
		{name: "empty spectrum", spectra: []specio.Named{a, {Name: "empty"}}, sentinel: specio.ErrGrid},
		{name: "other start", spectra: []specio.Named{a, onGrid(t, "b", 405, 10, 1, 2, 3)}, sentinel: specio.ErrGrid},
		{name: "other step", spectra: []specio.Named{a, onGrid(t, "b", 400, 5, 1, 2, 3)}, sentinel: specio.ErrGrid},
		{name: "other length", spectra: []specio.Named{a, onGrid(t, "b", 400, 10, 1, 2, 3, 4)}, sentinel: specio.ErrGrid},
		{name: "line break in name", spectra: []specio.Named{a, onGrid(t, "b\nc", 400, 10, 1, 2, 3)}, sentinel: specio.ErrName},
		// The reader refuses a header naming two spectra alike, so the
		// writer does not write one: common practice (no source).
		{name: "NUL in name", spectra: []specio.Named{a, onGrid(t, "b\x00", 400, 10, 1, 2, 3)}, sentinel: specio.ErrName},
		{name: "name twice", spectra: []specio.Named{a, onGrid(t, "b", 400, 10, 1, 2, 3), onGrid(t, "a", 400, 10, 4, 5, 6)}, sentinel: specio.ErrName},
	} {
		var b bytes.Buffer
		err := specio.WriteColumns(&b, tc.spectra)
		if !errors.Is(err, tc.sentinel) {
			t.Errorf("%s: error %v, want %v", tc.name, err, tc.sentinel)
		}
		if b.Len() != 0 {
			t.Errorf("%s: wrote %q before failing", tc.name, b.String())
		}
	}
}

// failWriter fails after n bytes.
type failWriter struct{ n int }

var errFull = errors.New("disk full")

func (w *failWriter) Write(p []byte) (int, error) {
	if len(p) > w.n {
		k := w.n
		w.n = 0
		return k, errFull
	}
	w.n -= len(p)
	return len(p), nil
}

func TestWriteColumnsWriterError(t *testing.T) {
	t.Parallel()
	values := make([]float64, 2000)
	s := onGrid(t, "long", 300, 0.5, values...)
	for _, n := range []int{0, 10, 5000} {
		if err := specio.WriteColumns(&failWriter{n: n}, []specio.Named{s}); !errors.Is(err, errFull) {
			t.Errorf("failing after %d bytes: error %v, want %v", n, err, errFull)
		}
	}
}

// TestWriteReadRoundTrip checks with random spectra that what
// WriteColumns writes, Reader reads back unchanged. Values must come back
// bit for bit: strconv's 'g' format with precision −1 is the shortest
// decimal that parses back to the same float64 (Go strconv documentation).
// Wavelengths come back to 1e-9 nm (colorimetry.Grid.Equal), as the grid
// is rebuilt from the printed wavelengths.
func TestWriteReadRoundTrip(t *testing.T) {
	t.Parallel()
	rapid.Check(t, func(rt *rapid.T) {
		start := rapid.Float64Range(100, 2000).Draw(rt, "start")
		step := rapid.SampledFrom([]float64{0.1, 0.5, 1, 2, 5, 10, 20}).Draw(rt, "step")
		if rapid.Bool().Draw(rt, "odd step") {
			step = rapid.Float64Range(0.05, 25).Draw(rt, "step value")
		}
		n := rapid.IntRange(3, 60).Draw(rt, "n")
		k := rapid.IntRange(1, 5).Draw(rt, "spectra")
		name := rapid.StringN(1, 12, -1).Filter(func(s string) bool { return !strings.ContainsAny(s, "\r\n\x00") })
		names := map[string]bool{} // names must differ (see TestWriteColumnsErrors)
		value := rapid.OneOf(rapid.Float64(), rapid.Float64Range(-0.05, 1.05), rapid.Float64Range(0, 100))
		in := make([]specio.Named, k)
		for j := range in {
			v := rapid.SliceOfN(value, n, n).Draw(rt, "values")
			g := colorimetry.Grid{Start: start, Step: step, N: n}
			s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
			if err != nil {
				rt.Fatal(err)
			}
			nm := name.Filter(func(s string) bool { return !names[s] }).Draw(rt, "name")
			names[nm] = true
			in[j] = specio.Named{Name: nm, Spectrum: s}
		}
		var b bytes.Buffer
		if err := specio.WriteColumns(&b, in); err != nil {
			rt.Fatal(err)
		}
		out, err := specio.NewReader(&b, "round.csv").ReadAll()
		if err != nil {
			rt.Fatalf("reading back: %v", err)
		}
		if len(out) != len(in) {
			rt.Fatalf("read %d spectra, wrote %d", len(out), len(in))
		}
		for j := range in {
			if out[j].Name != in[j].Name {
				rt.Errorf("name %q read back as %q", in[j].Name, out[j].Name)
			}
			gi, go_ := in[j].Spectrum.Grid(), out[j].Spectrum.Grid()
			if !gi.Equal(go_) {
				rt.Fatalf("%q: grid %v (start %v step %v) read back as %v (start %v step %v)", in[j].Name, gi, gi.Start, gi.Step, go_, go_.Start, go_.Step)
			}
			for i := range n {
				a, c := in[j].Spectrum.Value(i), out[j].Spectrum.Value(i)
				if !scalar.EqualWithinAbsOrRel(a, c, 0, 0) || math.Signbit(a) != math.Signbit(c) {
					rt.Errorf("%q sample %d: wrote %v, read %v", in[j].Name, i, a, c)
				}
			}
		}
	})
}
