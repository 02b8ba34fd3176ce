package main

import (
	"math"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"unfold/analysis"
)

// TestReportStates: on the logistic map at r = 4 the report has a states section with its
// diagram, and its states object is what `unfold states --json` prints on the symbols stage's
// stream (but for input.path: the same bytes, so the same SHA-256). The map cut at its critical
// point is conjugate to the tent map, whose binary symbols are a fair coin (exact; Crutchfield &
// Young 1989): one causal state, Cμ = 0, hμ = 1 bit/symbol (issue 16 tolerances: Cμ ± 0.03,
// hμ ± 0.02 bit).
func TestReportStates(t *testing.T) {
	dir := t.TempDir()
	in, out, m := reportOnLogistic(t, dir)
	got, ok := m["states"].(map[string]any)
	if !ok {
		t.Fatalf("no states object in result.json: %v", m["provenance"])
	}
	if n, _ := got["states"].(float64); n != 1 {
		t.Errorf("states %v, want 1 (a fair coin)", got["states"])
	}
	if c, _ := got["statistical_complexity"].(float64); math.Abs(c) > 0.03 {
		t.Errorf("statistical_complexity %v, want 0 ± 0.03 bit", c)
	}
	if h, _ := got["entropy_rate"].(float64); math.Abs(h-1) > 0.02 {
		t.Errorf("entropy_rate %v, want 1 ± 0.02 bit/symbol", h)
	}
	sym := filepath.Join(dir, "x.sym")
	if _, se, code := runCLI(t, "", "symbols", "--json", "-q", "--threads", "2", in, "-o", sym); code != 0 {
		t.Fatalf("symbols: exit %d: %s", code, se)
	}
	so, se, code := runCLI(t, "", "states", "--json", "-q", sym)
	if code != 0 {
		t.Fatalf("states: exit %d: %s", code, se)
	}
	want := decode(t, so)
	want["input"].(map[string]any)["path"] = analysis.StatesStreamName
	if !reflect.DeepEqual(got, want) {
		t.Errorf("report's states object differs from `unfold states --json` on the stream:\n got %v\nwant %v", got, want)
	}
	page, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	checkStageFigures(t, page, map[string]string{"states": "states"})
}
