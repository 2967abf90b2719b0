package complement_test

import (
	"fmt"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

func ExampleComplementaryWavelengths() {
	// D65 (x, y) for the CIE 1931 observer, CIE 15:2004 Table T.3.
	d65 := colorimetry.XY{X: 0.31272, Y: 0.32903}
	g, err := colorimetry.NewGrid(440, 640, 40)
	if err != nil {
		fmt.Println(err)
		return
	}
	rows, err := complement.ComplementaryWavelengths(cie.CIE1931(), d65, g)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range rows {
		if !r.HasComplement {
			fmt.Printf("%.0f nm: none (purple)\n", r.Nm)
			continue
		}
		fmt.Printf("%.0f nm: %.1f nm, power ratio %.2f, luminance ratio %.2f\n", r.Nm, r.ComplementNm, r.PowerRatio, r.LuminanceRatio)
	}
	// Output:
	// 440 nm: 567.5 nm, power ratio 1.64, luminance ratio 68.92
	// 480 nm: 578.4 nm, power ratio 0.69, luminance ratio 4.38
	// 520 nm: none (purple)
	// 560 nm: none (purple)
	// 600 nm: 489.9 nm, power ratio 2.82, luminance ratio 0.92
	// 640 nm: 492.9 nm, power ratio 1.38, luminance ratio 1.87
}

func ExampleComplementaryPair() {
	d65 := colorimetry.XY{X: 0.31272, Y: 0.32903}
	p, err := complement.ComplementaryPair(cie.CIE1931(), d65, 470)
	if err != nil {
		fmt.Println(err)
		return
	}
	// 1 W at 470 nm plus PowerRatio W at the complement matches D65.
	fmt.Printf("470 nm + %.3f × %.2f nm\n", p.PowerRatio, p.ComplementNm)
	// Output:
	// 470 nm + 1.167 × 572.17 nm
}

func ExampleObjectSolid_Realisable() {
	s, err := complement.NewObjectSolid(cie.CIE1931(), cie.D65(), colorimetry.Grid5nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	grey := s.White().Scale(0.18) // a grey of 18 % reflectance
	// The chromaticity of 520 nm light at half the white's luminance.
	green, err := colorimetry.XY{X: 0.0743, Y: 0.8338}.XYZ(50)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range []colorimetry.XYZ{grey, green} {
		ok, err := s.Realisable(c)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Println(c, ok)
	}
	// Output:
	// XYZ(17.1077, 18.0000, 19.5984) true
	// XYZ(4.4555, 50.0000, 5.5109) false
}

func ExampleObjectSolid_MaxChroma() {
	s, err := complement.NewObjectSolid(cie.CIE1931(), cie.D65(), colorimetry.Grid1nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, h := range []float64{0, 90, 180, 300} {
		c, err := s.MaxChroma(50, h)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("L* 50, h %3.0f°: C*ab ≤ %.1f\n", h, c)
	}
	// Output:
	// L* 50, h   0°: C*ab ≤ 97.5
	// L* 50, h  90°: C*ab ≤ 85.7
	// L* 50, h 180°: C*ab ≤ 140.8
	// L* 50, h 300°: C*ab ≤ 98.4
}

func ExampleObjectSolid_Boundary() {
	s, err := complement.NewObjectSolid(cie.CIE1931(), cie.D65(), colorimetry.Grid1nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	b, err := s.Boundary(70, 4)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, o := range b {
		kind := "band-pass"
		if o.BandStop {
			kind = "band-stop"
		}
		lch := o.Lab.LCh()
		fmt.Printf("h %3.0f°: C*ab %.1f, %s %.0f nm\n", lch.H, lch.C, kind, o.Edges)
	}
	// Output:
	// h   0°: C*ab 81.3, band-stop [449 566] nm
	// h  90°: C*ab 119.0, band-pass [551 603] nm
	// h 180°: C*ab 123.6, band-pass [459 547] nm
	// h 270°: C*ab 51.5, band-stop [539 619] nm
}

func ExampleObjectSolid_MaxLuminance() {
	s, err := complement.NewObjectSolid(cie.CIE1931(), cie.D65(), colorimetry.Grid1nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	o, err := s.MaxLuminance(colorimetry.XY{X: 0.5, Y: 0.4})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("MacAdam limit at (0.5, 0.4): Y = %.2f, band-stop %v, edges %.0f nm\n", o.XYZ.Y, o.BandStop, o.Edges)
	// Output:
	// MacAdam limit at (0.5, 0.4): Y = 59.61, band-stop true, edges [431 546] nm
}
