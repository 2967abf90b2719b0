package cie

import (
	"fmt"
	"strings"
	"sync"

	"github.com/antipode-color/antipode/colorimetry"
)

// Observer names, as returned by Observer.Name.
const (
	NameCIE1931 = "CIE 1931 2°"
	NameCIE1964 = "CIE 1964 10°"
)

var (
	obs1931, obs1964 *colorimetry.Observer
	obsOnce          sync.Once
)

func initObservers() {
	obs1931 = newObserver(NameCIE1931, &tabCIE1931)
	obs1964 = newObserver(NameCIE1964, &tabCIE1964)
}

func newObserver(name string, t *table) *colorimetry.Observer {
	o, err := colorimetry.NewObserver(name, t.wavelengths(), t.data[0], t.data[1], t.data[2])
	if err != nil {
		panic("cie: " + err.Error()) // generated tables are valid by construction
	}
	return o
}

// CIE1931 returns the CIE 1931 2° standard colorimetric observer, x̄, ȳ, z̄
// at 1 nm from 360 to 830 nm (ISO/CIE 11664-1:2019, CIE 015:2018). Its ȳ
// is the photopic luminous efficiency V(λ) of CIE 018:2019. The observer
// is built once and shared.
func CIE1931() *colorimetry.Observer {
	obsOnce.Do(initObservers)
	return obs1931
}

// CIE1964 returns the CIE 1964 10° standard colorimetric observer, x̄10,
// ȳ10, z̄10 at 1 nm from 360 to 830 nm (ISO/CIE 11664-1:2019, CIE
// 015:2018). The observer is built once and shared.
func CIE1964() *colorimetry.Observer {
	obsOnce.Do(initObservers)
	return obs1964
}

// ObserverByName returns the standard observer named s, case-insensitive:
// "1931", "2", "2deg", "2°" or "CIE 1931 2°" for CIE1931, and "1964",
// "10", "10deg", "10°" or "CIE 1964 10°" for CIE1964. Other names give an
// error wrapping ErrUnknown.
func ObserverByName(s string) (*colorimetry.Observer, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "1931", "2", "2deg", "2°", "cie1931", "cie 1931", strings.ToLower(NameCIE1931):
		return CIE1931(), nil
	case "1964", "10", "10deg", "10°", "cie1964", "cie 1964", strings.ToLower(NameCIE1964):
		return CIE1964(), nil
	}
	return nil, fmt.Errorf("%w observer %q (want 1931, 2, 2deg, 1964, 10 or 10deg)", ErrUnknown, s)
}
