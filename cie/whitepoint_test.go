package cie

import (
	"math"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/antipode-color/antipode/colorimetry"
)

// white returns the perfect-diffuser tristimulus values and chromaticity
// of the illuminant name for observer deg (2 or 10) on grid g.
func white(t *testing.T, name string, deg int, g colorimetry.Grid) (colorimetry.XYZ, colorimetry.XY) {
	t.Helper()
	ill, err := Illuminant(name)
	if err != nil {
		t.Fatal(err)
	}
	obs := CIE1931()
	if deg == 10 {
		obs = CIE1964()
	}
	w, err := colorimetry.NewObjectWeights(obs, ill, g)
	if err != nil {
		t.Fatal(err)
	}
	xy, err := w.White().XY()
	if err != nil {
		t.Fatal(err)
	}
	return w.White(), xy
}

// whiteRow is one expected white point. Fields that a source does not
// give are NaN.
type whiteRow struct {
	ill    string
	deg    int
	source string // the `source` column of shared/reference/white_points.csv
	X, Z   float64
	x, y   float64
}

var nan = math.NaN()

// computedWhites are the computed_* rows of shared/reference/white_points.csv,
// sums of the byte-verified CIE tables (PROVENANCE.md Checks 3 and 4), the
// primary oracle. Variant computed_1nm_360-830 is summed on
// colorimetry.Grid1nm; computed_5nm_380-780 and
// computed_5nm_380-780_from_S0S1S2 on colorimetry.Grid5nm with the 5 nm
// rows of the observer. D50, D55 and D75 exist only as 5 nm rows.
var computedWhites = []whiteRow{
	{"A", 2, "computed_1nm_360-830", 109.8503, 35.5849, 0.44757, 0.40744},
	{"A", 10, "computed_1nm_360-830", 111.1439, 35.1999, 0.45117, 0.40594},
	{"D65", 2, "computed_1nm_360-830", 95.0471, 108.8829, 0.31273, 0.32902},
	{"D65", 10, "computed_1nm_360-830", 94.8111, 107.3047, 0.31382, 0.33100},
	{"E", 2, "computed_1nm_360-830", 100.0080, 100.0331, 0.33331, 0.33329},
	{"E", 10, "computed_1nm_360-830", 99.9886, 100.0104, 0.33330, 0.33333},
	{"A", 2, "computed_5nm_380-780", 109.8490, 35.5825, 0.44758, 0.40745},
	{"A", 10, "computed_5nm_380-780", 111.1439, 35.1995, 0.45117, 0.40594},
	{"D65", 2, "computed_5nm_380-780", 95.0430, 108.8801, 0.31272, 0.32903},
	{"D65", 10, "computed_5nm_380-780", 94.8118, 107.3241, 0.31381, 0.33098},
	{"D50", 2, "computed_5nm_380-780_from_S0S1S2", 96.4197, 82.5123, 0.34567, 0.35851},
	{"D50", 10, "computed_5nm_380-780_from_S0S1S2", 96.7198, 81.4267, 0.34773, 0.35952},
	{"D55", 2, "computed_5nm_380-780_from_S0S1S2", 95.6791, 92.1368, 0.33243, 0.34744},
	{"D55", 10, "computed_5nm_380-780_from_S0S1S2", 95.7995, 90.9254, 0.33412, 0.34877},
	{"D75", 2, "computed_5nm_380-780_from_S0S1S2", 94.9673, 122.6140, 0.29903, 0.31488},
	{"D75", 10, "computed_5nm_380-780_from_S0S1S2", 94.4160, 120.6399, 0.29968, 0.31740},
	{"F2", 2, "computed_5nm_380-780", 99.1858, 67.3938, 0.37207, 0.37512},
	{"F2", 10, "computed_5nm_380-780", 103.2805, 69.0299, 0.37927, 0.36723},
	{"F7", 2, "computed_5nm_380-780", 95.0416, 108.7489, 0.31285, 0.32917},
	{"F7", 10, "computed_5nm_380-780", 95.7930, 107.6897, 0.31565, 0.32951},
	{"F11", 2, "computed_5nm_380-780", 100.9610, 64.3506, 0.38054, 0.37692},
	{"F11", 10, "computed_5nm_380-780", 103.8644, 65.6085, 0.38544, 0.37109},
}

// gridOf returns the computation grid a white_points.csv source names.
func gridOf(source string) colorimetry.Grid {
	if source == "computed_1nm_360-830" {
		return colorimetry.Grid1nm
	}
	return colorimetry.Grid5nm
}

// TestWhitePointsComputed checks the white points against the computed_*
// rows of shared/reference/white_points.csv to 1e-4 in X, Z (the printed 4
// decimals: half a unit is 5e-5, and we allow one unit) and half a unit
// of the 5th decimal in x, y.
func TestWhitePointsComputed(t *testing.T) {
	t.Parallel()
	for _, c := range computedWhites {
		g := gridOf(c.source)
		got, xy := white(t, c.ill, c.deg, g)
		if !scalar.EqualWithinAbs(got.X, c.X, 1e-4) || !scalar.EqualWithinAbs(got.Z, c.Z, 1e-4) || got.Y != 100 {
			t.Errorf("%s %d° on %v: X, Y, Z = %.4f, %.4f, %.4f, want %.4f, 100, %.4f (white_points.csv %s)", c.ill, c.deg, g, got.X, got.Y, got.Z, c.X, c.Z, c.source)
		}
		if !scalar.EqualWithinAbs(xy.X, c.x, 5e-6+1e-12) || !scalar.EqualWithinAbs(xy.Y, c.y, 5e-6+1e-12) {
			t.Errorf("%s %d° on %v: x, y = %.5f, %.5f, want %.5f, %.5f (white_points.csv %s)", c.ill, c.deg, g, xy.X, xy.Y, c.x, c.y, c.source)
		}
	}
}

// TestWhitePointsFile cross-checks computedWhites against
// shared/reference/white_points.csv when it is present, so the copy in this
// file cannot drift from the reference.
func TestWhitePointsFile(t *testing.T) {
	t.Parallel()
	rows := readRef(t, "white_points.csv")
	want := map[[3]string][4]float64{}
	for _, r := range rows[1:] {
		var v [4]float64
		for k, f := range []string{r[3], r[5], r[6], r[7]} {
			v[k] = nan
			if f != "" {
				v[k], _ = strconv.ParseFloat(f, 64)
			}
		}
		want[[3]string{r[0], r[1], r[2]}] = v
	}
	n := 0
	for key, v := range want {
		if len(key[2]) < 9 || key[2][:9] != "computed_" {
			continue
		}
		n++
		found := false
		for _, c := range computedWhites {
			if c.ill == key[0] && strconv.Itoa(c.deg) == key[1] && c.source == key[2] {
				found = true
				if c.X != v[0] || c.Z != v[1] || c.x != v[2] || c.y != v[3] {
					t.Errorf("%v: test copy %v, %v, %v, %v; file %v", key, c.X, c.Z, c.x, c.y, v)
				}
			}
		}
		// The 1 nm 380–780 variant is not used: this library sums on
		// 360–830 nm at 1 nm or 380–780 nm at 5 nm.
		if !found && key[2] != "computed_1nm_380-780" {
			t.Errorf("white_points.csv row %v has no copy in computedWhites", key)
		}
	}
	if n == 0 {
		t.Error("no computed_* rows found in white_points.csv")
	}
}

// TestWhitePointsPublished checks the white points against the published
// values that shared/reference/white_points.csv records from memory (CIE
// 15:2004 Table T.3; ASTM E308), to half a unit of their printed precision.
// CIE 15:2004 computed T.3 at 5 nm, 380–780 nm: compared on Grid5nm. The
// ASTM E308 values for A and D65 are 1 nm sums over 360–830 nm: compared
// on Grid1nm.
func TestWhitePointsPublished(t *testing.T) {
	t.Parallel()
	cases := []struct {
		whiteRow
		g       colorimetry.Grid
		tolXZ   float64 // half a unit of the printed X, Z
		tolXY   float64 // half a unit of the printed x, y
		comment string
	}{
		// CIE 15:2004 Table T.3 (from memory, PROVENANCE.md Checks 4).
		{whiteRow{"A", 2, "CIE015-2004_T3_from_memory", 109.85, 35.58, 0.44758, 0.40745}, colorimetry.Grid5nm, 0.005, 5e-6, ""},
		{whiteRow{"A", 10, "CIE015-2004_T3_from_memory", 111.14, 35.20, 0.45117, 0.40594}, colorimetry.Grid5nm, 0.005, 5e-6, ""},
		{whiteRow{"D50", 2, "CIE015-2004_T3_from_memory", 96.42, 82.51, 0.34567, 0.35851}, colorimetry.Grid5nm, 0.005, 5e-6, ""},
		{whiteRow{"D50", 10, "CIE015-2004_T3_from_memory", 96.72, 81.43, 0.34773, 0.35952}, colorimetry.Grid5nm, 0.005, 5e-6, ""},
		{whiteRow{"D55", 2, "CIE015-2004_T3_from_memory", 95.68, 92.14, 0.33243, 0.34744}, colorimetry.Grid5nm, 0.005, 5e-6, ""},
		{whiteRow{"D55", 10, "CIE015-2004_T3_from_memory", 95.80, 90.93, 0.33412, 0.34877}, colorimetry.Grid5nm, 0.005, 5e-6, ""},
		{whiteRow{"D65", 2, "CIE015-2004_T3_from_memory", 95.04, 108.88, 0.31272, 0.32903}, colorimetry.Grid5nm, 0.005, 5e-6, ""},
		// D65/10°: the recalled x, y (0.31382, 0.33100) do not follow from
		// the recalled X, Z (which give 0.31381, 0.33098, as our 5 nm sum
		// does); they equal the 1 nm sum instead. PROVENANCE.md marks them
		// doubtful, so x, y are checked only to 3e-5, the size of that
		// inconsistency, while X, Z keep the printed precision.
		{whiteRow{"D65", 10, "CIE015-2004_T3_from_memory", 94.81, 107.32, 0.31382, 0.33100}, colorimetry.Grid5nm, 0.005, 3e-5, "doubtful x, y"},
		{whiteRow{"D75", 2, "CIE015-2004_T3_from_memory", 94.97, 122.61, 0.29903, 0.31488}, colorimetry.Grid5nm, 0.005, 5e-6, ""},
		{whiteRow{"D75", 10, "CIE015-2004_T3_from_memory", 94.42, 120.64, 0.29968, 0.31740}, colorimetry.Grid5nm, 0.005, 5e-6, ""},
		// CIE 15:2004 fluorescent-lamp table, 2° x, y (from memory).
		{whiteRow{"F2", 2, "CIE015-2004_FLtable_from_memory", nan, nan, 0.3721, 0.3751}, colorimetry.Grid5nm, 0, 5e-5, ""},
		{whiteRow{"F7", 2, "CIE015-2004_FLtable_from_memory", nan, nan, 0.3129, 0.3292}, colorimetry.Grid5nm, 0, 5e-5, ""},
		{whiteRow{"F11", 2, "CIE015-2004_FLtable_from_memory", nan, nan, 0.3805, 0.3769}, colorimetry.Grid5nm, 0, 5e-5, ""},
		// ASTM E308 (from memory), 3 decimals.
		{whiteRow{"A", 2, "ASTM_E308_from_memory", 109.850, 35.585, nan, nan}, colorimetry.Grid1nm, 0.0005, 0, ""},
		{whiteRow{"A", 10, "ASTM_E308_from_memory", 111.144, 35.200, nan, nan}, colorimetry.Grid1nm, 0.0005, 0, ""},
		{whiteRow{"D65", 2, "ASTM_E308_from_memory", 95.047, 108.883, nan, nan}, colorimetry.Grid1nm, 0.0005, 0, ""},
		// D65/10°: the 1 nm 360–830 sum gives Z = 107.30467, which rounds to
		// 107.305, not the recalled 107.304 (a 380–780 nm sum gives
		// 107.3040 but then X = 94.8107 and 2° Z fails). Checked to one
		// unit (1e-3) until someone reads the ASTM table itself.
		{whiteRow{"D65", 10, "ASTM_E308_from_memory", 94.811, 107.304, nan, nan}, colorimetry.Grid1nm, 0.001, 0, "Z off by 0.7 units (recalled value)"},
	}
	for _, c := range cases {
		got, xy := white(t, c.ill, c.deg, c.g)
		if c.comment != "" {
			t.Logf("%s %d° %s: %s; got X, Z = %.5f, %.5f, x, y = %.6f, %.6f", c.ill, c.deg, c.source, c.comment, got.X, got.Z, xy.X, xy.Y)
		}
		if !math.IsNaN(c.X) && (!scalar.EqualWithinAbs(got.X, c.X, c.tolXZ+1e-12) || !scalar.EqualWithinAbs(got.Z, c.Z, c.tolXZ+1e-12)) {
			t.Errorf("%s %d° on %v: X, Z = %.5f, %.5f, want %v, %v ± %g (%s)", c.ill, c.deg, c.g, got.X, got.Z, c.X, c.Z, c.tolXZ, c.source)
		}
		if !math.IsNaN(c.x) && (!scalar.EqualWithinAbs(xy.X, c.x, c.tolXY+1e-12) || !scalar.EqualWithinAbs(xy.Y, c.y, c.tolXY+1e-12)) {
			t.Errorf("%s %d° on %v: x, y = %.6f, %.6f, want %v, %v ± %g (%s)", c.ill, c.deg, c.g, xy.X, xy.Y, c.x, c.y, c.tolXY, c.source)
		}
	}
}

// TestNamedDaylightOn1nm computes D50, D55 and D75 on the 1 nm grid
// 360–830 nm, linearly interpolated from their 5 nm tables. The only
// published-style value at 1 nm is D50/2°, 96.424 / 82.513, computed in
// PROVENANCE.md (Doubts: "a 1 nm linear interpolation of the CIE D50"), to
// 3 decimals. For the others, the 1 nm sums differ from the 5 nm rows of
// white_points.csv only by the grid: measured up to 0.0235 (D75 10° Z),
// checked to 0.03. (CIE 15:2004 T.3 was computed at 5 nm: D75/2° Z on 1 nm
// is 122.6193, which would not round to T.3's 122.61.)
func TestNamedDaylightOn1nm(t *testing.T) {
	t.Parallel()
	got, _ := white(t, "D50", 2, colorimetry.Grid1nm)
	if math.Abs(got.X-96.424) > 5e-4 || math.Abs(got.Z-82.513) > 5e-4 {
		t.Errorf("D50 2° on 1 nm: X, Z = %.4f, %.4f, want 96.424, 82.513 (PROVENANCE.md)", got.X, got.Z)
	}
	for _, c := range computedWhites {
		if c.source != "computed_5nm_380-780_from_S0S1S2" {
			continue
		}
		got, _ := white(t, c.ill, c.deg, colorimetry.Grid1nm)
		t.Logf("%s %d° on 1 nm 360–830: X, Z = %.4f, %.4f (5 nm: %.4f, %.4f)", c.ill, c.deg, got.X, got.Z, c.X, c.Z)
		if math.Abs(got.X-c.X) > 0.03 || math.Abs(got.Z-c.Z) > 0.03 {
			t.Errorf("%s %d° on 1 nm: X, Z = %.4f, %.4f, far from the 5 nm %.4f, %.4f", c.ill, c.deg, got.X, got.Z, c.X, c.Z)
		}
	}
}
