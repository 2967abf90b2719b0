package mixing

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
)

// The halftone print model. A halftone prints each ink as dots whose
// fraction of the area, the coverage, carries the tone; the eye averages
// dots and paper. For k inks printed independently of one another
// (rotated screens, stochastic screens), the fraction of the area covered
// by exactly the inks in a set p is given by the Demichel (1924)
// equations,
//
//	w_p = Πᵢ (aᵢ if ink i is in p, else 1 − aᵢ),
//
// over the 2^k Neugebauer primaries: the bare paper, each solid ink and
// every solid overprint. The Yule–Nielsen modified spectral Neugebauer
// model (Viggiano 1990; Yule and Nielsen 1951) predicts the reflectance
//
//	R(λ) = [Σ_p w_p·R_p(λ)^(1/n)]^n,
//
// with R_p the measured primaries and n ≥ 1 the Yule–Nielsen factor, which
// stands for light scattered sideways in the paper under the dots (optical
// dot gain). n = 1 is the spectral Neugebauer model, and with one ink the
// Murray–Davies equation (Murray 1936) R = (1 − a)·R_paper + a·R_solid.
//
// The coverages aᵢ in these equations are effective coverages. The
// coverage sent to the plate or the printer, the nominal coverage, grows
// on the way to paper (mechanical dot gain); each ink's dot-gain curve
// maps nominal to effective coverage. Coverages are fractions 0–1 in the
// library; the trade writes percent, and the CLI reads and prints percent.

// HalftoneKind is the model kind of the halftone print model in model
// files.
const HalftoneKind = "halftone"

// Limits of the halftone model.
const (
	// MaxHalftoneInks is the largest number of inks of a halftone model:
	// four inks need 16 measured primaries; more are left out (each
	// further ink doubles the primaries to measure).
	MaxHalftoneInks = 4
	// MinNFactor and MaxNFactor bound the Yule–Nielsen factor. n = 1 is
	// no optical dot gain; values beyond 10 behave like the n → ∞ limit
	// (density additivity) and point at a measurement problem rather than
	// at the paper: common practice (no source).
	MinNFactor = 1
	MaxNFactor = 10
)

// Errors of the halftone model.
var (
	// ErrHalftoneData reports calibration data that the halftone model
	// cannot use; the wrapping error says what and where.
	ErrHalftoneData = errors.New("unusable halftone calibration data")
	// ErrUnknownInk reports a coverage for an ink that the model lacks.
	ErrUnknownInk = errors.New("no such ink in the model")
)

// MurrayDavies returns the reflectance (fraction 0–1) of a halftone of
// one ink at effective coverage a (0–1) on paper of reflectance paper,
// where the solid ink has reflectance solid: (1 − a)·paper + a·solid
// (Murray, J. Franklin Inst. 221, 721–744, 1936). It applies at one
// wavelength or to luminance factors Y/100 alike. Special cases are:
//
//	MurrayDavies(p, s, 0) = p
//	MurrayDavies(p, s, 1) = s
func MurrayDavies(paper, solid, a float64) float64 {
	return (1-a)*paper + a*solid
}

// YuleNielsen returns the reflectance (fraction 0–1) of a halftone of one
// ink at effective coverage a (0–1) by the Yule–Nielsen modified
// Murray–Davies equation, R = [(1 − a)·paper^(1/n) + a·solid^(1/n)]^n
// (Yule and Nielsen, TAGA Proc. 3, 65–76, 1951), with n ≥ 1 the
// Yule–Nielsen factor. Negative reflectances (measurement noise near
// black) are taken as 0. Special cases are:
//
//	YuleNielsen(p, s, a, 1) = MurrayDavies(p, s, a)
//	YuleNielsen(p, s, 0, n) = p, YuleNielsen(p, s, 1, n) = s (p, s ≥ 0)
func YuleNielsen(paper, solid, a, n float64) float64 {
	paper, solid = math.Max(paper, 0), math.Max(solid, 0)
	switch {
	case n == 1:
		return MurrayDavies(paper, solid, a)
	case a == 0:
		return paper
	case a == 1:
		return solid
	}
	return math.Pow((1-a)*math.Pow(paper, 1/n)+a*math.Pow(solid, 1/n), n)
}

// YuleNielsenCoverage inverts YuleNielsen: the effective coverage a that
// gives the tint's reflectance tint between paper and solid,
//
//	a = (paper^(1/n) − tint^(1/n)) / (paper^(1/n) − solid^(1/n)).
//
// With n = 1 and luminance factors (Y/100) it is the Murray–Davies tone
// value of the printing standards (ISO 12647-1, written there with
// densities relative to the paper, a = (1 − 10^−D_t)/(1 − 10^−D_s): from
// memory). The result is not clamped: a tint lighter than the paper gives
// a < 0, one darker than the solid a > 1. It returns an error when paper
// and solid are equal (no contrast to measure a coverage by), a value is
// negative or not finite, or n is outside [MinNFactor, MaxNFactor].
func YuleNielsenCoverage(paper, solid, tint, n float64) (float64, error) {
	for _, v := range []struct {
		name string
		x    float64
	}{{"paper", paper}, {"solid", solid}, {"tint", tint}} {
		if !htFinite(v.x) || v.x < 0 {
			return 0, fmt.Errorf("yule–nielsen coverage: %s reflectance %v is not a finite non-negative number", v.name, v.x)
		}
	}
	if !htFinite(n) || n < MinNFactor || n > MaxNFactor {
		return 0, fmt.Errorf("yule–nielsen coverage: n %v is outside [%g, %g]", n, float64(MinNFactor), float64(MaxNFactor))
	}
	p, s, t := math.Pow(paper, 1/n), math.Pow(solid, 1/n), math.Pow(tint, 1/n)
	if p == s {
		return 0, fmt.Errorf("yule–nielsen coverage: paper and solid have the same reflectance %g: no contrast", paper)
	}
	return (p - t) / (p - s), nil
}

// DemichelTo fills dst with the Demichel weights of the 2^k Neugebauer
// primaries for the effective coverages a (k inks, each 0–1) and returns
// it: dst[p] = Πᵢ (a[i] if bit i of p is set, else 1 − a[i]), the fraction
// of the area covered by exactly the inks of p when the inks' dots fall
// independently of one another (Demichel 1924). dst[0] is the bare paper.
// The weights sum to 1 for any a. It panics if len(dst) != 2^len(a).
func DemichelTo(dst, a []float64) []float64 {
	if len(dst) != 1<<len(a) {
		panic("mixing: Demichel weights need 2^k entries for k inks")
	}
	dst[0] = 1
	size := 1
	for i, ai := range a {
		// Entries [0, size) cover inks 0…i−1; split each on ink i.
		for p := range size {
			w := dst[p]
			dst[p] = w * (1 - ai)
			dst[p|1<<i] = w * ai
		}
		size <<= 1
	}
	return dst
}

// PrimaryName returns the name of Neugebauer primary p (a bit set over
// inks): "paper" for 0, else the inks of p joined by "+", e.g. "c+m+y".
// It panics if p has a bit beyond the inks.
func PrimaryName(inks []string, p int) string {
	if p < 0 || p >= 1<<len(inks) {
		panic("mixing: primary index beyond the inks")
	}
	if p == 0 {
		return "paper"
	}
	var parts []string
	for i, name := range inks {
		if p&(1<<i) != 0 {
			parts = append(parts, name)
		}
	}
	return strings.Join(parts, "+")
}

// DotGain is an ink's dot-gain curve: the effective coverage (0–1, what
// the Yule–Nielsen–Neugebauer equations see) as a function of the nominal
// coverage (0–1, what is sent to the plate or the printer). It is a
// monotone piecewise cubic through knots from (0, 0) to (1, 1) (Fritsch
// and Butland, SIAM J. Sci. Stat. Comput. 5(2), 300–304, 1984). The zero
// value is no dot gain (effective = nominal). It is immutable.
type DotGain struct {
	nominal, effective []float64
	r                  LightResponse // the same monotone curve as a light's response
}

// NewDotGain returns the dot-gain curve through the knots (nominal[k],
// effective[k]). Nominal coverages must be finite and strictly
// increasing from 0 to 1, effective coverages non-decreasing from 0 to 1;
// at least two knots.
func NewDotGain(nominal, effective []float64) (DotGain, error) {
	n := len(nominal)
	if len(effective) != n {
		return DotGain{}, fmt.Errorf("dot gain: %d nominal but %d effective coverages", n, len(effective))
	}
	if n < 2 {
		return DotGain{}, fmt.Errorf("dot gain: %d knots, need at least 2", n)
	}
	for k := range n {
		if !htFinite(nominal[k]) || !htFinite(effective[k]) {
			return DotGain{}, fmt.Errorf("dot gain: knot %d (nominal %v, effective %v): %w", k+1, nominal[k], effective[k], ErrNotFinite)
		}
	}
	if nominal[0] != 0 || nominal[n-1] != 1 || effective[0] != 0 || effective[n-1] != 1 {
		return DotGain{}, fmt.Errorf("dot gain: the knots must run from (nominal 0, effective 0) to (nominal 1, effective 1); got (%g, %g) to (%g, %g)",
			nominal[0], effective[0], nominal[n-1], effective[n-1])
	}
	for k := 1; k < n; k++ {
		if nominal[k] <= nominal[k-1] {
			return DotGain{}, fmt.Errorf("dot gain: knot %d: nominal coverage %g does not increase from %g", k+1, nominal[k], nominal[k-1])
		}
		if effective[k] < effective[k-1] {
			return DotGain{}, fmt.Errorf("dot gain: knot %d: effective coverage falls from %g to %g at nominal %g", k+1, effective[k-1], effective[k], nominal[k])
		}
	}
	r, err := MonotoneResponse(nominal, effective)
	if err != nil {
		return DotGain{}, fmt.Errorf("dot gain: %w", err)
	}
	return DotGain{nominal: append([]float64(nil), nominal...), effective: append([]float64(nil), effective...), r: r}, nil
}

// Effective returns the effective coverage (0–1) at nominal coverage a
// (0–1; values outside are clamped to it).
func (d DotGain) Effective(a float64) float64 {
	a = math.Min(math.Max(a, 0), 1)
	if d.nominal == nil {
		return a
	}
	return d.r.Output(a)
}

// Nominal returns the nominal coverage (0–1) that prints at effective
// coverage e, the inverse of Effective (where the curve is flat, the
// lowest such nominal coverage; to 1e-12).
func (d DotGain) Nominal(e float64) float64 {
	e = math.Min(math.Max(e, 0), 1)
	if d.nominal == nil {
		return e
	}
	return d.r.Drive(e)
}

// Gain returns the dot gain at nominal coverage a: Effective(a) − a, as a
// fraction (0.17 is the trade's "17 %" at that tone).
func (d DotGain) Gain(a float64) float64 {
	return d.Effective(a) - math.Min(math.Max(a, 0), 1)
}

// Knots returns copies of the curve's knots (nil, nil for the zero value).
func (d DotGain) Knots() (nominal, effective []float64) {
	if d.nominal == nil {
		return nil, nil
	}
	return append([]float64(nil), d.nominal...), append([]float64(nil), d.effective...)
}

// Halftone is a Yule–Nielsen modified spectral Neugebauer model of a
// printing process with one to MaxHalftoneInks inks: the measured
// primaries on one wavelength grid, the Yule–Nielsen factor (one for all
// inks, or one per ink) and each ink's dot-gain curve, with the fit report
// of its calibration. Its kind is "halftone". It is immutable and safe for
// concurrent use.
//
// With one n per ink, a patch is computed with the coverage-weighted mean
// n = Σ eᵢ·nᵢ / Σ eᵢ over the effective coverages eᵢ: a patch of one ink
// uses that ink's n exactly (the Yule–Nielsen model of its ramp), and with
// all nᵢ equal the model is the usual one. The weighting is this
// library's choice (no published source): the Yule–Nielsen–Neugebauer
// model has one n.
type Halftone struct {
	grid colorimetry.Grid
	inks []string
	prim [][]float64 // 2^k primaries on grid, clamped at 0
	n    []float64   // 1 or k factors
	nSE  []float64   // standard errors of n from the fit (0: unknown or fixed)
	gain []DotGain   // k curves
	tac  float64     // total area coverage limit of the press, percent; 0 = none

	// Precomputed for the forward model.
	q    [][]float64 // prim^(1/n) for one n
	logp [][]float64 // ln prim for per-ink n

	report   FitReport
	inkFits  []InkFit
	primFits []PrimaryFit
}

var _ Model = (*Halftone)(nil)

func init() { register(HalftoneKind, decodeHalftone) }

// NewHalftone returns the halftone model of the inks (1 to
// MaxHalftoneInks, unique non-empty names without ',', '=' or '+') on grid
// g. primaries[p] is the reflectance (fraction 0–1) of Neugebauer primary
// p: the bare paper for p = 0, otherwise the solid overprint of the inks
// whose bits are set in p (bit i for inks[i]; see PrimaryName). Each is
// resampled onto g by its own rules. n holds one Yule–Nielsen factor for
// all inks, or one per ink, each in [MinNFactor, MaxNFactor]; gain holds
// each ink's dot-gain curve, or is nil for none. tac is the press's total
// area coverage limit in percent (0 for none). It returns an error for
// data it cannot use: a reflectance below −0.01 (beyond spectrophotometer
// noise) or above 1.5 (percent, not a fraction), a primary missing or on
// a range that does not cover g, and values out of range.
func NewHalftone(g colorimetry.Grid, inks []string, primaries []colorimetry.Spectrum, n []float64, gain []DotGain, tac float64) (*Halftone, error) {
	if !g.Valid() {
		return nil, fmt.Errorf("halftone model: %w: %+v", colorimetry.ErrBadGrid, g)
	}
	if err := htCheckInks(inks); err != nil {
		return nil, fmt.Errorf("halftone model: %w", err)
	}
	k := len(inks)
	if len(primaries) != 1<<k {
		return nil, fmt.Errorf("halftone model: %d primaries for %d inks (want 2^%d = %d)", len(primaries), k, k, 1<<k)
	}
	prim := make([][]float64, len(primaries))
	for p, s := range primaries {
		if s.IsZero() {
			return nil, fmt.Errorf("halftone model: primary %s: empty spectrum", PrimaryName(inks, p))
		}
		r, err := s.Resample(g)
		if err != nil {
			return nil, fmt.Errorf("halftone model: primary %s onto %v: %w", PrimaryName(inks, p), g, err)
		}
		prim[p] = r.Values(nil)
	}
	if gain == nil {
		gain = make([]DotGain, k)
	}
	m := &Halftone{grid: g, inks: append([]string(nil), inks...), prim: prim, n: append([]float64(nil), n...),
		gain: append([]DotGain(nil), gain...), tac: tac, report: htEmptyReport()}
	if err := m.setup(); err != nil {
		return nil, fmt.Errorf("halftone model: %w", err)
	}
	return m, nil
}

// htEmptyReport is the report of a model that was not fitted.
func htEmptyReport() FitReport { return FitReport{Samples: []SampleFit{}, Warnings: []string{}} }

// htCheckInks validates ink names.
func htCheckInks(inks []string) error {
	if len(inks) == 0 || len(inks) > MaxHalftoneInks {
		return fmt.Errorf("%d inks (want 1 to %d)", len(inks), MaxHalftoneInks)
	}
	seen := map[string]bool{}
	for i, name := range inks {
		switch {
		case strings.TrimSpace(name) == "" || name != strings.TrimSpace(name):
			return fmt.Errorf("ink %d has an empty name or one with spaces at its ends (%q)", i+1, name)
		case strings.ContainsAny(name, ",=+\n"):
			return fmt.Errorf("ink %q: a name may not contain ',', '=', '+' or a line break", name)
		case strings.EqualFold(name, "paper"):
			return fmt.Errorf("ink %d is named %q, the name of the bare paper", i+1, name)
		case seen[strings.ToLower(name)]:
			return fmt.Errorf("ink %q named twice", name)
		}
		seen[strings.ToLower(name)] = true
	}
	return nil
}

// setup validates the model and precomputes the forward model's tables.
func (m *Halftone) setup() error {
	k := len(m.inks)
	for p, r := range m.prim {
		if len(r) != m.grid.N {
			return fmt.Errorf("primary %s: %d values for %d wavelengths", PrimaryName(m.inks, p), len(r), m.grid.N)
		}
		for j, v := range r {
			switch {
			case !htFinite(v):
				return fmt.Errorf("primary %s at %g nm: %w", PrimaryName(m.inks, p), m.grid.Wavelength(j), ErrNotFinite)
			case v < -htNegTol:
				return fmt.Errorf("primary %s: reflectance %g at %g nm is below −%g, beyond measurement noise", PrimaryName(m.inks, p), v, m.grid.Wavelength(j), htNegTol)
			case v > htMaxReflectance:
				return fmt.Errorf("primary %s: reflectance %g at %g nm is above %g: reflectance is a fraction 0–1, not percent", PrimaryName(m.inks, p), v, m.grid.Wavelength(j), htMaxReflectance)
			}
			r[j] = math.Max(v, 0)
		}
	}
	if len(m.n) != 1 && len(m.n) != k {
		return fmt.Errorf("%d Yule–Nielsen factors for %d inks (want 1 or %d)", len(m.n), k, k)
	}
	for i, v := range m.n {
		if !htFinite(v) || v < MinNFactor || v > MaxNFactor {
			return fmt.Errorf("Yule–Nielsen factor %d is %v, outside [%g, %g]", i+1, v, float64(MinNFactor), float64(MaxNFactor))
		}
	}
	if m.nSE == nil {
		m.nSE = make([]float64, len(m.n))
	}
	if len(m.nSE) != len(m.n) {
		return fmt.Errorf("%d standard errors for %d Yule–Nielsen factors", len(m.nSE), len(m.n))
	}
	for _, v := range m.nSE {
		if !htFinite(v) || v < 0 {
			return fmt.Errorf("standard error %v of the Yule–Nielsen factor is not a finite non-negative number", v)
		}
	}
	if len(m.gain) != k {
		return fmt.Errorf("%d dot-gain curves for %d inks", len(m.gain), k)
	}
	if !htFinite(m.tac) || m.tac < 0 {
		return fmt.Errorf("total area coverage limit %v %% is not a finite non-negative number", m.tac)
	}
	if len(m.n) == 1 {
		m.q = make([][]float64, len(m.prim))
		for p, r := range m.prim {
			m.q[p] = make([]float64, len(r))
			for j, v := range r {
				m.q[p][j] = math.Pow(v, 1/m.n[0])
			}
		}
	} else {
		m.logp = make([][]float64, len(m.prim))
		for p, r := range m.prim {
			m.logp[p] = make([]float64, len(r))
			for j, v := range r {
				m.logp[p][j] = math.Log(v) // −Inf at 0: exp(−Inf/n) = 0
			}
		}
	}
	return nil
}

// htNegTol is how far below zero a measured reflectance may fall and be
// taken as noise near black (then as 0): 0.01, as CheckFraction's usual
// tolerance: common practice (no source).
const htNegTol = 0.01

// htMaxReflectance is the largest reflectance accepted: 1.5. Above it the
// values are almost surely percent. Fluorescent papers exceed 1 a little.
const htMaxReflectance = 1.5

// Kind returns "halftone".
func (m *Halftone) Kind() string { return HalftoneKind }

// Grid returns the wavelength grid of the model's spectra.
func (m *Halftone) Grid() colorimetry.Grid { return m.grid }

// Inks returns the inks' names in the model's order.
func (m *Halftone) Inks() []string { return append([]string(nil), m.inks...) }

// Primaries returns the 2^k Neugebauer primaries (reflectance 0–1, on the
// model's grid), indexed as in NewHalftone.
func (m *Halftone) Primaries() []colorimetry.Spectrum {
	out := make([]colorimetry.Spectrum, len(m.prim))
	for p, r := range m.prim {
		out[p] = m.spectrumOf(r)
	}
	return out
}

// NFactor returns the Yule–Nielsen factors (one for all inks, or one per
// ink) and their standard errors from the fit (0 where fixed or unknown).
func (m *Halftone) NFactor() (n, se []float64) {
	return append([]float64(nil), m.n...), append([]float64(nil), m.nSE...)
}

// DotGains returns the inks' dot-gain curves, in the model's order.
func (m *Halftone) DotGains() []DotGain { return append([]DotGain(nil), m.gain...) }

// TAC returns the press's total area coverage limit in percent, 0 when
// the model has none.
func (m *Halftone) TAC() float64 { return m.tac }

// Report returns the fit report (empty for a model built by NewHalftone).
// Its samples are the calibration's tints and overprint patches; the
// primaries, which the model reproduces by construction, are in
// PrimaryFits.
func (m *Halftone) Report() FitReport { return m.report }

// InkFits returns each ink's ramp summary from the fit (nil for a model
// built by NewHalftone).
func (m *Halftone) InkFits() []InkFit { return append([]InkFit(nil), m.inkFits...) }

// PrimaryFits returns the primaries' replicate summaries from the fit
// (nil for a model built by NewHalftone).
func (m *Halftone) PrimaryFits() []PrimaryFit { return append([]PrimaryFit(nil), m.primFits...) }

// index returns the position of ink name, or −1.
func (m *Halftone) index(name string) int {
	for i, n := range m.inks {
		if n == name {
			return i
		}
	}
	return -1
}

// Coverages returns the nominal coverages (0–1) in the model's ink order
// from amounts keyed by ink name; inks not named are 0. It returns an
// error wrapping ErrUnknownInk for a name the model lacks, and an error
// for an ink named twice or a coverage outside [0, 1] or not finite.
func (m *Halftone) Coverages(amounts []Amount) ([]float64, error) {
	c := make([]float64, len(m.inks))
	set := make([]bool, len(m.inks))
	for _, a := range amounts {
		i := m.index(a.Name)
		if i < 0 {
			return nil, fmt.Errorf("%w: %q (inks: %s)", ErrUnknownInk, a.Name, strings.Join(m.inks, ", "))
		}
		if set[i] {
			return nil, fmt.Errorf("ink %q given twice", a.Name)
		}
		if !htFinite(a.Value) || a.Value < 0 || a.Value > 1 {
			return nil, fmt.Errorf("ink %q: coverage %v is outside 0–1 (coverages are fractions: 40 %% is 0.4)", a.Name, a.Value)
		}
		c[i], set[i] = a.Value, true
	}
	return c, nil
}

// Reflectance returns the reflectance (fraction 0–1, on the model's grid)
// printed at the nominal coverages given by ink name (0–1; inks not named
// are 0). Errors: see Coverages.
func (m *Halftone) Reflectance(amounts []Amount) (colorimetry.Spectrum, error) {
	c, err := m.Coverages(amounts)
	if err != nil {
		return colorimetry.Spectrum{}, err
	}
	return m.spectrumOf(m.ReflectanceTo(make([]float64, m.grid.N), c)), nil
}

// EffectiveTo fills dst with the effective coverages of the nominal
// coverages (model ink order, each clamped to 0–1) and returns it. It
// panics if a slice has the wrong length.
func (m *Halftone) EffectiveTo(dst, nominal []float64) []float64 {
	if len(dst) != len(m.inks) || len(nominal) != len(m.inks) {
		panic("mixing: coverage slices must have one entry per ink")
	}
	for i, a := range nominal {
		dst[i] = m.gain[i].Effective(a)
	}
	return dst
}

// ReflectanceTo fills dst (len Grid().N) with the reflectance printed at
// the nominal coverages (model ink order, 0–1, clamped) and returns it. It
// allocates a little scratch space. It panics if a slice has the wrong
// length.
func (m *Halftone) ReflectanceTo(dst, nominal []float64) []float64 {
	if len(dst) != m.grid.N {
		panic("mixing: reflectance dst must have one entry per wavelength")
	}
	eff := m.EffectiveTo(make([]float64, len(m.inks)), nominal)
	return m.effectiveReflectanceTo(dst, eff, make([]float64, len(m.prim)))
}

// effectiveReflectanceTo is the Yule–Nielsen modified spectral Neugebauer
// model at effective coverages eff, with w scratch for the Demichel
// weights (len 2^k).
func (m *Halftone) effectiveReflectanceTo(dst, eff, w []float64) []float64 {
	DemichelTo(w, eff)
	if m.q != nil {
		n := m.n[0]
		for j := range dst {
			var s float64
			for p, q := range m.q {
				s += w[p] * q[j]
			}
			dst[j] = htPowN(s, n)
		}
		return dst
	}
	n := m.nFor(eff)
	for j := range dst {
		var s float64
		for p, lp := range m.logp {
			if w[p] != 0 {
				s += w[p] * math.Exp(lp[j]/n)
			}
		}
		dst[j] = htPowN(s, n)
	}
	return dst
}

// nFor returns the coverage-weighted Yule–Nielsen factor of a patch with
// per-ink factors (the mean factor for bare paper).
func (m *Halftone) nFor(eff []float64) float64 {
	var se, sn, mean float64
	for i, e := range eff {
		se += e
		sn += e * m.n[i]
		mean += m.n[i]
	}
	if se <= 0 {
		return mean / float64(len(m.n))
	}
	return sn / se
}

// htPowN returns s^n for s ≥ 0, with the common n = 1 and n = 2 exact and
// fast.
func htPowN(s, n float64) float64 {
	switch n {
	case 1:
		return s
	case 2:
		return s * s
	}
	return math.Pow(s, n)
}

// spectrumOf wraps values on the model grid as a spectrum.
func (m *Halftone) spectrumOf(v []float64) colorimetry.Spectrum {
	s, err := colorimetry.NewSpectrumOnGrid(m.grid, v, colorimetry.Options{})
	if err != nil {
		panic("mixing: reflectance of a validated halftone model is not finite: " + err.Error())
	}
	return s
}

// InkFit summarises one ink's tint ramp in the calibration.
type InkFit struct {
	Ink string `json:"ink"`
	// Patches and Levels count the training tints of the ramp and their
	// distinct nominal coverages.
	Patches int `json:"patches"`
	Levels  int `json:"levels"`
	// N is the ink's own Yule–Nielsen factor when n was fitted per ink,
	// null otherwise.
	N *float64 `json:"n_factor"`
	// Gain25, Gain50 and Gain75 are the dot gain (effective − nominal, a
	// fraction) at nominal 25, 50 and 75 %; MaxGain is the largest over
	// the curve, at nominal coverage MaxGainAt (0–1).
	Gain25    float64 `json:"dot_gain_25"`
	Gain50    float64 `json:"dot_gain_50"`
	Gain75    float64 `json:"dot_gain_75"`
	MaxGain   float64 `json:"dot_gain_max"`
	MaxGainAt float64 `json:"dot_gain_max_at"`
	// Smoothed reports that the effective coverages fitted to the ramp
	// fell slightly with rising nominal coverage somewhere and were pooled
	// into a monotone curve.
	Smoothed bool `json:"smoothed"`
}

// PrimaryFit summarises the measurements of one Neugebauer primary.
type PrimaryFit struct {
	Name string `json:"name"` // "paper", "c", "c+m" …
	// Samples names the measured patches averaged into the primary.
	Samples []string `json:"samples"`
	// Spread is the largest ΔE00 between a replicate and their mean under
	// the fit's illuminant (0 for a single measurement).
	Spread float64 `json:"spread_dE00"`
	// L, A, B are the primary's CIELAB under the fit's illuminant.
	L float64 `json:"L"`
	A float64 `json:"a"`
	B float64 `json:"b"`
}

// halftoneJSON is the "model" object of a halftone model file.
type halftoneJSON struct {
	Grid      gridJSON        `json:"grid"`
	Inks      []string        `json:"inks"`
	NFactor   []float64       `json:"n_factor"`
	NFactorSE []float64       `json:"n_factor_se"`
	TAC       *float64        `json:"tac_percent"` // null: no limit
	Primaries []htPrimaryJSON `json:"primaries"`
	DotGain   []htGainJSON    `json:"dot_gain"`
	Fit       FitReport       `json:"fit"`
	InkFits   []InkFit        `json:"ink_fits"`
	PrimFits  []PrimaryFit    `json:"primary_fits"`
}

type htPrimaryJSON struct {
	Name        string    `json:"name"`
	Reflectance []float64 `json:"reflectance"`
}

type htGainJSON struct {
	Ink       string    `json:"ink"`
	Nominal   []float64 `json:"nominal"`   // null: no dot gain
	Effective []float64 `json:"effective"` // null: no dot gain
}

// MarshalJSON writes the model's "model" object.
func (m *Halftone) MarshalJSON() ([]byte, error) {
	j := halftoneJSON{Grid: gridJSON{m.grid.Start, m.grid.Step, m.grid.N}, Inks: m.inks, NFactor: m.n, NFactorSE: m.nSE,
		Fit: m.report, InkFits: m.inkFits, PrimFits: m.primFits}
	if m.tac > 0 {
		t := m.tac
		j.TAC = &t
	}
	for p, r := range m.prim {
		j.Primaries = append(j.Primaries, htPrimaryJSON{Name: PrimaryName(m.inks, p), Reflectance: r})
	}
	for i, g := range m.gain {
		nom, eff := g.Knots()
		j.DotGain = append(j.DotGain, htGainJSON{Ink: m.inks[i], Nominal: nom, Effective: eff})
	}
	if j.Fit.Samples == nil {
		j.Fit.Samples = []SampleFit{}
	}
	if j.Fit.Warnings == nil {
		j.Fit.Warnings = []string{}
	}
	if j.InkFits == nil {
		j.InkFits = []InkFit{}
	}
	if j.PrimFits == nil {
		j.PrimFits = []PrimaryFit{}
	}
	return json.Marshal(j)
}

// decodeHalftone reads and validates a "halftone" model object.
func decodeHalftone(raw json.RawMessage) (Model, error) {
	var j halftoneJSON
	dec := json.NewDecoder(strings.NewReader(string(raw)))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&j); err != nil {
		return nil, err
	}
	g := colorimetry.Grid{Start: j.Grid.Start, Step: j.Grid.Step, N: j.Grid.N}
	if !g.Valid() || !(g.Start > 0) {
		return nil, fmt.Errorf("grid: %+v is not a valid wavelength grid", j.Grid)
	}
	if err := htCheckInks(j.Inks); err != nil {
		return nil, err
	}
	k := len(j.Inks)
	if len(j.Primaries) != 1<<k {
		return nil, fmt.Errorf("%d primaries for %d inks (want %d)", len(j.Primaries), k, 1<<k)
	}
	m := &Halftone{grid: g, inks: j.Inks, n: j.NFactor, nSE: j.NFactorSE, report: j.Fit, inkFits: j.InkFits, primFits: j.PrimFits}
	for p, pj := range j.Primaries {
		if want := PrimaryName(j.Inks, p); pj.Name != want {
			return nil, fmt.Errorf("primary %d is named %q, want %q (primaries are ordered by the bits of their inks)", p+1, pj.Name, want)
		}
		m.prim = append(m.prim, append([]float64(nil), pj.Reflectance...))
	}
	if len(j.DotGain) != k {
		return nil, fmt.Errorf("%d dot-gain curves for %d inks", len(j.DotGain), k)
	}
	for i, dj := range j.DotGain {
		if dj.Ink != j.Inks[i] {
			return nil, fmt.Errorf("dot-gain curve %d is for ink %q, want %q", i+1, dj.Ink, j.Inks[i])
		}
		var d DotGain
		if dj.Nominal != nil || dj.Effective != nil {
			var err error
			if d, err = NewDotGain(dj.Nominal, dj.Effective); err != nil {
				return nil, fmt.Errorf("ink %q: %w", dj.Ink, err)
			}
		}
		m.gain = append(m.gain, d)
	}
	if j.TAC != nil {
		if !(*j.TAC > 0) {
			return nil, fmt.Errorf("total area coverage limit %v %% is not positive (write null for none)", *j.TAC)
		}
		m.tac = *j.TAC
	}
	if m.report.Samples == nil {
		m.report.Samples = []SampleFit{}
	}
	if m.report.Warnings == nil {
		m.report.Warnings = []string{}
	}
	if err := m.setup(); err != nil {
		return nil, err
	}
	return m, nil
}

// htFinite reports whether v is neither NaN nor infinite.
func htFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
