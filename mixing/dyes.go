package mixing

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"
)

// The dyes and filters model (Beer–Lambert–Bouguer). Decadic absorbance
// A = −log10 T adds over the dyes of a solution or a tinted film:
//
//	A_mix(λ) = A_base(λ) + ℓ·Σᵢ cᵢ·εᵢ(λ)
//
// with A_base the absorbance of the substrate or solvent, cᵢ the
// concentration of dye i in the calibration's unit, εᵢ its absorptivity
// per unit concentration at the calibration's path length, and ℓ the path
// length (or film thickness) relative to the calibration's, 1 by default.
// The base does not scale with ℓ: it stands for what does not change with
// the amount of solution (cell windows, a gel's carrier film).

// Defaults of the dyes model.
const (
	// DefaultAbsorbanceLimit is the absorbance above which a measured
	// value is taken to be limited by stray light in the
	// spectrophotometer and left out of the fit: 2.5 (T ≈ 0.3 %). Most
	// laboratory instruments lose linearity between absorbance 2 and 3:
	// common practice (no source).
	DefaultAbsorbanceLimit = 2.5
	// TransmittanceFloor is the smallest transmittance turned into an
	// absorbance; values at or below zero are clamped to it, A = 5.
	TransmittanceFloor = 1e-5
	// DefaultDyeTolerance is the ΔE00 up to which a dye recipe counts as
	// reaching its target: 0.5, below what most observers see in a side
	// by side comparison of filters: common practice (no source).
	DefaultDyeTolerance = 0.5
)

// Errors of the dyes model.
var (
	// ErrDyeData reports a calibration file or sample set that the dyes
	// model cannot use; the wrapping error says what and where.
	ErrDyeData = errors.New("unusable dye calibration data")
	// ErrUnknownDye reports an amount for a dye that the model lacks.
	ErrUnknownDye = errors.New("no such dye in the model")
)

// Dye is one dye of a Dyes model.
type Dye struct {
	// Name identifies the dye; names are unique within a model.
	Name string
	// Absorptivity is the decadic absorbance per unit concentration (the
	// model's Unit) at the calibration's path length, on the model's grid.
	Absorptivity []float64
	// StdErr is the standard error of Absorptivity from the fit residuals
	// (same units and grid), nil when unknown.
	StdErr []float64
	// CalibratedMin and CalibratedMax are the smallest and largest
	// non-zero concentrations of the dye in its calibration (Unit);
	// beyond CalibratedMax the model extrapolates Beer–Lambert.
	CalibratedMin, CalibratedMax float64
}

// DyeLinearity says how well a dye's dilution series follows
// Beer–Lambert: R² of absorbance against concentration (single-dye
// samples and blanks) at the dye's absorption peak and the lowest R² over
// the band where it absorbs (absorptivity at least a tenth of the peak's).
// R² values are null where the series cannot give one.
type DyeLinearity struct {
	Dye              string   `json:"dye"`
	PeakNM           float64  `json:"peak_nm"`           // wavelength of the largest absorptivity, nm
	PeakAbsorptivity float64  `json:"peak_absorptivity"` // per unit concentration
	R2Peak           *float64 `json:"r2_peak"`           // R² at the peak
	R2BandMin        *float64 `json:"r2_band_min"`       // lowest R² over the band
	R2BandMinNM      *float64 `json:"r2_band_min_nm"`    // where it occurs, nm
	BandFrom         float64  `json:"band_from_nm"`      // first wavelength of the band, nm
	BandTo           float64  `json:"band_to_nm"`        // last wavelength of the band, nm
	Levels           int      `json:"levels"`            // distinct non-zero concentrations in the series
}

// Breakdown flags a calibration sample where the Beer–Lambert law does
// not hold: Reason "nonlinear" when its absorbance at the dye's peak
// departs from the line through the lower concentrations by more than 3σ
// of their residuals, "stray_light" when its measured absorbance exceeds
// the absorbance limit (those values are left out of the fit).
type Breakdown struct {
	Sample        string  `json:"sample"`
	Dye           string  `json:"dye"`           // the dye of a single-dye sample, "" for a mixture
	Concentration float64 `json:"concentration"` // of Dye, in the model's unit; 0 for a mixture
	Wavelength    float64 `json:"wavelength_nm"`
	Absorbance    float64 `json:"absorbance"` // measured
	Expected      float64 `json:"expected"`   // from the line (nonlinear) or the model (stray_light)
	Reason        string  `json:"reason"`
}

// Dyes is a fitted Beer–Lambert–Bouguer model of dyes in a solvent or a
// film. It is immutable and safe for concurrent use.
type Dyes struct {
	grid       colorimetry.Grid
	unit       string
	base       []float64
	dyes       []Dye
	limit      float64
	report     FitReport
	linearity  []DyeLinearity
	breakdowns []Breakdown
}

var _ Model = (*Dyes)(nil)

func init() { register("dyes", decodeDyes) }

// NewDyes returns a model on grid g with base absorbance base (len g.N,
// decadic) and the given dyes, whose concentrations are in unit. It
// validates the data: finite values, lengths matching the grid, unique
// non-empty names, non-negative absorptivities and calibrated ranges
// with 0 ≤ min ≤ max. The slices are copied. The model's fit report is
// empty.
func NewDyes(g colorimetry.Grid, unit string, base []float64, dyes []Dye) (*Dyes, error) {
	m := &Dyes{grid: g, unit: unit, base: append([]float64(nil), base...), limit: DefaultAbsorbanceLimit,
		report: FitReport{Samples: []SampleFit{}, Warnings: []string{}}}
	for _, d := range dyes {
		d.Absorptivity = append([]float64(nil), d.Absorptivity...)
		if d.StdErr != nil {
			d.StdErr = append([]float64(nil), d.StdErr...)
		}
		m.dyes = append(m.dyes, d)
	}
	if err := m.validate(); err != nil {
		return nil, err
	}
	return m, nil
}

// validate checks the invariants listed at NewDyes.
func (m *Dyes) validate() error {
	if !m.grid.Valid() {
		return fmt.Errorf("%w: %+v", colorimetry.ErrBadGrid, m.grid)
	}
	if len(m.base) != m.grid.N {
		return fmt.Errorf("base absorbance has %d values for %d wavelengths", len(m.base), m.grid.N)
	}
	for i, v := range m.base {
		if !dyeFinite(v) {
			return fmt.Errorf("base absorbance at %g nm: %w", m.grid.Wavelength(i), ErrNotFinite)
		}
	}
	if len(m.dyes) == 0 {
		return errors.New("the model has no dyes")
	}
	seen := map[string]bool{}
	for _, d := range m.dyes {
		switch {
		case strings.TrimSpace(d.Name) == "":
			return errors.New("a dye has an empty name")
		case seen[d.Name]:
			return fmt.Errorf("dye %q appears twice", d.Name)
		case len(d.Absorptivity) != m.grid.N:
			return fmt.Errorf("dye %q: %d absorptivity values for %d wavelengths", d.Name, len(d.Absorptivity), m.grid.N)
		case d.StdErr != nil && len(d.StdErr) != m.grid.N:
			return fmt.Errorf("dye %q: %d standard errors for %d wavelengths", d.Name, len(d.StdErr), m.grid.N)
		case !dyeFinite(d.CalibratedMin) || !dyeFinite(d.CalibratedMax) || d.CalibratedMin < 0 || d.CalibratedMin > d.CalibratedMax:
			return fmt.Errorf("dye %q: calibrated range %g–%g is not 0 ≤ min ≤ max", d.Name, d.CalibratedMin, d.CalibratedMax)
		}
		seen[d.Name] = true
		for i, v := range d.Absorptivity {
			if !dyeFinite(v) || v < 0 {
				return fmt.Errorf("dye %q: absorptivity %v at %g nm is not a finite non-negative number", d.Name, v, m.grid.Wavelength(i))
			}
		}
		for i, v := range d.StdErr {
			if !dyeFinite(v) || v < 0 {
				return fmt.Errorf("dye %q: standard error %v at %g nm is not a finite non-negative number", d.Name, v, m.grid.Wavelength(i))
			}
		}
	}
	if !dyeFinite(m.limit) || m.limit <= 0 {
		return fmt.Errorf("absorbance limit %v is not positive", m.limit)
	}
	return nil
}

// Kind returns "dyes".
func (m *Dyes) Kind() string { return "dyes" }

// Grid returns the wavelength grid of the model's spectra.
func (m *Dyes) Grid() colorimetry.Grid { return m.grid }

// Unit returns the concentration unit of the calibration, as written in
// its file (e.g. "g/L"); it may be empty.
func (m *Dyes) Unit() string { return m.unit }

// Names returns the dyes' names in the model's order.
func (m *Dyes) Names() []string {
	n := make([]string, len(m.dyes))
	for i, d := range m.dyes {
		n[i] = d.Name
	}
	return n
}

// Dyes returns copies of the model's dyes.
func (m *Dyes) Dyes() []Dye {
	out := make([]Dye, len(m.dyes))
	for i, d := range m.dyes {
		d.Absorptivity = append([]float64(nil), d.Absorptivity...)
		if d.StdErr != nil {
			d.StdErr = append([]float64(nil), d.StdErr...)
		}
		out[i] = d
	}
	return out
}

// Base returns the base (substrate or solvent) absorbance spectrum.
func (m *Dyes) Base() colorimetry.Spectrum {
	s, _ := colorimetry.NewSpectrumOnGrid(m.grid, m.base, colorimetry.Options{})
	return s
}

// AbsorbanceLimit returns the absorbance above which the calibration's
// measurements were left out as stray-light limited.
func (m *Dyes) AbsorbanceLimit() float64 { return m.limit }

// Report returns the fit report (empty for a model built by NewDyes).
func (m *Dyes) Report() FitReport { return m.report }

// Linearity returns the Beer–Lambert linearity of each dye's series.
func (m *Dyes) Linearity() []DyeLinearity { return append([]DyeLinearity(nil), m.linearity...) }

// Breakdowns returns the calibration samples flagged as departing from
// Beer–Lambert.
func (m *Dyes) Breakdowns() []Breakdown { return append([]Breakdown(nil), m.breakdowns...) }

// AbsorbanceTo fills dst (len Grid().N) with the decadic absorbance
// A_base + ℓ·Σ cᵢ·εᵢ for the concentrations conc (one per dye, the
// model's order and unit) at relative path length pathLength, and returns
// it. It allocates nothing. It panics if a length is wrong.
func (m *Dyes) AbsorbanceTo(dst, conc []float64, pathLength float64) []float64 {
	if len(dst) != m.grid.N {
		panic("mixing: dst length differs from the model grid")
	}
	if len(conc) != len(m.dyes) {
		panic("mixing: one concentration per dye is needed")
	}
	copy(dst, m.base)
	for i, d := range m.dyes {
		k := pathLength * conc[i]
		if k == 0 {
			continue
		}
		for j, e := range d.Absorptivity {
			dst[j] += k * e
		}
	}
	return dst
}

// Concentrations returns the model-ordered concentration vector of the
// amounts (dyes not named are 0). It returns an error wrapping
// ErrUnknownDye for a name the model lacks, and an error for a negative or
// non-finite amount or a name given twice.
func (m *Dyes) Concentrations(amounts []Amount) ([]float64, error) {
	c := make([]float64, len(m.dyes))
	set := make([]bool, len(m.dyes))
	for _, a := range amounts {
		i := m.index(a.Name)
		if i < 0 {
			return nil, fmt.Errorf("%w: %q (the model has %s)", ErrUnknownDye, a.Name, strings.Join(m.Names(), ", "))
		}
		if set[i] {
			return nil, fmt.Errorf("dye %q given twice", a.Name)
		}
		if !dyeFinite(a.Value) || a.Value < 0 {
			return nil, fmt.Errorf("dye %q: concentration %v is not a finite non-negative number", a.Name, a.Value)
		}
		c[i], set[i] = a.Value, true
	}
	return c, nil
}

func (m *Dyes) index(name string) int {
	for i, d := range m.dyes {
		if d.Name == name {
			return i
		}
	}
	return -1
}

// Transmittance returns the transmittance spectrum (fraction 0–1, on the
// model's grid) of the dyes at the given concentrations (model unit) and
// relative path length ℓ > 0, with warnings when a concentration times ℓ
// exceeds the dye's calibrated range or the absorbance exceeds the
// calibration's absorbance limit. Errors: see Concentrations, a path
// length that is not finite and positive, and concentrations times path
// length so large that the absorbance overflows (ErrNotFinite).
func (m *Dyes) Transmittance(amounts []Amount, pathLength float64) (colorimetry.Spectrum, []string, error) {
	if !dyeFinite(pathLength) || pathLength <= 0 {
		return colorimetry.Spectrum{}, nil, fmt.Errorf("path length %v is not a finite positive number", pathLength)
	}
	c, err := m.Concentrations(amounts)
	if err != nil {
		return colorimetry.Spectrum{}, nil, err
	}
	a := m.AbsorbanceTo(make([]float64, m.grid.N), c, pathLength)
	for j, v := range a {
		// Concentrations times the path length near the float64 range
		// overflow (∞·0 at a wavelength where a dye does not absorb), and
		// a negative absorbance below −308 makes 10^(−A) overflow.
		if math.IsNaN(v) || math.IsInf(math.Pow(10, -v), 0) {
			return colorimetry.Spectrum{}, nil, fmt.Errorf("absorbance at %g nm is %v: concentrations × path length %v overflow the float64 range: %w",
				m.grid.Wavelength(j), v, pathLength, ErrNotFinite)
		}
	}
	return m.spectrumOf(a), m.rangeWarnings(c, pathLength, a), nil
}

// spectrumOf returns 10^(−a) as a spectrum on the model grid.
func (m *Dyes) spectrumOf(a []float64) colorimetry.Spectrum {
	t := make([]float64, len(a))
	for i, v := range a {
		t[i] = math.Pow(10, -v)
	}
	s, err := colorimetry.NewSpectrumOnGrid(m.grid, t, colorimetry.Options{})
	if err != nil {
		panic("mixing: transmittance of a validated model is not finite: " + err.Error())
	}
	return s
}

// rangeWarnings reports concentrations beyond the calibration and
// absorbance beyond the stray-light limit.
func (m *Dyes) rangeWarnings(c []float64, pathLength float64, a []float64) []string {
	var w []string
	for i, d := range m.dyes {
		if eff := c[i] * pathLength; eff > d.CalibratedMax*(1+1e-9) {
			w = append(w, fmt.Sprintf("%s: concentration %.4g %s × path length %.4g exceeds the calibrated range (up to %.4g %s); Beer–Lambert is extrapolated",
				d.Name, c[i], m.unit, pathLength, d.CalibratedMax, m.unit))
		}
	}
	k, amax := 0, math.Inf(-1)
	for j, v := range a {
		if v > amax {
			k, amax = j, v
		}
	}
	if amax > m.limit {
		w = append(w, fmt.Sprintf("absorbance %.3g at %g nm exceeds %.3g, beyond what the calibration could measure", amax, m.grid.Wavelength(k), m.limit))
	}
	return w
}

// DyeSample is one calibration measurement: the transmittance (fraction
// 0–1) of a sample of known dye concentrations.
type DyeSample struct {
	// Name identifies the sample; names are unique.
	Name string
	// Amounts are the sample's concentrations per dye (the calibration's
	// unit); none, or all zero, for a blank (base only).
	Amounts []Amount
	// Transmittance is the measured spectrum, fraction 0–1.
	Transmittance colorimetry.Spectrum
	// HeldOut excludes the sample from the fit; it is only scored.
	HeldOut bool
	// Place says where the sample came from ("file.csv:12"), for
	// messages; may be empty.
	Place string
}

// where names a sample in messages.
func (s DyeSample) where() string {
	if s.Place != "" {
		return fmt.Sprintf("%s: sample %q", s.Place, s.Name)
	}
	return fmt.Sprintf("sample %q", s.Name)
}

// DyeSamples reads calibration samples from the records of a rows-layout
// spectral CSV file (specio), whose extra columns give the amounts
// (column names are matched without regard to case):
//
//	name   the sample's name (the first column, as in every rows file)
//	dye    the dye's name; empty, "base" or "blank" for a blank; or, for
//	       a mixture, name=concentration pairs joined by "+", e.g.
//	       "amber=0.02+teal=0.01" (the concentration cell then stays empty)
//	concentration   the dye's concentration; 0 makes the row a blank. The
//	       header may carry the unit: "concentration (g/L)" or
//	       "concentration [g/L]"
//	unit   optional: the concentration unit, the same on every row
//	heldout  optional: 1 (or yes, true) keeps the sample out of the fit
//	         and scores it as a validation sample; 0 or empty uses it
//
// followed by one column per wavelength holding transmittance (fraction
// 0–1). It returns the samples and the unit ("" when the file names
// none). Errors name the file, line and column: a missing dye or
// concentration column (listing the columns found), a cell that is not a
// number, a unit that differs between rows, a sample name used twice.
func DyeSamples(recs []specio.Named, file string) ([]DyeSample, string, error) {
	if len(recs) == 0 {
		return nil, "", fmt.Errorf("%s: %w: no samples", file, ErrDyeData)
	}
	keys := map[string]string{} // lower-case role → header text
	var found []string
	for k := range recs[0].Fields {
		found = append(found, k)
	}
	sort.Strings(found)
	unitFromHeader := ""
	for _, k := range found {
		l := strings.ToLower(strings.TrimSpace(k))
		switch {
		case l == "dye", l == "heldout", l == "unit":
			keys[l] = k
		case l == "concentration" || strings.HasPrefix(l, "concentration (") && strings.HasSuffix(l, ")") ||
			strings.HasPrefix(l, "concentration [") && strings.HasSuffix(l, "]"):
			if _, dup := keys["concentration"]; dup {
				return nil, "", fmt.Errorf("%s:%d: %w: two concentration columns (%q and %q)", file, recs[0].Line, ErrDyeData, keys["concentration"], k)
			}
			keys["concentration"] = k
			if l != "concentration" {
				t := strings.TrimSpace(k)
				unitFromHeader = strings.TrimSpace(t[len("concentration (") : len(t)-1])
			}
		}
	}
	for _, need := range []string{"dye", "concentration"} {
		if _, ok := keys[need]; !ok {
			have := "none"
			if len(found) > 0 {
				have = strings.Join(found, ", ")
			}
			return nil, "", fmt.Errorf("%s: %w: no %q column (the non-wavelength columns found: %s); the rows layout is name, dye, concentration, [unit], [heldout], then one column per wavelength",
				file, ErrDyeData, need, have)
		}
	}
	unit, unitLine := unitFromHeader, 0
	seen := map[string]int{}
	out := make([]DyeSample, 0, len(recs))
	for _, r := range recs {
		place := fmt.Sprintf("%s:%d", file, r.Line)
		if prev, dup := seen[r.Name]; dup {
			return nil, "", fmt.Errorf("%s: %w: sample name %q used twice (also on line %d)", place, ErrDyeData, r.Name, prev)
		}
		seen[r.Name] = r.Line
		s := DyeSample{Name: r.Name, Transmittance: r.Spectrum, Place: place}
		if k, ok := keys["unit"]; ok {
			if u := strings.TrimSpace(r.Fields[k]); u != "" {
				switch {
				case unit == "":
					unit, unitLine = u, r.Line
				case u != unit:
					from := "the concentration header"
					if unitLine > 0 {
						from = fmt.Sprintf("line %d", unitLine)
					}
					return nil, "", fmt.Errorf("%s (field %s): %w: unit %q differs from %q on %s", place, k, ErrDyeData, u, unit, from)
				}
			}
		}
		if k, ok := keys["heldout"]; ok {
			switch strings.ToLower(strings.TrimSpace(r.Fields[k])) {
			case "", "0", "no", "false":
			case "1", "yes", "true":
				s.HeldOut = true
			default:
				return nil, "", fmt.Errorf("%s (field %s): %w: %q is not 0 or 1", place, k, ErrDyeData, r.Fields[k])
			}
		}
		dye := strings.TrimSpace(r.Fields[keys["dye"]])
		concText := strings.TrimSpace(r.Fields[keys["concentration"]])
		switch {
		case strings.Contains(dye, "="):
			if concText != "" {
				return nil, "", fmt.Errorf("%s (field %s): %w: a mixture %q gives its concentrations in the dye cell; leave the concentration cell empty", place, keys["concentration"], ErrDyeData, dye)
			}
			names := map[string]bool{}
			for _, part := range strings.Split(dye, "+") {
				n, v, _ := strings.Cut(part, "=")
				n = strings.TrimSpace(n)
				x, err := strconv.ParseFloat(strings.ReplaceAll(strings.TrimSpace(v), ",", "."), 64)
				if n == "" || err != nil || !dyeFinite(x) || x < 0 {
					return nil, "", fmt.Errorf("%s (field %s): %w: %q is not dye=concentration with a finite non-negative number", place, keys["dye"], ErrDyeData, strings.TrimSpace(part))
				}
				if names[n] {
					return nil, "", fmt.Errorf("%s (field %s): %w: dye %q named twice in the mixture", place, keys["dye"], ErrDyeData, n)
				}
				names[n] = true
				s.Amounts = append(s.Amounts, Amount{Name: n, Value: x})
			}
		default:
			c, err := r.Number(keys["concentration"])
			if err != nil {
				return nil, "", err
			}
			if c < 0 {
				return nil, "", fmt.Errorf("%s (field %s): %w: concentration %g is negative", place, keys["concentration"], ErrDyeData, c)
			}
			l := strings.ToLower(dye)
			if l != "" && l != "base" && l != "blank" && c > 0 {
				s.Amounts = []Amount{{Name: dye, Value: c}}
			} else if c > 0 {
				return nil, "", fmt.Errorf("%s (field %s): %w: a blank row has concentration %g; name its dye or write 0", place, keys["concentration"], ErrDyeData, c)
			}
		}
		out = append(out, s)
	}
	return out, unit, nil
}

// DyeFitSettings control FitDyes. The zero value fits under D65 and the
// CIE 1931 observer with no extra samples held out.
type DyeFitSettings struct {
	// Unit is the concentration unit recorded in the model.
	Unit string
	// Scorer scores the fit (ΔE00 of transmittance as an object colour);
	// nil means D65 and the CIE 1931 2° observer.
	Scorer *Scorer
	// HoldOut is the fraction (0 ≤ HoldOut < 1) of the samples to hold out
	// for validation, on top of those marked HeldOut, chosen
	// deterministically: never a blank nor the lowest or highest
	// concentration of a dye, spread evenly over the remaining samples in
	// input order.
	HoldOut float64
	// AbsorbanceLimit is the measured absorbance above which a value is
	// left out of the fit as stray-light limited; 0 means
	// DefaultAbsorbanceLimit.
	AbsorbanceLimit float64
}

// dyeNoiseFloor is the smallest transmittance noise σ_T used to flag
// non-linearity, 0.001 (0.1 % T): the photometric noise of a good
// spectrophotometer, so that noise-free data do not flag rounding: common
// practice (no source).
const dyeNoiseFloor = 0.001

// FitDyes calibrates a Beer–Lambert–Bouguer model from dilution series.
//
// For every wavelength it solves the least-squares problem over all
// training samples (those not held out) jointly,
//
//	A_s(λ) ≈ A_base(λ) + Σᵢ c_si·εᵢ(λ),  εᵢ(λ) ≥ 0,
//
// by BoundedLS (base free, absorptivities non-negative), leaving out values
// above the absorbance limit. Each equation is weighted by the sample's
// measured transmittance T_s(λ): transmittance noise σ_T becomes
// absorbance noise σ_T/(T·ln 10), so the weighted problem has residuals of
// one variance (first-order propagation, JCGM 100:2008 eq. 10). Single-dye series, blanks and mixtures all
// enter as equations; replicates (two rows of the same dye and
// concentration) are independent measurements and welcome. The standard
// error of each εᵢ(λ) comes from the weighted residual variance,
// σ̂²·[(XᵀWX)⁻¹]ᵢᵢ. Transmittance ≤ 0 is clamped at TransmittanceFloor with
// a warning naming the sample and wavelength.
//
// The report scores every sample (training and held out): RMS spectral
// residual in transmittance and ΔE00 of the transmittance as an object
// colour; it lists each dye's linearity (R² at its peak and the worst over
// its band) and flags samples where the law breaks down.
//
// Errors (wrapping ErrDyeData, naming the sample, dye or wavelength): no
// samples, spectra on different grids, a sample name used twice, a dye
// with fewer than two different non-zero training concentrations, a
// wavelength where every training sample of a dye exceeds the absorbance
// limit, or a calibration that cannot tell the dyes and the base apart.
func FitDyes(samples []DyeSample, set DyeFitSettings) (*Dyes, error) {
	if len(samples) == 0 {
		return nil, fmt.Errorf("%w: no samples", ErrDyeData)
	}
	if set.HoldOut < 0 || set.HoldOut >= 1 || !dyeFinite(set.HoldOut) {
		return nil, fmt.Errorf("hold-out fraction %v is not in [0, 1)", set.HoldOut)
	}
	limit := set.AbsorbanceLimit
	if limit == 0 {
		limit = DefaultAbsorbanceLimit
	}
	if !dyeFinite(limit) || limit <= 0 {
		return nil, fmt.Errorf("absorbance limit %v is not positive", limit)
	}
	scorer := set.Scorer
	if scorer == nil {
		scorer = NewScorer(cie.CIE1931(), cie.D65(), "D65")
	}
	var warns []string

	// Dyes in order of first appearance; samples on one grid.
	g := samples[0].Transmittance.Grid()
	var names []string
	seen := map[string]int{}
	nameLine := map[string]string{}
	for _, s := range samples {
		if prev, dup := nameLine[s.Name]; dup {
			return nil, fmt.Errorf("%s: %w: sample name used twice (also %s)", s.where(), ErrDyeData, prev)
		}
		nameLine[s.Name] = s.where()
		if s.Transmittance.IsZero() {
			return nil, fmt.Errorf("%s: %w: no spectrum", s.where(), ErrDyeData)
		}
		if sg := s.Transmittance.Grid(); !sg.Equal(g) {
			return nil, fmt.Errorf("%s: %w: spectrum on %v, the first sample on %v; measure all samples on one grid", s.where(), ErrDyeData, sg, g)
		}
		for _, a := range s.Amounts {
			if !dyeFinite(a.Value) || a.Value < 0 {
				return nil, fmt.Errorf("%s: %w: concentration of %q is %v", s.where(), ErrDyeData, a.Name, a.Value)
			}
			if _, ok := seen[a.Name]; !ok && a.Value > 0 {
				seen[a.Name] = len(names)
				names = append(names, a.Name)
			}
		}
	}
	if len(names) == 0 {
		return nil, fmt.Errorf("%w: every sample is a blank; the calibration needs dye samples", ErrDyeData)
	}
	n, nl := len(names), g.N
	conc := make([][]float64, len(samples))
	for k, s := range samples {
		conc[k] = make([]float64, n)
		for _, a := range s.Amounts {
			if i, ok := seen[a.Name]; ok {
				conc[k][i] += a.Value
			}
		}
	}
	held := chooseDyeHoldOut(samples, conc, set.HoldOut)

	// Absorbance of every sample.
	absb := make([][]float64, len(samples))
	for k, s := range samples {
		absb[k] = make([]float64, nl)
		var clamped []float64
		for j := range nl {
			t := s.Transmittance.Value(j)
			if t <= TransmittanceFloor {
				if t <= 0 {
					clamped = append(clamped, g.Wavelength(j))
				}
				t = TransmittanceFloor
			}
			absb[k][j] = -math.Log10(t)
		}
		if len(clamped) > 0 {
			warns = append(warns, fmt.Sprintf("%s: transmittance ≤ 0 at %s; absorbance undefined, clamped at T = %g (A = %g)",
				s.where(), dyeNMList(clamped), TransmittanceFloor, -math.Log10(TransmittanceFloor)))
		}
	}

	// Each dye needs two different non-zero training concentrations.
	for i, name := range names {
		levels := map[float64]bool{}
		var where []string
		for k := range samples {
			if !held[k] && conc[k][i] > 0 {
				levels[conc[k][i]] = true
				where = append(where, samples[k].where())
			}
		}
		if len(levels) < 2 {
			if len(levels) == 0 {
				return nil, fmt.Errorf("%w: dye %q has no training sample (all held out)", ErrDyeData, name)
			}
			return nil, fmt.Errorf("%w: dye %q has a single concentration (%s); a slope needs at least two different concentrations", ErrDyeData, name, strings.Join(where, "; "))
		}
	}

	// Per-wavelength fit.
	p := n + 1
	eps := make([][]float64, n)
	se := make([][]float64, n)
	for i := range n {
		eps[i] = make([]float64, nl)
		se[i] = make([]float64, nl)
	}
	base := make([]float64, nl)
	lo := make([]float64, p)
	hi := make([]float64, p)
	lo[0] = math.Inf(-1)
	for i := range hi {
		hi[i] = math.Inf(1)
	}
	seOK := true
	excluded := map[int][]float64{} // sample → wavelengths left out
	for j := range nl {
		var rows []int
		for k := range samples {
			if held[k] {
				continue
			}
			if absb[k][j] > limit {
				excluded[k] = append(excluded[k], g.Wavelength(j))
				continue
			}
			rows = append(rows, k)
		}
		for i, name := range names {
			ok := false
			for _, k := range rows {
				if conc[k][i] > 0 {
					ok = true
					break
				}
			}
			if !ok {
				return nil, fmt.Errorf("%w: at %g nm every training sample of dye %q has absorbance above the limit %g; dilute the series or raise the limit",
					ErrDyeData, g.Wavelength(j), name, limit)
			}
		}
		x := mat.NewDense(len(rows), p, nil)
		y := make([]float64, len(rows))
		for r, k := range rows {
			// Row weight T: absorbance noise is σ_T/(T·ln 10), so the
			// weighted residuals share one variance.
			w := math.Pow(10, -absb[k][j])
			x.Set(r, 0, w)
			for i := range n {
				x.Set(r, i+1, w*conc[k][i])
			}
			y[r] = w * absb[k][j]
		}
		beta, rnorm, err := BoundedLS(x, y, lo, hi)
		if err != nil {
			return nil, fmt.Errorf("fit at %g nm: %w", g.Wavelength(j), err)
		}
		base[j] = beta[0]
		for i := range n {
			eps[i][j] = beta[i+1]
		}
		// Standard errors: σ̂²·diag((XᵀWX)⁻¹) (x holds W^½·X).
		var xtx mat.SymDense
		xtx.SymOuterK(1, x.T())
		var inv mat.Dense
		if err := inv.Inverse(&xtx); err != nil {
			return nil, fmt.Errorf("%w: at %g nm the training samples cannot tell the base and the dyes apart (%v); add blanks or vary each dye on its own",
				ErrDyeData, g.Wavelength(j), err)
		}
		dof := len(rows) - p
		if dof < 1 {
			seOK = false
			continue
		}
		s2 := rnorm * rnorm / float64(dof)
		for i := range n {
			se[i][j] = math.Sqrt(s2 * math.Max(0, inv.At(i+1, i+1)))
		}
	}
	for k, nms := range excluded {
		warns = append(warns, fmt.Sprintf("%s: absorbance above %g at %s left out of the fit (stray light)", samples[k].where(), limit, dyeNMList(nms)))
	}

	m := &Dyes{grid: g, unit: set.Unit, base: base, limit: limit}
	for i, name := range names {
		d := Dye{Name: name, Absorptivity: eps[i], CalibratedMin: math.Inf(1)}
		if seOK {
			d.StdErr = se[i]
		}
		for k := range samples {
			if c := conc[k][i]; !held[k] && c > 0 {
				d.CalibratedMin = math.Min(d.CalibratedMin, c)
				d.CalibratedMax = math.Max(d.CalibratedMax, c)
			}
		}
		m.dyes = append(m.dyes, d)
	}
	if err := m.validate(); err != nil {
		return nil, fmt.Errorf("fitted model: %w", err)
	}

	// Fit report.
	fits := make([]SampleFit, len(samples))
	pred := make([]float64, nl)
	for k, s := range samples {
		m.AbsorbanceTo(pred, conc[k], 1)
		ps := m.spectrumOf(pred)
		rms, maxAbs, err := Residual(s.Transmittance, ps)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", s.where(), err)
		}
		de, err := scorer.ObjectDE00(s.Transmittance, ps)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", s.where(), err)
		}
		fits[k] = SampleFit{Name: s.Name, HeldOut: held[k], RMS: rms, MaxAbs: maxAbs, DE00: de}
	}
	m.report = NewFitReport(fits, scorer.Illuminant(), scorer.Observer())
	m.linearity, m.breakdowns = dyeLinearityOf(m, samples, conc, absb, held)
	exKeys := make([]int, 0, len(excluded))
	for k := range excluded {
		exKeys = append(exKeys, k)
	}
	sort.Ints(exKeys)
	for _, k := range exKeys {
		nms := excluded[k]
		// Stray-light flags at the worst wavelength of each sample.
		jw, aw := 0, math.Inf(-1)
		for _, nm := range nms {
			j := int(math.Round((nm - g.Start) / g.Step))
			if absb[k][j] > aw {
				jw, aw = j, absb[k][j]
			}
		}
		m.AbsorbanceTo(pred, conc[k], 1)
		b := Breakdown{Sample: samples[k].Name, Wavelength: g.Wavelength(jw), Absorbance: aw, Expected: pred[jw], Reason: "stray_light"}
		if d, c, ok := dyeSingle(conc[k], names); ok {
			b.Dye, b.Concentration = d, c
		}
		m.breakdowns = append(m.breakdowns, b)
	}
	sort.SliceStable(m.breakdowns, func(a, b int) bool {
		x, y := m.breakdowns[a], m.breakdowns[b]
		if x.Dye != y.Dye {
			return x.Dye < y.Dye
		}
		if x.Concentration != y.Concentration {
			return x.Concentration < y.Concentration
		}
		return x.Reason < y.Reason
	})
	for _, b := range m.breakdowns {
		if b.Reason == "nonlinear" {
			warns = append(warns, fmt.Sprintf("sample %q (%s at %.4g %s): absorbance %.4f at %g nm departs from the line through the lower concentrations (%.4f): Beer–Lambert breaks down",
				b.Sample, b.Dye, b.Concentration, m.unit, b.Absorbance, b.Wavelength, b.Expected))
		}
	}
	if set.HoldOut > 0 {
		k := 0
		for i := range samples {
			if held[i] && !samples[i].HeldOut {
				k++
			}
		}
		want := int(math.Round(set.HoldOut * float64(len(samples))))
		if k < want {
			warns = append(warns, fmt.Sprintf("hold-out %.3g asks for %d samples; only %d could be spared (blanks and each dye's lowest and highest concentrations stay in the fit)", set.HoldOut, want, k))
		}
	}
	sort.Strings(warns)
	m.report.Warnings = append(m.report.Warnings, warns...)
	return m, nil
}

// dyeSingle returns the dye and concentration of a single-dye sample.
func dyeSingle(c []float64, names []string) (string, float64, bool) {
	k := -1
	for i, v := range c {
		if v > 0 {
			if k >= 0 {
				return "", 0, false
			}
			k = i
		}
	}
	if k < 0 {
		return "", 0, false
	}
	return names[k], c[k], true
}

// chooseDyeHoldOut marks the samples held out: those flagged, plus
// round(frac·len) more chosen evenly from the candidates (not a blank, not
// the lowest or highest concentration of any dye it contains).
func chooseDyeHoldOut(samples []DyeSample, conc [][]float64, frac float64) []bool {
	held := make([]bool, len(samples))
	for k, s := range samples {
		held[k] = s.HeldOut
	}
	want := int(math.Round(frac * float64(len(samples))))
	if want == 0 {
		return held
	}
	n := len(conc[0])
	lo, hi := make([]float64, n), make([]float64, n)
	for i := range n {
		lo[i], hi[i] = math.Inf(1), 0
		for k := range samples {
			if c := conc[k][i]; !held[k] && c > 0 {
				lo[i], hi[i] = math.Min(lo[i], c), math.Max(hi[i], c)
			}
		}
	}
	var cand []int
	for k := range samples {
		if held[k] {
			continue
		}
		ok, blank := true, true
		for i, c := range conc[k] {
			if c > 0 {
				blank = false
				if c == lo[i] || c == hi[i] {
					ok = false
				}
			}
		}
		if ok && !blank {
			cand = append(cand, k)
		}
	}
	want = min(want, len(cand))
	for i := range want {
		held[cand[(2*i+1)*len(cand)/(2*want)]] = true
	}
	return held
}

// dyeLinearityOf computes each dye's R² over its single-dye series and flags
// non-linear high concentrations: a line weighted by the inverse
// absorbance variance is fitted to the blanks and the lower half of the
// concentration levels, the transmittance noise σ_T is pooled from its
// residuals over the dye's band (at least dyeNoiseFloor), and a higher
// concentration whose absorbance at the peak departs from the line by more
// than 3 standard deviations (its own noise and the line's prediction
// error combined) is flagged.
func dyeLinearityOf(m *Dyes, samples []DyeSample, conc [][]float64, absb [][]float64, held []bool) ([]DyeLinearity, []Breakdown) {
	var lin []DyeLinearity
	var flags []Breakdown
	g := m.grid
	names := m.Names()
	for i, d := range m.dyes {
		peak := 0
		for j, e := range d.Absorptivity {
			if e > d.Absorptivity[peak] {
				peak = j
			}
		}
		var band []int
		for j, e := range d.Absorptivity {
			if e >= 0.1*d.Absorptivity[peak] && e > 0 {
				band = append(band, j)
			}
		}
		// The series: training blanks and single-dye samples of dye i.
		var series []int
		levels := map[float64]bool{}
		for k := range samples {
			if held[k] {
				continue
			}
			if _, c, ok := dyeSingle(conc[k], names); ok && conc[k][i] > 0 {
				series = append(series, k)
				levels[c] = true
			} else if dyeIsBlank(conc[k]) {
				series = append(series, k)
			}
		}
		dl := DyeLinearity{Dye: d.Name, PeakNM: g.Wavelength(peak), PeakAbsorptivity: d.Absorptivity[peak], Levels: len(levels)}
		if len(band) > 0 {
			dl.BandFrom, dl.BandTo = g.Wavelength(band[0]), g.Wavelength(band[len(band)-1])
		}
		r2At := func(j int) (float64, bool) {
			var xs, ys []float64
			for _, k := range series {
				if absb[k][j] <= m.limit {
					xs = append(xs, conc[k][i])
					ys = append(ys, absb[k][j])
				}
			}
			_, _, r2, ok := dyeLineFit(xs, ys)
			return r2, ok
		}
		if r2, ok := r2At(peak); ok {
			dl.R2Peak = &r2
		}
		for _, j := range band {
			if r2, ok := r2At(j); ok && (dl.R2BandMin == nil || r2 < *dl.R2BandMin) {
				v, nm := r2, g.Wavelength(j)
				dl.R2BandMin, dl.R2BandMinNM = &v, &nm
			}
		}
		lin = append(lin, dl)

		// Non-linearity: a weighted line through the blanks and the lower
		// half of the levels (weights (T·ln 10)², the inverse absorbance
		// variance per unit σ_T²); σ_T pooled over the band.
		lv := make([]float64, 0, len(levels))
		for c := range levels {
			lv = append(lv, c)
		}
		sort.Float64s(lv)
		if len(lv) < 3 {
			continue
		}
		cut := lv[(len(lv)-1)/2]
		var ss float64
		var dof int
		var peakLine *dyeLine
		for _, j := range band {
			var xs, ys, ws []float64
			for _, k := range series {
				if conc[k][i] <= cut && absb[k][j] <= m.limit {
					xs = append(xs, conc[k][i])
					ys = append(ys, absb[k][j])
					ws = append(ws, math.Pow(math.Pow(10, -absb[k][j])*math.Ln10, 2))
				}
			}
			l, ok := dyeWeightedLine(xs, ys, ws)
			if !ok {
				continue
			}
			if j == peak {
				peakLine = &l
			}
			ss += l.wss
			dof += len(xs) - 2
		}
		if peakLine == nil || dof < 1 {
			continue
		}
		sigmaT := math.Max(math.Sqrt(ss/float64(dof)), dyeNoiseFloor)
		for _, k := range series {
			c, a := conc[k][i], absb[k][peak]
			if c <= cut || a > m.limit {
				continue
			}
			want, predVar := peakLine.at(c)
			w := math.Pow(math.Pow(10, -a)*math.Ln10, 2)
			if math.Abs(a-want) > 3*sigmaT*math.Sqrt(1/w+predVar) {
				flags = append(flags, Breakdown{Sample: samples[k].Name, Dye: d.Name, Concentration: c, Wavelength: g.Wavelength(peak),
					Absorbance: a, Expected: want, Reason: "nonlinear"})
			}
		}
	}
	return lin, flags
}

// dyeLine is a weighted straight line y = a + b·x with the unscaled
// covariance of (a, b) and the weighted residual sum of squares.
type dyeLine struct {
	a, b          float64
	caa, cab, cbb float64 // (XᵀWX)⁻¹
	wss           float64 // Σ w·e²
}

// at returns the line's value at x and its variance per unit σ².
func (l dyeLine) at(x float64) (y, v float64) {
	return l.a + l.b*x, l.caa + 2*x*l.cab + x*x*l.cbb
}

// dyeWeightedLine fits y = a + b·x by weighted least squares; ok is false
// with fewer than three points or two distinct x.
func dyeWeightedLine(x, y, w []float64) (dyeLine, bool) {
	if len(x) < 3 {
		return dyeLine{}, false
	}
	var sw, sx, sy, sxx, sxy float64
	for i := range x {
		sw += w[i]
		sx += w[i] * x[i]
		sy += w[i] * y[i]
		sxx += w[i] * x[i] * x[i]
		sxy += w[i] * x[i] * y[i]
	}
	det := sw*sxx - sx*sx
	if !(det > 1e-12*sw*sxx) {
		return dyeLine{}, false
	}
	l := dyeLine{caa: sxx / det, cab: -sx / det, cbb: sw / det}
	l.b = (sw*sxy - sx*sy) / det
	l.a = (sy - l.b*sx) / sw
	for i := range x {
		e := y[i] - l.a - l.b*x[i]
		l.wss += w[i] * e * e
	}
	return l, true
}

// dyeIsBlank reports whether every concentration is zero.
func dyeIsBlank(c []float64) bool {
	for _, v := range c {
		if v != 0 {
			return false
		}
	}
	return true
}

// dyeLineFit returns the ordinary least-squares line y = a + b·x and its R²;
// ok is false with fewer than two distinct x or no spread in y.
func dyeLineFit(x, y []float64) (a, b, r2 float64, ok bool) {
	n := float64(len(x))
	if len(x) < 2 {
		return 0, 0, 0, false
	}
	var mx, my float64
	for i := range x {
		mx += x[i]
		my += y[i]
	}
	mx /= n
	my /= n
	var sxx, sxy, syy float64
	for i := range x {
		sxx += (x[i] - mx) * (x[i] - mx)
		sxy += (x[i] - mx) * (y[i] - my)
		syy += (y[i] - my) * (y[i] - my)
	}
	if sxx == 0 {
		return 0, 0, 0, false
	}
	b = sxy / sxx
	a = my - b*mx
	if syy == 0 {
		return a, b, 0, false
	}
	var sse float64
	for i := range x {
		e := y[i] - a - b*x[i]
		sse += e * e
	}
	return a, b, 1 - sse/syy, true
}

// dyeNMList writes wavelengths compactly: "400 nm", or "400–420 nm (5 values)".
func dyeNMList(nm []float64) string {
	switch len(nm) {
	case 0:
		return ""
	case 1:
		return fmt.Sprintf("%g nm", nm[0])
	}
	return fmt.Sprintf("%g–%g nm (%d values)", nm[0], nm[len(nm)-1], len(nm))
}

// DyeSolveSettings control Dyes.Solve. The zero value solves under D65 and
// the CIE 1931 observer at path length 1 with tolerance
// DefaultDyeTolerance.
type DyeSolveSettings struct {
	// Scorer gives the illuminant and observer of the colour match; nil
	// means D65 and the CIE 1931 2° observer.
	Scorer *Scorer
	// PathLength is the relative path length ℓ of the recipe; 0 means 1.
	PathLength float64
	// Tolerance is the ΔE00 up to which the target counts as reached;
	// 0 means DefaultDyeTolerance.
	Tolerance float64
	// MaxEvaluations caps the colour refinement's model evaluations; 0
	// means 2000 per dye.
	MaxEvaluations int
}

// Solve finds dye concentrations whose transmittance matches the target
// (fraction 0–1; resampled onto the model's grid).
//
// It first solves the spectral problem in absorbance,
// min Σ_λ w(λ)²·(ℓ·Σᵢ cᵢεᵢ(λ) − (A_target(λ) − A_base(λ)))² over c ≥ 0 by
// NNLS, with w(λ) the target's transmittance (at least 10⁻³), which makes
// the absorbance residual a first-order transmittance residual. It then
// refines the concentrations to the smallest ΔE00 under the scorer's
// illuminant, by Nelder–Mead over cᵢ = sᵢ·uᵢ² (non-negative; sᵢ the
// dye's calibrated maximum). The recipes come ranked by ΔE00: the
// colour-refined one and the spectral one when they differ. Recipe.Extra
// holds "method" ("colour" or "spectral"), "path_length", "unit",
// "transmittance_Y" (luminous transmittance, the recipe's Y under the
// illuminant, 0–100), "spectral_rms" (RMS transmittance difference from the
// target on the model grid) and "L", "a", "b" of the recipe.
//
// A target that cannot be reached is not an error: its recipes have
// Reachable false. Errors: a target that cannot be resampled onto the
// model grid, non-finite settings, and non-convergence of the refinement
// (a *ConvergenceError whose Best holds the concentrations, model order).
func (m *Dyes) Solve(target colorimetry.Spectrum, set DyeSolveSettings) (Solution, error) {
	scorer := set.Scorer
	if scorer == nil {
		scorer = NewScorer(cie.CIE1931(), cie.D65(), "D65")
	}
	ell := set.PathLength
	if ell == 0 {
		ell = 1
	}
	tol := set.Tolerance
	if tol == 0 {
		tol = DefaultDyeTolerance
	}
	if !dyeFinite(ell) || ell <= 0 {
		return Solution{}, fmt.Errorf("path length %v is not a finite positive number", ell)
	}
	if !dyeFinite(tol) || tol < 0 {
		return Solution{}, fmt.Errorf("tolerance %v is not a finite non-negative number", tol)
	}
	n, nl := len(m.dyes), m.grid.N
	tt, err := target.Resample(m.grid)
	if err != nil {
		return Solution{}, fmt.Errorf("target on the model grid %v: %w", m.grid, err)
	}
	var warns []string
	var clamped []float64
	aMat := mat.NewDense(nl, n, nil)
	rhs := make([]float64, nl)
	for j := range nl {
		t := tt.Value(j)
		if t <= 0 {
			clamped = append(clamped, m.grid.Wavelength(j))
		}
		t = math.Max(t, TransmittanceFloor)
		w := math.Max(t, 1e-3)
		rhs[j] = w * (-math.Log10(t) - m.base[j])
		for i, d := range m.dyes {
			aMat.Set(j, i, w*ell*d.Absorptivity[j])
		}
	}
	if len(clamped) > 0 {
		warns = append(warns, fmt.Sprintf("target transmittance ≤ 0 at %s, taken as %g", dyeNMList(clamped), TransmittanceFloor))
	}
	labT, err := scorer.ObjectLab(target)
	if err != nil {
		return Solution{}, fmt.Errorf("target: %w", err)
	}
	cSpec, _, err := NNLS(aMat, rhs)
	if err != nil {
		return Solution{}, fmt.Errorf("spectral solve: %w", err)
	}

	absb := make([]float64, nl)
	eval := func(c []float64) (float64, colorimetry.Spectrum, colorimetry.Lab, error) {
		m.AbsorbanceTo(absb, c, ell)
		s := m.spectrumOf(absb)
		lab, err := scorer.ObjectLab(s)
		if err != nil {
			return 0, s, lab, err
		}
		return colorimetry.DeltaE2000(labT, lab), s, lab, nil
	}
	deSpec, _, _, err := eval(cSpec)
	if err != nil {
		return Solution{}, err
	}

	// Colour refinement.
	scale := make([]float64, n)
	for i, d := range m.dyes {
		scale[i] = d.CalibratedMax
		if scale[i] <= 0 {
			scale[i] = 1
		}
	}
	toC := func(dst, u []float64) []float64 {
		for i := range u {
			dst[i] = scale[i] * u[i] * u[i]
		}
		return dst
	}
	u0 := make([]float64, n)
	for i := range n {
		u0[i] = math.Sqrt(cSpec[i] / scale[i])
	}
	cBuf := make([]float64, n)
	var evalErr error
	best, bestC := deSpec, append([]float64(nil), cSpec...)
	prob := optimize.Problem{Func: func(u []float64) float64 {
		de, _, _, err := eval(toC(cBuf, u))
		if err != nil {
			evalErr = err
			return math.Inf(1)
		}
		if de < best {
			best = de
			copy(bestC, cBuf)
		}
		return de
	}}
	maxEval := set.MaxEvaluations
	if maxEval <= 0 {
		maxEval = 2000 * n
	}
	res, err := optimize.Minimize(prob, u0, &optimize.Settings{
		FuncEvaluations: maxEval,
		Converger:       &optimize.FunctionConverge{Absolute: 1e-9, Relative: 1e-9, Iterations: 20 * n},
	}, &optimize.NelderMead{SimplexSize: 0.05})
	if evalErr != nil {
		return Solution{}, evalErr
	}
	if err != nil || res.Status != optimize.FunctionConvergence {
		if deSpec > 1e-9 {
			return Solution{}, &ConvergenceError{Op: "dye colour refinement", Iterations: maxEval, Best: bestC, Residual: best}
		}
		// The spectral recipe already matches exactly; nothing to refine.
	}

	var sol Solution
	add := func(c []float64, method string) error {
		de, s, lab, err := eval(c)
		if err != nil {
			return err
		}
		rms, _, err := Residual(tt, s)
		if err != nil {
			return err
		}
		w, err := scorer.ObjectWeights(m.grid)
		if err != nil {
			return err
		}
		xyz, err := w.XYZ(s)
		if err != nil {
			return err
		}
		r := Recipe{DE00: de, Reachable: de <= tol, Extra: map[string]any{
			"method": method, "path_length": ell, "unit": m.unit, "transmittance_Y": xyz.Y,
			"spectral_rms": rms, "L": lab.L, "a": lab.A, "b": lab.B,
		}}
		for i, d := range m.dyes {
			r.Amounts = append(r.Amounts, Amount{Name: d.Name, Value: c[i]})
		}
		r.Warnings = append(append([]string(nil), warns...), m.rangeWarnings(c, ell, absb)...)
		if method == "spectral" && de > tol {
			r.Warnings = append(r.Warnings, fmt.Sprintf("the closest spectral match is ΔE00 %.2f from the target", de))
		}
		sol.Recipes = append(sol.Recipes, r)
		return nil
	}
	if err := add(bestC, "colour"); err != nil {
		return Solution{}, err
	}
	differs := false
	for i := range n {
		if math.Abs(bestC[i]-cSpec[i]) > 1e-6*math.Max(scale[i], math.Abs(cSpec[i])) {
			differs = true
		}
	}
	if differs {
		if err := add(cSpec, "spectral"); err != nil {
			return Solution{}, err
		}
	} else {
		sol.Recipes[0].Extra["method"] = "spectral"
	}
	sort.SliceStable(sol.Recipes, func(a, b int) bool { return sol.Recipes[a].DE00 < sol.Recipes[b].DE00 })
	if !sol.Recipes[0].Reachable {
		sol.Recipes[0].Warnings = append(sol.Recipes[0].Warnings,
			fmt.Sprintf("target not reachable with these dyes: nearest recipe is ΔE00 %.2f away (tolerance %.2g)", sol.Recipes[0].DE00, tol))
	}
	return sol, nil
}

// dyesJSON is the "model" object of a dyes model file.
type dyesJSON struct {
	Grid            gridJSON       `json:"grid"`
	Unit            string         `json:"unit"`
	AbsorbanceLimit float64        `json:"absorbance_limit"`
	Base            []float64      `json:"base_absorbance"`
	Dyes            []dyeJSON      `json:"dyes"`
	Fit             FitReport      `json:"fit"`
	Linearity       []DyeLinearity `json:"linearity"`
	Breakdowns      []Breakdown    `json:"breakdowns"`
}

type dyeJSON struct {
	Name          string    `json:"name"`
	Absorptivity  []float64 `json:"absorptivity"`
	StdErr        []float64 `json:"absorptivity_se"`
	CalibratedMin float64   `json:"calibrated_min"`
	CalibratedMax float64   `json:"calibrated_max"`
}

// MarshalJSON writes the model's "model" object.
func (m *Dyes) MarshalJSON() ([]byte, error) {
	var j dyesJSON
	j.Grid.Start, j.Grid.Step, j.Grid.N = m.grid.Start, m.grid.Step, m.grid.N
	j.Unit, j.AbsorbanceLimit, j.Base, j.Fit = m.unit, m.limit, m.base, m.report
	j.Linearity, j.Breakdowns = m.linearity, m.breakdowns
	if j.Linearity == nil {
		j.Linearity = []DyeLinearity{}
	}
	if j.Breakdowns == nil {
		j.Breakdowns = []Breakdown{}
	}
	if j.Fit.Samples == nil {
		j.Fit.Samples = []SampleFit{}
	}
	if j.Fit.Warnings == nil {
		j.Fit.Warnings = []string{}
	}
	for _, d := range m.dyes {
		j.Dyes = append(j.Dyes, dyeJSON(d))
	}
	return json.Marshal(j)
}

// decodeDyes reads and validates a "dyes" model object.
func decodeDyes(raw json.RawMessage) (Model, error) {
	var j dyesJSON
	if err := json.Unmarshal(raw, &j); err != nil {
		return nil, err
	}
	m := &Dyes{grid: colorimetry.Grid{Start: j.Grid.Start, Step: j.Grid.Step, N: j.Grid.N}, unit: j.Unit, base: j.Base,
		limit: j.AbsorbanceLimit, report: j.Fit, linearity: j.Linearity, breakdowns: j.Breakdowns}
	if m.limit == 0 {
		m.limit = DefaultAbsorbanceLimit
	}
	for _, d := range j.Dyes {
		m.dyes = append(m.dyes, Dye(d))
	}
	if err := m.validate(); err != nil {
		return nil, err
	}
	return m, nil
}

func dyeFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
