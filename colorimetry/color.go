package colorimetry

import (
	"fmt"
	"math"
)

// Km is the maximum luminous efficacy of radiation for photopic vision,
// 683.002 lm/W (CIE 015:2018 §7.1; CIE 018:2019).
const Km = 683.002

// XYZ holds CIE tristimulus values. Object colours are on the scale where
// the perfect diffuser has Y = 100; lights are relative (a stated scale) or
// absolute photometric quantities.
type XYZ struct{ X, Y, Z float64 }

// XY is a CIE 1931 chromaticity (x, y).
type XY struct{ X, Y float64 }

// UVPrime is a CIE 1976 UCS chromaticity (u′, v′).
type UVPrime struct{ U, V float64 }

// UV is a CIE 1960 UCS chromaticity (u, v), used for correlated colour
// temperature: u = u′, v = 2v′/3.
type UV struct{ U, V float64 }

// Add returns c + d.
func (c XYZ) Add(d XYZ) XYZ { return XYZ{c.X + d.X, c.Y + d.Y, c.Z + d.Z} }

// Sub returns c − d.
func (c XYZ) Sub(d XYZ) XYZ { return XYZ{c.X - d.X, c.Y - d.Y, c.Z - d.Z} }

// Scale returns k·c.
func (c XYZ) Scale(k float64) XYZ { return XYZ{k * c.X, k * c.Y, k * c.Z} }

// Finite reports whether all three components are finite.
func (c XYZ) Finite() bool { return isFinite(c.X) && isFinite(c.Y) && isFinite(c.Z) }

// ScaleToY returns c scaled so that its Y equals y. It returns
// ErrZeroLuminance when c.Y is zero or not finite, and ErrNotFinite when
// y is not finite or the scaled values overflow the float64 range.
func (c XYZ) ScaleToY(y float64) (XYZ, error) {
	if c.Y == 0 || !c.Finite() {
		return XYZ{}, fmt.Errorf("cannot scale %v to Y = %g: %w", c, y, ErrZeroLuminance)
	}
	d := c.Scale(y / c.Y)
	if !d.Finite() {
		return XYZ{}, fmt.Errorf("scaling %v to Y = %g overflows: %w", c, y, ErrNotFinite)
	}
	return d, nil
}

// XY returns the chromaticity x = X/(X+Y+Z), y = Y/(X+Y+Z). It returns
// ErrZeroLuminance when X+Y+Z is zero or a component is not finite, and
// ErrNotFinite when the sum overflows the float64 range.
func (c XYZ) XY() (XY, error) {
	s := c.X + c.Y + c.Z
	if s == 0 || !c.Finite() {
		return XY{}, fmt.Errorf("chromaticity of %v: %w", c, ErrZeroLuminance)
	}
	if !isFinite(s) {
		return XY{}, fmt.Errorf("chromaticity of %v: X+Y+Z overflows: %w", c, ErrNotFinite)
	}
	return XY{c.X / s, c.Y / s}, nil
}

// UVPrime returns the CIE 1976 chromaticity u′ = 4X/(X+15Y+3Z),
// v′ = 9Y/(X+15Y+3Z). It returns ErrZeroLuminance when the denominator is
// zero or a component is not finite, and ErrNotFinite when the
// denominator or numerators overflow the float64 range.
func (c XYZ) UVPrime() (UVPrime, error) {
	d := c.X + 15*c.Y + 3*c.Z
	if d == 0 || !c.Finite() {
		return UVPrime{}, fmt.Errorf("u′v′ of %v: %w", c, ErrZeroLuminance)
	}
	p := UVPrime{4 * c.X / d, 9 * c.Y / d}
	if !isFinite(d) || !isFinite(p.U) || !isFinite(p.V) {
		return UVPrime{}, fmt.Errorf("u′v′ of %v: X+15Y+3Z overflows: %w", c, ErrNotFinite)
	}
	return p, nil
}

// UV returns the CIE 1960 chromaticity u, v. It returns ErrZeroLuminance
// as UVPrime does.
func (c XYZ) UV() (UV, error) {
	p, err := c.UVPrime()
	if err != nil {
		return UV{}, err
	}
	return p.UV(), nil
}

// String formats c with four decimals.
func (c XYZ) String() string { return fmt.Sprintf("XYZ(%.4f, %.4f, %.4f)", c.X, c.Y, c.Z) }

// XYZ returns the tristimulus values with luminance Y of the chromaticity
// p. It returns ErrZeroLuminance when p.Y is zero, and ErrNotFinite when
// the result overflows the float64 range.
func (p XY) XYZ(Y float64) (XYZ, error) {
	if p.Y == 0 || !isFinite(p.X) || !isFinite(p.Y) {
		return XYZ{}, fmt.Errorf("tristimulus values of chromaticity (%g, %g): %w", p.X, p.Y, ErrZeroLuminance)
	}
	c := XYZ{Y * p.X / p.Y, Y, Y * (1 - p.X - p.Y) / p.Y}
	if !c.Finite() {
		return XYZ{}, fmt.Errorf("tristimulus values of chromaticity (%g, %g) at Y = %g: %w", p.X, p.Y, Y, ErrNotFinite)
	}
	return c, nil
}

// UVPrime converts x, y to u′, v′ (CIE 015:2018 eq. 8.3–8.4). The result
// is undefined (infinite) where −2x + 12y + 3 = 0, outside the gamut of
// real colours.
func (p XY) UVPrime() UVPrime {
	d := -2*p.X + 12*p.Y + 3
	return UVPrime{4 * p.X / d, 9 * p.Y / d}
}

// XY converts u′, v′ to x, y.
func (p UVPrime) XY() XY {
	d := 6*p.U - 16*p.V + 12
	return XY{9 * p.U / d, 4 * p.V / d}
}

// UV converts u′, v′ to CIE 1960 u, v.
func (p UVPrime) UV() UV { return UV{p.U, 2 * p.V / 3} }

// UVPrime converts CIE 1960 u, v to u′, v′.
func (p UV) UVPrime() UVPrime { return UVPrime{p.U, 1.5 * p.V} }

// DeltaUVPrime returns Δu′v′, the Euclidean distance between a and b in
// the CIE 1976 UCS diagram.
func DeltaUVPrime(a, b UVPrime) float64 { return math.Hypot(a.U-b.U, a.V-b.V) }
