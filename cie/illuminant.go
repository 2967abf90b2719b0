package cie

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
)

// Ranges of the parametric illuminant families.
const (
	// DaylightMinCCT and DaylightMaxCCT bound the correlated colour
	// temperatures (K) for which CIE 015:2018 defines the D series.
	DaylightMinCCT = 4000
	DaylightMaxCCT = 25000
	// PlanckMinT and PlanckMaxT bound the temperatures (K) that Illuminant
	// accepts for "planck:T". The limits are common practice (no source):
	// below 500 K a blackbody is practically invisible, and above 10⁶ K the
	// chromaticity no longer changes.
	PlanckMinT = 500
	PlanckMaxT = 1e6
)

// gridA is the grid of the CIE tables of A and D65: 300–830 nm at 1 nm
// (ISO/CIE 11664-2:2022).
var gridA = colorimetry.Grid{Start: 300, Step: 1, N: 531}

// c2A is the value of the second radiation constant, m·K, in the
// definition of illuminant A (ISO/CIE 11664-2:2022): 1.435×10⁻² m·K, the
// value in use when A was defined, kept so that A stays unchanged. With
// c2 = 1.4388×10⁻² m·K the same distribution is a Planckian radiator at
// about 2856 K.
const c2A = 1.435e-2

// tA is the temperature of illuminant A, K (ISO/CIE 11664-2:2022).
const tA = 2848

// A returns CIE standard illuminant A from its defining formula
// (ISO/CIE 11664-2:2022),
//
//	S_A(λ) = 100·(560/λ)⁵·(exp(1.435×10⁷/(2848·560)) − 1)/(exp(1.435×10⁷/(2848·λ)) − 1),
//
// λ in nm, on 300–830 nm at 1 nm, normalised to 100 at 560 nm. A is smooth,
// so it interpolates by the default rule (Sprague).
func A() colorimetry.Spectrum {
	const c = c2A * 1e9 // nm·K
	v := make([]float64, gridA.N)
	for i := range v {
		nm := gridA.Wavelength(i)
		v[i] = 100 * math.Pow(560/nm, 5) * math.Expm1(c/(tA*560)) / math.Expm1(c/(tA*nm))
	}
	return mustSpectrum(gridA, v, colorimetry.Options{})
}

// D65 returns CIE standard illuminant D65 as tabulated at 1 nm from 300 to
// 830 nm (ISO/CIE 11664-2:2022 Table B.1). The 1 nm values are the linear
// interpolation of the 10 nm values, so D65 interpolates linearly.
func D65() colorimetry.Spectrum {
	return tabD65.spectrum(0, colorimetry.Options{Interp: colorimetry.InterpLinear})
}

// D50 returns CIE illuminant D50: the D series at 5000·1.4388/1.4380 K
// with M1, M2 rounded to 3 decimals as CIE 015:2018 does for its tables.
// See DaylightRounded.
func D50() colorimetry.Spectrum { return mustDaylight(5000 * C2Ratio) }

// D55 returns CIE illuminant D55 (5500·1.4388/1.4380 K, M1 and M2 rounded
// to 3 decimals, CIE 015:2018). See DaylightRounded.
func D55() colorimetry.Spectrum { return mustDaylight(5500 * C2Ratio) }

// D75 returns CIE illuminant D75 (7500·1.4388/1.4380 K, M1 and M2 rounded
// to 3 decimals, CIE 015:2018). See DaylightRounded.
func D75() colorimetry.Spectrum { return mustDaylight(7500 * C2Ratio) }

// C2Ratio is 1.4388/1.4380, the factor by which the nominal temperatures
// of the CIE D illuminants (5000, 5500, 6500, 7500 K) are multiplied
// since the second radiation constant was changed from 1.4380×10⁻² to
// 1.4388×10⁻² m·K (CIE 015:2018). D65, for example, has a CCT of
// about 6504 K.
const C2Ratio = 1.4388 / 1.4380

// gridE is the grid of the equal-energy illuminant: the 1 nm range of the
// observer tables.
var gridE = colorimetry.Grid1nm

// E returns the equal-energy illuminant (CIE 015:2018): 100 at every
// wavelength, on 360–830 nm at 1 nm.
func E() colorimetry.Spectrum {
	v := make([]float64, gridE.N)
	for i := range v {
		v[i] = 100
	}
	return mustSpectrum(gridE, v, colorimetry.Options{Interp: colorimetry.InterpLinear})
}

// Planckian returns the relative spectral power distribution of a
// Planckian (blackbody) radiator at temperature t (K) on 300–830 nm at
// 1 nm, normalised to 100 at 560 nm, with c2 = colorimetry.C2 (1.4388×10⁻²
// m·K, CIE 015:2018). For another grid or c2 use colorimetry.Blackbody.
// It returns an error for a temperature that is not positive and finite.
func Planckian(t float64) (colorimetry.Spectrum, error) {
	return colorimetry.Blackbody(t, gridA, colorimetry.C2)
}

// Fluorescent returns CIE illuminant FLn (Fn), n = 1…12, as tabulated at
// 5 nm from 380 to 780 nm (CIE 015:2018 Tables 10.1–10.3). These are line
// spectra: they interpolate linearly (never by Sprague) and are best
// integrated on their own 5 nm grid (colorimetry.Grid5nm). It returns an
// error wrapping ErrRange for another n.
func Fluorescent(n int) (colorimetry.Spectrum, error) {
	if n < 1 || n > len(tabFL.data) {
		return colorimetry.Spectrum{}, fmt.Errorf("fluorescent illuminant FL%d: %w (FL1–FL%d)", n, ErrRange, len(tabFL.data))
	}
	return tabFL.spectrum(n-1, colorimetry.Options{Interp: colorimetry.InterpLinear}), nil
}

// LEDNames returns the names of the CIE LED illuminants in the order of
// CIE 015:2018 Tables 12.1–12.2: LED-B1 … LED-B5, LED-BH1, LED-RGB1,
// LED-V1, LED-V2.
func LEDNames() []string { return append([]string(nil), tabLED.cols...) }

// LED returns the CIE LED illuminant with the given name (one of
// LEDNames(), case-insensitive), as tabulated at 5 nm from 380 to 780 nm (CIE
// 015:2018 Tables 12.1–12.2). It interpolates linearly. It returns an
// error wrapping ErrUnknown for another name.
func LED(name string) (colorimetry.Spectrum, error) {
	j := tabLED.col(strings.ToUpper(strings.TrimSpace(name)))
	if j < 0 {
		return colorimetry.Spectrum{}, fmt.Errorf("%w LED illuminant %q (want one of %s)", ErrUnknown, name, strings.Join(tabLED.cols, ", "))
	}
	return tabLED.spectrum(j, colorimetry.Options{Interp: colorimetry.InterpLinear}), nil
}

// mustSpectrum wraps values computed here from valid inputs.
func mustSpectrum(g colorimetry.Grid, v []float64, opt colorimetry.Options) colorimetry.Spectrum {
	s, err := colorimetry.NewSpectrumOnGrid(g, v, opt)
	if err != nil {
		panic("cie: " + err.Error())
	}
	return s
}

// Illuminant returns the illuminant with the given name, case-insensitive:
//
//	A, D50, D55, D65, D75, E         the CIE standard and named illuminants
//	F1 … F12 (or FL1 … FL12)         the CIE fluorescent illuminants
//	LED-B1 … LED-B5, LED-BH1, LED-RGB1, LED-V1, LED-V2
//	daylight:T                       the D series at CCT T K, 4000–25000 K (unrounded M1, M2)
//	planck:T                         a Planckian radiator at T K, 500–10⁶ K
//
// Unknown names give an error wrapping ErrUnknown, and temperatures out of
// range an error wrapping ErrRange. File paths are not resolved here.
func Illuminant(name string) (colorimetry.Spectrum, error) {
	key := strings.ToUpper(strings.TrimSpace(name))
	switch key {
	case "A":
		return A(), nil
	case "D50":
		return D50(), nil
	case "D55":
		return D55(), nil
	case "D65":
		return D65(), nil
	case "D75":
		return D75(), nil
	case "E":
		return E(), nil
	}
	if fam, arg, ok := strings.Cut(key, ":"); ok {
		t, err := strconv.ParseFloat(strings.TrimSpace(arg), 64)
		if err != nil || math.IsNaN(t) || math.IsInf(t, 0) {
			return colorimetry.Spectrum{}, fmt.Errorf("illuminant %q: temperature %q is not a number in K", name, arg)
		}
		switch strings.TrimSpace(fam) {
		case "DAYLIGHT":
			return Daylight(t)
		case "PLANCK":
			if t < PlanckMinT || t > PlanckMaxT {
				return colorimetry.Spectrum{}, fmt.Errorf("illuminant %q: %g K %w of planck:T (%g–%g K)", name, t, ErrRange, float64(PlanckMinT), float64(PlanckMaxT))
			}
			return Planckian(t)
		}
	}
	if n, ok := strings.CutPrefix(key, "FL"); ok && isDigits(n) {
		return fluorescentByNumber(name, n)
	}
	if n, ok := strings.CutPrefix(key, "F"); ok && isDigits(n) {
		return fluorescentByNumber(name, n)
	}
	if strings.HasPrefix(key, "LED-") {
		return LED(key)
	}
	return colorimetry.Spectrum{}, fmt.Errorf("%w illuminant %q (try A, D50, D65, E, F2, F11, LED-B3, daylight:5200 or planck:3200; see List)", ErrUnknown, name)
}

// isDigits reports whether s is a non-empty run of ASCII digits.
func isDigits(s string) bool {
	for _, r := range s {
		if r < '0' || r > '9' {
			return false
		}
	}
	return s != ""
}

// fluorescentByNumber resolves the number after "F" or "FL" in name.
func fluorescentByNumber(name, num string) (colorimetry.Spectrum, error) {
	n, err := strconv.Atoi(num)
	if err != nil || n < 1 || n > len(tabFL.data) {
		return colorimetry.Spectrum{}, fmt.Errorf("%w illuminant %q (fluorescent illuminants are F1–F%d or FL1–FL%d)", ErrUnknown, name, len(tabFL.data), len(tabFL.data))
	}
	return Fluorescent(n)
}

// IlluminantInfo describes one name that Illuminant accepts.
type IlluminantInfo struct {
	Name        string // as accepted by Illuminant, e.g. "D65" or "daylight:K"
	Description string // one line: standard, CCT and grid
}

// List returns the illuminants that Illuminant knows, including the
// parametric families daylight:K and planck:K, in a fixed order.
func List() []IlluminantInfo {
	l := []IlluminantInfo{
		{"A", "CIE standard illuminant A, Planckian 2856 K (2848 K, c2 = 1.435e-2); ISO/CIE 11664-2 formula; 300–830 nm at 1 nm"},
		{"D50", "CIE D50, daylight 5003 K; CIE 015:2018 from S0, S1, S2 (M1, M2 to 3 decimals); 300–830 nm at 5 nm, linear"},
		{"D55", "CIE D55, daylight 5503 K; CIE 015:2018 from S0, S1, S2 (M1, M2 to 3 decimals); 300–830 nm at 5 nm, linear"},
		{"D65", "CIE standard illuminant D65, daylight 6504 K; ISO/CIE 11664-2 table; 300–830 nm at 1 nm, linear"},
		{"D75", "CIE D75, daylight 7504 K; CIE 015:2018 from S0, S1, S2 (M1, M2 to 3 decimals); 300–830 nm at 5 nm, linear"},
		{"E", "equal-energy illuminant, x = y = 1/3; CIE 015:2018; 360–830 nm at 1 nm"},
	}
	for i, cct := range flCCT {
		l = append(l, IlluminantInfo{
			Name:        fmt.Sprintf("F%d", i+1),
			Description: fmt.Sprintf("CIE fluorescent FL%d, %s, about %d K; CIE 015:2018 Tables 10.1–10.3; 380–780 nm at 5 nm, linear", i+1, flKind[i], cct),
		})
	}
	for i, n := range tabLED.cols {
		l = append(l, IlluminantInfo{
			Name:        n,
			Description: fmt.Sprintf("CIE LED illuminant, %s, about %d K; CIE 015:2018 Tables 12.1–12.2; 380–780 nm at 5 nm, linear", ledKind[i], ledCCT[i]),
		})
	}
	return append(l,
		IlluminantInfo{"daylight:K", "CIE D series at CCT K (4000–25000 K); CIE 015:2018 from S0, S1, S2; 300–830 nm at 5 nm, linear"},
		IlluminantInfo{"planck:K", "Planckian radiator at K (500–1e6 K), c2 = 1.4388e-2 m·K; 300–830 nm at 1 nm"},
	)
}

// Nominal CCTs (K) and lamp types of FL1–FL12, from the colorimetric table
// of the FL illuminants in CIE 015:2018 (rounded to 10 K; they agree with
// PROVENANCE.md Checks 10, and TestList recomputes them).
var (
	flCCT  = [...]int{6430, 4230, 3450, 2940, 6350, 4150, 6500, 5000, 4150, 5000, 4000, 3000}
	flKind = [...]string{
		"standard halophosphate", "standard halophosphate", "standard halophosphate",
		"standard halophosphate", "standard halophosphate", "standard halophosphate",
		"broadband", "broadband", "broadband",
		"three-band", "three-band", "three-band",
	}
)

// Nominal CCTs (K) and types of the CIE LED illuminants, from the
// colorimetric table of the LED illuminants in CIE 015:2018, from memory
// (rounded to 10 K; TestList recomputes them: all within 4 K).
var (
	ledCCT  = [...]int{2730, 2990, 4100, 5110, 6600, 2850, 2840, 2720, 4070}
	ledKind = [...]string{
		"phosphor-converted blue", "phosphor-converted blue", "phosphor-converted blue",
		"phosphor-converted blue", "phosphor-converted blue", "hybrid blue",
		"RGB", "phosphor-converted violet", "phosphor-converted violet",
	}
)
