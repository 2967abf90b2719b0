// Package complement derives and checks complementary colours: additive
// complements (two lights, or two surfaces mixed optically, that add up to
// the white of a reference illuminant) and subtractive complements (two
// filters or transparent inks that, stacked, pass black or a neutral grey).
//
// It builds on package colorimetry for the spectral maths and on package
// cie for standard data; it never imports package mixing. Conventions are
// those of colorimetry: wavelengths in nm, fractions 0–1, object Y = 100,
// Δu′v′ in the CIE 1976 diagram.
//
// The checks themselves arrive with the complement issue; this file fixes
// the package's place in the layout.
package complement
