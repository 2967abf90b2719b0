package colorimetry

import (
	"errors"
	"fmt"
	"math"
)

// ErrConeResponse reports a white point whose cone (or sharpened) response
// under a chromatic adaptation transform has a component that is zero or
// negative, so that the von Kries scaling between two whites is undefined.
var ErrConeResponse = errors.New("cone response of the white is not positive")

// CAT selects a linear chromatic adaptation transform of the von Kries
// type: the tristimulus values are taken to a cone (or sharpened) response
// space by a 3×3 matrix M, each response is scaled by the ratio of the
// destination white's response to the source white's, and the result is
// taken back by M⁻¹. Adaptation is complete (degree of adaptation D = 1).
// The zero CAT is Bradford.
type CAT int

const (
	// Bradford is the linearised Bradford transform (Lam 1985; Hunt,
	// The Reproduction of Colour, 6th ed., 2004; ICC.1 Annex E).
	Bradford CAT = iota
	// CAT02 is the transform of CIECAM02 (CIE 159:2004).
	CAT02
	// CAT16 is the transform of CAM16 (Li, Li, Wang, Zu, Luo, Cui, Melgosa,
	// Brill & Pointer 2017, Color Res. Appl. 42(6) 703–718; citation from
	// memory).
	CAT16
	// VonKries uses the Hunt–Pointer–Estévez cone fundamentals,
	// normalised so that the equal-energy illuminant E (X = Y = Z) gives
	// equal cone responses, as printed in CIE 159:2004 (the M_HPE matrix of
	// CIECAM02). The normalisation of a cone matrix does not change the
	// adaptation it yields: a diagonal factor cancels between M, the
	// response ratios and M⁻¹.
	VonKries
)

// catMatrices are the cone response matrices M of each CAT, rows L, M, S
// (or R, G, B sharpened), typed from memory with the digits their sources
// print.
var catMatrices = [...][3][3]float64{
	Bradford: { // Lam (1985), as printed by Hunt (2004) and ICC.1 Annex E; from memory.
		{0.8951, 0.2664, -0.1614},
		{-0.7502, 1.7135, 0.0367},
		{0.0389, -0.0685, 1.0296},
	},
	CAT02: { // CIE 159:2004, M_CAT02; from memory.
		{0.7328, 0.4296, -0.1624},
		{-0.7036, 1.6975, 0.0061},
		{0.0030, 0.0136, 0.9834},
	},
	CAT16: { // Li et al. (2017), M_16; from memory.
		{0.401288, 0.650173, -0.051461},
		{-0.250268, 1.204414, 0.045854},
		{-0.002079, 0.048952, 0.953127},
	},
	VonKries: { // Hunt–Pointer–Estévez, CIE 159:2004 M_HPE; from memory.
		{0.38971, 0.68898, -0.07868},
		{-0.22981, 1.18340, 0.04641},
		{0, 0, 1},
	},
}

// catInverses are the inverses of catMatrices, computed once.
var catInverses = func() (inv [len(catMatrices)][3][3]float64) {
	for i, m := range catMatrices {
		inv[i], _ = invert3(m)
	}
	return inv
}()

// String returns the transform's name.
func (cat CAT) String() string {
	switch cat {
	case Bradford:
		return "Bradford"
	case CAT02:
		return "CAT02"
	case CAT16:
		return "CAT16"
	case VonKries:
		return "von Kries"
	}
	return fmt.Sprintf("CAT(%d)", int(cat))
}

// valid reports whether cat is one of the defined transforms.
func (cat CAT) valid() bool { return cat >= 0 && int(cat) < len(catMatrices) }

// Matrix returns the cone response matrix M of cat, which takes XYZ to the
// transform's cone (or sharpened) responses: ρ = M·XYZ. It returns the
// zero matrix for an undefined CAT.
func (cat CAT) Matrix() [3][3]float64 {
	if !cat.valid() {
		return [3][3]float64{}
	}
	return catMatrices[cat]
}

// Adaptation is a chromatic adaptation from one white point to another,
// precomputed for reuse in hot loops: the corresponding colour under the
// destination white is M·XYZ. The zero Adaptation maps every colour to
// black; build one with NewAdaptation.
type Adaptation struct {
	// M is the full 3×3 matrix M_cat⁻¹ · diag(ρ_to/ρ_from) · M_cat, which
	// maps tristimulus values under the source white to the corresponding
	// values under the destination white, on the destination white's scale.
	M [3][3]float64
}

// NewAdaptation returns the chromatic adaptation by cat that maps the white
// point from onto the white point to (any common scale; the result takes
// the scale of to). It returns an error wrapping ErrWhitePoint for a white
// with a component that is not positive and finite, ErrConeResponse for a
// white whose cone response is not positive, and an error for an undefined
// CAT.
func NewAdaptation(from, to XYZ, cat CAT) (Adaptation, error) {
	if !cat.valid() {
		return Adaptation{}, fmt.Errorf("colorimetry: undefined chromatic adaptation transform %v", cat)
	}
	if err := checkWhite(from); err != nil {
		return Adaptation{}, fmt.Errorf("source white: %w", err)
	}
	if err := checkWhite(to); err != nil {
		return Adaptation{}, fmt.Errorf("destination white: %w", err)
	}
	a, err := vonKriesScaling(&catMatrices[cat], &catInverses[cat], from, to)
	if err != nil {
		return Adaptation{}, fmt.Errorf("%v adaptation from %v to %v: %w", cat, from, to, err)
	}
	return a, nil
}

// vonKriesScaling returns the adaptation inv · diag(ρ_to/ρ_from) · m for
// the cone matrix m and its inverse inv, with ρ = m·white. It returns an
// error wrapping ErrConeResponse when a cone response is not positive.
func vonKriesScaling(m, inv *[3][3]float64, from, to XYZ) (Adaptation, error) {
	rs, rd := mulVec3(m, from), mulVec3(m, to)
	var k [3]float64
	for i := range k {
		if !(rs[i] > 0) || !(rd[i] > 0) {
			return Adaptation{}, fmt.Errorf("responses %.6g and %.6g: %w", rs, rd, ErrConeResponse)
		}
		k[i] = rd[i] / rs[i]
	}
	var a Adaptation
	for i := range 3 {
		for j := range 3 {
			var s float64
			for n := range 3 {
				s += inv[i][n] * k[n] * m[n][j]
			}
			a.M[i][j] = s
		}
	}
	return a, nil
}

// Apply returns the corresponding colour of c under the destination white.
func (a Adaptation) Apply(c XYZ) XYZ {
	v := mulVec3(&a.M, c)
	return XYZ{v[0], v[1], v[2]}
}

// ApplyTo writes the corresponding colours of src into dst and returns dst,
// allocating when dst is nil. It panics if dst is non-nil with a length
// other than len(src). dst and src may be the same slice.
func (a Adaptation) ApplyTo(dst, src []XYZ) []XYZ {
	if dst == nil {
		dst = make([]XYZ, len(src))
	}
	if len(dst) != len(src) {
		panic("colorimetry: dst length differs from src length")
	}
	for i, c := range src {
		dst[i] = a.Apply(c)
	}
	return dst
}

// Adapt returns the corresponding colour of c, seen under the white point
// from, when seen under the white point to, by the chromatic adaptation
// transform cat with complete adaptation. c and from share one scale; the
// result is on the scale of to. For many colours, build the matrix once
// with NewAdaptation. Adapt returns an error wrapping ErrNotFinite for a
// non-finite c and the errors of NewAdaptation. Special cases are:
//
//	Adapt(from, from, to, cat) = to (to rounding)
func Adapt(c, from, to XYZ, cat CAT) (XYZ, error) {
	if !c.Finite() {
		return XYZ{}, fmt.Errorf("adapting %v: %w", c, ErrNotFinite)
	}
	a, err := NewAdaptation(from, to, cat)
	if err != nil {
		return XYZ{}, err
	}
	return a.Apply(c), nil
}

// mulVec3 returns m·c.
func mulVec3(m *[3][3]float64, c XYZ) [3]float64 {
	return [3]float64{
		m[0][0]*c.X + m[0][1]*c.Y + m[0][2]*c.Z,
		m[1][0]*c.X + m[1][1]*c.Y + m[1][2]*c.Z,
		m[2][0]*c.X + m[2][1]*c.Y + m[2][2]*c.Z,
	}
}

// invert3 returns the inverse of m by the adjugate, and false when m is
// singular (zero or non-finite determinant).
func invert3(m [3][3]float64) ([3][3]float64, bool) {
	c00 := m[1][1]*m[2][2] - m[1][2]*m[2][1]
	c01 := m[1][2]*m[2][0] - m[1][0]*m[2][2]
	c02 := m[1][0]*m[2][1] - m[1][1]*m[2][0]
	det := m[0][0]*c00 + m[0][1]*c01 + m[0][2]*c02
	if det == 0 || math.IsNaN(det) || math.IsInf(det, 0) {
		return [3][3]float64{}, false
	}
	d := 1 / det
	return [3][3]float64{
		{c00 * d, (m[0][2]*m[2][1] - m[0][1]*m[2][2]) * d, (m[0][1]*m[1][2] - m[0][2]*m[1][1]) * d},
		{c01 * d, (m[0][0]*m[2][2] - m[0][2]*m[2][0]) * d, (m[0][2]*m[1][0] - m[0][0]*m[1][2]) * d},
		{c02 * d, (m[0][1]*m[2][0] - m[0][0]*m[2][1]) * d, (m[0][0]*m[1][1] - m[0][1]*m[1][0]) * d},
	}, true
}
