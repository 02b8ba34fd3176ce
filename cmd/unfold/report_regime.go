package main

import (
	"fmt"
	"strconv"

	"github.com/spf13/pflag"
	"gonum.org/v1/plot/vg"

	"unfold/regime"
	"unfold/report"
	"unfold/series"
)

// regimeStage is the report's "regime" stage: `unfold regime` with its defaults (19 IAAFT
// surrogates) on the lag, dimension and Theiler window chosen upstream (st.lag, st.dim,
// st.theiler; a Theiler window of 0 lets regime choose its own), with the lyapunov stage's λ1
// and interval as the λ1 evidence when that stage gave one (recorded as "lyapunov_from" in the
// parameters; regime estimates λ1 itself otherwise). The page shows the verdict, the evidence
// table, the cautions and the evidence figure (spectrum with its lines, surrogate tests).
func (a *app) regimeStage(path string, s *series.Series, o *reportOptions, st *chainState,
	envelope func(command string, params, body any) ([]byte, error)) report.Stage {
	return report.Stage{Key: "regime", Title: "Regime: verdict and evidence", Run: func() (*report.Section, error) {
		ro := &regimeOptions{}
		addRegimeFlags(pflag.NewFlagSet("regime", pflag.ContinueOnError), ro)
		ro.in, ro.lag, ro.dim = o.in, st.lag, st.dim
		if st.theiler > 0 {
			ro.theiler = st.theiler
		}
		var lyap *regime.Exponent
		if st.lambda != nil {
			lyap = &regime.Exponent{Value: *st.lambda, Lo: st.lambdaInterval[0], Hi: st.lambdaInterval[1]}
		}
		an, p, res, err := a.regimeCompute(path, s, ro, st.lagMethod, st.dimMethod, lyap)
		if err != nil {
			return nil, err
		}
		js, err := envelope("regime", p, res)
		if err != nil {
			return nil, err
		}
		rows, err := evidencePlots(an, st.title)
		if err != nil {
			return nil, fmt.Errorf("regime: figure: %w", err)
		}
		ev, v := an.Evidence, an.Verdict
		lyapFrom := "estimated by regime"
		if p.LyapunovFrom != "" {
			lyapFrom = "from the lyapunov stage"
		} else if ro.noLyap {
			lyapFrom = "not used"
		}
		sum := [][2]string{
			{"regime", v.Regime},
			{"confidence", strconv.FormatFloat(v.Confidence, 'f', 2, 64)},
			{"rule", v.Rule},
			{"embedding", fmt.Sprintf("lag %d (%s), dimension %d (%s), Theiler window %d samples; λ1 %s; %d IAAFT surrogates",
				ev.Lag, p.LagMethod, ev.Dim, p.DimMethod, ev.Theiler, lyapFrom, p.Surrogates)},
			{"evidence", "points to (weight): detail"},
		}
		sum = append(sum, evidenceRows(v)...)
		w := 11 * vg.Inch
		if len(rows[0]) < 3 {
			w = vg.Length(len(rows[0])) * 4 * vg.Inch
		}
		return &report.Section{JSON: js, Summary: sum, Cautions: res.Cautions, Figures: []report.Figure{{Name: "regime",
			Caption: "The evidence: the spectrum with its significant lines, and the data's nonlinear prediction error and time-reversal asymmetry (line) against the IAAFT surrogates' (points).",
			Width:   w, Height: 4 * vg.Inch, Rows: rows}}}, nil
	}}
}
