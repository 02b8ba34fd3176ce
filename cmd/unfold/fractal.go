package main

import (
	"errors"
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"unfold/dimension"
	"unfold/series"
)

type fractalOptions struct {
	in        inputOptions
	lag       int
	dim       int
	maxDim    int
	theiler   int
	radii     string
	euclidean bool
	csv       string
	plot      string
}

func newFractalCmd(a *app) *cobra.Command {
	o := &fractalOptions{}
	cmd := &cobra.Command{
		Use:   "fractal FILE",
		Short: "Correlation sums and the correlation dimension D2 with its scaling range and interval",
		Long: `fractal computes the correlation sums C(r) of the delay vectors for embedding dimensions
m = 1…max-dim (Grassberger & Procaccia 1983) at log-spaced radii, excluding pairs closer in time
than the Theiler window (Theiler 1986), and reads the correlation dimension D2 from the scaling
range of log C against log r (found automatically; local slopes stable within 10 %, retried at
20 %), with a 95 % bootstrap interval. "saturated" is true when D2 of the three largest
dimensions agree within max(0.1, 5 %) and lie at least 1 below m; D2 is then their median. The
Takens (1985) maximum-likelihood estimate is a second opinion. A caution is given when D2
exceeds 2·log10(N) (Eckmann & Ruelle 1992).

When --lag or --theiler are not given they are chosen as 'unfold lag' does (first significant
minimum of the mutual information; 1/e decay time of the autocorrelation) and printed. Distances
use the maximum norm unless --euclidean. Radii are in signal units.`,
		Example: `  # Hénon data, lag 1, dimensions 1…5, Theiler window 2
  unfold simulate henon --n 10000 -o henon.csv
  unfold fractal --column x --lag 1 --max-dim 5 --theiler 2 henon.csv
  # automatic lag and Theiler window; curves to CSV and local slopes to a figure
  unfold fractal --column x --json --csv csum.csv --plot slopes.png lorenz.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runFractal(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	addFractalFlags(cmd.Flags(), o)
	return cmd
}

// addFractalFlags binds the flags of `fractal` (besides the input flags) to o, with their defaults.
func addFractalFlags(f *pflag.FlagSet, o *fractalOptions) {
	f.IntVar(&o.lag, "lag", 0, "delay in samples (default: chosen from the mutual information)")
	f.IntVar(&o.dim, "dim", 0, "compute only up to this dimension (same as --max-dim; kept for symmetry with other commands)")
	f.IntVar(&o.maxDim, "max-dim", 8, "largest embedding dimension")
	f.IntVar(&o.theiler, "theiler", -1, "Theiler window in samples (default: 1/e decay time of the autocorrelation; 0 excludes only the point itself)")
	f.StringVar(&o.radii, "radii", "", "radii in signal units: a comma list (0.01,0.02,…) or lo:hi:count log-spaced (default: 40 radii from 10^-3.5 of the range up to the range)")
	f.BoolVar(&o.euclidean, "euclidean", false, "use the Euclidean norm instead of the maximum norm")
	f.StringVar(&o.csv, "csv", "", "write the correlation sums (dimension, r, c, pairs, local_slope) to this CSV file")
	f.StringVar(&o.plot, "plot", "", "draw the local slopes d log C / d log r against r for every m (.png or .svg)")
}

// parseRadii reads "a,b,c" or "lo:hi:count".
func parseRadii(s string) ([]float64, error) {
	if s == "" {
		return nil, nil
	}
	if p := strings.Split(s, ":"); len(p) == 3 {
		lo, e1 := strconv.ParseFloat(p[0], 64)
		hi, e2 := strconv.ParseFloat(p[1], 64)
		n, e3 := strconv.Atoi(p[2])
		if e1 != nil || e2 != nil || e3 != nil || !(lo > 0) || !(hi > lo) || n < 5 {
			return nil, usagef("fractal: --radii %q: want lo:hi:count with 0 < lo < hi and count ≥ 5", s)
		}
		r := make([]float64, n)
		for k := range r {
			r[k] = lo * math.Pow(hi/lo, float64(k)/float64(n-1))
		}
		return r, nil
	}
	var r []float64
	for i, f := range strings.Split(s, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || !(v > 0) {
			return nil, usagef("fractal: --radii %q: item %d (%q) is not a positive number", s, i+1, f)
		}
		r = append(r, v)
	}
	if len(r) < 5 {
		return nil, usagef("fractal: --radii %q: need at least 5 radii", s)
	}
	return r, nil
}

type fractalParams struct {
	Column    string `json:"column"`
	Lag       int    `json:"lag"`
	LagMethod string `json:"lag_method"`
	MaxDim    int    `json:"max_dim"`
	Theiler   int    `json:"theiler"`
	TheilerBy string `json:"theiler_method"`
	Norm      string `json:"norm"`
	Radii     int    `json:"radii"`
	Seed      uint64 `json:"seed"`
}

type csumPoint struct {
	Dimension int     `json:"dimension"`
	R         float64 `json:"r"`
	C         float64 `json:"c"`
}

type fractalDim struct {
	Dimension int        `json:"dimension"`
	D2        *float64   `json:"d2"`
	Interval  [2]float64 `json:"interval"`
	Takens    *float64   `json:"takens"`
}

type fractalResult struct {
	D2             float64      `json:"d2"`
	Interval       [2]float64   `json:"interval"`
	ScalingRange   [2]float64   `json:"scaling_range"`
	Saturated      bool         `json:"saturated"`
	Dimension      int          `json:"dimension"`
	Takens         *float64     `json:"takens"`
	PerDimension   []fractalDim `json:"per_dimension"`
	CorrelationSum []csumPoint  `json:"correlation_sum"`
	Cautions       []string     `json:"cautions"`
}

// fractalRun is what fractalCompute found, for the renderers (table, CSV, figure).
type fractalRun struct {
	r                    *dimension.Result
	lag, theiler         int
	lagMethod, theilerBy string
	cautions             []string
}

// checkFractalOptions validates the flags of `fractal` (after --dim has been folded into
// --max-dim) and parses the radii.
func checkFractalOptions(o *fractalOptions) ([]float64, error) {
	if o.lag < 0 || o.maxDim < 1 || o.maxDim > 30 {
		return nil, usagef("fractal: want --lag ≥ 0 and 1 ≤ --max-dim ≤ 30")
	}
	return parseRadii(o.radii)
}

// fractalCompute computes the correlation sums of s and D2 (choosing what o does not give) and
// returns what the renderers need with the JSON parameters and body of `fractal`; the command
// and the report both use it. lagMethod and theilerBy name the rules that chose o.lag and
// o.theiler when a caller chose them already (the report's earlier stages); "" means given or
// chosen here. When the curves have no scaling range the run is returned (its curves can be
// drawn) with a no-answer error, and the body is empty.
func (a *app) fractalCompute(path string, s *series.Series, o *fractalOptions, lagMethod, theilerBy string) (*fractalRun, fractalParams, fractalResult, error) {
	fail := func(run *fractalRun, err error) (*fractalRun, fractalParams, fractalResult, error) {
		return run, fractalParams{}, fractalResult{}, err
	}
	radii, err := checkFractalOptions(o)
	if err != nil {
		return fail(nil, err)
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return fail(nil, err)
	}
	x := s.Values
	lag, lagBy, theiler, theilerFrom, cautions, err := a.embeddingDefaults(x, o.lag, o.theiler)
	if err != nil {
		return fail(nil, noAnswer(fmt.Errorf("fractal: %s: %w", path, err)))
	}
	if lagMethod == "" {
		lagMethod = lagBy
	}
	if theilerFrom != "given" {
		a.notef("Theiler window %d samples (%s)", theiler, theilerFrom)
	}
	if theilerBy != "" {
		theilerFrom = theilerBy
	}
	r, derr := dimension.CorrelationDimension(x, dimension.Options{Lag: lag, MaxDim: o.maxDim, Theiler: theiler,
		Radii: radii, Euclidean: o.euclidean, Seed: a.global.Seed, Threads: a.threads(), Progress: a.progress("pair counts")})
	if r == nil {
		return fail(nil, noAnswer(fmt.Errorf("fractal: %s: %w", path, derr)))
	}
	cautions = append(cautions, r.Cautions...)
	if cautions == nil {
		cautions = []string{}
	}
	run := &fractalRun{r: r, lag: lag, theiler: theiler, lagMethod: lagMethod, theilerBy: theilerFrom, cautions: cautions}
	if derr != nil {
		return fail(run, noAnswer(fmt.Errorf("fractal: %s: %w", path, derr)))
	}
	res := fractalResult{D2: r.D2, Interval: [2]float64{r.Lo, r.Hi}, ScalingRange: [2]float64{r.RLo, r.RHi},
		Saturated: r.Saturated, Dimension: r.Dim, Takens: finitePtr(r.Takens), Cautions: cautions, CorrelationSum: []csumPoint{}}
	for _, c := range r.Curves {
		fd := fractalDim{Dimension: c.Dim}
		if c.Fitted {
			d2, tk := c.D2, c.Takens
			fd.D2, fd.Interval = &d2, [2]float64{c.Lo, c.Hi}
			if !math.IsNaN(tk) {
				fd.Takens = &tk
			}
		}
		res.PerDimension = append(res.PerDimension, fd)
		for k, rad := range r.Radii {
			res.CorrelationSum = append(res.CorrelationSum, csumPoint{c.Dim, rad, c.C[k]})
		}
	}
	p := fractalParams{Column: s.Name, Lag: lag, LagMethod: lagMethod, MaxDim: r.MaxDim, Theiler: theiler,
		TheilerBy: theilerFrom, Norm: r.Norm, Radii: len(r.Radii), Seed: a.global.Seed}
	return run, p, res, nil
}

// fractalFigure draws the local slopes of the correlation sums of run.
func fractalFigure(run *fractalRun, name string) (*plot.Plot, error) {
	return slopePlot(run.r, fmt.Sprintf("%s: local slopes (τ = %d, Theiler %d, %s norm)", name, run.lag, run.theiler, run.r.Norm))
}

func (a *app) runFractal(path string, o *fractalOptions) error {
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	if o.dim > 0 {
		o.maxDim = o.dim
	}
	if _, err := checkFractalOptions(o); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	run, p, res, derr := a.fractalCompute(path, s, o, "", "")
	if run == nil {
		return derr
	}
	r, lag, theiler, lagMethod, theilerFrom, cautions := run.r, run.lag, run.theiler, run.lagMethod, run.theilerBy, run.cautions
	if o.csv != "" {
		var dims, rs, cs, ps, sl []float64
		for _, c := range r.Curves {
			for k, rad := range r.Radii {
				dims = append(dims, float64(c.Dim))
				rs = append(rs, rad)
				cs = append(cs, c.C[k])
				ps = append(ps, float64(c.Pairs[k]))
				sl = append(sl, c.Slopes[k])
			}
		}
		if err := writeCSVFile(o.csv, path, []string{"dimension", "r", "c", "pairs", "local_slope"}, dims, rs, cs, ps, sl); err != nil {
			return err
		}
	}
	if o.plot != "" {
		pl, err := fractalFigure(run, figureName(path))
		if err != nil {
			return err
		}
		if err := writeFigureFile(o.plot, path, 8*vg.Inch, 5.5*vg.Inch, [][]*plot.Plot{{pl}}); err != nil {
			return err
		}
	}
	if derr != nil {
		if errors.Is(derr, dimension.ErrNoScaling) {
			for _, c := range cautions {
				a.notef("caution: %s", c)
			}
		}
		return derr
	}
	if a.global.JSON {
		return a.emitJSON("fractal", in, p, res)
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
	rows := [][]string{
		{"file", path},
		{"lag", fmt.Sprintf("%d samples (%s)", lag, lagMethod)},
		{"Theiler window", fmt.Sprintf("%d samples (%s)", theiler, theilerFrom)},
		{"D2", fmt.Sprintf("%s [%s, %s] at m = %d, saturated %v", g(r.D2), g(r.Lo), g(r.Hi), r.Dim, r.Saturated)},
		{"scaling range", fmt.Sprintf("r = %s … %s", g(r.RLo), g(r.RHi))},
		{"Takens estimate", g(r.Takens)},
	}
	for _, c := range r.Curves {
		v := "no scaling range"
		if c.Fitted {
			v = fmt.Sprintf("%s [%s, %s]", g(c.D2), g(c.Lo), g(c.Hi))
		}
		rows = append(rows, []string{fmt.Sprintf("  m = %d", c.Dim), v})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}

// figureName is the input's name for figure titles.
func figureName(path string) string {
	if path == "-" {
		return "standard input"
	}
	return path
}

// slopePlot draws the local slopes against r (log axis) for every dimension, with the fitted
// scaling range of each curve drawn thicker.
func slopePlot(r *dimension.Result, title string) (*plot.Plot, error) {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = "r (signal units, log scale)"
	p.Y.Label.Text = "d log C / d log r"
	p.X.Scale = plot.LogScale{}
	p.X.Tick.Marker = plot.LogTicks{Prec: -1}
	for i, c := range r.Curves {
		var pts, fitPts plotter.XYs
		for k, s := range c.Slopes {
			if math.IsNaN(s) || math.IsInf(s, 0) {
				continue
			}
			pts = append(pts, plotter.XY{X: r.Radii[k], Y: s})
			if c.Fitted && k >= c.From && k <= c.To {
				fitPts = append(fitPts, plotter.XY{X: r.Radii[k], Y: s})
			}
		}
		if len(pts) < 2 {
			continue
		}
		col := palette(i)
		l, err := plotter.NewLine(pts)
		if err != nil {
			return nil, err
		}
		l.Color = col
		p.Add(l)
		p.Legend.Add(fmt.Sprintf("m = %d", c.Dim), l)
		if len(fitPts) >= 2 {
			f, err := plotter.NewLine(fitPts)
			if err != nil {
				return nil, err
			}
			f.Color, f.Width = col, vg.Points(3)
			p.Add(f)
		}
	}
	if r.D2 > 0 {
		h := plotter.NewFunction(func(float64) float64 { return r.D2 })
		h.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
		h.Color = color.Gray{Y: 80}
		p.Add(h)
		p.Legend.Add(fmt.Sprintf("D2 = %.3g", r.D2), h)
	}
	p.Legend.Top, p.Legend.Left = true, true
	p.Y.Min = 0
	return p, nil
}

// palette returns a distinguishable colour for curve i.
func palette(i int) color.Color {
	cols := []color.RGBA{{31, 119, 180, 255}, {214, 39, 40, 255}, {44, 160, 44, 255}, {148, 103, 189, 255},
		{255, 127, 14, 255}, {140, 86, 75, 255}, {227, 119, 194, 255}, {23, 190, 207, 255}, {127, 127, 127, 255}, {188, 189, 34, 255}}
	return cols[i%len(cols)]
}

// finitePtr returns &v, or nil (JSON null) when v is NaN or infinite.
func finitePtr(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}
