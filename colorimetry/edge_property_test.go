package colorimetry_test

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"pgregory.net/rapid"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// edgeFloat draws a float64 from the edges of the range as well as the
// middle: zeros of both signs, subnormals, values near 1e±308 and ordinary
// numbers, either sign. Every draw is finite.
func edgeFloat() *rapid.Generator[float64] {
	return rapid.OneOf(
		rapid.SampledFrom([]float64{0, math.Copysign(0, -1), 5e-324, -5e-324, 1e-300, 1e300, 1e308, -1e308,
			math.MaxFloat64, -math.MaxFloat64, math.SmallestNonzeroFloat64, 1, -1}),
		rapid.Float64Range(-1e308, 1e308),
		rapid.Float64Range(-2, 2),
		rapid.Float64Range(0, 100),
	)
}

// finite reports whether every value is neither NaN nor infinite.
func finite(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// TestNoNonFiniteWithoutError checks the rule that no entry point hands
// back NaN or Inf as a result: for spectra and chromaticities drawn from
// the whole float64 range (zeros, subnormals, ±1e308), XYZ, chromaticity,
// CIELAB, CIELUV, ΔE, CCT and dominant wavelength either return an error
// or finite numbers. A property of the API contract: common practice (no
// source).
func TestNoNonFiniteWithoutError(t *testing.T) {
	t.Parallel()
	obs := cie.CIE1931()
	g := colorimetry.Grid{Start: 380, Step: 10, N: 41}
	ow, err := colorimetry.NewObjectWeights(obs, cie.D65(), g)
	if err != nil {
		t.Fatal(err)
	}
	lw, err := colorimetry.NewLightWeights(obs, g)
	if err != nil {
		t.Fatal(err)
	}
	table, err := colorimetry.NewPlanckianTable(obs, colorimetry.C2)
	if err != nil {
		t.Fatal(err)
	}
	white := ow.White()
	wxy, err := white.XY()
	if err != nil {
		t.Fatal(err)
	}
	rapid.Check(t, func(rt *rapid.T) {
		v := rapid.SliceOfN(edgeFloat(), g.N, g.N).Draw(rt, "values")
		s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
		if err != nil {
			rt.Fatal(err) // finite values on a valid grid must build
		}
		// Resampling (Sprague at 10 nm) may overflow near ±1e308: an error.
		if r, err := s.Resample(colorimetry.Grid1nm); err == nil {
			for i := range r.Len() {
				if !finite(r.Value(i)) {
					rt.Fatalf("Resample gave %v at %g nm without an error", r.Value(i), r.Grid().Wavelength(i))
				}
			}
		}
		for _, w := range []*colorimetry.Weights{ow, lw} {
			c, err := w.XYZ(s)
			if err != nil {
				if !errors.Is(err, colorimetry.ErrNotFinite) {
					rt.Fatalf("XYZ error %v does not wrap ErrNotFinite", err)
				}
				continue
			}
			if !c.Finite() {
				rt.Fatalf("XYZ = %v without an error", c)
			}
			checkDerived(rt, c, white, wxy, table, obs)
		}
		// Chromaticities anywhere, not only those of spectra.
		p := colorimetry.XY{X: rapid.Float64Range(-10, 10).Draw(rt, "x"), Y: rapid.Float64Range(-10, 10).Draw(rt, "y")}
		if d, err := colorimetry.DominantWavelength(obs, p, wxy); err == nil &&
			!finite(d.Wavelength, d.ExcitationPurity, d.ColorimetricPurity, d.Boundary.X, d.Boundary.Y) {
			rt.Fatalf("dominant wavelength of %v = %+v without an error", p, d)
		}
		if c, err := p.XYZ(rapid.Float64Range(0, 1e308).Draw(rt, "Y")); err == nil && !c.Finite() {
			rt.Fatalf("XY.XYZ of %v = %v without an error", p, c)
		}
		// CIELAB colours anywhere within ±LabLimit, and back.
		comp := rapid.OneOf(rapid.Float64Range(-colorimetry.LabLimit, colorimetry.LabLimit), rapid.Float64Range(-200, 200),
			rapid.SampledFrom([]float64{0, -colorimetry.LabLimit, colorimetry.LabLimit, 1e44, 1e77}))
		la := colorimetry.Lab{L: comp.Draw(rt, "L1"), A: comp.Draw(rt, "a1"), B: comp.Draw(rt, "b1")}
		lb := colorimetry.Lab{L: comp.Draw(rt, "L2"), A: comp.Draw(rt, "a2"), B: comp.Draw(rt, "b2")}
		checkDeltaE(rt, la, lb)
		if c, err := la.XYZ(white); err == nil && !c.Finite() {
			rt.Fatalf("Lab.XYZ of %v = %v without an error", la, c)
		}
		uv := colorimetry.UV{U: rapid.Float64Range(-1, 1).Draw(rt, "u"), V: rapid.Float64Range(-1, 1).Draw(rt, "v")}
		for _, m := range []colorimetry.CCTMethod{colorimetry.CCTOhno, colorimetry.CCTRobertson} {
			if k, err := table.CCT(uv, m); err == nil && !finite(k.Kelvin, k.Duv) {
				rt.Fatalf("CCT(%v, %v) = %+v without an error", uv, m, k)
			}
		}
	})
}

// checkDerived checks the quantities derived from finite tristimulus
// values c: chromaticities, CIELAB, CIELUV, ΔE against the white, CCT and
// dominant wavelength are finite wherever they come without an error.
func checkDerived(rt *rapid.T, c, white colorimetry.XYZ, wxy colorimetry.XY, table *colorimetry.PlanckianTable, obs *colorimetry.Observer) {
	if xy, err := c.XY(); err == nil {
		if !finite(xy.X, xy.Y) {
			rt.Fatalf("XY of %v = %v without an error", c, xy)
		}
		if d, err := colorimetry.DominantWavelength(obs, xy, wxy); err == nil &&
			!finite(d.Wavelength, d.ExcitationPurity, d.ColorimetricPurity) {
			rt.Fatalf("dominant wavelength of %v = %+v without an error", xy, d)
		}
	}
	if uv, err := c.UV(); err == nil {
		if !finite(uv.U, uv.V) {
			rt.Fatalf("UV of %v = %v without an error", c, uv)
		}
		if k, err := table.CCT(uv, colorimetry.CCTOhno); err == nil && !finite(k.Kelvin, k.Duv) {
			rt.Fatalf("CCT of %v = %+v without an error", c, k)
		}
	}
	if s, err := c.ScaleToY(100); err == nil && !s.Finite() {
		rt.Fatalf("ScaleToY of %v = %v without an error", c, s)
	}
	lab, err := c.Lab(white)
	if err != nil {
		return
	}
	if !lab.Finite() || !finite(lab.LCh().C, lab.LCh().H) {
		rt.Fatalf("Lab of %v = %v without an error", c, lab)
	}
	if luv, err := c.Luv(white); err == nil && !luv.Finite() {
		rt.Fatalf("Luv of %v = %v without an error", c, luv)
	}
	checkDeltaE(rt, lab, colorimetry.Lab{L: 50, A: 10, B: -10})
}

// checkDeltaE checks that every colour difference of a and ref is finite
// and not negative.
func checkDeltaE(rt *rapid.T, lab, ref colorimetry.Lab) {
	for name, de := range map[string]float64{
		"ΔE*ab": colorimetry.DeltaEab(lab, ref),
		"ΔE94":  colorimetry.DeltaE94(lab, ref, colorimetry.CIE94GraphicArts),
		"ΔECMC": colorimetry.DeltaECMC(lab, ref, 2, 1),
		"ΔE00":  colorimetry.DeltaE2000(lab, ref),
	} {
		if !finite(de) || de < 0 {
			rt.Fatalf("%s(%v, %v) = %v", name, lab, ref, de)
		}
	}
}

// TestTristimulusLinearity checks Grassmann's law as the weighting table
// applies it: XYZ(a·s + b·t) = a·XYZ(s) + b·XYZ(t) for spectra on the
// table's grid (CIE 015:2018 §7: tristimulus values are sums of the
// spectrum times the weights, so linear). Tol 1e-12 relative to the
// largest |term| (round-off of 41-term sums).
func TestTristimulusLinearity(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid{Start: 380, Step: 10, N: 41}
	w, err := colorimetry.NewObjectWeights(cie.CIE1964(), cie.A(), g)
	if err != nil {
		t.Fatal(err)
	}
	rapid.Check(t, func(rt *rapid.T) {
		val := rapid.Float64Range(-1, 2)
		sv := rapid.SliceOfN(val, g.N, g.N).Draw(rt, "s")
		tv := rapid.SliceOfN(val, g.N, g.N).Draw(rt, "t")
		a := rapid.Float64Range(-1e3, 1e3).Draw(rt, "a")
		b := rapid.Float64Range(-1e3, 1e3).Draw(rt, "b")
		mix := make([]float64, g.N)
		for i := range mix {
			mix[i] = a*sv[i] + b*tv[i]
		}
		xs := mustXYZ(rt, w, g, sv)
		xt := mustXYZ(rt, w, g, tv)
		xm := mustXYZ(rt, w, g, mix)
		want := xs.Scale(a).Add(xt.Scale(b))
		scale := 100 * (math.Abs(a) + math.Abs(b)) * 2
		for i, p := range [][2]float64{{xm.X, want.X}, {xm.Y, want.Y}, {xm.Z, want.Z}} {
			if !scalar.EqualWithinAbs(p[0], p[1], 1e-12*scale) {
				rt.Fatalf("component %d: XYZ(a·s+b·t) = %v, a·XYZ(s)+b·XYZ(t) = %v", i, p[0], p[1])
			}
		}
	})
}

// mustXYZ builds a spectrum on g and returns its tristimulus values.
func mustXYZ(rt *rapid.T, w *colorimetry.Weights, g colorimetry.Grid, v []float64) colorimetry.XYZ {
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
	if err != nil {
		rt.Fatal(err)
	}
	c, err := w.XYZ(s)
	if err != nil {
		rt.Fatal(err)
	}
	return c
}

// TestInterpolationReproducesNodes checks that every interpolation rule
// (Sprague, natural cubic spline, linear) passes through its data: data at
// 10 or 5 nm resampled to 1 nm keep their values at the data wavelengths
// (CIE 015:2018 §7.2.1: interpolation, not smoothing; Sprague 1880 and
// the spline interpolate by construction). Tol 1e-12 relative to the
// largest |value| (round-off).
func TestInterpolationReproducesNodes(t *testing.T) {
	t.Parallel()
	rapid.Check(t, func(rt *rapid.T) {
		step := rapid.SampledFrom([]float64{5, 10, 20}).Draw(rt, "step")
		n := rapid.IntRange(3, 40).Draw(rt, "n")
		start := rapid.Float64Range(300, 500).Draw(rt, "start")
		start = math.Round(start)
		v := rapid.SliceOfN(rapid.Float64Range(-5, 5), n, n).Draw(rt, "values")
		m := rapid.SampledFrom([]colorimetry.Interp{colorimetry.InterpSprague, colorimetry.InterpSpline, colorimetry.InterpLinear}).Draw(rt, "interp")
		g := colorimetry.Grid{Start: start, Step: step, N: n}
		s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{Interp: m})
		if err != nil {
			rt.Fatal(err)
		}
		fine := colorimetry.Grid{Start: start, Step: 1, N: int(step)*(n-1) + 1}
		r, err := s.Resample(fine)
		if err != nil {
			rt.Fatal(err)
		}
		peak := 0.0
		for _, x := range v {
			peak = math.Max(peak, math.Abs(x))
		}
		for i, want := range v {
			got := r.Value(i * int(step))
			if !scalar.EqualWithinAbs(got, want, 1e-12*math.Max(peak, 1)) {
				rt.Fatalf("%v: node %d (%g nm) = %v after resampling, want %v", m, i, g.Wavelength(i), got, want)
			}
			if at := s.At(g.Wavelength(i)); !scalar.EqualWithinAbs(at, want, 1e-12*math.Max(peak, 1)) {
				rt.Fatalf("%v: At(%g nm) = %v, want %v", m, g.Wavelength(i), at, want)
			}
		}
	})
}

// TestGridValidEdges checks the grids that model files and spectra may
// not use: wavelengths are positive (CIE 015:2018 works in nm > 0; common
// practice (no source)), the end must be finite and the step must survive
// rounding against the start.
func TestGridValidEdges(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		g    colorimetry.Grid
		want bool
	}{
		{"380–780 at 5 nm", colorimetry.Grid{Start: 380, Step: 5, N: 81}, true},
		{"tiny positive start", colorimetry.Grid{Start: 1e-300, Step: 1e-300, N: 3}, true},
		{"zero start", colorimetry.Grid{Start: 0, Step: 5, N: 81}, false},
		{"negative start", colorimetry.Grid{Start: -1e308, Step: 5, N: 81}, false},
		{"end overflows", colorimetry.Grid{Start: 380, Step: 1e308, N: 81}, false},
		{"step lost to rounding", colorimetry.Grid{Start: 1e20, Step: 1, N: 3}, false},
		{"NaN step", colorimetry.Grid{Start: 380, Step: math.NaN(), N: 3}, false},
		{"two points", colorimetry.Grid{Start: 380, Step: 5, N: 2}, false},
	} {
		if got := tc.g.Valid(); got != tc.want {
			t.Errorf("%s: Valid(%+v) = %v, want %v", tc.name, tc.g, got, tc.want)
		}
	}
}

// TestOverflowCases pins the overflows the property test above found, so
// that they fail deterministically should they come back: each must be an
// error wrapping ErrNotFinite, or a finite number. Common practice (no
// source).
func TestOverflowCases(t *testing.T) {
	t.Parallel()
	obs := cie.CIE1931()
	g := colorimetry.Grid{Start: 380, Step: 20, N: 21}
	v := make([]float64, g.N)
	for i := range v {
		v[i] = 1e308
	}
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	lw, err := colorimetry.NewLightWeights(obs, g)
	if err != nil {
		t.Fatal(err)
	}
	white := colorimetry.XYZ{X: 95.047, Y: 100, Z: 108.883}
	huge := colorimetry.XYZ{X: 1e308, Y: 1e308, Z: 1e308}
	_, errXYZ := lw.XYZ(s)
	_, errResample := s.Resample(colorimetry.Grid1nm) // Sprague at 20 nm overshoots
	_, errXY := huge.XY()
	_, errUV := huge.UVPrime()
	_, errScale := colorimetry.XYZ{X: 1, Y: 5e-324, Z: 1}.ScaleToY(100)
	_, errLab := colorimetry.XYZ{X: 1, Y: 1, Z: -1e308}.Lab(white)
	_, errLabXYZ := colorimetry.Lab{L: 1e120, A: 0, B: 0}.XYZ(white)
	_, errXYXYZ := colorimetry.XY{X: 1, Y: 1.875}.XYZ(1e308)
	for name, err := range map[string]error{
		"light XYZ of 1e308": errXYZ, "Sprague resampling of 1e308": errResample, "xy of 1e308": errXY,
		"u′v′ of 1e308": errUV, "ScaleToY from a subnormal Y": errScale, "Lab of Z = −1e308": errLab,
		"XYZ of L* = 1e120": errLabXYZ, "XYZ of xy at Y = 1e308": errXYXYZ,
	} {
		if !errors.Is(err, colorimetry.ErrNotFinite) {
			t.Errorf("%s: error %v, want ErrNotFinite", name, err)
		}
	}
	// C⁷ and C⁴ overflow in CIEDE2000 and CMC for chromas beyond 1e44
	// and 1e77; the results must stay finite.
	a := colorimetry.Lab{L: 50, A: 1e100, B: -1e100}
	b := colorimetry.Lab{L: 50, A: 10, B: 10}
	for name, de := range map[string]float64{
		"ΔE00": colorimetry.DeltaE2000(a, b), "ΔECMC": colorimetry.DeltaECMC(a, b, 2, 1),
	} {
		if !finite(de) {
			t.Errorf("%s of %v and %v = %v", name, a, b, de)
		}
	}
}

// TestRobertsonContinuity checks that Robertson's method has no jump
// where it passes from one pair of isotemperature lines to the next: its
// reciprocal temperature is interpolated linearly between adjacent lines
// (Robertson 1968), so the CCT is continuous in u, v. Around each line of
// the table (10–575 MK⁻¹, near T = 10⁶/mired), chromaticities on the
// normal of the locus at Duv −0.02, 0 and +0.02 are swept over ±0.5 % in
// steps of 5e-5·T; the CCT may change by at most 2 steps per step (the
// method's slope dCCT/dT stays within a few per cent of 1), so a jump of
// a third of the method's error (0.05 MK⁻¹, 3e-4·T at 6500 K) would show.
func TestRobertsonContinuity(t *testing.T) {
	t.Parallel()
	table, err := colorimetry.NewPlanckianTable(cie.CIE1931(), colorimetry.C2)
	if err != nil {
		t.Fatal(err)
	}
	mireds := []float64{10, 20, 30, 40, 50, 60, 70, 80, 90, 100, 125, 150, 175, 200, 225, 250, 275,
		300, 325, 350, 375, 400, 425, 450, 475, 500, 525, 550, 575} // Robertson 1968, Table 1 (from memory)
	for _, m := range mireds {
		t0 := 1e6 / m
		step := 5e-5 * t0
		for _, duv := range []float64{-0.02, 0, 0.02} {
			prev := math.NaN()
			for k := t0 * 0.995; k <= math.Min(t0*1.005, colorimetry.CCTMax); k += step {
				uv, err := table.UV(k, duv)
				if err != nil {
					t.Fatal(err)
				}
				c, err := table.CCT(uv, colorimetry.CCTRobertson)
				if err != nil {
					t.Fatalf("%.3f K, Duv %g: %v", k, duv, err)
				}
				if d := math.Abs(c.Kelvin - prev); d > 2*step {
					t.Fatalf("near %g MK⁻¹, Duv %g: the CCT jumps by %.4f K (%.4f → %.4f) over a step of %.4f K", m, duv, d, prev, c.Kelvin, step)
				}
				prev = c.Kelvin
			}
		}
	}
}
