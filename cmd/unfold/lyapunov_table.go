package main

import (
	"fmt"
	"math"
	"strconv"

	"unfold/analysis"
	"unfold/lyapunov"
)

// lyapunovTable prints the human summary.
func (a *app) lyapunovTable(r *lyapunov.Result, sp *lyapunov.SpectrumResult, res analysis.LyapunovResult, lagMethod, dimMethod, theilerFrom string) error {
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
	rows := [][]string{
		{"embedding", fmt.Sprintf("lag %d samples (%s), dimension %d (%s), Theiler window %d samples (%s), %s norm",
			r.Lag, lagMethod, r.Dim, dimMethod, r.Theiler, theilerFrom, r.Norm)},
		{"curve", fmt.Sprintf("%s, horizon %d steps (%s time units), %d reference points", r.Method, r.Horizon, g(float64(r.Horizon)*r.Dt), r.ReferencePoints)},
		{"reference points", res.Sampling},
	}
	if r.Method == lyapunov.Kantz {
		ch := r.Curves[r.Chosen]
		line := fmt.Sprintf("chosen ε = %s (median slope);", g(ch.Eps))
		for e, c := range r.Curves {
			sl := "no range"
			if !math.IsNaN(r.EpsSlopes[e]) {
				sl = g(r.EpsSlopes[e]/r.Dt) + "/time"
			}
			line += fmt.Sprintf(" ε %s: %s;", g(c.Eps), sl)
		}
		rows = append(rows, []string{"eps", line})
	}
	if res.LambdaMax != nil {
		rows = append(rows,
			[]string{"lambda_max", fmt.Sprintf("%s nats per time unit = %s bits per time unit", g(r.Lambda), g(r.Lambda/ln2))},
			[]string{"per sample", fmt.Sprintf("%s nats per step (dt = %s)", g(r.LambdaPerSample), g(r.Dt))},
			[]string{"interval", fmt.Sprintf("[%s, %s] nats per time unit (%.0f%%, block bootstrap over reference points, %d resamples)",
				g(r.Interval[0]), g(r.Interval[1]), 100*r.Level, r.Bootstrap.Reps)},
			[]string{"fit range", fmt.Sprintf("steps %d … %d (%s)", r.From, r.To, res.Fit.Criterion)})
	}
	if sp != nil {
		line := ""
		for k, v := range sp.Exponents {
			if k > 0 {
				line += ", "
			}
			line += g(v)
		}
		rows = append(rows,
			[]string{"spectrum", line + " nats per time unit (" + strconv.Itoa(sp.Steps) + " local maps)"},
			[]string{"Kaplan–Yorke", g(sp.KaplanYorke)})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	if sp != nil {
		fmt.Fprintf(a.stdout, "note: %s\n", sp.Note)
	}
	for _, c := range res.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}
