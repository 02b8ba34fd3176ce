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
// figure.MinTextSize or more in a sans-serif face, a viewBox on every figure, and every colour
// on the page of the project's style (figure.InStyle: the palette, a neutral grey or a light
// tint; issue 15: the palette is our own).
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
	}
	palette := map[[3]uint64]bool{}
	for _, c := range figure.Colors() {
		r, g, b, _ := c.RGBA()
		palette[[3]uint64{uint64(r >> 8), uint64(g >> 8), uint64(b >> 8)}] = true
	}
	for _, h := range regexp.MustCompile(`#[0-9a-fA-F]{6}\b`).FindAllString(page, -1) {
		v, _ := strconv.ParseUint(h[1:], 16, 32)
		c := [3]uint64{v >> 16 & 0xff, v >> 8 & 0xff, v & 0xff}
		grey := c[0] == c[1] && c[1] == c[2]
		tint := c[0] >= 0xd0 && c[1] >= 0xd0 && c[2] >= 0xd0 // bands and backgrounds
		if !grey && !tint && !palette[c] {
			t.Errorf("page: colour %s is not of the project's palette", h)
		}
	}
}
