package main

import (
	"flag"
	"fmt"

	"github.com/antipode-color/antipode/cie"
)

func init() {
	register(&command{
		name:    "illuminants",
		summary: "list the standard illuminants antipode knows",
		usage:   "illuminants [--json]",
		about: `Lists the CIE illuminants that --illuminant accepts by name (case does not
matter). A file path is accepted too, for a measured light: a file with one
spectrum, or FILE:NAME for one spectrum of a file.`,
		example: `  $ antipode illuminants
  $ antipode describe cmd/antipode/demo/paints.csv --illuminant daylight:5200`,
		run: runIlluminants,
	})
}

func runIlluminants(e *env, args []string) error {
	var asJSON bool
	fs := flag.NewFlagSet("illuminants", flag.ContinueOnError)
	fs.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	pos, err := parseFlags(commands["illuminants"], fs, e, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("illuminants takes no arguments")
	}
	list := cie.List()
	if asJSON {
		type item struct {
			Name        string `json:"name"`
			Description string `json:"description"`
		}
		out := make([]item, len(list))
		for i, l := range list {
			out[i] = item{l.Name, l.Description}
		}
		return writeJSON(e.stdout, out)
	}
	w := 4
	for _, l := range list {
		w = max(w, len(l.Name))
	}
	for _, l := range list {
		fmt.Fprintf(e.stdout, "%-*s  %s\n", w, l.Name, l.Description)
	}
	return nil
}
