package colorimetry_test

import (
	"fmt"

	"github.com/antipode-color/antipode/colorimetry"
)

// exampleD65 is the CIE D65 white for the CIE 1931 observer, Y = 100
// (ASTM E308).
var exampleD65 = colorimetry.XYZ{X: 95.047, Y: 100, Z: 108.883}

func ExampleXYZ_Lab() {
	// The red primary of sRGB (IEC 61966-2-1), Y of the white = 100.
	red := colorimetry.XYZ{X: 41.24, Y: 21.26, Z: 1.93}
	lab, err := red.Lab(exampleD65)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("L* %.4f  a* %.4f  b* %.4f\n", lab.L, lab.A, lab.B)
	lch := lab.LCh()
	fmt.Printf("L* %.4f  C*ab %.4f  hab %.4f°\n", lch.L, lch.C, lch.H)
	// Output:
	// L* 53.2329  a* 80.1093  b* 67.2201
	// L* 53.2329  C*ab 104.5755  hab 40.0002°
}

func ExampleXYZ_Luv() {
	red := colorimetry.XYZ{X: 41.24, Y: 21.26, Z: 1.93}
	luv, err := red.Luv(exampleD65)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("L* %.4f  u* %.4f  v* %.4f\n", luv.L, luv.U, luv.V)
	// Output:
	// L* 53.2329  u* 175.0530  v* 37.7505
}

func ExampleLab_XYZ() {
	// A mid grey: L* = 50 is Y = 18.4187 % of the white.
	c, err := colorimetry.Lab{L: 50}.XYZ(exampleD65)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("X %.4f  Y %.4f  Z %.4f\n", c.X, c.Y, c.Z)
	// Output:
	// X 17.5064  Y 18.4187  Z 20.0548
}

func ExampleDeltaE2000() {
	// Sharma, Wu & Dalal (2005), Table 1, pair 1.
	a := colorimetry.Lab{L: 50, A: 2.6772, B: -79.7751}
	b := colorimetry.Lab{L: 50, A: 0, B: -82.7485}
	fmt.Printf("ΔE00 %.4f\n", colorimetry.DeltaE2000(a, b))
	fmt.Printf("ΔE*ab %.4f\n", colorimetry.DeltaEab(a, b))
	// Output:
	// ΔE00 2.0425
	// ΔE*ab 4.0011
}

func ExampleDeltaECMC() {
	// CMC is computed from the standard, so the order matters.
	standard := colorimetry.Lab{L: 50, A: 18, B: 24}
	batch := colorimetry.Lab{L: 51, A: 20, B: 25}
	fmt.Printf("CMC(2:1) %.4f\n", colorimetry.DeltaECMC(standard, batch, 2, 1))
	fmt.Printf("CMC(2:1) reversed %.4f\n", colorimetry.DeltaECMC(batch, standard, 2, 1))
	fmt.Printf("ΔE94 %.4f\n", colorimetry.DeltaE94(standard, batch, colorimetry.CIE94GraphicArts))
	// Output:
	// CMC(2:1) 1.6946
	// CMC(2:1) reversed 1.6143
	// ΔE94 1.4770
}

func ExampleAdapt() {
	d50 := colorimetry.XYZ{X: 96.422, Y: 100, Z: 82.521}
	red := colorimetry.XYZ{X: 41.24, Y: 21.26, Z: 1.93}
	c, err := colorimetry.Adapt(red, exampleD65, d50, colorimetry.Bradford)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("X %.4f  Y %.4f  Z %.4f\n", c.X, c.Y, c.Z)
	// Output:
	// X 43.6016  Y 22.2431  Z 1.3906
}

func ExampleNewAdaptation() {
	// Build the matrix once, then apply it to many colours.
	a := colorimetry.XYZ{X: 109.850, Y: 100, Z: 35.585}
	cat, err := colorimetry.NewAdaptation(exampleD65, a, colorimetry.CAT16)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range []colorimetry.XYZ{exampleD65, {X: 20, Y: 20, Z: 20}} {
		r := cat.Apply(c)
		fmt.Printf("%.4f %.4f %.4f\n", r.X, r.Y, r.Z)
	}
	// Output:
	// 109.8500 100.0000 35.5850
	// 23.1911 20.0233 6.4858
}
