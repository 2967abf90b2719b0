package mixing

import (
	"fmt"
	"math"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/interp"
)

// GreyBalanceSettings control Halftone.GreyBalance. The zero value gives
// 11 absolute neutrals of the inks c, m, y under D50 and the CIE 1931
// observer, within the model's total area coverage limit.
type GreyBalanceSettings struct {
	// Scorer gives the illuminant and observer; nil means D50 and the CIE
	// 1931 2° observer (ISO 3664, ISO 13655; from memory).
	Scorer *Scorer
	// Inks names the three inks that make the grey; nil means c, m and
	// y, or the model's inks when it has exactly three. Other inks stay
	// at 0.
	Inks []string
	// Steps is the number of rows of the table, from the paper's L* down
	// to the darkest neutral (at least 2); 0 means 11.
	Steps int
	// Relative aims at the paper-relative neutral (see GreyBalance)
	// instead of a* = b* = 0.
	Relative bool
	// TAC is the total area coverage limit in percent; 0 means the
	// model's own limit, or none.
	TAC float64
	// Tolerance is the ΔE00 up to which a neutral counts as reached; 0
	// means DefaultHalftoneTolerance.
	Tolerance float64
}

// GreyStep is one row of a grey balance: the neutral aimed at, the
// nominal coverages that print closest to it, and what they print.
type GreyStep struct {
	// Target is the neutral aimed at (CIELAB under the illuminant).
	Target colorimetry.Lab
	// Coverages are the nominal coverages (0–1) of the grey's inks, in
	// the order of GreyBalance.Inks.
	Coverages []Amount
	// Lab is what the coverages print; DE00 its difference from the aim,
	// Reachable whether that is within the tolerance.
	Lab       colorimetry.Lab
	DE00      float64
	Reachable bool
	// TACPercent is the sum of the coverages, percent.
	TACPercent float64
}

// GreyBalance is the grey balance of a press: for neutrals from the
// paper's lightness down to the darkest neutral the three inks can print,
// the nominal coverages that print them. The table is Steps; At reads the
// curve between its rows.
//
// Absolute neutrals have a* = b* = 0. Relative neutrals follow the paper:
// their a*, b* are the paper's, fading linearly with the lightness to 0 at
// the lightness of the solid overprint of the three inks,
//
//	a*(L*) = a*_paper·(1 − (L*_paper − L*)/(L*_paper − L*_black)),
//
// and likewise b* (clamped to the paper's value above L*_paper and to 0
// below L*_black). This follows the paper-relative grey used by the
// printing trade's grey-balance calibrations; the printing standards
// (ISO 12647-2:2013, ISO/TS 10128:2009) deal with near-neutral greys, but
// the formula here is written from memory, not read from them. L*_black is
// taken here as the overprint of the three solids.
type GreyBalance struct {
	// Inks are the grey's three inks.
	Inks []string
	// Relative reports a paper-relative aim.
	Relative bool
	Paper    colorimetry.Lab // the paper under the illuminant
	Black    colorimetry.Lab // the solid overprint of the three inks
	// DarkestL is the L* of the darkest neutral reached within the
	// tolerance, 0 when none is.
	DarkestL float64
	// TACLimit is the total area coverage limit applied, percent (0 for
	// none).
	TACLimit float64
	// Tolerance is the ΔE00 within which a neutral counts as reached.
	Tolerance float64
	// Steps is the table, from the paper's L* down to DarkestL.
	Steps []GreyStep
	// Illuminant and Observer name the viewing condition.
	Illuminant string
	Observer   string
	// Warnings are cautions about the result.
	Warnings []string

	curves []*interp.FritschButland // per ink, coverage against L* (ascending)
	lo, hi float64                  // the curve's L* range
}

// At returns the nominal coverages (0–1, in the order of Inks) of the
// neutral at lightness L*, read from the curve through the table's rows
// (a monotone piecewise cubic, Fritsch–Butland, in L*). It returns an
// error for an L* outside the table's range.
func (g GreyBalance) At(L float64) ([]Amount, error) {
	if len(g.curves) == 0 {
		return nil, fmt.Errorf("grey balance: no curve (the table has fewer than two rows)")
	}
	if !htFinite(L) || L < g.lo-1e-9 || L > g.hi+1e-9 {
		return nil, fmt.Errorf("grey balance: L* %v is outside the table's range %.4g–%.4g", L, g.lo, g.hi)
	}
	out := make([]Amount, len(g.Inks))
	for i, c := range g.curves {
		out[i] = Amount{Name: g.Inks[i], Value: math.Min(math.Max(c.Predict(L), 0), 1)}
	}
	return out, nil
}

// greyInks resolves the inks of a grey balance.
func (m *Halftone) greyInks(names []string) ([]int, error) {
	if names == nil {
		switch {
		case m.index("c") >= 0 && m.index("m") >= 0 && m.index("y") >= 0:
			names = []string{"c", "m", "y"}
		case len(m.inks) == 3:
			names = m.inks
		default:
			return nil, fmt.Errorf("grey balance: name the three inks of the grey (the model's inks are %s)", strings.Join(m.inks, ", "))
		}
	}
	if len(names) != 3 {
		return nil, fmt.Errorf("grey balance: %d inks named; a grey balance takes three", len(names))
	}
	var idx []int
	for _, n := range names {
		i := m.index(n)
		if i < 0 {
			return nil, fmt.Errorf("grey balance: %w: %q (inks: %s)", ErrUnknownInk, n, strings.Join(m.inks, ", "))
		}
		for _, j := range idx {
			if j == i {
				return nil, fmt.Errorf("grey balance: ink %q named twice", n)
			}
		}
		idx = append(idx, i)
	}
	return idx, nil
}

// GreyBalance returns the grey balance of three of the model's inks: the
// nominal coverages that print neutral greys from the paper's L* down to
// the darkest neutral they reach within the tolerance, in Steps rows
// evenly spaced in L*. Each row is a colour match (see SolveLab) of the
// neutral aim at that L*, the other inks at 0, within the total area
// coverage limit. The darkest neutral is found by a scan from the paper
// down to the three-ink overprint at steps of at most 4 L* and a
// bisection to 0.05 L*.
//
// With an absolute aim the lightest rows may not be reachable: a tinted
// paper cannot be made neutral without darkening it. Rows that miss their
// aim are kept, with Reachable false. Errors: settings out of range and
// non-convergence of a colour match (*ConvergenceError).
func (m *Halftone) GreyBalance(set GreyBalanceSettings) (GreyBalance, error) {
	idx, err := m.greyInks(set.Inks)
	if err != nil {
		return GreyBalance{}, err
	}
	steps := set.Steps
	if steps == 0 {
		steps = 11
	}
	if steps < 2 || steps > 1000 {
		return GreyBalance{}, fmt.Errorf("grey balance: %d steps (want 2 to 1000)", steps)
	}
	scorer := set.Scorer
	if scorer == nil {
		scorer = NewScorer(cie.CIE1931(), cie.D50(), "D50")
	}
	var fixed []Amount
	for i, n := range m.inks {
		if i != idx[0] && i != idx[1] && i != idx[2] {
			fixed = append(fixed, Amount{Name: n, Value: 0})
		}
	}
	pr, _, err := m.newProblem(HalftoneSolveSettings{Scorer: scorer, TAC: set.TAC, Fixed: fixed, Tolerance: set.Tolerance})
	if err != nil {
		return GreyBalance{}, fmt.Errorf("grey balance: %w", err)
	}
	gb := GreyBalance{Relative: set.Relative, TACLimit: pr.limit, Tolerance: pr.tol, Illuminant: scorer.Illuminant(),
		Observer: scorer.Observer(), Warnings: []string{}}
	for _, i := range idx {
		gb.Inks = append(gb.Inks, m.inks[i])
	}
	gb.Paper = pr.ew.lab(m.prim[0])
	gb.Black = pr.ew.lab(m.prim[1<<idx[0]|1<<idx[1]|1<<idx[2]])
	if !(gb.Paper.L-gb.Black.L > 1) {
		return GreyBalance{}, fmt.Errorf("grey balance: the overprint of %s (L* %.2f) is not darker than the paper (L* %.2f)", strings.Join(gb.Inks, "+"), gb.Black.L, gb.Paper.L)
	}
	aim := func(L float64) colorimetry.Lab {
		if !set.Relative {
			return colorimetry.Lab{L: L}
		}
		f := math.Min(math.Max((gb.Paper.L-L)/(gb.Paper.L-gb.Black.L), 0), 1)
		return colorimetry.Lab{L: L, A: gb.Paper.A * (1 - f), B: gb.Paper.B * (1 - f)}
	}

	// Solves remember their results so neighbours start from them.
	type solved struct {
		L  float64
		x  []float64
		de float64
	}
	var done []solved
	solveAt := func(L float64) (solved, error) {
		pr.labT = aim(L)
		var extra [][]float64
		levels := 0
		if len(done) > 0 {
			// The nearest solved lightness as a start, and a coarser grid.
			near := done[0]
			for _, d := range done {
				if math.Abs(d.L-L) < math.Abs(near.L-L) {
					near = d
				}
			}
			extra, levels = [][]float64{near.x}, 6
		}
		x, de, err := pr.solve(extra, levels)
		if err != nil {
			return solved{}, err
		}
		s := solved{L: L, x: x, de: de}
		done = append(done, s)
		return s, nil
	}

	// The darkest reachable neutral: scan, then bisect.
	span := gb.Paper.L - gb.Black.L
	nScan := max(int(math.Ceil(span/4)), 2)
	lastOK, firstBad := math.NaN(), math.NaN()
	for s := 0; s <= nScan; s++ {
		L := gb.Paper.L - span*float64(s)/float64(nScan)
		r, err := solveAt(L)
		if err != nil {
			return GreyBalance{}, fmt.Errorf("grey balance at L* %.2f: %w", L, err)
		}
		if r.de <= pr.tol {
			lastOK, firstBad = L, math.NaN()
		} else if !math.IsNaN(lastOK) && math.IsNaN(firstBad) {
			firstBad = L
		}
	}
	switch {
	case math.IsNaN(lastOK):
		gb.Warnings = append(gb.Warnings, fmt.Sprintf("no neutral within ΔE00 %.2g is printable with %s between the paper and their overprint", pr.tol, strings.Join(gb.Inks, ", ")))
	case !math.IsNaN(firstBad):
		lo, hi := firstBad, lastOK
		for hi-lo > 0.05 {
			mid := 0.5 * (lo + hi)
			r, err := solveAt(mid)
			if err != nil {
				return GreyBalance{}, fmt.Errorf("grey balance at L* %.2f: %w", mid, err)
			}
			if r.de <= pr.tol {
				hi = mid
			} else {
				lo = mid
			}
		}
		gb.DarkestL = hi
	default:
		gb.DarkestL = lastOK
	}
	end := gb.DarkestL
	if gb.Paper.L-end < 1 {
		// No neutral darker than the paper itself: show the whole range.
		end = gb.Black.L
	}

	// The table.
	for s := range steps {
		L := gb.Paper.L - (gb.Paper.L-end)*float64(s)/float64(steps-1)
		r, err := solveAt(L)
		if err != nil {
			return GreyBalance{}, fmt.Errorf("grey balance at L* %.2f: %w", L, err)
		}
		rec := pr.recipe(r.x, r.de, "least ink")
		st := GreyStep{Target: aim(L), DE00: r.de, Reachable: r.de <= pr.tol, TACPercent: rec.Extra["tac_percent"].(float64),
			Lab: colorimetry.Lab{L: rec.Extra["L"].(float64), A: rec.Extra["a"].(float64), B: rec.Extra["b"].(float64)}}
		for _, i := range idx {
			st.Coverages = append(st.Coverages, Amount{Name: m.inks[i], Value: rec.Amounts[i].Value})
		}
		gb.Steps = append(gb.Steps, st)
	}
	unreached := 0
	for _, st := range gb.Steps {
		if !st.Reachable {
			unreached++
		}
	}
	if unreached > 0 && gb.DarkestL != 0 {
		gb.Warnings = append(gb.Warnings, fmt.Sprintf("%d of %d rows miss their aim by more than ΔE00 %.2g (near the paper a tinted paper cannot be neutralised without darkening it)", unreached, steps, pr.tol))
	}

	// The curve: coverage against ascending L*.
	n := len(gb.Steps)
	xs := make([]float64, n)
	for s := range n {
		xs[s] = gb.Steps[n-1-s].Target.L
	}
	gb.lo, gb.hi = xs[0], xs[n-1]
	for c := range gb.Inks {
		ys := make([]float64, n)
		for s := range n {
			ys[s] = gb.Steps[n-1-s].Coverages[c].Value
		}
		fb := &interp.FritschButland{}
		if err := fb.Fit(xs, ys); err != nil {
			return GreyBalance{}, fmt.Errorf("grey balance curve: %w", err)
		}
		gb.curves = append(gb.curves, fb)
	}
	return gb, nil
}
