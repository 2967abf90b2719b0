package mixing_test

import (
	"fmt"

	"github.com/antipode-color/antipode/cie"
	"github.com/antipode-color/antipode/mixing"
)

// The most efficient mix of a five-channel rig near 4000 K on the
// Planckian locus, when the white may be off by up to Δu′v′ 0.002: what
// each share of the tolerance buys.
func ExampleLights_SolveQualityWithin() {
	m, err := qualityExampleRig()
	if err != nil {
		fmt.Println(err)
		return
	}
	xy, err := mixing.LightTargetCCT(cie.CIE1931(), 4000, 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	tol := mixing.LightTolerance{UVPrime: 0.002}
	sol, err := m.SolveQualityWithin(mixing.LightTarget{XY: xy}, mixing.GoalMaxEfficacy, tol, mixing.LightSolveOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	r := sol.Recipes[0]
	fmt.Printf("%s within %v: Δu′v′ %.4f, CCT %.0f K, %.1f lm/W\n", r.Extra["strategy"], tol,
		r.Extra["delta_uv_prime"], r.Extra["cct_kelvin"], r.Extra["efficacy_lm_per_w"])
	for _, p := range r.Extra["tolerance_trade_off"].([]map[string]any) {
		fmt.Printf("share %.1f: Δu′v′ %.4f  %.1f lm/W  Ra %.1f\n", p["fraction"], p["delta_uv_prime"], p["efficacy_lm_per_w"], p["ra"])
	}
	// Output:
	// max efficacy within Δu′v′ ≤ 0.002: Δu′v′ 0.0020, CCT 3963 K, 412.5 lm/W
	// share 0.0: Δu′v′ 0.0000  409.3 lm/W  Ra 47.1
	// share 0.5: Δu′v′ 0.0010  410.9 lm/W  Ra 47.0
	// share 1.0: Δu′v′ 0.0020  412.5 lm/W  Ra 46.8
}
