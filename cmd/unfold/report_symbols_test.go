package main

import (
	"math"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"unfold/analysis"
)

// TestReportSymbolsEntropy: on the logistic map the report's symbols object is what `unfold
// symbols --json` prints (but for "output" and "sidecar", empty because the report keeps the
// stream in memory), its entropy object is what `unfold entropy --json` prints on that stream
// (but for input.path: the same stream bytes, so the same SHA-256), the values are the
// published ones, and the page has the return-map and entropy figures in those sections.
func TestReportSymbolsEntropy(t *testing.T) {
	dir := t.TempDir()
	in, out, m := reportOnLogistic(t, dir)
	sym := filepath.Join(dir, "x.sym")
	so, se, code := runCLI(t, "", "symbols", "--json", "-q", "--threads", "2", in, "-o", sym)
	if code != 0 {
		t.Fatalf("symbols: exit %d: %s", code, se)
	}
	want := decode(t, so)
	want["output"], want["sidecar"] = "", ""
	got, ok := m["symbols"].(map[string]any)
	if !ok {
		t.Fatalf("no symbols object in result.json: %v", m["provenance"])
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("report's symbols object differs from `unfold symbols --json`:\n got %v\nwant %v", got, want)
	}
	// logistic r = 4: generating cut at 1/2 (CHECKS.md §9, E); issue 7 tolerance ± 0.02
	if th := lookup(got, "partition.thresholds").([]any); len(th) != 1 || math.Abs(th[0].(float64)-0.5) > 0.02 {
		t.Errorf("thresholds %v, want [0.5 ± 0.02]", th)
	}
	so, se, code = runCLI(t, "", "entropy", "--json", "-q", sym)
	if code != 0 {
		t.Fatalf("entropy: exit %d: %s", code, se)
	}
	want = decode(t, so)
	want["input"].(map[string]any)["path"] = analysis.EntropyStreamName
	if got := m["entropy"]; !reflect.DeepEqual(got, want) {
		t.Errorf("report's entropy object differs from `unfold entropy --json` on the stream:\n got %v\nwant %v", got, want)
	}
	// h = 1 bit/symbol (Pesin, λ = ln 2; CHECKS.md §9 E)
	if h, _ := lookup(m, "entropy.entropy_rate").(float64); math.Abs(h-1) > 0.03 {
		t.Errorf("entropy_rate %.4f, want 1 bit/symbol", h)
	}
	page, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	checkStageFigures(t, page, map[string]string{"symbols": "symbols", "entropy": "entropy"})
}

// reportOnLogistic writes 8000 values of the logistic map at r = 4 (writeLogisticMap) in dir,
// runs `unfold report` on them into dir/rep and returns the input, the report folder and its
// result.json decoded; exit 1 (a stage without an answer) is allowed.
func reportOnLogistic(t *testing.T, dir string) (in, out string, m map[string]any) {
	t.Helper()
	in = writeLogisticMap(t, dir, 8000)
	out = filepath.Join(dir, "rep")
	_, stderr, code := runCLI(t, "", "report", "-q", "--threads", "2", "-o", out, in)
	if code != 0 && code != 1 {
		t.Fatalf("report: exit %d: %s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(out, "result.json"))
	if err != nil {
		t.Fatal(err)
	}
	return in, out, decode(t, string(b))
}
