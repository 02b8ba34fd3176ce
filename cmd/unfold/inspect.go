package main

import (
	"fmt"
	"strconv"

	"github.com/spf13/cobra"
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

func (a *app) runInspect(path string, o *inspectOptions) error {
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	p, res, sm, err := a.env(&o.in).Inspect(path, s)
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
	for _, n := range res.Notes {
		rows = append(rows, []string{"reading", n})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range sm.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}
