package rendering

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// FidelityScale is the scaling factor c_f of CIE 224:2017, 6.73, in
// Rf = 10·ln(exp((100 − c_f·ΔE′)/10) + 1) (from memory).
const FidelityScale = 6.73

// Fidelity is the colour fidelity of a light by CIE 224:2017.
type Fidelity struct {
	// CCT is the correlated colour temperature (K) and Duv of the light,
	// CIE 1931 observer, on the computation grid.
	CCT colorimetry.CCT
	// Reference is the reference illuminant: Planckian up to 4000 K, CIE
	// daylight from 5000 K, a blend in between.
	Reference Reference
	// Rf is the general colour fidelity index, 0–100.
	Rf float64
	// Rfi holds the special colour fidelity indices Rf,i of the colour
	// evaluation samples CES 1–99 (Rfi[0] is sample 1).
	Rfi [cie.NumCES]float64
	// DeltaE is the mean colour difference ΔE′ in CAM02-UCS over the 99
	// samples, and DeltaEi the difference of each.
	DeltaE  float64
	DeltaEi [cie.NumCES]float64
	// Warnings are cautions about the result; empty when there are none.
	Warnings []string
}

// ColourFidelity returns the CIE 224:2017 colour fidelity index Rf of
// light, a relative or absolute spectral power distribution (see the
// package documentation for the grid), with the 99 special indices Rf,i.
//
// Method (CIE 224:2017; from memory): the light's CCT (CIE 1931 observer)
// selects the reference illuminant, a Planckian radiator (c2 =
// 1.4388×10⁻² m·K) up to 4000 K, CIE daylight of the same CCT from 5000 K,
// and between them the blend (5000 − T)/1000 of the Planckian radiator and
// (T − 4000)/1000 of daylight, each normalised to equal Y10. The
// tristimulus values of CES 1–99 under the light and under the reference
// (CIE 1964 10° observer, each illuminant scaled to Y10 = 100) are taken to
// CAM02-UCS by CIECAM02 with the illuminant as adopted white, LA =
// 100 cd/m², Yb = 20, average surround and complete adaptation (D = 1).
// ΔE′ᵢ is the Euclidean distance in J′a′b′, ΔE′ their mean, and
//
//	Rf = 10·ln(exp((100 − 6.73·ΔE′)/10) + 1),
//
// Rf,i the same of ΔE′ᵢ.
//
// Errors: an empty light, one with no power in 380–780 nm or with negative
// power beyond 1 % of its peak; a CCT outside the range where it is defined
// (wrapping colorimetry.ErrCCTRange); a CCT above 25 000 K (wrapping
// ErrNoReference).
func ColourFidelity(light colorimetry.Spectrum) (Fidelity, error) {
	t, err := load()
	if err != nil {
		return Fidelity{}, err
	}
	s, err := onGrid(light)
	if err != nil {
		return Fidelity{}, fmt.Errorf("colour fidelity: %w", err)
	}
	cct, err := t.cct(s)
	if err != nil {
		return Fidelity{}, fmt.Errorf("colour fidelity: %w", err)
	}
	ref, r, err := t.reference224(cct.Kelvin)
	if err != nil {
		return Fidelity{}, fmt.Errorf("colour fidelity: %w", err)
	}
	out, err := t.fidelity(s, ref)
	if err != nil {
		return Fidelity{}, fmt.Errorf("colour fidelity: %w", err)
	}
	out.CCT, out.Reference = cct, r
	return out, nil
}

// fidelity compares the light s with the reference ref, both on the
// computation grid (CIE 224:2017), and fills Rf, Rfi, DeltaE and DeltaEi.
func (t *tables) fidelity(s, ref []float64) (Fidelity, error) {
	out := Fidelity{Warnings: []string{}}
	wk := tristimulus(s, nil, t.x10, t.y10, t.z10)
	wr := tristimulus(ref, nil, t.x10, t.y10, t.z10)
	if !(wk.Y > 0) || !(wr.Y > 0) {
		return out, fmt.Errorf("the light or its reference has no luminance: %w", colorimetry.ErrZeroLuminance)
	}
	kk, kr := 100/wk.Y, 100/wr.Y
	mk := newCAM02(wk.Scale(kk), view224)
	mr := newCAM02(wr.Scale(kr), view224)
	var sum float64
	for i, r := range t.ces {
		a := mk.ucs(tristimulus(s, r, t.x10, t.y10, t.z10).Scale(kk))
		b := mr.ucs(tristimulus(ref, r, t.x10, t.y10, t.z10).Scale(kr))
		de := math.Sqrt((a[0]-b[0])*(a[0]-b[0]) + (a[1]-b[1])*(a[1]-b[1]) + (a[2]-b[2])*(a[2]-b[2]))
		if !isFinite(de) {
			return out, fmt.Errorf("CES %d: colour difference is not finite: %w", i+1, colorimetry.ErrNotFinite)
		}
		out.DeltaEi[i] = de
		out.Rfi[i] = FidelityIndex(de)
		sum += de
	}
	out.DeltaE = sum / float64(len(t.ces))
	out.Rf = FidelityIndex(out.DeltaE)
	return out, nil
}

// FidelityIndex returns the fidelity index of a colour difference de in
// CAM02-UCS, 10·ln(exp((100 − 6.73·de)/10) + 1) (CIE 224:2017; from
// memory): about 100 − 6.73·de for small differences, tending to 0 for
// large ones instead of going negative. Special cases are:
//
//	FidelityIndex(0) = 100 + 10·ln(1 + e⁻¹⁰) ≈ 100.00045
func FidelityIndex(de float64) float64 {
	x := (100 - FidelityScale*de) / 10
	// ln(eˣ + 1) = x + ln(1 + e⁻ˣ) for large x, avoiding overflow.
	if x > 0 {
		return 10 * (x + math.Log1p(math.Exp(-x)))
	}
	return 10 * math.Log1p(math.Exp(x))
}
