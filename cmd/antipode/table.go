package main

import (
	"fmt"
	"io"
	"strings"
	"unicode/utf8"
)

// table lays out rows of text in columns: the first column left-aligned,
// the others right-aligned, two spaces apart.
type table struct {
	rows [][]string
	// left marks further columns to align left (notes, names).
	left map[int]bool
	// minWidth holds columns' smallest widths, so that blocks of one long
	// table printed one after another line up.
	minWidth []int
	// noHeader leaves out the first row (the header) when printing.
	noHeader bool
}

func (t *table) header(cells ...string) { t.rows = append(t.rows, cells) }
func (t *table) row(cells ...string)    { t.rows = append(t.rows, cells) }

// write prints the table and returns the column widths it used.
func (t *table) write(w io.Writer) []int {
	width := append([]int(nil), t.minWidth...)
	for _, r := range t.rows {
		for i, c := range r {
			if i >= len(width) {
				width = append(width, 0)
			}
			width[i] = max(width[i], utf8.RuneCountInString(c))
		}
	}
	for k, r := range t.rows {
		if k == 0 && t.noHeader {
			continue
		}
		var b strings.Builder
		for i, c := range r {
			pad := strings.Repeat(" ", width[i]-utf8.RuneCountInString(c))
			switch {
			case i == 0:
				b.WriteString(c + pad)
			case t.left[i]:
				b.WriteString("  " + c + pad)
			default:
				b.WriteString("  " + pad + c)
			}
		}
		fmt.Fprintln(w, strings.TrimRight(b.String(), " "))
	}
	return width
}
