package main

import (
	"encoding/json"
	"fmt"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"unfold/analysis"
	"unfold/report"
)

// lyapunovStage renders the chain's "lyapunov" stage: the divergence curve with the fit range
// shaded.
func lyapunovStage(res *analysis.Result, title string) report.Stage {
	return report.Stage{Key: "lyapunov", Title: "Largest Lyapunov exponent: divergence curve", Run: func() (*report.Section, error) {
		noFit := stageErr(res, "lyapunov")
		if res.Lyapunov == nil {
			return nil, noFit
		}
		run, p, b := res.Lyapunov.Run, res.Lyapunov.Params, res.Lyapunov.Body
		js, err := json.Marshal(res.Lyapunov)
		if err != nil {
			return nil, err
		}
		pl, err := lyapunovFigure(run, title)
		if err != nil {
			return nil, err
		}
		r := run.R
		g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
		sum := [][2]string{
			{"embedding", fmt.Sprintf("lag %d samples (%s), dimension %d (%s), Theiler window %d samples (%s)",
				p.Lag, p.LagMethod, p.Dim, p.DimMethod, p.Theiler, p.TheilerFrom)},
			{"curve", fmt.Sprintf("%s, horizon %d steps (%s time units), %d reference points", p.Method, r.Horizon, g(float64(r.Horizon)*r.Dt), r.ReferencePoints)},
		}
		if b.LambdaMax != nil {
			sum = append(sum,
				[2]string{"λ_max", fmt.Sprintf("%s nats per time unit (%s bits; %s nats per sample)", g(r.Lambda), g(r.Lambda/ln2), g(r.LambdaPerSample))},
				[2]string{"interval", fmt.Sprintf("[%s, %s] nats per time unit (%.0f %%, block bootstrap, %d resamples)", g(r.Interval[0]), g(r.Interval[1]), 100*r.Level, r.Reps)},
				[2]string{"fit range", fmt.Sprintf("steps %d … %d (%s)", r.From, r.To, b.Fit.Criterion)})
		} else {
			sum = append(sum, [2]string{"λ_max", "no answer: " + b.Reason})
		}
		return &report.Section{JSON: js, Summary: sum, Cautions: b.Cautions, Figures: []report.Figure{{Name: "lyapunov",
			Caption: "Mean log separation of initially close delay vectors against the steps ahead; the fit range is shaded and λ_max is the slope there.",
			Width:   8 * vg.Inch, Height: 5.5 * vg.Inch, Rows: [][]*plot.Plot{{pl}}}}}, noFit
	}}
}
