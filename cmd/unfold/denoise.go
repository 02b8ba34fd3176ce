package main

import (
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"unfold/denoise"
	"unfold/embed"
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

// denoisePlotPoints is the largest number of delay vectors drawn per panel of --plot.
const denoisePlotPoints = 20000

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
     (--iterations). After each iteration the rms correction is printed; iteration stops when it
     no longer shrinks (that pass is discarded). Distances use the maximum norm (--euclidean
     for the Euclidean norm).

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
	f := cmd.Flags()
	f.StringVarP(&o.output, "output", "o", "", "output CSV file (required): t, input, cleaned values in the last column")
	f.StringVar(&o.method, "method", "projective", "nonlinear noise reduction: projective, constant or none")
	f.IntVar(&o.dim, "dim", denoise.DefaultDim, "embedding dimension m")
	f.IntVar(&o.lag, "lag", 0, "delay in samples (default: chosen by the mutual-information rule of 'unfold lag')")
	f.IntVar(&o.q, "q", denoise.DefaultQ, "dimension of the local manifold (projective; also used by the noise estimate)")
	f.Float64Var(&o.eps, "eps", 0, "neighbourhood radius in signal units (default: --eps-factor × the estimated noise level)")
	f.Float64Var(&o.epsFactor, "eps-factor", denoise.DefaultEpsFactor, "default radius in units of the estimated noise level")
	f.IntVar(&o.iterations, "iterations", denoise.DefaultIterations, "largest number of iterations (stops earlier when the rms correction stops shrinking)")
	f.IntVar(&o.minNb, "min-neighbors", 0, "smallest neighbourhood for which a point is corrected (default: 2·m projective, 2 constant)")
	f.IntVar(&o.maxNb, "max-neighbors", 0, "use at most this many nearest ε-neighbours per point (0: all; bounds the time on long records)")
	f.IntVar(&o.theiler, "theiler", 0, "exclude neighbours closer in time than this many samples (0: only the point itself)")
	f.BoolVar(&o.euclidean, "euclidean", false, "use the Euclidean norm instead of the maximum norm")
	f.Float64Var(&o.endWeight, "end-weight", denoise.DefaultEndWeight, "weight of the first and last delay coordinates (projective)")
	f.Float64Var(&o.lowpass, "lowpass", 0, "low-pass corner frequency in cycles per time unit (Hz for seconds)")
	f.Float64Var(&o.highpass, "highpass", 0, "high-pass corner frequency in cycles per time unit (Hz for seconds)")
	f.StringVar(&o.bandpass, "bandpass", "", "band-pass corners F1,F2 in cycles per time unit (Hz for seconds)")
	f.IntVar(&o.filterOrder, "filter-order", denoise.DefaultOrder, "Butterworth order of each filter (one pass)")
	f.Float64Var(&o.resample, "resample", 0, "resample to this sampling interval, in time units")
	f.IntVar(&o.polyDetrend, "poly-detrend", -1, "remove a least-squares polynomial of this order (-1: none)")
	f.StringVar(&o.plot, "plot", "", "draw the delay picture before and after (.png or .svg)")
	return cmd
}

// denoiseParams are the "parameters" of the JSON output: every parameter used.
type denoiseParams struct {
	Column       string    `json:"column"`
	Method       string    `json:"method"`
	Dim          int       `json:"dim,omitempty"`
	Lag          int       `json:"lag,omitempty"`
	LagMethod    string    `json:"lag_method,omitempty"`
	Q            int       `json:"q,omitempty"`
	Eps          float64   `json:"eps,omitempty"`
	EpsRule      string    `json:"eps_rule,omitempty"`
	EpsFactor    float64   `json:"eps_factor,omitempty"`
	Iterations   int       `json:"iterations,omitempty"`
	MinNeighbors int       `json:"min_neighbors,omitempty"`
	MaxNeighbors int       `json:"max_neighbors"`
	Theiler      int       `json:"theiler"`
	Norm         string    `json:"norm,omitempty"`
	EndWeight    float64   `json:"end_weight,omitempty"`
	Lowpass      float64   `json:"lowpass,omitempty"`
	Highpass     float64   `json:"highpass,omitempty"`
	Bandpass     []float64 `json:"bandpass,omitempty"`
	FilterOrder  int       `json:"filter_order,omitempty"`
	FilterUnit   string    `json:"filter_frequency_unit,omitempty"`
	FilterPad    int       `json:"filter_edge_pad,omitempty"`
	Resample     float64   `json:"resample_dt,omitempty"`
	PolyDetrend  int       `json:"poly_detrend"`
	Detrend      string    `json:"detrend"`
	Standardize  bool      `json:"standardize"`
	Decimate     int       `json:"decimate"`
	From         string    `json:"from"`
	To           string    `json:"to"`
	Threads      int       `json:"threads"`
}

// denoiseResult is the JSON body of `denoise`.
type denoiseResult struct {
	NoiseLevel    float64             `json:"noise_level,omitempty"`
	NoiseSteps    []denoise.NoiseStep `json:"noise_estimate_steps,omitempty"`
	Iterations    []denoise.Iteration `json:"iterations"`
	RMSCorrection float64             `json:"rms_correction"`
	Rows          int                 `json:"rows"`
	Dt            float64             `json:"output_dt"`
	Output        string              `json:"output"`
	Plot          string              `json:"plot,omitempty"`
	Cautions      []string            `json:"cautions"`
	filters       []*denoise.Filter   // for the table
	res           *denoise.Result     // for the table
}

func (a *app) runDenoise(path string, o *denoiseOptions) error {
	if o.output == "" {
		return usagef("denoise: give the output file with -o OUT.csv")
	}
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	method := strings.ToLower(o.method)
	if method != "none" {
		if _, err := denoise.ParseMethod(method); err != nil || method == "" {
			return usagef("denoise: --method %q: want projective, constant or none", o.method)
		}
	}
	if o.polyDetrend < -1 || o.polyDetrend > denoise.MaxPolyOrder {
		return usagef("denoise: --poly-detrend %d: want -1 (none) or 0 … %d", o.polyDetrend, denoise.MaxPolyOrder)
	}
	var band []float64
	if o.bandpass != "" {
		parts := strings.Split(o.bandpass, ",")
		if len(parts) != 2 {
			return usagef("denoise: --bandpass %q: want two frequencies F1,F2", o.bandpass)
		}
		for _, p := range parts {
			v, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
			if err != nil {
				return usagef("denoise: --bandpass %q: %q is not a number", o.bandpass, p)
			}
			band = append(band, v)
		}
	}
	if method != "none" && (o.dim < 2 || o.q < 1 || o.q >= o.dim || o.iterations < 1 || o.eps < 0 || o.lag < 0) {
		return usagef("denoise: want --dim >= 2, 1 <= --q < --dim, --iterations >= 1, --eps >= 0 and --lag >= 0 (got dim %d, q %d, iterations %d, eps %g, lag %d)", o.dim, o.q, o.iterations, o.eps, o.lag)
	}
	if o.resample < 0 {
		return usagef("denoise: --resample %g: want a positive sampling interval", o.resample)
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
	if s.Len() < 2 {
		return noAnswer(fmt.Errorf("denoise: %s: %d samples: nothing to clean", path, s.Len()))
	}
	p := denoiseParams{Column: s.Name, Method: method, Theiler: o.theiler, PolyDetrend: o.polyDetrend,
		Detrend: o.in.prep.Detrend, Standardize: o.in.prep.Standardize, Decimate: max(o.in.prep.Decimate, 1),
		From: o.in.prep.From, To: o.in.prep.To, Threads: a.threads()}
	body := denoiseResult{Output: o.output, Plot: o.plot, Cautions: []string{}, Iterations: []denoise.Iteration{}}
	x := append([]float64(nil), s.Values...)
	dt := s.Dt

	// 1. polynomial detrend
	if o.polyDetrend >= 0 {
		if x, _, err = denoise.PolyDetrend(x, o.polyDetrend); err != nil {
			return usagef("denoise: --poly-detrend: %v", err)
		}
	}
	// 2. filters
	type fspec struct {
		band    denoise.Band
		corners []float64
		flag    string
	}
	var fs []fspec
	if o.highpass != 0 {
		fs = append(fs, fspec{denoise.HighPass, []float64{o.highpass}, "--highpass"})
		p.Highpass = o.highpass
	}
	if o.lowpass != 0 {
		fs = append(fs, fspec{denoise.LowPass, []float64{o.lowpass}, "--lowpass"})
		p.Lowpass = o.lowpass
	}
	if band != nil {
		fs = append(fs, fspec{denoise.BandPass, band, "--bandpass"})
		p.Bandpass = band
	}
	for _, f := range fs {
		flt, err := denoise.Butterworth(f.band, o.filterOrder, f.corners, dt)
		if err != nil {
			return usagef("denoise: %s: %v", f.flag, err)
		}
		if x, err = flt.ZeroPhase(x); err != nil {
			return noAnswer(fmt.Errorf("denoise: %s: %w", f.flag, err))
		}
		p.FilterOrder = o.filterOrder
		p.FilterPad = max(p.FilterPad, flt.PadLength(len(x)))
		body.filters = append(body.filters, flt)
	}
	if len(fs) > 0 {
		p.FilterUnit = "cycles per time unit"
		if s.TimeUnit != "" {
			p.FilterUnit = "cycles per " + s.TimeUnit
		}
	}
	// 3. resampling
	if o.resample > 0 {
		if x, err = denoise.Resample(x, dt, o.resample); err != nil {
			return usagef("denoise: --resample: %v", err)
		}
		dt = o.resample
		p.Resample = o.resample
	}
	before := append([]float64(nil), x...)
	// 4. nonlinear noise reduction
	lag := o.lag
	if method != "none" {
		if lag == 0 {
			c, err := embed.ChooseLag(x, embed.LagOptions{})
			if err != nil {
				return noAnswer(fmt.Errorf("denoise: %s: choosing the lag: %w (give --lag)", path, err))
			}
			lag = c.Lag
			p.LagMethod = c.Method
			a.notef("denoise: lag %d samples (%s)", lag, c.Reason)
		} else {
			p.LagMethod = "given"
		}
		m, _ := denoise.ParseMethod(method)
		res, err := denoise.Reduce(x, denoise.Options{Method: m, Dim: o.dim, Lag: lag, Q: o.q, Eps: o.eps,
			EpsFactor: o.epsFactor, Iterations: o.iterations, MinNeighbors: o.minNb, MaxNeighbors: o.maxNb, Theiler: o.theiler,
			Euclidean: o.euclidean, EndWeight: o.endWeight, Threads: a.threads(), Progress: a.progress("denoise")})
		if err != nil {
			return noAnswer(fmt.Errorf("denoise: %s: %w", path, err))
		}
		x = res.Values
		p.Dim, p.Lag, p.Q, p.Eps, p.EpsRule = res.Dim, res.Lag, res.Q, res.Eps, res.EpsRule
		p.MaxNeighbors = res.MaxNeighbors
		p.Iterations, p.MinNeighbors, p.Norm, p.EndWeight = o.iterations, res.MinNeighbors, res.Norm, res.EndWeight
		if o.eps == 0 {
			p.EpsFactor = o.epsFactor
		}
		if res.Noise != nil {
			body.NoiseLevel = res.Noise.Sigma
			body.NoiseSteps = res.Noise.Steps
		}
		body.Iterations = res.Iterations
		body.Cautions = append(body.Cautions, res.Cautions...)
		body.res = res
		for _, it := range res.Iterations {
			state := "applied"
			if !it.Applied {
				state = "discarded (did not shrink)"
			}
			a.notef("denoise: iteration %d: rms correction %.4g, %d uncorrected, %s", it.Iteration, it.RMSCorrection, it.Uncorrected, state)
		}
	}
	// rms correction relative to the record as read (same grid only)
	if o.resample == 0 {
		var ss float64
		for i := range x {
			d := x[i] - s.Values[i]
			ss += d * d
		}
		body.RMSCorrection = rmsOf(ss, len(x))
	} else if body.res != nil {
		body.RMSCorrection = body.res.RMSCorrection
	}
	body.Rows, body.Dt = len(x), dt

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
		pb, err := delayPanel(before, l, "before: "+name)
		if err != nil {
			return err
		}
		pa, err := delayPanel(x, l, "after: "+name+"_clean")
		if err != nil {
			return err
		}
		if err := writeFigureFile(o.plot, path, 13*vg.Inch, 6.5*vg.Inch, [][]*plot.Plot{{pb, pa}}); err != nil {
			return err
		}
	}
	if a.global.JSON {
		return a.emitJSON("denoise", in, p, body)
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 5, 64) }
	rows := [][]string{{"file", path}, {"signal", name}, {"samples in / out", fmt.Sprintf("%d / %d", s.Len(), len(x))}}
	if o.polyDetrend >= 0 {
		rows = append(rows, []string{"polynomial detrend", "order " + strconv.Itoa(o.polyDetrend)})
	}
	for _, f := range body.filters {
		rows = append(rows, []string{"filter", fmt.Sprintf("Butterworth %s order %d at %v %s, zero phase", f.Band, f.Order, f.Corners, p.FilterUnit)})
	}
	if o.resample > 0 {
		rows = append(rows, []string{"resampled", "dt " + g(s.Dt) + " → " + g(dt)})
	}
	if r := body.res; r != nil {
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

func rmsOf(ss float64, n int) float64 {
	if n == 0 {
		return 0
	}
	return math.Sqrt(ss / float64(n))
}

// delayPanel draws x(t+lag) against x(t) for at most denoisePlotPoints vectors.
func delayPanel(x []float64, lag int, title string) (*plot.Plot, error) {
	n := min(len(x)-lag, denoisePlotPoints)
	if n < 1 {
		return nil, fmt.Errorf("denoise: figure: too few samples for lag %d", lag)
	}
	pts := make(plotter.XYs, n)
	for i := range pts {
		pts[i].X, pts[i].Y = x[i], x[i+lag]
	}
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = "x(t)"
	p.Y.Label.Text = fmt.Sprintf("x(t + %d·dt)", lag)
	sc, err := plotter.NewScatter(pts)
	if err != nil {
		return nil, fmt.Errorf("denoise: figure: %w", err)
	}
	sc.GlyphStyle.Shape = draw.CircleGlyph{}
	sc.GlyphStyle.Radius = vg.Points(0.6)
	sc.GlyphStyle.Color = color.RGBA{R: 0x1f, G: 0x4e, B: 0x9a, A: 0xff}
	p.Add(sc)
	return p, nil
}
