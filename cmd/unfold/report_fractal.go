package main

import (
	"fmt"
	"strconv"

	"github.com/spf13/pflag"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"unfold/report"
	"unfold/series"
)

// fractalStage is the report's "fractal" stage: `unfold fractal` with its defaults (dimensions
// 1 … 8, maximum norm, 40 radii) on the lag and Theiler window chosen upstream (st.lag,
// st.theiler); the local slopes of the correlation sums with the scaling range drawn thicker.
// D2 scans its own dimensions, so st.dim is not used here.
func (a *app) fractalStage(path string, s *series.Series, o *reportOptions, st *chainState,
	envelope func(command string, params, body any) ([]byte, error)) report.Stage {
	return report.Stage{Key: "fractal", Title: "Correlation dimension: local slopes of the correlation sums", Run: func() (*report.Section, error) {
		fo := &fractalOptions{}
		addFractalFlags(pflag.NewFlagSet("fractal", pflag.ContinueOnError), fo)
		fo.in, fo.lag, fo.theiler = o.in, st.lag, st.theiler
		run, p, res, err := a.fractalCompute(path, s, fo, st.lagMethod, st.theilerFrom)
		if run == nil {
			return nil, err
		}
		pl, ferr := fractalFigure(run, st.title)
		if ferr != nil {
			return nil, fmt.Errorf("fractal: figure: %w", ferr)
		}
		fig := []report.Figure{{Name: "fractal",
			Caption: "Local slopes d log C / d log r of the correlation sums against the radius, one curve per embedding dimension; the fitted scaling range is drawn thicker and D2 dashed.",
			Width:   8 * vg.Inch, Height: 5.5 * vg.Inch, Rows: [][]*plot.Plot{{pl}}}}
		if err != nil {
			// no scaling range: no JSON object to show, but the curves say why
			return &report.Section{JSON: nil, Figures: fig, Cautions: run.cautions}, err
		}
		js, err := envelope("fractal", p, res)
		if err != nil {
			return nil, err
		}
		g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
		r := run.r
		perDim := ""
		for _, c := range r.Curves {
			if c.Fitted {
				if perDim != "" {
					perDim += ", "
				}
				perDim += fmt.Sprintf("m %d: %s", c.Dim, g(c.D2))
			}
		}
		return &report.Section{JSON: js, Cautions: res.Cautions, Figures: fig, Summary: [][2]string{
			{"D2", fmt.Sprintf("%s [%s, %s] (95 %% bootstrap) at m = %d, saturated %v", g(r.D2), g(r.Lo), g(r.Hi), r.Dim, r.Saturated)},
			{"scaling range", fmt.Sprintf("r = %s … %s signal units", g(r.RLo), g(r.RHi))},
			{"Takens estimate", g(r.Takens)},
			{"per dimension", perDim},
			{"lag, Theiler window", fmt.Sprintf("%d samples (%s), %d samples (%s); %s norm", p.Lag, p.LagMethod, p.Theiler, p.TheilerBy, p.Norm)},
		}}, nil
	}}
}
