package colorimetry_test

import (
	"errors"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"gonum.org/v1/gonum/floats/scalar"
)

// photopic and scotopic are the CIE luminous efficiency functions with
// their maximum efficacies (CIE 018:2019).
var (
	photopic = colorimetry.Efficiency{V: cie.PhotopicV(), K: colorimetry.Km}
	scotopic = colorimetry.Efficiency{V: cie.ScotopicV(), K: cie.KmScotopic}
)

// line returns a spectrum on a 1 nm grid that is zero except for power p
// (per nm) at nm.
func line(t *testing.T, nm, p float64) colorimetry.Spectrum {
	t.Helper()
	g := colorimetry.Grid{Start: nm - 10, Step: 1, N: 21}
	v := make([]float64, g.N)
	v[10] = p
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{Interp: colorimetry.InterpLinear, Extrap: colorimetry.ExtrapZero})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestEfficacyOfLines(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name string
		nm   float64
		e    colorimetry.Efficiency
		want float64
		tol  float64
	}{
		// CIE 018:2019: V(555 nm) = 1 (Table 1) and Km = 683.002 lm/W, so a
		// line at 555 nm has the maximum efficacy. The tolerance is float
		// round-off.
		{"photopic 555 nm", 555, photopic, 683.002, 1e-9},
		// CIE 018:2019: V′(λ) peaks at 507 nm, V′(507 nm) = 1 (Table 2),
		// K′m = 1700.06 lm/W (from memory; confirmed as 683/V′(555.016 nm)
		// in shared/reference PROVENANCE Checks A1).
		{"scotopic 507 nm", 507, scotopic, 1700.06, 1e-9},
		// CIE 018:2019 Table 1: V(650 nm) = 0.107 (from memory; the 1 nm
		// table prints 0.107000), so 683.002 · 0.107 lm/W.
		{"photopic 650 nm", 650, photopic, 683.002 * 0.107, 1e-9},
	} {
		got, err := colorimetry.EfficacyOfRadiation(line(t, c.nm, 2.5), c.e)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if !scalar.EqualWithinAbsOrRel(got, c.want, c.tol, c.tol) {
			t.Errorf("%s: efficacy %.9g lm/W, want %.9g", c.name, got, c.want)
		}
	}
}

func TestScotopicPeak(t *testing.T) {
	t.Parallel()
	// CIE 018:2019 Table 2: V′ = 1 at 506, 507 and 508 nm on the 1 nm
	// table (printed to three decimals there); the peak is 507 nm, the
	// middle of the plateau (shared/reference PROVENANCE Checks A1).
	v := cie.ScotopicV()
	peak, _ := v.Max()
	if peak != 1 || v.At(507) != 1 || v.At(505) >= 1 || v.At(509) >= 1 {
		t.Errorf("V′: peak %g, V′(505) %g, V′(507) %g, V′(509) %g; want the plateau 1 at 506–508 nm", peak, v.At(505), v.At(507), v.At(509))
	}
}

func TestAbsolutePhotometry(t *testing.T) {
	t.Parallel()
	// Radiometric input gives absolute photometric quantities (CIE 018:2019
	// definition of Km): 2 W·m⁻²·nm⁻¹ in a 1 nm line at 555 nm is an
	// irradiance of 2 W/m² and an illuminance of 2·683.002 lx.
	s := line(t, 555, 2)
	e, err := colorimetry.Radiant(s)
	if err != nil || e != 2 {
		t.Errorf("irradiance %g W/m² (%v), want 2", e, err)
	}
	ev, err := photopic.Integral(s)
	if err != nil || !scalar.EqualWithinAbsOrRel(ev, 2*683.002, 1e-9, 1e-12) {
		t.Errorf("illuminance %g lx (%v), want %g", ev, err, 2*683.002)
	}
}

func TestSPRatio(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name string
		s    colorimetry.Spectrum
		want float64
		tol  float64
	}{
		// shared/reference PROVENANCE Checks A1: S/P computed from the CIE
		// tables at 1 nm over 380–780 nm, A 1.4123 and D65 2.4646; the
		// literature gives about 1.4 for incandescent light and 2.5 for
		// daylight (from memory). Here the photopic sum runs over 360–830
		// nm; the tolerance is half a unit of the printed fourth decimal.
		{"A", cie.A(), 1.4123, 5e-5},
		{"D65", cie.D65(), 2.4646, 5e-5},
	} {
		got, err := colorimetry.SPRatio(c.s, photopic, scotopic)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if !scalar.EqualWithinAbs(got, c.want, c.tol) {
			t.Errorf("%s: S/P %.5f, want %.4f", c.name, got, c.want)
		}
	}
}

func TestAlphaOpicD65(t *testing.T) {
	t.Parallel()
	d65 := cie.D65()
	for _, c := range []struct {
		a cie.AlphaOpic
		// K_α,v^D65 in mW/lm, CIE S 026/E:2018 (recalled from memory and
		// reproduced from the CIE tables in shared/reference PROVENANCE
		// Checks A3b); tolerance half a unit of the fourth decimal.
		k float64
		// The α-opic DER of illuminant A, computed from the CIE tables in
		// PROVENANCE Checks A3b (for information there, not published);
		// tolerance half a unit of the fourth decimal.
		derA float64
	}{
		{cie.SCone, 0.8173, 0.3110},
		{cie.MCone, 1.4558, 0.8066},
		{cie.LCone, 1.6289, 1.0171},
		{cie.Rhodopic, 1.4497, 0.5730},
		{cie.Melanopic, 1.3262, 0.4957},
	} {
		act, err := cie.AlphaOpicAction(c.a)
		if err != nil {
			t.Fatal(err)
		}
		ao, err := colorimetry.NewAlphaOpic(act, photopic, d65)
		if err != nil {
			t.Fatalf("%v: %v", c.a, err)
		}
		if got := 1000 * ao.D65Efficacy(); !scalar.EqualWithinAbs(got, c.k, 5e-5) {
			t.Errorf("%v: K_α,v^D65 %.5f mW/lm, want %.4f (CIE S 026)", c.a, got, c.k)
		}
		// The DER of D65 is 1 by definition (CIE S 026/E:2018); the
		// tolerance is float round-off.
		der, err := ao.DER(d65)
		if err != nil || !scalar.EqualWithinAbs(der, 1, 1e-12) {
			t.Errorf("%v: DER of D65 %g (%v), want 1", c.a, der, err)
		}
		derA, err := ao.DER(cie.A())
		if err != nil || !scalar.EqualWithinAbs(derA, c.derA, 5e-5) {
			t.Errorf("%v: DER of A %.5f (%v), want %.4f", c.a, derA, err, c.derA)
		}
		// EDI of D65 equals its illuminance (CIE S 026/E:2018: the
		// definition of the equivalent daylight illuminance). D65 scaled
		// to a spectral irradiance in W·m⁻²·nm⁻¹.
		s := d65.Scale(0.01)
		ev, err := photopic.Integral(s)
		if err != nil {
			t.Fatal(err)
		}
		edi, err := ao.EDI(s)
		if err != nil || !scalar.EqualWithinAbsOrRel(edi, ev, 1e-9, 1e-12) {
			t.Errorf("%v: EDI of D65 %g lx (%v), want its illuminance %g lx", c.a, edi, err, ev)
		}
	}
}

func TestPhotometryErrors(t *testing.T) {
	t.Parallel()
	zero, err := colorimetry.NewSpectrumOnGrid(colorimetry.Grid5nm, make([]float64, 81), colorimetry.Options{})
	if err != nil {
		t.Fatal(err)
	}
	mel, err := cie.AlphaOpicAction(cie.Melanopic)
	if err != nil {
		t.Fatal(err)
	}
	ir := line(t, 900, 1) // beyond every weighting function
	for _, c := range []struct {
		name string
		f    func() error
		is   error // nil: any error
	}{
		// Data problems are errors (DESIGN.md), each checked here:
		{"empty spectrum", func() error { _, err := photopic.Integral(colorimetry.Spectrum{}); return err }, colorimetry.ErrTooFew},
		{"zero efficiency", func() error { _, err := colorimetry.Efficiency{}.Integral(cie.D65()); return err }, nil},
		{"negative Km", func() error {
			_, err := colorimetry.Efficiency{V: cie.PhotopicV(), K: -1}.Integral(cie.D65())
			return err
		}, nil},
		{"no radiant power", func() error { _, err := colorimetry.EfficacyOfRadiation(zero, photopic); return err }, colorimetry.ErrNoPower},
		{"S/P of infrared", func() error { _, err := colorimetry.SPRatio(ir, photopic, scotopic); return err }, colorimetry.ErrNoPower},
		{"zero AlphaOpic", func() error { _, err := colorimetry.AlphaOpic{}.DER(cie.D65()); return err }, nil},
		{"zero AlphaOpic EDI", func() error { _, err := colorimetry.AlphaOpic{}.EDI(cie.D65()); return err }, nil},
		{"action blind to D65", func() error { _, err := colorimetry.NewAlphaOpic(zero, photopic, cie.D65()); return err }, colorimetry.ErrNoPower},
		{"DER of infrared", func() error {
			ao, err := colorimetry.NewAlphaOpic(mel, photopic, cie.D65())
			if err != nil {
				return nil // fails the test below: the constructor must work
			}
			_, err = ao.DER(ir)
			return err
		}, colorimetry.ErrNoPower},
	} {
		err := c.f()
		if err == nil || (c.is != nil && !errors.Is(err, c.is)) {
			t.Errorf("%s: error %v, want %v", c.name, err, c.is)
		}
	}
}
