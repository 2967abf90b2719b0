package main

import (
	"flag"
	"fmt"
	"slices"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/complement"
)

func init() {
	register(&command{
		name:    "partner",
		summary: "rank a library of spectra as complement partners of a spectrum",
		usage:   "partner A LIBRARY [--mode additive|subtractive] [--as light|reflectance|transmittance] [--illuminant NAME|FILE] [--observer 1931|1964] [--top 10] [--json]",
		about: `Ranks every spectrum of LIBRARY as a complement partner of A, best first.
Additive: by Δu′v′ of the best-ratio mix to the white, then by the white's
distance from the line A–partner. Subtractive (stacked filters): by the stack's
luminous transmittance Y, then by its chroma. LIBRARY may be any spectral file
(the wavelength-rows layout suits large libraries); tristimulus values are
computed once for the whole library, so 100 000 candidates take a fraction of
a second. The verdicts and tolerances are those of 'antipode pair', applied
to the best-ratio mix.

Which mix each figure is of (JSON keys in brackets):
  Δu′v′ at the best ratio [mix_delta_uv_prime, and delta_uv_prime, kept
    for compatibility]: A + t·candidate at the ratio t that comes nearest
    the white; 'antipode pair' gives the same quantity under
    mix_delta_uv_prime. Its own delta_uv_prime is a different figure: A + B
    as given.
  spectral RMS [spectral_rms]: of the same best-ratio mix against the
    white at its best-fitting scale, on the computation grid (360–830 nm at
    1 nm for most illuminants). 'antipode pair' takes it of A + B as
    given, so the two differ unless the pair is already at its best ratio
    (and then only by the grid).
  ratio A:B by luminance [ratio_luminance]: Y(A) : Y(t·candidate).
Subtractive: delta_uv_prime is Δu′v′ of the light the stack passes and
mix_delta_uv_prime is null. A may be -:NAME (one spectrum of standard
input) or LIBRARY may be -, not both.`,
		example: `  $ antipode partner cmd/antipode/demo/filters.csv:gel-deep-amber cmd/antipode/demo/filters.csv --mode subtractive --top 3
  $ antipode partner lamps.csv:wash-amber lamps.csv --json`,
		run: runPartner,
	})
}

func runPartner(e *env, args []string) error {
	var pf pairFlags
	var top int
	var asJSON bool
	fs := flag.NewFlagSet("partner", flag.ContinueOnError)
	pf.define(fs)
	fs.IntVar(&top, "top", 10, "show the best `N` candidates (0: all)")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	pos, err := parseFlags(commands["partner"], fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) != 2 {
		return usagef("want a spectrum A and a LIBRARY (got %s)", plural(len(pos), "argument", "arguments"))
	}
	if err := oneStdin(pos...); err != nil {
		return err
	}
	if top < 0 {
		return usagef("--top %d: want 0 or more", top)
	}
	m, cond, illName, err := pf.resolve(e)
	if err != nil {
		return err
	}
	inA, a, _, warnA, err := pf.load(e, pos[0], "A")
	if err != nil {
		return err
	}
	lib, err := spectrumArg(e, pos[1])
	if err != nil {
		return err
	}
	names := make([]string, len(lib))
	spectra := make([]colorimetry.Spectrum, len(lib))
	for i, in := range lib {
		names[i] = in.name
		if pf.as == "light" {
			spectra[i] = in.s.WithExtrap(colorimetry.ExtrapZero)
			continue
		}
		if spectra[i], _, _, _, err = asFraction(in, pf.scale, pf.as); err != nil {
			return err
		}
	}
	l, err := cond.NewLibrary(names, spectra)
	if err != nil {
		return libraryError(err, pos[1])
	}
	ranked, err := l.Partners(a, m, pf.opt)
	if err != nil {
		return pairError(err, inA, inA)
	}
	// A itself, when the library holds it (same name, same values), is no
	// partner of its own; the indices keep the library's order.
	ranked = slices.DeleteFunc(ranked, func(p complement.Partner) bool {
		in := lib[p.Index]
		return in.name == inA.name && sameSpectrum(in.s, inA.s)
	})
	if top > 0 && len(ranked) > top {
		ranked = ranked[:top]
	}
	if asJSON {
		rows := make([]partnerRow, len(ranked))
		for i, p := range ranked {
			rows[i].Partner = p
			if m != complement.Filters {
				rows[i].MixUV = p.DeltaUVPrime
			}
		}
		return writeJSON(e.stdout, rows)
	}
	w := e.stdout
	fmt.Fprintf(w, "partners of %s from %s (%s), %s, white %s, %s observer\n\n", inA.name, pos[1], plural(len(lib), "candidate", "candidates"), pf.mode, illName, cond.Observer().Name())
	t := &table{left: map[int]bool{2: true}}
	if m == complement.Filters {
		t.header("rank", "name", "verdict", "stack Y", "stack C*ab")
		for i, p := range ranked {
			t.row(fmt.Sprint(i+1), p.Name, string(p.Verdict), fmtOpt(p.StackY, "%.3f"), fmtOpt(p.StackChroma, "%.2f"))
		}
	} else {
		t.header("rank", "name", "verdict", "Δu′v′ at best ratio", "line distance", "ratio A:B (lum.)", "spectral RMS at best ratio")
		for i, p := range ranked {
			t.row(fmt.Sprint(i+1), p.Name, string(p.Verdict), fmtOpt(p.DeltaUVPrime, "%.5f"), fmtOpt(p.LineDistanceUVPrime, "%.5f"), fmtOpt(p.RatioLuminance, "%.4g"), fmtOpt(p.SpectralRMS, "%.4f"))
		}
	}
	t.left[1] = true
	t.write(w)
	if len(warnA) > 0 {
		fmt.Fprintf(w, "\nwarnings:\n  %s\n", joinLines(warnA))
	}
	return nil
}

// partnerRow is one entry of "partner --json": the keys of
// complement.Partner (a contract) and mix_delta_uv_prime, Δu′v′ of the
// best-ratio mix to the white — the same value as delta_uv_prime, under
// the key "pair" uses for that quantity (pair's delta_uv_prime is of A + B
// as given). It is null in subtractive mode.
type partnerRow struct {
	complement.Partner
	MixUV *float64 `json:"mix_delta_uv_prime"`
}

// libraryError names the library file in an error of the complement
// package (which names the entry by number and name).
func libraryError(err error, file string) error {
	return fmt.Errorf("%s: %v", file, err)
}

// sameSpectrum reports whether a and b hold the same samples on the same
// grid.
func sameSpectrum(a, b colorimetry.Spectrum) bool {
	if a.Grid() != b.Grid() || a.Len() != b.Len() {
		return false
	}
	for i := range a.Len() {
		if a.Value(i) != b.Value(i) {
			return false
		}
	}
	return true
}
