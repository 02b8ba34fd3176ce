package report

import (
	"bytes"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"unfold/figure"
)

// TestSweepFiguresStyle checks the sweep page's figures in the project's style: every text at
// figure.MinTextSize or more in a sans-serif face, a viewBox on every figure, and none of the
// default colour cycle of a widely used plotting library (issue 15).
func TestSweepFiguresStyle(t *testing.T) {
	rows := logisticRows()
	for i := range rows {
		rows[i].EntropyRate, rows[i].Complexity = 0.1*float64(i%7), 0.2*float64(i%5)
		rows[i].Points = []float64{0.2, 0.5 + 0.01*float64(i)}
		rows[i].D2, rows[i].D2Lo, rows[i].D2Hi = 1+0.01*float64(i), 0.9, 1.2+0.01*float64(i)
		rows[i].Frequencies = []float64{0.125, 0.25}
	}
	var b bytes.Buffer
	if err := writeSweepPage(&b, "r", nil, rows, SweepPageOptions{}); err != nil {
		t.Fatal(err)
	}
	page := b.String()
	svgs := regexp.MustCompile(`(?s)<svg.*?</svg>`).FindAllString(page, -1)
	if len(svgs) != 5 {
		t.Fatalf("%d figures on the page, want 5", len(svgs))
	}
	size := regexp.MustCompile(`font-size:([0-9.]+)px`)
	cycle := []string{"#1f77b4", "#ff7f0e", "#2ca02c", "#d62728", "#9467bd", "#8c564b", "#e377c2", "#7f7f7f", "#bcbd22", "#17becf"}
	for i, s := range svgs {
		if !strings.Contains(s, "viewBox") {
			t.Errorf("figure %d: no viewBox", i)
		}
		sizes := size.FindAllStringSubmatch(s, -1)
		if len(sizes) == 0 {
			t.Errorf("figure %d: no text", i)
		}
		for _, m := range sizes {
			if v, _ := strconv.ParseFloat(m[1], 64); v < figure.MinTextSize.Points()-1e-9 || math.IsNaN(v) {
				t.Errorf("figure %d: text at %s px, want at least %g", i, m[1], figure.MinTextSize.Points())
			}
		}
		low := strings.ToLower(s)
		for _, c := range cycle {
			if strings.Contains(low, c) {
				t.Errorf("figure %d: default-cycle colour %s", i, c)
			}
		}
	}
	for _, c := range cycle {
		if strings.Contains(strings.ToLower(page), c) {
			t.Errorf("page: default-cycle colour %s (the key)", c)
		}
	}
}
