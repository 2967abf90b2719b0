package complement_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// randomFilter returns a smooth random transmittance on g (a logistic edge
// at a random wavelength, rising or falling, with random floor and
// ceiling), drawn from rng: synthetic data for searches and benchmarks.
func randomFilter(rng *rand.Rand, g colorimetry.Grid, dst []float64) {
	edge := 400 + 300*rng.Float64()
	width := 5 + 40*rng.Float64()
	if rng.IntN(2) == 0 {
		width = -width
	}
	lo, hi := 0.2*rng.Float64(), 0.6+0.4*rng.Float64()
	for i := range dst {
		dst[i] = lo + (hi-lo)/(1+math.Exp(-(g.Wavelength(i)-edge)/width))
	}
}

// partnerLibrary returns a library on c's grid: the spectral complement
// 1 − target, a metameric partner of target at ratio 1.5 (for the mode),
// a black entry, and 40 random filters.
func partnerLibrary(t *testing.T, c *complement.Conditions, m complement.Mode, target colorimetry.Spectrum) (*complement.Library, []colorimetry.Spectrum) {
	t.Helper()
	g := c.Grid()
	d, err := complement.ReflectanceComplement(target)
	if err != nil {
		t.Fatal(err)
	}
	_, meta := metamericPair(t, c, m, 1.5)
	spectra := []colorimetry.Spectrum{d.Spectrum, meta, onGrid(t, g, func(float64) float64 { return 0 })}
	names := []string{"complement", "metameric", "black"}
	rng := rand.New(rand.NewPCG(1, 1))
	for range 40 {
		v := make([]float64, g.N)
		randomFilter(rng, g, v)
		s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
		if err != nil {
			t.Fatal(err)
		}
		spectra = append(spectra, s)
		names = append(names, "random")
	}
	lib, err := c.NewLibrary(names, spectra)
	if err != nil {
		t.Fatal(err)
	}
	return lib, spectra
}

// TestPartnersAdditive checks the fast additive search against the
// reference path, candidate by candidate (fast versus reference): Δu′v′,
// line distance and luminance ratio against MixRatio (tol 1e-9 relative:
// round-off of different summation orders), verdict and spectral residual
// against CheckAdditive of target + t·candidate (tol 1e-6 absolute for the
// residual: the search takes it as ‖m‖² − ⟨m, w⟩²/‖w‖², which loses half
// the digits near zero). The spectral complement must rank first.
func TestPartnersAdditive(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	for _, m := range []complement.Mode{complement.Lights, complement.Surfaces} {
		target := gaussians(t, g, []float64{450, 545, 605}, []float64{12, 15, 12}, []float64{0.1, 0.6, 0.8})
		lib, spectra := partnerLibrary(t, c, m, target)
		ps, err := lib.Partners(target, m, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		if len(ps) != lib.Len() {
			t.Fatalf("%v: %d partners for %d entries", m, len(ps), lib.Len())
		}
		if m == complement.Surfaces && (ps[0].Name != "complement" || ps[0].Verdict != complement.Spectral) {
			t.Errorf("%v: first partner %+v, want the spectral complement", m, ps[0])
		}
		seen := make(map[int]bool)
		for k, p := range ps {
			seen[p.Index] = true
			if p.StackY != nil || p.StackChroma != nil || p.DeltaUVPrime == nil || p.SpectralRMS == nil {
				t.Errorf("%v: %+v: wrong fields set", m, p)
				continue
			}
			if k > 0 {
				q := ps[k-1]
				if rank(q.Verdict) > rank(p.Verdict) || rank(q.Verdict) == rank(p.Verdict) && *q.DeltaUVPrime > *p.DeltaUVPrime {
					t.Errorf("%v: %+v ranked after %+v", m, p, q)
				}
			}
			cand := spectra[p.Index]
			if p.Name != lib.Name(p.Index) {
				t.Errorf("%v: name %q for entry %d", m, p.Name, p.Index)
			}
			if p.Name == "metameric" && (p.Verdict != complement.Metameric || *p.DeltaUVPrime > 1e-12) {
				t.Errorf("%v: the metameric partner at ratio 1.5 gave %+v (Δu′v′ %g)", m, p, *p.DeltaUVPrime)
			}
			if p.Name == "black" {
				if p.LineDistanceUVPrime != nil || p.Verdict != complement.None {
					t.Errorf("%v: black candidate %+v", m, p)
				}
				continue
			}
			r, err := c.MixRatio(target, cand, m)
			if err != nil {
				t.Fatal(err)
			}
			if !scalar.EqualWithinAbsOrRel(*p.DeltaUVPrime, r.DeltaUVPrime, 1e-13, 1e-9) ||
				!scalar.EqualWithinAbsOrRel(*p.LineDistanceUVPrime, r.LineDistanceUVPrime, 1e-13, 1e-9) ||
				(p.RatioLuminance == nil) != (r.RatioLuminance == nil) ||
				p.RatioLuminance != nil && !scalar.EqualWithinAbsOrRel(*p.RatioLuminance, *r.RatioLuminance, 1e-13, 1e-9) {
				t.Errorf("%v, entry %d: search %+v, MixRatio %+v", m, p.Index, p, r)
				continue
			}
			if r.Weight == nil || *r.Weight == 0 {
				if p.Verdict != complement.None && r.DeltaUVPrime > complement.DefaultDeltaUVPrime {
					t.Errorf("%v, entry %d: verdict %s at an end of the segment", m, p.Index, p.Verdict)
				}
				continue
			}
			a, err := c.CheckAdditive(target, cand.Scale(*r.Weight), m, complement.Options{})
			if err != nil {
				t.Fatal(err)
			}
			if a.Verdict != p.Verdict || !scalar.EqualWithinAbsOrRel(*p.SpectralRMS, a.SpectralRMS, 1e-6, 1e-9) {
				t.Errorf("%v, entry %d: search %s, RMS %g; check %s, RMS %g", m, p.Index, p.Verdict, *p.SpectralRMS, a.Verdict, a.SpectralRMS)
			}
		}
		if len(seen) != lib.Len() {
			t.Errorf("%v: %d distinct entries ranked, want %d", m, len(seen), lib.Len())
		}
	}
}

func rank(v complement.Verdict) int {
	switch v {
	case complement.Spectral, complement.Black:
		return 0
	case complement.Metameric, complement.Neutral:
		return 1
	}
	return 2
}

// TestPartnersSubtractive checks the fast subtractive search (one weighting
// table for illuminant × target × observer) against CheckSubtractive,
// candidate by candidate (fast versus reference; tol 1e-9 relative,
// round-off), with and without a Beer–Lambert factor on the target, and the
// ranking by verdict, then stack Y.
func TestPartnersSubtractive(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1964(), fluorescent(t, 11))
	g := c.Grid()
	target := logistic(t, g, 560, 10, 0.01, 0.9)
	lib, spectra := partnerLibrary(t, c, complement.Surfaces, target)
	for _, f := range []float64{0, 1.5} {
		opt := complement.Options{FactorA: f}
		ps, err := lib.Partners(target, complement.Filters, opt)
		if err != nil {
			t.Fatal(err)
		}
		for k, p := range ps {
			if p.StackY == nil || p.StackChroma == nil || p.LineDistanceUVPrime != nil || p.SpectralRMS != nil || p.RatioLuminance != nil {
				t.Errorf("factor %g: %+v: wrong fields set", f, p)
				continue
			}
			if k > 0 {
				q := ps[k-1]
				if rank(q.Verdict) > rank(p.Verdict) || rank(q.Verdict) == rank(p.Verdict) && *q.StackY > *p.StackY {
					t.Errorf("factor %g: %+v ranked after %+v", f, p, q)
				}
			}
			r, err := c.CheckSubtractive(target, spectra[p.Index], opt)
			if p.Name == "black" {
				if !errors.Is(err, complement.ErrBlack) || *p.StackY != 0 || p.Verdict != complement.Black || p.DeltaUVPrime != nil {
					t.Errorf("factor %g: black entry %+v", f, p)
				}
				continue
			}
			if err != nil {
				t.Fatal(err)
			}
			if r.Verdict != p.Verdict || !scalar.EqualWithinAbsOrRel(*p.StackY, r.StackY, 1e-13, 1e-9) ||
				!scalar.EqualWithinAbsOrRel(*p.StackChroma, r.StackChroma, 1e-11, 1e-9) ||
				!scalar.EqualWithinAbsOrRel(*p.DeltaUVPrime, *r.DeltaUVPrime, 1e-13, 1e-9) {
				t.Errorf("factor %g, entry %d: search %+v (Y %g, C %g); check %+v", f, p.Index, p, *p.StackY, *p.StackChroma, r)
			}
		}
		if ps[0].Name != "black" {
			t.Errorf("factor %g: first partner %+v, want the black entry", f, ps[0])
		}
	}
}

// TestPartnersErrors checks bad libraries and searches.
func TestPartnersErrors(t *testing.T) {
	t.Parallel()
	c := conditions(t, cie.CIE1931(), cie.D65())
	g := c.Grid()
	good := logistic(t, g, 560, 10, 0.01, 0.9)
	bad := logistic(t, g, 560, 10, -0.2, 0.9)
	lib, err := c.NewLibrary([]string{"good", "bad"}, []colorimetry.Spectrum{good, bad})
	if err != nil {
		t.Fatal(err)
	}
	_, err = lib.Partners(good, complement.Filters, complement.Options{})
	var ie *complement.InputError
	if !errors.Is(err, colorimetry.ErrNegative) || !errors.As(err, &ie) || ie.Input != `library entry 2 ("bad")` {
		t.Errorf("negative entry: got %v", err)
	}
	if _, err := lib.Partners(good, complement.Filters, complement.Options{FactorB: 2}); !errors.Is(err, complement.ErrOptions) {
		t.Errorf("FactorB 2: got %v, want ErrOptions", err)
	}
	if _, err := lib.Partners(colorimetry.Spectrum{}, complement.Surfaces, complement.Options{}); !errors.As(err, &ie) || ie.Input != "target" {
		t.Errorf("empty target: got %v", err)
	}
	if _, err := c.NewLibraryOnGrid(nil, make([]float64, g.N+1)); err == nil {
		t.Error("values not a whole number of spectra: no error")
	}
	v := make([]float64, 2*g.N)
	v[g.N+3] = math.NaN()
	if _, err := c.NewLibraryOnGrid(nil, v); !errors.Is(err, colorimetry.ErrNotFinite) || !errors.As(err, &ie) || ie.Input != "library entry 2" {
		t.Errorf("NaN value: got %v", err)
	}
	if _, err := c.NewLibrary([]string{"one"}, []colorimetry.Spectrum{good, good}); err == nil {
		t.Error("names and spectra differ in number: no error")
	}
}

var sinkPartners []complement.Partner

// benchmarkPartner times one search of a synthetic library of n random
// filters on 380–780 nm at 5 nm (81 samples) in mode m.
func benchmarkPartner(b *testing.B, m complement.Mode, n int) {
	c, err := complement.NewConditionsOnGrid(cie.CIE1931(), cie.D65(), colorimetry.Grid5nm)
	if err != nil {
		b.Fatal(err)
	}
	g := c.Grid()
	rng := rand.New(rand.NewPCG(1, 1))
	values := make([]float64, n*g.N)
	for j := range n {
		randomFilter(rng, g, values[j*g.N:(j+1)*g.N])
	}
	lib, err := c.NewLibraryOnGrid(nil, values)
	if err != nil {
		b.Fatal(err)
	}
	tv := make([]float64, g.N)
	randomFilter(rng, g, tv)
	target, err := colorimetry.NewSpectrumOnGrid(g, tv, colorimetry.Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		sinkPartners, err = lib.Partners(target, m, complement.Options{})
		if err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/candidate")
}

// BenchmarkPartner times a search of 100 000 candidates in each mode.
func BenchmarkPartner(b *testing.B) {
	for _, m := range []complement.Mode{complement.Lights, complement.Surfaces, complement.Filters} {
		b.Run(m.String(), func(b *testing.B) { benchmarkPartner(b, m, 100000) })
	}
}
