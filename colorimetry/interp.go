package colorimetry

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/interp"
)

// Interp selects how a spectrum is interpolated between its samples.
type Interp int

const (
	// InterpAuto uses Sprague (1880) interpolation for uniformly spaced data
	// with at least 6 samples, and a natural cubic spline otherwise, as
	// CIE 015:2018 §7.2.2 recommends for smooth measured data.
	InterpAuto Interp = iota
	// InterpSprague is the fifth-order Sprague (1880) interpolation with
	// the boundary extension of CIE 167:2005. It needs uniform spacing and
	// at least 6 samples; with fewer, a natural cubic spline is used.
	InterpSprague
	// InterpSpline is a natural cubic spline (gonum interp.NaturalCubic).
	InterpSpline
	// InterpLinear is piecewise linear. The CIE tabulates the D series for
	// linear interpolation, and line spectra (fluorescent lamps, anything
	// with narrow peaks) must never be interpolated by Sprague.
	InterpLinear
)

// String returns the method's name as used in the CLI.
func (m Interp) String() string {
	switch m {
	case InterpAuto:
		return "auto"
	case InterpSprague:
		return "sprague"
	case InterpSpline:
		return "spline"
	case InterpLinear:
		return "linear"
	}
	return fmt.Sprintf("Interp(%d)", int(m))
}

// Extrap selects what a spectrum is taken to be outside its range.
type Extrap int

const (
	// ExtrapHold repeats the end values (CIE 015:2018 §7.2.2). It is the
	// default.
	ExtrapHold Extrap = iota
	// ExtrapZero takes the spectrum to be zero outside its range, as suits
	// a light measured over its whole emission.
	ExtrapZero
	// ExtrapError refuses: resampling beyond the range returns ErrCoverage.
	ExtrapError
)

// String returns the rule's name as used in the CLI.
func (e Extrap) String() string {
	switch e {
	case ExtrapHold:
		return "hold"
	case ExtrapZero:
		return "zero"
	case ExtrapError:
		return "error"
	}
	return fmt.Sprintf("Extrap(%d)", int(e))
}

// spragueMin is the number of samples Sprague interpolation needs.
const spragueMin = 6

// resample evaluates the data v on the grid src at every wavelength of dst
// and writes the values into out (len dst.N). It uses method m inside the
// range and rule e outside it.
func resample(out []float64, src Grid, v []float64, m Interp, e Extrap, dst Grid) error {
	p := newPredictor(src, v, m)
	lo, hi := src.Start, src.End()
	for i := range out {
		nm := dst.Wavelength(i)
		switch {
		case nm < lo-1e-9 || nm > hi+1e-9:
			switch e {
			case ExtrapZero:
				out[i] = 0
			case ExtrapError:
				return &SampleError{Index: i, Wavelength: nm, Err: fmt.Errorf("%w (%v)", ErrCoverage, src)}
			default:
				if nm < lo {
					out[i] = v[0]
				} else {
					out[i] = v[len(v)-1]
				}
			}
		default:
			out[i] = p(nm)
			if x := out[i]; math.IsNaN(x) || math.IsInf(x, 0) {
				// Finite data near ±1e308 can overflow in the
				// interpolation's weighted sums.
				return fmt.Errorf("%v interpolation overflows the float64 range at %g nm: %w", m, nm, ErrNotFinite)
			}
		}
	}
	return nil
}

// newPredictor returns an interpolating function over the uniform data v
// on grid g. Exact grid nodes return the sample itself.
func newPredictor(g Grid, v []float64, m Interp) func(nm float64) float64 {
	node := func(nm float64) (int, float64, bool) {
		t := (nm - g.Start) / g.Step
		i := int(math.Floor(t))
		if i < 0 {
			i, t = 0, 0
		}
		if i >= g.N-1 {
			i, t = g.N-2, float64(g.N-1)
		}
		f := t - float64(i)
		if f < 1e-9 {
			return i, 0, true
		}
		if f > 1-1e-9 {
			return i + 1, 0, true
		}
		return i, f, false
	}
	if m == InterpAuto || m == InterpSprague {
		if len(v) >= spragueMin {
			p := spraguePad(v)
			return func(nm float64) float64 {
				i, f, exact := node(nm)
				if exact {
					return v[i]
				}
				return spragueSegment(p, i, f)
			}
		}
		m = InterpSpline
	}
	if m == InterpSpline {
		var nc interp.NaturalCubic
		xs := g.Wavelengths(nil)
		// Fit can fail only on a singular system, which the tridiagonal
		// system of a natural spline on distinct nodes never is.
		if err := nc.Fit(xs, v); err == nil {
			return func(nm float64) float64 {
				if i, _, exact := node(nm); exact {
					return v[i]
				}
				return nc.Predict(nm)
			}
		}
	}
	return func(nm float64) float64 {
		i, f, exact := node(nm)
		if exact {
			return v[i]
		}
		return v[i] + f*(v[i+1]-v[i])
	}
}

// spraguePad returns v extended by two points at each end with the
// boundary coefficients of CIE 167:2005, Table 1.
func spraguePad(v []float64) []float64 {
	n := len(v)
	p := make([]float64, n+4)
	copy(p[2:], v)
	r := v
	p[0] = (884*r[0] - 1960*r[1] + 3033*r[2] - 2648*r[3] + 1080*r[4] - 180*r[5]) / 209
	p[1] = (508*r[0] - 540*r[1] + 488*r[2] - 367*r[3] + 144*r[4] - 24*r[5]) / 209
	r = v[n-6:]
	p[n+2] = (-24*r[0] + 144*r[1] - 367*r[2] + 488*r[3] - 540*r[4] + 508*r[5]) / 209
	p[n+3] = (-180*r[0] + 1080*r[1] - 2648*r[2] + 3033*r[3] - 1960*r[4] + 884*r[5]) / 209
	return p
}

// spragueSegment evaluates the Sprague quintic between samples i and i+1
// of the unpadded data at fraction f in [0, 1); p is the padded data, so
// sample i sits at p[i+2]. Coefficients: CIE 167:2005, Table 2.
func spragueSegment(p []float64, i int, f float64) float64 {
	rm2, rm1, r0, r1, r2, r3 := p[i], p[i+1], p[i+2], p[i+3], p[i+4], p[i+5]
	a0 := r0
	a1 := (2*rm2 - 16*rm1 + 16*r1 - 2*r2) / 24
	a2 := (-rm2 + 16*rm1 - 30*r0 + 16*r1 - r2) / 24
	a3 := (-9*rm2 + 39*rm1 - 70*r0 + 66*r1 - 33*r2 + 7*r3) / 24
	a4 := (13*rm2 - 64*rm1 + 126*r0 - 124*r1 + 61*r2 - 12*r3) / 24
	a5 := (-5*rm2 + 25*rm1 - 50*r0 + 50*r1 - 25*r2 + 5*r3) / 24
	return a0 + f*(a1+f*(a2+f*(a3+f*(a4+f*a5))))
}
