package rendering

import (
	"errors"
	"fmt"
	"math"
	"sync"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/colorimetry"
)

// ErrNoReference reports a light for which the standard defines no
// reference illuminant: a correlated colour temperature above the end of
// the CIE daylight series (25 000 K).
var ErrNoReference = errors.New("no reference illuminant")

// grid is the computation grid of both indices: 380–780 nm at 5 nm.
var grid = colorimetry.Grid5nm

// Reference describes the reference illuminant a light was compared with.
type Reference struct {
	// Kelvin is the temperature of the reference: the correlated colour
	// temperature of the light, K.
	Kelvin float64
	// Daylight is the share of CIE daylight in the reference, 0–1: 0 for
	// a Planckian radiator, 1 for the CIE daylight illuminant of that
	// correlated colour temperature, and in between for the blend that
	// CIE 224:2017 uses from 4000 K to 5000 K.
	Daylight float64
}

// String names the reference, e.g. "Planckian 2940 K", "CIE daylight
// 6500 K" or "blend at 4500 K, 50 % daylight".
func (r Reference) String() string {
	switch r.Daylight {
	case 0:
		return fmt.Sprintf("Planckian %.0f K", r.Kelvin)
	case 1:
		return fmt.Sprintf("CIE daylight %.0f K", r.Kelvin)
	}
	return fmt.Sprintf("blend at %.0f K, %.0f %% daylight", r.Kelvin, 100*r.Daylight)
}

// tables holds the samples and observers on the computation grid.
type tables struct {
	tcs        [cie.NumTCS][]float64
	ces        [cie.NumCES][]float64
	x2, y2, z2 []float64 // CIE 1931 2°
	x10, y10   []float64 // CIE 1964 10°
	z10        []float64
	planck     *colorimetry.PlanckianTable // CIE 1931, c2 = colorimetry.C2
}

var (
	tabOnce sync.Once
	tab     *tables
	tabErr  error
)

// load returns the tables, building them once.
func load() (*tables, error) {
	tabOnce.Do(func() { tab, tabErr = build() })
	return tab, tabErr
}

func build() (*tables, error) {
	t := &tables{}
	for i := range t.tcs {
		s, err := cie.TCS(i + 1)
		if err != nil {
			return nil, err
		}
		if t.tcs[i], err = values(s); err != nil {
			return nil, err
		}
	}
	for i := range t.ces {
		s, err := cie.CES(i + 1)
		if err != nil {
			return nil, err
		}
		if t.ces[i], err = values(s); err != nil {
			return nil, err
		}
	}
	var err error
	x, y, z := cie.CIE1931().CMF()
	if t.x2, err = values(x); err != nil {
		return nil, err
	}
	if t.y2, err = values(y); err != nil {
		return nil, err
	}
	if t.z2, err = values(z); err != nil {
		return nil, err
	}
	x, y, z = cie.CIE1964().CMF()
	if t.x10, err = values(x); err != nil {
		return nil, err
	}
	if t.y10, err = values(y); err != nil {
		return nil, err
	}
	if t.z10, err = values(z); err != nil {
		return nil, err
	}
	if t.planck, err = colorimetry.NewPlanckianTable(cie.CIE1931(), colorimetry.C2); err != nil {
		return nil, err
	}
	return t, nil
}

// values returns s on the computation grid by its own rules.
func values(s colorimetry.Spectrum) ([]float64, error) {
	r, err := s.Resample(grid)
	if err != nil {
		return nil, err
	}
	return r.Values(nil), nil
}

// onGrid returns the light on the computation grid (see the package
// documentation): as it is when sampled at 5 nm on the grid's nodes,
// reduced by a triangular band pass of 5 nm half-width when sampled more
// finely, interpolated by its own rule otherwise; zero outside its range.
// It returns an error for an empty light and for one with negative power
// beyond 1 % of its peak (measurement noise is tolerated).
func onGrid(light colorimetry.Spectrum) ([]float64, error) {
	if light.IsZero() {
		return nil, fmt.Errorf("empty spectrum: %w", colorimetry.ErrTooFew)
	}
	light = light.WithExtrap(colorimetry.ExtrapZero)
	g := light.Grid()
	var out []float64
	if g.Step < grid.Step-1e-9 {
		out = make([]float64, grid.N)
		// Resample to 1 nm first when the data are not on a 1 nm grid, so
		// that the band pass has uniform weights.
		fine := light
		if math.Abs(g.Step-1) > 1e-9 || math.Abs(g.Start-math.Round(g.Start)) > 1e-9 {
			fg, err := colorimetry.NewGrid(math.Ceil(g.Start), math.Floor(g.End()), 1)
			if err != nil {
				return nil, fmt.Errorf("light on a 1 nm grid: %w", err)
			}
			if fine, err = light.Resample(fg); err != nil {
				return nil, err
			}
		}
		fg := fine.Grid()
		for k := range out {
			c := grid.Wavelength(k)
			var sum float64
			for d := -4; d <= 4; d++ {
				nm := c + float64(d)
				j := int(math.Round(nm - fg.Start))
				if j < 0 || j >= fg.N {
					continue // zero outside the light's range
				}
				sum += fine.Value(j) * (1 - math.Abs(float64(d))/5)
			}
			out[k] = sum / 5 // the weights sum to 5
		}
	} else {
		r, err := light.Resample(grid)
		if err != nil {
			return nil, err
		}
		out = r.Values(nil)
	}
	peak := 0.0
	for _, v := range out {
		peak = math.Max(peak, v)
	}
	if !(peak > 0) {
		return nil, fmt.Errorf("the light has no power within %v: %w", grid, colorimetry.ErrZeroLuminance)
	}
	for k, v := range out {
		if v < -0.01*peak {
			return nil, &colorimetry.SampleError{Index: k, Wavelength: grid.Wavelength(k),
				Err: fmt.Errorf("%w: spectral power %g is below −1 %% of the peak %g", colorimetry.ErrNegative, v, peak)}
		}
	}
	return out, nil
}

// tristimulus returns the raw sums Σ S·r·x̄, Σ S·r·ȳ, Σ S·r·z̄ of the light
// s times the factor r (nil for 1) with the functions x, y, z.
func tristimulus(s, r, x, y, z []float64) colorimetry.XYZ {
	var c colorimetry.XYZ
	for k, v := range s {
		if r != nil {
			v *= r[k]
		}
		c.X += v * x[k]
		c.Y += v * y[k]
		c.Z += v * z[k]
	}
	return c
}

// cct returns the correlated colour temperature and Duv of the light s on
// the computation grid with the CIE 1931 observer.
func (t *tables) cct(s []float64) (colorimetry.CCT, error) {
	c := tristimulus(s, nil, t.x2, t.y2, t.z2)
	uv, err := c.UV()
	if err != nil {
		return colorimetry.CCT{}, fmt.Errorf("the light: %w", err)
	}
	return t.planck.CCT(uv, colorimetry.CCTOhno)
}

// planckian returns a Planckian radiator at kelvin on the grid.
func planckian(kelvin float64) ([]float64, error) {
	p, err := colorimetry.Blackbody(kelvin, grid, colorimetry.C2)
	if err != nil {
		return nil, err
	}
	return p.Values(nil), nil
}

// daylight returns the CIE daylight illuminant at kelvin on the grid.
func daylight(kelvin float64) ([]float64, error) {
	d, err := cie.Daylight(kelvin)
	if err != nil {
		if kelvin > cie.DaylightMaxCCT {
			return nil, fmt.Errorf("%w at %.0f K: the CIE daylight series ends at %d K (%v)", ErrNoReference, kelvin, cie.DaylightMaxCCT, err)
		}
		return nil, err
	}
	return values(d)
}

// reference13 returns the CIE 13.3 reference illuminant for the
// correlated colour temperature kelvin: a Planckian radiator below 5000 K,
// CIE daylight from 5000 K (CIE 13.3-1995 §5.1; from memory).
func reference13(kelvin float64) ([]float64, Reference, error) {
	if kelvin < 5000 {
		p, err := planckian(kelvin)
		return p, Reference{Kelvin: kelvin}, err
	}
	d, err := daylight(kelvin)
	return d, Reference{Kelvin: kelvin, Daylight: 1}, err
}

// reference224 returns the CIE 224:2017 reference illuminant for the
// correlated colour temperature kelvin: a Planckian radiator up to
// 4000 K, CIE daylight from 5000 K, and in between the blend
// (5000 − T)/1000 · P/Y10(P) + (T − 4000)/1000 · D/Y10(D) of the two,
// each normalised to equal Y10 (CIE 224:2017 §4.2; from memory).
func (t *tables) reference224(kelvin float64) ([]float64, Reference, error) {
	switch {
	case kelvin <= 4000:
		p, err := planckian(kelvin)
		return p, Reference{Kelvin: kelvin}, err
	case kelvin >= 5000:
		d, err := daylight(kelvin)
		return d, Reference{Kelvin: kelvin, Daylight: 1}, err
	}
	p, err := planckian(kelvin)
	if err != nil {
		return nil, Reference{}, err
	}
	d, err := daylight(kelvin)
	if err != nil {
		return nil, Reference{}, err
	}
	m := (kelvin - 4000) / 1000 // share of daylight
	yp := tristimulus(p, nil, t.x10, t.y10, t.z10).Y
	yd := tristimulus(d, nil, t.x10, t.y10, t.z10).Y
	out := make([]float64, len(p))
	for k := range out {
		out[k] = (1-m)*p[k]/yp + m*d[k]/yd
	}
	return out, Reference{Kelvin: kelvin, Daylight: m}, nil
}
