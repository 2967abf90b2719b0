package colorimetry

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// testObserver is a smooth stand-in observer for tests of the weighting
// mechanics only (three Gaussians; invented). Checks against the CIE
// tables live in package cie.
func testObserver(t testing.TB) *Observer {
	g := Grid{Start: 360, Step: 1, N: 471}
	nm := g.Wavelengths(nil)
	var x, y, z []float64
	for _, w := range nm {
		x = append(x, 1.06*math.Exp(-0.5*math.Pow((w-600)/38, 2))+0.36*math.Exp(-0.5*math.Pow((w-446)/19, 2)))
		y = append(y, math.Exp(-0.5*math.Pow((w-556)/47, 2)))
		z = append(z, 1.78*math.Exp(-0.5*math.Pow((w-449)/22, 2)))
	}
	o, err := NewObserver("test", nm, x, y, z)
	if err != nil {
		t.Fatal(err)
	}
	return o
}

func TestObjectWeightsWhite(t *testing.T) {
	t.Parallel()
	obs := testObserver(t)
	ill, err := Blackbody(5000, Grid1nm, C2)
	if err != nil {
		t.Fatal(err)
	}
	for _, g := range []Grid{Grid1nm, Grid5nm} {
		w, err := NewObjectWeights(obs, ill, g)
		if err != nil {
			t.Fatal(err)
		}
		one := make([]float64, g.N)
		for i := range one {
			one[i] = 1
		}
		s, _ := NewSpectrumOnGrid(g, one, Options{})
		c, err := w.XYZ(s)
		if err != nil {
			t.Fatal(err)
		}
		// The perfect diffuser has Y = 100 by definition (CIE 015:2018 §7.1).
		if !scalar.EqualWithinAbsOrRel(c.Y, 100, 1e-12, 1e-12) {
			t.Errorf("%v: Y of perfect diffuser %g", g, c.Y)
		}
		wh := w.White()
		if !scalar.EqualWithinAbsOrRel(c.X, wh.X, 1e-12, 1e-12) || !scalar.EqualWithinAbsOrRel(c.Z, wh.Z, 1e-12, 1e-12) {
			t.Errorf("%v: white %v, diffuser %v", g, wh, c)
		}
	}
}

func TestXYZBatchMatchesSingle(t *testing.T) {
	// Not parallel: testing.AllocsPerRun refuses parallel tests.
	obs := testObserver(t)
	ill, _ := Blackbody(6500, Grid5nm, C2)
	w, err := NewObjectWeights(obs, ill, Grid5nm)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(1, 1))
	const n = 50
	vals := make([]float64, n*Grid5nm.N)
	for i := range vals {
		vals[i] = rng.Float64()
	}
	dst := w.XYZBatchTo(make([]float64, 3*n), vals)
	for j := 0; j < n; j++ {
		s, _ := NewSpectrumOnGrid(Grid5nm, vals[j*Grid5nm.N:(j+1)*Grid5nm.N], Options{})
		c, _ := w.XYZ(s)
		if c.X != dst[3*j] || c.Y != dst[3*j+1] || c.Z != dst[3*j+2] {
			t.Fatalf("spectrum %d: batch %v, single %v", j, dst[3*j:3*j+3], c)
		}
	}
	if allocs := testing.AllocsPerRun(10, func() { w.XYZBatchTo(dst, vals) }); allocs != 0 {
		t.Errorf("XYZBatchTo allocates %g times per call", allocs)
	}
}

func TestLightWeightsLinear(t *testing.T) {
	t.Parallel()
	obs := testObserver(t)
	w, err := NewLightWeights(obs, Grid1nm)
	if err != nil {
		t.Fatal(err)
	}
	a, _ := Blackbody(3000, Grid{Start: 380, Step: 1, N: 401}, C2)
	b, _ := Blackbody(9000, Grid5nm, C2)
	sum, _ := Add(a, b)
	ca, _ := w.XYZ(a)
	cb, _ := w.XYZ(b)
	cs, _ := w.XYZ(sum)
	// Tristimulus values are linear in the spectrum (CIE 015 §7: they are
	// sums) and so are interpolation and extrapolation; 1e-12 is round-off.
	want := ca.Add(cb)
	for i, p := range [][2]float64{{cs.X, want.X}, {cs.Y, want.Y}, {cs.Z, want.Z}} {
		if !scalar.EqualWithinAbsOrRel(p[0], p[1], 1e-9, 1e-12) {
			t.Errorf("component %d: %g want %g", i, p[0], p[1])
		}
	}
	// A 1 W·nm⁻¹ flat spectrum gives Y = Km·Σȳ·Δλ.
	flat, _ := NewSpectrumOnGrid(Grid1nm, ones(Grid1nm.N), Options{})
	c, _ := w.XYZ(flat)
	_, y, _ := obs.CMF()
	var sy float64
	for i := 0; i < y.Len(); i++ {
		sy += y.Value(i)
	}
	if !scalar.EqualWithinAbsOrRel(c.Y, Km*sy, 1e-9, 1e-12) {
		t.Errorf("flat light: Y %g want %g", c.Y, Km*sy)
	}
}

func ones(n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = 1
	}
	return v
}

func TestPlanckWien(t *testing.T) {
	t.Parallel()
	// Wien's displacement law λmax·T = b = 2.897771955e-3 m·K (CODATA 2018);
	// with c2 = hc/k (CODATA) the peak of Planck's law must sit there.
	const b = 2.897771955e-3
	for _, T := range []float64{3000, 5000} {
		peak := b / T * 1e9
		lo, hi := Planck(peak-0.5, T, C2CODATA), Planck(peak+0.5, T, C2CODATA)
		mid := Planck(peak, T, C2CODATA)
		if !(mid > lo && mid > hi) {
			t.Errorf("%g K: Planck not peaked at %g nm", T, peak)
		}
	}
	if _, err := Blackbody(-1, Grid1nm, C2); err == nil {
		t.Error("negative temperature accepted")
	}
}

var sinkXYZ []float64

func benchmarkXYZBatch(b *testing.B, n int) {
	obs := testObserver(b)
	ill, _ := Blackbody(6504, Grid5nm, C2)
	w, err := NewObjectWeights(obs, ill, Grid5nm)
	if err != nil {
		b.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(1, 1))
	vals := make([]float64, n*Grid5nm.N)
	for i := range vals {
		vals[i] = rng.Float64()
	}
	dst := make([]float64, 3*n)
	b.SetBytes(int64(8 * len(vals)))
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		sinkXYZ = w.XYZBatchTo(dst, vals)
	}
	b.ReportMetric(float64(n)*float64(b.N)/b.Elapsed().Seconds(), "spectra/s")
}

// BenchmarkXYZBatchSmall converts 1000 81-band reflectances (380–780 nm at
// 5 nm) to XYZ with one precomputed weighting table: 648 kB that stay in
// cache, so it times the arithmetic alone (BenchmarkXYZBatch streams
// 200 000 from memory).
func BenchmarkXYZBatchSmall(b *testing.B) { benchmarkXYZBatch(b, 1000) }
