package embed

import (
	"encoding/csv"
	"os"
	"strconv"
	"testing"
)

// record reads column col (0-based, after R's row-name column when there is one) of a CSV
// file in testdata: the R files of testdata/r and testdata/ecg/ecg.csv.
func record(t testing.TB, path string, col int) []float64 {
	t.Helper()
	f, err := os.Open("../testdata/" + path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	skip := 0
	if rows[0][0] == "" {
		skip = 1
	}
	x := make([]float64, 0, len(rows)-1)
	for _, r := range rows[1:] {
		v, err := strconv.ParseFloat(r[skip+col], 64)
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		x = append(x, v)
	}
	return x
}

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
		x := record(t, c.path, 1)
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
