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
}

func (t *table) header(cells ...string) { t.rows = append(t.rows, cells) }
func (t *table) row(cells ...string)    { t.rows = append(t.rows, cells) }

func (t *table) write(w io.Writer) {
	var width []int
	for _, r := range t.rows {
		for i, c := range r {
			if i >= len(width) {
				width = append(width, 0)
			}
			width[i] = max(width[i], utf8.RuneCountInString(c))
		}
	}
	for _, r := range t.rows {
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
}
