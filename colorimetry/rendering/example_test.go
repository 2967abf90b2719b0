package rendering_test

import (
	"fmt"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry/rendering"
)

// The colour rendering of the CIE cool-white fluorescent illuminant FL2.
func ExampleColourRendering() {
	fl2, err := cie.Fluorescent(2)
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := rendering.ColourRendering(fl2)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("CCT %.0f K, Duv %+.4f, reference %v\n", c.CCT.Kelvin, c.CCT.Duv, c.Reference)
	fmt.Printf("Ra %.0f, R9 %.0f\n", c.Ra, c.R[8])
	fmt.Println("warnings:", len(c.Warnings))
	// Output:
	// CCT 4224 K, Duv +0.0018, reference Planckian 4224 K
	// Ra 64, R9 -84
	// warnings: 0
}

// The colour fidelity of the CIE phosphor-converted LED illuminant LED-B3,
// with its worst-rendered colour evaluation sample.
func ExampleColourFidelity() {
	led, err := cie.LED("LED-B3")
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := rendering.ColourFidelity(led)
	if err != nil {
		fmt.Println(err)
		return
	}
	worst := 0
	for i, r := range f.Rfi {
		if r < f.Rfi[worst] {
			worst = i
		}
	}
	fmt.Printf("Rf %.1f against %v\n", f.Rf, f.Reference)
	fmt.Printf("lowest Rf,i %.1f (sample %d)\n", f.Rfi[worst], worst+1)
	// Output:
	// Rf 85.3 against blend at 4103 K, 10 % daylight
	// lowest Rf,i 66.5 (sample 20)
}
