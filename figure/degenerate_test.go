package figure

import (
	"bytes"
	"errors"
	"io"
	"math"
	"testing"

	"gonum.org/v1/plot"

	"unfold/embed"
	"unfold/fit"
	"unfold/lyapunov"
)

// draw2 writes rows as SVG (checked by checkSVG) when the figure function gave them; an error
// from the function is an acceptable answer, a panic is not (the test fails on a panic).
func draw2(t *testing.T, name string, rows [][]*plot.Plot, err error) {
	t.Helper()
	if err != nil {
		t.Logf("%s: %v (an error, not a figure)", name, err)
		return
	}
	w, h := SizeFor(rows)
	var svg bytes.Buffer
	if err := Write(&svg, "svg", w, h, rows); err != nil {
		t.Logf("%s: Write: %v (an error, not a figure)", name, err)
		return
	}
	checkSVG(t, name, svg.Bytes())
}

// TestDegenerateInputs feeds every figure function all-equal values, a single point, zeros on a
// log axis, NaN and infinite values and empty inputs: each gives a valid figure or an error.
func TestDegenerateInputs(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	signals := map[string][]float64{
		"constant": {3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3},
		"zeros":    make([]float64, 64),
		"single":   {1.5},
		"nan":      {1, nan, 2, 3, nan, 1, 0, 2, 1, 3, 2, 1, 0, 2, 1, 3, 2, 1, 0, 2},
		"all-nan":  {nan, nan, nan},
		"inf":      {1, inf, -inf, 2},
		"empty":    {},
	}
	rec := Record{Title: "t.csv"}
	for name, x := range signals {
		rows, err := SignalPlots("x", "", "", x, 0, 1500)
		draw2(t, "signal/"+name, rows, err)

		e := embed.Embedding{X: x, Lag: 1, Dim: 3}
		if len(x) >= 3 {
			rows, err = StateSpacePlots(e, rec, StateSpaceOptions{})
			draw2(t, "state/"+name, rows, err)
			rows, err = StateSpacePlots(e, rec, StateSpaceOptions{DensityAbove: 1, Bins: 4})
			draw2(t, "state-dense/"+name, rows, err)
		}

		mi := &embed.MICurve{Nats: x, Err: x, Bins: 4}
		lc := &embed.LagChoice{Lag: 1, MI: mi, ACF: &embed.Autocorrelation{R: x}}
		rows, err = LagPlots(lc, rec)
		draw2(t, "lag/"+name, rows, err)

		dc := &embed.DimChoice{MaxDim: len(x)}
		for i, v := range x {
			dc.FNN = append(dc.FNN, embed.FNNPoint{Dim: i + 1, Fraction: v})
			dc.Cao = append(dc.Cao, embed.CaoPoint{Dim: i + 1, E1: v, E2: v})
		}
		rows, err = DimPlots(dc, rec)
		draw2(t, "dim/"+name, rows, err)

		st := &embed.STP{Dt: make([]int, len(x)), Fractions: []float64{0.5}, Dist: [][]float64{x}}
		p, err := STPPlot(st, e, 2, rec)
		draw2(t, "stp/"+name, [][]*plot.Plot{{p}}, err)

		for _, fitErr := range []error{nil, fit.ErrNoRange} {
			r := &lyapunov.Result{Method: lyapunov.Kantz, Horizon: len(x), Dt: 0.01, To: len(x),
				Curves: []lyapunov.Curve{{Eps: 1, MeanLog: x, References: 1, FitErr: fitErr}}}
			p, err = DivergencePlot(r, "t", "s")
			draw2(t, "divergence/"+name, [][]*plot.Plot{{p}}, err)
		}
	}
	if _, err := LagPlots(nil, rec); err == nil {
		t.Error("LagPlots(nil): want an error")
	}
	if _, err := DimPlots(&embed.DimChoice{}, rec); err == nil {
		t.Error("DimPlots without curves: want an error")
	}
	if _, err := DivergencePlot(&lyapunov.Result{Chosen: 3, Curves: []lyapunov.Curve{{MeanLog: []float64{1}}}}, "t", ""); err == nil {
		t.Error("DivergencePlot with the chosen curve out of range: want an error")
	}
	if _, err := StateSpacePlots(embed.Embedding{X: []float64{1}, Lag: 1, Dim: 3}, rec, StateSpaceOptions{}); err == nil {
		t.Error("StateSpacePlots on one sample: want an error")
	}
}

// TestWriteLogAxisZeros checks that a non-positive value forced onto a log axis gives an error
// from Write (gonum/plot panics on it), not a panic.
func TestWriteLogAxisZeros(t *testing.T) {
	p := New("zeros on a log axis", "x", "y")
	p.Y.Scale = plot.LogScale{}
	p.Y.Min, p.Y.Max = 0, 10
	err := Write(io.Discard, "svg", Width, Height, [][]*plot.Plot{{p}})
	if err == nil {
		t.Fatal("want an error")
	}
	if errors.Is(err, io.EOF) {
		t.Fatal(err)
	}
	// The plot is handed back as it was given.
	if p.Y.Min != 0 || p.Y.Max != 10 {
		t.Errorf("range [%g, %g] after Write, want [0, 10]", p.Y.Min, p.Y.Max)
	}
	// A nil panel leaves its tile empty.
	q := New("one", "x", "y")
	if err := Write(io.Discard, "svg", Width, Height, [][]*plot.Plot{{q, nil}}); err != nil {
		t.Errorf("a nil panel: %v", err)
	}
}
