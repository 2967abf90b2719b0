package complement

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
)

// Additive is the result of CheckAdditive: how closely a + b matches the
// white, spectrally and in colour.
type Additive struct {
	// Verdict is Spectral, Metameric or None.
	Verdict Verdict `json:"verdict"`
	// Scale is the s that minimises ‖a + b − s·W‖ (least squares on the
	// common grid), W the illuminant for Lights and 1 for Surfaces.
	Scale float64 `json:"scale"`
	// SpectralRMS and SpectralMax are the RMS and the largest absolute
	// residual a + b − s·W, as fractions of the peak of s·W.
	SpectralRMS float64 `json:"spectral_rms"`
	SpectralMax float64 `json:"spectral_max"`
	// DeltaUVPrime is Δu′v′ between XYZ(a) + XYZ(b) and the white.
	DeltaUVPrime float64 `json:"delta_uv_prime"`
	// DeltaDuv is Duv of the sum minus Duv of the white (CIE 1960 UCS,
	// Ohno's method on the observer's own Planckian locus); nil when either
	// lies outside the range where a CCT is defined.
	DeltaDuv *float64 `json:"delta_duv"`
	// DeltaE00 is CIEDE2000 between the sum scaled to Y = 100 and the white
	// at Y = 100 (CIELAB relative to the white): a difference in
	// chromaticity only, luminance normalised away.
	DeltaE00 float64 `json:"delta_e00"`
	// Warnings are cautions: a CCT out of range, a spectral comparison on
	// a narrow range, a spectral match whose colour still misses.
	Warnings []string `json:"warnings"`
}

// CheckAdditive checks whether a and b are additive complements under the
// conditions c: lights (mode Lights) whose sum should be a multiple of the
// illuminant, or reflectances mixed optically (mode Surfaces) whose sum
// should be the perfect white, 1 at every wavelength.
//
// Spectrally, the residual a + b − s·W is taken on the common grid of a, b
// (and the illuminant, for lights) with the least-squares s; it is reported
// as RMS and maximum relative to the peak of s·W. In colour, XYZ(a) + XYZ(b)
// (Grassmann additivity) is compared with the white of the mode by Δu′v′,
// ΔDuv and a luminance-normalised ΔE00.
//
// The verdict is Spectral when the RMS residual is within
// opt.SpectralRMS and Δu′v′ within opt.DeltaUVPrime (a spectral complement
// is a colorimetric one a fortiori; a spectral pass with a colour miss gives
// None and a warning), Metameric when only Δu′v′ is within tolerance, and
// None otherwise.
//
// It returns an error naming "a" or "b" for an empty spectrum, an all-zero
// one, one negative beyond noise (1 % of the peak for lights, 0.01 for
// reflectances) or one without luminance; an error wrapping
// colorimetry.ErrNoOverlap for grids that do not overlap; an error wrapping
// ErrMode for Filters (use CheckSubtractive); and one wrapping ErrOptions for
// invalid options.
func (c *Conditions) CheckAdditive(a, b colorimetry.Spectrum, m Mode, opt Options) (Additive, error) {
	if err := checkMode(m, "the additive check", Lights, Surfaces); err != nil {
		return Additive{}, err
	}
	opt, err := opt.withDefaults()
	if err != nil {
		return Additive{}, err
	}
	xa, xb, err := c.pair(a, b, m)
	if err != nil {
		return Additive{}, err
	}
	res := Additive{Warnings: []string{}}

	// Spectral residual on the common grid.
	sum, err := colorimetry.Add(a, b)
	if err != nil {
		return Additive{}, fmt.Errorf("a and b: %w", err)
	}
	var sv, wv []float64
	if m == Lights {
		rs, ri, err := colorimetry.Align(sum, c.ill)
		if err != nil {
			return Additive{}, fmt.Errorf("a + b and illuminant: %w", err)
		}
		sv, wv = rs.Values(nil), ri.Values(nil)
		res.Warnings = appendRangeWarning(res.Warnings, rs.Grid())
	} else {
		sv = sum.Values(nil)
		wv = make([]float64, len(sv))
		for i := range wv {
			wv[i] = 1
		}
		res.Warnings = appendRangeWarning(res.Warnings, sum.Grid())
	}
	res.Scale, res.SpectralRMS, res.SpectralMax, err = spectralResidual(sv, wv)
	if err != nil {
		return Additive{}, fmt.Errorf("a + b: %w", err)
	}

	// Colorimetry of the sum against the white.
	if err := c.colorimetric(&res, xa.Add(xb), m); err != nil {
		return Additive{}, err
	}

	colourOK := res.DeltaUVPrime <= opt.DeltaUVPrime
	switch {
	case res.SpectralRMS <= opt.SpectralRMS && colourOK:
		res.Verdict = Spectral
	case colourOK:
		res.Verdict = Metameric
	default:
		res.Verdict = None
		if res.SpectralRMS <= opt.SpectralRMS {
			res.Warnings = append(res.Warnings, fmt.Sprintf(
				"spectral residual %.3g is within tolerance but Δu′v′ %.3g is not: the residual falls where the eye is sensitive", res.SpectralRMS, res.DeltaUVPrime))
		}
	}
	return res, nil
}

// pair validates a and b for mode m and returns their tristimulus values.
func (c *Conditions) pair(a, b colorimetry.Spectrum, m Mode) (xa, xb colorimetry.XYZ, err error) {
	var x [2]colorimetry.XYZ
	for i, in := range []struct {
		name string
		s    colorimetry.Spectrum
	}{{"a", a}, {"b", b}} {
		if err := checkSpectrum(in.name, in.s, m, c.grid); err != nil {
			return xa, xb, err
		}
		if x[i], err = c.XYZ(in.s, m); err != nil {
			return xa, xb, inputErr(in.name, err)
		}
		if !(x[i].Y > 0) {
			return xa, xb, inputErr(in.name, fmt.Errorf("%w: Y = %g on %v", colorimetry.ErrZeroLuminance, x[i].Y, c.grid))
		}
		// Chromaticity must be defined: X+15Y+3Z may overflow.
		if _, err := x[i].UVPrime(); err != nil {
			return xa, xb, inputErr(in.name, err)
		}
	}
	return x[0], x[1], nil
}

// spectralResidual returns the least-squares scale s of w to v, and the RMS
// and largest absolute residual v − s·w as fractions of the peak of s·w.
func spectralResidual(v, w []float64) (s, rms, maxAbs float64, err error) {
	var vw, ww, peak float64
	for i := range v {
		vw += v[i] * w[i]
		ww += w[i] * w[i]
		peak = math.Max(peak, w[i])
	}
	s = vw / ww
	if !(s > 0) || !(peak > 0) {
		return 0, 0, 0, fmt.Errorf("no positive multiple of the white fits (s = %g): %w", s, ErrBlack)
	}
	var ss float64
	for i := range v {
		r := v[i] - s*w[i]
		ss += r * r
		maxAbs = math.Max(maxAbs, math.Abs(r))
	}
	p := s * peak
	rms, maxAbs = math.Sqrt(ss/float64(len(v)))/p, maxAbs/p
	if math.IsInf(ss, 0) || math.IsNaN(rms) || math.IsInf(rms, 0) || math.IsInf(maxAbs, 0) {
		// Values near ±1e154 and beyond overflow the sum of squares.
		return 0, 0, 0, fmt.Errorf("spectral residual overflows the float64 range: %w", colorimetry.ErrNotFinite)
	}
	return s, rms, maxAbs, nil
}

// appendRangeWarning warns when a spectral comparison does not span the
// visible range 400–700 nm (common practice (no source): the range that
// carries nearly all of the luminance).
func appendRangeWarning(w []string, g colorimetry.Grid) []string {
	if g.Start > 400+1e-9 || g.End() < 700-1e-9 {
		w = append(w, fmt.Sprintf("spectral residual taken over %v only, short of 400–700 nm", g))
	}
	return w
}

// colorimetric fills the colour differences of res between the sum (of
// mode m) and the white.
func (c *Conditions) colorimetric(res *Additive, sum colorimetry.XYZ, m Mode) error {
	white := c.White(m)
	uv, err := sum.UVPrime()
	if err != nil {
		return fmt.Errorf("a + b: %w", err)
	}
	wuv := c.wuv[whiteIndex(m)]
	res.DeltaUVPrime = colorimetry.DeltaUVPrime(uv, wuv)

	ds, errS := c.table.CCT(uv.UV(), colorimetry.CCTOhno)
	dw, errW := c.table.CCT(wuv.UV(), colorimetry.CCTOhno)
	switch {
	case errS != nil:
		res.Warnings = append(res.Warnings, "ΔDuv not given: CCT of the sum: "+errS.Error())
	case errW != nil:
		res.Warnings = append(res.Warnings, "ΔDuv not given: CCT of the white: "+errW.Error())
	default:
		d := ds.Duv - dw.Duv
		res.DeltaDuv = &d
	}

	s100, err := sum.ScaleToY(100)
	if err != nil {
		return fmt.Errorf("a + b: %w", err)
	}
	w100, err := white.ScaleToY(100)
	if err != nil {
		return inputErr("illuminant", err)
	}
	ls, err := s100.Lab(w100)
	if err != nil {
		return fmt.Errorf("a + b: %w", err)
	}
	lw, err := w100.Lab(w100)
	if err != nil {
		return inputErr("illuminant", err)
	}
	res.DeltaE00 = colorimetry.DeltaE2000(ls, lw)
	return nil
}

// Ratio is the result of MixRatio: the mix a + t·b nearest the white's
// chromaticity, t ≥ 0.
type Ratio struct {
	// Weight is t, the multiple of b (as given) in the mix a + t·b; nil
	// when the nearest mix is b alone (t → ∞).
	Weight *float64 `json:"weight_b"`
	// RatioLuminance is Y(a) : Y(t·b), the ratio of a to b in the mix by
	// luminance; nil when the nearest mix is a alone (t = 0).
	RatioLuminance *float64 `json:"ratio_luminance"`
	// RatioPower is the same ratio by radiant power, Σ a Δλ : Σ t·b Δλ for
	// lights and Σ a·S Δλ : Σ t·b·S Δλ (the reflected light) for surfaces,
	// on the computation grid; nil when the nearest mix is a alone.
	RatioPower *float64 `json:"ratio_power"`
	// FractionLuminance is b's share of the mix's luminance,
	// Y(t·b) / (Y(a) + Y(t·b)), 0–1; finite at both ends.
	FractionLuminance float64 `json:"fraction_luminance_b"`
	// DeltaUVPrime is Δu′v′ between the nearest mix and the white.
	DeltaUVPrime float64 `json:"delta_uv_prime"`
	// LineDistanceUVPrime is the distance in the u′v′ diagram of the white
	// from the straight line through a and b: 0 for exact complements (at
	// some ratio, possibly negative).
	LineDistanceUVPrime float64 `json:"line_distance_uv_prime"`
	// Warnings are cautions: the nearest mix at an end of the segment, a
	// and b of one chromaticity.
	Warnings []string `json:"warnings"`
}

// MixRatio returns the ratio of b to a whose additive mix a + t·b, t ≥ 0,
// comes nearest the chromaticity of the white in the CIE 1976 u′v′ diagram,
// in mode Lights or Surfaces.
//
// The solution is exact, not iterative: u′v′ of the mix moves along the
// straight line from u′v′(a) to u′v′(b) (the projective map from XYZ to
// u′v′ keeps lines), at the point (1 − μ)·p_a + μ·p_b with
// μ = t·D_b / (D_a + t·D_b), D = X + 15Y + 3Z. The white is projected onto
// the line, μ clamped to the segment [0, 1], and t recovered from μ.
//
// Errors are those of CheckAdditive for bad input, and one wrapping
// colorimetry.ErrNotFinite when a and b differ in scale so much that the
// ratio overflows the float64 range.
func (c *Conditions) MixRatio(a, b colorimetry.Spectrum, m Mode) (Ratio, error) {
	if err := checkMode(m, "the mixing ratio", Lights, Surfaces); err != nil {
		return Ratio{}, err
	}
	xa, xb, err := c.pair(a, b, m)
	if err != nil {
		return Ratio{}, err
	}
	pa, err := c.power("a", a, m)
	if err != nil {
		return Ratio{}, err
	}
	pb, err := c.power("b", b, m)
	if err != nil {
		return Ratio{}, err
	}
	mx := c.nearestMix(xa, xb, m)
	r := Ratio{DeltaUVPrime: mx.delta, LineDistanceUVPrime: mx.line, Warnings: []string{}}
	if mx.same {
		r.Warnings = append(r.Warnings, "a and b have the same chromaticity: every mix has it, so no ratio moves it towards the white")
	}
	switch {
	case mx.mu <= 0:
		zero := 0.0
		r.Weight = &zero
		if !mx.same {
			r.Warnings = append(r.Warnings, "the nearest mix is a alone: adding b only moves away from the white")
		}
	case mx.mu >= 1:
		zero := 0.0
		r.RatioLuminance, r.RatioPower = &zero, &zero
		r.FractionLuminance = 1
		r.Warnings = append(r.Warnings, "the nearest mix is b alone: adding a only moves away from the white")
	default:
		t := mx.t
		rl := xa.Y / (t * xb.Y)
		rp := pa / (t * pb)
		r.Weight, r.RatioLuminance, r.RatioPower = &t, &rl, &rp
		r.FractionLuminance = t * xb.Y / (xa.Y + t*xb.Y)
		for _, v := range []float64{t, rl, rp, r.FractionLuminance} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				// a and b differ in scale by a factor near the float64
				// range: the ratio overflows.
				return Ratio{}, fmt.Errorf("mixing ratio of b to a (luminances %g and %g) overflows the float64 range: %w", xa.Y, xb.Y, colorimetry.ErrNotFinite)
			}
		}
	}
	return r, nil
}

// mix is the nearest point to the white on the u′v′ segment from a to b.
type mix struct {
	mu    float64 // position on the segment, 0 at a, 1 at b
	t     float64 // weight of b, a + t·b; +Inf at mu = 1
	delta float64 // Δu′v′ of the nearest point from the white
	line  float64 // distance of the white from the line a–b
	same  bool    // a and b share a chromaticity (no line)
}

// nearestMix solves the mixing ratio for tristimulus values xa, xb (each
// with X + 15Y + 3Z > 0) of mode m. It allocates nothing.
func (c *Conditions) nearestMix(xa, xb colorimetry.XYZ, m Mode) mix {
	w := c.wuv[whiteIndex(m)]
	da := xa.X + 15*xa.Y + 3*xa.Z
	db := xb.X + 15*xb.Y + 3*xb.Z
	au, av := 4*xa.X/da, 9*xa.Y/da
	bu, bv := 4*xb.X/db, 9*xb.Y/db
	du, dv := bu-au, bv-av
	wu, wv := w.U-au, w.V-av
	l2 := du*du + dv*dv
	if !(l2 > 0) {
		d := math.Hypot(wu, wv)
		return mix{delta: d, line: d, same: true}
	}
	l := math.Sqrt(l2)
	mu := (wu*du + wv*dv) / l2
	line := math.Abs(du*wv-dv*wu) / l
	switch {
	case mu <= 0:
		return mix{delta: math.Hypot(wu, wv), line: line}
	case mu >= 1:
		return mix{mu: 1, t: math.Inf(1), delta: math.Hypot(w.U-bu, w.V-bv), line: line}
	}
	// μ = t·D_b / (D_a + t·D_b) ⇒ t = μ·D_a / ((1 − μ)·D_b).
	return mix{mu: mu, t: mu * da / ((1 - mu) * db), delta: line, line: line}
}
