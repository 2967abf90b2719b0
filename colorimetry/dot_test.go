package colorimetry

import (
	"math"
	"math/rand/v2"
	"testing"
)

// sumBound is the classical bound on the rounding error of a sum of n
// products taken in any order, with or without fused multiply-adds:
// γ(n+1)·Σ|rᵢwᵢ|, γ(k) = k·u/(1 − k·u), u = 2⁻⁵³ (Higham, Accuracy and
// Stability of Numerical Algorithms, 2nd ed., §3.1, eq. 3.5). Both kernels
// lie within it of the exact sum, so within twice it of each other.
func sumBound(r, w []float64) float64 {
	var a float64
	for i := range r {
		a += math.Abs(r[i] * w[i])
	}
	k := float64(len(r) + 1)
	u := 0x1p-53
	return 2 * k * u / (1 - k*u) * a
}

// TestXYZKernelMatchesGeneric runs the batch kernel this processor uses
// against the portable one for every length from 1 to 100 samples (all
// block and tail cases of the vector kernel) and batches of 0 to 4 spectra,
// on values of both signs, for float64 and float32 samples.
func TestXYZKernelMatchesGeneric(t *testing.T) {
	t.Parallel()
	if !haveFMA {
		t.Log("no vector kernel on this processor: both paths are the portable one")
	}
	rng := rand.New(rand.NewPCG(7, 11))
	for n := 1; n <= 100; n++ {
		w := [3][]float64{make([]float64, n), make([]float64, n), make([]float64, n)}
		for k := range w {
			for i := range w[k] {
				w[k][i] = rng.NormFloat64()
			}
		}
		for count := 0; count <= 4; count++ {
			v := make([]float64, n*count)
			v32 := make([]float32, n*count)
			for i := range v {
				v32[i] = float32(rng.NormFloat64() * 10)
				v[i] = float64(v32[i])
			}
			got := make([]float64, 3*count)
			got32 := make([]float64, 3*count)
			want := make([]float64, 3*count)
			xyzBatch(got, v, w[0], w[1], w[2])
			xyzBatch32(got32, v32, w[0], w[1], w[2])
			xyzBatchGeneric(want, v, w[0], w[1], w[2])
			for j := range count {
				for k := range 3 {
					tol := sumBound(v[j*n:(j+1)*n], w[k])
					if d := math.Abs(got[3*j+k] - want[3*j+k]); d > tol {
						t.Fatalf("n %d spectrum %d component %d: kernel %g, generic %g (|Δ| %g > %g)", n, j, k, got[3*j+k], want[3*j+k], d, tol)
					}
					// The float32 samples widen exactly, so the float32
					// kernel must give the float64 kernel's very bits.
					if got32[3*j+k] != got[3*j+k] {
						t.Fatalf("n %d spectrum %d component %d: float32 kernel %g, float64 kernel %g", n, j, k, got32[3*j+k], got[3*j+k])
					}
				}
			}
		}
	}
}

// TestXYZBatch32Accuracy checks the accuracy target for the
// float32 path: reflectances rounded to float32 give X, Y, Z within 1e-6
// relative of the float64 results (the rounding is at most 2⁻²⁴ relative
// per sample, so about 6e-8 is expected).
func TestXYZBatch32Accuracy(t *testing.T) {
	// Not parallel: testing.AllocsPerRun refuses parallel tests.
	obs := testObserver(t)
	ill, _ := Blackbody(6504, Grid5nm, C2)
	w, err := NewObjectWeights(obs, ill, Grid5nm)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(3, 5))
	const count = 5000
	v := make([]float64, count*Grid5nm.N)
	v32 := make([]float32, len(v))
	for i := range v {
		v[i] = rng.Float64()
		v32[i] = float32(v[i])
	}
	want := w.XYZBatchTo(make([]float64, 3*count), v)
	got := w.XYZBatch32To(make([]float64, 3*count), v32)
	par := w.XYZBatch32ParallelTo(make([]float64, 3*count), v32, 3)
	var worst float64
	for i := range want {
		worst = max(worst, math.Abs(got[i]-want[i])/math.Abs(want[i]))
		if par[i] != got[i] {
			t.Fatalf("value %d: parallel %g, serial %g", i, par[i], got[i])
		}
	}
	if worst > 1e-6 {
		t.Errorf("float32 path: worst relative error %.3g > 1e-6", worst)
	}
	t.Logf("float32 path: worst relative error %.3g over %d spectra", worst, count)
	if allocs := testing.AllocsPerRun(10, func() { w.XYZBatch32To(got, v32) }); allocs != 0 {
		t.Errorf("XYZBatch32To allocates %g times per call", allocs)
	}
}

// TestXYZKernelChunks runs a batch longer than one kernel call takes
// (kernelChunk spectra) and checks every spectrum, the ones on both sides
// of each chunk boundary included, against the portable kernel.
func TestXYZKernelChunks(t *testing.T) {
	t.Parallel()
	const n = 81
	count := 2*kernelChunk + 5
	rng := rand.New(rand.NewPCG(13, 17))
	w := [3][]float64{make([]float64, n), make([]float64, n), make([]float64, n)}
	for k := range w {
		for i := range w[k] {
			w[k][i] = rng.Float64()
		}
	}
	v := make([]float64, n*count)
	for i := range v {
		v[i] = rng.Float64()
	}
	got := make([]float64, 3*count)
	want := make([]float64, 3*count)
	xyzBatch(got, v, w[0], w[1], w[2])
	xyzBatchGeneric(want, v, w[0], w[1], w[2])
	for j := range count {
		for k := range 3 {
			if d := math.Abs(got[3*j+k] - want[3*j+k]); d > sumBound(v[j*n:(j+1)*n], w[k]) {
				t.Fatalf("spectrum %d component %d: kernel %g, generic %g", j, k, got[3*j+k], want[3*j+k])
			}
		}
	}
}
