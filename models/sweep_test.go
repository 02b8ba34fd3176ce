package models

import (
	"strings"
	"testing"
)

func TestParseGridRange(t *testing.T) {
	// 3.5 … 4 in steps of 0.02: (4 − 3.5)/0.02 + 1 = 26 values (arithmetic), ends exact.
	g, err := ParseGrid("3.5:4:0.02")
	if err != nil {
		t.Fatal(err)
	}
	if len(g) != 26 || g[0] != 3.5 || g[25] != 4 {
		t.Fatalf("3.5:4:0.02: %d values from %v to %v, want 26 from 3.5 to 4", len(g), g[0], g[len(g)-1])
	}
	if g[13] != 3.76 || g[1] != 3.52 {
		t.Errorf("grid points not the written decimals: g[1] = %v, g[13] = %v", g[1], g[13])
	}
	// A stop that is not on the grid is not passed: 0:1:0.3 → 0, 0.3, 0.6, 0.9 (arithmetic).
	g, err = ParseGrid("0:1:0.3")
	if err != nil || len(g) != 4 || g[3] != 0.9 {
		t.Errorf("0:1:0.3 = %v, %v; want [0 0.3 0.6 0.9]", g, err)
	}
	// Descending.
	g, err = ParseGrid("6:5:-0.5")
	if err != nil || len(g) != 3 || g[2] != 5 {
		t.Errorf("6:5:-0.5 = %v, %v; want [6 5.5 5]", g, err)
	}
}

func TestParseGridList(t *testing.T) {
	g, err := ParseGrid("3.5, 3.835,4")
	if err != nil || len(g) != 3 || g[1] != 3.835 {
		t.Fatalf("list: %v, %v", g, err)
	}
	if d := GridDecimals(g); d != 3 {
		t.Errorf("GridDecimals = %d, want 3", d)
	}
	for _, bad := range []string{"", "1:2", "1:2:0", "2:1:0.1", "1,x", "1,1", "1:1e9:1e-9", "NaN"} {
		if _, err := ParseGrid(bad); err == nil {
			t.Errorf("ParseGrid(%q) accepted", bad)
		}
	}
}

func TestSweepValues(t *testing.T) {
	lg, _ := Lookup("logistic")
	p, err := lg.ParseSweepParam("r")
	if err != nil {
		t.Fatal(err)
	}
	vs, err := lg.SweepValues(nil, p, []float64{3.5, 4})
	if err != nil || len(vs) != 2 || vs[1]["r"][0] != 4 {
		t.Fatalf("logistic r sweep: %v, %v", vs, err)
	}
	if _, err := lg.ParseSweepParam("q"); err == nil || !strings.Contains(err.Error(), "its parameters: r") {
		t.Errorf("unknown parameter: %v", err)
	}
	ro, _ := Lookup("rossler")
	p, _ = ro.ParseSweepParam("c")
	vs, err = ro.SweepValues(Values{"a": {0.1}}, p, []float64{2.5, 5.7})
	if err != nil || vs[0]["c"][0] != 2.5 || vs[1]["a"][0] != 0.1 || vs[1]["b"][0] != 0.2 {
		t.Errorf("rossler c sweep: %v, %v", vs, err)
	}
	si, _ := Lookup("sines")
	if _, err := si.ParseSweepParam("amplitudes"); err == nil {
		t.Error("a list parameter without an element was accepted")
	}
	p, err = si.ParseSweepParam("amplitudes[2]")
	if err != nil || p.Label() != "amplitudes_2" {
		t.Fatalf("amplitudes[2]: %v %v", p, err)
	}
	vs, err = si.SweepValues(nil, p, []float64{0.25, 0.5})
	if err != nil {
		t.Fatal(err)
	}
	if a := vs[0]["amplitudes"]; len(a) != 2 || a[0] != 1 || a[1] != 0.25 {
		t.Errorf("amplitudes at 0.25 = %v, want [1 0.25]", a)
	}
	// An element beyond the tones is refused by the model (3 amplitudes for 2 ratios).
	p, _ = si.ParseSweepParam("amplitudes[3]")
	if _, err := si.SweepValues(nil, p, []float64{0.5}); err == nil {
		t.Error("amplitudes[3] of two tones accepted")
	}
}
