package colorimetry_test

import (
	"fmt"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// The luminous efficacy of radiation of two CIE illuminants, each over its
// tabulated range, and the S/P ratio.
func ExampleEfficacyOfRadiation() {
	v := colorimetry.Efficiency{V: cie.PhotopicV(), K: colorimetry.Km}
	vs := colorimetry.Efficiency{V: cie.ScotopicV(), K: cie.KmScotopic}
	for _, name := range []string{"D65", "FL2"} {
		s, err := cie.Illuminant(name)
		if err != nil {
			fmt.Println(err)
			return
		}
		k, err := colorimetry.EfficacyOfRadiation(s, v)
		if err != nil {
			fmt.Println(err)
			return
		}
		sp, err := colorimetry.SPRatio(s, v, vs)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%s over %v: %.1f lm/W, S/P %.2f\n", name, s.Grid(), k, sp)
	}
	// Output:
	// D65 over 300–830 nm at 1 nm: 176.7 lm/W, S/P 2.46
	// FL2 over 380–780 nm at 5 nm: 336.4 lm/W, S/P 1.57
}

// The melanopic quantities of CIE S 026 for a lamp that gives 500 lx.
func ExampleAlphaOpic() {
	v := colorimetry.Efficiency{V: cie.PhotopicV(), K: colorimetry.Km}
	mel, err := cie.AlphaOpicAction(cie.Melanopic)
	if err != nil {
		fmt.Println(err)
		return
	}
	ao, err := colorimetry.NewAlphaOpic(mel, v, cie.D65())
	if err != nil {
		fmt.Println(err)
		return
	}
	// Illuminant A, scaled to a spectral irradiance (W·m⁻²·nm⁻¹) of 500 lx.
	a := cie.A()
	ev, err := v.Integral(a)
	if err != nil {
		fmt.Println(err)
		return
	}
	s := a.Scale(500 / ev)
	e, _ := ao.Irradiance(s)
	edi, _ := ao.EDI(s)
	der, _ := ao.DER(s)
	fmt.Printf("K_mel,v(D65) = %.4f mW/lm\n", 1000*ao.D65Efficacy())
	fmt.Printf("melanopic irradiance %.4f W/m², EDI %.1f lx, DER %.4f\n", e, edi, der)
	// Output:
	// K_mel,v(D65) = 1.3262 mW/lm
	// melanopic irradiance 0.3287 W/m², EDI 247.9 lx, DER 0.4957
}
