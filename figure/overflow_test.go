package figure

import (
	"bytes"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// TestWriteRefusesWhatItCannotDraw: an axis spanning more than a float64 (values near
// ±1.5e308) is an error, not a hang or a panic; a log axis without positive data draws or is
// an error, never a panic.
func TestWriteRefusesWhatItCannotDraw(t *testing.T) {
	huge := plot.New()
	l, err := plotter.NewLine(plotter.XYs{{X: 0, Y: -1.5e308}, {X: 1, Y: 1.5e308}})
	if err != nil {
		t.Fatal(err)
	}
	huge.Add(l)
	logEmpty := plot.New()
	logEmpty.Y.Scale = plot.LogScale{}
	logEmpty.Y.Tick.Marker = plot.LogTicks{}
	var b bytes.Buffer
	if err := Write(&b, "svg", 4*vg.Inch, 3*vg.Inch, [][]*plot.Plot{{huge}}); err == nil || !strings.HasPrefix(err.Error(), "figure: ") {
		t.Errorf("huge: error %v", err)
	}
	b.Reset()
	if err := Write(&b, "svg", 4*vg.Inch, 3*vg.Inch, [][]*plot.Plot{{logEmpty}}); err != nil && !strings.HasPrefix(err.Error(), "figure: ") {
		t.Errorf("empty log axis: error %v", err)
	}
}
