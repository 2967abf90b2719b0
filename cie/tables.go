package cie

//go:generate go run ./internal/gentables -ref ../../shared/reference -out tables_gen.go

import "github.com/antipode-color/antipode/colorimetry"

// table is one generated CIE dataset: columns of values on a uniform
// wavelength grid from start in steps of step (nm).
type table struct {
	start, step float64
	cols        []string    // column names as in the reference CSV header
	data        [][]float64 // data[j] is column cols[j]
}

// grid returns the table's wavelength grid.
func (t *table) grid() colorimetry.Grid {
	return colorimetry.Grid{Start: t.start, Step: t.step, N: len(t.data[0])}
}

// wavelengths returns the table's wavelengths, nm.
func (t *table) wavelengths() []float64 { return t.grid().Wavelengths(nil) }

// col returns the index of the column named name, or −1.
func (t *table) col(name string) int {
	for j, c := range t.cols {
		if c == name {
			return j
		}
	}
	return -1
}

// spectrum returns column j as a Spectrum with the given options. The
// generated tables are valid by construction, so an error here is a bug.
func (t *table) spectrum(j int, opt colorimetry.Options) colorimetry.Spectrum {
	s, err := colorimetry.NewSpectrumOnGrid(t.grid(), t.data[j], opt)
	if err != nil {
		panic("cie: generated table " + t.cols[j] + ": " + err.Error())
	}
	return s
}
