package testsignals

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"testing"
)

// OpenRecord reads column col (0-based, after R's row-name column when there is one) of an
// open record in the repository's testdata folder; path is relative to testdata, e.g.
// "r/co2.csv" (the R datasets of testdata/r, written by R's write.csv: quoted header, row
// names) or "ecg/ecg.csv" (the ECG of testdata/ecg). The folder is found from this file's own
// location, so the helper works from any package's tests. It reads the CSV with encoding/csv
// and strconv rather than package series, so that series' own tests can use it too.
func OpenRecord(t testing.TB, path string, col int) []float64 {
	t.Helper()
	_, self, _, ok := runtime.Caller(0)
	if !ok {
		t.Fatal("testsignals: cannot locate the testdata folder")
	}
	file := filepath.Join(filepath.Dir(self), "..", "..", "testdata", filepath.FromSlash(path))
	f, err := os.Open(file)
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
