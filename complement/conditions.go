package complement

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
)

// Mode says what kind of spectra a check combines and how.
type Mode int

const (
	// Lights are spectral power distributions (any one scale shared by
	// both lights) added together. The white is the illuminant's own
	// spectral power distribution; colorimetry is that of lights
	// (colorimetry.NewLightWeights), and the scale of the illuminant
	// relative to the lights does not matter.
	Lights Mode = iota
	// Surfaces are reflectances (fractions 0–1) mixed optically: side by
	// side below the eye's resolution, on a spinning disc, or through a
	// non-absorbing beam splitter. Spectrally the white is the perfect
	// diffuser, 1 at every wavelength; colorimetrically a + b is compared,
	// as XYZ(a) + XYZ(b) under the illuminant, with the illuminant's white
	// point (object colorimetry, Y = 100 for the perfect diffuser).
	Surfaces
	// Filters are transmittances (fractions 0–1) stacked: the light that
	// passes both is I·Ta·Tb. Their check is CheckSubtractive; the white is
	// the illuminant's white point (Y = 100 for the empty stack).
	Filters
)

// String returns "lights", "surfaces" or "filters".
func (m Mode) String() string {
	switch m {
	case Lights:
		return "lights"
	case Surfaces:
		return "surfaces"
	case Filters:
		return "filters"
	}
	return fmt.Sprintf("Mode(%d)", int(m))
}

// MarshalText encodes the mode as its String, for JSON.
func (m Mode) MarshalText() ([]byte, error) {
	if !m.valid() {
		return nil, fmt.Errorf("%w: %v", ErrMode, m)
	}
	return []byte(m.String()), nil
}

// ParseMode returns the mode named s ("lights", "surfaces" or "filters",
// case-insensitive). Other names give an error wrapping ErrMode.
func ParseMode(s string) (Mode, error) {
	for _, m := range []Mode{Lights, Surfaces, Filters} {
		if strings.EqualFold(strings.TrimSpace(s), m.String()) {
			return m, nil
		}
	}
	return 0, fmt.Errorf("%w: unknown mode %q (want lights, surfaces or filters)", ErrMode, s)
}

func (m Mode) valid() bool { return m >= Lights && m <= Filters }

// Verdict is the outcome of a complement check, one of the constants
// below. Its string value is the word used in JSON.
type Verdict string

// Verdicts of the additive check (Spectral, Metameric, None) and of the
// subtractive check (Black, Neutral, None).
const (
	// Spectral: the sum matches a scaled white spectrally (RMS residual
	// within tolerance) and in chromaticity.
	Spectral Verdict = "spectral"
	// Metameric: the sum has the white's chromaticity (Δu′v′ within
	// tolerance) but not its spectrum, so the match may fail under another
	// illuminant or for another observer.
	Metameric Verdict = "metameric"
	// None: not complements within the tolerances.
	None Verdict = "none"
	// Black: the stack passes almost nothing (luminous transmittance Y at
	// most Options.BlackY).
	Black Verdict = "black"
	// Neutral: the stack passes a dark grey (Y at most Options.NeutralY
	// and chroma C*ab at most Options.NeutralChroma).
	Neutral Verdict = "neutral"
)

// Defaults of Options, used where a field is zero.
const (
	// DefaultSpectralRMS is the largest RMS spectral residual, as a
	// fraction of the peak of the scaled white, of a spectral complement:
	// 0.01, common practice (no source) for spectrophotometric agreement.
	DefaultSpectralRMS = 0.01
	// DefaultDeltaUVPrime is the largest Δu′v′ of a colorimetric
	// complement: 0.001, common practice (no source): about one
	// just-noticeable step between whites.
	DefaultDeltaUVPrime = 0.001
	// DefaultBlackY is the largest luminous transmittance Y (0–100) of a
	// stack judged black: 1, common practice (no source).
	DefaultBlackY = 1
	// DefaultNeutralY is the largest Y (0–100) of a stack judged a dark
	// neutral: 20, common practice (no source).
	DefaultNeutralY = 20
	// DefaultNeutralChroma is the largest CIELAB chroma C*ab of a stack
	// judged neutral: 2, common practice (no source).
	DefaultNeutralChroma = 2
)

// Noise limits for input spectra, common practice (no source): a
// reflectance or transmittance may dip below zero by 0.01 (spectrophotometer
// noise near black), a light by 1 % of its peak.
const (
	fractionNoise = 0.01
	lightNoise    = 0.01
)

// Options are the tolerances and layer factors of the checks. The zero
// value gives the defaults; a zero field means its default.
type Options struct {
	// SpectralRMS is the largest RMS spectral residual of a spectral
	// complement, a fraction of the peak of the scaled white; zero means
	// DefaultSpectralRMS.
	SpectralRMS float64
	// DeltaUVPrime is the largest Δu′v′ of a colorimetric complement;
	// zero means DefaultDeltaUVPrime.
	DeltaUVPrime float64
	// BlackY is the largest luminous transmittance Y (0–100) of a stack
	// judged black; zero means DefaultBlackY.
	BlackY float64
	// NeutralY is the largest Y (0–100) of a stack judged a dark neutral;
	// zero means DefaultNeutralY. It must not be below BlackY.
	NeutralY float64
	// NeutralChroma is the largest chroma C*ab of a neutral stack; zero
	// means DefaultNeutralChroma.
	NeutralChroma float64
	// FactorA and FactorB are Beer–Lambert factors (relative thickness or
	// concentration) of the two layers of a stack: a layer of
	// transmittance T counts as T^f. Zero means 1.
	FactorA, FactorB float64
}

// withDefaults returns o with zero fields set to their defaults, or an
// error wrapping ErrOptions for a negative or non-finite field.
func (o Options) withDefaults() (Options, error) {
	fields := []struct {
		name string
		v    *float64
		def  float64
	}{
		{"SpectralRMS", &o.SpectralRMS, DefaultSpectralRMS},
		{"DeltaUVPrime", &o.DeltaUVPrime, DefaultDeltaUVPrime},
		{"BlackY", &o.BlackY, DefaultBlackY},
		{"NeutralY", &o.NeutralY, DefaultNeutralY},
		{"NeutralChroma", &o.NeutralChroma, DefaultNeutralChroma},
		{"FactorA", &o.FactorA, 1},
		{"FactorB", &o.FactorB, 1},
	}
	for _, f := range fields {
		switch {
		case math.IsNaN(*f.v) || math.IsInf(*f.v, 0) || *f.v < 0:
			return o, fmt.Errorf("%w: %s = %g must be positive and finite", ErrOptions, f.name, *f.v)
		case *f.v == 0:
			*f.v = f.def
		}
	}
	if o.NeutralY < o.BlackY {
		return o, fmt.Errorf("%w: NeutralY %g is below BlackY %g", ErrOptions, o.NeutralY, o.BlackY)
	}
	return o, nil
}

// Conditions fix the observer, the illuminant (the white) and the
// computation grid of a set of checks, with everything precomputed from
// them: weighting tables for lights and for object colours, both whites and
// the observer's Planckian table. Conditions are immutable and safe for
// concurrent use.
type Conditions struct {
	obs   *colorimetry.Observer
	ill   colorimetry.Spectrum // as given, for spectral comparisons
	grid  colorimetry.Grid
	illG  []float64 // the illuminant on grid
	objW  *colorimetry.Weights
	litW  *colorimetry.Weights
	white [2]colorimetry.XYZ     // indexed by whiteIndex(mode)
	wuv   [2]colorimetry.UVPrime // chromaticity of white
	kObj  float64                // 100 / Σ S ȳ Δλ, for a line added to a surface colour
	table *colorimetry.PlanckianTable
}

// NewConditions returns the conditions for observer obs and illuminant
// ill (a relative spectral power distribution) on the computation grid that
// suits the illuminant's data (colorimetry.ComputationGrid): 380–780 nm at
// 5 nm for data at 5 nm, such as the CIE fluorescent and LED illuminants,
// and 360–830 nm at 1 nm otherwise. It returns an error naming the
// "illuminant" when it is empty, negative beyond 1 % of its peak, or
// without luminance.
func NewConditions(obs *colorimetry.Observer, ill colorimetry.Spectrum) (*Conditions, error) {
	if ill.IsZero() {
		return nil, inputErr("illuminant", fmt.Errorf("empty spectrum: %w", colorimetry.ErrTooFew))
	}
	return NewConditionsOnGrid(obs, ill, colorimetry.ComputationGrid(ill.Grid()))
}

// NewConditionsOnGrid is NewConditions on the computation grid g, such as
// the grid of a library of spectra measured at 10 nm. Every spectrum is
// resampled onto g by its own interpolation and extrapolation rules before
// its tristimulus values are summed.
func NewConditionsOnGrid(obs *colorimetry.Observer, ill colorimetry.Spectrum, g colorimetry.Grid) (*Conditions, error) {
	if obs == nil {
		return nil, errors.New("complement: nil observer")
	}
	if !g.Valid() {
		return nil, fmt.Errorf("computation grid: %w: %+v", colorimetry.ErrBadGrid, g)
	}
	if err := checkSpectrum("illuminant", ill, Lights, g); err != nil {
		return nil, err
	}
	c := &Conditions{obs: obs, ill: ill, grid: g}
	r, err := ill.Resample(g)
	if err != nil {
		return nil, inputErr("illuminant", err)
	}
	c.illG = r.Values(nil)
	if c.objW, err = colorimetry.NewObjectWeights(obs, ill, g); err != nil {
		return nil, inputErr("illuminant", err)
	}
	if c.litW, err = colorimetry.NewLightWeights(obs, g); err != nil {
		return nil, err
	}
	c.white[whiteIndex(Surfaces)] = c.objW.White()
	wl, err := c.litW.XYZ(ill)
	if err != nil {
		return nil, inputErr("illuminant", err)
	}
	if !(wl.Y > 0) {
		return nil, inputErr("illuminant", fmt.Errorf("white Y = %g: %w", wl.Y, colorimetry.ErrZeroLuminance))
	}
	c.white[whiteIndex(Lights)] = wl
	for i, w := range c.white {
		if c.wuv[i], err = w.UVPrime(); err != nil {
			return nil, inputErr("illuminant", err)
		}
	}
	// Object weights are k·S·x̄·Δλ and light weights Km·x̄·Δλ, so the
	// illuminant's light Y is Km·Σ S ȳ Δλ = 100·Km / k.
	c.kObj = 100 * colorimetry.Km / wl.Y
	if c.table, err = colorimetry.NewPlanckianTable(obs, colorimetry.C2); err != nil {
		return nil, err
	}
	return c, nil
}

// whiteIndex maps Lights to 0 and the object modes to 1.
func whiteIndex(m Mode) int {
	if m == Lights {
		return 0
	}
	return 1
}

// Grid returns the computation grid.
func (c *Conditions) Grid() colorimetry.Grid { return c.grid }

// Observer returns the observer.
func (c *Conditions) Observer() *colorimetry.Observer { return c.obs }

// Illuminant returns the illuminant as it was given.
func (c *Conditions) Illuminant() colorimetry.Spectrum { return c.ill }

// White returns the white of mode m: for Lights the tristimulus values of
// the illuminant as a light (Km = 683.002 lm/W times the relative units of
// the illuminant), for Surfaces and Filters the white point, Y = 100.
func (c *Conditions) White(m Mode) colorimetry.XYZ { return c.white[whiteIndex(m)] }

// weights returns the weighting table of mode m.
func (c *Conditions) weights(m Mode) *colorimetry.Weights {
	if m == Lights {
		return c.litW
	}
	return c.objW
}

// XYZ returns the tristimulus values of s in mode m: as a light for
// Lights, as a reflectance or transmittance under the illuminant (Y = 100
// for the perfect diffuser) for Surfaces and Filters. The spectrum is not
// validated; it is resampled onto the computation grid by its own rules.
func (c *Conditions) XYZ(s colorimetry.Spectrum, m Mode) (colorimetry.XYZ, error) {
	return c.weights(m).XYZ(s)
}

// checkSpectrum validates the input called name for mode m on the
// computation grid g: not empty, overlapping g, not all zero, and not
// negative beyond noise (1 % of the peak for lights, 0.01 for fractions).
func checkSpectrum(name string, s colorimetry.Spectrum, m Mode, g colorimetry.Grid) error {
	if s.IsZero() {
		return inputErr(name, fmt.Errorf("empty spectrum: %w", colorimetry.ErrTooFew))
	}
	sg := s.Grid()
	if sg.End() < g.Start || sg.Start > g.End() {
		return inputErr(name, fmt.Errorf("%w: data %v, computation grid %v", colorimetry.ErrNoOverlap, sg, g))
	}
	peak, _ := s.Max()
	if !(peak > 0) {
		return inputErr(name, ErrBlack)
	}
	if m == Lights {
		lo, nm := s.Min()
		if lo < -lightNoise*peak {
			i := int(math.Round((nm - sg.Start) / sg.Step))
			return inputErr(name, &colorimetry.SampleError{Index: i, Wavelength: nm,
				Err: fmt.Errorf("%w (%g is more than 1 %% of the peak %g below zero)", colorimetry.ErrNegative, lo, peak)})
		}
		return nil
	}
	if err := s.CheckFraction(fractionNoise); err != nil {
		return inputErr(name, err)
	}
	return nil
}

// checkMode returns an error wrapping ErrMode unless m is one of allowed.
func checkMode(m Mode, what string, allowed ...Mode) error {
	for _, a := range allowed {
		if m == a {
			return nil
		}
	}
	return fmt.Errorf("%w: %s takes %v, not %v", ErrMode, what, allowed, m)
}
