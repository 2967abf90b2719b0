package complement

import (
	"errors"
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
)

// Complementary is the complementary wavelength of a colour: the
// wavelength λc whose monochromatic light, added to the colour in the right
// amount, matches the white in chromaticity.
type Complementary struct {
	// Wavelength is λc, nm.
	Wavelength float64 `json:"wavelength_nm"`
	// Power is P, the radiant power of the monochromatic light at λc that
	// brings the colour onto the white: colour + P·δ(λ − λc) has the
	// white's chromaticity. It is in the units of the colour's spectrum
	// times nm (for Surfaces and Filters, of the illuminant's spectrum
	// times nm: the colour is then the light r·S the surface returns).
	Power float64 `json:"power"`
	// PowerRatio is P divided by the radiant power of the colour on the
	// computation grid (Σ s Δλ for a light, Σ r·S Δλ for a surface).
	PowerRatio float64 `json:"power_ratio"`
	// Warnings are cautions about the solution.
	Warnings []string `json:"warnings"`
}

// ComplementaryWavelength returns the complementary wavelength of the
// colour s (a light for Lights; a reflectance or transmittance under the
// illuminant for Surfaces and Filters) relative to the conditions' white,
// and the radiant power of light at that wavelength which, added to the
// colour, matches the white in chromaticity (CIE 015:2018 §9.1 defines λc;
// the power follows from Grassmann additivity, a 1-D linear problem in
// XYZ).
//
// The wavelength is found on the observer's spectrum locus
// (colorimetry.SpectrumLocus: the ray from the white away from the colour)
// and then refined on the observer's own interpolated colour-matching
// functions, so that colour + P·δ(λc) lands on the white to round-off; the
// two agree to a small fraction of a nm.
//
// It returns an error wrapping ErrNoComplementaryWavelength for a colour at
// the white, or a greenish colour whose complement lies on the purple line
// (for daylight whites and the CIE 1931 observer, dominant wavelengths of
// roughly 493–567 nm), and the errors of CheckAdditive, naming "s", for bad
// input.
func (c *Conditions) ComplementaryWavelength(s colorimetry.Spectrum, m Mode) (Complementary, error) {
	if !m.valid() {
		return Complementary{}, fmt.Errorf("%w: %v", ErrMode, m)
	}
	if err := checkSpectrum("s", s, m, c.grid); err != nil {
		return Complementary{}, err
	}
	x, err := c.XYZ(s, m)
	if err != nil {
		return Complementary{}, inputErr("s", err)
	}
	if !(x.Y > 0) {
		return Complementary{}, inputErr("s", fmt.Errorf("%w: Y = %g", colorimetry.ErrZeroLuminance, x.Y))
	}
	nm, cmf, err := complementaryLine(c.obs, x, c.White(m))
	if err != nil {
		return Complementary{}, inputErr("s", err)
	}
	// A line of power P adds K·P·cmf(λc): K = Km for lights (weights
	// Km·x̄·Δλ), k = 100 / Σ S ȳ Δλ for object colours.
	k := colorimetry.Km
	if m != Lights {
		k = c.kObj
	}
	alpha := planeCoefficient(cmf.Scale(k), x, c.White(m))
	res := Complementary{Wavelength: nm, Power: -1 / alpha, Warnings: []string{}}
	phi, err := c.power("s", s, m)
	if err != nil {
		return Complementary{}, err
	}
	res.PowerRatio = res.Power / phi
	return res, nil
}

// power returns the radiant power of s in mode m on the computation grid:
// Σ v Δλ for lights, Σ v·S Δλ for object colours.
func (c *Conditions) power(name string, s colorimetry.Spectrum, m Mode) (float64, error) {
	r, err := s.Resample(c.grid)
	if err != nil {
		return 0, inputErr(name, err)
	}
	var p float64
	for j := range c.grid.N {
		v := r.Value(j)
		if m != Lights {
			v *= c.illG[j]
		}
		p += v * c.grid.Step
	}
	return p, nil
}

// planeCoefficient returns α in v = α·c + β·w, for v in the plane of c and
// w through the origin of XYZ space (least squares otherwise).
func planeCoefficient(v, c, w colorimetry.XYZ) float64 {
	cw := cross(c, w)
	return dot(cross(v, w), cw) / dot(cw, cw)
}

func cross(a, b colorimetry.XYZ) colorimetry.XYZ {
	return colorimetry.XYZ{X: a.Y*b.Z - a.Z*b.Y, Y: a.Z*b.X - a.X*b.Z, Z: a.X*b.Y - a.Y*b.X}
}

func dot(a, b colorimetry.XYZ) float64 { return a.X*b.X + a.Y*b.Y + a.Z*b.Z }

// complementaryLine returns the complementary wavelength λc (nm) of the
// colour x relative to white w for the observer obs, and the
// colour-matching functions x̄, ȳ, z̄ at λc: they lie in the plane of x and
// w, on the far side of the white from x.
func complementaryLine(obs *colorimetry.Observer, x, w colorimetry.XYZ) (float64, colorimetry.XYZ, error) {
	locus, err := colorimetry.NewSpectrumLocus(obs)
	if err != nil {
		return 0, colorimetry.XYZ{}, err
	}
	cxy, err := x.XY()
	if err != nil {
		return 0, colorimetry.XYZ{}, err
	}
	wxy, err := w.XY()
	if err != nil {
		return 0, colorimetry.XYZ{}, err
	}
	// The complementary wavelength of the colour is the dominant
	// wavelength of its reflection through the white, taken close to the
	// white so that it stays inside the locus.
	dx, dy := cxy.X-wxy.X, cxy.Y-wxy.Y
	d := math.Hypot(dx, dy)
	if d < 1e-12 {
		return 0, colorimetry.XYZ{}, fmt.Errorf("%w: the colour is at the white", ErrNoComplementaryWavelength)
	}
	const step = 1e-3 // distance of the reflected point from the white, xy
	dom, err := locus.Dominant(colorimetry.XY{X: wxy.X - step*dx/d, Y: wxy.Y - step*dy/d}, wxy)
	switch {
	case errors.Is(err, colorimetry.ErrAchromatic):
		return 0, colorimetry.XYZ{}, fmt.Errorf("%w: the colour is at the white", ErrNoComplementaryWavelength)
	case err != nil:
		return 0, colorimetry.XYZ{}, err
	case dom.Complementary:
		return 0, colorimetry.XYZ{}, fmt.Errorf("%w: the complement of a colour of dominant wavelength %.1f nm lies on the purple line", ErrNoComplementaryWavelength, dom.Wavelength)
	}
	nm := refineLine(obs, x, w, dom.Wavelength)
	cx, cy, cz := obs.At(nm)
	cmf := colorimetry.XYZ{X: cx, Y: cy, Z: cz}
	if !(planeCoefficient(cmf, x, w) < 0) {
		return 0, colorimetry.XYZ{}, fmt.Errorf("%w: no monochromatic light beyond the white near %.1f nm", ErrNoComplementaryWavelength, dom.Wavelength)
	}
	return nm, cmf, nil
}

// refineLine returns the wavelength near nm0 (within 2 nm) where the
// observer's interpolated colour-matching functions cross the plane of x
// and w, found by bisection; nm0 itself when no crossing is bracketed.
func refineLine(obs *colorimetry.Observer, x, w colorimetry.XYZ, nm0 float64) float64 {
	n := cross(x, w)
	f := func(nm float64) float64 {
		a, b, c := obs.At(nm)
		return n.X*a + n.Y*b + n.Z*c
	}
	g := obs.Grid()
	for _, h := range []float64{0.5, 1, 2} {
		lo, hi := math.Max(nm0-h, g.Start), math.Min(nm0+h, g.End())
		flo, fhi := f(lo), f(hi)
		if flo == 0 {
			return lo
		}
		if fhi == 0 {
			return hi
		}
		if (flo < 0) == (fhi < 0) {
			continue
		}
		for range 100 {
			mid := 0.5 * (lo + hi)
			if mid <= lo || mid >= hi {
				break
			}
			fm := f(mid)
			if fm == 0 {
				return mid
			}
			if (fm < 0) == (flo < 0) {
				lo, flo = mid, fm
			} else {
				hi = mid
			}
		}
		return 0.5 * (lo + hi)
	}
	return nm0
}
