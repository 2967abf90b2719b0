package main

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"slices"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/lucasb-eyer/go-colorful"
)

func init() {
	register(&command{
		name:    "describe",
		summary: "tristimulus values and chromaticity of every spectrum in a file",
		usage:   "describe FILE[:NAME]… [--column NAME,…] [--as light|reflectance|transmittance] [--illuminant NAME|FILE] [--observer 1931|1964] [--scale fraction|percent] [--absolute] [--json]",
		about: `Reads spectral CSV files (wavelength columns or wavelength rows, told apart by
content; comma, semicolon or tab separated; "-" is standard input) and prints
X, Y, Z, x, y, u′, v′ for each spectrum. FILE:NAME picks one spectrum of a
file, as --column does for every file. The footer gives the wavelength range
of the data and the grid the computation used; data that miss the visible
range are refused, and data that cover only part of 400–700 nm or are
sampled more coarsely than 20 nm get a warning.

Reflectance and transmittance are weighted by the illuminant so that the
perfect diffuser has Y = 100. Lights are relative (Y = 100 for the light
itself) unless --absolute is given, when a spectral radiance in W·sr⁻¹·m⁻²·nm⁻¹
gives luminance in cd/m² (Km = 683.002 lm/W). Without --scale, reflectance or
transmittance whose maximum exceeds 1.5 is taken as percent, and the output
says so; a reflectance or transmittance above 1.05 after scaling gets a
warning, and one above 100 is refused.

Lights also get their lighting quality: the colour rendering indices Ra and
R1–R14 (CIE 13.3), the colour fidelity index Rf and Rf,i (CIE 224:2017), the
luminous efficacy of radiation (lm per radiant W, not a fixture's electrical
efficacy), the scotopic/photopic ratio and the melanopic daylight efficacy
ratio of CIE S 026 (a measure of the light's non-visual, circadian potency:
see 'antipode help cautions'). Ra and Rf are null outside the range where the
CCT is defined, and Ra carries a warning beyond |Duv| = 0.0054.`,
		example: `  $ antipode describe cmd/antipode/demo/paints.csv --column ky-barn-red,ky-teal
  $ antipode describe cmd/antipode/demo/lamps.csv --as light --json
  $ antipode describe my-gels.csv --as transmittance --illuminant A --observer 1964`,
		run: runDescribe,
	})
}

// describeRow is one spectrum's result; its JSON keys are a contract.
type describeRow struct {
	Name     string   `json:"name"`
	File     string   `json:"file"`
	X        float64  `json:"X"`
	Y        float64  `json:"Y"`
	Z        float64  `json:"Z"`
	SmallX   *float64 `json:"x"`
	SmallY   *float64 `json:"y"`
	UPrime   *float64 `json:"u_prime"`
	VPrime   *float64 `json:"v_prime"`
	As       string   `json:"as"`
	Scale    *string  `json:"scale"`
	Observer string   `json:"observer"`
	Illum    *string  `json:"illuminant"`
	Grid     string   `json:"grid"`
	// DataGrid is the wavelength range and step of the data as read (grid
	// is the one the computation used).
	DataGrid string  `json:"data_grid"`
	SRGB     *string `json:"srgb"`
	// Added by the colour-quantities issue; null where they do not apply.
	L             *float64     `json:"L"`
	A             *float64     `json:"a"`
	B             *float64     `json:"b"`
	C             *float64     `json:"C"`
	H             *float64     `json:"h"`
	CCT           *float64     `json:"cct_kelvin"`
	Duv           *float64     `json:"duv"`
	Dominant      *float64     `json:"dominant_wavelength_nm"`
	Complementary *float64     `json:"complementary_wavelength_nm"`
	Purity        *float64     `json:"excitation_purity"`
	ColPurity     *float64     `json:"colorimetric_purity"`
	White         *string      `json:"white"`
	U             *uncertainty `json:"u"`
	// Lighting quality of lights (quality.go): ra, r, rf, rf_i,
	// efficacy_lm_per_w, sp_ratio, melanopic_der.
	lightQualityKeys
	Warnings []string `json:"warnings"`
}

// uncertainty holds standard uncertainties of describe's quantities, in
// the same units; null where not evaluated.
type uncertainty struct {
	X      *float64 `json:"X"`
	Y      *float64 `json:"Y"`
	Z      *float64 `json:"Z"`
	SmallX *float64 `json:"x"`
	SmallY *float64 `json:"y"`
	UPrime *float64 `json:"u_prime"`
	VPrime *float64 `json:"v_prime"`
	L      *float64 `json:"L"`
	A      *float64 `json:"a"`
	B      *float64 `json:"b"`
	C      *float64 `json:"C"`
	H      *float64 `json:"h"`
	Method string   `json:"method"`
}

type describeOpts struct {
	columns     string
	as          string
	illuminant  string
	observer    string
	scale       string
	white       string
	cctMethod   string
	uncertainty string
	absolute    bool
	json        bool
}

func runDescribe(e *env, args []string) error {
	c := commands["describe"]
	var o describeOpts
	fs := flag.NewFlagSet("describe", flag.ContinueOnError)
	fs.StringVar(&o.columns, "column", "", "only the spectra with these `NAMES` (comma-separated)")
	fs.StringVar(&o.as, "as", "reflectance", "what the spectra are: `light`, reflectance or transmittance")
	fs.StringVar(&o.illuminant, "illuminant", "D65", "illuminant for reflectance and transmittance: a CIE `NAME` (see 'antipode illuminants') or a FILE")
	fs.StringVar(&o.observer, "observer", "1931", "standard observer: `1931` (2°) or 1964 (10°)")
	fs.StringVar(&o.scale, "scale", "", "scale of reflectance or transmittance values: `fraction` (0–1) or percent (0–100); default: percent when the maximum exceeds 1.5")
	fs.BoolVar(&o.absolute, "absolute", false, "lights: absolute photometric values (Km = 683.002 lm/W) instead of Y = 100")
	fs.StringVar(&o.white, "white", "E", "lights: the illuminant `NAME` whose chromaticity is the white for dominant wavelength and purity (objects use the illuminant)")
	fs.StringVar(&o.cctMethod, "cct-method", "ohno", "lights: CCT method, `ohno` (Ohno 2014) or robertson (Robertson 1968)")
	fs.StringVar(&o.uncertainty, "uncertainty", "", "standard uncertainty of every sample: a `VALUE` in the file's units, or a spectral FILE (one spectrum for all, or one per name)")
	fs.BoolVar(&o.json, "json", false, "print JSON instead of a table")
	plotPath := fs.String("plot", "", "also draw the chromaticities in the x, y chromaticity diagram, to `FILE` (.svg or .png)")
	files, err := parseFlags(c, fs, e, args)
	if err != nil {
		return err
	}
	if len(files) == 0 {
		return usagef("name at least one spectral file (or - for standard input)")
	}
	switch o.as {
	case "light", "reflectance", "transmittance":
	default:
		return usagef("--as %s: want light, reflectance or transmittance", o.as)
	}
	switch o.scale {
	case "", "fraction", "percent":
	default:
		return usagef("--scale %s: want fraction or percent", o.scale)
	}
	if o.absolute && o.as != "light" {
		return usagef("--absolute applies to --as light only")
	}
	// Flags that the kind of spectrum makes meaningless are refused rather
	// than silently ignored: a mistyped --white would otherwise pass.
	var misplaced error
	fs.Visit(func(f *flag.Flag) {
		switch {
		case misplaced != nil:
		case (f.Name == "white" || f.Name == "cct-method") && o.as != "light":
			misplaced = usagef("--%s applies to --as light only (for reflectance and transmittance the illuminant is the white)", f.Name)
		case f.Name == "illuminant" && o.as == "light":
			misplaced = usagef("--illuminant applies to reflectance and transmittance; a light is its own spectrum (for dominant wavelength use --white)")
		}
	})
	if misplaced != nil {
		return misplaced
	}
	// The figure's destination is checked before anything is printed, so
	// a pipeline never gets a complete table with exit status 2.
	if *plotPath != "" {
		if _, err := checkFigurePath("--plot", *plotPath, append(append([]string(nil), files...), o.uncertainty)); err != nil {
			return err
		}
		if err := checkOutDir("--plot", *plotPath); err != nil {
			return err
		}
	}
	type source struct {
		file  string
		names []string
	}
	var srcs []source
	for _, f := range files {
		file, name := splitSpectrumArg(f)
		var names []string
		switch {
		case name != "" && o.columns != "":
			return usagef("%s names a spectrum and so does --column %s: use one or the other", f, o.columns)
		case name != "":
			names = []string{name}
		case o.columns != "":
			names = strings.Split(o.columns, ",")
		}
		srcs = append(srcs, source{file, names})
	}
	d, err := newDescriber(e, o)
	if err != nil {
		return err
	}
	out := newDescribeOut(e.stdout, o, *plotPath != "")
	for _, src := range srcs {
		err := eachSpectrum(e, src.file, src.names, func(in spectrumIn) error {
			r, err := d.describe(in)
			if err != nil {
				return err
			}
			return out.add(r)
		})
		if err != nil {
			return err
		}
	}
	if err := out.finish(); err != nil {
		return err
	}
	return plotDescribe(*plotPath, files, d, out.kept)
}

// describeOut prints describe's rows as they come: JSON elements one by
// one, and tables in blocks of describeBlock rows, so that a file of
// millions of spectra needs no more memory than one block. A table of up
// to describeBlock rows is laid out as one.
type describeOut struct {
	w        io.Writer
	o        describeOpts
	keep     bool          // keep every row (for --plot)
	kept     []describeRow // the rows, when keep
	block    []describeRow
	n        int // rows written so far
	width    []int
	notes    []describeNote // distinct warnings, up to maxNotes
	noteAt   map[string]int // index in notes by text
	extra    int            // warnings beyond maxNotes
	grids    []string
	data     []string // data grids, up to maxDataGrids
	moreData int      // data grids beyond maxDataGrids
	white    *string
}

const (
	describeBlock = 1000
	maxNotes      = 200
	maxDataGrids  = 8
)

// describeNote is one warning text and the spectra that gave it: a
// warning about a whole file (its range, its scale) or about the
// illuminant is printed once, not once per spectrum.
type describeNote struct {
	text  string
	names []string // the first few
	count int
}

// maxNoteNames is how many names a shared warning lists before "and N more".
const maxNoteNames = 3

func (n describeNote) String() string {
	who := strings.Join(n.names, ", ")
	if more := n.count - len(n.names); more > 0 {
		who += fmt.Sprintf(" and %d more", more)
	}
	return who + ": " + n.text
}

func newDescribeOut(w io.Writer, o describeOpts, keep bool) *describeOut {
	return &describeOut{w: w, o: o, keep: keep, noteAt: map[string]int{}}
}

func (p *describeOut) add(r describeRow) error {
	if p.keep {
		p.kept = append(p.kept, r)
	}
	if !slices.Contains(p.grids, r.Grid) {
		p.grids = append(p.grids, r.Grid)
	}
	if !slices.Contains(p.data, r.DataGrid) {
		if len(p.data) < maxDataGrids {
			p.data = append(p.data, r.DataGrid)
		} else {
			p.moreData++
		}
	}
	if p.white == nil {
		p.white = r.White
	}
	if p.o.json {
		b, err := json.MarshalIndent(r, "  ", "  ")
		if err != nil {
			return err
		}
		sep := ",\n  "
		if p.n == 0 {
			sep = "[\n  "
		}
		p.n++
		_, err = fmt.Fprintf(p.w, "%s%s", sep, b)
		return err
	}
	for _, wn := range r.Warnings {
		if i, ok := p.noteAt[wn]; ok {
			n := &p.notes[i]
			if len(n.names) < maxNoteNames {
				n.names = append(n.names, r.Name)
			}
			n.count++
			continue
		}
		if len(p.notes) < maxNotes {
			p.noteAt[wn] = len(p.notes)
			p.notes = append(p.notes, describeNote{text: wn, names: []string{r.Name}, count: 1})
		} else {
			p.extra++
		}
	}
	p.block = append(p.block, r)
	if len(p.block) == describeBlock {
		p.flush()
	}
	return nil
}

func (p *describeOut) flush() {
	if len(p.block) == 0 {
		return
	}
	if p.n == 0 {
		printDescribeHeader(p.w, p.block[0], p.o)
	}
	p.width = printDescribeRows(p.w, p.block, p.o, p.n == 0, p.width)
	p.n += len(p.block)
	p.block = p.block[:0]
}

func (p *describeOut) finish() error {
	if p.o.json {
		if p.n == 0 {
			_, err := fmt.Fprintln(p.w, "[]")
			return err
		}
		_, err := fmt.Fprintln(p.w, "\n]")
		return err
	}
	p.flush()
	if p.n == 0 {
		fmt.Fprintln(p.w, "no spectra")
		return nil
	}
	if len(p.notes) > 0 {
		lines := make([]string, len(p.notes))
		for i, n := range p.notes {
			lines[i] = n.String()
		}
		fmt.Fprintf(p.w, "\nwarnings:\n  %s\n", strings.Join(lines, "\n  "))
		if p.extra > 0 {
			fmt.Fprintf(p.w, "  … and %d more\n", p.extra)
		}
	}
	light := p.o.as == "light"
	white := "the illuminant"
	if light && p.white != nil {
		white = *p.white
	}
	fmt.Fprintf(p.w, "\nλd: dominant wavelength relative to %s (negative: complementary wavelength of a purple, CIE 015); pe: excitation purity.\n", white)
	if light {
		lightQualityNote(p.w)
	}
	data := strings.Join(p.data, "; ")
	if p.moreData > 0 {
		data += fmt.Sprintf("; and %d more", p.moreData)
	}
	fmt.Fprintf(p.w, "data: %s\ngrid: %s\n", data, strings.Join(p.grids, "; "))
	return nil
}

// describer computes describe's quantities for one set of options.
type describer struct {
	o       describeOpts
	calc    *tristimulus
	illName string
	locus   *colorimetry.SpectrumLocus
	planck  *colorimetry.PlanckianTable
	method  colorimetry.CCTMethod
	white   colorimetry.XY // white for dominant wavelength (lights)
	wname   string
	uValue  float64      // constant standard uncertainty, or
	uFile   []spectrumIn // uncertainty spectra
	uSource string       // what was given to --uncertainty
}

func newDescriber(e *env, o describeOpts) (*describer, error) {
	var ill colorimetry.Spectrum
	var illName string
	if o.as != "light" {
		var err error
		ill, illName, err = illuminantFlag(e, "--illuminant", o.illuminant)
		if err != nil {
			return nil, err
		}
	}
	return newDescriberIll(e, o, ill, illName)
}

// newDescriberIll is newDescriber with the illuminant already resolved.
func newDescriberIll(e *env, o describeOpts, ill colorimetry.Spectrum, illName string) (*describer, error) {
	if o.observer == "" {
		o.observer = "1931"
	}
	if o.white == "" {
		o.white = "E"
	}
	if o.cctMethod == "" {
		o.cctMethod = "ohno"
	}
	obs, err := observerFlag(o.observer)
	if err != nil {
		return nil, err
	}
	d := &describer{o: o, illName: illName}
	d.calc = newTristimulus(obs, ill, o.as == "light")
	if d.locus, err = colorimetry.NewSpectrumLocus(obs); err != nil {
		return nil, err
	}
	if o.as == "light" {
		switch o.cctMethod {
		case "ohno":
			d.method = colorimetry.CCTOhno
		case "robertson":
			d.method = colorimetry.CCTRobertson
		default:
			return nil, usagef("--cct-method %s: want ohno or robertson", o.cctMethod)
		}
		if d.planck, err = colorimetry.NewPlanckianTable(obs, colorimetry.C2); err != nil {
			return nil, err
		}
		ws, name, err := illuminantFlag(e, "--white", o.white)
		if err != nil {
			return nil, err
		}
		if d.white, err = lightXY(obs, ws); err != nil {
			return nil, fmt.Errorf("--white %s: %v", o.white, err)
		}
		d.wname = name
	}
	if o.uncertainty != "" {
		d.uSource = o.uncertainty
		if v, perr := strconv.ParseFloat(o.uncertainty, 64); perr == nil {
			if !(v >= 0) || math.IsInf(v, 0) {
				return nil, usagef("--uncertainty %s: want a non-negative number or a file", o.uncertainty)
			}
			d.uValue = v
		} else {
			if _, serr := os.Stat(o.uncertainty); serr != nil && o.uncertainty != "-" {
				return nil, usagef("--uncertainty %s: not a number and not a file", o.uncertainty)
			}
			if d.uFile, err = readSpectra(e, o.uncertainty); err != nil {
				return nil, err
			}
		}
	}
	return d, nil
}

// uncertaintyFor returns the per-sample standard uncertainty of in on its
// own grid, in the file's units, or ok = false when none was given.
func (d *describer) uncertaintyFor(in spectrumIn) ([]float64, bool, error) {
	if d.o.uncertainty == "" {
		return nil, false, nil
	}
	n := in.s.Len()
	u := make([]float64, n)
	if d.uFile == nil {
		for i := range u {
			u[i] = d.uValue
		}
		return u, true, nil
	}
	src := d.uFile[0]
	if len(d.uFile) > 1 {
		found := false
		for _, c := range d.uFile {
			if c.name == in.name {
				src, found = c, true
				break
			}
		}
		if !found {
			return nil, false, fmt.Errorf("%s: no uncertainty spectrum named %q (a file of several uncertainty spectra needs one per name)", d.uSource, in.name)
		}
	}
	// Standard uncertainties are taken at the data's wavelengths by linear
	// interpolation of the uncertainty spectrum.
	r, err := src.s.WithInterp(colorimetry.InterpLinear).Resample(in.s.Grid())
	if err != nil {
		return nil, false, fmt.Errorf("%s: %v", d.uSource, err)
	}
	r.Values(u)
	for i, v := range u {
		if v < 0 {
			return nil, false, fmt.Errorf("%s: spectrum %q: negative standard uncertainty %g at %g nm", d.uSource, src.name, v, in.s.Grid().Wavelength(i))
		}
	}
	return u, true, nil
}

// tristimulus computes XYZ with weighting tables cached per grid.
type tristimulus struct {
	obs   *colorimetry.Observer
	ill   colorimetry.Spectrum
	light bool
	cache map[colorimetry.Grid]*colorimetry.Weights
}

func newTristimulus(obs *colorimetry.Observer, ill colorimetry.Spectrum, light bool) *tristimulus {
	return &tristimulus{obs: obs, ill: ill, light: light, cache: map[colorimetry.Grid]*colorimetry.Weights{}}
}

// weights returns the weighting table for the computation grid that suits
// s's sampling (colorimetry.ComputationGrid), building it once per grid.
func (t *tristimulus) weights(s colorimetry.Spectrum) (*colorimetry.Weights, colorimetry.Grid, error) {
	g := colorimetry.ComputationGrid(s.Grid())
	w, ok := t.cache[g]
	if !ok {
		var err error
		if t.light {
			w, err = colorimetry.NewLightWeights(t.obs, g)
		} else {
			w, err = colorimetry.NewObjectWeights(t.obs, t.ill, g)
		}
		if err != nil {
			return nil, g, err
		}
		t.cache[g] = w
	}
	return w, g, nil
}

// xyzOnly returns the tristimulus values of s.
func (t *tristimulus) xyzOnly(s colorimetry.Spectrum) (colorimetry.XYZ, error) {
	w, _, err := t.weights(s)
	if err != nil {
		return colorimetry.XYZ{}, err
	}
	return w.XYZ(s)
}

// describe computes one spectrum's row.
func (d *describer) describe(in spectrumIn) (describeRow, error) {
	o, calc := d.o, d.calc
	r := describeRow{Name: in.name, File: in.file, As: o.as, Observer: calc.obs.Name(), Warnings: []string{}}
	where := in.place()
	s := in.s
	r.DataGrid = dataGrid(in)
	cover, err := checkCoverage(in, o.as == "light")
	if err != nil {
		return r, err
	}
	r.Warnings = append(r.Warnings, cover...)
	factor := 1.0 // from the file's units to the computation's
	if o.as == "light" {
		s = s.WithExtrap(colorimetry.ExtrapZero)
		if v, nm := s.Min(); v < 0 {
			peak, _ := s.Max()
			if v < -0.01*math.Abs(peak) {
				return r, fmt.Errorf("%s: negative spectral power %.4g (more than 1%% of the peak)", in.placeAt(nm), v)
			}
			r.Warnings = append(r.Warnings, fmt.Sprintf("small negative values (down to %.3g at %g nm) taken as noise", v, nm))
		}
	} else {
		r.Illum = &d.illName
		var warns []string
		s, factor, r.Scale, warns, err = asFraction(in, o.scale, o.as)
		if err != nil {
			return r, err
		}
		r.Warnings = append(r.Warnings, warns...)
	}
	w, g, err := calc.weights(s)
	if err != nil {
		return r, fmt.Errorf("%s: %v", where, err)
	}
	c, err := w.XYZ(s)
	if err != nil {
		return r, fmt.Errorf("%s: %v", where, err)
	}
	r.Grid = g.String()
	norm := 1.0 // relative lights: Y = 100
	if o.as == "light" && !o.absolute {
		if c.Y == 0 {
			return r, fmt.Errorf("%s: the light has no luminance (Y = 0)", where)
		}
		norm = 100 / c.Y
		if d := c.Scale(norm); !d.Finite() {
			return r, fmt.Errorf("%s: the light's luminance Y = %g is too small to scale to Y = 100", where, c.Y)
		}
		c = c.Scale(norm)
	}
	r.X, r.Y, r.Z = c.X, c.Y, c.Z
	xy, err := c.XY()
	if err != nil {
		// A perfect black: L* = a* = b* = 0 and sRGB #000000, as compare
		// and limits take it; chromaticity and dominant wavelength stay
		// undefined.
		r.Warnings = append(r.Warnings, "black (X + Y + Z = 0): chromaticity undefined")
		if o.as != "light" {
			d.objectColour(&r, c, w.White())
		}
		return r, nil
	}
	r.SmallX, r.SmallY = &xy.X, &xy.Y
	uv, _ := c.UVPrime()
	r.UPrime, r.VPrime = &uv.U, &uv.V

	white := d.white
	if o.as == "light" {
		r.White = &d.wname
		d.cct(&r, c)
		lightQuality(&r, s)
	} else {
		wxyz := w.White()
		white, _ = wxyz.XY()
		if err := d.objectColour(&r, c, wxyz); err != nil {
			return r, fmt.Errorf("%s: %v", where, err)
		}
	}
	if dom, err := d.locus.Dominant(xy, white); err == nil {
		if dom.Complementary {
			r.Complementary = ptr(dom.Wavelength)
		} else {
			r.Dominant = ptr(dom.Wavelength)
		}
		r.Purity = ptr(dom.ExcitationPurity)
		r.ColPurity = ptr(dom.ColorimetricPurity)
	} else {
		r.Warnings = append(r.Warnings, dominantWarning(err, xy))
	}

	u, ok, err := d.uncertaintyFor(in)
	if err != nil {
		return r, err
	}
	if ok {
		for i := range u {
			u[i] *= factor
		}
		if err := d.propagate(&r, w, s, u, norm); err != nil {
			return r, fmt.Errorf("%s: uncertainty: %v", where, err)
		}
	}
	return r, nil
}

// objectColour fills the CIELAB, CIELCh and sRGB swatch of an object
// colour c seen under the illuminant whose perfect diffuser is wxyz.
func (d *describer) objectColour(r *describeRow, c, wxyz colorimetry.XYZ) error {
	lab, err := c.Lab(wxyz)
	if err != nil {
		return err
	}
	lch := lab.LCh()
	r.L, r.A, r.B, r.C, r.H = ptr(lab.L), ptr(lab.A), ptr(lab.B), ptr(lch.C), ptr(lch.H)
	r.White = &d.illName
	if hex, inGamut, err := srgbSwatch(c, wxyz); err == nil {
		r.SRGB = &hex
		if !inGamut {
			r.Warnings = append(r.Warnings, "outside the sRGB gamut: the swatch "+hex+" is clipped")
		}
	} else {
		r.Warnings = append(r.Warnings, "no sRGB swatch: the illuminant is too far from any white for a chromatic adaptation (Bradford) to sRGB's D65")
	}
	return nil
}

// dominantWarning words the warning for a dominant wavelength that the
// library could not find (err) for chromaticity xy, with the
// chromaticity to four decimals as the table prints it.
func dominantWarning(err error, xy colorimetry.XY) string {
	msg := err.Error()
	if strings.HasPrefix(msg, "dominant wavelength of (") {
		if _, rest, ok := strings.Cut(msg, "): "); ok {
			msg = rest
		}
	}
	return fmt.Sprintf("dominant wavelength undefined at x %.4f, y %.4f: %s", xy.X, xy.Y, msg)
}

// cct fills the correlated colour temperature and Duv of a light, or
// leaves them null with a warning outside the range where CCT is defined.
func (d *describer) cct(r *describeRow, c colorimetry.XYZ) {
	uv, err := c.UV()
	if err != nil {
		return
	}
	t, err := d.planck.CCT(uv, d.method)
	if err != nil {
		var re *colorimetry.CCTRangeError
		if errors.As(err, &re) {
			r.Warnings = append(r.Warnings, err.Error())
			return
		}
		r.Warnings = append(r.Warnings, "CCT not computed: "+err.Error())
		return
	}
	r.CCT, r.Duv = ptr(t.Kelvin), ptr(t.Duv)
}

// propagate fills r.U from the per-sample standard uncertainties u of s
// (uncorrelated, JCGM 100:2008), scaled by norm for relative lights.
func (d *describer) propagate(r *describeRow, w *colorimetry.Weights, s colorimetry.Spectrum, u []float64, norm float64) error {
	su, err := colorimetry.NewSpectrumUncertainty(s.Grid(), u)
	if err != nil {
		return err
	}
	x, err := w.XYZCov(s, su)
	if err != nil {
		return err
	}
	x = x.Scale(norm)
	out := &uncertainty{Method: colorimetry.Propagation{}.String()}
	if d.o.as != "light" || d.o.absolute {
		ux := x.U()
		out.X, out.Y, out.Z = ptr(ux.X), ptr(ux.Y), ptr(ux.Z)
	}
	if d.o.as == "light" {
		// Relative lights: X, Y, Z are normalised away; chromaticity keeps
		// its uncertainty, which does not depend on the scale.
		pxy, err := colorimetry.PropagateXY(x)
		if err != nil {
			return err
		}
		puv, err := colorimetry.PropagateUVPrime(x)
		if err != nil {
			return err
		}
		out.SmallX, out.SmallY = ptr(pxy.U().X), ptr(pxy.U().Y)
		out.UPrime, out.VPrime = ptr(puv.U().U), ptr(puv.U().V)
		r.U = out
		return nil
	}
	pc, err := colorimetry.PropagateColour(x, w.White(), colorimetry.MonteCarlo{})
	if err != nil {
		return err
	}
	out.SmallX, out.SmallY = ptr(pc.XY.U().X), ptr(pc.XY.U().Y)
	out.UPrime, out.VPrime = ptr(pc.UVPrime.U().U), ptr(pc.UVPrime.U().V)
	ul := pc.Lab.U()
	out.L, out.A, out.B = ptr(ul.L), ptr(ul.A), ptr(ul.B)
	out.C, out.H = ptr(pc.LCh.C.U), ptr(pc.LCh.H.U)
	if pc.LCh.C.Method.Draws > 0 {
		out.Method += "; C and h: " + pc.LCh.C.Method.String()
	}
	r.U = out
	return nil
}

func ptr(v float64) *float64 { return &v }

// d65sRGB is the white of IEC 61966-2-1 (sRGB), x = 0.3127, y = 0.3290,
// at Y = 100.
var d65sRGB = colorimetry.XYZ{X: 100 * 0.3127 / 0.3290, Y: 100, Z: 100 * (1 - 0.3127 - 0.3290) / 0.3290}

// srgbSwatch returns the sRGB hex swatch of an object colour seen under
// white: adapted to the sRGB white by Bradford, then encoded by go-colorful
// (which serves at this boundary: sRGB encoding and hex). It reports
// whether the colour lies inside the sRGB gamut; outside, the hex is
// clipped.
func srgbSwatch(c, white colorimetry.XYZ) (string, bool, error) {
	a, err := colorimetry.Adapt(c, white, d65sRGB, colorimetry.Bradford)
	if err != nil {
		return "", false, err
	}
	col := colorful.Xyz(a.X/100, a.Y/100, a.Z/100)
	// 1/510 is half an 8-bit step: colours within it of the cube are in gamut.
	const eps = 1.0 / 510
	in := col.R >= -eps && col.R <= 1+eps && col.G >= -eps && col.G <= 1+eps && col.B >= -eps && col.B <= 1+eps
	return col.Clamped().Hex(), in, nil
}

func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

// printDescribeHeader prints the line that says what the table shows.
func printDescribeHeader(w io.Writer, first describeRow, o describeOpts) {
	what := o.as
	switch {
	case o.as == "light" && o.absolute:
		what += ", absolute (Km = 683.002 lm/W)"
	case o.as == "light":
		what += ", relative: Y = 100 for each light"
	default:
		what += fmt.Sprintf(" under %s, perfect diffuser Y = 100", *first.Illum)
	}
	fmt.Fprintf(w, "%s; %s observer\n\n", what, first.Observer)
}

// printDescribeRows prints one block of rows (with the column header when
// header is true), its columns at least as wide as width, and returns the
// widths used so later blocks line up.
func printDescribeRows(w io.Writer, rows []describeRow, o describeOpts, header bool, width []int) []int {
	light := o.as == "light"
	t := &table{minWidth: width, noHeader: !header}
	if light {
		t.header("name", "X", "Y", "Z", "x", "y", "u′", "v′", "CCT K", "Duv", "λd nm", "pe", "Ra", "Rf")
	} else {
		t.header("name", "X", "Y", "Z", "x", "y", "L*", "a*", "b*", "C*ab", "hab", "λd nm", "pe", "sRGB")
	}
	for _, r := range rows {
		row := []string{r.Name, fmt.Sprintf("%.4f", r.X), fmt.Sprintf("%.4f", r.Y), fmt.Sprintf("%.4f", r.Z), f4(r.SmallX), f4(r.SmallY)}
		dom := "—"
		switch {
		case r.Dominant != nil:
			dom = fmt.Sprintf("%.1f", *r.Dominant)
		case r.Complementary != nil:
			dom = fmt.Sprintf("−%.1f", *r.Complementary)
		}
		if light {
			row = append(row, f4(r.UPrime), f4(r.VPrime), fmtOpt(r.CCT, "%.0f"), fmtOpt(r.Duv, "%+.4f"), dom, fmtOpt(r.Purity, "%.3f"), fmtOpt(r.Ra, "%.1f"), fmtOpt(r.Rf, "%.1f"))
		} else {
			sw := "—"
			if r.SRGB != nil {
				sw = *r.SRGB
			}
			row = append(row, fmtOpt(r.L, "%.2f"), fmtOpt(r.A, "%.2f"), fmtOpt(r.B, "%.2f"), fmtOpt(r.C, "%.2f"), fmtOpt(r.H, "%.1f"), dom, fmtOpt(r.Purity, "%.3f"), sw)
		}
		t.row(row...)
	}
	width = t.write(w)
	if rows[0].U != nil {
		fmt.Fprintf(w, "\nstandard uncertainties (k = 1), from uncorrelated per-sample uncertainties %s:\n", o.uncertainty)
		u := &table{}
		if light {
			u.header("name", "u(X)", "u(Y)", "u(Z)", "u(x)", "u(y)", "u(u′)", "u(v′)", "method")
		} else {
			u.header("name", "u(X)", "u(Y)", "u(Z)", "u(x)", "u(y)", "u(L*)", "u(a*)", "u(b*)", "u(C*ab)", "u(hab)", "method")
		}
		for _, r := range rows {
			if r.U == nil {
				continue
			}
			v := []string{r.Name, fmtOpt(r.U.X, "%.4f"), fmtOpt(r.U.Y, "%.4f"), fmtOpt(r.U.Z, "%.4f"), fmtOpt(r.U.SmallX, "%.5f"), fmtOpt(r.U.SmallY, "%.5f")}
			if light {
				v = append(v, fmtOpt(r.U.UPrime, "%.5f"), fmtOpt(r.U.VPrime, "%.5f"))
			} else {
				v = append(v, fmtOpt(r.U.L, "%.3f"), fmtOpt(r.U.A, "%.3f"), fmtOpt(r.U.B, "%.3f"), fmtOpt(r.U.C, "%.3f"), fmtOpt(r.U.H, "%.2f"))
			}
			u.row(append(v, r.U.Method)...)
		}
		u.write(w)
	}
	return width
}

// f4 formats an optional number with 4 decimals, "—" when absent.
func f4(v *float64) string { return fmtOpt(v, "%.4f") }

// fmtOpt formats an optional number, "—" when absent.
func fmtOpt(v *float64, format string) string {
	if v == nil {
		return "—"
	}
	return fmt.Sprintf(format, *v)
}
