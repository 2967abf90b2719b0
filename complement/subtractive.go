package complement

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
)

// Subtractive is the result of CheckSubtractive: what passes a stack of
// two filters or transparent inks.
type Subtractive struct {
	// Verdict is Black, Neutral or None.
	Verdict Verdict `json:"verdict"`
	// StackY is the luminous transmittance of the stack under the
	// illuminant, 0–100.
	StackY float64 `json:"stack_Y"`
	// StackChroma is the CIELAB chroma C*ab of the light that passes,
	// relative to the illuminant's white (Y = 100).
	StackChroma float64 `json:"stack_chroma"`
	// DeltaUVPrime is Δu′v′ between the light that passes and the white;
	// nil when the stack passes no light at all.
	DeltaUVPrime *float64 `json:"delta_uv_prime"`
	// Warnings are cautions about the data.
	Warnings []string `json:"warnings"`
}

// CheckSubtractive checks whether the filters (or transparent inks) a and
// b, stacked, cancel to black or a dark neutral under the conditions'
// illuminant. The stack transmits T = Ta^fa · Tb^fb, the factors
// opt.FactorA and opt.FactorB scaling each layer's thickness or
// concentration by Beer–Lambert (factor 2 squares the transmittance). Its
// luminous transmittance Y (0–100) and the chroma C*ab of what passes are
// object colorimetry under the illuminant; the verdict is Black for
// Y ≤ opt.BlackY, Neutral for Y ≤ opt.NeutralY with C*ab ≤
// opt.NeutralChroma, and None otherwise (two clear filters are not
// complements).
//
// Samples below zero within noise count as zero transmittance. It returns
// an error naming "a" or "b" for an empty or all-zero spectrum or one below
// zero by more than 0.01, and one wrapping ErrOptions for invalid options.
func (c *Conditions) CheckSubtractive(a, b colorimetry.Spectrum, opt Options) (Subtractive, error) {
	opt, err := opt.withDefaults()
	if err != nil {
		return Subtractive{}, err
	}
	res := Subtractive{Warnings: []string{}}
	stack := make([]float64, c.grid.N)
	for i := range stack {
		stack[i] = 1
	}
	for _, in := range []struct {
		name string
		s    colorimetry.Spectrum
		f    float64
	}{{"a", a, opt.FactorA}, {"b", b, opt.FactorB}} {
		if err := checkSpectrum(in.name, in.s, Filters, c.grid); err != nil {
			return Subtractive{}, err
		}
		r, err := in.s.Resample(c.grid)
		if err != nil {
			return Subtractive{}, inputErr(in.name, err)
		}
		clamped := false
		for i := range stack {
			v := r.Value(i)
			if v < 0 {
				v, clamped = 0, true
			}
			if in.f != 1 {
				v = math.Pow(v, in.f)
			}
			stack[i] *= v
		}
		if clamped {
			res.Warnings = append(res.Warnings, in.name+" dips below zero within noise; taken as zero transmittance there")
		}
	}
	s, err := colorimetry.NewSpectrumOnGrid(c.grid, stack, colorimetry.Options{Interp: colorimetry.InterpLinear})
	if err != nil {
		return Subtractive{}, fmt.Errorf("stack of a and b: %w", err)
	}
	x, err := c.objW.XYZ(s)
	if err != nil {
		return Subtractive{}, fmt.Errorf("stack of a and b: %w", err)
	}
	if err := c.fillStack(&res, x); err != nil {
		return Subtractive{}, err
	}
	res.Verdict = stackVerdict(res.StackY, res.StackChroma, opt)
	return res, nil
}

// fillStack sets StackY, StackChroma and DeltaUVPrime of res from the
// stack's tristimulus values x (object colorimetry, Y = 100 for clear).
func (c *Conditions) fillStack(res *Subtractive, x colorimetry.XYZ) error {
	lab, err := x.Lab(c.White(Filters))
	if err != nil {
		return fmt.Errorf("stack of a and b: %w", err)
	}
	res.StackY = x.Y
	res.StackChroma = lab.LCh().C
	if uv, err := x.UVPrime(); err == nil {
		d := colorimetry.DeltaUVPrime(uv, c.wuv[whiteIndex(Filters)])
		res.DeltaUVPrime = &d
	}
	return nil
}

// stackVerdict judges a stack of luminous transmittance y (0–100) and
// chroma ch by the thresholds of o.
func stackVerdict(y, ch float64, o Options) Verdict {
	switch {
	case y <= o.BlackY:
		return Black
	case y <= o.NeutralY && ch <= o.NeutralChroma:
		return Neutral
	}
	return None
}
