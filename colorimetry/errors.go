package colorimetry

import (
	"errors"
	"fmt"
)

// Sentinel errors. Functions wrap them in a *SampleError or return them
// with context; test with errors.Is.
var (
	// ErrNotFinite reports a NaN or infinite value.
	ErrNotFinite = errors.New("value is not finite")
	// ErrUnsorted reports wavelengths that are not strictly increasing.
	ErrUnsorted = errors.New("wavelengths are not strictly increasing")
	// ErrDuplicate reports a wavelength given twice.
	ErrDuplicate = errors.New("wavelength appears twice")
	// ErrTooFew reports a spectrum with fewer than three samples.
	ErrTooFew = errors.New("a spectrum needs at least 3 samples")
	// ErrLength reports wavelength and value slices of different lengths.
	ErrLength = errors.New("wavelength and value counts differ")
	// ErrCoverage reports a grid that does not reach a wavelength that is
	// needed, when extrapolation was refused.
	ErrCoverage = errors.New("wavelength outside the data's range")
	// ErrNoOverlap reports two spectra whose wavelength ranges do not overlap.
	ErrNoOverlap = errors.New("wavelength ranges do not overlap")
	// ErrZeroLuminance reports a colour or white with no luminance, for
	// which chromaticity or normalisation is undefined.
	ErrZeroLuminance = errors.New("zero luminance")
	// ErrNegative reports a reflectance or transmittance below zero by
	// more than measurement noise.
	ErrNegative = errors.New("negative value beyond noise")
	// ErrBadGrid reports a grid with a non-positive step or fewer than
	// three points.
	ErrBadGrid = errors.New("invalid wavelength grid")
)

// SampleError locates a data problem in a spectrum: the zero-based sample
// index and its wavelength in nm.
type SampleError struct {
	Index      int     // zero-based sample index
	Wavelength float64 // wavelength of the sample, nm
	Err        error   // one of the sentinel errors
}

func (e *SampleError) Error() string {
	return fmt.Sprintf("sample %d at %g nm: %v", e.Index+1, e.Wavelength, e.Err)
}

// Unwrap returns the underlying sentinel error.
func (e *SampleError) Unwrap() error { return e.Err }
