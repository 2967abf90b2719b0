package mixing

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// Synthetic test models. Their K and S are invented shapes (a test
// fixture made from a known model, as the house rules allow for
// calibration checks), not data of any real colorant.

// gridKM is the grid of the synthetic models: 400–700 nm at 10 nm, the
// grid of the shared benchmark (shared/bench/README.md).
var gridKM = colorimetry.Grid{Start: 400, Step: 10, N: 31}

// bandShape describes one synthetic colorant: absorption bands (centre,
// width, height in nm and units of the white's scattering) on a floor,
// and a scattering level with a slope.
type bandShape struct {
	name   string
	floor  float64
	bands  [][3]float64
	s0, s1 float64 // S at 400 nm and at 700 nm
}

func (b bandShape) colorant(g colorimetry.Grid) Colorant {
	c := Colorant{Name: b.name, K: make([]float64, g.N), S: make([]float64, g.N)}
	for i := range g.N {
		nm := g.Wavelength(i)
		k := b.floor
		for _, bd := range b.bands {
			d := (nm - bd[0]) / bd[1]
			k += bd[2] * math.Exp(-0.5*d*d)
		}
		c.K[i] = k
		c.S[i] = b.s0 + (b.s1-b.s0)*(nm-g.Start)/(g.End()-g.Start)
	}
	return c
}

// synthShapes are twelve invented chromatic colorants and a black.
var synthShapes = []bandShape{
	{"lemon", 0.02, [][3]float64{{420, 30, 6}}, 0.30, 0.20},
	{"amber", 0.02, [][3]float64{{460, 45, 8}}, 0.25, 0.15},
	{"vermilion", 0.03, [][3]float64{{500, 50, 10}}, 0.35, 0.25},
	{"rose", 0.02, [][3]float64{{540, 35, 8}}, 0.25, 0.20},
	{"violet", 0.05, [][3]float64{{570, 45, 8}, {480, 30, 1}}, 0.20, 0.15},
	{"ultramarine", 0.05, [][3]float64{{610, 55, 10}}, 0.25, 0.15},
	{"cyan", 0.03, [][3]float64{{650, 50, 12}}, 0.30, 0.25},
	{"viridian", 0.04, [][3]float64{{440, 35, 7}, {650, 45, 7}}, 0.15, 0.10},
	{"olive", 0.30, [][3]float64{{430, 50, 6}, {620, 60, 3}}, 0.20, 0.20},
	{"ochre", 0.05, [][3]float64{{450, 60, 5}}, 0.50, 0.40},
	{"oxide-red", 0.10, [][3]float64{{480, 70, 9}}, 0.60, 0.45},
	{"carbon", 6, nil, 0.30, 0.30},
}

// synthWhite is the white: little absorption with a blue edge, S = 1.
func synthWhite(g colorimetry.Grid) Colorant {
	c := Colorant{Name: "white", K: make([]float64, g.N), S: make([]float64, g.N)}
	for i := range g.N {
		nm := g.Wavelength(i)
		c.K[i] = 0.008 + 0.2*math.Exp(-(nm-380)/12)
		c.S[i] = 1
	}
	return c
}

// synthModel returns a model of the white and the first n synthetic
// colorants, with k1 = 0.04 (n = 1.5) and k2 = 0.6, specular included,
// as in the shared benchmark.
func synthModel(n int) *Pigments {
	p := &Pigments{Grid: gridKM, White: "white", Surface: Saunderson{K1: 0.04, K2: 0.6, RefractiveIndex: 1.5}}
	p.Colorants = append(p.Colorants, synthWhite(gridKM))
	for _, b := range synthShapes[:n] {
		p.Colorants = append(p.Colorants, b.colorant(gridKM))
	}
	return p
}

// d65 returns the primary illuminant of the tests.
func d65() colorimetry.NamedIlluminant {
	return colorimetry.NamedIlluminant{Name: "D65", Spectrum: cie.D65()}
}

// mustReflectance is Reflectance that fails the test on error.
func mustReflectance(t testing.TB, p *Pigments, a []Amount) colorimetry.Spectrum {
	t.Helper()
	r, err := p.Reflectance(a)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// randomRecipe draws the white plus k distinct chromatic colorants of p
// with fractions typical of tints.
func randomRecipe(rng *rand.Rand, p *Pigments, k int) []Amount {
	idx := rng.Perm(len(p.Colorants) - 1)[:k]
	rest := 1.0
	var out []Amount
	for _, i := range idx {
		f := 0.005 + 0.15*rng.Float64()
		out = append(out, Amount{Name: p.Colorants[i+1].Name, Value: f})
		rest -= f
	}
	return append([]Amount{{Name: p.White, Value: rest}}, out...)
}

// perturbed returns a copy of p with each colorant's K and S scaled by
// factors within ±frac (seeded): a deliberately mis-calibrated model.
func perturbed(p *Pigments, frac float64, seed uint64) *Pigments {
	rng := rand.New(rand.NewPCG(seed, 1))
	q := *p
	q.Colorants = nil
	for _, c := range p.Colorants {
		fk := 1 + frac*(2*rng.Float64()-1)
		fs := 1 + frac*(2*rng.Float64()-1)
		d := Colorant{Name: c.Name, K: make([]float64, len(c.K)), S: make([]float64, len(c.S))}
		for l := range c.K {
			d.K[l] = c.K[l] * fk
			d.S[l] = c.S[l] * fs
		}
		q.Colorants = append(q.Colorants, d)
	}
	return &q
}
