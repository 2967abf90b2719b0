// Package complement derives and checks complementary colours.
//
// Additive complements add up to the white: lights (Mode Lights; the white
// is the illuminant's spectral power distribution) or reflectances mixed
// optically (Mode Surfaces; spectrally the perfect white 1, colorimetrically
// XYZ(a) + XYZ(b) against the illuminant's white point). Subtractive
// complements stack to black or a dark neutral: filters or transparent inks
// (Mode Filters; T = Ta^fa·Tb^fb, with Beer–Lambert factors fa, fb).
//
// Conditions fix the observer, the illuminant and the computation grid, and
// precompute the weighting tables. LightComplement and
// ReflectanceComplement derive complements. CheckAdditive, MixRatio and
// CheckSubtractive check a pair. ComplementaryWavelength gives λc and the
// radiant power of the line at λc. Library.Partners ranks a library.
// Robustness repeats a check under other illuminants and observers.
// WithinProbability and Conditions.Confidence give the probability that a
// measured pair is within tolerance. ComplementaryWavelengths tabulates
// complementary wavelength pairs for a white. ObjectSolid holds the
// boundary of the object-colour solid (optimal colours, MacAdam limits):
// Realisable, MaxChroma, MaxLuminance and Boundary.
//
// Units: wavelengths in nm; reflectance and transmittance as fractions 0–1;
// object Y and stack luminous transmittance 0–100; Δu′v′ in the CIE 1976
// diagram; Duv in CIE 1960; ΔE00 in CIE units; spectral residuals as
// fractions of the peak of the scaled white. Default tolerances: spectral
// RMS 0.01 of the peak, Δu′v′ 0.001 (about one just-noticeable step between
// whites, common practice), black Y ≤ 1, neutral 1 < Y ≤ 20 with C*ab ≤ 2.
//
// Data problems are errors naming the input (InputError); results carry
// Warnings. The package imports colorimetry and cie only, never mixing.
package complement
