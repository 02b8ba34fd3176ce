package main

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"testing"
)

// TestLyapunovAcceptance is issue 5's acceptance check: --json gives lambda_max, interval, fit
// and the curve; --spectrum adds spectrum and kaplan_yorke_dimension; --csv and --plot write
// files; the logistic map's exponent is ln 2 (CHECKS.md §1, E) within 5 % (§3).
func TestLyapunovAcceptance(t *testing.T) {
	dir := t.TempDir()
	p := writeLogisticMap(t, dir, 4000)
	png := filepath.Join(dir, "div.png")
	csv := filepath.Join(dir, "div.csv")
	out, errs, code := runCLI(t, "", "lyapunov", "--json", "--lag", "1", "--dim", "1", "--theiler", "1",
		"--spectrum", "--csv", csv, "--plot", png, p)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	m := decode(t, out)
	for _, k := range []string{"command", "version", "input", "parameters", "lambda_max", "lambda_max_per_sample",
		"interval", "fit", "divergence", "spectrum", "kaplan_yorke_dimension", "cautions"} {
		if _, ok := m[k]; !ok {
			t.Errorf("JSON has no %q", k)
		}
	}
	lam, _ := m["lambda_max"].(float64)
	if math.Abs(lam-math.Ln2) > 0.05*math.Ln2 {
		t.Errorf("lambda_max = %v, want ln 2 ± 5%%", lam)
	}
	iv, _ := m["interval"].([]any)
	if len(iv) != 2 || iv[0].(float64) > lam || iv[1].(float64) < lam {
		t.Errorf("interval %v does not bracket %v", iv, lam)
	}
	f, _ := m["fit"].(map[string]any)
	if f == nil || f["from"] == nil || f["to"] == nil {
		t.Errorf("fit = %v, want from and to", m["fit"])
	}
	div, _ := m["divergence"].([]any)
	if len(div) < 10 {
		t.Fatalf("divergence has %d points", len(div))
	}
	if d0, _ := div[0].(map[string]any); d0["step"] != 0.0 || d0["mean_log"] == nil {
		t.Errorf("divergence[0] = %v, want step 0 and mean_log", d0)
	}
	sp, _ := m["spectrum"].([]any)
	if len(sp) != 1 || math.Abs(sp[0].(float64)-math.Ln2) > 0.1 {
		t.Errorf("spectrum %v, want [≈ ln 2]", sp)
	}
	if params, _ := m["parameters"].(map[string]any); params["seed"] != 1.0 || params["method"] != "kantz" {
		t.Errorf("parameters %v: want seed 1 and method kantz", params)
	}
	for _, file := range []string{png, csv} {
		if st, err := os.Stat(file); err != nil || st.Size() == 0 {
			t.Errorf("%s not written: %v", file, err)
		}
	}
	// The human table, Rosenstein, a given fit range.
	out, errs, code = runCLI(t, "", "lyapunov", "--method", "rosenstein", "--lag", "1", "--dim", "1", "--theiler", "1",
		"--fit-from", "1", "--fit-to", "8", p)
	if code != 0 || !bytes.Contains([]byte(out), []byte("bits per time unit")) || !bytes.Contains([]byte(out), []byte("steps 1 … 8")) {
		t.Errorf("table (exit %d): %s%s", code, out, errs)
	}
	// Usage errors exit 2.
	for _, args := range [][]string{
		{"lyapunov", "--method", "wolf", p},
		{"lyapunov", "--fit-from", "3", p},
		{"lyapunov", "--plot", "x.jpg", p},
	} {
		if _, _, code := runCLI(t, "", args...); code != 2 {
			t.Errorf("%v: exit %d, want 2", args, code)
		}
	}
}
