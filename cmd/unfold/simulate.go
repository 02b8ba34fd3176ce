package main

import (
	"errors"
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
