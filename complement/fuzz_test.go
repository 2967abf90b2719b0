package complement_test

import (
	"encoding/json"
	"strings"
	"sync"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

// fuzzConditions are the CIE 1931 observer under D65, built once.
var fuzzConditions = sync.OnceValues(func() (*complement.Conditions, error) {
	return complement.NewConditions(cie.CIE1931(), cie.D65())
})

// fuzzSpectrum turns bytes into a spectrum: the first byte picks the grid
// (start 300–555 nm, step 1–32 nm), every further byte a value — most as
// byte/100, and a few as the edges of the float64 range (1e308, −1e308,
// the smallest subnormal, −0, −0.5). It reports false for fewer than 3
// values.
func fuzzSpectrum(b []byte) (colorimetry.Spectrum, bool) {
	if len(b) < 4 {
		return colorimetry.Spectrum{}, false
	}
	g := colorimetry.Grid{Start: 300 + float64(b[0]), Step: float64(b[0]%32 + 1), N: len(b) - 1}
	v := make([]float64, g.N)
	for i, c := range b[1:] {
		switch c {
		case 255:
			v[i] = 1e308
		case 254:
			v[i] = -1e308
		case 253:
			v[i] = 5e-324
		case 252:
			v[i] = colorimetry.XYZ{}.Scale(-1).X // −0
		case 251:
			v[i] = -0.5
		default:
			v[i] = float64(c) / 100
		}
	}
	s, err := colorimetry.NewSpectrumOnGrid(g, v, colorimetry.Options{})
	return s, err == nil
}

// checkResult fails when err is not one line, or when v (a result without
// an error) holds NaN or Inf, which encoding/json refuses to encode (Go
// encoding/json documentation: "unsupported value").
func checkResult(t *testing.T, what string, v any, err error) {
	t.Helper()
	if err != nil {
		if msg := err.Error(); msg == "" || strings.ContainsAny(msg, "\r\n") {
			t.Fatalf("%s: error is not one line: %q", what, msg)
		}
		return
	}
	if _, jerr := json.Marshal(v); jerr != nil {
		t.Fatalf("%s: result %+v: %v", what, v, jerr)
	}
}

// FuzzComplement feeds arbitrary spectra to the complement checks and
// the partner search, in every mode: nothing may panic, errors are one
// line, and no result holds NaN or Inf (the rules of DEVELOPERS.md
// "Reliability").
func FuzzComplement(f *testing.F) {
	f.Add([]byte{80, 10, 20, 40, 80, 90, 60, 30, 10}, []byte{80, 90, 80, 60, 20, 10, 20, 40, 80}, uint8(0))
	f.Add([]byte{4, 255, 0, 255, 0, 255}, []byte{4, 254, 253, 252, 251, 0}, uint8(1))
	f.Add([]byte{200, 50, 50, 50}, []byte{200, 0, 0, 0}, uint8(2))
	f.Fuzz(func(t *testing.T, da, db []byte, mode uint8) {
		a, okA := fuzzSpectrum(da)
		b, okB := fuzzSpectrum(db)
		if !okA || !okB {
			return
		}
		c, err := fuzzConditions()
		if err != nil {
			t.Fatal(err)
		}
		m := complement.Mode(mode % 3)
		add, err := c.CheckAdditive(a, b, m, complement.Options{})
		checkResult(t, "CheckAdditive", add, err)
		sub, err := c.CheckSubtractive(a, b, complement.Options{})
		checkResult(t, "CheckSubtractive", sub, err)
		ratio, err := c.MixRatio(a, b, m)
		checkResult(t, "MixRatio", ratio, err)
		cw, err := c.ComplementaryWavelength(a, m)
		checkResult(t, "ComplementaryWavelength", cw, err)
		lib, err := c.NewLibrary([]string{"a", "b"}, []colorimetry.Spectrum{a, b})
		if err != nil {
			checkResult(t, "NewLibrary", nil, err)
			return
		}
		ps, err := lib.Partners(a, m, complement.Options{})
		checkResult(t, "Partners", ps, err)
	})
}
