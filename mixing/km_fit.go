package mixing

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/mat"
)

// Backing says what a calibration film was drawn over.
type Backing int

const (
	// BackingOpaque is a film thick enough to hide its backing (the
	// default): its reflectance is R∞.
	BackingOpaque Backing = iota
	// BackingBlack is a film over the black part of a drawdown chart.
	BackingBlack
	// BackingWhite is a film over the white part of a drawdown chart.
	BackingWhite
)

// String returns "opaque", "black" or "white".
func (b Backing) String() string {
	switch b {
	case BackingOpaque:
		return "opaque"
	case BackingBlack:
		return "black"
	case BackingWhite:
		return "white"
	}
	return fmt.Sprintf("Backing(%d)", int(b))
}

// ParseBacking reads "opaque" (or ""), "black" or "white",
// case-insensitive.
func ParseBacking(s string) (Backing, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "opaque":
		return BackingOpaque, nil
	case "black":
		return BackingBlack, nil
	case "white":
		return BackingWhite, nil
	}
	return 0, fmt.Errorf("backing %q: want white, black or opaque", s)
}

// LadderSample is one calibration measurement: a film of a colorant mixed
// with the white at a known mass fraction (a tint ladder), or the
// colorant alone (masstone, fraction 1), or the white alone, or a bare
// backing card.
type LadderSample struct {
	// Name names the sample in the fit report.
	Name string
	// Colorant names the colorant mixed with the white; the white's own
	// name for the white alone; "" for a bare backing card (Backing black
	// or white), whose reflectance the films over that backing need.
	Colorant string
	// Fraction is the colorant's mass fraction in the colorant + white
	// mix, 0 < Fraction ≤ 1 (1 = masstone). Ignored for the white alone
	// and for cards.
	Fraction float64
	// Backing is what the film was drawn over. Films over black and white
	// come in pairs of the same colorant and fraction.
	Backing Backing
	// HeldOut excludes the sample from the fit; the report shows how well
	// the model predicts it.
	HeldOut bool
	// Reflectance is the measured reflectance, fraction 0–1, measured in
	// the geometry that FitOptions.Surface describes.
	Reflectance colorimetry.Spectrum
	// Place says where the sample came from ("file:line"), for messages.
	Place string
}

// where returns the sample's place for messages.
func (s LadderSample) where() string {
	if s.Place != "" {
		return s.Place + ": sample " + fmt.Sprintf("%q", s.Name)
	}
	return fmt.Sprintf("sample %q", s.Name)
}

// FitOptions control FitPigments. The zero value fits against D65 and
// the CIE 1931 observer with no surface correction, taking the white from
// the data.
type FitOptions struct {
	// White names the white colorant; "" picks the only colorant measured
	// at fraction 1 alone, or one named "white".
	White string
	// Surface is the Saunderson correction of the measurements.
	Surface Saunderson
	// Observer and Illuminant are used for the fit report's ΔE00; nil and
	// the zero value mean CIE 1931 2° and D65.
	Observer   *colorimetry.Observer
	Illuminant colorimetry.NamedIlluminant
	// Grid is the model's grid; the zero Grid takes that of the first
	// film.
	Grid colorimetry.Grid
}

// PigmentFit is the result of FitPigments: the model and the standard
// uncertainties of its unit K and S.
type PigmentFit struct {
	Model *Pigments
	// UK and US hold, per colorant name and band, the standard
	// uncertainty of K and S estimated from the fit's residuals (same
	// units as K and S). A value is NaN where it cannot be estimated: a
	// value held at 0 by the non-negativity constraint, or no more
	// equations than unknowns at that band. The white's S is fixed at 1
	// (the scale) and has uncertainty 0.
	UK, US map[string][]float64
}

// ErrLadder reports calibration data that cannot determine the model: a
// colorant with a single mix, no white, an unpaired drawdown.
var ErrLadder = errors.New("calibration data cannot determine the model")

// film is one film's K/S per band, from one opaque sample or a pair of
// drawdowns over black and white.
type film struct {
	colorant int     // index into the colorant list (white = 0)
	fraction float64 // mass fraction of the colorant
	q        []float64
	dqdr     []float64 // |dRm/dq| per band, the weight of the linearised equation
	members  []int     // sample indices
	sx       []float64 // S·X per band for drawdown pairs (nil for opaque)
}

// FitPigments calibrates a two-constant Kubelka–Munk model from masstone
// and tint ladders. The white's scattering is the unit (S_white = 1 at
// every wavelength); the white's K comes from its own film, and each
// chromatic colorant's unit K and S from its mixes with the white. At each
// wavelength the equations
//
//	c·K_j + (1 − c)·K_white − q·(c·S_j + (1 − c)) = 0,
//
// one per film of colorant j at mass fraction c with measured K/S q, are
// solved together for all colorants by non-negative least squares (NNLS),
// each row weighted by |dRm/dq| / S_mix so that the residuals are in units
// of measured reflectance; the weights are refined twice with the new
// S_mix. Films drawn over black and white backings give their R∞ by
// Kubelka's formulas (FilmFromBackings).
//
// The fit report compares every sample's measured reflectance with the
// model's prediction (for a drawdown over a backing, at the film thickness
// that fits the pair best). Warnings flag short or narrow ladders and
// clamped reflectances. Errors wrap ErrLadder (a ladder of a single point,
// no white, a drawdown without its partner or a bare card) or name the
// sample whose data are invalid.
func FitPigments(samples []LadderSample, opt FitOptions) (*PigmentFit, error) {
	if err := opt.Surface.Validate(); err != nil {
		return nil, err
	}
	if len(samples) == 0 {
		return nil, fmt.Errorf("%w: no samples", ErrLadder)
	}
	obs := opt.Observer
	if obs == nil {
		obs = cie.CIE1931()
	}
	ill := opt.Illuminant
	if ill.Spectrum.IsZero() {
		ill = colorimetry.NamedIlluminant{Name: "D65", Spectrum: cie.D65()}
	}
	for _, s := range samples {
		if s.Reflectance.IsZero() {
			return nil, fmt.Errorf("%s: no reflectance", s.where())
		}
		if err := s.Reflectance.CheckFraction(0.01); err != nil {
			return nil, fmt.Errorf("%s: %w", s.where(), err)
		}
	}
	white, err := pickWhite(samples, opt.White)
	if err != nil {
		return nil, err
	}
	// Colorant list: the white first, the others in order of appearance.
	names := []string{white}
	idx := map[string]int{strings.ToLower(white): 0}
	for _, s := range samples {
		if s.Colorant == "" {
			continue
		}
		if _, ok := idx[strings.ToLower(s.Colorant)]; !ok {
			idx[strings.ToLower(s.Colorant)] = len(names)
			names = append(names, s.Colorant)
		}
	}
	if len(names) < 2 {
		return nil, fmt.Errorf("%w: only the white %q was measured; a model needs at least one other colorant", ErrLadder, white)
	}
	g := opt.Grid
	if !g.Valid() {
		for _, s := range samples {
			if s.Colorant != "" {
				g = s.Reflectance.Grid()
				break
			}
		}
	}
	p := &Pigments{Grid: g, White: white, Surface: opt.Surface, Illuminant: ill.Name, Observer: obs.Name()}
	var warns []string
	// Measured values on the model grid.
	meas := make([][]float64, len(samples))
	for i, s := range samples {
		v, w, err := p.onGrid(s.Reflectance, s.where())
		if err != nil {
			return nil, err
		}
		meas[i] = v
		warns = append(warns, w...)
	}
	films, cd, fw, err := buildFilms(p, samples, meas, idx)
	if err != nil {
		return nil, err
	}
	warns = append(warns, fw...)
	lw, err := checkLadders(samples, films, names)
	if err != nil {
		return nil, err
	}
	warns = append(warns, lw...)

	m := len(names) - 1
	n := g.N
	res := &PigmentFit{UK: map[string][]float64{}, US: map[string][]float64{}}
	ks := make([][]float64, len(names))
	ss := make([][]float64, len(names))
	for j := range names {
		ks[j] = make([]float64, n)
		ss[j] = make([]float64, n)
		res.UK[names[j]] = make([]float64, n)
		res.US[names[j]] = make([]float64, n)
	}
	var training []*film
	for i := range films {
		if !samples[films[i].members[0]].HeldOut {
			training = append(training, &films[i])
		}
	}
	for l := range n {
		theta, se, err := fitBand(training, m, l)
		if err != nil {
			return nil, fmt.Errorf("at %g nm: %w", g.Wavelength(l), err)
		}
		ks[0][l], ss[0][l] = theta[0], 1
		res.UK[names[0]][l], res.US[names[0]][l] = se[0], 0
		for j := 1; j <= m; j++ {
			ks[j][l], ss[j][l] = theta[2*j-1], theta[2*j]
			res.UK[names[j]][l], res.US[names[j]][l] = se[2*j-1], se[2*j]
		}
	}
	for j := range names {
		p.Colorants = append(p.Colorants, Colorant{Name: names[j], K: ks[j], S: ss[j]})
	}
	for j := 1; j <= m; j++ {
		zero := true
		for l := range n {
			if ss[j][l] > 0 {
				zero = false
				break
			}
		}
		if zero {
			warns = append(warns, fmt.Sprintf("colorant %q: the fit gives no scattering at any wavelength (a pure absorber); check its ladder", names[j]))
		}
	}
	if err := p.Validate(); err != nil {
		return nil, err
	}
	rep, err := fitReport(p, samples, meas, films, cd, obs, ill)
	if err != nil {
		return nil, err
	}
	rep.Warnings = append(rep.Warnings, warns...)
	p.Fit = &rep
	res.Model = p
	return res, nil
}

// pickWhite returns the white's name: the one asked for, else the only
// colorant measured alone at fraction 1 and never in a mix, else one
// named "white".
func pickWhite(samples []LadderSample, want string) (string, error) {
	have := map[string]string{}
	mixed := map[string]bool{}
	var order []string
	for _, s := range samples {
		if s.Colorant == "" {
			continue
		}
		key := strings.ToLower(s.Colorant)
		if _, ok := have[key]; !ok {
			have[key] = s.Colorant
			order = append(order, key)
		}
		if s.Fraction != 1 {
			mixed[key] = true
		}
	}
	if want != "" {
		if n, ok := have[strings.ToLower(want)]; ok {
			return n, nil
		}
		return "", fmt.Errorf("%w: the white %q has no sample (colorants measured: %s)", ErrLadder, want, strings.Join(order, ", "))
	}
	var cands []string
	for _, k := range order {
		if !mixed[k] {
			cands = append(cands, have[k])
		}
	}
	if len(cands) == 1 {
		return cands[0], nil
	}
	if n, ok := have["white"]; ok {
		return n, nil
	}
	return "", fmt.Errorf("%w: cannot tell which colorant is the white (measured alone only: %s); name it", ErrLadder, strings.Join(cands, ", "))
}

// buildFilms turns samples into films: one per opaque sample, one per
// pair of drawdowns over black and white. Cards are consumed here.
func buildFilms(p *Pigments, samples []LadderSample, meas [][]float64, idx map[string]int) ([]film, *cards, []string, error) {
	n := p.Grid.N
	var warns []string
	var cardBlack, cardWhite []float64
	var cardBlackAt, cardWhiteAt string
	type key struct {
		c    int
		f    float64
		held bool
	}
	pairs := map[key][2]int{} // [black, white] sample indices + 1
	var order []key
	var films []film
	for i, s := range samples {
		if s.Colorant == "" {
			switch s.Backing {
			case BackingBlack:
				if cardBlack != nil {
					return nil, nil, nil, fmt.Errorf("%w: %s: a second bare black card (the first is %s)", ErrLadder, s.where(), cardBlackAt)
				}
				cardBlack, cardBlackAt = meas[i], s.where()
			case BackingWhite:
				if cardWhite != nil {
					return nil, nil, nil, fmt.Errorf("%w: %s: a second bare white card (the first is %s)", ErrLadder, s.where(), cardWhiteAt)
				}
				cardWhite, cardWhiteAt = meas[i], s.where()
			default:
				return nil, nil, nil, fmt.Errorf("%w: %s: no colorant named (only bare backing cards, with backing black or white, may leave it empty)", ErrLadder, s.where())
			}
			continue
		}
		j := idx[strings.ToLower(s.Colorant)]
		f := s.Fraction
		if j == 0 {
			f = 0
		} else if !(f > 0 && f <= 1) {
			return nil, nil, nil, fmt.Errorf("%s: fraction %g: want a mass fraction in (0, 1] (1 = masstone)", s.where(), s.Fraction)
		}
		if s.Backing == BackingOpaque {
			q, w := p.internalKS(meas[i], s.where())
			warns = append(warns, w...)
			films = append(films, film{colorant: j, fraction: f, q: q, dqdr: slopes(p.Surface, q), members: []int{i}})
			continue
		}
		k := key{j, f, s.HeldOut}
		pr, seen := pairs[k]
		if !seen {
			order = append(order, k)
		}
		slot := 0
		if s.Backing == BackingWhite {
			slot = 1
		}
		if pr[slot] != 0 {
			return nil, nil, nil, fmt.Errorf("%w: %s: a second film of %q at fraction %g over %s (the first is %s)", ErrLadder, s.where(), s.Colorant, s.Fraction, s.Backing, samples[pr[slot]-1].where())
		}
		pr[slot] = i + 1
		pairs[k] = pr
	}
	if len(order) > 0 && cardWhite == nil {
		first := pairs[order[0]]
		at := first[0] + first[1] - 1
		if first[0] != 0 && first[1] != 0 {
			at = first[0] - 1
		}
		return nil, nil, nil, fmt.Errorf("%w: %s: films over backings need the bare white card's reflectance (a sample with no colorant and backing white)", ErrLadder, samples[at].where())
	}
	gBlack := make([]float64, n)
	gWhite := make([]float64, n)
	if len(order) > 0 {
		if cardBlack == nil {
			warns = append(warns, "no bare black card measured: the black backing is taken as ideal (reflectance 0)")
		}
		for l := range n {
			gWhite[l] = clampCard(p.Surface.Internal(cardWhite[l]))
			if cardBlack != nil {
				gBlack[l] = clampCard(p.Surface.Internal(cardBlack[l]))
			}
		}
	}
	for _, k := range order {
		pr := pairs[k]
		if pr[0] == 0 || pr[1] == 0 {
			have, miss := pr[0]+pr[1]-1, "black"
			if pr[1] == 0 {
				miss = "white"
			}
			return nil, nil, nil, fmt.Errorf("%w: %s: drawn over %s but its partner over %s is missing", ErrLadder, samples[have].where(), samples[have].Backing, miss)
		}
		ib, iw := pr[0]-1, pr[1]-1
		q := make([]float64, n)
		sx := make([]float64, n)
		var clamped []string
		for l := range n {
			rb := p.Surface.Internal(meas[ib][l])
			rw := p.Surface.Internal(meas[iw][l])
			if !(gWhite[l] > gBlack[l]) {
				return nil, nil, nil, fmt.Errorf("%w: at %g nm the white card (%.4g) is not lighter than the black one (%.4g)", ErrLadder, p.Grid.Wavelength(l), gWhite[l], gBlack[l])
			}
			if rb < ksMinR {
				rb = ksMinR
			}
			// 0.01 in reflectance: spectrophotometer noise, common
			// practice (no source).
			bf, err := FilmFromBackings(rb, rw, gBlack[l], gWhite[l], 0.01)
			if err != nil {
				return nil, nil, nil, fmt.Errorf("%s and %s at %g nm: %w", samples[ib].where(), samples[iw].where(), p.Grid.Wavelength(l), err)
			}
			var c bool
			q[l], c = KSClamped(bf.RInf)
			if c {
				clamped = append(clamped, fmt.Sprintf("%g nm", p.Grid.Wavelength(l)))
			}
			sx[l] = bf.SX
		}
		if len(clamped) > 0 {
			warns = append(warns, fmt.Sprintf("%s: R∞ outside (0, 1] at %s; K/S clamped", samples[ib].where(), strings.Join(clamped, ", ")))
		}
		films = append(films, film{colorant: k.c, fraction: k.f, q: q, dqdr: slopes(p.Surface, q), members: []int{ib, iw}, sx: sx})
	}
	return films, &cards{black: gBlack, white: gWhite}, warns, nil
}

// cards holds the internal reflectances of the bare backing cards per
// band (zero for an ideal black or when there are none).
type cards struct{ black, white []float64 }

// clampCard keeps a card's internal reflectance within [0, 0.999].
func clampCard(r float64) float64 { return math.Min(math.Max(r, 0), 0.999) }

// slopes returns |dRm/dq| per band for the film K/S q.
func slopes(sd Saunderson, q []float64) []float64 {
	d := make([]float64, len(q))
	for l, x := range q {
		// A film measured at or above R∞ = 1 (K/S clamped to 0) would
		// get an unbounded weight; K/S ≥ 1e-6 caps it near 700.
		r, dr := rInfSlope(math.Max(x, 1e-6))
		_, dm := sd.measuredSlope(r)
		d[l] = math.Abs(dr * dm)
	}
	return d
}

// checkLadders returns errors for ladders that cannot separate K from S
// and warnings for ladders that separate them poorly.
func checkLadders(samples []LadderSample, films []film, names []string) ([]string, error) {
	var warns []string
	fr := make([]map[float64]bool, len(names))
	first := make([]int, len(names))
	for j := range fr {
		fr[j] = map[float64]bool{}
		first[j] = -1
	}
	for _, f := range films {
		if samples[f.members[0]].HeldOut {
			continue
		}
		fr[f.colorant][f.fraction] = true
		if first[f.colorant] < 0 {
			first[f.colorant] = f.members[0]
		}
	}
	if len(fr[0]) == 0 {
		return nil, fmt.Errorf("%w: no film of the white %q alone in the training samples", ErrLadder, names[0])
	}
	for j := 1; j < len(names); j++ {
		var fs []float64
		for f := range fr[j] {
			fs = append(fs, f)
		}
		sort.Float64s(fs)
		switch {
		case len(fs) == 0:
			return nil, fmt.Errorf("%w: colorant %q has only held-out samples", ErrLadder, names[j])
		case len(fs) == 1:
			return nil, fmt.Errorf("%w: %s: colorant %q was measured at one mass fraction only (%g); K and S need at least two mixes with the white, e.g. the masstone and a 1:10 tint", ErrLadder, samples[first[j]].where(), names[j], fs[0])
		case len(fs) == 2:
			warns = append(warns, fmt.Sprintf("colorant %q: a ladder of two mixes (%g, %g) determines K and S with nothing left to check them; measure three or more", names[j], fs[0], fs[1]))
		}
		// A ladder spanning less than a factor of 4 in mass fraction
		// hardly separates K from S: common practice (no source).
		if len(fs) >= 2 && fs[len(fs)-1]/fs[0] < 4 {
			warns = append(warns, fmt.Sprintf("colorant %q: the ladder spans only mass fractions %g–%g; K and S are poorly separated (span a factor of 4 or more, e.g. masstone to 1:10)", names[j], fs[0], fs[len(fs)-1]))
		}
	}
	return warns, nil
}

// fitBand solves the weighted linearised equations of one band for
// θ = [K_white, K_1, S_1, …, K_m, S_m] ≥ 0 by NNLS and returns θ with
// standard uncertainties (NaN where not estimable).
func fitBand(films []*film, m, l int) (theta, se []float64, err error) {
	p := 1 + 2*m
	rows := len(films)
	a := mat.NewDense(rows, p, nil)
	b := make([]float64, rows)
	smix := make([]float64, rows)
	for i := range smix {
		smix[i] = 1
	}
	for pass := range 3 {
		for i, f := range films {
			c := f.fraction
			q := f.q[l]
			w := f.dqdr[l] / math.Max(smix[i], 1e-6)
			for j := range p {
				a.Set(i, j, 0)
			}
			a.Set(i, 0, w*(1-c))
			if f.colorant > 0 {
				a.Set(i, 2*f.colorant-1, w*c)
				a.Set(i, 2*f.colorant, -w*q*c)
			}
			b[i] = w * q * (1 - c)
		}
		theta, _, err = NNLS(a, b)
		if err != nil {
			return nil, nil, err
		}
		if pass == 2 {
			break
		}
		for i, f := range films {
			c := f.fraction
			s := 1 - c
			if f.colorant > 0 {
				s += c * theta[2*f.colorant]
			}
			smix[i] = s
		}
	}
	se = make([]float64, p)
	var freeCols []int
	for j, v := range theta {
		if v > 0 {
			freeCols = append(freeCols, j)
		} else {
			se[j] = math.NaN()
		}
	}
	dof := rows - len(freeCols)
	if dof <= 0 || len(freeCols) == 0 {
		for _, j := range freeCols {
			se[j] = math.NaN()
		}
		return theta, se, nil
	}
	var rss float64
	for i := range rows {
		r := -b[i]
		for j := range p {
			r += a.At(i, j) * theta[j]
		}
		rss += r * r
	}
	sigma2 := rss / float64(dof)
	af := mat.NewDense(rows, len(freeCols), nil)
	for k, j := range freeCols {
		for i := range rows {
			af.Set(i, k, a.At(i, j))
		}
	}
	var ata, inv mat.Dense
	ata.Mul(af.T(), af)
	if err := inv.Inverse(&ata); err != nil {
		for _, j := range freeCols {
			se[j] = math.NaN()
		}
		return theta, se, nil
	}
	for k, j := range freeCols {
		se[j] = math.Sqrt(sigma2 * inv.At(k, k))
	}
	return theta, se, nil
}

// fitReport compares each sample with the model's prediction.
func fitReport(p *Pigments, samples []LadderSample, meas [][]float64, films []film, cd *cards, obs *colorimetry.Observer, ill colorimetry.NamedIlluminant) (FitReport, error) {
	sc := NewScorer(obs, ill.Spectrum, ill.Name)
	n := p.Grid.N
	fits := make([]SampleFit, 0, len(samples))
	w := p.Colorants[0]
	for _, f := range films {
		c := p.Colorants[f.colorant]
		kmix := make([]float64, n)
		smix := make([]float64, n)
		for l := range n {
			kmix[l] = (1-f.fraction)*w.K[l] + f.fraction*c.K[l]
			smix[l] = (1-f.fraction)*w.S[l] + f.fraction*c.S[l]
		}
		// Film thickness, in units of the white's reciprocal scattering:
		// the median over bands of S·X / S_mix for a drawdown pair.
		x := math.Inf(1)
		if f.sx != nil {
			var xs []float64
			for l := range n {
				if !math.IsInf(f.sx[l], 1) && smix[l] > 0 {
					xs = append(xs, f.sx[l]/smix[l])
				}
			}
			if len(xs) > 0 {
				sort.Float64s(xs)
				x = xs[len(xs)/2]
			}
		}
		for _, i := range f.members {
			s := samples[i]
			g := cd.black
			if s.Backing == BackingWhite {
				g = cd.white
			}
			pred := make([]float64, n)
			for l := range n {
				r := ReflectanceInf(kmix[l] / smix[l])
				if f.sx != nil && !math.IsInf(x, 1) {
					r = LayerReflectance(kmix[l], smix[l], x, g[l])
				}
				pred[l] = p.Surface.Measured(r)
			}
			ps, err := colorimetry.NewSpectrumOnGrid(p.Grid, pred, colorimetry.Options{})
			if err != nil {
				return FitReport{}, fmt.Errorf("%s: prediction: %w", s.where(), err)
			}
			ms, err := colorimetry.NewSpectrumOnGrid(p.Grid, meas[i], colorimetry.Options{})
			if err != nil {
				return FitReport{}, fmt.Errorf("%s: %w", s.where(), err)
			}
			rms, mx, err := Residual(ms, ps)
			if err != nil {
				return FitReport{}, fmt.Errorf("%s: %w", s.where(), err)
			}
			de, err := sc.ObjectDE00(ms, ps)
			if err != nil {
				return FitReport{}, fmt.Errorf("%s: %w", s.where(), err)
			}
			fits = append(fits, SampleFit{Name: s.Name, HeldOut: s.HeldOut, RMS: rms, MaxAbs: mx, DE00: de})
		}
	}
	return NewFitReport(fits, ill.Name, obs.Name()), nil
}
