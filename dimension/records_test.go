package dimension

import (
	"testing"

	"unfold/internal/testsignals"
)

// TestD2NeverAboveM: on R's co2 (Mauna Loa CO2, a strong trend plus a yearly cycle,
// help(co2); testdata/r) the correlation sums have no real scaling range, and the fitted
// slope at m = 1 used to be 3.76 (issue 18). A correlation sum in m dimensions scales at most
// like r^m (Grassberger & Procaccia 1983, Physica D 9, 189), so D2 and its interval may never
// exceed the dimension they are read at.
func TestD2NeverAboveM(t *testing.T) {
	x := testsignals.OpenRecord(t, "r/co2.csv", 1)
	r, err := CorrelationDimension(x, Options{Lag: 6, MaxDim: 5, Theiler: 170, Seed: 7})
	if err != nil {
		t.Skipf("no scaling range at all: %v", err)
	}
	t.Logf("D2 = %.3g [%.3g, %.3g] at m = %d; %v", r.D2, r.Lo, r.Hi, r.Dim, r.Cautions)
	if m := float64(r.Dim); r.D2 > m || r.Hi > m {
		t.Errorf("D2 = %.3g [%.3g, %.3g] above m = %d", r.D2, r.Lo, r.Hi, r.Dim)
	}
}
