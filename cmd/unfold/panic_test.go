package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// panicWriter panics on every write: a stand-in for a panic anywhere below a command.
type panicWriter struct{}

func (panicWriter) Write([]byte) (int, error) { panic("boom") }

// TestRunRecoversPanic: a panic becomes exit status 3 with one line naming the input and no
// stack trace (DESIGN.md §3: internal error, never a panic trace).
func TestRunRecoversPanic(t *testing.T) {
	in := filepath.Join(t.TempDir(), "sig.csv")
	os.WriteFile(in, []byte("x\n1\n2\n3\n4\n5\n6\n7\n8\n9\n"), 0o644)
	for _, debug := range []string{"", "1"} {
		t.Setenv("UNFOLD_DEBUG", debug)
		var errs bytes.Buffer
		code := run([]string{"inspect", in}, strings.NewReader(""), panicWriter{}, &errs)
		msg := errs.String()
		if code != 3 || !strings.HasPrefix(msg, "unfold: internal error, please report: ") ||
			!strings.Contains(msg, "boom") || !strings.Contains(msg, "(input \""+in+"\")\n") {
			t.Errorf("UNFOLD_DEBUG=%q: exit %d, stderr %q", debug, code, msg)
		}
		if hasStack := strings.Contains(msg, "goroutine "); hasStack != (debug == "1") {
			t.Errorf("UNFOLD_DEBUG=%q: stack on stderr is %v", debug, hasStack)
		}
	}
}

// TestDegenerateSignalsNoPanic: degenerate records give a written report and exit 1 (no
// answer), never an internal error; `dim --json` writes valid JSON with null for the
// undefined E2 of a square wave and of a 3-level signal (it failed on NaN).
func TestDegenerateSignalsNoPanic(t *testing.T) {
	dir := t.TempDir()
	write := func(name string, n int, f func(i int) string) string {
		var b strings.Builder
		b.WriteString("x\n")
		for i := 0; i < n; i++ {
			b.WriteString(f(i) + "\n")
		}
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(b.String()), 0o644)
		return p
	}
	for _, in := range []string{
		write("ten.csv", 10, func(int) string { return "3" }),
		write("negzero.csv", 200, func(int) string { return "-0" }),
		write("one.csv", 1, func(int) string { return "1" }),
		write("two.csv", 2, func(i int) string { return []string{"1", "2"}[i] }),
	} {
		out := filepath.Join(dir, "out-"+filepath.Base(in))
		_, errs, code := runCLI(t, "", "report", "--quiet", "-o", out, in)
		if code != 1 || strings.Contains(errs, "internal error") {
			t.Errorf("report %s: exit %d, stderr %q", filepath.Base(in), code, errs)
		}
		if _, err := os.Stat(filepath.Join(out, "report.html")); err != nil {
			t.Errorf("report %s: no page: %v", filepath.Base(in), err)
		}
	}
	for _, in := range []string{
		write("square.csv", 2000, func(i int) string { return []string{"1", "-1"}[i/10%2] }),
		write("three.csv", 2000, func(i int) string { return []string{"0", "1", "2"}[i%3] }),
	} {
		stdout, errs, code := runCLI(t, "", "dim", "--json", "--quiet", in)
		var m map[string]any
		if err := json.Unmarshal([]byte(stdout), &m); err != nil || code == 3 || strings.Contains(errs, "unsupported value") {
			t.Errorf("dim %s: exit %d, %v, stderr %q", filepath.Base(in), code, err, errs)
		}
	}
}
