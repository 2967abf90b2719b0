package colorimetry

import (
	"errors"
	"fmt"
)

// ErrNoTests reports a metamerism computation given no test illuminant.
var ErrNoTests = errors.New("no test illuminant")

// NamedIlluminant is an illuminant's relative spectral power distribution
// together with the name under which results about it are reported, such
// as "A" or "FL11".
type NamedIlluminant struct {
	Name     string   // name used in results
	Spectrum Spectrum // relative spectral power distribution
}

// MetamerismResult is the special metamerism index of a pair of object
// colours for one test illuminant. All values are CIEDE2000 colour
// differences ΔE00 in CIE units, each computed in the CIELAB space of the
// illuminant concerned (relative to its own perfect-diffuser white).
type MetamerismResult struct {
	// Illuminant is the name of the test illuminant.
	Illuminant string
	// Index is the special metamerism index for the change from the
	// reference to this illuminant: ΔE00 between standard and trial under
	// the test illuminant after the additive correction in CIELAB.
	Index float64
	// Uncorrected is ΔE00 between standard and trial under the test
	// illuminant without correction.
	Uncorrected float64
	// Mismatch is the residual ΔE00 between standard and trial under the
	// reference illuminant; zero for an exact metameric match. It is the
	// same for every test illuminant of one computation.
	Mismatch float64
	// Correction holds ΔL*, Δa*, Δb* (trial − standard) under the
	// reference illuminant, in CIE units: the difference that the additive
	// correction subtracts from the trial's CIELAB coordinates under the
	// test illuminant.
	Correction Lab
}

// MetamerismIndex returns the special metamerism index for a change in
// illuminant (CIE 015:2018, "Special metamerism index: change in
// illuminant"; title and content from memory) of the pair std
// (standard) and trial, reflectance or transmittance spectra (fractions
// 0–1) that match, or nearly match, under the reference illuminant ref.
// For each test illuminant, in the order given, it computes the CIELAB
// coordinates of both specimens relative to that illuminant's own
// perfect-diffuser white (Weights.White), seen by obs and summed on grid g,
// and the colour difference ΔE00 (CIEDE2000) between them.
//
// When the pair does not match exactly under the reference illuminant,
// CIE 015 recommends a correction (from memory); this function applies
// the additive one in CIELAB: the reference difference (ΔL*, Δa*, Δb*) = Lab_trial,ref −
// Lab_std,ref is subtracted from the trial's Lab under the test illuminant
// before the difference is taken. The index is then
//
//	ΔE00(Lab_std,test, Lab_trial,test − (Lab_trial,ref − Lab_std,ref)).
//
// The index is to be reported with the colour-difference formula used;
// here it is always CIEDE2000 (older editions of CIE 015 used ΔE*ab; from
// memory).
//
// The weights for each illuminant are built once. Grids: line spectra
// (the FL series) should be given with g = Grid5nm, where their own
// samples are used without interpolation; see ComputationGrid. It returns
// ErrNoTests when tests is empty, and the error of NewObjectWeights,
// Weights.XYZ or XYZ.Lab, with the illuminant's name, for invalid data.
func MetamerismIndex(std, trial Spectrum, obs *Observer, ref Spectrum, tests []NamedIlluminant, g Grid) ([]MetamerismResult, error) {
	if len(tests) == 0 {
		return nil, ErrNoTests
	}
	ls, lt, err := pairLab(std, trial, obs, ref, g)
	if err != nil {
		return nil, fmt.Errorf("reference illuminant: %w", err)
	}
	corr := Lab{L: lt.L - ls.L, A: lt.A - ls.A, B: lt.B - ls.B}
	mismatch := DeltaE2000(ls, lt)
	out := make([]MetamerismResult, len(tests))
	for i, ti := range tests {
		s, t, err := pairLab(std, trial, obs, ti.Spectrum, g)
		if err != nil {
			return nil, fmt.Errorf("test illuminant %q: %w", ti.Name, err)
		}
		tc := Lab{L: t.L - corr.L, A: t.A - corr.A, B: t.B - corr.B}
		out[i] = MetamerismResult{
			Illuminant:  ti.Name,
			Index:       DeltaE2000(s, tc),
			Uncorrected: DeltaE2000(s, t),
			Mismatch:    mismatch,
			Correction:  corr,
		}
	}
	return out, nil
}

// FieldSize compares a pair of object colours seen by the CIE 1931 2° and
// the CIE 1964 10° standard observers under one illuminant. Differences are
// ΔE00 (CIEDE2000) in CIE units, each in the CIELAB space of its own
// observer.
type FieldSize struct {
	DeltaE2  float64 // ΔE00 between the pair for the 2° observer
	DeltaE10 float64 // ΔE00 between the pair for the 10° observer
	Change   float64 // DeltaE10 − DeltaE2
}

// FieldSizeCheck returns how the colour difference between std and trial
// (reflectance or transmittance, fractions 0–1) changes from the 2°
// observer obs2 to the 10° observer obs10 (in practice cie.CIE1931 and
// cie.CIE1964) under the illuminant ill, summed on grid g. Each observer's
// CIELAB coordinates are relative to its own perfect-diffuser white.
//
// This is a field-size check only. It is not the CIE special metamerism
// index for a change in observer (CIE 015:2018; CIE 80:1989, from
// memory), which uses the CIE standard deviate observer, whose data this
// package does not have. It returns the errors of NewObjectWeights, Weights.XYZ and
// XYZ.Lab.
func FieldSizeCheck(std, trial Spectrum, obs2, obs10 *Observer, ill Spectrum, g Grid) (FieldSize, error) {
	var r FieldSize
	for i, o := range [2]*Observer{obs2, obs10} {
		a, b, err := pairLab(std, trial, o, ill, g)
		if err != nil {
			return FieldSize{}, fmt.Errorf("observer %s: %w", o.Name(), err)
		}
		if i == 0 {
			r.DeltaE2 = DeltaE2000(a, b)
		} else {
			r.DeltaE10 = DeltaE2000(a, b)
		}
	}
	r.Change = r.DeltaE10 - r.DeltaE2
	return r, nil
}

// pairLab returns the CIELAB coordinates of a and b under the illuminant
// ill seen by obs on grid g, relative to the illuminant's own white.
func pairLab(a, b Spectrum, obs *Observer, ill Spectrum, g Grid) (la, lb Lab, err error) {
	w, err := NewObjectWeights(obs, ill, g)
	if err != nil {
		return Lab{}, Lab{}, err
	}
	xa, err := w.XYZ(a)
	if err != nil {
		return Lab{}, Lab{}, fmt.Errorf("standard: %w", err)
	}
	xb, err := w.XYZ(b)
	if err != nil {
		return Lab{}, Lab{}, fmt.Errorf("trial: %w", err)
	}
	if la, err = xa.Lab(w.White()); err != nil {
		return Lab{}, Lab{}, fmt.Errorf("standard: %w", err)
	}
	if lb, err = xb.Lab(w.White()); err != nil {
		return Lab{}, Lab{}, fmt.Errorf("trial: %w", err)
	}
	return la, lb, nil
}
