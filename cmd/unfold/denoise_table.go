package main

import (
	"fmt"
	"strconv"

	"unfold/analysis"
	"unfold/series"
)

// denoiseTable prints the human summary of `denoise`.
func (a *app) denoiseTable(path, name string, s *series.Series, o *denoiseOptions, run *analysis.DenoiseRun, p analysis.DenoiseParams, body analysis.DenoiseResult) error {
	x, dt, method := run.Clean, run.Dt, p.Method
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 5, 64) }
	rows := [][]string{{"file", path}, {"signal", name}, {"samples in / out", fmt.Sprintf("%d / %d", s.Len(), len(x))}}
	if o.polyDetrend >= 0 {
		rows = append(rows, []string{"polynomial detrend", "order " + strconv.Itoa(o.polyDetrend)})
	}
	for _, f := range run.Filters {
		rows = append(rows, []string{"filter", fmt.Sprintf("Butterworth %s order %d at %v %s, zero phase", f.Band, f.Order, f.Corners, p.FilterUnit)})
	}
	if o.resample > 0 {
		rows = append(rows, []string{"resampled", "dt " + g(s.Dt) + " → " + g(dt)})
	}
	if r := run.Res; r != nil {
		rows = append(rows,
			[]string{"method", method},
			[]string{"embedding", fmt.Sprintf("m = %d, lag = %d (%s), q = %d, %s norm", r.Dim, r.Lag, p.LagMethod, r.Q, r.Norm)},
			[]string{"eps", g(r.Eps) + " (" + r.EpsRule + ")"})
		for _, it := range r.Iterations {
			state := ""
			if !it.Applied {
				state = " (discarded: did not shrink)"
			}
			rows = append(rows, []string{fmt.Sprintf("iteration %d", it.Iteration), "rms correction " + g(it.RMSCorrection) + state})
		}
	}
	if o.resample == 0 {
		rows = append(rows, []string{"rms correction", g(body.RMSCorrection)})
	}
	rows = append(rows, []string{"output", o.output})
	if o.plot != "" {
		rows = append(rows, []string{"plot", o.plot})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range body.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}
