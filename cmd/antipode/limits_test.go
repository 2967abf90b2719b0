package main

import (
	"encoding/json"
	"strings"
	"testing"
)

func TestWavelengthsCSV(t *testing.T) {
	t.Parallel()
	code, out, errs := runCLI(t, "", "wavelengths", "--step", "20", "--from", "480", "--to", "600")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	// 480 nm ↔ about 580 nm and 600 nm ↔ about 490 nm for a daylight white,
	// greens have none (textbook diagrams; from memory, ±2.5 nm).
	for _, want := range []string{"480,578.", "500,purple line", "600,489."} {
		if !strings.Contains(out, want) {
			t.Errorf("CSV lacks %q:\n%s", want, out)
		}
	}
}

func TestLimitsJSON(t *testing.T) {
	t.Parallel()
	code, out, errs := runCLI(t, "", "limits", "--hues", "4", "--lightness", "60", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var r struct {
		Boundary []struct {
			L, C     float64
			Edges    []float64 `json:"edges_nm"`
			BandStop bool      `json:"band_stop"`
		} `json:"boundary"`
	}
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatal(err)
	}
	if len(r.Boundary) != 4 {
		t.Fatalf("%d boundary points, want 4", len(r.Boundary))
	}
	for _, p := range r.Boundary {
		// Lightness of the slice to 1e-6 (the boundary is solved for it).
		if p.L < 60-1e-6 || p.L > 60+1e-6 || p.C <= 0 || len(p.Edges) < 2 {
			t.Errorf("boundary point %+v", p)
		}
	}
	code, out, errs = runCLI(t, "", "limits", "--check", "demo/paints.csv", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var rows []struct {
		Name       string
		Realisable bool
		C          float64
		MaxC       float64 `json:"max_chroma"`
	}
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatal(err)
	}
	// Real reflectances (values in 0–1) are always inside the solid.
	for _, r := range rows {
		if !r.Realisable || r.MaxC < r.C {
			t.Errorf("%s: realisable %v, C %g, max %g", r.Name, r.Realisable, r.C, r.MaxC)
		}
	}
}
