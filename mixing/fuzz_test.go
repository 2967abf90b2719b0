package mixing_test

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
	"github.com/antipode-color/antipode/mixing"
)

// The fuzz targets of this file check the entries that take user data —
// model files, the measurement files of each fit, and the solvers — for
// the rules of DEVELOPERS.md "Reliability": no panic, no hang, errors of
// one line, and no NaN or Inf handed back as a result. Their seed corpora
// are in testdata/fuzz/<Target>/, which plain `go test` replays.

// oneLine fails unless err's message is a single non-empty line.
func oneLine(t *testing.T, err error) {
	t.Helper()
	msg := err.Error()
	if msg == "" || strings.ContainsAny(msg, "\r\n") {
		t.Fatalf("error is not one line: %q", msg)
	}
}

// spectrumFinite fails when s has a sample that is NaN or infinite.
func spectrumFinite(t *testing.T, what string, s colorimetry.Spectrum) {
	t.Helper()
	for i := range s.Len() {
		if v := s.Value(i); math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("%s: sample %d = %v without an error", what, i, v)
		}
	}
}

// FuzzLoad feeds arbitrary bytes to Load. A model that loads must save,
// load again and save to the same bytes (Save is a fixed point of Load),
// and its forward model at amounts of 0.5 each must give a finite
// spectrum or an error.
func FuzzLoad(f *testing.F) {
	f.Add([]byte(`{"schema":"antipode-model/1","kind":"dyes","model":{}}`))
	f.Add([]byte(`{"schema":"antipode-model/1","kind":"nope","model":{}}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		m, err := mixing.Load(bytes.NewReader(data))
		if err != nil {
			oneLine(t, err)
			return
		}
		var once, twice bytes.Buffer
		if err := mixing.Save(&once, m); err != nil {
			t.Fatalf("a loaded %s model does not save: %v", m.Kind(), err)
		}
		back, err := mixing.Load(bytes.NewReader(once.Bytes()))
		if err != nil {
			t.Fatalf("a saved %s model does not load: %v\n%s", m.Kind(), err, once.String())
		}
		if err := mixing.Save(&twice, back); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(once.Bytes(), twice.Bytes()) {
			t.Fatalf("save, load, save differs:\n%s\n---\n%s", once.String(), twice.String())
		}
		forward(t, m)
	})
}

// halves returns amounts of 0.5 for every name.
func halves(names []string) []mixing.Amount {
	a := make([]mixing.Amount, len(names))
	for i, n := range names {
		a[i] = mixing.Amount{Name: n, Value: 0.5}
	}
	return a
}

// forward runs a loaded model's forward function at amounts of 0.5.
func forward(t *testing.T, m mixing.Model) {
	var s colorimetry.Spectrum
	var err error
	switch m := m.(type) {
	case *mixing.Dyes:
		s, _, err = m.Transmittance(halves(m.Names()), 1)
	case *mixing.Lights:
		s, err = m.Spectrum(halves(m.Names()))
	case *mixing.Pigments:
		s, err = m.Reflectance(halves(m.Names()))
	case *mixing.Halftone:
		s, err = m.Reflectance(halves(m.Inks()))
	default:
		return
	}
	if err != nil {
		oneLine(t, err)
		return
	}
	spectrumFinite(t, m.Kind()+" forward model", s)
}

// readFuzzRecords reads data as a spectral file named fuzz.csv with a
// small resampling limit (so each run stays fast through the same code).
func readFuzzRecords(data []byte) []specio.Named {
	r := specio.NewReader(bytes.NewReader(data), "fuzz.csv")
	r.MaxSamples = 1 << 12
	recs, _ := r.ReadAll()
	return recs
}

// FuzzLightRamps feeds the spectra of arbitrary files to
// LightRampsFromNamed (the lights fit's measurement reader).
func FuzzLightRamps(f *testing.F) {
	f.Add([]byte("name,channel,drive,heldout,400,410,420\nr1,red,0.5,,1,2,3\nr2,red,1,yes,2,4,6\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		recs := readFuzzRecords(data)
		samples, err := mixing.LightRampsFromNamed(recs, "fuzz.csv")
		if err != nil {
			oneLine(t, err)
			return
		}
		for _, s := range samples {
			if !(s.Drive >= 0 && s.Drive <= 1) || s.Channel == "" {
				t.Fatalf("sample %+v", s)
			}
			spectrumFinite(t, "ramp", s.Spectrum)
		}
	})
}

// FuzzDyeSamples feeds the spectra of arbitrary files to DyeSamples (the
// dyes fit's measurement reader).
func FuzzDyeSamples(f *testing.F) {
	f.Add([]byte("name,dye,concentration (g/L),400,410,420\nb,base,0,0.9,0.9,0.9\na1,amber,0.01,0.5,0.6,0.7\nm,amber=0.01+teal=0.02,,0.3,0.4,0.5\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		recs := readFuzzRecords(data)
		samples, _, err := mixing.DyeSamples(recs, "fuzz.csv")
		if err != nil {
			oneLine(t, err)
			return
		}
		for _, s := range samples {
			for _, a := range s.Amounts {
				if math.IsNaN(a.Value) || math.IsInf(a.Value, 0) || a.Value < 0 {
					t.Fatalf("sample %q amount %+v", s.Name, a)
				}
			}
			spectrumFinite(t, "dye sample", s.Transmittance)
		}
	})
}

// FuzzHalftoneSamples feeds the spectra of arbitrary files to
// HalftoneSamples (the halftone fit's measurement reader).
func FuzzHalftoneSamples(f *testing.F) {
	f.Add([]byte("name,c (%),m (%),ink:orange (%),heldout,400,410,420\np,0,0,0,,0.9,0.9,0.9\nq,100,50,0,1,0.1,0.2,0.3\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		recs := readFuzzRecords(data)
		samples, inks, err := mixing.HalftoneSamples(recs, "fuzz.csv")
		if err != nil {
			oneLine(t, err)
			return
		}
		for _, s := range samples {
			if len(s.Coverages) > len(inks) {
				t.Fatalf("patch %q has %d coverages for %d inks", s.Name, len(s.Coverages), len(inks))
			}
			for _, c := range s.Coverages {
				if !(c.Value >= 0 && c.Value <= 1) {
					t.Fatalf("patch %q coverage %+v outside 0–1", s.Name, c)
				}
			}
			spectrumFinite(t, "patch", s.Reflectance)
		}
	})
}

// FuzzBoundedLS feeds arbitrary small problems to NNLS and BoundedLS. A
// solution without an error must be finite, lie within its bounds and
// satisfy the Karush–Kuhn–Tucker conditions of bounded least squares
// (Lawson & Hanson 1974, ch. 23; Stark & Parker 1995): the gradient
// g = Aᵀ(Ax − b) is ≈ 0 where a bound is not active, ≥ 0 at a lower bound
// and ≤ 0 at an upper bound. Tolerance 1e-6 relative to ‖A‖·‖b‖ (the
// solver's own stopping rule is tighter; from memory).
func FuzzBoundedLS(f *testing.F) {
	f.Add(uint8(3), uint8(2), []byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20}, false)
	f.Add(uint8(4), uint8(4), []byte{200, 0, 0, 0, 0, 200, 0, 0, 0, 0, 200, 0, 0, 0, 0, 200, 255, 1, 128, 3, 0, 1, 0, 1}, true)
	f.Fuzz(func(t *testing.T, rows, cols uint8, data []byte, bounded bool) {
		m, n := int(rows%8)+1, int(cols%6)+1
		need := m*n + m + 2*n
		if len(data) < need {
			return
		}
		val := func(i int) float64 { return (float64(data[i]) - 128) / 16 }
		a := mat.NewDense(m, n, nil)
		for i := range m {
			for j := range n {
				a.Set(i, j, val(i*n+j))
			}
		}
		b := make([]float64, m)
		for i := range b {
			b[i] = val(m*n + i)
		}
		lo, hi := make([]float64, n), make([]float64, n)
		for j := range n {
			lo[j] = math.Min(0, val(m*n+m+j))
			hi[j] = lo[j] + math.Abs(val(m*n+m+n+j)) + 0.1
		}
		var x []float64
		var err error
		if bounded {
			x, _, err = mixing.BoundedLS(a, b, lo, hi)
		} else {
			x, _, err = mixing.NNLS(a, b)
			for j := range lo {
				lo[j], hi[j] = 0, math.Inf(1)
			}
		}
		if err != nil {
			oneLine(t, err)
			return
		}
		r := make([]float64, m)
		for i := range m {
			r[i] = -b[i]
			for j := range n {
				r[i] += a.At(i, j) * x[j]
			}
		}
		scale := (mat.Norm(a, 2) + 1) * (lsNorm(b) + 1)
		for j := range n {
			if math.IsNaN(x[j]) || math.IsInf(x[j], 0) || x[j] < lo[j]-1e-12 || x[j] > hi[j]+1e-12 {
				t.Fatalf("x[%d] = %v outside [%v, %v]", j, x[j], lo[j], hi[j])
			}
			g := 0.0
			for i := range m {
				g += a.At(i, j) * r[i]
			}
			tol := 1e-6 * scale
			atLo, atHi := x[j] <= lo[j]+1e-9*(1+math.Abs(lo[j])), x[j] >= hi[j]-1e-9*(1+math.Abs(hi[j]))
			switch {
			case atLo && atHi:
			case atLo && g < -tol, atHi && g > tol, !atLo && !atHi && math.Abs(g) > tol:
				t.Fatalf("KKT fails at %d: x %v in [%v, %v], gradient %v (tol %v)", j, x[j], lo[j], hi[j], g, tol)
			}
		}
	})
}

// lsNorm returns the Euclidean norm of v.
func lsNorm(v []float64) float64 {
	s := 0.0
	for _, x := range v {
		s += x * x
	}
	return math.Sqrt(s)
}

// fuzzDyes is a two-dye Beer–Lambert model on 400–700 nm at 20 nm, made
// up for the fuzz target (invented data).
func fuzzDyes(t *testing.T) *mixing.Dyes {
	g := colorimetry.Grid{Start: 400, Step: 20, N: 16}
	e1, e2, base := make([]float64, g.N), make([]float64, g.N), make([]float64, g.N)
	for i := range g.N {
		x := float64(i) / float64(g.N-1)
		e1[i] = 2 * math.Exp(-(x-0.2)*(x-0.2)*20)
		e2[i] = 1.5 * math.Exp(-(x-0.8)*(x-0.8)*20)
		base[i] = 0.02
	}
	m, err := mixing.NewDyes(g, "g/L", base, []mixing.Dye{{Name: "a", Absorptivity: e1}, {Name: "b", Absorptivity: e2}})
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// FuzzDyesSolve solves a small dyes model for arbitrary target spectra
// (bytes as transmittances 0–1.27, with some wild values). Every recipe
// returned without an error must have finite, non-negative amounts and a
// finite ΔE00.
func FuzzDyesSolve(f *testing.F) {
	f.Add([]byte{60, 50, 40, 30, 20, 30, 40, 50, 60, 70, 80, 90, 100, 110, 120, 127}, float64(1))
	f.Add([]byte{0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0}, float64(0))
	f.Add([]byte{255, 255, 255}, 1e300)
	f.Fuzz(func(t *testing.T, data []byte, ell float64) {
		if len(data) < 3 {
			return
		}
		m := fuzzDyes(t)
		v := make([]float64, len(data))
		for i, c := range data {
			switch c {
			case 255:
				v[i] = 1e308
			case 254:
				v[i] = -1
			default:
				v[i] = float64(c) / 100
			}
		}
		g := colorimetry.Grid{Start: 380, Step: 400 / float64(len(v)-1), N: len(v)}
		target, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
		if err != nil {
			oneLine(t, err)
			return
		}
		sol, err := m.Solve(target, mixing.DyeSolveSettings{PathLength: ell, MaxEvaluations: 200})
		if err != nil {
			oneLine(t, err)
			return
		}
		for _, r := range sol.Recipes {
			if math.IsNaN(r.DE00) || math.IsInf(r.DE00, 0) || r.DE00 < 0 {
				t.Fatalf("recipe ΔE00 %v", r.DE00)
			}
			for _, a := range r.Amounts {
				if math.IsNaN(a.Value) || math.IsInf(a.Value, 0) || a.Value < 0 {
					t.Fatalf("recipe amount %+v", a)
				}
			}
		}
	})
}
