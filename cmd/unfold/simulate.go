package main

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/models"
	"unfold/series"
)

type simulateOptions struct {
	n         int
	dt        float64
	substeps  int
	transient float64
	noise     float64
	initial   []float64
	output    string
	lyapunov  bool
	// params holds one flag value per parameter name of any model; only flags that were given
	// are passed on.
	scalars map[string]*float64
	lists   map[string]*[]float64
}

func newSimulateCmd(a *app) *cobra.Command {
	o := &simulateOptions{scalars: map[string]*float64{}, lists: map[string]*[]float64{}}
	cmd := &cobra.Command{
		Use:   "simulate MODEL",
		Short: "Write a signal from a model system (CSV t,x[,y,z]), or its Lyapunov spectrum from the equations",
		Long:  simulateLong(),
		Example: `  # 20,000 samples of the Lorenz flow at dt = 0.01 (RK4 step 0.001), 1 % measurement noise
  unfold simulate lorenz --n 20000 --noise 0.01 -o lorenz.csv
  # the Hénon map with a different a, then its x column through inspect
  unfold simulate henon --a 1.2 --n 5000 | unfold inspect --column x -
  # the two-well forced Duffing oscillator, 50 samples per forcing period
  unfold simulate duffing --delta 0.25 --alpha -1 --gamma 0.4 --dt 0.12566 -o duffing.csv
  # an AR(2) process, seed 7
  unfold simulate ar --phi 0.5,0.3 --seed 7 -o ar2.csv
  # the Lyapunov spectrum and Kaplan–Yorke dimension of the Lorenz flow (Benettin QR), as JSON
  unfold simulate lorenz --lyapunov --json`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) != 1 {
				return usagef("simulate: expected one model name, got %d arguments; see unfold simulate --help for the models", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runSimulate(cmd.Flags(), args[0], o)
		},
	}
	f := cmd.Flags()
	f.IntVar(&o.n, "n", 10000, "samples to write (with --lyapunov: renormalisation intervals of length --dt; default per model)")
	f.Float64Var(&o.dt, "dt", 0, "output interval in time units (default per model; maps, ar and noise: 1 per sample)")
	f.IntVar(&o.substeps, "substeps", models.DefaultSubsteps, "RK4 steps per output interval for flows (integration step = dt/substeps)")
	f.Float64Var(&o.transient, "transient", 0, "time dropped before recording, in time units (iterations for maps; default per model)")
	f.Float64Var(&o.noise, "noise", 0, "Gaussian measurement noise, as a fraction of each column's standard deviation (0.01 = 1 %)")
	f.Var((*floatList)(&o.initial), "init", "initial condition: the first state variables, comma-separated (default per model)")
	f.StringVarP(&o.output, "output", "o", "", "write the CSV to FILE (written atomically) instead of standard output")
	f.BoolVar(&o.lyapunov, "lyapunov", false, "print the Lyapunov spectrum from the equations (Benettin et al. 1980) and the Kaplan–Yorke dimension instead of writing a signal")
	for _, p := range paramFlags() {
		if p.list {
			l := new([]float64)
			o.lists[p.name] = l
			f.Var((*floatList)(l), p.name, p.usage)
		} else {
			o.scalars[p.name] = f.Float64(p.name, 0, p.usage)
		}
	}
	bindSimulateSweep(a, cmd)
	return cmd
}

type paramFlag struct {
	name  string
	list  bool
	usage string
}

// paramFlags returns one flag per parameter name used by any model, with a usage line that
// says which models use it and their defaults.
func paramFlags() []paramFlag {
	type use struct {
		model string
		p     models.Param
	}
	uses := map[string][]use{}
	for _, s := range models.Catalog() {
		for _, p := range s.Params {
			uses[p.Name] = append(uses[p.Name], use{s.Name, p})
		}
	}
	names := make([]string, 0, len(uses))
	for n := range uses {
		names = append(names, n)
	}
	sort.Strings(names)
	out := make([]paramFlag, 0, len(names))
	for _, n := range names {
		var parts []string
		list := false
		for _, u := range uses[n] {
			list = list || u.p.List
			parts = append(parts, fmt.Sprintf("%s %s, %s (default %s)", u.model, u.p.Symbol, u.p.Doc, formatValues(u.p.Default)))
		}
		out = append(out, paramFlag{name: n, list: list, usage: "model parameter: " + strings.Join(parts, "; ")})
	}
	return out
}

func formatValues(v []float64) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = strconv.FormatFloat(x, 'g', 6, 64)
	}
	return strings.Join(s, ",")
}

// simulateLong is the long help: the models with their equations and parameters.
func simulateLong() string {
	var b strings.Builder
	b.WriteString(`simulate writes a signal from a published model system as CSV with a header: a time column t
and the recorded state variables (t,x[,y,z]). Flows are integrated by fixed-step fourth-order
Runge–Kutta with a step finer than the output interval (dt/substeps); the transient is dropped and
time is counted from the first recorded sample. --noise adds Gaussian measurement noise as a
fraction of each column's standard deviation; --seed makes every random step reproducible.
Every model parameter is a flag; parameters a model does not have are refused.

--lyapunov computes the Lyapunov spectrum from the equations instead, by the QR method of
Benettin, Galgani, Giorgilli & Strelcyn (1980, Meccanica 15, 9): tangent vectors carried along the
orbit by the variational equations and re-orthonormalised every dt; exponents in nats per time
unit (per iteration for maps), with the Kaplan–Yorke dimension (Kaplan & Yorke 1979).

Models (defaults in brackets; dt, transient and spectrum length are per model):
`)
	for _, s := range models.Catalog() {
		fmt.Fprintf(&b, "\n  %s — %s (%s)\n      %s\n", s.Name, s.Title, s.Kind, s.Equations)
		var ps []string
		for _, p := range s.Params {
			ps = append(ps, fmt.Sprintf("--%s %s", p.Name, formatValues(p.Default)))
		}
		if len(ps) > 0 {
			fmt.Fprintf(&b, "      [%s]", strings.Join(ps, " "))
		}
		fmt.Fprintf(&b, "  dt %g, transient %g", s.Dt, s.Transient)
		if s.Kind != models.KindProcess {
			fmt.Fprintf(&b, ", init %s", formatValues(s.Initial))
		}
		fmt.Fprintf(&b, "\n      %s\n", s.Reference)
	}
	return b.String()
}

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

func (a *app) runSimulate(flags *pflag.FlagSet, name string, o *simulateOptions) error {
	spec, err := models.Lookup(name)
	if err != nil {
		return usagef("simulate: %v", err)
	}
	given := models.Values{}
	for n, v := range o.scalars {
		if flags.Changed(n) {
			given[n] = []float64{*v}
		}
	}
	for n, v := range o.lists {
		if flags.Changed(n) {
			given[n] = append([]float64(nil), (*v)...)
		}
	}
	values, err := spec.Resolve(given)
	if err != nil {
		return usagef("simulate: %v", err)
	}
	if _, err := spec.New(values); err != nil {
		return usagef("simulate: %v", err)
	}
	opt := spec.DefaultOptions()
	opt.Seed = a.global.Seed
	opt.Substeps = o.substeps
	opt.Noise = o.noise
	opt.Initial = o.initial
	if flags.Changed("dt") {
		opt.Dt = o.dt
	}
	if flags.Changed("transient") {
		opt.Transient = o.transient
	}
	opt.N = o.n
	if o.lyapunov && !flags.Changed("n") {
		opt.N = spec.SpectrumN
	}
	params := simulateParams{Model: spec.Name, Kind: spec.Kind.String(), ModelParams: map[string]any{},
		N: opt.N, Dt: opt.Dt, Transient: opt.Transient, Initial: opt.Initial, Noise: opt.Noise, Seed: opt.Seed}
	for _, p := range spec.Params {
		if p.List {
			params.ModelParams[p.Name] = values[p.Name]
		} else {
			params.ModelParams[p.Name] = values[p.Name][0]
		}
	}
	if spec.Kind == models.KindFlow {
		params.Substeps = opt.Substeps
		params.Step = opt.Dt / float64(opt.Substeps)
	}
	if spec.Kind != models.KindProcess && len(params.Initial) == 0 {
		params.Initial = spec.Initial
	}
	wrap := func(err error) error {
		var esc *models.EscapeError
		if errors.As(err, &esc) {
			return noAnswer(err)
		}
		return usagef("%v", err)
	}

	if o.lyapunov {
		if o.output != "" {
			return usagef("simulate: --lyapunov prints a spectrum and writes no signal; leave out -o")
		}
		if flags.Changed("noise") {
			return usagef("simulate: --noise does not apply to the spectrum from the equations")
		}
		params.Noise = 0
		params.Method = "Benettin et al. (1980) QR on the variational equations, Gram–Schmidt every dt"
		sp, err := spec.Spectrum(values, opt)
		if err != nil {
			return wrap(err)
		}
		units := "nats per time unit"
		if spec.Kind == models.KindMap {
			units = "nats per iteration"
		}
		var sum float64
		for _, l := range sp.Exponents {
			sum += l
		}
		if a.global.JSON {
			return a.emitJSON("simulate", nil, params, simulateResult{Spectrum: sp.Exponents, Units: units,
				Sum: sum, KaplanYorke: sp.KaplanYorke, Time: sp.Time, Intervals: sp.Intervals})
		}
		return a.printSpectrum(spec, values, sp, units, sum)
	}

	if a.global.JSON && o.output == "" {
		return usagef("simulate: --json needs -o FILE (the signal itself goes to standard output otherwise)")
	}
	tr, err := spec.Simulate(values, opt)
	if err != nil {
		return wrap(err)
	}
	header := append([]string{"t"}, tr.Columns...)
	cols := make([][]float64, 0, len(header))
	t := make([]float64, tr.Len())
	for i := range t {
		t[i] = float64(i) * tr.Dt
	}
	cols = append(cols, t)
	cols = append(cols, tr.Data...)
	if o.output == "" {
		return series.WriteCSV(a.stdout, header, cols...)
	}
	if err := writeAtomicCSV(o.output, header, cols); err != nil {
		return err
	}
	if a.global.JSON {
		return a.emitJSON("simulate", nil, params, simulateWritten{Output: o.output, Samples: tr.Len(), Columns: header})
	}
	a.notef("simulate: wrote %d samples of %s (%s) to %s", tr.Len(), spec.Name, strings.Join(header, ","), o.output)
	return nil
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
type floatList []float64

func (l *floatList) String() string { return formatValues(*l) }

// Type names the value in the usage text.
func (l *floatList) Type() string { return "floats" }

// Set parses a comma-separated list of numbers; the flag given again replaces the list.
func (l *floatList) Set(s string) error {
	var v []float64
	for _, f := range strings.Split(s, ",") {
		x, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return fmt.Errorf("%q is not a finite number", f)
		}
		v = append(v, x)
	}
	*l = v
	return nil
}
