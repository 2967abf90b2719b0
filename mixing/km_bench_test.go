package mixing

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/antipode-color/antipode/colorimetry"
)

// benchDir is the shared benchmark data: $ANTIPODE_BENCH_DIR/data (where
// .ci/bench regenerates it) or shared/bench/data beside the repository,
// read when present.
var benchDir = func() string {
	if d := os.Getenv("ANTIPODE_BENCH_DIR"); d != "" {
		return filepath.Join(d, "data")
	}
	return filepath.Join("..", "..", "shared", "bench", "data")
}()

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

// BenchmarkRecipeShared is the numpy/scipy anchor's own job
// (../shared/bench/km_recipe.py): for each of the 200 targets, the white plus
// every 3 of the 6 chromatic colorants (20 combinations). It reports
// ms/target; .ci/bench puts it beside the anchor's median.
func BenchmarkRecipeShared(b *testing.B) {
	d := loadBench(b)
	opt := RecipeOptions{Colorants: 3}
	b.ReportAllocs()
	b.ResetTimer()
	n := 0
	for range b.N {
		sol, err := d.model.Recipe(d.targets[n%len(d.targets)], opt)
		if err != nil {
			b.Fatal(err)
		}
		sinkDE = sol.Recipes[0].DE00
		n++
	}
	b.ReportMetric(float64(b.Elapsed().Microseconds())/1e3/float64(b.N), "ms/target")
}
