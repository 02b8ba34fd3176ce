package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// TestFractalNullsRegimeCLI checks the JSON keys of DESIGN.md §3 for fractal and regime, that
// nulls writes K files and a summary without touching the input, and the exit status.
func TestFractalNullsRegimeCLI(t *testing.T) {
	dir := t.TempDir()
	p, orig := writeTX(t, dir, 3000, 0.02)
	out, errs, code := runCLI(t, "", "fractal", "--json", "--max-dim", "4", p)
	if code != 0 {
		t.Fatalf("fractal exit %d: %s", code, errs)
	}
	m := decode(t, out)
	for _, k := range []string{"command", "version", "input", "parameters", "d2", "interval", "scaling_range", "saturated", "correlation_sum"} {
		if _, ok := m[k]; !ok {
			t.Errorf("fractal JSON lacks %q", k)
		}
	}
	out, errs, code = runCLI(t, "", "regime", "--json", "--surrogates", "9", "--threads", "2", p)
	if code != 0 {
		t.Fatalf("regime exit %d: %s", code, errs)
	}
	m = decode(t, out)
	for _, k := range []string{"regime", "confidence", "evidence", "cautions"} {
		if _, ok := m[k]; !ok {
			t.Errorf("regime JSON lacks %q", k)
		}
	}
	nd := filepath.Join(dir, "nulls")
	if _, errs, code = runCLI(t, "", "nulls", "--surrogates", "3", "--method", "aaft", "-o", nd, p); code != 0 {
		t.Fatalf("nulls exit %d: %s", code, errs)
	}
	for _, f := range []string{"surrogate-001.csv", "surrogate-003.csv", "summary.json"} {
		if _, err := os.Stat(filepath.Join(nd, f)); err != nil {
			t.Error(err)
		}
	}
	if b, _ := os.ReadFile(p); !bytes.Equal(b, orig) {
		t.Error("nulls changed the input")
	}
	if _, _, code = runCLI(t, "", "nulls", "--method", "shuffle", "-o", nd, p); code != 2 {
		t.Errorf("bad --method: exit %d, want 2", code)
	}
}
