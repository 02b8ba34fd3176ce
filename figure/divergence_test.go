package figure

import (
	"strings"
	"testing"

	"gonum.org/v1/plot"

	"unfold/lyapunov"
)

// TestDivergenceAndSignalFigures draws the divergence curves of the Lorenz (1963) flow (Kantz's
// method, three radii) and the signal figure of the same record, and checks the SVG, the time
// unit in the labels and that the spectrum axis is a log axis with at most MaxLabels labels.
func TestDivergenceAndSignalFigures(t *testing.T) {
	x := lorenzX(t, 4000, 0.01)
	r, err := lyapunov.KantzExponent(x, lyapunov.Options{Lag: 10, Dim: 3, Theiler: 20, Horizon: 60, Dt: 0.01,
		Eps: []float64{0.5, 1, 2}, Reps: 20, Seed: 1, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	p, err := DivergencePlot(r, "lorenz.csv: divergence", "s")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(p.X.Label.Text, "0.01 s") {
		t.Errorf("x label %q lacks the step in seconds", p.X.Label.Text)
	}
	drawAll(t, "divergence", [][]*plot.Plot{{p}})

	rows, err := SignalPlots("x", "V", "s", x, 0.01, 1500)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(rows[0][0].Y.Label.Text, "[V]") || !strings.Contains(rows[1][0].X.Label.Text, "per s") {
		t.Errorf("labels %q, %q lack the units", rows[0][0].Y.Label.Text, rows[1][0].X.Label.Text)
	}
	sp := rows[1][0]
	if _, ok := sp.Y.Scale.(plot.LogScale); !ok {
		t.Fatal("the spectrum's power axis is not logarithmic")
	}
	if n := len(labelsOf(sp.Y.Tick.Marker.Ticks(sp.Y.Min, sp.Y.Max))); n > MaxLabels || n < 2 {
		t.Errorf("%d labels on the power axis [%g, %g], want 2…%d", n, sp.Y.Min, sp.Y.Max, MaxLabels)
	}
	drawAll(t, "signal", rows)
}
