package colorimetry

import "fmt"

// Observer is a set of colour-matching functions x̄, ȳ, z̄ on one grid,
// such as the CIE 1931 2° or CIE 1964 10° standard observer (package cie
// provides both). It is immutable.
type Observer struct {
	name    string
	x, y, z Spectrum
}

// NewObserver returns the observer with the colour-matching functions x, y,
// z sampled at the wavelengths nm (uniform spacing required).
func NewObserver(name string, nm, x, y, z []float64) (*Observer, error) {
	var s [3]Spectrum
	for i, v := range [3][]float64{x, y, z} {
		var err error
		s[i], err = NewSpectrum(nm, v)
		if err != nil {
			return nil, fmt.Errorf("observer %s, function %c̄: %w", name, "xyz"[i], err)
		}
	}
	if !s[0].grid.Equal(s[1].grid) || !s[0].grid.Equal(s[2].grid) || s[0].Len() != len(nm) {
		return nil, fmt.Errorf("observer %s: colour-matching functions must be uniformly spaced", name)
	}
	return &Observer{name: name, x: s[0], y: s[1], z: s[2]}, nil
}

// Name returns the observer's name, such as "CIE 1931 2°".
func (o *Observer) Name() string { return o.name }

// Grid returns the grid on which the functions are tabulated.
func (o *Observer) Grid() Grid { return o.x.grid }

// CMF returns the colour-matching functions x̄, ȳ, z̄.
func (o *Observer) CMF() (x, y, z Spectrum) { return o.x, o.y, o.z }

// At returns x̄, ȳ, z̄ at nm, interpolated between table rows; outside the
// table they are zero.
func (o *Observer) At(nm float64) (x, y, z float64) {
	if !o.x.grid.Contains(nm) {
		return 0, 0, 0
	}
	return o.x.At(nm), o.y.At(nm), o.z.At(nm)
}

// onGrid returns the functions evaluated on g: the table's own rows where
// g's wavelengths fall on them, interpolated between rows otherwise, and
// zero outside the table.
func (o *Observer) onGrid(g Grid) (x, y, z []float64) {
	x, y, z = make([]float64, g.N), make([]float64, g.N), make([]float64, g.N)
	for i, s := range [3]Spectrum{o.x, o.y, o.z} {
		dst := [3][]float64{x, y, z}[i]
		// ExtrapZero never fails, so the error is always nil.
		_ = resample(dst, s.grid, s.values, s.interp, ExtrapZero, g)
	}
	return x, y, z
}
