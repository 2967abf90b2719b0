// Package mixing holds forward models, calibration fits and inverse solves
// for the ways colours mix: lights (additive), dyes and filters
// (Beer–Lambert–Bouguer), pigments (Kubelka–Munk with the Saunderson
// correction) and halftone print (Murray–Davies, Yule–Nielsen, spectral
// Neugebauer).
//
// Every model has the same shape: a forward model (parameters and amounts
// give a spectrum), a fit from calibration measurements with a fit report
// (residuals, RMS spectral error, ΔE00 statistics on training and held-out
// samples), and an inverse solve from a target to amounts. Conventions are
// those of package colorimetry: wavelengths in nm, fractions 0–1, object
// Y = 100.
//
// The models arrive with the mixing issues; this file fixes the package's
// place in the layout.
package mixing
