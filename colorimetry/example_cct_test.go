package colorimetry_test

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

func ExamplePlanckianTable_CCT() {
	obs := cie.CIE1931()
	table, err := colorimetry.NewPlanckianTable(obs, colorimetry.C2)
	if err != nil {
		fmt.Println(err)
		return
	}
	w, err := colorimetry.NewLightWeights(obs, colorimetry.Grid1nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	// Illuminant A is a Planckian radiator at 2848 K with c2 = 1.435e-2
	// m·K, that is 2855.5 K with the c2 of CIE 015.
	for _, ill := range []struct {
		name string
		s    colorimetry.Spectrum
	}{{"A", cie.A()}, {"D65", cie.D65()}} {
		xyz, err := w.XYZ(ill.s)
		if err != nil {
			fmt.Println(err)
			return
		}
		uv, err := xyz.UV()
		if err != nil {
			fmt.Println(err)
			return
		}
		ohno, err := table.CCT(uv, colorimetry.CCTOhno)
		if err != nil {
			fmt.Println(err)
			return
		}
		robertson, err := table.CCT(uv, colorimetry.CCTRobertson)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%-3s %.1f K, Duv %.4f (Robertson %.1f K)\n",
			ill.name, ohno.Kelvin, math.Round(ohno.Duv*1e4)/1e4+0, robertson.Kelvin)
	}
	// Output:
	// A   2855.5 K, Duv 0.0000 (Robertson 2855.6 K)
	// D65 6502.7 K, Duv 0.0032 (Robertson 6502.1 K)
}

func ExamplePlanckianTable_UV() {
	table, err := colorimetry.NewPlanckianTable(cie.CIE1931(), colorimetry.C2)
	if err != nil {
		fmt.Println(err)
		return
	}
	// A target white for a lamp: 3000 K, slightly below the locus.
	uv, err := table.UV(3000, -0.004)
	if err != nil {
		fmt.Println(err)
		return
	}
	xy := uv.UVPrime().XY()
	fmt.Printf("u %.5f  v %.5f  (x %.5f  y %.5f)\n", uv.U, uv.V, xy.X, xy.Y)
	back, err := table.CCT(uv, colorimetry.CCTOhno)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.3f K, Duv %.5f\n", back.Kelvin, back.Duv)

	// Beyond |Duv| = 0.05 the CCT is not defined.
	if _, err := table.UV(3000, 0.06); err != nil {
		fmt.Println(err)
	}
	// Output:
	// u 0.25200  v 0.34385  (x 0.43121  y 0.39226)
	// 3000.000 K, Duv -0.00400
	// correlated colour temperature not defined: 3000.0 K, Duv 0.06000 (defined for 1000–100000 K, |Duv| ≤ 0.05)
}

func ExampleSpectrumLocus_Dominant() {
	locus, err := colorimetry.NewSpectrumLocus(cie.CIE1931())
	if err != nil {
		fmt.Println(err)
		return
	}
	white := colorimetry.XY{X: 0.31272, Y: 0.32903} // D65, CIE 1931 observer
	for _, c := range []colorimetry.XY{
		{X: 0.5, Y: 0.4},  // an amber filter under D65
		{X: 0.35, Y: 0.2}, // a magenta
		{X: 0.2, Y: 0.25}, // a blue-green
	} {
		d, err := locus.Dominant(c, white)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("(%.2f, %.2f): λ %6.1f nm  pe %.3f  pc %.3f\n",
			c.X, c.Y, d.Signed(), d.ExcitationPurity, d.ColorimetricPurity)
	}
	// Output:
	// (0.50, 0.40): λ  589.5 nm  pe 0.722  pc 0.771
	// (0.35, 0.20): λ -533.2 nm  pe 0.563  pc 0.281
	// (0.20, 0.25): λ  482.6 nm  pe 0.484  pc 0.321
}

func ExampleSpectrumLocus_Complementary() {
	locus, err := colorimetry.NewSpectrumLocus(cie.CIE1931())
	if err != nil {
		fmt.Println(err)
		return
	}
	white := colorimetry.XY{X: 0.31272, Y: 0.32903} // D65, CIE 1931 observer
	for _, nm := range []float64{450, 480, 520, 600} {
		c, ok, err := locus.Complementary(nm, white)
		switch {
		case err != nil:
			fmt.Println(err)
		case ok:
			fmt.Printf("%.0f nm ↔ %.1f nm\n", nm, c)
		default:
			fmt.Printf("%.0f nm: none, the line meets the purple line\n", nm)
		}
	}
	// Output:
	// 450 nm ↔ 568.3 nm
	// 480 nm ↔ 578.4 nm
	// 520 nm: none, the line meets the purple line
	// 600 nm ↔ 489.9 nm
}
