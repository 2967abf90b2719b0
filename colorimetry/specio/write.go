package specio

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// WriteColumns writes spectra to w in the columns layout, separated by
// commas with LF line endings: a header "wavelength_nm,name1,name2,…",
// then one line per wavelength of the shared grid (nm). Numbers are
// written in the shortest form that reads back to the same float64
// (strconv 'g' format, precision −1), so Reader returns the same values.
// Names are quoted when they contain a comma, semicolon, tab or quote, or
// begin or end with white space; an empty name is written as "" and reads
// back as "column N". Named.Fields are not written.
//
// It returns an error wrapping ErrGrid when spectra is empty, holds an
// empty spectrum or spectra on different grids (colorimetry.Grid.Equal),
// and ErrName when a name contains a line break or a NUL byte (which the
// reader takes for UTF-16), or is given twice (the
// reader refuses a header that names two spectra alike); nothing is
// written then.
// Errors from w are returned as they are.
func WriteColumns(w io.Writer, spectra []Named) error {
	if len(spectra) == 0 {
		return fmt.Errorf("specio: nothing to write: %w", ErrGrid)
	}
	g := spectra[0].Spectrum.Grid()
	seen := make(map[string]int, len(spectra))
	for i, s := range spectra {
		if j, dup := seen[s.Name]; dup && s.Name != "" {
			return fmt.Errorf("specio: spectrum %d (%q) has the name of spectrum %d: %w", i+1, s.Name, j, ErrName)
		}
		seen[s.Name] = i + 1
		if s.Spectrum.IsZero() {
			return fmt.Errorf("specio: spectrum %d (%q) is empty: %w", i+1, s.Name, ErrGrid)
		}
		if sg := s.Spectrum.Grid(); !sg.Equal(g) {
			return fmt.Errorf("specio: spectrum %d (%q) is on %v, spectrum 1 (%q) on %v: %w", i+1, s.Name, sg, spectra[0].Name, g, ErrGrid)
		}
		if strings.ContainsAny(s.Name, "\r\n\x00") {
			return fmt.Errorf("specio: spectrum %d (%q): %w", i+1, s.Name, ErrName)
		}
	}
	bw := bufio.NewWriter(w)
	buf := make([]byte, 0, 64)
	buf = append(buf, "wavelength_nm"...)
	for _, s := range spectra {
		buf = append(buf, ',')
		buf = appendName(buf, s.Name)
		if len(buf) > 4096 {
			if _, err := bw.Write(buf); err != nil {
				return err
			}
			buf = buf[:0]
		}
	}
	buf = append(buf, '\n')
	for i := range g.N {
		buf = strconv.AppendFloat(buf, g.Wavelength(i), 'g', -1, 64)
		for _, s := range spectra {
			buf = append(buf, ',')
			buf = strconv.AppendFloat(buf, s.Spectrum.Value(i), 'g', -1, 64)
		}
		buf = append(buf, '\n')
		if _, err := bw.Write(buf); err != nil {
			return err
		}
		buf = buf[:0]
	}
	return bw.Flush()
}

// appendName appends a header cell, quoted (RFC 4180 §2 rules 6 and 7)
// when the reader would otherwise split, trim or misdetect it.
func appendName(dst []byte, name string) []byte {
	if !needsQuotes(name) {
		return append(dst, name...)
	}
	dst = append(dst, '"')
	dst = append(dst, strings.ReplaceAll(name, `"`, `""`)...)
	return append(dst, '"')
}

// needsQuotes reports whether a name must be quoted to read back as it is.
func needsQuotes(name string) bool {
	if name == "" || strings.ContainsAny(name, ",;\t\"") {
		return true
	}
	first, _ := utf8.DecodeRuneInString(name)
	last, _ := utf8.DecodeLastRuneInString(name)
	return unicode.IsSpace(first) || unicode.IsSpace(last)
}
