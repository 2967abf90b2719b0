package mixing

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
)

// HalftoneSample is one measured patch of a print calibration: its
// nominal coverages and its reflectance.
type HalftoneSample struct {
	// Name identifies the patch; names are unique.
	Name string
	// Coverages are the nominal coverages (fraction 0–1) by ink name;
	// inks not named are 0.
	Coverages []Amount
	// Reflectance is the measured spectrum, fraction 0–1.
	Reflectance colorimetry.Spectrum
	// HeldOut excludes the patch from the fit; it is only scored.
	HeldOut bool
	// Place says where the patch came from ("file.csv:12"), for messages;
	// may be empty.
	Place string
}

// where names a patch in messages.
func (s HalftoneSample) where() string {
	if s.Place != "" {
		return fmt.Sprintf("%s: patch %q", s.Place, s.Name)
	}
	return fmt.Sprintf("patch %q", s.Name)
}

// htProcessInks are the process inks recognised by their column name
// alone, in the order the model keeps them.
var htProcessInks = []string{"c", "m", "y", "k"}

// htColumn is an ink column of a calibration file.
type htColumn struct {
	header  string // as written
	ink     string
	percent bool
	bare    bool // no unit in the header: percent by default
}

// htParseColumn reads an ink column header: "c", "c (%)", "c %",
// "c (fraction)", "ink:orange (%)" … ok is false when the header names no
// ink.
func htParseColumn(h string) (htColumn, bool) {
	col := htColumn{header: h, percent: true}
	t := strings.TrimSpace(h)
	spot := false
	if len(t) > 4 && strings.EqualFold(t[:4], "ink:") {
		spot = true
		t = strings.TrimSpace(t[4:])
	}
	l := strings.ToLower(t)
	switch {
	case strings.HasSuffix(l, "(%)"):
		t = t[:len(t)-3]
	case strings.HasSuffix(l, "%"):
		t = t[:len(t)-1]
	case strings.HasSuffix(l, "(fraction)"):
		t, col.percent = t[:len(t)-len("(fraction)")], false
	case strings.HasSuffix(l, "(0-1)"), strings.HasSuffix(l, "(0–1)"):
		t, col.percent = t[:strings.LastIndex(t, "(")], false
	default:
		col.bare = true
	}
	t = strings.TrimSpace(t)
	for _, p := range htProcessInks {
		if strings.EqualFold(t, p) {
			col.ink = p
			return col, true
		}
	}
	if spot && t != "" {
		col.ink = t
		return col, true
	}
	return col, false
}

// HalftoneSamples reads calibration patches from the records of a
// rows-layout spectral CSV file (specio). Besides the name (the first
// column), the extra columns are:
//
//	c, m, y, k      nominal coverage of a process ink, in percent 0–100 (the
//	                trade's way); the header may say so, "c (%)" or "c %",
//	                or declare fractions 0–1, "c (fraction)"; an empty
//	                cell is 0
//	ink:NAME        a spot ink's coverage, e.g. "ink:orange (%)", with the
//	                same units as above
//	heldout         optional: 1 (or yes, true) keeps the patch out of the
//	                fit and scores it; 0 or empty uses it
//
// followed by one column per wavelength holding reflectance. Column names
// are matched without regard to case. It returns the patches (coverages
// as fractions 0–1) and the inks: the process inks c, m, y, k that the
// file has, in that order, then the spot inks in alphabetical order.
//
// Errors name the file, line and column: no ink column, a column that is
// neither an ink nor heldout, an ink in two columns, a coverage that is
// not a number or lies outside 0–100 % (0–1), percent columns whose
// values all lie within 0–1 (fractions written under a percent header),
// a patch name used twice.
func HalftoneSamples(recs []specio.Named, file string) ([]HalftoneSample, []string, error) {
	if len(recs) == 0 {
		return nil, nil, fmt.Errorf("%s: %w: no patches", file, ErrHalftoneData)
	}
	var headers []string
	for h := range recs[0].Fields {
		headers = append(headers, h)
	}
	sort.Strings(headers)
	heldKey := ""
	byInk := map[string]htColumn{}
	for _, h := range headers {
		if strings.EqualFold(strings.TrimSpace(h), "heldout") {
			heldKey = h
			continue
		}
		col, ok := htParseColumn(h)
		if !ok {
			return nil, nil, fmt.Errorf("%s: %w: column %q is neither an ink nor heldout; process inks are c, m, y, k (percent), a spot ink is declared as ink:NAME, e.g. \"ink:orange (%%)\"",
				file, ErrHalftoneData, h)
		}
		if prev, dup := byInk[col.ink]; dup {
			return nil, nil, fmt.Errorf("%s: %w: ink %q has two columns (%q and %q)", file, ErrHalftoneData, col.ink, prev.header, h)
		}
		byInk[col.ink] = col
	}
	if len(byInk) == 0 {
		have := "none"
		if len(headers) > 0 {
			have = strings.Join(headers, ", ")
		}
		return nil, nil, fmt.Errorf("%s: %w: no ink columns (the non-wavelength columns found: %s); the rows layout is name, c, m, y, k (percent) or ink:NAME, [heldout], then one column per wavelength",
			file, ErrHalftoneData, have)
	}
	var inks, spots []string
	for _, p := range htProcessInks {
		if _, ok := byInk[p]; ok {
			inks = append(inks, p)
		}
	}
	for name := range byInk {
		if !strings.EqualFold(name, "c") && !strings.EqualFold(name, "m") && !strings.EqualFold(name, "y") && !strings.EqualFold(name, "k") {
			spots = append(spots, name)
		}
	}
	sort.Strings(spots)
	inks = append(inks, spots...)
	if err := htCheckInks(inks); err != nil {
		return nil, nil, fmt.Errorf("%s: %w: %v", file, ErrHalftoneData, err)
	}

	seen := map[string]int{}
	out := make([]HalftoneSample, 0, len(recs))
	var bareMax float64
	bareAny, bareCol, bareLine := false, "", 0
	for _, r := range recs {
		place := fmt.Sprintf("%s:%d", file, r.Line)
		if prev, dup := seen[r.Name]; dup {
			return nil, nil, fmt.Errorf("%s: %w: patch name %q used twice (also on line %d)", place, ErrHalftoneData, r.Name, prev)
		}
		seen[r.Name] = r.Line
		s := HalftoneSample{Name: r.Name, Reflectance: r.Spectrum, Place: place}
		if heldKey != "" {
			switch strings.ToLower(strings.TrimSpace(r.Fields[heldKey])) {
			case "", "0", "no", "false":
			case "1", "yes", "true":
				s.HeldOut = true
			default:
				return nil, nil, fmt.Errorf("%s (field %s): %w: %q is not 0 or 1", place, heldKey, ErrHalftoneData, r.Fields[heldKey])
			}
		}
		for _, ink := range inks {
			col := byInk[ink]
			if strings.TrimSpace(r.Fields[col.header]) == "" {
				// An empty cell is no ink, as spreadsheets leave it.
				s.Coverages = append(s.Coverages, Amount{Name: ink, Value: 0})
				continue
			}
			v, err := r.Number(col.header)
			if err != nil {
				return nil, nil, err
			}
			top, unit := 1.0, "0–1"
			if col.percent {
				top, unit = 100, "0–100 %"
			}
			if v < 0 || v > top {
				return nil, nil, fmt.Errorf("%s (field %s): %w: coverage %g is outside %s", place, col.header, ErrHalftoneData, v, unit)
			}
			if col.bare && v > 0 {
				bareAny = true
				if v > bareMax {
					bareMax, bareCol, bareLine = v, col.header, r.Line
				}
			}
			s.Coverages = append(s.Coverages, Amount{Name: ink, Value: v / top})
		}
		out = append(out, s)
	}
	if bareAny && bareMax <= 1 {
		return nil, nil, fmt.Errorf("%s:%d (field %s): %w: every coverage is within 0–1 (largest %g) but a column headed %q reads percent: write the header as \"%s (fraction)\" or the coverages in percent",
			file, bareLine, bareCol, ErrHalftoneData, bareMax, bareCol, bareCol)
	}
	return out, inks, nil
}

// HalftoneFitSettings control FitHalftone. The zero value fits one
// Yule–Nielsen factor under D50 and the CIE 1931 observer, with no extra
// patches held out and no total area coverage limit.
type HalftoneFitSettings struct {
	// Scorer scores the fit (ΔE00 of reflectance); nil means D50 and the
	// CIE 1931 2° observer, the graphic arts' viewing and measurement
	// condition (ISO 3664, ISO 13655; from memory).
	Scorer *Scorer
	// NFactor fixes the Yule–Nielsen factor instead of fitting it (1 for
	// the spectral Neugebauer and Murray–Davies models); 0 fits it within
	// [MinNFactor, MaxNFactor].
	NFactor float64
	// PerInk fits one Yule–Nielsen factor per ink, each from its own ramp
	// (see Halftone for how they combine); otherwise one factor for all
	// inks. It cannot be combined with NFactor.
	PerInk bool
	// HoldOut is the fraction (0 ≤ HoldOut < 1) of the patches to hold out
	// for validation, on top of those marked HeldOut, chosen
	// deterministically: never a primary nor the lowest or highest tint of
	// an ink's ramp, spread evenly over the other patches in input order.
	HoldOut float64
	// TAC is the press's total area coverage limit in percent, recorded in
	// the model for solves (0 for none).
	TAC float64
}

// Patch kinds of a calibration.
const (
	htPrimary = iota // every coverage 0 or 1
	htRamp           // one ink strictly between 0 and 1, the others 0
	htMixed          // anything else
)

// htPatch is a calibration patch as the fit sees it.
type htPatch struct {
	s    HalftoneSample
	nom  []float64 // nominal coverages in ink order
	r    []float64 // reflectance on the grid
	kind int
	mask int // the primary's bits (htPrimary)
	ink  int // the ramp's ink (htRamp)
	held bool
}

// htMonotoneTol is how far (coverage, 0–1) a ramp's effective coverage
// may fall from one nominal level to a higher one and still be taken as
// noise and pooled: 0.02, about the tone repeatability across a press
// sheet: common practice (no source). A larger fall is an error.
const htMonotoneTol = 0.02

// htNWarnSE is the standard error of a fitted Yule–Nielsen factor above
// which the fit warns that the data do not determine it: 0.5, a third of
// the distance from n = 1 to the typical 1.5–2 of coated papers (common
// practice (no source)).
const htNWarnSE = 0.5

// htSpreadWarn is the ΔE00 between replicates of a primary above which the
// fit warns: 1.0, about the sheet-to-sheet variation of a stable press run:
// common practice (no source).
const htSpreadWarn = 1.0

// FitHalftone calibrates a Yule–Nielsen modified spectral Neugebauer model
// of the inks (1 to MaxHalftoneInks, the order of the model) from measured
// patches.
//
// The patches whose coverages are all 0 or 1 are the Neugebauer
// primaries: the paper, each solid and every overprint, 2^k in all;
// replicates are averaged. The patches of one ink strictly between 0 and 1
// (the others 0) form that ink's tint ramp; all other patches (overprint
// tints) validate the model, or, when not held out, take part in the fit
// of n.
//
// For a trial n, every ramp patch gets the effective coverage that best
// reproduces its reflectance by the Yule–Nielsen equation (least squares
// over wavelength in reflectance, Gauss–Newton); the effective coverages
// of each nominal level are averaged, pooled into a non-decreasing
// sequence where needed, and joined by a monotone curve (DotGain) from
// (0, 0) to (1, 1). n minimises the sum of squared reflectance residuals
// of the ramp patches and of the training overprint tints predicted
// through the curves; it is found by a scan of [MinNFactor, MaxNFactor]
// at steps of 0.25 and a golden-section search. Its standard error comes
// from the curvature of that profile, σ̂·√(2/SSR″(n)), taking the
// spectral residuals as independent (they are not quite, so it is a lower
// bound). With PerInk each ink's n comes from its own ramp alone.
//
// The report scores every tint and overprint tint (training and held
// out): RMS spectral residual in reflectance and ΔE00 under the scorer's
// illuminant; the primaries, reproduced by construction, are summarised
// in PrimaryFits (replicate spread), the ramps in InkFits (dot gain at 25,
// 50 and 75 %).
//
// Errors (wrapping ErrHalftoneData, naming the patch, ink or primary): no
// patches, inks not valid, spectra on different grids, a reflectance
// below −0.01 or above 1.5, a coverage outside 0–1 or for an unknown ink,
// a primary held out, primaries missing (naming each), an ink without a
// training ramp, and a ramp whose effective coverage falls by more than
// 0.02 from one nominal level to a higher one (naming both patches).
func FitHalftone(inks []string, samples []HalftoneSample, set HalftoneFitSettings) (*Halftone, error) {
	if err := htCheckInks(inks); err != nil {
		return nil, fmt.Errorf("%w: %v", ErrHalftoneData, err)
	}
	if len(samples) == 0 {
		return nil, fmt.Errorf("%w: no patches", ErrHalftoneData)
	}
	if !htFinite(set.HoldOut) || set.HoldOut < 0 || set.HoldOut >= 1 {
		return nil, fmt.Errorf("hold-out fraction %v is not in [0, 1)", set.HoldOut)
	}
	if set.NFactor != 0 && (!htFinite(set.NFactor) || set.NFactor < MinNFactor || set.NFactor > MaxNFactor) {
		return nil, fmt.Errorf("Yule–Nielsen factor %v is outside [%g, %g]", set.NFactor, float64(MinNFactor), float64(MaxNFactor))
	}
	if set.NFactor != 0 && set.PerInk {
		return nil, fmt.Errorf("a fixed Yule–Nielsen factor and one factor per ink exclude each other")
	}
	if !htFinite(set.TAC) || set.TAC < 0 {
		return nil, fmt.Errorf("total area coverage limit %v %% is not a finite non-negative number", set.TAC)
	}
	scorer := set.Scorer
	if scorer == nil {
		scorer = NewScorer(cie.CIE1931(), cie.D50(), "D50")
	}
	k := len(inks)
	idx := map[string]int{}
	for i, n := range inks {
		idx[n] = i
	}
	g := samples[0].Reflectance.Grid()
	var patches []htPatch
	names := map[string]string{}
	for _, s := range samples {
		if prev, dup := names[s.Name]; dup {
			return nil, fmt.Errorf("%s: %w: patch name used twice (also %s)", s.where(), ErrHalftoneData, prev)
		}
		names[s.Name] = s.where()
		if s.Reflectance.IsZero() {
			return nil, fmt.Errorf("%s: %w: no spectrum", s.where(), ErrHalftoneData)
		}
		if sg := s.Reflectance.Grid(); !sg.Equal(g) {
			return nil, fmt.Errorf("%s: %w: spectrum on %v, the first patch on %v; measure all patches on one grid", s.where(), ErrHalftoneData, sg, g)
		}
		if err := s.Reflectance.CheckFraction(htNegTol); err != nil {
			return nil, fmt.Errorf("%s: %w: %v", s.where(), ErrHalftoneData, err)
		}
		if v, nm := s.Reflectance.Max(); v > htMaxReflectance {
			return nil, fmt.Errorf("%s: %w: reflectance %g at %g nm is above %g: give reflectance as a fraction 0–1, not percent", s.where(), ErrHalftoneData, v, nm, htMaxReflectance)
		}
		p := htPatch{s: s, nom: make([]float64, k), r: s.Reflectance.Values(nil), held: s.HeldOut}
		given := make([]bool, k)
		for _, a := range s.Coverages {
			i, ok := idx[a.Name]
			if !ok {
				return nil, fmt.Errorf("%s: %w: %w %q (inks: %s)", s.where(), ErrHalftoneData, ErrUnknownInk, a.Name, strings.Join(inks, ", "))
			}
			if given[i] {
				return nil, fmt.Errorf("%s: %w: ink %q given twice", s.where(), ErrHalftoneData, a.Name)
			}
			if !htFinite(a.Value) || a.Value < 0 || a.Value > 1 {
				return nil, fmt.Errorf("%s: %w: coverage of %q is %v, outside 0–1", s.where(), ErrHalftoneData, a.Name, a.Value)
			}
			p.nom[i], given[i] = a.Value, true
		}
		p.kind, p.mask, p.ink = htClassify(p.nom)
		if p.kind == htPrimary && p.held {
			return nil, fmt.Errorf("%s: %w: primary %s is held out; the model is built from the primaries, so they cannot be", s.where(), ErrHalftoneData, PrimaryName(inks, p.mask))
		}
		patches = append(patches, p)
	}
	htChooseHoldOut(patches, k, set.HoldOut)

	// The primaries: every one measured, replicates averaged.
	prim := make([][]float64, 1<<k)
	primOf := make([][]int, 1<<k)
	for pi, p := range patches {
		if p.kind == htPrimary {
			primOf[p.mask] = append(primOf[p.mask], pi)
		}
	}
	var missing []string
	for mask := range prim {
		if len(primOf[mask]) == 0 {
			missing = append(missing, PrimaryName(inks, mask))
			continue
		}
		prim[mask] = make([]float64, g.N)
		for _, pi := range primOf[mask] {
			for j, v := range patches[pi].r {
				prim[mask][j] += math.Max(v, 0) / float64(len(primOf[mask]))
			}
		}
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("%w: missing primaries: %s (the model needs the paper, every solid and every overprint of the %d inks: %d patches whose coverages are all 0 or 100 %%)",
			ErrHalftoneData, strings.Join(missing, ", "), k, 1<<k)
	}

	// The ramps.
	fd := &htFitData{g: g, inks: inks, prim: prim, reps: make([]int, len(prim))}
	for mask := range prim {
		fd.reps[mask] = len(primOf[mask])
	}
	fd.ramps = make([][]int, k)
	for pi, p := range patches {
		switch {
		case p.held:
		case p.kind == htRamp:
			fd.ramps[p.ink] = append(fd.ramps[p.ink], pi)
		case p.kind == htMixed:
			fd.mixed = append(fd.mixed, pi)
		}
	}
	fd.patches = patches
	for i, r := range fd.ramps {
		if len(r) == 0 {
			return nil, fmt.Errorf("%w: ink %q has no tint ramp in the fit (patches of %s alone between 0 and 100 %%, not held out)", ErrHalftoneData, inks[i], inks[i])
		}
	}

	// The Yule–Nielsen factor(s).
	var warns []string
	var nf, nse []float64
	switch {
	case set.NFactor != 0:
		nf, nse = []float64{set.NFactor}, []float64{0}
	case set.PerInk:
		for i := range inks {
			n, se, atBound := fd.fitN([]int{i}, false)
			nf, nse = append(nf, n), append(nse, se)
			if atBound {
				warns = append(warns, htBoundWarning(fmt.Sprintf("ink %q", inks[i]), n))
			}
		}
	default:
		all := make([]int, k)
		for i := range all {
			all[i] = i
		}
		n, se, atBound := fd.fitN(all, true)
		nf, nse = []float64{n}, []float64{se}
		if atBound {
			warns = append(warns, htBoundWarning("the press", n))
		}
	}

	for i, se := range nse {
		if se > htNWarnSE {
			who := "the press"
			if len(nse) == k {
				who = fmt.Sprintf("ink %q", inks[i])
			}
			warns = append(warns, fmt.Sprintf("Yule–Nielsen factor of %s is poorly determined (%.3g ± %.3g): a spectrally flat ink cannot tell optical from mechanical dot gain; fit one factor for all inks or fix it", who, nf[i], se))
		}
	}

	// Dot-gain curves at the fitted factor(s), with the monotonicity check.
	gains := make([]DotGain, k)
	inkFits := make([]InkFit, k)
	for i := range inks {
		n := nf[0]
		if len(nf) == k {
			n = nf[i]
		}
		effs, _ := fd.rampEffective(i, n)
		levels, means, counts := htLevels(fd, i, effs)
		for b := 1; b < len(levels); b++ {
			for a := range b {
				if means[b] < means[a]-htMonotoneTol {
					return nil, fmt.Errorf("%w: the ramp of ink %q is not monotone: at %s the print is lighter (effective coverage %.3f) than at %s (%.3f); check those patches",
						ErrHalftoneData, inks[i], htLevelPlaces(fd, i, levels[b]), means[b], htLevelPlaces(fd, i, levels[a]), means[a])
				}
			}
		}
		pooled := htPool(means, counts)
		smoothed := false
		for b := range pooled {
			if math.Abs(pooled[b]-means[b]) > 1e-12 {
				smoothed = true
			}
		}
		d, err := htCurve(levels, pooled)
		if err != nil {
			return nil, fmt.Errorf("ink %q: %w", inks[i], err)
		}
		gains[i] = d
		f := InkFit{Ink: inks[i], Patches: len(fd.ramps[i]), Levels: len(levels), Smoothed: smoothed,
			Gain25: d.Gain(0.25), Gain50: d.Gain(0.5), Gain75: d.Gain(0.75)}
		for s := 0; s <= 100; s++ {
			a := float64(s) / 100
			if gn := d.Gain(a); gn > f.MaxGain {
				f.MaxGain, f.MaxGainAt = gn, a
			}
		}
		if len(nf) == k {
			v := nf[i]
			f.N = &v
		}
		inkFits[i] = f
		if smoothed {
			warns = append(warns, fmt.Sprintf("ink %q: the ramp's effective coverage falls slightly between neighbouring levels (within %.2g); pooled into a monotone curve", inks[i], htMonotoneTol))
		}
		if len(levels) < 3 {
			warns = append(warns, fmt.Sprintf("ink %q: the ramp has %d level(s); the dot-gain curve between them is an interpolation: measure at least 3, better 10 (10 %%, 20 %% … 90 %%)", inks[i], len(levels)))
		}
	}

	primSpectra := make([]colorimetry.Spectrum, len(prim))
	for mask, r := range prim {
		s, err := colorimetry.NewSpectrumOnGrid(g, r, colorimetry.Options{})
		if err != nil {
			return nil, fmt.Errorf("primary %s: %w", PrimaryName(inks, mask), err)
		}
		primSpectra[mask] = s
	}
	m, err := NewHalftone(g, inks, primSpectra, nf, gains, set.TAC)
	if err != nil {
		return nil, fmt.Errorf("fitted model: %w", err)
	}
	m.nSE = nse
	m.inkFits = inkFits

	// Primary summaries.
	for mask := range prim {
		pf := PrimaryFit{Name: PrimaryName(inks, mask)}
		lab, err := scorer.ObjectLab(primSpectra[mask])
		if err != nil {
			return nil, fmt.Errorf("primary %s: %w", pf.Name, err)
		}
		pf.L, pf.A, pf.B = lab.L, lab.A, lab.B
		for _, pi := range primOf[mask] {
			pf.Samples = append(pf.Samples, patches[pi].s.Name)
			if len(primOf[mask]) > 1 {
				de, err := scorer.ObjectDE00(patches[pi].s.Reflectance, primSpectra[mask])
				if err != nil {
					return nil, fmt.Errorf("%s: %w", patches[pi].s.where(), err)
				}
				pf.Spread = math.Max(pf.Spread, de)
			}
		}
		if pf.Spread > htSpreadWarn {
			warns = append(warns, fmt.Sprintf("primary %s: its %d measurements differ from their mean by up to ΔE00 %.2f", pf.Name, len(primOf[mask]), pf.Spread))
		}
		m.primFits = append(m.primFits, pf)
	}

	// The report: every tint and overprint tint.
	var fits []SampleFit
	pred := make([]float64, g.N)
	for _, p := range patches {
		if p.kind == htPrimary {
			continue
		}
		ps := m.spectrumOf(m.ReflectanceTo(pred, p.nom))
		rms, maxAbs, err := Residual(p.s.Reflectance, ps)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", p.s.where(), err)
		}
		de, err := scorer.ObjectDE00(p.s.Reflectance, ps)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", p.s.where(), err)
		}
		fits = append(fits, SampleFit{Name: p.s.Name, HeldOut: p.held, RMS: rms, MaxAbs: maxAbs, DE00: de})
	}
	if fits == nil {
		fits = []SampleFit{}
	}
	m.report = NewFitReport(fits, scorer.Illuminant(), scorer.Observer())
	nMixed := 0
	for _, p := range patches {
		if p.kind == htMixed {
			nMixed++
		}
	}
	if nMixed == 0 && k > 1 {
		warns = append(warns, "no overprint tints (patches of two or more inks with at least one between 0 and 100 %): how the inks combine is not tested; add some and hold them out")
	}
	if set.HoldOut > 0 {
		got := 0
		for _, p := range patches {
			if p.held && !p.s.HeldOut {
				got++
			}
		}
		if want := int(math.Round(set.HoldOut * float64(len(patches)))); got < want {
			warns = append(warns, fmt.Sprintf("hold-out %.3g asks for %d patches; only %d could be spared (primaries and each ramp's lowest and highest tints stay in the fit)", set.HoldOut, want, got))
		}
	}
	m.report.Warnings = append(m.report.Warnings, warns...)
	return m, nil
}

// htBoundWarning says that a fitted n sits at a bound of its range.
func htBoundWarning(who string, n float64) string {
	return fmt.Sprintf("Yule–Nielsen factor of %s at the bound %g of [%g, %g]: either an ink is spectrally flat, so that its ramp cannot tell optical from mechanical dot gain (fit one factor for all inks or fix it), or the tints do not behave like halftones of these solids (check the primaries and the ramps' coverages)",
		who, n, float64(MinNFactor), float64(MaxNFactor))
}

// htClassify returns a patch's kind, its primary bits and its ramp ink.
func htClassify(nom []float64) (kind, mask, ink int) {
	partial, solid := 0, 0
	ink = -1
	for i, a := range nom {
		switch {
		case a == 1:
			solid++
			mask |= 1 << i
		case a > 0:
			partial++
			ink = i
		}
	}
	switch {
	case partial == 0:
		return htPrimary, mask, -1
	case partial == 1 && solid == 0:
		return htRamp, 0, ink
	}
	return htMixed, 0, -1
}

// htChooseHoldOut marks round(frac·len) more patches held out, chosen
// evenly among the candidates: overprint tints and ramp tints that are
// neither the lowest nor the highest level of their ink.
func htChooseHoldOut(patches []htPatch, k int, frac float64) {
	want := int(math.Round(frac * float64(len(patches))))
	if want == 0 {
		return
	}
	lo, hi := make([]float64, k), make([]float64, k)
	for i := range k {
		lo[i], hi[i] = 2, -1
	}
	for _, p := range patches {
		if p.kind == htRamp && !p.held {
			lo[p.ink] = math.Min(lo[p.ink], p.nom[p.ink])
			hi[p.ink] = math.Max(hi[p.ink], p.nom[p.ink])
		}
	}
	var cand []int
	for pi, p := range patches {
		if p.held {
			continue
		}
		if p.kind == htMixed || p.kind == htRamp && p.nom[p.ink] != lo[p.ink] && p.nom[p.ink] != hi[p.ink] {
			cand = append(cand, pi)
		}
	}
	want = min(want, len(cand))
	for i := range want {
		patches[cand[(2*i+1)*len(cand)/(2*want)]].held = true
	}
}

// htFitData holds what the fit of n works on.
type htFitData struct {
	g       colorimetry.Grid
	inks    []string
	prim    [][]float64 // averaged primaries, ≥ 0
	reps    []int       // replicates averaged into each primary
	patches []htPatch
	ramps   [][]int // training ramp patches per ink
	mixed   []int   // training overprint tints
}

// htNoiseFloor is the reflectance below which a primary's value is taken
// as this floor when its measurement noise is propagated: 0.002, about the
// photometric noise of a graphic-arts spectrophotometer near black, so
// that a solid measured as 0 does not get an infinite weight: common
// practice (no source).
const htNoiseFloor = 0.002

// htSens returns, per wavelength, the sensitivity factor of the
// Yule–Nielsen power of a primary to noise in its measurement:
// max(R, floor)^(1/n − 1)/√r for a primary averaged over r replicates
// (d(R^(1/n))/dR = R^(1/n − 1)/n; the 1/n cancels against the n of the
// outer power).
func htSens(r []float64, reps int, n float64) []float64 {
	g := make([]float64, len(r))
	for j, v := range r {
		g[j] = math.Pow(math.Max(v, htNoiseFloor), 1/n-1) / math.Sqrt(float64(reps))
	}
	return g
}

// rampEffective returns the effective coverage of each training ramp patch
// of ink i at Yule–Nielsen factor n and their summed weighted squared
// residuals.
func (fd *htFitData) rampEffective(i int, n float64) ([]float64, float64) {
	paper, solid := fd.prim[0], fd.prim[1<<i]
	N := len(paper)
	pq, dq, rq := make([]float64, N), make([]float64, N), make([]float64, N)
	for j := range N {
		pq[j] = math.Pow(paper[j], 1/n)
		dq[j] = math.Pow(solid[j], 1/n) - pq[j]
	}
	gp, gs := htSens(paper, fd.reps[0], n), htSens(solid, fd.reps[1<<i], n)
	var ssr float64
	effs := make([]float64, len(fd.ramps[i]))
	for t, pi := range fd.ramps[i] {
		r := fd.patches[pi].r
		for j := range N {
			rq[j] = math.Pow(math.Max(r[j], 0), 1/n)
		}
		a, e := htEffective(pq, dq, rq, r, gp, gs, n)
		effs[t] = a
		ssr += e
	}
	return effs, ssr
}

// htEffective returns the effective coverage a (0–1) whose Yule–Nielsen
// reflectance (pq + a·dq)^n best matches r in weighted least squares, and
// the summed weighted squared residual. pq, dq and rq are paper^(1/n),
// solid^(1/n) − paper^(1/n) and r^(1/n); gp and gs the paper's and the
// solid's sensitivity factors (htSens).
//
// The weights are those of the effective-variance method (Orear, Am. J.
// Phys. 50, 912–916, 1982): the paper and the solid are measurements too,
// with the same noise as the tint, so each residual's variance is
// σ²·(1 + (∂R/∂R_paper)² + (∂R/∂R_solid)²). Where a solid is nearly black
// its Yule–Nielsen power amplifies its noise many times, and without the
// weights that noise biases n. The start is the least-squares solution in
// the 1/n power, refined by Gauss–Newton in reflectance with the weights
// updated at each step.
func htEffective(pq, dq, rq, r, gp, gs []float64, n float64) (float64, float64) {
	var num, den float64
	for j := range pq {
		num += (rq[j] - pq[j]) * dq[j]
		den += dq[j] * dq[j]
	}
	if !(den > 0) {
		// The solid equals the paper: no coverage can be read.
		return 0, htSSR(pq, dq, r, gp, gs, n, 0)
	}
	a := math.Min(math.Max(num/den, 0), 1)
	for range 30 {
		var jr, jj float64
		for j := range pq {
			b := pq[j] + a*dq[j]
			bn1 := htPowN1(b, n)
			f := b * bn1
			d := n * bn1 * dq[j]
			w := htWeight(bn1, a, gp[j], gs[j])
			jr += w * d * (f - r[j])
			jj += w * d * d
		}
		if !(jj > 0) {
			break
		}
		next := math.Min(math.Max(a-jr/jj, 0), 1)
		step := math.Abs(next - a)
		a = next
		if step < 1e-13 {
			break
		}
	}
	return a, htSSR(pq, dq, r, gp, gs, n, a)
}

// htPowN1 returns b^(n−1) for b ≥ 0 and n ≥ 1 (1 for n = 1).
func htPowN1(b, n float64) float64 {
	switch {
	case n == 1:
		return 1
	case b > 0:
		return math.Exp((n - 1) * math.Log(b))
	}
	return 0
}

// htWeight is the effective-variance weight of a one-ink residual, with
// bn1 = (pq + a·dq)^(n−1).
func htWeight(bn1, a, gp, gs float64) float64 {
	u, v := bn1*(1-a)*gp, bn1*a*gs
	return 1 / (1 + u*u + v*v)
}

// htSSR is the summed weighted squared reflectance residual at coverage a.
func htSSR(pq, dq, r, gp, gs []float64, n, a float64) float64 {
	var s float64
	for j := range pq {
		b := pq[j] + a*dq[j]
		bn1 := htPowN1(b, n)
		e := b*bn1 - r[j]
		s += htWeight(bn1, a, gp[j], gs[j]) * e * e
	}
	return s
}

// htLevels groups ink i's training ramp effective coverages by nominal
// level: the sorted levels, the mean effective coverage and the count of
// each.
func htLevels(fd *htFitData, i int, effs []float64) (levels, means []float64, counts []int) {
	sum := map[float64]float64{}
	cnt := map[float64]int{}
	for t, pi := range fd.ramps[i] {
		a := fd.patches[pi].nom[i]
		sum[a] += effs[t]
		cnt[a]++
	}
	for a := range sum {
		levels = append(levels, a)
	}
	sort.Float64s(levels)
	for _, a := range levels {
		means = append(means, sum[a]/float64(cnt[a]))
		counts = append(counts, cnt[a])
	}
	return levels, means, counts
}

// htLevelPlaces names the patches of ink i at nominal level a.
func htLevelPlaces(fd *htFitData, i int, a float64) string {
	var parts []string
	for _, pi := range fd.ramps[i] {
		if fd.patches[pi].nom[i] == a {
			parts = append(parts, fd.patches[pi].s.where())
		}
	}
	return fmt.Sprintf("%s %g %% (%s)", fd.inks[i], 100*a, strings.Join(parts, "; "))
}

// htPool returns the weighted least-squares non-decreasing fit to v
// (pool-adjacent-violators; Barlow et al., Statistical Inference under
// Order Restrictions, 1972), clamped to [0, 1].
func htPool(v []float64, w []int) []float64 {
	type block struct {
		sum, w float64
		n      int
	}
	var bs []block
	for i, x := range v {
		bs = append(bs, block{sum: x * float64(w[i]), w: float64(w[i]), n: 1})
		for len(bs) > 1 && bs[len(bs)-2].sum/bs[len(bs)-2].w > bs[len(bs)-1].sum/bs[len(bs)-1].w {
			a, b := bs[len(bs)-2], bs[len(bs)-1]
			bs = append(bs[:len(bs)-2], block{sum: a.sum + b.sum, w: a.w + b.w, n: a.n + b.n})
		}
	}
	out := make([]float64, 0, len(v))
	for _, b := range bs {
		for range b.n {
			out = append(out, math.Min(math.Max(b.sum/b.w, 0), 1))
		}
	}
	return out
}

// htCurve returns the dot-gain curve through (0, 0), the levels and (1, 1).
func htCurve(levels, eff []float64) (DotGain, error) {
	nom := append(append([]float64{0}, levels...), 1)
	e := append(append([]float64{0}, eff...), 1)
	return NewDotGain(nom, e)
}

// htBootDraws is the number of simulated noise draws behind the standard
// error of n.
const htBootDraws = 24

// fitN fits one Yule–Nielsen factor to the ramps of the inks listed (and,
// with mixed, the training overprint tints) and returns it, its standard
// error (0 when it cannot be estimated) and whether it sits at the upper
// bound.
//
// The standard error is that of a linearised parametric bootstrap: the
// noise σ̂ is estimated from the weighted residuals, htBootDraws sets of
// Gaussian noise of that size are added to every measurement (tints and
// primaries alike, the primaries' noise shrunk by their replicates), and
// each set moves the minimum by −SSR′(n)/SSR″(n) (one Newton step, the
// derivatives by central differences). The standard deviation of those
// moves is the standard error. The primaries' noise matters: it is shared
// by every tint of an ink, so it does not average out over the ramp.
func (fd *htFitData) fitN(inks []int, mixed bool) (n, se float64, atBound bool) {
	values := 0
	params := 1
	for _, i := range inks {
		values += len(fd.ramps[i]) * fd.g.N
		params += len(fd.ramps[i])
	}
	if mixed {
		values += len(fd.mixed) * fd.g.N
	}
	f := func(n float64) float64 { return fd.objective(inks, mixed, n) }
	n, fmin, atBound := htMinimise1D(f, MinNFactor, MaxNFactor)
	const h = 0.01
	if atBound || values <= params || n-h < MinNFactor {
		return n, 0, atBound
	}
	curv := (f(n+h) - 2*fmin + f(n-h)) / (h * h)
	if !(curv > 0) {
		return n, 0, false
	}
	sigma := math.Sqrt(fmin / float64(values-params))
	rng := rand.New(rand.NewPCG(1, 2))
	var ss float64
	for range htBootDraws {
		q := fd.perturbed(rng, sigma)
		slope := (q.objective(inks, mixed, n+h) - q.objective(inks, mixed, n-h)) / (2 * h)
		d := slope / curv
		ss += d * d
	}
	return n, math.Sqrt(ss / htBootDraws), false
}

// perturbed returns a copy of the data with Gaussian noise sigma added to
// every measured value (sigma/√r to a primary averaged over r replicates).
func (fd *htFitData) perturbed(rng *rand.Rand, sigma float64) *htFitData {
	q := *fd
	q.prim = make([][]float64, len(fd.prim))
	for p, r := range fd.prim {
		q.prim[p] = make([]float64, len(r))
		s := sigma / math.Sqrt(float64(fd.reps[p]))
		for j, v := range r {
			q.prim[p][j] = math.Max(v+s*rng.NormFloat64(), 0)
		}
	}
	q.patches = append([]htPatch(nil), fd.patches...)
	for pi := range q.patches {
		if q.patches[pi].kind == htPrimary {
			continue
		}
		r := make([]float64, len(fd.patches[pi].r))
		for j, v := range fd.patches[pi].r {
			r[j] = v + sigma*rng.NormFloat64()
		}
		q.patches[pi].r = r
	}
	return &q
}

// objective returns the summed squared reflectance residuals at factor n
// of the listed inks' ramps and, with mixed, of the training overprint
// tints predicted through the ramps' dot-gain curves.
func (fd *htFitData) objective(inks []int, mixed bool, n float64) float64 {
	k := len(fd.inks)
	var ssr float64
	gains := make([]DotGain, k)
	for _, i := range inks {
		effs, e := fd.rampEffective(i, n)
		ssr += e
		if !mixed {
			continue
		}
		levels, means, counts := htLevels(fd, i, effs)
		d, err := htCurve(levels, htPool(means, counts))
		if err != nil {
			return math.Inf(1)
		}
		gains[i] = d
	}
	if !mixed || len(fd.mixed) == 0 {
		return ssr
	}
	m := &Halftone{grid: fd.g, inks: fd.inks, prim: fd.prim, n: []float64{n}, gain: gains}
	if err := m.setup(); err != nil {
		return math.Inf(1)
	}
	// Effective-variance weights as for the ramps (see htEffective): the
	// residual's variance is σ²·(1 + Σ_p (∂R/∂R_p)²) with
	// ∂R/∂R_p = M^(n−1)·w_p·R_p^(1/n − 1), M the Demichel sum.
	g := make([][]float64, len(fd.prim))
	for p, r := range fd.prim {
		g[p] = htSens(r, fd.reps[p], n)
	}
	eff, w := make([]float64, k), make([]float64, len(fd.prim))
	for _, pi := range fd.mixed {
		p := fd.patches[pi]
		m.EffectiveTo(eff, p.nom)
		DemichelTo(w, eff)
		for j := range fd.g.N {
			var s float64
			for q := range m.q {
				s += w[q] * m.q[q][j]
			}
			sn1 := htPowN1(s, n)
			var v float64
			for q := range g {
				x := sn1 * w[q] * g[q][j]
				v += x * x
			}
			e := s*sn1 - p.r[j]
			ssr += e * e / (1 + v)
		}
	}
	return ssr
}

// htMinimise1D minimises f over [lo, hi]: a scan at steps of 0.25, then a
// golden-section search around the best point to 1e-6. atBound reports a
// minimum at the upper end of the range.
func htMinimise1D(f func(float64) float64, lo, hi float64) (x, fx float64, atBound bool) {
	const step = 0.25
	steps := int(math.Round((hi - lo) / step))
	best, bestF := lo, math.Inf(1)
	bi := 0
	for s := 0; s <= steps; s++ {
		x := lo + float64(s)*(hi-lo)/float64(steps)
		if v := f(x); v < bestF {
			best, bestF, bi = x, v, s
		}
	}
	a := lo + float64(max(bi-1, 0))*(hi-lo)/float64(steps)
	b := lo + float64(min(bi+1, steps))*(hi-lo)/float64(steps)
	gr := (math.Sqrt(5) - 1) / 2
	c, d := b-gr*(b-a), a+gr*(b-a)
	fc, fd := f(c), f(d)
	for b-a > 1e-6 {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - gr*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + gr*(b-a)
			fd = f(d)
		}
	}
	x = 0.5 * (a + b)
	fx = f(x)
	if bestF < fx {
		x, fx = best, bestF
	}
	// A minimum within 1e-3 of an end is reported at the end itself. Only
	// the upper end is flagged: n = 1 (no optical dot gain) is a physical
	// case, n at the upper end a symptom.
	switch {
	case x-lo < 1e-3:
		x, fx = lo, f(lo)
	case hi-x < 1e-3:
		x, fx, atBound = hi, f(hi), true
	}
	return x, fx, atBound
}
