package main

import (
	"fmt"
	"strconv"

	"github.com/spf13/pflag"
	"gonum.org/v1/plot"

	"unfold/figure"
	"unfold/report"
	"unfold/series"
)

// lyapunovStage is the report's "lyapunov" stage: `unfold lyapunov` with its defaults on the
// embedding chosen upstream (st.lag, st.dim, st.theiler); the divergence curve with the fit
// range shaded. It leaves λ1 and its interval in st for the regime stage.
func (a *app) lyapunovStage(path string, s *series.Series, o *reportOptions, st *chainState,
	envelope func(command string, params, body any) ([]byte, error)) report.Stage {
	return report.Stage{Key: "lyapunov", Title: "Largest Lyapunov exponent: divergence curve", Run: func() (*report.Section, error) {
		lo := &lyapunovOptions{}
		addLyapunovFlags(pflag.NewFlagSet("lyapunov", pflag.ContinueOnError), lo)
		lo.in, lo.lag, lo.dim, lo.theiler, lo.maxDim, lo.norm = o.in, st.lag, st.dim, st.theiler, o.maxDim, o.norm
		run, p, res, noFit := a.lyapunovCompute(path, s, lo, st.lagMethod, st.dimMethod)
		if run == nil {
			return nil, noFit
		}
		if st.theilerFrom != "" {
			p.TheilerFrom, run.theilerBy = st.theilerFrom, st.theilerFrom
		}
		js, err := envelope("lyapunov", p, res)
		if err != nil {
			return nil, err
		}
		pl, err := lyapunovFigure(run, st.title)
		if err != nil {
			return nil, err
		}
		r := run.r
		g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
		sum := [][2]string{
			{"embedding", fmt.Sprintf("lag %d samples (%s), dimension %d (%s), Theiler window %d samples (%s)",
				p.Lag, p.LagMethod, p.Dim, p.DimMethod, p.Theiler, p.TheilerFrom)},
			{"curve", fmt.Sprintf("%s, horizon %d steps (%s time units), %d reference points", p.Method, r.Horizon, g(float64(r.Horizon)*r.Dt), r.ReferencePoints)},
		}
		if res.LambdaMax != nil {
			st.lambda = res.LambdaMax
			st.lambdaInterval = *res.Interval
			sum = append(sum,
				[2]string{"λ_max", fmt.Sprintf("%s nats per time unit (%s bits; %s nats per sample)", g(r.Lambda), g(r.Lambda/ln2), g(r.LambdaPerSample))},
				[2]string{"interval", fmt.Sprintf("[%s, %s] nats per time unit (%.0f %%, block bootstrap, %d resamples)", g(r.Interval[0]), g(r.Interval[1]), 100*r.Level, r.Reps)},
				[2]string{"fit range", fmt.Sprintf("steps %d … %d (%s)", r.From, r.To, res.Fit.Criterion)})
		} else {
			sum = append(sum, [2]string{"λ_max", "no answer: " + res.Reason})
		}
		return &report.Section{JSON: js, Summary: sum, Cautions: res.Cautions, Figures: []report.Figure{{Name: "lyapunov",
			Caption: "Mean log separation of initially close delay vectors against the steps ahead; the fit range is shaded and λ_max is the slope there.",
			Width:   figure.Width, Height: figure.Height, Rows: [][]*plot.Plot{{pl}}}}}, noFit
	}}
}
