package main

import (
	"errors"
	"fmt"
	"strconv"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/analysis"
	"unfold/figure"
	"unfold/neighbors"
)

type dimOptions struct {
	in        inputOptions
	lag       int
	maxDim    int
	theiler   int
	rtol      float64
	atol      float64
	threshold float64
	norm      string
	csvPath   string
	plot      string
}

func newDimCmd(a *app) *cobra.Command {
	o := &dimOptions{}
	cmd := &cobra.Command{
		Use:   "dim FILE",
		Short: "False-neighbour fraction and Cao's E1/E2 against the dimension; the chosen dimension",
		Long: `dim scans embedding dimensions m = 1 … --max-dim at a fixed lag. In each dimension the
nearest neighbour of every delay vector (outside the Theiler window) is found with a kd-tree, in
parallel, and gives both:

  - the false-nearest-neighbour fraction (Kennel, Brown & Abarbanel 1992): a neighbour is false
    when the added coordinate separates it by more than --rtol times the distance, or when the
    distance in m+1 dimensions exceeds --atol times the RMS deviation of the signal;
  - Cao's (1997) E1(d) (saturates near 1 once the attractor is unfolded) and E2(d) (≈ 1 for every
    d for random data).

The dimension is the smallest m whose false fraction is below --fnn-threshold, or the smallest d
where E1 saturates (E1 > 0.9 and changing by less than 5 % to d+1), whichever is smaller; the
rule is printed ("method" in JSON). E2 within 0.1 of 1 for every d is reported as "consistent with
noise". The lag, when not given, is chosen as 'unfold lag' does (histogram estimator); the Theiler
window, when not given, is the 1/e decay time of the autocorrelation. Exit status 1 when no
dimension up to --max-dim qualifies.

Cost as a function of N: per dimension m ≤ --max-dim a kd-tree, O(N log N · m), and one
nearest-neighbour search per vector (O(log N) on low-dimensional attractors): about
O(max-dim · N log N) in all; memory O(N · m), one dimension at a time.`,
		Example: `  # Lorenz x sampled at dt = 0.01: lag chosen automatically, dimensions 1 … 10
  unfold dim lorenz.csv
  # a given lag and Theiler window, JSON and the figure
  unfold dim --lag 12 --theiler 30 --json --plot dim.png lorenz.csv
  # compare with a reference implementation that has no Theiler window
  unfold dim --lag 12 --theiler 0 --max-dim 6 --csv fnn.csv lorenz.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runDim(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	addDimFlags(cmd.Flags(), o)
	return cmd
}

// addDimFlags binds the flags of `dim` (besides the input flags) to o, with their defaults.
func addDimFlags(f *pflag.FlagSet, o *dimOptions) {
	d := analysis.DefaultDimOptions()
	f.IntVar(&o.lag, "lag", d.Lag, "delay in samples (default: chosen from the mutual information, as 'unfold lag')")
	f.IntVar(&o.maxDim, "max-dim", d.MaxDim, "largest dimension scanned")
	f.IntVar(&o.theiler, "theiler", d.Theiler, "Theiler window in samples: neighbours closer in time are excluded (default: 1/e decay time of the autocorrelation; 0 excludes only the point itself)")
	f.Float64Var(&o.rtol, "rtol", d.RTol, "false-neighbour distance-ratio threshold R_tol")
	f.Float64Var(&o.atol, "atol", d.ATol, "false-neighbour size threshold A_tol (in RMS deviations of the signal)")
	f.Float64Var(&o.threshold, "fnn-threshold", d.Threshold, "false fraction below which a dimension is accepted")
	f.StringVar(&o.norm, "norm", d.Norm, "distance: euclidean or max")
	f.StringVar(&o.csvPath, "csv", "", "write the curves to this CSV file (dimension, fnn_fraction, criterion1, criterion2, e1, e2)")
	f.StringVar(&o.plot, "plot", "", "draw the curves with the chosen dimension marked (.png or .svg)")
}

// parseNorm reads --norm.
func parseNorm(s string) (neighbors.Norm, error) { return analysis.ParseNorm(s) }

func (o *dimOptions) options() analysis.DimOptions {
	return analysis.DimOptions{Lag: o.lag, Theiler: o.theiler, MaxDim: o.maxDim, RTol: o.rtol, ATol: o.atol,
		Threshold: o.threshold, Norm: o.norm}
}

func (a *app) runDim(path string, o *dimOptions) error {
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	if err := analysis.CheckDim(o.options()); err != nil {
		return err
	}
	norm, _ := parseNorm(o.norm)
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	ch, p, res, err := a.env(&o.in).Dim(path, s, o.options())
	if err != nil {
		return err
	}
	c := ch.DimChoice
	lag, lagMethod, theiler, theilerFrom := p.Lag, p.LagMethod, p.Theiler, p.TheilerFrom
	if o.csvPath != "" {
		n := len(c.FNN)
		cols := make([][]float64, 6)
		for i := range cols {
			cols[i] = make([]float64, n)
		}
		for i, p := range c.FNN {
			cols[0][i], cols[1][i], cols[2][i], cols[3][i] = float64(p.Dim), p.Fraction, p.Criterion1, p.Criterion2
			cols[4][i], cols[5][i] = nan(), nan()
			if i < len(c.Cao) {
				cols[4][i], cols[5][i] = c.Cao[i].E1, c.Cao[i].E2
			}
		}
		if err := writeCSVFile(o.csvPath, path, []string{"dimension", "fnn_fraction", "criterion1", "criterion2", "e1", "e2"}, cols...); err != nil {
			return err
		}
	}
	if o.plot != "" {
		rows, err := figure.DimPlots(c, figureOf(path, s))
		if err != nil {
			return fmt.Errorf("dim: figure: %w", err)
		}
		if err := writeFigureFile(o.plot, path, rows); err != nil {
			return err
		}
	}
	var noDim error
	if c.Dimension == 0 {
		noDim = noAnswer(errors.New("dim: " + path + ": " + c.Reason + "; give --dim to embed anyway, or scan further with --max-dim"))
	}
	if a.global.JSON {
		if err := a.emitJSON("dim", in, p, res); err != nil {
			return err
		}
		return noDim
	}
	rows := [][]string{{"m", "false_fraction", "criterion1", "criterion2", "E1", "E2", ""}}
	for i, p := range c.FNN {
		e1, e2 := "", ""
		if i < len(c.Cao) {
			e1, e2 = fmt.Sprintf("%.4f", c.Cao[i].E1), fmt.Sprintf("%.4f", c.Cao[i].E2)
		}
		mark := ""
		if p.Dim == c.Dimension {
			mark = "<- chosen"
		}
		rows = append(rows, []string{strconv.Itoa(p.Dim), fmt.Sprintf("%.4f", p.Fraction), fmt.Sprintf("%.4f", p.Criterion1),
			fmt.Sprintf("%.4f", p.Criterion2), e1, e2, mark})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	fmt.Fprintf(a.stdout, "lag %d samples = %s time units (%s); Theiler window %d samples (%s); R_tol %g, A_tol %g, %s norm\n",
		lag, fmtG(res.LagTime), lagMethod, theiler, theilerFrom, c.RTol, c.ATol, norm)
	if c.Dimension > 0 {
		fmt.Fprintf(a.stdout, "dimension: %d (%s)\n%s\n", c.Dimension, c.Method, c.Reason)
	}
	for _, w := range res.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", w)
	}
	return noDim
}

func nan() float64 { var z float64; return z / z }
