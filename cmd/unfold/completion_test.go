package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCompletionValues checks value completion through cobra's hidden __complete command:
// model names for simulate, partition kinds, formats, norms, surrogate methods, and the column
// names of the file already on the command line.
func TestCompletionValues(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "rec.csv")
	if err := os.WriteFile(p, []byte("# a record\ntime (s),strain,temp\n0,1,2\n1,2,3\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		args []string
		want []string
		not  []string
	}{
		{[]string{"simulate", ""}, []string{"lorenz", "logistic", "henon"}, nil},
		{[]string{"symbols", "--partition", ""}, []string{"search", "critical", "quantile", "threshold"}, nil},
		{[]string{"states", "--partition", ""}, []string{"critical"}, nil},
		{[]string{"inspect", "--format", ""}, []string{"csv", "npy", "wav"}, nil},
		{[]string{"dim", "--norm", ""}, []string{"euclidean", "max"}, nil},
		{[]string{"fractal", "--norm", ""}, []string{"euclidean", "max"}, nil},
		{[]string{"nulls", "--method", ""}, []string{"phase", "aaft", "iaaft"}, []string{"kantz"}},
		{[]string{"lyapunov", "--method", ""}, []string{"kantz", "rosenstein"}, []string{"iaaft"}},
		{[]string{"inspect", p, "--column", ""}, []string{"time (s)", "strain", "temp"}, nil},
		{[]string{"fractal", p, "--time-column", ""}, []string{"strain"}, nil},
	}
	for _, c := range cases {
		so, se, code := runCLI(t, "", append([]string{"__complete"}, c.args...)...)
		if code != 0 {
			t.Errorf("%q: exit %d: %s", c.args, code, se)
			continue
		}
		lines := map[string]bool{}
		for _, l := range strings.Split(so, "\n") {
			name, _, _ := strings.Cut(l, "\t")
			lines[name] = true
		}
		for _, w := range c.want {
			if !lines[w] {
				t.Errorf("%q: %q not offered in %q", c.args, w, so)
			}
		}
		for _, w := range c.not {
			if lines[w] {
				t.Errorf("%q: %q offered", c.args, w)
			}
		}
	}
}
