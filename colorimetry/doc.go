// Package colorimetry is antipode's spectral data model and everything
// computed from it: spectra on regular wavelength grids, observers,
// precomputed weighting tables, tristimulus values, chromaticity and, in
// later files, the colour spaces and differences built on them.
//
// Conventions, fixed once for the whole package:
//
//   - Wavelengths are in nanometres.
//   - Reflectance and transmittance are fractions 0–1. Object colours are
//     scaled so that the perfect diffuser has Y = 100 under the chosen
//     illuminant (k = 100 / Σ S ȳ Δλ, CIE 015:2018 §7).
//   - Lights are either relative (one stated scale for every light in one
//     comparison) or absolute, with Km = 683.002 lm/W.
//   - Chromaticity is CIE 1931 x, y and CIE 1976 u′, v′; CIE 1960 u, v is
//     used only where correlated colour temperature needs it.
//
// The package never imports the standard data in package cie: every
// function takes its observer, illuminant or weighting function as an
// argument. Values are immutable after construction and may be shared
// between goroutines.
//
// Data problems (non-finite values, unsorted wavelengths, too few samples, a
// grid that cannot cover another) are returned as errors that name the
// sample and wavelength; programmer mistakes in hot loops (a dst slice of
// the wrong length) panic, as in gonum. Results are not guaranteed to be
// bit-identical across architectures.
package colorimetry
