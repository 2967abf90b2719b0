package main

// Chromaticity diagrams: CIE 1931 x, y and CIE 1976 u′, v′, drawn with
// equal scales on both axes.

import (
	"errors"
	"flag"
	"fmt"
	"image/color"
	"math"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
	"github.com/lucasb-eyer/go-colorful"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// diagramPoint is one chromaticity drawn on a diagram.
type diagramPoint struct {
	name string
	xy   colorimetry.XY // x, y for the diagram's observer
	// fill is the marker's colour; nil gives the display colour of the
	// chromaticity itself.
	fill color.Color
	// target draws the point as a target (a ring with a centre dot).
	target bool
}

// diagramSpec says what a chromaticity diagram shows.
type diagramSpec struct {
	space string // "xy" (CIE 1931) or "uv" (CIE 1976 UCS)
	obs   *colorimetry.Observer
	// planck draws the Planckian locus with isotherm marks.
	planck bool
	// hasWhite marks the white point white, named whiteName.
	hasWhite  bool
	white     colorimetry.XY
	whiteName string
	points    []diagramPoint
	// pair holds two indices into points to join, or nil.
	pair []int
	// chord draws the line from the pair's first point through the white
	// to the spectrum locus.
	chord bool
	// gamut are the corners of a mixing gamut: their convex hull is drawn.
	gamut []diagramPoint
	// boundary is a closed curve of x, y chromaticities (the
	// object-colour limit), named boundaryName.
	boundary     []colorimetry.XY
	boundaryName string
	title        string
}

// Wavelengths and temperatures marked on the diagrams.
var (
	// isotherms are the correlated colour temperatures marked on the
	// Planckian locus, K.
	isotherms = []float64{2000, 2500, 3000, 4000, 5000, 6500, 10000}
	// locusMarkStep is the step of the wavelength marks on the spectrum
	// locus, nm; labels are dropped where they would collide.
	locusMarkStep = 10.0
)

// Sizes on the diagram, pt.
const (
	locusTick    = 5   // length of a wavelength mark
	isothermHalf = 6   // half-length of an isotherm mark
	markerR      = 4   // radius of a point's marker
	labelFont    = 8.5 // labels of points, marks and the white
	labelPad     = 1.5 // clearance kept around labels
)

// Diagram colours and line styles.
var (
	locusStyle    = draw.LineStyle{Color: color.Gray{Y: 0x1a}, Width: 1.3}
	purpleStyle   = draw.LineStyle{Color: color.Gray{Y: 0x1a}, Width: 1.1, Dashes: []vg.Length{5, 3}}
	tickStyle     = draw.LineStyle{Color: color.Gray{Y: 0x1a}, Width: 0.8}
	planckColour  = color.NRGBA{R: 0x8a, G: 0x4b, B: 0x08, A: 0xff}
	planckStyle   = draw.LineStyle{Color: planckColour, Width: 1.1}
	isoStyle      = draw.LineStyle{Color: planckColour, Width: 0.9}
	pairColour    = color.NRGBA{R: 0x17, G: 0x6e, B: 0x6a, A: 0xff}
	pairStyle     = draw.LineStyle{Color: pairColour, Width: 1.4}
	chordStyle    = draw.LineStyle{Color: pairColour, Width: 0.9, Dashes: []vg.Length{4, 3}}
	gamutFill     = color.NRGBA{R: 0x30, G: 0x30, B: 0x50, A: 0x22}
	gamutStyle    = draw.LineStyle{Color: color.NRGBA{R: 0x30, G: 0x30, B: 0x50, A: 0xff}, Width: 1}
	boundaryStyle = draw.LineStyle{Color: color.NRGBA{R: 0x5f, G: 0x6e, B: 0x12, A: 0xff}, Width: 1.1, Dashes: []vg.Length{1.5, 2}}
	edgeStyle     = draw.LineStyle{Color: color.Gray{Y: 0x10}, Width: 0.8}
	whiteRing     = draw.GlyphStyle{Color: color.Black, Radius: 5, Shape: draw.CircleGlyph{}}
)

// coord returns the diagram coordinates of an x, y chromaticity (of the
// diagram's observer): x, y itself, or u′, v′.
func (d *diagramSpec) coord(p colorimetry.XY) (float64, float64) {
	if d.space == "uv" {
		q := p.UVPrime()
		return q.U, q.V
	}
	return p.X, p.Y
}

// panel builds the diagram.
func (d *diagramSpec) panel() (*panel, error) {
	if d.obs == nil {
		return nil, errors.New("diagram: no observer")
	}
	locus, err := colorimetry.NewSpectrumLocus(d.obs)
	if err != nil {
		return nil, err
	}
	l := &diagramLayer{d: d}
	lo, hi := locus.Range()
	for nm := lo; nm < hi; nm++ {
		p, err := locus.At(nm)
		if err != nil {
			return nil, err
		}
		l.locus = append(l.locus, p)
		l.locusNM = append(l.locusNM, nm)
	}
	end, err := locus.At(hi)
	if err != nil {
		return nil, err
	}
	l.locus, l.locusNM = append(l.locus, end), append(l.locusNM, hi)
	for nm := math.Ceil(lo/locusMarkStep) * locusMarkStep; nm <= hi; nm += locusMarkStep {
		l.marks = append(l.marks, nm)
	}
	if d.planck {
		t, err := colorimetry.NewPlanckianTable(d.obs, colorimetry.C2)
		if err != nil {
			return nil, err
		}
		l.table = t
		const n = 240
		for i := range n + 1 {
			k := colorimetry.CCTMin * math.Pow(colorimetry.CCTMax/colorimetry.CCTMin, float64(i)/n)
			uv, err := t.UV(k, 0)
			if err != nil {
				return nil, err
			}
			l.planck = append(l.planck, uv.UVPrime().XY())
		}
	}
	for _, pt := range append(append([]diagramPoint(nil), d.points...), d.gamut...) {
		if !finiteXY(pt.xy) {
			return nil, fmt.Errorf("%s: chromaticity (%g, %g) cannot be drawn", pt.name, pt.xy.X, pt.xy.Y)
		}
	}
	if d.hasWhite && !finiteXY(d.white) {
		return nil, fmt.Errorf("white %s: chromaticity cannot be drawn", d.whiteName)
	}
	if d.pair != nil && (len(d.pair) != 2 || d.pair[0] < 0 || d.pair[1] < 0 || d.pair[0] >= len(d.points) || d.pair[1] >= len(d.points)) {
		return nil, errors.New("diagram: the pair must name two of the points")
	}
	l.hull = convexHull(d.gamut, d)

	// The 10° observer's coordinates carry the subscript 10 (CIE 015).
	sub := ""
	if strings.Contains(d.obs.Name(), "10°") {
		sub = "₁₀"
	}
	var xl, yl string
	var x0, x1, y0, y1 float64
	if d.space == "uv" {
		xl, yl = "u′"+sub+" (CIE 1976 UCS)", "v′"+sub+" (CIE 1976 UCS)"
		x0, x1, y0, y1 = -0.04, 0.65, -0.02, 0.62
	} else {
		xl, yl = "x"+sub, "y"+sub
		x0, x1, y0, y1 = -0.05, 0.8, -0.02, 0.9
	}
	p := newPlot(d.title, xl, yl)
	// Room for whatever lies outside the usual frame (imaginary colours,
	// a white far off): the frame grows to hold it with a margin.
	var extra []colorimetry.XY
	for _, pt := range d.points {
		extra = append(extra, pt.xy)
	}
	for _, pt := range d.gamut {
		extra = append(extra, pt.xy)
	}
	extra = append(extra, d.boundary...)
	if d.hasWhite {
		extra = append(extra, d.white)
	}
	for _, q := range extra {
		a, b := d.coord(q)
		x0, x1 = min(x0, a-0.03), max(x1, a+0.03)
		y0, y1 = min(y0, b-0.03), max(y1, b+0.03)
	}
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = x0, x1, y0, y1
	p.X.Tick.Marker = chromaTicks{}
	p.Y.Tick.Marker = chromaTicks{}
	p.Add(l)

	legend := []legendItem{
		{text: "spectrum locus (marks: nm)", thumb: lineThumb{locusStyle}},
		{text: "purple line", thumb: lineThumb{purpleStyle}},
	}
	if d.planck {
		legend = append(legend, legendItem{text: "Planckian locus (marks: K)", thumb: lineThumb{planckStyle}})
	}
	if d.hasWhite {
		legend = append(legend, legendItem{text: "white point " + d.whiteName, thumb: whiteThumb{}})
	}
	if len(d.boundary) > 2 {
		legend = append(legend, legendItem{text: d.boundaryName, thumb: lineThumb{boundaryStyle}})
	}
	if len(l.hull) > 2 {
		legend = append(legend, legendItem{text: "mixing gamut", thumb: areaThumb{fill: gamutFill, edge: gamutStyle}})
	}
	if len(l.corners()) > 0 {
		legend = append(legend, legendItem{text: "gamut corners (named)", thumb: glyphThumb{
			fill: draw.GlyphStyle{Color: color.Gray{Y: 0xa0}, Radius: markerR + 0.5, Shape: draw.PyramidGlyph{}},
			edge: draw.GlyphStyle{Color: edgeStyle.Color, Radius: markerR + 0.5, Shape: triangleOutline{}},
		}})
	}
	if d.pair != nil {
		a, b := d.points[d.pair[0]].name, d.points[d.pair[1]].name
		legend = append(legend, legendItem{text: fmt.Sprintf("pair %s – %s", a, b), thumb: lineThumb{pairStyle}})
		if d.chord && d.hasWhite {
			legend = append(legend, legendItem{text: fmt.Sprintf("line from %s through the white", a), thumb: lineThumb{chordStyle}})
		}
	}
	if len(d.points) > 0 {
		legend = append(legend, legendItem{text: "chromaticities (named)", thumb: glyphThumb{
			fill: draw.GlyphStyle{Color: color.Gray{Y: 0xa0}, Radius: markerR, Shape: draw.CircleGlyph{}},
			edge: draw.GlyphStyle{Color: edgeStyle.Color, Radius: markerR, Shape: draw.RingGlyph{}},
		}})
	}
	return &panel{p: p, legend: legend, equal: true}, nil
}

// finiteXY reports whether both coordinates are finite.
func finiteXY(p colorimetry.XY) bool {
	return !math.IsNaN(p.X) && !math.IsInf(p.X, 0) && !math.IsNaN(p.Y) && !math.IsInf(p.Y, 0)
}

// whiteThumb is the legend thumbnail of the white point.
type whiteThumb struct{}

func (whiteThumb) Thumbnail(c *draw.Canvas) {
	drawWhite(c, vg.Point{X: (c.Min.X + c.Max.X) / 2, Y: (c.Min.Y + c.Max.Y) / 2})
}

// drawWhite draws the white-point marker: a ring with a cross inside.
func drawWhite(c *draw.Canvas, pt vg.Point) {
	c.DrawGlyphNoClip(draw.GlyphStyle{Color: color.Black, Radius: whiteRing.Radius, Shape: draw.RingGlyph{}}, pt)
	c.DrawGlyphNoClip(draw.GlyphStyle{Color: color.Black, Radius: whiteRing.Radius * 0.7, Shape: draw.CrossGlyph{}}, pt)
}

// chromaTicks marks chromaticity axes every 0.1, labelled, with unlabelled
// marks between.
type chromaTicks struct{}

func (chromaTicks) Ticks(lo, hi float64) []plot.Tick {
	var out []plot.Tick
	for k := math.Ceil(lo/0.05 - 1e-9); k*0.05 <= hi+1e-9; k++ {
		v := k * 0.05
		t := plot.Tick{Value: v}
		if int(math.Round(k))%2 == 0 {
			t.Label = fmt.Sprintf("%.1f", v)
			if t.Label == "-0.0" {
				t.Label = "0.0"
			}
		}
		out = append(out, t)
	}
	return out
}

// diagramLayer draws the diagram's contents in the data area.
type diagramLayer struct {
	d       *diagramSpec
	locus   []colorimetry.XY // spectrum locus, lo to hi
	locusNM []float64
	marks   []float64                   // wavelengths marked, nm
	table   *colorimetry.PlanckianTable // nil: no Planckian locus
	planck  []colorimetry.XY
	hull    []diagramPoint // gamut polygon, counter-clockwise
}

// Plot implements plot.Plotter.
func (l *diagramLayer) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	d := l.d
	at := func(q colorimetry.XY) vg.Point {
		a, b := d.coord(q)
		return vg.Point{X: tx(a), Y: ty(b)}
	}
	path := func(qs []colorimetry.XY) []vg.Point {
		out := make([]vg.Point, len(qs))
		for i, q := range qs {
			out[i] = at(q)
		}
		return out
	}
	pl := &placer{bounds: c.Rectangle}
	locus := path(l.locus)
	closed := append(append([]vg.Point(nil), locus...), locus[0])

	// Areas and lines first, then marks, then markers, then labels.
	if len(d.boundary) > 2 {
		b := path(d.boundary)
		c.StrokeLines(boundaryStyle, append(b, b[0]))
	}
	if len(l.hull) > 2 {
		h := make([]vg.Point, len(l.hull))
		for i, g := range l.hull {
			h[i] = at(g.xy)
		}
		c.FillPolygon(gamutFill, h)
		c.StrokeLines(gamutStyle, append(h, h[0]))
	}
	c.StrokeLines(locusStyle, locus)
	c.StrokeLines(purpleStyle, []vg.Point{locus[len(locus)-1], locus[0]})
	pl.hard = append(pl.hard, closed)

	centre := polygonCentroid(locus)
	type markLabel struct {
		text string
		q    quad
		pt   vg.Point
		sty  text.Style
		rank int
	}
	var wl []markLabel
	var lastTick vg.Point
	for k, nm := range l.marks {
		q0, n := l.locusNormal(nm, at, centre)
		q1 := q0.Add(n.Scale(locusTick))
		// Where the locus crowds its wavelengths together (the ends),
		// marks closer than 3 pt to the last one drawn are left out.
		if k > 0 && hypot(q0.Sub(lastTick)) < 3 {
			continue
		}
		lastTick = q0
		c.StrokeLine2(tickStyle, q0.X, q0.Y, q1.X, q1.Y)
		s := fmt.Sprintf("%.0f", nm)
		sty := plotText(labelFont)
		w, h := sty.Width(s), sty.Height(s)
		anchor := q1.Add(n.Scale(2))
		ctr := vg.Point{X: anchor.X + n.X*w/2, Y: anchor.Y + n.Y*h/2}
		rank := 2
		switch {
		case nm == l.marks[0] || nm == l.marks[len(l.marks)-1]:
			rank = 0
		case math.Mod(nm, 20) == 0:
			rank = 1
		}
		sty.XAlign, sty.YAlign = draw.XCenter, draw.YCenter
		wl = append(wl, markLabel{text: s, q: boxAt(ctr, w, h), pt: ctr, sty: sty, rank: rank})
	}

	var pairA, pairB vg.Point
	if d.pair != nil {
		pairA, pairB = at(d.points[d.pair[0]].xy), at(d.points[d.pair[1]].xy)
	}
	var planckLabels [][]markLabel
	if l.table != nil {
		pk := path(l.planck)
		c.StrokeLines(planckStyle, pk)
		pl.lines = append(pl.lines, pk)
		for _, k := range isotherms {
			// Isotherms are straight in every one of these diagrams; the
			// mark is drawn along one, a fixed length either side.
			mid, err1 := l.table.UV(k, 0)
			dn, err2 := l.table.UV(k, -0.001)
			if err1 != nil || err2 != nil {
				continue
			}
			m := at(mid.UVPrime().XY())
			dir := unit(at(dn.UVPrime().XY()).Sub(m))
			if dir == (vg.Point{}) {
				continue
			}
			c.StrokeLines(isoStyle, []vg.Point{m.Sub(dir.Scale(isothermHalf)), m.Add(dir.Scale(isothermHalf))})
			// The label runs on along the isotherm beyond the mark: on the
			// side of positive Duv, where the isotherms fan out, or on the
			// other, a little further out each round.
			s := fmt.Sprintf("%.0f K", k)
			var cands []markLabel
			for _, gap := range []vg.Length{2, 7, 12, 20} {
				for _, side := range []vg.Length{-1, 1} {
					u := dir.Scale(side)
					sty := plotText(labelFont - 0.5)
					sty.Color = planckColour
					sty.YAlign = draw.YCenter
					sty.Rotation = math.Atan2(float64(u.Y), float64(u.X))
					sty.XAlign = draw.XLeft
					if u.X < 0 {
						sty.Rotation = math.Atan2(float64(-u.Y), float64(-u.X))
						sty.XAlign = draw.XRight
					}
					anchor := m.Add(u.Scale(isothermHalf + gap))
					w, h := sty.Width(s), sty.Height(s)
					cands = append(cands, markLabel{text: s, q: rayBox(anchor, u, w, h), pt: anchor, sty: sty})
				}
			}
			planckLabels = append(planckLabels, cands)
		}
	}
	if d.pair != nil {
		if d.chord && d.hasWhite {
			if hit, ok := rayExit(pairA, at(d.white), closed); ok {
				c.StrokeLines(chordStyle, []vg.Point{pairA, hit})
			}
		}
		c.StrokeLines(pairStyle, []vg.Point{pairA, pairB})
		pl.lines = append(pl.lines, []vg.Point{pairA, pairB})
	}

	// Markers, which labels keep clear of.
	var white vg.Point
	if d.hasWhite {
		white = at(d.white)
		pl.take(boxAt(white, 2*whiteRing.Radius, 2*whiteRing.Radius))
	}
	corners := l.corners()
	gamutAt := make([]vg.Point, len(corners))
	for i, g := range corners {
		gamutAt[i] = at(g.xy)
		pl.take(boxAt(gamutAt[i], 2*markerR, 2*markerR))
	}
	pointAt := make([]vg.Point, len(d.points))
	for i, pt := range d.points {
		pointAt[i] = at(pt.xy)
		pl.take(boxAt(pointAt[i], 2*markerR, 2*markerR))
	}
	for _, g := range corners {
		q := at(g.xy)
		fill := g.fill
		if fill == nil {
			fill = chromaticityColour(g.xy)
		}
		tri := draw.GlyphStyle{Color: fill, Radius: markerR + 0.5, Shape: draw.PyramidGlyph{}}
		c.DrawGlyphNoClip(tri, q)
		tri.Color, tri.Shape = edgeStyle.Color, triangleOutline{}
		c.DrawGlyphNoClip(tri, q)
	}
	for i, pt := range d.points {
		q := pointAt[i]
		fill := pt.fill
		if fill == nil {
			fill = chromaticityColour(pt.xy)
		}
		if pt.target {
			c.DrawGlyphNoClip(draw.GlyphStyle{Color: color.Black, Radius: markerR + 3, Shape: draw.RingGlyph{}}, q)
			pl.take(boxAt(q, 2*markerR+6, 2*markerR+6))
		}
		c.DrawGlyphNoClip(draw.GlyphStyle{Color: fill, Radius: markerR, Shape: draw.CircleGlyph{}}, q)
		c.DrawGlyphNoClip(draw.GlyphStyle{Color: edgeStyle.Color, Radius: markerR, Shape: draw.RingGlyph{}}, q)
	}
	if d.hasWhite {
		// Over the points, unfilled: a neutral sample at the white shows
		// through it.
		drawWhite(&c, white)
	}

	// Labels: the isotherms' (fixed places), the white's, the points', the
	// gamut corners', then the wavelengths' (fixed places, the most
	// important first), each only where it has room.
	for _, cands := range planckLabels {
	isotherm:
		for _, level := range []avoid{avoidAll, avoidHard, avoidBoxes} {
			for _, ml := range cands {
				// Inside the spectrum locus, where temperatures belong.
				if pl.free(ml.q, level) && quadInside(ml.q, closed) {
					pl.take(ml.q)
					c.FillText(ml.sty, ml.pt, ml.text)
					break isotherm
				}
			}
		}
	}
	if d.hasWhite {
		pl.label(&c, white, whiteRing.Radius, "white "+d.whiteName, plotText(labelFont))
	}
	for i, pt := range d.points {
		sty := plotText(labelFont)
		sty.Color = color.Black
		r := vg.Length(markerR)
		if pt.target {
			r += 3
		}
		pl.label(&c, pointAt[i], r, pt.name, sty)
	}
	for i, g := range corners {
		sty := plotText(labelFont)
		sty.Color = gamutStyle.Color
		pl.label(&c, gamutAt[i], markerR, g.name, sty)
	}
	sort.SliceStable(wl, func(i, j int) bool { return wl[i].rank < wl[j].rank })
	for _, ml := range wl {
		if pl.free(ml.q, avoidBoxes) {
			pl.take(ml.q)
			c.FillText(ml.sty, ml.pt, ml.text)
		}
	}
}

// corners returns the gamut's corners that are not also points of the
// diagram (those are drawn and named as points).
func (l *diagramLayer) corners() []diagramPoint {
	var out []diagramPoint
	for _, g := range l.d.gamut {
		dup := false
		for _, p := range l.d.points {
			if p.name == g.name && p.xy == g.xy {
				dup = true
				break
			}
		}
		if !dup {
			out = append(out, g)
		}
	}
	return out
}

// locusNormal returns the canvas point of the locus at nm and the unit
// vector pointing out of the locus there: perpendicular to the curve where
// its direction is well defined, else away from the centre.
func (l *diagramLayer) locusNormal(nm float64, at func(colorimetry.XY) vg.Point, centre vg.Point) (vg.Point, vg.Point) {
	i := sort.SearchFloat64s(l.locusNM, nm)
	i = min(i, len(l.locus)-1)
	q := at(l.locus[i])
	radial := unit(q.Sub(centre))
	a, b := at(l.locus[max(0, i-3)]), at(l.locus[min(len(l.locus)-1, i+3)])
	t := b.Sub(a)
	if hypot(t) < 1 {
		return q, radial
	}
	n := unit(vg.Point{X: t.Y, Y: -t.X})
	if n.Dot(radial) < 0 {
		n = n.Scale(-1)
	}
	return q, n
}

// triangleOutline draws the outline of draw.PyramidGlyph, a little
// heavier than draw.TriangleGlyph.
type triangleOutline struct{}

func (triangleOutline) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	r := sty.Radius + (sty.Radius-sty.Radius*vg.Length(math.Sin(math.Pi/6)))/2
	h := r * vg.Length(math.Sqrt(3)) / 2
	pts := []vg.Point{
		{X: pt.X, Y: pt.Y + r},
		{X: pt.X - h, Y: pt.Y - r/2},
		{X: pt.X + h, Y: pt.Y - r/2},
	}
	c.StrokeLines(draw.LineStyle{Color: sty.Color, Width: edgeStyle.Width}, append(pts, pts[0]))
}

// chromaticityColour returns a display colour for a chromaticity: the
// brightest sRGB colour of that chromaticity, desaturated into the gamut
// by adding white where needed.
func chromaticityColour(p colorimetry.XY) color.Color {
	if !(p.Y > 0) {
		return color.Gray{Y: 0x80}
	}
	r, g, b := colorful.XyzToLinearRgb(p.X/p.Y, 1, (1-p.X-p.Y)/p.Y)
	if m := min(r, g, b); m < 0 {
		r, g, b = r-m, g-m, b-m
	}
	top := max(r, g, b)
	if !(top > 0) {
		return color.Gray{Y: 0x80}
	}
	return colorful.LinearRgb(r/top, g/top, b/top).Clamped()
}

// quad is a label's box: four corners in order.
type quad [4]vg.Point

// boxAt returns the upright box of w×h centred on c, with the clearance
// labelPad.
func boxAt(c vg.Point, w, h vg.Length) quad {
	w, h = w/2+labelPad, h/2+labelPad
	return quad{{X: c.X - w, Y: c.Y - h}, {X: c.X + w, Y: c.Y - h}, {X: c.X + w, Y: c.Y + h}, {X: c.X - w, Y: c.Y + h}}
}

// rayBox returns the box of a text of w×h that starts at a and runs along
// the unit vector dir.
func rayBox(a, dir vg.Point, w, h vg.Length) quad {
	n := vg.Point{X: -dir.Y, Y: dir.X}.Scale(h/2 + labelPad)
	b := a.Add(dir.Scale(w + labelPad))
	a = a.Sub(dir.Scale(labelPad))
	return quad{a.Sub(n), b.Sub(n), b.Add(n), a.Add(n)}
}

// placer keeps the boxes already taken on a diagram and the lines labels
// should avoid: hard lines (the spectrum locus) above all, others where
// there is room.
type placer struct {
	bounds      vg.Rectangle
	taken       []quad
	lines, hard [][]vg.Point
}

// avoid says what a label must keep clear of, besides the boxes taken.
type avoid int

const (
	avoidBoxes avoid = iota // the boxes only
	avoidHard               // and the hard lines
	avoidAll                // and every line
)

func (pl *placer) take(q quad) { pl.taken = append(pl.taken, q) }

// free reports whether q lies inside the bounds, clear of every box taken
// and of the lines level asks for.
func (pl *placer) free(q quad, level avoid) bool {
	for _, p := range q {
		if p.X < pl.bounds.Min.X || p.X > pl.bounds.Max.X || p.Y < pl.bounds.Min.Y || p.Y > pl.bounds.Max.Y {
			return false
		}
	}
	for _, t := range pl.taken {
		if quadsOverlap(q, t) {
			return false
		}
	}
	if level >= avoidHard && hitsAny(pl.hard, q) {
		return false
	}
	return level < avoidAll || !hitsAny(pl.lines, q)
}

// quadInside reports whether every corner of q lies inside the closed
// polygon poly (even–odd rule).
func quadInside(q quad, poly []vg.Point) bool {
	for _, p := range q {
		in := false
		for i, j := 0, len(poly)-1; i < len(poly); j, i = i, i+1 {
			a, b := poly[i], poly[j]
			if (a.Y > p.Y) != (b.Y > p.Y) && p.X < a.X+(p.Y-a.Y)*(b.X-a.X)/(b.Y-a.Y) {
				in = !in
			}
		}
		if !in {
			return false
		}
	}
	return true
}

// hitsAny reports whether one of the polylines touches q.
func hitsAny(lines [][]vg.Point, q quad) bool {
	for _, ln := range lines {
		for i := 1; i < len(ln); i++ {
			if segmentHitsQuad(ln[i-1], ln[i], q) {
				return true
			}
		}
	}
	return false
}

// label writes s beside a marker of radius r at p: at the first of eight
// places around it that is clear of other labels, markers and lines, else
// of labels, markers and the spectrum locus, trying further out each round
// (with a leader line to the marker); failing all, where it overlaps the
// fewest labels and markers.
func (pl *placer) label(c *draw.Canvas, p vg.Point, r vg.Length, s string, sty text.Style) {
	w, h := sty.Width(s), sty.Height(s)
	dirs := []vg.Point{{X: 1}, {X: -1}, {Y: 1}, {Y: -1}, {X: 1, Y: 1}, {X: 1, Y: -1}, {X: -1, Y: 1}, {X: -1, Y: -1}}
	place := func(dir vg.Point, gap vg.Length) (vg.Point, quad) {
		ctr := vg.Point{X: p.X + dir.X*(r+gap+w/2), Y: p.Y + dir.Y*(r+gap+h/2)}
		return ctr, boxAt(ctr, w, h)
	}
	sty.XAlign, sty.YAlign = draw.XCenter, draw.YCenter
	put := func(dir vg.Point, gap vg.Length) {
		ctr, q := place(dir, gap)
		pl.take(q)
		if gap > 4 {
			// A leader from the marker's edge to the label's near side.
			u := unit(dir)
			a := p.Add(u.Scale(r + 1))
			b := vg.Point{X: p.X + dir.X*(r+gap-1), Y: p.Y + dir.Y*(r+gap-1)}
			c.StrokeLines(draw.LineStyle{Color: color.Gray{Y: 0x70}, Width: 0.5}, []vg.Point{a, b})
		}
		c.FillText(sty, ctr, s)
	}
	gaps := []vg.Length{2, 9, 18, 30, 45}
	for k, gap := range gaps {
		for _, level := range []avoid{avoidAll, avoidHard} {
			if k > 1 && level == avoidAll {
				continue
			}
			for _, dir := range dirs {
				if _, q := place(dir, gap); pl.free(q, level) {
					put(dir, gap)
					return
				}
			}
		}
	}
	bestDir, bestGap, fewest := dirs[0], gaps[0], math.MaxInt
	for _, gap := range gaps {
		for _, dir := range dirs {
			_, q := place(dir, gap)
			n := 0
			for _, t := range pl.taken {
				if quadsOverlap(q, t) {
					n++
				}
			}
			if !pl.free(q, avoidBoxes) && n == 0 {
				n = 1000 // outside the data area
			}
			if n < fewest {
				bestDir, bestGap, fewest = dir, gap, n
			}
		}
	}
	put(bestDir, bestGap)
}

// quadsOverlap reports whether two convex quads overlap (separating axis
// test).
func quadsOverlap(a, b quad) bool {
	for _, q := range []quad{a, b} {
		for i := range 4 {
			e := q[(i+1)%4].Sub(q[i])
			n := vg.Point{X: -e.Y, Y: e.X}
			amin, amax := project(a, n)
			bmin, bmax := project(b, n)
			if amax < bmin || bmax < amin {
				return false
			}
		}
	}
	return true
}

func project(q quad, n vg.Point) (lo, hi vg.Length) {
	lo, hi = q[0].Dot(n), q[0].Dot(n)
	for _, p := range q[1:] {
		v := p.Dot(n)
		lo, hi = min(lo, v), max(hi, v)
	}
	return lo, hi
}

// segmentHitsQuad reports whether the segment a–b touches the quad q.
func segmentHitsQuad(a, b vg.Point, q quad) bool {
	if inQuad(a, q) || inQuad(b, q) {
		return true
	}
	for i := range 4 {
		if segmentsCross(a, b, q[i], q[(i+1)%4]) {
			return true
		}
	}
	return false
}

// inQuad reports whether p lies inside the convex quad q.
func inQuad(p vg.Point, q quad) bool {
	sign := 0.0
	for i := range 4 {
		e := q[(i+1)%4].Sub(q[i])
		cr := float64(e.X*(p.Y-q[i].Y) - e.Y*(p.X-q[i].X))
		if cr == 0 {
			continue
		}
		if sign == 0 {
			sign = math.Copysign(1, cr)
		} else if math.Copysign(1, cr) != sign {
			return false
		}
	}
	return true
}

// segmentsCross reports whether segments a–b and c–d intersect.
func segmentsCross(a, b, c, d vg.Point) bool {
	o := func(p, q, r vg.Point) float64 {
		return float64((q.X-p.X)*(r.Y-p.Y) - (q.Y-p.Y)*(r.X-p.X))
	}
	d1, d2, d3, d4 := o(c, d, a), o(c, d, b), o(a, b, c), o(a, b, d)
	return ((d1 > 0) != (d2 > 0)) && ((d3 > 0) != (d4 > 0)) && d1 != 0 && d2 != 0 && d3 != 0 && d4 != 0
}

// rayExit returns where the ray from a through w leaves the closed polygon
// poly, beyond w.
func rayExit(a, w vg.Point, poly []vg.Point) (vg.Point, bool) {
	dir := w.Sub(a)
	if hypot(dir) == 0 {
		return vg.Point{}, false
	}
	best := math.Inf(1)
	for i := 1; i < len(poly); i++ {
		p, q := poly[i-1], poly[i]
		e := q.Sub(p)
		den := float64(dir.X*e.Y - dir.Y*e.X)
		if den == 0 {
			continue
		}
		ap := p.Sub(a)
		t := float64(ap.X*e.Y-ap.Y*e.X) / den
		s := float64(ap.X*dir.Y-ap.Y*dir.X) / den
		if t > 1 && s >= 0 && s <= 1 && t < best {
			best = t
		}
	}
	if math.IsInf(best, 1) {
		return vg.Point{}, false
	}
	return a.Add(dir.Scale(vg.Length(best))), true
}

// polygonCentroid returns the centroid of the area of a closed polygon
// (the last point joins the first).
func polygonCentroid(p []vg.Point) vg.Point {
	var a, cx, cy float64
	for i := range p {
		q, r := p[i], p[(i+1)%len(p)]
		cr := float64(q.X*r.Y - r.X*q.Y)
		a += cr
		cx += float64(q.X+r.X) * cr
		cy += float64(q.Y+r.Y) * cr
	}
	if a == 0 {
		return p[0]
	}
	return vg.Point{X: vg.Length(cx / (3 * a)), Y: vg.Length(cy / (3 * a))}
}

func hypot(p vg.Point) float64 { return math.Hypot(float64(p.X), float64(p.Y)) }

// unit returns p scaled to length 1, or the zero point.
func unit(p vg.Point) vg.Point {
	n := hypot(p)
	if n == 0 {
		return vg.Point{}
	}
	return p.Scale(vg.Length(1 / n))
}

// convexHull returns the corners of the convex hull of the points in the
// diagram's coordinates, counter-clockwise (monotone chain).
func convexHull(pts []diagramPoint, d *diagramSpec) []diagramPoint {
	if len(pts) < 3 {
		return nil
	}
	p := append([]diagramPoint(nil), pts...)
	sort.Slice(p, func(i, j int) bool {
		ai, bi := d.coord(p[i].xy)
		aj, bj := d.coord(p[j].xy)
		return ai < aj || (ai == aj && bi < bj)
	})
	cross := func(o, a, b diagramPoint) float64 {
		ox, oy := d.coord(o.xy)
		ax, ay := d.coord(a.xy)
		bx, by := d.coord(b.xy)
		return (ax-ox)*(by-oy) - (ay-oy)*(bx-ox)
	}
	var h []diagramPoint
	for _, q := range p {
		for len(h) >= 2 && cross(h[len(h)-2], h[len(h)-1], q) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, q)
	}
	lower := len(h) + 1
	for i := len(p) - 2; i >= 0; i-- {
		for len(h) >= lower && cross(h[len(h)-2], h[len(h)-1], p[i]) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, p[i])
	}
	h = h[:len(h)-1]
	if len(h) < 3 {
		return nil
	}
	return h
}

func runPlotDiagram(e *env, args []string) error {
	var o plotOpts
	var columns, as, scale, illum, observer, space, pair, gamut string
	var lightness float64
	planck := true
	fs := flag.NewFlagSet("plot diagram", flag.ContinueOnError)
	o.define(fs)
	fs.StringVar(&columns, "column", "", "only the spectra with these `NAMES` (comma-separated)")
	fs.StringVar(&as, "as", "reflectance", "what the spectra are: `light`, reflectance or transmittance")
	fs.StringVar(&scale, "scale", "", "reflectance or transmittance: `fraction` or percent (default: percent when the maximum exceeds 1.5)")
	fs.StringVar(&illum, "illuminant", "D65", "the white: the illuminant objects are seen under, or the white lights should make; a CIE `NAME` or a FILE")
	fs.StringVar(&observer, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.StringVar(&space, "space", "xy", "the diagram: `xy` (CIE 1931) or uv (CIE 1976 u′, v′)")
	fs.StringVar(&pair, "pair", "", "join two spectra `A,B` and draw the line from A through the white")
	fs.StringVar(&gamut, "gamut", "", "draw the mixing gamut of these spectra, `NAMES` comma-separated, or all")
	fs.Float64Var(&lightness, "lightness", 0, "reflectance and transmittance: draw the limit of object colours at CIE L* = `L`, 0 < L < 100 (0: none)")
	fs.BoolVar(&planck, "planck", true, "draw the Planckian locus")
	files, err := parseFlags(plotDiagramCommand, fs, e, args)
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
	if space != "xy" && space != "uv" {
		return usagef("--space %s: want xy or uv", space)
	}
	if lightness != 0 {
		if as == "light" {
			return usagef("--lightness draws the limit of object colours: it needs --as reflectance or transmittance")
		}
		if !(lightness > 0 && lightness < 100) {
			return usagef("--lightness %g: want a CIE L* between 0 and 100", lightness)
		}
	}
	format, err := checkFigurePath("--out", o.out, append(append([]string(nil), files...), illum))
	if err != nil {
		return err
	}
	defH := diagramHXY
	if space == "uv" {
		defH = diagramHUV
	}
	w, h, err := parseSize(o.size, diagramW, defH)
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
	ds := diagramSpec{space: space, obs: obs, planck: planck, hasWhite: true, whiteName: illName}
	if ds.white, err = lightXY(obs, ill); err != nil {
		return fmt.Errorf("--illuminant %s: %v", illum, err)
	}
	light := as == "light"
	calc := newTristimulus(obs, ill, light)
	names := legendNames(ls.ins)
	warns := ls.warns
	var kept []int // index into ls of each point
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
		xy, err := c.XY()
		if err != nil {
			warns = append(warns, in.name+": black (X + Y + Z = 0): no chromaticity to draw")
			continue
		}
		pt := diagramPoint{name: names[i], xy: xy}
		if !light {
			if hex, _, err := srgbSwatch(c, wt.White()); err == nil {
				pt.fill = hexColour(hex)
			}
		}
		ds.points = append(ds.points, pt)
		kept = append(kept, i)
	}
	find := func(flagName, name string) (int, error) {
		name = strings.TrimSpace(name)
		for k, i := range kept {
			if strings.EqualFold(ls.ins[i].name, name) || strings.EqualFold(names[i], name) {
				return k, nil
			}
		}
		have := make([]string, len(kept))
		for k, i := range kept {
			have[k] = ls.ins[i].name
		}
		return 0, usagef("%s: no spectrum named %q to draw (there are: %s)", flagName, name, strings.Join(have, ", "))
	}
	if pair != "" {
		a, b, ok := strings.Cut(pair, ",")
		if !ok || strings.Contains(b, ",") {
			return usagef("--pair %s: want two names, A,B", pair)
		}
		ia, err := find("--pair", a)
		if err != nil {
			return err
		}
		ib, err := find("--pair", b)
		if err != nil {
			return err
		}
		ds.pair, ds.chord = []int{ia, ib}, true
	}
	if gamut != "" {
		var idx []int
		if strings.EqualFold(strings.TrimSpace(gamut), "all") {
			for k := range ds.points {
				idx = append(idx, k)
			}
		} else {
			for _, n := range strings.Split(gamut, ",") {
				k, err := find("--gamut", n)
				if err != nil {
					return err
				}
				idx = append(idx, k)
			}
		}
		for _, k := range idx {
			ds.gamut = append(ds.gamut, ds.points[k])
		}
		if convexHull(ds.gamut, &ds) == nil {
			return usagef("--gamut %s: want at least three chromaticities not on one line", gamut)
		}
	}
	if lightness != 0 {
		solid, err := complement.NewObjectSolid(obs, ill, colorimetry.Grid1nm)
		if err != nil {
			return fmt.Errorf("--illuminant %s: %v", illum, err)
		}
		b, err := solid.Boundary(lightness, 0)
		if err != nil {
			return fmt.Errorf("--lightness %g: %v", lightness, err)
		}
		for _, oc := range b {
			ds.boundary = append(ds.boundary, oc.Chromaticity)
		}
		ds.boundaryName = fmt.Sprintf("limit of object colours at L* = %g under %s", lightness, illName)
	}
	ds.title = o.title
	if ds.title == "" {
		what := "chromaticity x, y"
		if space == "uv" {
			what = "chromaticity u′, v′ (CIE 1976 UCS)"
		}
		ds.title = fmt.Sprintf("%s; %s observer; %s", what, obs.Name(), as)
		if !light {
			ds.title += " under " + illName
		}
	}
	pn, err := ds.panel()
	if err != nil {
		return fmt.Errorf("%s: %v", o.out, err)
	}
	if err := writeFigure(o.out, format, &figure{panels: []*panel{pn}}, w, h); err != nil {
		return err
	}
	printWarnings(e, "plot", warns)
	fmt.Fprintf(e.stdout, "wrote %s (%s)\n", o.out, plural(len(ds.points), "chromaticity", "chromaticities"))
	return nil
}
