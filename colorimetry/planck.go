package colorimetry

import (
	"fmt"
	"math"
)

// Radiation constants for Planck's law.
const (
	// C2 is the second radiation constant that CIE 015:2018 §7 prescribes
	// for colorimetric work, 1.4388×10⁻² m·K.
	C2 = 1.4388e-2
	// C2CODATA is the CODATA 2018 value of the second radiation constant,
	// hc/k = 1.438776877×10⁻² m·K.
	C2CODATA = 1.438776877e-2
	// C1 is the first radiation constant 2πhc² (CODATA 2018),
	// 3.741771852×10⁻¹⁶ W·m².
	C1 = 3.741771852e-16
)

// Planck returns the spectral radiant exitance of a blackbody at
// temperature t (K) and wavelength nm (nm), in W·m⁻²·nm⁻¹, by Planck's
// law M = c1 λ⁻⁵ / (exp(c2/(λT)) − 1) with the given c2 (m·K; pass C2 for
// colorimetric work). Special cases are:
//
//	Planck(nm, t, c2) = 0 for t ≤ 0 or nm ≤ 0
func Planck(nm, t, c2 float64) float64 {
	if t <= 0 || nm <= 0 {
		return 0
	}
	l := nm * 1e-9
	return C1 / (l * l * l * l * l * math.Expm1(c2/(l*t))) * 1e-9
}

// Blackbody returns the relative spectral power distribution of a Planckian
// radiator at temperature t (K) on grid g, normalised to 100 at 560 nm as
// the CIE normalises illuminant A, with radiation constant c2 (m·K). It
// returns an error for a temperature that is not positive and finite.
func Blackbody(t float64, g Grid, c2 float64) (Spectrum, error) {
	if !(t > 0) || math.IsInf(t, 0) {
		return Spectrum{}, fmt.Errorf("blackbody temperature %g K: must be positive and finite", t)
	}
	if !g.Valid() {
		return Spectrum{}, fmt.Errorf("%w: %+v", ErrBadGrid, g)
	}
	ref := Planck(560, t, c2)
	v := make([]float64, g.N)
	for i := range v {
		v[i] = 100 * Planck(g.Wavelength(i), t, c2) / ref
	}
	// Very low temperatures underflow to zero at 560 nm.
	for i, x := range v {
		if !isFinite(x) {
			return Spectrum{}, &SampleError{Index: i, Wavelength: g.Wavelength(i), Err: fmt.Errorf("blackbody at %g K: %w", t, ErrNotFinite)}
		}
	}
	return fromGrid(g, v, InterpAuto, ExtrapHold), nil
}
