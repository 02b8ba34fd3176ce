package main

import (
	"fmt"
	"math"
	"strconv"

	"unfold/analysis"
	"unfold/report"
)

// sweepBody is the JSON result of sweep, after the envelope.
type sweepBody struct {
	Directory   string         `json:"directory"`
	Records     int            `json:"records"`
	Inputs      int            `json:"inputs"`
	Skipped     int            `json:"skipped"`
	OK          int            `json:"ok"`
	Partial     int            `json:"partial"`
	Errors      int            `json:"errors"`
	CSV         string         `json:"sweep_csv"`
	HTML        string         `json:"sweep_html"`
	Transitions []string       `json:"transitions"`
	Rows        []sweepRowJSON `json:"rows"`
	Cautions    []string       `json:"cautions"`
}

// sweepRowJSON is one row of sweep.csv with its numbers typed: null where the stage gave no
// answer (the row's error says why) or was not run.
type sweepRowJSON struct {
	Value                 float64           `json:"value"`
	Regime                *string           `json:"regime"`
	Confidence            *float64          `json:"confidence"`
	Lag                   *int              `json:"lag"`
	Dimension             *int              `json:"dimension"`
	LambdaMax             *float64          `json:"lambda_max"`
	LambdaLo              *float64          `json:"lambda_lo"`
	LambdaHi              *float64          `json:"lambda_hi"`
	D2                    *float64          `json:"d2"`
	D2Lo                  *float64          `json:"d2_lo"`
	D2Hi                  *float64          `json:"d2_hi"`
	EntropyRate           *float64          `json:"entropy_rate"`
	StatisticalComplexity *float64          `json:"statistical_complexity"`
	Frequencies           []float64         `json:"frequencies"`
	Samples               *int              `json:"samples"`
	Dt                    *float64          `json:"dt"`
	Status                string            `json:"status"`
	Error                 string            `json:"error,omitempty"`
	Path                  string            `json:"path"`
	Labels                map[string]string `json:"labels,omitempty"`
}

func positive(n int) *int {
	if n <= 0 {
		return nil
	}
	return &n
}

func newSweepBody(dir, csvPath, htmlPath string, list *report.SweepList, st report.BatchStats, rows []report.SweepRow, tr []string) sweepBody {
	b := sweepBody{Directory: dir, Records: len(list.Entries), Inputs: st.Inputs, Skipped: st.Skipped, OK: st.OK,
		Partial: st.Partial, Errors: st.Errors, CSV: csvPath, HTML: htmlPath, Transitions: tr, Rows: []sweepRowJSON{}, Cautions: []string{}}
	missing := 0
	for _, r := range rows {
		j := sweepRowJSON{Value: r.Value, Confidence: analysis.Finite(r.Confidence), Lag: positive(r.Lag), Dimension: positive(r.Dimension),
			LambdaMax: analysis.Finite(r.LambdaMax), LambdaLo: analysis.Finite(r.LambdaLo), LambdaHi: analysis.Finite(r.LambdaHi),
			D2: analysis.Finite(r.D2), D2Lo: analysis.Finite(r.D2Lo), D2Hi: analysis.Finite(r.D2Hi), EntropyRate: analysis.Finite(r.EntropyRate),
			StatisticalComplexity: analysis.Finite(r.Complexity), Frequencies: r.Frequencies, Samples: positive(r.Samples),
			Dt: analysis.Finite(r.Dt), Status: r.Status, Error: r.Error, Path: r.Path}
		if j.Frequencies == nil {
			j.Frequencies = []float64{}
		}
		if r.Regime != "" {
			j.Regime = &r.Regime
		}
		if len(list.Labels) > 0 {
			j.Labels = map[string]string{}
			for i, l := range list.Labels {
				if i < len(r.Labels) {
					j.Labels[l] = r.Labels[i]
				}
			}
		}
		if r.Status == "missing" {
			missing++
		}
		b.Rows = append(b.Rows, j)
	}
	if missing > 0 {
		b.Cautions = append(b.Cautions, fmt.Sprintf("%d of %d records have no result yet (status missing): run the other shards, then --merge", missing, len(rows)))
	}
	return b
}

// g4 writes a number with 4 significant digits, "–" when absent.
func g4(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "–"
	}
	return strconv.FormatFloat(v, 'g', 4, 64)
}

// renderSweep prints one line per record, the route in words and the page's path.
func (a *app) renderSweep(list *report.SweepList, rows []report.SweepRow, tr []string, htmlPath string) error {
	t := [][]string{{list.Parameter, "verdict", "λ1 [interval]", "D2 [interval]", "status"}}
	for _, r := range rows {
		lam, d2 := g4(r.LambdaMax), g4(r.D2)
		if !math.IsNaN(r.LambdaLo) && !math.IsNaN(r.LambdaHi) {
			lam += " [" + g4(r.LambdaLo) + ", " + g4(r.LambdaHi) + "]"
		}
		if !math.IsNaN(r.D2Lo) && !math.IsNaN(r.D2Hi) {
			d2 += " [" + g4(r.D2Lo) + ", " + g4(r.D2Hi) + "]"
		}
		v := r.Regime
		if v == "" {
			v = "–"
		}
		t = append(t, []string{strconv.FormatFloat(r.Value, 'g', -1, 64), v, lam, d2, r.Status})
	}
	if err := a.table(t); err != nil {
		return err
	}
	fmt.Fprintln(a.stdout)
	for _, s := range tr {
		fmt.Fprintln(a.stdout, s)
	}
	_, err := fmt.Fprintf(a.stdout, "page: %s\n", htmlPath)
	return err
}
