package cie

import "errors"

// Sentinel errors; test with errors.Is.
var (
	// ErrUnknown reports a name that is not one of the standard data sets.
	ErrUnknown = errors.New("unknown")
	// ErrRange reports a parameter outside the range where the standard
	// defines the data (a daylight CCT outside 4000–25000 K, a sample
	// number beyond the set).
	ErrRange = errors.New("outside the defined range")
)
