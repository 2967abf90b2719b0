package specio

import (
	"bufio"
	"fmt"
	"io"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/antipode-color/antipode/colorimetry"
)

// DefaultCGATSIdentifier is the file identifier WriteCGATS writes when the
// first set has none.
const DefaultCGATSIdentifier = "CGATS.17"

// NewCGATSSet returns a data set of the samples for WriteCGATS, with the
// identifier DefaultCGATSIdentifier, the keyword ORIGINATOR (when
// originator is not empty), the keyword CREATED (when created is not the
// zero time) and then the given keywords. CREATED is written in ISO 8601
// form: the date alone ("2025-03-14") when created is at midnight, the
// date and time with its offset otherwise ("2025-03-14T09:30:00+01:00").
// The caller passes the time, so output is reproducible. The data format
// is left nil, for WriteCGATS to derive.
func NewCGATSSet(samples []Named, originator string, created time.Time, keywords ...Keyword) CGATSSet {
	var kw []Keyword
	if originator != "" {
		kw = append(kw, Keyword{Name: "ORIGINATOR", Value: originator})
	}
	if !created.IsZero() {
		layout := "2006-01-02T15:04:05Z07:00"
		if h, m, s := created.Clock(); h == 0 && m == 0 && s == 0 && created.Nanosecond() == 0 {
			layout = "2006-01-02"
		}
		kw = append(kw, Keyword{Name: "CREATED", Value: created.Format(layout)})
	}
	kw = append(kw, keywords...)
	return CGATSSet{
		CGATSHeader: CGATSHeader{Identifier: DefaultCGATSIdentifier, Keywords: kw},
		Samples:     samples,
	}
}

// WriteCGATS writes the data sets to w as CGATS.17 text, separated by
// tabs with LF line endings, so that ReadCGATS returns the same keywords,
// fields and values:
//
//   - the first set's Identifier (DefaultCGATSIdentifier when empty) on
//     the first line;
//   - for each set, its keywords in order, each private one (not defined
//     by CGATS.17) declared by a KEYWORD line before its first use, then
//     NUMBER_OF_FIELDS, the data format on one line, NUMBER_OF_SETS (the
//     number of samples) and the data between BEGIN_DATA and END_DATA,
//     one sample a line.
//
// The data format is the set's Format with any spectral field names
// (however spelt) replaced by one field per wavelength of the samples'
// common grid, spelt SPECTRAL_NM380 and so on, at the place of the first
// of them, or at the end when Format names none; a set without samples
// keeps the wavelengths its Format names, so respelt. A nil Format is derived:
// SAMPLE_ID, SAMPLE_NAME, the samples' other Fields in sorted order, then
// the spectral fields. A field's value is the sample's Fields entry; when
// there is none, SAMPLE_ID is the sample's 1-based index in its set and
// SAMPLE_NAME its Name. Spectral values are written in the shortest form
// that reads back to the same float64; other values are written as they
// are when they read as a number, in double quotes otherwise (a quote
// doubled). Fields[CGATSSetKey] is never written; comments are not kept.
//
// It returns an error, having written nothing, wrapping ErrNoData when
// there is no set; ErrGrid when the samples of a set do not all have a
// spectrum on one grid, or all none; ErrNoField when a sample lacks a
// field of the format; and ErrUnwritable for a name that is not a CGATS
// token (ASCII letters, digits and "_.-+/", starting with a letter or
// underscore), a structural keyword among the keywords, a field named
// twice, a line break or NUL byte in a value, an XYZ or LAB value that is not a
// number, or an identifier that would not read back as one. Errors from w
// are returned as they are.
func WriteCGATS(w io.Writer, sets ...CGATSSet) error {
	if len(sets) == 0 {
		return fmt.Errorf("specio: no data set to write: %w", ErrNoData)
	}
	ident := sets[0].Identifier
	if ident == "" {
		ident = DefaultCGATSIdentifier
	}
	if err := checkIdentifier(ident); err != nil {
		return err
	}
	plans := make([]cgatsPlan, len(sets))
	for k := range sets {
		if err := plans[k].make(&sets[k], k+1); err != nil {
			return err
		}
	}
	bw := bufio.NewWriter(w)
	buf := make([]byte, 0, 4096)
	buf = append(buf, ident...)
	buf = append(buf, '\n')
	for k := range sets {
		var err error
		if buf, err = plans[k].write(bw, buf, &sets[k]); err != nil {
			return err
		}
	}
	if _, err := bw.Write(buf); err != nil {
		return err
	}
	return bw.Flush()
}

// checkIdentifier returns an error wrapping ErrUnwritable unless ident
// reads back as the file identifier.
func checkIdentifier(ident string) error {
	name, _, text, ok := splitKeyword(ident)
	if !ok || text != ident || strings.ContainsAny(ident, "\t\r\n\x00") {
		return fmt.Errorf("specio: identifier %q: %w", ident, ErrUnwritable)
	}
	if w := strings.ToUpper(name); isStructural(w) || isStandardKeyword(w) {
		return fmt.Errorf("specio: identifier %q starts with a keyword: %w", ident, ErrUnwritable)
	}
	return nil
}

// cgatsPlan is the checked layout of one data set to write.
type cgatsPlan struct {
	fields []string // output field names
	spec   []int    // per field: index into the grid, or -1 for text
	grid   colorimetry.Grid
	wl     []float64 // wavelengths of the spectral fields, nm
}

// make checks set (the k-th) and lays out its data format.
func (p *cgatsPlan) make(set *CGATSSet, k int) error {
	where := func(format string, a ...any) string {
		return fmt.Sprintf("specio: data set %d: ", k) + fmt.Sprintf(format, a...)
	}
	for _, kw := range set.Keywords {
		if !validName(kw.Name) || isStructural(strings.ToUpper(kw.Name)) {
			return fmt.Errorf("%s: %w", where("keyword %q", kw.Name), ErrUnwritable)
		}
		if strings.ContainsAny(kw.Value, "\r\n\x00") {
			return fmt.Errorf("%s: %w", where("keyword %s: value %q holds a line break or NUL byte", kw.Name, kw.Value), ErrUnwritable)
		}
	}
	spectral := 0
	for i, s := range set.Samples {
		if s.Spectrum.IsZero() {
			continue
		}
		if spectral == 0 {
			p.grid = s.Spectrum.Grid()
		} else if g := s.Spectrum.Grid(); !g.Equal(p.grid) {
			return fmt.Errorf("%s: %w", where("sample %d (%q) is on %v, an earlier one on %v", i+1, s.Name, g, p.grid), ErrGrid)
		}
		spectral++
	}
	if spectral > 0 && spectral < len(set.Samples) {
		return fmt.Errorf("%s: %w", where("%d of %d samples have a spectrum", spectral, len(set.Samples)), ErrGrid)
	}
	var names []string
	at := -1 // place of the spectral fields in names
	if set.Format != nil {
		for _, f := range set.Format {
			if _, ok := spectralWavelength(f); ok {
				if at < 0 {
					at = len(names)
				}
				continue
			}
			names = append(names, f)
		}
		if at >= 0 && spectral == 0 {
			if len(set.Samples) > 0 {
				return fmt.Errorf("%s: %w", where("the format names spectral fields, the samples have no spectrum"), ErrGrid)
			}
			// An empty set keeps the wavelengths its format names.
			for _, f := range set.Format {
				if nm, ok := spectralWavelength(f); ok {
					p.wl = append(p.wl, nm)
				}
			}
			sort.Float64s(p.wl)
		}
	} else {
		names = derivedFormat(set.Samples)
	}
	if spectral > 0 {
		p.wl = p.grid.Wavelengths(nil)
		if at < 0 {
			at = len(names)
		}
	}
	seen := make(map[string]bool, len(names)+len(p.wl))
	add := func(name string, spec int) error {
		switch {
		case !validName(name) || isStructural(strings.ToUpper(name)):
			return fmt.Errorf("%s: %w", where("field name %q", name), ErrUnwritable)
		case seen[name]:
			return fmt.Errorf("%s: %w", where("field %s named twice", name), ErrUnwritable)
		}
		if _, ok := spectralWavelength(name); ok && spec < 0 {
			return fmt.Errorf("%s: %w", where("field %s would read as spectral", name), ErrUnwritable)
		}
		seen[name] = true
		p.fields = append(p.fields, name)
		p.spec = append(p.spec, spec)
		return nil
	}
	for i := 0; i <= len(names); i++ {
		if i == at {
			for j, nm := range p.wl {
				if err := add(spectralField(nm), j); err != nil {
					return err
				}
			}
		}
		if i < len(names) {
			if err := add(names[i], -1); err != nil {
				return err
			}
		}
	}
	if len(p.fields) == 0 {
		return fmt.Errorf("%s: %w", where("no field to write"), ErrUnwritable)
	}
	for i, s := range set.Samples {
		for c, name := range p.fields {
			if p.spec[c] >= 0 {
				continue
			}
			v, err := textValue(s, i, name)
			if err != nil {
				return fmt.Errorf("%s: %w", where("sample %d (%q)", i+1, s.Name), err)
			}
			if strings.ContainsAny(v, "\r\n\x00") {
				return fmt.Errorf("%s: %w", where("sample %d (%q), field %s: value %q holds a line break or NUL byte", i+1, s.Name, name, v), ErrUnwritable)
			}
			if isColorimetric(name) && !isNumber(v, true) {
				return fmt.Errorf("%s: %w", where("sample %d (%q), field %s: value %q is not a number", i+1, s.Name, name, v), ErrUnwritable)
			}
		}
	}
	return nil
}

// derivedFormat returns SAMPLE_ID, SAMPLE_NAME and the other keys of the
// samples' Fields, sorted, without CGATSSetKey.
func derivedFormat(samples []Named) []string {
	keys := map[string]bool{}
	for _, s := range samples {
		for k := range s.Fields {
			keys[k] = true
		}
	}
	delete(keys, CGATSSetKey)
	delete(keys, "SAMPLE_ID")
	delete(keys, "SAMPLE_NAME")
	rest := make([]string, 0, len(keys))
	for k := range keys {
		rest = append(rest, k)
	}
	sort.Strings(rest)
	return append([]string{"SAMPLE_ID", "SAMPLE_NAME"}, rest...)
}

// textValue returns the text of a non-spectral field of the i-th sample.
func textValue(s Named, i int, name string) (string, error) {
	if v, ok := s.Fields[name]; ok {
		return v, nil
	}
	switch name {
	case "SAMPLE_ID":
		return strconv.Itoa(i + 1), nil
	case "SAMPLE_NAME":
		return s.Name, nil
	}
	return "", fmt.Errorf("field %s: %w", name, ErrNoField)
}

// write appends the set's lines to buf, flushing it to bw as it grows, and
// returns buf.
func (p *cgatsPlan) write(bw *bufio.Writer, buf []byte, set *CGATSSet) ([]byte, error) {
	flush := func() error {
		if len(buf) < 32<<10 {
			return nil
		}
		_, err := bw.Write(buf)
		buf = buf[:0]
		return err
	}
	declared := map[string]bool{}
	for _, kw := range set.Keywords {
		if !isStandardKeyword(strings.ToUpper(kw.Name)) && !declared[kw.Name] {
			declared[kw.Name] = true
			buf = append(buf, "KEYWORD\t\""...)
			buf = append(buf, kw.Name...)
			buf = append(buf, "\"\n"...)
		}
		buf = append(buf, kw.Name...)
		buf = append(buf, '\t')
		buf = appendCGATSValue(buf, kw.Value)
		buf = append(buf, '\n')
	}
	buf = append(buf, "NUMBER_OF_FIELDS\t"...)
	buf = strconv.AppendInt(buf, int64(len(p.fields)), 10)
	buf = append(buf, "\nBEGIN_DATA_FORMAT\n"...)
	for c, name := range p.fields {
		if c > 0 {
			buf = append(buf, '\t')
		}
		buf = append(buf, name...)
		if err := flush(); err != nil {
			return buf, err
		}
	}
	buf = append(buf, "\nEND_DATA_FORMAT\nNUMBER_OF_SETS\t"...)
	buf = strconv.AppendInt(buf, int64(len(set.Samples)), 10)
	buf = append(buf, "\nBEGIN_DATA\n"...)
	for i, s := range set.Samples {
		for c, name := range p.fields {
			if c > 0 {
				buf = append(buf, '\t')
			}
			if j := p.spec[c]; j >= 0 {
				buf = strconv.AppendFloat(buf, s.Spectrum.Value(j), 'g', -1, 64)
				continue
			}
			v, _ := textValue(s, i, name) // checked by make
			buf = appendCGATSValue(buf, v)
		}
		buf = append(buf, '\n')
		if err := flush(); err != nil {
			return buf, err
		}
	}
	buf = append(buf, "END_DATA\n"...)
	return buf, flush()
}

// appendCGATSValue appends a value as it is when it reads as a number, and
// in double quotes, with any quote doubled, otherwise.
func appendCGATSValue(dst []byte, v string) []byte {
	if isNumber(v, true) {
		return append(dst, v...)
	}
	dst = append(dst, '"')
	dst = append(dst, strings.ReplaceAll(v, `"`, `""`)...)
	return append(dst, '"')
}
