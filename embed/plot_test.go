package embed

import (
	"bytes"
	"image/png"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// TestFigures draws every figure to PNG and SVG and checks that the output decodes and has
// the size asked for (110 dpi); the 30000-vector cloud goes through the density-image branch.
func TestFigures(t *testing.T) {
	x := lorenzX(30000, 0.01)
	f := Figure{Title: "lorenz.csv", Signal: "x", Unit: "V", Dt: 0.01, TimeUnit: "s"}
	lc, err := ChooseLag(x, LagOptions{MaxLag: 40})
	if err != nil {
		t.Fatal(err)
	}
	dc, err := ChooseDimension(x[:5000], DimOptions{Lag: lc.Lag, MaxDim: 5, Theiler: 30, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	e := Embedding{X: x, Lag: lc.Lag, Dim: 3}
	st, err := SpaceTimeSeparation(e, STPOptions{MaxDt: 100})
	if err != nil {
		t.Fatal(err)
	}
	lagRows, err := LagPlots(lc, f)
	if err != nil {
		t.Fatal(err)
	}
	dimRows, err := DimPlots(dc, f)
	if err != nil {
		t.Fatal(err)
	}
	ssRows, err := StateSpacePlots(e, f, StateSpaceOptions{Azimuth: -45, Elevation: 30})
	if err != nil {
		t.Fatal(err)
	}
	if len(ssRows[0]) != 2 {
		t.Errorf("m = 3 gives %d panels, want the delay plot and the 3-D view", len(ssRows[0]))
	}
	stp, err := STPPlot(st, e, 30, f)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(lagRows[0][0].Title.Text, "lorenz.csv") || !strings.Contains(ssRows[0][0].Y.Label.Text, "[V]") {
		t.Errorf("title %q / label %q lack the file name or the unit", lagRows[0][0].Title.Text, ssRows[0][0].Y.Label.Text)
	}
	for name, rows := range map[string][][]*plot.Plot{"lag": lagRows, "dim": dimRows, "state": ssRows, "stp": {{stp}}} {
		var buf bytes.Buffer
		if err := WriteFigure(&buf, "png", 8*vg.Inch, 6*vg.Inch, rows); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		img, err := png.Decode(&buf)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if b := img.Bounds(); b.Dx() != 880 || b.Dy() != 660 {
			t.Errorf("%s: %v, want 880×660 (8×6 in at 110 dpi)", name, b)
		}
		var svg bytes.Buffer
		if err := WriteFigure(&svg, "svg", 8*vg.Inch, 6*vg.Inch, rows); err != nil || !bytes.Contains(svg.Bytes(), []byte("<svg")) {
			t.Errorf("%s: SVG output: %v", name, err)
		}
	}
	if err := WriteFigure(&bytes.Buffer{}, "gif", vg.Inch, vg.Inch, lagRows); err == nil {
		t.Error("gif: want an error")
	}
}

// TestWriteFigureRefusesWhatItCannotDraw: an axis spanning more than a float64 (values near
// ±1.5e308) and a log axis without positive data are errors, not a hang or a panic.
func TestWriteFigureRefusesWhatItCannotDraw(t *testing.T) {
	huge := plot.New()
	l, err := plotter.NewLine(plotter.XYs{{X: 0, Y: -1.5e308}, {X: 1, Y: 1.5e308}})
	if err != nil {
		t.Fatal(err)
	}
	huge.Add(l)
	logEmpty := plot.New()
	logEmpty.Y.Scale = plot.LogScale{}
	logEmpty.Y.Tick.Marker = plot.LogTicks{}
	for name, p := range map[string]*plot.Plot{"huge": huge, "empty log axis": logEmpty} {
		var b bytes.Buffer
		if err := WriteFigure(&b, "svg", 4*vg.Inch, 3*vg.Inch, [][]*plot.Plot{{p}}); err == nil || !strings.HasPrefix(err.Error(), "figure: ") {
			t.Errorf("%s: error %v", name, err)
		}
	}
}
