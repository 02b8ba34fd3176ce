package main

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"unfold/internal/testsignals"
)

// writeLogisticMap writes n iterates of the logistic map r = 4 from 0.3 (CHECKS.md §13) as a t,x CSV.
func writeLogisticMap(t *testing.T, dir string, n int) string {
	t.Helper()
	var b bytes.Buffer
	b.WriteString("t,x\n")
	for i, x := range testsignals.Logistic(n, 4, 0.3, 1001) { // the first sample one step past 1000 dropped
		b.WriteString(strconv.Itoa(i) + "," + strconv.FormatFloat(x, 'g', 17, 64) + "\n")
	}
	p := filepath.Join(dir, "logistic.csv")
	if err := os.WriteFile(p, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestSymbolsEntropyAcceptance is issue 7's acceptance: symbols --json --alphabet 2 and
// entropy --json on a map signal; the stream read back reproduces the sidecar's counts.
func TestSymbolsEntropyAcceptance(t *testing.T) {
	dir := t.TempDir()
	in := writeLogisticMap(t, dir, 20000)
	sym := filepath.Join(dir, "x.sym")
	out, errs, code := runCLI(t, "", "symbols", "--json", "--alphabet", "2", in, "-o", sym)
	if code != 0 {
		t.Fatalf("symbols: exit %d: %s", code, errs)
	}
	m := decode(t, out)
	part := m["partition"].(map[string]any)
	th := part["thresholds"].([]any)
	// logistic r = 4: generating cut at 1/2 (CHECKS.md §9, E); issue 7 tolerance ± 0.02
	if len(th) != 1 || math.Abs(th[0].(float64)-0.5) > 0.02 {
		t.Errorf("thresholds %v, want [0.5 ± 0.02]", th)
	}
	if _, ok := part["score"].(float64); !ok {
		t.Errorf("partition.score missing: %v", part)
	}
	if m["alphabet_size"].(float64) != 2 || m["count"].(float64) != 20000 || m["output"].(string) != sym {
		t.Errorf("alphabet_size/count/output: %v %v %v", m["alphabet_size"], m["count"], m["output"])
	}
	// entropy of the stream: h = 1 bit/symbol (Pesin, λ = ln 2; CHECKS.md §9 E)
	out, errs, code = runCLI(t, "", "entropy", "--json", sym)
	if code != 0 {
		t.Fatalf("entropy: exit %d: %s", code, errs)
	}
	e := decode(t, out)
	if h := e["entropy_rate"].(float64); math.Abs(h-1) > 0.02 {
		t.Errorf("entropy_rate %.4f, want 1 bit/symbol", h)
	}
	if ex := e["excess_entropy"].(float64); math.Abs(ex) > 0.15 {
		t.Errorf("excess_entropy %.4f, want ≈ 0 (CHECKS.md §9: E = 0 for the generating partition)", ex)
	}
	if _, ok := e["lz76"].(float64); !ok {
		t.Errorf("lz76 missing")
	}
	if b := e["block_entropies"].([]any); len(b) < 5 {
		t.Errorf("block_entropies: %v", b)
	}
	// a tampered stream is refused with exit status 2 and a line:column
	raw, _ := os.ReadFile(sym)
	raw[85] = 'x'
	bad := filepath.Join(dir, "bad.sym")
	os.WriteFile(bad, raw, 0o644)
	side, _ := os.ReadFile(sym + ".json")
	os.WriteFile(bad+".json", side, 0o644)
	_, errs, code = runCLI(t, "", "entropy", bad)
	if code != 2 || !strings.Contains(errs, "bad.sym:2:5") {
		t.Errorf("tampered stream: exit %d, %s", code, errs)
	}
	// never over the input
	if _, errs, code = runCLI(t, "", "symbols", in, "-o", in); code != 2 {
		t.Errorf("writing over the input: exit %d (%s)", code, errs)
	}
}

func TestSectionAndPermutationCLI(t *testing.T) {
	dir := t.TempDir()
	var b bytes.Buffer
	b.WriteString("t,x\n")
	for i := 0; i < 3000; i++ {
		ti := float64(i) * 0.01
		b.WriteString(strconv.FormatFloat(ti, 'f', 2, 64) + "," + strconv.FormatFloat(math.Sin(2*math.Pi*ti/1.3), 'g', 12, 64) + "\n")
	}
	p := filepath.Join(dir, "sine.csv")
	if err := os.WriteFile(p, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	png := filepath.Join(dir, "r.png")
	csv := filepath.Join(dir, "c.csv")
	out, errs, code := runCLI(t, "", "section", "--json", "--lag", "20", "--level", "0", "-o", csv, "--plot", png, p)
	if code != 0 {
		t.Fatalf("section: exit %d: %s", code, errs)
	}
	m := decode(t, out)
	// the sine of period 1.3 over 30 time units crosses 0 upward about 23 times (exact: 30/1.3)
	if c := m["crossings"].(float64); c < 21 || c > 24 {
		t.Errorf("crossings %v, want about 23", c)
	}
	if r := m["rate_per_time_unit"].(float64); math.Abs(r-1/1.3) > 0.06 {
		t.Errorf("rate %.3f, want 1/1.3", r)
	}
	if cs := m["cautions"].([]any); len(cs) == 0 {
		t.Errorf("23 crossings should carry a caution")
	}
	for _, f := range []string{png, csv} {
		if st, err := os.Stat(f); err != nil || st.Size() == 0 {
			t.Errorf("%s not written", f)
		}
	}
	out, errs, code = runCLI(t, "", "entropy", "--json", "--permutation", "3", p)
	if code != 0 {
		t.Fatalf("entropy --permutation: exit %d: %s", code, errs)
	}
	pe := decode(t, out)["permutation_entropy"].(map[string]any)
	if b := pe["bits"].(float64); !(b > 0 && b <= math.Log2(6)) {
		t.Errorf("permutation entropy %v out of [0, log2 6]", b)
	}
}
