package main

import (
	"bytes"
	"encoding/xml"
	"fmt"
	colorful "github.com/lucasb-eyer/go-colorful"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// svgFigure is what the tests read back from an SVG figure.
type svgFigure struct {
	width, height string   // attributes of the root element
	texts         []string // contents of every <text> element
	paths         []svgPath
}

type svgPath struct {
	d, style string
}

// readSVG parses an SVG file with encoding/xml: it must be well-formed,
// with an <svg> root.
func readSVG(t *testing.T, path string) svgFigure {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var f svgFigure
	dec := xml.NewDecoder(bytes.NewReader(data))
	depth, inText := 0, false
	var buf strings.Builder
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("%s: not well-formed XML: %v", path, err)
		}
		switch el := tok.(type) {
		case xml.StartElement:
			if depth == 0 {
				if el.Name.Local != "svg" {
					t.Fatalf("%s: root element <%s>, want <svg>", path, el.Name.Local)
				}
				for _, a := range el.Attr {
					switch a.Name.Local {
					case "width":
						f.width = a.Value
					case "height":
						f.height = a.Value
					}
				}
			}
			depth++
			switch el.Name.Local {
			case "text":
				inText = true
				buf.Reset()
			case "path":
				var p svgPath
				for _, a := range el.Attr {
					switch a.Name.Local {
					case "d":
						p.d = a.Value
					case "style":
						p.style = a.Value
					}
				}
				f.paths = append(f.paths, p)
			}
		case xml.EndElement:
			depth--
			if el.Name.Local == "text" {
				f.texts = append(f.texts, buf.String())
				inText = false
			}
		case xml.CharData:
			if inText {
				buf.Write(el)
			}
		}
	}
	if depth != 0 {
		t.Fatalf("%s: unbalanced elements", path)
	}
	return f
}

// hasText reports whether some <text> element reads exactly s.
func (f svgFigure) hasText(s string) bool {
	for _, t := range f.texts {
		if t == s {
			return true
		}
	}
	return false
}

// strokes returns the vertices of the stroked paths in colour hex (as
// vgsvg writes it, e.g. "#1A1A1A") and width w, without dashes, leaving
// out straight segments (legend thumbnails and marks).
func (f svgFigure) strokes(hex string, w float64) [][][2]float64 {
	var out [][][2]float64
	want := fmt.Sprintf("stroke:%s;", hex)
	width := "stroke-width:" + strconv.FormatFloat(w, 'g', -1, 64)
	for _, p := range f.paths {
		if !strings.Contains(p.style, want) || !strings.Contains(p.style, width) || strings.Contains(p.style, "dasharray") {
			continue
		}
		if v := pathVertices(p.d); len(v) > 2 {
			out = append(out, v)
		}
	}
	return out
}

// pathVertices parses the M and L commands of an SVG path.
func pathVertices(d string) [][2]float64 {
	var pts [][2]float64
	for _, part := range strings.FieldsFunc(d, func(r rune) bool { return r == 'M' || r == 'L' }) {
		xs, ys, ok := strings.Cut(part, ",")
		if !ok {
			return nil
		}
		x, err1 := strconv.ParseFloat(xs, 64)
		y, err2 := strconv.ParseFloat(ys, 64)
		if err1 != nil || err2 != nil {
			return nil
		}
		pts = append(pts, [2]float64{x, y})
	}
	return pts
}

// bbox returns the extent of the points.
func bbox(pts [][2]float64) (w, h float64) {
	x0, x1, y0, y1 := math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)
	for _, p := range pts {
		x0, x1 = math.Min(x0, p[0]), math.Max(x1, p[0])
		y0, y1 = math.Min(y0, p[1]), math.Max(y1, p[1])
	}
	return x1 - x0, y1 - y0
}

// readPNG decodes a PNG file.
func readPNG(t *testing.T, path string) image.Image {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("%s: not a PNG: %v", path, err)
	}
	return img
}

// rgb8 returns the 8-bit colour of a pixel.
func rgb8(img image.Image, x, y int) (r, g, b uint8) {
	c := color.NRGBAModel.Convert(img.At(x, y)).(color.NRGBA)
	return c.R, c.G, c.B
}

// commonestColour returns the most frequent colour of the image other than
// pure white, and how many pixels have it.
func commonestColour(img image.Image) (color.NRGBA, int) {
	count := map[color.NRGBA]int{}
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			c := color.NRGBAModel.Convert(img.At(x, y)).(color.NRGBA)
			if c.R == 255 && c.G == 255 && c.B == 255 {
				continue
			}
			count[c]++
		}
	}
	var best color.NRGBA
	n := 0
	for c, k := range count {
		if k > n {
			best, n = c, k
		}
	}
	return best, n
}

// flatCSV writes flat spectra 380–780 nm at 10 nm, one column per value.
func flatCSV(t *testing.T, name string, values map[string]float64, order ...string) string {
	t.Helper()
	g, err := colorimetry.NewGrid(380, 780, 10)
	if err != nil {
		t.Fatal(err)
	}
	return writeTemp(t, name, columnsCSV(g, order, func(j int, nm float64) float64 { return values[order[j]] }))
}

// srgbEncode8 is the sRGB encoding of a linear value to 8 bits
// (IEC 61966-2-1).
func srgbEncode8(v float64) int {
	if v <= 0.0031308 {
		return int(math.Round(255 * 12.92 * v))
	}
	return int(math.Round(255 * (1.055*math.Pow(v, 1/2.4) - 0.055)))
}

func TestPlotSpectraSVG(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "paints.svg")
	code, stdout, errs := runCLI(t, "", "plot", "spectra", "demo/paints.csv", "--column", "ky-teal,ky-ochre", "--out", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(stdout, "wrote "+out+" (2 spectra)") {
		t.Errorf("stdout %q does not report the file", stdout)
	}
	f := readSVG(t, out)
	// The legend names every spectrum, and both axes say what they carry
	// and in which unit: common practice (no source).
	for _, want := range []string{"ky-teal", "ky-ochre", "wavelength (nm)", yReflectance} {
		if !f.hasText(want) {
			t.Errorf("no text %q in the SVG (texts: %q)", want, f.texts)
		}
	}
	// Default size 900×560 px, written in pt at 0.75 pt a pixel (CSS 2.1,
	// absolute lengths: 1 px = 0.75 pt; from memory).
	if f.width != "675pt" || f.height != "420pt" {
		t.Errorf("SVG size %s × %s, want 675pt × 420pt", f.width, f.height)
	}
	// Each spectrum is drawn whole, one vertex per sample of the demo file
	// (380–780 nm at 5 nm, its own grid), in a colour of its own hue: the
	// teal's CIELAB hue between 150° and 230°, the ochre's between 40° and
	// 100° (their hues under D65 are 186.7° and 73.8°, from describe).
	hues := map[string][2]float64{"ky-teal": {150, 230}, "ky-ochre": {40, 100}}
	found := map[string]bool{}
	for _, p := range f.paths {
		if !strings.Contains(p.style, "stroke-width:1.4") || strings.Contains(p.style, "dasharray") || len(pathVertices(p.d)) != 81 {
			continue
		}
		_, hex, _ := strings.Cut(p.style, "stroke:")
		hex, _, _ = strings.Cut(hex, ";")
		c, err := colorful.Hex(strings.ToLower(hex))
		if err != nil {
			t.Fatalf("stroke colour %q: %v", hex, err)
		}
		h, _, _ := c.Hcl()
		for name, r := range hues {
			if h >= r[0] && h <= r[1] {
				found[name] = true
			}
		}
	}
	for name := range hues {
		if !found[name] {
			t.Errorf("%s: no 81-vertex curve in a colour of its hue (paths %d)", name, len(f.paths))
		}
	}
}

func TestPlotSpectraLightsNormalised(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, norm := range []string{"all", "each", "none"} {
		out := filepath.Join(dir, norm+".svg")
		code, _, errs := runCLI(t, "", "plot", "spectra", "demo/lamps.csv", "--as", "light", "--column", "wash-red,tungsten-3200", "--normalise", norm, "--out", out)
		if code != 0 {
			t.Fatalf("--normalise %s: exit %d: %s", norm, code, errs)
		}
		f := readSVG(t, out)
		// The y axis names the quantity and its scale: common practice
		// (no source).
		want := map[string]string{
			"all":  "relative spectral power (largest peak = 1)",
			"each": "relative spectral power (each peak = 1)",
			"none": "spectral power (units of the file)",
		}[norm]
		if !f.hasText(want) {
			t.Errorf("--normalise %s: no axis label %q", norm, want)
		}
	}
}

// TestPlotManySpectra checks that sixty spectra in a small figure keep
// room for the plot: the legend lists what fits and counts the rest.
// common practice (no source)
func TestPlotManySpectra(t *testing.T) {
	t.Parallel()
	vals := map[string]float64{}
	var names []string
	for i := range 60 {
		n := fmt.Sprintf("sample-%02d", i)
		vals[n] = 0.01 + float64(i)/61
		names = append(names, n)
	}
	in := flatCSV(t, "many.csv", vals, names...)
	out := filepath.Join(t.TempDir(), "many.svg")
	code, _, errs := runCLI(t, "", "plot", "spectra", in, "--size", "480x360", "--out", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	f := readSVG(t, out)
	more := ""
	for _, s := range f.texts {
		if strings.HasPrefix(s, "… and ") && strings.HasSuffix(s, " more") {
			more = s
		}
	}
	if more == "" || !f.hasText("sample-00") || f.hasText("sample-59") {
		t.Errorf("legend: first entry shown %v, last shown %v, note %q", f.hasText("sample-00"), f.hasText("sample-59"), more)
	}
	// Every spectrum is still drawn: sixty lines of 41 vertices (380–780
	// nm at 10 nm).
	n := 0
	for _, p := range f.paths {
		if v := pathVertices(p.d); len(v) == 41 && strings.Contains(p.style, "stroke-width:1.4") {
			n++
		}
	}
	if n != 60 {
		t.Errorf("%d spectra drawn, want 60", n)
	}
}

// TestPlotDiagramSVG checks the parts of a chromaticity diagram: the locus
// drawn whole and with equal scales, the marks and the white point.
func TestPlotDiagramSVG(t *testing.T) {
	t.Parallel()
	for _, space := range []string{"xy", "uv"} {
		out := filepath.Join(t.TempDir(), "lamps-"+space+".svg")
		code, _, errs := runCLI(t, "", "plot", "diagram", "demo/lamps.csv", "--as", "light", "--space", space,
			"--pair", "wash-amber,wash-blue", "--gamut", "wash-red,wash-green,wash-blue", "--out", out)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", space, code, errs)
		}
		f := readSVG(t, out)
		// Axis labels, the white point's name, legend entries and the
		// wavelength marks in the green, where the locus leaves room:
		// common practice (no source).
		want := []string{"white D65", "white point D65", "spectrum locus (marks: nm)", "Planckian locus (marks: K)",
			"mixing gamut", "pair wash-amber – wash-blue", "wash-amber", "wash-blue", "480", "560", "580"}
		if space == "xy" {
			want = append(want, "x", "y")
		} else {
			want = append(want, "u′ (CIE 1976 UCS)", "v′ (CIE 1976 UCS)")
		}
		for _, s := range want {
			if !f.hasText(s) {
				t.Errorf("%s: no text %q (texts: %q)", space, s, f.texts)
			}
		}
		// Most isotherm marks are named where they have room: common
		// practice (no source).
		named := 0
		for _, k := range isotherms {
			if f.hasText(fmt.Sprintf("%.0f K", k)) {
				named++
			}
		}
		if named < 5 {
			t.Errorf("%s: %d of %d isotherms named", space, named, len(isotherms))
		}
		// The spectrum locus is one polyline through every row of the CIE
		// 1931 table from 360 to 699 nm at 1 nm: 340 vertices
		// (colorimetry.SpectrumLocus; the rows of the CIE 1931 table,
		// shared/reference/cie1931_2deg_1nm.csv).
		loci := f.strokes("#1A1A1A", 1.3)
		if len(loci) != 1 || len(loci[0]) != 340 {
			t.Fatalf("%s: %d locus lines, want one of 340 vertices", space, len(loci))
		}
		// Equal scales: the drawn locus has the aspect of the locus in the
		// diagram's own units, computed from the same table. A chromaticity
		// diagram is drawn with one unit as long on both axes, or distances
		// in it (Δu′v′) would be distorted: from memory.
		loc, err := colorimetry.NewSpectrumLocus(cie.CIE1931())
		if err != nil {
			t.Fatal(err)
		}
		var data [][2]float64
		for nm := 360.0; nm <= 699; nm++ {
			p, err := loc.At(nm)
			if err != nil {
				t.Fatal(err)
			}
			if space == "uv" {
				q := p.UVPrime()
				data = append(data, [2]float64{q.U, q.V})
			} else {
				data = append(data, [2]float64{p.X, p.Y})
			}
		}
		dw, dh := bbox(data)
		sw, sh := bbox(loci[0])
		if r := (sw / sh) / (dw / dh); math.Abs(r-1) > 0.005 {
			t.Errorf("%s: drawn locus aspect %.4f, data aspect %.4f: scales differ by %.2f %%", space, sw/sh, dw/dh, 100*(r-1))
		}
	}
}

// TestPlotDiagramPNG checks a PNG diagram of reflectances with the
// object-colour limit: it decodes, at the size asked.
func TestPlotDiagramPNG(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "paints.png")
	code, _, errs := runCLI(t, "", "plot", "diagram", "demo/paints.csv", "--lightness", "50", "--size", "360x400", "--out", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	img := readPNG(t, out)
	// The size asked for, in pixels: common practice (no source).
	if b := img.Bounds(); b.Dx() != 360 || b.Dy() != 400 {
		t.Errorf("PNG is %d×%d, want 360×400", b.Dx(), b.Dy())
	}
	// The background is white at the corner: common practice (no source).
	if r, g, b := rgb8(img, 0, 0); r != 255 || g != 255 || b != 255 {
		t.Errorf("corner pixel (%d, %d, %d), want white", r, g, b)
	}
}

// TestPlotSwatchGrey checks a swatch pixel: a flat reflectance of 0.18 under
// D65 is a neutral whose Y is 18, so R = G = B = the sRGB encoding of 0.18,
// 118 (the IEC 61966-2-1 encoding function), within ±1.
func TestPlotSwatchGrey(t *testing.T) {
	t.Parallel()
	in := flatCSV(t, "grey.csv", map[string]float64{"grey-18": 0.18}, "grey-18")
	out := filepath.Join(t.TempDir(), "grey.png")
	code, stdout, errs := runCLI(t, "", "plot", "swatches", in, "--size", "300x240", "--out", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(stdout, "1 swatch, 0 outside") {
		t.Errorf("stdout %q", stdout)
	}
	img := readPNG(t, out)
	if b := img.Bounds(); b.Dx() != 300 || b.Dy() != 240 {
		t.Errorf("PNG is %d×%d, want 300×240", b.Dx(), b.Dy())
	}
	want := srgbEncode8(0.18)
	if want != 118 {
		t.Fatalf("sRGB encoding of 0.18 = %d, want 118 (IEC 61966-2-1)", want)
	}
	c, n := commonestColour(img)
	if n < 1000 {
		t.Fatalf("the swatch covers %d pixels", n)
	}
	for _, v := range []uint8{c.R, c.G, c.B} {
		if math.Abs(float64(v)-float64(want)) > 1 {
			t.Errorf("swatch colour %v, want R = G = B = %d ± 1", c, want)
			break
		}
	}
}

// TestPlotSwatchRedPrimary draws the sRGB red primary, XYZ (41.24, 21.26,
// 1.93) with the sRGB white at Y = 100, through the swatch pipeline: the
// pixel at the swatch's centre is (255, 0, 0) (IEC 61966-2-1: primaries
// and encoding, as in TestSRGBSwatch).
func TestPlotSwatchRedPrimary(t *testing.T) {
	t.Parallel()
	hex, in, err := srgbSwatch(colorimetry.XYZ{X: 41.24, Y: 21.26, Z: 1.93}, d65sRGB)
	if err != nil {
		t.Fatal(err)
	}
	rgb, ok := parseHex(hex)
	if !ok || !in {
		t.Fatalf("swatch %s (in gamut %v)", hex, in)
	}
	sw := []swatch{{name: "sRGB red", hex: hex, rgb: rgb, inGamut: in}, {name: "grey", hex: "#777777", rgb: color.NRGBA{0x77, 0x77, 0x77, 0xff}, inGamut: true}}
	note := swatchNote("test strip", sw)
	const w, h = 320, 200
	data, err := swatchFigure("", note, sw).render("png", w, h)
	if err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	// Where the strip puts the first swatch, in pt from the bottom left.
	body := figureBody(vg.Rectangle{Max: vg.Point{X: w * 0.75, Y: h * 0.75}}, "")
	g, ok := layoutSwatches(len(sw), body.Max.X-body.Min.X, body.Max.Y-body.Min.Y, captionHeight(note, body.Max.X-body.Min.X))
	if !ok {
		t.Fatal("no room for two swatches")
	}
	r := g.cell(draw.Canvas{Rectangle: body}, 0)
	cx := int(float64(r.Min.X+r.Max.X) / 2 / 0.75)
	cy := h - int(float64(r.Min.Y+r.Max.Y)/2/0.75)
	if r, g, b := rgb8(img, cx, cy); r != 255 || g != 0 || b != 0 {
		t.Errorf("pixel (%d, %d) = (%d, %d, %d), want (255, 0, 0)", cx, cy, r, g, b)
	}
}

// TestPlotSwatchOutOfGamut checks that a colour outside sRGB is marked: the
// hatched corner puts black and white pixels in the swatch's top right
// corner, and the caption says what the mark means. common practice (no
// source)
func TestPlotSwatchOutOfGamut(t *testing.T) {
	t.Parallel()
	sw := []swatch{{name: "teal", hex: "#008d81", rgb: color.NRGBA{0, 0x8d, 0x81, 0xff}, inGamut: false}}
	note := swatchNote("test strip", sw)
	if !strings.Contains(note, "outside the sRGB gamut") {
		t.Errorf("caption %q does not explain the mark", note)
	}
	const w, h = 300, 260
	data, err := swatchFigure("", note, sw).render("png", w, h)
	if err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	body := figureBody(vg.Rectangle{Max: vg.Point{X: w * 0.75, Y: h * 0.75}}, "")
	g, _ := layoutSwatches(1, body.Max.X-body.Min.X, body.Max.Y-body.Min.Y, captionHeight(note, body.Max.X-body.Min.X))
	r := g.cell(draw.Canvas{Rectangle: body}, 0)
	// The corner triangle's inner part, 2–12 % of the side in from the
	// corner, holds both stripes and gaps.
	side := float64(r.Max.X - r.Min.X)
	x0, x1 := int((float64(r.Max.X)-0.12*side)/0.75), int((float64(r.Max.X)-0.02*side)/0.75)
	y0, y1 := h-int(float64(r.Max.Y)/0.75-0.02*side/0.75), h-int((float64(r.Max.Y)-0.12*side)/0.75)
	dark, light, fill := 0, 0, 0
	for y := y0; y <= y1; y++ {
		for x := x0; x <= x1; x++ {
			cr, cg, cb := rgb8(img, x, y)
			switch {
			case cr < 60 && cg < 60 && cb < 60:
				dark++
			case cr > 200 && cg > 200 && cb > 200:
				light++
			case cr == 0 && cg == 0x8d && cb == 0x81:
				fill++
			}
		}
	}
	if dark == 0 || light == 0 {
		t.Errorf("corner: %d dark, %d light pixels: no hatching", dark, light)
	}
	// The centre keeps the clipped colour.
	cx, cy := int(float64(r.Min.X+r.Max.X)/2/0.75), h-int(float64(r.Min.Y+r.Max.Y)/2/0.75)
	if cr, cg, cb := rgb8(img, cx, cy); cr != 0 || cg != 0x8d || cb != 0x81 {
		t.Errorf("centre (%d, %d, %d), want #008d81", cr, cg, cb)
	}
}

// TestPlotHooks runs the --plot flag of describe, pair and complement.
func TestPlotHooks(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, tc := range []struct {
		args []string
		want []string // texts the SVG must hold: common practice (no source)
	}{
		{[]string{"describe", "demo/paints.csv", "--column", "ky-teal,ky-barn-red"}, []string{"ky-teal", "ky-barn-red", "white D65"}},
		{[]string{"describe", "demo/lamps.csv", "--as", "light"}, []string{"wash-amber", "white E"}},
		{[]string{"pair", "demo/lamps.csv:wash-amber", "demo/lamps.csv:wash-blue"}, []string{"wash-amber (A)", "wash-blue (B)", "A + B", "white D65", "relative spectral power (peak of A + B = 1)"}},
		{[]string{"pair", "demo/filters.csv:gel-straw", "demo/filters.csv:gel-steel-blue", "--mode", "subtractive"}, []string{"stack A × B", yTransmittance}},
		{[]string{"complement", "demo/lamps.csv:wash-amber"}, []string{"wash-amber (A)", "wash-amber complement", "white D65"}},
		{[]string{"complement", "demo/paints.csv:ky-ochre", "--as", "reflectance"}, []string{"ky-ochre complement (1 − A)", yReflectance}},
	} {
		out := filepath.Join(dir, tc.args[0]+strconv.Itoa(len(tc.args))+".svg")
		args := append(append([]string(nil), tc.args...), "--plot", out)
		code, _, errs := runCLI(t, "", args...)
		if code != 0 {
			t.Errorf("%v: exit %d: %s", tc.args, code, errs)
			continue
		}
		f := readSVG(t, out)
		for _, s := range tc.want {
			if !f.hasText(s) {
				t.Errorf("%v: no text %q (texts: %q)", tc.args, s, f.texts)
			}
		}
	}
	// A PNG through a hook decodes, at the hook's fixed size: common
	// practice (no source).
	out := filepath.Join(dir, "pair.png")
	if code, _, errs := runCLI(t, "", "pair", "demo/paints.csv:ky-barn-red", "demo/paints.csv:ky-teal", "--as", "reflectance", "--plot", out); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if b := readPNG(t, out).Bounds(); b.Dx() != twoPanelW || b.Dy() != twoPanelH {
		t.Errorf("pair --plot PNG is %d×%d, want %d×%d", b.Dx(), b.Dy(), twoPanelW, twoPanelH)
	}
}

// TestPlotSolve draws solve figures for lights and for reflectances from
// spectra made here.
func TestPlotSolve(t *testing.T) {
	t.Parallel()
	lamps, err := readSpectra(&env{}, "demo/lamps.csv")
	if err != nil {
		t.Fatal(err)
	}
	by := map[string]colorimetry.Spectrum{}
	for _, l := range lamps {
		by[l.name] = l.s
	}
	mix, err := colorimetry.Add(by["wash-red"].Scale(0.4), by["wash-green"].Scale(0.3))
	if err != nil {
		t.Fatal(err)
	}
	if mix, err = colorimetry.Add(mix, by["wash-blue"].Scale(0.2)); err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	out := filepath.Join(dir, "solve-lights.svg")
	err = plotSolve(out, solvePlot{
		As:         "light",
		Illuminant: cie.D65(),
		IllName:    "D65",
		TargetXY:   &colorimetry.XY{X: 0.3127, Y: 0.3290},
		Recipes:    []namedSpectrum{{"recipe 1", mix}},
		Channels:   []namedSpectrum{{"wash-red", by["wash-red"]}, {"wash-green", by["wash-green"]}, {"wash-blue", by["wash-blue"]}},
		Inputs:     []string{"demo/lamps.csv"},
	})
	if err != nil {
		t.Fatal(err)
	}
	f := readSVG(t, out)
	// The gamut's corners are the channels, named; the target and the
	// recipe are named too: common practice (no source).
	for _, s := range []string{"target", "recipe 1", "wash-red", "wash-green", "wash-blue", "mixing gamut", "gamut corners (named)", "white D65"} {
		if !f.hasText(s) {
			t.Errorf("lights: no text %q (texts: %q)", s, f.texts)
		}
	}
	grey := flatCSV(t, "greys.csv", map[string]float64{"target": 0.5, "mix": 0.45}, "target", "mix")
	ins, err := readSpectra(&env{}, grey)
	if err != nil {
		t.Fatal(err)
	}
	out = filepath.Join(dir, "solve-paint.png")
	err = plotSolve(out, solvePlot{
		As: "reflectance", Illuminant: cie.D65(), IllName: "D65",
		Target:  &namedSpectrum{"grey card", ins[0].s},
		Recipes: []namedSpectrum{{"recipe 1", ins[1].s}},
		Inputs:  []string{grey},
	})
	if err != nil {
		t.Fatal(err)
	}
	readPNG(t, out)
	// Without the illuminant a reflectance has no colour: an error, not a
	// figure: common practice (no source).
	bad := filepath.Join(dir, "bad.svg")
	if err := plotSolve(bad, solvePlot{As: "reflectance", Recipes: []namedSpectrum{{"r", ins[1].s}}}); err == nil {
		t.Error("reflectance without an illuminant: no error")
	}
	if _, err := os.Stat(bad); err == nil {
		t.Error("a figure was written despite the error")
	}
	// The figure never replaces an input: common practice (no source).
	if err := plotSolve(grey, solvePlot{As: "reflectance", Illuminant: cie.D65(), Recipes: []namedSpectrum{{"r", ins[1].s}}, Inputs: []string{grey + ":mix"}}); err == nil {
		t.Error("--plot over the input: no error")
	}
}

// TestPlotErrors checks that mistakes give one line on standard error
// naming the flag or file, exit 2, no figure and no panic (DESIGN.md, "The
// command-line tool": exit 2 for bad input or usage, errors one line naming
// the file and place, never a stack trace).
func TestPlotErrors(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	// A CSV that happens to end in .svg: a figure must never replace it.
	input := filepath.Join(dir, "data.svg")
	csv, err := os.ReadFile("demo/paints.csv")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(input, csv, 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "x.svg")
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"plot"}, "name what to plot"},
		{[]string{"plot", "histogram", "demo/paints.csv"}, "plot histogram"},
		{[]string{"plot", "spectra", "demo/paints.csv"}, "--out FILE"},
		{[]string{"plot", "spectra", "demo/paints.csv", "--out", filepath.Join(dir, "x.jpg")}, "x.jpg: want a file ending in .svg or .png"},
		{[]string{"plot", "spectra", "demo/paints.csv", "--out", dir}, "is a directory"},
		{[]string{"plot", "spectra", input, "--out", input}, "would replace the input file"},
		{[]string{"plot", "diagram", input + ":ky-teal", "--out", input}, "would replace the input file"},
		{[]string{"plot", "spectra", "demo/paints.csv", "--size", "12x9000", "--out", out}, "--size 12x9000"},
		{[]string{"plot", "spectra", "demo/paints.csv", "--size", "wide", "--out", out}, "--size wide"},
		{[]string{"plot", "spectra", "demo/paints.csv", "--as", "ink", "--out", out}, "--as ink"},
		{[]string{"plot", "spectra", "demo/paints.csv", "--column", "ky-mauve", "--out", out}, `no spectrum named "ky-mauve"`},
		{[]string{"plot", "spectra", filepath.Join(dir, "missing.csv"), "--out", out}, "missing.csv"},
		{[]string{"plot", "diagram", "demo/paints.csv", "--pair", "ky-teal", "--out", out}, "--pair ky-teal"},
		{[]string{"plot", "diagram", "demo/paints.csv", "--pair", "ky-teal,ky-mauve", "--out", out}, `--pair: no spectrum named "ky-mauve"`},
		{[]string{"plot", "diagram", "demo/paints.csv", "--gamut", "ky-teal,ky-ochre", "--out", out}, "--gamut"},
		{[]string{"plot", "diagram", "demo/lamps.csv", "--as", "light", "--lightness", "50", "--out", out}, "--lightness"},
		{[]string{"plot", "diagram", "demo/paints.csv", "--lightness", "100", "--out", out}, "--lightness 100"},
		{[]string{"plot", "diagram", "demo/paints.csv", "--space", "lab", "--out", out}, "--space lab"},
		{[]string{"plot", "swatches", "demo/lamps.csv", "--as", "light", "--out", out}, "--as light"},
		{[]string{"plot", "swatches", "demo/paints.csv", "--size", "240x180", "--out", out}, "too small for 9 swatches"},
		{[]string{"describe", "demo/paints.csv", "--plot", filepath.Join(dir, "d.pdf")}, "--plot"},
		{[]string{"pair", "demo/lamps.csv:wash-amber", "demo/lamps.csv:wash-blue", "--plot", dir}, "is a directory"},
		{[]string{"complement", input + ":ky-ochre", "--as", "reflectance", "--plot", input}, "would replace the input file"},
	} {
		code, _, errs := runCLI(t, "", tc.args...)
		if code != exitBad {
			t.Errorf("%v: exit %d, want %d", tc.args, code, exitBad)
		}
		if !strings.Contains(errs, tc.want) {
			t.Errorf("%v: stderr %q lacks %q", tc.args, errs, tc.want)
		}
		if strings.Count(strings.TrimRight(errs, "\n"), "\n") != 0 || strings.Contains(errs, "goroutine") {
			t.Errorf("%v: stderr is not one line: %q", tc.args, errs)
		}
	}
	if _, err := os.Stat(out); err == nil {
		t.Errorf("%s was written by a failing command", out)
	}
	if got, err := os.ReadFile(input); err != nil || !bytes.Equal(got, csv) {
		t.Errorf("the input %s was changed", input)
	}
}

// TestPlotHelp checks the help of each kind of plot: usage and example
// (DESIGN.md: every subcommand's --help shows an example).
func TestPlotHelp(t *testing.T) {
	t.Parallel()
	for _, kind := range []string{"spectra", "diagram", "swatches"} {
		code, out, _ := runCLI(t, "", "plot", kind, "--help")
		if code != 0 || !strings.Contains(out, "antipode plot "+kind) || !strings.Contains(out, "Example") || !strings.Contains(out, "--out") {
			t.Errorf("plot %s --help: exit %d:\n%s", kind, code, out)
		}
	}
}

// TestLightXY checks the white point the diagrams mark: D65 as a light, CIE
// 1931 2°, 1 nm 360–830 nm: x 0.31273, y 0.32902 (shared/reference
// PROVENANCE.md Checks 3, from the CIE tables).
func TestLightXY(t *testing.T) {
	t.Parallel()
	xy, err := lightXY(cie.CIE1931(), cie.D65())
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(xy.X-0.31273) > 1e-5 || math.Abs(xy.Y-0.32902) > 1e-5 {
		t.Errorf("D65 white (%.5f, %.5f), want (0.31273, 0.32902)", xy.X, xy.Y)
	}
}

func TestLinearTicks(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		lo, hi float64
		want   []string // labelled marks: round steps, common practice (no source)
	}{
		{0, 1.04, []string{"0.0", "0.2", "0.4", "0.6", "0.8", "1.0"}},
		{380, 780, []string{"400", "450", "500", "550", "600", "650", "700", "750"}},
		{0, 2.5, []string{"0.0", "0.5", "1.0", "1.5", "2.0", "2.5"}},
		{-0.3, 0.3, []string{"-0.3", "-0.2", "-0.1", "0.0", "0.1", "0.2", "0.3"}},
	} {
		var got []string
		for _, tk := range (linearTicks{}).Ticks(tc.lo, tc.hi) {
			if tk.Label != "" {
				got = append(got, tk.Label)
			}
		}
		if strings.Join(got, " ") != strings.Join(tc.want, " ") {
			t.Errorf("ticks %g–%g: %q, want %q", tc.lo, tc.hi, got, tc.want)
		}
	}
}

func TestPlotGeometry(t *testing.T) {
	t.Parallel()
	// The hull of a square with a point inside is the square's four
	// corners: common practice (no source).
	d := &diagramSpec{space: "xy"}
	pts := []diagramPoint{{name: "a", xy: colorimetry.XY{X: 0.1, Y: 0.1}}, {name: "b", xy: colorimetry.XY{X: 0.5, Y: 0.1}},
		{name: "in", xy: colorimetry.XY{X: 0.3, Y: 0.3}}, {name: "c", xy: colorimetry.XY{X: 0.5, Y: 0.5}}, {name: "d", xy: colorimetry.XY{X: 0.1, Y: 0.5}}}
	h := convexHull(pts, d)
	if len(h) != 4 {
		t.Fatalf("hull %v, want the 4 corners", h)
	}
	for _, p := range h {
		if p.name == "in" {
			t.Errorf("the inner point is on the hull")
		}
	}
	if convexHull(pts[:2], d) != nil || convexHull([]diagramPoint{pts[0], pts[2], pts[3]}, d) != nil {
		t.Error("two points, or three on a line, have no hull")
	}
	// A ray from (1, 1) through (2, 2) leaves the square 0–4 at (4, 4).
	sq := []vg.Point{{X: 0, Y: 0}, {X: 4, Y: 0}, {X: 4, Y: 4}, {X: 0, Y: 4}, {X: 0, Y: 0}}
	if p, ok := rayExit(vg.Point{X: 1, Y: 1}, vg.Point{X: 2, Y: 2}, sq); !ok || math.Abs(float64(p.X-4)) > 1e-9 || math.Abs(float64(p.Y-4)) > 1e-9 {
		t.Errorf("ray exit %v %v, want (4, 4)", p, ok)
	}
	// Boxes side by side overlap only when they touch; a box turned by 45°
	// between two upright ones misses both.
	a, b := boxAt(vg.Point{X: 0, Y: 0}, 10, 4), boxAt(vg.Point{X: 20, Y: 0}, 10, 4)
	if quadsOverlap(a, b) || !quadsOverlap(a, boxAt(vg.Point{X: 9, Y: 2}, 10, 4)) {
		t.Error("upright boxes: wrong overlap")
	}
	// A box along x + y = 16, 3 pt thick with its clearance, passes the
	// corner (6.5, 3.5) of a by 6/√2 pt though their extents in x and y
	// overlap; one along x + y = 12 cuts the corner.
	dir := unit(vg.Point{X: -1, Y: 1})
	if r := rayBox(vg.Point{X: 12, Y: 4}, dir, 11, 3); quadsOverlap(r, a) {
		t.Error("turned box: overlap where there is none")
	}
	if r := rayBox(vg.Point{X: 8, Y: 4}, dir, 11, 3); !quadsOverlap(r, a) {
		t.Error("turned box: no overlap where there is one")
	}
}

// TestPlotLabelsApart places the names of three points at one spot: each
// gets a place of its own. common practice (no source)
func TestPlotLabelsApart(t *testing.T) {
	t.Parallel()
	c := draw.New(vgimg.New(300, 300))
	pl := &placer{bounds: c.Rectangle}
	p := vg.Point{X: 150, Y: 150}
	pl.take(boxAt(p, 2*markerR, 2*markerR))
	for _, s := range []string{"first", "second", "third"} {
		pl.label(&c, p, markerR, s, plotText(labelFont))
	}
	labels := pl.taken[1:]
	for i := range labels {
		for j := i + 1; j < len(labels); j++ {
			if quadsOverlap(labels[i], labels[j]) {
				t.Errorf("labels %d and %d overlap", i, j)
			}
		}
	}
}
