package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"unfold/report"
)

func TestSimulateSweepLogistic(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "sweep")
	out, errs, code := runCLI(t, "", "simulate", "logistic", "--sweep", "r=3.5:4:0.02", "--n", "400", "--json", "-o", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	// One JSON object for the whole sweep.
	var js struct {
		Parameters struct {
			Parameter string    `json:"parameter"`
			Values    []float64 `json:"values"`
		} `json:"parameters"`
		List  string   `json:"list"`
		Files []string `json:"files"`
	}
	if err := json.Unmarshal([]byte(out), &js); err != nil {
		t.Fatalf("stdout is not one JSON object: %v\n%s", err, out)
	}
	// (4 − 3.5)/0.02 + 1 = 26 values, ends exact (arithmetic).
	if n := len(js.Parameters.Values); n != 26 || js.Parameters.Values[0] != 3.5 || js.Parameters.Values[25] != 4 || len(js.Files) != 26 {
		t.Fatalf("values %v, files %d", js.Parameters.Values, len(js.Files))
	}
	// The LIST reads back through the sweep's own reader, paths resolved beside it.
	l, err := report.ReadSweepList(js.List, "")
	if err != nil {
		t.Fatal(err)
	}
	if l.Parameter != "r" || len(l.Entries) != 26 || l.Entries[1].Value != 3.52 || l.Entries[1].Path != filepath.Join(dir, "r=3.52.csv") {
		t.Fatalf("list: parameter %q, %d entries, second %+v", l.Parameter, len(l.Entries), l.Entries[1])
	}
	// Each file holds the logistic map at its r: x' = r x (1 − x) (May 1976) holds between
	// successive samples of r = 3.9.
	b, err := os.ReadFile(filepath.Join(dir, "r=3.90.csv"))
	if err != nil {
		t.Fatal(err)
	}
	h, cols := parseCSV(t, string(b))
	if strings.Join(h, ",") != "t,x" || len(cols[1]) != 400 {
		t.Fatalf("r=3.90.csv: header %v, %d rows", h, len(cols[1]))
	}
	for i := 1; i < len(cols[1]); i++ {
		x := cols[1][i-1]
		if want := 3.9 * x * (1 - x); math.Abs(cols[1][i]-want) > 1e-12 {
			t.Fatalf("sample %d: %v, want r x (1 − x) = %v", i, cols[1][i], want)
		}
	}
}

func TestSimulateSweepListAndErrors(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "s")
	_, errs, code := runCLI(t, "", "simulate", "sines", "--sweep", "amplitudes[2]=0.25,0.5", "--n", "64", "-o", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	l, err := os.ReadFile(filepath.Join(dir, "list.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if string(l) != "path,amplitudes_2\namplitudes_2=0.25.csv,0.25\namplitudes_2=0.50.csv,0.5\n" {
		t.Errorf("list:\n%s", l)
	}
	// The second tone's amplitude is the swept value: x(t) = sin(ω t) + A₂ sin(φ ω t) at the
	// default ratios 1 and the golden mean (the model's equation).
	b, err := os.ReadFile(filepath.Join(dir, "amplitudes_2=0.50.csv"))
	if err != nil {
		t.Fatal(err)
	}
	_, cols := parseCSV(t, string(b))
	tt, x := cols[0][5], cols[1][5]
	if want := math.Sin(tt) + 0.5*math.Sin((1+math.Sqrt(5))/2*tt); math.Abs(x-want) > 1e-9 {
		t.Errorf("x(%v) = %v, want %v", tt, x, want)
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"simulate", "logistic", "--sweep", "r=3.5:4:0.02"}, "-o DIR"},
		{[]string{"simulate", "logistic", "--sweep", "q=1,2", "-o", dir}, "no parameter"},
		{[]string{"simulate", "logistic", "--sweep", "r", "-o", dir}, "NAME=START:STOP:STEP"},
		{[]string{"simulate", "logistic", "--sweep", "r=4:3:0.1", "-o", dir}, "other sign"},
		{[]string{"simulate", "logistic", "--r", "3", "--sweep", "r=3,4", "-o", dir}, "give it once"},
		{[]string{"simulate", "lorenz", "--lyapunov", "--sweep", "rho=28,29", "-o", dir}, "--lyapunov"},
	} {
		_, errs, code := runCLI(t, "", c.args...)
		if code != 2 || !strings.Contains(errs, c.want) {
			t.Errorf("%s: exit %d, %q; want 2 and %q", strings.Join(c.args, " "), code, errs, c.want)
		}
	}
}
