package complement

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/antipode-color/antipode/colorimetry"
)

// ObjectSolid is the object-colour solid of one illuminant, observer and
// computation grid: the set of tristimulus values (perfect diffuser
// Y = 100) of every reflectance or transmittance with values in [0, 1].
// Its boundary is made of the optimal colours, whose greatest luminance at
// each chromaticity is the MacAdam limit (MacAdam 1935, J. Opt. Soc. Am.
// 25, 361–367). It is immutable and safe for concurrent use.
//
// # Method
//
// On a grid of n samples the tristimulus values of a reflectance r are the
// sum Σ rᵢ·wᵢ of the object weights wᵢ = k·S(λᵢ)·(x̄, ȳ, z̄)(λᵢ)·Δλ
// (colorimetry.NewObjectWeights), so the solid is the set of all such sums
// with 0 ≤ rᵢ ≤ 1: a zonotope, point-symmetric about half the white. A
// reflectance and its complement 1 − r add up to the perfect diffuser.
//
// Where the weights' chromaticities (the spectrum locus) run convexly, the
// boundary is made of the optimal colours of Schrödinger (1920) and Rösch
// (1928): reflectances that are 1 on one interval of wavelengths and 0
// elsewhere (band-pass) or the reverse (band-stop). A transition inside
// sample i is a fractional reflectance at that sample alone: the share of
// its interval [λᵢ − Δλ/2, λᵢ + Δλ/2] on the "1" side of the edge. With the
// prefix sums of the weights, the tristimulus values of any such spectrum
// cost O(1), and a slice of these colours at luminance Y is a polygon with
// one vertex for each of the n sample boundaries taken as the start of the
// interval and one for each taken as its end (the other end is found by
// binary search on the prefix sum of ȳ), 2n vertices in O(n log n).
//
// The spectrum locus is not exactly convex: CIE 1931 bends inwards by up
// to 8e-5 in x, y around 437–452 nm, and the rounded digits of the tables
// leave the nearly straight stretch from 570 to 650 nm and the ends below
// 410 nm and beyond 699 nm not quite convex either. There optimal colours
// with four or more transitions lie beyond that polygon: by up to about
// 0.07 in X or Z, or 0.02 in C*ab, for CIE 1931 and D65 on the 1 nm grid
// (the tests find such colours). The solid therefore treats the convex
// hull of the polygon as an inner bound and makes it exact where an answer
// depends on it: an edge is confirmed, or pushed outwards, by the exact
// support function of the slice, max v·(X, Z) subject to Σ rᵢ·Yᵢ = Y,
// 0 ≤ rᵢ ≤ 1, a fractional knapsack solved by taking samples in order of
// v·(Xᵢ, Zᵢ)/Yᵢ (the extremal property of optimal colours shown by Rösch
// and MacAdam). Realisable refines only the edges facing the colour,
// MaxChroma and Boundary only the edges crossed by the hue directions
// asked for, so a query costs O(n log n) plus a few refinements (a
// tenth to a few tenths of a millisecond on the 1 nm grid).
//
// # Accuracy
//
// The solid is exact for summation on its grid (CIE 015:2018 §7): the
// tristimulus values of any reflectance computed with the same weights lie
// inside it, and every boundary point returned is the colour of a
// reflectance in [0, 1] on the grid. With respect to the continuous
// integral it is grid-limited: the boundary runs along chords between
// the grid's wavelengths, so on the 5 nm grid MaxChroma falls short of its
// 1 nm value by up to about 1 CIELAB unit (0.6 %, at the most saturated
// blue-greens near L* 45, h_ab 175°, for D65 and either CIE observer;
// elsewhere the two differ by a few tenths either way, each grid having
// its own weights and white).
type ObjectSolid struct {
	grid     colorimetry.Grid
	observer string
	white    colorimetry.XYZ   // perfect diffuser, Y = 100 exactly
	w        []colorimetry.XYZ // weight of each sample
	cum      []colorimetry.XYZ // cum[k] = Σ_{i<k} w[i], k = 0…n
	total    colorimetry.XYZ   // cum[n]: the perfect diffuser as summed
}

// OptimalColour is a colour on the boundary of an ObjectSolid with the
// reflectance that gives it: 0 or 1 on the solid's grid but for the
// samples that hold a transition.
type OptimalColour struct {
	// XYZ are the tristimulus values, perfect diffuser Y = 100.
	XYZ colorimetry.XYZ `json:"xyz"`
	// Lab is CIELAB relative to the white of the solid (the perfect
	// diffuser under its illuminant).
	Lab colorimetry.Lab `json:"lab"`
	// Chromaticity is the CIE 1931 x, y.
	Chromaticity colorimetry.XY `json:"xy"`
	// Edges are the wavelengths in nm, increasing, at which the
	// reflectance switches between 0 and 1: two for a band-pass or
	// band-stop spectrum, one for a long- or short-pass edge, and rarely
	// four or more where the spectrum locus is not convex. A grid sample
	// λᵢ stands for the interval [λᵢ − Δλ/2, λᵢ + Δλ/2]: an edge inside it
	// gives the sample a fractional reflectance, and edges may lie up to
	// Δλ/2 beyond the ends of the grid.
	Edges []float64 `json:"edges_nm"`
	// BandStop reports that the reflectance is 1 at the short-wave end of
	// the grid, before the first edge. With two edges it is a band-stop
	// spectrum (0 between the edges); false with two edges is a band-pass
	// spectrum (1 between them).
	BandStop bool `json:"band_stop"`
}

// Tolerances of the object-colour solid.
const (
	// realisableTol is the distance (in X, Y, Z on the scale perfect
	// diffuser Y = 100) within which Realisable accepts a colour beyond
	// the boundary: room for round-off in colours computed on the boundary
	// itself, common practice (no source).
	realisableTol = 1e-9
	// edgeTol is how far the support function may exceed an edge's line
	// (same units) for the edge to count as part of the boundary: a
	// hundredth of realisableTol, so that a confirmed edge decides
	// Realisable, and ten times the round-off of the support function.
	edgeTol = 1e-11
	// limitTol is the distance within which MaxLuminance counts a colour
	// as inside while it searches for the limit: round-off, so that
	// chromaticities on the spectrum locus (reached only at one point of
	// the boundary) are found, without letting Y overshoot.
	limitTol = 1e-12
)

// NewObjectSolid returns the object-colour solid for the observer obs and
// the illuminant ill (a relative spectral power distribution), computed on
// the grid g; a zero g means colorimetry.Grid1nm (360–830 nm at 1 nm), the
// finest boundary. Use colorimetry.Grid5nm (380–780 nm at 5 nm) to match
// colours computed on that grid. The illuminant is resampled onto g by its
// own rules.
//
// It returns an error for a nil observer, one wrapping
// colorimetry.ErrBadGrid for an invalid grid, and one naming the
// "illuminant" when it is empty, negative beyond 1 % of its peak or without
// luminance on g, or when a weight is negative.
func NewObjectSolid(obs *colorimetry.Observer, ill colorimetry.Spectrum, g colorimetry.Grid) (*ObjectSolid, error) {
	if obs == nil {
		return nil, errors.New("complement: nil observer")
	}
	if g == (colorimetry.Grid{}) {
		g = colorimetry.Grid1nm
	}
	if !g.Valid() {
		return nil, fmt.Errorf("object-colour solid: %w: %+v", colorimetry.ErrBadGrid, g)
	}
	if err := checkSpectrum("illuminant", ill, Lights, g); err != nil {
		return nil, err
	}
	wt, err := colorimetry.NewObjectWeights(obs, ill, g)
	if err != nil {
		return nil, inputErr("illuminant", err)
	}
	n := g.N
	s := &ObjectSolid{
		grid:     g,
		observer: obs.Name(),
		white:    wt.White(),
		w:        make([]colorimetry.XYZ, n),
		cum:      make([]colorimetry.XYZ, n+1),
	}
	// The weight of sample i is the tristimulus value of the reflectance
	// that is 1 at sample i and 0 elsewhere.
	unit := make([]float64, n)
	var dst [3]float64
	for i := range n {
		unit[i] = 1
		wt.XYZBatchTo(dst[:], unit)
		unit[i] = 0
		s.w[i] = colorimetry.XYZ{X: dst[0], Y: dst[1], Z: dst[2]}
		if s.w[i].X < 0 || s.w[i].Y < 0 || s.w[i].Z < 0 {
			// An illuminant sample below zero within noise: the weights
			// would no longer span a solid of real reflectances.
			return nil, inputErr("illuminant", &colorimetry.SampleError{Index: i, Wavelength: g.Wavelength(i),
				Err: fmt.Errorf("%w: object weight %v", colorimetry.ErrNegative, s.w[i])})
		}
		s.cum[i+1] = s.cum[i].Add(s.w[i])
	}
	s.total = s.cum[n]
	return s, nil
}

// Grid returns the computation grid.
func (s *ObjectSolid) Grid() colorimetry.Grid { return s.grid }

// ObserverName returns the name of the observer the solid was built for.
func (s *ObjectSolid) ObserverName() string { return s.observer }

// White returns the tristimulus values of the perfect diffuser, Y = 100:
// the white of CIELAB for the solid.
func (s *ObjectSolid) White() colorimetry.XYZ { return s.white }

// cumAt returns the prefix sum at integer position k, 0 ≤ k ≤ 2n, taking
// the grid as periodic: cum[k − n] + total beyond n.
func (s *ObjectSolid) cumAt(k int) colorimetry.XYZ {
	if n := s.grid.N; k > n {
		return s.cum[k-n].Add(s.total)
	}
	return s.cum[k]
}

// cumY is the Y component of cumAt.
func (s *ObjectSolid) cumY(k int) float64 {
	if n := s.grid.N; k > n {
		return s.cum[k-n].Y + s.total.Y
	}
	return s.cum[k].Y
}

// at returns F(x), the tristimulus values of the reflectance that is 1 on
// the positions [0, x] (fractional at the last sample), for 0 ≤ x ≤ 2n,
// periodic beyond n. Position i is the start of sample i's interval.
func (s *ObjectSolid) at(x float64) colorimetry.XYZ {
	n := s.grid.N
	k := int(math.Floor(x))
	if k >= 2*n {
		return s.cumAt(2 * n)
	}
	k = max(k, 0)
	return s.cumAt(k).Add(s.w[k%n].Scale(x - float64(k)))
}

// endAt returns the smallest position b ≥ lo with F_Y(b) = target, for
// F_Y(lo) ≤ target ≤ F_Y(lo + n), and the integer k with k − 1 ≤ b < k
// from which the search may resume for a larger lo and target (pass it
// back as hint; 0 starts afresh).
func (s *ObjectSolid) endAt(lo int, target float64, hint int) (float64, int) {
	n := s.grid.N
	k := max(hint, lo)
	for k <= lo+n && s.cumY(k) < target {
		k++
	}
	switch {
	case k == lo:
		return float64(lo), k
	case k > lo+n:
		return float64(lo + n), k
	}
	f := 1.0
	if wy := s.w[(k-1)%n].Y; wy > 0 {
		f = math.Min(math.Max((target-s.cumY(k-1))/wy, 0), 1)
	}
	return float64(k-1) + f, k
}

// startAt returns the largest position a in [lo, lo + n] with
// F_Y(a) = target, for F_Y(lo) ≤ target ≤ F_Y(lo + n), and the integer k
// with k ≤ a from which the search may resume for a larger lo and target
// (pass it back as hint; 0 starts afresh).
func (s *ObjectSolid) startAt(lo int, target float64, hint int) (float64, int) {
	n := s.grid.N
	k := max(hint, lo)
	// Largest k in [lo, lo+n] with cumY(k) ≤ target.
	for k < lo+n && s.cumY(k+1) <= target {
		k++
	}
	if k >= lo+n {
		return float64(lo + n), k
	}
	f := 0.0
	if wy := s.w[k%n].Y; wy > 0 {
		f = math.Min(math.Max((target-s.cumY(k))/wy, 0), 1)
	}
	return float64(k) + f, k
}

// vertex is a point of a slice of the solid with the reflectance that
// gives it: the two-transition spectrum of the interval span when r is
// nil, or the reflectance r on the grid.
type vertex struct {
	p    colorimetry.XYZ
	span span
	r    []float64
	id   int             // identifies the vertex within its slice
	lab  colorimetry.Lab // CIELAB of p, when the slice keeps it
}

// span is the interval of positions [a, b] of a two-transition spectrum
// (0 ≤ a < n, a ≤ b ≤ a + n, wrapping round the end of the grid beyond
// n); position i is the start of sample i's interval.
type span struct{ a, b float64 }

// twoTransition returns the polygon of two-transition spectra of
// luminance y, 0 < y < total Y, in order of their start position: their
// intervals and tristimulus values. It is an inner bound of the slice
// (see ObjectSolid).
func (s *ObjectSolid) twoTransition(y float64) ([]span, []colorimetry.XYZ) {
	n := s.grid.N
	// Intervals starting on the boundary before sample i, in order of i.
	// The searches move forward only (F_Y is monotone): O(n) in all.
	first := make([]span, n)
	hint := 0
	for i := range first {
		var b float64
		b, hint = s.endAt(i, s.cumY(i)+y, hint)
		first[i] = span{float64(i), b}
	}
	// Intervals ending there (as i + n, so that the start lies in
	// [i, i + n]). Their starts grow with i; those beyond n wrap round to
	// the front, and stay below the first unwrapped start (F_Y is
	// monotone), so the list is sorted after one rotation.
	second := make([]span, n)
	wrap := n
	hint = 0
	for i := range second {
		var a float64
		a, hint = s.startAt(i, s.cumY(i+n)-y, hint)
		if a >= float64(n) {
			second[i] = span{a - float64(n), float64(i)}
			wrap = min(wrap, i)
		} else {
			second[i] = span{a, float64(i + n)}
		}
	}
	second = slices.Concat(second[wrap:], second[:wrap])
	less := func(p, q span) bool { return p.a < q.a || p.a == q.a && p.b < q.b }
	v := make([]span, 0, 2*n)
	add := func(q span) {
		if k := len(v); k > 0 && q.a-v[k-1].a < 1e-12 && q.b-v[k-1].b < 1e-12 {
			return
		}
		v = append(v, q)
	}
	i, j := 0, 0
	for i < n || j < n {
		if j == n || i < n && less(first[i], second[j]) {
			add(first[i])
			i++
		} else {
			add(second[j])
			j++
		}
	}
	p := make([]colorimetry.XYZ, len(v))
	for i, q := range v {
		p[i] = s.at(q.b).Sub(s.at(q.a))
	}
	return v, p
}

// support returns the point of the slice at luminance y that lies
// furthest in the direction (vx, vz) of the (X, Z) plane, and its
// reflectance: the fractional knapsack that takes the samples in order of
// decreasing (vx·Xᵢ + vz·Zᵢ)/Yᵢ until their Y adds up to y, plus every
// sample without luminance that adds to the objective. Ties go to the
// shorter wavelength.
func (s *ObjectSolid) support(y, vx, vz float64) (colorimetry.XYZ, []float64) {
	n := s.grid.N
	r := make([]float64, n)
	idx := make([]int, 0, n)
	for i, w := range s.w {
		switch {
		case w.Y > 0:
			idx = append(idx, i)
		case vx*w.X+vz*w.Z > 0:
			r[i] = 1
		}
	}
	keys := make([]float64, n)
	for _, i := range idx {
		keys[i] = (vx*s.w[i].X + vz*s.w[i].Z) / s.w[i].Y
	}
	slices.SortFunc(idx, func(i, j int) int {
		if c := cmp.Compare(keys[j], keys[i]); c != 0 {
			return c
		}
		return cmp.Compare(i, j)
	})
	left := y
	for _, i := range idx {
		if left <= 0 {
			break
		}
		f := math.Min(left/s.w[i].Y, 1)
		r[i] = f
		left -= f * s.w[i].Y
	}
	var p colorimetry.XYZ
	for i, f := range r {
		if f != 0 {
			p = p.Add(s.w[i].Scale(f))
		}
	}
	return p, r
}

// reflectance returns the reflectance of v on the grid.
func (s *ObjectSolid) reflectance(v vertex) []float64 {
	if v.r != nil {
		return v.r
	}
	n := s.grid.N
	r := make([]float64, n)
	a, b := v.span.a, v.span.b
	addCover(r, a, math.Min(b, float64(n)))
	if b > float64(n) {
		addCover(r, 0, b-float64(n))
	}
	return r
}

// addCover adds to r[i] the length of the overlap of the positions [a, b]
// with sample i's interval [i, i + 1].
func addCover(r []float64, a, b float64) {
	if !(b > a) {
		return
	}
	lo := max(int(math.Floor(a)), 0)
	hi := min(int(math.Ceil(b)), len(r))
	for i := lo; i < hi; i++ {
		r[i] += math.Min(b, float64(i+1)) - math.Max(a, float64(i))
	}
}

// slicePoly is a slice of the solid at luminance y being made exact: a
// convex polygon of points of the slice, counter-clockwise in the (X, Z)
// plane, that starts as the hull of the two-transition polygon and grows
// by support points wherever an edge is found to lie inside the slice.
type slicePoly struct {
	s      *ObjectSolid
	y      float64
	v      []vertex
	done   map[[2]int]bool // edges (by vertex ids) confirmed on the boundary
	nextID int
	lab    bool // whether vertices carry CIELAB
}

// newSlice returns the slice at luminance y, 0 < y < total Y, starting
// from the hull of its two-transition polygon; with lab, its vertices
// carry CIELAB.
func (s *ObjectSolid) newSlice(y float64, lab bool) *slicePoly {
	sp := s.hullSlice(s.twoTransition(y))
	sp.y, sp.lab = y, lab
	if lab {
		for i := range sp.v {
			sp.v[i].lab = sp.labOf(sp.v[i].p)
		}
	}
	return sp
}

// labOf returns CIELAB of p at the slice's luminance.
func (sp *slicePoly) labOf(p colorimetry.XYZ) colorimetry.Lab {
	p.Y = sp.y
	l, _ := p.Lab(sp.s.white) // valid white, finite p: no error
	return l
}

// hullSlice returns the slice whose polygon is the convex hull of the
// two-transition polygon of intervals v and points p.
func (s *ObjectSolid) hullSlice(v []span, p []colorimetry.XYZ) *slicePoly {
	h := convexHull(p)
	sp := &slicePoly{s: s, v: make([]vertex, len(h)), done: map[[2]int]bool{}, nextID: len(p)}
	for k, i := range h {
		sp.v[k] = vertex{p: p[i], span: v[i], id: i}
	}
	return sp
}

// convexHull returns the indices of the convex hull of the points p in the
// (X, Z) plane, counter-clockwise, without collinear points (Andrew's
// monotone chain).
func convexHull(p []colorimetry.XYZ) []int {
	idx := make([]int, len(p))
	for i := range idx {
		idx[i] = i
	}
	if len(p) < 3 {
		return idx
	}
	slices.SortFunc(idx, func(i, j int) int {
		if c := cmp.Compare(p[i].X, p[j].X); c != 0 {
			return c
		}
		return cmp.Compare(p[i].Z, p[j].Z)
	})
	h := make([]int, 0, len(p)+1)
	for _, q := range idx {
		for len(h) >= 2 && turn(p[h[len(h)-2]], p[h[len(h)-1]], p[q]) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, q)
	}
	lower := len(h) + 1
	for k := len(idx) - 2; k >= 0; k-- {
		q := idx[k]
		for len(h) >= lower && turn(p[h[len(h)-2]], p[h[len(h)-1]], p[q]) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, q)
	}
	return h[:len(h)-1]
}

// turn returns the cross product (a − o) × (b − o) in the (X, Z) plane:
// positive for a left (counter-clockwise) turn o → a → b.
func turn(o, a, b colorimetry.XYZ) float64 {
	return (a.X-o.X)*(b.Z-o.Z) - (a.Z-o.Z)*(b.X-o.X)
}

// insertAfter returns the convex polygon v (counter-clockwise) with the
// point r, which lies beyond edge k, inserted after vertex k and the
// vertices that r hides removed: the incremental step of a convex hull.
func insertAfter(v []vertex, k int, r vertex) []vertex {
	m := len(v)
	// Rotate so that edge k runs from the last vertex to the first, then
	// append r and walk both ways.
	w := make([]vertex, 0, m+1)
	w = append(w, v[(k+1)%m:]...)
	w = append(w, v[:(k+1)%m]...)
	// w[0] … w[m−1]; edge k is w[m−1] → w[0]. Drop from the front while
	// r → w[0] → w[1] is not a left turn, and from the back while
	// w[m−2] → w[m−1] → r is not.
	lo, hi := 0, len(w)
	for hi-lo >= 2 && turn(r.p, w[lo].p, w[lo+1].p) <= 0 {
		lo++
	}
	for hi-lo >= 2 && turn(w[hi-2].p, w[hi-1].p, r.p) <= 0 {
		hi--
	}
	return append(w[lo:hi:hi], r)
}

// edge returns the end points of edge k (from vertex k to the next) and
// its outward unit normal in the (X, Z) plane.
func (sp *slicePoly) edge(k int) (p, q vertex, nx, nz float64) {
	p, q = sp.v[k], sp.v[(k+1)%len(sp.v)]
	dx, dz := q.p.X-p.p.X, q.p.Z-p.p.Z
	l := math.Hypot(dx, dz)
	if l == 0 {
		return p, q, 0, 0
	}
	return p, q, dz / l, -dx / l
}

// refine checks edge k against the support function of the slice. If the
// slice reaches beyond the edge's line by more than edgeTol, it adds the
// support point to the polygon (dropping the vertices it hides) and
// reports true; otherwise it records the edge as part of the boundary and
// reports false.
func (sp *slicePoly) refine(k int) bool {
	p, q, nx, nz := sp.edge(k)
	key := [2]int{p.id, q.id}
	if sp.done[key] {
		return false
	}
	if nx == 0 && nz == 0 {
		sp.done[key] = true
		return false
	}
	c, r := sp.s.support(sp.y, nx, nz)
	if nx*(c.X-p.p.X)+nz*(c.Z-p.p.Z) <= edgeTol {
		sp.done[key] = true
		return false
	}
	nv := vertex{p: c, r: r, id: sp.nextID}
	sp.nextID++
	if sp.lab {
		nv.lab = sp.labOf(c)
	}
	sp.v = insertAfter(sp.v, k, nv)
	return true
}

// contains reports whether the point (x, z) lies inside the slice or
// within tol of its boundary. It refines the edges that face the point
// until the point is inside, or beyond a confirmed edge.
func (sp *slicePoly) contains(x, z, tol float64) bool {
	for {
		m := len(sp.v)
		if m < 3 {
			for i := range m {
				p, q := sp.v[i].p, sp.v[(i+1)%m].p
				if segDist(p.X, p.Z, q.X, q.Z, x, z) <= tol {
					return true
				}
			}
			return false
		}
		grew := false
		for k := 0; k < m && !grew; k++ {
			p, _, nx, nz := sp.edge(k)
			if nx*(x-p.p.X)+nz*(z-p.p.Z) <= tol {
				continue // on the inner side of the edge's line, or within tol
			}
			if !sp.refine(k) {
				return false // beyond an edge of the slice's boundary
			}
			grew = true
		}
		if !grew {
			return true
		}
	}
}

// segDist returns the distance of (x, y) from the segment (x0, y0)–(x1, y1).
func segDist(x0, y0, x1, y1, x, y float64) float64 {
	dx, dy := x1-x0, y1-y0
	l2 := dx*dx + dy*dy
	t := 0.0
	if l2 > 0 {
		t = math.Min(math.Max(((x-x0)*dx+(y-y0)*dy)/l2, 0), 1)
	}
	return math.Hypot(x-x0-t*dx, y-y0-t*dy)
}

// insideTwoTransition reports whether (x, z) lies inside the polygon v
// (even–odd rule) or within tol of its edges: a quick test against the
// inner bound of the slice.
func insideTwoTransition(v []colorimetry.XYZ, x, z, tol float64) bool {
	in := false
	m := len(v)
	for i := range m {
		p, q := v[i], v[(i+1)%m]
		if (p.Z > z) != (q.Z > z) && x < p.X+(z-p.Z)*(q.X-p.X)/(q.Z-p.Z) {
			in = !in
		}
	}
	if in {
		return true
	}
	for i := range m {
		p, q := v[i], v[(i+1)%m]
		if segDist(p.X, p.Z, q.X, q.Z, x, z) <= tol {
			return true
		}
	}
	return false
}

// colour returns the point at fraction t of edge k as an optimal colour:
// its tristimulus values and its reflectance interpolated between the two
// vertices (a reflectance in [0, 1] whose tristimulus values are those of
// the point, by linearity).
func (sp *slicePoly) colour(k int, t float64) OptimalColour {
	p, q := sp.v[k], sp.v[(k+1)%len(sp.v)]
	c := colorimetry.XYZ{X: p.p.X + t*(q.p.X-p.p.X), Y: sp.y, Z: p.p.Z + t*(q.p.Z-p.p.Z)}
	rp, rq := sp.s.reflectance(p), sp.s.reflectance(q)
	r := make([]float64, len(rp))
	for i := range r {
		r[i] = rp[i] + t*(rq[i]-rp[i])
	}
	return sp.s.optimal(c, r)
}

// optimal returns the optimal colour of tristimulus values c and
// reflectance r on the grid.
func (s *ObjectSolid) optimal(c colorimetry.XYZ, r []float64) OptimalColour {
	pos, on := edgesOf(r)
	o := OptimalColour{XYZ: c, Edges: make([]float64, len(pos)), BandStop: on}
	for i, x := range pos {
		o.Edges[i] = s.grid.Start + (x-0.5)*s.grid.Step
	}
	// The white is valid (Y = 100, X and Z positive) and c is finite, so
	// Lab cannot fail; black has no chromaticity and keeps the zero XY.
	o.Lab, _ = c.Lab(s.white)
	o.Chromaticity, _ = c.XY()
	return o
}

// edgesOf returns the positions (sample i spans [i, i + 1]) at which a
// reflectance equivalent to r on the grid switches between 0 and 1, and
// whether it starts at 1. A fractional sample is placed against the side
// that is already at 1: left after a 1, right after a 0, so that a
// transition inside a sample costs one edge.
func edgesOf(r []float64) (pos []float64, startsOn bool) {
	const snap = 1e-12
	level := len(r) > 0 && r[0] >= 1-snap
	startsOn = level
	for i, f := range r {
		x := float64(i)
		switch {
		case f >= 1-snap:
			if !level {
				pos = append(pos, x)
				level = true
			}
		case f <= snap:
			if level {
				pos = append(pos, x)
				level = false
			}
		case level:
			pos = append(pos, x+f)
			level = false
		default:
			pos = append(pos, x+1-f)
			level = true
		}
	}
	return pos, startsOn
}

// checkXYZ returns an error unless c is finite.
func checkXYZ(c colorimetry.XYZ) error {
	if !c.Finite() {
		return fmt.Errorf("object colour %v: %w", c, colorimetry.ErrNotFinite)
	}
	return nil
}

// Realisable reports whether the object colour c (tristimulus values on
// the scale perfect diffuser Y = 100, same illuminant and observer) lies
// inside the object-colour solid, or on its boundary within 1e-9: whether
// some reflectance with values in [0, 1] has these tristimulus values on
// the solid's grid.
//
// It cuts the solid at c's luminance Y and tests whether c lies inside
// that slice in the (X, Z) plane, which is the same as testing its
// chromaticity against the MacAdam limit at that Y (see ObjectSolid for
// the method). Special cases are:
//
//	Y < 0 or Y > 100 (beyond 1e-9): false
//	Y = 0: true only for black, X = Z = 0
//	Y = 100: true only for the perfect diffuser's X and Z
//
// It returns an error wrapping colorimetry.ErrNotFinite for a non-finite c.
func (s *ObjectSolid) Realisable(c colorimetry.XYZ) (bool, error) {
	if err := checkXYZ(c); err != nil {
		return false, err
	}
	const tol = realisableTol
	switch {
	case c.Y < -tol || c.Y > s.total.Y+tol:
		return false, nil
	case c.Y <= tol:
		return math.Hypot(c.X, c.Z) <= tol, nil
	case c.Y >= s.total.Y-tol:
		return math.Hypot(c.X-s.total.X, c.Z-s.total.Z) <= tol, nil
	}
	return s.contains(c, tol), nil
}

// contains reports whether c, with 0 < Y < total Y, lies in the slice at
// its Y or within tol of its boundary: first against the two-transition
// polygon, then exactly.
func (s *ObjectSolid) contains(c colorimetry.XYZ, tol float64) bool {
	v, p := s.twoTransition(c.Y)
	if insideTwoTransition(p, c.X, c.Z, tol) {
		return true
	}
	sp := s.hullSlice(v, p)
	sp.y = c.Y
	return sp.contains(c.X, c.Z, tol)
}

// ErrLightness reports a CIE lightness L* outside 0–100, or one at which
// the object-colour solid has no extent (0 or 100) where a slice is asked
// for.
var ErrLightness = errors.New("lightness outside the object-colour solid")

// lightnessY returns the luminance Y (perfect diffuser 100) of CIE
// lightness l, or an error for l outside [0, 100] or not finite.
func (s *ObjectSolid) lightnessY(l float64) (float64, error) {
	if math.IsNaN(l) || math.IsInf(l, 0) {
		return 0, fmt.Errorf("lightness %g: %w", l, colorimetry.ErrNotFinite)
	}
	if l < 0 || l > 100 {
		return 0, fmt.Errorf("lightness L* = %g: %w", l, ErrLightness)
	}
	c, err := colorimetry.Lab{L: l}.XYZ(s.white)
	if err != nil {
		return 0, err
	}
	return c.Y, nil
}

// labSlice returns the slice at lightness l with CIELAB on its vertices,
// or nil (and no error) at l = 0 or 100, where the solid is a point.
func (s *ObjectSolid) labSlice(l float64) (*slicePoly, error) {
	y, err := s.lightnessY(l)
	if err != nil {
		return nil, err
	}
	if !(y > 0 && y < s.total.Y) {
		return nil, nil
	}
	return s.newSlice(y, true), nil
}

// hueCrossing returns where the ray from the neutral axis at hue angle h
// (degrees) leaves the polygon in the (a*, b*) plane, at its outermost
// crossing: the edge k and the fraction t along it. ok is false when no
// edge crosses the ray, which a slice strictly between black and white
// cannot do.
//
// The polygon is straight in (X, Z) but curved in (a*, b*); an edge whose
// ends lie on either side of the ray (or on it) is searched by bisection
// on the side of the ray.
func (sp *slicePoly) hueCrossing(h float64) (k int, t float64, ok bool) {
	sin, cos := math.Sincos(h * math.Pi / 180)
	side := func(l colorimetry.Lab) float64 { return sin*l.A - cos*l.B }
	along := func(l colorimetry.Lab) float64 { return cos*l.A + sin*l.B }
	at := func(i int, t float64) colorimetry.Lab {
		p, q := sp.v[i].p, sp.v[(i+1)%len(sp.v)].p
		return sp.labOf(colorimetry.XYZ{X: p.X + t*(q.X-p.X), Z: p.Z + t*(q.Z-p.Z)})
	}
	m := len(sp.v)
	best := -1.0
	for i := range m {
		p, q := sp.v[i].lab, sp.v[(i+1)%m].lab
		sp0, sq := side(p), side(q)
		if (sp0 > 0 && sq > 0) || (sp0 < 0 && sq < 0) || (along(p) <= 0 && along(q) <= 0) {
			continue
		}
		var tt float64
		switch {
		case sp0 == 0:
			tt = 0
		case sq == 0:
			tt = 1
		default:
			lo, hi := 0.0, 1.0
			for range 64 {
				mid := 0.5 * (lo + hi)
				if mid <= lo || mid >= hi {
					break
				}
				if sm := side(at(i, mid)); sm != 0 && (sm < 0) == (sp0 < 0) {
					lo = mid
				} else {
					hi = mid
				}
			}
			tt = 0.5 * (lo + hi)
		}
		l := at(i, tt)
		if a := along(l); a > 0 && a > best {
			best, k, t, ok = a, i, tt, true
		}
	}
	return k, t, ok
}

// hueColour returns the optimal colour of greatest chroma at hue angle h
// (degrees) in the slice, refining the crossed edge until it is confirmed
// on the boundary.
func (sp *slicePoly) hueColour(h float64) (OptimalColour, error) {
	for {
		k, t, ok := sp.hueCrossing(h)
		if !ok {
			return OptimalColour{}, fmt.Errorf("object-colour solid at Y = %g: no boundary at hue %g° (slice of %d vertices)", sp.y, h, len(sp.v))
		}
		if !sp.refine(k) {
			return sp.colour(k, t), nil
		}
	}
}

// MaxChroma returns the largest chroma C*ab (CIE units) of an object
// colour of CIE lightness l (0–100) and hue angle hue (degrees, any finite
// value) under the solid's illuminant and observer, CIELAB relative to
// White: the distance from the neutral axis to the boundary of the solid's
// slice at that lightness along the hue direction, at its outermost
// crossing. The crossing is found to about 1e-12 of an edge of the slice,
// which is exact on the solid's grid (see ObjectSolid). Special cases are:
//
//	MaxChroma(0, h) = MaxChroma(100, h) = 0 (only black and the white)
//
// It returns an error wrapping ErrLightness for l outside [0, 100] and
// colorimetry.ErrNotFinite for a non-finite l or hue.
func (s *ObjectSolid) MaxChroma(l, hue float64) (float64, error) {
	if math.IsNaN(hue) || math.IsInf(hue, 0) {
		return 0, fmt.Errorf("hue angle %g: %w", hue, colorimetry.ErrNotFinite)
	}
	sp, err := s.labSlice(l)
	if err != nil || sp == nil {
		return 0, err
	}
	o, err := sp.hueColour(hue)
	if err != nil {
		return 0, err
	}
	return o.Lab.LCh().C, nil
}

// Boundary returns the boundary of the object-colour solid at CIE
// lightness l (0 < l < 100) as optimal colours. With n > 0 they are the n
// colours of greatest chroma at the hue angles h_ab = 0°, 360°/n,
// 2·360°/n, … (see MaxChroma). With n = 0 they are every vertex of the
// exact slice polygon, up to about twice the number of grid samples, in
// order of increasing hue angle from the smallest, for plots; this costs
// one solution of the support function per edge (milliseconds on the 1 nm
// grid). Each colour carries its CIELAB, x, y and the transition
// wavelengths of its reflectance.
//
// It returns an error wrapping ErrLightness for l outside (0, 100) (the
// solid is a point at 0 and 100), colorimetry.ErrNotFinite for a
// non-finite l, and an error for negative n.
func (s *ObjectSolid) Boundary(l float64, n int) ([]OptimalColour, error) {
	if n < 0 {
		return nil, fmt.Errorf("boundary at L* = %g: %d hue angles asked for", l, n)
	}
	sp, err := s.labSlice(l)
	if err != nil {
		return nil, err
	}
	if sp == nil {
		return nil, fmt.Errorf("boundary at L* = %g: %w (the solid is a point there)", l, ErrLightness)
	}
	if n == 0 {
		return sp.vertices(), nil
	}
	out := make([]OptimalColour, n)
	for i := range out {
		if out[i], err = sp.hueColour(360 * float64(i) / float64(n)); err != nil {
			return nil, err
		}
	}
	return out, nil
}

// vertices confirms or refines every edge of the slice and returns its
// vertices as optimal colours, turning counter-clockwise in the (a*, b*)
// plane from the vertex of smallest hue angle.
func (sp *slicePoly) vertices() []OptimalColour {
	for k := 0; k < len(sp.v); {
		if sp.refine(k) {
			k = 0 // the hull changed; confirmed edges are skipped quickly
			continue
		}
		k++
	}
	m := len(sp.v)
	out := make([]OptimalColour, m)
	var area float64 // twice the signed area in (a*, b*)
	for i, q := range sp.v {
		out[i] = sp.s.optimal(colorimetry.XYZ{X: q.p.X, Y: sp.y, Z: q.p.Z}, sp.s.reflectance(q))
		p, r := sp.v[i].lab, sp.v[(i+1)%m].lab
		area += p.A*r.B - r.A*p.B
	}
	if area < 0 {
		slices.Reverse(out)
	}
	first := 0
	for i := range out {
		if out[i].Lab.LCh().H < out[first].Lab.LCh().H {
			first = i
		}
	}
	return slices.Concat(out[first:], out[:first])
}

// MaxLuminance returns the optimal colour of chromaticity c with the
// greatest luminance Y: the MacAdam limit at c (MacAdam 1935). No object
// colour of that chromaticity has a higher Y under the solid's illuminant
// and observer. Y is found by bisection, to about 1e-9 relative (the
// realisable luminances of a chromaticity form an interval from 0, since
// the solid is convex and contains black), and the chromaticity of the
// result matches c to about 1e-10. The white's own chromaticity gives the
// perfect diffuser. It costs some forty slices (milliseconds on the 1 nm
// grid).
//
// It returns an error wrapping colorimetry.ErrNotFinite for a non-finite
// c, and colorimetry.ErrOutOfGamut for a chromaticity with y ≤ 0 or outside
// the chromaticities the solid reaches (the spectrum locus on its grid,
// closed by the line between the grid's end wavelengths).
func (s *ObjectSolid) MaxLuminance(c colorimetry.XY) (OptimalColour, error) {
	if math.IsNaN(c.X) || math.IsInf(c.X, 0) || math.IsNaN(c.Y) || math.IsInf(c.Y, 0) {
		return OptimalColour{}, fmt.Errorf("chromaticity (%g, %g): %w", c.X, c.Y, colorimetry.ErrNotFinite)
	}
	if !(c.Y > 0) {
		return OptimalColour{}, fmt.Errorf("chromaticity (%g, %g): %w (y ≤ 0)", c.X, c.Y, colorimetry.ErrOutOfGamut)
	}
	n := s.grid.N
	whole := func() OptimalColour {
		r := make([]float64, n)
		for i := range r {
			r[i] = 1
		}
		return s.optimal(s.total, r)
	}
	if wxy, _ := s.total.XY(); math.Hypot(c.X-wxy.X, c.Y-wxy.Y) < 1e-12 {
		return whole(), nil
	}
	at := func(y float64) colorimetry.XYZ {
		return colorimetry.XYZ{X: y * c.X / c.Y, Y: y, Z: y * (1 - c.X - c.Y) / c.Y}
	}
	lo, hi := 1e-9*s.total.Y, s.total.Y
	if !s.contains(at(lo), limitTol) {
		return OptimalColour{}, fmt.Errorf("chromaticity (%g, %g): %w: no object colour under this illuminant has it", c.X, c.Y, colorimetry.ErrOutOfGamut)
	}
	for hi-lo > 1e-10 {
		mid := 0.5 * (lo + hi)
		if mid <= lo || mid >= hi {
			break
		}
		if s.contains(at(mid), limitTol) {
			lo = mid
		} else {
			hi = mid
		}
	}
	// The boundary point where the ray from the neutral point through c
	// leaves the slice at lo: c itself, to the bisection's tolerance.
	sp := s.newSlice(lo, false)
	g := s.total.Scale(lo / s.total.Y)
	p := at(lo)
	for {
		k, t, ok := rayExit(sp.v, g.X, g.Z, p.X-g.X, p.Z-g.Z)
		if !ok {
			return whole(), nil // c at the white to within the bisection
		}
		if !sp.refine(k) {
			return sp.colour(k, t), nil
		}
	}
}

// rayExit returns the edge k and the fraction t along it where the ray
// (x0, z0) + u·(dx, dz), u > 0, leaves the polygon of the vertices v in the
// (X, Z) plane, at its outermost crossing; ok is false when none crosses.
func rayExit(v []vertex, x0, z0, dx, dz float64) (k int, t float64, ok bool) {
	best := 0.0
	m := len(v)
	for i := range m {
		p, q := v[i].p, v[(i+1)%m].p
		ex, ez := q.X-p.X, q.Z-p.Z
		den := dx*ez - dz*ex
		if den == 0 {
			continue
		}
		ax, az := p.X-x0, p.Z-z0
		s := (ax*dz - az*dx) / den
		if s < 0 || s > 1 {
			continue
		}
		if u := (ax*ez - az*ex) / den; u > best {
			best, k, t, ok = u, i, s, true
		}
	}
	return k, t, ok
}

// Reflectance returns the reflectance of the optimal colour o on the
// solid's grid: starting at 1 if o.BandStop and 0 otherwise, switching at
// each of o.Edges, with the covered share of the sample's interval
// [λᵢ − Δλ/2, λᵢ + Δλ/2] at a sample that holds an edge. Its tristimulus
// values under the solid's weights are o.XYZ (to round-off). It
// interpolates linearly.
//
// It returns an error wrapping colorimetry.ErrNotFinite for a non-finite
// edge and colorimetry.ErrCoverage for edges that decrease or lie more
// than half a step beyond the ends of the grid.
func (s *ObjectSolid) Reflectance(o OptimalColour) (colorimetry.Spectrum, error) {
	g := s.grid
	n := float64(g.N)
	const slack = 1e-9 // positions, for round-off in the wavelengths
	pos := make([]float64, 0, len(o.Edges)+2)
	if o.BandStop {
		pos = append(pos, 0)
	}
	prev := math.Inf(-1)
	for _, e := range o.Edges {
		if math.IsNaN(e) || math.IsInf(e, 0) {
			return colorimetry.Spectrum{}, fmt.Errorf("optimal colour edge %g nm: %w", e, colorimetry.ErrNotFinite)
		}
		x := (e-g.Start)/g.Step + 0.5
		if x < -slack || x > n+slack || x < prev-slack {
			return colorimetry.Spectrum{}, fmt.Errorf("optimal colour edges %v nm on %v: %w", o.Edges, g, colorimetry.ErrCoverage)
		}
		x = math.Min(math.Max(x, math.Max(prev, 0)), n)
		pos = append(pos, x)
		prev = x
	}
	if len(pos)%2 == 1 {
		pos = append(pos, n)
	}
	r := make([]float64, g.N)
	for i := 0; i < len(pos); i += 2 {
		addCover(r, pos[i], pos[i+1])
	}
	for i := range r {
		r[i] = math.Min(r[i], 1)
	}
	return colorimetry.NewSpectrumOnGrid(g, r, colorimetry.Options{Interp: colorimetry.InterpLinear})
}
