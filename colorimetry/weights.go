package colorimetry

import (
	"fmt"
)

// Weights is a precomputed weighting table for one observer, one
// illuminant (or none, for lights) and one computation grid: it turns a
// spectrum on that grid into X, Y, Z with three dot products (CIE 015:2018
// §7, summation at the grid interval). It is immutable and safe for
// concurrent use.
type Weights struct {
	grid       Grid
	wx, wy, wz []float64
	white      XYZ
	object     bool
	observer   string
}

// NewObjectWeights returns the weights for reflectance or transmittance
// (fraction 0–1) under the illuminant ill, seen by obs, computed on the grid
// g: W(λ) = k·S(λ)·x̄(λ)·Δλ with k = 100 / Σ S ȳ Δλ, so the perfect
// diffuser has Y = 100. The illuminant is resampled onto g by its own
// rules, the observer is taken at its table rows (and is zero outside its
// table). It returns ErrZeroLuminance when the illuminant has no
// luminance on g.
func NewObjectWeights(obs *Observer, ill Spectrum, g Grid) (*Weights, error) {
	if !g.Valid() {
		return nil, fmt.Errorf("%w: %+v", ErrBadGrid, g)
	}
	s, err := ill.Resample(g)
	if err != nil {
		return nil, fmt.Errorf("illuminant on %v: %w", g, err)
	}
	x, y, z := obs.onGrid(g)
	var sy float64
	for i := range y {
		sy += s.values[i] * y[i]
	}
	if sy == 0 || !isFinite(sy) {
		return nil, fmt.Errorf("illuminant on %v: %w", g, ErrZeroLuminance)
	}
	k := 100 / sy
	w := &Weights{grid: g, wx: x, wy: y, wz: z, object: true, observer: obs.name}
	for i := range x {
		f := k * s.values[i]
		w.wx[i] *= f
		w.wy[i] *= f
		w.wz[i] *= f
		w.white.X += w.wx[i]
		w.white.Y += w.wy[i]
		w.white.Z += w.wz[i]
	}
	w.white.Y = 100 // exact by construction; avoid summation round-off
	return w, nil
}

// NewLightWeights returns the weights for a light (a spectral power
// distribution) seen by obs on grid g: W(λ) = Km·x̄(λ)·Δλ, so a spectral
// radiance in W·sr⁻¹·m⁻²·nm⁻¹ gives luminance Y in cd/m², a spectral
// irradiance in W·m⁻²·nm⁻¹ gives illuminance in lx, and so on
// (Km = 683.002 lm/W). For relative lights scale the result with
// XYZ.ScaleToY.
func NewLightWeights(obs *Observer, g Grid) (*Weights, error) {
	if !g.Valid() {
		return nil, fmt.Errorf("%w: %+v", ErrBadGrid, g)
	}
	x, y, z := obs.onGrid(g)
	f := Km * g.Step
	for i := range x {
		x[i] *= f
		y[i] *= f
		z[i] *= f
	}
	return &Weights{grid: g, wx: x, wy: y, wz: z, observer: obs.name}, nil
}

// Grid returns the computation grid.
func (w *Weights) Grid() Grid { return w.grid }

// Object reports whether w weights object colours (true) or lights.
func (w *Weights) Object() bool { return w.object }

// White returns the tristimulus values of the perfect diffuser (Y = 100)
// for object weights, and the zero XYZ for light weights.
func (w *Weights) White() XYZ { return w.white }

// ObserverName returns the name of the observer the weights were built for.
func (w *Weights) ObserverName() string { return w.observer }

// XYZ returns the tristimulus values of s. A spectrum on another grid is
// first resampled onto w's grid by its own interpolation and extrapolation
// rules (CIE 015: interpolate the data, not the weights). It returns an
// error wrapping ErrNotFinite when the sums overflow the float64 range
// (values near 1e308).
func (w *Weights) XYZ(s Spectrum) (XYZ, error) {
	if s.IsZero() {
		return XYZ{}, fmt.Errorf("empty spectrum: %w", ErrTooFew)
	}
	r, err := s.Resample(w.grid)
	if err != nil {
		return XYZ{}, err
	}
	c := w.dot(r.values)
	if !c.Finite() {
		return XYZ{}, fmt.Errorf("tristimulus values %v overflow the float64 range: %w", c, ErrNotFinite)
	}
	return c, nil
}

// dot returns the three weighted sums of v (len w.grid.N), by the same
// kernel as the batch methods, so single and batch results are identical.
func (w *Weights) dot(v []float64) XYZ {
	var c [3]float64
	xyzBatch(c[:], v, w.wx, w.wy, w.wz)
	return XYZ{c[0], c[1], c[2]}
}

// XYZBatchTo computes the tristimulus values of many spectra sampled on
// w's grid. values holds the spectra one after another (len N·n, n =
// Grid().N); dst receives X, Y, Z for each spectrum in turn (len 3·N) and is
// returned. It allocates nothing, and each spectrum's sums are taken in the
// same order as XYZ takes them, so the results are identical. On amd64
// processors with AVX2 and FMA the sums run four samples at a time with
// fused multiply-adds; elsewhere in sample order. It panics if len(values)
// is not a multiple of n or dst has the wrong length.
func (w *Weights) XYZBatchTo(dst, values []float64) []float64 {
	w.checkBatch(len(dst), len(values))
	xyzBatch(dst, values, w.wx, w.wy, w.wz)
	return dst
}

// XYZBatch32To is XYZBatchTo for spectra stored as float32, as
// hyperspectral cubes and spectral renderers usually hold them: half the
// bytes to read. Each sample is widened to float64 exactly and the sums are
// taken in float64, so the results differ from XYZBatchTo's on the same
// (float32-representable) values only by summation order — and from those
// of the float64 originals by the float32 rounding of the input (relative
// 6e-8 at most per sample).
func (w *Weights) XYZBatch32To(dst []float64, values []float32) []float64 {
	w.checkBatch(len(dst), len(values))
	xyzBatch32(dst, values, w.wx, w.wy, w.wz)
	return dst
}

// checkBatch panics unless a batch of nv samples fills whole spectra and
// nd = 3 per spectrum.
func (w *Weights) checkBatch(nd, nv int) {
	n := w.grid.N
	if nv%n != 0 {
		panic("colorimetry: batch length is not a multiple of the grid size")
	}
	if nd != 3*(nv/n) {
		panic("colorimetry: dst length must be 3 per spectrum")
	}
}

// XYZBatchParallelTo is XYZBatchTo with the spectra split into contiguous
// blocks over workers goroutines (workers ≤ 0 means runtime.GOMAXPROCS). The
// results are identical to XYZBatchTo's. It allocates only the goroutines'
// bookkeeping, not per spectrum, and panics as XYZBatchTo does.
func (w *Weights) XYZBatchParallelTo(dst, values []float64, workers int) []float64 {
	w.checkBatch(len(dst), len(values))
	n := w.grid.N
	// Below a few thousand spectra the goroutines cost more than they save.
	parallel(len(values)/n, workers, 2048, func(lo, hi int) {
		xyzBatch(dst[3*lo:3*hi], values[n*lo:n*hi], w.wx, w.wy, w.wz)
	})
	return dst
}

// XYZBatch32ParallelTo is XYZBatch32To split over workers goroutines, as
// XYZBatchParallelTo splits XYZBatchTo.
func (w *Weights) XYZBatch32ParallelTo(dst []float64, values []float32, workers int) []float64 {
	w.checkBatch(len(dst), len(values))
	n := w.grid.N
	parallel(len(values)/n, workers, 2048, func(lo, hi int) {
		xyzBatch32(dst[3*lo:3*hi], values[n*lo:n*hi], w.wx, w.wy, w.wz)
	})
	return dst
}
