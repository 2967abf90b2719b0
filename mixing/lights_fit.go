package mixing

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
)

// DarkChannel is the channel name that marks a dark measurement (every
// channel off) in a lights calibration.
const DarkChannel = "dark"

// RampSample is one measurement of a lights calibration: the spectrum of
// one channel at one drive level (dark included, as the instrument saw
// it), or of the rig with every channel off (Channel DarkChannel, Drive 0).
type RampSample struct {
	Name     string               // sample name, for reports
	Channel  string               // channel name, or DarkChannel
	Drive    float64              // drive level 0–1
	HeldOut  bool                 // excluded from the fit, used to test it
	Spectrum colorimetry.Spectrum // the measured spectrum
	// Where locates the sample in messages ("ramps.csv:12"); empty means
	// the sample name is used.
	Where string
}

// where returns the sample's place for messages.
func (s RampSample) where() string {
	if s.Where != "" {
		return s.Where
	}
	return fmt.Sprintf("sample %q", s.Name)
}

// Column names of the lights measurement layout (rows layout): name,
// channel, drive, an optional held-out flag, then one column per
// wavelength. Header cells are matched without case.
const (
	RampChannelColumn = "channel"
	RampDriveColumn   = "drive"
	RampHeldOutColumn = "heldout"
)

// LightRampsFromNamed turns spectra read by specio from a lights
// measurement file (rows layout: name, channel, drive, [heldout],
// wavelengths…) into ramp samples. file names the file in messages. The
// held-out flag reads 1/0, yes/no, true/false or empty (no). It returns an
// error naming the file, line and column for a missing channel or drive
// column, an empty channel, a drive that is not a number in 0–1, or a
// held-out flag it cannot read.
func LightRampsFromNamed(list []specio.Named, file string) ([]RampSample, error) {
	if len(list) == 0 {
		return nil, fmt.Errorf("%s: no spectra", file)
	}
	var out []RampSample
	for _, n := range list {
		where := fmt.Sprintf("%s:%d", file, n.Line)
		chKey, ok := lightField(n, RampChannelColumn)
		if !ok {
			return nil, fmt.Errorf("%s: no %q column: a lights measurement file has the columns name, channel, drive, [heldout], then one column per wavelength", where, RampChannelColumn)
		}
		dKey, ok := lightField(n, RampDriveColumn)
		if !ok {
			return nil, fmt.Errorf("%s: no %q column: a lights measurement file has the columns name, channel, drive, [heldout], then one column per wavelength", where, RampDriveColumn)
		}
		ch := strings.TrimSpace(n.Fields[chKey])
		if ch == "" {
			return nil, fmt.Errorf("%s: spectrum %q: the %q field is empty", where, n.Name, chKey)
		}
		d, err := n.Number(dKey)
		if err != nil {
			return nil, err
		}
		if !(d >= 0 && d <= 1) {
			return nil, fmt.Errorf("%s (field %s): spectrum %q: drive level %g is outside 0–1", where, dKey, n.Name, d)
		}
		s := RampSample{Name: n.Name, Channel: ch, Drive: d, Spectrum: n.Spectrum, Where: where}
		if hk, ok := lightField(n, RampHeldOutColumn); ok {
			switch strings.ToLower(strings.TrimSpace(n.Fields[hk])) {
			case "1", "yes", "y", "true":
				s.HeldOut = true
			case "0", "no", "n", "false", "":
			default:
				return nil, fmt.Errorf("%s (field %s): spectrum %q: held-out flag %q (want 1/0, yes/no or true/false)", where, hk, n.Name, n.Fields[hk])
			}
		}
		out = append(out, s)
	}
	return out, nil
}

// lightField returns the key of n's extra field named name, without case.
func lightField(n specio.Named, name string) (string, bool) {
	for k := range n.Fields {
		if strings.EqualFold(strings.TrimSpace(k), name) {
			return k, true
		}
	}
	return "", false
}

// LightsFitOptions control FitLights. The zero value fits power laws,
// holds nothing out, judges shape changes at 3 % and uses the CIE 1931
// observer.
type LightsFitOptions struct {
	// Response is ResponsePower (the default) or ResponseMonotone.
	Response string
	// HoldOut is the fraction (0–0.5) of each channel's ramp samples
	// (drive strictly between 0 and 1) held out of the fit to test it:
	// every k-th by drive, k = round(1/HoldOut), starting in the middle of
	// the first k. Samples flagged HeldOut are held out as well.
	HoldOut float64
	// ShapeTol is the relative RMS residual of a sample's scale fit (its
	// spectrum against the full-drive spectrum, dark taken off) above
	// which the channel is reported as changing shape with drive, judged
	// on samples at 20 % of full output or more, where noise matters
	// little. Zero means 0.03, common practice (no source).
	ShapeTol float64
	// Observer for the fit report's ΔE00 and Δu′v′; nil means CIE 1931 2°.
	Observer *colorimetry.Observer
	// Absolute says the spectra are radiometric (see NewLights).
	Absolute bool
}

// RampFit is how one calibration sample of a channel was read by
// FitLights: its measured relative output (the scale of its spectrum
// against the full-drive spectrum, dark taken off, with its standard
// error) and the response curve's output at its drive.
type RampFit struct {
	Name      string  // sample name
	Channel   string  // channel name
	Drive     float64 // drive level 0–1
	HeldOut   bool    // excluded from the fit
	Measured  float64 // measured relative output w
	StdErr    float64 // standard error of Measured
	Predicted float64 // the fitted response at Drive
	Where     string  // place in the file, if known
}

// Ramps returns the calibration samples of the channels as the fit read
// them, channel by channel in the model's order and in file order within
// a channel (dark samples excluded); nil for
// a model that was not fitted in this process (model files keep only the
// fit report).
func (m *Lights) Ramps() []RampFit { return append([]RampFit(nil), m.ramps...) }

// lightShapeMinOutput is the relative output below which a sample's scale
// fit is not used to judge shape changes: there the residual is mostly
// noise.
const lightShapeMinOutput = 0.2

// FitLights calibrates a lights model from ramp measurements.
//
// The dark spectrum is the mean of the DarkChannel samples (zero, with a
// warning, when there are none). Each channel's spectrum is the mean of its
// full-drive samples (drive 1) less the dark. The relative output of every
// other sample is the least-squares scale of its spectrum (less the dark)
// against the channel's spectrum, w = ⟨x, S⟩/⟨S, S⟩, with standard error
// σ̂/‖S‖ from the scale fit's residual. The response curve is then fitted
// to the training samples:
//
//   - power: w = d^γ by weighted least squares in logarithms, ln w = γ·ln d,
//     weighted by w² (the inverse variance of ln w when every scale carries
//     the same noise), with the standard error of γ from the weighted
//     residuals; samples with w ≤ 0 are left out with a warning;
//   - monotone: the mean output at each drive level, forced monotone by
//     pooling adjacent violators (isotonic regression) where a dip lies
//     within noise, through (0, 0) and (1, 1) by Fritsch–Butland.
//
// A ramp whose output falls between consecutive drive levels by more than
// three standard errors is an error naming the channel and the drives. A
// channel whose spectrum changes shape with drive (an LED's peak moving)
// gets a warning (see LightsFitOptions.ShapeTol): the model keeps the
// full-drive shape at every drive. The fit report holds, for every channel
// sample, the RMS and largest spectral residual of the model's prediction
// and ΔE00 and Δu′v′ as Scorer.LightDE00 computes them.
//
// Errors name the sample (file and line when RampSample.Where says so):
// no samples, samples on different grids, a drive outside 0–1, a dark
// sample with a drive other than 0, a channel without a full-drive sample,
// a held-out full-drive sample, a channel with no light, too few ramp
// samples for the power law, a non-monotone ramp.
func FitLights(samples []RampSample, opt LightsFitOptions) (*Lights, error) {
	if len(samples) == 0 {
		return nil, errors.New("lights fit: no samples")
	}
	switch opt.Response {
	case "":
		opt.Response = ResponsePower
	case ResponsePower, ResponseMonotone:
	default:
		return nil, fmt.Errorf("lights fit: response %q (want %s or %s)", opt.Response, ResponsePower, ResponseMonotone)
	}
	if !(opt.HoldOut >= 0 && opt.HoldOut <= 0.5) {
		return nil, fmt.Errorf("lights fit: hold-out fraction %g is outside 0–0.5", opt.HoldOut)
	}
	if opt.ShapeTol == 0 {
		opt.ShapeTol = 0.03
	}
	if !(opt.ShapeTol > 0) || math.IsInf(opt.ShapeTol, 0) {
		return nil, fmt.Errorf("lights fit: shape tolerance %g must be positive", opt.ShapeTol)
	}
	if opt.Observer == nil {
		opt.Observer = cie.CIE1931()
	}
	g := samples[0].Spectrum.Grid()
	var warns []string
	var darks []RampSample
	var order []string
	byCh := map[string][]int{}
	for i, s := range samples {
		if s.Spectrum.IsZero() {
			return nil, fmt.Errorf("lights fit: %s: empty spectrum", s.where())
		}
		if !s.Spectrum.Grid().Equal(g) {
			return nil, fmt.Errorf("lights fit: %s: spectrum on %v, but %s is on %v: every measurement must share one grid", s.where(), s.Spectrum.Grid(), samples[0].where(), g)
		}
		if !(s.Drive >= 0 && s.Drive <= 1) {
			return nil, fmt.Errorf("lights fit: %s: drive level %g is outside 0–1", s.where(), s.Drive)
		}
		if strings.EqualFold(strings.TrimSpace(s.Channel), DarkChannel) {
			if s.Drive != 0 {
				return nil, fmt.Errorf("lights fit: %s: a dark measurement has every channel off, but its drive is %g", s.where(), s.Drive)
			}
			darks = append(darks, s)
			continue
		}
		key := strings.ToLower(strings.TrimSpace(s.Channel))
		if key == "" {
			return nil, fmt.Errorf("lights fit: %s: no channel name", s.where())
		}
		if _, ok := byCh[key]; !ok {
			order = append(order, key)
		}
		byCh[key] = append(byCh[key], i)
	}
	if len(order) == 0 {
		return nil, errors.New("lights fit: no channel measurements (only dark samples)")
	}
	n := g.N
	dark := make([]float64, n)
	if len(darks) == 0 {
		warns = append(warns, "no dark measurement: the dark spectrum is taken as zero")
	} else {
		for _, s := range darks {
			for k := range dark {
				dark[k] += s.Spectrum.Value(k) / float64(len(darks))
			}
		}
	}
	heldOut := lightHoldOut(samples, byCh, order, opt.HoldOut)

	type scaled struct {
		idx    int
		w, se  float64
		rr     float64 // squared norm of the scale fit's residual
		duv    float64 // chromaticity shift from the full-drive spectrum
		excess float64 // relative residual beyond noise
	}
	fitObs := opt.Observer
	lw, err := colorimetry.NewLightWeights(fitObs, colorimetry.ComputationGrid(g))
	if err != nil {
		return nil, fmt.Errorf("lights fit: %w", err)
	}
	var channels []LightChannel
	perCh := make([][]scaled, len(order))
	for ci, key := range order {
		idx := byCh[key]
		name := strings.TrimSpace(samples[idx[0]].Channel)
		full := make([]float64, n)
		nFull := 0
		for _, i := range idx {
			s := samples[i]
			if s.Drive != 1 {
				continue
			}
			if s.HeldOut {
				return nil, fmt.Errorf("lights fit: %s: channel %q: the full-drive measurement defines the channel's spectrum and cannot be held out", s.where(), name)
			}
			nFull++
			for k := range full {
				full[k] += s.Spectrum.Value(k)
			}
		}
		if nFull == 0 {
			return nil, fmt.Errorf("lights fit: channel %q: no measurement at full drive (drive 1), which defines the channel's spectrum (first sample %s)", name, samples[idx[0]].where())
		}
		var ss float64
		for k := range full {
			full[k] = full[k]/float64(nFull) - dark[k]
			ss += full[k] * full[k]
		}
		spec, err := colorimetry.NewSpectrumOnGrid(g, full, colorimetry.Options{Interp: colorimetry.InterpLinear, Extrap: colorimetry.ExtrapZero})
		if err != nil {
			return nil, fmt.Errorf("lights fit: channel %q: %w", name, err)
		}
		sc, err := lw.XYZ(spec)
		if err != nil {
			return nil, fmt.Errorf("lights fit: channel %q: %w", name, err)
		}
		if !(sc.Y > 0) || !(ss > 0) {
			return nil, fmt.Errorf("lights fit: channel %q: no light at full drive once the dark is taken off (Y = %g)", name, sc.Y)
		}
		suv, _ := sc.UVPrime()
		for _, i := range idx {
			s := samples[i]
			x := make([]float64, n)
			var xs float64
			for k := range x {
				x[k] = s.Spectrum.Value(k) - dark[k]
				xs += x[k] * full[k]
			}
			a := xs / ss
			var rr float64
			for k := range x {
				r := x[k] - a*full[k]
				rr += r * r
			}
			se := 0.0
			if n > 1 {
				se = math.Sqrt(rr/float64(n-1)) / math.Sqrt(ss)
			}
			sf := scaled{idx: i, w: a, se: se, rr: rr}
			if a > 0 {
				if xsp, err := colorimetry.NewSpectrumOnGrid(g, x, colorimetry.Options{Interp: colorimetry.InterpLinear, Extrap: colorimetry.ExtrapZero}); err == nil {
					if xc, err := lw.XYZ(xsp); err == nil {
						if xuv, err := xc.UVPrime(); err == nil {
							sf.duv = colorimetry.DeltaUVPrime(xuv, suv)
						}
					}
				}
			}
			perCh[ci] = append(perCh[ci], sf)
		}
		// Noise of one measurement, σ̂², from the scale-fit residuals of the
		// low-output samples (w < lightShapeMinOutput, where a change of
		// shape, which grows with the output, adds little): the median of
		// ‖r‖²/(N − 1) over each sample's noise factor. A residual carries
		// the sample's own noise, the full-drive mean's scaled by w and the
		// dark mean's scaled by 1 − w: factor 1 + w²/n_full + (1 − w)²/n_dark.
		nDark := len(darks)
		noiseFactor := func(w float64) float64 {
			f := 1 + w*w/float64(nFull)
			if nDark > 0 {
				f += (1 - w) * (1 - w) / float64(nDark)
			}
			return f
		}
		var low, anyv []float64
		for _, sf := range perCh[ci] {
			if samples[sf.idx].Drive == 1 || n < 2 {
				continue
			}
			v := sf.rr / float64(n-1) / noiseFactor(sf.w)
			anyv = append(anyv, v)
			if sf.w < lightShapeMinOutput {
				low = append(low, v)
			}
		}
		sigma2 := 0.0
		switch {
		case len(low) > 0:
			sigma2 = lightMedian(low)
		case len(anyv) > 0:
			sigma2 = slices.Min(anyv)
		}
		for k, sf := range perCh[ci] {
			if samples[sf.idx].Drive == 1 || !(sf.w > 0) || n < 2 {
				continue
			}
			v, e := sf.rr/float64(n-1), sigma2*noiseFactor(sf.w)
			// Twice the expected variance: a χ² with N − 1 ≥ 30 degrees of
			// freedom stays below that with probability > 0.999, common
			// practice (no source) for a margin over an estimated noise.
			if v > 2*e {
				perCh[ci][k].excess = math.Sqrt(v-e) / (sf.w * math.Sqrt(ss/float64(n)))
			}
		}
		// Training points at drives strictly between 0 and 1.
		var pts []lightPoint
		for _, sf := range perCh[ci] {
			s := samples[sf.idx]
			if heldOut[sf.idx] || s.Drive == 0 || s.Drive == 1 {
				continue
			}
			pts = append(pts, lightPoint{d: s.Drive, w: sf.w, se: sf.se, where: s.where()})
		}
		groups := lightGroup(pts)
		if err := lightCheckMonotone(name, groups); err != nil {
			return nil, fmt.Errorf("lights fit: %w", err)
		}
		var resp LightResponse
		switch opt.Response {
		case ResponsePower:
			var w []string
			resp, w, err = lightFitPower(name, pts, lightCommonMode{sigma2: sigma2, ss: ss, nFull: nFull, nDark: nDark})
			warns = append(warns, w...)
		case ResponseMonotone:
			var w []string
			resp, w, err = lightFitMonotone(name, groups)
			warns = append(warns, w...)
		}
		if err != nil {
			return nil, fmt.Errorf("lights fit: %w", err)
		}
		// Shape change with drive.
		worst := -1
		for k, sf := range perCh[ci] {
			if sf.w >= lightShapeMinOutput && sf.excess > opt.ShapeTol && (worst < 0 || sf.excess > perCh[ci][worst].excess) {
				worst = k
			}
		}
		if worst >= 0 {
			sf := perCh[ci][worst]
			warns = append(warns, fmt.Sprintf("channel %s: the spectrum changes shape with drive (scale-fit residual beyond noise %.1f%% of the signal at drive %g, Δu′v′ %.4f from the full-drive colour; %s): the model keeps the full-drive shape at every drive",
				name, 100*sf.excess, samples[sf.idx].Drive, sf.duv, samples[sf.idx].where()))
		}
		channels = append(channels, LightChannel{Name: name, Spectrum: spec, Response: resp})
	}
	var darkSpec colorimetry.Spectrum
	if len(darks) > 0 {
		if darkSpec, err = colorimetry.NewSpectrumOnGrid(g, dark, colorimetry.Options{Interp: colorimetry.InterpLinear, Extrap: colorimetry.ExtrapZero}); err != nil {
			return nil, fmt.Errorf("lights fit: dark spectrum: %w", err)
		}
	}
	m, err := NewLights(channels, darkSpec, opt.Absolute)
	if err != nil {
		return nil, fmt.Errorf("lights fit: %w", err)
	}

	// Fit report: every channel sample against the model's prediction.
	sc := NewScorer(fitObs, cie.E(), "E (lights: equal-energy white)")
	var fits []SampleFit
	for ci := range order {
		for _, sf := range perCh[ci] {
			s := samples[sf.idx]
			w := make([]float64, m.Len())
			w[ci] = m.resp[ci].Output(s.Drive)
			pred, err := m.spectrumOf(w, colorimetry.Spectrum{})
			if err != nil {
				return nil, fmt.Errorf("lights fit: %s: %w", s.where(), err)
			}
			rms, maxAbs, err := Residual(s.Spectrum, pred)
			if err != nil {
				return nil, fmt.Errorf("lights fit: %s: %w", s.where(), err)
			}
			de, duv, err := sc.LightDE00(s.Spectrum, pred)
			if err != nil {
				warns = append(warns, fmt.Sprintf("%s: sample %q left out of the report: %v", s.where(), s.Name, err))
				continue
			}
			fits = append(fits, SampleFit{Name: s.Name, HeldOut: heldOut[sf.idx], RMS: rms, MaxAbs: maxAbs, DE00: de, DeltaUVPrime: &duv})
		}
	}
	for ci := range order {
		for _, sf := range perCh[ci] {
			s := samples[sf.idx]
			m.ramps = append(m.ramps, RampFit{Name: s.Name, Channel: m.names[ci], Drive: s.Drive, HeldOut: heldOut[sf.idx],
				Measured: sf.w, StdErr: sf.se, Predicted: m.resp[ci].Output(s.Drive), Where: s.Where})
		}
	}
	rep := NewFitReport(fits, sc.Illuminant(), sc.Observer())
	rep.Warnings = append(rep.Warnings, warns...)
	m.report = &rep
	return m, nil
}

// lightHoldOut returns which samples are held out: those flagged, and
// every k-th ramp sample of each channel by drive (see
// LightsFitOptions.HoldOut).
func lightHoldOut(samples []RampSample, byCh map[string][]int, order []string, frac float64) []bool {
	h := make([]bool, len(samples))
	for i, s := range samples {
		h[i] = s.HeldOut
	}
	if frac <= 0 {
		return h
	}
	k := max(2, int(math.Round(1/frac)))
	for _, key := range order {
		var ramp []int
		for _, i := range byCh[key] {
			if d := samples[i].Drive; d > 0 && d < 1 && !h[i] {
				ramp = append(ramp, i)
			}
		}
		sorted := lightSortedIndex(len(ramp), func(j int) float64 { return samples[ramp[j]].Drive })
		for j, p := range sorted {
			if j%k == k/2 {
				h[ramp[p]] = true
			}
		}
	}
	return h
}

// lightPoint is one training sample of a ramp: drive, relative output and
// its standard error.
type lightPoint struct {
	d, w, se float64
	n        int // samples pooled
	where    string
}

// lightGroup averages points at equal drive and sorts them by drive; the
// standard error of a mean is √(Σ se²)/n.
func lightGroup(pts []lightPoint) []lightPoint {
	var out []lightPoint
	idx := lightSortedIndex(len(pts), func(i int) float64 { return pts[i].d })
	for _, i := range idx {
		p := pts[i]
		if k := len(out) - 1; k >= 0 && out[k].d == p.d {
			q := &out[k]
			// Running sums: w and se² are stored as sums until the end.
			q.w += p.w
			q.se += p.se * p.se
			q.n++
			continue
		}
		p.se *= p.se
		p.n = 1
		out = append(out, p)
	}
	for k := range out {
		out[k].w /= float64(out[k].n)
		out[k].se = math.Sqrt(out[k].se) / float64(out[k].n)
	}
	return out
}

// lightCheckMonotone returns an error when the output falls between
// consecutive drive levels (the anchors (0, 0) and (1, 1) included) by
// more than three standard errors.
func lightCheckMonotone(name string, groups []lightPoint) error {
	// The anchors carry the noise of their neighbours: the dark and the
	// full-drive spectrum are measured too.
	all := append([]lightPoint{{d: 0, w: 0, n: 1}}, groups...)
	all = append(all, lightPoint{d: 1, w: 1, n: 1, where: "full drive"})
	if len(groups) > 0 {
		all[0].se = groups[0].se
		all[len(all)-1].se = groups[len(groups)-1].se
	}
	for k := 1; k < len(all); k++ {
		a, b := all[k-1], all[k]
		lim := 3 * math.Hypot(a.se, b.se)
		if a.w-b.w > lim {
			place := b.where
			if place == "full drive" || place == "" {
				place = a.where
			}
			return fmt.Errorf("%s: channel %s: the output falls from %.4g at drive %g to %.4g at drive %g, more than three standard errors (%.2g): the ramp is not monotone",
				place, name, a.w, a.d, b.w, b.d, lim)
		}
	}
	return nil
}

// lightCommonMode describes the errors every scale of a channel shares:
// those of the full-drive mean (n_full spectra) and of the dark mean
// (n_dark spectra), each of noise σ² per wavelength, projected on the
// channel's spectrum of squared norm ss.
type lightCommonMode struct {
	sigma2, ss   float64
	nFull, nDark int
}

// lightFitPower fits w = d^γ (see FitLights). The standard error of γ
// adds to the scatter of the points the errors they share: the full-drive
// mean scales every w alike (ln w shifts by ε_S, variance σ²/(n_full·ss)),
// the dark mean shifts every w by (1 − w)·ε_D (ln w by ε_D·(1 − w)/w,
// variance σ²/(n_dark·ss)); propagated through the weighted estimator.
func lightFitPower(name string, pts []lightPoint, cm lightCommonMode) (LightResponse, []string, error) {
	var warns []string
	var sxx, sxy float64
	var use []lightPoint
	for _, p := range pts {
		if !(p.w > 0) {
			warns = append(warns, fmt.Sprintf("%s: channel %s: output %.3g at drive %g is not positive; left out of the power-law fit", p.where, name, p.w, p.d))
			continue
		}
		u := p.w * p.w
		x, y := math.Log(p.d), math.Log(p.w)
		sxx += u * x * x
		sxy += u * x * y
		use = append(use, p)
	}
	if len(use) == 0 {
		return LightResponse{}, warns, fmt.Errorf("channel %s: no ramp sample with a drive between 0 and 1 and a positive output, so no power law can be fitted (measure the channel at a few drive levels below 1)", name)
	}
	gamma := sxy / sxx
	se := 0.0
	if len(use) > 1 {
		var ss float64
		for _, p := range use {
			r := math.Log(p.w) - gamma*math.Log(p.d)
			ss += p.w * p.w * r * r
		}
		se = math.Sqrt(ss / float64(len(use)-1) / sxx)
	}
	if cm.ss > 0 && cm.sigma2 > 0 {
		var sx, sd float64
		for _, p := range use {
			u, x := p.w*p.w, math.Log(p.d)
			sx += u * x
			sd += u * x * (1 - p.w) / p.w
		}
		v := cm.sigma2 / cm.ss * sx * sx / float64(cm.nFull)
		if cm.nDark > 0 {
			v += cm.sigma2 / cm.ss * sd * sd / float64(cm.nDark)
		}
		se = math.Sqrt(se*se + v/(sxx*sxx))
	}
	r, err := powerResponseSE(gamma, se)
	if err != nil {
		return LightResponse{}, warns, fmt.Errorf("channel %s: %w", name, err)
	}
	return r, warns, nil
}

// lightFitMonotone fits the monotone response through the grouped means
// (see FitLights).
func lightFitMonotone(name string, groups []lightPoint) (LightResponse, []string, error) {
	var warns []string
	// Pool adjacent violators, weighted by the number of samples; outputs
	// are first held within the anchors 0 and 1.
	type block struct {
		d, w   float64
		n      int
		d0, d1 float64
	}
	var bl []block
	for _, g := range groups {
		if g.d <= 0 || g.d >= 1 {
			continue
		}
		bl = append(bl, block{d: g.d, w: math.Min(math.Max(g.w, 0), 1), n: g.n, d0: g.d, d1: g.d})
		for len(bl) > 1 && bl[len(bl)-2].w > bl[len(bl)-1].w {
			a, b := bl[len(bl)-2], bl[len(bl)-1]
			nn := a.n + b.n
			m := block{d: (a.d*float64(a.n) + b.d*float64(b.n)) / float64(nn), w: (a.w*float64(a.n) + b.w*float64(b.n)) / float64(nn), n: nn, d0: a.d0, d1: b.d1}
			bl = append(bl[:len(bl)-2], m)
		}
	}
	drive, out := []float64{0}, []float64{0}
	for _, b := range bl {
		if b.d0 != b.d1 {
			warns = append(warns, fmt.Sprintf("channel %s: the output dips within noise between drive %g and %g; those levels are pooled to keep the curve monotone", name, b.d0, b.d1))
		}
		drive = append(drive, b.d)
		out = append(out, b.w)
	}
	drive, out = append(drive, 1), append(out, 1)
	r, err := MonotoneResponse(drive, out)
	if err != nil {
		return LightResponse{}, warns, fmt.Errorf("channel %s: %w", name, err)
	}
	return r, warns, nil
}

// lightMedian returns the median of v (not empty); v is reordered.
func lightMedian(v []float64) float64 {
	sort.Float64s(v)
	k := len(v) / 2
	if len(v)%2 == 1 {
		return v[k]
	}
	return 0.5 * (v[k-1] + v[k])
}
