package main

import (
	"bufio"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
)

// parseCSV reads simulate's output: a header and numeric rows.
func parseCSV(t *testing.T, s string) ([]string, [][]float64) {
	t.Helper()
	sc := bufio.NewScanner(strings.NewReader(s))
	sc.Buffer(make([]byte, 1<<16), 1<<20)
	if !sc.Scan() {
		t.Fatal("no header")
	}
	header := strings.Split(sc.Text(), ",")
	cols := make([][]float64, len(header))
	line := 1
	for sc.Scan() {
		line++
		f := strings.Split(sc.Text(), ",")
		if len(f) != len(header) {
			t.Fatalf("line %d: %d fields, header has %d", line, len(f), len(header))
		}
		for j, v := range f {
			x, err := strconv.ParseFloat(v, 64)
			if err != nil {
				t.Fatalf("line %d: %v", line, err)
			}
			cols[j] = append(cols[j], x)
		}
	}
	return header, cols
}

func TestSimulateCSV(t *testing.T) {
	out, errs, code := runCLI(t, "", "simulate", "lorenz", "--n", "100")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	h, cols := parseCSV(t, out)
	if strings.Join(h, ",") != "t,x,y,z" || len(cols[0]) != 100 {
		t.Fatalf("header %v and %d rows, want t,x,y,z and 100", h, len(cols[0]))
	}
	if math.Abs(cols[0][99]-0.99) > 1e-12 {
		t.Errorf("last time stamp %g, want 0.99 (dt 0.01)", cols[0][99])
	}
	// Maps: t counts iterations, columns x,y; a parameter flag changes the output.
	out1, _, _ := runCLI(t, "", "simulate", "henon", "--n", "10")
	out2, _, code := runCLI(t, "", "simulate", "henon", "--n", "10", "--a", "1.2")
	if code != 0 || out1 == out2 || !strings.HasPrefix(out1, "t,x,y\n0,") {
		t.Errorf("henon output with --a did not change or is malformed:\n%s", out2)
	}
	// A negative value as a separate argument (two-well Duffing).
	if _, errs, code := runCLI(t, "", "simulate", "duffing", "--alpha", "-1", "--delta", "0.25", "--gamma", "0.4", "--n", "10"); code != 0 {
		t.Errorf("two-well duffing: exit %d: %s", code, errs)
	}
	// The same seed gives the same noisy record; another seed a different one.
	a, _, _ := runCLI(t, "", "simulate", "ar", "--n", "50", "--seed", "3")
	b, _, _ := runCLI(t, "", "simulate", "ar", "--n", "50", "--seed", "3")
	c, _, _ := runCLI(t, "", "simulate", "ar", "--n", "50", "--seed", "4")
	if a != b || a == c {
		t.Error("--seed does not make the AR process reproducible")
	}
}

func TestSimulateOutputFileAndJSON(t *testing.T) {
	p := filepath.Join(t.TempDir(), "h.csv")
	out, errs, code := runCLI(t, "", "simulate", "henon", "--n", "500", "-o", p, "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	m := decode(t, out)
	if m["command"] != "simulate" || m["output"] != p || m["samples"] != 500.0 {
		t.Errorf("JSON %v", m)
	}
	data, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	if _, cols := parseCSV(t, string(data)); len(cols[0]) != 500 {
		t.Errorf("%d rows written, want 500", len(cols[0]))
	}
	left, _ := filepath.Glob(filepath.Join(filepath.Dir(p), ".*tmp*"))
	if len(left) != 0 {
		t.Errorf("temporary files left behind: %v", left)
	}
	// --json without -o would mix JSON and CSV on stdout: refused.
	if _, _, code := runCLI(t, "", "simulate", "henon", "--json"); code != 2 {
		t.Errorf("--json without -o: exit %d, want 2", code)
	}
}

func TestSimulateLyapunovJSON(t *testing.T) {
	out, errs, code := runCLI(t, "", "simulate", "logistic", "--lyapunov", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	m := decode(t, out)
	for _, k := range []string{"command", "version", "parameters", "spectrum", "kaplan_yorke_dimension"} {
		if _, ok := m[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	params := m["parameters"].(map[string]any)
	if params["seed"] != 1.0 || params["model"] != "logistic" {
		t.Errorf("parameters %v", params)
	}
	sp := m["spectrum"].([]any)
	// Logistic r = 4: λ = ln 2 (CHECKS §1, E, C; 10⁶ iterations, ±1e-3).
	if l := sp[0].(float64); math.Abs(l-math.Ln2) > 1e-3 {
		t.Errorf("λ = %g, want ln 2", l)
	}
	// Hénon table output: λ1 = 0.4192 ± 0.005 (Sprott 2003, CHECKS §2, M + C), and the sum
	// ln 0.3 = −1.203973 (CHECKS §1, E).
	out, _, code = runCLI(t, "", "simulate", "henon", "--lyapunov", "--n", "100000")
	if code != 0 || !strings.Contains(out, "-1.203973") {
		t.Errorf("henon spectrum table (exit %d):\n%s", code, out)
	}
	for _, line := range strings.Split(out, "\n") {
		if f := strings.Fields(line); len(f) > 1 && f[0] == "λ1" {
			if l, err := strconv.ParseFloat(f[1], 64); err != nil || math.Abs(l-0.4192) > 0.005 {
				t.Errorf("henon λ1 line %q", line)
			}
		}
	}
}

func TestSimulateBadUsage(t *testing.T) {
	cases := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"simulate"}, 2, "model name"},
		{[]string{"simulate", "lorentz"}, 2, "models: lorenz"},
		{[]string{"simulate", "henon", "--sigma", "3"}, 2, "no parameter"},
		{[]string{"simulate", "henon", "--dt", "0.5"}, 2, "per sample"},
		{[]string{"simulate", "ar", "--phi", "1.1"}, 2, "non-stationary"},
		{[]string{"simulate", "logistic", "--r", "5"}, 2, "[0, 4]"},
		{[]string{"simulate", "noise", "--lyapunov"}, 2, "no Lyapunov spectrum"},
		{[]string{"simulate", "lorenz", "--lyapunov", "--noise", "0.1"}, 2, "--noise"},
		{[]string{"simulate", "lorenz", "--init", "1,x"}, 2, "not a finite number"},
		{[]string{"simulate", "henon", "--init", "10,10"}, 1, "left to infinity"},
	}
	for _, c := range cases {
		_, errs, code := runCLI(t, "", c.args...)
		if code != c.code || !strings.Contains(errs, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want exit %d and %q", c.args, code, errs, c.code, c.want)
		}
	}
}

func TestSimulateHelpListsModels(t *testing.T) {
	out, _, code := runCLI(t, "", "simulate", "--help")
	if code != 0 {
		t.Fatalf("exit %d", code)
	}
	for _, w := range []string{"lorenz", "rossler", "duffing", "henon", "logistic", "tent", "lozi", "ikeda", "sines", "ar", "noise",
		"σ(y − x)", "Benettin", "Examples:", "--sigma"} {
		if !strings.Contains(out, w) {
			t.Errorf("help lacks %q", w)
		}
	}
}

// TestSimulateDemoRecipe checks the `unfold simulate` command in testdata/demo/README.md: after
// the stated scaling (t/(10π) seconds, 250 µε per unit of x) it reproduces strip.csv to its
// printed precision (all rows on amd64; the first 1000 elsewhere, see models' TestDemoStrip).
func TestSimulateDemoRecipe(t *testing.T) {
	out, errs, code := runCLI(t, "", "simulate", "duffing", "--delta", "0.25", "--alpha", "-1", "--beta", "1",
		"--gamma", "0.4", "--omega", "1", "--dt", "0.12566370614359174", "--transient", "628.3185307179587",
		"--n", "20000", "--noise", "0.015", "--seed", "11")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	_, sim := parseCSV(t, out)
	data, err := os.ReadFile("../../testdata/demo/strip.csv")
	if err != nil {
		t.Fatal(err)
	}
	h, demo := parseCSV(t, string(data))
	if strings.Join(h, ",") != "t,strain" || len(demo[0]) != len(sim[0]) {
		t.Fatalf("demo header %v, %d rows; simulated %d rows", h, len(demo[0]), len(sim[0]))
	}
	n := len(demo[0])
	if runtime.GOARCH != "amd64" {
		n = 1000
	}
	for i := 0; i < n; i++ {
		ts := sim[0][i] / (10 * math.Pi)
		strain := 250 * sim[1][i]
		if math.Abs(ts-demo[0][i]) > 0.0005+1e-9 || math.Abs(strain-demo[1][i]) > 0.005+1e-9 {
			t.Fatalf("row %d: simulate gives (%.6f s, %.4f µε), strip.csv has (%g, %g)", i+1, ts, strain, demo[0][i], demo[1][i])
		}
	}
}
