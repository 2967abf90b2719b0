package complement

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/antipode-color/antipode/colorimetry"
)

// Library is a set of spectra on the computation grid of one Conditions,
// with their tristimulus values (as lights and as object colours) and the
// sums the partner search needs, all computed once. It is immutable and
// safe for concurrent use.
type Library struct {
	c      *Conditions
	names  []string
	n      int       // samples per spectrum, c.grid.N
	values []float64 // the spectra one after another, len N·n
	xyz    [2][]float64
	sumSq  []float64 // Σ b²
	dotW   [2][]float64
	minV   []float64 // smallest sample
	peak   []float64 // largest sample
}

// NewLibrary returns the library of spectra, with their names (nil for
// none), resampled onto the computation grid of c by their own rules. It
// returns an error naming the entry (counted from 1) for an empty spectrum
// or one that does not overlap the grid, and an error when names and
// spectra differ in number.
func (c *Conditions) NewLibrary(names []string, spectra []colorimetry.Spectrum) (*Library, error) {
	if names != nil && len(names) != len(spectra) {
		return nil, fmt.Errorf("library: %d names for %d spectra", len(names), len(spectra))
	}
	n := c.grid.N
	values := make([]float64, len(spectra)*n)
	for j, s := range spectra {
		name := entryName(names, j)
		if s.IsZero() {
			return nil, inputErr(name, fmt.Errorf("empty spectrum: %w", colorimetry.ErrTooFew))
		}
		sg := s.Grid()
		if sg.End() < c.grid.Start || sg.Start > c.grid.End() {
			return nil, inputErr(name, fmt.Errorf("%w: data %v, computation grid %v", colorimetry.ErrNoOverlap, sg, c.grid))
		}
		r, err := s.Resample(c.grid)
		if err != nil {
			return nil, inputErr(name, err)
		}
		r.Values(values[j*n : (j+1)*n])
	}
	return c.newLibrary(names, values)
}

// NewLibraryOnGrid returns the library of spectra sampled on c.Grid() and
// stored one after another in values (len N·Grid().N), with their names
// (nil for none). The values are copied. It returns an error when the
// length of values is not a multiple of the grid size, names and spectra
// differ in number, or a value is not finite (naming the entry and
// wavelength).
func (c *Conditions) NewLibraryOnGrid(names []string, values []float64) (*Library, error) {
	n := c.grid.N
	if len(values)%n != 0 {
		return nil, fmt.Errorf("library: %d values are not a whole number of spectra of %d samples (%v)", len(values), n, c.grid)
	}
	if names != nil && len(names) != len(values)/n {
		return nil, fmt.Errorf("library: %d names for %d spectra", len(names), len(values)/n)
	}
	for i, v := range values {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, inputErr(entryName(names, i/n), &colorimetry.SampleError{Index: i % n, Wavelength: c.grid.Wavelength(i % n), Err: colorimetry.ErrNotFinite})
		}
	}
	return c.newLibrary(names, slices.Clone(values))
}

// newLibrary precomputes the library's sums; values is kept.
func (c *Conditions) newLibrary(names []string, values []float64) (*Library, error) {
	n := c.grid.N
	k := len(values) / n
	l := &Library{c: c, n: n, values: values, names: slices.Clone(names)}
	for i, w := range []*colorimetry.Weights{c.litW, c.objW} {
		l.xyz[i] = w.XYZBatchTo(make([]float64, 3*k), values)
	}
	l.sumSq = make([]float64, k)
	l.dotW[0], l.dotW[1] = make([]float64, k), make([]float64, k)
	l.minV, l.peak = make([]float64, k), make([]float64, k)
	for j := range k {
		v := values[j*n : (j+1)*n]
		lo, hi := math.Inf(1), math.Inf(-1)
		var sq, di, ds float64
		for i, x := range v {
			sq += x * x
			di += x * c.illG[i]
			ds += x
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
		l.sumSq[j], l.dotW[0][j], l.dotW[1][j] = sq, di, ds
		l.minV[j], l.peak[j] = lo, hi
	}
	return l, nil
}

// entryName names library entry j (from 0) in errors, counting from 1.
func entryName(names []string, j int) string {
	if names != nil && names[j] != "" {
		return fmt.Sprintf("library entry %d (%q)", j+1, names[j])
	}
	return fmt.Sprintf("library entry %d", j+1)
}

// Len returns the number of spectra in the library.
func (l *Library) Len() int { return len(l.sumSq) }

// Name returns the name of entry i (from 0), or "" when it has none.
func (l *Library) Name(i int) string {
	if l.names == nil {
		return ""
	}
	return l.names[i]
}

// Spectrum returns entry i (from 0) on the computation grid. It panics
// if i is out of range.
func (l *Library) Spectrum(i int) colorimetry.Spectrum {
	s, err := colorimetry.NewSpectrumOnGrid(l.c.grid, l.values[i*l.n:(i+1)*l.n], colorimetry.Options{})
	if err != nil {
		panic("complement: " + err.Error()) // values were validated
	}
	return s
}

// Partner is one candidate of a partner search. Fields that do not apply to
// the search's mode are nil.
type Partner struct {
	// Name and Index identify the candidate in the library (Index from 0).
	Name  string `json:"name"`
	Index int    `json:"index"`
	// Verdict is that of the additive check of the best-ratio mix (Lights,
	// Surfaces) or of the stack (Filters).
	Verdict Verdict `json:"verdict"`
	// DeltaUVPrime is Δu′v′ from the white of the best-ratio mix
	// (additive) or of the light the stack passes (Filters; nil when it
	// passes none).
	DeltaUVPrime *float64 `json:"delta_uv_prime"`
	// LineDistanceUVPrime is the distance of the white from the line
	// target–candidate in the u′v′ diagram (additive; nil for a candidate
	// without luminance).
	LineDistanceUVPrime *float64 `json:"line_distance_uv_prime"`
	// RatioLuminance is Y(target) : Y(t·candidate) in the best-ratio mix
	// (additive; nil when the best mix is the target alone).
	RatioLuminance *float64 `json:"ratio_luminance"`
	// SpectralRMS is the RMS residual of the best-ratio mix from the
	// scaled white on the computation grid, a fraction of its peak
	// (additive).
	SpectralRMS *float64 `json:"spectral_rms"`
	// StackY is the luminous transmittance (0–100) and StackChroma the
	// chroma C*ab of the stack target·candidate (Filters).
	StackY      *float64 `json:"stack_Y"`
	StackChroma *float64 `json:"stack_chroma"`
}

// Partners ranks every spectrum in the library as a partner of target.
//
// For Lights and Surfaces it ranks additive partners: for each candidate
// the best-ratio mix target + t·candidate nearest the white's chromaticity
// (see MixRatio), judged as CheckAdditive judges a sum (with the spectral
// residual taken on the computation grid), ranked by verdict (Spectral,
// Metameric, None), then Δu′v′ of the mix, then line distance. The
// tristimulus values of the library were computed once; each candidate
// costs one dot product with the target for the spectral residual.
//
// For Filters it ranks subtractive partners: the stack target^FactorA ·
// candidate under the illuminant, judged as CheckSubtractive judges it,
// ranked by verdict (Black, Neutral, None), then stack Y, then chroma. The
// weighting table of the stack, illuminant × target × observer, is built
// once, so each candidate costs one weighted sum over the grid.
// opt.FactorB must be 0 or 1: library entries are taken as they are, and
// samples below zero within noise are not clamped.
//
// Ties keep library order. It returns an error naming "target" for bad
// input (as CheckAdditive or CheckSubtractive), and one naming the entry
// for a candidate negative beyond noise for the mode.
func (l *Library) Partners(target colorimetry.Spectrum, m Mode, opt Options) ([]Partner, error) {
	if !m.valid() {
		return nil, fmt.Errorf("%w: %v", ErrMode, m)
	}
	if opt.FactorB != 0 && opt.FactorB != 1 {
		return nil, fmt.Errorf("%w: FactorB = %g; the partner search takes library entries as they are", ErrOptions, opt.FactorB)
	}
	opt, err := opt.withDefaults()
	if err != nil {
		return nil, err
	}
	if err := checkSpectrum("target", target, m, l.c.grid); err != nil {
		return nil, err
	}
	for j := range l.Len() {
		if err := l.checkEntry(j, m); err != nil {
			return nil, err
		}
	}
	if m == Filters {
		return l.subtractivePartners(target, opt)
	}
	return l.additivePartners(target, m, opt)
}

// checkEntry validates entry j for mode m from its stored extremes.
func (l *Library) checkEntry(j int, m Mode) error {
	lo, hi := l.minV[j], l.peak[j]
	limit := -fractionNoise
	what := "0.01 below zero"
	if m == Lights {
		limit, what = -lightNoise*math.Max(hi, 0), "1 % of the peak below zero"
	}
	if lo < limit {
		v := l.values[j*l.n : (j+1)*l.n]
		i := slices.Index(v, lo)
		return inputErr(entryName(l.names, j), &colorimetry.SampleError{Index: i, Wavelength: l.c.grid.Wavelength(i),
			Err: fmt.Errorf("%w (%g is more than %s)", colorimetry.ErrNegative, lo, what)})
	}
	return nil
}

// verdictRank orders verdicts from best to worst partner.
func verdictRank(v Verdict) int {
	switch v {
	case Spectral, Black:
		return 0
	case Metameric, Neutral:
		return 1
	}
	return 2
}

// orInf returns *p, or +Inf for nil (ranked last).
func orInf(p *float64) float64 {
	if p == nil {
		return math.Inf(1)
	}
	return *p
}

// rankKey is what partners are sorted by: the verdict's rank, two values
// (smaller first), then the library index.
type rankKey struct {
	rank  int32
	index int32
	v, w  float64
}

// rankPartners returns ps (indexed by library entry) sorted by verdict
// rank, then by the two values that by returns, then by index. It sorts
// small keys rather than the partners themselves.
func rankPartners(ps []Partner, by func(*Partner) (float64, float64)) []Partner {
	keys := make([]rankKey, len(ps))
	for j := range ps {
		v, w := by(&ps[j])
		keys[j] = rankKey{rank: int32(verdictRank(ps[j].Verdict)), index: int32(j), v: v, w: w}
	}
	slices.SortFunc(keys, func(a, b rankKey) int {
		return cmp.Or(cmp.Compare(a.rank, b.rank), cmp.Compare(a.v, b.v), cmp.Compare(a.w, b.w), cmp.Compare(a.index, b.index))
	})
	out := make([]Partner, len(ps))
	for i, k := range keys {
		out[i] = ps[k.index]
	}
	return out
}

// additivePartners ranks the library as additive partners of target.
func (l *Library) additivePartners(target colorimetry.Spectrum, m Mode, opt Options) ([]Partner, error) {
	c := l.c
	xa, err := c.XYZ(target, m)
	if err != nil {
		return nil, inputErr("target", err)
	}
	if !(xa.Y > 0) {
		return nil, inputErr("target", fmt.Errorf("%w: Y = %g", colorimetry.ErrZeroLuminance, xa.Y))
	}
	if _, err := xa.UVPrime(); err != nil {
		return nil, inputErr("target", err) // X+15Y+3Z overflows
	}
	r, err := target.Resample(c.grid)
	if err != nil {
		return nil, inputErr("target", err)
	}
	a := r.Values(nil)
	wi := whiteIndex(m)
	// The white spectrum: the illuminant for lights, 1 for surfaces.
	w := c.illG
	if m != Lights {
		w = make([]float64, len(a))
		for i := range w {
			w[i] = 1
		}
	}
	var aa, aw, ww, peakW float64
	for i := range a {
		aa += a[i] * a[i]
		aw += a[i] * w[i]
		ww += w[i] * w[i]
		peakW = math.Max(peakW, w[i])
	}
	n := float64(len(a))
	// rms returns the spectral residual of the mix with ‖mix‖² = mm and
	// ⟨mix, w⟩ = mw from its least-squares multiple of w.
	rms := func(mm, mw float64) (float64, bool) {
		s := mw / ww
		if !(s > 0) {
			return 0, false
		}
		r := math.Sqrt(math.Max(0, mm-mw*mw/ww)/n) / (s * peakW)
		if math.IsNaN(r) || math.IsInf(r, 0) {
			return 0, false // sums of squares overflowed: no residual
		}
		return r, true
	}

	k := l.Len()
	ps := make([]Partner, k)
	store := make([]float64, 4*k)
	xyz := l.xyz[wi]
	for j := range k {
		p := &ps[j]
		p.Name, p.Index = l.Name(j), j
		f := store[4*j : 4*j+4 : 4*j+4]
		xb := colorimetry.XYZ{X: xyz[3*j], Y: xyz[3*j+1], Z: xyz[3*j+2]}
		var mx mix
		if _, uvErr := xb.UVPrime(); xb.Y > 0 && uvErr == nil && xb.X+15*xb.Y+3*xb.Z > 0 {
			mx = c.nearestMix(xa, xb, m)
			f[1] = mx.line
			p.LineDistanceUVPrime = &f[1]
		} else {
			// No luminance (or tristimulus values beyond the float64
			// range): the candidate cannot move the mix.
			mx = mix{delta: colorimetry.DeltaUVPrime(mustUV(xa), c.wuv[wi])}
		}
		f[0] = mx.delta
		p.DeltaUVPrime = &f[0]
		var mm, mw float64
		switch {
		case mx.mu >= 1:
			mm, mw = l.sumSq[j], l.dotW[wi][j]
			f[2] = 0
			p.RatioLuminance = &f[2]
		case mx.mu > 0:
			b := l.values[j*l.n : (j+1)*l.n]
			var ab float64
			for i, x := range b {
				ab += a[i] * x
			}
			t := mx.t
			mm = aa + 2*t*ab + t*t*l.sumSq[j]
			mw = aw + t*l.dotW[wi][j]
			f[2] = xa.Y / (t * xb.Y)
			if !math.IsInf(f[2], 0) && !math.IsNaN(f[2]) && !math.IsInf(t, 0) {
				p.RatioLuminance = &f[2] // else a and b differ in scale beyond the float64 range
			}
		default:
			mm, mw = aa, aw
		}
		ok := false
		if f[3], ok = rms(mm, mw); ok {
			p.SpectralRMS = &f[3]
		}
		colourOK := mx.delta <= opt.DeltaUVPrime
		switch {
		case colourOK && ok && f[3] <= opt.SpectralRMS:
			p.Verdict = Spectral
		case colourOK:
			p.Verdict = Metameric
		default:
			p.Verdict = None
		}
	}
	return rankPartners(ps, func(p *Partner) (float64, float64) {
		return orInf(p.DeltaUVPrime), orInf(p.LineDistanceUVPrime)
	}), nil
}

// mustUV returns u′v′ of x, which has X + 15Y + 3Z > 0.
func mustUV(x colorimetry.XYZ) colorimetry.UVPrime {
	uv, _ := x.UVPrime()
	return uv
}

// subtractivePartners ranks the library as subtractive partners of target.
func (l *Library) subtractivePartners(target colorimetry.Spectrum, opt Options) ([]Partner, error) {
	c := l.c
	r, err := target.Resample(c.grid)
	if err != nil {
		return nil, inputErr("target", err)
	}
	ta := r.Values(nil)
	for i, v := range ta {
		v = math.Max(v, 0)
		if opt.FactorA != 1 {
			v = math.Pow(v, opt.FactorA)
		}
		ta[i] = v
	}
	tas, err := colorimetry.NewSpectrumOnGrid(c.grid, ta, colorimetry.Options{Interp: colorimetry.InterpLinear})
	if err != nil {
		return nil, inputErr("target", err)
	}
	xa, err := c.objW.XYZ(tas)
	if err != nil {
		return nil, inputErr("target", err)
	}
	if !(xa.Y > 0) {
		return nil, inputErr("target", fmt.Errorf("passes no light under the illuminant: %w", colorimetry.ErrZeroLuminance))
	}
	// The stack's weighting table is that of object colours under the
	// light the target passes, S·Ta, rescaled from Y = 100 for that light
	// to Y = 100 for the illuminant itself: factor Y(Ta)/100.
	for i := range ta {
		ta[i] *= c.illG[i]
	}
	passed, err := colorimetry.NewSpectrumOnGrid(c.grid, ta, colorimetry.Options{Interp: colorimetry.InterpLinear})
	if err != nil {
		return nil, inputErr("target", err)
	}
	sw, err := colorimetry.NewObjectWeights(c.obs, passed, c.grid)
	if err != nil {
		return nil, inputErr("target", err)
	}
	k := l.Len()
	xyz := sw.XYZBatchTo(make([]float64, 3*k), l.values)
	scale := xa.Y / 100
	white := c.White(Filters)
	ps := make([]Partner, k)
	store := make([]float64, 3*k)
	for j := range k {
		p := &ps[j]
		p.Name, p.Index = l.Name(j), j
		f := store[3*j : 3*j+3 : 3*j+3]
		x := colorimetry.XYZ{X: xyz[3*j] * scale, Y: xyz[3*j+1] * scale, Z: xyz[3*j+2] * scale}
		lab, err := x.Lab(white)
		if err != nil {
			return nil, inputErr(entryName(l.names, j), err)
		}
		f[0], f[1] = x.Y, lab.LCh().C
		p.StackY, p.StackChroma = &f[0], &f[1]
		if d := x.X + 15*x.Y + 3*x.Z; d > 0 {
			f[2] = math.Hypot(4*x.X/d-c.wuv[1].U, 9*x.Y/d-c.wuv[1].V)
			p.DeltaUVPrime = &f[2]
		}
		p.Verdict = stackVerdict(f[0], f[1], opt)
	}
	return rankPartners(ps, func(p *Partner) (float64, float64) {
		return orInf(p.StackY), orInf(p.StackChroma)
	}), nil
}
