package main

import (
	"flag"
	"fmt"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/mat"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

func init() {
	register(&command{
		name:    "display",
		summary: "a display's RGB→XYZ matrix and white-balance gains from its primaries",
		usage:   "display (FILE [--channels R,G,B] | --primaries xr,yr,xg,yg,xb,yb [--white D65|x,y]) [--white-y 100] [--balance NAME|x,y] [--observer 1931|1964] [--json]",
		about: `Computes the 3×3 matrix that takes a display's or an RGB light's linear drive
(R, G, B each 0–1, full drive 1) to CIE XYZ, and its inverse, by the method of
SMPTE RP 177: the primaries' chromaticities and the white's fix the matrix.

From measured spectra (FILE: the spectral power of each channel at full drive,
relative or absolute; --channels names the red, green and blue spectra, in
that order, when the file holds more than three) the white is what the
display shows at R = G = B = 1: the sum of the three. From chromaticities
(--primaries) the white is --white, a CIE illuminant NAME or x,y (default
D65). --white-y sets the white's luminance Y (100: relative; or the measured
cd/m²).

--balance NAME|x,y adds the drive gains that make the display show that white
as bright as it can (the largest gain 1), the luminance that leaves, and
whether the white lies inside the primaries' triangle at all.`,
		example: `  $ antipode display --primaries 0.64,0.33,0.30,0.60,0.15,0.06 --white D65
  $ antipode display cmd/antipode/demo/lamps.csv --channels wash-red,wash-green,wash-blue --balance D65`,
		run: runDisplay,
	})
}

// displayOut is the JSON form of the display command's result.
type displayOut struct {
	Source    string          `json:"source"`
	Observer  string          `json:"observer"`
	Primaries []displayColour `json:"primaries"`
	White     displayColour   `json:"white"`
	RGBToXYZ  [3][3]float64   `json:"rgb_to_xyz"`
	XYZToRGB  [3][3]float64   `json:"xyz_to_rgb"`
	Balance   *displayBalance `json:"balance"`
	Warnings  []string        `json:"warnings"`
}

// displayColour is a named chromaticity (and, for the white, luminance).
type displayColour struct {
	Name string   `json:"name"`
	X    float64  `json:"x"`
	Y    float64  `json:"y"`
	Lum  *float64 `json:"Y,omitempty"`
}

// displayBalance is the white balance towards a target white.
type displayBalance struct {
	Target       displayColour `json:"target"`
	Gains        [3]float64    `json:"gains"`
	Lum          float64       `json:"Y"`
	Reachable    bool          `json:"reachable"`
	DeltaUVPrime float64       `json:"delta_uv_prime"`
}

func runDisplay(e *env, args []string) error {
	var channels, primaries, white, balance, observer string
	var whiteY float64
	var asJSON bool
	fs := flag.NewFlagSet("display", flag.ContinueOnError)
	fs.StringVar(&channels, "channels", "", "with FILE: the red, green and blue spectra, comma-separated `NAMES` in that order")
	fs.StringVar(&primaries, "primaries", "", "the primaries' chromaticities instead of a FILE: `xr,yr,xg,yg,xb,yb` (for the observer of --observer)")
	fs.StringVar(&white, "white", "", "with --primaries: the display white, a CIE illuminant `NAME` or x,y (default D65)")
	fs.Float64Var(&whiteY, "white-y", 100, "luminance `Y` of the white at full drive (100: relative; or cd/m²)")
	fs.StringVar(&balance, "balance", "", "also the gains that balance the display to this white: a CIE `NAME` or x,y")
	fs.StringVar(&observer, "observer", "1931", "standard observer of the chromaticities: `1931` (2°) or 1964 (10°)")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of tables")
	pos, err := parseFlags(commands["display"], fs, e, args)
	if err != nil {
		return err
	}
	if !(whiteY > 0) || whiteY > 1e12 {
		return usagef("--white-y %g: want a positive luminance", whiteY)
	}
	obs, err := observerFlag(observer)
	if err != nil {
		return err
	}
	out := displayOut{Observer: obs.Name()}
	var prim [3]colorimetry.XY
	var wxy colorimetry.XY
	switch {
	case primaries != "" && len(pos) > 0:
		return usagef("give a FILE of channel spectra or --primaries, not both")
	case primaries != "":
		if channels != "" {
			return usagef("--channels applies to a FILE of channel spectra")
		}
		if prim, err = parsePrimaries(primaries); err != nil {
			return err
		}
		if white == "" {
			white = "D65"
		}
		var name string
		if wxy, name, err = whiteArg(e, "--white", white, obs); err != nil {
			return err
		}
		out.Source = "chromaticities"
		out.White.Name = name
	case len(pos) == 1:
		if white != "" {
			return usagef("--white applies to --primaries: the white of measured channels is their sum at full drive")
		}
		var names [3]string
		if prim, wxy, names, err = displayChannels(e, pos[0], channels, obs); err != nil {
			return err
		}
		out.Source = fileOf(pos[0])
		out.White.Name = "R = G = B = 1"
		out.Primaries = []displayColour{{Name: names[0]}, {Name: names[1]}, {Name: names[2]}}
	case len(pos) > 1:
		return usagef("name one FILE of channel spectra (got %d arguments)", len(pos))
	default:
		return usagef("name a FILE of channel spectra or give --primaries: %s", commands["display"].usage)
	}
	if out.Primaries == nil {
		out.Primaries = []displayColour{{Name: "red"}, {Name: "green"}, {Name: "blue"}}
	}
	for i, p := range prim {
		out.Primaries[i].X, out.Primaries[i].Y = p.X, p.Y
	}
	out.White.X, out.White.Y, out.White.Lum = wxy.X, wxy.Y, &whiteY
	out.Warnings = append([]string{}, primariesOrder(prim)...)
	if out.RGBToXYZ, err = mixing.DisplayMatrix(prim[0], prim[1], prim[2], wxy, whiteY); err != nil {
		return err
	}
	m := mat.NewDense(3, 3, nil)
	for i := range 3 {
		for j := range 3 {
			m.Set(i, j, out.RGBToXYZ[i][j])
		}
	}
	var inv mat.Dense
	if err := inv.Inverse(m); err != nil {
		return fmt.Errorf("the primaries give a singular matrix: %v", err)
	}
	for i := range 3 {
		for j := range 3 {
			out.XYZToRGB[i][j] = inv.At(i, j)
		}
	}
	if balance != "" {
		txy, name, err := whiteArg(e, "--balance", balance, obs)
		if err != nil {
			return err
		}
		wb, err := mixing.WhiteBalanceGains(out.RGBToXYZ, txy)
		if err != nil {
			return fmt.Errorf("--balance %s: %v", balance, err)
		}
		out.Balance = &displayBalance{Target: displayColour{Name: name, X: txy.X, Y: txy.Y}, Gains: wb.Gains, Lum: wb.Y, Reachable: wb.Reachable, DeltaUVPrime: wb.DeltaUVPrime}
	}
	if asJSON {
		return writeJSON(e.stdout, out)
	}
	printDisplay(e, out)
	return nil
}

// printDisplay prints the display command's tables.
func printDisplay(e *env, out displayOut) {
	w := e.stdout
	if out.Source == "chromaticities" {
		fmt.Fprintf(w, "display from the primaries' chromaticities; white %s at x %.4f, y %.4f\n\n", out.White.Name, out.White.X, out.White.Y)
	} else {
		fmt.Fprintf(w, "display from the channel spectra in %s, %s observer; white: R = G = B = 1\n\n", out.Source, out.Observer)
	}
	t := &table{left: map[int]bool{0: true}}
	t.header("", "x", "y")
	for i, p := range out.Primaries {
		label := []string{"red", "green", "blue"}[i]
		if p.Name != label {
			label += " (" + p.Name + ")"
		}
		t.row(label, fmt.Sprintf("%.4f", p.X), fmt.Sprintf("%.4f", p.Y))
	}
	t.row("white", fmt.Sprintf("%.4f", out.White.X), fmt.Sprintf("%.4f", out.White.Y))
	if out.Source == "chromaticities" && out.White.Name != "chromaticity" {
		t.rows[len(t.rows)-1][0] = "white (" + out.White.Name + ")"
	}
	t.write(w)
	printMatrix := func(title string, m [3][3]float64, rows, cols [3]string) {
		fmt.Fprintf(w, "\n%s\n", title)
		t := &table{left: map[int]bool{0: true}}
		t.header("", cols[0], cols[1], cols[2])
		for i := range 3 {
			t.row(rows[i], fmt.Sprintf("%.6f", m[i][0]), fmt.Sprintf("%.6f", m[i][1]), fmt.Sprintf("%.6f", m[i][2]))
		}
		t.write(w)
	}
	printMatrix(fmt.Sprintf("RGB → XYZ (linear drive 0–1; the white at full drive has Y = %g)", *out.White.Lum), out.RGBToXYZ, [3]string{"X", "Y", "Z"}, [3]string{"R", "G", "B"})
	printMatrix("XYZ → RGB", out.XYZToRGB, [3]string{"R", "G", "B"}, [3]string{"X", "Y", "Z"})
	defer func() {
		if len(out.Warnings) > 0 {
			fmt.Fprintf(w, "\nwarnings:\n  %s\n", joinLines(out.Warnings))
		}
	}()
	if b := out.Balance; b != nil {
		fmt.Fprintf(w, "\nwhite balance to %s at x %.4f, y %.4f: gains R %.4f, G %.4f, B %.4f; Y %.4g", b.Target.Name, b.Target.X, b.Target.Y, b.Gains[0], b.Gains[1], b.Gains[2], b.Lum)
		if b.Reachable {
			fmt.Fprintln(w, "; reached")
		} else {
			fmt.Fprintf(w, "; outside the primaries' triangle: the nearest mix is Δu′v′ %.4f away\n", b.DeltaUVPrime)
		}
	}
}

// parsePrimaries reads --primaries: six numbers, the x, y of red, green and
// blue, each inside the CIE 1931 triangle.
func parsePrimaries(s string) ([3]colorimetry.XY, error) {
	var p [3]colorimetry.XY
	parts := strings.Split(s, ",")
	if len(parts) != 6 {
		return p, usagef("--primaries %s: want six numbers xr,yr,xg,yg,xb,yb", shown(s))
	}
	for i := range 3 {
		x, err1 := strconv.ParseFloat(strings.TrimSpace(parts[2*i]), 64)
		y, err2 := strconv.ParseFloat(strings.TrimSpace(parts[2*i+1]), 64)
		// x + y = 1 (z = 0) is allowed: long-wave primaries (DCI-P3's and
		// ITU-R BT.2020's reds) lie on the spectrum locus where z̄ ≈ 0.
		if err1 != nil || err2 != nil || !(x >= 0 && y > 0 && x+y <= 1+1e-9) {
			return p, usagef("--primaries %s: the %s primary (%s,%s) is not a chromaticity with x ≥ 0, y > 0, x + y ≤ 1",
				shown(s), []string{"red", "green", "blue"}[i], shown(parts[2*i]), shown(parts[2*i+1]))
		}
		p[i] = colorimetry.XY{X: x, Y: y}
	}
	return p, nil
}

// primariesOrder returns a warning when the primaries, taken as red, green
// and blue, run clockwise round their triangle in the x, y diagram: red →
// green → blue runs anticlockwise for every RGB display, so a clockwise
// triangle means two channels were swapped.
func primariesOrder(p [3]colorimetry.XY) []string {
	cross := (p[1].X-p[0].X)*(p[2].Y-p[0].Y) - (p[1].Y-p[0].Y)*(p[2].X-p[0].X)
	if cross < 0 {
		return []string{"the primaries run clockwise in the x, y diagram: red, green and blue are not in that order (check --channels or --primaries); the matrix follows the order given"}
	}
	return nil
}

// whiteArg resolves a white given to flag as x,y or as a CIE illuminant
// NAME or FILE (its chromaticity for obs). It returns the chromaticity
// and a name for it.
func whiteArg(e *env, flag, v string, obs *colorimetry.Observer) (colorimetry.XY, string, error) {
	if parts := strings.Split(v, ","); len(parts) == 2 {
		if _, err := strconv.ParseFloat(strings.TrimSpace(parts[0]), 64); err == nil {
			c, err := parseXY(v)
			if err != nil {
				return c, "", usagef("%s %s: want a chromaticity x,y with x > 0, y > 0, x + y < 1", flag, shown(v))
			}
			return c, "chromaticity", nil
		}
	}
	s, name, err := illuminantFlag(e, flag, v)
	if err != nil {
		return colorimetry.XY{}, "", err
	}
	xy, err := lightXY(obs, s)
	if err != nil {
		return colorimetry.XY{}, "", fmt.Errorf("%s %s: %v", flag, v, err)
	}
	return xy, name, nil
}

// displayChannels reads the red, green and blue channel spectra of path
// (names: which three, in that order; all three when the file has exactly
// three) and returns their chromaticities, the chromaticity of their sum
// (the white at full drive) and their names.
func displayChannels(e *env, path, names string, obs *colorimetry.Observer) ([3]colorimetry.XY, colorimetry.XY, [3]string, error) {
	var prim [3]colorimetry.XY
	var got [3]string
	list, err := spectrumArg(e, path)
	if err != nil {
		return prim, colorimetry.XY{}, got, err
	}
	if names != "" {
		if n := len(strings.Split(names, ",")); n != 3 {
			return prim, colorimetry.XY{}, got, usagef("--channels %s: want three names, red, green and blue (got %d)", shown(names), n)
		}
		if list, err = selectColumns(list, names, fileOf(path)); err != nil {
			return prim, colorimetry.XY{}, got, err
		}
	}
	if len(list) != 3 {
		return prim, colorimetry.XY{}, got, usagef("%s holds %d spectra: name the red, green and blue channels with --channels R,G,B", fileOf(path), len(list))
	}
	calc := newTristimulus(obs, colorimetry.Spectrum{}, true)
	var sum colorimetry.XYZ
	for i, in := range list {
		c, err := calc.xyzOnly(in.s)
		if err != nil {
			return prim, colorimetry.XY{}, got, fmt.Errorf("%s: %v", in.place(), err)
		}
		if prim[i], err = c.XY(); err != nil {
			return prim, colorimetry.XY{}, got, fmt.Errorf("%s: %v", in.place(), err)
		}
		sum = sum.Add(c)
		got[i] = in.name
	}
	wxy, err := sum.XY()
	if err != nil {
		return prim, colorimetry.XY{}, got, fmt.Errorf("%s: the channels' sum: %v", fileOf(path), err)
	}
	return prim, wxy, got, nil
}
