// Package cie provides the CIE standard data that antipode computes with:
// the CIE 1931 2° and CIE 1964 10° standard observers, the CIE standard and
// named illuminants (A, the D series, E, the fluorescent FL1–FL12 and the
// LED illuminants), Planckian radiators, the CIE 13.3 and CIE 224 colour
// samples, and the photopic, scotopic and α-opic weighting functions. All
// are built on the types of package colorimetry.
//
// # Units
//
// Wavelengths are in nanometres. Illuminants are relative spectral power
// distributions normalised to 100 at 560 nm (the CIE convention; the LED
// and fluorescent illuminants keep the CIE's own tabulated scale). Colour
// samples are spectral radiance factors, fractions 0–1. Colour-matching
// functions, luminous efficiencies and α-opic action spectra are
// dimensionless and peak at about 1.
//
// # Sources
//
// The tables are generated Go source (tables_gen.go, written by
// internal/gentables through go generate) with exactly the published
// digits of the CIE datasets; the library never reads data files at run
// time. shared/reference/PROVENANCE.md records where each table was read
// and how it was verified against the CIE's checksums.
//
//   - Observers: ISO/CIE 11664-1:2019 and CIE 015:2018, 360–830 nm at 1 nm;
//     CIE 018:2019 Table 6, dataset DOI 10.25039/CIE.DS.xvudnb9b (1931 2°),
//     and CIE dataset CIE_xyz_1964_10deg.csv (1964 10°).
//   - A: the defining formula of ISO/CIE 11664-2:2022 (Planck's law at
//     2848 K with c2 = 1.435×10⁻² m·K); the 1 nm table, dataset DOI
//     10.25039/CIE.DS.8jsxjrsn, is kept only to check it.
//   - D65: ISO/CIE 11664-2:2022 Table B.1, 300–830 nm at 1 nm, dataset DOI
//     10.25039/CIE.DS.hjfjmt59.
//   - D series (D50, D55, D75, any CCT 4000–25000 K): CIE 015:2018
//     from the components S0, S1, S2, 300–830 nm at 5 nm, dataset DOI
//     10.25039/CIE.DS.w7zunnny.
//   - FL1–FL12: CIE 015:2018 Tables 10.1–10.3, 380–780 nm at 5 nm, dataset
//     DOI 10.25039/CIE.DS.ukaymjdn.
//   - LED illuminants: CIE 015:2018 Tables 12.1–12.2, 380–780 nm at 5 nm,
//     dataset DOI 10.25039/CIE.DS.vgssnyfg.
//   - TCS01–TCS14: CIE 13.3-1995, 360–830 nm at 5 nm, dataset DOI
//     10.25039/CIE.DS.wuiuu9cz.
//   - CES 1–99: CIE 224:2017, 380–780 nm at 5 nm, dataset DOI
//     10.25039/CIE.DS.wi5idbqu.
//   - V(λ) = ȳ(λ) and V′(λ): CIE 018:2019 Tables 1 and 2, dataset DOIs
//     10.25039/CIE.DS.dktna2s3 and 10.25039/CIE.DS.gr6w4b5g.
//   - α-opic action spectra: CIE S 026/E:2018 Table 2, 380–780 nm at 1 nm,
//     dataset DOI 10.25039/CIE.DS.vqqhzp5a.
//
// # Grids and interpolation
//
// Every spectrum keeps the grid on which the CIE tabulates it, and carries
// the interpolation rule the CIE prescribes for it (CIE 015:2018 §7.2.2):
//
//   - the D series, D65 and the daylight components interpolate linearly,
//     as the CIE tabulates them;
//   - the fluorescent and LED illuminants interpolate linearly and are
//     best integrated on their own 5 nm grid (colorimetry.Grid5nm) with the
//     5 nm rows of the observer: line spectra are never interpolated by
//     Sprague;
//   - smooth data (observers, A, Planckian radiators, colour samples,
//     weighting functions) use the default, Sprague interpolation for
//     uniform data.
//
// Outside their range spectra repeat their end values (colorimetry's
// default), except the weighting functions V, V′ and the α-opic action
// spectra, which are zero there. The observer functions are zero outside
// 360–830 nm.
//
// The observers are built once and shared; every other function returns a
// new Spectrum, which is immutable. Everything here is safe for concurrent
// use.
package cie
