package main

import (
	"errors"
	"flag"
	"fmt"
	"math"
	"os"
	"strings"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

func init() {
	register(&command{
		name:    "pair",
		summary: "check whether two spectra are complements (additive or subtractive)",
		usage:   "pair A B [--mode additive|subtractive] [--as light|reflectance|transmittance] [--illuminant NAME|FILE] [--observer 1931|1964] [--tolerance-uv-prime 0.001] [--tolerance-spectral 0.01] [--also A,F11,…] [--uncertainty VALUE] [--strict] [--json]",
		about: `Checks whether A and B are complements and says how far they are from it.

Additive (default): do A and B add up to the white? Lights (--as light, the
default for additive) are compared with the illuminant's spectrum scaled to fit;
reflectances (--as reflectance, surfaces mixed optically) with the perfect white.
Verdict "spectral" when the spectral residual (RMS, fraction of the white's
peak) and Δu′v′ are both within tolerance, "metameric" when only the colour
(Δu′v′ of XYZ(A) + XYZ(B) against the white) is, "none" otherwise. Also the
mixing ratio that brings the mix nearest the white, and the distance of the
white from the line A–B in the u′v′ diagram (0 for exact complements).

Which mix each figure is of (JSON keys in brackets):
  Δu′v′ of A + B as given [delta_uv_prime]: A and B at the intensities in
    their files; the verdict is judged on this mix.
  spectral RMS and max residual [spectral_rms, spectral_max]: also A + B as
    given, against the white at its best-fitting scale [scale], on the grid
    the files share with the illuminant.
  Δu′v′ at the best ratio [mix_delta_uv_prime]: A + t·B at the ratio t that
    comes nearest the white [ratio_luminance, ratio_power]. 'antipode
    partner' ranks by this quantity; its entries carry it under the same key
    (and, for historical reasons, under delta_uv_prime too), and its spectral
    RMS is also taken at the best ratio. For a pair that is already at its
    best ratio the two commands agree, up to the grid the residual is taken
    on (partner: 360–830 nm at 1 nm for most illuminants).

Subtractive (filters or transparent inks stacked, --as transmittance): the
luminous transmittance Y of the stack (0–100) under the illuminant and the
chroma C*ab of what passes. Verdict "black" (Y ≤ --black-y), "neutral" (Y ≤
--neutral-y and C*ab ≤ --neutral-chroma) or "none". --factor-a and --factor-b
scale each layer by Beer–Lambert (T^f: f = 2 is twice the thickness).
delta_uv_prime is then Δu′v′ of the light the stack passes; the keys of the
additive check are null.

--also repeats the check under other illuminants, with both observers, and
shows where a metameric complement breaks. --uncertainty VALUE (standard
uncertainty of every sample, in the files' units) gives the probability that
the true Δu′v′ is within tolerance. A and B are files with one spectrum each, or
FILE:NAME; - reads standard input and -:NAME names one of its spectra (only
one of A and B can come from standard input). Exit status 0 whatever the
verdict; with --strict, 1 when the verdict is "none". See 'antipode help
tolerances'.`,
		example: `  $ antipode pair cmd/antipode/demo/filters.csv:gel-straw cmd/antipode/demo/filters.csv:gel-steel-blue --mode subtractive
  $ antipode pair lamps.csv:wash-amber lamps.csv:wash-blue --illuminant D65 --also A,F11 --json`,
		run: runPair,
	})
}

// pairResult is the JSON of "pair"; its keys are a contract. Keys of the
// other mode are null.
type pairResult struct {
	A            string             `json:"a"`
	B            string             `json:"b"`
	Mode         string             `json:"mode"`
	As           string             `json:"as"`
	Illuminant   string             `json:"illuminant"`
	Observer     string             `json:"observer"`
	Verdict      complement.Verdict `json:"verdict"`
	DeltaUVPrime *float64           `json:"delta_uv_prime"`
	SpectralRMS  *float64           `json:"spectral_rms"`
	SpectralMax  *float64           `json:"spectral_max"`
	Scale        *float64           `json:"scale"`
	DeltaDuv     *float64           `json:"delta_duv"`
	DE00         *float64           `json:"dE00"`
	RatioLum     *float64           `json:"ratio_luminance"`
	RatioPower   *float64           `json:"ratio_power"`
	MixUV        *float64           `json:"mix_delta_uv_prime"`
	LineDistance *float64           `json:"line_distance_uv_prime"`
	StackY       *float64           `json:"stack_Y"`
	StackChroma  *float64           `json:"stack_chroma"`
	Robustness   []robustRow        `json:"robustness"`
	Confidence   *float64           `json:"confidence"`
	Tolerances   map[string]float64 `json:"tolerances"`
	Warnings     []string           `json:"warnings"`
}

type robustRow struct {
	Illuminant   string             `json:"illuminant"`
	Observer     string             `json:"observer"`
	Verdict      complement.Verdict `json:"verdict"`
	DeltaUVPrime *float64           `json:"delta_uv_prime"`
	StackY       *float64           `json:"stack_Y"`
}

// pairFlags are the flags "pair" and "partner" share.
type pairFlags struct {
	cmd                                   string // "pair" or "partner", from the flag set
	mode, as, illuminant, observer, scale string
	opt                                   complement.Options
}

func (p *pairFlags) define(fs *flag.FlagSet) {
	p.cmd = fs.Name()
	fs.StringVar(&p.mode, "mode", "additive", "`additive` (add to white) or subtractive (stack to black)")
	fs.StringVar(&p.as, "as", "", "what the spectra are: `light`, reflectance or transmittance (default: light for additive, transmittance for subtractive)")
	fs.StringVar(&p.illuminant, "illuminant", "D65", "the white (lights) or the viewing illuminant: a CIE `NAME` or a FILE")
	fs.StringVar(&p.observer, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.StringVar(&p.scale, "scale", "", "reflectance or transmittance: `fraction` or percent (default: percent when the maximum exceeds 1.5)")
	fs.Float64Var(&p.opt.DeltaUVPrime, "tolerance-uv-prime", complement.DefaultDeltaUVPrime, "colorimetric tolerance, Δu′v′ (about one just-noticeable step for whites)")
	fs.Float64Var(&p.opt.SpectralRMS, "tolerance-spectral", complement.DefaultSpectralRMS, "spectral tolerance: RMS residual as a fraction of the white's peak")
	fs.Float64Var(&p.opt.BlackY, "black-y", complement.DefaultBlackY, "subtractive: stack Y (0–100) at or below which the pair is black")
	fs.Float64Var(&p.opt.NeutralY, "neutral-y", complement.DefaultNeutralY, "subtractive: stack Y (0–100) at or below which a low-chroma pair is a neutral")
	fs.Float64Var(&p.opt.NeutralChroma, "neutral-chroma", complement.DefaultNeutralChroma, "subtractive: C*ab at or below which the stack is neutral")
	fs.Float64Var(&p.opt.FactorA, "factor-a", 1, "subtractive: Beer–Lambert factor of layer A (thickness or concentration, T^f)")
	fs.Float64Var(&p.opt.FactorB, "factor-b", 1, "subtractive: Beer–Lambert factor of layer B")
}

// resolve checks the flags and returns the complement mode and the
// conditions.
func (p *pairFlags) resolve(e *env) (complement.Mode, *complement.Conditions, string, error) {
	if err := p.checkOptions(); err != nil {
		return 0, nil, "", err
	}
	switch p.mode {
	case "additive":
		if p.as == "" {
			p.as = "light"
		}
	case "subtractive":
		if p.as == "" {
			p.as = "transmittance"
		}
		if p.as != "transmittance" {
			return 0, nil, "", usagef("--mode subtractive stacks filters: --as must be transmittance")
		}
	default:
		return 0, nil, "", usagef("--mode %s: want additive or subtractive", p.mode)
	}
	var m complement.Mode
	switch p.as {
	case "light":
		m = complement.Lights
	case "reflectance", "transmittance":
		m = complement.Surfaces
		if p.mode == "subtractive" {
			m = complement.Filters
		}
	default:
		return 0, nil, "", usagef("--as %s: want light, reflectance or transmittance", p.as)
	}
	if p.scale != "" && p.scale != "fraction" && p.scale != "percent" {
		return 0, nil, "", usagef("--scale %s: want fraction or percent", p.scale)
	}
	obs, err := observerFlag(p.observer)
	if err != nil {
		return 0, nil, "", err
	}
	ill, name, err := illuminantFlag(e, "--illuminant", p.illuminant)
	if err != nil {
		return 0, nil, "", err
	}
	c, err := complement.NewConditions(obs, ill)
	if err != nil {
		return 0, nil, "", fmt.Errorf("--illuminant %s: %v", p.illuminant, err)
	}
	return m, c, name, nil
}

// checkOptions checks the tolerance and layer flags before any file is
// read, naming the flag. The complement package would name its Options
// field instead, and it takes 0 for "the default", which from the command
// line would silently replace a value the user typed.
func (p *pairFlags) checkOptions() error {
	for _, f := range []struct {
		flag  string
		v     float64
		limit float64 // largest allowed value
	}{
		{"--tolerance-uv-prime", p.opt.DeltaUVPrime, math.MaxFloat64},
		{"--tolerance-spectral", p.opt.SpectralRMS, math.MaxFloat64},
		{"--black-y", p.opt.BlackY, 100},
		{"--neutral-y", p.opt.NeutralY, 100},
		{"--neutral-chroma", p.opt.NeutralChroma, math.MaxFloat64},
		{"--factor-a", p.opt.FactorA, math.MaxFloat64},
		{"--factor-b", p.opt.FactorB, math.MaxFloat64},
	} {
		switch {
		case !(f.v > 0) || math.IsInf(f.v, 0):
			return usagef("%s %g: want a positive, finite number", f.flag, f.v)
		case f.v > f.limit:
			return usagef("%s %g: want a luminous transmittance Y of at most %g", f.flag, f.v, f.limit)
		}
	}
	if p.opt.NeutralY < p.opt.BlackY {
		return usagef("--neutral-y %g is below --black-y %g: want --neutral-y at or above --black-y", p.opt.NeutralY, p.opt.BlackY)
	}
	if p.cmd == "partner" && p.opt.FactorB != 1 {
		return usagef("--factor-b %g: partner takes the library's spectra as they are (factor 1); scale A with --factor-a, or check one pair with 'antipode pair --factor-b'", p.opt.FactorB)
	}
	return nil
}

// load reads one spectrum argument for the pair's mode. It returns the
// factor applied to the file's values (0.01 for percent, else 1) and the
// warnings, each naming the spectrum as role (A or B) and name.
func (p *pairFlags) load(e *env, arg string, role string) (spectrumIn, colorimetry.Spectrum, float64, []string, error) {
	list, err := spectrumArg(e, arg)
	if err != nil {
		return spectrumIn{}, colorimetry.Spectrum{}, 0, nil, err
	}
	if len(list) != 1 {
		return spectrumIn{}, colorimetry.Spectrum{}, 0, nil, usagef("%s: %s holds %s; name one as %s", role, arg, plural(len(list), "spectrum", "spectra"), nameOne(arg))
	}
	in := list[0]
	if p.as == "light" {
		return in, in.s.WithExtrap(colorimetry.ExtrapZero), 1, nil, nil
	}
	s, factor, _, warns, err := asFraction(in, p.scale, p.as)
	return in, s, factor, prefixAll(warns, role+" ("+in.name+"): "), err
}

// prefixAll returns ws with prefix put before each (nil for none), so that
// a warning names the spectrum it concerns.
func prefixAll(ws []string, prefix string) []string {
	var out []string
	for _, w := range ws {
		out = append(out, prefix+w)
	}
	return out
}

// nameWarning rewrites a warning of the complement package, which calls
// the two spectra "a" and "b", so that it names them as the report does:
// "A (name)" and "B (name)". It also says plainly why ΔDuv is missing
// instead of stacking the causes. Other warnings pass unchanged.
func nameWarning(w, a, b string) string {
	la, lb := "A ("+a+")", "B ("+b+")"
	const cct = "correlated colour temperature not defined: "
	for _, r := range []struct{ old, new string }{
		{"ΔDuv not given: CCT of the sum: " + cct, "ΔDuv not given, as A + B has no correlated colour temperature: "},
		{"ΔDuv not given: CCT of the sum: ", "ΔDuv not given, as A + B has no correlated colour temperature: "},
		{"ΔDuv not given: CCT of the white: " + cct, "ΔDuv not given, as the white has no correlated colour temperature: "},
		{"ΔDuv not given: CCT of the white: ", "ΔDuv not given, as the white has no correlated colour temperature: "},
		{"a dips below zero", la + " dips below zero"},
		{"b dips below zero", lb + " dips below zero"},
		{"a and b have the same chromaticity", la + " and " + lb + " have the same chromaticity"},
		{"the nearest mix is a alone: adding b only", "the nearest mix is " + la + " alone: adding " + lb + " only"},
		{"the nearest mix is b alone: adding a only", "the nearest mix is " + lb + " alone: adding " + la + " only"},
	} {
		if strings.HasPrefix(w, r.old) {
			return r.new + w[len(r.old):]
		}
	}
	return w
}

// lightsHint returns a warning when both spectra of a subtractive check
// exceed 1 (as fractions, after the scale decision) by more than the noise
// asFraction allows: they look like light spectra, and stacking them as
// filters means nothing. peakA and peakB are the largest values.
func lightsHint(peakA, peakB float64) []string {
	// 1.05: the level above which asFraction warns that a transmittance
	// exceeds 1 (common practice, no source).
	if peakA > 1.05 && peakB > 1.05 {
		return []string{fmt.Sprintf("A and B both exceed 1 (largest values %.4g and %.4g): they look like lights, not filters; the subtractive check stacks transmittances 0–1 (for lights use --mode additive)", peakA, peakB)}
	}
	return nil
}

// nameOne says how to name one spectrum of the argument arg.
func nameOne(arg string) string {
	if isStdin(arg) {
		return "-:NAME"
	}
	return "FILE:NAME"
}

// isStdin reports whether the spectrum argument arg reads standard input:
// "-", or "-:NAME" when no file has that name.
func isStdin(arg string) bool {
	if arg == "-" {
		return true
	}
	if !strings.HasPrefix(arg, "-:") {
		return false
	}
	_, err := os.Stat(arg)
	return err != nil
}

// oneStdin refuses more than one spectrum argument from standard input,
// which can be read only once.
func oneStdin(args ...string) error {
	var from []string
	for _, a := range args {
		if isStdin(a) {
			from = append(from, a)
		}
	}
	if len(from) > 1 {
		both := "both"
		if len(from) > 2 {
			both = "all"
		}
		return usagef("%s %s read standard input, which can be read once: give at most one of them as - or -:NAME (save the other to a file)", strings.Join(from, " and "), both)
	}
	return nil
}

func runPair(e *env, args []string) error {
	var pf pairFlags
	var also, unc string
	var strict, asJSON bool
	fs := flag.NewFlagSet("pair", flag.ContinueOnError)
	pf.define(fs)
	fs.StringVar(&also, "also", "", "repeat the check under these illuminants, comma-separated `NAMES` (both observers)")
	fs.StringVar(&unc, "uncertainty", "", "standard uncertainty of every sample, a `VALUE` in the files' units (additive: gives the confidence)")
	fs.BoolVar(&strict, "strict", false, "exit with status 1 when the verdict is none")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a report")
	plotPath := fs.String("plot", "", "also draw the pair (spectra and the x, y chromaticity diagram) to `FILE` (.svg or .png)")
	pos, err := parseFlags(commands["pair"], fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) != 2 {
		return usagef("want two spectra A and B (got %s)", plural(len(pos), "argument", "arguments"))
	}
	if err := oneStdin(pos...); err != nil {
		return err
	}
	var u float64 // --uncertainty, in the files' units
	if unc != "" {
		if _, err := fmt.Sscanf(unc, "%g", &u); err != nil || !(u >= 0) || math.IsInf(u, 0) {
			return usagef("--uncertainty %s: want a non-negative number", unc)
		}
	}
	m, cond, illName, err := pf.resolve(e)
	if err != nil {
		return err
	}
	inA, a, fa, wa, err := pf.load(e, pos[0], "A")
	if err != nil {
		return err
	}
	inB, b, fb, wb, err := pf.load(e, pos[1], "B")
	if err != nil {
		return err
	}
	r := pairResult{A: inA.name, B: inB.name, Mode: pf.mode, As: pf.as, Illuminant: illName, Observer: cond.Observer().Name(),
		Robustness: []robustRow{}, Warnings: append(wa, wb...)}
	if r.Warnings == nil {
		r.Warnings = []string{}
	}
	if m == complement.Filters {
		r.Tolerances = map[string]float64{"black_y": pf.opt.BlackY, "neutral_y": pf.opt.NeutralY, "neutral_chroma": pf.opt.NeutralChroma}
		res, err := cond.CheckSubtractive(a, b, pf.opt)
		if err != nil {
			return pairError(err, inA, inB)
		}
		r.Verdict = res.Verdict
		r.StackY, r.StackChroma, r.DeltaUVPrime = ptr(res.StackY), ptr(res.StackChroma), res.DeltaUVPrime
		r.Warnings = append(r.Warnings, res.Warnings...)
		peakA, _ := a.Max()
		peakB, _ := b.Max()
		r.Warnings = append(r.Warnings, lightsHint(peakA, peakB)...)
	} else {
		r.Tolerances = map[string]float64{"uv_prime": pf.opt.DeltaUVPrime, "spectral_rms": pf.opt.SpectralRMS}
		res, err := cond.CheckAdditive(a, b, m, pf.opt)
		if err != nil {
			return pairError(err, inA, inB)
		}
		r.Verdict = res.Verdict
		r.DeltaUVPrime, r.SpectralRMS, r.SpectralMax = ptr(res.DeltaUVPrime), ptr(res.SpectralRMS), ptr(res.SpectralMax)
		r.Scale, r.DeltaDuv, r.DE00 = ptr(res.Scale), res.DeltaDuv, ptr(res.DeltaE00)
		r.Warnings = append(r.Warnings, res.Warnings...)
		ratio, err := cond.MixRatio(a, b, m)
		if err != nil {
			return pairError(err, inA, inB)
		}
		r.RatioLum, r.RatioPower = ratio.RatioLuminance, ratio.RatioPower
		r.MixUV, r.LineDistance = ptr(ratio.DeltaUVPrime), ptr(ratio.LineDistanceUVPrime)
		r.Warnings = append(r.Warnings, ratio.Warnings...)
		if unc != "" {
			// In the files' units: percent files were scaled by 0.01 (also
			// when the scale was detected, not given).
			ua, err := constantUncertainty(a, u*fa)
			if err != nil {
				return err
			}
			ub, err := constantUncertainty(b, u*fb)
			if err != nil {
				return err
			}
			p, err := cond.Confidence(a, b, ua, ub, m, pf.opt.DeltaUVPrime)
			if err != nil {
				return pairError(err, inA, inB)
			}
			r.Confidence = &p
		}
	}
	if unc != "" && m == complement.Filters {
		r.Warnings = append(r.Warnings, "--uncertainty gives a confidence for additive checks only")
	}
	for i, w := range r.Warnings {
		r.Warnings[i] = nameWarning(w, r.A, r.B)
	}
	if also != "" {
		ills := []colorimetry.NamedIlluminant{{Name: illName, Spectrum: cond.Illuminant()}}
		for _, name := range strings.Split(also, ",") {
			s, n, err := illuminantFlag(e, "--also", strings.TrimSpace(name))
			if err != nil {
				return err
			}
			ills = append(ills, colorimetry.NamedIlluminant{Name: n, Spectrum: s})
		}
		out, err := complement.Robustness(a, b, m, ills, []*colorimetry.Observer{cie.CIE1931(), cie.CIE1964()}, pf.opt)
		if err != nil {
			return pairError(err, inA, inB)
		}
		for _, o := range out {
			r.Robustness = append(r.Robustness, robustRow{Illuminant: o.Illuminant, Observer: o.Observer, Verdict: o.Verdict, DeltaUVPrime: o.DeltaUVPrime, StackY: o.StackY})
		}
	}
	if err := plotPair(*plotPath, pos, cond, m, r, a, b); err != nil {
		return err
	}
	if asJSON {
		if err := writeJSON(e.stdout, r); err != nil {
			return err
		}
	} else {
		printPair(e, r)
	}
	if strict && r.Verdict == complement.None {
		return fmt.Errorf("%w: %s and %s are not complements", errStrict, r.A, r.B)
	}
	return nil
}

// pairError names the file behind an input error of the complement package.
func pairError(err error, a, b spectrumIn) error {
	var ie *complement.InputError
	if errors.As(err, &ie) {
		switch ie.Input {
		case "a":
			return fmt.Errorf("%s: %v", a.place(), ie.Err)
		case "b":
			return fmt.Errorf("%s: %v", b.place(), ie.Err)
		}
	}
	return err
}

func printPair(e *env, r pairResult) {
	w := e.stdout
	how := "added"
	switch {
	case r.Mode == "subtractive":
		how = "stacked (filters)"
	case r.As == "light":
		how = "added (lights)"
	case r.As != "light":
		how = "added (surfaces mixed optically)"
	}
	fmt.Fprintf(w, "%s + %s, %s, white %s, %s observer\n\n", r.A, r.B, how, r.Illuminant, r.Observer)
	fmt.Fprintf(w, "verdict: %s\n", r.Verdict)
	t := &table{left: map[int]bool{2: true}}
	add := func(label string, v *float64, format, note string) {
		if v != nil {
			t.row(label, fmt.Sprintf(format, *v), note)
		}
	}
	if r.Mode == "subtractive" {
		add("stack Y (0–100)", r.StackY, "%.3f", fmt.Sprintf("black ≤ %g, neutral ≤ %g", r.Tolerances["black_y"], r.Tolerances["neutral_y"]))
		add("stack C*ab", r.StackChroma, "%.2f", fmt.Sprintf("neutral ≤ %g", r.Tolerances["neutral_chroma"]))
		add("Δu′v′ of stack to white", r.DeltaUVPrime, "%.4f", "")
	} else {
		add("Δu′v′ of A + B as given, to white", r.DeltaUVPrime, "%.5f", fmt.Sprintf("tolerance %g", r.Tolerances["uv_prime"]))
		add("spectral RMS residual, as given", r.SpectralRMS, "%.4f", fmt.Sprintf("of the white's peak; tolerance %g", r.Tolerances["spectral_rms"]))
		add("spectral max residual, as given", r.SpectralMax, "%.4f", "")
		add("scale of the white", r.Scale, "%.4g", "best fit of A + B as given to s·white")
		add("ΔDuv", r.DeltaDuv, "%+.5f", "")
		add("ΔE00 (luminance normalised)", r.DE00, "%.2f", "")
		add("best ratio A:B by luminance", r.RatioLum, "%.4g", "")
		add("best ratio A:B by radiant power", r.RatioPower, "%.4g", "")
		add("Δu′v′ at the best ratio", r.MixUV, "%.5f", "")
		add("white's distance from line A–B", r.LineDistance, "%.5f", "Δu′v′; 0 for exact complements")
		add("confidence", r.Confidence, "%.3f", "probability that the true Δu′v′ is within tolerance")
	}
	t.write(w)
	if len(r.Robustness) > 0 {
		fmt.Fprintln(w, "\nrobustness:")
		rt := &table{}
		if r.Mode == "subtractive" {
			rt.header("illuminant", "observer", "verdict", "stack Y")
		} else {
			rt.header("illuminant", "observer", "verdict", "Δu′v′")
		}
		for _, o := range r.Robustness {
			v := o.DeltaUVPrime
			f := "%.5f"
			if r.Mode == "subtractive" {
				v, f = o.StackY, "%.3f"
			}
			rt.row(o.Illuminant, o.Observer, string(o.Verdict), fmtOpt(v, f))
		}
		rt.write(w)
	}
	if len(r.Warnings) > 0 {
		fmt.Fprintf(w, "\nwarnings:\n  %s\n", strings.Join(r.Warnings, "\n  "))
	}
}
