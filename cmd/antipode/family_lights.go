package main

import (
	"flag"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// The lights family: fit, mix and solve for the additive model of a rig of
// light channels (package mixing, Lights).

const lightsFitHelp = `Calibrates the lights (additive) model of a rig of channels — LED emitters,
lamps on dimmers — from drive ramps: the spectrum of each channel measured at
several drive levels, and of the rig with every channel off. The model is

  E(λ) = dark(λ) + Σ wᵢ·Sᵢ(λ),   wᵢ = responseᵢ(drive level dᵢ), 0–1

Each channel's spectrum Sᵢ is its full-drive measurement (drive 1) less the
dark. The relative output w of every other measurement is the least-squares
scale of its spectrum (less the dark) against Sᵢ; the response curve is fitted
through those outputs: a power law w = d^γ (least squares in logarithms, with
its standard error) or, with --response monotone, a monotone piecewise cubic
(Fritsch–Butland) through the mean output at each level. A ramp whose output
falls with rising drive beyond noise is an error; a channel whose spectrum
changes shape with drive (an LED's peak moving) is warned about.

The measurement file is spectral CSV in the rows layout, one spectrum per line:

  name      the measurement's name (first column)
  channel   the channel's name; "dark" for a measurement with every channel off
  drive     the drive level, 0–1 (a dimmer or DMX level as a fraction); 0 for dark
  heldout   optional: 1 keeps the measurement out of the fit and scores it
  380, 385, …  spectral power, one column per wavelength (nm), all lines in
            the same units (relative, or radiometric: say --absolute)

  name,channel,drive,heldout,380,385,390,…
  dark-1,dark,0,0,0.0001,0.0002,0.0001,…
  red@0.5,wash-red,0.5,0,0.0001,0.0001,0.0001,…
  red@1,wash-red,1,0,0.0002,0.0001,0.0003,…

Every channel needs one or more lines at drive 1 and a few below it. The
report lists every measurement (its measured output w, the curve's, RMS and
largest spectral residual of the model, ΔE00 and Δu′v′ of the model against
the measurement, both scaled to the measurement's Y = 100 against an
equal-energy white), the summary on training and held-out measurements, and
the warnings. For a saturated channel at low drive ΔE00 mostly shows noise
(CIELAB's cube root of a nearly zero Z or X magnifies it); Δu′v′ is the
steadier figure there.`

func init() {
	registerFamily(&modelFamily{kind: mixing.LightsKind, fitHelp: lightsFitHelp, fit: fitLights, mix: mixLights, solve: solveLights})
}

var fitLightsCommand = &command{
	name:  "fit",
	usage: "fit lights MEASUREMENTS.csv --out MODEL.json [--response power|monotone] [--holdout FRACTION] [--absolute] [--observer 1931] [--json]",
	about: lightsFitHelp,
	example: `  $ antipode demo --out kestrel
  $ antipode fit lights kestrel/rig_ramps.csv --out rig.json
  $ antipode fit lights kestrel/rig_ramps.csv --out rig-mono.json --response monotone --holdout 0.2`,
}

var mixLightsCommand = &command{
	name:  "mix",
	usage: "mix LIGHTS-MODEL.json --amounts name=drive,… [--observer 1931] [--out FILE.csv] [--json]",
	about: `Runs a lights model forward: the spectrum of the rig at the given drive
levels (0–1; channels not named are off) and its colour: X, Y, Z, x, y, u′, v′,
CCT and Duv (Ohno 2014; null with a warning outside the range where CIE 015
defines them) and the luminous efficacy of radiation of the channels' light.
X, Y, Z are relative — Y = 100 with every channel at full drive — unless the
model was fitted with --absolute, when they are photometric (Km = 683.002 lm/W:
cd/m² for spectral radiance, lx for irradiance). --out writes the spectrum as
CSV (wavelength column, then the spectrum).`,
	example: `  $ antipode fit lights kestrel/rig_ramps.csv --out rig.json
  $ antipode mix rig.json --amounts wash-red=0.8,wash-green=0.35,wash-blue=0.2
  $ antipode mix rig.json --amounts wash-lime=1,wash-blue=0.4 --out lime-blue.csv --json`,
}

var solveLightsCommand = &command{
	name:  "solve",
	usage: "solve LIGHTS-MODEL.json (--target FILE[:NAME] | --xy x,y | --cct K [--duv d]) [--level Y|target] [--add FILE[:NAME] [--add-level Y]] [--prefer efficacy|reference] [--maximize ra|rf|r9|efficacy|melanopic | --minimize melanopic [--tolerance-uv-prime d] [--tolerance-cct K --tolerance-duv d]] [--observer 1931] [--json]",
	about: `Finds the drive levels that make the rig reach a target chromaticity — given
as a light's spectrum (--target), as x, y, or as a CCT and Duv on the Planckian
locus — exactly, by visiting every vertex of the set of reachable mixes.

Without --level the mix is as bright as the rig allows; with --level Y it has
luminance Y on the model's scale (relative: Y = 100 with every channel at full
drive), and --level target takes the --target spectrum's own luminance in the
model's units. With more than three channels many mixes reach the target:
the recipes then also give the one of highest luminous efficacy of radiation
and the one whose spectrum is closest to a reference illuminant of the
target's CCT (Planck's law below 5000 K, CIE daylight above); --prefer says
which comes first.

--add names a coloured light (a lamp behind a gel) that shines as well: the
solve finds the channel mix that, added to it, reaches the target — first the
one that adds the least radiant power, then the brightest. The light is taken
in the model's units (measured with the same instrument), or scaled to
luminance --add-level Y on the model's scale.

Each recipe gives every channel's drive level, whether the target was reached,
the chromaticity reached and its Δu′v′ to the target, ΔE00 (at the target's
luminance, or at the mix's own for a chromaticity target), Y, CCT and Duv,
and the efficacy (lm/W of the channels' radiant power: a ratio, so it holds
for relative data too; not a fixture's electrical efficacy). A target the
rig cannot reach gives the nearest mix, marked not reachable.

` + lightsGoalHelp + `

` + lightsToleranceHelp + `

Every recipe also gives Ra and R9 (CIE 13.3), Rf (CIE 224:2017) and the
melanopic DER (CIE S 026) of the whole light, dark and added light included.`,
	example: `  $ antipode fit lights kestrel/rig_ramps.csv --out rig.json
  $ antipode solve rig.json --cct 4000 --duv 0
  $ antipode solve rig.json --cct 4000 --add kestrel/rig_filtered.csv
  $ antipode solve rig.json --xy 0.31,0.33 --level 40 --prefer reference --json
  $ antipode solve rig.json --cct 3200 --maximize ra
  $ antipode solve rig.json --cct 4000 --maximize ra --tolerance-uv-prime 0.002
  $ antipode solve rig.json --cct 3500 --maximize efficacy --tolerance-cct 100 --tolerance-duv 0.002`,
}

// lightsToleranceHelp explains the target-white tolerance of a quality
// goal.
const lightsToleranceHelp = `A tolerance lets the goal's recipe (and only it) land near the target white
instead of on it, to buy more of the goal's quality:
  --tolerance-uv-prime d   Δu′v′ to the target at most d (the same colorimetric
                           tolerance as in 'antipode pair'; 0.001 is about one
                           just-noticeable step between whites)
  --tolerance-cct K        with --cct: |CCT − target CCT| at most K kelvin
  --tolerance-duv d        with --cct: |Duv − target Duv| at most d
The recipe meets every tolerance given (a CCT tolerance needs a Duv one, or a
Δu′v′ one, beside it); the default, 0, reaches the target exactly. A level
(--level) is still met exactly. The recipe's Δu′v′ row shows what it used,
and a table shows what the tolerance buys: the optimum at none, half and
all of the tolerance.`

// lightsModel asserts the model's type.
func lightsModel(m mixing.Model) (*mixing.Lights, error) {
	l, ok := m.(*mixing.Lights)
	if !ok {
		return nil, fmt.Errorf("not a lights model (kind %s)", m.Kind())
	}
	return l, nil
}

// fitLights runs "antipode fit lights".
func fitLights(e *env, args []string) error {
	ff := fitFlags{model: "MODEL.json"}
	var response, obsName string
	var holdout float64
	var absolute bool
	fs := flag.NewFlagSet("fit lights", flag.ContinueOnError)
	ff.define(fs)
	fs.StringVar(&response, "response", mixing.ResponsePower, "response curve: `power` (w = d^γ) or monotone (Fritsch–Butland through the measured levels)")
	fs.Float64Var(&holdout, "holdout", 0, "hold out this `FRACTION` (0–0.5) of each channel's ramp, every k-th level by drive, to test the fit")
	fs.BoolVar(&absolute, "absolute", false, "the spectra are radiometric (e.g. W·sr⁻¹·m⁻²·nm⁻¹): mix and solve print absolute photometric values (Km = 683.002 lm/W)")
	fs.StringVar(&obsName, "observer", "1931", "standard observer for the report: `1931` (2°) or 1964 (10°)")
	files, err := ff.parse(fitLightsCommand, fs, e, args, "measurement")
	if err != nil {
		return err
	}
	if response != mixing.ResponsePower && response != mixing.ResponseMonotone {
		return usagef("--response %s: want power or monotone", response)
	}
	if !(holdout >= 0 && holdout <= 0.5) {
		return usagef("--holdout %v: want a fraction in [0, 0.5]", holdout)
	}
	obs, err := observerFlag(obsName)
	if err != nil {
		return err
	}
	path := files[0]
	recs, err := readCalibration(e, path, "no channel or drive columns: a lights calibration needs the rows layout (name, channel, drive, [heldout], then wavelengths; see 'antipode fit lights --help')")
	if err != nil {
		return err
	}
	samples, err := mixing.LightRampsFromNamed(recs, path)
	if err != nil {
		return err
	}
	m, err := mixing.FitLights(samples, mixing.LightsFitOptions{Response: response, HoldOut: holdout, Observer: obs, Absolute: absolute})
	if err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	if err := saveModel(ff.out, m, files); err != nil {
		return err
	}
	chans, err := lightsChannelRows(m, obs)
	if err != nil {
		return err
	}
	if ff.asJSON {
		return writeJSON(e.stdout, map[string]any{"model": ff.out, "kind": m.Kind(), "units": lightsUnits(m), "channels": chans, "fit": m.Report()})
	}
	printLightsFit(e.stdout, m, chans, path, ff.out)
	return nil
}

// lightsChannelJSON describes one fitted channel.
type lightsChannelJSON struct {
	Name     string   `json:"name"`
	Response string   `json:"response"`
	Gamma    *float64 `json:"gamma"`
	GammaSE  *float64 `json:"gamma_se"`
	Knots    *int     `json:"knots"`
	PeakNM   float64  `json:"peak_nm"`
	X        *float64 `json:"x"`
	Y        *float64 `json:"y"`
	Share    float64  `json:"luminance_share"` // fraction of the rig's full-drive Y
}

func lightsChannelRows(m *mixing.Lights, obs *colorimetry.Observer) ([]lightsChannelJSON, error) {
	var out []lightsChannelJSON
	for i := range m.Len() {
		c := m.Channel(i)
		r := lightsChannelJSON{Name: c.Name, Response: c.Response.Kind()}
		switch c.Response.Kind() {
		case mixing.ResponsePower:
			g, se := c.Response.Gamma()
			r.Gamma, r.GammaSE = ptr(g), ptr(se)
		case mixing.ResponseMonotone:
			d, _ := c.Response.Knots()
			k := len(d)
			r.Knots = &k
		}
		_, r.PeakNM = c.Spectrum.Max()
		col, err := m.Colour([]mixing.Amount{{Name: c.Name, Value: 1}}, obs)
		if err != nil {
			return nil, err
		}
		if len(col.Warnings) == 0 || col.XY != (colorimetry.XY{}) {
			r.X, r.Y = ptr(col.XY.X), ptr(col.XY.Y)
		}
		dark, err := m.Colour(nil, obs)
		if err != nil {
			return nil, err
		}
		full := 100.0
		if m.Absolute() {
			all := make([]mixing.Amount, m.Len())
			for j, n := range m.Names() {
				all[j] = mixing.Amount{Name: n, Value: 1}
			}
			a, err := m.Colour(all, obs)
			if err != nil {
				return nil, err
			}
			full = a.XYZ.Y
		}
		r.Share = (col.XYZ.Y - dark.XYZ.Y) / full
		out = append(out, r)
	}
	return out, nil
}

func lightsUnits(m *mixing.Lights) string {
	if m.Absolute() {
		return "absolute"
	}
	return "relative"
}

// lightsScaleNote says what the model's X, Y, Z mean.
func lightsScaleNote(m *mixing.Lights) string {
	if m.Absolute() {
		return "absolute photometric values (Km = 683.002 lm/W)"
	}
	return "relative: Y = 100 with every channel at full drive"
}

func printLightsFit(w io.Writer, m *mixing.Lights, chans []lightsChannelJSON, path, out string) {
	r := m.Report()
	g := m.Grid()
	fmt.Fprintf(w, "Lights model from %s: %d channels, %g–%g nm at %g nm, %s units\n\n", path, m.Len(), g.Start, g.End(), g.Step, lightsUnits(m))
	var ct table
	ct.left = map[int]bool{1: true}
	ct.header("channel", "response", "peak nm", "x", "y", "share of Y")
	for _, c := range chans {
		resp := c.Response
		switch {
		case c.Gamma != nil:
			resp = fmt.Sprintf("power γ %.3f ± %.3f", *c.Gamma, *c.GammaSE)
		case c.Knots != nil:
			resp = fmt.Sprintf("monotone, %d knots", *c.Knots)
		}
		ct.row(c.Name, resp, fmt.Sprintf("%g", c.PeakNM), f4(c.X), f4(c.Y), fmt.Sprintf("%.1f %%", 100*c.Share))
	}
	ct.write(w)
	fmt.Fprintf(w, "\nmeasurements against the model (ΔE00 and Δu′v′ with both scaled to the measurement's Y = 100, %s):\n\n", r.Observer)
	var st table
	st.left = map[int]bool{1: true, 3: true}
	st.header("measurement", "channel", "drive", "set", "w measured", "w curve", "RMS", "max", "ΔE00", "Δu′v′")
	fits := map[string][]mixing.SampleFit{}
	for _, s := range r.Samples {
		fits[s.Name] = append(fits[s.Name], s)
	}
	var duvFit, duvHeld []float64
	for _, rf := range m.Ramps() {
		q := fits[rf.Name]
		if len(q) == 0 {
			continue // left out of the report; a warning says why
		}
		s := q[0]
		fits[rf.Name] = q[1:]
		set := "fit"
		if rf.HeldOut {
			set = "held out"
		}
		if d := s.DeltaUVPrime; d != nil {
			if rf.HeldOut {
				duvHeld = append(duvHeld, *d)
			} else {
				duvFit = append(duvFit, *d)
			}
		}
		st.row(rf.Name, rf.Channel, fmt.Sprintf("%g", rf.Drive), set, fmt.Sprintf("%.4f", rf.Measured), fmt.Sprintf("%.4f", rf.Predicted),
			fmt.Sprintf("%.5f", s.RMS), fmt.Sprintf("%.5f", s.MaxAbs), fmt.Sprintf("%.2f", s.DE00), fmtOpt(s.DeltaUVPrime, "%.4f"))
	}
	st.write(w)
	printFitSummary(w, r, "measurements", 5, "mark measurements with heldout = 1 or use --holdout")
	// Δu′v′ beside ΔE00: at low drive CIELAB's cube root of a nearly zero
	// X or Z magnifies small differences in ΔE00, not in Δu′v′.
	summary := func(d []float64) string {
		if len(d) == 0 {
			return "none"
		}
		var sum, top float64
		for _, v := range d {
			sum, top = sum+v, max(top, v)
		}
		return fmt.Sprintf("mean %.4f, max %.4f", sum/float64(len(d)), top)
	}
	fmt.Fprintf(w, "Δu′v′:    fit %s; held out %s (steadier than ΔE00 at low drive)\n", summary(duvFit), summary(duvHeld))
	printClosing(w, "\n", r.Warnings, out)
}

// mixLights runs "antipode mix" on a lights model.
func mixLights(e *env, mm mixing.Model, args []string) error {
	m, err := lightsModel(mm)
	if err != nil {
		return err
	}
	var amounts, obsName, out string
	var asJSON bool
	fs := flag.NewFlagSet("mix lights", flag.ContinueOnError)
	fs.StringVar(&amounts, "amounts", "", "drive levels as `name=drive,…` (0–1; channels not named are off)")
	fs.StringVar(&obsName, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.StringVar(&out, "out", "", "write the mix's spectrum to `FILE.csv`")
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of text")
	pos, err := parseFlags(mixLightsCommand, fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("unexpected argument %q: %s", pos[0], mixLightsCommand.usage)
	}
	am, err := parseAmounts(amounts)
	if err != nil {
		return err
	}
	obs, err := observerFlag(obsName)
	if err != nil {
		return err
	}
	col, err := m.Colour(am, obs)
	if err != nil {
		return usagef("--amounts: %v", err)
	}
	spec, err := m.Spectrum(am)
	if err != nil {
		return usagef("--amounts: %v", err)
	}
	if err := e.writeSpectrumOut(out, lightsAmountsLabel(am), spec); err != nil {
		return err
	}
	outputs := map[string]float64{}
	drives := map[string]float64{}
	for i, n := range m.Names() {
		outputs[n] = col.Outputs[i]
		drives[n] = 0
	}
	for _, a := range am {
		for _, n := range m.Names() {
			if strings.EqualFold(n, a.Name) {
				drives[n] = a.Value
			}
		}
	}
	var x, y, u, v, cct, duv, eff *float64
	if col.XYZ.X+col.XYZ.Y+col.XYZ.Z > 0 {
		x, y, u, v = ptr(col.XY.X), ptr(col.XY.Y), ptr(col.UV.U), ptr(col.UV.V)
	}
	if col.CCT != nil {
		cct, duv = ptr(col.CCT.Kelvin), ptr(col.CCT.Duv)
	}
	if col.Efficacy > 0 {
		eff = ptr(col.Efficacy)
	}
	if asJSON {
		return writeJSON(e.stdout, map[string]any{
			"amounts": drives, "outputs": outputs, "units": lightsUnits(m), "observer": obs.Name(),
			"X": col.XYZ.X, "Y": col.XYZ.Y, "Z": col.XYZ.Z, "x": x, "y": y, "u_prime": u, "v_prime": v,
			"cct_kelvin": cct, "duv": duv, "efficacy_lm_per_w": eff, "out": orNull(out), "warnings": nonNil(col.Warnings),
		})
	}
	w := e.stdout
	var parts []string
	for i, n := range m.Names() {
		if drives[n] > 0 {
			parts = append(parts, fmt.Sprintf("%s %g (output %.1f %%)", n, drives[n], 100*col.Outputs[i]))
		}
	}
	if len(parts) == 0 {
		parts = []string{"every channel off"}
	}
	fmt.Fprintf(w, "mix: %s\n", strings.Join(parts, ", "))
	fmt.Fprintf(w, "%s; %s observer\n", lightsScaleNote(m), obs.Name())
	fmt.Fprintf(w, "  X %.4f  Y %.4f  Z %.4f\n", col.XYZ.X, col.XYZ.Y, col.XYZ.Z)
	fmt.Fprintf(w, "  x %s  y %s  u′ %s  v′ %s\n", fmtOpt(x, "%.5f"), fmtOpt(y, "%.5f"), fmtOpt(u, "%.5f"), fmtOpt(v, "%.5f"))
	fmt.Fprintf(w, "  CCT %s K  Duv %s\n", fmtOpt(cct, "%.0f"), fmtOpt(duv, "%+.4f"))
	fmt.Fprintf(w, "  luminous efficacy of radiation of the channels' light %s lm/W\n", fmtOpt(eff, "%.0f"))
	printClosing(w, "", col.Warnings, out)
	return nil
}

// lightsAmountsLabel names a mix's spectrum by its drive levels.
func lightsAmountsLabel(am []mixing.Amount) string {
	var p []string
	for _, a := range am {
		p = append(p, fmt.Sprintf("%s=%g", a.Name, a.Value))
	}
	if len(p) == 0 {
		return "dark"
	}
	return strings.Join(p, "+")
}

// solveLights runs "antipode solve" on a lights model.
func solveLights(e *env, mm mixing.Model, args []string) error {
	m, err := lightsModel(mm)
	if err != nil {
		return err
	}
	var target, xyArg, level, addArg, prefer, obsName, maximize, minimize string
	var cct, duv, addLevel float64
	var tol mixing.LightTolerance
	var asJSON bool
	fs := flag.NewFlagSet("solve lights", flag.ContinueOnError)
	fs.StringVar(&target, "target", "", "the target light: a spectral `FILE` or FILE:NAME (its chromaticity; see --level)")
	fs.StringVar(&xyArg, "xy", "", "the target chromaticity as `x,y` (CIE 1931)")
	fs.Float64Var(&cct, "cct", 0, "the target's correlated colour temperature, `K` (1000–100000)")
	fs.Float64Var(&duv, "duv", 0, "with --cct: the target's distance `d` from the Planckian locus (CIE 1960 UCS, |d| ≤ 0.05; + is greenish)")
	fs.StringVar(&level, "level", "", "the target luminance `Y` on the model's scale, or \"target\" for the --target spectrum's own; default: as bright as the rig allows")
	fs.StringVar(&addArg, "add", "", "a coloured light that shines as well, to complement: `FILE` or FILE:NAME")
	fs.Float64Var(&addLevel, "add-level", 0, "scale the --add light to luminance `Y` on the model's scale; 0 takes it as it is, in the model's units")
	fs.StringVar(&prefer, "prefer", "efficacy", "with more than three channels, rank first the mix of highest `efficacy` or the one closest to the reference spectrum (reference)")
	fs.StringVar(&obsName, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.BoolVar(&asJSON, "json", false, "print the solve JSON ({\"recipes\": […]}) instead of text")
	fs.StringVar(&maximize, "maximize", "", "rank first the mix at the target with the highest `QUALITY`: ra, rf, r9, efficacy or melanopic")
	fs.StringVar(&minimize, "minimize", "", "rank first the mix at the target with the lowest `QUALITY`: melanopic")
	fs.Float64Var(&tol.UVPrime, "tolerance-uv-prime", 0, "with a goal: colorimetric tolerance, Δu′v′: the goal's recipe may land up to `d` from the target (0: exactly on it)")
	fs.Float64Var(&tol.CCT, "tolerance-cct", 0, "with a goal and --cct: the goal's recipe may differ from the target CCT by up to `K` kelvin")
	fs.Float64Var(&tol.Duv, "tolerance-duv", 0, "with a goal and --cct: the goal's recipe may differ from the target Duv by up to `d`")
	pos, err := parseFlags(solveLightsCommand, fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("unexpected argument %q: %s", pos[0], solveLightsCommand.usage)
	}
	given := 0
	for _, s := range []bool{target != "", xyArg != "", cct != 0} {
		if s {
			given++
		}
	}
	switch {
	case given == 0:
		return usagef("give a target: --target FILE, --xy x,y or --cct K")
	case given > 1:
		return usagef("give one target only: --target FILE, --xy x,y or --cct K")
	}
	if duv != 0 && cct == 0 {
		return usagef("--duv needs --cct")
	}
	if addLevel != 0 && addArg == "" {
		return usagef("--add-level needs --add")
	}
	if !(addLevel >= 0) || math.IsInf(addLevel, 0) {
		return usagef("--add-level %v: want a positive luminance", addLevel)
	}
	opt := mixing.LightSolveOptions{}
	switch prefer {
	case "efficacy":
		opt.Prefer = mixing.PreferEfficacy
	case "reference":
		opt.Prefer = mixing.PreferReference
	default:
		return usagef("--prefer %s: want efficacy or reference", prefer)
	}
	obs, err := observerFlag(obsName)
	if err != nil {
		return err
	}
	opt.Observer = obs
	scale, err := m.Scale(obs)
	if err != nil {
		return err
	}
	lw, err := colorimetry.NewLightWeights(obs, colorimetry.ComputationGrid(m.Grid()))
	if err != nil {
		return err
	}
	var t mixing.LightTarget
	var what string
	switch {
	case target != "":
		in, err := lightsOneSpectrum(e, target, "--target")
		if err != nil {
			return err
		}
		c, err := lw.XYZ(in.s.WithExtrap(colorimetry.ExtrapZero))
		if err != nil {
			return fmt.Errorf("%s: %v", in.place(), err)
		}
		if t.XY, err = c.XY(); err != nil {
			return fmt.Errorf("%s: the target gives no light", in.place())
		}
		what = fmt.Sprintf("%s (%s)", in.name, in.file)
		if level == "target" {
			t.Y = c.Y * scale
		}
	case xyArg != "":
		xy, err := parseXY(xyArg)
		if err != nil {
			return err
		}
		t.XY = xy
		what = fmt.Sprintf("x %.4f, y %.4f", xy.X, xy.Y)
	default:
		xy, err := mixing.LightTargetCCT(obs, cct, duv)
		if err != nil {
			return usagef("--cct %g --duv %g: %v", cct, duv, err)
		}
		t.XY = xy
		what = fmt.Sprintf("%g K, Duv %+.4f", cct, duv)
	}
	switch level {
	case "", "target":
		if level == "target" && target == "" {
			return usagef("--level target needs --target")
		}
	default:
		y, err := strconv.ParseFloat(level, 64)
		if err != nil || !(y > 0) || math.IsInf(y, 0) {
			return usagef("--level %s: want a positive luminance on the model's scale, or \"target\"", level)
		}
		t.Y = y
	}
	addNote := ""
	if addArg != "" {
		in, err := lightsOneSpectrum(e, addArg, "--add")
		if err != nil {
			return err
		}
		s := in.s.WithExtrap(colorimetry.ExtrapZero)
		c, err := lw.XYZ(s)
		if err != nil {
			return fmt.Errorf("%s: %v", in.place(), err)
		}
		if !(c.Y > 0) {
			return fmt.Errorf("%s: the added light has no luminance", in.place())
		}
		if addLevel > 0 {
			s = s.Scale(addLevel / (c.Y * scale))
			c = c.Scale(addLevel / (c.Y * scale))
		}
		opt.Add = s
		addNote = fmt.Sprintf("%s (%s), Y %.4g on the model's scale", in.name, in.file, c.Y*scale)
	}
	goal, err := lightsGoal(maximize, minimize)
	if err != nil {
		return err
	}
	if err := lightsToleranceFlags(tol, goal, cct != 0); err != nil {
		return err
	}
	sol, err := m.SolveQualityWithin(t, goal, tol, opt)
	if err != nil {
		return err
	}
	if asJSON {
		return writeSolution(e, sol)
	}
	printLightsSolution(e.stdout, m, obs, t, what, addNote, sol)
	printLightsTolerance(e.stdout, tol, sol)
	return nil
}

// lightsToleranceFlags checks the tolerance flags of solve.
func lightsToleranceFlags(tol mixing.LightTolerance, goal mixing.LightGoal, byCCT bool) error {
	for _, f := range []struct {
		name string
		v    float64
	}{{"--tolerance-uv-prime", tol.UVPrime}, {"--tolerance-cct", tol.CCT}, {"--tolerance-duv", tol.Duv}} {
		if !(f.v >= 0) || math.IsInf(f.v, 0) {
			return usagef("%s %v: want zero or a positive tolerance", f.name, f.v)
		}
	}
	if (tol.CCT > 0 || tol.Duv > 0) && !byCCT {
		return usagef("--tolerance-cct and --tolerance-duv need the target as --cct K [--duv d]")
	}
	if tol.UVPrime == 0 && (tol.CCT > 0) != (tol.Duv > 0) {
		return usagef("--tolerance-cct and --tolerance-duv come together (or beside --tolerance-uv-prime): one alone leaves the other unbounded")
	}
	if !tol.IsZero() && goal == mixing.GoalNone {
		return usagef("a tolerance applies to the recipe of a goal: add --maximize or --minimize")
	}
	return nil
}

// printLightsTolerance prints what the tolerance of a goal's recipe buys,
// if the solve has one.
func printLightsTolerance(w io.Writer, tol mixing.LightTolerance, sol mixing.Solution) {
	if len(sol.Recipes) == 0 {
		return
	}
	pts, ok := sol.Recipes[0].Extra["tolerance_trade_off"].([]map[string]any)
	if !ok || len(pts) == 0 {
		return
	}
	num := func(v any, format string) string {
		if f, ok := v.(float64); ok {
			return fmt.Sprintf(format, f)
		}
		return "—"
	}
	fmt.Fprintf(w, "\nwhat the tolerance buys (recipe 1, %v; tolerance %v; the other recipes reach the target exactly):\n", sol.Recipes[0].Extra["strategy"], tol)
	var tb table
	tb.header("share", "Δu′v′", "CCT K", "Duv", "Y", "Ra", "R9", "Rf", "efficacy lm/W", "melanopic DER")
	for _, p := range pts {
		share := num(p["fraction"], "%.2g")
		if r, _ := p["reachable"].(bool); !r {
			tb.row(share, "out of reach", "", "", "", "", "", "", "", "")
			continue
		}
		duv := num(p["duv"], "%+.4f")
		if d, ok := p["duv"].(float64); ok && math.Abs(d) < 5e-5 {
			duv = "0.0000" // a Duv that rounds to zero, without a sign
		}
		tb.row(share, num(p["delta_uv_prime"], "%.6f"), num(p["cct_kelvin"], "%.0f"), duv, num(p["Y"], "%.4g"),
			num(p["ra"], "%.1f"), num(p["r9"], "%.1f"), num(p["rf"], "%.1f"), num(p["efficacy_lm_per_w"], "%.0f"), num(p["melanopic_der"], "%.3f"))
	}
	tb.write(w)
}

// lightsOneSpectrum resolves FILE or FILE:NAME to one spectrum.
func lightsOneSpectrum(e *env, arg, flagName string) (spectrumIn, error) {
	list, err := spectrumArg(e, arg)
	if err != nil {
		return spectrumIn{}, err
	}
	if len(list) != 1 {
		names := make([]string, len(list))
		for i, s := range list {
			names[i] = s.name
		}
		return spectrumIn{}, usagef("%s %s: the file holds %d spectra (%s); name one as FILE:NAME", flagName, arg, len(list), strings.Join(names, ", "))
	}
	return list[0], nil
}

func printLightsSolution(w io.Writer, m *mixing.Lights, obs *colorimetry.Observer, t mixing.LightTarget, what, addNote string, sol mixing.Solution) {
	lvl := "as bright as the rig allows"
	if t.Y > 0 {
		lvl = fmt.Sprintf("Y %.4g", t.Y)
	}
	fmt.Fprintf(w, "target: %s → x %.5f, y %.5f; %s\n", what, t.XY.X, t.XY.Y, lvl)
	if addNote != "" {
		fmt.Fprintf(w, "added light: %s\n", addNote)
	}
	fmt.Fprintf(w, "%s; %s observer; drive levels 0–1\n\n", lightsScaleNote(m), obs.Name())
	var tb table
	head := []string{""}
	for k, r := range sol.Recipes {
		head = append(head, fmt.Sprintf("%d %s", k+1, r.Extra["strategy"]))
	}
	tb.header(head...)
	for i, n := range m.Names() {
		row := []string{n}
		for _, r := range sol.Recipes {
			row = append(row, fmt.Sprintf("%.4f", r.Amounts[i].Value))
		}
		tb.row(row...)
	}
	num := func(v any, format string) string {
		if f, ok := v.(float64); ok {
			return fmt.Sprintf(format, f)
		}
		return "—"
	}
	for _, line := range []struct {
		label string
		cell  func(r mixing.Recipe) string
	}{
		{"reachable", func(r mixing.Recipe) string {
			if r.Reachable {
				return "yes"
			}
			return "no"
		}},
		{"x", func(r mixing.Recipe) string { return num(r.Extra["x"], "%.5f") }},
		{"y", func(r mixing.Recipe) string { return num(r.Extra["y"], "%.5f") }},
		{"Δu′v′", func(r mixing.Recipe) string { return num(r.Extra["delta_uv_prime"], "%.6f") }},
		{"ΔE00", func(r mixing.Recipe) string { return fmt.Sprintf("%.2f", r.DE00) }},
		{"Y", func(r mixing.Recipe) string { return num(r.Extra["Y"], "%.4g") }},
		{"CCT K", func(r mixing.Recipe) string { return num(r.Extra["cct_kelvin"], "%.0f") }},
		{"Duv", func(r mixing.Recipe) string {
			// Show a Duv that rounds to zero without a sign.
			if d, ok := r.Extra["duv"].(float64); ok && math.Abs(d) < 5e-5 {
				return "0.0000"
			}
			return num(r.Extra["duv"], "%+.4f")
		}},
		{"efficacy lm/W", func(r mixing.Recipe) string { return num(r.Extra["efficacy_lm_per_w"], "%.0f") }},
		{"Ra", func(r mixing.Recipe) string { return num(r.Extra["ra"], "%.1f") }},
		{"R9", func(r mixing.Recipe) string { return num(r.Extra["r9"], "%.1f") }},
		{"Rf", func(r mixing.Recipe) string { return num(r.Extra["rf"], "%.1f") }},
		{"melanopic DER", func(r mixing.Recipe) string { return num(r.Extra["melanopic_der"], "%.3f") }},
		{"to reference", func(r mixing.Recipe) string { return num(r.Extra["reference_distance"], "%.3f") }},
	} {
		row := []string{line.label}
		for _, r := range sol.Recipes {
			row = append(row, line.cell(r))
		}
		tb.row(row...)
	}
	tb.write(w)
	if ref, ok := sol.Recipes[0].Extra["reference"].(string); ok {
		fmt.Fprintf(w, "\nto reference: relative RMS spectral distance of the whole light to %s at the same Y.\n", ref)
	}
	fmt.Fprintln(w, "efficacy: luminous efficacy of radiation of the channels' light (lm per radiant W; not electrical).")
	printLightsTradeOff(w, sol)
	seen := map[string]bool{}
	var notes []string
	for k, r := range sol.Recipes {
		for _, wn := range r.Warnings {
			key := wn
			if seen[key] {
				continue
			}
			seen[key] = true
			notes = append(notes, fmt.Sprintf("%d: %s", k+1, wn))
		}
	}
	if len(notes) > 0 {
		fmt.Fprintf(w, "\nwarnings:\n  %s\n", strings.Join(notes, "\n  "))
	}
}
