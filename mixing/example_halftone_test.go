package mixing_test

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// ExampleYuleNielsen shows a 50 % tint of a dark ink on white paper by
// Murray–Davies (n = 1) and with optical dot gain (n = 2): the light
// scattered under the dots makes the tint darker than its area suggests.
func ExampleYuleNielsen() {
	paper, solid := 0.81, 0.01
	fmt.Printf("Murray–Davies: %.3f\n", mixing.MurrayDavies(paper, solid, 0.5))
	for _, n := range []float64{1, 2, 4} {
		fmt.Printf("Yule–Nielsen n = %g: %.3f\n", n, mixing.YuleNielsen(paper, solid, 0.5, n))
	}
	a, _ := mixing.YuleNielsenCoverage(paper, solid, 0.25, 2)
	fmt.Printf("coverage of R = 0.25 at n = 2: %.2f\n", a)
	// Output:
	// Murray–Davies: 0.410
	// Yule–Nielsen n = 1: 0.410
	// Yule–Nielsen n = 2: 0.250
	// Yule–Nielsen n = 4: 0.160
	// coverage of R = 0.25 at n = 2: 0.50
}

// ExampleDemichelTo lists the area fractions of the four Neugebauer
// primaries of two inks printed at 30 % and 60 %.
func ExampleDemichelTo() {
	inks := []string{"c", "m"}
	w := mixing.DemichelTo(make([]float64, 4), []float64{0.3, 0.6})
	for p, v := range w {
		fmt.Printf("%-5s %.2f\n", mixing.PrimaryName(inks, p), v)
	}
	// Output:
	// paper 0.28
	// c     0.12
	// m     0.42
	// c+m   0.18
}

// htExGrid is the examples' grid, 400–700 nm at 10 nm.
var htExGrid = colorimetry.Grid{Start: 400, Step: 10, N: 31}

// htExPrimaries makes the primaries of two invented inks, a blue-green
// and a red, by multiplying their transmittances over a white paper.
func htExPrimaries() []colorimetry.Spectrum {
	ink := func(nm, peak, width, height float64) float64 {
		d := (nm - peak) / width
		return 0.03 + height*math.Exp(-0.5*d*d)
	}
	out := make([]colorimetry.Spectrum, 4)
	for p := range out {
		v := make([]float64, htExGrid.N)
		for j := range v {
			nm := htExGrid.Wavelength(j)
			a := 0.0
			if p&1 != 0 {
				a += ink(nm, 620, 60, 1.2)
			}
			if p&2 != 0 {
				a += ink(nm, 500, 50, 1.1)
			}
			v[j] = 0.87 * math.Pow(10, -2*a)
		}
		out[p], _ = colorimetry.NewSpectrumOnGrid(htExGrid, v, colorimetry.Options{})
	}
	return out
}

// ExampleFitHalftone calibrates a two-ink print from its primaries and
// tint ramps (made here with n = 1.7 and a dot gain of 15 % at 50 %), then
// solves the coverages of a colour printed at 35 % and 70 %.
func ExampleFitHalftone() {
	inks := []string{"teal", "red"}
	prim := htExPrimaries()
	// The "press": e = a + 0.6·a·(1 − a) gives 15 % gain at 50 %.
	var nom, eff []float64
	for s := 0; s <= 20; s++ {
		a := float64(s) / 20
		nom, eff = append(nom, a), append(eff, a+0.6*a*(1-a))
	}
	gain, _ := mixing.NewDotGain(nom, eff)
	press, err := mixing.NewHalftone(htExGrid, inks, prim, []float64{1.7}, []mixing.DotGain{gain, gain}, 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	var chart []mixing.HalftoneSample
	patch := func(name string, a, b float64) {
		r, _ := press.Reflectance([]mixing.Amount{{Name: "teal", Value: a}, {Name: "red", Value: b}})
		chart = append(chart, mixing.HalftoneSample{Name: name, Reflectance: r,
			Coverages: []mixing.Amount{{Name: "teal", Value: a}, {Name: "red", Value: b}}})
	}
	patch("paper", 0, 0)
	patch("teal", 1, 0)
	patch("red", 0, 1)
	patch("teal+red", 1, 1)
	for _, a := range []float64{0.1, 0.25, 0.5, 0.75, 0.9} {
		patch(fmt.Sprint("teal ", a), a, 0)
		patch(fmt.Sprint("red ", a), 0, a)
	}
	m, err := mixing.FitHalftone(inks, chart, mixing.HalftoneFitSettings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	n, _ := m.NFactor()
	fmt.Printf("n = %.2f\n", n[0])
	for _, f := range m.InkFits() {
		fmt.Printf("%s: dot gain at 50 %% = %.1f %%\n", f.Ink, 100*f.Gain50)
	}

	target, _ := press.Reflectance([]mixing.Amount{{Name: "teal", Value: 0.35}, {Name: "red", Value: 0.7}})
	sol, err := m.Solve(target, mixing.HalftoneSolveSettings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	r := sol.Recipes[0]
	for _, a := range r.Amounts {
		fmt.Printf("%s %.1f %%\n", a.Name, 100*a.Value)
	}
	fmt.Printf("ΔE00 %.2f, reachable %v, total %.0f %%\n", r.DE00, r.Reachable, r.Extra["tac_percent"])
	// Output:
	// n = 1.70
	// teal: dot gain at 50 % = 15.0 %
	// red: dot gain at 50 % = 15.0 %
	// teal 35.0 %
	// red 70.0 %
	// ΔE00 0.00, reachable true, total 105 %
}

// ExampleHalftone_GreyBalance finds the coverages of three invented inks
// that print neutral greys (a* = b* = 0 under D50) from light to dark.
func ExampleHalftone_GreyBalance() {
	bands := [][3]float64{{630, 55, 0.75}, {535, 40, 0.7}, {440, 35, 0.65}} // centre, width, height
	prim := make([]colorimetry.Spectrum, 8)
	for p := range prim {
		v := make([]float64, htExGrid.N)
		for j := range v {
			nm := htExGrid.Wavelength(j)
			a := 0.0
			for i, b := range bands {
				if p&(1<<i) != 0 {
					d := (nm - b[0]) / b[1]
					a += 0.03 + b[2]*math.Exp(-0.5*d*d)
				}
			}
			v[j] = 0.88 * math.Pow(10, -2*a)
		}
		prim[p], _ = colorimetry.NewSpectrumOnGrid(htExGrid, v, colorimetry.Options{})
	}
	m, err := mixing.NewHalftone(htExGrid, []string{"c", "m", "y"}, prim, []float64{1.8}, nil, 300)
	if err != nil {
		fmt.Println(err)
		return
	}
	gb, err := m.GreyBalance(mixing.GreyBalanceSettings{Steps: 4})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("paper L* %.0f, darkest neutral L* %.0f\n", gb.Paper.L, gb.DarkestL)
	for _, st := range gb.Steps[1:3] {
		fmt.Printf("L* %.0f: c %.0f %%, m %.0f %%, y %.0f %%; ΔE00 %.1f from neutral\n", st.Target.L,
			100*st.Coverages[0].Value, 100*st.Coverages[1].Value, 100*st.Coverages[2].Value, st.DE00)
	}
	// Output:
	// paper L* 95, darkest neutral L* 21
	// L* 70: c 31 %, m 24 %, y 36 %; ΔE00 0.0 from neutral
	// L* 46: c 62 %, m 52 %, y 70 %; ΔE00 0.0 from neutral
}
