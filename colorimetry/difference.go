package colorimetry

import "math"

// Colour differences between two CIELAB colours, all in CIE units (a ΔE of
// 1 is, roughly, a just-noticeable difference; not the ΔE/100 of some
// libraries). They are hot-path functions: they return a float64 without
// an error, and their inputs must be finite; XYZ.Lab and Lab.XYZ validate
// the data that produce Lab values. With a NaN input the result is NaN.
// For components within ±LabLimit (which XYZ.Lab never exceeds) the result
// is finite.

// DeltaEab returns the CIE 1976 colour difference ΔE*ab, the Euclidean
// distance between a and b in CIELAB (CIE 015:2018 §8; ISO/CIE 11664-4),
// in CIE units.
func DeltaEab(a, b Lab) float64 {
	dl, da, db := a.L-b.L, a.A-b.A, a.B-b.B
	return math.Sqrt(dl*dl + da*da + db*db)
}

// CIE94Params holds the parametric factors and weighting constants of the
// CIE 1994 colour difference (CIE 116-1995): the lightness, chroma and hue
// parametric factors kL, kC, kH and the constants K1, K2 of the chroma and
// hue weights S_C = 1 + K1·C*, S_H = 1 + K2·C*.
type CIE94Params struct {
	KL, KC, KH float64 // parametric factors (1 under reference conditions)
	K1, K2     float64 // chroma and hue weighting constants
}

// The two parameter sets in use. CIE 116-1995 defines kL = kC = kH = 1,
// K1 = 0.045, K2 = 0.015; the textile industry uses kL = 2 with
// K1 = 0.048, K2 = 0.014 (common practice, no source at hand). Treat them
// as constants.
var (
	// CIE94GraphicArts is kL = kC = kH = 1, K1 = 0.045, K2 = 0.015.
	CIE94GraphicArts = CIE94Params{KL: 1, KC: 1, KH: 1, K1: 0.045, K2: 0.015}
	// CIE94Textiles is kL = 2, kC = kH = 1, K1 = 0.048, K2 = 0.014.
	CIE94Textiles = CIE94Params{KL: 2, KC: 1, KH: 1, K1: 0.048, K2: 0.014}
)

// chromaHueDiff returns the chroma C*ab of a and b, the chroma difference
// ΔC = C_a − C_b and the hue difference ΔH, whose square is
// Δa² + Δb² − ΔC² (clamped at 0 against rounding).
func chromaHueDiff(a, b Lab) (ca, cb, dc, dh float64) {
	ca = math.Hypot(a.A, a.B)
	cb = math.Hypot(b.A, b.B)
	dc = ca - cb
	da, db := a.A-b.A, a.B-b.B
	dh2 := da*da + db*db - dc*dc
	if dh2 > 0 {
		dh = math.Sqrt(dh2)
	}
	return ca, cb, dc, dh
}

// DeltaE94 returns the CIE 1994 colour difference ΔE*94 (CIE 116-1995) of
// the sample b from the reference (standard) a, in CIE units, with the
// parameters p (CIE94GraphicArts or CIE94Textiles). As CIE 116-1995
// prescribes for a standard and a batch, the weights S_C and S_H use the
// chroma of the reference a, so the formula is not symmetric: swapping a
// and b changes the result when their chromas differ.
func DeltaE94(a, b Lab, p CIE94Params) float64 {
	ca, _, dc, dh := chromaHueDiff(a, b)
	sc := 1 + p.K1*ca
	sh := 1 + p.K2*ca
	tl := (a.L - b.L) / p.KL // S_L = 1
	tc := dc / (p.KC * sc)
	th := dh / (p.KH * sh)
	return math.Sqrt(tl*tl + tc*tc + th*th)
}

// DeltaECMC returns the CMC(l:c) colour difference of the sample b from the
// standard a (Clarke, McDonald & Rigg 1984; ISO 105-J03), in CIE units,
// with lightness weight l and chroma weight c: CMC(2:1) for acceptability,
// CMC(1:1) for perceptibility. The weights are computed from the standard,
// so the formula is not symmetric: the first argument must be the
// standard.
func DeltaECMC(a, b Lab, l, c float64) float64 {
	ca, _, dc, dh := chromaHueDiff(a, b)
	h := hueDeg(a.B, a.A)
	var sl float64
	if a.L < 16 {
		sl = 0.511
	} else {
		sl = 0.040975 * a.L / (1 + 0.01765*a.L)
	}
	sc := 0.0638*ca/(1+0.0131*ca) + 0.638
	c4 := ca * ca * ca * ca
	f := 1.0 // the limit of √(C⁴/(C⁴+1900)) where C⁴ overflows
	if c4 <= math.MaxFloat64 {
		f = math.Sqrt(c4 / (c4 + 1900))
	}
	var t float64
	if 164 <= h && h <= 345 {
		t = 0.56 + math.Abs(0.2*math.Cos((h+168)*(math.Pi/180)))
	} else {
		t = 0.36 + math.Abs(0.4*math.Cos((h+35)*(math.Pi/180)))
	}
	sh := sc * (f*t + 1 - f)
	tl := (a.L - b.L) / (l * sl)
	tc := dc / (c * sc)
	th := dh / sh
	return math.Sqrt(tl*tl + tc*tc + th*th)
}

// DeltaE2000 returns the CIEDE2000 colour difference ΔE00 between a and b
// (CIE 142-2001; ISO/CIE 11664-6), in CIE units, with the parametric
// factors kL = kC = kH = 1. It follows the implementation notes of Sharma,
// Wu & Dalal (2005), including their rules for the mean hue and the hue
// difference; it is symmetric in a and b.
func DeltaE2000(a, b Lab) float64 { return DeltaE2000K(a, b, 1, 1, 1) }

// hue2000Eps is the slack, in degrees, with which CIEDE2000 compares the
// hue difference |h′₁ − h′₂| with 180°. Two hues exactly opposite in exact
// arithmetic (Sharma et al. 2005, pair 14) may come out of atan2 and the
// conversion to degrees a few ulp (≈ 1e-13°) apart from 180°, which would
// flip the mean hue by 180°; 1e-10° is far above that rounding and far
// below any meaningful hue difference.
const hue2000Eps = 1e-10

// pow25to7 is 25⁷, from the CIEDE2000 terms G and R_C.
const pow25to7 = 6103515625.0

// Trigonometric constants of the CIEDE2000 term T, in radians.
var (
	cos30, sin30 = math.Cos(30 * math.Pi / 180), math.Sin(30 * math.Pi / 180)
	cos6, sin6   = math.Cos(6 * math.Pi / 180), math.Sin(6 * math.Pi / 180)
	cos63, sin63 = math.Cos(63 * math.Pi / 180), math.Sin(63 * math.Pi / 180)
)

// DeltaE2000K returns the CIEDE2000 colour difference ΔE00 between a and b
// with the parametric factors kL, kC and kH (all 1 under the reference
// conditions of CIE 142-2001; the textile industry often uses kL = 2), in
// CIE units. See DeltaE2000.
//
// This is the optimised form of deltaE2000Ref: the same equations, with
// the four cosines of T taken from one sine and cosine of the mean hue by
// the multiple-angle identities and seventh powers by multiplication.
func DeltaE2000K(a, b Lab, kL, kC, kH float64) float64 {
	// Sharma et al. (2005), step 1: a′, C′. Lab values are far from the
	// range where x² overflows, so plain square roots serve for hypot.
	cab := (math.Sqrt(a.A*a.A+a.B*a.B) + math.Sqrt(b.A*b.A+b.B*b.B)) / 2
	g := 0.5 * (1 - math.Sqrt(ratio7(pow7(cab))))
	a1p := (1 + g) * a.A
	a2p := (1 + g) * b.A
	c1p := math.Sqrt(a1p*a1p + a.B*a.B)
	c2p := math.Sqrt(a2p*a2p + b.B*b.B)
	prod := c1p * c2p

	// Steps 2 and 3 work with the hue directions as unit vectors: the mean
	// hue h̄′ of CIEDE2000 is the bisector of the shorter arc between h′₁
	// and h′₂, so cos h̄′ and sin h̄′ come from u₁ + u₂, and
	// sin(Δh′/2) = ±|u₂ − u₁|/2 with the sign of Δh′ (that of u₁ × u₂).
	// This saves an arctangent and two sines against the angle form; the
	// angle form (deltaE2000Angles) handles a zero chroma and hues within
	// about 0.01° of opposite, where the bisector is ill-defined and
	// Sharma's 180° rules decide.
	if prod == 0 {
		return deltaE2000Angles(a, b, a1p, a2p, c1p, c2p, kL, kC, kH)
	}
	u1x, u1y := a1p/c1p, a.B/c1p
	u2x, u2y := a2p/c2p, b.B/c2p
	bx, by := u1x+u2x, u1y+u2y
	nb := math.Sqrt(bx*bx + by*by)
	if nb < 2e-4 {
		return deltaE2000Angles(a, b, a1p, a2p, c1p, c2p, kL, kC, kH)
	}
	cs, sn := bx/nb, by/nb
	dx, dy := u2x-u1x, u2y-u1y
	half := math.Sqrt(dx*dx+dy*dy) / 2 // |sin(Δh′/2)|
	if u1x*u2y-u1y*u2x < 0 {
		half = -half
	}
	dHp := 2 * math.Sqrt(prod) * half
	hbar := math.Atan2(sn, cs) * (180 / math.Pi)
	if hbar < 0 {
		hbar += 360
	}
	return deltaE2000Weights(a.L, b.L, c1p, c2p, dHp, hbar, sn, cs, kL, kC, kH)
}

// deltaE2000Angles is CIEDE2000 from step 2 on in the angle form of
// Sharma et al. (2005), for the cases DeltaE2000K leaves to it.
func deltaE2000Angles(a, b Lab, a1p, a2p, c1p, c2p, kL, kC, kH float64) float64 {
	h1p := hueDeg(a.B, a1p)
	h2p := hueDeg(b.B, a2p)
	var dhp, hbar float64
	prod := c1p * c2p
	if prod == 0 {
		dhp = 0
		hbar = h1p + h2p
	} else {
		d := h2p - h1p
		switch {
		case d > 180+hue2000Eps:
			dhp = d - 360
		case d < -180-hue2000Eps:
			dhp = d + 360
		default:
			dhp = d
		}
		s := h1p + h2p
		switch {
		case math.Abs(d) <= 180+hue2000Eps:
			hbar = s / 2
		case s < 360:
			hbar = (s + 360) / 2
		default:
			hbar = (s - 360) / 2
		}
	}
	dHp := 2 * math.Sqrt(prod) * math.Sin(dhp*(math.Pi/360))
	sn, cs := math.Sincos(hbar * (math.Pi / 180))
	return deltaE2000Weights(a.L, b.L, c1p, c2p, dHp, hbar, sn, cs, kL, kC, kH)
}

// deltaE2000Weights is step 3 of CIEDE2000: the weighting functions and
// ΔE00, given the mean hue h̄′ in degrees with its sine and cosine.
func deltaE2000Weights(l1, l2, c1p, c2p, dHp, hbar, sn, cs, kL, kC, kH float64) float64 {
	dLp := l2 - l1
	dCp := c2p - c1p
	lbar := (l1 + l2) / 2
	cbar := (c1p + c2p) / 2
	c2h, s2h := 2*cs*cs-1, 2*sn*cs
	c3h, s3h := cs*(4*cs*cs-3), sn*(3-4*sn*sn)
	c4h, s4h := 2*c2h*c2h-1, 2*s2h*c2h
	t := 1 - 0.17*(cs*cos30+sn*sin30) + 0.24*c2h +
		0.32*(c3h*cos6-s3h*sin6) - 0.20*(c4h*cos63+s4h*sin63)
	x := (hbar - 275) / 25
	dTheta := 30 * math.Exp(-x*x)
	rc := 2 * math.Sqrt(ratio7(pow7(cbar)))
	l50 := (lbar - 50) * (lbar - 50)
	sl := 1 + 0.015*l50/math.Sqrt(20+l50)
	sc := 1 + 0.045*cbar
	sh := 1 + 0.015*cbar*t
	rt := -math.Sin(dTheta*(math.Pi/90)) * rc

	tl := dLp / (kL * sl)
	tc := dCp / (kC * sc)
	th := dHp / (kH * sh)
	return math.Sqrt(tl*tl + tc*tc + th*th + rt*tc*th)
}

// ratio7 returns c7/(c7 + 25⁷), the CIEDE2000 chroma ratio of G and R_C,
// and its limit 1 where c7 = C⁷ overflowed to +Inf (C above about 1e44),
// so that large chromas give no NaN.
func ratio7(c7 float64) float64 {
	if c7 > math.MaxFloat64 {
		return 1
	}
	return c7 / (c7 + pow25to7)
}

// pow7 returns x⁷.
func pow7(x float64) float64 {
	x2 := x * x
	x3 := x2 * x
	return x3 * x3 * x
}

// de2000Terms holds the intermediate quantities of CIEDE2000 with the
// names of Sharma et al. (2005), Table 1: a′ᵢ, C′ᵢ, h′ᵢ (degrees), the
// mean hue h̄′ (degrees), G, T, S_L, S_C, S_H, R_T, and ΔE00.
type de2000Terms struct {
	A1p, C1p, H1p float64
	A2p, C2p, H2p float64
	HBar          float64
	G, T          float64
	SL, SC, SH    float64
	RT            float64
	DE            float64
}

// deltaE2000Ref is the plain reference implementation of CIEDE2000,
// transcribed equation by equation from Sharma, Wu & Dalal (2005),
// steps 1–3, with the same 180° slack as DeltaE2000K. It returns the
// intermediate quantities of their Table 1 as well as ΔE00.
func deltaE2000Ref(a, b Lab, kL, kC, kH float64) de2000Terms {
	const deg = math.Pi / 180
	var r de2000Terms
	// Eq. 2–7.
	c1 := math.Sqrt(a.A*a.A + a.B*a.B)
	c2 := math.Sqrt(b.A*b.A + b.B*b.B)
	cab := (c1 + c2) / 2
	r.G = 0.5 * (1 - math.Sqrt(math.Pow(cab, 7)/(math.Pow(cab, 7)+math.Pow(25, 7))))
	r.A1p = (1 + r.G) * a.A
	r.A2p = (1 + r.G) * b.A
	r.C1p = math.Sqrt(r.A1p*r.A1p + a.B*a.B)
	r.C2p = math.Sqrt(r.A2p*r.A2p + b.B*b.B)
	hp := func(bb, ap float64) float64 {
		if bb == 0 && ap == 0 {
			return 0
		}
		h := math.Atan2(bb, ap) / deg
		if h < 0 {
			h += 360
		}
		if h >= 360 {
			h -= 360
		}
		return h
	}
	r.H1p = hp(a.B, r.A1p)
	r.H2p = hp(b.B, r.A2p)
	// Eq. 8–11.
	dLp := b.L - a.L
	dCp := r.C2p - r.C1p
	var dhp float64
	switch d := r.H2p - r.H1p; {
	case r.C1p*r.C2p == 0:
		dhp = 0
	case math.Abs(d) <= 180+hue2000Eps:
		dhp = d
	case d > 180:
		dhp = d - 360
	default:
		dhp = d + 360
	}
	dHp := 2 * math.Sqrt(r.C1p*r.C2p) * math.Sin(dhp/2*deg)
	// Eq. 12–22.
	lbar := (a.L + b.L) / 2
	cbar := (r.C1p + r.C2p) / 2
	switch s := r.H1p + r.H2p; {
	case r.C1p*r.C2p == 0:
		r.HBar = s
	case math.Abs(r.H1p-r.H2p) <= 180+hue2000Eps:
		r.HBar = s / 2
	case s < 360:
		r.HBar = (s + 360) / 2
	default:
		r.HBar = (s - 360) / 2
	}
	h := r.HBar
	r.T = 1 - 0.17*math.Cos((h-30)*deg) + 0.24*math.Cos(2*h*deg) +
		0.32*math.Cos((3*h+6)*deg) - 0.20*math.Cos((4*h-63)*deg)
	dTheta := 30 * math.Exp(-math.Pow((h-275)/25, 2))
	rc := 2 * math.Sqrt(math.Pow(cbar, 7)/(math.Pow(cbar, 7)+math.Pow(25, 7)))
	r.SL = 1 + 0.015*math.Pow(lbar-50, 2)/math.Sqrt(20+math.Pow(lbar-50, 2))
	r.SC = 1 + 0.045*cbar
	r.SH = 1 + 0.015*cbar*r.T
	r.RT = -math.Sin(2*dTheta*deg) * rc
	tl := dLp / (kL * r.SL)
	tc := dCp / (kC * r.SC)
	th := dHp / (kH * r.SH)
	r.DE = math.Sqrt(tl*tl + tc*tc + th*th + r.RT*tc*th)
	return r
}
