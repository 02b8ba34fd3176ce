package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestReportDegenerate: degenerate and extreme records (issue 13) give exit status 0 or 1,
// never 2 or 3; result.json is valid JSON; every stage without an answer says why, in
// result.json and on the page. Records of extreme magnitude run scaled (analysis.Unscale) and
// are not called constant.
func TestReportDegenerate(t *testing.T) {
	fill := func(n int, f func(i int) float64) []float64 {
		x := make([]float64, n)
		for i := range x {
			x[i] = f(i)
		}
		return x
	}
	cases := map[string][]float64{
		"ten-equal":   fill(10, func(int) float64 { return 3 }),
		"neg-zero":    fill(200, func(int) float64 { return math.Copysign(0, -1) }),
		"denormal":    fill(500, func(i int) float64 { return 1e-310 * float64(i%3) }),
		"sine":        fill(1000, func(i int) float64 { return math.Sin(2 * math.Pi * float64(i) / 50) }),
		"square":      fill(1000, func(i int) float64 { return float64(1 - 2*(i/10%2)) }),
		"three-level": fill(1000, func(i int) float64 { return float64(i % 3) }),
		"two":         {1, 2},
		"huge":        fill(1000, func(i int) float64 { return 1.5e308 * math.Sin(0.7*float64(i)) }),
		"tiny":        fill(1000, func(i int) float64 { return 1e-300*math.Sin(0.7*float64(i)) + 1e-301*math.Sin(0.13*float64(i*i)) }),
	}
	dir := t.TempDir()
	for name, x := range cases {
		var b strings.Builder
		b.WriteString("x\n")
		for _, v := range x {
			b.WriteString(strconv.FormatFloat(v, 'g', -1, 64) + "\n")
		}
		in := filepath.Join(dir, name+".csv")
		if err := os.WriteFile(in, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		out := filepath.Join(dir, "r-"+name)
		_, errOut, code := runCLI(t, "", "report", "-q", "--threads", "1", "-o", out, in)
		if code != exitOK && code != exitNoAnswer {
			t.Errorf("%s: exit %d, want 0 or 1: %s", name, code, errOut)
			continue
		}
		raw, err := os.ReadFile(filepath.Join(out, "result.json"))
		if err != nil || !json.Valid(raw) {
			t.Errorf("%s: result.json missing or invalid: %v", name, err)
			continue
		}
		var res struct {
			Status     string `json:"status"`
			Provenance struct {
				Stages []struct {
					Key, Status, Error string
				} `json:"stages"`
			} `json:"provenance"`
		}
		if err := json.Unmarshal(raw, &res); err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if len(res.Provenance.Stages) < 9 {
			t.Errorf("%s: %d stages recorded", name, len(res.Provenance.Stages))
		}
		page, _ := os.ReadFile(filepath.Join(out, "report.html"))
		for _, st := range res.Provenance.Stages {
			if st.Status != "ok" && strings.TrimSpace(st.Error) == "" {
				t.Errorf("%s: stage %s has no answer and no reason", name, st.Key)
			}
			if st.Status == "error" && strings.Contains(st.Error, "record is constant") && name != "ten-equal" && name != "neg-zero" {
				t.Errorf("%s: stage %s calls a varying record constant: %s", name, st.Key, st.Error)
			}
		}
		if (code == exitNoAnswer) != (res.Status != "ok") {
			t.Errorf("%s: exit %d with status %q", name, code, res.Status)
		}
		if len(page) == 0 {
			t.Errorf("%s: no page", name)
		}
	}
}
