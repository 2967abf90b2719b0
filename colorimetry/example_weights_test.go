package colorimetry_test

import (
	"fmt"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// A grey card of 50 % reflectance under D65 for the CIE 1931 observer: half
// the white point, Y = 50.
func ExampleNewObjectWeights() {
	w, err := colorimetry.NewObjectWeights(cie.CIE1931(), cie.D65(), colorimetry.Grid5nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	grey := make([]float64, colorimetry.Grid5nm.N)
	for i := range grey {
		grey[i] = 0.5
	}
	s, err := colorimetry.NewSpectrumOnGrid(colorimetry.Grid5nm, grey, colorimetry.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := w.XYZ(s)
	if err != nil {
		fmt.Println(err)
		return
	}
	wh := w.White()
	fmt.Printf("white X %.2f Y %.2f Z %.2f\n", wh.X, wh.Y, wh.Z)
	fmt.Printf("grey  X %.2f Y %.2f Z %.2f\n", c.X, c.Y, c.Z)
	// Output:
	// white X 95.04 Y 100.00 Z 108.88
	// grey  X 47.52 Y 50.00 Z 54.44
}

// Many spectra at once, stored one after another on the weights' grid:
// here a flat 20 % and a flat 80 % reflectance.
func ExampleWeights_XYZBatchTo() {
	w, err := colorimetry.NewObjectWeights(cie.CIE1931(), cie.D65(), colorimetry.Grid5nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	n := w.Grid().N
	values := make([]float64, 2*n)
	for i := range n {
		values[i], values[n+i] = 0.2, 0.8
	}
	xyz := w.XYZBatchTo(make([]float64, 2*3), values)
	fmt.Printf("%.2f\n%.2f\n", xyz[:3], xyz[3:])
	// Output:
	// [19.01 20.00 21.78]
	// [76.03 80.00 87.10]
}

// Spectra stored as float32, as hyperspectral cubes usually hold them: the
// sums are taken in float64.
func ExampleWeights_XYZBatch32To() {
	w, err := colorimetry.NewObjectWeights(cie.CIE1931(), cie.D65(), colorimetry.Grid5nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	values := make([]float32, w.Grid().N)
	for i := range values {
		values[i] = 0.25
	}
	xyz := w.XYZBatch32To(make([]float64, 3), values)
	fmt.Printf("%.3f\n", xyz)
	// Output:
	// [23.761 25.000 27.220]
}
