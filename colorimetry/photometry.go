package colorimetry

import (
	"errors"
	"fmt"
	"math"
)

// Photometry: quantities weighted by a spectral efficiency function that
// the caller passes in (the photopic V(λ), the scotopic V′(λ) or an α-opic
// action spectrum of CIE S 026/E:2018; package cie provides them). The
// package itself holds no weighting function.
//
// Integration follows the rest of the package: a weighted integral is the
// sum k·Σ S(λ)·v(λ)·Δλ on the computation grid of the spectrum
// (ComputationGrid: 380–780 nm at 5 nm for data at 5 nm, 360–830 nm at 1 nm
// otherwise), with the spectrum taken as zero outside its own range (a light
// emits nothing that was not measured) and the weighting function taken at
// its table rows. A radiant integral Σ S(λ)·Δλ runs over the spectrum's own
// samples, its measured range; to count radiant power over another range
// (380–780 nm, say), resample the spectrum onto it first.
//
// Units follow the input: a spectral radiant flux in W·nm⁻¹ gives a
// luminous flux in lm, a spectral irradiance in W·m⁻²·nm⁻¹ an illuminance
// in lx, a spectral radiance in W·sr⁻¹·m⁻²·nm⁻¹ a luminance in cd/m².
// Ratios (efficacy, S/P ratio, α-opic efficacy and DER) hold for relative
// spectra too.

// ErrNoPower reports a spectrum with no radiant power, or none that the
// weighting function sees, so that a ratio to it is undefined.
var ErrNoPower = errors.New("no radiant power")

// Efficiency is a spectral weighting function with the factor that turns
// its weighted integral into a photometric quantity: V(λ) with Km =
// 683.002 lm/W for photopic vision, V′(λ) with K′m = 1700.06 lm/W for
// scotopic vision (CIE 018:2019). It is a value; the zero Efficiency is
// invalid and every function given one returns an error.
type Efficiency struct {
	// V is the relative spectral efficiency, dimensionless, 1 at its
	// peak. It is taken as zero outside its own range.
	V Spectrum
	// K is the maximum luminous efficacy, lm/W.
	K float64
}

// check returns an error for an unusable Efficiency.
func (e Efficiency) check() error {
	if e.V.IsZero() {
		return errors.New("colorimetry: efficiency function is empty")
	}
	if !(e.K > 0) || math.IsInf(e.K, 0) {
		return fmt.Errorf("colorimetry: maximum efficacy %g lm/W must be positive and finite", e.K)
	}
	return nil
}

// Integral returns the photometric quantity of s, K·Σ S(λ)·V(λ)·Δλ on the
// computation grid of s: luminous flux (lm) for a spectral radiant flux in
// W·nm⁻¹, illuminance (lx) for a spectral irradiance in W·m⁻²·nm⁻¹,
// luminance (cd/m²) for a spectral radiance in W·sr⁻¹·m⁻²·nm⁻¹. It
// returns an error for an empty s or an invalid e.
func (e Efficiency) Integral(s Spectrum) (float64, error) {
	if err := e.check(); err != nil {
		return 0, err
	}
	v, err := weightedSum(s, e.V)
	if err != nil {
		return 0, err
	}
	return e.K * v, nil
}

// weightedSum returns Σ S(λ)·w(λ)·Δλ on the computation grid of s, with
// s zero outside its range and w by its own extrapolation rule.
func weightedSum(s, w Spectrum) (float64, error) {
	if s.IsZero() {
		return 0, fmt.Errorf("empty spectrum: %w", ErrTooFew)
	}
	if w.IsZero() {
		return 0, fmt.Errorf("empty weighting function: %w", ErrTooFew)
	}
	g := ComputationGrid(s.grid)
	sv := make([]float64, g.N)
	if err := resample(sv, s.grid, s.values, s.interp, ExtrapZero, g); err != nil {
		return 0, err
	}
	wv := make([]float64, g.N)
	if err := resample(wv, w.grid, w.values, w.interp, w.extrap, g); err != nil {
		return 0, fmt.Errorf("weighting function on %v: %w", g, err)
	}
	var sum float64
	for i, x := range sv {
		sum += x * wv[i]
	}
	sum *= g.Step
	if !isFinite(sum) {
		return 0, fmt.Errorf("weighted integral: %w", ErrNotFinite)
	}
	return sum, nil
}

// Radiant returns the radiometric quantity of s, Σ S(λ)·Δλ over its own
// samples: radiant flux (W) for a spectral radiant flux in W·nm⁻¹,
// irradiance (W/m²) for a spectral irradiance, radiance (W·sr⁻¹·m⁻²) for a
// spectral radiance. It returns an error for an empty s.
func Radiant(s Spectrum) (float64, error) {
	if s.IsZero() {
		return 0, fmt.Errorf("empty spectrum: %w", ErrTooFew)
	}
	var sum float64
	for _, v := range s.values {
		sum += v
	}
	return sum * s.grid.Step, nil
}

// EfficacyOfRadiation returns the luminous efficacy of radiation of s in
// lm/W, K = Km·Σ S V Δλ / Σ S Δλ (the definition of the International
// Lighting Vocabulary, CIE S 017; from memory): e.Integral(s) over
// Radiant(s). It is a ratio, so
// s may be relative. It is not the efficacy of a lamp, which divides by
// electrical power. It returns an error wrapping ErrNoPower when s has no
// positive radiant power, and the errors of Integral. Special cases are:
//
//	EfficacyOfRadiation(a line at the peak of V, e) = e.K
func EfficacyOfRadiation(s Spectrum, e Efficiency) (float64, error) {
	lum, err := e.Integral(s)
	if err != nil {
		return 0, err
	}
	p, err := Radiant(s)
	if err != nil {
		return 0, err
	}
	if !(p > 0) {
		return 0, fmt.Errorf("luminous efficacy of radiation: %w (Σ S Δλ = %g)", ErrNoPower, p)
	}
	return lum / p, nil
}

// SPRatio returns the scotopic to photopic ratio of s,
// K′m·Σ S V′ Δλ / (Km·Σ S V Δλ): scotopic.Integral(s) over
// photopic.Integral(s). Illuminant A gives about 1.41 and D65 about 2.46
// (computed from the CIE tables; see the tests). It returns an error
// wrapping ErrNoPower when s has no photopic luminance, and the errors of
// Integral.
func SPRatio(s Spectrum, photopic, scotopic Efficiency) (float64, error) {
	p, err := photopic.Integral(s)
	if err != nil {
		return 0, err
	}
	sc, err := scotopic.Integral(s)
	if err != nil {
		return 0, err
	}
	if !(p > 0) {
		return 0, fmt.Errorf("S/P ratio: %w (no photopic luminance)", ErrNoPower)
	}
	return sc / p, nil
}

// AlphaOpic is one α-opic quantity of CIE S 026/E:2018: an action spectrum
// s_α(λ), the photopic efficiency, and the α-opic efficacy of luminous
// radiation of D65, K_α,v^D65 (W/lm), computed from the tables given to
// NewAlphaOpic. It is a value and safe for concurrent use; the zero
// AlphaOpic is invalid. Build one with NewAlphaOpic.
type AlphaOpic struct {
	action   Spectrum
	photopic Efficiency
	d65      float64 // K_α,v^D65, W/lm
}

// NewAlphaOpic returns the α-opic quantity with action spectrum action
// (dimensionless, 1 at its peak, zero where undefined), photopic efficiency
// photopic (V(λ) with Km) and the spectrum of CIE standard illuminant D65,
// from which it computes K_α,v^D65 = Σ s_α S_D65 Δλ / (Km Σ V S_D65 Δλ)
// (CIE S 026/E:2018). With the CIE tables at 1 nm this is 0.8173, 1.4558,
// 1.6289, 1.4497 and 1.3262 mW/lm for the S-cone-opic, M-cone-opic,
// L-cone-opic, rhodopic and melanopic classes (see the tests). It returns
// an error for an empty action spectrum or D65, an invalid photopic
// efficiency, or a D65 that the action spectrum does not see.
func NewAlphaOpic(action Spectrum, photopic Efficiency, d65 Spectrum) (AlphaOpic, error) {
	a := AlphaOpic{action: action, photopic: photopic}
	k, err := a.elr(d65)
	if err != nil {
		return AlphaOpic{}, fmt.Errorf("α-opic efficacy of D65: %w", err)
	}
	if !(k > 0) {
		return AlphaOpic{}, fmt.Errorf("α-opic efficacy of D65: %w (the action spectrum does not see D65)", ErrNoPower)
	}
	a.d65 = k
	return a, nil
}

// D65Efficacy returns K_α,v^D65, the α-opic efficacy of luminous radiation
// of D65, W/lm (multiply by 1000 for the mW/lm of CIE S 026).
func (a AlphaOpic) D65Efficacy() float64 { return a.d65 }

// Irradiance returns the α-opic quantity of s, Σ S(λ)·s_α(λ)·Δλ on the
// computation grid of s: α-opic irradiance (W/m²) for a spectral
// irradiance in W·m⁻²·nm⁻¹, α-opic radiance (W·sr⁻¹·m⁻²) for a spectral
// radiance. It returns an error for an empty s or an invalid a.
func (a AlphaOpic) Irradiance(s Spectrum) (float64, error) {
	if a.action.IsZero() {
		return 0, errors.New("colorimetry: α-opic quantity without an action spectrum (use NewAlphaOpic)")
	}
	return weightedSum(s, a.action)
}

// elr returns the α-opic efficacy of luminous radiation of s, W/lm.
func (a AlphaOpic) elr(s Spectrum) (float64, error) {
	e, err := a.Irradiance(s)
	if err != nil {
		return 0, err
	}
	v, err := a.photopic.Integral(s)
	if err != nil {
		return 0, err
	}
	if !(v > 0) {
		return 0, fmt.Errorf("α-opic efficacy: %w (no photopic luminance)", ErrNoPower)
	}
	return e / v, nil
}

// ELR returns the α-opic efficacy of luminous radiation of s,
// K_α,v = Σ s_α S Δλ / (Km Σ V S Δλ), in W/lm. It is a ratio, so s may be
// relative. It returns an error wrapping ErrNoPower when s has no photopic
// luminance.
func (a AlphaOpic) ELR(s Spectrum) (float64, error) {
	if a.d65 == 0 {
		return 0, errors.New("colorimetry: α-opic quantity not built by NewAlphaOpic")
	}
	return a.elr(s)
}

// EDI returns the α-opic equivalent daylight (D65) illuminance of s in lx,
// E_α / K_α,v^D65 (CIE S 026/E:2018): the illuminance of D65 that gives
// the same α-opic irradiance. s must be a spectral irradiance in
// W·m⁻²·nm⁻¹ (a spectral radiance gives the equivalent daylight luminance,
// cd/m²). It returns the errors of Irradiance.
func (a AlphaOpic) EDI(s Spectrum) (float64, error) {
	if a.d65 == 0 {
		return 0, errors.New("colorimetry: α-opic quantity not built by NewAlphaOpic")
	}
	e, err := a.Irradiance(s)
	if err != nil {
		return 0, err
	}
	return e / a.d65, nil
}

// DER returns the α-opic daylight (D65) efficacy ratio of s,
// K_α,v / K_α,v^D65 (CIE S 026/E:2018): the α-opic EDI per lux of
// illuminance. It is a ratio, so s may be relative. Special cases are:
//
//	DER(D65) = 1 (by definition)
func (a AlphaOpic) DER(s Spectrum) (float64, error) {
	k, err := a.ELR(s)
	if err != nil {
		return 0, err
	}
	return k / a.d65, nil
}
