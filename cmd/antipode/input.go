package main

import (
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
)

// spectrumIn is one spectrum read from a file, with where it came from.
type spectrumIn struct {
	name string
	file string
	line int
	s    colorimetry.Spectrum
}

// readSpectra reads every spectrum of path ("-" is standard input), in any
// layout the specio package recognises by content.
func readSpectra(e *env, path string) ([]spectrumIn, error) {
	list, err := readRecords(e, path)
	if err != nil {
		return nil, err
	}
	out := make([]spectrumIn, len(list))
	for i, n := range list {
		out[i] = spectrumIn{name: n.Name, file: path, line: n.Line, s: n.Spectrum}
	}
	return out, nil
}

// readRecords reads every record of path ("-" is standard input) as the
// specio package gives them, with their fields.
func readRecords(e *env, path string) ([]specio.Named, error) {
	if path == "-" {
		return specio.NewReader(e.stdin, "-").ReadAll()
	}
	return specio.ReadFile(path)
}

// selectColumns keeps the spectra named in the comma-separated list names
// (all when names is empty), in the order given.
func selectColumns(in []spectrumIn, names string, file string) ([]spectrumIn, error) {
	if names == "" {
		return in, nil
	}
	var out []spectrumIn
	for _, want := range strings.Split(names, ",") {
		want = strings.TrimSpace(want)
		found := false
		for _, s := range in {
			if strings.EqualFold(s.name, want) {
				out = append(out, s)
				found = true
				break
			}
		}
		if !found {
			have := make([]string, 0, len(in))
			for _, s := range in {
				have = append(have, s.name)
			}
			return nil, fmt.Errorf("%s: no spectrum named %q (the file has: %s)", file, want, strings.Join(have, ", "))
		}
	}
	return out, nil
}

// observerFlag resolves --observer.
func observerFlag(name string) (*colorimetry.Observer, error) {
	o, err := cie.ObserverByName(name)
	if err != nil {
		return nil, usagef("--observer %s: %v", name, err)
	}
	return o, nil
}

// illuminantFlag resolves the value name of flag (--illuminant, --also,
// --white; messages name it): a CIE name (see "antipode
// illuminants"), a file with one spectrum, or FILE:NAME for one spectrum of a
// file.
func illuminantFlag(e *env, flag, name string) (colorimetry.Spectrum, string, error) {
	s, err := cie.Illuminant(name)
	if err == nil {
		return s, name, nil
	}
	if _, statErr := os.Stat(fileOf(name)); statErr != nil {
		return colorimetry.Spectrum{}, "", usagef("%s %s: not a known illuminant (see 'antipode illuminants') and not a file", flag, name)
	}
	list, rerr := spectrumArg(e, name)
	if rerr != nil {
		return colorimetry.Spectrum{}, "", rerr
	}
	if len(list) != 1 {
		return colorimetry.Spectrum{}, "", usagef("%s %s: the file holds %d spectra; name one as FILE:NAME", flag, name, len(list))
	}
	// A measured light: zero outside its measured range.
	return list[0].s.WithExtrap(colorimetry.ExtrapZero), list[0].name, nil
}

// place names a spectrum in messages: "file:line: spectrum "name"".
func (in spectrumIn) place() string {
	if in.line > 0 {
		return fmt.Sprintf("%s:%d: spectrum %q", in.file, in.line, in.name)
	}
	return fmt.Sprintf("%s: spectrum %q", in.file, in.name)
}

// asFraction returns the reflectance or transmittance in as a fraction
// 0–1: scale is "fraction", "percent", or "" to take percent when the
// maximum exceeds 1.5. It returns the factor applied, the scale used and
// any warnings, and an error naming the file and wavelength for values
// below zero beyond noise.
func asFraction(in spectrumIn, scale, as string) (colorimetry.Spectrum, float64, *string, []string, error) {
	s := in.s
	var warns []string
	peak, _ := s.Max()
	if scale == "" {
		scale = "fraction"
		if peak > 1.5 {
			scale = "percent"
			warns = append(warns, fmt.Sprintf("values taken as percent (maximum %.4g > 1.5); say --scale to choose", peak))
		}
	}
	factor := 1.0
	if scale == "percent" {
		factor = 0.01
		s = s.Scale(factor)
		peak /= 100
	}
	// 0.01 below zero is spectrophotometer noise near black: common
	// practice (no source).
	if err := s.CheckFraction(0.01); err != nil {
		return s, factor, &scale, warns, fmt.Errorf("%s: %v", in.place(), err)
	}
	if peak > 1.05 && as == "transmittance" {
		warns = append(warns, fmt.Sprintf("transmittance reaches %.4g, above 1", peak))
	}
	return s, factor, &scale, warns, nil
}

// spectrumArg resolves a FILE or FILE:NAME argument to its spectra: all of
// the file's, or the one named.
func spectrumArg(e *env, arg string) ([]spectrumIn, error) {
	file, col := arg, ""
	if _, err := os.Stat(file); err != nil && arg != "-" {
		if i := strings.LastIndex(arg, ":"); i > 0 {
			file, col = arg[:i], arg[i+1:]
		}
	}
	list, err := readSpectra(e, file)
	if err != nil {
		return nil, err
	}
	return selectColumns(list, col, file)
}

// fileOf returns the file part of a FILE or FILE:NAME argument.
func fileOf(arg string) string {
	if _, err := os.Stat(arg); err == nil {
		return arg
	}
	if i := strings.LastIndex(arg, ":"); i > 0 {
		return arg[:i]
	}
	return arg
}

// joinLines joins warnings for the indented warnings block.
func joinLines(s []string) string { return strings.Join(s, "\n  ") }

// eachSpectrum calls f for every spectrum of path ("-" is standard input) as
// the file is read, so a file of millions of spectra in the rows layout or
// CGATS is processed in constant memory. With names (comma-separated) only
// those spectra are passed on, in file order; a name that never appears is
// an error naming what the file had (up to a few names).
func eachSpectrum(e *env, path, names string, f func(spectrumIn) error) error {
	var src io.Reader = e.stdin
	if path != "-" {
		fh, err := os.Open(path)
		if err != nil {
			return err
		}
		defer fh.Close()
		src = fh
	}
	want := map[string]bool{}
	if names != "" {
		for _, n := range strings.Split(names, ",") {
			want[strings.ToLower(strings.TrimSpace(n))] = false
		}
	}
	var seen []string
	r := specio.NewReader(src, path)
	for {
		n, err := r.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			return err
		}
		if len(want) > 0 {
			key := strings.ToLower(n.Name)
			if _, ok := want[key]; !ok {
				if len(seen) < 12 {
					seen = append(seen, n.Name)
				}
				continue
			}
			want[key] = true
		}
		if err := f(spectrumIn{name: n.Name, file: path, line: n.Line, s: n.Spectrum}); err != nil {
			return err
		}
	}
	for name, found := range want {
		if !found {
			return fmt.Errorf("%s: no spectrum named %q (the file has: %s)", path, name, strings.Join(seen, ", "))
		}
	}
	return nil
}
