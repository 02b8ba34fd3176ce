package main

import (
	"fmt"
	"strconv"

	"github.com/spf13/cobra"

	"unfold/series"
)

type inspectOptions struct {
	in inputOptions
}

func newInspectCmd(a *app) *cobra.Command {
	o := &inspectOptions{}
	cmd := &cobra.Command{
		Use:   "inspect FILE",
		Short: "Length, sampling, statistics, quantisation, dominant period and stationarity hints of a signal",
		Long: `inspect reads one signal and reports what to know before any analysis: the number of
samples, the sampling interval and duration, mean, standard deviation, range, the quantisation
step (the smallest step between distinct values, e.g. an ADC's resolution), how many gaps were
filled, the dominant period (from the largest periodogram peak, in time units) and a
stationarity hint: the means and variances of the halves and quarters compared with their
sampling error (integrated autocorrelation time), with a plain-words caution when they differ.`,
		Example: `  # a two-column t,x file sampled at 0.02 s
  unfold inspect vibration.csv
  # the same as JSON, from standard input, signal in the column named "strain"
  cat vibration.csv | unfold inspect --json --column strain -
  # after removing a linear trend (monthly data with a time column in years)
  unfold inspect --detrend linear monthly.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runInspect(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	return cmd
}

// inspectResult is the JSON body of `inspect` (DESIGN.md §3).
type inspectResult struct {
	Duration       float64             `json:"duration"`
	Mean           float64             `json:"mean"`
	Std            float64             `json:"std"`
	Min            float64             `json:"min"`
	Max            float64             `json:"max"`
	Quantization   float64             `json:"quantization"`
	DominantPeriod float64             `json:"dominant_period"`
	GapsFilled     int                 `json:"gaps_filled"`
	Stationarity   series.Stationarity `json:"stationarity"`
	Cautions       []string            `json:"cautions"`
}

type inspectParams struct {
	Column      string `json:"column"`
	TimeColumn  string `json:"time_column"`
	Detrend     string `json:"detrend"`
	Standardize bool   `json:"standardize"`
	Decimate    int    `json:"decimate"`
	From        string `json:"from"`
	To          string `json:"to"`
	Gaps        string `json:"gaps"`
}

// inspectCompute describes s and returns the JSON parameters and body of `inspect` with the
// summary they came from; the command and the report both use it.
func inspectCompute(path string, s *series.Series, o *inspectOptions) (inspectParams, inspectResult, *series.Summary, error) {
	sm, err := series.Describe(s)
	if err != nil {
		return inspectParams{}, inspectResult{}, nil, noAnswer(fmt.Errorf("inspect: %s: %w", path, err))
	}
	if sm.Cautions == nil {
		sm.Cautions = []string{}
	}
	p := inspectParams{Column: s.Name, TimeColumn: s.TimeName, Detrend: o.in.prep.Detrend,
		Standardize: o.in.prep.Standardize, Decimate: max(o.in.prep.Decimate, 1),
		From: o.in.prep.From, To: o.in.prep.To, Gaps: o.in.read.Gaps}
	res := inspectResult{
		Duration: sm.Duration, Mean: sm.Mean, Std: sm.Std, Min: sm.Min, Max: sm.Max,
		Quantization: sm.Quantization, DominantPeriod: sm.DominantPeriod,
		GapsFilled: sm.GapsFilled, Stationarity: sm.Stationarity, Cautions: sm.Cautions,
	}
	return p, res, sm, nil
}

func (a *app) runInspect(path string, o *inspectOptions) error {
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	p, res, sm, err := inspectCompute(path, s, o)
	if err != nil {
		return err
	}
	if a.global.JSON {
		return a.emitJSON("inspect", in, p, res)
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
	unit := ""
	if s.Unit != "" {
		unit = " " + s.Unit
	}
	timeFrom := "given or default (no time column)"
	if s.TimeName != "" {
		timeFrom = "from column " + strconv.Quote(s.TimeName)
	}
	rows := [][]string{
		{"file", path},
		{"signal", s.Name},
		{"samples", strconv.Itoa(sm.Samples)},
		{"dt", g(sm.Dt) + " (" + timeFrom + ")"},
		{"duration", g(sm.Duration)},
		{"mean", g(sm.Mean) + unit},
		{"std", g(sm.Std) + unit},
		{"min / max", g(sm.Min) + " / " + g(sm.Max) + unit},
		{"quantization", g(sm.Quantization) + unit},
		{"dominant period", g(sm.DominantPeriod) + " time units (" + g(sm.DominantPeriod/sm.Dt) + " samples)"},
		{"gaps filled", strconv.Itoa(sm.GapsFilled)},
		{"stationary", fmt.Sprintf("%v (mean shift %.1f, variance shift %.1f standard errors; correlation time %.1f samples)",
			sm.Stationarity.Stationary, sm.Stationarity.MeanShift, sm.Stationarity.VarianceShift, sm.Stationarity.CorrelationTime)},
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range sm.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}
