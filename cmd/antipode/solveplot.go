package main

import (
	"flag"
	"fmt"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/mixing"
)

// plotFlag defines --plot on a command's flag set.
func plotFlag(fs *flag.FlagSet) *string {
	return fs.String("plot", "", "also draw the target and the recipes (spectra and chromaticity diagram) to `FILE` (.svg or .png)")
}

// plotObjectSolve draws a solve of reflectance or transmittance recipes:
// spectrumOf gives the spectrum each recipe makes. illum and obs are the
// solve's --illuminant and --observer; target may be nil (a CIELAB target).
// It does nothing when path is empty.
func plotObjectSolve(e *env, path, as, illum, obs string, target *namedSpectrum, sol mixing.Solution,
	spectrumOf func([]mixing.Amount) (colorimetry.Spectrum, error), inputs ...string) error {
	if path == "" {
		return nil
	}
	o, err := observerFlag(obs)
	if err != nil {
		return err
	}
	ill, name, err := illuminantFlag(e, "--illuminant", illum)
	if err != nil {
		return err
	}
	sv := solvePlot{As: as, Observer: o, Illuminant: ill, IllName: name, Target: target, Inputs: append([]string{e.modelPath}, inputs...)}
	for i, r := range sol.Recipes {
		s, err := spectrumOf(r.Amounts)
		if err != nil {
			return fmt.Errorf("--plot: recipe %d: %v", i+1, err)
		}
		sv.Recipes = append(sv.Recipes, namedSpectrum{name: fmt.Sprintf("recipe %d", i+1), s: s})
	}
	return plotSolve(path, sv)
}
