package colorimetry

// RobertsonRows exposes the isotemperature table typed into cct.go to the
// external tests (mired, u, v, slope t), so that they check the library's
// own copy rather than one of their own.
func RobertsonRows() [][4]float64 {
	rows := make([][4]float64, len(robertsonTable))
	for i, r := range robertsonTable {
		rows[i] = [4]float64{r.mired, r.u, r.v, r.t}
	}
	return rows
}
