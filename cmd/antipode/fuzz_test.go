package main

import (
	"bytes"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/mixing"
)

// The fuzz targets of this file feed arbitrary flag values and files to
// the parsers of the command line (the rules of DEVELOPERS.md
// "Reliability": no panic, errors of one line, nothing non-finite
// accepted). Their seed corpora are in testdata/fuzz/<Target>/, which
// plain `go test` replays.

// errOneLine fails unless err's message is a single non-empty line.
func errOneLine(t *testing.T, err error) {
	t.Helper()
	if msg := err.Error(); msg == "" || strings.ContainsAny(msg, "\r\n") {
		t.Fatalf("error is not one line: %q", msg)
	}
}

// finiteValue reports whether v is neither NaN nor infinite.
func finiteValue(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// FuzzParseAmounts checks --amounts: what it accepts has non-empty,
// distinct names and finite values, each value the whole of its text read
// as a number, and it reads back the same from its own rendering.
func FuzzParseAmounts(f *testing.F) {
	for _, s := range []string{"a=0.5,b=0.25", " wash-red = 0.8 , wash-green=0.35", "a=1e300", "a=0.5abc", "a=NaN", "a=,b=1", "=1", "a=1,a=2", "a=0x1p-2", ""} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		am, err := parseAmounts(s)
		if err != nil {
			errOneLine(t, err)
			return
		}
		parts := strings.Split(s, ",")
		if len(am) != len(parts) {
			t.Fatalf("%q: %d amounts from %d parts", s, len(am), len(parts))
		}
		seen := map[string]bool{}
		var b strings.Builder
		for i, a := range am {
			if a.Name == "" || seen[a.Name] || !finiteValue(a.Value) {
				t.Fatalf("%q: amount %+v", s, a)
			}
			seen[a.Name] = true
			_, text, _ := strings.Cut(parts[i], "=")
			if v, err := strconv.ParseFloat(strings.TrimSpace(text), 64); err != nil || v != a.Value {
				t.Fatalf("%q: %s = %v from the text %q", s, a.Name, a.Value, text)
			}
			if i > 0 {
				b.WriteByte(',')
			}
			b.WriteString(a.Name + "=" + strconv.FormatFloat(a.Value, 'g', -1, 64))
		}
		back, err := parseAmounts(b.String())
		if err != nil || len(back) != len(am) {
			t.Fatalf("%q read back from %q as %v, %v", s, b.String(), back, err)
		}
		for i := range am {
			if back[i] != am[i] {
				t.Fatalf("%q read back as %+v, want %+v", b.String(), back[i], am[i])
			}
		}
	})
}

// FuzzParseXY checks --xy: what it accepts is a finite chromaticity
// strictly inside the triangle x > 0, y > 0, x + y < 1.
func FuzzParseXY(f *testing.F) {
	for _, s := range []string{"0.31,0.33", " 0.3127 , 0.3290 ", "0,0.5", "0.5,0.5", "1e-300,1e-300", "NaN,0.3", "0.3", "0.3,0.3,0.3", "inf,-inf"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		xy, err := parseXY(s)
		if err != nil {
			errOneLine(t, err)
			return
		}
		if !finiteValue(xy.X) || !finiteValue(xy.Y) || !(xy.X > 0 && xy.Y > 0 && xy.X+xy.Y < 1) {
			t.Fatalf("%q accepted as %+v", s, xy)
		}
	})
}

// FuzzParseLab checks --lab: what it accepts is finite with L* in 0–100.
func FuzzParseLab(f *testing.F) {
	for _, s := range []string{"50,10,-10", "100,0,0", "-1,0,0", "50,1e308,-1e308", "50,NaN,0", "50,0", ""} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		lab, err := parseLab(s)
		if err != nil {
			errOneLine(t, err)
			return
		}
		if !lab.Finite() || lab.L < 0 || lab.L > 100 {
			t.Fatalf("%q accepted as %v", s, lab)
		}
	})
}

// FuzzCCTFlag checks --cct K --duv d as the flag package and
// mixing.LightTargetCCT read them: an accepted target is a finite
// chromaticity with y > 0, and comes from K in 1000–100 000 and
// |d| ≤ 0.05 (CIE 015:2018 §9.5, with the library's slack of 1e-6 in K
// and 1e-9 in Duv). It may lie outside the spectrum locus (1000 K at
// Duv +0.05 gives x + y ≈ 1.3): the solve reports such a target as no
// chromaticity of a light.
func FuzzCCTFlag(f *testing.F) {
	for _, s := range [][2]string{{"4000", "0"}, {"6500", "0.003"}, {"999", "0"}, {"100000", "-0.05"}, {"1e308", "0"}, {"NaN", "0"}, {"3000", "Inf"}, {"0x1p12", "-0"}} {
		f.Add(s[0], s[1])
	}
	obs := cie.CIE1931()
	f.Fuzz(func(t *testing.T, k, d string) {
		kelvin, err1 := strconv.ParseFloat(k, 64)
		duv, err2 := strconv.ParseFloat(d, 64)
		if err1 != nil || err2 != nil {
			return // the flag package refuses it
		}
		xy, err := mixing.LightTargetCCT(obs, kelvin, duv)
		if err != nil {
			errOneLine(t, err)
			return
		}
		if !finiteValue(xy.X) || !finiteValue(xy.Y) || !(xy.Y > 0) {
			t.Fatalf("--cct %s --duv %s gives %+v", k, d, xy)
		}
		if !(kelvin >= 1000*(1-1e-6) && kelvin <= 100000*(1+1e-6) && math.Abs(duv) <= 0.05+1e-9) {
			t.Fatalf("--cct %s --duv %s accepted", k, d)
		}
	})
}

// FuzzReadLadders feeds arbitrary bytes, as standard input, to the
// pigments fit's ladder reader, in both --scale settings and automatic.
// Samples read without an error have a place and finite reflectance and
// mass fraction.
func FuzzReadLadders(f *testing.F) {
	f.Add([]byte("name,colorant,fraction,backing,heldout,400,410,420\nw,white,1,,,0.9,0.9,0.9\nr1,red,0.5,black,1,0.2,0.3,0.5\nr2,red,1,,,0.1,0.2,0.6\n"), uint8(0))
	f.Add([]byte("name,colorant,fraction,400,410,420\nw,white,1,90,90,90\n"), uint8(0))
	f.Fuzz(func(t *testing.T, data []byte, scale uint8) {
		e := &env{stdin: bytes.NewReader(data), stdout: &bytes.Buffer{}, stderr: &bytes.Buffer{}}
		samples, _, err := readLadders(e, "-", []string{"", "fraction", "percent"}[scale%3])
		if err != nil {
			errOneLine(t, err)
			return
		}
		for _, s := range samples {
			if s.Place == "" || !finiteValue(s.Fraction) {
				t.Fatalf("sample %+v", s)
			}
			for i := range s.Reflectance.Len() {
				if !finiteValue(s.Reflectance.Value(i)) {
					t.Fatalf("sample %q reflectance %v", s.Name, s.Reflectance.Value(i))
				}
			}
		}
	})
}
