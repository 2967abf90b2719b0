package mixing

import (
	"fmt"
	"math"
	"sort"

	"github.com/antipode-color/antipode/colorimetry"
)

// SampleFit is how well a fitted model reproduces one calibration sample.
type SampleFit struct {
	Name    string  `json:"name"`
	HeldOut bool    `json:"held_out"` // excluded from the fit, used to test it
	RMS     float64 `json:"rms"`      // RMS spectral residual, in the data's units
	MaxAbs  float64 `json:"max_abs"`  // largest absolute spectral residual
	DE00    float64 `json:"dE00"`     // CIEDE2000 between measured and predicted
	// DeltaUVPrime is Δu′v′ between measured and predicted, for lights;
	// null for object colours.
	DeltaUVPrime *float64 `json:"delta_uv_prime"`
}

// DEStats summarises colour differences over a set of samples, in CIE
// units.
type DEStats struct {
	N    int     `json:"n"`
	Mean float64 `json:"mean"`
	P95  float64 `json:"p95"` // 95th percentile (nearest rank)
	Max  float64 `json:"max"`
}

// FitReport says how well a model fits its calibration measurements: per
// sample, the RMS spectral error over the training samples, and ΔE00
// statistics on training and held-out samples under a stated illuminant
// and observer.
type FitReport struct {
	Samples    []SampleFit `json:"samples"`
	RMS        float64     `json:"rms_spectral"` // RMS spectral residual over all training samples
	Training   DEStats     `json:"training"`
	HeldOut    *DEStats    `json:"held_out"` // null when no sample was held out
	Illuminant string      `json:"illuminant"`
	Observer   string      `json:"observer"`
	Warnings   []string    `json:"warnings"`
}

// NewFitReport summarises the per-sample results. The RMS spectral residual
// pools the squared residuals of the training samples, weighting each sample
// by its number of spectral values n (one n for all, the model's grid).
func NewFitReport(samples []SampleFit, illuminant, observer string) FitReport {
	r := FitReport{Samples: samples, Illuminant: illuminant, Observer: observer, Warnings: []string{}}
	var train, held []float64
	var ss float64
	for _, s := range samples {
		if s.HeldOut {
			held = append(held, s.DE00)
			continue
		}
		train = append(train, s.DE00)
		ss += s.RMS * s.RMS
	}
	if len(train) > 0 {
		r.RMS = math.Sqrt(ss / float64(len(train)))
	}
	r.Training = stats(train)
	if len(held) > 0 {
		h := stats(held)
		r.HeldOut = &h
	}
	return r
}

// stats returns the mean, 95th percentile (nearest rank) and maximum of v.
func stats(v []float64) DEStats {
	if len(v) == 0 {
		return DEStats{}
	}
	s := append([]float64(nil), v...)
	sort.Float64s(s)
	var sum float64
	for _, x := range s {
		sum += x
	}
	k := int(math.Ceil(0.95*float64(len(s)))) - 1
	return DEStats{N: len(s), Mean: sum / float64(len(s)), P95: s[max(k, 0)], Max: s[len(s)-1]}
}

// Residual returns the RMS and largest absolute difference between the
// measured and predicted spectra on the measured spectrum's grid (the
// prediction is resampled onto it).
func Residual(measured, predicted colorimetry.Spectrum) (rms, maxAbs float64, err error) {
	p, err := predicted.Resample(measured.Grid())
	if err != nil {
		return 0, 0, err
	}
	var ss float64
	for i := 0; i < measured.Len(); i++ {
		d := measured.Value(i) - p.Value(i)
		ss += d * d
		maxAbs = math.Max(maxAbs, math.Abs(d))
	}
	return math.Sqrt(ss / float64(measured.Len())), maxAbs, nil
}

// Scorer computes colour differences between measured and predicted
// spectra under one illuminant and observer: ΔE00 of object colours
// relative to the illuminant's perfect-diffuser white, and for lights ΔE00
// with both normalised to the measured light's Y = 100 against the white of
// equal-energy chromaticity, plus Δu′v′.
type Scorer struct {
	obs    *colorimetry.Observer
	ill    colorimetry.Spectrum
	object map[colorimetry.Grid]*colorimetry.Weights
	light  map[colorimetry.Grid]*colorimetry.Weights
	name   string
}

// NewScorer returns a Scorer for the observer and illuminant (named name in
// reports). A Scorer caches weighting tables and is not safe for concurrent
// use.
func NewScorer(obs *colorimetry.Observer, ill colorimetry.Spectrum, name string) *Scorer {
	return &Scorer{obs: obs, ill: ill, name: name, object: map[colorimetry.Grid]*colorimetry.Weights{}, light: map[colorimetry.Grid]*colorimetry.Weights{}}
}

// Illuminant returns the illuminant's name as given to NewScorer.
func (s *Scorer) Illuminant() string { return s.name }

// Observer returns the observer's name.
func (s *Scorer) Observer() string { return s.obs.Name() }

// ObjectWeights returns the object weighting table for the computation
// grid that suits g (colorimetry.ComputationGrid).
func (s *Scorer) ObjectWeights(g colorimetry.Grid) (*colorimetry.Weights, error) {
	cg := colorimetry.ComputationGrid(g)
	if w, ok := s.object[cg]; ok {
		return w, nil
	}
	w, err := colorimetry.NewObjectWeights(s.obs, s.ill, cg)
	if err != nil {
		return nil, err
	}
	s.object[cg] = w
	return w, nil
}

// LightWeights returns the light weighting table for the computation grid
// that suits g.
func (s *Scorer) LightWeights(g colorimetry.Grid) (*colorimetry.Weights, error) {
	cg := colorimetry.ComputationGrid(g)
	if w, ok := s.light[cg]; ok {
		return w, nil
	}
	w, err := colorimetry.NewLightWeights(s.obs, cg)
	if err != nil {
		return nil, err
	}
	s.light[cg] = w
	return w, nil
}

// ObjectLab returns the CIELAB coordinates of a reflectance or
// transmittance under the scorer's illuminant.
func (s *Scorer) ObjectLab(r colorimetry.Spectrum) (colorimetry.Lab, error) {
	w, err := s.ObjectWeights(r.Grid())
	if err != nil {
		return colorimetry.Lab{}, err
	}
	c, err := w.XYZ(r)
	if err != nil {
		return colorimetry.Lab{}, err
	}
	return c.Lab(w.White())
}

// ObjectDE00 returns ΔE00 between two reflectances or transmittances.
func (s *Scorer) ObjectDE00(measured, predicted colorimetry.Spectrum) (float64, error) {
	a, err := s.ObjectLab(measured)
	if err != nil {
		return 0, fmt.Errorf("measured: %w", err)
	}
	b, err := s.ObjectLab(predicted)
	if err != nil {
		return 0, fmt.Errorf("predicted: %w", err)
	}
	return colorimetry.DeltaE2000(a, b), nil
}

// LightDE00 returns ΔE00 and Δu′v′ between two lights. Both are scaled by
// the factor that brings the measured light to Y = 100, and CIELAB is taken
// against an equal-energy white of Y = 100, so ΔE00 counts luminance and
// chromaticity differences together, as a designer sees two lights side
// by side.
func (s *Scorer) LightDE00(measured, predicted colorimetry.Spectrum) (de, duv float64, err error) {
	w, err := s.LightWeights(measured.Grid())
	if err != nil {
		return 0, 0, err
	}
	a, err := w.XYZ(measured)
	if err != nil {
		return 0, 0, fmt.Errorf("measured: %w", err)
	}
	b, err := w.XYZ(predicted)
	if err != nil {
		return 0, 0, fmt.Errorf("predicted: %w", err)
	}
	if !(a.Y > 0) {
		return 0, 0, fmt.Errorf("measured light: %w", colorimetry.ErrZeroLuminance)
	}
	k := 100 / a.Y
	a, b = a.Scale(k), b.Scale(k)
	white := colorimetry.XYZ{X: 100, Y: 100, Z: 100}
	la, err := a.Lab(white)
	if err != nil {
		return 0, 0, err
	}
	lb, err := b.Lab(white)
	if err != nil {
		return 0, 0, err
	}
	ua, err := a.UVPrime()
	if err != nil {
		return 0, 0, err
	}
	ub, err := b.UVPrime()
	if err != nil {
		return 0, 0, fmt.Errorf("predicted light: %w", err)
	}
	return colorimetry.DeltaE2000(la, lb), colorimetry.DeltaUVPrime(ua, ub), nil
}
