package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"unfold/internal/testsignals"
)

// TestReportLorenzSkipNotPartial is issue 18's "skipped" check: a clean 10,000-sample Lorenz
// record (x at Δt = 0.01, 100 time units) gives a Poincaré section of only a few dozen
// crossings, too few for the partition search; the symbols stage then takes the local maxima
// (about one per loop, more than the section's crossings) or is skipped with the record length
// it needs, and either way the report ends "ok" with exit status 0.
func TestReportLorenzSkipNotPartial(t *testing.T) {
	dir := t.TempDir()
	var b bytes.Buffer
	b.WriteString("t,x\n")
	for i, v := range testsignals.LorenzX(10000, testsignals.Sub(0.01, 10, 50)) {
		b.WriteString(strconv.FormatFloat(float64(i)*0.01, 'g', -1, 64) + "," + strconv.FormatFloat(v, 'g', 17, 64) + "\n")
	}
	in := filepath.Join(dir, "lorenz.csv")
	if err := os.WriteFile(in, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "rep")
	_, stderr, code := runCLI(t, "", "report", "-q", "--threads", "2", "-o", out, in)
	if code != 0 {
		t.Fatalf("report: exit %d, want 0: %s", code, stderr)
	}
	js, err := os.ReadFile(filepath.Join(out, "result.json"))
	if err != nil {
		t.Fatal(err)
	}
	m := decode(t, string(js))
	if m["status"] != "ok" {
		t.Errorf("status %v, want ok", m["status"])
	}
	var sym map[string]any
	for _, s := range lookup(m, "provenance.stages").([]any) {
		if s.(map[string]any)["key"] == "symbols" {
			sym = s.(map[string]any)
		}
	}
	switch sym["status"] {
	case "ok":
		if lookup(m, "symbols.parameters.section.method") != "maxima" {
			t.Errorf("symbols answered from %v, want the local maxima", lookup(m, "symbols.parameters.section"))
		}
	case "skipped":
		if !strings.Contains(sym["error"].(string), "a record of at least") {
			t.Errorf("symbols skipped without the record length it needs: %v", sym["error"])
		}
	default:
		t.Errorf("symbols stage %v", sym)
	}
}
