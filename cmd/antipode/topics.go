package main

// topics are the "antipode help TOPIC" texts that are not commands.
var topics = map[string]string{
	"tolerances": `Tolerances and defaults

Chromaticity
  Δu′v′ (JSON delta_uv_prime) is the distance in the CIE 1976 u′v′ diagram.
  About 0.001 is one just-noticeable step between whites (common practice);
  checks of complements use it as their default colorimetric tolerance.
  Duv (JSON duv) is the signed distance from the Planckian locus in the CIE 1960
  u,v diagram, positive above the locus (greenish), negative below (pinkish).

Target whites of a light-mix solve
  solve --cct K [--duv d] (or --xy x,y) reaches the white exactly. With a
  quality goal (--maximize ra …), --tolerance-uv-prime r lets the mix land
  anywhere within Δu′v′ ≤ r of the target, and --tolerance-cct K together with
  --tolerance-duv d within a CCT/Duv box; the output shows what the tolerance
  buys (the goal at 0, half and the whole tolerance).

Correlated colour temperature
  CCT is defined only for |Duv| ≤ 0.05 (CIE 015:2018); beyond that antipode
  reports null with a warning rather than a misleading number.

Scales
  Reflectance and transmittance are fractions 0–1. Files in percent are
  recognised when their maximum exceeds 1.5 (say --scale to be explicit).
  Object colours: the perfect diffuser has Y = 100 under the chosen illuminant.
  Lights: relative, Y = 100 for the light itself, unless --absolute.

Computation grid
  Data at 5 nm are integrated at 5 nm over 380–780 nm with the 5 nm rows of
  the observer; everything else is interpolated to 1 nm over 360–830 nm
  (Sprague for smooth uniformly spaced data, a cubic spline for irregular
  data, linear for line spectra), after CIE 015:2018. Values beyond the
  measured range repeat the end values (reflectance) or are zero (lights).
`,
	"cautions": `Cautions

antipode computes colour; it does not make anything safe.

- Pigments and dyes: many colorants are toxic (lead, cadmium, chromium,
  cobalt and other metal pigments; some organic dyes and solvents). Read each
  product's safety data sheet, use the protection it names, and follow your
  local regulations for handling and disposal.
- Lighting: lamps run hot and mains or high-voltage supplies can kill. Gel
  filters in front of hot lamps need the clearance the maker states. Rigging,
  wiring and fixtures are work for qualified people under local codes.
- Safety colours (signs, markings, signal lights): computed chromaticities are
  no substitute for measurement against the standard that applies. A colour
  that "passes" here must still be verified with calibrated instruments.
- Optical radiation: intense blue, UV or IR sources can harm eyes and skin;
  follow the photobiological safety classification of the source.
- Circadian light: melanopic quantities (melanopic DER, EDI) describe
  non-visual effects of light on sleep and alertness; they are not a health
  rating. Follow current health guidance for evening and night lighting.

Defer to local codes, the applicable standards and licensed practice.
`,
}
