package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"unfold/internal/testsignals"
)

// TestFlagAliases checks the one vocabulary of issue 15: every old spelling still works, is
// hidden from --help and prints a deprecation note naming the new flag on stderr (nothing on
// stdout, which holds the JSON); giving both spellings is a usage error (exit 2).
func TestFlagAliases(t *testing.T) {
	dir := t.TempDir()
	p := writeSignal(t, "h.csv", testsignals.HenonX(600, 100), 1)
	cases := []struct {
		cmd, old, new string
		oldArgs       []string // the old spelling with its value
		newArgs       []string // the new spelling with its value
		rest          []string
	}{
		{"fractal", "euclidean", "norm", []string{"--euclidean"}, []string{"--norm", "euclidean"}, []string{"--lag", "1", "--theiler", "1", "--max-dim", "2"}},
		{"fractal", "dim", "max-dim", []string{"--dim", "2"}, []string{"--max-dim", "2"}, []string{"--lag", "1", "--theiler", "1"}},
		{"denoise", "euclidean", "norm", []string{"--euclidean"}, []string{"--norm", "euclidean"},
			[]string{"--method", "constant", "--dim", "3", "--q", "1", "--lag", "1", "--max-iter", "1", "-o", filepath.Join(dir, "d.csv")}},
		{"nulls", "count", "surrogates", []string{"--count", "2"}, []string{"--surrogates", "2"}, []string{"-o", filepath.Join(dir, "n")}},
		{"denoise", "iterations", "max-iter", []string{"--iterations", "1"}, []string{"--max-iter", "1"},
			[]string{"--method", "constant", "--dim", "3", "--q", "1", "--lag", "1", "-o", filepath.Join(dir, "d2.csv")}},
		{"entropy", "delay", "lag", []string{"--delay", "2"}, []string{"--lag", "2"}, []string{"--permutation", "3"}},
	}
	for _, c := range cases {
		args := append(append([]string{c.cmd, "--json", "--column", "x"}, c.rest...), c.oldArgs...)
		so, se, code := runCLI(t, "", append(args, p)...)
		if code != 0 {
			t.Errorf("%s --%s: exit %d: %s", c.cmd, c.old, code, se)
			continue
		}
		if !strings.Contains(se, "--"+c.old+" has been deprecated") || !strings.Contains(se, "--"+c.new) {
			t.Errorf("%s --%s: no deprecation note naming --%s on stderr: %q", c.cmd, c.old, c.new, se)
		}
		if strings.Contains(so, "deprecated") {
			t.Errorf("%s --%s: deprecation note on stdout", c.cmd, c.old)
		}
		decode(t, so)
		// the same run with the new spelling gives the same parameters
		args = append(append([]string{c.cmd, "--json", "--column", "x"}, c.rest...), c.newArgs...)
		so2, se2, code := runCLI(t, "", append(args, p)...)
		if code != 0 || strings.Contains(se2, "deprecated") {
			t.Errorf("%s --%s: exit %d, %q", c.cmd, c.new, code, se2)
		} else if a, b := decode(t, so)["parameters"], decode(t, so2)["parameters"]; !sameJSON(a, b) {
			t.Errorf("%s: --%s gives parameters %v, --%s %v", c.cmd, c.old, a, c.new, b)
		}
		// both spellings: a usage error
		args = append(append(append([]string{c.cmd, "--column", "x"}, c.rest...), c.oldArgs...), c.newArgs...)
		if _, se, code := runCLI(t, "", append(args, p)...); code != 2 || !strings.Contains(se, "give --"+c.new+" only") {
			t.Errorf("%s --%s with --%s: exit %d, %q; want 2 and a message", c.cmd, c.old, c.new, code, se)
		}
		// --help shows the new name only
		help, _, _ := runCLI(t, "", c.cmd, "--help")
		if strings.Contains(help, "--"+c.old+" ") || !strings.Contains(help, "--"+c.new+" ") {
			t.Errorf("%s --help: want --%s and not --%s:\n%s", c.cmd, c.new, c.old, help)
		}
	}
	os.RemoveAll(dir)
}

func sameJSON(a, b any) bool {
	ma, ok1 := a.(map[string]any)
	mb, ok2 := b.(map[string]any)
	if !ok1 || !ok2 || len(ma) != len(mb) {
		return false
	}
	for k, v := range ma {
		if _, nested := v.(map[string]any); nested {
			if !sameJSON(v, mb[k]) {
				return false
			}
			continue
		}
		if vs, ok := v.([]any); ok {
			ws, ok := mb[k].([]any)
			if !ok || len(vs) != len(ws) {
				return false
			}
			continue
		}
		if mb[k] != v {
			return false
		}
	}
	return true
}

// TestEntropyPlanePlot checks `entropy --permutation D --plot`: an SVG with a viewBox, and
// --plot refused without --permutation.
func TestEntropyPlanePlot(t *testing.T) {
	p := writeSignal(t, "h.csv", testsignals.HenonX(2000, 100), 1)
	out := filepath.Join(t.TempDir(), "plane.svg")
	if _, se, code := runCLI(t, "", "entropy", "--permutation", "4", "--column", "x", "--plot", out, p); code != 0 {
		t.Fatalf("exit %d: %s", code, se)
	}
	b, err := os.ReadFile(out)
	if err != nil || !strings.Contains(string(b), "viewBox") || !strings.Contains(string(b), "complexity") {
		t.Errorf("plane.svg: %v, %.200s", err, b)
	}
	if _, _, code := runCLI(t, "", "entropy", "--plot", out, p); code != 2 {
		t.Errorf("--plot without --permutation: exit %d, want 2", code)
	}
}
