package specio_test

import (
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
)

// A colorant library in the rows layout streams one spectrum per call;
// the extra "drive" column is read as a number.
func ExampleNewReader() {
	const library = `# Kettle Row inks, transmittance in percent (invented demo data)
name,380,430,480,530,580,drive
harbour teal,12.5,48,71.25,40,9.75,0.85
quince yellow,3,4.5,60,88,91.5,1
`
	r := specio.NewReader(strings.NewReader(library), "inks.csv")
	for {
		ink, err := r.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			fmt.Println(err)
			return
		}
		drive, err := ink.Number("drive")
		if err != nil {
			fmt.Println(err)
			return
		}
		v, nm := ink.Spectrum.Max()
		fmt.Printf("line %d: %s on %v, peak %g at %g nm, drive %g\n", ink.Line, ink.Name, ink.Spectrum.Grid(), v, nm, drive)
	}
	// Output:
	// line 3: harbour teal on 380–580 nm at 50 nm, peak 71.25 at 480 nm, drive 0.85
	// line 4: quince yellow on 380–580 nm at 50 nm, peak 91.5 at 580 nm, drive 1
}

// A spreadsheet export in the columns layout, with semicolons and decimal
// commas.
func ExampleReader_ReadAll() {
	const sheet = "nm;warm wash;teal gel\n400;0,12;0,30\n450;0,35;0,91\n500;0,58;1\n"
	lamps, err := specio.NewReader(strings.NewReader(sheet), "lamps.csv").ReadAll()
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, l := range lamps {
		fmt.Printf("%s (column %d): %v\n", l.Name, l.Column, l.Spectrum.Values(nil))
	}
	// Output:
	// warm wash (column 2): [0.12 0.35 0.58]
	// teal gel (column 3): [0.3 0.91 1]
}

func ExampleReadFile() {
	lamps, err := specio.ReadFile("testdata/lamps_columns.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, l := range lamps {
		fmt.Printf("%q on %v\n", l.Name, l.Spectrum.Grid())
	}
	// Output:
	// "warm wash" on 400–700 nm at 50 nm
	// "teal gel, double" on 400–700 nm at 50 nm
	// "amber gel" on 400–700 nm at 50 nm
}

// A bad cell is reported with file, line, column and the column's header,
// and wraps a sentinel error.
func ExampleParseError() {
	const bad = "name,400,455,500\nmoss glaze,0.11,abc,0.30\n"
	_, err := specio.NewReader(strings.NewReader(bad), "glazes.csv").ReadAll()
	fmt.Println(err)
	var pe *specio.ParseError
	if errors.As(err, &pe) {
		fmt.Println(pe.Line, pe.Column, pe.Field, errors.Is(err, specio.ErrNotNumber))
	}
	// Output:
	// glazes.csv:2:3 (field 455): value "abc" is not a number
	// 2 3 455 true
}

func ExampleWriteColumns() {
	g := colorimetry.Grid{Start: 400, Step: 50, N: 3}
	dune, err := colorimetry.NewSpectrumOnGrid(g, []float64{0.2, 0.5, 0.9}, colorimetry.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	complement, err := colorimetry.NewSpectrumOnGrid(g, []float64{0.8, 0.5, 0.1}, colorimetry.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	err = specio.WriteColumns(os.Stdout, []specio.Named{
		{Name: "dune lamp", Spectrum: dune},
		{Name: "dune lamp, complement", Spectrum: complement},
	})
	if err != nil {
		fmt.Println(err)
	}
	// Output:
	// wavelength_nm,dune lamp,"dune lamp, complement"
	// 400,0.2,0.8
	// 450,0.5,0.5
	// 500,0.9,0.1
}
