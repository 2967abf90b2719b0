package cie_test

import (
	"fmt"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// The white point of D65 for the CIE 1931 observer, summed on 360–830 nm
// at 1 nm.
func ExampleCIE1931() {
	w, err := colorimetry.NewObjectWeights(cie.CIE1931(), cie.D65(), colorimetry.Grid1nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	white := w.White()
	xy, _ := white.XY()
	fmt.Println(cie.CIE1931().Name())
	fmt.Printf("X, Y, Z = %.4f, %.4f, %.4f\n", white.X, white.Y, white.Z)
	fmt.Printf("x, y = %.4f, %.4f\n", xy.X, xy.Y)
	// Output:
	// CIE 1931 2°
	// X, Y, Z = 95.0471, 100.0000, 108.8829
	// x, y = 0.3127, 0.3290
}

// A fluorescent illuminant is a line spectrum: compute it on its own 5 nm
// grid with the 5 nm rows of the observer.
func ExampleIlluminant() {
	for _, name := range []string{"D65", "F11", "daylight:5200"} {
		s, err := cie.Illuminant(name)
		if err != nil {
			fmt.Println(err)
			return
		}
		w, err := colorimetry.NewObjectWeights(cie.CIE1931(), s, colorimetry.ComputationGrid(s.Grid()))
		if err != nil {
			fmt.Println(err)
			return
		}
		xy, _ := w.White().XY()
		fmt.Printf("%-13s %v, %v: x, y = %.4f, %.4f\n", name, s.Grid(), s.Interp(), xy.X, xy.Y)
	}
	_, err := cie.Illuminant("daylight:3000")
	fmt.Println(err)
	// Output:
	// D65           300–830 nm at 1 nm, linear: x, y = 0.3127, 0.3290
	// F11           380–780 nm at 5 nm, linear: x, y = 0.3805, 0.3769
	// daylight:5200 300–830 nm at 5 nm, linear: x, y = 0.3401, 0.3540
	// daylight CCT 3000 K: outside the defined range of the CIE D series (4000–25000 K)
}

func ExampleObserverByName() {
	o, err := cie.ObserverByName("10deg")
	fmt.Println(o.Name(), err)
	_, err = cie.ObserverByName("2006")
	fmt.Println(err)
	// Output:
	// CIE 1964 10° <nil>
	// unknown observer "2006" (want 1931, 2, 2deg, 1964, 10 or 10deg)
}

// The D series at any correlated colour temperature from 4000 to 25000 K.
func ExampleDaylight() {
	xy, _ := cie.DaylightChromaticity(6500 * cie.C2Ratio)
	m1, m2 := cie.DaylightFactors(xy)
	fmt.Printf("xD, yD = %.6f, %.6f; M1, M2 = %.3f, %.3f\n", xy.X, xy.Y, m1, m2)
	s, _ := cie.Daylight(6500 * cie.C2Ratio)
	fmt.Printf("%.2f at 560 nm, %.4f at 555 nm\n", s.At(560), s.At(555))
	// Output:
	// xD, yD = 0.312720, 0.329125; M1, M2 = -0.295, -0.689
	// 100.00 at 560 nm, 102.0235 at 555 nm
}

func ExampleList() {
	for _, e := range cie.List()[:4] {
		fmt.Println(e.Name)
	}
	// Output:
	// A
	// D50
	// D55
	// D65
}
