package complement

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
)

// WavelengthPair is one row of a table of complementary wavelengths: a
// monochromatic stimulus at Nm and the monochromatic stimulus at
// ComplementNm that, added to it in the right amount, matches the white in
// chromaticity.
type WavelengthPair struct {
	// Nm is the wavelength λ of the first stimulus, nm.
	Nm float64
	// HasComplement is false when the line from the locus point at λ
	// through the white meets the purple line instead of the spectrum
	// locus (for daylight whites and the CIE 1931 observer, λ between
	// about 493 and 567 nm): no monochromatic stimulus complements λ, and
	// the three fields below are zero (null in JSON).
	HasComplement bool
	// ComplementNm is the complementary wavelength λc, nm.
	ComplementNm float64
	// PowerRatio is P(λc)/P(λ), the ratio of the radiant powers of the two
	// monochromatic stimuli (equal-power units: the same units of
	// radiant power at both wavelengths) such that P(λ)·δ(λ) +
	// P(λc)·δ(λc) has the white's chromaticity. Dimensionless, > 0.
	PowerRatio float64
	// LuminanceRatio is the ratio of the luminances of the two stimuli in
	// that mixture, PowerRatio·ȳ(λc)/ȳ(λ). Dimensionless, > 0.
	LuminanceRatio float64
}

// MarshalJSON encodes the pair with keys wavelength_nm,
// complement_nm, power_ratio and luminance_ratio; the last three are
// null when HasComplement is false.
func (p WavelengthPair) MarshalJSON() ([]byte, error) {
	type row struct {
		Nm             float64  `json:"wavelength_nm"`
		ComplementNm   *float64 `json:"complement_nm"`
		PowerRatio     *float64 `json:"power_ratio"`
		LuminanceRatio *float64 `json:"luminance_ratio"`
	}
	r := row{Nm: p.Nm}
	if p.HasComplement {
		r.ComplementNm, r.PowerRatio, r.LuminanceRatio = &p.ComplementNm, &p.PowerRatio, &p.LuminanceRatio
	}
	return json.Marshal(r)
}

// ComplementaryPair returns the complementary wavelength of the
// monochromatic stimulus at nm (nm) relative to the white of chromaticity
// white for the observer obs, with the power and luminance ratios of the
// mixture of the two stimuli that matches the white (see WavelengthPair).
//
// The complementary wavelength λc is the one where the line from the
// stimulus through the white meets the spectrum locus again (CIE 015:2018
// §9.1). It is found as ComplementaryWavelength finds it: on the observer's
// spectrum locus (colorimetry.SpectrumLocus), then refined on the
// observer's own interpolated colour-matching functions so that x̄, ȳ, z̄
// at λc lie in the plane of x̄, ȳ, z̄ at λ and the white's tristimulus
// direction.
//
// The power ratio t solves XYZ(λ) + t·XYZ(λc) ∝ W with XYZ(λ) = (x̄(λ),
// ȳ(λ), z̄(λ)) and W the white's tristimulus values (x/y, 1, z/y). The three
// vectors are coplanar by construction, so the problem has an exact
// solution; it is taken by least squares in the components normal to W:
// with a = XYZ(λ), b = XYZ(λc), t = −(a×W)·(b×W) / |b×W|², which minimises
// |(a + t·b)×W|, the departure of the mixture from the white's direction.
//
// Where the spectrum locus stands still (CIE 1931 beyond 699 nm, where x
// stays 0.73469), a stimulus there has the complementary wavelength of
// the locus end, and a complement that falls there is placed near 699 nm;
// its power ratio then depends on that choice.
//
// It returns an error for a nil observer, one wrapping
// colorimetry.ErrNotFinite for a non-finite nm or white,
// colorimetry.ErrCoverage for nm outside the observer's table,
// colorimetry.ErrZeroLuminance where the observer has no response at nm,
// and colorimetry.ErrOutOfGamut for a white outside the spectrum locus
// (or on it at nm).
func ComplementaryPair(obs *colorimetry.Observer, white colorimetry.XY, nm float64) (WavelengthPair, error) {
	if obs == nil {
		return WavelengthPair{}, errors.New("complement: nil observer")
	}
	w, err := whiteXYZ(white)
	if err != nil {
		return WavelengthPair{}, err
	}
	return complementaryPair(obs, w, nm)
}

// whiteXYZ returns the tristimulus values with Y = 1 of the white of
// chromaticity white, or an error for a non-finite white or one with
// y ≤ 0.
func whiteXYZ(white colorimetry.XY) (colorimetry.XYZ, error) {
	if math.IsNaN(white.X) || math.IsInf(white.X, 0) || math.IsNaN(white.Y) || math.IsInf(white.Y, 0) {
		return colorimetry.XYZ{}, fmt.Errorf("white point (%g, %g): %w", white.X, white.Y, colorimetry.ErrNotFinite)
	}
	if !(white.Y > 0) {
		return colorimetry.XYZ{}, fmt.Errorf("white point (%g, %g): %w (y ≤ 0)", white.X, white.Y, colorimetry.ErrOutOfGamut)
	}
	return white.XYZ(1)
}

// complementaryPair is ComplementaryPair with the white's tristimulus
// values w already checked.
func complementaryPair(obs *colorimetry.Observer, w colorimetry.XYZ, nm float64) (WavelengthPair, error) {
	if math.IsNaN(nm) || math.IsInf(nm, 0) {
		return WavelengthPair{}, fmt.Errorf("complementary wavelength of %g nm: %w", nm, colorimetry.ErrNotFinite)
	}
	if g := obs.Grid(); !g.Contains(nm) {
		return WavelengthPair{}, fmt.Errorf("complementary wavelength of %g nm: %w (%s tabulated %g–%g nm)", nm, colorimetry.ErrCoverage, obs.Name(), g.Start, g.End())
	}
	ax, ay, az := obs.At(nm)
	a := colorimetry.XYZ{X: ax, Y: ay, Z: az}
	if !(ay > 0) || !(ax+ay+az > 0) {
		return WavelengthPair{}, fmt.Errorf("complementary wavelength of %g nm: %s has no luminance there: %w", nm, obs.Name(), colorimetry.ErrZeroLuminance)
	}
	axy, err := a.XY()
	if err != nil {
		return WavelengthPair{}, fmt.Errorf("complementary wavelength of %g nm: %w", nm, err)
	}
	wxy, _ := w.XY() // w has Y = 1 and a finite, positive y: no error
	if math.Hypot(axy.X-wxy.X, axy.Y-wxy.Y) < 1e-12 {
		return WavelengthPair{}, fmt.Errorf("complementary wavelength of %g nm: white point (%g, %g) on the spectrum locus: %w", nm, wxy.X, wxy.Y, colorimetry.ErrOutOfGamut)
	}
	p := WavelengthPair{Nm: nm}
	cnm, b, err := complementaryLine(obs, a, w)
	switch {
	case errors.Is(err, ErrNoComplementaryWavelength):
		return p, nil // the complement lies on the purple line
	case err != nil:
		return WavelengthPair{}, fmt.Errorf("complementary wavelength of %g nm: %w", nm, err)
	}
	t := -planeCoefficient(a, b, w)
	if !(t > 0) || math.IsInf(t, 0) || !(b.Y > 0) {
		// complementaryLine has checked that b lies beyond the white from
		// a, so this reports degenerate functions at λc.
		return WavelengthPair{}, fmt.Errorf("complementary wavelength of %g nm: power ratio %g at %g nm: %w", nm, t, cnm, colorimetry.ErrZeroLuminance)
	}
	p.HasComplement = true
	p.ComplementNm = cnm
	p.PowerRatio = t
	p.LuminanceRatio = t * b.Y / a.Y
	return p, nil
}

// ComplementaryWavelengths returns the table of complementary wavelengths
// relative to the white of chromaticity white for the observer obs, one
// row for each wavelength of the grid g (nm): see ComplementaryPair. Rows
// whose complement lies on the purple line have HasComplement false.
//
// It returns an error wrapping colorimetry.ErrBadGrid for an invalid grid
// and the errors of ComplementaryPair, naming the first wavelength that
// fails (a grid reaching beyond the observer's table, 360–830 nm for the
// CIE observers, fails there).
func ComplementaryWavelengths(obs *colorimetry.Observer, white colorimetry.XY, g colorimetry.Grid) ([]WavelengthPair, error) {
	if obs == nil {
		return nil, errors.New("complement: nil observer")
	}
	if !g.Valid() {
		return nil, fmt.Errorf("complementary wavelength table: %w: %+v", colorimetry.ErrBadGrid, g)
	}
	w, err := whiteXYZ(white)
	if err != nil {
		return nil, err
	}
	rows := make([]WavelengthPair, g.N)
	for i := range rows {
		if rows[i], err = complementaryPair(obs, w, g.Wavelength(i)); err != nil {
			return nil, err
		}
	}
	return rows, nil
}
