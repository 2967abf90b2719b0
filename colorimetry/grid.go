package colorimetry

import (
	"fmt"
	"math"
)

// Grid is a regular wavelength sampling: N samples from Start in steps of
// Step, all in nm. The zero Grid is empty and invalid.
type Grid struct {
	Start float64 // first wavelength, nm
	Step  float64 // spacing, nm (> 0)
	N     int     // number of samples (≥ 3 for a spectrum)
}

// Standard computation grids, after CIE 015:2018 §7: the full 1 nm range of
// the CIE observer tables, and the abridged 5 nm range used where the data
// are at 5 nm.
var (
	Grid1nm = Grid{Start: 360, Step: 1, N: 471} // 360–830 nm at 1 nm
	Grid5nm = Grid{Start: 380, Step: 5, N: 81}  // 380–780 nm at 5 nm
)

// NewGrid returns the grid from start to end (inclusive, nm) at step nm.
// End is rounded to the nearest whole number of steps.
func NewGrid(start, end, step float64) (Grid, error) {
	if !(step > 0) || math.IsInf(step, 0) || !isFinite(start) || !isFinite(end) || end <= start {
		return Grid{}, fmt.Errorf("%w: %g–%g nm at %g nm", ErrBadGrid, start, end, step)
	}
	span := math.Round((end - start) / step)
	if span > math.MaxInt32 {
		return Grid{}, fmt.Errorf("%w: %g–%g nm at %g nm has too many points", ErrBadGrid, start, end, step)
	}
	n := int(span) + 1
	if n < 3 {
		return Grid{}, fmt.Errorf("%w: %g–%g nm at %g nm has fewer than 3 points", ErrBadGrid, start, end, step)
	}
	return Grid{Start: start, Step: step, N: n}, nil
}

// Wavelength returns the i-th wavelength of g, nm.
func (g Grid) Wavelength(i int) float64 { return g.Start + float64(i)*g.Step }

// End returns the last wavelength of g, nm.
func (g Grid) End() float64 { return g.Wavelength(g.N - 1) }

// Wavelengths returns the wavelengths of g in dst, allocating when dst is
// nil; it panics if dst is non-nil with a length other than g.N.
func (g Grid) Wavelengths(dst []float64) []float64 {
	if dst == nil {
		dst = make([]float64, g.N)
	}
	if len(dst) != g.N {
		panic("colorimetry: dst length differs from grid size")
	}
	for i := range dst {
		dst[i] = g.Wavelength(i)
	}
	return dst
}

// Equal reports whether g and h sample the same wavelengths, to 1e-9 nm.
func (g Grid) Equal(h Grid) bool {
	return g.N == h.N && math.Abs(g.Start-h.Start) < 1e-9 && math.Abs(g.Step-h.Step) < 1e-9
}

// Valid reports whether g has a positive finite step, at least 3 points,
// a positive start (wavelengths are positive) and a finite end, with its
// last two wavelengths distinct in float64 (a step not lost to rounding
// against the start).
func (g Grid) Valid() bool {
	return g.Step > 0 && isFinite(g.Step) && g.Start > 0 && isFinite(g.Start) && g.N >= 3 &&
		isFinite(g.End()) && g.End() > g.Wavelength(g.N-2)
}

// Contains reports whether nm lies within g's range (1e-9 nm slack).
func (g Grid) Contains(nm float64) bool {
	return nm >= g.Start-1e-9 && nm <= g.End()+1e-9
}

// String formats g as "380–780 nm at 5 nm".
func (g Grid) String() string {
	return fmt.Sprintf("%g–%g nm at %g nm", g.Start, g.End(), g.Step)
}

// ComputationGrid returns the grid on which data sampled on g are best
// integrated, after CIE 015:2018 §7 and this project's conventions: data at
// 5 nm whose wavelengths fall on multiples of 5 nm are integrated on
// Grid5nm (380–780 nm at 5 nm) with the 5 nm rows of the observer; all
// other data are interpolated to Grid1nm (360–830 nm at 1 nm).
func ComputationGrid(g Grid) Grid {
	if math.Abs(g.Step-5) < 1e-9 && math.Abs(g.Start/5-math.Round(g.Start/5)) < 1e-9 {
		return Grid5nm
	}
	return Grid1nm
}

func isFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
