package mixing

import (
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"hash/fnv"
	"math"
	"strings"
	"sync"

	"github.com/antipode-color/antipode/colorimetry"
)

// KindPigments is the model kind of Pigments in model files.
const KindPigments = "pigments"

func init() {
	register(KindPigments, func(raw json.RawMessage) (Model, error) {
		p := new(Pigments)
		if err := json.Unmarshal(raw, p); err != nil {
			return nil, err
		}
		return p, nil
	})
}

// ErrPigments reports an invalid pigment model: a missing white, a
// colorant without spectra, values that are negative or not finite.
var ErrPigments = errors.New("invalid pigment model")

// Colorant is one colorant of a pigment model: its unit absorption K and
// scattering S per band of the model's grid, per unit mass fraction, both
// relative to the scattering of the white (whose S is 1 when the model was
// calibrated by FitPigments). Only ratios of K and S enter an opaque
// film's colour, so the common scale is free.
type Colorant struct {
	Name string
	K    []float64 // unit absorption per band, ≥ 0
	S    []float64 // unit scattering per band, ≥ 0
}

// Pigments is a two-constant Kubelka–Munk model of opaque paint films: a
// white and chromatic colorants mixed by mass fraction c, with
// K_mix = Σ cᵢ·Kᵢ and S_mix = Σ cᵢ·Sᵢ at each wavelength, R∞ of K_mix/S_mix
// inside the film and the Saunderson correction to the measured
// reflectance. Its model-file kind is "pigments".
//
// A Pigments is not modified by its methods and may be shared between
// goroutines. Validate checks its invariants; Load validates.
type Pigments struct {
	// Grid holds the model's wavelengths (nm); every Colorant has one K
	// and one S per wavelength.
	Grid colorimetry.Grid
	// Colorants lists the white and the chromatic colorants.
	Colorants []Colorant
	// White names the white among Colorants.
	White string
	// Surface is the Saunderson correction of the measurements the model
	// was calibrated from and predicts.
	Surface Saunderson
	// Illuminant and Observer name the conditions of the calibration's
	// colour differences (the fit report's ΔE00); informational.
	Illuminant, Observer string
	// Fit is the calibration's fit report; nil for a model not fitted by
	// FitPigments.
	Fit *FitReport
}

// Kind returns "pigments".
func (p *Pigments) Kind() string { return KindPigments }

// Names returns the colorant names in the model's order.
func (p *Pigments) Names() []string {
	n := make([]string, len(p.Colorants))
	for i, c := range p.Colorants {
		n[i] = c.Name
	}
	return n
}

// index returns the position of the named colorant (case-insensitive), or
// −1.
func (p *Pigments) index(name string) int {
	for i, c := range p.Colorants {
		if strings.EqualFold(c.Name, name) {
			return i
		}
	}
	return -1
}

// whiteIndex returns the position of the white.
func (p *Pigments) whiteIndex() int { return p.index(p.White) }

// Validate checks the model: a valid grid, unique non-empty names, K and S
// of the grid's length, finite and ≥ 0, a white among the colorants with S
// > 0 at every wavelength, and a valid Saunderson correction. Errors wrap
// ErrPigments and name the colorant and wavelength.
func (p *Pigments) Validate() error {
	if !p.Grid.Valid() {
		return fmt.Errorf("%w: wavelength grid %+v", ErrPigments, p.Grid)
	}
	if len(p.Colorants) < 2 {
		return fmt.Errorf("%w: %d colorants; want a white and at least one other", ErrPigments, len(p.Colorants))
	}
	seen := map[string]bool{}
	for _, c := range p.Colorants {
		key := strings.ToLower(c.Name)
		if strings.TrimSpace(c.Name) == "" {
			return fmt.Errorf("%w: a colorant has no name", ErrPigments)
		}
		if seen[key] {
			return fmt.Errorf("%w: colorant %q appears twice", ErrPigments, c.Name)
		}
		seen[key] = true
		if len(c.K) != p.Grid.N || len(c.S) != p.Grid.N {
			return fmt.Errorf("%w: colorant %q has %d K and %d S values for %d wavelengths", ErrPigments, c.Name, len(c.K), len(c.S), p.Grid.N)
		}
		for i := range c.K {
			for _, v := range [2]struct {
				what string
				x    float64
			}{{"K", c.K[i]}, {"S", c.S[i]}} {
				if !(v.x >= 0) || math.IsInf(v.x, 0) {
					return fmt.Errorf("%w: colorant %q, %s at %g nm = %g: want a finite value ≥ 0", ErrPigments, c.Name, v.what, p.Grid.Wavelength(i), v.x)
				}
			}
		}
	}
	w := p.whiteIndex()
	if w < 0 {
		return fmt.Errorf("%w: the white %q is not among the colorants (%s)", ErrPigments, p.White, strings.Join(p.Names(), ", "))
	}
	for i, s := range p.Colorants[w].S {
		if !(s > 0) {
			return fmt.Errorf("%w: the white %q has no scattering at %g nm", ErrPigments, p.White, p.Grid.Wavelength(i))
		}
	}
	if err := p.Surface.Validate(); err != nil {
		return fmt.Errorf("%w: %v", ErrPigments, err)
	}
	return nil
}

// pigmentsJSON is the on-disk form of the "model" object of a pigments
// model file.
type pigmentsJSON struct {
	Grid      gridJSON `json:"grid"`
	White     string   `json:"white"`
	Colorants []struct {
		Name string    `json:"name"`
		K    []float64 `json:"k_unit"`
		S    []float64 `json:"s_unit"`
	} `json:"colorants"`
	Surface struct {
		K1               float64  `json:"k1"`
		K2               float64  `json:"k2"`
		Specular         string   `json:"specular"`
		RefractiveIndex  *float64 `json:"refractive_index"`
		InternalOpticsOf string   `json:"correction"`
	} `json:"surface"`
	Illuminant string     `json:"illuminant"`
	Observer   string     `json:"observer"`
	Fit        *FitReport `json:"fit"`
}

// MarshalJSON writes the model's fields (the "model" object of a model
// file): grid {start_nm, step_nm, n}, white, colorants [{name,
// k_unit, s_unit}], surface {k1, k2, specular "included"|"excluded",
// refractive_index, correction}, illuminant, observer, fit.
func (p *Pigments) MarshalJSON() ([]byte, error) {
	var j pigmentsJSON
	j.Grid.Start, j.Grid.Step, j.Grid.N = p.Grid.Start, p.Grid.Step, p.Grid.N
	j.White = p.White
	for _, c := range p.Colorants {
		j.Colorants = append(j.Colorants, struct {
			Name string    `json:"name"`
			K    []float64 `json:"k_unit"`
			S    []float64 `json:"s_unit"`
		}{c.Name, c.K, c.S})
	}
	j.Surface.K1, j.Surface.K2 = p.Surface.K1, p.Surface.K2
	j.Surface.Specular = "included"
	if p.Surface.SpecularExcluded {
		j.Surface.Specular = "excluded"
	}
	if p.Surface.RefractiveIndex != 0 {
		n := p.Surface.RefractiveIndex
		j.Surface.RefractiveIndex = &n
	}
	j.Surface.InternalOpticsOf = "Saunderson"
	j.Illuminant, j.Observer, j.Fit = p.Illuminant, p.Observer, p.Fit
	return json.Marshal(j)
}

// UnmarshalJSON reads the model's fields and validates them.
func (p *Pigments) UnmarshalJSON(b []byte) error {
	var j pigmentsJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	q := Pigments{
		Grid:       colorimetry.Grid{Start: j.Grid.Start, Step: j.Grid.Step, N: j.Grid.N},
		White:      j.White,
		Illuminant: j.Illuminant,
		Observer:   j.Observer,
		Fit:        j.Fit,
		Surface:    Saunderson{K1: j.Surface.K1, K2: j.Surface.K2},
	}
	switch j.Surface.Specular {
	case "included", "":
	case "excluded":
		q.Surface.SpecularExcluded = true
	default:
		return fmt.Errorf("%w: surface.specular %q: want \"included\" or \"excluded\"", ErrPigments, j.Surface.Specular)
	}
	if j.Surface.RefractiveIndex != nil {
		q.Surface.RefractiveIndex = *j.Surface.RefractiveIndex
	}
	for _, c := range j.Colorants {
		q.Colorants = append(q.Colorants, Colorant{Name: c.Name, K: c.K, S: c.S})
	}
	if err := q.Validate(); err != nil {
		return err
	}
	*p = q
	return nil
}

// amountVector turns named amounts into one weight per colorant, in the
// model's order. Unknown names, negative or non-finite values and an
// all-zero recipe are errors.
func (p *Pigments) amountVector(amounts []Amount) ([]float64, error) {
	c := make([]float64, len(p.Colorants))
	var sum float64
	for _, a := range amounts {
		i := p.index(a.Name)
		if i < 0 {
			return nil, fmt.Errorf("no colorant %q in the model (it has %s)", a.Name, strings.Join(p.Names(), ", "))
		}
		if !(a.Value >= 0) || math.IsInf(a.Value, 0) {
			return nil, fmt.Errorf("colorant %q: mass fraction %g: want a finite value ≥ 0", a.Name, a.Value)
		}
		c[i] += a.Value
		sum += a.Value
	}
	if sum == 0 {
		return nil, fmt.Errorf("the recipe has no colorant in it")
	}
	return c, nil
}

// Reflectance returns the measured reflectance (fraction 0–1, with the
// model's Saunderson correction) of an opaque film of the mix, on the
// model's grid. Amounts are mass fractions by colorant name; an opaque
// film's colour depends only on their ratios, so amounts that do not sum
// to 1 give the film of the normalised recipe. It returns an error for an
// unknown name, a negative amount or an empty recipe.
func (p *Pigments) Reflectance(amounts []Amount) (colorimetry.Spectrum, error) {
	if err := p.Validate(); err != nil {
		return colorimetry.Spectrum{}, err
	}
	c, err := p.amountVector(amounts)
	if err != nil {
		return colorimetry.Spectrum{}, err
	}
	v := make([]float64, p.Grid.N)
	for l := range v {
		var k, s float64
		for i, ci := range c {
			k += ci * p.Colorants[i].K[l]
			s += ci * p.Colorants[i].S[l]
		}
		q := math.Inf(1)
		if s > 0 {
			q = k / s
		}
		v[l] = p.Surface.Measured(ReflectanceInf(q))
	}
	return colorimetry.NewSpectrumOnGrid(p.Grid, v, colorimetry.Options{})
}

// onGrid resamples a measured spectrum onto the model's grid and returns
// its values, with a warning when the spectrum does not cover the grid.
func (p *Pigments) onGrid(s colorimetry.Spectrum, what string) ([]float64, []string, error) {
	if s.IsZero() {
		return nil, nil, fmt.Errorf("%s: empty spectrum", what)
	}
	var warns []string
	g := s.Grid()
	if g.Start > p.Grid.Start+1e-9 || g.End() < p.Grid.End()-1e-9 {
		warns = append(warns, fmt.Sprintf("%s covers %s, less than the model's %s; end values repeated", what, g, p.Grid))
	}
	r, err := s.Resample(p.Grid)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", what, err)
	}
	return r.Values(nil), warns, nil
}

// internalKS converts measured reflectances (on the model's grid) to the
// K/S of the film, clamping with a warning where the internal reflectance
// falls outside (0, 1].
func (p *Pigments) internalKS(rm []float64, what string) ([]float64, []string) {
	q := make([]float64, len(rm))
	var clamped []string
	for l, x := range rm {
		var c bool
		q[l], c = KSClamped(p.Surface.Internal(x))
		if c {
			clamped = append(clamped, fmt.Sprintf("%g nm", p.Grid.Wavelength(l)))
		}
	}
	if len(clamped) > 0 {
		return q, []string{fmt.Sprintf("%s: internal reflectance outside (0, 1] at %s; K/S clamped (reflectance taken as 1e-4 or 1)", what, strings.Join(clamped, ", "))}
	}
	return q, nil
}

// effWeights is a weighting table folded onto the model's grid: the
// tristimulus values of a spectrum sampled on the model grid are the three
// dot products with x, y, z. Because interpolation onto the computation
// grid is linear in the data, this gives the same XYZ as Weights.XYZ of
// the spectrum (to rounding), at a fraction of the cost.
type effWeights struct {
	name    string
	x, y, z []float64
	white   colorimetry.XYZ
	full    *colorimetry.Weights // the weights on the computation grid
}

// effCacheKey identifies folded weights: the observer (immutable, so its
// identity will do), the illuminant by name and by a hash of its grid and
// values (two files may share a name), and the model grid.
type effCacheKey struct {
	obs     *colorimetry.Observer
	ill     string
	illHash uint64
	grid    colorimetry.Grid
}

// effCache keeps folded weights between solves: folding resamples one unit
// spectrum per sample, which costs as much as a whole recipe search of a
// few combinations. The entries are immutable; the cache is bounded.
var effCache struct {
	sync.Mutex
	m map[effCacheKey]*effWeights
}

const effCacheMax = 64

// newEffWeights returns the object weights of obs and ill folded onto the
// grid g, computing the XYZ of each unit spectrum on g the first time and
// reusing the result afterwards. The result must not be modified.
func newEffWeights(obs *colorimetry.Observer, ill colorimetry.NamedIlluminant, g colorimetry.Grid) (*effWeights, error) {
	h := fnv.New64a()
	var buf [8]byte
	for _, v := range []float64{ill.Spectrum.Grid().Start, ill.Spectrum.Grid().Step, float64(ill.Spectrum.Len())} {
		binary.LittleEndian.PutUint64(buf[:], math.Float64bits(v))
		h.Write(buf[:])
	}
	for i := range ill.Spectrum.Len() {
		binary.LittleEndian.PutUint64(buf[:], math.Float64bits(ill.Spectrum.Value(i)))
		h.Write(buf[:])
	}
	key := effCacheKey{obs: obs, ill: ill.Name, illHash: h.Sum64(), grid: g}
	effCache.Lock()
	e, ok := effCache.m[key]
	effCache.Unlock()
	if ok {
		return e, nil
	}
	e, err := foldWeights(obs, ill, g)
	if err != nil {
		return nil, err
	}
	effCache.Lock()
	if effCache.m == nil || len(effCache.m) >= effCacheMax {
		effCache.m = make(map[effCacheKey]*effWeights)
	}
	effCache.m[key] = e
	effCache.Unlock()
	return e, nil
}

// foldWeights folds the object weights of obs and ill onto the grid g by
// computing the XYZ of each unit spectrum on g.
func foldWeights(obs *colorimetry.Observer, ill colorimetry.NamedIlluminant, g colorimetry.Grid) (*effWeights, error) {
	w, err := colorimetry.NewObjectWeights(obs, ill.Spectrum, colorimetry.ComputationGrid(g))
	if err != nil {
		return nil, fmt.Errorf("illuminant %s: %w", ill.Name, err)
	}
	e := &effWeights{name: ill.Name, x: make([]float64, g.N), y: make([]float64, g.N), z: make([]float64, g.N), white: w.White(), full: w}
	unit := make([]float64, g.N)
	for i := range unit {
		unit[i] = 1
		s, err := colorimetry.NewSpectrumOnGrid(g, unit, colorimetry.Options{})
		if err != nil {
			return nil, err
		}
		c, err := w.XYZ(s)
		if err != nil {
			return nil, err
		}
		e.x[i], e.y[i], e.z[i] = c.X, c.Y, c.Z
		unit[i] = 0
	}
	return e, nil
}

// xyz returns the tristimulus values of r (on the model's grid).
func (e *effWeights) xyz(r []float64) colorimetry.XYZ {
	var c colorimetry.XYZ
	for i, v := range r {
		c.X += v * e.x[i]
		c.Y += v * e.y[i]
		c.Z += v * e.z[i]
	}
	return c
}

// lab returns CIELAB of r relative to the weights' white.
func (e *effWeights) lab(r []float64) colorimetry.Lab {
	return labOf(e.xyz(r), e.white)
}

// labOf is XYZ.Lab for a valid white, without the error (the white comes
// from NewObjectWeights and is valid).
func labOf(c, white colorimetry.XYZ) colorimetry.Lab {
	fx, fy, fz := kmLabF(c.X/white.X), kmLabF(c.Y/white.Y), kmLabF(c.Z/white.Z)
	return colorimetry.Lab{L: 116*fy - 16, A: 500 * (fx - fy), B: 200 * (fy - fz)}
}

// CIELAB constants of CIE 015:2018 §8 (δ = 6/29), as in package
// colorimetry.
const (
	kmLabDelta = 6.0 / 29.0
	kmLabEps   = kmLabDelta * kmLabDelta * kmLabDelta
	kmLabSlope = 1 / (3 * kmLabDelta * kmLabDelta)
)

// kmLabF is the CIELAB function f(t).
func kmLabF(t float64) float64 {
	if t > kmLabEps {
		return math.Cbrt(t)
	}
	return kmLabSlope*t + 4.0/29.0
}

// kmLabFSlope is df/dt.
func kmLabFSlope(t float64) float64 {
	if t > kmLabEps {
		c := math.Cbrt(t)
		return 1 / (3 * c * c)
	}
	return kmLabSlope
}

// labJac returns the Jacobian of CIELAB with respect to X, Y, Z at c.
func labJac(c, white colorimetry.XYZ) [3][3]float64 {
	dx := kmLabFSlope(c.X/white.X) / white.X
	dy := kmLabFSlope(c.Y/white.Y) / white.Y
	dz := kmLabFSlope(c.Z/white.Z) / white.Z
	return [3][3]float64{
		{0, 116 * dy, 0},
		{500 * dx, -500 * dy, 0},
		{0, 200 * dy, -200 * dz},
	}
}

// de00Metric returns the upper-triangular factor U (UᵀU = M) of the local
// quadratic form of CIEDE2000 at the colour t: for small differences d in
// CIELAB, ΔE00(t, t + d)² ≈ dᵀ·M·d, so ‖U·d‖ approximates ΔE00. M is found
// by polarisation from ΔE00 at steps of h = 1e-3 along the axes and their
// sums. A target whose form is not positive definite (it always is for
// CIEDE2000; the fallback is defensive) gets the identity, i.e. ΔE*ab.
func de00Metric(t colorimetry.Lab) [3][3]float64 {
	const h = 1e-3
	add := func(d [3]float64) colorimetry.Lab {
		return colorimetry.Lab{L: t.L + d[0], A: t.A + d[1], B: t.B + d[2]}
	}
	sq := func(d [3]float64) float64 {
		e := colorimetry.DeltaE2000(t, add(d))
		return e * e / (h * h)
	}
	var m [3][3]float64
	var diag [3]float64
	for i := range 3 {
		var d [3]float64
		d[i] = h
		diag[i] = sq(d)
		m[i][i] = diag[i]
	}
	for i := range 3 {
		for j := i + 1; j < 3; j++ {
			var d [3]float64
			d[i], d[j] = h, h
			m[i][j] = 0.5 * (sq(d) - diag[i] - diag[j])
			m[j][i] = m[i][j]
		}
	}
	// Cholesky M = UᵀU.
	var u [3][3]float64
	for i := range 3 {
		s := m[i][i]
		for k := range i {
			s -= u[k][i] * u[k][i]
		}
		if !(s > 0) {
			return [3][3]float64{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
		}
		u[i][i] = math.Sqrt(s)
		for j := i + 1; j < 3; j++ {
			v := m[i][j]
			for k := range i {
				v -= u[k][i] * u[k][j]
			}
			u[i][j] = v / u[i][i]
		}
	}
	return u
}
