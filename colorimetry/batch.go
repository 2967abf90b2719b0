package colorimetry

import (
	"runtime"
	"sync"
)

// DeltaE2000To writes ΔE00 (CIEDE2000, kL = kC = kH = 1) of each pair
// a[i], b[i] into dst[i] and returns dst. It allocates nothing. It panics if
// the three slices differ in length.
func DeltaE2000To(dst []float64, a, b []Lab) []float64 {
	if len(a) != len(b) || len(dst) != len(a) {
		panic("colorimetry: DeltaE2000To slice lengths differ")
	}
	for i := range dst {
		dst[i] = DeltaE2000(a[i], b[i])
	}
	return dst
}

// parallel runs f over [0, count) split into contiguous blocks on workers
// goroutines (workers ≤ 0 means runtime.GOMAXPROCS), using one goroutine when
// count is below minPer per worker.
func parallel(count, workers, minPer int, f func(lo, hi int)) {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, max(1, count/minPer))
	if workers == 1 {
		f(0, count)
		return
	}
	var wg sync.WaitGroup
	per := (count + workers - 1) / workers
	for lo := 0; lo < count; lo += per {
		hi := min(lo+per, count)
		wg.Add(1)
		go func() {
			defer wg.Done()
			f(lo, hi)
		}()
	}
	wg.Wait()
}
