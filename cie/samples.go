package cie

import (
	"fmt"

	"github.com/antipode-color/antipode/colorimetry"
)

// Sizes of the CIE sample sets.
const (
	NumTCS = 14 // CIE 13.3-1995 test colour samples
	NumCES = 99 // CIE 224:2017 colour evaluation samples
)

// TCS returns the spectral radiance factor (fraction 0–1) of CIE 13.3-1995
// test colour sample n, n = 1…14 (TCS01–TCS08 for the general colour
// rendering index Ra, TCS09–TCS14 for the special indices), at 5 nm from
// 360 to 830 nm (CIE dataset CIE_srf_cri.csv, DOI 10.25039/CIE.DS.wuiuu9cz).
// It interpolates by the default rule for smooth reflectances. It returns
// an error wrapping ErrRange for another n.
func TCS(n int) (colorimetry.Spectrum, error) {
	if n < 1 || n > NumTCS {
		return colorimetry.Spectrum{}, fmt.Errorf("test colour sample TCS%02d: %w (TCS01–TCS%02d)", n, ErrRange, NumTCS)
	}
	return tabTCS.spectrum(n-1, colorimetry.Options{}), nil
}

// CES returns the spectral radiance factor (fraction 0–1) of CIE 224:2017
// colour evaluation sample n, n = 1…99, at 5 nm from 380 to 780 nm (CIE
// 224:2017 Tables A.1–A.10; dataset CIE_srf_cfi.csv, DOI
// 10.25039/CIE.DS.wi5idbqu). It interpolates by the default rule. It
// returns an error wrapping ErrRange for another n.
func CES(n int) (colorimetry.Spectrum, error) {
	if n < 1 || n > NumCES {
		return colorimetry.Spectrum{}, fmt.Errorf("colour evaluation sample CES %d: %w (1–%d)", n, ErrRange, NumCES)
	}
	return tabCES.spectrum(n-1, colorimetry.Options{}), nil
}

// PhotopicV returns the CIE photopic spectral luminous efficiency V(λ) at
// 1 nm from 360 to 830 nm (CIE 018:2019 Table 1, dataset DOI
// 10.25039/CIE.DS.dktna2s3), which equals ȳ(λ) of the CIE 1931 observer
// at every tabulated wavelength. It is zero outside its range. The maximum
// luminous efficacy is colorimetry.Km.
func PhotopicV() colorimetry.Spectrum {
	return tabCIE1931.spectrum(1, colorimetry.Options{Extrap: colorimetry.ExtrapZero})
}

// KmScotopic is the maximum luminous efficacy for scotopic vision,
// 1700.06 lm/W (CIE 018:2019; from memory, confirmed as 683/V′(555.016 nm)
// in shared/reference/PROVENANCE.md Checks A1).
const KmScotopic = 1700.06

// ScotopicV returns the CIE 1951 scotopic spectral luminous efficiency
// V′(λ) at 1 nm from 380 to 780 nm (CIE 018:2019 Table 2, dataset DOI
// 10.25039/CIE.DS.gr6w4b5g). It is zero outside its range.
func ScotopicV() colorimetry.Spectrum {
	return tabScotopic.spectrum(0, colorimetry.Options{Extrap: colorimetry.ExtrapZero})
}

// AlphaOpic names one of the five α-opic photoreceptor classes of CIE S
// 026/E:2018.
type AlphaOpic int

// The α-opic classes, in the column order of CIE S 026/E:2018 Table 2.
const (
	SCone     AlphaOpic = iota // S-cone-opic, s_sc(λ)
	MCone                      // M-cone-opic, s_mc(λ)
	LCone                      // L-cone-opic, s_lc(λ)
	Rhodopic                   // rhodopic, s_rh(λ) (= V′(λ))
	Melanopic                  // melanopic, s_mel(λ)
)

var alphaOpicNames = [...]string{"S-cone-opic", "M-cone-opic", "L-cone-opic", "rhodopic", "melanopic"}

// String returns the class's name as CIE S 026 writes it, e.g. "melanopic".
func (a AlphaOpic) String() string {
	if a < 0 || int(a) >= len(alphaOpicNames) {
		return fmt.Sprintf("AlphaOpic(%d)", int(a))
	}
	return alphaOpicNames[a]
}

// AlphaOpicAction returns the α-opic action spectrum s_α(λ) of class a,
// normalised to 1 at its peak, at 1 nm from 380 to 780 nm (CIE S
// 026/E:2018 Table 2, DOI 10.25039/S026.2018; dataset DOI
// 10.25039/CIE.DS.vqqhzp5a). Where the CIE leaves a spectrum undefined
// (s_sc below 390 and above 615 nm; s_mc and s_lc below 390 nm) it is 0,
// and it is 0 outside 380–780 nm, as the CIE metadata prescribe. It
// returns an error wrapping ErrUnknown for a value of a that is not one of
// the five classes.
func AlphaOpicAction(a AlphaOpic) (colorimetry.Spectrum, error) {
	if a < 0 || int(a) >= len(tabAlphaOpic.data) {
		return colorimetry.Spectrum{}, fmt.Errorf("%w α-opic class %v", ErrUnknown, a)
	}
	return tabAlphaOpic.spectrum(int(a), colorimetry.Options{Extrap: colorimetry.ExtrapZero}), nil
}
