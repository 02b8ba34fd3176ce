package main

import (
	"encoding/json"
	"fmt"
	"strconv"

	"gonum.org/v1/plot/vg"

	"unfold/analysis"
	"unfold/report"
)

// regimeStage renders the chain's "regime" stage: the verdict, the evidence table (λ1 from the
// lyapunov stage, D2 from the fractal stage), the cautions and the evidence figure (spectrum
// with its lines, surrogate tests).
func regimeStage(res *analysis.Result, title string) report.Stage {
	return report.Stage{Key: "regime", Title: "Regime: verdict and evidence", Run: func() (*report.Section, error) {
		if res.Regime == nil {
			return nil, stageErr(res, "regime")
		}
		an, p, b := res.Regime.Analysis, res.Regime.Params, res.Regime.Body
		js, err := json.Marshal(res.Regime)
		if err != nil {
			return nil, err
		}
		rows, err := evidencePlots(an, title)
		if err != nil {
			return nil, fmt.Errorf("regime: figure: %w", err)
		}
		ev, v := an.Evidence, an.Verdict
		lyapFrom := "not used (the lyapunov stage gave none)"
		if p.LyapunovFrom != "" {
			lyapFrom = "from the lyapunov stage"
		}
		d2From := "not used (the fractal stage gave none)"
		if p.DimensionFrom != "" {
			d2From = "from the fractal stage"
		}
		sum := [][2]string{
			{"regime", v.Regime},
			{"confidence", strconv.FormatFloat(v.Confidence, 'f', 2, 64)},
			{"rule", v.Rule},
			{"embedding", fmt.Sprintf("lag %d (%s), dimension %d (%s), Theiler window %d samples; λ1 %s; D2 %s; %d IAAFT surrogates",
				ev.Lag, p.LagMethod, ev.Dim, p.DimMethod, ev.Theiler, lyapFrom, d2From, p.Surrogates)},
			{"evidence", "points to (weight): detail"},
		}
		sum = append(sum, evidenceRows(v)...)
		w := 11 * vg.Inch
		if len(rows[0]) < 3 {
			w = vg.Length(len(rows[0])) * 4 * vg.Inch
		}
		return &report.Section{JSON: js, Summary: sum, Cautions: b.Cautions, Figures: []report.Figure{{Name: "regime",
			Caption: "The evidence: the spectrum with its significant lines, and the data's nonlinear prediction error and time-reversal asymmetry (line) against the IAAFT surrogates' (points).",
			Width:   w, Height: 4 * vg.Inch, Rows: rows}}}, nil
	}}
}
