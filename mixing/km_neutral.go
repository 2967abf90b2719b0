package mixing

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// Neutraliser is one colorant that, mixed into a paint, brings it towards
// a neutral grey: its subtractive complement.
type Neutraliser struct {
	Colorant string // the colorant added
	// Fraction is the colorant's mass fraction in the paint + colorant
	// mix at the most neutral point, 0–1.
	Fraction float64
	// Ratio is the mass of colorant per unit mass of paint,
	// Fraction / (1 − Fraction); +Inf when Fraction is 1.
	Ratio float64
	// Chroma is the residual chroma C*ab of the mix at that point, in
	// CIE units; 0 is a perfect neutral.
	Chroma float64
	// Lab is the mix's CIELAB under the primary illuminant.
	Lab colorimetry.Lab
	// Interior reports whether the most neutral point lies strictly
	// inside the mixing line; false when the colorant alone (Fraction 1)
	// is the most neutral, i.e. it does not cancel the paint's hue.
	Interior bool
}

// Neutralisation is the result of Pigments.Neutralise.
type Neutralisation struct {
	Paint       string          // the paint's name
	PaintLab    colorimetry.Lab // the paint's CIELAB under the primary illuminant
	PaintChroma float64         // its chroma C*ab
	// Candidates are the chromatic colorants ranked by residual chroma,
	// lowest first.
	Candidates []Neutraliser
	// Recipe is the recipe fitted to a measured paint (NeutraliseSpectrum)
	// to estimate its scattering; nil for a colorant of the model.
	Recipe   []Amount
	Warnings []string
}

// NeutralOptions control Neutralise. The zero value works under D65 for
// the CIE 1931 observer.
type NeutralOptions struct {
	Observer   *colorimetry.Observer       // nil: CIE 1931 2°
	Illuminant colorimetry.NamedIlluminant // zero value: D65
	// Achromatic is the chroma C*ab below which a colorant counts as
	// achromatic (white, black, greys) at every tint with the white, and
	// is not offered as a neutraliser: such colorants lower chroma only
	// by dilution. 0 means 10 (common practice, no source).
	Achromatic float64
	// Recipe is used by NeutraliseSpectrum to fit the measured paint
	// (Colorants, Only, Tolerance); its Illuminant and Observer are
	// replaced by the ones above.
	Recipe RecipeOptions
}

// tintLadder is the set of mass fractions in the white at which a
// colorant's chroma is looked at to decide whether it is achromatic.
var tintLadder = []float64{1, 0.5, 0.2, 0.1, 0.05, 0.02, 0.01}

// Neutralise finds the colorants of the model that bring the named
// colorant (the paint) closest to a neutral grey when mixed with it: for
// each chromatic colorant other than the paint and the white, the mass
// fraction t of colorant in the paint + colorant mix that minimises the
// chroma C*ab of the opaque film, found by a scan of t over [0, 1] and a
// golden-section refinement. Candidates are ranked by residual chroma.
func (p *Pigments) Neutralise(paint string, opt NeutralOptions) (Neutralisation, error) {
	if err := p.Validate(); err != nil {
		return Neutralisation{}, err
	}
	i := p.index(paint)
	if i < 0 {
		return Neutralisation{}, fmt.Errorf("no colorant %q in the model (it has %s)", paint, strings.Join(p.Names(), ", "))
	}
	c := p.Colorants[i]
	return p.neutralise(c.Name, c.K, c.S, i, nil, opt)
}

// NeutraliseSpectrum is Neutralise for a measured paint (reflectance,
// fraction 0–1, measured like the model's calibration). Its K/S follows
// from the measurement; its scattering, which a single opaque film cannot
// tell, is estimated as that of the recipe of model colorants that
// matches it best (Recipe with opt.Recipe), and its K as K/S times that
// scattering. The recipe is reported.
func (p *Pigments) NeutraliseSpectrum(name string, paint colorimetry.Spectrum, opt NeutralOptions) (Neutralisation, error) {
	if err := p.Validate(); err != nil {
		return Neutralisation{}, err
	}
	ro := opt.Recipe
	ro.Observer, ro.Illuminant, ro.Also, ro.Spectral = opt.Observer, opt.Illuminant, nil, false
	sol, err := p.Recipe(paint, ro)
	if err != nil {
		return Neutralisation{}, fmt.Errorf("paint %q: fitting a recipe to estimate its scattering: %w", name, err)
	}
	rec := sol.Recipes[0]
	cv, err := p.amountVector(rec.Amounts)
	if err != nil {
		return Neutralisation{}, err
	}
	rm, warns, err := p.onGrid(paint, fmt.Sprintf("paint %q", name))
	if err != nil {
		return Neutralisation{}, err
	}
	q, cw := p.internalKS(rm, fmt.Sprintf("paint %q", name))
	warns = append(warns, cw...)
	k := make([]float64, p.Grid.N)
	s := make([]float64, p.Grid.N)
	for l := range k {
		for j, cj := range cv {
			s[l] += cj * p.Colorants[j].S[l]
		}
		k[l] = q[l] * s[l]
	}
	res, err := p.neutralise(name, k, s, -1, warns, opt)
	if err != nil {
		return Neutralisation{}, err
	}
	res.Recipe = rec.Amounts
	if !rec.Reachable {
		res.Warnings = append(res.Warnings, fmt.Sprintf("the model's colorants match the paint only to ΔE00 %.3g; its scattering estimate is rough", rec.DE00))
	}
	return res, nil
}

// neutralise does the work for a paint with unit K and S; skip is the
// paint's own index (−1 for a measured paint).
func (p *Pigments) neutralise(name string, pk, ps []float64, skip int, warns []string, opt NeutralOptions) (Neutralisation, error) {
	obs := opt.Observer
	if obs == nil {
		obs = cie.CIE1931()
	}
	ill := opt.Illuminant
	if ill.Spectrum.IsZero() {
		ill = colorimetry.NamedIlluminant{Name: "D65", Spectrum: cie.D65()}
	}
	ach := opt.Achromatic
	if ach == 0 {
		ach = 10
	}
	if !(ach > 0) {
		return Neutralisation{}, fmt.Errorf("achromatic threshold %g: want a chroma > 0", opt.Achromatic)
	}
	e, err := newEffWeights(obs, ill, p.Grid)
	if err != nil {
		return Neutralisation{}, err
	}
	n := p.Grid.N
	rm := make([]float64, n)
	// chroma returns C*ab and Lab of the film (1 − t)·A + t·B.
	film := func(ak, as, bk, bs []float64, t float64) colorimetry.Lab {
		for l := range n {
			k := (1-t)*ak[l] + t*bk[l]
			s := (1-t)*as[l] + t*bs[l]
			q := math.Inf(1)
			if s > 0 {
				q = k / s
			}
			rm[l] = p.Surface.Measured(ReflectanceInf(q))
		}
		return e.lab(rm)
	}
	chroma := func(l colorimetry.Lab) float64 { return math.Hypot(l.A, l.B) }
	out := Neutralisation{Paint: name, Warnings: warns}
	out.PaintLab = film(pk, ps, pk, ps, 0)
	out.PaintChroma = chroma(out.PaintLab)
	if out.PaintChroma < ach {
		out.Warnings = append(out.Warnings, fmt.Sprintf("the paint is already near neutral (chroma %.3g)", out.PaintChroma))
	}
	w := p.Colorants[p.whiteIndex()]
	var skipped []string
	for j, c := range p.Colorants {
		if j == skip || j == p.whiteIndex() {
			continue
		}
		var cmax float64
		for _, f := range tintLadder {
			cmax = math.Max(cmax, chroma(film(w.K, w.S, c.K, c.S, f)))
		}
		if cmax < ach {
			skipped = append(skipped, c.Name)
			continue
		}
		f := func(t float64) float64 { return chroma(film(pk, ps, c.K, c.S, t)) }
		t := minimise01(f)
		lab := film(pk, ps, c.K, c.S, t)
		nz := Neutraliser{Colorant: c.Name, Fraction: t, Chroma: chroma(lab), Lab: lab, Interior: t > 0 && t < 1-1e-9}
		nz.Ratio = math.Inf(1)
		if t < 1 {
			nz.Ratio = t / (1 - t)
		}
		out.Candidates = append(out.Candidates, nz)
	}
	if len(skipped) > 0 {
		out.Warnings = append(out.Warnings, fmt.Sprintf("not offered, achromatic (chroma below %g at every tint): %s", ach, strings.Join(skipped, ", ")))
	}
	if len(out.Candidates) == 0 {
		return out, fmt.Errorf("no chromatic colorant in the model besides %q to neutralise it with", name)
	}
	sort.SliceStable(out.Candidates, func(a, b int) bool { return out.Candidates[a].Chroma < out.Candidates[b].Chroma })
	return out, nil
}

// minimise01 returns the t in [0, 1] that minimises f: the best of a scan
// (400 even steps plus fractions from 1e-4 to 1e-2 on a log scale, since
// strong colorants neutralise at small fractions), refined by golden
// section within the neighbouring scan points.
func minimise01(f func(float64) float64) float64 {
	var ts []float64
	for k := 0; k <= 400; k++ {
		ts = append(ts, float64(k)/400)
	}
	for k := range 40 {
		ts = append(ts, math.Pow(10, -4+2*float64(k)/40))
	}
	sort.Float64s(ts)
	best, bi := math.Inf(1), 0
	for i, t := range ts {
		if v := f(t); v < best {
			best, bi = v, i
		}
	}
	lo := ts[max(bi-1, 0)]
	hi := ts[min(bi+1, len(ts)-1)]
	const gr = 0.6180339887498949 // (√5 − 1)/2
	a, b := lo, hi
	c, d := b-gr*(b-a), a+gr*(b-a)
	fc, fd := f(c), f(d)
	for range 100 {
		if b-a < 1e-12 {
			break
		}
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - gr*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + gr*(b-a)
			fd = f(d)
		}
	}
	t := 0.5 * (a + b)
	if f(t) > best {
		return ts[bi]
	}
	return t
}
