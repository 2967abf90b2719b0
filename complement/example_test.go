package complement_test

import (
	"fmt"
	"math"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// The examples use invented spectra: Gaussian LEDs and logistic filter
// edges, sampled on the 1 nm computation grid.

func exampleSpectrum(f func(nm float64) float64) colorimetry.Spectrum {
	g := colorimetry.Grid1nm
	v := make([]float64, g.N)
	for i := range v {
		v[i] = f(g.Wavelength(i))
	}
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
	if err != nil {
		panic(err)
	}
	return s
}

func led(peak, width, power float64) colorimetry.Spectrum {
	return exampleSpectrum(func(nm float64) float64 {
		d := (nm - peak) / width
		return power * math.Exp(-0.5*d*d)
	})
}

func edge(at, width, lo, hi float64) colorimetry.Spectrum {
	return exampleSpectrum(func(nm float64) float64 { return lo + (hi-lo)/(1+math.Exp(-(nm-at)/width)) })
}

func ExampleReflectanceComplement() {
	c, err := complement.NewConditions(cie.CIE1931(), cie.D65())
	if err != nil {
		fmt.Println(err)
		return
	}
	// A cyan band-pass swatch: reflects 450–550 nm.
	r := exampleSpectrum(func(nm float64) float64 {
		if nm >= 450 && nm <= 550 {
			return 1
		}
		return 0
	})
	d, err := complement.ReflectanceComplement(r)
	if err != nil {
		fmt.Println(err)
		return
	}
	res, err := c.CheckAdditive(r, d.Spectrum, complement.Surfaces, complement.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("complement at 500 nm %.0f, at 600 nm %.0f\n", d.Spectrum.At(500), d.Spectrum.At(600))
	fmt.Printf("verdict %s, Δu′v′ < 1e-12: %v\n", res.Verdict, res.DeltaUVPrime < 1e-12)
	// Output:
	// complement at 500 nm 0, at 600 nm 1
	// verdict spectral, Δu′v′ < 1e-12: true
}

func ExampleLightComplement() {
	amber := led(592, 9, 1)
	d, err := complement.LightComplement(amber, cie.D65(), 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := complement.NewConditions(cie.CIE1931(), cie.D65())
	if err != nil {
		fmt.Println(err)
		return
	}
	res, err := c.CheckAdditive(amber, d.Spectrum, complement.Lights, complement.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	lo, nm := d.Spectrum.Min()
	fmt.Printf("s = %.5f; complement is %g at %g nm\n", d.Scale, lo, nm)
	fmt.Printf("amber + complement: %s, scale %.5f\n", res.Verdict, res.Scale)
	// Output:
	// s = 0.01124; complement is 0 at 592 nm
	// amber + complement: spectral, scale 0.01124
}

func ExampleConditions_CheckAdditive() {
	c, err := complement.NewConditions(cie.CIE1931(), cie.D65())
	if err != nil {
		fmt.Println(err)
		return
	}
	blue := led(455, 10, 1)
	yellow := led(568.2, 15, 1.06)
	res, err := c.CheckAdditive(blue, yellow, complement.Lights, complement.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("verdict %s, Δu′v′ %.4f, ΔE00 %.1f, spectral RMS %.2f of peak\n",
		res.Verdict, res.DeltaUVPrime, res.DeltaE00, res.SpectralRMS)
	// Output:
	// verdict metameric, Δu′v′ 0.0003, ΔE00 0.2, spectral RMS 1.17 of peak
}

func ExampleConditions_MixRatio() {
	c, err := complement.NewConditions(cie.CIE1931(), cie.D65())
	if err != nil {
		fmt.Println(err)
		return
	}
	blue := led(455, 10, 1)
	yellow := led(568.2, 15, 1)
	r, err := c.MixRatio(blue, yellow, complement.Lights)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("yellow × %.3f; blue : yellow by luminance %.4f; Δu′v′ %.4f from the white\n",
		*r.Weight, *r.RatioLuminance, r.DeltaUVPrime)
	// Output:
	// yellow × 1.062; blue : yellow by luminance 0.0355; Δu′v′ 0.0002 from the white
}

func ExampleConditions_CheckSubtractive() {
	c, err := complement.NewConditions(cie.CIE1931(), cie.D65())
	if err != nil {
		fmt.Println(err)
		return
	}
	red := edge(600, 8, 0, 0.92)    // long-pass
	cyan := edge(500, -8, 0, 0.9)   // short-pass
	clear := edge(500, 8, 0.8, 0.9) // nearly clear
	for _, p := range []struct {
		name string
		a, b colorimetry.Spectrum
	}{{"red over cyan", red, cyan}, {"red over clear", red, clear}} {
		res, err := c.CheckSubtractive(p.a, p.b, complement.Options{})
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%s: %s, Y %.3f, C*ab %.1f\n", p.name, res.Verdict, res.StackY, res.StackChroma)
	}
	// Output:
	// red over cyan: black, Y 0.000, C*ab 0.0
	// red over clear: none, Y 13.579, C*ab 106.2
}

func ExampleConditions_ComplementaryWavelength() {
	c, err := complement.NewConditions(cie.CIE1931(), cie.D65())
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := c.ComplementaryWavelength(led(592, 9, 1), complement.Lights)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("λc = %.1f nm; %.3f times the amber's radiant power\n", r.Wavelength, r.PowerRatio)
	// Output:
	// λc = 487.4 nm; 2.373 times the amber's radiant power
}

func ExampleLibrary_Partners() {
	c, err := complement.NewConditions(cie.CIE1931(), cie.D65())
	if err != nil {
		fmt.Println(err)
		return
	}
	names := []string{"pale blue", "deep cyan", "green", "violet"}
	lib, err := c.NewLibrary(names, []colorimetry.Spectrum{
		edge(520, -30, 0.3, 0.9), edge(510, -6, 0, 0.9), led(530, 30, 0.8), edge(430, -10, 0.02, 0.8),
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	ps, err := lib.Partners(edge(600, 8, 0, 0.92), complement.Filters, complement.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range ps {
		fmt.Printf("%-10s %-7s Y %6.3f\n", p.Name, p.Verdict, *p.StackY)
	}
	// Output:
	// deep cyan  black   Y  0.000
	// violet     black   Y  0.302
	// green      black   Y  0.586
	// pale blue  none    Y  4.954
}

func ExampleRobustness() {
	// Two surfaces that mix optically to the perfect white: a band and
	// its band-stop complement. A spectral complement holds everywhere.
	r := exampleSpectrum(func(nm float64) float64 {
		if nm >= 480 && nm <= 580 {
			return 1
		}
		return 0
	})
	d, err := complement.ReflectanceComplement(r)
	if err != nil {
		fmt.Println(err)
		return
	}
	fl11, err := cie.Fluorescent(11)
	if err != nil {
		fmt.Println(err)
		return
	}
	ills := []colorimetry.NamedIlluminant{{Name: "D65", Spectrum: cie.D65()}, {Name: "FL11", Spectrum: fl11}}
	out, err := complement.Robustness(r, d.Spectrum, complement.Surfaces, ills,
		[]*colorimetry.Observer{cie.CIE1931(), cie.CIE1964()}, complement.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, o := range out {
		fmt.Printf("%-4s %-12s %s\n", o.Illuminant, o.Observer, o.Verdict)
	}
	// Output:
	// D65  CIE 1931 2°  spectral
	// D65  CIE 1964 10° spectral
	// FL11 CIE 1931 2°  spectral
	// FL11 CIE 1964 10° spectral
}
