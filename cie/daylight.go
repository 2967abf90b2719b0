package cie

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
)

// DaylightChromaticity returns the chromaticity (xD, yD) of the CIE
// daylight illuminant with correlated colour temperature cct (K), CIE
// 015:2018 (daylight illuminants):
//
//	xD = −4.6070×10⁹/T³ + 2.9678×10⁶/T² + 0.09911×10³/T + 0.244063   (4000 K ≤ T ≤ 7000 K)
//	xD = −2.0064×10⁹/T³ + 1.9018×10⁶/T² + 0.24748×10³/T + 0.237040   (7000 K < T ≤ 25000 K)
//	yD = −3.000 xD² + 2.870 xD − 0.275
//
// It returns an error wrapping ErrRange outside 4000–25000 K.
func DaylightChromaticity(cct float64) (colorimetry.XY, error) {
	if !(cct >= DaylightMinCCT && cct <= DaylightMaxCCT) {
		return colorimetry.XY{}, fmt.Errorf("daylight CCT %g K: %w of the CIE D series (%d–%d K)", cct, ErrRange, DaylightMinCCT, DaylightMaxCCT)
	}
	t := cct
	var x float64
	if t <= 7000 {
		x = -4.6070e9/(t*t*t) + 2.9678e6/(t*t) + 0.09911e3/t + 0.244063
	} else {
		x = -2.0064e9/(t*t*t) + 1.9018e6/(t*t) + 0.24748e3/t + 0.237040
	}
	return colorimetry.XY{X: x, Y: -3.000*x*x + 2.870*x - 0.275}, nil
}

// DaylightFactors returns the factors M1, M2 with which the daylight
// components S1, S2 are added to S0 for the chromaticity xy (CIE 015:2018
// daylight illuminants):
//
//	M  = 0.0241 + 0.2562 xD − 0.7341 yD
//	M1 = (−1.3515 − 1.7703 xD + 5.9114 yD) / M
//	M2 = ( 0.0300 − 31.4424 xD + 30.0717 yD) / M
func DaylightFactors(xy colorimetry.XY) (m1, m2 float64) {
	m := 0.0241 + 0.2562*xy.X - 0.7341*xy.Y
	m1 = (-1.3515 - 1.7703*xy.X + 5.9114*xy.Y) / m
	m2 = (0.0300 - 31.4424*xy.X + 30.0717*xy.Y) / m
	return m1, m2
}

// Daylight returns the CIE daylight illuminant (D series) with correlated
// colour temperature cct (K), S(λ) = S0(λ) + M1·S1(λ) + M2·S2(λ) (CIE
// 015:2018), with M1 and M2 unrounded. It is on 300–830 nm at 5 nm,
// the grid of the components, 100 at 560 nm (S1 and S2 vanish there), and
// interpolates linearly as the CIE prescribes for the D series. The CCT is
// used as given: to get a named illuminant such as D50, multiply the
// nominal temperature by C2Ratio, or use DaylightRounded. It returns an
// error wrapping ErrRange outside 4000–25000 K.
func Daylight(cct float64) (colorimetry.Spectrum, error) {
	return daylight(cct, false)
}

// DaylightRounded is Daylight with M1 and M2 rounded to 3 decimals, as CIE
// 015:2018 does to tabulate D50, D55 and D75; D50, D55 and D75 are
// DaylightRounded at 5000, 5500 and 7500 K times C2Ratio. The rounding
// moves the chromaticity x, y by at most 3.3×10⁻⁵ (measured over
// 4000–25000 K with the 1931 observer at 5 nm).
func DaylightRounded(cct float64) (colorimetry.Spectrum, error) {
	return daylight(cct, true)
}

func daylight(cct float64, round bool) (colorimetry.Spectrum, error) {
	xy, err := DaylightChromaticity(cct)
	if err != nil {
		return colorimetry.Spectrum{}, err
	}
	m1, m2 := DaylightFactors(xy)
	if round {
		m1 = math.Round(m1*1000) / 1000
		m2 = math.Round(m2*1000) / 1000
	}
	s0, s1, s2 := tabDaylight.data[0], tabDaylight.data[1], tabDaylight.data[2]
	v := make([]float64, len(s0))
	for i := range v {
		v[i] = s0[i] + m1*s1[i] + m2*s2[i]
	}
	return mustSpectrum(tabDaylight.grid(), v, colorimetry.Options{Interp: colorimetry.InterpLinear}), nil
}

// mustDaylight is DaylightRounded for the named illuminants, whose CCTs
// are in range.
func mustDaylight(cct float64) colorimetry.Spectrum {
	s, err := daylight(cct, true)
	if err != nil {
		panic("cie: " + err.Error())
	}
	return s
}

// DaylightComponents returns the CIE daylight components S0, S1, S2 at
// 5 nm from 300 to 830 nm (CIE 015:2018, Table 1.2 of CIE 15.2-1986;
// dataset DOI 10.25039/CIE.DS.w7zunnny). They interpolate linearly.
func DaylightComponents() (s0, s1, s2 colorimetry.Spectrum) {
	opt := colorimetry.Options{Interp: colorimetry.InterpLinear}
	return tabDaylight.spectrum(0, opt), tabDaylight.spectrum(1, opt), tabDaylight.spectrum(2, opt)
}
