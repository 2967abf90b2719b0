package colorimetry

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

func TestNewSpectrumErrors(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name   string
		nm, v  []float64
		want   error
		index  int // 1-based sample in the message; 0: not a SampleError
		wantNm float64
	}{
		{"too few", []float64{400, 410}, []float64{1, 2}, ErrTooFew, 0, 0},
		{"length", []float64{400, 410, 420}, []float64{1, 2}, ErrLength, 0, 0},
		{"nan", []float64{400, 410, 420}, []float64{1, math.NaN(), 2}, ErrNotFinite, 2, 410},
		{"inf", []float64{400, 410, 420}, []float64{1, 2, math.Inf(1)}, ErrNotFinite, 3, 420},
		{"nan wavelength", []float64{400, math.NaN(), 420}, []float64{1, 2, 3}, ErrNotFinite, 2, 0},
		{"duplicate", []float64{400, 410, 410, 420}, []float64{1, 2, 3, 4}, ErrDuplicate, 3, 410},
		{"unsorted", []float64{400, 420, 410}, []float64{1, 2, 3}, ErrUnsorted, 3, 410},
	} {
		_, err := NewSpectrum(tc.nm, tc.v)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: got %v, want %v", tc.name, err, tc.want)
			continue
		}
		var se *SampleError
		if tc.index > 0 {
			if !errors.As(err, &se) || se.Index+1 != tc.index {
				t.Errorf("%s: got %v, want sample %d", tc.name, err, tc.index)
			} else if tc.wantNm != 0 && se.Wavelength != tc.wantNm {
				t.Errorf("%s: wavelength %g, want %g", tc.name, se.Wavelength, tc.wantNm)
			}
		}
	}
}

func TestNewSpectrumGrids(t *testing.T) {
	t.Parallel()
	// Uniform input, printed to two decimals as instruments do, keeps its grid.
	s, err := NewSpectrum([]float64{380, 385.0002, 390, 395, 400}, []float64{1, 2, 3, 4, 5})
	if err != nil {
		t.Fatal(err)
	}
	if g := s.Grid(); !g.Equal(Grid{380, 5, 5}) {
		t.Errorf("uniform grid: got %v", g)
	}
	// Irregular input is resampled onto whole nanometres; a straight line
	// stays straight under the natural spline.
	nm := []float64{400.3, 401.1, 403.7, 404.2, 407.9}
	v := make([]float64, len(nm))
	for i, w := range nm {
		v[i] = 2*w - 700
	}
	s, err = NewSpectrum(nm, v)
	if err != nil {
		t.Fatal(err)
	}
	if g := s.Grid(); !g.Equal(Grid{401, 1, 7}) {
		t.Fatalf("irregular grid: got %v", g)
	}
	for i := 0; i < s.Len(); i++ {
		w := s.Grid().Wavelength(i)
		if !scalar.EqualWithinAbsOrRel(s.Value(i), 2*w-700, 1e-12, 1e-12) {
			t.Errorf("irregular at %g nm: got %g want %g", w, s.Value(i), 2*w-700)
		}
	}
}

// TestSpragueInterior checks Sprague interpolation away from the ends: its
// interior segments use five-point central differences and so reproduce
// polynomials up to degree 4 exactly (CIE 167:2005 §5; verifiable from the
// coefficients). The ends depend on the CIE 167 boundary extension, which
// package cie checks against the CIE's own 1 nm and 5 nm tables.
func TestSpragueInterior(t *testing.T) {
	t.Parallel()
	g := Grid{Start: 400, Step: 10, N: 20}
	for deg := 0; deg <= 4; deg++ {
		f := func(x float64) float64 { return math.Pow((x-500)/100, float64(deg)) }
		v := make([]float64, g.N)
		for i := range v {
			v[i] = f(g.Wavelength(i))
		}
		s, err := NewSpectrumWith(g.Wavelengths(nil), v, Options{Interp: InterpSprague})
		if err != nil {
			t.Fatal(err)
		}
		fine, err := s.Resample(Grid{Start: 420, Step: 0.7, N: 200})
		if err != nil {
			t.Fatal(err)
		}
		for i := 0; i < fine.Len(); i++ {
			x := fine.Grid().Wavelength(i)
			if d := math.Abs(fine.Value(i) - f(x)); d > 1e-12 {
				t.Errorf("degree %d at %g nm: error %g", deg, x, d)
				break
			}
		}
	}
}

func TestInterpolationReproducesNodes(t *testing.T) {
	t.Parallel()
	v := []float64{0.1, 0.5, 0.2, 0.9, 0.4, 0.45, 0.3, 0.8}
	nm := Grid{Start: 400, Step: 10, N: len(v)}.Wavelengths(nil)
	for _, m := range []Interp{InterpAuto, InterpSprague, InterpSpline, InterpLinear} {
		s, err := NewSpectrumWith(nm, v, Options{Interp: m})
		if err != nil {
			t.Fatal(err)
		}
		r, err := s.Resample(Grid{Start: 400, Step: 5, N: 15})
		if err != nil {
			t.Fatal(err)
		}
		for i, want := range v {
			if got := r.Value(2 * i); got != want {
				t.Errorf("%v: node %g nm: got %g want %g", m, nm[i], got, want)
			}
		}
		// Linear interpolation: midpoints are means.
		if m == InterpLinear {
			if got, want := r.Value(1), (v[0]+v[1])/2; math.Abs(got-want) > 1e-15 {
				t.Errorf("linear midpoint: got %g want %g", got, want)
			}
		}
	}
}

func TestExtrapolation(t *testing.T) {
	t.Parallel()
	s, err := NewSpectrum([]float64{400, 410, 420}, []float64{0.2, 0.4, 0.6})
	if err != nil {
		t.Fatal(err)
	}
	g := Grid{Start: 390, Step: 10, N: 5}
	for _, tc := range []struct {
		e      Extrap
		lo, hi float64
		err    error
	}{
		{ExtrapHold, 0.2, 0.6, nil},
		{ExtrapZero, 0, 0, nil},
		{ExtrapError, 0, 0, ErrCoverage},
	} {
		r, err := s.WithExtrap(tc.e).Resample(g)
		if !errors.Is(err, tc.err) {
			t.Errorf("%v: error %v, want %v", tc.e, err, tc.err)
			continue
		}
		if err != nil {
			continue
		}
		if r.Value(0) != tc.lo || r.Value(4) != tc.hi {
			t.Errorf("%v: ends %g, %g want %g, %g", tc.e, r.Value(0), r.Value(4), tc.lo, tc.hi)
		}
	}
}

func TestArithmeticAndAlign(t *testing.T) {
	t.Parallel()
	a, _ := NewSpectrum([]float64{400, 410, 420, 430, 440}, []float64{1, 1, 1, 1, 1})
	b, _ := NewSpectrum([]float64{420, 425, 430, 435, 440, 445, 450}, []float64{2, 2, 2, 2, 2, 2, 2})
	sum, err := Add(a, b)
	if err != nil {
		t.Fatal(err)
	}
	if g := sum.Grid(); !g.Equal(Grid{420, 5, 5}) {
		t.Errorf("common grid: got %v", g)
	}
	prod, _ := Mul(a, b)
	diff, _ := Sub(b, a)
	for i := 0; i < sum.Len(); i++ {
		if sum.Value(i) != 3 || prod.Value(i) != 2 || diff.Value(i) != 1 {
			t.Fatalf("sample %d: sum %g prod %g diff %g", i, sum.Value(i), prod.Value(i), diff.Value(i))
		}
	}
	c, _ := NewSpectrum([]float64{600, 610, 620}, []float64{1, 1, 1})
	if _, err := Add(a, c); !errors.Is(err, ErrNoOverlap) {
		t.Errorf("disjoint: got %v, want ErrNoOverlap", err)
	}
	if got := a.Scale(0.5).Value(2); got != 0.5 {
		t.Errorf("scale: got %g", got)
	}
}

func TestCheckFraction(t *testing.T) {
	t.Parallel()
	s, _ := NewSpectrum([]float64{400, 410, 420}, []float64{0.5, -0.005, -0.2})
	err := s.CheckFraction(0.01)
	var se *SampleError
	if !errors.Is(err, ErrNegative) || !errors.As(err, &se) || se.Wavelength != 420 {
		t.Errorf("got %v, want ErrNegative at 420 nm", err)
	}
}

func TestChromaticityRoundTrip(t *testing.T) {
	t.Parallel()
	c := XYZ{41.24, 21.26, 1.93}
	xy, err := c.XY()
	if err != nil {
		t.Fatal(err)
	}
	back, err := xy.XYZ(c.Y)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbsOrRel(back.X, c.X, 1e-12, 1e-12) || !scalar.EqualWithinAbsOrRel(back.Z, c.Z, 1e-12, 1e-12) {
		t.Errorf("xy round trip: %v → %v", c, back)
	}
	uv, _ := c.UVPrime()
	if got := uv.XY(); !scalar.EqualWithinAbsOrRel(got.X, xy.X, 1e-14, 1e-14) || !scalar.EqualWithinAbsOrRel(got.Y, xy.Y, 1e-14, 1e-14) {
		t.Errorf("u′v′ → xy: %v, want %v", got, xy)
	}
	if got := xy.UVPrime(); DeltaUVPrime(got, uv) > 1e-15 {
		t.Errorf("xy → u′v′: %v, want %v", got, uv)
	}
	if _, err := (XYZ{}).XY(); !errors.Is(err, ErrZeroLuminance) {
		t.Errorf("zero XYZ: got %v", err)
	}
	if _, err := (XYZ{math.NaN(), 1, 1}).UVPrime(); !errors.Is(err, ErrZeroLuminance) {
		t.Errorf("NaN XYZ: got %v", err)
	}
}

func TestNewSpectrumLimits(t *testing.T) {
	t.Parallel()
	// A span of 1e9 nm at 1 nm would need 10⁹ samples.
	if _, err := NewSpectrum([]float64{1, 2, 1e9}, []float64{0, 0, 0}); !errors.Is(err, ErrBadGrid) {
		t.Errorf("huge irregular span: got %v, want ErrBadGrid", err)
	}
	// A spline through alternating ±1e308 overflows between the samples.
	_, err := NewSpectrum([]float64{400, 401, 403, 406, 410}, []float64{1e308, -1e308, 1e308, -1e308, 1e308})
	if !errors.Is(err, ErrNotFinite) {
		t.Errorf("overflowing spline: got %v, want ErrNotFinite", err)
	}
	if _, ok := UniformStep([]float64{400, 405, 410.5}); ok {
		t.Error("400, 405, 410.5 taken as uniform")
	}
	if st, ok := UniformStep([]float64{400, 405, 410}); !ok || st != 5 {
		t.Errorf("UniformStep: %g, %v", st, ok)
	}
}
