package mixing

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"
	"sync"

	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/interp"
)

// The lights (additive) model. A rig of n channels (LED emitters, lamps
// on dimmers) gives the spectrum
//
//	E(λ) = D(λ) + Σᵢ wᵢ·Sᵢ(λ),  wᵢ = fᵢ(dᵢ) ∈ [0, 1],
//
// where Sᵢ is channel i's spectrum at full drive with the dark spectrum
// taken off, D the dark (ambient) spectrum measured with every channel
// off, dᵢ the drive level 0–1 (a dimmer or DMX level as a fraction) and fᵢ
// the channel's response curve, which maps drive to relative output with
// fᵢ(0) = 0 and fᵢ(1) = 1. Spectra are in the units of the measurements
// they came from: relative, or radiometric (a spectral radiance or
// irradiance) when the model says it is absolute.

// LightsKind is the model kind of the lights model in model files.
const LightsKind = "lights"

// Response curve kinds.
const (
	// ResponsePower is the power law w = d^γ.
	ResponsePower = "power"
	// ResponseMonotone is a monotone piecewise cubic through measured
	// knots (Fritsch–Butland), from (0, 0) to (1, 1).
	ResponseMonotone = "monotone"
)

// LightResponse is a channel's response curve: its relative output w
// (0–1, a fraction of the output at full drive) as a function of the drive
// level d (0–1). It is a power law w = d^γ or a monotone piecewise cubic
// through knots (Fritsch & Butland 1984). Build one with PowerResponse or
// MonotoneResponse; the zero value is the linear response w = d. It is
// immutable.
type LightResponse struct {
	kind    string
	gamma   float64
	gammaSE float64 // standard error of gamma from the fit; 0 if unknown
	drive   []float64
	output  []float64
	fb      *interp.FritschButland
}

// PowerResponse returns the power-law response w = d^γ. It returns an
// error unless γ is positive and finite.
func PowerResponse(gamma float64) (LightResponse, error) {
	return powerResponseSE(gamma, 0)
}

func powerResponseSE(gamma, se float64) (LightResponse, error) {
	if !(gamma > 0) || math.IsInf(gamma, 0) {
		return LightResponse{}, fmt.Errorf("power response: gamma %g must be positive and finite", gamma)
	}
	if !(se >= 0) || math.IsInf(se, 0) {
		return LightResponse{}, fmt.Errorf("power response: standard error of gamma %g must be non-negative and finite", se)
	}
	return LightResponse{kind: ResponsePower, gamma: gamma, gammaSE: se}, nil
}

// MonotoneResponse returns the response through the knots (drive[k],
// output[k]) by the monotone piecewise cubic of Fritsch and Butland
// (SIAM J. Sci. Stat. Comput. 5(2) 300–304, 1984; gonum's
// interp.FritschButland). Drives must be finite and strictly increasing
// from 0 to 1, outputs non-decreasing from 0 to 1; at least two knots.
func MonotoneResponse(drive, output []float64) (LightResponse, error) {
	if len(drive) != len(output) {
		return LightResponse{}, fmt.Errorf("monotone response: %d drives but %d outputs", len(drive), len(output))
	}
	n := len(drive)
	if n < 2 {
		return LightResponse{}, fmt.Errorf("monotone response: %d knots, need at least 2", n)
	}
	if drive[0] != 0 || drive[n-1] != 1 || output[0] != 0 || output[n-1] != 1 {
		return LightResponse{}, fmt.Errorf("monotone response: the knots must run from (drive 0, output 0) to (drive 1, output 1); got (%g, %g) to (%g, %g)",
			drive[0], output[0], drive[n-1], output[n-1])
	}
	for k := range drive {
		if !lightFinite(drive[k]) || !lightFinite(output[k]) {
			return LightResponse{}, fmt.Errorf("monotone response: knot %d (drive %g, output %g): %w", k+1, drive[k], output[k], ErrNotFinite)
		}
		if k > 0 && drive[k] <= drive[k-1] {
			return LightResponse{}, fmt.Errorf("monotone response: knot %d: drive %g does not increase from %g", k+1, drive[k], drive[k-1])
		}
		if k > 0 && output[k] < output[k-1] {
			return LightResponse{}, fmt.Errorf("monotone response: knot %d: output falls from %g to %g at drive %g", k+1, output[k-1], output[k], drive[k])
		}
	}
	d := append([]float64(nil), drive...)
	o := append([]float64(nil), output...)
	fb := &interp.FritschButland{}
	if err := fb.Fit(d, o); err != nil {
		return LightResponse{}, fmt.Errorf("monotone response: %w", err)
	}
	return LightResponse{kind: ResponseMonotone, drive: d, output: o, fb: fb}, nil
}

// Kind returns ResponsePower, ResponseMonotone, or "linear" for the zero
// value.
func (r LightResponse) Kind() string {
	if r.kind == "" {
		return "linear"
	}
	return r.kind
}

// Gamma returns γ of a power-law response and the standard error of the
// fit that gave it (0 when not fitted); both are 0 for other kinds.
func (r LightResponse) Gamma() (gamma, se float64) { return r.gamma, r.gammaSE }

// Knots returns copies of the knots of a monotone response (nil for other
// kinds): drive levels and relative outputs, both 0–1.
func (r LightResponse) Knots() (drive, output []float64) {
	if r.kind != ResponseMonotone {
		return nil, nil
	}
	return append([]float64(nil), r.drive...), append([]float64(nil), r.output...)
}

// Output returns the relative output w (0–1) at drive level d (0–1).
// Drives outside [0, 1] are clamped to it.
func (r LightResponse) Output(d float64) float64 {
	d = math.Min(math.Max(d, 0), 1)
	switch r.kind {
	case ResponsePower:
		return math.Pow(d, r.gamma)
	case ResponseMonotone:
		return math.Min(math.Max(r.fb.Predict(d), 0), 1)
	}
	return d
}

// Drive returns the drive level d (0–1) that gives relative output w, the
// inverse of Output; outputs outside [0, 1] are clamped to it. Where the
// curve is flat (a saturated monotone response) it returns the lowest
// such drive. The monotone inverse is found by bisection to 1e-12.
func (r LightResponse) Drive(w float64) float64 {
	w = math.Min(math.Max(w, 0), 1)
	switch r.kind {
	case ResponsePower:
		return math.Pow(w, 1/r.gamma)
	case ResponseMonotone:
		if w == 0 {
			return 0
		}
		lo, hi := 0.0, 1.0
		for hi-lo > 1e-12 {
			mid := 0.5 * (lo + hi)
			if r.Output(mid) < w {
				lo = mid
			} else {
				hi = mid
			}
		}
		return hi
	}
	return w
}

// lightResponseJSON is the file form of a LightResponse.
type lightResponseJSON struct {
	Kind    string    `json:"kind"`
	Gamma   *float64  `json:"gamma"`
	GammaSE *float64  `json:"gamma_se"`
	Drive   []float64 `json:"drive"`
	Output  []float64 `json:"output"`
}

func (r LightResponse) toJSON() lightResponseJSON {
	j := lightResponseJSON{Kind: r.Kind()}
	switch r.kind {
	case ResponsePower:
		g, se := r.gamma, r.gammaSE
		j.Gamma, j.GammaSE = &g, &se
	case ResponseMonotone:
		j.Drive, j.Output = r.Knots()
	}
	return j
}

func lightResponseFromJSON(j lightResponseJSON) (LightResponse, error) {
	switch j.Kind {
	case ResponsePower:
		if j.Gamma == nil {
			return LightResponse{}, errors.New("power response without \"gamma\"")
		}
		se := 0.0
		if j.GammaSE != nil {
			se = *j.GammaSE
		}
		return powerResponseSE(*j.Gamma, se)
	case ResponseMonotone:
		return MonotoneResponse(j.Drive, j.Output)
	case "linear":
		return LightResponse{}, nil
	}
	return LightResponse{}, fmt.Errorf("response kind %q (want %s or %s)", j.Kind, ResponsePower, ResponseMonotone)
}

// LightChannel is one channel of a rig: its name, its spectrum at full
// drive with the dark spectrum taken off, and its response curve.
type LightChannel struct {
	Name     string
	Spectrum colorimetry.Spectrum
	Response LightResponse
}

// Lights is a fitted lights (additive) model: channel spectra at full
// drive on one grid, their response curves, the dark spectrum and the fit
// report. Its kind is "lights". It is immutable and safe for concurrent
// use.
type Lights struct {
	names    []string
	spectra  []colorimetry.Spectrum // on grid, ExtrapZero
	resp     []LightResponse
	grid     colorimetry.Grid
	dark     colorimetry.Spectrum // zero Spectrum: no dark
	absolute bool
	report   *FitReport
	ramps    []RampFit // calibration samples, when fitted in this process

	mu    sync.Mutex
	cache map[*colorimetry.Observer]*lightBasis
}

var _ Model = (*Lights)(nil)

// lightNegTol is the fraction of a channel's peak by which its spectrum
// may fall below zero: a fitted channel spectrum is the difference of two
// measured spectra, whose noise leaves small negative values where the
// channel emits nothing. 5 % is common practice (no source) for the noise
// floor of a spectroradiometer at low signal.
const lightNegTol = 0.05

// NewLights returns the lights model of the channels and the dark
// spectrum (the zero Spectrum for none). Channel spectra and the dark
// spectrum are resampled onto the grid of the first channel by their own
// rules, and are taken as zero outside it. absolute says that the spectra
// are radiometric (e.g. spectral radiance, W·sr⁻¹·m⁻²·nm⁻¹), so that
// tristimulus values are absolute photometric quantities (Km =
// 683.002 lm/W); otherwise they are relative. It returns an error for no
// channels, empty or duplicate names (compared without case), an empty
// spectrum, a negative spectral value beyond 5 % of the channel's peak, or
// a channel whose spectrum has no positive value.
func NewLights(channels []LightChannel, dark colorimetry.Spectrum, absolute bool) (*Lights, error) {
	if len(channels) == 0 {
		return nil, errors.New("lights model: no channels")
	}
	if channels[0].Spectrum.IsZero() {
		return nil, fmt.Errorf("lights model: channel %q: empty spectrum", channels[0].Name)
	}
	g := channels[0].Spectrum.Grid()
	m := &Lights{grid: g, absolute: absolute, cache: map[*colorimetry.Observer]*lightBasis{}}
	seen := map[string]bool{}
	for i, c := range channels {
		name := strings.TrimSpace(c.Name)
		if name == "" {
			return nil, fmt.Errorf("lights model: channel %d has no name", i+1)
		}
		if strings.ContainsAny(name, ",=\n") {
			return nil, fmt.Errorf("lights model: channel %q: a name may not contain ',', '=' or a line break", name)
		}
		key := strings.ToLower(name)
		if seen[key] {
			return nil, fmt.Errorf("lights model: channel %q named twice", name)
		}
		seen[key] = true
		if c.Spectrum.IsZero() {
			return nil, fmt.Errorf("lights model: channel %q: empty spectrum", name)
		}
		s, err := c.Spectrum.Resample(g)
		if err != nil {
			return nil, fmt.Errorf("lights model: channel %q onto %v: %w", name, g, err)
		}
		s = s.WithExtrap(colorimetry.ExtrapZero)
		peak, _ := s.Max()
		if !(peak > 0) {
			return nil, fmt.Errorf("lights model: channel %q: the spectrum has no positive value", name)
		}
		if v, nm := s.Min(); v < -lightNegTol*peak {
			return nil, fmt.Errorf("lights model: channel %q: negative spectral power %g at %g nm (beyond %g%% of the peak %g)", name, v, nm, 100*lightNegTol, peak)
		}
		m.names = append(m.names, name)
		m.spectra = append(m.spectra, s)
		m.resp = append(m.resp, c.Response)
	}
	if !dark.IsZero() {
		d, err := dark.Resample(g)
		if err != nil {
			return nil, fmt.Errorf("lights model: dark spectrum onto %v: %w", g, err)
		}
		m.dark = d.WithExtrap(colorimetry.ExtrapZero)
	}
	return m, nil
}

// Kind returns "lights".
func (m *Lights) Kind() string { return LightsKind }

// Len returns the number of channels.
func (m *Lights) Len() int { return len(m.names) }

// Names returns the channel names in the model's order.
func (m *Lights) Names() []string { return append([]string(nil), m.names...) }

// Channel returns channel i. It panics if i is out of range.
func (m *Lights) Channel(i int) LightChannel {
	return LightChannel{Name: m.names[i], Spectrum: m.spectra[i], Response: m.resp[i]}
}

// Grid returns the wavelength grid of the channel spectra, nm.
func (m *Lights) Grid() colorimetry.Grid { return m.grid }

// Dark returns the dark spectrum, or the zero Spectrum when there is none.
func (m *Lights) Dark() colorimetry.Spectrum { return m.dark }

// Absolute reports whether the spectra are radiometric, so that
// tristimulus values are absolute photometric quantities.
func (m *Lights) Absolute() bool { return m.absolute }

// Report returns the fit report, or nil for a model built by NewLights.
func (m *Lights) Report() *FitReport { return m.report }

// Outputs returns the relative output w (0–1) of every channel, in the
// model's order, for the drive levels in amounts (0–1, by channel name,
// compared without case). Channels not named are off. It returns an error
// for an unknown name, a name given twice, or a drive level outside [0, 1]
// or not finite.
func (m *Lights) Outputs(amounts []Amount) ([]float64, error) {
	w := make([]float64, len(m.names))
	given := make([]bool, len(m.names))
	for _, a := range amounts {
		i := m.index(a.Name)
		if i < 0 {
			return nil, fmt.Errorf("no channel %q (the model has: %s)", a.Name, strings.Join(m.names, ", "))
		}
		if given[i] {
			return nil, fmt.Errorf("channel %q given twice", m.names[i])
		}
		given[i] = true
		if !(a.Value >= 0 && a.Value <= 1) {
			return nil, fmt.Errorf("channel %q: drive level %g is outside 0–1", m.names[i], a.Value)
		}
		w[i] = m.resp[i].Output(a.Value)
	}
	return w, nil
}

// index returns the channel named name (without case), or −1.
func (m *Lights) index(name string) int {
	for i, n := range m.names {
		if strings.EqualFold(n, strings.TrimSpace(name)) {
			return i
		}
	}
	return -1
}

// Spectrum returns the rig's spectrum E(λ) = D(λ) + Σ wᵢ·Sᵢ(λ) for the
// drive levels in amounts (see Outputs), on the model's grid.
func (m *Lights) Spectrum(amounts []Amount) (colorimetry.Spectrum, error) {
	w, err := m.Outputs(amounts)
	if err != nil {
		return colorimetry.Spectrum{}, err
	}
	return m.spectrumOf(w, colorimetry.Spectrum{})
}

// spectrumOf returns D + add + Σ wᵢ Sᵢ on the model's grid.
func (m *Lights) spectrumOf(w []float64, add colorimetry.Spectrum) (colorimetry.Spectrum, error) {
	v := make([]float64, m.grid.N)
	if !m.dark.IsZero() {
		m.dark.Values(v)
	}
	for i, s := range m.spectra {
		if w[i] == 0 {
			continue
		}
		for k := range v {
			v[k] += w[i] * s.Value(k)
		}
	}
	if !add.IsZero() {
		a, err := add.Resample(m.grid)
		if err != nil {
			return colorimetry.Spectrum{}, fmt.Errorf("added light onto %v: %w", m.grid, err)
		}
		for k := range v {
			v[k] += a.Value(k)
		}
	}
	s, err := colorimetry.NewSpectrumOnGrid(m.grid, v, colorimetry.Options{Interp: colorimetry.InterpLinear, Extrap: colorimetry.ExtrapZero})
	if err != nil {
		return colorimetry.Spectrum{}, fmt.Errorf("lights mix: %w", err)
	}
	return s, nil
}

// lightBasis holds what the forward model and the solve need for one
// observer: the tristimulus values of every channel at full drive and of
// the dark spectrum (raw: Km-weighted sums in the data's units), the
// radiant power of every channel, and the factor from raw to the model's
// scale.
type lightBasis struct {
	w     *colorimetry.Weights
	ch    []colorimetry.XYZ
	dark  colorimetry.XYZ
	power []float64 // Σ Sᵢ Δλ on the model's grid
	scale float64   // raw → model scale (1 for absolute models)
}

// basis returns the cached lightBasis for obs.
func (m *Lights) basis(obs *colorimetry.Observer) (*lightBasis, error) {
	m.mu.Lock()
	defer m.mu.Unlock()
	if b, ok := m.cache[obs]; ok {
		return b, nil
	}
	w, err := colorimetry.NewLightWeights(obs, colorimetry.ComputationGrid(m.grid))
	if err != nil {
		return nil, err
	}
	b := &lightBasis{w: w, scale: 1}
	var all colorimetry.XYZ
	for i, s := range m.spectra {
		c, err := w.XYZ(s)
		if err != nil {
			return nil, fmt.Errorf("channel %q: %w", m.names[i], err)
		}
		b.ch = append(b.ch, c)
		all = all.Add(c)
		var p float64
		for k := 0; k < s.Len(); k++ {
			p += s.Value(k)
		}
		b.power = append(b.power, p*m.grid.Step)
	}
	if !m.dark.IsZero() {
		if b.dark, err = w.XYZ(m.dark); err != nil {
			return nil, fmt.Errorf("dark spectrum: %w", err)
		}
	}
	all = all.Add(b.dark)
	if !(all.Y > 0) {
		return nil, fmt.Errorf("lights model: the rig at full drive has no luminance (Y = %g): %w", all.Y, colorimetry.ErrZeroLuminance)
	}
	if !m.absolute {
		b.scale = 100 / all.Y
	}
	m.cache[obs] = b
	return b, nil
}

// fullY returns the raw luminance of every channel at full drive.
func (b *lightBasis) fullY() float64 {
	var y float64
	for _, c := range b.ch {
		y += c.Y
	}
	return y
}

// mixXYZ returns the raw tristimulus values of D + off + Σ wᵢ·chᵢ.
func (b *lightBasis) mixXYZ(w []float64, off colorimetry.XYZ) colorimetry.XYZ {
	c := b.dark.Add(off)
	for i, x := range w {
		c = c.Add(b.ch[i].Scale(x))
	}
	return c
}

// Scale returns the factor that takes tristimulus values computed with
// colorimetry.NewLightWeights for obs from the model's data to the
// model's scale: 1 for an absolute model, and for a relative one the
// factor that gives Y = 100 with every channel at full drive (dark
// included).
func (m *Lights) Scale(obs *colorimetry.Observer) (float64, error) {
	b, err := m.basis(obs)
	if err != nil {
		return 0, err
	}
	return b.scale, nil
}

// LightColour describes the light of a mix, seen by one observer.
type LightColour struct {
	// XYZ on the model's scale: absolute photometric values (Km =
	// 683.002 lm/W; cd/m² for spectral radiance, lx for irradiance) for an
	// absolute model; for a relative one, Y = 100 with every channel at
	// full drive.
	XYZ colorimetry.XYZ
	XY  colorimetry.XY      // CIE 1931 chromaticity
	UV  colorimetry.UVPrime // CIE 1976 u′, v′
	// CCT is the correlated colour temperature and Duv (Ohno 2014); nil
	// outside the range where CIE 015:2018 defines it (a warning says so).
	CCT *colorimetry.CCT
	// Efficacy is the luminous efficacy of radiation of the channels' light
	// (dark and added light excluded), lm/W: Km·∫V·E dλ / ∫E dλ over the
	// model's grid. It is a ratio, so it holds for relative data in
	// proportion to radiant power; it is not the electrical efficacy of a
	// fixture. 0 when every channel is off.
	Efficacy float64
	// Outputs holds every channel's relative output w (0–1).
	Outputs []float64
	// Warnings are cautions (CCT undefined …).
	Warnings []string
}

// Colour returns the colour of the light for the drive levels in amounts
// (see Outputs), seen by obs.
func (m *Lights) Colour(amounts []Amount, obs *colorimetry.Observer) (LightColour, error) {
	w, err := m.Outputs(amounts)
	if err != nil {
		return LightColour{}, err
	}
	b, err := m.basis(obs)
	if err != nil {
		return LightColour{}, err
	}
	return m.colourOf(b, obs, w, colorimetry.XYZ{})
}

// colourOf describes the mix of outputs w plus the raw offset off.
func (m *Lights) colourOf(b *lightBasis, obs *colorimetry.Observer, w []float64, off colorimetry.XYZ) (LightColour, error) {
	raw := b.mixXYZ(w, off)
	c := LightColour{XYZ: raw.Scale(b.scale), Outputs: w, Warnings: []string{}}
	xy, err := raw.XY()
	if err != nil {
		c.Warnings = append(c.Warnings, "no light (X + Y + Z = 0): chromaticity undefined")
		return c, nil
	}
	c.XY = xy
	c.UV, _ = raw.UVPrime()
	c.CCT, c.Warnings = lightCCT(obs, raw, c.Warnings)
	var y, p float64
	for i, x := range w {
		y += x * b.ch[i].Y
		p += x * b.power[i]
	}
	if p > 0 {
		c.Efficacy = y / p
	}
	return c, nil
}

// lightCCT returns the CCT and Duv of c (Ohno's method), or nil and a
// warning outside the defined range.
func lightCCT(obs *colorimetry.Observer, c colorimetry.XYZ, warns []string) (*colorimetry.CCT, []string) {
	t, err := colorimetry.NewPlanckianTable(obs, colorimetry.C2)
	if err != nil {
		return nil, append(warns, "CCT not computed: "+err.Error())
	}
	uv, err := c.UV()
	if err != nil {
		return nil, warns
	}
	cct, err := t.CCT(uv, colorimetry.CCTOhno)
	if err != nil {
		return nil, append(warns, "CCT and Duv: "+err.Error())
	}
	return &cct, warns
}

// lightsJSON is the "model" object of a lights model file.
type lightsJSON struct {
	Grid     gridJSON           `json:"grid"`
	Units    string             `json:"units"` // "relative" or "absolute"
	Channels []lightChannelJSON `json:"channels"`
	Dark     []float64          `json:"dark"` // null: no dark spectrum
	Fit      *FitReport         `json:"fit"`
}

type lightChannelJSON struct {
	Name     string            `json:"name"`
	Response lightResponseJSON `json:"response"`
	Spectrum []float64         `json:"spectrum"`
}

// MarshalJSON writes the model's fields for Save.
func (m *Lights) MarshalJSON() ([]byte, error) {
	j := lightsJSON{Grid: gridJSON{m.grid.Start, m.grid.Step, m.grid.N}, Units: "relative", Fit: m.report}
	if m.absolute {
		j.Units = "absolute"
	}
	for i, s := range m.spectra {
		j.Channels = append(j.Channels, lightChannelJSON{Name: m.names[i], Response: m.resp[i].toJSON(), Spectrum: s.Values(nil)})
	}
	if !m.dark.IsZero() {
		j.Dark = m.dark.Values(nil)
	}
	return json.Marshal(j)
}

// decodeLights reads and validates the "model" object of a lights file.
func decodeLights(raw json.RawMessage) (Model, error) {
	var j lightsJSON
	dec := json.NewDecoder(strings.NewReader(string(raw)))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&j); err != nil {
		return nil, err
	}
	g := colorimetry.Grid{Start: j.Grid.Start, Step: j.Grid.Step, N: j.Grid.N}
	if !g.Valid() || !(g.Start > 0) {
		return nil, fmt.Errorf("grid: %+v is not a valid wavelength grid", j.Grid)
	}
	var absolute bool
	switch j.Units {
	case "relative":
	case "absolute":
		absolute = true
	default:
		return nil, fmt.Errorf("units %q (want relative or absolute)", j.Units)
	}
	opt := colorimetry.Options{Interp: colorimetry.InterpLinear, Extrap: colorimetry.ExtrapZero}
	var ch []LightChannel
	for i, c := range j.Channels {
		s, err := colorimetry.NewSpectrumOnGrid(g, c.Spectrum, opt)
		if err != nil {
			return nil, fmt.Errorf("channel %d (%q): spectrum: %w", i+1, c.Name, err)
		}
		r, err := lightResponseFromJSON(c.Response)
		if err != nil {
			return nil, fmt.Errorf("channel %d (%q): %w", i+1, c.Name, err)
		}
		ch = append(ch, LightChannel{Name: c.Name, Spectrum: s, Response: r})
	}
	var dark colorimetry.Spectrum
	if j.Dark != nil {
		var err error
		if dark, err = colorimetry.NewSpectrumOnGrid(g, j.Dark, opt); err != nil {
			return nil, fmt.Errorf("dark spectrum: %w", err)
		}
	}
	m, err := NewLights(ch, dark, absolute)
	if err != nil {
		return nil, err
	}
	m.report = j.Fit
	return m, nil
}

func init() { register(LightsKind, decodeLights) }

// lightFinite reports whether v is neither NaN nor infinite.
func lightFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// lightSortedIndex returns 0…n−1 ordered by increasing key (stable).
func lightSortedIndex(n int, key func(i int) float64) []int {
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return key(idx[a]) < key(idx[b]) })
	return idx
}
