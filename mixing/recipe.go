package mixing

// Amount is one named amount of a recipe: a drive level 0–1 for a light
// channel, a concentration in the calibration file's units for a dye, a
// mass fraction for a pigment, a coverage 0–1 for a halftone ink.
type Amount struct {
	Name  string
	Value float64
}

// Recipe is one solution of an inverse solve. The CLI prints it as an
// object with the keys `amounts` (keyed by name), `dE00`, `reachable`,
// `warnings` and the model's own keys (see Extra).
type Recipe struct {
	// Amounts in the model's order of channels, dyes, colorants or inks.
	Amounts []Amount
	// DE00 is the colour difference reached against the target, under the
	// solve's illuminant and observer.
	DE00 float64
	// Reachable reports whether the target lies within what the model can
	// make, to the solve's tolerance; when false the recipe is the nearest
	// one found.
	Reachable bool
	// Extra holds the model's own result keys (for lights x, y,
	// delta_uv_prime; for pigments metamerism …); values must marshal to
	// JSON. Keys that do not apply are present with a nil value.
	Extra map[string]any
	// Warnings are cautions about this recipe.
	Warnings []string
}

// Solution is the result of an inverse solve: recipes ranked best first
// (at least one).
type Solution struct {
	Recipes []Recipe
}
