package main

import (
	"path/filepath"
	"strings"
	"testing"
)

// simulateLorenz writes n samples of the Lorenz flow (x, dt 0.01) with `unfold simulate`.
func simulateLorenz(t *testing.T, dir string, n string) string {
	t.Helper()
	p := filepath.Join(dir, "lorenz.csv")
	if _, errs, code := runCLI(t, "", "simulate", "lorenz", "--n", n, "-o", p); code != 0 {
		t.Fatalf("simulate: exit %d: %s", code, errs)
	}
	return p
}

// TestThreadsIdentical: fractal's and lyapunov's JSON are the same with --threads 1 and 2
// (issue 14: results identical for any thread count), apart from the thread count recorded
// in the parameters.
func TestThreadsIdentical(t *testing.T) {
	p := simulateLorenz(t, t.TempDir(), "12000")
	for _, cmd := range [][]string{
		{"fractal", "--column", "x", "--lag", "11", "--theiler", "20", "--max-dim", "4"},
		{"lyapunov", "--column", "x", "--lag", "11", "--dim", "3", "--theiler", "20"},
	} {
		var outs [2]string
		for k, th := range []string{"1", "2"} {
			out, errs, code := runCLI(t, "", append(append([]string{"--json", "--threads", th}, cmd...), p)...)
			if code != 0 {
				t.Fatalf("%s --threads %s: exit %d: %s", cmd[0], th, code, errs)
			}
			outs[k] = strings.Replace(out, `"threads": `+th+",", `"threads": N,`, 1)
		}
		if outs[0] != outs[1] {
			t.Errorf("%s: JSON differs between --threads 1 and 2", cmd[0])
		}
		if !strings.Contains(outs[0], `"reference_points": 4000`) || !strings.Contains(outs[0], `"sampling": "sampled: 4000 reference points`) {
			t.Errorf("%s: the JSON does not state its 4000 sampled reference points", cmd[0])
		}
	}
}

// TestReferencePointsFlags: --reference-points sets the number stated in the JSON, and
// fractal --exact counts all pairs and says so.
func TestReferencePointsFlags(t *testing.T) {
	p := simulateLorenz(t, t.TempDir(), "5000")
	for _, c := range []struct {
		args []string
		refs string
		how  string
	}{
		{[]string{"fractal", "--lag", "11", "--theiler", "20", "--max-dim", "4", "--reference-points", "700"}, `"reference_points": 700,`, `"sampling": "sampled: 700 reference points`},
		{[]string{"fractal", "--lag", "11", "--theiler", "20", "--max-dim", "4", "--exact"}, `"reference_points": 4967,`, `"sampling": "exact: all pairs`},
		{[]string{"lyapunov", "--lag", "11", "--dim", "3", "--theiler", "20", "--reference-points", "900"}, `"reference_points": 900,`, `"sampling": "sampled: 900 reference points`},
	} {
		out, errs, code := runCLI(t, "", append(append([]string{"--json", "--column", "x"}, c.args...), p)...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", c.args, code, errs)
		}
		if !strings.Contains(out, c.refs) || !strings.Contains(out, c.how) {
			t.Errorf("%v: want %s and %s in the JSON", c.args, c.refs, c.how)
		}
	}
	if _, errs, code := runCLI(t, "", "fractal", "--column", "x", "--reference-points", "-3", p); code != 2 || !strings.Contains(errs, "--reference-points") {
		t.Errorf("fractal --reference-points -3: exit %d (want 2): %s", code, errs)
	}
}
