package complement

import "errors"

// Sentinel errors. Functions wrap them, usually in an *InputError that
// names the input; test with errors.Is. Problems that colorimetry already
// names (colorimetry.ErrNegative, colorimetry.ErrNoOverlap,
// colorimetry.ErrZeroLuminance, colorimetry.ErrTooFew) are wrapped as they
// are.
var (
	// ErrBlack reports a spectrum whose samples are all zero (or all at or
	// below zero): no light, or a perfect black, which has no chromaticity
	// and cannot take part in a complement.
	ErrBlack = errors.New("all samples are zero")
	// ErrAboveOne reports a reflectance above 1 by more than measurement
	// noise, whose additive complement 1 − r would be negative
	// (fluorescent material, or data in percent rather than 0–1).
	ErrAboveOne = errors.New("reflectance above 1 beyond noise")
	// ErrScale reports a scale factor s for the derived complement s·I − a
	// that is not finite, not positive, or too small to keep the
	// complement non-negative.
	ErrScale = errors.New("invalid scale for the complement")
	// ErrNoComplementaryWavelength reports a colour whose complement lies
	// on the purple line (a greenish colour) or a colour at the white
	// itself: no single wavelength complements it.
	ErrNoComplementaryWavelength = errors.New("no complementary wavelength")
	// ErrMode reports a Mode that does not apply to the check asked for.
	ErrMode = errors.New("mode does not apply")
	// ErrOptions reports an Options field that is negative, not finite or
	// inconsistent with another.
	ErrOptions = errors.New("invalid option")
)

// InputError names the input that a data problem was found in: "a", "b",
// "illuminant", "r", "s", "target", or `library entry 12 ("name")` (counted
// from 1) in a library.
type InputError struct {
	Input string // which input, as the caller passed it
	Err   error  // what is wrong with it
}

func (e *InputError) Error() string { return e.Input + ": " + e.Err.Error() }

// Unwrap returns the underlying error.
func (e *InputError) Unwrap() error { return e.Err }

// inputErr wraps err in an *InputError for input name.
func inputErr(name string, err error) error { return &InputError{Input: name, Err: err} }
