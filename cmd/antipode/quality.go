package main

import (
	"errors"
	"fmt"
	"io"
	"strings"
	"sync"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/rendering"
	"github.com/antipode-color/antipode/mixing"
)

// The lighting quality of a light, for describe --as light: colour
// rendering (CIE 13.3), colour fidelity (CIE 224:2017) and photometry
// (luminous efficacy of radiation, S/P ratio, melanopic DER of CIE S 026).

// lightQualityKeys are describe's lighting-quality keys; describeRow embeds
// them, so they sit in its JSON beside the other keys. Every key is null
// where it does not apply (objects) or cannot be computed (Ra and Rf of a
// light whose CCT is not defined).
type lightQualityKeys struct {
	Ra       *float64  `json:"ra"`                // CIE 13.3 general colour rendering index
	R        []float64 `json:"r"`                 // CIE 13.3 special indices R1–R14
	Rf       *float64  `json:"rf"`                // CIE 224:2017 colour fidelity index
	RfI      []float64 `json:"rf_i"`              // CIE 224:2017 Rf,i of CES 1–99
	Efficacy *float64  `json:"efficacy_lm_per_w"` // luminous efficacy of radiation, lm/W
	SP       *float64  `json:"sp_ratio"`          // scotopic/photopic ratio
	MelDER   *float64  `json:"melanopic_der"`     // melanopic daylight efficacy ratio
}

// weighting holds the CIE weighting functions, built once.
type weighting struct {
	photopic, scotopic colorimetry.Efficiency
	melanopic          colorimetry.AlphaOpic
}

var cieWeighting = sync.OnceValues(func() (*weighting, error) {
	w := &weighting{
		photopic: colorimetry.Efficiency{V: cie.PhotopicV(), K: colorimetry.Km},
		scotopic: colorimetry.Efficiency{V: cie.ScotopicV(), K: cie.KmScotopic},
	}
	mel, err := cie.AlphaOpicAction(cie.Melanopic)
	if err != nil {
		return nil, err
	}
	if w.melanopic, err = colorimetry.NewAlphaOpic(mel, w.photopic, cie.D65()); err != nil {
		return nil, err
	}
	return w, nil
})

// lightQuality fills the lighting-quality keys of a light's row from its
// spectrum s (zero outside its range), and adds a warning for each
// quantity that cannot be computed and for a light too far from the
// Planckian locus for Ra to be meaningful (CIE 13.3).
func lightQuality(r *describeRow, s colorimetry.Spectrum) {
	q := &r.lightQualityKeys
	cri, errRa := rendering.ColourRendering(s)
	if errRa == nil {
		q.Ra = ptr(cri.Ra)
		q.R = append([]float64(nil), cri.R[:]...)
		r.Warnings = append(r.Warnings, cri.Warnings...)
	}
	fid, errRf := rendering.ColourFidelity(s)
	if errRf == nil {
		q.Rf = ptr(fid.Rf)
		q.RfI = append([]float64(nil), fid.Rfi[:]...)
		r.Warnings = append(r.Warnings, fid.Warnings...)
	}
	switch {
	case errRa != nil && errRf != nil && qualityReason(errRa) == qualityReason(errRf):
		r.Warnings = append(r.Warnings, "Ra and Rf not computed: "+qualityReason(errRa))
	default:
		if errRa != nil {
			r.Warnings = append(r.Warnings, "Ra not computed: "+qualityReason(errRa))
		}
		if errRf != nil {
			r.Warnings = append(r.Warnings, "Rf not computed: "+qualityReason(errRf))
		}
	}
	w, err := cieWeighting()
	if err != nil {
		r.Warnings = append(r.Warnings, "photometry not computed: "+err.Error())
		return
	}
	if k, err := colorimetry.EfficacyOfRadiation(s, w.photopic); err == nil {
		q.Efficacy = ptr(k)
	} else {
		r.Warnings = append(r.Warnings, "luminous efficacy not computed: "+err.Error())
	}
	if sp, err := colorimetry.SPRatio(s, w.photopic, w.scotopic); err == nil {
		q.SP = ptr(sp)
	} else {
		r.Warnings = append(r.Warnings, "S/P ratio not computed: "+err.Error())
	}
	if der, err := w.melanopic.DER(s); err == nil {
		q.MelDER = ptr(der)
	} else {
		r.Warnings = append(r.Warnings, "melanopic DER not computed: "+err.Error())
	}
}

// qualityReason says in a few words why an index is not computed.
func qualityReason(err error) string {
	var re *colorimetry.CCTRangeError
	switch {
	case errors.As(err, &re):
		return fmt.Sprintf("no reference illuminant where the CCT is not defined (%.0f K, Duv %+.4f; CIE 015 defines it for 1000–100 000 K, |Duv| ≤ 0.05)", re.CCT.Kelvin, re.CCT.Duv)
	case errors.Is(err, rendering.ErrNoReference):
		return "above 25 000 K there is no CIE daylight reference"
	}
	return strings.TrimPrefix(strings.TrimPrefix(err.Error(), "colour rendering: "), "colour fidelity: ")
}

// lightQualityNote explains the quality columns of describe's light table.
func lightQualityNote(w io.Writer) {
	fmt.Fprintln(w, "Ra: CIE 13.3 general colour rendering index; Rf: CIE 224:2017 colour fidelity index (both from the spectrum at 5 nm; R1–R14, Rf,i, efficacy, S/P ratio and melanopic DER in --json).")
}

// lightsGoalHelp explains the quality goals of solve on a lights model.
const lightsGoalHelp = `--maximize ra|rf|r9|efficacy|melanopic or --minimize melanopic ranks first
the mix, among all that reach the target white (exactly, or within
--tolerance-uv-prime / --tolerance-cct and --tolerance-duv; and its level,
with --level), that is best by that quality: the colour rendering index Ra or R9
(CIE 13.3), the colour fidelity index Rf (CIE 224:2017), the luminous
efficacy of radiation of the channels' light, or the melanopic daylight
efficacy ratio (CIE S 026; high for a stimulating, alerting light, low for
evening light — circadian effects are real: see 'antipode help cautions').
Efficacy and melanopic DER are found exactly at a vertex of the set of such
mixes; Ra, R9 and Rf by a search from several starts that is never worse
than the other recipes. That recipe also shows the trade-off: from the most
efficient mix to the optimum, the most efficient mix found at evenly spaced
levels of the goal's quantity (for --maximize efficacy: from the mix of
highest Ra, the highest Ra found at each level of efficacy).`

// lightsGoal returns the goal of --maximize or --minimize.
func lightsGoal(maximize, minimize string) (mixing.LightGoal, error) {
	switch {
	case maximize != "" && minimize != "":
		return 0, usagef("give --maximize or --minimize, not both")
	case minimize != "":
		if minimize != "melanopic" {
			return 0, usagef("--minimize %s: want melanopic", minimize)
		}
		return mixing.GoalMinMelanopic, nil
	}
	switch maximize {
	case "":
		return mixing.GoalNone, nil
	case "ra":
		return mixing.GoalMaxRa, nil
	case "rf":
		return mixing.GoalMaxRf, nil
	case "r9":
		return mixing.GoalMaxR9, nil
	case "efficacy":
		return mixing.GoalMaxEfficacy, nil
	case "melanopic":
		return mixing.GoalMaxMelanopic, nil
	}
	return 0, usagef("--maximize %s: want ra, rf, r9, efficacy or melanopic", maximize)
}

// printLightsTradeOff prints the trade-off curve of a quality goal's
// recipe, if the solve has one.
func printLightsTradeOff(w io.Writer, sol mixing.Solution) {
	if len(sol.Recipes) == 0 {
		return
	}
	curve, ok := sol.Recipes[0].Extra["trade_off"].([]map[string]any)
	if !ok || len(curve) < 2 {
		return
	}
	num := func(v any, format string) string {
		if f, ok := v.(float64); ok {
			return fmt.Sprintf(format, f)
		}
		return "—"
	}
	fmt.Fprintf(w, "\ntrade-off of recipe 1 (%v), from the other end to the optimum:\n", sol.Recipes[0].Extra["strategy"])
	var tb table
	tb.header("point", "Ra", "R9", "Rf", "efficacy lm/W", "melanopic DER")
	for k, p := range curve {
		tb.row(fmt.Sprint(k+1), num(p["ra"], "%.1f"), num(p["r9"], "%.1f"), num(p["rf"], "%.1f"), num(p["efficacy_lm_per_w"], "%.0f"), num(p["melanopic_der"], "%.3f"))
	}
	tb.write(w)
}
