package main

import (
	"github.com/spf13/cobra"
	"gonum.org/v1/plot"

	"unfold/analysis"
	"unfold/figure"
	"unfold/series"
)

type denoiseOptions struct {
	in          inputOptions
	output      string
	method      string
	dim, lag, q int
	eps         float64
	epsFactor   float64
	iterations  int
	minNb       int
	maxNb       int
	theiler     int
	euclidean   bool
	endWeight   float64
	lowpass     float64
	highpass    float64
	bandpass    string
	filterOrder int
	resample    float64
	polyDetrend int
	plot        string
}

func newDenoiseCmd(a *app) *cobra.Command {
	o := &denoiseOptions{}
	cmd := &cobra.Command{
		Use:   "denoise FILE -o OUT.csv",
		Short: "Nonlinear noise reduction (local projective or locally constant) and zero-phase filtering, resampling, polynomial detrending",
		Long: `denoise cleans a record and writes it as CSV: a header, then one row per sample with the
time stamp t = T0 + i·Dt (T0 the first time stamp of the input, Dt its sampling interval), the
input value and the cleaned value in the last column. Without --resample the output has as many
rows and the same time stamps as the (preprocessed) input. The input is never overwritten.

Steps, in this order, each only when asked for:
  1. --poly-detrend ORDER: remove the least-squares polynomial of that order in time
     (Legendre basis; ORDER 0 is the mean).
  2. --lowpass F / --highpass F / --bandpass F1,F2: Butterworth filter of --filter-order
     (Butterworth 1930) by the bilinear transform with prewarping, as second-order sections,
     applied forward and backward: zero phase, magnitude |H|², so −6 dB at a corner (one pass is
     −3 dB there). Frequencies are in cycles per time unit of Dt: Hz when the time column is in
     seconds. Edges: odd reflection of the record plus a steady-state start of each section.
  3. --resample DT: Kaiser-windowed sinc interpolation to the new interval (16 zero crossings);
     the kernel's cutoff is the lower of the old and new Nyquist frequencies (anti-alias rule).
     The output then has the new time grid t = T0 + i·DT (one cleaned column).
  4. Nonlinear noise reduction (--method, default projective; none skips it):
     projective: local projective noise reduction (Grassberger, Hegger, Kantz, Schaffrath &
       Schreiber 1993, Chaos 3, 127): each delay vector is projected onto the q-dimensional local
       manifold of its ε-neighbourhood (weighted covariance, first and last coordinates weighted
       by --end-weight so they are hardly moved).
     constant: locally constant noise reduction (Schreiber 1993, Phys. Rev. E 47, 2401): the
       middle coordinate of each delay vector is replaced by its mean over the ε-neighbours.
     Defaults, all shown and overridable: m = 7 (--dim), lag from the mutual-information rule of
     'unfold lag' (--lag), q = 2 (--q), ε = 3 × the noise level estimated from the spread of the
     delay vectors across their local manifolds (--eps, --eps-factor), at most 5 iterations
     (--max-iter). After each iteration the rms correction is printed; iteration stops when it
     no longer shrinks (that pass is discarded). Distances use the maximum norm (--norm
     euclidean for the Euclidean norm).

--plot draws the delay picture x(t+lag) against x(t) before and after (at most 20000 points
each).`,
		Example: `  # a noisy Hénon record: projective noise reduction with the defaults
  unfold simulate henon --n 10000 --noise 0.05 -o henon.csv
  unfold denoise --column x henon.csv -o henon_clean.csv --plot henon_clean.png
  # the locally constant method with a given radius and embedding, JSON report
  unfold denoise --method constant --dim 5 --lag 1 --eps 0.08 --json -o clean.csv henon.csv
  # band-pass 0.5–20 Hz (time column in seconds) and a quadratic trend removed, no nonlinear step
  unfold denoise --method none --bandpass 0.5,20 --poly-detrend 2 -o filtered.csv vibration.csv
  # resample to 0.05 s, then reduce noise in m = 6 with q = 3
  unfold denoise --resample 0.05 --dim 6 --q 3 -o out.csv probe.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runDenoise(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	d := analysis.DefaultDenoiseOptions()
	f := cmd.Flags()
	f.StringVarP(&o.output, "output", "o", "", "output CSV file (required): t, input, cleaned values in the last column")
	f.StringVar(&o.method, "method", d.Method, "nonlinear noise reduction: projective, constant or none")
	f.IntVar(&o.dim, "dim", d.Dim, "embedding dimension m")
	f.IntVar(&o.lag, "lag", 0, "delay in samples (default: chosen by the mutual-information rule of 'unfold lag')")
	f.IntVar(&o.q, "q", d.Q, "dimension of the local manifold (projective; also used by the noise estimate)")
	f.Float64Var(&o.eps, "eps", 0, "neighbourhood radius in signal units (default: --eps-factor × the estimated noise level)")
	f.Float64Var(&o.epsFactor, "eps-factor", d.EpsFactor, "default radius in units of the estimated noise level")
	f.IntVar(&o.iterations, "max-iter", d.Iterations, "largest number of iterations (stops earlier when the rms correction stops shrinking)")
	aliasFlag(f, "iterations", "max-iter")
	f.IntVar(&o.minNb, "min-neighbors", 0, "smallest neighbourhood for which a point is corrected (default: 2·m projective, 2 constant)")
	f.IntVar(&o.maxNb, "max-neighbors", 0, "use at most this many nearest ε-neighbours per point (0: all; bounds the time on long records)")
	f.IntVar(&o.theiler, "theiler", 0, "exclude neighbours closer in time than this many samples (0: only the point itself)")
	normFlag(f, &o.euclidean, "distance between delay vectors: euclidean or max")
	f.Float64Var(&o.endWeight, "end-weight", d.EndWeight, "weight of the first and last delay coordinates (projective)")
	f.Float64Var(&o.lowpass, "lowpass", 0, "low-pass corner frequency in cycles per time unit (Hz for seconds)")
	f.Float64Var(&o.highpass, "highpass", 0, "high-pass corner frequency in cycles per time unit (Hz for seconds)")
	f.StringVar(&o.bandpass, "bandpass", "", "band-pass corners F1,F2 in cycles per time unit (Hz for seconds)")
	f.IntVar(&o.filterOrder, "filter-order", d.FilterOrder, "Butterworth order of each filter (one pass)")
	f.Float64Var(&o.resample, "resample", 0, "resample to this sampling interval, in time units")
	f.IntVar(&o.polyDetrend, "poly-detrend", d.PolyDetrend, "remove a least-squares polynomial of this order (-1: none)")
	f.StringVar(&o.plot, "plot", "", "draw the delay picture before and after (.png or .svg)")
	return cmd
}

func (o *denoiseOptions) options() analysis.DenoiseOptions {
	return analysis.DenoiseOptions{Output: o.output, Plot: o.plot, Method: o.method, Dim: o.dim, Lag: o.lag, Q: o.q,
		Eps: o.eps, EpsFactor: o.epsFactor, Iterations: o.iterations, MinNeighbors: o.minNb, MaxNeighbors: o.maxNb,
		Theiler: o.theiler, Euclidean: o.euclidean, EndWeight: o.endWeight, Lowpass: o.lowpass, Highpass: o.highpass,
		Bandpass: o.bandpass, FilterOrder: o.filterOrder, Resample: o.resample, PolyDetrend: o.polyDetrend}
}

func (a *app) runDenoise(path string, o *denoiseOptions) error {
	if o.output == "" {
		return usagef("denoise: give the output file with -o OUT.csv")
	}
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	if _, _, err := analysis.CheckDenoise(o.options()); err != nil {
		return err
	}
	// refuse to write over the input before any work (the write itself checks again)
	if f, err := series.CreateAtomic(o.output, path); err != nil {
		return err
	} else {
		_ = f.Abort()
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	run, p, body, err := a.env(&o.in).Denoise(path, s, o.options())
	if err != nil {
		return err
	}
	x, dt, lag, before := run.Clean, run.Dt, run.Lag, run.Before
	// output
	t := make([]float64, len(x))
	for i := range t {
		t[i] = s.T0 + float64(i)*dt
	}
	tname := "t"
	if s.TimeName != "" {
		tname = s.TimeName
	}
	name := s.Name
	if name == "" {
		name = "x"
	}
	if o.resample == 0 {
		err = writeCSVFile(o.output, path, []string{tname, name, name + "_clean"}, t, s.Values, x)
	} else {
		err = writeCSVFile(o.output, path, []string{tname, name + "_clean"}, t, x)
	}
	if err != nil {
		return err
	}
	if o.plot != "" {
		l := max(lag, 1)
		pb, err := figure.DelayPanel(before, l, "before: "+name)
		if err != nil {
			return err
		}
		pa, err := figure.DelayPanel(x, l, "after: "+name+"_clean")
		if err != nil {
			return err
		}
		if err := writeFigureFile(o.plot, path, [][]*plot.Plot{{pb, pa}}); err != nil {
			return err
		}
	}
	if a.global.JSON {
		return a.emitJSON("denoise", in, p, body)
	}
	return a.denoiseTable(path, name, s, o, run, p, body)
}
