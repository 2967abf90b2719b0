package mixing_test

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// qualityExampleRig is an invented five-channel LED wash light: red,
// green, blue, amber and a broad phosphor lime, Gaussian bands on
// 380–780 nm at 5 nm.
func qualityExampleRig() (*mixing.Lights, error) {
	g := colorimetry.Grid{Start: 380, Step: 5, N: 81}
	var ch []mixing.LightChannel
	for _, b := range []struct {
		name               string
		centre, fwhm, peak float64
	}{{"red", 630, 20, 1}, {"green", 525, 32, 0.8}, {"blue", 455, 22, 1.1}, {"amber", 592, 16, 0.9}, {"lime", 560, 90, 0.7}} {
		v := make([]float64, g.N)
		for k := range v {
			d := (g.Wavelength(k) - b.centre) / (b.fwhm / 2.3548)
			v[k] = b.peak * math.Exp(-0.5*d*d)
		}
		s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
		if err != nil {
			return nil, err
		}
		ch = append(ch, mixing.LightChannel{Name: b.name, Spectrum: s})
	}
	return mixing.NewLights(ch, colorimetry.Spectrum{}, false)
}

// The mix of a five-channel rig at 4000 K on the Planckian locus with the
// highest colour rendering index, against the most efficient one.
func ExampleLights_SolveQuality() {
	m, err := qualityExampleRig()
	if err != nil {
		fmt.Println(err)
		return
	}
	xy, err := mixing.LightTargetCCT(cie.CIE1931(), 4000, 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	sol, err := m.SolveQuality(mixing.LightTarget{XY: xy}, mixing.GoalMaxRa, mixing.LightSolveOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range sol.Recipes {
		fmt.Printf("%-22s Ra %5.1f  R9 %6.1f  Rf %5.1f  %3.0f lm/W  melanopic DER %.3f\n", r.Extra["strategy"],
			r.Extra["ra"], r.Extra["r9"], r.Extra["rf"], r.Extra["efficacy_lm_per_w"], r.Extra["melanopic_der"])
	}
	// Output:
	// max Ra                 Ra  94.4  R9   87.8  Rf  89.3  349 lm/W  melanopic DER 0.632
	// max luminance          Ra  77.2  R9  -12.8  Rf  77.5  371 lm/W  melanopic DER 0.576
	// max efficacy           Ra  47.1  R9 -233.6  Rf  56.3  409 lm/W  melanopic DER 0.523
	// closest to reference   Ra  76.7  R9   11.2  Rf  76.2  368 lm/W  melanopic DER 0.562
}
