package colorimetry

// xyzBatchGeneric is the portable tristimulus kernel: for each of the
// len(v)/n spectra in v (n = len(wx)), the three weighted sums in sample
// order, written to dst as X, Y, Z. It serves processors without the
// vector kernel, and is the reference the vector kernel is tested against.
func xyzBatchGeneric[T float32 | float64](dst []float64, v []T, wx, wy, wz []float64) {
	n := len(wx)
	wy, wz = wy[:n], wz[:n]
	for j := 0; j+n <= len(v); j += n {
		var x, y, z float64
		for i, s := range v[j : j+n] {
			r := float64(s)
			x += r * wx[i]
			y += r * wy[i]
			z += r * wz[i]
		}
		k := 3 * (j / n)
		dst[k], dst[k+1], dst[k+2] = x, y, z
	}
}
