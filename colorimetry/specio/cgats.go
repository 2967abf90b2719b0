package specio

// CGATS.17 text (ISO 28178), read sample by sample.
//
// A CGATS file, as this reader takes it, is a sequence of lines:
//
//	CGATS.17                       file identifier (first line)
//	ORIGINATOR   "…"               keywords with a value, quoted or not
//	KEYWORD      "MY_KEY"          declaration of a private keyword
//	MY_KEY       "…"
//	NUMBER_OF_FIELDS  4            optional; checked against the format
//	BEGIN_DATA_FORMAT
//	SAMPLE_ID SAMPLE_NAME XYZ_X …  field names, on one or more lines
//	END_DATA_FORMAT
//	NUMBER_OF_SETS  2              optional; checked against the data
//	BEGIN_DATA
//	1 "teal" 12.5 …                one sample per line
//	END_DATA
//
// after which a further data set, with its own keywords and format, may
// follow. The tolerances and rules are documented on NewCGATSReader.

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/antipode-color/antipode/colorimetry"
)

// CGATSSetKey is the key under which a sample read from CGATS text carries
// the 1-based index of its data set in Named.Fields ("1", "2", …). It holds
// a space, so it cannot clash with a CGATS field name, and WriteCGATS
// never writes it as a field.
const CGATSSetKey = "data set"

// Sentinel errors of the CGATS reader and writer, wrapped by *ParseError
// (reading) or returned with context (writing); test with errors.Is.
var (
	// ErrStructure reports lines out of the order CGATS.17 prescribes: a
	// BEGIN_DATA without a data format, an END_DATA without BEGIN_DATA, a
	// missing END_DATA_FORMAT or END_DATA, a header line that does not
	// start with a keyword, NUMBER_OF_FIELDS given twice.
	ErrStructure = errors.New("unexpected CGATS structure")
	// ErrNoSpectrum reports a data set without spectral fields where
	// spectra were asked for (CGATSReader.NeedSpectra, and every Reader).
	ErrNoSpectrum = errors.New("no spectral fields")
	// ErrSetCount reports a data set whose number of samples differs from
	// its NUMBER_OF_SETS keyword.
	ErrSetCount = errors.New("number of samples differs from NUMBER_OF_SETS")
	// ErrUnwritable reports a keyword, field name or value that WriteCGATS
	// cannot write so that it reads back unchanged.
	ErrUnwritable = errors.New("cannot be written as CGATS text")
)

// Keyword is one keyword line of a CGATS header.
type Keyword struct {
	Name  string // as written, e.g. "ORIGINATOR"
	Value string // the value without its quotes; "" when there is none
}

// CGATSHeader is the header of one CGATS data set. Its slices are shared
// and must not be modified.
type CGATSHeader struct {
	// Identifier is the file identifier, the first line of the file (for
	// example "CGATS.17"), or "" when the file starts with a keyword.
	// Every set of a file carries the file's identifier.
	Identifier string
	// Set is the 1-based index of the data set in its file.
	Set int
	// Line is the 1-based line of the set's first header line.
	Line int
	// Keywords are the header keywords in file order, without the
	// structural ones (NUMBER_OF_FIELDS, NUMBER_OF_SETS and KEYWORD
	// declarations), which WriteCGATS derives.
	Keywords []Keyword
	// Format is the data format: the field names in file order, as
	// written.
	Format []string
}

// Value returns the value of the first keyword called name (exact
// spelling) and whether there is one.
func (h CGATSHeader) Value(name string) (string, bool) {
	for _, k := range h.Keywords {
		if k.Name == name {
			return k.Value, true
		}
	}
	return "", false
}

// CGATSSet is one data set: its header and its samples. A sample of a set
// with spectral fields has its Spectrum; a sample of a set without them
// has a zero Spectrum. Every non-spectral field (SAMPLE_ID, SAMPLE_NAME,
// XYZ_X, LAB_L, CMYK_C, …) is in the sample's Fields, keyed by field name,
// with its text as written; see Named.Number, Named.XYZ and Named.Lab.
type CGATSSet struct {
	CGATSHeader
	Samples []Named
}

// CGATSReader reads samples from CGATS.17 text one at a time, so a file
// of any length streams in constant memory. Its exported fields may be
// changed after NewCGATSReader and before the first call to Next. A
// CGATSReader is not safe for concurrent use.
type CGATSReader struct {
	// Options control how each spectrum is built (interpolation,
	// extrapolation, grid step for irregular wavelengths); the zero value
	// gives colorimetry's defaults.
	Options colorimetry.Options
	// MaxLineBytes is the longest line accepted, in bytes without the line
	// ending; zero means DefaultMaxLineBytes.
	MaxLineBytes int
	// MaxSamples is the largest grid, in samples, onto which irregularly
	// spaced wavelengths may be resampled; zero means DefaultMaxSamples.
	MaxSamples int
	// MaxColumns is the largest number of fields in a data format; zero
	// means DefaultMaxColumns.
	MaxColumns int
	// NeedSpectra makes a data set without spectral fields an error
	// wrapping ErrNoSpectrum, naming the file and the line of its
	// BEGIN_DATA_FORMAT. By default such a set yields samples with a zero
	// Spectrum.
	NeedSpectra bool

	src     *Reader // line source, error formatting, spectrum building
	own     bool    // src was made by NewCGATSReader: copy the settings
	started bool
	err     error // sticky error, io.EOF at the end

	state   cgatsState
	ident   string // the file identifier
	first   bool   // the next meaningful line is the file's first
	sets    int    // data sets begun
	total   int    // samples returned without error
	cur     *cgatsSet
	toks    []string
	onBegin func(CGATSHeader) // called at each BEGIN_DATA (ReadCGATS)
}

// cgatsState is where the reader is in the file.
type cgatsState int

const (
	stHeader      cgatsState = iota // keywords before BEGIN_DATA_FORMAT
	stFormat                        // between BEGIN_ and END_DATA_FORMAT
	stAfterFormat                   // keywords between END_DATA_FORMAT and BEGIN_DATA
	stData                          // between BEGIN_DATA and END_DATA
)

// cgatsSet is the state of the data set being read.
type cgatsSet struct {
	head        CGATSHeader
	nFields     int // NUMBER_OF_FIELDS, -1 when absent
	nFieldsLine int
	nSets       int // NUMBER_OF_SETS, -1 when absent
	nSetsLine   int
	formatLine  int   // line of BEGIN_DATA_FORMAT
	dataLine    int   // line of BEGIN_DATA
	count       int   // data lines read
	fieldLines  []int // line of each field name of the format

	wl       []float64 // spectral wavelengths, ascending, nm
	wlCols   []int     // their 0-based columns
	vals     []float64
	numeric  []int // 0-based columns of XYZ and Lab fields, checked as numbers
	textCols []int // 0-based columns of non-spectral fields
	idCol    int   // SAMPLE_ID column, -1 if none
	nameCol  int   // SAMPLE_NAME column, -1 if none
	setText  string
	src      *source
}

// NewCGATSReader returns a CGATSReader that reads CGATS.17 text from r.
// The file name is used in error messages; "-" stands for standard input.
//
// What it accepts:
//
//   - LF or CRLF line endings, a UTF-8 byte order mark, blank lines, and
//     comments: a '#' at the start of a token, outside quotes, runs to the
//     end of the line.
//   - Tokens separated by any run of spaces and tabs. A token may be
//     quoted with double quotes; a doubled quote inside stands for one
//     quote, and a quote not followed by white space or the end of the
//     line is kept as it is.
//   - The first line is the file identifier unless it starts with a
//     structural or a standard keyword. In a later data set, a line equal
//     to the identifier is skipped.
//   - Keyword lines "NAME value", where the value is a single quoted
//     string (returned without its quotes), or else the rest of the line
//     as written; private keywords need not be declared with KEYWORD.
//     Structural keywords (BEGIN_DATA_FORMAT and the like) are matched
//     without regard to case.
//   - NUMBER_OF_FIELDS and NUMBER_OF_SETS are optional; when given they
//     must agree with the data format and the number of data lines.
//   - One sample per data line, every field of the format on it.
//   - Several data sets in one file, each with its own header; each
//     sample's set index is in Fields[CGATSSetKey].
//   - Spectral fields named after their wavelength in nm, in any case and
//     any order: SPECTRAL_NM380 (the spelling WriteCGATS writes),
//     SPECTRAL_NM_380, SPECTRAL_380, NM380 and NM_380, with decimals
//     allowed (SPECTRAL_NM380.5). Their values must be finite decimal
//     numbers (a decimal comma is accepted) and are kept as written, never
//     rescaled; the fields are sorted by wavelength, and a wavelength given
//     twice is an error. Irregular wavelengths are resampled as by Reader.
//   - XYZ_X, XYZ_Y, XYZ_Z, LAB_L, LAB_A and LAB_B must be finite numbers;
//     every other field is kept as text.
//
// A sample's Name is its SAMPLE_NAME, or else its SAMPLE_ID (matched
// without regard to case or underscores, so SampleID counts), or else
// "sample K" (K counts from 1 in each set), with "set S " before it in
// sets after the first. Its Line is its data line, its Column 1.
func NewCGATSReader(r io.Reader, file string) *CGATSReader {
	return &CGATSReader{src: NewReader(r, file), own: true, first: true}
}

// ReadCGATS reads every data set of CGATS text from r, each with its
// samples, keeping empty sets. It returns the sets read before the first
// error together with that error.
func ReadCGATS(r io.Reader, file string) ([]CGATSSet, error) {
	cr := NewCGATSReader(r, file)
	var sets []CGATSSet
	cr.onBegin = func(h CGATSHeader) { sets = append(sets, CGATSSet{CGATSHeader: h}) }
	for {
		n, err := cr.Next()
		if err == io.EOF {
			return sets, nil
		}
		if err != nil {
			return sets, err
		}
		s := &sets[len(sets)-1]
		s.Samples = append(s.Samples, n)
	}
}

// ReadCGATSFile reads every data set of the named CGATS file; "-" reads
// standard input. See ReadCGATS.
func ReadCGATSFile(path string) ([]CGATSSet, error) {
	if path == "-" {
		return ReadCGATS(os.Stdin, "-")
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return ReadCGATS(f, path)
}

// Header returns the header of the data set of the sample last returned
// by Next (or of the set being read when Next returned an error), and
// false before the first data set has begun.
func (r *CGATSReader) Header() (CGATSHeader, bool) {
	if r.cur == nil {
		return CGATSHeader{}, false
	}
	return r.cur.head, true
}

// Next returns the next sample, or io.EOF after the last one.
//
// A problem with one data line (a bad number, a wrong number of fields) is
// returned as a *ParseError and the next call goes on with the following
// line; so is a NUMBER_OF_SETS that disagrees with the data, reported at
// END_DATA, after which the next set is read. Problems with the structure
// or a header (a missing END_DATA, a bad data format, a set without
// spectral fields under NeedSpectra, a line too long, a read error, a file
// without samples) are returned by every later call as well.
func (r *CGATSReader) Next() (Named, error) {
	if r.err != nil {
		return Named{}, r.err
	}
	if !r.started {
		r.started = true
		if r.own {
			r.src.Options = r.Options
			r.src.MaxLineBytes = r.MaxLineBytes
			r.src.MaxSamples = r.MaxSamples
			r.src.MaxColumns = r.MaxColumns
		}
		if err := checkLimits(r.MaxLineBytes, r.MaxSamples, r.MaxColumns); err != nil {
			r.err = err
			return Named{}, r.err
		}
	}
	return r.next()
}

// fail records err as the sticky error and returns it.
func (r *CGATSReader) fail(err error) (Named, error) {
	r.err = err
	return Named{}, err
}

// next reads lines until it has a sample, an error or the end. Errors of
// one data line are returned as they are; every other error is recorded as
// sticky.
func (r *CGATSReader) next() (Named, error) {
	for {
		line, err := r.src.readLine()
		if err == io.EOF {
			return r.fail(r.atEOF())
		}
		if err != nil {
			return r.fail(err)
		}
		ln := r.src.line
		switch r.state {
		case stData:
			toks, qcol := splitCGATS(r.toks, line)
			r.toks = toks
			if qcol > 0 {
				r.cur.count++
				return Named{}, r.src.errorf(ln, qcol, r.fieldName(qcol-1), ErrQuote)
			}
			if len(toks) == 0 {
				continue
			}
			if isWord(toks[0], "END_DATA") && !startsQuoted(line) {
				if err := r.endData(ln, len(toks)); err != nil {
					return Named{}, err
				}
				continue
			}
			r.cur.count++
			return r.sample(toks, ln)
		case stFormat:
			if err := r.formatTokens(line, ln); err != nil {
				return r.fail(err)
			}
		default:
			if err := r.headerLine(line, ln); err != nil {
				return r.fail(err)
			}
		}
	}
}

// fieldName returns the name of the 0-based column c of the current
// format, or "".
func (r *CGATSReader) fieldName(c int) string {
	if r.cur == nil || c < 0 || c >= len(r.cur.head.Format) {
		return ""
	}
	return r.cur.head.Format[c]
}

// atEOF returns the error (io.EOF when all is well) for the end of the
// input in the current state.
func (r *CGATSReader) atEOF() error {
	last := max(r.src.line, 1)
	switch r.state {
	case stData:
		return r.src.errorf(last, 0, "END_DATA", fmt.Errorf("%w: BEGIN_DATA at line %d has no END_DATA", ErrStructure, r.cur.dataLine))
	case stFormat:
		return r.src.errorf(last, 0, "END_DATA_FORMAT", fmt.Errorf("%w: BEGIN_DATA_FORMAT at line %d has no END_DATA_FORMAT", ErrStructure, r.cur.formatLine))
	case stAfterFormat:
		return r.src.errorf(last, 0, "BEGIN_DATA", fmt.Errorf("%w: data format at line %d is followed by no BEGIN_DATA", ErrStructure, r.cur.formatLine))
	}
	if r.cur != nil && r.cur.dataLine == 0 {
		return r.src.errorf(r.cur.head.Line, 0, "BEGIN_DATA_FORMAT", fmt.Errorf("%w: the header of data set %d has no BEGIN_DATA_FORMAT", ErrStructure, r.cur.head.Set))
	}
	if r.total == 0 {
		if r.sets == 0 {
			return r.src.errorf(last, 0, "", fmt.Errorf("no data set: %w", ErrNoData))
		}
		return r.src.errorf(last, 0, "", fmt.Errorf("no samples: %w", ErrNoData))
	}
	return io.EOF
}

// beginSet starts a new data set at line ln, if none is being read.
func (r *CGATSReader) beginSet(ln int) {
	if r.cur != nil && r.cur.dataLine == 0 {
		return
	}
	r.sets++
	r.cur = &cgatsSet{
		head:    CGATSHeader{Identifier: r.ident, Set: r.sets, Line: ln},
		nFields: -1,
		nSets:   -1,
		idCol:   -1,
		nameCol: -1,
		setText: strconv.Itoa(r.sets),
	}
}

// headerLine handles a line outside the data format and the data.
func (r *CGATSReader) headerLine(line string, ln int) error {
	name, rest, text, ok := splitKeyword(line)
	if !ok {
		return nil // blank or comment
	}
	word := strings.ToUpper(name)
	if r.first {
		r.first = false
		if !isStructural(word) && !isStandardKeyword(word) {
			r.ident = strings.Clone(text)
			return nil
		}
	}
	if r.state == stHeader && r.sets > 0 && r.cur.dataLine != 0 && r.ident != "" && text == r.ident {
		return nil // the identifier repeated before a later set
	}
	if r.state == stHeader {
		r.beginSet(ln)
	}
	s := r.cur
	switch word {
	case "BEGIN_DATA_FORMAT":
		if r.state == stAfterFormat {
			return r.src.errorf(ln, 0, name, fmt.Errorf("%w: a second data format for data set %d (the first at line %d)", ErrStructure, s.head.Set, s.formatLine))
		}
		s.formatLine = ln
		r.state = stFormat
		if rest != "" {
			return r.formatTokens(rest, ln)
		}
		return nil
	case "END_DATA_FORMAT":
		return r.src.errorf(ln, 0, name, fmt.Errorf("%w: END_DATA_FORMAT without BEGIN_DATA_FORMAT", ErrStructure))
	case "BEGIN_DATA":
		if r.state != stAfterFormat {
			return r.src.errorf(ln, 0, name, fmt.Errorf("%w: BEGIN_DATA before the data format", ErrStructure))
		}
		if rest != "" {
			return r.src.errorf(ln, 0, name, fmt.Errorf("%w: text after BEGIN_DATA", ErrStructure))
		}
		s.dataLine = ln
		if err := r.prepare(); err != nil {
			return err
		}
		r.state = stData
		if r.onBegin != nil {
			r.onBegin(s.head)
		}
		return nil
	case "END_DATA":
		return r.src.errorf(ln, 0, name, fmt.Errorf("%w: END_DATA without BEGIN_DATA", ErrStructure))
	case "NUMBER_OF_FIELDS", "NUMBER_OF_SETS":
		v, err := countValue(rest)
		if err != nil {
			return r.src.errorf(ln, 2, name, err)
		}
		p, pl := &s.nFields, &s.nFieldsLine
		if word == "NUMBER_OF_SETS" {
			p, pl = &s.nSets, &s.nSetsLine
		}
		if *p >= 0 {
			return r.src.errorf(ln, 0, name, fmt.Errorf("%w: %s given twice (first at line %d)", ErrStructure, name, *pl))
		}
		*p, *pl = v, ln
		return nil
	case "KEYWORD":
		return nil // declarations are derived when writing
	}
	if !validName(name) {
		return r.src.errorf(ln, 1, "", fmt.Errorf("%w: line starts with %s, not a keyword", ErrStructure, strconv.Quote(name)))
	}
	s.head.Keywords = append(s.head.Keywords, Keyword{Name: strings.Clone(name), Value: strings.Clone(keywordValue(rest))})
	return nil
}

// formatTokens adds the field names in text to the current format, up to
// an END_DATA_FORMAT.
func (r *CGATSReader) formatTokens(text string, ln int) error {
	toks, qcol := splitCGATS(r.toks, text)
	r.toks = toks
	s := r.cur
	if qcol > 0 {
		return r.src.errorf(ln, 0, "", fmt.Errorf("data format: %w", ErrQuote))
	}
	for i, t := range toks {
		if isWord(t, "END_DATA_FORMAT") {
			if i != len(toks)-1 {
				return r.src.errorf(ln, 0, t, fmt.Errorf("%w: text after END_DATA_FORMAT", ErrStructure))
			}
			r.state = stAfterFormat
			return nil
		}
		col := len(s.head.Format) + 1
		if m := orDefault(r.src.MaxColumns, DefaultMaxColumns); col > m {
			return r.src.errorf(ln, col, "", fmt.Errorf("%w: more than %d fields in the data format (MaxColumns)", ErrTooBig, m))
		}
		if u := strings.ToUpper(t); isStructural(u) {
			return r.src.errorf(ln, col, t, fmt.Errorf("%w: %s inside the data format (BEGIN_DATA_FORMAT at line %d has no END_DATA_FORMAT)", ErrStructure, t, s.formatLine))
		}
		if !validName(t) {
			return r.src.errorf(ln, col, t, fmt.Errorf("%w: %s is not a field name", ErrHeader, strconv.Quote(t)))
		}
		if k := slices.Index(s.head.Format, t); k >= 0 {
			return r.src.errorf(ln, col, t, fmt.Errorf("%w: field name appears twice (fields %d and %d)", ErrHeader, k+1, col))
		}
		s.head.Format = append(s.head.Format, strings.Clone(t))
		s.fieldLines = append(s.fieldLines, ln)
	}
	return nil
}

// prepare checks the current set's format at BEGIN_DATA and classifies its
// fields.
func (r *CGATSReader) prepare() error {
	s := r.cur
	f := s.head.Format
	if len(f) == 0 {
		return r.src.errorf(s.formatLine, 0, "BEGIN_DATA_FORMAT", fmt.Errorf("%w: the data format names no field", ErrHeader))
	}
	if s.nFields >= 0 && s.nFields != len(f) {
		return r.src.errorf(s.nFieldsLine, 2, "NUMBER_OF_FIELDS", fmt.Errorf("%w: NUMBER_OF_FIELDS is %d, the data format at line %d names %d", ErrFieldCount, s.nFields, s.formatLine, len(f)))
	}
	s.src = &source{file: r.src.file, decimalComma: true, extra: map[string]int{CGATSSetKey: 0}}
	type spectral struct {
		nm  float64
		col int
	}
	var sp []spectral
	for c, name := range f {
		if nm, ok := spectralWavelength(name); ok {
			if !(nm > 0) {
				return r.src.errorf(s.fieldLines[c], c+1, name, fmt.Errorf("%g nm: %w", nm, ErrWavelength))
			}
			sp = append(sp, spectral{nm, c})
			continue
		}
		switch strings.ReplaceAll(strings.ToUpper(name), "_", "") {
		case "SAMPLENAME":
			if s.nameCol < 0 {
				s.nameCol = c
			}
		case "SAMPLEID":
			if s.idCol < 0 {
				s.idCol = c
			}
		}
		if isColorimetric(name) {
			s.numeric = append(s.numeric, c)
		}
		s.textCols = append(s.textCols, c)
		s.src.extra[name] = c + 1
	}
	if len(sp) == 0 {
		if r.NeedSpectra {
			return r.src.errorf(s.formatLine, 0, "", fmt.Errorf("data set %d has %w (such as SPECTRAL_NM380); its fields are %s",
				s.head.Set, ErrNoSpectrum, fieldList(f)))
		}
		return nil
	}
	sort.SliceStable(sp, func(i, j int) bool { return sp[i].nm < sp[j].nm })
	for i := 1; i < len(sp); i++ {
		if sp[i].nm == sp[i-1].nm {
			a, b := sp[i-1].col, sp[i].col
			if a > b {
				a, b = b, a
			}
			return r.src.errorf(s.fieldLines[b], b+1, f[b], fmt.Errorf("%g nm, as field %d (%s): %w", sp[i].nm, a+1, f[a], colorimetry.ErrDuplicate))
		}
	}
	if len(sp) < 3 {
		return r.src.errorf(s.fieldLines[sp[0].col], sp[0].col+1, f[sp[0].col], fmt.Errorf("%d spectral fields: %w", len(sp), colorimetry.ErrTooFew))
	}
	s.wl = make([]float64, len(sp))
	s.wlCols = make([]int, len(sp))
	for i, x := range sp {
		s.wl[i], s.wlCols[i] = x.nm, x.col
	}
	s.vals = make([]float64, len(sp))
	first := s.wlCols[0]
	if err := r.src.checkSpan(s.wl); err != nil {
		return r.src.errorf(s.fieldLines[first], first+1, f[first], err)
	}
	// Problems of the wavelengths alone are reported once, here.
	if _, err := r.src.spectrum(s.wl, s.vals); err != nil {
		return r.src.errorf(s.fieldLines[first], first+1, f[first], err)
	}
	return nil
}

// fieldList returns up to ten field names for a message.
func fieldList(f []string) string {
	if len(f) > 10 {
		return strings.Join(f[:10], " ") + fmt.Sprintf(" … (%d in all)", len(f))
	}
	return strings.Join(f, " ")
}

// endData closes the current set at an END_DATA line ln of ntok tokens.
func (r *CGATSReader) endData(ln, ntok int) error {
	s := r.cur
	r.state = stHeader
	if ntok > 1 {
		r.err = r.src.errorf(ln, 0, "END_DATA", fmt.Errorf("%w: text after END_DATA", ErrStructure))
		return r.err
	}
	if s.nSets >= 0 && s.nSets != s.count {
		return r.src.errorf(ln, 0, "NUMBER_OF_SETS", fmt.Errorf("%w: NUMBER_OF_SETS at line %d is %d, data set %d has %d data lines", ErrSetCount, s.nSetsLine, s.nSets, s.head.Set, s.count))
	}
	return nil
}

// sample builds one sample from the tokens of data line ln.
func (r *CGATSReader) sample(toks []string, ln int) (Named, error) {
	s := r.cur
	f := s.head.Format
	if len(toks) != len(f) {
		col := len(toks) + 1
		if len(toks) > len(f) {
			col = len(f) + 1
		}
		return Named{}, r.src.errorf(ln, col, r.fieldName(col-1), fmt.Errorf("%w: %d fields, the data format names %d", ErrFieldCount, len(toks), len(f)))
	}
	for j, c := range s.wlCols {
		v, err := parseNumber(toks[c], true)
		if err != nil {
			return Named{}, r.src.errorf(ln, c+1, f[c], err)
		}
		s.vals[j] = v
	}
	for _, c := range s.numeric {
		if _, err := parseNumber(toks[c], true); err != nil {
			return Named{}, r.src.errorf(ln, c+1, f[c], err)
		}
	}
	n := Named{Line: ln, Column: 1, src: s.src}
	if len(s.wl) > 0 {
		sp, err := r.src.spectrum(s.wl, s.vals)
		if err != nil {
			return Named{}, r.src.sampleError(err, len(s.wl), ln, 0, "", func(i int) (int, int, string) {
				c := s.wlCols[i]
				return ln, c + 1, f[c]
			})
		}
		n.Spectrum = sp
		n.MaxStep = maxStep(s.wl)
	}
	n.Fields = make(map[string]string, len(s.textCols)+1)
	for _, c := range s.textCols {
		n.Fields[f[c]] = strings.Clone(toks[c])
	}
	n.Fields[CGATSSetKey] = s.setText
	switch {
	case s.nameCol >= 0 && toks[s.nameCol] != "":
		n.Name = n.Fields[f[s.nameCol]]
	case s.idCol >= 0 && toks[s.idCol] != "":
		n.Name = n.Fields[f[s.idCol]]
	case s.head.Set > 1:
		n.Name = "set " + s.setText + " sample " + strconv.Itoa(s.count)
	default:
		n.Name = "sample " + strconv.Itoa(s.count)
	}
	r.total++
	return n, nil
}

// XYZ returns the tristimulus values in the fields XYZ_X, XYZ_Y and XYZ_Z,
// as CGATS files carry them (on the scale the file uses, usually
// Y = 100 for the white). It returns a *ParseError naming the file, line
// and field, wrapping ErrNoField when a field is missing and ErrNotNumber,
// ErrEmpty or colorimetry.ErrNotFinite when its text is not a finite
// number.
func (n Named) XYZ() (colorimetry.XYZ, error) {
	var v [3]float64
	for i, k := range [3]string{"XYZ_X", "XYZ_Y", "XYZ_Z"} {
		x, err := n.Number(k)
		if err != nil {
			return colorimetry.XYZ{}, err
		}
		v[i] = x
	}
	return colorimetry.XYZ{X: v[0], Y: v[1], Z: v[2]}, nil
}

// Lab returns the CIELAB values in the fields LAB_L, LAB_A and LAB_B (L*
// 0–100), with errors as for XYZ.
func (n Named) Lab() (colorimetry.Lab, error) {
	var v [3]float64
	for i, k := range [3]string{"LAB_L", "LAB_A", "LAB_B"} {
		x, err := n.Number(k)
		if err != nil {
			return colorimetry.Lab{}, err
		}
		v[i] = x
	}
	return colorimetry.Lab{L: v[0], A: v[1], B: v[2]}, nil
}

// isColorimetric reports whether a field holds XYZ or CIELAB values,
// which must be numbers: XYZ_X, XYZ_Y, XYZ_Z, LAB_L, LAB_A, LAB_B
// (CGATS.17 data format identifiers, from memory).
func isColorimetric(name string) bool {
	switch name {
	case "XYZ_X", "XYZ_Y", "XYZ_Z", "LAB_L", "LAB_A", "LAB_B":
		return true
	}
	return false
}

// spectralField returns the field name WriteCGATS writes for a spectral
// value at nm: SPECTRAL_NM followed by the wavelength, as CGATS.17 names
// spectral data fields (from memory), e.g. SPECTRAL_NM380 or
// SPECTRAL_NM380.5.
func spectralField(nm float64) string {
	return "SPECTRAL_NM" + strconv.FormatFloat(nm, 'f', -1, 64)
}

// spectralWavelength reads a field name as a spectral field and returns
// its wavelength in nm. It accepts, in any case, SPECTRAL_NM380,
// SPECTRAL_NM_380, SPECTRAL_380, NM380 and NM_380, with a decimal point
// allowed in the wavelength.
func spectralWavelength(name string) (float64, bool) {
	if len(name) < 3 {
		return 0, false
	}
	t := name
	switch {
	case hasPrefixFold(t, "SPECTRAL_"):
		t = t[len("SPECTRAL_"):]
		if hasPrefixFold(t, "NM") {
			t = t[2:]
		}
	case hasPrefixFold(t, "NM"):
		t = t[2:]
	default:
		return 0, false
	}
	t = strings.TrimPrefix(t, "_")
	if t == "" {
		return 0, false
	}
	digits, points := 0, 0
	for i := 0; i < len(t); i++ {
		switch c := t[i]; {
		case c >= '0' && c <= '9':
			digits++
		case c == '.':
			points++
		default:
			return 0, false
		}
	}
	if digits == 0 || points > 1 {
		return 0, false
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil {
		return 0, false
	}
	return v, true
}

// hasPrefixFold reports whether s begins with the upper-case ASCII prefix
// p, without regard to case.
func hasPrefixFold(s, p string) bool {
	return len(s) >= len(p) && strings.EqualFold(s[:len(p)], p)
}

// isWord reports whether tok is the structural keyword w (upper case),
// without regard to case.
func isWord(tok, w string) bool { return len(tok) == len(w) && strings.EqualFold(tok, w) }

// isStructural reports whether the upper-case word is a keyword that
// shapes a CGATS file rather than describing its data.
func isStructural(w string) bool {
	switch w {
	case "BEGIN_DATA_FORMAT", "END_DATA_FORMAT", "BEGIN_DATA", "END_DATA",
		"NUMBER_OF_FIELDS", "NUMBER_OF_SETS", "KEYWORD":
		return true
	}
	return false
}

// standardKeywords are the header keywords CGATS.17 defines, which need no
// KEYWORD declaration (from memory of ISO 28178; a private keyword that is
// declared anyway reads the same).
var standardKeywords = map[string]bool{
	"ORIGINATOR": true, "DESCRIPTOR": true, "CREATED": true, "MANUFACTURER": true,
	"MANUFACTURE": true, "PROD_DATE": true, "SERIAL": true, "MATERIAL": true,
	"INSTRUMENTATION": true, "MEASUREMENT_SOURCE": true, "MEASUREMENT_GEOMETRY": true,
	"PRINT_CONDITIONS": true, "SAMPLE_BACKING": true, "CHISQ_DOF": true,
	"FILE_DESCRIPTOR": true, "WEIGHTING_FUNCTION": true, "COMPUTATIONAL_PARAMETER": true,
	"FILTER": true, "POLARIZATION": true,
}

// isStandardKeyword reports whether the upper-case word is a keyword
// CGATS.17 defines.
func isStandardKeyword(w string) bool { return standardKeywords[w] }

// validName reports whether s can be a keyword or field name: ASCII
// letters, digits and "_.-+/", starting with a letter or underscore.
func validName(s string) bool {
	if s == "" {
		return false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= 'A' && c <= 'Z', c >= 'a' && c <= 'z', c == '_':
		case i > 0 && (c >= '0' && c <= '9' || c == '.' || c == '-' || c == '+' || c == '/'):
		default:
			return false
		}
	}
	return true
}

// countValue reads the value of NUMBER_OF_FIELDS or NUMBER_OF_SETS: a
// non-negative integer, quoted or not.
func countValue(rest string) (int, error) {
	v := keywordValue(rest)
	n, err := strconv.Atoi(v)
	if err != nil || n < 0 || strings.HasPrefix(v, "+") {
		return 0, fmt.Errorf("value %q is %w (want a count)", v, ErrNotNumber)
	}
	return n, nil
}

// isSpace reports whether c separates CGATS tokens. A carriage return
// inside a line counts as a space.
func isSpace(c byte) bool { return c == ' ' || c == '\t' || c == '\r' }

// splitCGATS splits a line into tokens, dropping a comment, into dst,
// which it reslices and returns. Unquoted tokens are substrings of line.
// It returns the 1-based number of a quoted token left open at the end of
// the line, or 0.
func splitCGATS(dst []string, line string) ([]string, int) {
	dst = dst[:0]
	i, n := 0, len(line)
	for {
		for i < n && isSpace(line[i]) {
			i++
		}
		if i >= n || line[i] == '#' {
			return dst, 0
		}
		if line[i] == '"' {
			tok, next, ok := cgatsQuoted(line, i+1)
			if !ok {
				return dst, len(dst) + 1
			}
			dst = append(dst, tok)
			i = next
			continue
		}
		j := i + 1
		for j < n && !isSpace(line[j]) {
			j++
		}
		dst = append(dst, line[i:j])
		i = j
	}
}

// cgatsQuoted reads a quoted token whose content starts at line[start]. It
// returns the content, the index just past the closing quote and whether
// the token was closed. A doubled quote stands for one quote; a quote
// followed by anything but white space or the end of the line is kept.
func cgatsQuoted(line string, start int) (string, int, bool) {
	var b strings.Builder
	from := start
	for k := start; k < len(line); k++ {
		if line[k] != '"' {
			continue
		}
		if k+1 < len(line) && line[k+1] == '"' {
			b.WriteString(line[from : k+1])
			k++
			from = k + 1
			continue
		}
		if k+1 == len(line) || isSpace(line[k+1]) {
			if b.Len() == 0 {
				return line[from:k], k + 1, true
			}
			b.WriteString(line[from:k])
			return b.String(), k + 1, true
		}
	}
	return "", len(line), false
}

// splitKeyword splits a header line into its first token and the rest of
// the line, trimmed and without a comment, and returns the whole line so
// trimmed as text. It reports false for a blank or comment line. An
// unclosed quote leaves the rest of the line as it is.
func splitKeyword(line string) (name, rest, text string, ok bool) {
	i, n := 0, len(line)
	for i < n && isSpace(line[i]) {
		i++
	}
	if i >= n || line[i] == '#' {
		return "", "", "", false
	}
	// end is the end of the last token before a comment; j the end of
	// the first token, start the start of the second.
	j, start, end := -1, -1, i
	for k := i; ; {
		for k < n && isSpace(line[k]) {
			k++
		}
		if k >= n || line[k] == '#' {
			break
		}
		if j >= 0 && start < 0 {
			start = k
		}
		if line[k] == '"' {
			_, next, closed := cgatsQuoted(line, k+1)
			if !closed {
				k = n
			} else {
				k = next
			}
		} else {
			for k < n && !isSpace(line[k]) {
				k++
			}
		}
		end = k
		if j < 0 {
			j = k
		}
	}
	text = strings.TrimRight(line[i:end], " \t\r")
	name = line[i:j]
	if start >= 0 {
		rest = strings.TrimRight(line[start:end], " \t\r")
	}
	return name, rest, text, true
}

// keywordValue returns the value of a keyword line from the rest of the
// line: the content of a single quoted string, or the rest as it is.
func keywordValue(rest string) string {
	if len(rest) >= 2 && rest[0] == '"' {
		if v, next, ok := cgatsQuoted(rest, 1); ok && next == len(rest) {
			return v
		}
	}
	return rest
}

// startCGATS makes r read CGATS.17 text, by CGATSReader's rules with
// NeedSpectra set, when its input looks like it (see looksLikeCGATS) in
// the first 64 KiB (the read buffer). It reports whether it did.
// Reader.start calls it under LayoutAuto.
func (r *Reader) startCGATS() bool {
	b, _ := r.br.Peek(r.br.Size()) // short at the end of the input; a read error recurs later
	if !looksLikeCGATS(b) {
		return false
	}
	r.cgats = &CGATSReader{src: r, started: true, first: true, NeedSpectra: true}
	return true
}

// looksLikeCGATS reports whether b looks like CGATS text: its first line
// that is neither blank nor a comment starts with "CGATS" (the identifier
// CGATS.17 and its kin) and holds no comma or semicolon (so is no CSV
// header), or any line starts with the token BEGIN_DATA_FORMAT; both
// without regard to case.
func looksLikeCGATS(b []byte) bool {
	b = bytes.TrimPrefix(b, []byte(bom))
	first := true
	for len(b) > 0 {
		line := b
		if k := bytes.IndexByte(b, '\n'); k >= 0 {
			line, b = b[:k], b[k+1:]
		} else {
			b = nil
		}
		i := 0
		for i < len(line) && isSpace(line[i]) {
			i++
		}
		t := line[i:]
		if len(t) == 0 || t[0] == '#' {
			continue
		}
		if first && hasPrefixFold(string(t[:min(len(t), 5)]), "CGATS") && !bytes.ContainsAny(t, ",;") {
			return true
		}
		first = false
		const word = "BEGIN_DATA_FORMAT"
		if len(t) >= len(word) && strings.EqualFold(string(t[:len(word)]), word) &&
			(len(t) == len(word) || isSpace(t[len(word)]) || t[len(word)] == '#') {
			return true
		}
	}
	return false
}

// startsQuoted reports whether the first token of line is quoted.
func startsQuoted(line string) bool {
	t := strings.TrimLeft(line, " \t\r")
	return t != "" && t[0] == '"'
}
