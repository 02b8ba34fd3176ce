package main

import (
	"bytes"
	"encoding/json"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestDenoiseCLI: `unfold denoise FILE -o OUT.csv` writes as many rows as the input with the
// same time stamps, the cleaned values in the last column; the JSON names the parameters and the
// rms correction per iteration; the input is never overwritten (DESIGN.md §3; issue 9).
func TestDenoiseCLI(t *testing.T) {
	dir := t.TempDir()
	r := rand.New(rand.NewPCG(1, 2))
	var b bytes.Buffer
	b.WriteString("time,x\n")
	x, y := 0.1, 0.1
	const n = 3000
	for i := -500; i < n; i++ {
		x, y = 1-1.4*x*x+y, 0.3*x
		if i >= 0 {
			b.WriteString(strconv.FormatFloat(5+0.5*float64(i), 'g', -1, 64) + "," + strconv.FormatFloat(x+0.036*r.NormFloat64(), 'g', 10, 64) + "\n")
		}
	}
	in := filepath.Join(dir, "henon.csv")
	if err := os.WriteFile(in, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "clean.csv")
	png := filepath.Join(dir, "clean.png")
	stdout, stderr, code := runCLI(t, "", "denoise", "--json", "-q", "--lag", "1", "--max-iter", "3", "-o", out, "--plot", png, in)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var js map[string]any
	if err := json.Unmarshal([]byte(stdout), &js); err != nil {
		t.Fatalf("JSON: %v\n%s", err, stdout)
	}
	params, _ := js["parameters"].(map[string]any)
	for _, k := range []string{"method", "dim", "lag", "q", "eps", "eps_rule"} {
		if _, ok := params[k]; !ok {
			t.Errorf("parameters lack %q", k)
		}
	}
	its, _ := js["iterations"].([]any)
	if len(its) == 0 {
		t.Fatalf("no iterations in %s", stdout)
	}
	if _, ok := its[0].(map[string]any)["rms_correction"]; !ok {
		t.Error("iteration lacks rms_correction")
	}
	got, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	inLines := strings.Split(strings.TrimSpace(b.String()), "\n")
	outLines := strings.Split(strings.TrimSpace(string(got)), "\n")
	if len(outLines) != len(inLines) {
		t.Fatalf("%d output lines, want %d", len(outLines), len(inLines))
	}
	if outLines[0] != "time,x,x_clean" {
		t.Errorf("header %q", outLines[0])
	}
	for i := 1; i < len(inLines); i++ {
		ti := strings.Split(inLines[i], ",")[0]
		to := strings.Split(outLines[i], ",")[0]
		a, _ := strconv.ParseFloat(ti, 64)
		c, _ := strconv.ParseFloat(to, 64)
		if a != c {
			t.Fatalf("row %d: time %s, want %s", i, to, ti)
		}
	}
	if st, err := os.Stat(png); err != nil || st.Size() == 0 {
		t.Errorf("plot not written: %v", err)
	}
	// never over the input
	if _, _, code := runCLI(t, "", "denoise", "-q", "-o", in, in); code != 2 {
		t.Errorf("writing over the input: exit %d, want 2", code)
	}
	if now, _ := os.ReadFile(in); !bytes.Equal(now, b.Bytes()) {
		t.Error("input changed")
	}
	// bad usage
	if _, _, code := runCLI(t, "", "denoise", "-q", "--method", "median", "-o", out, in); code != 2 {
		t.Errorf("bad method: exit %d, want 2", code)
	}
	if _, _, code := runCLI(t, "", "denoise", "-q", "--method", "none", "--lowpass", "5", "-o", out, in); code != 2 {
		t.Errorf("corner above Nyquist: exit %d, want 2", code)
	}
}
