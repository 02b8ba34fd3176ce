package main

import (
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"strconv"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
	"gonum.org/v1/plot"

	"unfold/figure"
	"unfold/fit"
	"unfold/lyapunov"
	"unfold/neighbors"
	"unfold/series"
)

type lyapunovOptions struct {
	in           inputOptions
	lag, dim     int
	maxDim       int
	theiler      int
	method       string
	norm         string
	horizon      int
	eps          []float64
	maxNeighbors int
	fitFrom      int
	fitTo        int
	reps         int
	spectrum     bool
	neighbors    int
	evolve       int
	csvPath      string
	plot         string
}

func newLyapunovCmd(a *app) *cobra.Command {
	o := &lyapunovOptions{}
	cmd := &cobra.Command{
		Use:   "lyapunov FILE",
		Short: "Largest Lyapunov exponent (and --spectrum) from divergence curves, with fit range and interval",
		Long: `lyapunov embeds the signal in delay coordinates and follows initially close pairs of delay
vectors: the mean logarithm of their separation S(k) against the number of steps k grows
linearly, with slope λ_max, until the separation reaches the size of the attractor.

  --method kantz (default): Kantz (1994), the log of the mean distance to every neighbour within
      ε (at most --max-neighbors nearest), one curve per ε (--eps; default 2, 4, 8, 16 times the
      median nearest-neighbour distance); robust to noise. The answer is the curve whose slope is
      the median over ε.
  --method rosenstein: Rosenstein, Collins & De Luca (1993), one nearest neighbour per point.

Neighbours closer in time than the Theiler window are excluded. The fit range is found
automatically (package fit: the longest stretch whose local slopes stay within 20 % of their
median, not a plateau, rising by at least 1 nat) unless --fit-from/--fit-to are given; a curve
that never rises by a factor e is read over its whole horizon (bounded motion, λ ≈ 0). The
interval is a block bootstrap over reference points (--reps resamples, --seed). λ_max is in nats
per time unit (uses --dt), per sample, and in bits in the table.

When --lag, --dim or --theiler are not given they are chosen as 'unfold lag' and 'unfold dim'
do (mutual information; false neighbours / Cao; the 1/e decay time of the autocorrelation) and
printed. --spectrum adds the spectrum from local linear maps fitted by least squares with QR
re-orthonormalisation (Eckmann et al. 1986; Sano & Sawada 1985) and its Kaplan–Yorke dimension.

Exit status 1 when no range of the curve is linear (say --fit-from/--fit-to to fit anyway).`,
		Example: `  # Lorenz x at dt = 0.01 (synthetic): lag, dimension and Theiler window chosen automatically
  unfold simulate lorenz --n 20000 -o lorenz.csv
  unfold lyapunov --column x lorenz.csv
  #   → λ_max ≈ 0.9 nats per time unit (about 1.3 bits), fit range and 95 % interval printed
  # the same with given embedding, the spectrum, JSON, the curves as CSV and the figure
  unfold lyapunov --column x --lag 12 --dim 3 --theiler 20 --spectrum --json \
      --csv div.csv --plot div.png lorenz.csv
  # Rosenstein's curve with a hand-picked fit range (steps)
  unfold lyapunov --method rosenstein --fit-from 70 --fit-to 240 --column x lorenz.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runLyapunov(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	addLyapunovFlags(cmd.Flags(), o)
	return cmd
}

// addLyapunovFlags binds the flags of `lyapunov` (besides the input flags) to o, with their defaults.
func addLyapunovFlags(f *pflag.FlagSet, o *lyapunovOptions) {
	f.IntVar(&o.lag, "lag", 0, "delay in samples (default: chosen from the mutual information, as 'unfold lag')")
	f.IntVar(&o.dim, "dim", 0, "embedding dimension (default: chosen by false neighbours / Cao, as 'unfold dim')")
	f.IntVar(&o.maxDim, "max-dim", 10, "largest dimension scanned when --dim is chosen automatically")
	f.IntVar(&o.theiler, "theiler", -1, "Theiler window in samples (default: 1/e decay time of the autocorrelation; 0 excludes only the point itself)")
	f.StringVar(&o.method, "method", "kantz", "divergence curve: kantz or rosenstein")
	f.StringVar(&o.norm, "norm", "euclidean", "distance between delay vectors: euclidean or max")
	f.IntVar(&o.horizon, "horizon", 0, "steps each pair is followed (default 10·lag·(dim−1), clamped to 30…500)")
	f.Float64SliceVar(&o.eps, "eps", nil, "Kantz radii in signal units, comma-separated ascending (default 2, 4, 8, 16 × the median nearest-neighbour distance)")
	f.IntVar(&o.maxNeighbors, "max-neighbors", 32, "Kantz: at most this many nearest neighbours within ε")
	f.IntVar(&o.fitFrom, "fit-from", -1, "first step of the fit range (with --fit-to; default automatic)")
	f.IntVar(&o.fitTo, "fit-to", -1, "last step of the fit range (with --fit-from; default automatic)")
	f.IntVar(&o.reps, "reps", 500, "bootstrap resamples for the interval")
	f.BoolVar(&o.spectrum, "spectrum", false, "also estimate the whole spectrum from local linear maps, and the Kaplan–Yorke dimension")
	f.IntVar(&o.neighbors, "neighbors", 0, "--spectrum: neighbours per local fit (default max(5·dim, 20))")
	f.IntVar(&o.evolve, "evolve", 0, "--spectrum: steps spanned by each local map (default the lag)")
	f.StringVar(&o.csvPath, "csv", "", "write the divergence curves to this CSV file (step, then mean_log per curve)")
	f.StringVar(&o.plot, "plot", "", "draw the curves, the fit range and the fitted line (.png or .svg)")
}

type lyapunovParams struct {
	prepParams
	Lag          int       `json:"lag"`
	LagMethod    string    `json:"lag_method"`
	Dim          int       `json:"dim"`
	DimMethod    string    `json:"dim_method"`
	Theiler      int       `json:"theiler"`
	TheilerFrom  string    `json:"theiler_from"`
	Method       string    `json:"method"`
	Norm         string    `json:"norm"`
	Horizon      int       `json:"horizon"`
	Eps          []float64 `json:"eps,omitempty"`
	MaxNeighbors int       `json:"max_neighbors,omitempty"`
	FitFrom      *int      `json:"fit_from"`
	FitTo        *int      `json:"fit_to"`
	Blocks       int       `json:"bootstrap_blocks"`
	Reps         int       `json:"bootstrap_reps"`
	Level        float64   `json:"interval_level"`
	Seed         uint64    `json:"seed"`
	Threads      int       `json:"threads"`
	Spectrum     bool      `json:"spectrum"`
	Neighbors    int       `json:"spectrum_neighbors,omitempty"`
	Evolve       int       `json:"spectrum_evolve,omitempty"`
}

type lyapunovFit struct {
	From      int    `json:"from"`
	To        int    `json:"to"`
	Automatic bool   `json:"automatic"`
	Criterion string `json:"criterion"`
}

type divergencePoint struct {
	Step    int     `json:"step"`
	MeanLog float64 `json:"mean_log"`
	Pairs   int64   `json:"pairs"`
}

type epsCurveJSON struct {
	Eps                float64  `json:"eps"`
	References         int      `json:"references"`
	LambdaMax          *float64 `json:"lambda_max"`
	LambdaMaxPerSample *float64 `json:"lambda_max_per_sample"`
	Fit                *[2]int  `json:"fit"`
}

type lyapunovResult struct {
	LambdaMax          *float64          `json:"lambda_max"`
	LambdaMaxPerSample *float64          `json:"lambda_max_per_sample"`
	Interval           *[2]float64       `json:"interval"`
	IntervalPerSample  *[2]float64       `json:"interval_per_sample"`
	Fit                *lyapunovFit      `json:"fit"`
	Eps                *float64          `json:"eps,omitempty"`
	Curves             []epsCurveJSON    `json:"curves,omitempty"`
	Divergence         []divergencePoint `json:"divergence"`
	References         int               `json:"reference_points"`
	Reason             string            `json:"reason,omitempty"`
	Spectrum           []float64         `json:"spectrum,omitempty"`
	SpectrumPerSample  []float64         `json:"spectrum_per_sample,omitempty"`
	KaplanYorke        *float64          `json:"kaplan_yorke_dimension,omitempty"`
	SpectrumNote       string            `json:"spectrum_note,omitempty"`
	Cautions           []string          `json:"cautions"`
}

// lyapunovRun is what lyapunovCompute found, for the renderers (table, CSV, figure).
type lyapunovRun struct {
	r                               *lyapunov.Result
	sp                              *lyapunov.SpectrumResult
	method                          lyapunov.Method
	lagMethod, dimMethod, theilerBy string
}

// checkLyapunovOptions validates the flags of `lyapunov`.
func checkLyapunovOptions(o *lyapunovOptions) (lyapunov.Method, neighbors.Norm, error) {
	method, err := lyapunov.ParseMethod(o.method)
	if err != nil {
		return 0, 0, usagef("lyapunov: --method %q: want kantz or rosenstein", o.method)
	}
	norm, err := parseNorm(o.norm)
	if err != nil {
		return 0, 0, err
	}
	if o.lag < 0 || o.dim < 0 || o.horizon < 0 || o.maxNeighbors < 1 || o.reps < 2 || o.maxDim < 1 || o.neighbors < 0 || o.evolve < 0 {
		return 0, 0, usagef("lyapunov: want --lag, --dim, --horizon, --neighbors, --evolve ≥ 0, --max-neighbors ≥ 1, --reps ≥ 2, --max-dim ≥ 1")
	}
	if (o.fitFrom >= 0) != (o.fitTo >= 0) {
		return 0, 0, usagef("lyapunov: give both --fit-from and --fit-to, or neither")
	}
	if o.fitTo >= 0 && o.fitTo <= o.fitFrom {
		return 0, 0, usagef("lyapunov: --fit-to %d must be larger than --fit-from %d", o.fitTo, o.fitFrom)
	}
	return method, norm, nil
}

// lyapunovCompute estimates the largest exponent of s (choosing what o does not give) and
// returns what the renderers need with the JSON parameters and body of `lyapunov`; the command
// and the report both use it. lagMethod and dimMethod name the rules that chose o.lag and o.dim
// when a caller chose them already (the report's earlier stages); "" means given or chosen
// here. When the curve has no linear range the run, parameters and body are returned with a
// no-answer error (the body then carries the curve and the reason).
func (a *app) lyapunovCompute(path string, s *series.Series, o *lyapunovOptions, lagMethod, dimMethod string) (*lyapunovRun, lyapunovParams, lyapunovResult, error) {
	fail := func(err error) (*lyapunovRun, lyapunovParams, lyapunovResult, error) {
		return nil, lyapunovParams{}, lyapunovResult{}, err
	}
	method, norm, err := checkLyapunovOptions(o)
	if err != nil {
		return fail(err)
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return fail(err)
	}
	x := s.Values
	ec, err := a.chooseEmbedding("lyapunov", path, x, o.lag, o.theiler, o.dim, o.maxDim, norm, lagMethod, dimMethod)
	if err != nil {
		return fail(err)
	}
	lag, theiler, theilerFrom, dim, cautions := ec.lag, ec.theiler, ec.theilerFrom, ec.dim, ec.cautions
	lagMethod, dimMethod = ec.lagMethod, ec.dimMethod
	if theilerFrom != "given" {
		a.notef("Theiler window %d samples (%s)", theiler, theilerFrom)
	}
	opt := lyapunov.Options{Lag: lag, Dim: dim, Theiler: theiler, Method: method, Norm: norm,
		Horizon: o.horizon, Eps: o.eps, MaxNeighbors: o.maxNeighbors, Dt: s.Dt, Reps: o.reps,
		Seed: a.global.Seed, Threads: a.threads(), Progress: a.progress("divergence")}
	if o.fitTo >= 0 {
		opt.FitFrom, opt.FitTo = o.fitFrom, o.fitTo
	}
	r, derr := lyapunov.Divergence(x, opt)
	if r == nil {
		if derr == nil {
			derr = errors.New("no result")
		}
		return fail(noAnswer(fmt.Errorf("lyapunov: %s: %w", path, derr)))
	}
	var sp *lyapunov.SpectrumResult
	if o.spectrum {
		sp, err = lyapunov.Spectrum(x, lyapunov.SpectrumOptions{Lag: lag, Dim: dim, Theiler: theiler, Norm: norm,
			Neighbors: o.neighbors, Evolve: o.evolve, Dt: s.Dt, Threads: a.threads(), Progress: a.progress("local maps")})
		if err != nil {
			return fail(noAnswer(fmt.Errorf("lyapunov: %s: spectrum: %w", path, err)))
		}
	}
	res := lyapunovResult{References: r.ReferencePoints, Cautions: append(cautions, r.Cautions...)}
	ch := r.Curves[r.Chosen]
	for k, v := range ch.MeanLog {
		if !math.IsNaN(v) {
			res.Divergence = append(res.Divergence, divergencePoint{Step: k, MeanLog: v, Pairs: ch.Pairs[k]})
		}
	}
	if derr == nil {
		res.LambdaMax, res.LambdaMaxPerSample = &r.Lambda, &r.LambdaPerSample
		res.Interval, res.IntervalPerSample = &r.Interval, &r.IntervalPerSample
		crit := "given"
		if r.AutoRange {
			ro := r.RangeOptions
			crit = fmt.Sprintf("longest non-plateau range whose %d-step local slopes stay within %g·|median| + %.3g of their median (at least %d points; plateau: rise under %g nat)",
				ro.Window, ro.RelTol, ro.AbsTol, ro.MinPoints, ro.FlatRise)
			if ch.Fit.Plateau {
				crit = "no range rises by a factor e: the whole horizon after the first step (bounded curve)"
			}
		}
		res.Fit = &lyapunovFit{From: r.From, To: r.To, Automatic: r.AutoRange, Criterion: crit}
	} else {
		res.Reason = derr.Error()
	}
	if method == lyapunov.Kantz {
		res.Eps = &ch.Eps
		for e, c := range r.Curves {
			ej := epsCurveJSON{Eps: c.Eps, References: c.References}
			if c.FitErr == nil {
				ps := r.EpsSlopes[e]
				pt := ps / s.Dt
				ej.LambdaMaxPerSample, ej.LambdaMax = &ps, &pt
				ej.Fit = &[2]int{c.Fit.From, c.Fit.To}
			}
			res.Curves = append(res.Curves, ej)
		}
	}
	if sp != nil {
		res.Spectrum, res.SpectrumPerSample = sp.Exponents, sp.PerSample
		res.KaplanYorke, res.SpectrumNote = &sp.KaplanYorke, sp.Note
		res.Cautions = append(res.Cautions, sp.Cautions...)
	}
	if res.Cautions == nil {
		res.Cautions = []string{}
	}
	p := lyapunovParams{prepParams: newPrepParams(s, &o.in), Lag: lag, LagMethod: lagMethod, Dim: dim,
		DimMethod: dimMethod, Theiler: theiler, TheilerFrom: theilerFrom, Method: method.String(),
		Norm: norm.String(), Horizon: r.Horizon, Blocks: r.Blocks, Reps: r.Reps, Level: r.Level,
		Seed: a.global.Seed, Threads: a.threads(), Spectrum: o.spectrum}
	if method == lyapunov.Kantz {
		p.Eps, p.MaxNeighbors = make([]float64, len(r.Curves)), r.MaxNeighbors
		for e, c := range r.Curves {
			p.Eps[e] = c.Eps
		}
	}
	if o.fitTo >= 0 {
		ff, ft := o.fitFrom, o.fitTo
		p.FitFrom, p.FitTo = &ff, &ft
	}
	if sp != nil {
		p.Neighbors, p.Evolve = sp.Neighbors, sp.Evolve
	}
	run := &lyapunovRun{r: r, sp: sp, method: method, lagMethod: lagMethod, dimMethod: dimMethod, theilerBy: theilerFrom}
	var noFit error
	if derr != nil {
		if errors.Is(derr, fit.ErrNoRange) {
			noFit = noAnswer(fmt.Errorf("lyapunov: %s: %w; give --fit-from and --fit-to to fit a range anyway", path, derr))
		} else {
			noFit = noAnswer(fmt.Errorf("lyapunov: %s: %w", path, derr))
		}
	}
	return run, p, res, noFit
}

// lyapunovFigure draws the divergence curves with the fit range shaded and the fitted line.
func lyapunovFigure(run *lyapunovRun, name string) (*plot.Plot, error) {
	r := run.r
	p, err := figure.DivergencePlot(r, fmt.Sprintf("%s: divergence (%s, m = %d, τ = %d, Theiler %d)", name, run.method, r.Dim, r.Lag, r.Theiler), "")
	if err != nil {
		return nil, fmt.Errorf("lyapunov: figure: %w", err)
	}
	return p, nil
}

func (a *app) runLyapunov(path string, o *lyapunovOptions) error {
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	if _, _, err := checkLyapunovOptions(o); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	run, p, res, fail := a.lyapunovCompute(path, s, o, "", "")
	if run == nil {
		return fail
	}
	r := run.r
	if o.csvPath != "" {
		header := []string{"step"}
		cols := [][]float64{make([]float64, r.Horizon+1)}
		for k := range cols[0] {
			cols[0][k] = float64(k)
		}
		for _, c := range r.Curves {
			if run.method == lyapunov.Kantz {
				header = append(header, "mean_log_eps_"+strconv.FormatFloat(c.Eps, 'g', 6, 64))
			} else {
				header = append(header, "mean_log")
			}
			cols = append(cols, c.MeanLog)
		}
		if err := writeCSVFile(o.csvPath, path, header, cols...); err != nil {
			return err
		}
	}
	if o.plot != "" {
		title := filepath.Base(path)
		if path == "-" {
			title = "standard input"
		}
		pl, err := lyapunovFigure(run, title)
		if err != nil {
			return err
		}
		if err := writeFigureFile(o.plot, path, figure.Width, figure.Height, [][]*plot.Plot{{pl}}); err != nil {
			return err
		}
	}
	if a.global.JSON {
		if err := a.emitJSON("lyapunov", in, p, res); err != nil {
			return err
		}
		return fail
	}
	return errors.Join(a.lyapunovTable(r, run.sp, res, run.lagMethod, run.dimMethod, run.theilerBy), fail)
}

// lyapunovTable prints the human summary.
func (a *app) lyapunovTable(r *lyapunov.Result, sp *lyapunov.SpectrumResult, res lyapunovResult, lagMethod, dimMethod, theilerFrom string) error {
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
	rows := [][]string{
		{"embedding", fmt.Sprintf("lag %d samples (%s), dimension %d (%s), Theiler window %d samples (%s), %s norm",
			r.Lag, lagMethod, r.Dim, dimMethod, r.Theiler, theilerFrom, r.Norm)},
		{"curve", fmt.Sprintf("%s, horizon %d steps (%s time units), %d reference points", r.Method, r.Horizon, g(float64(r.Horizon)*r.Dt), r.ReferencePoints)},
	}
	if r.Method == lyapunov.Kantz {
		ch := r.Curves[r.Chosen]
		line := fmt.Sprintf("chosen ε = %s (median slope);", g(ch.Eps))
		for e, c := range r.Curves {
			sl := "no range"
			if !math.IsNaN(r.EpsSlopes[e]) {
				sl = g(r.EpsSlopes[e]/r.Dt) + "/time"
			}
			line += fmt.Sprintf(" ε %s: %s;", g(c.Eps), sl)
		}
		rows = append(rows, []string{"eps", line})
	}
	if res.LambdaMax != nil {
		rows = append(rows,
			[]string{"lambda_max", fmt.Sprintf("%s nats per time unit = %s bits per time unit", g(r.Lambda), g(r.Lambda/ln2))},
			[]string{"per sample", fmt.Sprintf("%s nats per step (dt = %s)", g(r.LambdaPerSample), g(r.Dt))},
			[]string{"interval", fmt.Sprintf("[%s, %s] nats per time unit (%.0f%%, block bootstrap over reference points, %d resamples)",
				g(r.Interval[0]), g(r.Interval[1]), 100*r.Level, r.Bootstrap.Reps)},
			[]string{"fit range", fmt.Sprintf("steps %d … %d (%s)", r.From, r.To, res.Fit.Criterion)})
	}
	if sp != nil {
		line := ""
		for k, v := range sp.Exponents {
			if k > 0 {
				line += ", "
			}
			line += g(v)
		}
		rows = append(rows,
			[]string{"spectrum", line + " nats per time unit (" + strconv.Itoa(sp.Steps) + " local maps)"},
			[]string{"Kaplan–Yorke", g(sp.KaplanYorke)})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	if sp != nil {
		fmt.Fprintf(a.stdout, "note: %s\n", sp.Note)
	}
	for _, c := range res.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}
