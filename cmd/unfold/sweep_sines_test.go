package main

import (
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestSweepSinesQuasiperiodic sweeps the amplitude of the second tone of sin t + A sin φt
// (φ the golden mean) over a weak and a strong second tone (A = 0.3, 3): every record is
// quasiperiodic motion on a torus with exactly two independent frequencies, 1/(2π) and
// φ/(2π) cycles per time unit (exact), whatever A > 0.
// Every row must say quasiperiodic and list exactly those two lines, and λ1's interval must
// hold 0 (λ1 = 0 on a torus, exact).
func TestSweepSinesQuasiperiodic(t *testing.T) {
	dir := t.TempDir()
	recs, res := filepath.Join(dir, "recs"), filepath.Join(dir, "res")
	if _, errs, code := runCLI(t, "", "simulate", "sines", "--sweep", "amplitudes[2]=0.3,3", "--n", "2000", "-o", recs); code != 0 {
		t.Fatalf("simulate: exit %d: %s", code, errs)
	}
	out, errs, code := runCLI(t, "", "sweep", filepath.Join(recs, "list.csv"), "--jobs", "2", "-o", res)
	if code != 0 {
		t.Fatalf("sweep: exit %d: %s", code, errs)
	}
	_, h, rows := readSweepCSV(t, res)
	col := map[string]int{}
	for i, c := range h {
		col[c] = i
	}
	if len(rows) != 2 || h[0] != "amplitudes_2" {
		t.Fatalf("header %v, %d rows; want amplitudes_2 first and 2 rows", h, len(rows))
	}
	want := []float64{1 / (2 * math.Pi), 1.6180339887498949 / (2 * math.Pi)}
	for _, row := range rows {
		a := row[0]
		if got := row[col["regime"]]; got != "quasiperiodic" {
			t.Errorf("A = %s: regime %q, want quasiperiodic", a, got)
		}
		fs := strings.Split(row[col["frequencies"]], ";")
		if len(fs) != 2 {
			t.Errorf("A = %s: frequencies %q, want exactly two lines", a, row[col["frequencies"]])
			continue
		}
		for k, f := range fs {
			v, err := strconv.ParseFloat(f, 64)
			// Half a bin of the full-length periodogram (0.5/(L·Δt), L ≤ 2000, Δt = 0.25).
			if err != nil || math.Abs(v-want[k]) > 0.5/(1800*0.25) {
				t.Errorf("A = %s: line %d at %s, want %.5f", a, k+1, f, want[k])
			}
		}
		lo, err1 := strconv.ParseFloat(row[col["lambda_lo"]], 64)
		hi, err2 := strconv.ParseFloat(row[col["lambda_hi"]], 64)
		if err1 != nil || err2 != nil || !(lo <= 0 && 0 <= hi) {
			t.Errorf("A = %s: λ1 interval [%s, %s], want it to hold 0", a, row[col["lambda_lo"]], row[col["lambda_hi"]])
		}
	}
	if !strings.Contains(out, "quasiperiodic throughout") {
		t.Errorf("transitions: want \"quasiperiodic throughout\" in\n%s", out)
	}
	if strings.Contains(out, "λ1 is first positive") {
		t.Errorf("transitions claim a positive λ1 on a torus:\n%s", out)
	}
}
