package report

import (
	"bytes"
	"encoding/xml"
	"math"
	"strings"
	"testing"
	"unfold/figure"
)

// TestSignalFigureDegenerate: the signal figure of degenerate records draws (it used to panic
// on the log axis of an empty spectrum, and to hang labelling an axis near ±1.5e308) and is
// valid XML.
func TestSignalFigureDegenerate(t *testing.T) {
	negZero := math.Copysign(0, -1)
	fill := func(n int, f func(i int) float64) []float64 {
		x := make([]float64, n)
		for i := range x {
			x[i] = f(i)
		}
		return x
	}
	cases := map[string]struct {
		x        []float64
		spectrum bool // a spectrum is drawn
	}{
		"ten equal":          {fill(10, func(int) float64 { return 3 }), false},
		"all -0":             {fill(200, func(int) float64 { return negZero }), false},
		"constant 500":       {fill(500, func(int) float64 { return 7 }), false},
		"denormal with zero": {fill(500, func(i int) float64 { return 1e-310 * float64(i%3) }), true},
		"near max float":     {fill(1000, func(i int) float64 { return 1.5e308 * math.Sin(0.7*float64(i)) }), true},
		"two samples":        {[]float64{1, 2}, false},
		"one sample":         {[]float64{1}, false},
		"square wave":        {fill(2000, func(i int) float64 { return float64(1 - 2*(i/10%2)) }), true},
	}
	for name, c := range cases {
		f, err := SignalFigure("signal", "x", "V", "s", c.x, 0.01, 200)
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		var b bytes.Buffer
		if err := figure.Write(&b, "svg", f.Width, f.Height, f.Rows); err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if err := xml.Unmarshal(b.Bytes(), new(struct{})); err != nil {
			t.Errorf("%s: SVG is not XML: %v", name, err)
		}
		none := strings.Contains(f.Rows[1][0].Title.Text, "none")
		if none == c.spectrum {
			t.Errorf("%s: spectrum title %q", name, f.Rows[1][0].Title.Text)
		}
	}
}
