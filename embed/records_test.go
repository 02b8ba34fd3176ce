package embed

import (
	"testing"

	"unfold/internal/testsignals"
)

// TestEmbeddingRealRecords: every open record of 48 samples or more gets a lag and a
// dimension (issue 18), a trended record (R's co2: Mauna Loa CO2 with its rising trend,
// help(co2); AirPassengers: rising traffic, help(AirPassengers)) never gets m = 1, and the
// noisy 60 s ECG (scipy's record 208 excerpt, testdata/ecg) gets a noise-limited dimension.
func TestEmbeddingRealRecords(t *testing.T) {
	cases := []struct {
		path    string
		n       int
		trended bool
	}{
		{"r/lh.csv", 0, false},
		{"r/lakehuron.csv", 0, false},
		{"r/nile.csv", 0, false},
		{"r/lynx.csv", 0, false},
		{"r/airpassengers.csv", 0, true},
		{"r/nottem.csv", 0, false},
		{"r/sunspot_year.csv", 0, false},
		{"r/co2.csv", 0, true},
		{"r/sunspots_monthly.csv", 0, false},
		{"r/treering.csv", 0, false},
		{"ecg/ecg.csv", 0, false},
	}
	for _, c := range cases {
		x := testsignals.OpenRecord(t, c.path, 1)
		lc, err := ChooseLag(x, LagOptions{})
		if err != nil {
			t.Errorf("%s (N = %d): no lag: %v", c.path, len(x), err)
			continue
		}
		dc, err := ChooseDimension(x, DimOptions{Lag: lc.Lag, Theiler: DefaultTheiler(lc.ACF), MaxDim: 8, Threads: 2})
		if err != nil {
			t.Errorf("%s (N = %d): no dimension: %v", c.path, len(x), err)
			continue
		}
		t.Logf("%s N = %d: lag %d (%s), m = %d (%s; trend %.2f)", c.path, len(x), lc.Lag, lc.Method, dc.Dimension, dc.Reason, dc.Trend)
		if dc.Dimension < 1 {
			t.Errorf("%s: no dimension: %s", c.path, dc.Reason)
		}
		if c.trended && dc.Dimension < 2 {
			t.Errorf("%s: trended record got m = %d", c.path, dc.Dimension)
		}
	}
}
