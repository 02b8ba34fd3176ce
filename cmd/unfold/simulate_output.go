package main

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"unfold/models"
	"unfold/series"
)

// simulateParams is the "parameters" object of the JSON output.
type simulateParams struct {
	Model       string         `json:"model"`
	Kind        string         `json:"kind"`
	ModelParams map[string]any `json:"model_parameters"`
	N           int            `json:"n"`
	Dt          float64        `json:"dt"`
	Substeps    int            `json:"substeps,omitempty"`
	Step        float64        `json:"integration_step,omitempty"`
	Transient   float64        `json:"transient"`
	Initial     []float64      `json:"initial,omitempty"`
	Noise       float64        `json:"noise"`
	Seed        uint64         `json:"seed"`
	Method      string         `json:"method,omitempty"`
}

type simulateResult struct {
	Spectrum    []float64 `json:"spectrum"`
	Units       string    `json:"units"`
	Sum         float64   `json:"sum"`
	KaplanYorke float64   `json:"kaplan_yorke_dimension"`
	Time        float64   `json:"time"`
	Intervals   int       `json:"intervals"`
}

type simulateWritten struct {
	Output  string   `json:"output"`
	Samples int      `json:"samples"`
	Columns []string `json:"columns"`
}

func writeAtomicCSV(path string, header []string, cols [][]float64) error {
	f, err := series.CreateAtomic(path)
	if err != nil {
		return err
	}
	defer f.Abort()
	if err := series.WriteCSV(f, header, cols...); err != nil {
		return fmt.Errorf("simulate: %s: %w", path, err)
	}
	return f.Commit()
}

func (a *app) printSpectrum(spec models.Spec, values models.Values, sp *models.Spectrum, units string, sum float64) error {
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
	var ps []string
	for _, p := range spec.Params {
		ps = append(ps, p.Symbol+" = "+formatValues(values[p.Name]))
	}
	rows := [][]string{
		{"model", spec.Name + " (" + strings.Join(ps, ", ") + ")"},
		{"method", "Benettin et al. (1980) QR on the variational equations"},
	}
	if sp.Step > 0 {
		rows = append(rows, []string{"averaged over", fmt.Sprintf("T = %s time units (%d intervals, RK4 step %s)", g(sp.Time), sp.Intervals, g(sp.Step))})
	} else {
		rows = append(rows, []string{"averaged over", fmt.Sprintf("%d iterations", sp.Intervals)})
	}
	for i, l := range sp.Exponents {
		rows = append(rows, []string{fmt.Sprintf("λ%d", i+1), fmt.Sprintf("%10.6f %s  (%.6f bits)", l, units, l/math.Ln2)})
	}
	rows = append(rows,
		[]string{"sum", fmt.Sprintf("%10.6f", sum)},
		[]string{"Kaplan–Yorke dimension", fmt.Sprintf("%.5f", sp.KaplanYorke)})
	return a.table(rows)
}

// floatList is a flag value holding comma-separated numbers; it prints nothing as its default,
// so the usage line carries the per-model defaults.
