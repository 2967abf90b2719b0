package colorimetry

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/interp"
)

// Spectrum is a spectral distribution sampled on a regular Grid: a
// reflectance or transmittance (fraction 0–1), a relative or absolute
// spectral power distribution, a colour-matching function or an action
// spectrum. It remembers how it should be interpolated and extrapolated.
// A Spectrum is immutable; the zero Spectrum is empty.
type Spectrum struct {
	grid   Grid
	values []float64
	interp Interp
	extrap Extrap
}

// Options control how NewSpectrumWith builds a spectrum. The zero value
// gives the defaults of CIE 015:2018: InterpAuto, ExtrapHold and a 1 nm
// grid for irregular input.
type Options struct {
	Interp Interp  // interpolation method; zero means InterpAuto
	Extrap Extrap  // extrapolation rule; zero means ExtrapHold
	Step   float64 // grid step for irregular input, nm; zero means 1 nm
	// MaxSamples bounds the grid onto which irregular input is resampled;
	// zero means DefaultMaxSamples.
	MaxSamples int
}

// DefaultMaxSamples is the largest grid, in samples, onto which irregular
// input is resampled unless Options.MaxSamples says otherwise: 2²⁰, a
// 1 nm grid over a millimetre of wavelengths, far beyond any instrument.
const DefaultMaxSamples = 1 << 20

// UniformStep reports whether the strictly increasing wavelengths nm (at
// least two) are uniformly spaced, to a relative spread of 1e-4 of the
// step, and returns the mean step in nm.
func UniformStep(nm []float64) (step float64, ok bool) {
	n := len(nm)
	if n < 2 {
		return 0, false
	}
	step = (nm[n-1] - nm[0]) / float64(n-1)
	for i := 1; i < n; i++ {
		if math.Abs(nm[i]-nm[i-1]-step) > uniformTol*step {
			return step, false
		}
	}
	return step, true
}

// uniformTol is the relative spread of steps, as a fraction of the mean
// step, below which wavelengths count as uniformly spaced. Instruments
// print wavelengths to a few decimals, so 1e-4 of the step is generous.
const uniformTol = 1e-4

// NewSpectrum returns the spectrum with the given wavelengths (nm) and
// values, using the default Options. See NewSpectrumWith.
func NewSpectrum(nm, values []float64) (Spectrum, error) {
	return NewSpectrumWith(nm, values, Options{})
}

// NewSpectrumWith validates the wavelengths (nm) and values and returns
// the spectrum. Wavelengths must be finite and strictly increasing, values
// finite, with at least 3 samples. Uniformly spaced input keeps its own
// grid. Irregular input is resampled onto the grid of step opt.Step (1 nm by
// default) from the first multiple of the step at or above the first
// wavelength to the last at or below the last wavelength, by a natural cubic
// spline (linear if opt.Interp is InterpLinear); the result then interpolates
// with opt.Interp. The inputs are copied.
func NewSpectrumWith(nm, values []float64, opt Options) (Spectrum, error) {
	if len(nm) != len(values) {
		return Spectrum{}, fmt.Errorf("%w: %d wavelengths, %d values", ErrLength, len(nm), len(values))
	}
	if len(nm) < 3 {
		return Spectrum{}, fmt.Errorf("%w (got %d)", ErrTooFew, len(nm))
	}
	for i, w := range nm {
		if !isFinite(w) {
			return Spectrum{}, &SampleError{Index: i, Wavelength: w, Err: fmt.Errorf("wavelength: %w", ErrNotFinite)}
		}
		if !isFinite(values[i]) {
			return Spectrum{}, &SampleError{Index: i, Wavelength: w, Err: ErrNotFinite}
		}
		if i > 0 {
			switch {
			case w == nm[i-1]:
				return Spectrum{}, &SampleError{Index: i, Wavelength: w, Err: ErrDuplicate}
			case w < nm[i-1]:
				return Spectrum{}, &SampleError{Index: i, Wavelength: w, Err: fmt.Errorf("%w (%g nm follows %g nm)", ErrUnsorted, w, nm[i-1])}
			}
		}
	}
	n := len(nm)
	step, uniform := UniformStep(nm)
	if uniform {
		v := make([]float64, n)
		copy(v, values)
		return Spectrum{grid: Grid{Start: nm[0], Step: step, N: n}, values: v, interp: opt.Interp, extrap: opt.Extrap}, nil
	}
	st := opt.Step
	if st == 0 {
		st = 1
	}
	if !(st > 0) || !isFinite(st) {
		return Spectrum{}, fmt.Errorf("%w: step %g nm", ErrBadGrid, st)
	}
	lo := math.Ceil(nm[0]/st-1e-9) * st
	hi := math.Floor(nm[n-1]/st+1e-9) * st
	maxN := opt.MaxSamples
	if maxN <= 0 {
		maxN = DefaultMaxSamples
	}
	if (hi-lo)/st+1 > float64(maxN) {
		return Spectrum{}, fmt.Errorf("%w: irregular samples from %g to %g nm would need more than %d points at %g nm", ErrBadGrid, nm[0], nm[n-1], maxN, st)
	}
	g, err := NewGrid(lo, hi, st)
	if err != nil {
		return Spectrum{}, fmt.Errorf("irregular samples from %g to %g nm span too little for a %g nm grid: %w", nm[0], nm[n-1], st, err)
	}
	v := make([]float64, g.N)
	var pred interp.Predictor
	if opt.Interp == InterpLinear {
		var pl interp.PiecewiseLinear
		if err := pl.Fit(nm, values); err != nil {
			return Spectrum{}, err
		}
		pred = &pl
	} else {
		var nc interp.NaturalCubic
		if err := nc.Fit(nm, values); err != nil {
			return Spectrum{}, fmt.Errorf("cubic spline through irregular samples: %w", err)
		}
		pred = &nc
	}
	for i := range v {
		v[i] = pred.Predict(g.Wavelength(i))
		if !isFinite(v[i]) {
			// Not a SampleError: the index would be on the new grid, not
			// among the caller's samples.
			return Spectrum{}, fmt.Errorf("cubic spline through irregular samples overflows at %g nm: %w", g.Wavelength(i), ErrNotFinite)
		}
	}
	return Spectrum{grid: g, values: v, interp: opt.Interp, extrap: opt.Extrap}, nil
}

// NewSpectrumOnGrid returns the spectrum with values sampled on g. It
// returns an error if g is invalid, the lengths differ or a value is not
// finite. The values are copied.
func NewSpectrumOnGrid(g Grid, values []float64, opt Options) (Spectrum, error) {
	if !g.Valid() {
		return Spectrum{}, fmt.Errorf("%w: %+v", ErrBadGrid, g)
	}
	if len(values) != g.N {
		return Spectrum{}, fmt.Errorf("%w: grid has %d wavelengths, %d values", ErrLength, g.N, len(values))
	}
	for i, x := range values {
		if !isFinite(x) {
			return Spectrum{}, &SampleError{Index: i, Wavelength: g.Wavelength(i), Err: ErrNotFinite}
		}
	}
	v := make([]float64, len(values))
	copy(v, values)
	return Spectrum{grid: g, values: v, interp: opt.Interp, extrap: opt.Extrap}, nil
}

// fromGrid wraps v (not copied) without validation, for values computed
// from valid spectra.
func fromGrid(g Grid, v []float64, m Interp, e Extrap) Spectrum {
	return Spectrum{grid: g, values: v, interp: m, extrap: e}
}

// Grid returns the spectrum's wavelength grid.
func (s Spectrum) Grid() Grid { return s.grid }

// Len returns the number of samples.
func (s Spectrum) Len() int { return len(s.values) }

// IsZero reports whether s is the zero (empty) Spectrum.
func (s Spectrum) IsZero() bool { return len(s.values) == 0 }

// Interp returns the spectrum's interpolation method.
func (s Spectrum) Interp() Interp { return s.interp }

// Extrap returns the spectrum's extrapolation rule.
func (s Spectrum) Extrap() Extrap { return s.extrap }

// WithInterp returns s with interpolation method m.
func (s Spectrum) WithInterp(m Interp) Spectrum { s.interp = m; return s }

// WithExtrap returns s with extrapolation rule e.
func (s Spectrum) WithExtrap(e Extrap) Spectrum { s.extrap = e; return s }

// Value returns the i-th sample. It panics if i is out of range.
func (s Spectrum) Value(i int) float64 { return s.values[i] }

// Values copies the samples into dst, allocating when dst is nil, and
// returns it. It panics if dst is non-nil with the wrong length.
func (s Spectrum) Values(dst []float64) []float64 {
	if dst == nil {
		dst = make([]float64, len(s.values))
	}
	if len(dst) != len(s.values) {
		panic("colorimetry: dst length differs from spectrum length")
	}
	copy(dst, s.values)
	return dst
}

// Wavelengths returns the sample wavelengths, nm.
func (s Spectrum) Wavelengths() []float64 { return s.grid.Wavelengths(nil) }

// At returns the spectrum at nm, interpolated and extrapolated by the
// spectrum's own rules. Under ExtrapError a wavelength outside the range
// gives NaN; use Resample to get an error instead.
func (s Spectrum) At(nm float64) float64 {
	out := [1]float64{}
	g := Grid{Start: nm, Step: 1, N: 1}
	if err := resample(out[:], s.grid, s.values, s.interp, s.extrap, g); err != nil {
		return math.NaN()
	}
	return out[0]
}

// Resample returns s evaluated on the grid g with its own interpolation
// and extrapolation rules. Resampling onto the spectrum's own grid returns
// s unchanged. It returns an error wrapping ErrCoverage when g reaches
// beyond the data under ExtrapError, and ErrNotFinite when interpolating
// values near ±1e308 overflows.
func (s Spectrum) Resample(g Grid) (Spectrum, error) {
	if s.grid.Equal(g) {
		return s, nil
	}
	if !g.Valid() {
		return Spectrum{}, fmt.Errorf("%w: %+v", ErrBadGrid, g)
	}
	v := make([]float64, g.N)
	if err := resample(v, s.grid, s.values, s.interp, s.extrap, g); err != nil {
		return Spectrum{}, err
	}
	return fromGrid(g, v, s.interp, s.extrap), nil
}

// Max returns the largest sample and its wavelength, nm.
func (s Spectrum) Max() (value, nm float64) {
	if len(s.values) == 0 {
		return math.NaN(), math.NaN()
	}
	k := 0
	for i, v := range s.values {
		if v > s.values[k] {
			k = i
		}
	}
	return s.values[k], s.grid.Wavelength(k)
}

// Min returns the smallest sample and its wavelength, nm.
func (s Spectrum) Min() (value, nm float64) {
	if len(s.values) == 0 {
		return math.NaN(), math.NaN()
	}
	k := 0
	for i, v := range s.values {
		if v < s.values[k] {
			k = i
		}
	}
	return s.values[k], s.grid.Wavelength(k)
}

// Scale returns k·s.
func (s Spectrum) Scale(k float64) Spectrum {
	v := make([]float64, len(s.values))
	for i, x := range s.values {
		v[i] = k * x
	}
	return fromGrid(s.grid, v, s.interp, s.extrap)
}

// Map returns the spectrum f(s(λ)) on the same grid. It returns an error
// if f gives a non-finite value.
func (s Spectrum) Map(f func(nm, v float64) float64) (Spectrum, error) {
	v := make([]float64, len(s.values))
	for i, x := range s.values {
		nm := s.grid.Wavelength(i)
		v[i] = f(nm, x)
		if !isFinite(v[i]) {
			return Spectrum{}, &SampleError{Index: i, Wavelength: nm, Err: ErrNotFinite}
		}
	}
	return fromGrid(s.grid, v, s.interp, s.extrap), nil
}

// CheckFraction returns a *SampleError wrapping ErrNegative for the first
// sample below −tol, as suits a reflectance or transmittance (fraction
// 0–1) where small negative values are measurement noise. A tol of 0.01
// is common practice (no source) for spectrophotometer noise near black.
func (s Spectrum) CheckFraction(tol float64) error {
	for i, v := range s.values {
		if v < -tol {
			return &SampleError{Index: i, Wavelength: s.grid.Wavelength(i), Err: fmt.Errorf("%w (%g < −%g)", ErrNegative, v, tol)}
		}
	}
	return nil
}

// Align returns a and b resampled onto one common grid: their overlapping
// range, at the finer of the two steps, starting at the later start. If
// both already share a grid they are returned unchanged. It returns
// ErrNoOverlap when the ranges do not overlap by at least three samples of
// the finer step.
func Align(a, b Spectrum) (Spectrum, Spectrum, error) {
	if a.grid.Equal(b.grid) {
		return a, b, nil
	}
	step := math.Min(a.grid.Step, b.grid.Step)
	lo := math.Max(a.grid.Start, b.grid.Start)
	hi := math.Min(a.grid.End(), b.grid.End())
	if hi <= lo {
		return Spectrum{}, Spectrum{}, fmt.Errorf("%w: %v and %v", ErrNoOverlap, a.grid, b.grid)
	}
	n := int(math.Floor((hi-lo)/step+1e-9)) + 1
	if n < 3 {
		return Spectrum{}, Spectrum{}, fmt.Errorf("%w: %v and %v share fewer than 3 samples", ErrNoOverlap, a.grid, b.grid)
	}
	g := Grid{Start: lo, Step: step, N: n}
	ra, err := a.Resample(g)
	if err != nil {
		return Spectrum{}, Spectrum{}, err
	}
	rb, err := b.Resample(g)
	if err != nil {
		return Spectrum{}, Spectrum{}, err
	}
	return ra, rb, nil
}

// combine applies op sample by sample to a and b after aligning them.
func combine(a, b Spectrum, op func(x, y float64) float64) (Spectrum, error) {
	ra, rb, err := Align(a, b)
	if err != nil {
		return Spectrum{}, err
	}
	v := make([]float64, ra.Len())
	for i := range v {
		v[i] = op(ra.values[i], rb.values[i])
		if !isFinite(v[i]) {
			return Spectrum{}, &SampleError{Index: i, Wavelength: ra.grid.Wavelength(i), Err: ErrNotFinite}
		}
	}
	return fromGrid(ra.grid, v, a.interp, a.extrap), nil
}

// Add returns a + b on their common grid (see Align).
func Add(a, b Spectrum) (Spectrum, error) {
	return combine(a, b, func(x, y float64) float64 { return x + y })
}

// Sub returns a − b on their common grid (see Align).
func Sub(a, b Spectrum) (Spectrum, error) {
	return combine(a, b, func(x, y float64) float64 { return x - y })
}

// Mul returns a·b sample by sample on their common grid (see Align), as
// for a light through a filter or two stacked filters.
func Mul(a, b Spectrum) (Spectrum, error) {
	return combine(a, b, func(x, y float64) float64 { return x * y })
}
