//go:build !amd64 || purego

package colorimetry

// haveFMA is false where no vector kernel is built.
const haveFMA = false

// xyzBatch writes X, Y, Z of the len(v)/n spectra in v into dst (3 per
// spectrum).
func xyzBatch(dst, v, wx, wy, wz []float64) { xyzBatchGeneric(dst, v, wx, wy, wz) }

// xyzBatch32 is xyzBatch for float32 samples.
func xyzBatch32(dst []float64, v []float32, wx, wy, wz []float64) {
	xyzBatchGeneric(dst, v, wx, wy, wz)
}

// kernelChunk is unused without an assembly kernel; the tests refer to it.
const kernelChunk = 2048
