package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"sort"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/mixing"
)

// The model commands — fit, mix, solve — dispatch on the model family.
// Each family registers its handlers from its own file (fit_lights.go …).

// modelFamily holds one family's command handlers.
type modelFamily struct {
	kind string
	// fitHelp describes the measurement file layout for "fit KIND --help".
	fitHelp string
	// fit reads measurement files and writes a model file.
	fit func(e *env, args []string) error
	// mix runs the forward model (nil: not offered).
	mix func(e *env, m mixing.Model, args []string) error
	// solve runs the inverse (nil: not offered).
	solve func(e *env, m mixing.Model, args []string) error
}

var families = map[string]*modelFamily{}

func registerFamily(f *modelFamily) { families[f.kind] = f }

func familyNames() string {
	n := make([]string, 0, len(families))
	for k := range families {
		n = append(n, k)
	}
	sort.Strings(n)
	return strings.Join(n, "|")
}

func init() {
	register(&command{
		name:    "fit",
		summary: "calibrate a mixing model from measurements and write it as JSON",
		usage:   "fit KIND MEASUREMENTS… --out MODEL.json [flags]   (KIND: lights, dyes, pigments, halftone)",
		about: `Fits a mixing model to calibration measurements, prints the fit report
(residual per sample, RMS spectral error, ΔE00 mean / 95th percentile / maximum
on training and held-out samples) and writes the model file (JSON, schema
"antipode-model/1"; see the README). "antipode fit KIND --help" describes the
measurement layout each kind expects.`,
		example: `  $ antipode fit lights cmd/antipode/demo/rig_ramps.csv --out rig.json
  $ antipode fit dyes cmd/antipode/demo/dyes_dilutions.csv --out dyes.json --holdout 0.25`,
		run: runFit,
	})
	register(&command{
		name:    "mix",
		summary: "predict the spectrum of a mix from a model file",
		usage:   "mix MODEL.json --amounts name=value,… [--out FILE] [--json]",
		about: `Runs a fitted model forward: the spectrum and colour of the given amounts
(drive levels 0–1 for lights, concentrations for dyes, mass fractions for
pigments, coverages as fractions 0–1 for halftone inks: 40 % is 0.4).
"antipode mix MODEL.json --help" lists the flags of the model's kind; the
names are the model's channels, dyes, colorants or inks ('antipode demo'
writes rig.json, dyes.json, paints.json and press.json to try).`,
		example: `  $ antipode fit lights cmd/antipode/demo/rig_ramps.csv --out rig.json
  $ antipode mix rig.json --amounts wash-red=0.8,wash-green=0.35,wash-blue=0.1
  $ antipode mix rig.json --help`,
		run: runMix,
	})
	register(&command{
		name:    "solve",
		summary: "solve a model file for the amounts that reach a target",
		usage:   "solve MODEL.json (--target FILE | --lab L,a,b | --xy x,y | --cct K [--duv d]) [flags] [--json]",
		about: `Solves a fitted model for the amounts that reach a target and prints the
recipes ranked best first, each with the ΔE00 (or Δu′v′ for lights) reached
and whether the target was reachable. "antipode solve MODEL.json --help" lists
the flags of the model's kind. With --json the output is one object whose key
"recipes" is the ranked array of {amounts, dE00, reachable, warnings, …}.`,
		example: `  $ antipode fit lights cmd/antipode/demo/rig_ramps.csv --out rig.json
  $ antipode solve rig.json --cct 4000 --duv 0
  $ antipode fit dyes cmd/antipode/demo/dyes_dilutions.csv --out dyes.json
  $ antipode solve dyes.json --target cmd/antipode/demo/dyes_target.csv --json
  $ antipode solve dyes.json --help`,
		run: runSolve,
	})
}

func runFit(e *env, args []string) error {
	if len(args) == 0 || strings.HasPrefix(args[0], "-") {
		if len(args) > 0 && (args[0] == "--help" || args[0] == "-h" || args[0] == "-help") {
			printCommandHelp(e.stdout, commands["fit"], nil)
			return errHelp
		}
		return usagef("name the model kind first: fit %s MEASUREMENTS --out MODEL.json", familyNames())
	}
	f, ok := families[args[0]]
	if !ok || f.fit == nil {
		return usagef("unknown model kind %q (want %s)", args[0], familyNames())
	}
	return f.fit(e, args[1:])
}

// loadModel reads a model file.
func loadModel(path string) (mixing.Model, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	m, err := mixing.Load(bytes.NewReader(b))
	if err != nil {
		return nil, fmt.Errorf("%s: %v", path, err)
	}
	return m, nil
}

// modelArg splits off the model file (the first positional argument) and
// returns its family.
func modelArg(cmd string, args []string) (string, []string, error) {
	for i, a := range args {
		if a == "--help" || a == "-h" || a == "-help" {
			if i == 0 {
				return "", nil, errHelp
			}
			break
		}
		if !strings.HasPrefix(a, "-") {
			return a, append(append([]string{}, args[:i]...), args[i+1:]...), nil
		}
	}
	return "", nil, usagef("name a model file: %s", commands[cmd].usage)
}

func runMix(e *env, args []string) error {
	path, rest, err := modelArg("mix", args)
	if err != nil {
		if err == errHelp {
			printCommandHelp(e.stdout, commands["mix"], nil)
		}
		return err
	}
	m, err := loadModel(path)
	if err != nil {
		return err
	}
	e.modelPath = path
	f := families[m.Kind()]
	if f == nil || f.mix == nil {
		return fmt.Errorf("%s: the %s model has no forward command yet", path, m.Kind())
	}
	return f.mix(e, m, rest)
}

func runSolve(e *env, args []string) error {
	path, rest, err := modelArg("solve", args)
	if err != nil {
		if err == errHelp {
			printCommandHelp(e.stdout, commands["solve"], nil)
		}
		return err
	}
	m, err := loadModel(path)
	if err != nil {
		return err
	}
	e.modelPath = path
	f := families[m.Kind()]
	if f == nil || f.solve == nil {
		return fmt.Errorf("%s: the %s model has no solve command yet", path, m.Kind())
	}
	return f.solve(e, m, rest)
}

// parseAmounts parses "name=value,name=value" (--amounts).
func parseAmounts(s string) ([]mixing.Amount, error) {
	if strings.TrimSpace(s) == "" {
		return nil, usagef("--amounts: give name=value pairs, comma-separated")
	}
	var out []mixing.Amount
	seen := map[string]bool{}
	for _, part := range strings.Split(s, ",") {
		name, val, ok := strings.Cut(part, "=")
		name = strings.TrimSpace(name)
		if !ok || name == "" {
			return nil, usagef("--amounts: %q is not name=value", part)
		}
		// The whole value must be a number: fmt.Sscanf's %g stopped at
		// the first character that was not and took "0.5abc" for 0.5.
		v, err := strconv.ParseFloat(strings.TrimSpace(val), 64)
		if err != nil || v != v || v > 1e300 || v < -1e300 {
			return nil, usagef("--amounts: %s is not a finite number", shown(strings.TrimSpace(part)))
		}
		if seen[name] {
			return nil, usagef("--amounts: %s given twice", shown(name))
		}
		seen[name] = true
		out = append(out, mixing.Amount{Name: name, Value: v})
	}
	return out, nil
}

// solutionJSON is the one shape every "solve --json" prints.
type solutionJSON struct {
	Recipes []map[string]any `json:"recipes"`
}

// writeSolution prints a solution as the shared solve JSON.
func writeSolution(e *env, sol mixing.Solution) error {
	out := solutionJSON{Recipes: []map[string]any{}}
	for _, r := range sol.Recipes {
		am := map[string]float64{}
		for _, a := range r.Amounts {
			am[a.Name] = a.Value
		}
		obj := map[string]any{"amounts": am, "dE00": r.DE00, "reachable": r.Reachable, "warnings": nonNil(r.Warnings)}
		for k, v := range r.Extra {
			obj[k] = v
		}
		out.Recipes = append(out.Recipes, obj)
	}
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetIndent("", "  ")
	if err := enc.Encode(out); err != nil {
		return err
	}
	_, err := e.stdout.Write(b.Bytes())
	return err
}

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}

// saveModel writes a model file atomically; it refuses to replace one of
// the input files.
func saveModel(path string, m mixing.Model, inputs []string) error {
	if path == "" {
		return usagef("--out MODEL.json is required")
	}
	for _, in := range inputs {
		if sameFile(in, path) {
			return usagef("--out %s would replace the input file %s", path, in)
		}
	}
	var b bytes.Buffer
	if err := mixing.Save(&b, m); err != nil {
		return err
	}
	return writeFileAtomic(path, b.Bytes())
}

// sameFile reports whether a and b name the same existing file.
func sameFile(a, b string) bool {
	fa, err1 := os.Stat(a)
	fb, err2 := os.Stat(b)
	return err1 == nil && err2 == nil && os.SameFile(fa, fb)
}

// printRecipeWarnings prints the distinct warnings of a solution's recipes,
// once each, as the closing "warnings:" block of a solve.
func printRecipeWarnings(w io.Writer, sol mixing.Solution) {
	seen := map[string]bool{}
	var all []string
	for _, r := range sol.Recipes {
		for _, wn := range r.Warnings {
			if !seen[wn] {
				seen[wn] = true
				all = append(all, wn)
			}
		}
	}
	if len(all) > 0 {
		fmt.Fprintf(w, "\nwarnings:\n  %s\n", joinLines(all))
	}
}

// amountList formats values by name, "name=value,…", each value with
// format (for the best point of a solve that did not converge).
func amountList(names []string, v []float64, format string) string {
	parts := make([]string, 0, len(v))
	for i, x := range v {
		if i < len(names) {
			parts = append(parts, names[i]+"="+fmt.Sprintf(format, x))
		}
	}
	return strings.Join(parts, ",")
}

// scorerFlags resolves --illuminant and --observer into the Scorer that
// fits, solves and mixes of object colours report ΔE00 with.
func scorerFlags(e *env, illum, obs string) (*mixing.Scorer, error) {
	o, err := observerFlag(obs)
	if err != nil {
		return nil, err
	}
	ill, name, err := illuminantFlag(e, "--illuminant", illum)
	if err != nil {
		return nil, err
	}
	return mixing.NewScorer(o, ill, name), nil
}
