package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestReportRealRecords runs `unfold report` on open records (testdata/r: R datasets written by
// R; testdata/ecg: the MIT-BIH ECG SciPy ships, its first 10 s): no run exits 2 (bad input) or
// 3 (internal error) or shows a panic, each writes result.json with a lag and a dimension, and
// no impossible number (json "NaN" cannot be decoded). The chain's facts per record are
// checked in analysis (TestRealRecords).
func TestReportRealRecords(t *testing.T) {
	for _, c := range []struct {
		file string
		args []string
	}{
		{"r/lh.csv", nil},
		{"r/co2.csv", nil},
		{"ecg/ecg.csv", []string{"--to", "3600"}},
	} {
		out := filepath.Join(t.TempDir(), "rep")
		args := append([]string{"report", "-q", "--threads", "2", "-o", out}, c.args...)
		_, stderr, code := runCLI(t, "", append(args, filepath.Join("..", "..", "testdata", c.file))...)
		if code != 0 && code != 1 || strings.Contains(stderr, "panic") {
			t.Errorf("%s: exit %d: %s", c.file, code, stderr)
			continue
		}
		b, err := os.ReadFile(filepath.Join(out, "result.json"))
		if err != nil {
			t.Fatal(err)
		}
		m := decode(t, string(b))
		if _, ok := lookup(m, "lag.lag").(float64); !ok {
			t.Errorf("%s: no lag (status %v)", c.file, m["status"])
		}
		if d, _ := lookup(m, "dim.dimension").(float64); d < 1 {
			t.Errorf("%s: no dimension (status %v)", c.file, m["status"])
		}
	}
}
