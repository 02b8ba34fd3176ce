package main

import (
	"bytes"
	"image/png"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"unfold/internal/testsignals"
)

// writeSignal writes a t,x CSV of the values at step dt and returns its path.
func writeSignal(t *testing.T, name string, x []float64, dt float64) string {
	t.Helper()
	var b bytes.Buffer
	b.WriteString("t,x\n")
	for i, v := range x {
		b.WriteString(strconv.FormatFloat(float64(i)*dt, 'g', 10, 64))
		b.WriteByte(',')
		b.WriteString(strconv.FormatFloat(v, 'g', 12, 64))
		b.WriteByte('\n')
	}
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// lorenzSignal is x of the Lorenz system (10, 28, 8/3), RK4 with step dt from (1, 1, 1), after
// 50 time units (internal/testsignals).
func lorenzSignal(n int, dt float64) []float64 {
	return testsignals.LorenzX(n, testsignals.Sampling{Step: dt, Skip: testsignals.Steps(50, dt)})
}

// henonSignal is x of the Hénon map (1.4, 0.3) from (0.1, 0.1) after 1000 iterations
// (internal/testsignals).
func henonSignal(n int) []float64 { return testsignals.HenonX(n, 1000) }

// TestLagDimEmbedAcceptance is issue 4's acceptance: lag --json, dim --json and embed --plot
// work, with the DESIGN.md §3 keys; the PNG decodes; a map gets lag 1.
func TestLagDimEmbedAcceptance(t *testing.T) {
	lor := writeSignal(t, "lorenz.csv", lorenzSignal(20000, 0.01), 0.01)
	out, errs, code := runCLI(t, "", "lag", "--json", lor)
	if code != 0 {
		t.Fatalf("lag: exit %d: %s", code, errs)
	}
	m := decode(t, out)
	for _, k := range []string{"command", "version", "input", "parameters", "lag", "lag_time", "method", "mutual_information", "autocorrelation"} {
		if _, ok := m[k]; !ok {
			t.Errorf("lag JSON lacks %q", k)
		}
	}
	// Lorenz x, Δt = 0.01: lag in [8, 20] samples (CHECKS.md §5, Fraser & Swinney 1986, M).
	lag := int(m["lag"].(float64))
	if lag < 8 || lag > 20 || m["lag_time"].(float64) != float64(lag)*0.01 {
		t.Errorf("lag %d, lag_time %v", lag, m["lag_time"])
	}
	mi := m["mutual_information"].([]any)[1].(map[string]any)
	if _, ok := mi["bits"]; !ok {
		t.Errorf("mutual_information entries lack bits: %v", mi)
	}

	dir := t.TempDir()
	fig := filepath.Join(dir, "dim.png")
	out, errs, code = runCLI(t, "", "dim", "--json", "--max-dim", "5", "--plot", fig, lor)
	if code != 0 {
		t.Fatalf("dim: exit %d: %s", code, errs)
	}
	m = decode(t, out)
	for _, k := range []string{"dimension", "lag", "false_neighbors", "cao", "method", "reason", "theiler"} {
		if _, ok := m[k]; !ok {
			t.Errorf("dim JSON lacks %q", k)
		}
	}
	// Lorenz: three dimensions (Kennel, Brown & Abarbanel 1992, CHECKS.md §5, M).
	if d := m["dimension"].(float64); d != 3 {
		t.Errorf("dimension %v, want 3", d)
	}
	checkPNG(t, fig)

	plot := filepath.Join(dir, "ss.png")
	stp := filepath.Join(dir, "stp.png")
	npy := filepath.Join(dir, "v.npy")
	out, errs, code = runCLI(t, "", "embed", "--json", "--lag", "12", "-o", npy, "--plot", plot, "--stp", stp, lor)
	if code != 0 {
		t.Fatalf("embed: exit %d: %s", code, errs)
	}
	m = decode(t, out)
	// N − (m−1)·τ vectors with the chosen m = 3 (definition).
	if v := m["vectors"].(float64); v != 20000-2*12 {
		t.Errorf("vectors %v, want %d", v, 20000-24)
	}
	checkPNG(t, plot)
	checkPNG(t, stp)
	if b, err := os.ReadFile(npy); err != nil || !bytes.HasPrefix(b, []byte("\x93NUMPY")) {
		t.Errorf("%s is not a .npy file (%v)", npy, err)
	}

	// A map gets lag 1 (issue acceptance; common practice).
	hen := writeSignal(t, "henon.csv", henonSignal(5000), 1)
	out, errs, code = runCLI(t, "", "lag", "--json", hen)
	if code != 0 {
		t.Fatalf("lag henon: exit %d: %s", code, errs)
	}
	if l := decode(t, out)["lag"].(float64); l != 1 {
		t.Errorf("Hénon lag %v, want 1", l)
	}
	// embed refuses to write over its input (DESIGN.md §3), exit status 2.
	if _, _, code := runCLI(t, "", "embed", "--lag", "1", "--dim", "2", "-o", hen, hen); code != 2 {
		t.Errorf("embed -o over the input: exit %d, want 2", code)
	}
	// Nothing to do is a usage error.
	if _, _, code := runCLI(t, "", "embed", hen); code != 2 {
		t.Errorf("embed without outputs: exit %d, want 2", code)
	}
}

func checkPNG(t *testing.T, path string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	if b := img.Bounds(); b.Dx() < 500 || b.Dy() < 400 {
		t.Errorf("%s: %v is too small to read", path, b)
	}
}
