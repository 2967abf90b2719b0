package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"slices"
	"sort"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// The commands "correct" and "neutralize" work on a pigments model file.

func init() {
	register(&command{
		name:    "correct",
		summary: "correct a paint recipe from a measured trial batch (pigments model)",
		usage:   "correct PIGMENTS.json --recipe RECIPE.json --trial FILE[:NAME] --target FILE[:NAME] [--illuminant D65] [--observer 1931] [--also A,F11] [--tolerance 0.5] [--scale fraction|percent] [--json]",
		about: `Corrects a recipe after a trial batch: the trial's measured reflectance shows
how far the model was off for this recipe. The model's K/S is corrected at
every wavelength by the ratio between the trial's K/S and the K/S the model
predicted for it, and the recipe is solved again with the same colorants for
the smallest ΔE00 to the target. Repeat with each new trial: the corrections
converge even when the calibration is off by several percent.

RECIPE.json is the output of "antipode solve … --json" (the first recipe is
taken), the output of "antipode correct … --json" (so rounds chain), or a
plain object {"amounts": {"colorant": fraction, …}}.

The output gives ΔE00 of the trial against the target and against the
model's prediction, the corrected recipe with the ΔE00 the corrected model
expects, and what to add to the trial batch (per kg of batch) to reach the
corrected recipe without remixing. With --json it is the solve shape,
{"recipes":[{…, "trial_dE00", "model_dE00", "additions_per_unit_batch"}]}.`,
		example: `  $ antipode fit pigments cmd/antipode/demo/paint_ladders.csv --out paints.json
  $ antipode solve paints.json --target cmd/antipode/demo/paint_target.csv --json > recipe.json
  $ antipode correct paints.json --recipe recipe.json --trial cmd/antipode/demo/paint_trial.csv --target cmd/antipode/demo/paint_target.csv

` + pigmentCaution,
		run: runCorrect,
	})
	register(&command{
		name:    "neutralize",
		summary: "find the colorant that mixes with a paint to the most neutral grey (pigments model)",
		usage:   "neutralize PIGMENTS.json --paint NAME|FILE[:NAME] [--illuminant D65] [--observer 1931] [--json]",
		about: `Finds the subtractive complement of a paint among the model's colorants: for
each chromatic colorant, the mass fraction in a paint + colorant mix that
brings the opaque film closest to a neutral grey (smallest chroma C*ab under
the illuminant), ranked by the residual chroma. --paint names a colorant of
the model, or a measured reflectance (FILE or FILE:NAME): its scattering is
then estimated from the model recipe that matches it best. Achromatic
colorants (white, blacks) are not offered: they only dilute the colour.
A colorant is listed as a neutraliser only when its greyest mix lowers the
paint's chroma by at least 1 C*ab and by at least 10 %; the others are named
on the "no neutral crossing" line (and carry "neutralises": false in JSON).

The fraction is the colorant's share of the mix; the ratio is parts of
colorant per part of paint by mass.`,
		example: `  $ antipode fit pigments cmd/antipode/demo/paint_ladders.csv --out paints.json
  $ antipode neutralize paints.json --paint ky-brick
  $ antipode neutralize paints.json --paint cmd/antipode/demo/paint_target.csv --json

` + pigmentCaution,
		run: runNeutralize,
	})
}

// loadPigments loads the model file of the command cmd, which must be a
// pigments model, and returns the other arguments; it prints cmd's help
// for --help before the model file.
func loadPigments(e *env, cmd string, args []string) (*mixing.Pigments, []string, error) {
	path, rest, err := modelArg(cmd, args)
	if err != nil {
		if err == errHelp {
			printCommandHelp(e.stdout, commands[cmd], nil)
		}
		return nil, nil, err
	}
	m, err := loadModel(path)
	if err != nil {
		return nil, nil, err
	}
	p, ok := m.(*mixing.Pigments)
	if !ok {
		return nil, nil, fmt.Errorf("%s: a %s model; %s needs a pigments model (antipode fit pigments)", path, m.Kind(), cmd)
	}
	return p, rest, nil
}

// readRecipe reads RECIPE.json: solve or correct output (first recipe), or
// {"amounts": {…}}.
func readRecipe(path string) ([]mixing.Amount, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var doc struct {
		Recipes []struct {
			Amounts map[string]float64 `json:"amounts"`
		} `json:"recipes"`
		Amounts map[string]float64 `json:"amounts"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		return nil, fmt.Errorf("%s: not a recipe file: %v", path, err)
	}
	am := doc.Amounts
	if len(doc.Recipes) > 0 {
		am = doc.Recipes[0].Amounts
	}
	if len(am) == 0 {
		return nil, fmt.Errorf("%s: no amounts: want the JSON of 'antipode solve --json' or {\"amounts\": {\"colorant\": fraction, …}}", path)
	}
	names := make([]string, 0, len(am))
	for n := range am {
		names = append(names, n)
	}
	sort.Strings(names)
	out := make([]mixing.Amount, 0, len(am))
	for _, n := range names {
		v := am[n]
		if !(v >= 0) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%s: amount of %q = %g: want a mass fraction ≥ 0", path, n, v)
		}
		out = append(out, mixing.Amount{Name: n, Value: v})
	}
	return out, nil
}

func runCorrect(e *env, args []string) error {
	c := commands["correct"]
	p, rest, err := loadPigments(e, "correct", args)
	if err != nil {
		return err
	}
	var rf recipeFlags
	var recipe, trial, target string
	var asJSON bool
	fs := flag.NewFlagSet("correct", flag.ContinueOnError)
	fs.StringVar(&recipe, "recipe", "", "the recipe the trial was mixed from: `RECIPE.json` (solve or correct --json output, or {\"amounts\":{…}})")
	fs.StringVar(&trial, "trial", "", "the trial batch's measured reflectance: a spectral `FILE`, or FILE:NAME")
	fs.StringVar(&target, "target", "", "target reflectance: a spectral `FILE`, or FILE:NAME")
	rf.common(fs)
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	if err := parseNoArgs(c, fs, e, rest); err != nil {
		return err
	}
	if recipe == "" {
		return usagef("--recipe RECIPE.json is required")
	}
	rf.colorants, rf.alternatives = 1, 1
	opt, err := rf.options(e)
	if err != nil {
		return err
	}
	am, err := readRecipe(recipe)
	if err != nil {
		return err
	}
	for _, a := range am {
		if !isColorant(p, a.Name) {
			return fmt.Errorf("%s: no colorant %q in the model (it has %s)", recipe, a.Name, strings.Join(p.Names(), ", "))
		}
	}
	// Correct normalises the recipe and warns (in the recipe's warnings)
	// when the fractions do not sum to 1; the table's "was" shows the
	// proportions it used, so that "change" compares like with like.
	sum, sumWarn := fractionSum(am)
	tin, ts, w1, err := oneSpectrum(e, "target", target, rf.scale)
	if err != nil {
		return err
	}
	rin, rs, w2, err := oneSpectrum(e, "trial", trial, rf.scale)
	if err != nil {
		return err
	}
	res, err := p.Correct(am, rs, ts, opt)
	if err != nil {
		if r, ok := strings.CutPrefix(err.Error(), "recipe: "); ok {
			return fmt.Errorf("%s: %s", recipe, r)
		}
		return fmt.Errorf("%s against %s: %v", rin.place(), tin.place(), err)
	}
	rec := res.Recipe
	rec.Warnings = append(append(append([]string(nil), w1...), w2...), rec.Warnings...)
	rec.Extra["trial_dE00"] = res.TrialDE00
	rec.Extra["model_dE00"] = res.ModelDE00
	if res.Additions != nil {
		add := map[string]float64{}
		for _, a := range res.Additions {
			add[a.Name] = a.Value
		}
		rec.Extra["additions_per_unit_batch"] = add
	} else {
		rec.Extra["additions_per_unit_batch"] = nil
	}
	if asJSON {
		return writeSolution(e, mixing.Solution{Recipes: []mixing.Recipe{rec}})
	}
	fmt.Fprintf(e.stdout, "Correction of %s\n", amountText(am))
	if len(sumWarn) > 0 {
		fmt.Fprintf(e.stdout, "(%s, which \"was\" below shows)\n", sumWarn[0])
		// The header says it; the library's warning below would repeat it
		// (JSON keeps it).
		rec.Warnings = slices.DeleteFunc(slices.Clone(rec.Warnings), func(w string) bool {
			return strings.HasPrefix(w, "the recipe's mass fractions sum to")
		})
	}
	fmt.Fprintf(e.stdout, "from trial %s, target %s\nunder %s, %s\n\n", rin.place(), tin.place(), opt.Illuminant.Name, opt.Observer.Name())
	fmt.Fprintf(e.stdout, "trial against target:      ΔE00 %.2f\n", res.TrialDE00)
	fmt.Fprintf(e.stdout, "trial against the model:   ΔE00 %.2f (how far the calibration was off for this recipe)\n", res.ModelDE00)
	fmt.Fprintln(e.stdout, "\ncorrected recipe (mass fractions):")
	old := map[string]float64{}
	for _, a := range am {
		old[strings.ToLower(a.Name)] += a.Value / sum
	}
	var t table
	t.header("   colorant", "was", "now", "change")
	for _, a := range rec.Amounts {
		was := old[strings.ToLower(a.Name)]
		t.row("   "+a.Name, fmt.Sprintf("%.5f", was), fmt.Sprintf("%.5f", a.Value), fmt.Sprintf("%+.5f", a.Value-was))
	}
	t.write(e.stdout)
	reach := "reachable"
	if !rec.Reachable {
		reach = "NOT reachable with these colorants"
	}
	fmt.Fprintf(e.stdout, "the corrected model expects ΔE00 %.2f (%s)\n", rec.DE00, reach)
	if res.Additions != nil {
		fmt.Fprintln(e.stdout, "\nto correct the trial batch, add per kg of batch:")
		var at table
		for _, a := range res.Additions {
			at.row("   "+a.Name, fmt.Sprintf("%.1f g", 1000*a.Value))
		}
		at.write(e.stdout)
	}
	for _, x := range rec.Warnings {
		fmt.Fprintf(e.stdout, "warning: %s\n", x)
	}
	return nil
}

// neutralJSON is the JSON of "antipode neutralize".
type neutralJSON struct {
	Paint       string             `json:"paint"`
	PaintLab    map[string]float64 `json:"paint_lab"`
	PaintChroma float64            `json:"paint_chroma"`
	Illuminant  string             `json:"illuminant"`
	Observer    string             `json:"observer"`
	Candidates  []neutralCandJSON  `json:"candidates"`
	Recipe      map[string]float64 `json:"paint_recipe"`
	Warnings    []string           `json:"warnings"`
}

type neutralCandJSON struct {
	Colorant    string             `json:"colorant"`
	Fraction    float64            `json:"fraction"`
	Ratio       *float64           `json:"ratio"`
	Chroma      float64            `json:"residual_chroma"`
	Lab         map[string]float64 `json:"lab"`
	Interior    bool               `json:"interior"`
	Neutralises bool               `json:"neutralises"`
}

// A colorant neutralises a paint when its greyest mix lies inside the
// mixing line (Interior) and lowers the paint's chroma C*ab by at least
// neutralMinDrop and by at least the share neutralMinShare of it.
//
// The absolute floor, 1 C*ab, is about one just-noticeable difference in
// CIELAB (common practice, no source): a smaller drop cannot be seen, nor
// told from the model's error. The relative floor, 10 %, rejects the small
// dip in chroma that mixing any two colorants of neighbouring hue gives
// (subtractive mixing darkens and dulls a little): ky-sunflower in
// ky-barn-red dips from C*ab 57.5 to 57.3 at a fraction of 0.56 without
// cancelling any hue. A complement brings the chroma down by far more
// (ky-deep-sea takes the same red to 0.3).
const (
	neutralMinDrop  = 1.0 // C*ab units
	neutralMinShare = 0.1 // of the paint's C*ab
)

// neutralises reports whether n is a neutraliser of a paint of chroma
// paintC (C*ab), by the criterion above.
func neutralises(n mixing.Neutraliser, paintC float64) bool {
	drop := paintC - n.Chroma
	return n.Interior && drop >= neutralMinDrop && drop >= neutralMinShare*paintC
}

func labMap(l colorimetry.Lab) map[string]float64 {
	return map[string]float64{"L": l.L, "a": l.A, "b": l.B}
}

func runNeutralize(e *env, args []string) error {
	c := commands["neutralize"]
	p, rest, err := loadPigments(e, "neutralize", args)
	if err != nil {
		return err
	}
	var paint, scale string
	var vf viewFlags
	var asJSON bool
	fs := flag.NewFlagSet("neutralize", flag.ContinueOnError)
	fs.StringVar(&paint, "paint", "", "the paint: a colorant `NAME` of the model, or a measured reflectance FILE or FILE:NAME")
	vf.define(fs, "D65", "illuminant for the chroma")
	fs.StringVar(&scale, "scale", "", "scale of a measured paint: `fraction` (0–1) or percent; default: percent when the maximum exceeds 1.5")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	if err := parseNoArgs(c, fs, e, rest); err != nil {
		return err
	}
	if paint == "" {
		return usagef("--paint NAME or FILE is required")
	}
	o, ill, err := vf.named(e)
	if err != nil {
		return err
	}
	opt := mixing.NeutralOptions{Observer: o, Illuminant: ill}
	var res mixing.Neutralisation
	if isColorant(p, paint) {
		res, err = p.Neutralise(paint, opt)
	} else {
		if !fileArgExists(paint) {
			return usagef("--paint %s: not a colorant of the model (%s) and not a file", paint, strings.Join(p.Names(), ", "))
		}
		in, ps, warns, rerr := oneSpectrum(e, "paint", paint, scale)
		if rerr != nil {
			return rerr
		}
		res, err = p.NeutraliseSpectrum(in.name, ps, opt)
		res.Warnings = append(warns, res.Warnings...)
	}
	if err != nil {
		return err
	}
	if asJSON {
		out := neutralJSON{Paint: res.Paint, PaintLab: labMap(res.PaintLab), PaintChroma: res.PaintChroma, Illuminant: ill.Name, Observer: o.Name(), Warnings: nonNil(res.Warnings), Candidates: []neutralCandJSON{}}
		for _, n := range res.Candidates {
			cj := neutralCandJSON{Colorant: n.Colorant, Fraction: n.Fraction, Chroma: n.Chroma, Lab: labMap(n.Lab), Interior: n.Interior,
				Neutralises: neutralises(n, res.PaintChroma)}
			if !math.IsInf(n.Ratio, 0) {
				r := n.Ratio
				cj.Ratio = &r
			}
			out.Candidates = append(out.Candidates, cj)
		}
		if res.Recipe != nil {
			out.Recipe = map[string]float64{}
			for _, a := range res.Recipe {
				out.Recipe[a.Name] = a.Value
			}
		}
		return writeJSON(e.stdout, out)
	}
	lch := res.PaintLab.LCh()
	fmt.Fprintf(e.stdout, "Neutralising %s: L* %.1f, C*ab %.1f, h_ab %.0f° under %s, %s\n", res.Paint, res.PaintLab.L, lch.C, lch.H, ill.Name, o.Name())
	if res.Recipe != nil {
		fmt.Fprintf(e.stdout, "(scattering estimated from the matching recipe %s)\n", amountText(res.Recipe))
	}
	fmt.Fprintln(e.stdout)
	var t table
	t.header("colorant", "fraction", "parts per part paint", "residual C*ab", "L* of the grey", "hue left")
	var none []string
	for _, n := range res.Candidates {
		if !neutralises(n, res.PaintChroma) {
			none = append(none, n.Colorant)
			continue
		}
		t.row(n.Colorant, fmt.Sprintf("%.4f", n.Fraction), fmt.Sprintf("%.3f", n.Ratio), fmt.Sprintf("%.2f", n.Chroma), fmt.Sprintf("%.1f", n.Lab.L), fmt.Sprintf("%.0f°", n.Lab.LCh().H))
	}
	if len(t.rows) > 1 {
		t.write(e.stdout)
	} else {
		fmt.Fprintln(e.stdout, "no colorant of the model brings this paint closer to grey than the paint itself")
	}
	if len(none) > 0 {
		fmt.Fprintf(e.stdout, "no neutral crossing (no mix is greyer than the paint by %g C*ab and %.0f %%, nor than the colorant alone): %s\n", neutralMinDrop, 100*neutralMinShare, strings.Join(none, ", "))
	}
	for _, x := range res.Warnings {
		fmt.Fprintf(e.stdout, "warning: %s\n", x)
	}
	return nil
}

// isColorant reports whether name is a colorant of p (case-insensitive).
func isColorant(p *mixing.Pigments, name string) bool {
	for _, n := range p.Names() {
		if strings.EqualFold(n, name) {
			return true
		}
	}
	return false
}

// fileArgExists reports whether a FILE:NAME argument names an existing
// file.
func fileArgExists(arg string) bool {
	if i := strings.LastIndex(arg, ":"); i > 0 {
		if _, err := os.Stat(arg[:i]); err == nil {
			return true
		}
	}
	_, err := os.Stat(arg)
	return err == nil
}
