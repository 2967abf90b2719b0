package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// The pigments family: fit, mix and solve for the two-constant
// Kubelka–Munk model of opaque paint films with the Saunderson correction
// (package mixing, Pigments).

// pigmentCaution ends the help of every pigments command.
const pigmentCaution = `Many pigments are toxic: read each one's safety data sheet (see 'antipode help cautions').`

const pigmentsFitHelp = `Calibrates a two-constant Kubelka–Munk model of opaque paint films from tint
ladders: each colorant alone (masstone) and mixed with the white at known mass
fractions. The white's scattering is the unit: its S is 1 at every wavelength,
and every colorant gets a unit absorption K and scattering S per unit mass
fraction relative to it. At each wavelength the equations
c·K_j + (1 − c)·K_white = q·(c·S_j + (1 − c)), one per film with measured
K/S q, are solved for all colorants together by non-negative least squares,
weighted so that the residuals are in measured reflectance. Measured values
are first converted to the film's internal reflectance by the Saunderson
correction (--refractive-index or --k1, --k2, --specular).

The measurement file is spectral CSV in the rows layout, one film per line:

  name       the sample's name (first column)
  colorant   the colorant mixed with the white; the white's own name for the
             white alone; empty for a bare drawdown-chart backing
  fraction   mass fraction of the colorant in the colorant + white mix,
             0 < fraction ≤ 1 (1 = masstone); ignored for the white alone
  backing    optional: opaque (default; the film hides what is under it),
             black or white (a film drawn over that part of a drawdown
             chart; the same colorant and fraction over the other part must
             follow, and the bare chart's white part must be measured, its
             black part too or it is taken as ideal black)
  heldout    optional, 1 keeps the film out of the fit and scores it
  400, 410, … reflectance, fraction 0–1 (or percent, see --scale), one column
             per wavelength (nm)

  name,colorant,fraction,backing,heldout,400,410,420,…
  white-1,ky-scenic-white,1,opaque,0,0.531,0.624,0.693,…
  brick-masstone,ky-brick,1,opaque,0,0.052,0.051,0.050,…
  brick-0.1,ky-brick,0.1,opaque,0,0.133,0.131,0.130,…
  chart-white,,,white,0,0.801,0.802,0.803,…

Every colorant needs at least two mass fractions, better a ladder from the
masstone down to 1:20 or 1:50; the fit warns about short or narrow ladders and
refuses a single point (it cannot separate K from S). The white is the one
colorant measured only alone, or name it with --white.

The report lists every film (RMS and largest residual in measured
reflectance, ΔE00 under --illuminant), the summary on training and held-out
films, and each colorant's K and S. The model file keeps the grid, the
colorants, the Saunderson parameters and the report.`

var fitPigmentsCommand = &command{
	name:  "fit",
	usage: "fit pigments LADDERS.csv --out PIGMENTS.json [--white NAME] [--refractive-index 1.5 | --k1 K1] [--k2 0.6] [--specular included|excluded] [--illuminant D65] [--observer 1931] [--scale fraction|percent] [--json]",
	about: pigmentsFitHelp,
	example: `  $ antipode fit pigments cmd/antipode/demo/paint_ladders.csv --out paints.json
  $ antipode fit pigments drawdowns.csv --out paints.json --white titanium-base --k2 0.5 --specular excluded

` + pigmentCaution,
}

var mixPigmentsCommand = &command{
	name:  "mix",
	usage: "mix PIGMENTS.json --amounts name=fraction,… [--illuminant D65] [--observer 1931] [--out FILE.csv] [--json]",
	about: `Runs a pigments model forward: the measured reflectance of an opaque film of
the given mass fractions (Kubelka–Munk with the model's Saunderson
correction) and its colour under the illuminant: X, Y, Z, CIELAB, C*ab and
h_ab. Colorants not named are absent. An opaque film's colour depends only on
the ratios, so fractions that do not sum to 1 are taken as proportions (with a
warning). --out writes the reflectance as CSV (wavelength column, then the
spectrum).`,
	example: `  $ antipode fit pigments cmd/antipode/demo/paint_ladders.csv --out paints.json
  $ antipode mix paints.json --amounts ky-scenic-white=0.9,ky-brick=0.06,ky-moss=0.04
  $ antipode mix paints.json --amounts ky-scenic-white=0.95,ky-deep-sea=0.05 --out sky.csv

` + pigmentCaution,
}

var solvePigmentsCommand = &command{
	name:  "solve",
	usage: "solve PIGMENTS.json (--target FILE[:NAME] | --lab L,a,b) [--illuminant D65] [--observer 1931] [--also A,F11] [--colorants 3] [--only NAME,…] [--spectral] [--metamerism-weight W] [--metamerism-limit MI] [--tolerance 0.5] [--alternatives 5] [--scale fraction|percent] [--json]",
	about: `Finds paint recipes that reproduce a target: the white plus up to --colorants
chromatic colorants, as mass fractions summing to 1. Every combination of the
model's colorants is solved for the smallest ΔE00 under --illuminant (a
Levenberg–Marquardt search on CIELAB, weighted by the local CIEDE2000 metric,
started from the linearised Kubelka–Munk equations solved by NNLS), with a
small spectral term that prefers the least metameric of equally good recipes.
Recipes are ranked best first, one per set of colorants.

--also names secondary illuminants: each recipe then reports its special
metamerism index (CIEDE2000, after the additive correction of CIE 015) under
each; --metamerism-weight adds them to the objective, --metamerism-limit makes
them a constraint (recipes over the limit are re-solved, then ranked last).
--spectral matches the reflectance curve instead of the colour. --lab takes a
CIELAB target under --illuminant instead of a reflectance (then there is no
metamerism index). A target no mix can reach still gives the nearest recipe,
marked not reachable ("reachable" means ΔE00 ≤ --tolerance).

With --json the output is {"recipes":[{"amounts":{name: fraction},"dE00",
"reachable","warnings","metamerism":{illuminant: index} or null,
"rms_spectral","lab":{"L","a","b"},"match"}]}; "antipode correct" reads it.`,
	example: `  $ antipode fit pigments cmd/antipode/demo/paint_ladders.csv --out paints.json
  $ antipode solve paints.json --target cmd/antipode/demo/paint_target.csv --also A,F11
  $ antipode solve paints.json --target cmd/antipode/demo/paint_target.csv --colorants 2 --json > recipe.json
  $ antipode solve paints.json --lab 62,18,35 --illuminant D50

` + pigmentCaution,
}

func init() {
	registerFamily(&modelFamily{kind: mixing.KindPigments, fitHelp: pigmentsFitHelp, fit: fitPigments, mix: mixPigments, solve: solvePigments})
}

// pigmentSurface holds the Saunderson flags shared by fit.
type pigmentSurface struct {
	n, k2        float64
	k1, specular string
}

func (s *pigmentSurface) flags(fs *flag.FlagSet) {
	fs.Float64Var(&s.n, "refractive-index", 1.5, "refractive index `n` of the paint's medium; k1 = ((n − 1)/(n + 1))² (Fresnel at normal incidence)")
	fs.StringVar(&s.k1, "k1", "", "Saunderson external reflection `K1` (0–1), instead of deriving it from --refractive-index")
	fs.Float64Var(&s.k2, "k2", 0.6, "Saunderson internal diffuse reflection `K2` (0–1; common practice 0.4–0.6)")
	fs.StringVar(&s.specular, "specular", "included", "measurement geometry: specular component `included` (sphere, specular port closed) or excluded")
}

func (s *pigmentSurface) resolve(set map[string]bool) (mixing.Saunderson, error) {
	var excluded bool
	switch s.specular {
	case "included":
	case "excluded":
		excluded = true
	default:
		return mixing.Saunderson{}, usagef("--specular %s: want included or excluded", s.specular)
	}
	if set["k1"] {
		if set["refractive-index"] {
			return mixing.Saunderson{}, usagef("give --k1 or --refractive-index, not both")
		}
		k1, err := strconv.ParseFloat(strings.TrimSpace(s.k1), 64)
		if err != nil {
			return mixing.Saunderson{}, usagef("--k1 %s: not a number", s.k1)
		}
		sd := mixing.Saunderson{K1: k1, K2: s.k2, SpecularExcluded: excluded}
		if err := sd.Validate(); err != nil {
			return mixing.Saunderson{}, usagef("%v", err)
		}
		return sd, nil
	}
	sd, err := mixing.SaundersonFromIndex(s.n, s.k2, excluded)
	if err != nil {
		return mixing.Saunderson{}, usagef("%v", err)
	}
	return sd, nil
}

// setFlags returns the names of the flags given on the command line.
func setFlags(fs *flag.FlagSet) map[string]bool {
	m := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { m[f.Name] = true })
	return m
}

// readLadders reads the calibration file into ladder samples.
func readLadders(e *env, path, scale string) ([]mixing.LadderSample, []string, error) {
	recs, err := readCalibration(e, path, "no colorant or fraction columns: the pigments calibration needs the rows layout (name, colorant, fraction, [backing], [heldout], then wavelengths; see 'antipode fit pigments --help')")
	if err != nil {
		return nil, nil, err
	}
	if len(recs) == 0 {
		return nil, nil, fmt.Errorf("%s: no films", path)
	}
	if _, ok := recs[0].Fields["colorant"]; !ok {
		return nil, nil, fmt.Errorf("%s:%d: no \"colorant\" column (see 'antipode fit pigments --help')", path, recs[0].Line)
	}
	scale, warns := recordsScale(recs, scale, "values")
	out := make([]mixing.LadderSample, 0, len(recs))
	for _, r := range recs {
		at := fmt.Sprintf("%s:%d", path, r.Line)
		s := mixing.LadderSample{Name: r.Name, Colorant: strings.TrimSpace(r.Fields["colorant"]), Place: at, Reflectance: r.Spectrum}
		if scale == "percent" {
			s.Reflectance = r.Spectrum.Scale(0.01)
		}
		if b, ok := r.Fields["backing"]; ok {
			if s.Backing, err = mixing.ParseBacking(b); err != nil {
				return nil, nil, fmt.Errorf("%s: field \"backing\": %v", at, err)
			}
		}
		if s.Colorant != "" {
			if strings.TrimSpace(r.Fields["fraction"]) == "" {
				return nil, nil, fmt.Errorf("%s: field \"fraction\" is empty: give the colorant's mass fraction (1 for the masstone or the white alone)", at)
			}
			if s.Fraction, err = r.Number("fraction"); err != nil {
				return nil, nil, err
			}
		}
		if h, ok := r.Fields["heldout"]; ok && strings.TrimSpace(h) != "" {
			v, err := r.Number("heldout")
			if err != nil {
				return nil, nil, err
			}
			if v != 0 && v != 1 {
				return nil, nil, fmt.Errorf("%s: field \"heldout\" = %g: want 0 or 1", at, v)
			}
			s.HeldOut = v == 1
		}
		out = append(out, s)
	}
	return out, warns, nil
}

// fitPigments runs "antipode fit pigments".
func fitPigments(e *env, args []string) error {
	ff := fitFlags{model: "PIGMENTS.json"}
	var white, scale string
	var sf pigmentSurface
	var vf viewFlags
	fs := flag.NewFlagSet("fit pigments", flag.ContinueOnError)
	ff.define(fs)
	fs.StringVar(&white, "white", "", "the white colorant's `NAME` (default: the one measured only alone)")
	sf.flags(fs)
	vf.define(fs, "D65", "illuminant for the ΔE00 of the report")
	fs.StringVar(&scale, "scale", "", "scale of the reflectances: `fraction` (0–1) or percent; default: percent when a value exceeds 1.5")
	files, err := ff.parse(fitPigmentsCommand, fs, e, args, "measurement")
	if err != nil {
		return err
	}
	if err := checkScale(scale); err != nil {
		return err
	}
	sd, err := sf.resolve(setFlags(fs))
	if err != nil {
		return err
	}
	o, ill, err := vf.named(e)
	if err != nil {
		return err
	}
	path := files[0]
	samples, warns, err := readLadders(e, path, scale)
	if err != nil {
		return err
	}
	fit, err := mixing.FitPigments(samples, mixing.FitOptions{White: white, Surface: sd, Observer: o, Illuminant: ill})
	if err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	m := fit.Model
	m.Fit.Warnings = append(warns, m.Fit.Warnings...)
	if err := saveModel(ff.out, m, files); err != nil {
		return err
	}
	if ff.asJSON {
		cols := make([]map[string]any, 0, len(m.Colorants))
		for _, c := range m.Colorants {
			cols = append(cols, map[string]any{"name": c.Name, "u_k_median_relative": medianRel(c.K, fit.UK[c.Name]), "u_s_median_relative": medianRel(c.S, fit.US[c.Name])})
		}
		return writeJSON(e.stdout, map[string]any{"model": ff.out, "kind": m.Kind(), "white": m.White, "colorants": cols, "fit": m.Fit})
	}
	printPigmentFit(e.stdout, fit, samples, path, ff.out)
	return nil
}

// medianRel returns the median of u/v over the values where both are
// usable, or nil.
func medianRel(v, u []float64) *float64 {
	var r []float64
	for i := range v {
		if v[i] > 0 && !math.IsNaN(u[i]) && u[i] > 0 {
			r = append(r, u[i]/v[i])
		}
	}
	if len(r) == 0 {
		return nil
	}
	sort.Float64s(r)
	x := r[len(r)/2]
	return &x
}

// printPigmentFit writes the human-readable fit report.
func printPigmentFit(w io.Writer, fit *mixing.PigmentFit, samples []mixing.LadderSample, path, out string) {
	m := fit.Model
	r := m.Fit
	g := m.Grid
	fmt.Fprintf(w, "Pigments model from %s: %d films, white %s and %d colorants, %g–%g nm at %g nm\n",
		path, len(samples), m.White, len(m.Colorants)-1, g.Start, g.End(), g.Step)
	fmt.Fprintf(w, "%s; ΔE00 under %s, %s; RMS and max in measured reflectance (0–1)\n\n", surfaceText(m.Surface), r.Illuminant, r.Observer)
	byName := map[string]mixing.LadderSample{}
	for _, s := range samples {
		byName[s.Name] = s
	}
	var t table
	t.left = map[int]bool{1: true, 3: true, 4: true}
	t.header("film", "colorant", "fraction", "backing", "set", "RMS", "max", "ΔE00")
	for _, s := range r.Samples {
		src := byName[s.Name]
		set := "fit"
		if s.HeldOut {
			set = "held out"
		}
		frac := fmt.Sprintf("%g", src.Fraction)
		if strings.EqualFold(src.Colorant, m.White) {
			frac = "—"
		}
		t.row(s.Name, src.Colorant, frac, src.Backing.String(), set, fmt.Sprintf("%.4f", s.RMS), fmt.Sprintf("%.4f", s.MaxAbs), fmt.Sprintf("%.2f", s.DE00))
	}
	t.write(w)
	printFitSummary(w, r, "films", 4, "mark films with heldout = 1")
	fmt.Fprintf(w, "\nColorants: unit K and S per unit mass fraction, relative to the white's scattering\n")
	var ct table
	ct.header("colorant", "strongest absorption nm", "K there", "S range", "K/S range", "median u(K)", "median u(S)")
	for _, c := range m.Colorants {
		kmax, at := 0.0, 0
		smin, smax := math.Inf(1), 0.0
		qmin, qmax := math.Inf(1), 0.0
		for l := range c.K {
			if c.K[l] > kmax {
				kmax, at = c.K[l], l
			}
			smin, smax = math.Min(smin, c.S[l]), math.Max(smax, c.S[l])
			if c.S[l] > 0 {
				q := c.K[l] / c.S[l]
				qmin, qmax = math.Min(qmin, q), math.Max(qmax, q)
			}
		}
		qr := "—"
		if qmax > 0 {
			qr = fmt.Sprintf("%.3g–%.3g", qmin, qmax)
		}
		ct.row(c.Name, fmt.Sprintf("%g", g.Wavelength(at)), fmt.Sprintf("%.3g", kmax), fmt.Sprintf("%.3g–%.3g", smin, smax), qr,
			relText(medianRel(c.K, fit.UK[c.Name])), relText(medianRel(c.S, fit.US[c.Name])))
	}
	ct.write(w)
	for _, x := range r.Warnings {
		fmt.Fprintf(w, "warning: %s\n", x)
	}
	fmt.Fprintf(w, "\nwrote %s\n", out)
}

func relText(p *float64) string {
	if p == nil {
		return "—"
	}
	return fmt.Sprintf("%.1f %%", 100**p)
}

// surfaceText describes the Saunderson parameters.
func surfaceText(s mixing.Saunderson) string {
	k1 := fmt.Sprintf("k1 %.4g", s.K1)
	if s.RefractiveIndex != 0 {
		k1 += fmt.Sprintf(" (n %g)", s.RefractiveIndex)
	}
	spec := "specular included"
	if s.SpecularExcluded {
		spec = "specular excluded"
	}
	return fmt.Sprintf("Saunderson %s, k2 %g, %s", k1, s.K2, spec)
}

// mixPigments runs "antipode mix" on a pigments model.
func mixPigments(e *env, mm mixing.Model, args []string) error {
	var amounts, out string
	var vf viewFlags
	var asJSON bool
	fs := flag.NewFlagSet("mix", flag.ContinueOnError)
	fs.StringVar(&amounts, "amounts", "", "mass fractions as `name=fraction,…`")
	vf.define(fs, "D65", "illuminant for the colour")
	fs.StringVar(&out, "out", "", "also write the reflectance to `FILE.csv`")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	if err := parseNoArgs(mixPigmentsCommand, fs, e, args); err != nil {
		return err
	}
	p, err := modelAs[*mixing.Pigments](mm, "pigments")
	if err != nil {
		return err
	}
	am, err := parseAmounts(amounts)
	if err != nil {
		return err
	}
	sc, err := vf.scorer(e)
	if err != nil {
		return err
	}
	_, warns := fractionSum(am)
	r, err := p.Reflectance(am)
	if err != nil {
		return usagef("--amounts: %v", err)
	}
	xyz, lab, err := objectColour(sc, r)
	if err != nil {
		return err
	}
	if err := e.writeSpectrumOut(out, "mix", r); err != nil {
		return err
	}
	lch := lab.LCh()
	if asJSON {
		amap := map[string]float64{}
		for _, a := range am {
			amap[a.Name] = a.Value
		}
		return writeJSON(e.stdout, map[string]any{
			"amounts": amap, "X": xyz.X, "Y": xyz.Y, "Z": xyz.Z, "L": lab.L, "a": lab.A, "b": lab.B, "C": lch.C, "h": lch.H,
			"illuminant": sc.Illuminant(), "observer": sc.Observer(),
			"reflectance": map[string]any{"start_nm": r.Grid().Start, "step_nm": r.Grid().Step, "values": r.Values(nil)},
			"warnings":    nonNil(warns),
		})
	}
	fmt.Fprintf(e.stdout, "Opaque film of %s\n", amountText(am))
	fmt.Fprintf(e.stdout, "under %s, %s:\n", sc.Illuminant(), sc.Observer())
	fmt.Fprintf(e.stdout, "  X %.3f  Y %.3f  Z %.3f\n", xyz.X, xyz.Y, xyz.Z)
	fmt.Fprintf(e.stdout, "  L* %.2f  a* %.2f  b* %.2f  C*ab %.2f  h_ab %.1f°\n", lab.L, lab.A, lab.B, lch.C, lch.H)
	for _, x := range warns {
		fmt.Fprintf(e.stdout, "warning: %s\n", x)
	}
	if out != "" {
		fmt.Fprintf(e.stdout, "wrote %s\n", out)
	}
	return nil
}

// amountText formats amounts as "name 0.900, name 0.100".
func amountText(am []mixing.Amount) string {
	parts := make([]string, len(am))
	for i, a := range am {
		parts[i] = fmt.Sprintf("%s %.4g", a.Name, a.Value)
	}
	return strings.Join(parts, ", ")
}

// recipeFlags are the flags shared by solve and correct.
type recipeFlags struct {
	viewFlags
	also, only, scale       string
	colorants, alternatives int
	tol, metaW, metaLimit   float64
	spectral                bool
}

func (r *recipeFlags) common(fs *flag.FlagSet) {
	r.define(fs, "D65", "primary illuminant, under which ΔE00 is minimised")
	fs.StringVar(&r.also, "also", "", "secondary illuminants for the metamerism index, comma-separated CIE `NAMES` (e.g. A,F11)")
	fs.Float64Var(&r.tol, "tolerance", mixing.DefaultPigmentTolerance, "`ΔE00` up to which the target counts as reached")
	fs.StringVar(&r.scale, "scale", "", "scale of the spectra given: `fraction` (0–1) or percent; default: percent when the maximum exceeds 1.5")
}

func (r *recipeFlags) search(fs *flag.FlagSet) {
	fs.IntVar(&r.colorants, "colorants", 3, "use up to `N` chromatic colorants besides the white")
	fs.StringVar(&r.only, "only", "", "search only these colorants (comma-separated `NAMES`; the white is always used)")
	fs.BoolVar(&r.spectral, "spectral", false, "match the reflectance curve (least squares) instead of the colour")
	fs.Float64Var(&r.metaW, "metamerism-weight", 0, "weight `W` of the metamerism indices under --also in the objective (0: report only)")
	fs.Float64Var(&r.metaLimit, "metamerism-limit", 0, "largest metamerism index `MI` allowed under --also (0: no limit)")
	fs.IntVar(&r.alternatives, "alternatives", 5, "show up to `N` recipes, one per set of colorants")
}

// options turns the flags into recipe options.
func (r *recipeFlags) options(e *env) (mixing.RecipeOptions, error) {
	var o mixing.RecipeOptions
	obs, ill, err := r.named(e)
	if err != nil {
		return o, err
	}
	o.Observer = obs
	o.Illuminant = ill
	if strings.TrimSpace(r.also) != "" {
		for _, n := range strings.Split(r.also, ",") {
			n = strings.TrimSpace(n)
			s, sn, err := illuminantFlag(e, "--also", n)
			if err != nil {
				return o, err
			}
			o.Also = append(o.Also, colorimetry.NamedIlluminant{Name: sn, Spectrum: s})
		}
	}
	if !(r.tol > 0) || r.tol > 1e6 {
		return o, usagef("--tolerance %v: want a positive ΔE00", r.tol)
	}
	o.Tolerance = r.tol
	if err := checkScale(r.scale); err != nil {
		return o, err
	}
	if r.colorants < 1 {
		return o, usagef("--colorants %d: want 1 or more", r.colorants)
	}
	if r.alternatives < 1 {
		return o, usagef("--alternatives %d: want 1 or more", r.alternatives)
	}
	if !(r.metaW >= 0) || r.metaW > 1e6 {
		return o, usagef("--metamerism-weight %v: want a value ≥ 0", r.metaW)
	}
	if !(r.metaLimit >= 0) || r.metaLimit > 1e6 {
		return o, usagef("--metamerism-limit %v: want a ΔE00 ≥ 0", r.metaLimit)
	}
	if (r.metaW > 0 || r.metaLimit > 0) && len(o.Also) == 0 {
		return o, usagef("--metamerism-weight and --metamerism-limit need --also ILLUMINANTS")
	}
	o.Colorants, o.Alternatives = r.colorants, r.alternatives
	o.MetamerismWeight, o.MetamerismLimit, o.Spectral = r.metaW, r.metaLimit, r.spectral
	if strings.TrimSpace(r.only) != "" {
		for _, n := range strings.Split(r.only, ",") {
			o.Only = append(o.Only, strings.TrimSpace(n))
		}
	}
	return o, nil
}

// oneSpectrum reads a FILE[:NAME] argument that must name one spectrum,
// as a fraction.
func oneSpectrum(e *env, flagName, arg, scale string) (spectrumIn, colorimetry.Spectrum, []string, error) {
	if arg == "" {
		return spectrumIn{}, colorimetry.Spectrum{}, nil, usagef("--%s FILE is required", flagName)
	}
	list, err := spectrumArg(e, arg)
	if err != nil {
		return spectrumIn{}, colorimetry.Spectrum{}, nil, err
	}
	if len(list) != 1 {
		var names []string
		for i, s := range list {
			if i == 6 {
				names = append(names, "…")
				break
			}
			names = append(names, s.name)
		}
		return spectrumIn{}, colorimetry.Spectrum{}, nil, usagef("--%s %s holds %d spectra (%s); name one as FILE:NAME", flagName, arg, len(list), strings.Join(names, ", "))
	}
	s, _, _, warns, err := asFraction(list[0], scale, "reflectance")
	if err != nil {
		return spectrumIn{}, colorimetry.Spectrum{}, nil, err
	}
	return list[0], s, warns, nil
}

// parseLab reads "L,a,b".
func parseLab(s string) (colorimetry.Lab, error) {
	f := strings.Split(s, ",")
	if len(f) != 3 {
		return colorimetry.Lab{}, usagef("--lab %s: want L,a,b", shown(s))
	}
	var v [3]float64
	for i, x := range f {
		y, err := strconv.ParseFloat(strings.TrimSpace(x), 64)
		if err != nil || math.IsNaN(y) || math.IsInf(y, 0) {
			return colorimetry.Lab{}, usagef("--lab %s: %q is not a finite number", shown(s), x)
		}
		v[i] = y
	}
	if v[0] < 0 || v[0] > 100 {
		return colorimetry.Lab{}, usagef("--lab %s: L* must lie in 0–100", shown(s))
	}
	return colorimetry.Lab{L: v[0], A: v[1], B: v[2]}, nil
}

// solvePigments runs "antipode solve" on a pigments model.
func solvePigments(e *env, mm mixing.Model, args []string) error {
	var rf recipeFlags
	var target, lab string
	var asJSON bool
	fs := flag.NewFlagSet("solve", flag.ContinueOnError)
	fs.StringVar(&target, "target", "", "target reflectance: a spectral `FILE`, or FILE:NAME for one spectrum of it")
	fs.StringVar(&lab, "lab", "", "target CIELAB `L,a,b` under --illuminant, instead of --target")
	rf.common(fs)
	rf.search(fs)
	plotPath := plotFlag(fs)
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	if err := parseNoArgs(solvePigmentsCommand, fs, e, args); err != nil {
		return err
	}
	p, err := modelAs[*mixing.Pigments](mm, "pigments")
	if err != nil {
		return err
	}
	if (target == "") == (lab == "") {
		return usagef("give a target: --target FILE or --lab L,a,b (one of them)")
	}
	opt, err := rf.options(e)
	if err != nil {
		return err
	}
	var sol mixing.Solution
	var what string
	var warns []string
	var tgt *namedSpectrum
	if target != "" {
		in, ts, w, err := oneSpectrum(e, "target", target, rf.scale)
		if err != nil {
			return err
		}
		warns = w
		what = in.place()
		tgt = &namedSpectrum{name: in.name, s: ts}
		sol, err = p.Recipe(ts, opt)
		if err != nil {
			return solveError(what, err)
		}
	} else {
		l, err := parseLab(lab)
		if err != nil {
			return err
		}
		what = fmt.Sprintf("CIELAB %.2f, %.2f, %.2f", l.L, l.A, l.B)
		if sol, err = p.RecipeLab(l, opt); err != nil {
			return solveError(what, err)
		}
	}
	prependWarnings(sol, warns)
	if err := plotObjectSolve(e, *plotPath, "reflectance", rf.illum, rf.obs, tgt, sol, p.Reflectance, fileOf(target)); err != nil {
		return err
	}
	if asJSON {
		return writeSolution(e, sol)
	}
	fmt.Fprintf(e.stdout, "Recipes for %s\nunder %s, %s; the white %s and %s; reachable means ΔE00 ≤ %g\n",
		what, opt.Illuminant.Name, opt.Observer.Name(), p.White, recipeScope(p, opt), opt.Tolerance)
	printRecipes(e.stdout, sol, opt)
	return nil
}

// recipeScope says which chromatic colorants a solve may combine with the
// white: "up to 3 of 6 colorants", or "any of the 6 colorants" when
// --colorants allows them all; the pool is --only's names (the white left
// out) when given.
func recipeScope(p *mixing.Pigments, opt mixing.RecipeOptions) string {
	pool := len(p.Colorants) - 1
	if len(opt.Only) > 0 {
		pool = 0
		for _, n := range opt.Only {
			if !strings.EqualFold(n, p.White) {
				pool++
			}
		}
	}
	noun := "colorants"
	if pool == 1 {
		noun = "colorant"
	}
	if opt.Colorants >= pool {
		return fmt.Sprintf("any of the %d %s", pool, noun)
	}
	return fmt.Sprintf("up to %d of %d %s", opt.Colorants, pool, noun)
}

// solveError adds the best recipe of a non-converged solve to the message.
func solveError(what string, err error) error {
	var ce *mixing.RecipeConvergenceError
	if errors.As(err, &ce) {
		return fmt.Errorf("%s: %v", what, err)
	}
	return fmt.Errorf("%s: %w", what, err)
}

// printRecipes writes ranked recipes as blocks.
func printRecipes(w io.Writer, sol mixing.Solution, opt mixing.RecipeOptions) {
	for i, r := range sol.Recipes {
		reach := "reachable"
		if !r.Reachable {
			reach = "NOT reachable"
		}
		line := fmt.Sprintf("\n%d. ΔE00 %.2f, %s", i+1, r.DE00, reach)
		if v, ok := r.Extra["rms_spectral"].(float64); ok {
			line += fmt.Sprintf(", RMS reflectance difference %.4f", v)
		}
		if mi, ok := r.Extra["metamerism"].(map[string]float64); ok && len(mi) > 0 {
			var parts []string
			for _, a := range opt.Also {
				if v, ok := mi[a.Name]; ok {
					parts = append(parts, fmt.Sprintf("%s %.2f", a.Name, v))
				}
			}
			line += "; metamerism index " + strings.Join(parts, ", ")
		}
		fmt.Fprintln(w, line)
		var t table
		for _, a := range r.Amounts {
			t.row("   "+a.Name, fmt.Sprintf("%.5f", a.Value), fmt.Sprintf("%6.2f %%", 100*a.Value))
		}
		t.write(w)
		for _, x := range r.Warnings {
			fmt.Fprintf(w, "   warning: %s\n", x)
		}
	}
}
