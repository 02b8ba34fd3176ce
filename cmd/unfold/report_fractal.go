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

// fractalStage renders the chain's "fractal" stage: the local slopes of the correlation sums
// with the scaling range drawn thicker (also when no range was found: the curves say why).
func fractalStage(res *analysis.Result, title string) report.Stage {
	return report.Stage{Key: "fractal", Title: "Correlation dimension: local slopes of the correlation sums", Run: func() (*report.Section, error) {
		err := stageErr(res, "fractal")
		run := res.FractalCurves
		if run == nil {
			return nil, err
		}
		pl, ferr := fractalFigure(run, title)
		if ferr != nil {
			return nil, fmt.Errorf("fractal: figure: %w", ferr)
		}
		fig := []report.Figure{{Name: "fractal",
			Caption: "Local slopes d log C / d log r of the correlation sums against the radius, one curve per embedding dimension; the fitted scaling range is drawn thicker and D2 dashed.",
			Width:   8 * vg.Inch, Height: 5.5 * vg.Inch, Rows: [][]*plot.Plot{{pl}}}}
		if res.Fractal == nil {
			// no scaling range: no JSON object to show, but the curves say why
			return &report.Section{JSON: nil, Figures: fig, Cautions: run.Cautions}, err
		}
		p, b := res.Fractal.Params, res.Fractal.Body
		js, err := json.Marshal(res.Fractal)
		if err != nil {
			return nil, err
		}
		g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
		r := run.R
		perDim := ""
		for _, c := range r.Curves {
			if c.Fitted {
				if perDim != "" {
					perDim += ", "
				}
				perDim += fmt.Sprintf("m %d: %s", c.Dim, g(c.D2))
			}
		}
		return &report.Section{JSON: js, Cautions: b.Cautions, Figures: fig, Summary: [][2]string{
			{"D2", fmt.Sprintf("%s [%s, %s] (95 %% bootstrap) at m = %d, saturated %v", g(r.D2), g(r.Lo), g(r.Hi), r.Dim, r.Saturated)},
			{"scaling range", fmt.Sprintf("r = %s … %s signal units", g(r.RLo), g(r.RHi))},
			{"Takens estimate", g(r.Takens)},
			{"per dimension", perDim},
			{"lag, Theiler window", fmt.Sprintf("%d samples (%s), %d samples (%s); %s norm", p.Lag, p.LagMethod, p.Theiler, p.TheilerBy, p.Norm)},
		}}, nil
	}}
}
