package figure

import (
	"bytes"
	"strings"
	"testing"

	"gonum.org/v1/plot"

	"unfold/embed"
	"unfold/models"
)

// lorenzX is n samples of x of the Lorenz (1963) flow at the model's defaults, sampled every dt.
func lorenzX(t *testing.T, n int, dt float64) []float64 {
	t.Helper()
	spec, err := models.Lookup("lorenz")
	if err != nil {
		t.Fatal(err)
	}
	opt := spec.DefaultOptions()
	opt.N, opt.Dt = n, dt
	tr, err := spec.Simulate(nil, opt)
	if err != nil {
		t.Fatal(err)
	}
	return tr.Data[0]
}

// drawAll writes rows as SVG and PNG at their SizeFor canvas and checks the SVG (checkSVG).
func drawAll(t *testing.T, name string, rows [][]*plot.Plot) []byte {
	t.Helper()
	w, h := SizeFor(rows)
	var svg bytes.Buffer
	if err := Write(&svg, "svg", w, h, rows); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	checkSVG(t, name, svg.Bytes())
	if err := Write(&bytes.Buffer{}, "png", w, h, rows); err != nil {
		t.Fatalf("%s: PNG: %v", name, err)
	}
	return svg.Bytes()
}

// TestEmbeddingFigures draws the lag, dimension, state-space (points and the 30000-vector
// density image) and space–time separation figures, and checks titles, units and the square
// delay plot.
func TestEmbeddingFigures(t *testing.T) {
	x := lorenzX(t, 30000, 0.01)
	f := Record{Title: "lorenz.csv", Signal: "x", Unit: "V", Dt: 0.01, TimeUnit: "s"}
	lc, err := embed.ChooseLag(x, embed.LagOptions{MaxLag: 40})
	if err != nil {
		t.Fatal(err)
	}
	dc, err := embed.ChooseDimension(x[:4000], embed.DimOptions{Lag: lc.Lag, MaxDim: 5, Theiler: 30, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	e := embed.Embedding{X: x, Lag: lc.Lag, Dim: 3}
	st, err := embed.SpaceTimeSeparation(embed.Embedding{X: x[:5000], Lag: lc.Lag, Dim: 3}, embed.STPOptions{MaxDt: 100})
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
	dense, err := StateSpacePlots(e, f, StateSpaceOptions{Azimuth: -45, Elevation: 30})
	if err != nil {
		t.Fatal(err)
	}
	if len(dense[0]) != 2 {
		t.Errorf("m = 3 gives %d panels, want the delay plot and the 3-D view", len(dense[0]))
	}
	points, err := StateSpacePlots(embed.Embedding{X: x[:2000], Lag: lc.Lag, Dim: 2}, f, StateSpaceOptions{})
	if err != nil {
		t.Fatal(err)
	}
	stp, err := STPPlot(st, e, 30, f)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(lagRows[0][0].Title.Text, "lorenz.csv") || !strings.Contains(dense[0][0].Y.Label.Text, "[V]") {
		t.Errorf("title %q / label %q lack the file name or the unit", lagRows[0][0].Title.Text, dense[0][0].Y.Label.Text)
	}
	for _, p := range append(dense[0], points[0]...) {
		if !isSquare(p) {
			t.Errorf("%q: x range [%g, %g], y range [%g, %g]: want the same range on both axes", p.Title.Text, p.X.Min, p.X.Max, p.Y.Min, p.Y.Max)
		}
	}
	for name, rows := range map[string][][]*plot.Plot{"lag": lagRows, "dim": dimRows, "state": dense, "points": points, "stp": {{stp}}} {
		drawAll(t, name, rows)
	}
}
