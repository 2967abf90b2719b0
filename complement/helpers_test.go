package complement_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// Test spectra are built from simple shapes (rectangles, Gaussians,
// logistic edges) whose complements are known by construction; they are
// test fixtures, not reference data.

// onGrid returns the spectrum f(λ) sampled on g.
func onGrid(t testing.TB, g colorimetry.Grid, f func(nm float64) float64) colorimetry.Spectrum {
	t.Helper()
	v := make([]float64, g.N)
	for i := range v {
		v[i] = f(g.Wavelength(i))
	}
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// band returns the rectangular reflectance that is 1 from lo to hi nm
// (inclusive) and 0 elsewhere, on g.
func band(t testing.TB, g colorimetry.Grid, lo, hi float64) colorimetry.Spectrum {
	return onGrid(t, g, func(nm float64) float64 {
		if nm >= lo && nm <= hi {
			return 1
		}
		return 0
	})
}

// gaussians returns Σ amps[k]·exp(−½((λ − centers[k])/widths[k])²) on g.
func gaussians(t testing.TB, g colorimetry.Grid, centers, widths, amps []float64) colorimetry.Spectrum {
	return onGrid(t, g, func(nm float64) float64 {
		var v float64
		for k := range centers {
			d := (nm - centers[k]) / widths[k]
			v += amps[k] * math.Exp(-0.5*d*d)
		}
		return v
	})
}

// logistic returns lo + (hi − lo)/(1 + exp(−(λ − edge)/width)) on g: a
// long-pass edge, or a short-pass one when width < 0.
func logistic(t testing.TB, g colorimetry.Grid, edge, width, lo, hi float64) colorimetry.Spectrum {
	return onGrid(t, g, func(nm float64) float64 {
		return lo + (hi-lo)/(1+math.Exp(-(nm-edge)/width))
	})
}

// conditions returns the conditions for obs and ill or fails the test.
func conditions(t testing.TB, obs *colorimetry.Observer, ill colorimetry.Spectrum) *complement.Conditions {
	t.Helper()
	c, err := complement.NewConditions(obs, ill)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// fluorescent returns CIE FLn or fails the test.
func fluorescent(t testing.TB, n int) colorimetry.Spectrum {
	t.Helper()
	s, err := cie.Fluorescent(n)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// uvPrime returns u′v′ of x or fails the test.
func uvPrime(t testing.TB, x colorimetry.XYZ) colorimetry.UVPrime {
	t.Helper()
	p, err := x.UVPrime()
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// metamericPair returns a (three narrow Gaussians, amplitudes 0.1, 0.6,
// 0.8, so a reflectance) and b (three broad Gaussians at other wavelengths)
// such that, in mode m under c, XYZ(a) + t·XYZ(b) is exactly σ times the
// white, σ = 2·Y(a)/Y(white): metameric complements at ratio t. b's
// amplitudes are solved from the 3×3 linear system of its primaries'
// tristimulus values (Grassmann additivity, CIE 015:2018 §7).
func metamericPair(t testing.TB, c *complement.Conditions, m complement.Mode, ratio float64) (a, b colorimetry.Spectrum) {
	t.Helper()
	g := c.Grid()
	a = gaussians(t, g, []float64{450, 545, 605}, []float64{12, 15, 12}, []float64{0.1, 0.6, 0.8})
	qc, qw := []float64{470, 520, 640}, []float64{25, 30, 25}
	xa, err := c.XYZ(a, m)
	if err != nil {
		t.Fatal(err)
	}
	w := c.White(m)
	sigma := 2 * xa.Y / w.Y
	q := mat.NewDense(3, 3, nil)
	for k := range 3 {
		amps := make([]float64, 3)
		amps[k] = 1
		x, err := c.XYZ(gaussians(t, g, qc, qw, amps), m)
		if err != nil {
			t.Fatal(err)
		}
		q.Set(0, k, x.X)
		q.Set(1, k, x.Y)
		q.Set(2, k, x.Z)
	}
	rhs := mat.NewVecDense(3, []float64{sigma*w.X - xa.X, sigma*w.Y - xa.Y, sigma*w.Z - xa.Z})
	var beta mat.VecDense
	if err := beta.SolveVec(q, rhs); err != nil {
		t.Fatal(err)
	}
	amps := beta.RawVector().Data
	for k, v := range amps {
		if !(v > 0) || m != complement.Lights && v/ratio > 1 {
			t.Fatalf("metameric partner amplitude %d is %g (ratio %g); choose other primaries", k, v, ratio)
		}
		amps[k] = v / ratio
	}
	return a, gaussians(t, g, qc, qw, amps)
}
