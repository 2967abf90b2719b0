package complement_test

import (
	"errors"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// testIlluminants returns A, D65, FL11 and LED-B1 with their names.
func testIlluminants(t *testing.T) []colorimetry.NamedIlluminant {
	t.Helper()
	led, err := cie.LED("LED-B1")
	if err != nil {
		t.Fatal(err)
	}
	return []colorimetry.NamedIlluminant{
		{Name: "D65", Spectrum: cie.D65()}, {Name: "A", Spectrum: cie.A()},
		{Name: "FL11", Spectrum: fluorescent(t, 11)}, {Name: "LED-B1", Spectrum: led},
	}
}

var bothObservers = []*colorimetry.Observer{cie.CIE1931(), cie.CIE1964()}

// TestRobustness checks that a spectral complement (a band and its
// band-stop complement: r + (1 − r) = 1 exactly) holds under every
// illuminant and observer, and that a metameric complement made for D65 and
// the CIE 1931 observer holds there and breaks elsewhere. Failure of a
// metameric match when the illuminant or observer changes is the defining
// property of metamerism (CIE 015:2018, metamerism indices); the size of
// the break for these spectra is not from a source, so the test asks only
// that it exceed the 0.001 tolerance. Each outcome must equal the direct
// check under those conditions (tol 0: the same computation).
func TestRobustness(t *testing.T) {
	t.Parallel()
	ills := testIlluminants(t)

	r := band(t, colorimetry.Grid5nm, 470, 560)
	d, err := complement.ReflectanceComplement(r)
	if err != nil {
		t.Fatal(err)
	}
	out, err := complement.Robustness(r, d.Spectrum, complement.Surfaces, ills, bothObservers, complement.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(out) != len(ills)*len(bothObservers) {
		t.Fatalf("%d outcomes, want %d", len(out), len(ills)*len(bothObservers))
	}
	for k, o := range out {
		if o.Illuminant != ills[k/2].Name || o.Observer != bothObservers[k%2].Name() {
			t.Errorf("outcome %d is for %s, %s", k, o.Illuminant, o.Observer)
		}
		if o.Verdict != complement.Spectral || o.DeltaUVPrime == nil || *o.DeltaUVPrime > 1e-12 || o.StackY != nil {
			t.Errorf("band complement under %s, %s: %+v", o.Illuminant, o.Observer, o)
		}
	}

	c := conditions(t, cie.CIE1931(), cie.D65())
	for _, m := range []complement.Mode{complement.Lights, complement.Surfaces} {
		a, b := metamericPair(t, c, m, 1)
		out, err := complement.Robustness(a, b, m, ills, bothObservers, complement.Options{})
		if err != nil {
			t.Fatal(err)
		}
		for k, o := range out {
			design := o.Illuminant == "D65" && o.Observer == cie.NameCIE1931
			if design && o.Verdict != complement.Metameric || !design && (o.Verdict != complement.None || *o.DeltaUVPrime <= 0.001) {
				t.Errorf("%v metameric pair under %s, %s: %s, Δu′v′ %g", m, o.Illuminant, o.Observer, o.Verdict, *o.DeltaUVPrime)
			}
			cc := conditions(t, bothObservers[k%2], ills[k/2].Spectrum)
			direct, err := cc.CheckAdditive(a, b, m, complement.Options{})
			if err != nil {
				t.Fatal(err)
			}
			if direct.Verdict != o.Verdict || !scalar.EqualWithinAbsOrRel(direct.DeltaUVPrime, *o.DeltaUVPrime, 0, 0) {
				t.Errorf("%v under %s, %s: outcome %+v, direct check %+v", m, o.Illuminant, o.Observer, o, direct)
			}
		}
	}

	// Filters: crossed edges stay black under every light.
	g := colorimetry.Grid5nm
	out, err = complement.Robustness(logistic(t, g, 610, 6, 0, 1), logistic(t, g, 490, -6, 0, 1), complement.Filters, ills, bothObservers, complement.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range out {
		if o.Verdict != complement.Black || o.StackY == nil || *o.StackY > 1 {
			t.Errorf("crossed filters under %s, %s: %+v", o.Illuminant, o.Observer, o)
		}
	}
}

// TestRobustnessErrors checks the errors of Robustness.
func TestRobustnessErrors(t *testing.T) {
	t.Parallel()
	g := colorimetry.Grid5nm
	a, b := logistic(t, g, 560, 10, 0, 1), logistic(t, g, 560, -10, 0, 1)
	ills := testIlluminants(t)
	if _, err := complement.Robustness(a, b, complement.Surfaces, nil, bothObservers, complement.Options{}); err == nil {
		t.Error("no illuminants: no error")
	}
	if _, err := complement.Robustness(a, b, complement.Surfaces, ills, []*colorimetry.Observer{nil}, complement.Options{}); err == nil {
		t.Error("nil observer: no error")
	}
	bad := []colorimetry.NamedIlluminant{{Name: "dark", Spectrum: onGrid(t, g, func(float64) float64 { return 0 })}}
	if _, err := complement.Robustness(a, b, complement.Surfaces, bad, bothObservers, complement.Options{}); !errors.Is(err, complement.ErrBlack) {
		t.Errorf("dark illuminant: got %v, want ErrBlack", err)
	}
	if _, err := complement.Robustness(a, b, complement.Mode(7), ills, bothObservers, complement.Options{}); !errors.Is(err, complement.ErrMode) {
		t.Errorf("unknown mode: got %v, want ErrMode", err)
	}
}
