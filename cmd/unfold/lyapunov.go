package main

import (
	"errors"
	"path/filepath"
	"strconv"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
	"gonum.org/v1/plot"

	"unfold/analysis"
	"unfold/figure"
	"unfold/lyapunov"
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
	refPoints    int
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

Exit status 1 when no range of the curve is linear (say --fit-from/--fit-to to fit anyway).

Cost as a function of N: a kd-tree over the delay vectors, O(N log N · m), then a fixed number
of reference points R (--reference-points, default 4000, one drawn at random from each of R
equal stretches of the record with --seed) searched for neighbours among all vectors, O(R log N),
and followed for the horizon, O(R · horizon · max-neighbors · m): about linear in N; memory
O(N · m). The JSON states "reference_points" and "sampling".`,
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
	d := analysis.DefaultLyapunovOptions()
	f.IntVar(&o.lag, "lag", d.Lag, "delay in samples (default: chosen from the mutual information, as 'unfold lag')")
	f.IntVar(&o.dim, "dim", d.Dim, "embedding dimension (default: chosen by false neighbours / Cao, as 'unfold dim')")
	f.IntVar(&o.maxDim, "max-dim", d.MaxDim, "largest dimension scanned when --dim is chosen automatically")
	f.IntVar(&o.theiler, "theiler", d.Theiler, "Theiler window in samples (default: 1/e decay time of the autocorrelation; 0 excludes only the point itself)")
	f.StringVar(&o.method, "method", d.Method, "divergence curve: kantz or rosenstein")
	f.StringVar(&o.norm, "norm", d.Norm, "distance between delay vectors: euclidean or max")
	f.IntVar(&o.horizon, "horizon", d.Horizon, "steps each pair is followed (default 10·lag·(dim−1) clamped to 30…500, and at most a quarter of the delay vectors)")
	f.Float64SliceVar(&o.eps, "eps", d.Eps, "Kantz radii in signal units, comma-separated ascending (default 2, 4, 8, 16 × the median nearest-neighbour distance)")
	f.IntVar(&o.maxNeighbors, "max-neighbors", d.MaxNeighbors, "Kantz: at most this many nearest neighbours within ε")
	f.IntVar(&o.fitFrom, "fit-from", d.FitFrom, "first step of the fit range (with --fit-to; default automatic)")
	f.IntVar(&o.fitTo, "fit-to", d.FitTo, "last step of the fit range (with --fit-from; default automatic)")
	f.IntVar(&o.reps, "reps", d.Reps, "bootstrap resamples for the interval")
	f.IntVar(&o.refPoints, "reference-points", d.ReferencePoints, "reference points followed, one drawn at random from each of as many equal stretches of the record (default "+strconv.Itoa(lyapunov.DefaultReferencePoints)+"; all admissible points when fewer)")
	f.BoolVar(&o.spectrum, "spectrum", d.Spectrum, "also estimate the whole spectrum from local linear maps, and the Kaplan–Yorke dimension")
	f.IntVar(&o.neighbors, "neighbors", d.Neighbors, "--spectrum: neighbours per local fit (default max(5·dim, 20))")
	f.IntVar(&o.evolve, "evolve", d.Evolve, "--spectrum: steps spanned by each local map (default the lag)")
	f.StringVar(&o.csvPath, "csv", "", "write the divergence curves to this CSV file (step, then mean_log per curve)")
	f.StringVar(&o.plot, "plot", "", "draw the curves, the fit range and the fitted line (.png or .svg)")
}

func (o *lyapunovOptions) options() analysis.LyapunovOptions {
	return analysis.LyapunovOptions{Lag: o.lag, Dim: o.dim, MaxDim: o.maxDim, Theiler: o.theiler, Method: o.method,
		Norm: o.norm, Horizon: o.horizon, Eps: o.eps, MaxNeighbors: o.maxNeighbors, FitFrom: o.fitFrom, FitTo: o.fitTo,
		Reps: o.reps, ReferencePoints: o.refPoints, Spectrum: o.spectrum, Neighbors: o.neighbors, Evolve: o.evolve}
}

func (a *app) runLyapunov(path string, o *lyapunovOptions) error {
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	if _, _, err := analysis.CheckLyapunov(o.options()); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	run, p, res, fail := a.env(&o.in).Lyapunov(path, s, o.options(), nil, nil)
	if run == nil {
		return fail
	}
	r := run.R
	if o.csvPath != "" {
		header := []string{"step"}
		cols := [][]float64{make([]float64, r.Horizon+1)}
		for k := range cols[0] {
			cols[0][k] = float64(k)
		}
		for _, c := range r.Curves {
			if run.Method == lyapunov.Kantz {
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
		pl, err := figure.Lyapunov(run, title, s.TimeUnit)
		if err != nil {
			return err
		}
		if err := writeFigureFile(o.plot, path, [][]*plot.Plot{{pl}}); err != nil {
			return err
		}
	}
	if a.global.JSON {
		if err := a.emitJSON("lyapunov", in, p, res); err != nil {
			return err
		}
		return fail
	}
	return errors.Join(a.lyapunovTable(r, run.Spectrum, res, run.LagMethod, run.DimMethod, run.TheilerBy), fail)
}
