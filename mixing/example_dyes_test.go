package mixing_test

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
	"gonum.org/v1/gonum/mat"
)

// band returns a Gaussian absorption band (per unit concentration) on g.
func band(g colorimetry.Grid, peak, width, height float64) []float64 {
	v := make([]float64, g.N)
	for j := range v {
		d := (g.Wavelength(j) - peak) / width
		v[j] = 0.02 + height*math.Exp(-0.5*d*d)
	}
	return v
}

// sample returns the transmittance of the given concentrations of two
// bands over a clear base, as a calibration measurement.
func sample(g colorimetry.Grid, name string, bands [][]float64, c ...float64) mixing.DyeSample {
	t := make([]float64, g.N)
	var am []mixing.Amount
	for j := range t {
		a := 0.01
		for i, b := range bands {
			a += c[i] * b[j]
		}
		t[j] = math.Pow(10, -a)
	}
	for i, v := range c {
		if v > 0 {
			am = append(am, mixing.Amount{Name: []string{"straw-dye", "sky-dye"}[i], Value: v})
		}
	}
	s, _ := colorimetry.NewSpectrumOnGrid(g, t, colorimetry.Options{})
	return mixing.DyeSample{Name: name, Amounts: am, Transmittance: s}
}

// ExampleFitDyes calibrates two invented dyes from a dilution series and
// solves for the concentrations that reproduce a mixture.
func ExampleFitDyes() {
	g := colorimetry.Grid5nm
	bands := [][]float64{band(g, 450, 30, 8), band(g, 610, 40, 6)}
	samples := []mixing.DyeSample{sample(g, "blank", bands, 0, 0)}
	for _, c := range []float64{0.02, 0.05, 0.1} {
		samples = append(samples,
			sample(g, fmt.Sprint("straw ", c), bands, c, 0),
			sample(g, fmt.Sprint("sky ", c), bands, 0, c))
	}
	m, err := mixing.FitDyes(samples, mixing.DyeFitSettings{Unit: "g/L"})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, l := range m.Linearity() {
		fmt.Printf("%s: peak %g nm, absorptivity %.2f per g/L, R² %.4f\n", l.Dye, l.PeakNM, l.PeakAbsorptivity, *l.R2Peak)
	}

	target := sample(g, "wanted", bands, 0.04, 0.07).Transmittance
	sol, err := m.Solve(target, mixing.DyeSolveSettings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	r := sol.Recipes[0]
	for _, a := range r.Amounts {
		fmt.Printf("%s %.4f g/L\n", a.Name, a.Value)
	}
	fmt.Printf("ΔE00 %.3f, reachable %v\n", r.DE00, r.Reachable)
	// Output:
	// straw-dye: peak 450 nm, absorptivity 8.02 per g/L, R² 1.0000
	// sky-dye: peak 610 nm, absorptivity 6.02 per g/L, R² 1.0000
	// straw-dye 0.0400 g/L
	// sky-dye 0.0700 g/L
	// ΔE00 0.000, reachable true
}

// ExampleDyes_Transmittance shows Beer–Lambert arithmetic: a neutral dye
// of absorptivity 1 per unit concentration at concentration 1 has
// absorbance 1 and transmits 10 %; twice the path transmits 1 %.
func ExampleDyes_Transmittance() {
	g := colorimetry.Grid5nm
	flat := make([]float64, g.N)
	for i := range flat {
		flat[i] = 1
	}
	m, err := mixing.NewDyes(g, "g/L", make([]float64, g.N), []mixing.Dye{{Name: "grey", Absorptivity: flat, CalibratedMax: 1}})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, path := range []float64{1, 2} {
		t, warnings, _ := m.Transmittance([]mixing.Amount{{Name: "grey", Value: 1}}, path)
		fmt.Printf("path %g: T(550 nm) = %.4f, warnings %d\n", path, t.At(550), len(warnings))
	}
	// Output:
	// path 1: T(550 nm) = 0.1000, warnings 0
	// path 2: T(550 nm) = 0.0100, warnings 1
}

// ExampleNNLS solves a small non-negative least-squares problem whose
// unconstrained solution has a negative component.
func ExampleNNLS() {
	a := mat.NewDense(4, 2, []float64{
		0.0372, 0.2869,
		0.6861, 0.7071,
		0.6233, 0.6245,
		0.6344, 0.6170,
	})
	x, rnorm, err := mixing.NNLS(a, []float64{0.8587, 0.1781, 0.0747, 0.8405})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("x = [%.4f %.4f], ‖Ax − b‖ = %.4f\n", x[0], x[1], rnorm)
	// Output:
	// x = [0.0000 0.6929], ‖Ax − b‖ = 0.9118
}

// ExampleBoundedLS bounds every variable to [0, 0.5].
func ExampleBoundedLS() {
	a := mat.NewDense(3, 2, []float64{1, 0, 0, 1, 1, 1})
	x, _, err := mixing.BoundedLS(a, []float64{1, 0.2, 1.2}, []float64{0, 0}, []float64{0.5, 0.5})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("x = [%.4f %.4f]\n", x[0], x[1])
	// Output:
	// x = [0.5000 0.4500]
}
