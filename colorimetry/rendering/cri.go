package rendering

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// DuvLimit13 is the largest distance from the Planckian locus in the CIE
// 1960 UCS diagram, 5.4×10⁻³, within which CIE 13.3-1995 holds the colour
// rendering index meaningful (from memory).
const DuvLimit13 = 5.4e-3

// CRI is the colour rendering of a light by CIE 13.3-1995.
type CRI struct {
	// CCT is the correlated colour temperature (K) and Duv of the light,
	// CIE 1931 observer, on the computation grid.
	CCT colorimetry.CCT
	// Reference is the reference illuminant: a Planckian radiator below
	// 5000 K, CIE daylight from 5000 K.
	Reference Reference
	// Ra is the general colour rendering index, the mean of R1–R8.
	Ra float64
	// R holds the special colour rendering indices R1–R14 (R[0] is R1)
	// of the test colour samples TCS01–TCS14.
	R [cie.NumTCS]float64
	// DeltaE holds the colour differences ΔEᵢ in CIE 1964 U*V*W* between
	// each sample under the light (after adaptation) and under the
	// reference; Rᵢ = 100 − 4.6·ΔEᵢ.
	DeltaE [cie.NumTCS]float64
	// Warnings are cautions, such as a light too far from the Planckian
	// locus for Ra to be meaningful.
	Warnings []string
}

// ColourRendering returns the CIE 13.3-1995 colour rendering indices of
// light, a relative or absolute spectral power distribution (see the
// package documentation for the grid).
//
// Method (CIE 13.3-1995; the constants from memory): the light's CCT
// selects the reference illuminant, a Planckian radiator (c2 =
// 1.4388×10⁻² m·K) below 5000 K and CIE daylight of the same CCT from
// 5000 K. The tristimulus values of TCS01–TCS14 under the light and under
// the reference (CIE 1931 observer, each illuminant scaled to Y = 100) are
// taken to the CIE 1960 UCS; the colours under the light are adapted to the
// reference by the von Kries transform in CIE 13.3's c, d coordinates,
//
//	c = (4 − u − 10v)/v,  d = (1.708v + 0.404 − 1.481u)/v,
//	u′ = (10.872 + 0.404·(c_r/c_k)·c_i − 4·(d_r/d_k)·d_i) / (16.518 + 1.481·(c_r/c_k)·c_i − (d_r/d_k)·d_i),
//	v′ = 5.520 / (16.518 + 1.481·(c_r/c_k)·c_i − (d_r/d_k)·d_i),
//
// and compared in CIE 1964 U*V*W* (W* = 25·Y^⅓ − 17, U* = 13W*(u − u_w),
// V* = 13W*(v − v_w)): Rᵢ = 100 − 4.6·ΔEᵢ, Ra the mean of R1–R8.
//
// A light farther than DuvLimit13 from the Planckian locus gets the
// indices with a warning. Errors: an empty light, one with no power in
// 380–780 nm or with negative power beyond 1 % of its peak; a CCT outside
// the range where it is defined (wrapping colorimetry.ErrCCTRange); a CCT
// above 25 000 K (wrapping ErrNoReference).
func ColourRendering(light colorimetry.Spectrum) (CRI, error) {
	t, err := load()
	if err != nil {
		return CRI{}, err
	}
	s, err := onGrid(light)
	if err != nil {
		return CRI{}, fmt.Errorf("colour rendering: %w", err)
	}
	cct, err := t.cct(s)
	if err != nil {
		return CRI{}, fmt.Errorf("colour rendering: %w", err)
	}
	ref, r, err := reference13(cct.Kelvin)
	if err != nil {
		return CRI{}, fmt.Errorf("colour rendering: %w", err)
	}
	out, err := t.rendering(s, ref)
	if err != nil {
		return CRI{}, fmt.Errorf("colour rendering: %w", err)
	}
	out.CCT, out.Reference = cct, r
	if math.Abs(cct.Duv) > DuvLimit13 {
		out.Warnings = append(out.Warnings, fmt.Sprintf("Duv %+.4f (CIE 1931 observer) is beyond ±%.4f from the Planckian locus, where CIE 13.3 holds Ra not meaningful", cct.Duv, DuvLimit13))
	}
	return out, nil
}

// rendering compares the light s with the reference ref, both on the
// computation grid (CIE 13.3-1995), and fills Ra, R and DeltaE.
func (t *tables) rendering(s, ref []float64) (CRI, error) {
	var out CRI
	out.Warnings = []string{}
	wk := tristimulus(s, nil, t.x2, t.y2, t.z2)
	wr := tristimulus(ref, nil, t.x2, t.y2, t.z2)
	if !(wk.Y > 0) || !(wr.Y > 0) {
		return out, fmt.Errorf("the light or its reference has no luminance: %w", colorimetry.ErrZeroLuminance)
	}
	kk, kr := 100/wk.Y, 100/wr.Y
	uk, vk := uv60(wk)
	ur, vr := uv60(wr)
	ck, dk := cd(uk, vk)
	cr, dr := cd(ur, vr)
	if ck == 0 || dk == 0 {
		return out, fmt.Errorf("the light's chromaticity (u, v) = (%.5f, %.5f) leaves no von Kries transform", uk, vk)
	}
	fc, fd := cr/ck, dr/dk
	// The adapted light is the reference white up to rounding of the
	// published constants; CIE 13.3 uses the adapted coordinates.
	uwk, vwk := adapt13(ck, dk, fc, fd)
	var sum float64
	for i, r := range t.tcs {
		xk := tristimulus(s, r, t.x2, t.y2, t.z2).Scale(kk)
		xr := tristimulus(ref, r, t.x2, t.y2, t.z2).Scale(kr)
		ui, vi := uv60(xk)
		ci, di := cd(ui, vi)
		ua, va := adapt13(ci, di, fc, fd)
		uri, vri := uv60(xr)
		wsk := 25*math.Cbrt(xk.Y) - 17
		wsr := 25*math.Cbrt(xr.Y) - 17
		dU := 13*wsr*(uri-ur) - 13*wsk*(ua-uwk)
		dV := 13*wsr*(vri-vr) - 13*wsk*(va-vwk)
		dW := wsr - wsk
		de := math.Sqrt(dU*dU + dV*dV + dW*dW)
		if !isFinite(de) {
			return out, fmt.Errorf("TCS%02d: colour difference is not finite: %w", i+1, colorimetry.ErrNotFinite)
		}
		out.DeltaE[i] = de
		out.R[i] = 100 - 4.6*de
		if i < 8 {
			sum += out.R[i]
		}
	}
	out.Ra = sum / 8
	return out, nil
}

// uv60 returns the CIE 1960 UCS u, v of c (0, 0 for black).
func uv60(c colorimetry.XYZ) (u, v float64) {
	d := c.X + 15*c.Y + 3*c.Z
	if d == 0 {
		return 0, 0
	}
	return 4 * c.X / d, 6 * c.Y / d
}

// cd returns CIE 13.3's c and d of the CIE 1960 chromaticity u, v.
func cd(u, v float64) (c, d float64) {
	return (4 - u - 10*v) / v, (1.708*v + 0.404 - 1.481*u) / v
}

// adapt13 returns the von Kries adapted CIE 1960 u, v of CIE 13.3 for a
// colour with c, d under the light and the ratios fc = c_r/c_k,
// fd = d_r/d_k.
func adapt13(c, d, fc, fd float64) (u, v float64) {
	den := 16.518 + 1.481*fc*c - fd*d
	return (10.872 + 0.404*fc*c - 4*fd*d) / den, 5.520 / den
}

func isFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
