package main

import (
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"unfold/symbolic"
)

// writeGoldenMean writes n symbols of the golden-mean process (no two 1s in a row; after a 0,
// 0 or 1 with probability 1/2) as a symbol stream with its sidecar.
func writeGoldenMean(t *testing.T, dir string, n int) string {
	t.Helper()
	r := rand.New(rand.NewPCG(1, 2))
	x := make([]uint8, n)
	for i := 1; i < n; i++ {
		if x[i-1] == 0 && r.IntN(2) == 1 {
			x[i] = 1
		}
	}
	p := filepath.Join(dir, "gm.sym")
	f, err := os.Create(p)
	if err != nil {
		t.Fatal(err)
	}
	w, err := symbolic.NewWriter(f, "01")
	if err != nil {
		t.Fatal(err)
	}
	if err := w.Write(x); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	sf, err := os.Create(symbolic.SidecarPath(p))
	if err != nil {
		t.Fatal(err)
	}
	defer sf.Close()
	if err := symbolic.WriteSidecar(sf, w.Sidecar(symbolic.PartitionInfo{Kind: "threshold", Thresholds: []float64{0.5}}, symbolic.Source{Path: "golden-mean"}, "test", "test")); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestStatesGoldenMean: the golden-mean process has 2 causal states, Cμ = H(1/3) = 0.9183 bit and
// hμ = 2/3 bit (CHECKS.md, causal states; Crutchfield & Feldman 2003, exact).
func TestStatesGoldenMean(t *testing.T) {
	dir := t.TempDir()
	in := writeGoldenMean(t, dir, 100_000)
	svg, dot := filepath.Join(dir, "s.svg"), filepath.Join(dir, "s.dot")
	out, errs, code := runCLI(t, "", "states", "--json", "--scan", "--plot", svg, "--dot", dot, in)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	m := decode(t, out)
	h13 := -(1.0/3)*math.Log2(1.0/3) - (2.0/3)*math.Log2(2.0/3)
	if m["command"] != "states" || m["states"].(float64) != 2 || math.Abs(m["statistical_complexity"].(float64)-h13) > 0.03 ||
		math.Abs(m["entropy_rate"].(float64)-2.0/3) > 0.02 {
		t.Errorf("states %v, Cμ %v, hμ %v", m["states"], m["statistical_complexity"], m["entropy_rate"])
	}
	for _, k := range []string{"history_length", "significance", "state_list", "transitions", "cautions", "scan", "input", "parameters", "version"} {
		if _, ok := m[k]; !ok {
			t.Errorf("key %q missing", k)
		}
	}
	if n := len(m["transitions"].([]any)); n != 3 {
		t.Errorf("%d transitions, want 3 (A−0→A, A−1→B, B−0→A)", n)
	}
	for _, p := range []string{svg, dot} {
		if b, err := os.ReadFile(p); err != nil || len(b) == 0 {
			t.Errorf("%s not written: %v", p, err)
		}
	}
	// a stream too short for a stated L is refused with the length it needs (exit 2)
	_, errs, code = runCLI(t, "", "states", "--max-length", "16", in)
	if code != 2 || !strings.Contains(errs, "at least 655360") {
		t.Errorf("too short: exit %d, %s", code, errs)
	}
}

// TestStatesNumeric: the logistic map r = 4 through the generating partition (cut at 1/2) is a fair
// coin: one state, Cμ = 0, hμ = 1 bit (exact by the conjugacy to the tent map, CHECKS.md).
func TestStatesNumeric(t *testing.T) {
	in := writeLogisticMap(t, t.TempDir(), 20000)
	out, errs, code := runCLI(t, "", "states", "--json", "--alphabet", "2", in)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	m := decode(t, out)
	if m["states"].(float64) != 1 || m["statistical_complexity"].(float64) > 0.03 || math.Abs(m["entropy_rate"].(float64)-1) > 0.02 {
		t.Errorf("states %v, Cμ %v, hμ %v", m["states"], m["statistical_complexity"], m["entropy_rate"])
	}
}

// TestEntropyPermutationComplexity: the logistic map r = 4 at D = 6 lies between the plane's
// curves, near the maximum one (Rosso et al. 2007, Fig. 1, from memory: chaotic maps lie close to
// the upper curve; "near" = more than three quarters of the way up from the lower curve).
func TestEntropyPermutationComplexity(t *testing.T) {
	in := writeLogisticMap(t, t.TempDir(), 20000)
	out, errs, code := runCLI(t, "", "entropy", "--json", "--permutation", "6", in)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	m := decode(t, out)
	c, lo, hi := m["permutation_complexity"].(float64), m["complexity_min"].(float64), m["complexity_max"].(float64)
	if !(c > lo && c <= hi) || c-lo < 0.75*(hi-lo) {
		t.Errorf("C = %g, curves %g … %g", c, lo, hi)
	}
}
