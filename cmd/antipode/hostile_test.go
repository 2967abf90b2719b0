package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"unicode/utf16"
)

// hostileUTF16 encodes s as UTF-16 (big- or little-endian), with a byte
// order mark when bom is set (U+FEFF; Unicode Standard §23.8, from
// memory).
func hostileUTF16(s string, bigEndian, bom bool) string {
	u := utf16.Encode([]rune(s))
	if bom {
		u = append([]uint16{0xfeff}, u...)
	}
	b := make([]byte, 0, 2*len(u))
	for _, x := range u {
		if bigEndian {
			b = append(b, byte(x>>8), byte(x))
		} else {
			b = append(b, byte(x), byte(x>>8))
		}
	}
	return string(b)
}

// hostileGrid is a valid columns-layout body, 380–780 nm at 20 nm, with
// the value v in every cell of the one spectrum "s".
func hostileGrid(v string) string {
	var b strings.Builder
	b.WriteString("nm,s\n")
	for nm := 380; nm <= 780; nm += 20 {
		b.WriteString(strconv.Itoa(nm) + "," + v + "\n")
	}
	return b.String()
}

// TestDescribeHostileFiles runs describe, as a user would, on files that
// instruments, spreadsheets and scripts produce when something goes wrong.
// Each must exit 2 with exactly one line on stderr that names the file and
// the line (and the field where one is to blame) and no stack trace. The
// contract is DESIGN.md's ("Errors are one line on stderr naming the file
// and place; never a stack trace"): common practice (no source).
func TestDescribeHostileFiles(t *testing.T) {
	t.Parallel()
	const good = "nm,a\n400,0.5\n500,0.5\n600,0.5\n700,0.5\n"
	million := "nm," + strings.Repeat("a,", 1_000_000) + "a\n"
	var rows strings.Builder
	rows.WriteString("nm,a\n")
	for i := range 70000 {
		rows.WriteString(strconv.Itoa(300+i) + ",0.5\n")
	}
	for _, tc := range []struct {
		name    string
		content string
		args    []string
		place   string // the place after the file name, a regexp
		field   string // the field named, if any
		want    string // a word the message must contain
	}{
		{name: "utf16le.csv", content: hostileUTF16(good, false, true), place: `:1:`, want: "UTF-16 is not supported; save as UTF-8"},
		{name: "utf16be.csv", content: hostileUTF16(good, true, true), place: `:1:`, want: "UTF-16 is not supported; save as UTF-8"},
		{name: "utf16-nobom.csv", content: hostileUTF16(good, false, false), place: `:1:`, want: "UTF-16 is not supported; save as UTF-8"},
		{name: "cr-only.csv", content: strings.ReplaceAll(good, "\n", "\r"), place: `:1:`, want: "CR-only line endings"},
		{name: "junk.bin", content: string([]byte{0x7f, 'E', 'L', 'F', 2, 1, 1, 0, 0, 0, 0, 0, 0, 0, 0, 0, 3, 0, '\n'}), place: `:1:`, want: "UTF-16"},
		{name: "long-line.csv", content: "nm,a\n400," + strings.Repeat("5", 17<<20) + "\n", place: `:2:`, want: "line too long"},
		{name: "million-columns.csv", content: million, place: `:1:65537:`, want: "MaxColumns"},
		{name: "too-many-rows.csv", content: rows.String(), place: `:65538:`, want: "MaxRows"},
		{name: "duplicate.csv", content: "nm,a,b,a\n400,1,2,3\n500,1,2,3\n600,1,2,3\n", place: `:1:4 `, field: "a", want: "appears twice"},
		{name: "empty-column.csv", content: "nm,a,,b\n400,1,,3\n500,1,,3\n600,1,,3\n", place: `:2:3 `, field: "column 3", want: "empty"},
		{name: "inf.csv", content: "nm,a\n400,Inf\n500,1\n600,1\n", place: `:2:2 `, field: "a", want: "not finite"},
		{name: "nan-rows.csv", content: "name,400,500,600\nx,1,NaN,1\n", place: `:2:3 `, field: "500", want: "not finite"},
		{name: "beyond-float64.csv", content: "nm,a\n400,1e309\n500,1\n600,1\n", place: `:2:2 `, field: "a", want: "float64 range"},
		// ±1e308 reads, but the tristimulus sums overflow: an error naming
		// the spectrum, not NaN in the output.
		{name: "overflow-light.csv", content: hostileGrid("1e308"), args: []string{"--as", "light"}, place: `:1: `, want: "overflow"},
		// 1e308 and 1e306 as reflectance: even read as percent they are
		// far beyond any reflectance factor (a fluorescent sample barely
		// exceeds 1), so they are refused at their line and field, before
		// any sum can overflow or print 300-digit numbers.
		{name: "overflow-reflectance.csv", content: hostileGrid("1e308"), place: `:2:2 `, field: "s", want: "not a reflectance factor"},
		{name: "huge-reflectance.csv", content: hostileGrid("1e306"), place: `:2:2 `, field: "s", want: "not a reflectance factor"},
		{name: "huge-transmittance.csv", content: hostileGrid("101"), args: []string{"--as", "transmittance", "--scale", "fraction"}, place: `:2:2 `, field: "s", want: "not a transmittance factor"},
		// A subnormal light scales to Y = 100 by a factor beyond the
		// float64 range: +Inf in the table and a JSON failure before.
		{name: "subnormal-light.csv", content: hostileGrid("5e-324"), args: []string{"--as", "light"}, place: `:1: `, want: "too small to scale"},
		{name: "subnormal-light-json.csv", content: hostileGrid("5e-324"), args: []string{"--as", "light", "--json"}, place: `:1: `, want: "too small to scale"},
		{name: "overflow-light-json.csv", content: hostileGrid("1e308"), args: []string{"--as", "light", "--json"}, place: `:1: `, want: "overflow"},
	} {
		path := filepath.Join(t.TempDir(), tc.name)
		if err := os.WriteFile(path, []byte(tc.content), 0o644); err != nil {
			t.Fatal(err)
		}
		code, out, errs := runCLI(t, "", append([]string{"describe", path}, tc.args...)...)
		if code != exitBad {
			t.Errorf("%s: exit %d, want %d; stderr %q", tc.name, code, exitBad, errs)
			continue
		}
		if out != "" {
			t.Errorf("%s: printed %q on stdout", tc.name, out)
		}
		if strings.Count(errs, "\n") != 1 || !strings.HasSuffix(errs, "\n") {
			t.Errorf("%s: stderr is not one line: %q", tc.name, errs)
		}
		if strings.Contains(errs, "goroutine") || strings.Contains(errs, "panic") {
			t.Errorf("%s: stack trace on stderr: %q", tc.name, errs)
		}
		re := regexp.MustCompile(regexp.QuoteMeta(path) + tc.place)
		if !re.MatchString(errs) {
			t.Errorf("%s: %q does not name the place %s%s", tc.name, errs, path, tc.place)
		}
		if tc.field != "" && !strings.Contains(errs, "(field "+tc.field+")") {
			t.Errorf("%s: %q does not name the field %q", tc.name, errs, tc.field)
		}
		if !strings.Contains(errs, tc.want) {
			t.Errorf("%s: %q does not say %q", tc.name, errs, tc.want)
		}
	}
}

// TestDescribeEdgeValues runs describe on files at the edges that are
// valid data: -0, a UTF-8 byte order mark, CRLF endings, a percent
// reflectance of 10 000 % (100 as a fraction: the largest accepted), the
// smallest subnormal. Each must exit 0 and print JSON that parses, with no
// NaN: common practice (no source).
func TestDescribeEdgeValues(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ name, content string }{
		{"minus-zero.csv", hostileGrid("-0")},
		{"bom.csv", "\ufeff" + hostileGrid("0.5")},
		{"crlf.csv", strings.ReplaceAll(hostileGrid("0.5"), "\n", "\r\n")},
		{"largest-reflectance.csv", hostileGrid("1e4")},
		{"tiny.csv", hostileGrid("5e-324")},
	} {
		path := filepath.Join(t.TempDir(), tc.name)
		if err := os.WriteFile(path, []byte(tc.content), 0o644); err != nil {
			t.Fatal(err)
		}
		code, out, errs := runCLI(t, "", "describe", path, "--json")
		if code != exitOK {
			t.Errorf("%s: exit %d: %s", tc.name, code, errs)
			continue
		}
		var rows []map[string]any
		if err := json.Unmarshal([]byte(out), &rows); err != nil || len(rows) != 1 {
			t.Errorf("%s: %d rows, %v", tc.name, len(rows), err)
		}
	}
}

// TestHostileModelGrids edits the grid of each demo model file to values
// no model can have — a negative start, an end beyond the float64 range, a
// billion wavelengths, no wavelengths — and runs mix on it: exit 2 with
// one line on stderr naming the file, never a result (wavelengths are
// positive and a grid finite: common practice (no source)). It shares the
// demo folder of TestOutputSafety.
func TestHostileModelGrids(t *testing.T) {
	demo, err := outputDemo()
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range []struct{ file, amounts string }{
		{"dyes.json", "kestrel-amber-dye=0.03"}, {"paints.json", "ky-brick=1"},
		{"rig.json", "wash-red=0.5"}, {"press.json", "c=0.5"},
	} {
		b, err := os.ReadFile(filepath.Join(demo, m.file))
		if err != nil {
			t.Fatal(err)
		}
		for _, edit := range []struct {
			key string
			val float64
		}{{"start_nm", -1e308}, {"start_nm", 0}, {"step_nm", 1e308}, {"step_nm", 0}, {"n", 1e9}, {"n", 0}} {
			var doc map[string]any
			if err := json.Unmarshal(b, &doc); err != nil {
				t.Fatal(err)
			}
			doc["model"].(map[string]any)["grid"].(map[string]any)[edit.key] = edit.val
			nb, err := json.Marshal(doc)
			if err != nil {
				t.Fatal(err)
			}
			path := filepath.Join(t.TempDir(), m.file)
			if err := os.WriteFile(path, nb, 0o644); err != nil {
				t.Fatal(err)
			}
			code, out, errs := runCLI(t, "", "mix", path, "--amounts", m.amounts)
			if code != exitBad || out != "" || strings.Count(errs, "\n") != 1 || !strings.Contains(errs, path) {
				t.Errorf("%s with %s = %g: exit %d, stdout %d bytes, stderr %q", m.file, edit.key, edit.val, code, len(out), errs)
			}
		}
	}
}

// TestHostileAmounts runs mix with amounts at the edge of what --amounts
// accepts (1e300) and the longest --path-length: exit 2 with one line on
// stderr, not a panic (a dyes mix of 1e300 g/L over 1e12 path lengths
// overflowed the absorbance and the library panicked). Common practice (no
// source).
func TestHostileAmounts(t *testing.T) {
	demo, err := outputDemo()
	if err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{
		{"mix", "dyes.json", "--amounts", "kestrel-amber-dye=1e300,kestrel-rose-dye=1e300,kestrel-teal-dye=1e300", "--path-length", "1e12"},
		{"mix", "dyes.json", "--amounts", "kestrel-amber-dye=1e300,kestrel-rose-dye=1e300,kestrel-teal-dye=1e300", "--path-length", "1e12", "--json"},
		{"mix", "rig.json", "--amounts", "wash-red=1e300"},
		{"mix", "press.json", "--amounts", "c=-1e300"},
	} {
		args = append([]string(nil), args...)
		args[1] = filepath.Join(demo, args[1])
		code, out, errs := runCLI(t, "", args...)
		if code != exitBad || out != "" || strings.Count(errs, "\n") != 1 || strings.Contains(errs, "goroutine") {
			t.Errorf("%v: exit %d, stdout %q, stderr %q", args, code, out, errs)
		}
	}
}
