// Package rendering computes the colour rendering and colour fidelity of a
// light: the general and special colour rendering indices Ra and R1–R14 of
// CIE 13.3-1995, and the colour fidelity index Rf with its 99 per-sample
// values Rf,i of CIE 224:2017. Both compare the colours of standard samples
// lit by the light under test with their colours under a reference
// illuminant of the same correlated colour temperature.
//
// # Conventions
//
//   - Lights are relative or absolute spectral power distributions; only
//     their shape matters. Wavelengths are in nanometres.
//   - Both indices are computed on 380–780 nm at 5 nm (colorimetry.Grid5nm),
//     the grid on which the CIE tabulates the test colour samples (TCS) and
//     the colour evaluation samples (CES), with the 5 nm rows of the CIE
//     observer tables. A light sampled at 5 nm is used as it is; one
//     sampled more finely is reduced to 5 nm by a triangular band pass of
//     5 nm half-width, so that narrow lines between the 5 nm nodes keep
//     their power; a coarser one is interpolated by its own rule. The light
//     is zero outside its own range.
//   - Correlated colour temperature and Duv are those of the light on that
//     grid with the CIE 1931 observer (Ohno 2014), as both standards
//     choose their reference by the CIE 1931 CCT.
//   - Indices are returned unrounded; the CIE reports them rounded to
//     integers (Ra, Ri) or one decimal (Rf).
//
// # Validity
//
// CIE 13.3 holds Ra meaningful only for lights within 5.4×10⁻³ of the
// Planckian locus in the CIE 1960 UCS diagram; beyond that the index is
// still computed and a warning is returned with it. Outside the range where
// a correlated colour temperature is defined (1000–100 000 K, |Duv| ≤ 0.05,
// CIE 015:2018) there is no reference illuminant, and the functions return
// an error wrapping colorimetry.ErrCCTRange; above 25 000 K, where the CIE
// daylight series ends, one wrapping ErrNoReference.
//
// The package imports cie for the samples and observers; it never prints.
// Everything here is safe for concurrent use.
package rendering
