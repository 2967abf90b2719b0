package main

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
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
	// column is the spectrum's field number in the columns layout (2 or
	// more); 1 in the rows layout and CGATS, 0 when unknown.
	column int
	// maxStep is the widest spacing of the file's wavelengths, nm (the
	// grid step unless the file was irregular and s is resampled); 0 when
	// unknown.
	maxStep float64
	s       colorimetry.Spectrum
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
		out[i] = spectrumIn{name: n.Name, file: path, line: n.Line, column: n.Column, maxStep: n.MaxStep, s: n.Spectrum}
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
		var hits []spectrumIn
		for _, s := range in {
			if strings.EqualFold(s.name, want) {
				hits = append(hits, s)
			}
		}
		switch len(hits) {
		case 0:
			const maxListed = 12
			have := make([]string, 0, maxListed+1)
			for i, s := range in {
				if i == maxListed {
					have = append(have, fmt.Sprintf("and %d more", len(in)-maxListed))
					break
				}
				have = append(have, s.name)
			}
			return nil, fmt.Errorf("%s: no spectrum named %q (the file has: %s)", file, want, strings.Join(have, ", "))
		case 1:
			out = append(out, hits[0])
		default:
			// The rows layout and CGATS allow a name twice (repeat
			// measurements); picking one silently would be a guess.
			where := make([]string, len(hits))
			for i, h := range hits {
				where[i] = strconv.Itoa(h.line)
			}
			return nil, fmt.Errorf("%s: %d spectra are named %q (lines %s): the name does not say which", file, len(hits), want, strings.Join(where, ", "))
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
		// The CIE's spelling in messages: "d65" is shown as D65.
		n := strings.TrimSpace(name)
		if fam, arg, ok := strings.Cut(n, ":"); ok {
			n = strings.ToLower(strings.TrimSpace(fam)) + ":" + strings.TrimSpace(arg)
		} else {
			n = strings.ToUpper(n)
		}
		return s, n, nil
	}
	if _, statErr := os.Stat(fileOf(name)); statErr != nil {
		if msg, ok := illuminantParamProblem(name, err); ok {
			return colorimetry.Spectrum{}, "", usagef("%s %s: %s", flag, name, msg)
		}
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

// illuminantParamProblem explains why a parametric illuminant name
// (daylight:K, planck:K) was refused by cie.Illuminant with err: a
// temperature that is not a number, or one outside the family's range. It
// reports false for any other name.
func illuminantParamProblem(name string, err error) (string, bool) {
	fam, arg, ok := strings.Cut(strings.ToLower(strings.TrimSpace(name)), ":")
	if !ok {
		return "", false
	}
	var lo, hi float64
	switch strings.TrimSpace(fam) {
	case "daylight":
		lo, hi = cie.DaylightMinCCT, cie.DaylightMaxCCT
	case "planck":
		lo, hi = cie.PlanckMinT, cie.PlanckMaxT
	default:
		return "", false
	}
	fam = strings.TrimSpace(fam)
	t, perr := strconv.ParseFloat(strings.TrimSpace(arg), 64)
	if perr != nil || math.IsNaN(t) || math.IsInf(t, 0) {
		return fmt.Sprintf("the temperature %q is not a number; write %s:K with K in kelvin, %s–%s", strings.TrimSpace(arg), fam, kelvin(lo), kelvin(hi)), true
	}
	if errors.Is(err, cie.ErrRange) {
		return fmt.Sprintf("%s K is out of range: %s:K takes %s–%s K", kelvin(t), fam, kelvin(lo), kelvin(hi)), true
	}
	return "", false
}

// kelvin formats a temperature in K without an exponent up to 1e21.
func kelvin(t float64) string { return strconv.FormatFloat(t, 'f', -1, 64) }

// place names a spectrum in messages: "file:line: spectrum "name"".
func (in spectrumIn) place() string {
	if in.line > 0 {
		return fmt.Sprintf("%s:%d: spectrum %q", in.file, in.line, in.name)
	}
	return fmt.Sprintf("%s: spectrum %q", in.file, in.name)
}

// asFraction returns the reflectance or transmittance in as a fraction
// 0–1: scale is "fraction", "percent", or "" to take percent when the
// maximum exceeds 1.5 (decided per spectrum, so a file of millions of
// spectra streams). It returns the factor applied, the scale used and any
// warnings: a value above maxPlausibleFraction after scaling (a fluorescent
// sample may exceed 1 a little; a dark sample of a percent file read as a
// fraction exceeds it too, hence the hint). It returns an error naming the
// file, line and wavelength for values below zero beyond noise and for a
// peak above maxFraction after scaling, which no reflectance or
// transmittance factor reaches.
func asFraction(in spectrumIn, scale, as string) (colorimetry.Spectrum, float64, *string, []string, error) {
	s := in.s
	var warns []string
	peak, peakNM := s.Max()
	if scale == "" {
		scale = "fraction"
		if peak > 1.5 {
			scale = "percent"
			warns = append(warns, "values taken as percent (the maximum exceeds 1.5); say --scale to choose")
		}
	}
	factor := 1.0
	if scale == "percent" {
		factor = 0.01
		s = s.Scale(factor)
	}
	if frac := peak * factor; frac > maxFraction {
		return s, factor, &scale, warns, fmt.Errorf("%s: value %.4g is not a %s factor: read as %s it is %.4g, and a %s factor runs 0–1 (0–100 in percent)",
			in.placeAt(peakNM), peak, as, scale, frac, as)
	}
	// 0.01 below zero is spectrophotometer noise near black: common
	// practice (no source).
	const noise = 0.01
	if err := s.CheckFraction(noise); err != nil {
		var se *colorimetry.SampleError
		if errors.As(err, &se) && errors.Is(err, colorimetry.ErrNegative) {
			v := s.Value(se.Index) / factor
			what := fmt.Sprintf("negative value %.4g (noise near black allows down to -%g)", v, noise)
			if factor != 1 {
				what = fmt.Sprintf("negative value %.4g %% (noise near black allows down to -%g %%)", v, noise/factor)
			}
			return s, factor, &scale, warns, fmt.Errorf("%s: %s", in.placeAt(se.Wavelength), what)
		}
		return s, factor, &scale, warns, fmt.Errorf("%s: %v", in.place(), err)
	}
	if frac := peak * factor; frac > maxPlausibleFraction {
		hint := "a fluorescent sample can exceed 1; otherwise check the data"
		if scale == "fraction" {
			hint = "if the file is in percent, say --scale percent (a fluorescent sample can exceed 1)"
		}
		warns = append(warns, fmt.Sprintf("%s reaches %.4g at %g nm, above 1: %s", as, frac, peakNM, hint))
	}
	return s, factor, &scale, warns, nil
}

// A reflectance or transmittance factor above maxPlausibleFraction gets a
// warning: fluorescent samples exceed 1 by a little (common practice, no
// source). Above maxFraction (far beyond any fluorescent sample) the data
// are refused as not a reflectance or transmittance factor.
const (
	maxPlausibleFraction = 1.05
	maxFraction          = 100
)

// spectrumArg resolves a FILE or FILE:NAME argument to its spectra: all of
// the file's, or the one named.
func spectrumArg(e *env, arg string) ([]spectrumIn, error) {
	file, col := splitSpectrumArg(arg)
	list, err := readSpectra(e, file)
	if err != nil {
		return nil, err
	}
	return selectColumns(list, col, file)
}

// splitSpectrumArg splits a FILE or FILE:NAME argument: an existing file
// (or "-") is a FILE even with a colon in its name; otherwise the text
// after the last colon names one spectrum of the file before it.
func splitSpectrumArg(arg string) (file, name string) {
	if arg == "-" {
		return arg, ""
	}
	if _, err := os.Stat(arg); err == nil {
		return arg, ""
	}
	if i := strings.LastIndex(arg, ":"); i > 0 {
		return arg[:i], arg[i+1:]
	}
	return arg, ""
}

// fileOf returns the file part of a FILE or FILE:NAME argument.
func fileOf(arg string) string {
	file, _ := splitSpectrumArg(arg)
	return file
}

// joinLines joins warnings for the indented warnings block.
func joinLines(s []string) string { return strings.Join(s, "\n  ") }

// eachSpectrum calls f for every spectrum of path ("-" is standard input) as
// the file is read, so a file of millions of spectra in the rows layout or
// CGATS is processed in constant memory. With names only those spectra
// are passed on, in file order (names match without regard to case); a
// name that never appears is an error naming what the file had (up to
// maxListed names).
func eachSpectrum(e *env, path string, names []string, f func(spectrumIn) error) error {
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
	for _, n := range names {
		want[strings.ToLower(strings.TrimSpace(n))] = false
	}
	const maxListed = 12
	var seen []string
	more := 0
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
			if len(seen) < maxListed {
				seen = append(seen, n.Name)
			} else {
				more++
			}
			key := strings.ToLower(n.Name)
			if _, ok := want[key]; !ok {
				continue
			}
			want[key] = true
		}
		if err := f(spectrumIn{name: n.Name, file: path, line: n.Line, column: n.Column, maxStep: n.MaxStep, s: n.Spectrum}); err != nil {
			return err
		}
	}
	for _, n := range names {
		if !want[strings.ToLower(strings.TrimSpace(n))] {
			has := strings.Join(seen, ", ")
			if more > 0 {
				has += fmt.Sprintf(" and %d more", more)
			}
			return fmt.Errorf("%s: no spectrum named %q (the file has: %s)", path, strings.TrimSpace(n), has)
		}
	}
	return nil
}

// placeAt names the sample of in at wavelength nm in messages: the file,
// line and field where it was read when the file can tell
// ("f.csv:14:7 (field gel-cyan), 430 nm"), else the spectrum.
func (in spectrumIn) placeAt(nm float64) string {
	i := -1
	if g := in.s.Grid(); g.Step > 0 {
		if k := math.Round((nm - g.Start) / g.Step); k >= 0 && k < float64(g.N) {
			i = int(k)
		}
	}
	switch {
	case in.column >= 2:
		if line := in.dataLine(i); line > 0 {
			return fmt.Sprintf("%s:%d:%d (field %s), %g nm", in.file, line, in.column, in.name, nm)
		}
		return fmt.Sprintf("%s: spectrum %q (column %d), %g nm", in.file, in.name, in.column, nm)
	default:
		return fmt.Sprintf("%s, %g nm", in.place(), nm)
	}
}

// dataLine returns the line of in's file that holds sample i of a
// spectrum in the columns layout, or 0 when it cannot tell: standard
// input, or data resampled from irregular wavelengths (whose samples are
// not the file's rows). It reads the file again, so it serves messages
// only. Lines are skipped as the reader skips them: blank, comment (#)
// and all-empty lines.
func (in spectrumIn) dataLine(i int) int {
	if in.column < 2 || in.file == "-" || in.line <= 0 || i < 0 {
		return 0
	}
	fh, err := os.Open(in.file)
	if err != nil {
		return 0
	}
	defer fh.Close()
	sc := bufio.NewScanner(fh)
	sc.Buffer(make([]byte, 0, 64*1024), specio.DefaultMaxLineBytes)
	var lines []int
	for n := 1; sc.Scan(); n++ {
		if n < in.line {
			continue
		}
		t := strings.TrimLeft(sc.Text(), " \t")
		if t == "" || t[0] == '#' || strings.Trim(t, " \t\r,;\"") == "" {
			continue
		}
		if n == in.line && !startsWithNumber(t) {
			continue // the header
		}
		lines = append(lines, n)
		if len(lines) > in.s.Len() {
			return 0
		}
	}
	if sc.Err() != nil || len(lines) != in.s.Len() || i >= len(lines) {
		return 0
	}
	return lines[i]
}

// startsWithNumber reports whether the field at the start of t (after an
// optional quote) begins like a number.
func startsWithNumber(t string) bool {
	t = strings.TrimLeft(t, "\" ")
	return t != "" && strings.ContainsRune("0123456789.+-", rune(t[0]))
}

// The visible range over which colorimetry is computed, 380–780 nm (the
// range of the CIE 5 nm tables, CIE 015:2018, from memory), and the part
// of it that must be measured: the CIE 1931 colour-matching functions
// outside 400–700 nm carry under 1 % of the sum of each of x̄, ȳ, z̄
// (checked in TestCoverageCore against the cie tables), so data missing
// only those ends need no warning. Data sampled more coarsely than
// maxDataStep get a warning (CIE 015 prefers 5 nm, from memory; the 20 nm
// limit is common practice, no source).
const (
	visibleLo, visibleHi = 380.0, 780.0
	coreLo, coreHi       = 400.0, 700.0
	maxDataStep          = 20.0
)

// checkCoverage checks that in's wavelengths suit colorimetry. It returns
// an error naming the spectrum and its range when the data do not overlap
// 380–780 nm (wavelengths in µm, or an infrared file), and warnings naming
// the measured range when they miss part of 400–700 nm or are sampled more
// coarsely than 20 nm. light says how values beyond the data are taken:
// as zero (lights) or as the end values repeated (reflectance,
// transmittance).
func checkCoverage(in spectrumIn, light bool) ([]string, error) {
	g := in.s.Grid()
	lo, hi := nm6(g.Start), nm6(g.End())
	if g.End() <= visibleLo || g.Start >= visibleHi {
		hint := ""
		if g.End()*1000 > visibleLo && g.Start*1000 < visibleHi {
			hint = " (wavelengths in µm? antipode wants nm)"
		}
		return nil, fmt.Errorf("%s: the data cover %s–%s nm, no part of the visible range %g–%g nm%s", in.place(), lo, hi, visibleLo, visibleHi, hint)
	}
	var warns []string
	if g.Start > coreLo || g.End() < coreHi {
		fill := "the end values are repeated beyond them"
		if light {
			fill = "the light is taken as zero beyond them"
		}
		warns = append(warns, fmt.Sprintf("the data cover only %s–%s nm of %g–%g nm: %s, so the result may be far off", lo, hi, visibleLo, visibleHi, fill))
	}
	switch step := max(g.Step, in.maxStep); {
	case step <= maxDataStep:
	case in.maxStep > g.Step:
		warns = append(warns, fmt.Sprintf("the data leave gaps of up to %s nm over %s–%s nm, wider than %g nm: interpolation across them may be far off", nm6(step), lo, hi, maxDataStep))
	default:
		warns = append(warns, fmt.Sprintf("the data are sampled every %s nm over %s–%s nm, coarser than %g nm: interpolation between them may be far off", nm6(g.Step), lo, hi, maxDataStep))
	}
	return warns, nil
}

// checkOutDir checks, before any work, that the directory of an output
// file given to flagName exists and takes new files: it creates and
// removes a temporary file there, as the atomic write later does.
func checkOutDir(flagName, path string) error {
	dir := filepath.Dir(path)
	fi, err := os.Stat(dir)
	if err != nil {
		return usagef("%s %s: the directory %s does not exist", flagName, path, dir)
	}
	if !fi.IsDir() {
		return usagef("%s %s: %s is not a directory", flagName, path, dir)
	}
	f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return usagef("%s %s: cannot write in %s", flagName, path, dir)
	}
	name := f.Name()
	f.Close()
	os.Remove(name)
	return nil
}

// nm6 formats a wavelength in nm to six significant digits, so that grid
// ends computed as start + i·step print as the file wrote them.
func nm6(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

// dataGrid describes the sampling of the data as read, as Grid.String
// does, with nm6 numbers; for irregular wavelengths (resampled on reading)
// the widest gap they leave.
func dataGrid(in spectrumIn) string {
	g := in.s.Grid()
	if in.maxStep > g.Step*(1+1e-9) {
		return fmt.Sprintf("%s–%s nm, uneven steps up to %s nm (resampled at %s nm)", nm6(g.Start), nm6(g.End()), nm6(in.maxStep), nm6(g.Step))
	}
	return fmt.Sprintf("%s–%s nm at %s nm", nm6(g.Start), nm6(g.End()), nm6(g.Step))
}
