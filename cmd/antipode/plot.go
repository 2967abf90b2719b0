package main

// Figures: spectra, chromaticity diagrams and swatch strips, written as SVG
// or PNG. This file holds the "plot" command, the machinery every figure
// shares (canvas, panels, the legend strip beneath each panel, atomic
// output) and the spectra chart; plot_diagram.go draws chromaticity
// diagrams and plot_swatch.go swatch strips. The hooks that describe, pair,
// complement and solve call for --plot sit at the end of this file.

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"image"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
	"github.com/lucasb-eyer/go-colorful"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

func init() {
	// Every figure is set in the sans-serif face of the fonts gonum/plot
	// ships; plot.New reads this default when a plot is made.
	plot.DefaultFont = font.Font{Typeface: "Liberation", Variant: "Sans"}
	register(&command{
		name:    "plot",
		summary: "draw spectra, a chromaticity diagram or a swatch strip (SVG or PNG)",
		usage:   "plot spectra|diagram|swatches FILE… --out FILE.svg|FILE.png [flags]",
		about: `Draws a figure from spectral files; the format follows the extension of
--out (.svg or .png). Run 'antipode plot KIND --help' for the flags of each kind.

  spectra   the spectra against wavelength, with a legend; reflectance and
            transmittance as fractions 0–1, lights as relative spectral power
  diagram   the CIE 1931 x, y or CIE 1976 u′, v′ chromaticity diagram: the
            spectrum locus with wavelength marks, the purple line, the
            Planckian locus with temperature marks, the white point, every
            spectrum's chromaticity, and optionally a pair with its line
            through the white, a mixing gamut and the object-colour limit at
            a lightness
  swatches  a strip of sRGB swatches, named, with colours outside the sRGB
            gamut marked

describe, pair, complement and solve (for dyes, pigments and halftone models)
take --plot FILE to draw their result too.
Figures are written whole or not at all, and never over an input file.`,
		example: `  $ antipode plot spectra cmd/antipode/demo/paints.csv --out paints.svg
  $ antipode plot diagram cmd/antipode/demo/lamps.csv --as light --pair wash-amber,wash-blue --out lamps.png
  $ antipode plot swatches cmd/antipode/demo/paints.csv --illuminant A --out paints-under-A.png`,
		run: runPlot,
	})
}

// The kinds of "plot", each with its own help.
var (
	plotSpectraCommand = &command{
		name:  "plot",
		usage: "plot spectra FILE… [--column NAME,…] [--as light|reflectance|transmittance] [--scale fraction|percent] [--normalise each|all|none] [--title TEXT] [--size WxH] --out FILE.svg|FILE.png",
		about: `Draws spectra against wavelength (nm), one line each, with a legend beneath.
Reflectance and transmittance are drawn as fractions 0–1 (percent files are
recognised as describe does); lights as relative spectral power, scaled so
that each peak is 1 (--normalise each, the default: shapes compare), the
largest peak of all is 1 (all: levels compare), or as in the file (none).`,
		example: `  $ antipode plot spectra cmd/antipode/demo/filters.csv --as transmittance --out gels.svg
  $ antipode plot spectra cmd/antipode/demo/lamps.csv --as light --column wash-red,wash-green,wash-blue --normalise all --out rgb.png`,
	}
	plotDiagramCommand = &command{
		name:  "plot",
		usage: "plot diagram FILE… [--column NAME,…] [--as light|reflectance|transmittance] [--illuminant NAME|FILE] [--observer 1931|1964] [--space xy|uv] [--pair A,B] [--gamut NAME,…|all] [--lightness L] [--planck=false] [--title TEXT] [--size WxH] --out FILE.svg|FILE.png",
		about: `Draws a chromaticity diagram, CIE 1931 x, y (--space xy) or CIE 1976 u′, v′
(--space uv), with equal scales on both axes: the observer's spectrum locus
marked every 10 nm where the marks have room, the purple line, the Planckian
locus with isotherm marks at 2000, 2500, 3000, 4000, 5000, 6500 and 10000 K,
the white point and every spectrum's chromaticity, named.

The white is the illuminant: for reflectance and transmittance the one they
are seen under, for lights the white they are meant to make. --pair A,B joins
two of the spectra and draws the line from A through the white to the
spectrum locus: B lies on it when the pair can add up to the white. --gamut
draws the polygon of the named spectra's chromaticities (the colours their
mixtures reach; "all" for every spectrum). --lightness L (reflectance and
transmittance) draws the limit of object colours at CIE L* = L under the
illuminant.`,
		example: `  $ antipode plot diagram cmd/antipode/demo/lamps.csv --as light --gamut wash-red,wash-green,wash-blue --out rig.svg
  $ antipode plot diagram cmd/antipode/demo/paints.csv --space uv --lightness 50 --out paints-uv.png`,
	}
	plotSwatchesCommand = &command{
		name:  "plot",
		usage: "plot swatches FILE… [--column NAME,…] [--as reflectance|transmittance] [--scale fraction|percent] [--illuminant NAME|FILE] [--observer 1931|1964] [--title TEXT] [--size WxH] --out FILE.png|FILE.svg",
		about: `Draws each reflectance or transmittance as an sRGB swatch, named, with its
hex code: the colour under the illuminant, adapted to the sRGB white by
Bradford, as describe computes it. A colour outside the sRGB gamut is shown
clipped and marked with a hatched corner. Without --size each swatch is 120
pixels square, at most eight to a row.`,
		example: `  $ antipode plot swatches cmd/antipode/demo/paints.csv --out paints.png
  $ antipode plot swatches cmd/antipode/demo/filters.csv --as transmittance --illuminant A --out gels-A.png`,
	}
)

func runPlot(e *env, args []string) error {
	if len(args) == 0 {
		return usagef("name what to plot: spectra, diagram or swatches")
	}
	switch args[0] {
	case "spectra":
		return runPlotSpectra(e, args[1:])
	case "diagram":
		return runPlotDiagram(e, args[1:])
	case "swatches":
		return runPlotSwatches(e, args[1:])
	case "-h", "-help", "--help", "help":
		printCommandHelp(e.stdout, commands["plot"], nil)
		return errHelp
	}
	return usagef("plot %s: want spectra, diagram or swatches", args[0])
}

// Figure sizes in pixels (PNG at 96 dots per inch; SVG at 0.75 pt a pixel),
// and the limits of --size.
const (
	plotDPI      = 96
	minPlotW     = 240
	minPlotH     = 180
	maxPlotSide  = 6000
	spectraW     = 900
	spectraH     = 560
	twoPanelW    = 1400
	twoPanelH    = 760
	diagramW     = 720
	diagramHXY   = 820
	diagramHUV   = 760
	plotMarginPt = 8 // space around each panel, pt
)

// plotOpts are the flags every kind of plot shares.
type plotOpts struct {
	out, size, title string
}

func (o *plotOpts) define(fs *flag.FlagSet) {
	fs.StringVar(&o.out, "out", "", "write the figure to `FILE`: .svg or .png")
	fs.StringVar(&o.size, "size", "", "figure size in pixels, `WxH` (default: chosen for the figure)")
	fs.StringVar(&o.title, "title", "", "a `TEXT` over the figure (default: none, or for a diagram its name)")
}

// figureFormat returns "svg" or "png" from the extension of path.
func figureFormat(flagName, path string) (string, error) {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".svg":
		return "svg", nil
	case ".png":
		return "png", nil
	}
	return "", usagef("%s %s: want a file ending in .svg or .png", flagName, path)
}

// checkFigurePath checks a figure's destination before any work: a known
// extension, not a directory and none of the inputs (FILE or FILE:NAME
// arguments, "-" skipped).
func checkFigurePath(flagName, path string, inputs []string) (string, error) {
	if path == "" {
		return "", usagef("name the figure's file with %s FILE.svg or FILE.png", flagName)
	}
	if fi, err := os.Stat(path); err == nil && fi.IsDir() {
		return "", usagef("%s %s: is a directory, not a file", flagName, path)
	}
	format, err := figureFormat(flagName, path)
	if err != nil {
		return "", err
	}
	for _, in := range inputs {
		if in == "" || in == "-" {
			continue
		}
		if sameFile(path, fileOf(in)) || sameFile(path, in) {
			return "", usagef("%s %s would replace the input file %s", flagName, path, fileOf(in))
		}
	}
	return format, nil
}

// parseSize parses --size WxH (pixels); empty gives the defaults w, h.
func parseSize(s string, w, h int) (int, int, error) {
	if s == "" {
		return w, h, nil
	}
	a, b, ok := strings.Cut(strings.ToLower(strings.TrimSpace(s)), "x")
	pw, err1 := strconv.Atoi(strings.TrimSpace(a))
	ph, err2 := strconv.Atoi(strings.TrimSpace(b))
	if !ok || err1 != nil || err2 != nil {
		return 0, 0, usagef("--size %s: want WIDTHxHEIGHT in pixels, e.g. 900x600", s)
	}
	if pw < minPlotW || ph < minPlotH || pw > maxPlotSide || ph > maxPlotSide {
		return 0, 0, usagef("--size %s: want a width of %d–%d and a height of %d–%d pixels", s, minPlotW, maxPlotSide, minPlotH, maxPlotSide)
	}
	return pw, ph, nil
}

// figure is what gets drawn on one canvas: panels side by side under an
// optional title, or any other drawing (swatches).
type figure struct {
	title  string
	panels []*panel
	// paint, when set, draws the whole figure instead of the panels.
	paint func(c draw.Canvas)
}

// render draws the figure on a canvas of w×h pixels and returns the
// encoded file. A panic inside the drawing library comes back as an error.
func (f *figure) render(format string, w, h int) (data []byte, err error) {
	defer func() {
		if r := recover(); r != nil {
			data, err = nil, fmt.Errorf("drawing the figure failed: %v", r)
		}
	}()
	var buf bytes.Buffer
	switch format {
	case "svg":
		// 96 pixels to the inch, 72 points: a pixel is 0.75 pt.
		c := vgsvg.New(vg.Length(w)*0.75, vg.Length(h)*0.75)
		f.draw(draw.New(c))
		if _, err := c.WriteTo(&buf); err != nil {
			return nil, err
		}
	case "png":
		img := image.NewRGBA(image.Rect(0, 0, w, h))
		c := vgimg.NewWith(vgimg.UseImage(img), vgimg.UseDPI(plotDPI))
		f.draw(draw.New(c))
		if _, err := (vgimg.PngCanvas{Canvas: c}).WriteTo(&buf); err != nil {
			return nil, err
		}
	default:
		return nil, fmt.Errorf("unknown figure format %q", format)
	}
	return buf.Bytes(), nil
}

// draw lays the figure out on c.
func (f *figure) draw(c draw.Canvas) {
	c.SetColor(color.White)
	c.Fill(c.Rectangle.Path())
	body := figureBody(c.Rectangle, f.title)
	if f.title != "" {
		sty := titleStyle()
		c.FillText(sty, vg.Point{X: (body.Min.X + body.Max.X) / 2, Y: c.Max.Y - plotMarginPt}, wrapTitle(sty, f.title, body.Max.X-body.Min.X))
	}
	c.Rectangle = body
	if f.paint != nil {
		f.paint(c)
		return
	}
	widths := panelWidths(f.panels, c.Max.X-c.Min.X, c.Max.Y-c.Min.Y)
	x := c.Min.X
	for i, p := range f.panels {
		sub := c
		sub.Min.X, sub.Max.X = x, x+widths[i]
		x += widths[i]
		if i > 0 {
			sub.Min.X += 2 * plotMarginPt
		}
		p.draw(sub)
	}
}

// titleStyle is the style of a figure's title.
func titleStyle() text.Style {
	sty := plotText(12)
	sty.XAlign, sty.YAlign = draw.XCenter, draw.YTop
	return sty
}

// figureBody returns the part of a figure's rectangle r left for its
// contents: inside the margins and below the title.
func figureBody(r vg.Rectangle, title string) vg.Rectangle {
	r.Min.X += plotMarginPt
	r.Max.X -= plotMarginPt
	r.Min.Y += plotMarginPt
	r.Max.Y -= plotMarginPt
	if title != "" {
		sty := titleStyle()
		r.Max.Y -= sty.Height(wrapTitle(sty, title, r.Max.X-r.Min.X)) + 6
	}
	return r
}

// wrapTitle breaks a title into lines at most w wide.
func wrapTitle(sty text.Style, s string, w vg.Length) string {
	return strings.Join(wrapText(sty, s, w), "\n")
}

// panelWidths shares the width w among the panels: a panel with equal
// scales takes the width its data need at the height h (at most 60 % of
// the whole when it is not alone); the others share the rest equally.
func panelWidths(ps []*panel, w, h vg.Length) []vg.Length {
	out := make([]vg.Length, len(ps))
	if len(ps) == 1 {
		out[0] = w
		return out
	}
	rest, free := w, 0
	for i, p := range ps {
		if p.equal {
			out[i] = min(p.idealWidth(h), 0.6*w)
			rest -= out[i]
		} else {
			free++
		}
	}
	for i, p := range ps {
		if !p.equal {
			out[i] = rest / vg.Length(free)
		}
	}
	if free == 0 && rest > 0 {
		out[len(out)-1] += rest
	}
	return out
}

// panel is one plot with its legend in a strip beneath it.
type panel struct {
	p      *plot.Plot
	legend []legendItem
	// equal asks for one unit on x to be as long as one unit on y (the
	// chromaticity diagrams); the axis ranges then grow about their centre
	// to fill the space.
	equal bool
}

// legendItem is one entry of a legend strip: a thumbnail and its text.
type legendItem struct {
	text  string
	thumb plot.Thumbnailer
}

// Legend strip geometry, pt.
const (
	legendFont   = 9
	legendThumbW = 22
	legendGap    = 5
	legendColGap = 16
)

// legendLayout returns the number of columns and rows of the legend strip
// for the width w.
func legendLayout(items []legendItem, w vg.Length) (cols, rows int, colW vg.Length) {
	if len(items) == 0 {
		return 0, 0, 0
	}
	sty := plotText(legendFont)
	for _, it := range items {
		colW = max(colW, legendThumbW+legendGap+sty.Width(it.text)+legendColGap)
	}
	cols = max(1, min(len(items), int(w/colW)))
	rows = (len(items) + cols - 1) / cols
	return cols, rows, colW
}

// legendRowH is the height of one row of the legend strip, pt.
const legendRowH = legendFont * 1.5

// legendHeight returns the height of the legend strip at width w.
func legendHeight(items []legendItem, w vg.Length) vg.Length {
	_, rows, _ := legendLayout(items, w)
	if rows == 0 {
		return 0
	}
	return vg.Length(rows)*legendRowH + 4
}

// drawLegend draws the legend strip in c, row by row from the top left.
func drawLegend(c draw.Canvas, items []legendItem) {
	cols, _, colW := legendLayout(items, c.Max.X-c.Min.X)
	if cols == 0 {
		return
	}
	w := c.Max.X - c.Min.X
	colW = min(colW, w/vg.Length(cols))
	sty := plotText(legendFont)
	sty.YAlign = draw.YCenter
	for i, it := range items {
		col, row := i%cols, i/cols
		x := c.Min.X + vg.Length(col)*colW
		yTop := c.Max.Y - vg.Length(row)*legendRowH
		yMid := yTop - legendRowH/2
		icon := draw.Canvas{Canvas: c.Canvas, Rectangle: vg.Rectangle{
			Min: vg.Point{X: x, Y: yMid - legendFont/2},
			Max: vg.Point{X: x + legendThumbW, Y: yMid + legendFont/2},
		}}
		if it.thumb != nil {
			it.thumb.Thumbnail(&icon)
		}
		txt := fitText(sty, it.text, colW-legendThumbW-legendGap-4)
		c.FillText(sty, vg.Point{X: x + legendThumbW + legendGap, Y: yMid}, txt)
	}
}

// fitText shortens s with an ellipsis until it is at most w wide.
func fitText(sty text.Style, s string, w vg.Length) string {
	if sty.Width(s) <= w {
		return s
	}
	r := []rune(s)
	for len(r) > 1 {
		r = r[:len(r)-1]
		if t := string(r) + "…"; sty.Width(t) <= w {
			return t
		}
	}
	return string(r)
}

// The legend strip takes at most this share of a panel's height; entries
// beyond it are counted in a last entry instead.
const legendShare = 0.4

// split returns the canvas of the plot and of the legend strip within c,
// and the legend entries that fit there.
func (p *panel) split(c draw.Canvas) (plotC, legendC draw.Canvas, items []legendItem) {
	w, h := c.Max.X-c.Min.X, c.Max.Y-c.Min.Y
	items = p.legend
	for len(items) > 1 && legendHeight(items, w) > legendShare*h {
		// Drop entries until the rest and a note of how many are left out
		// fit.
		keep := len(items) - 2
		if keep < 1 {
			break
		}
		left := len(p.legend) - keep
		items = append(append([]legendItem(nil), p.legend[:keep]...), legendItem{text: fmt.Sprintf("… and %d more", left)})
	}
	lh := legendHeight(items, w)
	plotC, legendC = c, c
	legendC.Max.Y = c.Min.Y + lh
	if lh > 0 {
		plotC.Min.Y += lh + 6
	}
	return plotC, legendC, items
}

// draw draws the panel in c.
func (p *panel) draw(c draw.Canvas) {
	if t := p.p.Title.Text; t != "" && !strings.Contains(t, "\n") {
		p.p.Title.Text = wrapTitle(p.p.Title.TextStyle, t, c.Max.X-c.Min.X)
	}
	plotC, legendC, items := p.split(c)
	if p.equal {
		p.fitAspect(plotC)
	}
	p.p.Draw(plotC)
	drawLegend(legendC, items)
}

// fitAspect widens one axis range about its centre so that a unit has the
// same length on both axes in the canvas c. Tick labels change the
// padding, so it settles in a few rounds.
func (p *panel) fitAspect(c draw.Canvas) {
	for range 4 {
		dc := p.p.DataCanvas(c)
		w, h := float64(dc.Max.X-dc.Min.X), float64(dc.Max.Y-dc.Min.Y)
		xr, yr := p.p.X.Max-p.p.X.Min, p.p.Y.Max-p.p.Y.Min
		if !(w > 0 && h > 0 && xr > 0 && yr > 0) {
			return
		}
		sx, sy := w/xr, h/yr
		if math.Abs(sx-sy) <= 1e-9*sx {
			return
		}
		if sx > sy {
			grow(&p.p.X, w/sy)
		} else {
			grow(&p.p.Y, h/sx)
		}
	}
}

// grow sets the range of a to span about its centre.
func grow(a *plot.Axis, span float64) {
	mid := (a.Min + a.Max) / 2
	a.Min, a.Max = mid-span/2, mid+span/2
}

// idealWidth returns the width at which an equal-scale panel of height h
// needs no stretching of its axis ranges.
func (p *panel) idealWidth(h vg.Length) vg.Length {
	w := h
	for range 3 {
		c := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: w, Y: h}}}
		plotC, _, _ := p.split(c)
		dc := p.p.DataCanvas(plotC)
		pad := w - (dc.Max.X - dc.Min.X)
		xr, yr := p.p.X.Max-p.p.X.Min, p.p.Y.Max-p.p.Y.Min
		w = pad + (dc.Max.Y-dc.Min.Y)*vg.Length(xr/yr)
	}
	return w
}

// plotText returns the text style of the figures at size pt.
func plotText(size vg.Length) text.Style {
	return text.Style{
		Color:   color.Gray{Y: 0x20},
		Font:    font.From(plot.DefaultFont, size),
		Handler: plot.DefaultTextHandler,
	}
}

// newPlot returns a plot with the house style: small type, a faint grid.
func newPlot(title, xLabel, yLabel string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle = plotText(11)
	p.Title.TextStyle.XAlign, p.Title.TextStyle.YAlign = draw.XCenter, draw.YTop
	p.Title.Padding = 4
	p.X.Label.Text, p.Y.Label.Text = xLabel, yLabel
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle = plotText(10)
		a.Label.TextStyle.XAlign, a.Label.TextStyle.YAlign = draw.XCenter, draw.YBottom
		a.Label.Padding = 4
		a.Tick.Label = plotText(9)
		a.Color = color.Gray{Y: 0x40}
		a.Tick.Color = color.Gray{Y: 0x40}
	}
	p.X.Tick.Label.XAlign, p.X.Tick.Label.YAlign = draw.XCenter, draw.YTop
	p.Y.Tick.Label.XAlign, p.Y.Tick.Label.YAlign = draw.XRight, draw.YCenter
	g := plotter.NewGrid()
	g.Vertical = draw.LineStyle{Color: color.Gray{Y: 0xe8}, Width: 0.5}
	g.Horizontal = g.Vertical
	p.Add(g)
	return p
}

// linearTicks marks an axis at a round step chosen for about eight
// labelled marks, with unlabelled marks between.
type linearTicks struct{}

func (linearTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(hi > lo) || math.IsInf(hi-lo, 0) {
		return nil
	}
	raw := (hi - lo) / 8
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	step, minor := 10*mag, 5.0
	for _, m := range []struct{ f, minor float64 }{{1, 5}, {2, 4}, {2.5, 5}, {5, 5}} {
		if m.f*mag >= raw {
			step, minor = m.f*mag, m.minor
			break
		}
	}
	dec := max(0, -int(math.Floor(math.Log10(step)+1e-9)))
	if step/math.Pow(10, math.Floor(math.Log10(step)+1e-9)) == 2.5 {
		dec++
	}
	sub := step / minor
	var out []plot.Tick
	for k := math.Ceil(lo/sub - 1e-9); k*sub <= hi+1e-9*sub; k++ {
		v := k * sub
		t := plot.Tick{Value: v}
		if r := math.Round(k); int64(r)%int64(minor) == 0 {
			t.Label = strconv.FormatFloat(v, 'f', dec, 64)
			if strings.Trim(t.Label, "-0.") == "" {
				t.Label = strings.TrimPrefix(t.Label, "-")
			}
		}
		out = append(out, t)
	}
	return out
}

// The colours and dash patterns of spectra and points, in order of use.
var (
	plotPalette = []color.NRGBA{
		{0x1f, 0x4e, 0x8c, 0xff}, // deep blue
		{0xc2, 0x5b, 0x1b, 0xff}, // rust
		{0x2a, 0x8a, 0x5c, 0xff}, // green
		{0x8e, 0x2f, 0x7a, 0xff}, // plum
		{0x55, 0x55, 0x55, 0xff}, // graphite
		{0xb0, 0x8a, 0x00, 0xff}, // mustard
		{0x2b, 0x9c, 0xb3, 0xff}, // lagoon
		{0xa8, 0x32, 0x3e, 0xff}, // crimson
	}
	plotDashes = [][]vg.Length{nil, {6, 3}, {2, 2}, {8, 3, 2, 3}}
)

// seriesStyle returns the line style of the i-th spectrum.
func seriesStyle(i int) draw.LineStyle {
	return draw.LineStyle{
		Color:  plotPalette[i%len(plotPalette)],
		Width:  1.4,
		Dashes: plotDashes[(i/len(plotPalette))%len(plotDashes)],
	}
}

// lineThumb is a legend thumbnail showing a line style.
type lineThumb struct{ sty draw.LineStyle }

func (t lineThumb) Thumbnail(c *draw.Canvas) {
	y := (c.Min.Y + c.Max.Y) / 2
	c.StrokeLine2(t.sty, c.Min.X, y, c.Max.X, y)
}

// glyphThumb is a legend thumbnail showing a marker, with an outline.
type glyphThumb struct {
	fill, edge draw.GlyphStyle
}

func (t glyphThumb) Thumbnail(c *draw.Canvas) {
	pt := vg.Point{X: (c.Min.X + c.Max.X) / 2, Y: (c.Min.Y + c.Max.Y) / 2}
	c.DrawGlyphNoClip(t.fill, pt)
	c.DrawGlyphNoClip(t.edge, pt)
}

// areaThumb is a legend thumbnail showing a filled, outlined area.
type areaThumb struct {
	fill color.Color
	edge draw.LineStyle
}

func (t areaThumb) Thumbnail(c *draw.Canvas) {
	r := vg.Rectangle{Min: vg.Point{X: c.Min.X + 2, Y: c.Min.Y}, Max: vg.Point{X: c.Max.X - 2, Y: c.Max.Y}}
	pts := []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}}
	if t.fill != nil {
		c.FillPolygon(t.fill, pts)
	}
	c.StrokeLines(t.edge, append(pts, pts[0]))
}

// namedSpectrum is a spectrum with the name it is shown under.
type namedSpectrum struct {
	name string
	s    colorimetry.Spectrum
}

// curve is one line of a spectra chart.
type curve struct {
	name string
	s    colorimetry.Spectrum
	sty  draw.LineStyle
	// back draws the curve behind the others (sums, whites); the legend
	// keeps the order given.
	back bool
}

// spectraPanel returns a chart of the curves against wavelength, nm. For
// fractions (reflectance, transmittance) the y axis runs from 0 to at least
// 1.
func spectraPanel(title, yLabel string, curves []curve, fraction bool) (*panel, error) {
	p := newPlot(title, "wavelength (nm)", yLabel)
	p.X.Tick.Marker, p.Y.Tick.Marker = linearTicks{}, linearTicks{}
	p.X.Min, p.X.Max = math.Inf(1), math.Inf(-1)
	p.Y.Min, p.Y.Max = 0, 0
	if fraction {
		p.Y.Max = 1
	}
	var legend []legendItem
	order := make([]curve, 0, len(curves))
	for _, back := range []bool{true, false} {
		for _, cv := range curves {
			if cv.back == back {
				order = append(order, cv)
			}
		}
	}
	for _, cv := range curves {
		if cv.s.Len() > 0 {
			legend = append(legend, legendItem{text: cv.name, thumb: lineThumb{cv.sty}})
		}
	}
	for _, cv := range order {
		n := cv.s.Len()
		if n == 0 {
			continue
		}
		xy := make(plotter.XYs, n)
		g := cv.s.Grid()
		for i := range n {
			xy[i].X, xy[i].Y = g.Wavelength(i), cv.s.Value(i)
			if math.IsNaN(xy[i].Y) || math.IsInf(xy[i].Y, 0) {
				return nil, fmt.Errorf("spectrum %q: value %g at %g nm cannot be drawn", cv.name, xy[i].Y, xy[i].X)
			}
			p.Y.Min, p.Y.Max = min(p.Y.Min, xy[i].Y), max(p.Y.Max, xy[i].Y)
		}
		p.X.Min, p.X.Max = min(p.X.Min, g.Start), max(p.X.Max, g.End())
		l, err := plotter.NewLine(xy)
		if err != nil {
			return nil, fmt.Errorf("spectrum %q: %v", cv.name, err)
		}
		l.LineStyle = cv.sty
		p.Add(l)
	}
	if len(legend) == 0 {
		return nil, errors.New("no spectra to draw")
	}
	if p.X.Min == p.X.Max {
		p.X.Min, p.X.Max = p.X.Min-5, p.X.Max+5
	}
	if p.Y.Max == p.Y.Min {
		p.Y.Max = p.Y.Min + 1
	}
	p.Y.Max += 0.04 * (p.Y.Max - p.Y.Min)
	return &panel{p: p, legend: legend}, nil
}

// Legend texts of the quantities on the y axis of a spectra chart.
const (
	yReflectance   = "reflectance (fraction 0–1)"
	yTransmittance = "transmittance (fraction 0–1)"
)

// fractionLabel returns the y-axis label for reflectance or transmittance.
func fractionLabel(as string) string {
	if as == "transmittance" {
		return yTransmittance
	}
	return yReflectance
}

// writeFigure renders f at w×h pixels and writes it atomically to path.
func writeFigure(path, format string, f *figure, w, h int) error {
	data, err := f.render(format, w, h)
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	return writeFileAtomic(path, data)
}

// loadedSpectra is the spectra of a plot command, checked for its --as.
type loadedSpectra struct {
	ins    []spectrumIn
	values []colorimetry.Spectrum // fractions for objects, as read (extrapolating by zero) for lights
	warns  []string
}

// loadPlotSpectra reads the files, keeps the --column selection and
// turns reflectance or transmittance into fractions.
func loadPlotSpectra(e *env, files []string, columns, as, scale string) (loadedSpectra, error) {
	var out loadedSpectra
	for _, f := range files {
		list, err := readSpectra(e, f)
		if err != nil {
			return out, err
		}
		if list, err = selectColumns(list, columns, f); err != nil {
			return out, err
		}
		for _, in := range list {
			s := in.s
			if as == "light" {
				s = s.WithExtrap(colorimetry.ExtrapZero)
			} else {
				var warns []string
				s, _, _, warns, err = asFraction(in, scale, as)
				if err != nil {
					return out, err
				}
				for _, w := range warns {
					out.warns = append(out.warns, in.name+": "+w)
				}
			}
			out.ins = append(out.ins, in)
			out.values = append(out.values, s)
		}
	}
	if len(out.ins) == 0 {
		return out, usagef("the files hold no spectra to draw")
	}
	return out, nil
}

// legendNames returns the names to show: the spectrum's name, with its
// file's base name added where two spectra share a name.
func legendNames(ins []spectrumIn) []string {
	count := map[string]int{}
	for _, in := range ins {
		count[strings.ToLower(in.name)]++
	}
	out := make([]string, len(ins))
	for i, in := range ins {
		out[i] = in.name
		if count[strings.ToLower(in.name)] > 1 {
			out[i] = fmt.Sprintf("%s (%s)", in.name, filepath.Base(in.file))
		}
	}
	return out
}

// checkAs checks an --as value against the allowed words.
func checkAs(as string, allowed ...string) error {
	for _, a := range allowed {
		if as == a {
			return nil
		}
	}
	return usagef("--as %s: want %s", as, orList(allowed))
}

// plural returns "1 spectrum", "2 spectra" and the like.
func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

// orList joins words as "a, b or c".
func orList(w []string) string {
	if len(w) == 1 {
		return w[0]
	}
	return strings.Join(w[:len(w)-1], ", ") + " or " + w[len(w)-1]
}

// printWarnings prints warnings to standard error, one a line.
func printWarnings(e *env, cmd string, warns []string) {
	for _, w := range warns {
		fmt.Fprintf(e.stderr, "antipode %s: warning: %s\n", cmd, w)
	}
}

func runPlotSpectra(e *env, args []string) error {
	var o plotOpts
	var columns, as, scale, norm string
	fs := flag.NewFlagSet("plot spectra", flag.ContinueOnError)
	o.define(fs)
	fs.StringVar(&columns, "column", "", "only the spectra with these `NAMES` (comma-separated)")
	fs.StringVar(&as, "as", "reflectance", "what the spectra are: `light`, reflectance or transmittance")
	fs.StringVar(&scale, "scale", "", "reflectance or transmittance: `fraction` or percent (default: percent when the maximum exceeds 1.5)")
	fs.StringVar(&norm, "normalise", "each", "lights: scale so that each peak is 1 (`each`), the largest peak is 1 (all), or not at all (none)")
	files, err := parseFlags(plotSpectraCommand, fs, e, args)
	if err != nil {
		return err
	}
	if len(files) == 0 {
		return usagef("name at least one spectral file (or - for standard input)")
	}
	if err := checkAs(as, "light", "reflectance", "transmittance"); err != nil {
		return err
	}
	if scale != "" && scale != "fraction" && scale != "percent" {
		return usagef("--scale %s: want fraction or percent", scale)
	}
	if norm != "all" && norm != "each" && norm != "none" {
		return usagef("--normalise %s: want each, all or none", norm)
	}
	format, err := checkFigurePath("--out", o.out, files)
	if err != nil {
		return err
	}
	w, h, err := parseSize(o.size, spectraW, spectraH)
	if err != nil {
		return err
	}
	ls, err := loadPlotSpectra(e, files, columns, as, scale)
	if err != nil {
		return err
	}
	names := legendNames(ls.ins)
	curves := make([]curve, len(ls.values))
	yLabel := fractionLabel(as)
	if as == "light" {
		var peaks []float64
		if peaks, yLabel, err = lightPeaks(ls, norm); err != nil {
			return err
		}
		for i, s := range ls.values {
			ls.values[i] = s.Scale(1 / peaks[i])
		}
	}
	styles := spectrumStyles(ls.values, as == "light")
	for i, s := range ls.values {
		curves[i] = curve{name: names[i], s: s, sty: styles[i]}
	}
	pn, err := spectraPanel("", yLabel, curves, as != "light")
	if err != nil {
		return err
	}
	if err := writeFigure(o.out, format, &figure{title: o.title, panels: []*panel{pn}}, w, h); err != nil {
		return err
	}
	printWarnings(e, "plot", ls.warns)
	fmt.Fprintf(e.stdout, "wrote %s (%s)\n", o.out, plural(len(curves), "spectrum", "spectra"))
	return nil
}

// lightPeaks returns the divisor of each light for --normalise and the
// y-axis label that goes with it.
func lightPeaks(ls loadedSpectra, norm string) ([]float64, string, error) {
	peaks := make([]float64, len(ls.values))
	all := 0.0
	for i, s := range ls.values {
		p, _ := s.Max()
		if norm == "each" && !(p > 0) {
			return nil, "", fmt.Errorf("%s: no positive value to scale to 1 (--normalise each)", ls.ins[i].place())
		}
		peaks[i] = p
		all = max(all, p)
	}
	switch norm {
	case "each":
		return peaks, "relative spectral power (each peak = 1)", nil
	case "none":
		for i := range peaks {
			peaks[i] = 1
		}
		return peaks, "spectral power (units of the file)", nil
	}
	if !(all > 0) {
		return nil, "", errors.New("the lights have no positive value to scale to 1 (--normalise all)")
	}
	for i := range peaks {
		peaks[i] = all
	}
	return peaks, "relative spectral power (largest peak = 1)", nil
}

// The hooks below draw the result of another command for its --plot flag.
// Each returns nil at once when path is empty, and an error naming the
// flag or file otherwise; the figure is written whole or not at all.

// plotDescribe draws describe's chromaticities in the CIE 1931 x, y
// diagram: every row with x, y, the white (the illuminant for reflectance
// and transmittance, --white for lights) and the Planckian locus. files
// are describe's inputs, never overwritten.
func plotDescribe(path string, files []string, d *describer, rows []describeRow) error {
	if path == "" {
		return nil
	}
	format, err := checkFigurePath("--plot", path, append(append([]string(nil), files...), d.o.uncertainty))
	if err != nil {
		return err
	}
	obs := d.calc.obs
	ds := diagramSpec{space: "xy", obs: obs, planck: true}
	if d.o.as == "light" {
		ds.white, ds.whiteName = d.white, d.wname
	} else {
		if ds.white, err = lightXY(obs, d.calc.ill); err != nil {
			return fmt.Errorf("--illuminant %s: %v", d.illName, err)
		}
		ds.whiteName = d.illName
	}
	ds.hasWhite = true
	for _, r := range rows {
		if r.SmallX == nil || r.SmallY == nil {
			continue
		}
		pt := diagramPoint{name: r.Name, xy: colorimetry.XY{X: *r.SmallX, Y: *r.SmallY}}
		if r.SRGB != nil {
			pt.fill = hexColour(*r.SRGB)
		}
		ds.points = append(ds.points, pt)
	}
	what := "lights, white " + ds.whiteName
	if d.o.as != "light" {
		what = d.o.as + " under " + d.illName
	}
	ds.title = fmt.Sprintf("chromaticity x, y; %s observer; %s", obs.Name(), what)
	pn, err := ds.panel()
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	return writeFigure(path, format, &figure{panels: []*panel{pn}}, diagramW, diagramHXY)
}

// plotPair draws a pair check: the two spectra (with their sum and the
// fitted white for an additive pair, their product for a stack) beside the
// CIE 1931 x, y diagram with A, B, the white and the line through them.
// args are pair's positional arguments (FILE or FILE:NAME), never
// overwritten; a and b are the spectra as checked (fractions for objects).
func plotPair(path string, args []string, cond *complement.Conditions, m complement.Mode, r pairResult, a, b colorimetry.Spectrum) error {
	if path == "" {
		return nil
	}
	format, err := checkFigurePath("--plot", path, args)
	if err != nil {
		return err
	}
	ds, err := conditionsDiagram(cond, m, r.Illuminant)
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	for i, s := range []colorimetry.Spectrum{a, b} {
		pt, err := modePoint(cond, m, []string{r.A, r.B}[i], s)
		if err != nil {
			return fmt.Errorf("%s: %s: %v", path, []string{"A", "B"}[i], err)
		}
		ds.points = append(ds.points, pt)
	}
	sa, sb := pairStyles(ds.points[0], ds.points[1])
	var curves []curve
	var yLabel string
	switch m {
	case complement.Lights:
		sum, err := colorimetry.Add(a, b)
		if err != nil {
			return fmt.Errorf("--plot: A + B: %v", err)
		}
		peak, _ := sum.Max()
		if !(peak > 0) {
			return fmt.Errorf("--plot: A + B has no positive value to scale to 1")
		}
		curves = []curve{
			{name: r.A + " (A)", s: a.Scale(1 / peak), sty: sa},
			{name: r.B + " (B)", s: b.Scale(1 / peak), sty: sb},
			{name: "A + B", s: sum.Scale(1 / peak), sty: sumStyle, back: true},
		}
		if r.Scale != nil {
			if white, err := onGridOf(cond.Illuminant(), sum); err == nil {
				curves = append(curves, curve{name: fmt.Sprintf("white %s, scaled to fit A + B", r.Illuminant), s: white.Scale(*r.Scale / peak), sty: whiteStyle, back: true})
			}
		}
		yLabel = "relative spectral power (peak of A + B = 1)"
	case complement.Surfaces:
		sum, err := colorimetry.Add(a, b)
		if err != nil {
			return fmt.Errorf("--plot: A + B: %v", err)
		}
		curves = []curve{
			{name: r.A + " (A)", s: a, sty: sa},
			{name: r.B + " (B)", s: b, sty: sb},
			{name: "A + B (the perfect white is 1)", s: sum, sty: sumStyle, back: true},
		}
		yLabel = yReflectance
	default:
		stack, err := colorimetry.Mul(a, b)
		if err != nil {
			return fmt.Errorf("--plot: A × B: %v", err)
		}
		curves = []curve{
			{name: r.A + " (A)", s: a, sty: sa},
			{name: r.B + " (B)", s: b, sty: sb},
			{name: "stack A × B", s: stack, sty: sumStyle, back: true},
		}
		yLabel = yTransmittance
		if pt, err := modePoint(cond, m, "stack A × B", stack); err == nil {
			ds.points = append(ds.points, pt)
		}
	}
	sp, err := spectraPanel("spectra", yLabel, curves, m != complement.Lights)
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	ds.pair = []int{0, 1}
	ds.chord = m != complement.Filters
	ds.title = fmt.Sprintf("chromaticity, %s observer", r.Observer)
	dp, err := ds.panel()
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	title := fmt.Sprintf("%s and %s: %s pair, verdict %s", r.A, r.B, r.Mode, r.Verdict)
	return writeFigure(path, format, &figure{title: title, panels: []*panel{sp, dp}}, twoPanelW, twoPanelH)
}

// spectrumStyles returns the line style of each spectrum of a spectra
// chart: drawn in its own colour (a light's chromaticity; a reflectance's
// or transmittance's under D65 for the CIE 1931 observer), darkened to read
// on white, so that a red gel's curve is red; where that colour is close
// to one already used (two similar gels), dashed; where it cannot be
// computed, the palette's colour and dashes of its place instead.
func spectrumStyles(values []colorimetry.Spectrum, light bool) []draw.LineStyle {
	ill := colorimetry.Spectrum{}
	if !light {
		ill = cie.D65()
	}
	calc := newTristimulus(cie.CIE1931(), ill, light)
	out := make([]draw.LineStyle, len(values))
	var used []colorful.Color
	for i, s := range values {
		out[i] = seriesStyle(i)
		c, err := calc.xyzOnly(s)
		if err != nil {
			continue
		}
		xy, err := c.XY()
		if err != nil {
			continue
		}
		ink := inkColour(diagramPoint{xy: xy})
		near := 0 // curves already drawn in a colour like this one
		for _, u := range used {
			if ink.DistanceLab(u) < 0.2 {
				near++
			}
		}
		used = append(used, ink)
		out[i].Color, out[i].Dashes = ink, plotDashes[near%len(plotDashes)]
	}
	return out
}

// pairStyles returns the line styles of two spectra drawn with their
// points: each in its own colour, darkened to read on white; the palette's
// first two colours instead when the two would look alike.
func pairStyles(a, b diagramPoint) (draw.LineStyle, draw.LineStyle) {
	ca, cb := inkColour(a), inkColour(b)
	if ca.DistanceLab(cb) < 0.15 {
		return seriesStyle(0), seriesStyle(1)
	}
	sa, sb := seriesStyle(0), seriesStyle(1)
	sa.Color, sb.Color = ca, cb
	sa.Width, sb.Width = 1.6, 1.6
	return sa, sb
}

// inkColour returns the colour of a point darkened, where needed, to
// CIELAB L* 55 so that a line of it reads on white.
func inkColour(p diagramPoint) colorful.Color {
	fill := p.fill
	if fill == nil {
		fill = chromaticityColour(p.xy)
	}
	c, _ := colorful.MakeColor(fill)
	if l, a, b := c.Lab(); l > 0.55 {
		c = colorful.Lab(0.55, a, b).Clamped()
	}
	return c
}

// plotComplement draws complement's result: A, its complement (and for a
// light the scaled white they add up to) beside the CIE 1931 x, y diagram
// with A, the complement and the white. arg is complement's input and out
// its --out file; neither is overwritten.
func plotComplement(path, arg, out string, cond *complement.Conditions, m complement.Mode, r complementResult, a colorimetry.Spectrum, d complement.Derived) error {
	if path == "" {
		return nil
	}
	format, err := checkFigurePath("--plot", path, []string{arg, out})
	if err != nil {
		return err
	}
	if out != "" && filepath.Clean(out) == filepath.Clean(path) {
		return usagef("--plot %s is the --out file too", path)
	}
	cname := r.Name + " complement"
	ds, err := conditionsDiagram(cond, m, r.Illuminant)
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	for i, s := range []colorimetry.Spectrum{a, d.Spectrum} {
		pt, err := modePoint(cond, m, []string{r.Name, cname}[i], s)
		if err != nil {
			return fmt.Errorf("%s: %v", path, err)
		}
		ds.points = append(ds.points, pt)
	}
	sa, sc := pairStyles(ds.points[0], ds.points[1])
	var curves []curve
	var yLabel string
	if m == complement.Lights {
		white, err := onGridOf(cond.Illuminant(), a)
		if err != nil {
			return fmt.Errorf("--plot: %v", err)
		}
		white = white.Scale(d.Scale)
		peak, _ := white.Max()
		if !(peak > 0) {
			return errors.New("--plot: the scaled white has no positive value")
		}
		curves = []curve{
			{name: r.Name + " (A)", s: a.Scale(1 / peak), sty: sa},
			{name: cname, s: d.Spectrum.Scale(1 / peak), sty: sc},
			{name: fmt.Sprintf("white %s × %.4g = A + complement", r.Illuminant, d.Scale), s: white.Scale(1 / peak), sty: whiteStyle, back: true},
		}
		yLabel = "relative spectral power (peak of the white = 1)"
	} else {
		curves = []curve{
			{name: r.Name + " (A)", s: a, sty: sa},
			{name: cname + " (1 − A)", s: d.Spectrum, sty: sc},
		}
		yLabel = yReflectance
	}
	sp, err := spectraPanel("spectra", yLabel, curves, m != complement.Lights)
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	ds.pair, ds.chord = []int{0, 1}, true
	ds.title = fmt.Sprintf("chromaticity, %s observer", r.Observer)
	dp, err := ds.panel()
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	title := fmt.Sprintf("%s and its complement (%s), white %s", r.Name, r.As, r.Illuminant)
	return writeFigure(path, format, &figure{title: title, panels: []*panel{sp, dp}}, twoPanelW, twoPanelH)
}

// solvePlot is what a solve draws for --plot FILE: the spectra the recipes
// make beside their chromaticities. Fill it in a family's solve command and
// pass it to plotSolve.
type solvePlot struct {
	// As says what the spectra are: "light", "reflectance" or
	// "transmittance" (fractions 0–1).
	As string
	// Observer is the solve's observer (nil: CIE 1931).
	Observer *colorimetry.Observer
	// Illuminant is the illuminant reflectance and transmittance are seen
	// under; for lights the white marked on the diagram (zero: none).
	// IllName is its name.
	Illuminant colorimetry.Spectrum
	IllName    string
	// Target is the target spectrum, when the target was given as one.
	Target *namedSpectrum
	// TargetXY is the target chromaticity (x, y for the solve's
	// observer) when it was given without a spectrum.
	TargetXY *colorimetry.XY
	// Recipes are the spectra the recipes make, best first, named as the
	// output names them (e.g. "recipe 1").
	Recipes []namedSpectrum
	// Channels are, for lights, the channels at full drive: their
	// chromaticities bound the mixing gamut drawn on the diagram.
	Channels []namedSpectrum
	// Inputs are the files the figure must not replace (the model, the
	// target …).
	Inputs []string
}

// plotSolve draws a solve's recipes: their spectra with the target's, and
// the CIE 1931 x, y diagram with the target, the recipes, the white and,
// for lights, the mixing gamut of the channels.
func plotSolve(path string, sv solvePlot) error {
	if path == "" {
		return nil
	}
	format, err := checkFigurePath("--plot", path, sv.Inputs)
	if err != nil {
		return err
	}
	if err := checkAs(sv.As, "light", "reflectance", "transmittance"); err != nil {
		return fmt.Errorf("--plot: %v", err)
	}
	if len(sv.Recipes) == 0 {
		return errors.New("--plot: no recipe to draw")
	}
	obs := sv.Observer
	if obs == nil {
		if obs, err = observerFlag("1931"); err != nil {
			return err
		}
	}
	light := sv.As == "light"
	var curves []curve
	scale := 1.0
	if light {
		peak := 0.0
		for _, r := range sv.Recipes {
			p, _ := r.s.Max()
			peak = max(peak, p)
		}
		if sv.Target != nil {
			p, _ := sv.Target.s.Max()
			peak = max(peak, p)
		}
		if !(peak > 0) {
			return errors.New("--plot: the recipes give no light")
		}
		scale = 1 / peak
	}
	if sv.Target != nil {
		curves = append(curves, curve{name: sv.Target.name + " (target)", s: sv.Target.s.Scale(scale), sty: targetStyle})
	}
	for i, r := range sv.Recipes {
		curves = append(curves, curve{name: r.name, s: r.s.Scale(scale), sty: seriesStyle(i)})
	}
	yLabel := fractionLabel(sv.As)
	if light {
		yLabel = "relative spectral power (largest peak = 1)"
	}
	sp, err := spectraPanel("spectra", yLabel, curves, !light)
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	ds := diagramSpec{space: "xy", obs: obs, planck: true, title: fmt.Sprintf("chromaticity, %s observer", obs.Name())}
	calc := newTristimulus(obs, sv.Illuminant, light)
	if !sv.Illuminant.IsZero() {
		if ds.white, err = lightXY(obs, sv.Illuminant); err != nil {
			return fmt.Errorf("--plot: illuminant %s: %v", sv.IllName, err)
		}
		ds.hasWhite, ds.whiteName = true, sv.IllName
	} else if !light {
		return errors.New("--plot: reflectance and transmittance need the illuminant")
	}
	point := func(name string, s colorimetry.Spectrum) (diagramPoint, error) {
		w, _, err := calc.weights(s)
		if err != nil {
			return diagramPoint{}, fmt.Errorf("%s: %v", name, err)
		}
		c, err := w.XYZ(s)
		if err != nil {
			return diagramPoint{}, fmt.Errorf("%s: %v", name, err)
		}
		xy, err := c.XY()
		if err != nil {
			return diagramPoint{}, fmt.Errorf("%s: no chromaticity (black)", name)
		}
		pt := diagramPoint{name: name, xy: xy}
		if !light {
			if hex, _, err := srgbSwatch(c, w.White()); err == nil {
				pt.fill = hexColour(hex)
			}
		}
		return pt, nil
	}
	switch {
	case sv.Target != nil:
		pt, err := point(sv.Target.name+" (target)", sv.Target.s)
		if err != nil {
			return fmt.Errorf("--plot: %v", err)
		}
		pt.target = true
		ds.points = append(ds.points, pt)
	case sv.TargetXY != nil:
		ds.points = append(ds.points, diagramPoint{name: "target", xy: *sv.TargetXY, target: true})
	}
	for _, r := range sv.Recipes {
		pt, err := point(r.name, r.s)
		if err != nil {
			return fmt.Errorf("--plot: %v", err)
		}
		ds.points = append(ds.points, pt)
	}
	for _, ch := range sv.Channels {
		pt, err := point(ch.name, ch.s)
		if err != nil {
			return fmt.Errorf("--plot: channel %v", err)
		}
		ds.gamut = append(ds.gamut, pt)
	}
	dp, err := ds.panel()
	if err != nil {
		return fmt.Errorf("%s: %v", path, err)
	}
	return writeFigure(path, format, &figure{title: "solve: recipes and target", panels: []*panel{sp, dp}}, twoPanelW, twoPanelH)
}

// Line styles of the derived curves of the pair, complement and solve
// figures.
var (
	sumStyle    = draw.LineStyle{Color: color.Gray{Y: 0xa8}, Width: 3}
	whiteStyle  = draw.LineStyle{Color: color.Gray{Y: 0x80}, Width: 1.2, Dashes: []vg.Length{2, 2}}
	targetStyle = draw.LineStyle{Color: color.Gray{Y: 0x10}, Width: 2.2}
)

// onGridOf returns s resampled onto the grid of like.
func onGridOf(s, like colorimetry.Spectrum) (colorimetry.Spectrum, error) {
	return s.Resample(like.Grid())
}

// lightXY returns the chromaticity of a light (or illuminant).
func lightXY(obs *colorimetry.Observer, s colorimetry.Spectrum) (colorimetry.XY, error) {
	c, err := newTristimulus(obs, colorimetry.Spectrum{}, true).xyzOnly(s.WithExtrap(colorimetry.ExtrapZero))
	if err != nil {
		return colorimetry.XY{}, err
	}
	return c.XY()
}

// conditionsDiagram returns a CIE 1931 x, y diagram with the white of the
// complement conditions for mode m.
func conditionsDiagram(cond *complement.Conditions, m complement.Mode, illName string) (diagramSpec, error) {
	ds := diagramSpec{space: "xy", obs: cond.Observer(), planck: true, hasWhite: true, whiteName: illName}
	w, err := cond.White(m).XY()
	if err != nil {
		return ds, fmt.Errorf("white %s: %v", illName, err)
	}
	ds.white = w
	return ds, nil
}

// modePoint returns the diagram point of s under the conditions, filled
// with its sRGB swatch for objects.
func modePoint(cond *complement.Conditions, m complement.Mode, name string, s colorimetry.Spectrum) (diagramPoint, error) {
	c, err := cond.XYZ(s, m)
	if err != nil {
		return diagramPoint{}, err
	}
	xy, err := c.XY()
	if err != nil {
		return diagramPoint{}, fmt.Errorf("%s has no chromaticity (black)", name)
	}
	pt := diagramPoint{name: name, xy: xy}
	if m != complement.Lights {
		if hex, _, err := srgbSwatch(c, cond.White(m)); err == nil {
			pt.fill = hexColour(hex)
		}
	}
	return pt, nil
}

// hexColour parses "#rrggbb"; nil when it is not one.
func hexColour(s string) color.Color {
	c, ok := parseHex(s)
	if !ok {
		return nil
	}
	return c
}

// parseHex parses "#rrggbb" into an opaque colour.
func parseHex(s string) (color.NRGBA, bool) {
	if len(s) != 7 || s[0] != '#' {
		return color.NRGBA{}, false
	}
	v, err := strconv.ParseUint(s[1:], 16, 32)
	if err != nil {
		return color.NRGBA{}, false
	}
	return color.NRGBA{R: uint8(v >> 16), G: uint8(v >> 8), B: uint8(v), A: 0xff}, true
}
