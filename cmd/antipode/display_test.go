package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

func displayJSON(t *testing.T, args ...string) displayOut {
	t.Helper()
	code, out, errs := runCLI(t, "", append(append([]string{"display"}, args...), "--json")...)
	if code != 0 {
		t.Fatalf("%v: exit %d: %s", args, code, errs)
	}
	var d displayOut
	if err := json.Unmarshal([]byte(out), &d); err != nil {
		t.Fatalf("%v: %v\n%s", args, err, out)
	}
	return d
}

// TestDisplaySRGB checks the matrices of the sRGB primaries and white
// against IEC 61966-2-1:1999 as printed (4 decimals, from memory): the
// RGB→XYZ matrix to half a unit of the 4th decimal; the printed XYZ→RGB
// matrix was inverted from the rounded forward one, so it differs from the
// exact inverse by up to 4e-4 (its −0.9689 against −0.96924): tolerance
// 5e-4. Both on the scale white Y = 1.
func TestDisplaySRGB(t *testing.T) {
	t.Parallel()
	d := displayJSON(t, "--primaries", "0.64,0.33,0.30,0.60,0.15,0.06", "--white", "0.3127,0.3290", "--white-y", "1")
	fwd := [3][3]float64{{0.4124, 0.3576, 0.1805}, {0.2126, 0.7152, 0.0722}, {0.0193, 0.1192, 0.9505}}
	inv := [3][3]float64{{3.2406, -1.5372, -0.4986}, {-0.9689, 1.8758, 0.0415}, {0.0557, -0.2040, 1.0570}}
	for i := range 3 {
		for j := range 3 {
			if math.Abs(d.RGBToXYZ[i][j]-fwd[i][j]) > 5e-5 {
				t.Errorf("RGB→XYZ [%d][%d] = %.6f, IEC 61966-2-1 %.4f", i, j, d.RGBToXYZ[i][j], fwd[i][j])
			}
			if math.Abs(d.XYZToRGB[i][j]-inv[i][j]) > 5e-4 {
				t.Errorf("XYZ→RGB [%d][%d] = %.6f, IEC 61966-2-1 %.4f", i, j, d.XYZToRGB[i][j], inv[i][j])
			}
		}
	}
	if d.Balance != nil {
		t.Errorf("balance without --balance: %+v", d.Balance)
	}
}

// TestDisplayChannels checks the matrix from measured channel spectra (the
// demo rig's red, green and blue washes) against the definitions: each
// column has the chromaticity describe gives that channel, full drive sums
// to the white at Y = 100, the inverse undoes the matrix, and balancing to
// D65 (inside the triangle) reaches it with the largest gain 1. Tolerances
// are round-off.
func TestDisplayChannels(t *testing.T) {
	t.Parallel()
	d := displayJSON(t, "demo/lamps.csv", "--channels", "wash-red,wash-green,wash-blue", "--balance", "D65")
	for j, name := range []string{"wash-red", "wash-green", "wash-blue"} {
		code, out, errs := runCLI(t, "", "describe", "demo/lamps.csv", "--column", name, "--as", "light", "--json")
		if code != 0 {
			t.Fatalf("describe %s: %s", name, errs)
		}
		var rows []struct {
			X float64 `json:"x"`
			Y float64 `json:"y"`
		}
		if err := json.Unmarshal([]byte(out), &rows); err != nil || len(rows) != 1 {
			t.Fatalf("describe %s: %v %s", name, err, out)
		}
		col := [3]float64{d.RGBToXYZ[0][j], d.RGBToXYZ[1][j], d.RGBToXYZ[2][j]}
		sum := col[0] + col[1] + col[2]
		p := d.Primaries[j]
		if p.Name != name || math.Abs(p.X-rows[0].X) > 1e-12 || math.Abs(p.Y-rows[0].Y) > 1e-12 ||
			math.Abs(col[0]/sum-p.X) > 1e-12 || math.Abs(col[1]/sum-p.Y) > 1e-12 {
			t.Errorf("%s: column %v, primary %+v, describe x, y %+v", name, col, p, rows[0])
		}
	}
	if y := d.RGBToXYZ[1][0] + d.RGBToXYZ[1][1] + d.RGBToXYZ[1][2]; math.Abs(y-100) > 1e-9 {
		t.Errorf("full drive Y = %g, want 100", y)
	}
	for i := range 3 {
		for j := range 3 {
			var p float64
			for k := range 3 {
				p += d.XYZToRGB[i][k] * d.RGBToXYZ[k][j]
			}
			if want := map[bool]float64{true: 1, false: 0}[i == j]; math.Abs(p-want) > 1e-12 {
				t.Errorf("inverse × matrix [%d][%d] = %g", i, j, p)
			}
		}
	}
	b := d.Balance
	if b == nil || !b.Reachable || b.DeltaUVPrime > 1e-9 || math.Max(b.Gains[0], math.Max(b.Gains[1], b.Gains[2])) != 1 {
		t.Errorf("balance to D65: %+v", b)
	}
}

func TestDisplayErrors(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"display"}, "name a FILE"},
		{[]string{"display", "--primaries", "0.64,0.33,0.30,0.60,0.15"}, "want six numbers"},
		{[]string{"display", "--primaries", "0.64,0.33,0.30,0.60,0.15,0.9"}, "the blue primary"},
		{[]string{"display", "--primaries", "0.2,0.2,0.3,0.3,0.4,0.4"}, "collinear"},
		{[]string{"display", "demo/lamps.csv"}, "holds 8 spectra"},
		{[]string{"display", "demo/lamps.csv", "--channels", "wash-red,wash-green"}, "want three names"},
		{[]string{"display", "demo/lamps.csv", "--channels", "wash-red,wash-green,wash-blue", "--white", "D65"}, "--white applies to --primaries"},
		{[]string{"display", "demo/lamps.csv", "--primaries", "0.64,0.33,0.30,0.60,0.15,0.06"}, "not both"},
		{[]string{"display", "--primaries", "0.64,0.33,0.30,0.60,0.15,0.06", "--balance", "nope"}, "--balance nope"},
		{[]string{"display", "--primaries", "0.64,0.33,0.30,0.60,0.15,0.06", "--white-y", "-1"}, "--white-y"},
	} {
		code, out, errs := runCLI(t, "", tc.args...)
		if code != 2 || out != "" || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: exit %d, stdout %q, stderr %q (want %q)", tc.args, code, out, errs, tc.want)
		}
	}
}

// TestDisplayWideGamut checks primaries on the spectrum locus (x + y = 1):
// the ITU-R BT.2020 primaries and D65 white give the RGB→XYZ matrix
// published with them (from memory, 4 decimals: 0.6370 0.1446 0.1689 /
// 0.2627 0.6780 0.0593 / 0.0000 0.0281 1.0610); tolerance 1e-4, the
// rounding of the published figures plus a unit. Channels in the wrong
// order give a warning, and a white outside the triangle an error that
// says so (not "collinear").
func TestDisplayWideGamut(t *testing.T) {
	t.Parallel()
	d := displayJSON(t, "--primaries", "0.708,0.292,0.170,0.797,0.131,0.046", "--white", "0.3127,0.3290", "--white-y", "1")
	want := [3][3]float64{{0.6370, 0.1446, 0.1689}, {0.2627, 0.6780, 0.0593}, {0.0000, 0.0281, 1.0610}}
	for i := range 3 {
		for j := range 3 {
			if math.Abs(d.RGBToXYZ[i][j]-want[i][j]) > 1e-4 {
				t.Errorf("BT.2020 RGB→XYZ [%d][%d] = %.6f, published %.4f", i, j, d.RGBToXYZ[i][j], want[i][j])
			}
		}
	}
	if len(d.Warnings) != 0 {
		t.Errorf("BT.2020: warnings %v", d.Warnings)
	}
	swapped := displayJSON(t, "demo/lamps.csv", "--channels", "wash-red,wash-blue,wash-green")
	if len(swapped.Warnings) != 1 || !strings.Contains(swapped.Warnings[0], "not in that order") {
		t.Errorf("swapped channels: warnings %v", swapped.Warnings)
	}
	code, _, errs := runCLI(t, "", "display", "--primaries", "0.64,0.33,0.30,0.60,0.15,0.06", "--white", "0.7,0.25")
	if code != 1 && code != 2 || !strings.Contains(errs, "outside the primaries' triangle") || strings.Contains(errs, "collinear") {
		t.Errorf("white outside: exit %d, %s", code, errs)
	}
}
