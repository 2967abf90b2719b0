package main

import (
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/antipode-color/antipode/colorimetry"
)

// parseXY reads a chromaticity "x,y" (--xy): two finite numbers with
// x > 0, y > 0 and x + y < 1, the inside of the CIE 1931 triangle where a
// real colour's chromaticity lies.
func parseXY(s string) (colorimetry.XY, error) {
	parts := strings.Split(s, ",")
	if len(parts) != 2 {
		return colorimetry.XY{}, usagef("--xy %s: want x,y", shown(s))
	}
	x, err1 := strconv.ParseFloat(strings.TrimSpace(parts[0]), 64)
	y, err2 := strconv.ParseFloat(strings.TrimSpace(parts[1]), 64)
	if err1 != nil || err2 != nil || !(x > 0 && y > 0 && x+y < 1) {
		return colorimetry.XY{}, usagef("--xy %s: want a chromaticity x,y with x > 0, y > 0, x + y < 1", shown(s))
	}
	return colorimetry.XY{X: x, Y: y}, nil
}

// shown returns a flag value for a message: as it is when every rune
// prints, quoted with Go escapes otherwise (a line break, a control
// character, invalid UTF-8), so that the message stays one line.
func shown(s string) string {
	if !utf8.ValidString(s) || strings.ContainsFunc(s, func(r rune) bool { return !unicode.IsPrint(r) }) {
		return strconv.Quote(s)
	}
	return s
}
