package complement

import (
	"errors"
	"fmt"

	"github.com/antipode-color/antipode/colorimetry"
)

// Outcome is the verdict of one check under one illuminant and observer.
type Outcome struct {
	// Illuminant and Observer name the conditions.
	Illuminant string `json:"illuminant"`
	Observer   string `json:"observer"`
	// Verdict is that of CheckAdditive (Lights, Surfaces) or
	// CheckSubtractive (Filters) under these conditions.
	Verdict Verdict `json:"verdict"`
	// DeltaUVPrime is Δu′v′ from the white: of the sum (additive) or of
	// the light the stack passes (Filters; nil when it passes none).
	DeltaUVPrime *float64 `json:"delta_uv_prime"`
	// StackY is the stack's luminous transmittance, 0–100 (Filters only;
	// nil otherwise).
	StackY *float64 `json:"stack_Y"`
	// Warnings are those of the check under these conditions.
	Warnings []string `json:"warnings"`
}

// Robustness repeats the check of a and b in mode m (CheckAdditive for
// Lights and Surfaces, CheckSubtractive for Filters) under every
// illuminant and observer given, illuminant by illuminant and, for each,
// observer by observer, on each illuminant's own computation grid (see
// NewConditions). A spectral complement holds everywhere; a metameric one
// holds only near the conditions it was made for, and the outcomes show
// where it breaks (verdict None).
//
// For Lights each illuminant is a different target white; for Surfaces
// and Filters it lights the pair.
//
// It returns an error when no illuminant or no observer is given or an
// observer is nil, an error naming the illuminant for a bad illuminant,
// and the errors of the check for bad a or b.
func Robustness(a, b colorimetry.Spectrum, m Mode, ills []colorimetry.NamedIlluminant, observers []*colorimetry.Observer, opt Options) ([]Outcome, error) {
	if !m.valid() {
		return nil, fmt.Errorf("%w: %v", ErrMode, m)
	}
	if len(ills) == 0 || len(observers) == 0 {
		return nil, errors.New("robustness: needs at least one illuminant and one observer")
	}
	for i, o := range observers {
		if o == nil {
			return nil, fmt.Errorf("robustness: observer %d is nil", i+1)
		}
	}
	out := make([]Outcome, 0, len(ills)*len(observers))
	for _, ill := range ills {
		for _, obs := range observers {
			c, err := NewConditions(obs, ill.Spectrum)
			if err != nil {
				return nil, fmt.Errorf("illuminant %q: %w", ill.Name, err)
			}
			o := Outcome{Illuminant: ill.Name, Observer: obs.Name()}
			if m == Filters {
				r, err := c.CheckSubtractive(a, b, opt)
				if err != nil {
					return nil, err
				}
				y := r.StackY
				o.Verdict, o.DeltaUVPrime, o.StackY, o.Warnings = r.Verdict, r.DeltaUVPrime, &y, r.Warnings
			} else {
				r, err := c.CheckAdditive(a, b, m, opt)
				if err != nil {
					return nil, err
				}
				d := r.DeltaUVPrime
				o.Verdict, o.DeltaUVPrime, o.Warnings = r.Verdict, &d, r.Warnings
			}
			out = append(out, o)
		}
	}
	return out, nil
}
