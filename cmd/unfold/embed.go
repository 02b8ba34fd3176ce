package main

import (
	"bufio"
	"fmt"
	"path/filepath"
	"strconv"
	"strings"

	"codeberg.org/sbinet/npyio"
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/plot"

	"unfold/embed"
	"unfold/figure"
	"unfold/neighbors"
	"unfold/series"
)

type embedOptions struct {
	in           inputOptions
	output       string
	lag          int
	dim          int
	maxDim       int
	theiler      int
	plot         string
	stp          string
	stpMaxDt     int
	azimuth      float64
	elevation    float64
	densityAbove int
}

func newEmbedCmd(a *app) *cobra.Command {
	o := &embedOptions{}
	cmd := &cobra.Command{
		Use:   "embed FILE",
		Short: "Write the delay vectors and draw the state-space picture",
		Long: `embed builds the delay vectors (x(t), x(t+τ), …, x(t+(m−1)τ)) of a signal — N − (m−1)·τ of
them — and writes them (-o: .csv with a header, or .npy as an N×m float64 array). What is not
given is chosen by the same rules as 'unfold lag' (the lag) and 'unfold dim' (the dimension).

--plot draws the state-space picture: the 2-D delay plot x(t+τ) against x(t) and, for m ≥ 3, an
oblique view of (x(t), x(t+τ), x(t+2τ)) rotated by --azimuth and --elevation; up to
--density-above vectors are drawn as points, more as a density image (log10 of the count per
cell). --stp draws the space–time separation plot (Provenzale et al. 1992): quantiles of the
distance between vectors against their separation in time, with the Theiler window marked;
temporal correlation dominates until the curves stop rising.`,
		Example: `  # choose lag and dimension, write the vectors and draw the picture
  unfold embed lorenz.csv -o vectors.npy --plot attractor.png
  # a given lag and dimension, CSV output, a different view
  unfold embed --lag 12 --dim 3 --azimuth 60 --elevation 20 -o vectors.csv --plot view.svg lorenz.csv
  # only the space–time separation plot, separations up to 500 samples
  unfold embed --lag 12 --dim 3 --stp stp.png --stp-max-dt 500 lorenz.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runEmbed(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	addEmbedFlags(cmd.Flags(), o)
	return cmd
}

// addEmbedFlags binds the flags of `embed` (besides the input flags) to o, with their defaults.
func addEmbedFlags(f *pflag.FlagSet, o *embedOptions) {
	f.StringVarP(&o.output, "output", "o", "", "write the vectors to this file (.csv or .npy)")
	f.IntVar(&o.lag, "lag", 0, "delay in samples (default: chosen as 'unfold lag')")
	f.IntVar(&o.dim, "dim", 0, "embedding dimension (default: chosen as 'unfold dim')")
	f.IntVar(&o.maxDim, "max-dim", 10, "largest dimension scanned when --dim is not given")
	f.IntVar(&o.theiler, "theiler", -1, "Theiler window in samples for choosing the dimension and marking the space–time plot (default: 1/e decay time of the autocorrelation)")
	f.StringVar(&o.plot, "plot", "", "draw the state-space picture (.png or .svg)")
	f.StringVar(&o.stp, "stp", "", "draw the space–time separation plot (.png or .svg)")
	f.IntVar(&o.stpMaxDt, "stp-max-dt", 0, "largest time separation of the space–time plot, in samples (default: 5× the Theiler window, at least 50)")
	f.Float64Var(&o.azimuth, "azimuth", -45, "rotation of the 3-D view about the x(t+2τ) axis, degrees")
	f.Float64Var(&o.elevation, "elevation", 30, "elevation of the 3-D view above the x(t)–x(t+τ) plane, degrees")
	f.IntVar(&o.densityAbove, "density-above", 20000, "draw a density image instead of points above this many vectors")
}

type embedParams struct {
	prepParams
	Lag       int     `json:"lag"`
	LagMethod string  `json:"lag_method"`
	Dim       int     `json:"dim"`
	DimMethod string  `json:"dim_method"`
	Theiler   int     `json:"theiler"`
	Azimuth   float64 `json:"azimuth"`
	Elevation float64 `json:"elevation"`
	Threads   int     `json:"threads"`
}

type stpJSON struct {
	Dt       int       `json:"dt"`
	Quantile []float64 `json:"distance"`
}

type embedResult struct {
	Lag       int      `json:"lag"`
	LagTime   float64  `json:"lag_time"`
	Dimension int      `json:"dimension"`
	Vectors   int      `json:"vectors"`
	Output    string   `json:"output"`
	Plot      string   `json:"plot"`
	STP       string   `json:"stp_plot"`
	STPCurve  *stpBody `json:"space_time_separation,omitempty"`
	Cautions  []string `json:"cautions"`
}

type stpBody struct {
	Fractions []float64 `json:"fractions"`
	Curve     []stpJSON `json:"curve"`
}

// embedCompute builds the delay vectors of s (choosing what o does not give) and returns them
// with the Theiler window and the JSON parameters and body of `embed`; the command and the
// report both use it. lagMethod and dimMethod name the rules that chose o.lag and o.dim when
// a caller chose them already (the report's earlier stages); "" means given or chosen here.
func (a *app) embedCompute(path string, s *series.Series, o *embedOptions, lagMethod, dimMethod string) (embed.Embedding, int, embedParams, embedResult, error) {
	fail := func(err error) (embed.Embedding, int, embedParams, embedResult, error) {
		return embed.Embedding{}, 0, embedParams{}, embedResult{}, err
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return fail(err)
	}
	x := s.Values
	ec, err := a.chooseEmbedding("embed", path, x, o.lag, o.theiler, o.dim, o.maxDim, neighbors.Euclidean, lagMethod, dimMethod)
	if err != nil {
		return fail(err)
	}
	lag, theiler, dim, cautions := ec.lag, ec.theiler, ec.dim, ec.cautions
	lagMethod, dimMethod = ec.lagMethod, ec.dimMethod
	e, err := embed.New(x, lag, dim)
	if err != nil {
		return fail(noAnswer(fmt.Errorf("embed: %s: %w", path, err)))
	}
	res := embedResult{Lag: lag, LagTime: float64(lag) * s.Dt, Dimension: dim, Vectors: e.Len(),
		Output: o.output, Plot: o.plot, STP: o.stp, Cautions: cautions}
	if res.Cautions == nil {
		res.Cautions = []string{}
	}
	p := embedParams{prepParams: newPrepParams(s, &o.in), Lag: lag, LagMethod: lagMethod, Dim: dim, DimMethod: dimMethod,
		Theiler: theiler, Azimuth: o.azimuth, Elevation: o.elevation, Threads: a.threads()}
	return e, theiler, p, res, nil
}

func (a *app) runEmbed(path string, o *embedOptions) error {
	if o.output == "" && o.plot == "" && o.stp == "" {
		return usagef("embed: nothing to do: give -o FILE (.csv or .npy), --plot FILE or --stp FILE")
	}
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	if err := checkFigurePath(o.stp); err != nil {
		return err
	}
	ext := strings.ToLower(filepath.Ext(o.output))
	if o.output != "" && ext != ".csv" && ext != ".npy" {
		return usagef("embed: -o %s: the name must end in .csv or .npy", o.output)
	}
	if o.lag < 0 || o.dim < 0 || o.maxDim < 1 || o.stpMaxDt < 0 || o.densityAbove < 1 {
		return usagef("embed: --lag, --dim and --stp-max-dt must be ≥ 0, --max-dim and --density-above ≥ 1")
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	e, theiler, p, res, err := a.embedCompute(path, s, o, "", "")
	if err != nil {
		return err
	}
	x := s.Values
	lag, dim, lagMethod, dimMethod := p.Lag, p.Dim, p.LagMethod, p.DimMethod
	fig := figureOf(path, s)
	if o.output != "" {
		if err := writeVectors(o.output, path, ext, e, s.Name); err != nil {
			return err
		}
	}
	if o.plot != "" {
		rows, err := figure.StateSpacePlots(e, fig, figure.StateSpaceOptions{Azimuth: o.azimuth, Elevation: o.elevation, DensityAbove: o.densityAbove})
		if err != nil {
			return fmt.Errorf("embed: figure: %w", err)
		}
		w, h := figure.SizeFor(rows)
		if err := writeFigureFile(o.plot, path, w, h, rows); err != nil {
			return err
		}
	}
	if o.stp != "" {
		maxDt := o.stpMaxDt
		if maxDt == 0 {
			maxDt = max(50, 5*theiler)
		}
		st, err := embed.SpaceTimeSeparation(e, embed.STPOptions{MaxDt: maxDt})
		if err != nil {
			return noAnswer(fmt.Errorf("embed: %s: %w", path, err))
		}
		p, err := figure.STPPlot(st, e, theiler, fig)
		if err != nil {
			return fmt.Errorf("embed: figure: %w", err)
		}
		if err := writeFigureFile(o.stp, path, figure.Width, figure.Height, [][]*plot.Plot{{p}}); err != nil {
			return err
		}
		body := &stpBody{Fractions: st.Fractions}
		for k, d := range st.Dt {
			q := make([]float64, len(st.Fractions))
			for f := range q {
				q[f] = st.Dist[f][k]
			}
			body.Curve = append(body.Curve, stpJSON{Dt: d, Quantile: q})
		}
		res.STPCurve = body
	}
	if a.global.JSON {
		return a.emitJSON("embed", in, p, res)
	}
	rows := [][]string{
		{"lag", fmt.Sprintf("%d samples = %s time units (%s)", lag, fmtG(res.LagTime), lagMethod)},
		{"dimension", fmt.Sprintf("%d (%s)", dim, dimMethod)},
		{"vectors", fmt.Sprintf("%d = %d − (%d−1)·%d", e.Len(), len(x), dim, lag)},
		{"theiler window", strconv.Itoa(theiler) + " samples"},
	}
	for _, f := range [][2]string{{"vectors written", o.output}, {"state-space picture", o.plot}, {"space–time plot", o.stp}} {
		if f[1] != "" {
			rows = append(rows, []string{f[0], f[1]})
		}
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, w := range res.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", w)
	}
	return nil
}

// writeVectors writes the delay vectors as CSV (header x(t),x(t+τ)… in samples) or .npy (an
// N×m float64 array), through an atomic file.
func writeVectors(path, input, ext string, e embed.Embedding, name string) error {
	if name == "" {
		name = "x"
	}
	f, err := series.CreateAtomic(path, input)
	if err != nil {
		return err
	}
	defer f.Abort()
	if ext == ".npy" {
		bw := bufio.NewWriterSize(f, 1<<20)
		if err := npyio.Write(bw, mat.NewDense(e.Len(), e.Dim, e.Dense())); err != nil {
			return fmt.Errorf("writing %s: %w", path, err)
		}
		if err := bw.Flush(); err != nil {
			return fmt.Errorf("writing %s: %w", path, err)
		}
		return f.Commit()
	}
	header := make([]string, e.Dim)
	cols := make([][]float64, e.Dim)
	for k := range header {
		if k == 0 {
			header[k] = name + "(t)"
		} else {
			header[k] = fmt.Sprintf("%s(t+%d)", name, k*e.Lag)
		}
		cols[k] = e.X[k*e.Lag : k*e.Lag+e.Len()]
	}
	if err := series.WriteCSV(f, header, cols...); err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	return f.Commit()
}
