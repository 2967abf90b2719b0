package colorimetry_test

import (
	"fmt"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

func ExampleWeights_XYZCov() {
	// CIE 13.3 test colour sample 5 (360–830 nm at 5 nm), measured with a
	// standard uncertainty of 0.002 at every wavelength, independently,
	// seen by the CIE 1931 observer under D65 (380–780 nm at 5 nm).
	s, err := cie.TCS(5)
	if err != nil {
		fmt.Println(err)
		return
	}
	u := make([]float64, s.Len())
	for i := range u {
		u[i] = 0.002
	}
	su, err := colorimetry.NewSpectrumUncertainty(s.Grid(), u)
	if err != nil {
		fmt.Println(err)
		return
	}
	w, err := colorimetry.NewObjectWeights(cie.CIE1931(), cie.D65(), colorimetry.Grid5nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	x, err := w.XYZCov(s, su)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("X %.3f ± %.4f\n", x.Value.X, x.U().X)
	fmt.Printf("Y %.3f ± %.4f\n", x.Value.Y, x.U().Y)
	fmt.Printf("Z %.3f ± %.4f\n", x.Value.Z, x.U().Z)
	xy, err := colorimetry.PropagateXY(x)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("x %.5f ± %.5f, y %.5f ± %.5f\n", xy.Value.X, xy.U().X, xy.Value.Y, xy.U().Y)
	// Output:
	// X 24.985 ± 0.0332
	// Y 30.844 ± 0.0371
	// Z 40.352 ± 0.0549
	// x 0.25977 ± 0.00020, y 0.32069 ± 0.00027
}

func ExamplePropagateColour() {
	// Tristimulus values with their covariance, as XYZCov returns them
	// (invented numbers), under D65 for the CIE 1931 observer.
	w, err := colorimetry.NewObjectWeights(cie.CIE1931(), cie.D65(), colorimetry.Grid5nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	x := colorimetry.UncertainXYZ{
		Value: colorimetry.XYZ{X: 24.985, Y: 30.844, Z: 40.352},
		Cov:   colorimetry.Cov3{{0.0019, 0.0015, 0.0005}, {0.0015, 0.0021, 0.0002}, {0.0005, 0.0002, 0.0036}},
	}
	c, err := colorimetry.PropagateColour(x, w.White(), colorimetry.MonteCarlo{})
	if err != nil {
		fmt.Println(err)
		return
	}
	lab, u := c.Lab.Value, c.Lab.U()
	fmt.Printf("L* %.2f ± %.3f  a* %.2f ± %.3f  b* %.2f ± %.3f\n", lab.L, u.L, lab.A, u.A, lab.B, u.B)
	fmt.Printf("C*ab %.2f ± %.3f  h_ab %.2f° ± %.2f° (%v)\n", c.LCh.C.Value, c.LCh.C.U, c.LCh.H.Value, c.LCh.H.U, c.LCh.H.Method)
	// Output:
	// L* 62.38 ± 0.039  a* -17.53 ± 0.126  b* -8.53 ± 0.094
	// C*ab 19.49 ± 0.109  h_ab 205.95° ± 0.33° (GUM first order)
}

func ExamplePropagateDeltaE2000() {
	// Two measurements of one sample: ΔE00 is zero at the estimates, and
	// its distribution is far from normal, so Monte Carlo is used.
	w, err := colorimetry.NewObjectWeights(cie.CIE1931(), cie.D65(), colorimetry.Grid5nm)
	if err != nil {
		fmt.Println(err)
		return
	}
	x := colorimetry.UncertainXYZ{
		Value: colorimetry.XYZ{X: 24.985, Y: 30.844, Z: 40.352},
		Cov:   colorimetry.Cov3{{0.0019, 0.0015, 0.0005}, {0.0015, 0.0021, 0.0002}, {0.0005, 0.0002, 0.0036}},
	}
	d, err := colorimetry.PropagateDeltaE2000(x, x, w.White(), colorimetry.MonteCarlo{Seed: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("ΔE00 %.2f, mean %.3f, u %.3f, 95 %% interval [%.3f, %.3f]\n", d.Value, d.Mean, d.U, d.Low, d.High)
	fmt.Println(d.Method)
	// Output:
	// ΔE00 0.00, mean 0.145, u 0.077, 95 % interval [0.034, 0.329]
	// Monte Carlo (JCGM 101), 100000 draws, seed 1
}
