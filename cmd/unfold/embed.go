package main

import (
	"fmt"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
	"gonum.org/v1/plot"

	"unfold/analysis"
	"unfold/embed"
	"unfold/figure"
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
temporal correlation dominates until the curves stop rising.

Cost as a function of N: O(N · m) time and memory for the vectors; --stp uses at most 50 000
pairs per separation, whatever N.`,
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
	d := analysis.DefaultEmbedOptions()
	f.StringVarP(&o.output, "output", "o", "", "write the vectors to this file (.csv or .npy)")
	f.IntVar(&o.lag, "lag", d.Lag, "delay in samples (default: chosen as 'unfold lag')")
	f.IntVar(&o.dim, "dim", d.Dim, "embedding dimension (default: chosen as 'unfold dim')")
	f.IntVar(&o.maxDim, "max-dim", d.MaxDim, "largest dimension scanned when --dim is not given")
	f.IntVar(&o.theiler, "theiler", d.Theiler, "Theiler window in samples for choosing the dimension and marking the space–time plot (default: 1/e decay time of the autocorrelation)")
	f.StringVar(&o.plot, "plot", "", "draw the state-space picture (.png or .svg)")
	f.StringVar(&o.stp, "stp", "", "draw the space–time separation plot (.png or .svg)")
	f.IntVar(&o.stpMaxDt, "stp-max-dt", 0, "largest time separation of the space–time plot, in samples (default: 5× the Theiler window, at least 50)")
	f.Float64Var(&o.azimuth, "azimuth", d.Azimuth, "rotation of the 3-D view about the x(t+2τ) axis, degrees")
	f.Float64Var(&o.elevation, "elevation", d.Elevation, "elevation of the 3-D view above the x(t)–x(t+τ) plane, degrees")
	f.IntVar(&o.densityAbove, "density-above", 20000, "draw a density image instead of points above this many vectors")
}

func (o *embedOptions) options() analysis.EmbedOptions {
	return analysis.EmbedOptions{Lag: o.lag, Dim: o.dim, MaxDim: o.maxDim, Theiler: o.theiler, Azimuth: o.azimuth,
		Elevation: o.elevation, Output: o.output, Plot: o.plot, STP: o.stp}
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
	e, _, p, res, err := a.env(&o.in).Embed(path, s, o.options(), nil, nil)
	theiler := p.Theiler
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
		if err := writeFigureFile(o.plot, path, rows); err != nil {
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
		if err := writeFigureFile(o.stp, path, [][]*plot.Plot{{p}}); err != nil {
			return err
		}
		body := &analysis.STPBody{Fractions: st.Fractions}
		for k, d := range st.Dt {
			q := make([]float64, len(st.Fractions))
			for f := range q {
				q[f] = st.Dist[f][k]
			}
			body.Curve = append(body.Curve, analysis.STPJSON{Dt: d, Quantile: q})
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
