package main

// Swatch strips: each object colour as an sRGB square, named, with colours
// outside the sRGB gamut marked by a hatched corner.

import (
	"flag"
	"fmt"
	"image/color"
	"strings"

	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// swatch is one colour of a strip.
type swatch struct {
	name    string
	hex     string
	rgb     color.NRGBA
	inGamut bool
}

// Swatch strip geometry. Sizes in pixels are at 96 per inch; everything
// else is in pt.
const (
	swatchSidePx  = 120 // default side of a swatch
	swatchColsMax = 8   // default swatches to a row
	swatchMinSide = 12  // smallest side, pt
	swatchGap     = 12  // between swatches, pt
	swatchNameFt  = 9
	swatchHexFt   = 8
	swatchTextH   = 26 // under each swatch: name and hex code
	swatchNoteGap = 6  // above the caption
)

// swatchGrid is the layout of a strip.
type swatchGrid struct {
	cols, rows int
	side       vg.Length
}

// layoutSwatches chooses the number of columns that gives n swatches the
// largest side in an area of w×h pt, noteH of it taken by the caption.
func layoutSwatches(n int, w, h, noteH vg.Length) (swatchGrid, bool) {
	var best swatchGrid
	for cols := 1; cols <= n; cols++ {
		rows := (n + cols - 1) / cols
		sw := (w - vg.Length(cols-1)*swatchGap) / vg.Length(cols)
		sh := (h - noteH - vg.Length(rows)*swatchTextH - vg.Length(rows-1)*swatchGap) / vg.Length(rows)
		// Of equal sides the fewest columns: rows as even as they come.
		if s := min(sw, sh); s > best.side+0.01 {
			best = swatchGrid{cols: cols, rows: rows, side: s}
		}
	}
	return best, best.side >= swatchMinSide
}

// cell returns the square of the i-th swatch in c, row by row from the
// top left.
func (g swatchGrid) cell(c draw.Canvas, i int) vg.Rectangle {
	col, row := i%g.cols, i/g.cols
	x := c.Min.X + vg.Length(col)*(g.side+swatchGap)
	top := c.Max.Y - vg.Length(row)*(g.side+swatchTextH+swatchGap)
	return vg.Rectangle{Min: vg.Point{X: x, Y: top - g.side}, Max: vg.Point{X: x + g.side, Y: top}}
}

// defaultSwatchSize returns the size in pixels of a strip of n swatches of
// the default side, at most eight to a row, with the caption note.
func defaultSwatchSize(n int, title, note string) (int, int) {
	rows := (n + swatchColsMax - 1) / swatchColsMax
	cols := (n + rows - 1) / rows // rows as even as they come
	const pt = 4.0 / 3            // pixels per pt
	w := float64(cols*swatchSidePx) + pt*(float64(cols-1)*swatchGap+2*plotMarginPt)
	w = max(w, 360) // room for the caption
	noteH := captionHeight(note, vg.Length(w/pt-2*plotMarginPt))
	h := float64(rows*swatchSidePx) + pt*(float64(rows)*swatchTextH+float64(rows-1)*swatchGap+float64(noteH)+2*plotMarginPt)
	if title != "" {
		h += pt * 18
	}
	return int(w + 1), int(h + 1)
}

// swatchNote returns the caption of a strip: how the colours were made,
// and what the hatched corner means when a swatch has one.
func swatchNote(how string, sw []swatch) string {
	for _, s := range sw {
		if !s.inGamut {
			return how + ". Hatched corner: outside the sRGB gamut, shown clipped."
		}
	}
	return how + "."
}

// Caption type size and line height, pt.
const (
	captionFont  = 8
	captionLineH = captionFont * 1.35
)

// captionHeight returns the height of the caption note wrapped to width w.
func captionHeight(note string, w vg.Length) vg.Length {
	return vg.Length(len(wrapText(plotText(captionFont), note, w)))*captionLineH + swatchNoteGap
}

// wrapText breaks s into lines at most w wide, at spaces.
func wrapText(sty text.Style, s string, w vg.Length) []string {
	var lines []string
	line := ""
	for _, word := range strings.Fields(s) {
		try := word
		if line != "" {
			try = line + " " + word
		}
		if line != "" && sty.Width(try) > w {
			lines = append(lines, line)
			line = word
			continue
		}
		line = try
	}
	if line != "" {
		lines = append(lines, line)
	}
	return lines
}

// swatchFigure returns the figure of a strip; note is the caption under it.
func swatchFigure(title, note string, sw []swatch) *figure {
	return &figure{title: title, paint: func(c draw.Canvas) {
		w := c.Max.X - c.Min.X
		g, _ := layoutSwatches(len(sw), w, c.Max.Y-c.Min.Y, captionHeight(note, w))
		if g.cols == 0 {
			return
		}
		for i, s := range sw {
			r := g.cell(c, i)
			sq := []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}}
			c.FillPolygon(s.rgb, sq)
			c.StrokeLines(draw.LineStyle{Color: color.Gray{Y: 0xb0}, Width: 0.5}, append(sq, sq[0]))
			if !s.inGamut {
				hatchCorner(&c, r)
			}
			name := plotText(swatchNameFt)
			name.Color = color.Black
			name.YAlign = draw.YTop
			c.FillText(name, vg.Point{X: r.Min.X, Y: r.Min.Y - 3}, fitText(name, s.name, g.side))
			hex := plotText(swatchHexFt)
			hex.Color = color.Gray{Y: 0x50}
			hex.YAlign = draw.YTop
			code := s.hex
			if !s.inGamut {
				code += " (clipped)"
			}
			c.FillText(hex, vg.Point{X: r.Min.X, Y: r.Min.Y - 4 - swatchNameFt*1.2}, fitText(hex, code, g.side))
		}
		sty := plotText(captionFont)
		sty.YAlign = draw.YBottom
		lines := wrapText(sty, note, w)
		for k, ln := range lines {
			y := c.Min.Y + vg.Length(len(lines)-1-k)*captionLineH
			c.FillText(sty, vg.Point{X: c.Min.X, Y: y}, ln)
		}
	}}
}

// hatchCorner marks the top right corner of the swatch r with a hatched
// triangle.
func hatchCorner(c *draw.Canvas, r vg.Rectangle) {
	a := max(8, (r.Max.X-r.Min.X)*0.28)
	tr := r.Max
	tri := []vg.Point{tr, {X: tr.X - a, Y: tr.Y}, {X: tr.X, Y: tr.Y - a}}
	c.FillPolygon(color.White, tri)
	ink := draw.LineStyle{Color: color.Black, Width: 1}
	for t := vg.Length(3.5); t < a; t += 3.5 {
		c.StrokeLine2(ink, tr.X-t, tr.Y, tr.X, tr.Y-t)
	}
	c.StrokeLines(ink, append(tri, tri[0]))
}

func runPlotSwatches(e *env, args []string) error {
	var o plotOpts
	var columns, as, scale, illum, observer string
	fs := flag.NewFlagSet("plot swatches", flag.ContinueOnError)
	o.define(fs)
	fs.StringVar(&columns, "column", "", "only the spectra with these `NAMES` (comma-separated)")
	fs.StringVar(&as, "as", "reflectance", "what the spectra are: `reflectance` or transmittance")
	fs.StringVar(&scale, "scale", "", "`fraction` or percent (default: percent when the maximum exceeds 1.5)")
	fs.StringVar(&illum, "illuminant", "D65", "the illuminant the colours are seen under: a CIE `NAME` or a FILE")
	fs.StringVar(&observer, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	files, err := parseFlags(plotSwatchesCommand, fs, e, args)
	if err != nil {
		return err
	}
	if len(files) == 0 {
		return usagef("name at least one spectral file (or - for standard input)")
	}
	if err := checkAs(as, "reflectance", "transmittance"); err != nil {
		return err
	}
	if scale != "" && scale != "fraction" && scale != "percent" {
		return usagef("--scale %s: want fraction or percent", scale)
	}
	format, err := checkFigurePath("--out", o.out, append(append([]string(nil), files...), illum))
	if err != nil {
		return err
	}
	obs, err := observerFlag(observer)
	if err != nil {
		return err
	}
	ill, illName, err := illuminantFlag(e, "--illuminant", illum)
	if err != nil {
		return err
	}
	ls, err := loadPlotSpectra(e, files, columns, as, scale)
	if err != nil {
		return err
	}
	calc := newTristimulus(obs, ill, false)
	names := legendNames(ls.ins)
	sw := make([]swatch, len(ls.values))
	outside := 0
	for i, s := range ls.values {
		in := ls.ins[i]
		wt, _, err := calc.weights(s)
		if err != nil {
			return fmt.Errorf("%s: %v", in.place(), err)
		}
		c, err := wt.XYZ(s)
		if err != nil {
			return fmt.Errorf("%s: %v", in.place(), err)
		}
		hex, inGamut, err := srgbSwatch(c, wt.White())
		if err != nil {
			return fmt.Errorf("%s: %v", in.place(), err)
		}
		rgb, ok := parseHex(hex)
		if !ok {
			return fmt.Errorf("%s: swatch %q is not a colour", in.place(), hex)
		}
		sw[i] = swatch{name: names[i], hex: hex, rgb: rgb, inGamut: inGamut}
		if !inGamut {
			outside++
		}
	}
	note := swatchNote(fmt.Sprintf("sRGB (IEC 61966-2-1) of each colour under %s, %s observer, adapted to the sRGB white by Bradford", illName, obs.Name()), sw)
	dw, dh := defaultSwatchSize(len(sw), o.title, note)
	w, h, err := parseSize(o.size, dw, dh)
	if err != nil {
		return err
	}
	f := swatchFigure(o.title, note, sw)
	if o.size != "" {
		body := figureBody(vg.Rectangle{Max: vg.Point{X: vg.Length(w) * 0.75, Y: vg.Length(h) * 0.75}}, o.title)
		bw := body.Max.X - body.Min.X
		if _, ok := layoutSwatches(len(sw), bw, body.Max.Y-body.Min.Y, captionHeight(note, bw)); !ok {
			return usagef("--size %s: too small for %d swatches", o.size, len(sw))
		}
	}
	if err := writeFigure(o.out, format, f, w, h); err != nil {
		return err
	}
	printWarnings(e, "plot", ls.warns)
	fmt.Fprintf(e.stdout, "wrote %s (%s, %d outside the sRGB gamut)\n", o.out, plural(len(sw), "swatch", "swatches"), outside)
	return nil
}
