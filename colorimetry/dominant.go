package colorimetry

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"sync"
)

// ErrAchromatic reports a colour whose chromaticity coincides with the
// white point, for which dominant wavelength and purity are undefined.
var ErrAchromatic = errors.New("colour coincides with the white point")

// ErrOutOfGamut reports a chromaticity that no real colour can have: a
// white point outside the spectrum locus, or a colour with y ≤ 0.
var ErrOutOfGamut = errors.New("chromaticity outside the spectrum locus")

// locusEndTol is how close to its largest chromaticity x the long-wave end
// of the locus must come. Beyond that wavelength the tabulated
// chromaticity stops moving (CIE 1931: x = 0.73469 from 699 nm on, to 6
// decimals) or folds back (CIE 1964: x peaks at 701 nm), so the rows
// there carry no direction of their own. Common practice (no source).
const locusEndTol = 1e-6

// achromaticTol is the distance in the xy diagram below which a colour is
// taken to coincide with the white point.
const achromaticTol = 1e-12

// SpectrumLocus is the boundary of the chromaticities of real colours for
// one observer, in the CIE 1931 (x, y) diagram: the spectrum locus through
// the chromaticities of the observer's table rows, closed by the purple
// line. It finds dominant and complementary wavelengths and purities
// (CIE 015:2018 §9.1). It is immutable and safe for concurrent use.
//
// The locus runs from the first row of the table to the first row where x
// comes within 1e-6 of its largest value (CIE 1931: 360–699 nm; CIE 1964:
// 360–701 nm). Beyond that the tabulated chromaticity stands still (CIE
// 1931: x = 0.73469 from 699 nm on) or turns back (CIE 1964), so those
// rows carry no direction of their own. The purple line joins the two
// ends. Between rows the locus is straight and the wavelength is
// interpolated linearly.
//
// The tables are not exactly convex: CIE 1931 bends inwards by up to 8e-5
// in x, y around 437–452 nm, and below about 410 nm its chromaticities
// wobble within 0.002 in x. Where a ray from the white crosses the locus
// more than once, it is taken to leave the boundary at its outermost
// crossing. Below 410 nm dominant wavelengths are ill-conditioned: for
// CIE 1931, a change of 1e-5 in x moves the one at 380 nm by 0.4 nm.
type SpectrumLocus struct {
	observer string
	nm       []float64 // row wavelengths, nm, increasing
	p        []XY      // chromaticity of each row
}

// locusCache holds one *SpectrumLocus per observer.
var locusCache sync.Map

// NewSpectrumLocus returns the spectrum locus of obs (see SpectrumLocus).
// Loci are built once per observer and cached for the life of the
// program. It returns an error for a nil observer or one with fewer than
// three rows of positive response.
func NewSpectrumLocus(obs *Observer) (*SpectrumLocus, error) {
	if obs == nil {
		return nil, errors.New("spectrum locus: nil observer")
	}
	if l, ok := locusCache.Load(obs); ok {
		return l.(*SpectrumLocus), nil
	}
	l, err := buildLocus(obs)
	if err != nil {
		return nil, err
	}
	got, _ := locusCache.LoadOrStore(obs, l)
	return got.(*SpectrumLocus), nil
}

func buildLocus(obs *Observer) (*SpectrumLocus, error) {
	g := obs.Grid()
	var nm []float64
	var p []XY
	for i := range g.N {
		X, Y, Z := obs.x.values[i], obs.y.values[i], obs.z.values[i]
		s := X + Y + Z
		if !(s > 0) {
			continue // no response at this wavelength
		}
		nm = append(nm, g.Wavelength(i))
		p = append(p, XY{X / s, Y / s})
	}
	xmax := math.Inf(-1)
	for _, q := range p {
		xmax = math.Max(xmax, q.X)
	}
	end := 0
	for end < len(p)-1 && p[end].X < xmax-locusEndTol {
		end++
	}
	if end < 2 {
		return nil, fmt.Errorf("spectrum locus of %s: %w", obs.name, ErrTooFew)
	}
	return &SpectrumLocus{observer: obs.name, nm: nm[:end+1], p: p[:end+1]}, nil
}

// ObserverName returns the name of the observer the locus belongs to.
func (l *SpectrumLocus) ObserverName() string { return l.observer }

// Range returns the shortest and longest wavelength of the locus, nm: the
// two ends of the purple line.
func (l *SpectrumLocus) Range() (lo, hi float64) { return l.nm[0], l.nm[len(l.nm)-1] }

// At returns the chromaticity of the locus at wavelength nm (nm),
// interpolated linearly between table rows. It returns an error wrapping
// ErrCoverage for a wavelength outside Range.
func (l *SpectrumLocus) At(nm float64) (XY, error) {
	lo, hi := l.Range()
	if !(nm >= lo && nm <= hi) {
		return XY{}, fmt.Errorf("spectrum locus at %g nm (%g–%g nm): %w", nm, lo, hi, ErrCoverage)
	}
	k := sort.SearchFloat64s(l.nm, nm)
	if k < len(l.nm) && l.nm[k] == nm {
		return l.p[k], nil
	}
	a, b := l.p[k-1], l.p[k]
	f := (nm - l.nm[k-1]) / (l.nm[k] - l.nm[k-1])
	return XY{a.X + f*(b.X-a.X), a.Y + f*(b.Y-a.Y)}, nil
}

// Dominant describes a colour by the wavelength of the monochromatic
// stimulus which, mixed with the white, matches it, and by how far it lies
// from the white towards the boundary of real colours (CIE 015:2018 §9.1).
type Dominant struct {
	// Wavelength is the dominant wavelength λd in nm or, when
	// Complementary is true, the complementary wavelength λc in nm.
	Wavelength float64
	// Complementary reports a purple colour: the line from the white
	// through the colour meets the purple line, the dominant wavelength is
	// undefined, and Wavelength holds the complementary wavelength, where
	// the opposite ray meets the spectrum locus.
	Complementary bool
	// ExcitationPurity is pe, the distance from the white to the colour
	// divided by the distance from the white to Boundary, in the (x, y)
	// diagram: 0 at the white, 1 on the spectrum locus or the purple line,
	// above 1 outside the locus.
	ExcitationPurity float64
	// ColorimetricPurity is pc = pe·yb/y, with yb the y of Boundary and y
	// that of the colour: the share of the monochromatic (or purple
	// boundary) stimulus in the luminance of a mixture with the white
	// that matches the colour.
	ColorimetricPurity float64
	// Boundary is the point where the ray from the white through the
	// colour meets the spectrum locus or the purple line.
	Boundary XY
}

// Signed returns the wavelength in the CIE's notation, nm: λd, or −λc for
// a purple colour.
func (d Dominant) Signed() float64 {
	if d.Complementary {
		return -d.Wavelength
	}
	return d.Wavelength
}

// Dominant returns the dominant (or, for a purple colour, complementary)
// wavelength and the purities of the colour of chromaticity c relative to
// the white of chromaticity white (CIE 015:2018 §9.1). It returns an error
// wrapping ErrAchromatic when c coincides with white, ErrOutOfGamut when
// white lies outside the spectrum locus or c has y ≤ 0, and ErrNotFinite
// for non-finite input.
func (l *SpectrumLocus) Dominant(c, white XY) (Dominant, error) {
	if !isFinite(c.X) || !isFinite(c.Y) {
		return Dominant{}, fmt.Errorf("dominant wavelength of (%g, %g): %w", c.X, c.Y, ErrNotFinite)
	}
	if err := l.checkWhite(white); err != nil {
		return Dominant{}, err
	}
	d := XY{c.X - white.X, c.Y - white.Y}
	if math.Hypot(d.X, d.Y) < achromaticTol {
		return Dominant{}, fmt.Errorf("dominant wavelength of (%g, %g): %w", c.X, c.Y, ErrAchromatic)
	}
	if !(c.Y > 0) {
		return Dominant{}, fmt.Errorf("dominant wavelength of (%g, %g): %w (y ≤ 0)", c.X, c.Y, ErrOutOfGamut)
	}
	t, nm, k := l.hit(white, d)
	if k == hitNone {
		return Dominant{}, fmt.Errorf("dominant wavelength of (%g, %g): ray from the white meets no boundary: %w", c.X, c.Y, ErrOutOfGamut)
	}
	r := Dominant{
		Wavelength:       nm,
		ExcitationPurity: 1 / t,
		Boundary:         XY{white.X + t*d.X, white.Y + t*d.Y},
	}
	if k == hitPurple {
		_, nm, k = l.hit(white, XY{-d.X, -d.Y})
		if k != hitLocus {
			return Dominant{}, fmt.Errorf("dominant wavelength of (%g, %g): no complementary wavelength: %w", c.X, c.Y, ErrOutOfGamut)
		}
		r.Wavelength, r.Complementary = nm, true
	}
	r.ColorimetricPurity = r.ExcitationPurity * r.Boundary.Y / c.Y
	if !isFinite(r.ExcitationPurity) || !isFinite(r.ColorimetricPurity) {
		// A y of a few ulp above zero (far outside the locus) overflows
		// the colorimetric purity.
		return Dominant{}, fmt.Errorf("dominant wavelength of (%g, %g): purities %g, %g: %w", c.X, c.Y, r.ExcitationPurity, r.ColorimetricPurity, ErrNotFinite)
	}
	return r, nil
}

// Complementary returns the complementary wavelength of the monochromatic
// stimulus at nm (nm) relative to white: the wavelength where the line
// from the locus point at nm through the white meets the locus again. It
// reports false, with wavelength 0, when that line meets the purple line
// instead (no complementary wavelength). It returns an error wrapping
// ErrCoverage for nm outside Range, ErrOutOfGamut for a white outside the
// locus, and ErrNotFinite for non-finite input.
func (l *SpectrumLocus) Complementary(nm float64, white XY) (float64, bool, error) {
	if !isFinite(nm) {
		return 0, false, fmt.Errorf("complementary wavelength of %g nm: %w", nm, ErrNotFinite)
	}
	p, err := l.At(nm)
	if err != nil {
		return 0, false, err
	}
	if err := l.checkWhite(white); err != nil {
		return 0, false, err
	}
	_, c, k := l.hit(white, XY{white.X - p.X, white.Y - p.Y})
	switch k {
	case hitLocus:
		return c, true, nil
	case hitPurple:
		return 0, false, nil
	}
	return 0, false, fmt.Errorf("complementary wavelength of %g nm: ray from the white meets no boundary: %w", nm, ErrOutOfGamut)
}

// DominantWavelength returns the dominant wavelength and purities of the
// colour of chromaticity c relative to white for the observer obs, using
// the observer's cached SpectrumLocus. See SpectrumLocus.Dominant.
func DominantWavelength(obs *Observer, c, white XY) (Dominant, error) {
	l, err := NewSpectrumLocus(obs)
	if err != nil {
		return Dominant{}, err
	}
	return l.Dominant(c, white)
}

// Contains reports whether the chromaticity c lies inside the region of
// physically realisable stimuli: the area bounded by the spectrum locus and
// the purple line (even–odd rule; a point on the boundary may fall either
// way by rounding). Non-finite coordinates are outside.
func (l *SpectrumLocus) Contains(c XY) bool {
	if !isFinite(c.X) || !isFinite(c.Y) {
		return false
	}
	inside := false
	n := len(l.p)
	for i, a := range l.p {
		b := l.p[(i+1)%n]
		if (a.Y > c.Y) != (b.Y > c.Y) && c.X < a.X+(c.Y-a.Y)*(b.X-a.X)/(b.Y-a.Y) {
			inside = !inside
		}
	}
	return inside
}

// checkWhite returns an error unless w is finite and lies inside the
// boundary.
func (l *SpectrumLocus) checkWhite(w XY) error {
	if !isFinite(w.X) || !isFinite(w.Y) {
		return fmt.Errorf("white point (%g, %g): %w", w.X, w.Y, ErrNotFinite)
	}
	if !l.Contains(w) {
		return fmt.Errorf("white point (%g, %g) for %s: %w", w.X, w.Y, l.observer, ErrOutOfGamut)
	}
	return nil
}

// Kinds of boundary a ray from the white meets.
const (
	hitNone   = iota // no boundary: only for a white outside or on it
	hitLocus         // the spectrum locus
	hitPurple        // the purple line
)

// hitSlack is how far beyond a step's ends (as a fraction of the step) a
// ray may pass and still count as meeting it, so that rays through a row
// exactly are not lost to rounding; also the relative margin by which the
// purple line must lie beyond the locus to count.
const hitSlack = 1e-9

// hit returns where the ray w + t·d (t > 0) leaves the boundary, at its
// outermost crossing: the parameter t, the wavelength when the ray meets
// the spectrum locus, and which boundary it meets. A ray through an end
// of the locus counts as meeting the locus. w must lie inside.
func (l *SpectrumLocus) hit(w, d XY) (t, nm float64, kind int) {
	kind = hitNone
	n := len(l.p)
	for i := range n - 1 {
		ti, s, ok := crossing(w, d, l.p[i], l.p[i+1])
		if ok && ti > t {
			t, nm, kind = ti, l.nm[i]+s*(l.nm[i+1]-l.nm[i]), hitLocus
		}
	}
	if ti, _, ok := crossing(w, d, l.p[n-1], l.p[0]); ok && ti > t*(1+hitSlack) {
		t, nm, kind = ti, 0, hitPurple
	}
	return t, nm, kind
}

// crossing returns where the ray w + t·d (t > 0) crosses the segment from
// a to b, as the ray parameter t and the fraction s ∈ [0, 1] of the way
// from a to b; ok is false when it does not.
func crossing(w, d, a, b XY) (t, s float64, ok bool) {
	ex, ey := b.X-a.X, b.Y-a.Y
	den := d.X*ey - d.Y*ex
	if den == 0 {
		return 0, 0, false // parallel, or a zero-length step
	}
	ax, ay := a.X-w.X, a.Y-w.Y
	s = (ax*d.Y - ay*d.X) / den
	if s < -hitSlack || s > 1+hitSlack {
		return 0, 0, false
	}
	t = (ax*ey - ay*ex) / den
	return t, math.Min(math.Max(s, 0), 1), t > 0
}
