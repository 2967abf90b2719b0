package specio_test

import (
	"fmt"
	"io"
	"os"
	"strings"
	"time"

	"github.com/antipode-color/antipode/colorimetry"
	"github.com/antipode-color/antipode/colorimetry/specio"
)

// A CGATS file of colorimetric measurements streams one sample per call;
// its samples have no spectrum, and XYZ and Lab read their fields.
func ExampleNewCGATSReader() {
	const text = `CGATS.17
ORIGINATOR	"Kettle Row press room (invented demo data)"
NUMBER_OF_FIELDS	7
BEGIN_DATA_FORMAT
SAMPLE_ID	XYZ_X	XYZ_Y	XYZ_Z	LAB_L	LAB_A	LAB_B
END_DATA_FORMAT
NUMBER_OF_SETS	2
BEGIN_DATA
paper	84.7485	87.6183	74.5941	95.00	0.50	-2.00
cyan	15.0207	22.9298	52.8677	55.00	-37.00	-50.00
END_DATA
`
	r := specio.NewCGATSReader(strings.NewReader(text), "press.txt")
	for {
		s, err := r.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			fmt.Println(err)
			return
		}
		xyz, err := s.XYZ()
		if err != nil {
			fmt.Println(err)
			return
		}
		lab, err := s.Lab()
		if err != nil {
			fmt.Println(err)
			return
		}
		h, _ := r.Header()
		origin, _ := h.Value("ORIGINATOR")
		fmt.Printf("line %d: %s Y=%g L*=%g spectrum=%v (%s)\n", s.Line, s.Name, xyz.Y, lab.L, !s.Spectrum.IsZero(), origin)
	}
	// Output:
	// line 9: paper Y=87.6183 L*=95 spectrum=false (Kettle Row press room (invented demo data))
	// line 10: cyan Y=22.9298 L*=55 spectrum=false (Kettle Row press room (invented demo data))
}

// Two data sets in one file, each with its own header; every sample
// carries its set's index.
func ExampleReadCGATS() {
	const text = `CGATS.17
DESCRIPTOR "gels, first roll"
BEGIN_DATA_FORMAT
SAMPLE_NAME SPECTRAL_NM400 SPECTRAL_NM450 SPECTRAL_NM500
END_DATA_FORMAT
BEGIN_DATA
"amber gel" 0.12 0.35 0.58
END_DATA
DESCRIPTOR "gels, second roll"
BEGIN_DATA_FORMAT
SAMPLE_NAME nm500 nm450 nm400
END_DATA_FORMAT
BEGIN_DATA
"teal gel" 0.91 0.72 0.30
END_DATA
`
	sets, err := specio.ReadCGATS(strings.NewReader(text), "gels.txt")
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, set := range sets {
		d, _ := set.Value("DESCRIPTOR")
		for _, s := range set.Samples {
			fmt.Printf("set %s (%s): %s on %v: %v\n", s.Fields[specio.CGATSSetKey], d, s.Name, s.Spectrum.Grid(), s.Spectrum.Values(nil))
		}
	}
	// Output:
	// set 1 (gels, first roll): amber gel on 400–500 nm at 50 nm: [0.12 0.35 0.58]
	// set 2 (gels, second roll): teal gel on 400–500 nm at 50 nm: [0.3 0.72 0.91]
}

// Spectra become a CGATS data set with ORIGINATOR and a CREATED date
// passed in, so the output is reproducible.
func ExampleWriteCGATS() {
	g := colorimetry.Grid{Start: 400, Step: 50, N: 3}
	dune, err := colorimetry.NewSpectrumOnGrid(g, []float64{0.2, 0.5, 0.9}, colorimetry.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	set := specio.NewCGATSSet([]specio.Named{{Name: "dune lamp", Spectrum: dune}},
		"antipode", time.Date(2025, 3, 14, 0, 0, 0, 0, time.UTC),
		specio.Keyword{Name: "DESCRIPTOR", Value: "relative spectral power"})
	if err := specio.WriteCGATS(os.Stdout, set); err != nil {
		fmt.Println(err)
	}
	// Output:
	// CGATS.17
	// ORIGINATOR	"antipode"
	// CREATED	"2025-03-14"
	// DESCRIPTOR	"relative spectral power"
	// NUMBER_OF_FIELDS	5
	// BEGIN_DATA_FORMAT
	// SAMPLE_ID	SAMPLE_NAME	SPECTRAL_NM400	SPECTRAL_NM450	SPECTRAL_NM500
	// END_DATA_FORMAT
	// NUMBER_OF_SETS	1
	// BEGIN_DATA
	// 1	"dune lamp"	0.2	0.5	0.9
	// END_DATA
}

// A Reader that needs spectra refuses a colorimetric CGATS file, naming
// the file and the line of its data format.
func ExampleNewReader_cgats() {
	const text = "CGATS.17\nBEGIN_DATA_FORMAT\nSAMPLE_ID LAB_L LAB_A LAB_B\nEND_DATA_FORMAT\nBEGIN_DATA\n1 50 10 -5\nEND_DATA\n"
	_, err := specio.NewReader(strings.NewReader(text), "chart.txt").ReadAll()
	fmt.Println(err)
	// Output:
	// chart.txt:2: data set 1 has no spectral fields (such as SPECTRAL_NM380); its fields are SAMPLE_ID LAB_L LAB_A LAB_B
}
