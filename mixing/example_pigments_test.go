package mixing_test

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// exampleModel builds a small pigment model by hand: a white and four
// invented colorants with smooth absorption bands, on 400–700 nm at
// 10 nm, measured with the specular component included (k1 = 0.04 from
// n = 1.5, k2 = 0.6).
func exampleModel() *mixing.Pigments {
	g := colorimetry.Grid{Start: 400, Step: 10, N: 31}
	band := func(centre, width, height, floor float64) []float64 {
		k := make([]float64, g.N)
		for i := range k {
			d := (g.Wavelength(i) - centre) / width
			k[i] = floor + height*math.Exp(-0.5*d*d)
		}
		return k
	}
	flat := func(v float64) []float64 {
		s := make([]float64, g.N)
		for i := range s {
			s[i] = v
		}
		return s
	}
	add := func(a, b []float64) []float64 {
		for i := range a {
			a[i] += b[i]
		}
		return a
	}
	sd, _ := mixing.SaundersonFromIndex(1.5, 0.6, false)
	return &mixing.Pigments{
		Grid:    g,
		White:   "ky-scenic-white",
		Surface: sd,
		Colorants: []mixing.Colorant{
			{Name: "ky-scenic-white", K: flat(0.01), S: flat(1)},
			{Name: "ky-ochre", K: band(450, 50, 6, 0.03), S: flat(0.4)},
			{Name: "ky-madder", K: band(530, 40, 8, 0.02), S: flat(0.2)},
			{Name: "ky-prussian", K: band(620, 50, 9, 0.05), S: flat(0.15)},
			{Name: "ky-verdigris", K: add(band(430, 40, 5, 0.02), band(650, 50, 6, 0)), S: flat(0.25)},
		},
	}
}

func ExampleReflectanceInf() {
	// K/S = 1 gives R∞ = 2 − √3, and R∞ = 0.5 gives K/S = 0.25.
	fmt.Printf("R∞(1) = %.6f\n", mixing.ReflectanceInf(1))
	fmt.Printf("K/S(0.5) = %.4f\n", mixing.KS(0.5))
	// Output:
	// R∞(1) = 0.267949
	// K/S(0.5) = 0.2500
}

func ExampleLayerReflectance() {
	// A film with K = 0.25 and S = 1 per unit thickness, one unit thick,
	// over an ideal black and over a white backing of 0.8, and thick
	// enough to hide.
	fmt.Printf("over black %.5f\n", mixing.LayerReflectance(0.25, 1, 1, 0))
	fmt.Printf("over white %.5f\n", mixing.LayerReflectance(0.25, 1, 1, 0.8))
	fmt.Printf("hiding     %.5f\n", mixing.LayerReflectance(0.25, 1, math.Inf(1), 0))
	fmt.Printf("contrast ratio %.3f\n", mixing.ContrastRatio(0.25, 1, 1, 0.8))
	// Output:
	// over black 0.41138
	// over white 0.57925
	// hiding     0.50000
	// contrast ratio 0.710
}

func ExampleSaunderson() {
	s, _ := mixing.SaundersonFromIndex(1.5, 0.6, false)
	fmt.Printf("k1 = %.2f\n", s.K1)
	rm := s.Measured(0.5)
	fmt.Printf("internal 0.5 measures %.4f; back: %.4f\n", rm, s.Internal(rm))
	// Output:
	// k1 = 0.04
	// internal 0.5 measures 0.3143; back: 0.5000
}

func ExamplePigments_Recipe() {
	p := exampleModel()
	target, _ := p.Reflectance([]mixing.Amount{{Name: "ky-scenic-white", Value: 0.9}, {Name: "ky-ochre", Value: 0.07}, {Name: "ky-prussian", Value: 0.03}})
	sol, err := p.Recipe(target, mixing.RecipeOptions{Colorants: 2})
	if err != nil {
		fmt.Println(err)
		return
	}
	r := sol.Recipes[0]
	for _, a := range r.Amounts {
		fmt.Printf("%-16s %.4f\n", a.Name, a.Value)
	}
	fmt.Printf("ΔE00 below 0.01: %v, reachable: %v\n", r.DE00 < 0.01, r.Reachable)
	// Output:
	// ky-scenic-white  0.9000
	// ky-ochre         0.0700
	// ky-prussian      0.0300
	// ΔE00 below 0.01: true, reachable: true
}

func ExampleFitPigments() {
	truth := exampleModel()
	var samples []mixing.LadderSample
	white, _ := truth.Reflectance([]mixing.Amount{{Name: "ky-scenic-white", Value: 1}})
	samples = append(samples, mixing.LadderSample{Name: "white", Colorant: "ky-scenic-white", Fraction: 1, Reflectance: white})
	for _, c := range truth.Colorants[1:] {
		for _, f := range []float64{1, 0.5, 0.25, 0.1, 0.05, 0.02} {
			r, _ := truth.Reflectance([]mixing.Amount{{Name: c.Name, Value: f}, {Name: "ky-scenic-white", Value: 1 - f}})
			samples = append(samples, mixing.LadderSample{Name: fmt.Sprintf("%s %g", c.Name, f), Colorant: c.Name, Fraction: f, Reflectance: r})
		}
	}
	fit, err := mixing.FitPigments(samples, mixing.FitOptions{Surface: truth.Surface})
	if err != nil {
		fmt.Println(err)
		return
	}
	m := fit.Model
	fmt.Println("white:", m.White)
	for i, c := range m.Colorants[1:] {
		tc := truth.Colorants[i+1]
		fmt.Printf("%-12s K(530 nm) = %.3f (true %.3f)  S(530 nm) = %.3f (true %.3f)\n", c.Name, c.K[13], tc.K[13], c.S[13], tc.S[13])
	}
	fmt.Printf("training ΔE00 max below 0.001: %v\n", m.Fit.Training.Max < 0.001)
	// Output:
	// white: ky-scenic-white
	// ky-ochre     K(530 nm) = 1.698 (true 1.698)  S(530 nm) = 0.400 (true 0.400)
	// ky-madder    K(530 nm) = 8.020 (true 8.020)  S(530 nm) = 0.200 (true 0.200)
	// ky-prussian  K(530 nm) = 1.831 (true 1.831)  S(530 nm) = 0.150 (true 0.150)
	// ky-verdigris K(530 nm) = 0.576 (true 0.576)  S(530 nm) = 0.250 (true 0.250)
	// training ΔE00 max below 0.001: true
}

func ExamplePigments_Neutralise() {
	p := exampleModel()
	res, err := p.Neutralise("ky-madder", mixing.NeutralOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, n := range res.Candidates {
		fmt.Printf("%-12s fraction %.3f  residual chroma %.1f\n", n.Colorant, n.Fraction, n.Chroma)
	}
	// Output:
	// ky-verdigris fraction 0.626  residual chroma 0.1
	// ky-prussian  fraction 0.149  residual chroma 18.5
	// ky-ochre     fraction 0.128  residual chroma 21.7
}

func ExamplePigments_Correct() {
	p := exampleModel()
	recipe := []mixing.Amount{{Name: "ky-scenic-white", Value: 0.9}, {Name: "ky-ochre", Value: 0.06}, {Name: "ky-madder", Value: 0.04}}
	target, _ := p.Reflectance(recipe)
	// The trial batch came out redder than the model said: here it is
	// simulated with 15 % more madder than asked for.
	trial, _ := p.Reflectance([]mixing.Amount{{Name: "ky-scenic-white", Value: 0.9}, {Name: "ky-ochre", Value: 0.06}, {Name: "ky-madder", Value: 0.046}})
	c, err := p.Correct(recipe, trial, target, mixing.RecipeOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("trial ΔE00 %.2f\n", c.TrialDE00)
	for _, a := range c.Recipe.Amounts {
		fmt.Printf("%-16s %.4f\n", a.Name, a.Value)
	}
	// Output:
	// trial ΔE00 1.49
	// ky-scenic-white  0.9049
	// ky-ochre         0.0602
	// ky-madder        0.0348
}
