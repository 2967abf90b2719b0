package complement

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
)

// Derived is a complement derived from a spectrum.
type Derived struct {
	// Spectrum is the complement: s·I − a for a light, 1 − r for a
	// reflectance.
	Spectrum colorimetry.Spectrum `json:"-"`
	// Scale is s, the multiple of the white that the colour and its
	// complement add up to (1 for a reflectance: the perfect white).
	Scale float64 `json:"scale"`
	// Warnings are cautions about the data, such as a reflectance slightly
	// above 1 within noise.
	Warnings []string `json:"warnings"`
}

// LightComplement returns the complement c = s·I − a of the light a for the
// white illuminant ill: the light that, added to a, gives s times the
// white. With scale = 0 it takes the smallest s that keeps c non-negative,
// s = max a(λ)/I(λ), so that c is zero where a is strongest relative to the
// white; a positive scale is used as given and must be at least that
// large. Both spectra are relative spectral power distributions on one
// scale; c is computed on their common grid (colorimetry.Align) and carries
// the interpolation rules of a. Samples of a within noise below zero count
// as zero power.
//
// It returns an error naming "a" or "illuminant" for an empty or all-zero
// spectrum or one negative beyond 1 % of its peak, an error wrapping
// colorimetry.ErrNoOverlap when their ranges do not overlap, and an error
// wrapping ErrScale when the illuminant has no power where a has, or the
// given scale is not positive, not finite or too small.
func LightComplement(a, ill colorimetry.Spectrum, scale float64) (Derived, error) {
	if math.IsNaN(scale) || math.IsInf(scale, 0) || scale < 0 {
		return Derived{}, fmt.Errorf("%w: s = %g must be positive and finite", ErrScale, scale)
	}
	for _, in := range []struct {
		name string
		s    colorimetry.Spectrum
	}{{"a", a}, {"illuminant", ill}} {
		if err := checkSpectrum(in.name, in.s, Lights, in.s.Grid()); err != nil {
			return Derived{}, err
		}
	}
	ra, ri, err := colorimetry.Align(a, ill)
	if err != nil {
		return Derived{}, fmt.Errorf("a and illuminant: %w", err)
	}
	g := ra.Grid()
	av, iv := ra.Values(nil), ri.Values(nil)
	// The smallest s: the largest ratio a/I over the samples where a has
	// power.
	need, at := 0.0, -1
	for i, x := range av {
		if x <= 0 {
			continue
		}
		if iv[i] <= 0 {
			return Derived{}, inputErr("illuminant", fmt.Errorf("%w: no power at %g nm where a has %g", ErrScale, g.Wavelength(i), x))
		}
		if r := x / iv[i]; r > need {
			need, at = r, i
		}
	}
	if at < 0 {
		return Derived{}, inputErr("a", fmt.Errorf("no power on the common grid %v: %w", g, ErrBlack))
	}
	s := need
	if scale > 0 {
		// Relative slack of a few ulps of the ratio, for a caller who passes
		// back the scale this function returned.
		if scale < need*(1-4e-16) {
			return Derived{}, fmt.Errorf("%w: s = %g leaves the complement negative at %g nm (needs s ≥ %g)", ErrScale, scale, g.Wavelength(at), need)
		}
		s = scale
	}
	cv := make([]float64, len(av))
	for i := range cv {
		// s·I ≥ a holds exactly; clamp the round-off of the product.
		cv[i] = math.Max(0, s*iv[i]-math.Max(av[i], 0))
	}
	if scale == 0 {
		cv[at] = 0
	}
	c, err := colorimetry.NewSpectrumOnGrid(g, cv, colorimetry.Options{Interp: a.Interp(), Extrap: a.Extrap()})
	if err != nil {
		return Derived{}, err
	}
	d := Derived{Spectrum: c, Scale: s, Warnings: []string{}}
	if lo, nm := ra.Min(); lo < 0 {
		d.Warnings = append(d.Warnings, fmt.Sprintf("a dips below zero within noise (%g at %g nm); taken as zero power", lo, nm))
	}
	return d, nil
}

// ReflectanceComplement returns 1 − r, the additive complement of the
// reflectance r (fraction 0–1): the two add up to the perfect white at every
// wavelength, as the reflected and transmitted parts of a non-absorbing beam
// splitter do. The result is on r's grid with r's interpolation rules and
// Scale 1.
//
// (1 − T is not the subtractive partner of a filter T: stacked, T and
// 1 − T never give black. Use CheckSubtractive or Library.Partners.)
//
// It returns an error naming "r" for an empty or all-zero spectrum, one
// below zero by more than 0.01, or one above 1 by more than 0.01 (wrapping
// ErrAboveOne). Values outside 0–1 within that noise are kept, with a
// warning, so that r + (1 − r) stays exactly 1.
func ReflectanceComplement(r colorimetry.Spectrum) (Derived, error) {
	if err := checkSpectrum("r", r, Surfaces, r.Grid()); err != nil {
		return Derived{}, err
	}
	hi, nm := r.Max()
	if hi > 1+fractionNoise {
		return Derived{}, inputErr("r", fmt.Errorf("%w: %g at %g nm (fluorescent, or in percent?)", ErrAboveOne, hi, nm))
	}
	c, err := r.Map(func(_, v float64) float64 { return 1 - v })
	if err != nil {
		return Derived{}, inputErr("r", err)
	}
	d := Derived{Spectrum: c, Scale: 1, Warnings: []string{}}
	if hi > 1 {
		d.Warnings = append(d.Warnings, fmt.Sprintf("r exceeds 1 within noise (%g at %g nm): the complement is slightly negative there", hi, nm))
	}
	if lo, nm := r.Min(); lo < 0 {
		d.Warnings = append(d.Warnings, fmt.Sprintf("r dips below 0 within noise (%g at %g nm): the complement exceeds 1 there", lo, nm))
	}
	return d, nil
}
