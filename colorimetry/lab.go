package colorimetry

import (
	"errors"
	"fmt"
	"math"
)

// ErrWhitePoint reports a white point that cannot serve as the reference of
// a relative colour space or of a chromatic adaptation: a component that is
// zero, negative or not finite. The error also wraps ErrZeroLuminance when
// Y ≤ 0 and ErrNotFinite when a component is NaN or infinite.
var ErrWhitePoint = errors.New("invalid white point")

// Lab is a CIE 1976 L*a*b* (CIELAB) colour, relative to a white point
// (CIE 015:2018 §8; ISO/CIE 11664-4). L* runs from 0 (black) to 100 (the
// white); a* and b* are in the same CIE units, unbounded, zero on the
// neutral axis.
type Lab struct{ L, A, B float64 }

// LabLimit bounds the CIELAB and CIELUV components the package returns
// without an error: XYZ.Lab and XYZ.Luv refuse results beyond ±1e150
// (tristimulus values some 1e445 times the white's — not a colour), so
// that squares and sums of components in the colour differences cannot
// overflow.
const LabLimit = 1e150

// withinLimit reports whether |v| ≤ LabLimit for each value (false for
// NaN).
func withinLimit(v ...float64) bool {
	for _, x := range v {
		if !(math.Abs(x) <= LabLimit) {
			return false
		}
	}
	return true
}

// LCh is a CIELAB colour in cylindrical coordinates (ISO/CIE 11664-4):
// lightness L* (0–100), chroma C*ab (≥ 0, CIE units) and hue angle h_ab in
// degrees in [0, 360).
type LCh struct{ L, C, H float64 }

// Luv is a CIE 1976 L*u*v* (CIELUV) colour, relative to a white point
// (CIE 015:2018 §8; ISO/CIE 11664-5). L* is the CIELAB lightness (0–100);
// u* and v* are in CIE units.
type Luv struct{ L, U, V float64 }

// LChuv is a CIELUV colour in cylindrical coordinates: lightness L*
// (0–100), chroma C*uv (≥ 0, CIE units) and hue angle h_uv in degrees in
// [0, 360).
type LChuv struct{ L, C, H float64 }

// The CIE lightness function of CIE 015:2018 §8 and ISO/CIE 11664-4, written
// with its exact constants: f(t) = t^(1/3) for t > (6/29)³, and
// f(t) = t/(3·(6/29)²) + 4/29 otherwise. The two branches meet with equal
// value and slope at t = (6/29)³ = 216/24389, where L* = 8.
const (
	labDelta   = 6.0 / 29.0
	labEpsilon = labDelta * labDelta * labDelta // (6/29)³ = 216/24389
	labSlope   = 1 / (3 * labDelta * labDelta)  // 841/108
	labOffset  = 4.0 / 29.0                     // 16/116
)

// labF is the CIE function f(t) of CIELAB (ISO/CIE 11664-4).
func labF(t float64) float64 {
	if t > labEpsilon {
		return math.Cbrt(t)
	}
	return labSlope*t + labOffset
}

// labFInv is the inverse of labF.
func labFInv(f float64) float64 {
	if f > labDelta {
		return f * f * f
	}
	return (f - labOffset) / labSlope
}

// checkWhite returns an error unless white has finite, positive X, Y and Z.
func checkWhite(white XYZ) error {
	switch {
	case !white.Finite():
		return fmt.Errorf("%w %v: %w", ErrWhitePoint, white, ErrNotFinite)
	case !(white.Y > 0):
		return fmt.Errorf("%w %v: %w", ErrWhitePoint, white, ErrZeroLuminance)
	case !(white.X > 0) || !(white.Z > 0):
		return fmt.Errorf("%w %v: X and Z must be positive", ErrWhitePoint, white)
	}
	return nil
}

// Lab returns the CIELAB coordinates of c relative to the white point white
// (CIE 015:2018 §8; ISO/CIE 11664-4), with both on the same scale (usually
// Y of the white = 100). The white is the tristimulus value of the perfect
// diffuser under the illuminant and observer that gave c; to compare
// colours seen under different whites, adapt them first (see Adapt).
//
// Values of c outside the gamut of real colours (negative components) are
// converted with the same formulas; the linear branch of f then applies.
// It returns an error wrapping ErrNotFinite for a non-finite c, and
// ErrWhitePoint for a white with a component that is not positive and
// finite. Special cases are:
//
//	white.Lab(white) = Lab{100, 0, 0}
//	XYZ{}.Lab(white) = Lab{0, 0, 0}
func (c XYZ) Lab(white XYZ) (Lab, error) {
	if err := checkWhite(white); err != nil {
		return Lab{}, err
	}
	if !c.Finite() {
		return Lab{}, fmt.Errorf("CIELAB of %v: %w", c, ErrNotFinite)
	}
	fx := labF(c.X / white.X)
	fy := labF(c.Y / white.Y)
	fz := labF(c.Z / white.Z)
	lab := Lab{L: 116*fy - 16, A: 500 * (fx - fy), B: 200 * (fy - fz)}
	if !withinLimit(lab.L, lab.A, lab.B) {
		return Lab{}, fmt.Errorf("CIELAB of %v relative to %v is beyond ±%g: %w", c, white, LabLimit, ErrNotFinite)
	}
	return lab, nil
}

// XYZ returns the tristimulus values of the CIELAB colour c relative to the
// white point white, on the white's scale: the inverse of XYZ.Lab
// (ISO/CIE 11664-4). It returns an error wrapping ErrNotFinite for a
// non-finite c and ErrWhitePoint for an invalid white.
func (c Lab) XYZ(white XYZ) (XYZ, error) {
	if err := checkWhite(white); err != nil {
		return XYZ{}, err
	}
	if !c.Finite() {
		return XYZ{}, fmt.Errorf("tristimulus values of %v: %w", c, ErrNotFinite)
	}
	fy := (c.L + 16) / 116
	fx := fy + c.A/500
	fz := fy - c.B/200
	x := XYZ{
		X: white.X * labFInv(fx),
		Y: white.Y * labFInv(fy),
		Z: white.Z * labFInv(fz),
	}
	if !x.Finite() {
		return XYZ{}, fmt.Errorf("tristimulus values of %v overflow the float64 range: %w", c, ErrNotFinite)
	}
	return x, nil
}

// Finite reports whether all three components of c are finite.
func (c Lab) Finite() bool { return isFinite(c.L) && isFinite(c.A) && isFinite(c.B) }

// String formats c with four decimals.
func (c Lab) String() string { return fmt.Sprintf("Lab(%.4f, %.4f, %.4f)", c.L, c.A, c.B) }

// hueDeg returns atan2(y, x) in degrees in [0, 360), and 0 for x = y = 0.
func hueDeg(y, x float64) float64 {
	if x == 0 && y == 0 {
		return 0
	}
	h := math.Atan2(y, x) * (180 / math.Pi)
	if h < 0 {
		h += 360
		// A tiny negative angle rounds to 360 when shifted.
		if h >= 360 {
			h = 0
		}
	}
	return h + 0 // turns −0 into +0
}

// polar returns the chroma and hue angle (degrees in [0, 360)) of (x, y).
func polar(x, y float64) (c, h float64) { return math.Hypot(x, y), hueDeg(y, x) }

// cartesian returns the rectangular components of chroma c at hue h
// (degrees).
func cartesian(c, h float64) (x, y float64) {
	s, co := math.Sincos(h * (math.Pi / 180))
	return c * co, c * s
}

// LCh returns c in cylindrical coordinates: chroma C*ab = √(a*² + b*²) and
// hue angle h_ab = atan2(b*, a*) in degrees in [0, 360)
// (ISO/CIE 11664-4). Special cases are:
//
//	Lab{L, 0, 0}.LCh() = LCh{L, 0, 0}  (the hue of a neutral is 0)
//	Lab{L, NaN, b}.LCh() = LCh{L, NaN, NaN}
func (c Lab) LCh() LCh {
	ch, h := polar(c.A, c.B)
	return LCh{L: c.L, C: ch, H: h}
}

// Lab returns the rectangular CIELAB coordinates a* = C cos h,
// b* = C sin h of c. Any hue angle in degrees is accepted, also outside
// [0, 360).
func (c LCh) Lab() Lab {
	a, b := cartesian(c.C, c.H)
	return Lab{L: c.L, A: a, B: b}
}

// String formats c with four decimals.
func (c LCh) String() string { return fmt.Sprintf("LCh(%.4f, %.4f, %.4f°)", c.L, c.C, c.H) }

// Luv returns the CIELUV coordinates of c relative to the white point white
// (CIE 015:2018 §8; ISO/CIE 11664-5): L* as in CIELAB,
// u* = 13 L* (u′ − u′n), v* = 13 L* (v′ − v′n), with u′, v′ the CIE 1976 UCS chromaticities of c
// and of the white. Both are on the same scale (usually Y of the white =
// 100). It returns an error wrapping ErrNotFinite for a non-finite c and
// ErrWhitePoint for an invalid white. Special cases are:
//
//	white.Luv(white) = Luv{100, 0, 0}
//	c.Luv(white) = Luv{L*, 0, 0} when X + 15Y + 3Z = 0 (black, whose u′v′ is undefined)
func (c XYZ) Luv(white XYZ) (Luv, error) {
	if err := checkWhite(white); err != nil {
		return Luv{}, err
	}
	if !c.Finite() {
		return Luv{}, fmt.Errorf("CIELUV of %v: %w", c, ErrNotFinite)
	}
	l := 116*labF(c.Y/white.Y) - 16
	d := c.X + 15*c.Y + 3*c.Z
	if d == 0 {
		if !withinLimit(l) {
			return Luv{}, fmt.Errorf("CIELUV of %v relative to %v is beyond ±%g: %w", c, white, LabLimit, ErrNotFinite)
		}
		return Luv{L: l}, nil
	}
	dn := white.X + 15*white.Y + 3*white.Z
	du := 4*c.X/d - 4*white.X/dn
	dv := 9*c.Y/d - 9*white.Y/dn
	luv := Luv{L: l, U: 13 * l * du, V: 13 * l * dv}
	if !withinLimit(luv.L, luv.U, luv.V) {
		return Luv{}, fmt.Errorf("CIELUV of %v relative to %v is beyond ±%g: %w", c, white, LabLimit, ErrNotFinite)
	}
	return luv, nil
}

// XYZ returns the tristimulus values of the CIELUV colour c relative to the
// white point white, on the white's scale: the inverse of XYZ.Luv. It
// returns an error wrapping ErrNotFinite for a non-finite c or for a colour
// whose chromaticity would have v′ = 0 (no finite tristimulus values), and
// ErrWhitePoint for an invalid white. Special cases are:
//
//	Luv{0, u, v}.XYZ(white) = XYZ{0, 0, 0} for any u, v
func (c Luv) XYZ(white XYZ) (XYZ, error) {
	if err := checkWhite(white); err != nil {
		return XYZ{}, err
	}
	if !c.Finite() {
		return XYZ{}, fmt.Errorf("tristimulus values of %v: %w", c, ErrNotFinite)
	}
	if c.L == 0 {
		return XYZ{}, nil
	}
	y := white.Y * labFInv((c.L+16)/116)
	dn := white.X + 15*white.Y + 3*white.Z
	u := c.U/(13*c.L) + 4*white.X/dn
	v := c.V/(13*c.L) + 9*white.Y/dn
	r := XYZ{X: y * 9 * u / (4 * v), Y: y, Z: y * (12 - 3*u - 20*v) / (4 * v)}
	if !r.Finite() {
		return XYZ{}, fmt.Errorf("tristimulus values of %v (u′ %g, v′ %g): %w", c, u, v, ErrNotFinite)
	}
	return r, nil
}

// Finite reports whether all three components of c are finite.
func (c Luv) Finite() bool { return isFinite(c.L) && isFinite(c.U) && isFinite(c.V) }

// String formats c with four decimals.
func (c Luv) String() string { return fmt.Sprintf("Luv(%.4f, %.4f, %.4f)", c.L, c.U, c.V) }

// LCh returns c in cylindrical coordinates: chroma C*uv = √(u*² + v*²) and
// hue angle h_uv = atan2(v*, u*) in degrees in [0, 360)
// (ISO/CIE 11664-5). Special cases are:
//
//	Luv{L, 0, 0}.LCh() = LChuv{L, 0, 0}  (the hue of a neutral is 0)
func (c Luv) LCh() LChuv {
	ch, h := polar(c.U, c.V)
	return LChuv{L: c.L, C: ch, H: h}
}

// Luv returns the rectangular CIELUV coordinates u* = C cos h,
// v* = C sin h of c. Any hue angle in degrees is accepted.
func (c LChuv) Luv() Luv {
	u, v := cartesian(c.C, c.H)
	return Luv{L: c.L, U: u, V: v}
}

// String formats c with four decimals.
func (c LChuv) String() string {
	return fmt.Sprintf("LChuv(%.4f, %.4f, %.4f°)", c.L, c.C, c.H)
}
