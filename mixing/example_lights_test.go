package mixing_test

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// lightsBand returns a Gaussian emission band on 380–780 nm at 5 nm.
func lightsBand(centre, fwhm, peak float64) colorimetry.Spectrum {
	g := colorimetry.Grid{Start: 380, Step: 5, N: 81}
	v := make([]float64, g.N)
	for k := range v {
		d := (g.Wavelength(k) - centre) / (fwhm / 2.3548)
		v[k] = peak * math.Exp(-0.5*d*d)
	}
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
	if err != nil {
		panic(err)
	}
	return s
}

// lightsExampleRig is an invented five-channel LED rig with a gamma of 2.2.
func lightsExampleRig() *mixing.Lights {
	gamma, _ := mixing.PowerResponse(2.2)
	var ch []mixing.LightChannel
	for _, b := range []struct {
		name               string
		centre, fwhm, peak float64
	}{{"red", 630, 20, 1}, {"green", 525, 32, 0.8}, {"blue", 455, 22, 1.1}, {"amber", 592, 16, 0.9}, {"lime", 560, 90, 0.7}} {
		ch = append(ch, mixing.LightChannel{Name: b.name, Spectrum: lightsBand(b.centre, b.fwhm, b.peak), Response: gamma})
	}
	m, err := mixing.NewLights(ch, colorimetry.Spectrum{}, false)
	if err != nil {
		panic(err)
	}
	return m
}

func ExampleDisplayMatrix() {
	// The sRGB primaries and D65 white of IEC 61966-2-1.
	m, err := mixing.DisplayMatrix(
		colorimetry.XY{X: 0.64, Y: 0.33}, colorimetry.XY{X: 0.30, Y: 0.60},
		colorimetry.XY{X: 0.15, Y: 0.06}, colorimetry.XY{X: 0.3127, Y: 0.3290}, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, row := range m {
		fmt.Printf("%.4f %.4f %.4f\n", row[0], row[1], row[2])
	}
	// Output:
	// 0.4124 0.3576 0.1805
	// 0.2126 0.7152 0.0722
	// 0.0193 0.1192 0.9505
}

func ExampleWhiteBalanceGains() {
	d65 := colorimetry.XY{X: 0.3127, Y: 0.3290}
	m, _ := mixing.DisplayMatrix(colorimetry.XY{X: 0.64, Y: 0.33}, colorimetry.XY{X: 0.30, Y: 0.60},
		colorimetry.XY{X: 0.15, Y: 0.06}, d65, 100)
	// Balance the display to the chromaticity of CIE illuminant A.
	a := colorimetry.XY{X: 0.44757, Y: 0.40745}
	wb, err := mixing.WhiteBalanceGains(m, a)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("gains R %.3f G %.3f B %.3f, Y %.1f, reachable %v\n", wb.Gains[0], wb.Gains[1], wb.Gains[2], wb.Y, wb.Reachable)
	// Output:
	// gains R 1.000 G 0.448 B 0.126, Y 54.2, reachable true
}

func ExampleLights_Solve() {
	m := lightsExampleRig()
	obs := cie.CIE1931()
	xy, err := mixing.LightTargetCCT(obs, 4000, 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	sol, err := m.Solve(mixing.LightTarget{XY: xy}, mixing.LightSolveOptions{Observer: obs})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range sol.Recipes {
		fmt.Printf("%s:", r.Extra["strategy"])
		for _, a := range r.Amounts {
			fmt.Printf(" %s %.3f", a.Name, a.Value)
		}
		fmt.Printf(", Y %.1f, %.0f lm/W, Δu′v′ < 1e-9: %v\n", r.Extra["Y"], r.Extra["efficacy_lm_per_w"], r.Extra["delta_uv_prime"].(float64) < 1e-9)
	}
	// Output:
	// max luminance: red 1.000 green 0.546 blue 1.000 amber 0.992 lime 1.000, Y 82.9, 371 lm/W, Δu′v′ < 1e-9: true
	// max efficacy: red 0.000 green 0.000 blue 0.759 amber 1.000 lime 0.765, Y 44.8, 409 lm/W, Δu′v′ < 1e-9: true
	// closest to reference: red 0.954 green 0.000 blue 0.916 amber 0.666 lime 1.000, Y 68.8, 368 lm/W, Δu′v′ < 1e-9: true
}

func ExampleFitLights() {
	// Synthetic ramps of one channel with w = d^2.2 and no noise.
	s := lightsBand(630, 20, 1)
	var samples []mixing.RampSample
	for _, d := range []float64{0.25, 0.5, 0.75, 1} {
		samples = append(samples, mixing.RampSample{Name: fmt.Sprintf("red@%g", d), Channel: "red", Drive: d, Spectrum: s.Scale(math.Pow(d, 2.2))})
	}
	m, err := mixing.FitLights(samples, mixing.LightsFitOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	g, _ := m.Channel(0).Response.Gamma()
	fmt.Printf("gamma %.4f\n", g)
	fmt.Println(m.Report().Warnings)
	// Output:
	// gamma 2.2000
	// [no dark measurement: the dark spectrum is taken as zero]
}
