package mixing

import (
	"errors"
	"strings"
	"testing"
)

func TestStats(t *testing.T) {
	t.Parallel()
	// Nearest-rank percentile (NIST/SEMATECH e-Handbook §7.2.6.2, the
	// "nearest rank" definition): for 1…20 the 95th is the 19th value.
	v := make([]float64, 20)
	for i := range v {
		v[20-1-i] = float64(i + 1)
	}
	s := stats(v)
	if s.N != 20 || s.Mean != 10.5 || s.P95 != 19 || s.Max != 20 {
		t.Errorf("stats(1…20) = %+v", s)
	}
	if s := stats([]float64{3}); s.P95 != 3 || s.Max != 3 {
		t.Errorf("stats(3) = %+v", s)
	}
}

func TestFitReportHeldOut(t *testing.T) {
	t.Parallel()
	r := NewFitReport([]SampleFit{
		{Name: "a", RMS: 3, DE00: 1},
		{Name: "b", RMS: 4, DE00: 2},
		{Name: "c", HeldOut: true, RMS: 100, DE00: 9},
	}, "D65", "CIE 1931 2°")
	// Pooled RMS over training samples: sqrt((9 + 16) / 2).
	if got := r.RMS; got != 3.5355339059327378 {
		t.Errorf("RMS %v", got)
	}
	if r.Training.N != 2 || r.Training.Max != 2 || r.HeldOut == nil || r.HeldOut.Max != 9 {
		t.Errorf("report %+v", r)
	}
	if r := NewFitReport([]SampleFit{{Name: "a"}}, "D65", ""); r.HeldOut != nil {
		t.Error("HeldOut must be nil without held-out samples")
	}
}

func TestLoadRejects(t *testing.T) {
	t.Parallel()
	for _, in := range []string{
		`{"schema":"other/9","kind":"lights","model":{}}`,
		`{"schema":"antipode-model/1","kind":"teapot","model":{}}`,
		`{"schema":"antipode-model/1","kind":"lights"}`,
	} {
		if _, err := Load(strings.NewReader(in)); !errors.Is(err, ErrSchema) {
			t.Errorf("%s: got %v, want ErrSchema", in, err)
		}
	}
	if _, err := Load(strings.NewReader("{not json")); err == nil {
		t.Error("bad JSON accepted")
	}
}
