package main

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// checkDemoSummary checks the summary of the demo report (run by TestReportDemoGolden): one
// λ1 and one D2 on the whole page and in result.json (the lyapunov and fractal stages'
// estimates, also in the regime evidence), the demo's units, the summary block before the
// first section and the table of contents, and the terminal output printing the summary once
// and no stage table (the stage times go to stderr).
func checkDemoSummary(t *testing.T, dir, stdout string) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, "result.json"))
	if err != nil {
		t.Fatal(err)
	}
	m := decode(t, string(b))
	same := func(a, b string) {
		t.Helper()
		x, ok1 := lookup(m, a).(float64)
		y, ok2 := lookup(m, b).(float64)
		if !ok1 || !ok2 || x != y {
			t.Errorf("result.json: %s = %v, %s = %v: want the same number (one estimate)", a, lookup(m, a), b, lookup(m, b))
		}
	}
	same("summary.lambda_max.value", "lyapunov.lambda_max")
	same("summary.lambda_max.value", "regime.evidence.lyapunov.value")
	same("summary.d2.value", "fractal.d2")
	same("summary.d2.value", "regime.evidence.correlation_dimension.value")
	same("summary.confidence", "regime.confidence")
	same("summary.lag", "embed.lag")
	same("summary.dim", "embed.dimension")
	if r, g := lookup(m, "summary.regime"), lookup(m, "regime.regime"); r != g || r == nil {
		t.Errorf("summary.regime %v, regime.regime %v", r, g)
	}
	// the demo's units (testdata/demo/README.md: seconds, microstrain)
	for _, p := range []string{"units", "summary.units", "lyapunov.units", "inspect.units"} {
		u, _ := lookup(m, p).(map[string]any)
		if u["time"] != "s" || u["signal"] != "µε" {
			t.Errorf("result.json %s = %v, want {time: s, signal: µε}", p, u)
		}
	}
	if u := lookup(m, "summary.lambda_max.unit"); u != "nats per second" {
		t.Errorf("summary.lambda_max.unit = %v, want nats per second", u)
	}

	page, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	p := string(page)
	sum, nav, first := strings.Index(p, `<section id="summary"`), strings.Index(p, `<nav id="contents"`), strings.Index(p, `<section id="inspect"`)
	if sum < 0 || nav < 0 || first < 0 || !(sum < nav && nav < first) {
		t.Errorf("page: summary at %d, contents at %d, first section at %d: want the summary first, then the contents", sum, nav, first)
	}
	block := p[max(sum, 0):max(nav, 0)]
	for _, want := range []string{"chaotic", "strong evidence", "nats per second", "(0.116 s)", "dimension 6", `href="#fig-embed"`, `href="#g-lyapunov"`,
		"support expert judgement", "licensed practice"} {
		if !strings.Contains(block, want) {
			t.Errorf("page: the summary block lacks %q", want)
		}
	}
	for _, key := range []string{"cao_e2", "zero_one", "prediction_error", "points to (weight)"} {
		if strings.Contains(p, key) {
			t.Errorf("page: shows the machine key %q (keys belong in result.json only)", key)
		}
	}
	for _, want := range []string{`id="g-theiler"`, `id="g-iaaft"`, `id="g-zero-one"`, `href="#g-zero-one"`, "not used: supporting evidence only", "better than any of 39"} {
		if !strings.Contains(p, want) {
			t.Errorf("page: lacks %q", want)
		}
	}

	if n := strings.Count(stdout, "verdict"); n != 1 || strings.Contains(stdout, "wall time") {
		t.Errorf("stdout: want the summary once and no stage table, got:\n%s", stdout)
	}
	if !strings.Contains(stdout, "chaotic — strong evidence (confidence 0.93)") {
		t.Errorf("stdout lacks the verdict line:\n%s", stdout)
	}
}

// TestUnitsFromHeaderAndFlags checks the "units" object of a command's JSON: from the header
// ("time (s)", "strain [µε]") and from --time-unit/--unit, which win over the header.
func TestUnitsFromHeaderAndFlags(t *testing.T) {
	var b strings.Builder
	b.WriteString("time (s),strain [µε]\n")
	for i := range 400 {
		x := float64(i%17) - 8 + 0.37*float64(i%5) // any varying values
		b.WriteString(strconv.FormatFloat(0.01*float64(i), 'f', 2, 64) + "," + fmtG(x) + "\n")
	}
	p := filepath.Join(t.TempDir(), "rec.csv")
	if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		args       []string
		time, unit string
	}{
		{nil, "s", "µε"},
		{[]string{"--time-unit", "milliseconds", "--unit", "V"}, "ms", "V"},
		{[]string{"--column", "strain"}, "s", "µε"},
	} {
		args := append([]string{"inspect", "--json"}, c.args...)
		out, stderr, code := runCLI(t, "", append(args, p)...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", c.args, code, stderr)
		}
		m := decode(t, out)
		u, _ := m["units"].(map[string]any)
		if u["time"] != c.time || u["signal"] != c.unit {
			t.Errorf("%v: units = %v, want time %q, signal %q", c.args, u, c.time, c.unit)
		}
		if pm, _ := m["parameters"].(map[string]any); pm != nil && pm["column"] != nil && pm["column"] != "strain" {
			t.Errorf("%v: parameters.column = %v, want the name without its unit", c.args, pm["column"])
		}
	}
}
