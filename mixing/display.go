package mixing

import (
	"errors"
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/mat"
)

// ErrSingularPrimaries reports display primaries whose chromaticities are
// collinear (or a white on a side of their triangle), so that no RGB→XYZ
// matrix exists.
var ErrSingularPrimaries = errors.New("display primaries are collinear: no RGB to XYZ matrix")

// ErrWhiteOutsidePrimaries reports a display white that no positive mix of
// the primaries gives: it lies outside (or on a side of) their triangle.
var ErrWhiteOutsidePrimaries = errors.New("the white lies outside the primaries' triangle: no positive mix of them gives it")

// DisplayMatrix returns the 3×3 matrix M that takes a display's linear
// RGB (each 0–1, full drive = 1) to CIE XYZ, from the chromaticities of
// its red, green and blue primaries and of its white (R = G = B = 1),
// whose luminance is whiteY (100 for the usual relative scale, or the
// measured cd/m²). The method is that of SMPTE RP 177-1993: with P the
// matrix whose columns are the primaries' (x, y, 1 − x − y) and W the
// white's XYZ, the column scales are C = P⁻¹·W and M = P·diag(C). Rows of
// M are X, Y, Z; columns R, G, B.
//
// It returns an error for a chromaticity that is not finite or has y ≤ 0,
// a whiteY that is not positive and finite, ErrSingularPrimaries for
// collinear primaries, and ErrWhiteOutsidePrimaries for a white that needs
// a primary at zero or negative luminance.
func DisplayMatrix(r, g, b, white colorimetry.XY, whiteY float64) ([3][3]float64, error) {
	var out [3][3]float64
	for _, c := range []struct {
		name string
		xy   colorimetry.XY
	}{{"red", r}, {"green", g}, {"blue", b}, {"white", white}} {
		if !lightFinite(c.xy.X) || !lightFinite(c.xy.Y) || !(c.xy.Y > 0) {
			return out, fmt.Errorf("display matrix: %s chromaticity (%g, %g) is not valid", c.name, c.xy.X, c.xy.Y)
		}
	}
	if !(whiteY > 0) || math.IsInf(whiteY, 0) {
		return out, fmt.Errorf("display matrix: white luminance %g must be positive and finite", whiteY)
	}
	p := mat.NewDense(3, 3, []float64{
		r.X, g.X, b.X,
		r.Y, g.Y, b.Y,
		1 - r.X - r.Y, 1 - g.X - g.Y, 1 - b.X - b.Y,
	})
	w, _ := white.XYZ(whiteY)
	var c mat.VecDense
	if err := c.SolveVec(p, mat.NewVecDense(3, []float64{w.X, w.Y, w.Z})); err != nil {
		return out, fmt.Errorf("display matrix: %w", ErrSingularPrimaries)
	}
	for j := range 3 {
		if !(c.AtVec(j) > 0) {
			return out, fmt.Errorf("display matrix: white (%g, %g): %w", white.X, white.Y, ErrWhiteOutsidePrimaries)
		}
		for i := range 3 {
			out[i][j] = p.At(i, j) * c.AtVec(j)
		}
	}
	return out, nil
}

// WhiteBalance is the result of WhiteBalanceGains.
type WhiteBalance struct {
	// Gains are the R, G, B drive multipliers (linear, 0–1, the largest
	// 1) that give the target white as bright as the display allows.
	Gains [3]float64
	// Y is the luminance of the balanced white, on the scale of the
	// matrix's Y.
	Y float64
	// Reachable is false when the target lies outside the primaries'
	// triangle; Gains then hold the nearest corner-clipped mix (negative
	// gains set to 0).
	Reachable bool
	// DeltaUVPrime is the distance in the CIE 1976 UCS diagram from the
	// balanced white to the target (0 when reachable, to rounding).
	DeltaUVPrime float64
}

// WhiteBalanceGains returns the linear RGB gains that make a display with
// RGB→XYZ matrix m (see DisplayMatrix) show the target white chromaticity
// at the largest luminance: RGB ∝ M⁻¹·XYZ(target), scaled so that the
// largest gain is 1. It returns ErrSingularPrimaries for a singular m and
// an error for a target chromaticity with y ≤ 0 or not finite. A target
// outside the primaries' triangle is not an error (see
// WhiteBalance.Reachable).
func WhiteBalanceGains(m [3][3]float64, target colorimetry.XY) (WhiteBalance, error) {
	if !lightFinite(target.X) || !lightFinite(target.Y) || !(target.Y > 0) {
		return WhiteBalance{}, fmt.Errorf("white balance: target chromaticity (%g, %g) is not valid", target.X, target.Y)
	}
	a := mat.NewDense(3, 3, []float64{m[0][0], m[0][1], m[0][2], m[1][0], m[1][1], m[1][2], m[2][0], m[2][1], m[2][2]})
	t, _ := target.XYZ(1)
	var rgb mat.VecDense
	if err := rgb.SolveVec(a, mat.NewVecDense(3, []float64{t.X, t.Y, t.Z})); err != nil {
		return WhiteBalance{}, fmt.Errorf("white balance: %w", ErrSingularPrimaries)
	}
	wb := WhiteBalance{Reachable: true}
	var top float64
	for i := range 3 {
		v := rgb.AtVec(i)
		if v < 0 {
			// Beyond the triangle: a negative drive cannot be shown.
			if v < -1e-12*math.Abs(rgb.AtVec(0)+rgb.AtVec(1)+rgb.AtVec(2)) {
				wb.Reachable = false
			}
			v = 0
		}
		wb.Gains[i] = v
		top = math.Max(top, v)
	}
	if !(top > 0) {
		return WhiteBalance{Reachable: false}, fmt.Errorf("white balance: no positive mix of the primaries approaches (%g, %g)", target.X, target.Y)
	}
	var c colorimetry.XYZ
	for i := range 3 {
		wb.Gains[i] /= top
		c = c.Add(colorimetry.XYZ{X: m[0][i], Y: m[1][i], Z: m[2][i]}.Scale(wb.Gains[i]))
	}
	wb.Y = c.Y
	if uv, err := c.UVPrime(); err == nil {
		wb.DeltaUVPrime = colorimetry.DeltaUVPrime(uv, target.UVPrime())
	}
	return wb, nil
}
