package mixing

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/antipode-color/antipode/colorimetry"
)

// benchDir is the shared benchmark data (shared/bench/data, beside the
// repository), read when present.
var benchDir = filepath.Join("..", "..", "shared", "bench", "data")

// benchData is the shared Kubelka–Munk benchmark: the invented colorant
// set, the 200 targets mixed with the model and their true recipes
// (shared/bench/README.md, km_recipe.py).
type benchData struct {
	model   *Pigments
	targets []colorimetry.Spectrum
	truth   [][]float64
}

// loadBench reads the shared benchmark data, or skips the test.
func loadBench(tb testing.TB) *benchData {
	tb.Helper()
	d, err := readBench()
	if err != nil {
		tb.Skipf("shared benchmark data absent or unreadable: %v", err)
	}
	return d
}

// loadBenchQuiet returns the shared benchmark data, or nil.
func loadBenchQuiet() *benchData {
	d, err := readBench()
	if err != nil {
		return nil
	}
	return d
}

// readBench reads the shared benchmark data.
func readBench() (*benchData, error) {
	var col struct {
		Start, Step float64
		Bands       int
		K1, K2      float64
		Colorants   []struct {
			Name string
			K, S []float64
		}
	}
	var tg struct {
		Reflectance [][]float64
	}
	var tr struct {
		Targets []struct{ Concentrations []float64 }
	}
	for _, f := range []struct {
		name string
		v    any
	}{{"km_colorants.json", &col}, {"km_targets.json", &tg}, {"km_truth.json", &tr}} {
		b, err := os.ReadFile(filepath.Join(benchDir, f.name))
		if err != nil {
			return nil, err
		}
		if err := json.Unmarshal(b, f.v); err != nil {
			return nil, fmt.Errorf("%s: %w", f.name, err)
		}
	}
	p := &Pigments{
		Grid:    colorimetry.Grid{Start: col.Start, Step: col.Step, N: col.Bands},
		White:   col.Colorants[0].Name,
		Surface: Saunderson{K1: col.K1, K2: col.K2},
	}
	for _, c := range col.Colorants {
		p.Colorants = append(p.Colorants, Colorant{Name: c.Name, K: c.K, S: c.S})
	}
	if err := p.Validate(); err != nil {
		return nil, err
	}
	d := &benchData{model: p}
	for _, r := range tg.Reflectance {
		s, err := colorimetry.NewSpectrumOnGrid(p.Grid, r, colorimetry.Options{})
		if err != nil {
			return nil, err
		}
		d.targets = append(d.targets, s)
	}
	for _, t := range tr.Targets {
		d.truth = append(d.truth, t.Concentrations)
	}
	return d, nil
}
