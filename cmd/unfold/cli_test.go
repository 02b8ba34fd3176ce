package main

import (
	"bytes"
	"compress/gzip"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// runCLI runs the command line in-process and returns stdout, stderr and the exit status.
func runCLI(t *testing.T, stdin string, args ...string) (string, string, int) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(args, strings.NewReader(stdin), &out, &errb)
	return out.String(), errb.String(), code
}

// writeTX writes a t,x CSV of n rows at step dt with a sine signal and returns its path and bytes.
func writeTX(t *testing.T, dir string, n int, dt float64) (string, []byte) {
	t.Helper()
	var b bytes.Buffer
	b.WriteString("t,x\n")
	for i := 0; i < n; i++ {
		ti := float64(i) * dt
		b.WriteString(strconv.FormatFloat(ti, 'f', 2, 64))
		b.WriteByte(',')
		b.WriteString(strconv.FormatFloat(math.Sin(2*math.Pi*ti/1.3)+0.1*math.Sin(float64(i)), 'g', 8, 64))
		b.WriteByte('\n')
	}
	p := filepath.Join(dir, "tx.csv")
	if err := os.WriteFile(p, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return p, b.Bytes()
}

func decode(t *testing.T, s string) map[string]any {
	t.Helper()
	var m map[string]any
	if err := json.Unmarshal([]byte(s), &m); err != nil {
		t.Fatalf("output is not one JSON object: %v\n%s", err, s)
	}
	return m
}

// TestInspectAcceptance is issue 2's acceptance check: 30,000 rows at Dt 0.02 through a file,
// standard input and a .gz file.
func TestInspectAcceptance(t *testing.T) {
	dir := t.TempDir()
	p, raw := writeTX(t, dir, 30000, 0.02)
	var gz bytes.Buffer
	zw := gzip.NewWriter(&gz)
	zw.Write(raw)
	zw.Close()
	pgz := filepath.Join(dir, "tx.csv.gz")
	if err := os.WriteFile(pgz, gz.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name, stdin string
		args        []string
	}{
		{"file", "", []string{"inspect", "--json", p}},
		{"stdin", string(raw), []string{"inspect", "--json", "-"}},
		{"gzip", "", []string{"inspect", "--json", pgz}},
	} {
		out, errs, code := runCLI(t, c.stdin, c.args...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", c.name, code, errs)
		}
		m := decode(t, out)
		in := m["input"].(map[string]any)
		if in["samples"].(float64) != 30000 {
			t.Errorf("%s: samples %v, want 30000", c.name, in["samples"])
		}
		if dt := in["dt"].(float64); math.Abs(dt-0.02) > 1e-12 {
			t.Errorf("%s: dt %v, want 0.02", c.name, dt)
		}
		if m["command"] != "inspect" || m["version"] == nil || m["parameters"] == nil {
			t.Errorf("%s: envelope keys missing: %v", c.name, m)
		}
		for _, k := range []string{"mean", "std", "min", "max", "quantization", "dominant_period", "gaps_filled", "stationarity", "cautions"} {
			if _, ok := m[k]; !ok {
				t.Errorf("%s: key %q missing", c.name, k)
			}
		}
		// dominant period of the sine: 1.3 time units (construction), within one bin.
		if dp := m["dominant_period"].(float64); math.Abs(dp-1.3) > 0.01 {
			t.Errorf("%s: dominant period %v, want 1.3", c.name, dp)
		}
	}
}

// TestInspectRDatasets uses R's datasets (testdata/r, written by R's write.csv): co2 has a trend
// and a yearly cycle, nottem a yearly cycle (R documentation of the datasets; facts of the data).
func TestInspectRDatasets(t *testing.T) {
	out, errs, code := runCLI(t, "", "inspect", "--json", "../../testdata/r/co2.csv")
	if code != 0 {
		t.Fatalf("co2: exit %d: %s", code, errs)
	}
	m := decode(t, out)
	if st := m["stationarity"].(map[string]any); st["stationary"].(bool) {
		t.Errorf("co2: the stationarity caution did not fire: %v", st)
	}
	if in := m["input"].(map[string]any); in["samples"].(float64) != 468 || math.Abs(in["dt"].(float64)-1.0/12) > 1e-9 {
		t.Errorf("co2: input %v, want 468 samples at 1/12 year", in)
	}
	out, errs, code = runCLI(t, "", "inspect", "--json", "--detrend", "linear", "../../testdata/r/co2.csv")
	if code != 0 {
		t.Fatalf("co2 detrended: exit %d: %s", code, errs)
	}
	if dp := decode(t, out)["dominant_period"].(float64); math.Abs(dp-1) > 0.02 {
		t.Errorf("co2 detrended: dominant period %v years, want 1", dp)
	}
	out, errs, code = runCLI(t, "", "inspect", "--json", "../../testdata/r/nottem.csv")
	if code != 0 {
		t.Fatalf("nottem: exit %d: %s", code, errs)
	}
	m = decode(t, out)
	if dp := m["dominant_period"].(float64); math.Abs(dp-1) > 0.02 {
		t.Errorf("nottem: dominant period %v years, want 1", dp)
	}
	if m["parameters"].(map[string]any)["column"] != "nottem" {
		t.Errorf("nottem: default column %v, want nottem", m["parameters"])
	}
}

// TestExitStatuses checks the exit-status contract of DESIGN.md §3.
func TestExitStatuses(t *testing.T) {
	dir := t.TempDir()
	constant := filepath.Join(dir, "const.csv")
	os.WriteFile(constant, []byte("x\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n"), 0o644)
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("t,x\n0,1\n1,2\n2,abc\n3,4\n"), 0o644)
	empty := filepath.Join(dir, "empty.csv")
	os.WriteFile(empty, nil, 0o644)
	cases := []struct {
		name string
		args []string
		code int
		msg  string
	}{
		{"no args", []string{"inspect"}, 2, "expected one input file"},
		{"unknown flag", []string{"inspect", "--bogus", constant}, 2, "unknown flag"},
		{"unknown command", []string{"frobnicate"}, 2, "unknown command"},
		{"missing file", []string{"inspect", filepath.Join(dir, "nope.csv")}, 2, "nope.csv"},
		{"non-numeric cell", []string{"inspect", bad}, 2, "bad.csv:4:"},
		{"empty file", []string{"inspect", empty}, 2, "empty.csv"},
		{"unknown column", []string{"inspect", "--column", "y", bad}, 2, "y"},
	}
	for _, c := range cases {
		_, errs, code := runCLI(t, "", c.args...)
		if code != c.code || !strings.Contains(errs, c.msg) {
			t.Errorf("%s: exit %d (want %d), stderr %q (want it to contain %q)", c.name, code, c.code, errs, c.msg)
		}
	}
	out, _, code := runCLI(t, "", "--version")
	if code != 0 || !strings.Contains(out, version) {
		t.Errorf("--version: exit %d, %q", code, out)
	}
}
