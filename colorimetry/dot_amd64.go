//go:build amd64 && !purego

package colorimetry

import "golang.org/x/sys/cpu"

// haveFMA reports whether the AVX2 + FMA kernels may run on this processor
// (and the operating system saves the wide registers).
var haveFMA = cpu.X86.HasAVX2 && cpu.X86.HasFMA

// xyzBatchAVX2 is implemented in dot_amd64.s.
//
//go:noescape
func xyzBatchAVX2(dst, v, wx, wy, wz *float64, n, count int)

// xyzBatch32AVX2 is implemented in dot_amd64.s.
//
//go:noescape
func xyzBatch32AVX2(dst *float64, v *float32, wx, wy, wz *float64, n, count int)

// kernelChunk is the most spectra one call of an assembly kernel takes:
// about 30 µs of work. Assembly cannot be preempted, so a long batch in one
// call would hold up the garbage collector's stop-the-world for as long as
// it ran; between calls the goroutine can be stopped.
const kernelChunk = 2048

// xyzBatch writes X, Y, Z of the len(v)/n spectra in v into dst (3 per
// spectrum), with the vector kernel where the processor has one.
func xyzBatch(dst, v, wx, wy, wz []float64) {
	if !haveFMA {
		xyzBatchGeneric(dst, v, wx, wy, wz)
		return
	}
	n := len(wx)
	_, _ = wy[n-1], wz[n-1]
	for count := len(v) / n; count > 0; {
		c := min(count, kernelChunk)
		_ = dst[3*c-1]
		xyzBatchAVX2(&dst[0], &v[0], &wx[0], &wy[0], &wz[0], n, c)
		dst, v, count = dst[3*c:], v[n*c:], count-c
	}
}

// xyzBatch32 is xyzBatch for float32 samples.
func xyzBatch32(dst []float64, v []float32, wx, wy, wz []float64) {
	if !haveFMA {
		xyzBatchGeneric(dst, v, wx, wy, wz)
		return
	}
	n := len(wx)
	_, _ = wy[n-1], wz[n-1]
	for count := len(v) / n; count > 0; {
		c := min(count, kernelChunk)
		_ = dst[3*c-1]
		xyzBatch32AVX2(&dst[0], &v[0], &wx[0], &wy[0], &wz[0], n, c)
		dst, v, count = dst[3*c:], v[n*c:], count-c
	}
}
