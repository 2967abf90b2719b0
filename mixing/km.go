package mixing

import (
	"errors"
	"fmt"
	"math"
)

// Kubelka–Munk forward models. K and S are the absorption and scattering
// coefficients of the two-flux theory (Kubelka & Munk 1931; Kubelka 1948,
// J. Opt. Soc. Am. 38, 448–457): per unit thickness where a thickness X
// appears (any length unit, the same for K, S and X), otherwise only their
// ratio K/S matters. Reflectances here are internal (inside the film's
// surface) unless said otherwise; Saunderson converts between internal and
// measured reflectance.

// Clamping limits of the Kubelka–Munk function. An internal reflectance at
// or below ksMinR would need an infinite or negative K/S; it is clamped to
// ksMinR (K/S ≈ 5000, a black far darker than any paint film) and the
// caller is told. Common practice (no source).
const ksMinR = 1e-4

// ErrLayer reports drawdown measurements over two backings that no
// Kubelka–Munk film can produce (for instance darker over white than over
// black beyond noise).
var ErrLayer = errors.New("inconsistent drawdown over two backings")

// KS returns the Kubelka–Munk function K/S = (1 − R∞)² / (2·R∞) of the
// internal reflectance of an opaque layer r (fraction 0–1). Special cases
// are:
//
//	KS(1) = 0
//	KS(r) = +Inf for r ≤ 0
//	KS(NaN) = NaN
func KS(r float64) float64 {
	if math.IsNaN(r) {
		return r
	}
	if r <= 0 {
		return math.Inf(1)
	}
	d := 1 - r
	return d * d / (2 * r)
}

// KSClamped returns KS(r) with r first clamped to [1e-4, 1], and whether r
// had to be clamped: a reflectance of 0 would give an infinite K/S and one
// above 1 the wrong branch of the inverse. Callers report the clamp as a
// warning.
func KSClamped(r float64) (ks float64, clamped bool) {
	switch {
	case r < ksMinR:
		return KS(ksMinR), true
	case r > 1:
		return 0, true
	}
	return KS(r), false
}

// ReflectanceInf returns the internal reflectance of an opaque layer with
// the given K/S (≥ 0): R∞ = 1 + K/S − √((K/S)² + 2·K/S), evaluated as
// 1 / (1 + K/S + √((K/S)² + 2·K/S)), which is the same number without the
// cancellation for large K/S. Special cases are:
//
//	ReflectanceInf(0) = 1
//	ReflectanceInf(+Inf) = 0
//	ReflectanceInf(q) = NaN for q < 0 or NaN
func ReflectanceInf(ks float64) float64 {
	if !(ks >= 0) {
		return math.NaN()
	}
	if math.IsInf(ks, 1) {
		return 0
	}
	return 1 / (1 + ks + math.Sqrt(ks*ks+2*ks))
}

// SingleConstant returns the internal reflectance R∞ of an opaque film by
// the single-constant Kubelka–Munk model, in which K/S itself adds over the
// colorants: K/S_mix = K/S_substrate + Σ cᵢ·(K/S)ᵢ, with unitKS[i] the
// unit K/S of colorant i (per unit of the amount c[i]) at one wavelength.
// It suits colorants that hardly scatter on a substrate or in a white that
// dominates the scattering (dyes on paper or textile, tints of a strong
// white); for mixes whose scattering varies use the two-constant model
// (Pigments). It panics if the lengths of unitKS and c differ. Amounts and
// K/S values below zero give NaN.
func SingleConstant(substrateKS float64, unitKS, c []float64) float64 {
	if len(unitKS) != len(c) {
		panic("mixing: SingleConstant: unitKS and c lengths differ")
	}
	q := substrateKS
	for i, k := range unitKS {
		if c[i] < 0 || k < 0 {
			return math.NaN()
		}
		q += c[i] * k
	}
	return ReflectanceInf(q)
}

// rInfSlope returns R∞ and dR∞/d(K/S) at q > 0.
func rInfSlope(q float64) (r, dr float64) {
	if q < 1e-12 {
		q = 1e-12
	}
	t := math.Sqrt(q*q + 2*q)
	r = 1 / (1 + q + t)
	return r, -r * r * (1 + (q+1)/t)
}

// Saunderson is the surface correction between the internal reflectance R
// of a Kubelka–Munk film and the reflectance a spectrophotometer measures
// (Saunderson 1942, J. Opt. Soc. Am. 32, 727–736):
//
//	Rm = k1 + (1 − k1)(1 − k2)·R / (1 − k2·R)    specular component included
//	Rm =      (1 − k1)(1 − k2)·R / (1 − k2·R)    specular component excluded
//
// K1 is the fraction of the incident (collimated) light reflected at the
// surface, ((n − 1)/(n + 1))² by Fresnel at normal incidence for a medium
// of refractive index n; K2 is the fraction of the diffuse light inside the
// film reflected back at the surface (common practice 0.4–0.6, no source).
// The zero value is no correction (Rm = R).
type Saunderson struct {
	K1 float64 // external surface reflection, fraction 0–1
	K2 float64 // internal diffuse surface reflection, fraction 0–1
	// SpecularExcluded says that the measurements exclude the specular
	// component (a specular trap or a 45°:0° geometry); the k1 term is then
	// not added.
	SpecularExcluded bool
	// RefractiveIndex is the medium's index when K1 was derived from it
	// (FresnelK1), 0 when K1 was given; for the record only.
	RefractiveIndex float64
}

// FresnelK1 returns the Fresnel reflectance at normal incidence of a
// surface between air and a medium of refractive index n,
// ((n − 1)/(n + 1))² (for n = 1.5, 0.04).
func FresnelK1(n float64) float64 {
	f := (n - 1) / (n + 1)
	return f * f
}

// SaundersonFromIndex returns the correction with k1 from the refractive
// index n by Fresnel at normal incidence and the given k2. It returns an
// error for n < 1 or a k2 outside [0, 1).
func SaundersonFromIndex(n, k2 float64, specularExcluded bool) (Saunderson, error) {
	if !(n >= 1) || math.IsInf(n, 0) {
		return Saunderson{}, fmt.Errorf("refractive index %g: want a finite value ≥ 1", n)
	}
	s := Saunderson{K1: FresnelK1(n), K2: k2, SpecularExcluded: specularExcluded, RefractiveIndex: n}
	return s, s.Validate()
}

// Validate returns an error unless 0 ≤ K1 < 1 and 0 ≤ K2 < 1.
func (s Saunderson) Validate() error {
	if !(s.K1 >= 0 && s.K1 < 1) {
		return fmt.Errorf("Saunderson k1 = %g: want 0 ≤ k1 < 1", s.K1)
	}
	if !(s.K2 >= 0 && s.K2 < 1) {
		return fmt.Errorf("Saunderson k2 = %g: want 0 ≤ k2 < 1", s.K2)
	}
	if s.RefractiveIndex != 0 && !(s.RefractiveIndex >= 1) {
		return fmt.Errorf("refractive index %g: want 0 (not given) or ≥ 1", s.RefractiveIndex)
	}
	return nil
}

// offset returns the additive k1 term of the measured reflectance.
func (s Saunderson) offset() float64 {
	if s.SpecularExcluded {
		return 0
	}
	return s.K1
}

// Measured returns the reflectance a spectrophotometer measures for the
// internal reflectance r.
func (s Saunderson) Measured(r float64) float64 {
	return s.offset() + (1-s.K1)*(1-s.K2)*r/(1-s.K2*r)
}

// measuredSlope returns Measured(r) and its derivative in r.
func (s Saunderson) measuredSlope(r float64) (rm, d float64) {
	a := (1 - s.K1) * (1 - s.K2)
	den := 1 - s.K2*r
	return s.offset() + a*r/den, a / (den * den)
}

// Internal returns the internal reflectance of a film whose measured
// reflectance is rm: the inverse of Measured,
// R = (Rm − k0) / ((1 − k1)(1 − k2) + k2·(Rm − k0)), with k0 = k1 when the
// specular component is included and 0 otherwise. A measured value below
// k0 gives a negative internal reflectance; see KSClamped.
func (s Saunderson) Internal(rm float64) float64 {
	x := rm - s.offset()
	return x / ((1-s.K1)*(1-s.K2) + s.K2*x)
}

// cothTimes returns b·coth(b·sx) for b ≥ 0, sx > 0, with its limit 1/sx at
// b = 0.
func cothTimes(b, sx float64) float64 {
	y := b * sx
	if y < 1e-6 {
		return 1/sx + b*y/3
	}
	e := math.Exp(-2 * y)
	return b * (1 + e) / (1 - e)
}

// LayerReflectance returns the internal reflectance of a film of
// thickness x with absorption k and scattering s (per unit thickness, ≥ 0)
// over a backing of internal reflectance rg, by Kubelka's hyperbolic
// solution (Kubelka 1948, eq. for R):
//
//	R = (1 − Rg·(a − b·coth(b·S·X))) / (a − Rg + b·coth(b·S·X)),
//	a = 1 + K/S, b = √(a² − 1).
//
// Without scattering (s = 0) the film only absorbs: R = Rg·exp(−2·K·X).
// Special cases are: x = 0 gives rg; x = +Inf gives R∞ of k/s; k = s = 0
// gives rg. The result is finite for k and s up to 1e150.
func LayerReflectance(k, s, x, rg float64) float64 {
	switch {
	case x == 0, k == 0 && s == 0:
		return rg
	case s == 0, math.IsInf(k/s, 1):
		// No scattering, or too little to tell from none in float64.
		return rg * math.Exp(-2*k*x)
	case math.IsInf(x, 1):
		return ReflectanceInf(k / s)
	case k == 0, k/s == 0:
		// No absorption (or K/S below the float64 range): R = (S·X·(1 − Rg) + Rg) / (S·X·(1 − Rg) + 1),
		// the limit of the hyperbolic solution (Kubelka 1948).
		sx := s * x
		if math.IsInf(sx, 1) {
			return 1
		}
		d := sx * (1 - rg)
		return (d + rg) / (d + 1)
	}
	q := k / s                         // a = 1 + K/S of Kubelka's solution
	b := math.Sqrt(q) * math.Sqrt(q+2) // √(a² − 1) without cancellation, underflow or overflow
	bc := cothTimes(b, s*x)
	if math.IsInf(bc, 1) {
		return rg // S·X so small that 1/(S·X) overflows: the film vanishes
	}
	// (1 − Rg·(a − b·coth)) / (a − Rg + b·coth) with a = 1 + K/S written
	// out, so that 1 − a does not lose K/S to rounding when K/S ≪ 1.
	return ((1 - rg) - rg*(q-bc)) / ((1 - rg) + q + bc)
}

// LayerTransmittance returns the internal diffuse transmittance of a film
// of thickness x with absorption k and scattering s (per unit thickness,
// ≥ 0), by Kubelka's hyperbolic solution:
//
//	T = b / (a·sinh(b·S·X) + b·cosh(b·S·X)),
//
// evaluated with exponentials so that thick films give 0, not NaN. Without
// scattering T = exp(−K·X); without absorption T = 1 / (1 + S·X). Special
// cases are: x = 0 or k = s = 0 gives 1; x = +Inf gives 0 otherwise. The
// result is finite for k and s up to 1e150.
func LayerTransmittance(k, s, x float64) float64 {
	switch {
	case x == 0, k == 0 && s == 0:
		return 1
	case math.IsInf(x, 1):
		return 0
	case s == 0, math.IsInf(k/s, 1):
		return math.Exp(-k * x)
	case k == 0, k/s == 0:
		return 1 / (1 + s*x)
	}
	q := k / s
	b := math.Sqrt(q) * math.Sqrt(q+2)
	ab := (1 + q) / b // a/b, near 1 for K ≫ S, large for K ≪ S; never overflows
	y := b * s * x
	if y < 20 {
		// T = b / (a·sinh y + b·cosh y), divided through by b. The
		// exponential form below cancels catastrophically as b → 0
		// (K ≪ S); this one is exact there and cannot overflow.
		return 1 / (ab*math.Sinh(y) + math.Cosh(y))
	}
	e := math.Exp(-y)
	return 2 * e / ((ab + 1) - (ab-1)*e*e)
}

// ContrastRatio returns the hiding contrast ratio of a film of thickness x
// (absorption k, scattering s per unit thickness): its reflectance over an
// ideal black backing divided by its reflectance over a white backing of
// internal reflectance rWhite (both internal reflectances). It is 1 for a
// film that hides completely and tends to 0 for a thin film.
func ContrastRatio(k, s, x, rWhite float64) float64 {
	rw := LayerReflectance(k, s, x, rWhite)
	if rw == 0 {
		return 1
	}
	return LayerReflectance(k, s, x, 0) / rw
}

// HidingThickness returns the thickness (in the reciprocal unit of k and
// s) at which the contrast ratio over an ideal black and a white backing of
// internal reflectance rWhite reaches cr (0 < cr < 1; 0.98 is the usual
// criterion of complete hiding, common practice, no source). It returns an
// error when the film cannot reach cr: no scattering or absorption at all,
// or a white backing no lighter than the film's R∞.
func HidingThickness(k, s, rWhite, cr float64) (float64, error) {
	if !(cr > 0 && cr < 1) {
		return 0, fmt.Errorf("contrast ratio %g: want 0 < cr < 1", cr)
	}
	if !(k >= 0 && s >= 0) || k+s == 0 || math.IsInf(k, 0) || math.IsInf(s, 0) {
		return 0, fmt.Errorf("film with K = %g, S = %g: K and S must be finite and ≥ 0, not both 0", k, s)
	}
	f := func(x float64) float64 { return ContrastRatio(k, s, x, rWhite) - cr }
	lo, hi := 0.0, 1/(k+s)
	for f(hi) < 0 {
		lo, hi = hi, 2*hi
		if hi > 1e12/(k+s) {
			return 0, fmt.Errorf("film with K = %g, S = %g over a backing of %g: contrast ratio %g is never reached", k, s, rWhite, cr)
		}
	}
	for range 200 {
		mid := 0.5 * (lo + hi)
		if f(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo <= 1e-13*hi {
			break
		}
	}
	return 0.5 * (lo + hi), nil
}

// BackedFilm is what one wavelength of a drawdown over two backings tells
// about the film, by Kubelka's formulas: its reflectance over an ideal
// black backing R0, its transmittance T, the reflectance it would have at
// complete hiding RInf, and its scattering power S·X (+Inf for a film that
// already hides). All reflectances are internal.
type BackedFilm struct {
	R0, T, RInf, SX float64
}

// FilmFromBackings recovers a film from its internal reflectances over a
// dark and a light backing (rDark over a backing of internal reflectance
// gDark, 0 for an ideal black; rLight over gLight > gDark). A film over a
// backing g reflects R = R0 + T²·g / (1 − R0·g) (Kubelka 1948); two
// backings give R0 and T², and then a = (1 + R0² − T²)/(2·R0),
// b = √(a² − 1), R∞ = a − b and S·X = arcoth((1 − a·R0)/(b·R0)) / b.
//
// Measurement noise can make the film look darker over the light backing
// than over the dark one; up to tol (in reflectance) the film is taken to
// hide completely. Beyond it, or with a non-positive R0, it returns an
// error wrapping ErrLayer.
func FilmFromBackings(rDark, rLight, gDark, gLight, tol float64) (BackedFilm, error) {
	if !(gLight > gDark && gDark >= 0 && gLight < 1) {
		return BackedFilm{}, fmt.Errorf("%w: backings of %g and %g: want 0 ≤ dark < light < 1", ErrLayer, gDark, gLight)
	}
	r0 := rDark
	if gDark > 0 {
		r0 = (gDark*rLight - gLight*rDark) / (gDark - gLight + gDark*gLight*(rLight-rDark))
	}
	if !(r0 > 0) || r0 >= 1 {
		return BackedFilm{}, fmt.Errorf("%w: reflectance over black %.4g is outside (0, 1)", ErrLayer, r0)
	}
	t2 := (rLight - r0) * (1 - r0*gLight) / gLight
	if t2 < 0 {
		if rLight < rDark-tol {
			return BackedFilm{}, fmt.Errorf("%w: darker over the light backing (%.4g) than over the dark one (%.4g)", ErrLayer, rLight, rDark)
		}
		t2 = 0
	}
	a := (1 + r0*r0 - t2) / (2 * r0)
	if a < 1 {
		return BackedFilm{}, fmt.Errorf("%w: R0 = %.4g and T² = %.4g give a = %.4g < 1", ErrLayer, r0, t2, a)
	}
	b := math.Sqrt(a*a - 1)
	film := BackedFilm{R0: r0, T: math.Sqrt(t2), RInf: a - b, SX: math.Inf(1)}
	if t2 > 0 && b > 0 {
		z := (1 - a*r0) / (b * r0)
		if z > 1 {
			film.SX = 0.5 * math.Log((z+1)/(z-1)) / b
		}
	}
	return film, nil
}
