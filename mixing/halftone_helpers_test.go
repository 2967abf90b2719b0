package mixing

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/antipode-color/antipode/colorimetry"
)

// Synthetic presses for the halftone tests: invented ink absorbance bands
// and a paper, from which primaries are made by multiplying transmittances
// (a made-up but smooth way to get overprints), and tints by the
// Yule–Nielsen–Neugebauer model itself with a known n and known dot-gain
// curves, plus seeded noise. Not reference data: the fits are checked
// for recovering the parameters the data were made with.

// htGrid is the tests' grid, 400–700 nm at 10 nm.
var htGrid = colorimetry.Grid{Start: 400, Step: 10, N: 31}

// htBand is an ink's absorbance: Gaussian bands (centre, sigma, height) on
// a floor.
type htBand struct {
	name  string
	floor float64
	bands [][3]float64
}

// htInkSet holds the invented inks: cyan, magenta, yellow, black, and an
// orange spot ink.
var htInkSet = map[string]htBand{
	"c":      {"c", 0.04, [][3]float64{{630, 55, 1.25}, {560, 40, 0.25}}},
	"m":      {"m", 0.03, [][3]float64{{535, 40, 1.2}, {450, 30, 0.15}}},
	"y":      {"y", 0.02, [][3]float64{{440, 35, 1.1}}},
	"k":      {"k", 0.95, [][3]float64{{550, 200, 0.1}}},
	"orange": {"orange", 0.02, [][3]float64{{480, 45, 1.1}}},
}

// htAbsorbance returns an ink's absorbance at nm.
func htAbsorbance(ink string, nm float64) float64 {
	b := htInkSet[ink]
	a := b.floor
	for _, x := range b.bands {
		d := (nm - x[0]) / x[1]
		a += x[2] * math.Exp(-0.5*d*d)
	}
	return a
}

// htPaper returns the invented paper's reflectance: about 0.88, slightly
// bluish.
func htPaper(nm float64) float64 {
	d := (nm - 450) / 40
	return 0.86 + 0.03*math.Exp(-0.5*d*d) - 0.05*math.Exp(-(nm-400)/15)
}

// htPrimaries returns the 2^k primaries of the inks on htGrid.
func htPrimaries(t testing.TB, inks []string) []colorimetry.Spectrum {
	t.Helper()
	out := make([]colorimetry.Spectrum, 1<<len(inks))
	for p := range out {
		v := make([]float64, htGrid.N)
		for j := range v {
			nm := htGrid.Wavelength(j)
			a := 0.0
			for i, ink := range inks {
				if p&(1<<i) != 0 {
					a += htAbsorbance(ink, nm)
				}
			}
			// Double pass through the ink film.
			v[j] = htPaper(nm) * math.Pow(10, -2*a)
		}
		s, err := colorimetry.NewSpectrumOnGrid(htGrid, v, colorimetry.Options{})
		if err != nil {
			t.Fatal(err)
		}
		out[p] = s
	}
	return out
}

// htTrueGain returns a dot-gain curve e = 1 − (1 − a)^γ through 19 knots,
// the "true" curve of a synthetic press (gain at 50 %: 1 − 0.5^γ − 0.5).
func htTrueGain(t testing.TB, gamma float64) DotGain {
	t.Helper()
	var nom, eff []float64
	for s := 0; s <= 18; s++ {
		a := float64(s) / 18
		nom = append(nom, a)
		eff = append(eff, 1-math.Pow(1-a, gamma))
	}
	d, err := NewDotGain(nom, eff)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// htTrueEffective is the exact true curve.
func htTrueEffective(gamma, a float64) float64 { return 1 - math.Pow(1-a, gamma) }

// htPress is a synthetic press: its true model and the parameters.
type htPress struct {
	inks   []string
	n      []float64
	gammas []float64
	model  *Halftone
}

// htNewPress builds the true model of a synthetic press.
func htNewPress(t testing.TB, inks []string, n []float64, gammas []float64, tac float64) htPress {
	t.Helper()
	gains := make([]DotGain, len(inks))
	for i := range inks {
		gains[i] = htTrueGain(t, gammas[i])
	}
	m, err := NewHalftone(htGrid, inks, htPrimaries(t, inks), n, gains, tac)
	if err != nil {
		t.Fatal(err)
	}
	return htPress{inks: inks, n: n, gammas: gammas, model: m}
}

// htLevelsPct are the ramp levels of the synthetic charts, percent.
var htLevelsPct = []float64{5, 10, 20, 30, 40, 50, 60, 70, 80, 90, 95}

// chart returns the calibration patches of the press: every primary, a
// ramp per ink at htLevelsPct, and overprint tints (the last ones held
// out), each with Gaussian reflectance noise of standard deviation
// sigma·(0.2 + R) from the seed.
func (p htPress) chart(t testing.TB, sigma float64, seed uint64) []HalftoneSample {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 7))
	k := len(p.inks)
	var out []HalftoneSample
	add := func(name string, nom []float64, held bool) {
		r := p.model.ReflectanceTo(make([]float64, htGrid.N), nom)
		for j := range r {
			// Spectrophotometer-like noise: a floor plus a part
			// proportional to the signal.
			r[j] += sigma * (0.2 + r[j]) * rng.NormFloat64()
		}
		s, err := colorimetry.NewSpectrumOnGrid(htGrid, r, colorimetry.Options{})
		if err != nil {
			t.Fatal(err)
		}
		var am []Amount
		for i, a := range nom {
			am = append(am, Amount{Name: p.inks[i], Value: a})
		}
		out = append(out, HalftoneSample{Name: name, Coverages: am, Reflectance: s, HeldOut: held, Place: fmt.Sprintf("synthetic:%d", len(out)+1)})
	}
	for mask := range 1 << k {
		nom := make([]float64, k)
		for i := range k {
			if mask&(1<<i) != 0 {
				nom[i] = 1
			}
		}
		add(PrimaryName(p.inks, mask), nom, false)
	}
	for i, ink := range p.inks {
		for _, l := range htLevelsPct {
			nom := make([]float64, k)
			nom[i] = l / 100
			add(fmt.Sprintf("%s%g", ink, l), nom, false)
		}
	}
	// Overprint tints: a few fixed mixes, half of them held out.
	mixes := [][]float64{{0.4, 0.3, 0.3, 0.1}, {0.2, 0.6, 0.1, 0}, {0.7, 0.1, 0.5, 0.2}, {0.5, 0.5, 0, 0.3},
		{0.3, 0.25, 0.25, 0}, {0.6, 0.45, 0.45, 0.05}, {0.1, 0.8, 0.7, 0}, {0.85, 0.2, 0.1, 0.4}}
	for q, mix := range mixes {
		if k == 1 {
			break
		}
		nom := append([]float64(nil), mix[:k]...)
		add(fmt.Sprintf("mix%d", q+1), nom, q%2 == 1)
	}
	return out
}
