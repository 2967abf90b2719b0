package rendering

import (
	"math"

	"github.com/antipode-color/antipode/colorimetry"
)

// CIECAM02 (CIE 159:2004) and its uniform colour space CAM02-UCS (Luo, Cui
// & Li 2006, Color Res. Appl. 31(4) 320–330), as far as CIE 224:2017
// needs them: the forward model to lightness J, colourfulness M and hue
// angle h, and the J′a′b′ coordinates. Equations and constants are from
// memory and are checked against a worked example in the tests.

// viewing holds the CIECAM02 viewing conditions.
type viewing struct {
	la float64 // luminance of the adapting field, cd/m²
	yb float64 // relative luminance of the background (white = 100)
	f  float64 // surround factor F
	c  float64 // impact of surround c
	nc float64 // chromatic induction factor Nc
	// d is the degree of adaptation D, 0–1; a negative d asks for the
	// CIECAM02 formula D = F·(1 − (1/3.6)·exp((−LA − 42)/92)).
	d float64
}

// view224 are the viewing conditions of CIE 224:2017: LA = 100 cd/m²,
// Yb = 20, average surround (F = 1, c = 0.69, Nc = 1) and complete
// adaptation D = 1 (from memory).
var view224 = viewing{la: 100, yb: 20, f: 1, c: 0.69, nc: 1, d: 1}

// cam02 is the CIECAM02 model for one adopted white and one set of
// viewing conditions.
type cam02 struct {
	v        viewing
	dRGB     [3]float64 // D·Yw/Rw + 1 − D for each sharpened response
	fl       float64    // luminance-level adaptation factor F_L
	n        float64    // Yb/Yw
	nbb, ncb float64
	z        float64
	aw       float64 // achromatic response of the white
	cz       float64 // exponent c·z of J
	cFactor  float64 // (1.64 − 0.29ⁿ)^0.73 of C
	fl4      float64 // F_L^¼ of M
	flOver   float64 // F_L/100
}

// mCAT02 and mHPE are the CAT02 and Hunt–Pointer–Estévez matrices of CIE
// 159:2004, shared with package colorimetry; hpeCAT02inv is M_HPE·M_CAT02⁻¹.
var (
	mCAT02      = colorimetry.CAT02.Matrix()
	hpeCAT02inv = mul3(colorimetry.VonKries.Matrix(), inv3(mCAT02))
)

// newCAM02 returns the model for the adopted white w (Y of the white on
// the 0–100 scale) in the viewing conditions v.
func newCAM02(w colorimetry.XYZ, v viewing) cam02 {
	m := cam02{v: v}
	d := v.d
	if d < 0 {
		d = v.f * (1 - math.Exp((-v.la-42)/92)/3.6)
		d = math.Min(math.Max(d, 0), 1)
	}
	rgbw := apply3(&mCAT02, [3]float64{w.X, w.Y, w.Z})
	for i := range m.dRGB {
		m.dRGB[i] = d*w.Y/rgbw[i] + 1 - d
	}
	k := 1 / (5*v.la + 1)
	k4 := k * k * k * k
	m.fl = 0.2*k4*(5*v.la) + 0.1*(1-k4)*(1-k4)*math.Cbrt(5*v.la)
	m.n = v.yb / w.Y
	m.nbb = 0.725 * math.Pow(1/m.n, 0.2)
	m.ncb = m.nbb
	m.z = 1.48 + math.Sqrt(m.n)
	m.cz = v.c * m.z
	m.cFactor = math.Pow(1.64-math.Pow(0.29, m.n), 0.73)
	m.fl4 = math.Pow(m.fl, 0.25)
	m.flOver = m.fl / 100
	aw := m.adapted(w)
	m.aw = (2*aw[0] + aw[1] + aw[2]/20 - 0.305) * m.nbb
	return m
}

// adapted returns the post-adaptation cone responses R′a, G′a, B′a of c.
func (m cam02) adapted(c colorimetry.XYZ) [3]float64 {
	rgb := apply3(&mCAT02, [3]float64{c.X, c.Y, c.Z})
	for i := range rgb {
		rgb[i] *= m.dRGB[i]
	}
	p := apply3(&hpeCAT02inv, rgb)
	for i, x := range p {
		t := math.Pow(m.flOver*math.Abs(x), 0.42)
		p[i] = math.Copysign(400*t/(27.13+t), x) + 0.1
	}
	return p
}

// jch returns lightness J, chroma C, hue angle h (degrees, [0, 360)) and
// colourfulness M of the colour c (same scale as the white).
func (m cam02) jch(c colorimetry.XYZ) (j, ch, h, mm float64) {
	p := m.adapted(c)
	a := p[0] - 12*p[1]/11 + p[2]/11
	b := (p[0] + p[1] - 2*p[2]) / 9
	h = math.Atan2(b, a) * 180 / math.Pi
	if h < 0 {
		h += 360
	}
	et := (math.Cos(h*math.Pi/180+2) + 3.8) / 4
	A := (2*p[0] + p[1] + p[2]/20 - 0.305) * m.nbb
	if A > 0 && m.aw > 0 {
		j = 100 * math.Pow(A/m.aw, m.cz)
	}
	den := p[0] + p[1] + 21*p[2]/20
	var t float64
	if den != 0 {
		t = (50000.0 / 13 * m.v.nc * m.ncb * et * math.Hypot(a, b)) / den
	}
	ch = math.Pow(t, 0.9) * math.Sqrt(j/100) * m.cFactor
	mm = ch * m.fl4
	return j, ch, h, mm
}

// ucs returns the CAM02-UCS coordinates J′, a′, b′ of c (Luo, Cui & Li
// 2006: c1 = 0.007, c2 = 0.0228; from memory).
func (m cam02) ucs(c colorimetry.XYZ) [3]float64 {
	j, _, h, mm := m.jch(c)
	jp := 1.7 * j / (1 + 0.007*j)
	mp := math.Log1p(0.0228*mm) / 0.0228
	hr := h * math.Pi / 180
	return [3]float64{jp, mp * math.Cos(hr), mp * math.Sin(hr)}
}

func apply3(m *[3][3]float64, v [3]float64) [3]float64 {
	return [3]float64{
		m[0][0]*v[0] + m[0][1]*v[1] + m[0][2]*v[2],
		m[1][0]*v[0] + m[1][1]*v[1] + m[1][2]*v[2],
		m[2][0]*v[0] + m[2][1]*v[1] + m[2][2]*v[2],
	}
}

func mul3(a, b [3][3]float64) [3][3]float64 {
	var c [3][3]float64
	for i := range 3 {
		for j := range 3 {
			for k := range 3 {
				c[i][j] += a[i][k] * b[k][j]
			}
		}
	}
	return c
}

// inv3 returns the inverse of the (non-singular, constant) matrix m.
func inv3(m [3][3]float64) [3][3]float64 {
	c00 := m[1][1]*m[2][2] - m[1][2]*m[2][1]
	c01 := m[1][2]*m[2][0] - m[1][0]*m[2][2]
	c02 := m[1][0]*m[2][1] - m[1][1]*m[2][0]
	d := 1 / (m[0][0]*c00 + m[0][1]*c01 + m[0][2]*c02)
	return [3][3]float64{
		{c00 * d, (m[0][2]*m[2][1] - m[0][1]*m[2][2]) * d, (m[0][1]*m[1][2] - m[0][2]*m[1][1]) * d},
		{c01 * d, (m[0][0]*m[2][2] - m[0][2]*m[2][0]) * d, (m[0][2]*m[1][0] - m[0][0]*m[1][2]) * d},
		{c02 * d, (m[0][1]*m[2][0] - m[0][0]*m[2][1]) * d, (m[0][0]*m[1][1] - m[0][1]*m[1][0]) * d},
	}
}
