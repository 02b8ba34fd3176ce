package regime

import (
	"encoding/csv"
	"os"
	"strconv"
	"testing"
)

// record reads column col (0-based, after any row-name column) of a CSV file in testdata:
// the R files of testdata/r (quoted header, row names) and testdata/ecg/ecg.csv.
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
		skip = 1 // R's row-name column
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
