package report

import (
	"unfold/figure"
)

// SignalFigure is the record (at most maxShown samples from its start) above its Welch power
// spectrum, drawn by figure.SignalPlots at the project's standard size.
func SignalFigure(name, signal, unit, timeUnit string, x []float64, dt float64, maxShown int) (Figure, error) {
	rows, err := figure.SignalPlots(signal, unit, timeUnit, x, dt, maxShown)
	if err != nil {
		return Figure{}, err
	}
	w, h := figure.SizeFor(rows)
	return Figure{Name: name, Caption: "The record as read (after any preprocessing) and its power spectrum.",
		Width: w, Height: h, Rows: rows}, nil
}
