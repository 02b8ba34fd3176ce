package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestReportOutputChecked: -o is checked before any analysis (exit 2, no stage line on
// stderr), and a refused or unwritable destination keeps every old file; a report over an
// old report folder replaces it whole.
func TestReportOutputChecked(t *testing.T) {
	dir := t.TempDir()
	p, _ := writeTX(t, dir, 600, 0.01)
	file := filepath.Join(dir, "file")
	os.WriteFile(file, nil, 0o644)
	mine := filepath.Join(dir, "mine")
	os.MkdirAll(mine, 0o755)
	os.WriteFile(filepath.Join(mine, "notes.txt"), []byte("keep"), 0o644)
	for _, out := range []string{filepath.Join(file, "out"), mine} {
		_, errOut, code := runCLI(t, "", "report", "--threads", "1", "-o", out, p)
		if code != exitBadInput || strings.Contains(errOut, "inspect ") {
			t.Errorf("-o %s: exit %d, stderr %q; want exit 2 before any stage", out, code, errOut)
		}
	}
	if b, _ := os.ReadFile(filepath.Join(mine, "notes.txt")); string(b) != "keep" {
		t.Error("a refused folder lost its file")
	}
	// An old report in a read-only parent: nothing can be staged, and the old folder stays.
	if os.Geteuid() != 0 {
		ro := filepath.Join(dir, "ro")
		out := filepath.Join(ro, "rep")
		os.MkdirAll(filepath.Join(out, "figures"), 0o755)
		old := `{"status":"ok","input":{"path":"old.csv"}}`
		os.WriteFile(filepath.Join(out, "result.json"), []byte(old), 0o644)
		os.Chmod(ro, 0o555)
		defer os.Chmod(ro, 0o755)
		_, errOut, code := runCLI(t, "", "report", "--threads", "1", "-o", out, p)
		if code != exitBadInput || strings.Contains(errOut, "inspect ") {
			t.Errorf("read-only parent: exit %d, stderr %q; want exit 2 before any stage", code, errOut)
		}
		if b, _ := os.ReadFile(filepath.Join(out, "result.json")); string(b) != old {
			t.Error("the old report changed")
		}
	}
	// A report over an old report replaces it whole and says where the page fills in.
	out := filepath.Join(dir, "rep")
	if _, errOut, code := runCLI(t, "", "report", "--threads", "1", "-o", out, p); code > 1 {
		t.Fatalf("first report: exit %d: %s", code, errOut)
	}
	os.WriteFile(filepath.Join(out, "figures", "stale.svg"), []byte("<svg/>"), 0o644)
	_, errOut, code := runCLI(t, "", "report", "--threads", "1", "-o", out, p)
	if code > 1 {
		t.Fatalf("second report: exit %d: %s", code, errOut)
	}
	if !strings.Contains(errOut, "the page fills in at "+filepath.Join(dir, ".tmp-rep-")) || !strings.Contains(errOut, "it moves to "+out) {
		t.Errorf("stderr does not say where the page fills in: %s", errOut)
	}
	if _, err := os.Stat(filepath.Join(out, "figures", "stale.svg")); err == nil {
		t.Error("a file of the old report survived")
	}
	for _, f := range []string{"report.html", "result.json"} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Error(err)
		}
	}
	ents, _ := os.ReadDir(dir)
	for _, e := range ents {
		if strings.HasPrefix(e.Name(), ".tmp-") {
			t.Errorf("leftover %s", e.Name())
		}
	}
}
