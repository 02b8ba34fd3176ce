package main

import (
	"fmt"
	"strconv"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/analysis"
	"unfold/embed"
	"unfold/figure"
	"unfold/series"
)

type lagOptions struct {
	in      inputOptions
	maxLag  int
	mi      string
	bins    int
	k       int
	points  int
	z       float64
	csvPath string
	plot    string
}

func newLagCmd(a *app) *cobra.Command {
	o := &lagOptions{}
	cmd := &cobra.Command{
		Use:   "lag FILE",
		Short: "Mutual information and autocorrelation against the delay; the chosen lag",
		Long: `lag estimates the mutual information between x(t) and x(t+τ) for τ = 0 … --max-lag samples
(Fraser & Swinney 1986) and the autocorrelation (by FFT), and chooses the delay for embedding:

  1. lag 1 when the information at lag 1 is already at the level of independent samples (noise);
  2. the first local minimum of the information that is significant: the curve rises after it
     by more than --z standard errors of the difference (errors from 8 blocks of the record and,
     for the histogram, from a half-bin shift of the grid), so small wiggles are not minima;
  3. lag 1 when the autocorrelation is below 1/e already at lag 1 (a map, or coarse sampling);
  4. the first lag where the information falls below 1/e of its lag-0 value;
  5. the first zero of the autocorrelation.

The rule used is printed ("method" in JSON). The estimator is --mi hist (equiprobable bins, the
bin count from N: round(N^(1/3)), with the independence bias (B−1)²/2N) or --mi ksg (the
k-nearest-neighbour estimator of Kraskov, Stögbauer & Grassberger 2004, on at most --points pairs,
leaving out pairs closer in time than the autocorrelation's 1/e decay). Information is in bits.
The suggested Theiler window (the 1/e decay time of the autocorrelation) is printed as well.

Cost as a function of the record length N: O(N log N) for the equiprobable bins and the
autocorrelation, plus O(N) per lag scanned (--mi ksg: O(P log P) per lag on at most --points
pairs P, whatever N); memory O(N).`,
		Example: `  # a Lorenz signal sampled at dt = 0.01: the lag and the curves as a table
  unfold simulate lorenz --n 50000 -o lorenz.csv
  unfold lag lorenz.csv
  # the same as JSON, with the k-nearest-neighbour estimator, and the figure
  unfold lag --json --mi ksg --plot lag.png lorenz.csv
  # scan further and keep the curve
  unfold lag --max-lag 200 --csv mi.csv lorenz.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runLag(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	addLagFlags(cmd.Flags(), o)
	return cmd
}

// addLagFlags binds the flags of `lag` (besides the input flags) to o, with their defaults.
func addLagFlags(f *pflag.FlagSet, o *lagOptions) {
	d := analysis.DefaultLagOptions()
	f.IntVar(&o.maxLag, "max-lag", d.MaxLag, "largest lag scanned, in samples (default: max(20, 2×first zero, 4×1/e decay of the autocorrelation), at most 500 and N/4)")
	f.StringVar(&o.mi, "mi", d.MI, "mutual-information estimator: hist (equiprobable bins) or ksg (k nearest neighbours)")
	f.IntVar(&o.bins, "bins", d.Bins, "bins per axis for --mi hist (default: round(N^(1/3)) in [4, 128])")
	f.IntVar(&o.k, "k", d.K, "neighbours for --mi ksg")
	f.IntVar(&o.points, "points", d.Points, "pairs per lag for --mi ksg (evenly spaced in time)")
	f.Float64Var(&o.z, "z", d.Z, "significance of a minimum, in standard errors")
	f.StringVar(&o.csvPath, "csv", "", "write the curves to this CSV file (lag, lag_time, mi_bits, mi_error_bits, autocorrelation)")
	f.StringVar(&o.plot, "plot", "", "draw the curves with the chosen lag marked (.png or .svg)")
}

// prepParams are the reading and preprocessing parameters recorded in every JSON output of the
// embedding commands.
type prepParams = analysis.PrepParams

func newPrepParams(s *series.Series, o *inputOptions) prepParams {
	return prepParams{Column: s.Name, Detrend: o.prep.Detrend, Standardize: o.prep.Standardize,
		Decimate: max(o.prep.Decimate, 1), From: o.prep.From, To: o.prep.To, Gaps: o.read.Gaps}
}

func (o *lagOptions) options() analysis.LagOptions {
	return analysis.LagOptions{MaxLag: o.maxLag, MI: o.mi, Bins: o.bins, K: o.k, Points: o.points, Z: o.z}
}

func (a *app) runLag(path string, o *lagOptions) error {
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	if _, err := a.env(&o.in).EmbedLagOptions(o.options()); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	c, p, res, err := a.env(&o.in).Lag(path, s, o.options())
	if err != nil {
		return err
	}
	if o.csvPath != "" {
		n := len(c.MI.Nats)
		cols := make([][]float64, 5)
		for i := range cols {
			cols[i] = make([]float64, n)
		}
		for k := 0; k < n; k++ {
			cols[0][k], cols[1][k], cols[2][k], cols[3][k], cols[4][k] = float64(k), float64(k)*s.Dt, c.MI.Bits(k), c.MI.Err[k]/ln2, c.ACF.R[k]
		}
		if err := writeCSVFile(o.csvPath, path, []string{"lag", "lag_time", "mi_bits", "mi_error_bits", "autocorrelation"}, cols...); err != nil {
			return err
		}
	}
	if o.plot != "" {
		rows, err := figure.LagPlots(c, figureOf(path, s))
		if err != nil {
			return fmt.Errorf("lag: figure: %w", err)
		}
		if err := writeFigureFile(o.plot, path, rows); err != nil {
			return err
		}
	}
	if a.global.JSON {
		return a.emitJSON("lag", in, p, res)
	}
	est := fmt.Sprintf("equiprobable bins (B = %d, independence bias %.4f bits)", c.MI.Bins, res.BiasBits)
	if c.MI.Estimator == embed.KSG {
		est = fmt.Sprintf("KSG (k = %d, %d pairs per lag)", c.MI.K, c.MI.Points)
	}
	rows := [][]string{{"lag", "lag_time", "mi_bits", "± error", "autocorrelation", ""}}
	show := min(len(c.MI.Nats)-1, max(2*c.Lag, 20))
	for k := 0; k <= show; k++ {
		mark := ""
		if k == c.Lag {
			mark = "<- chosen"
		}
		rows = append(rows, []string{strconv.Itoa(k), fmtG(float64(k) * s.Dt), fmt.Sprintf("%.4f", c.MI.Bits(k)),
			fmt.Sprintf("%.4f", c.MI.Err[k]/ln2), fmt.Sprintf("%.4f", c.ACF.R[k]), mark})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	if show < len(c.MI.Nats)-1 {
		fmt.Fprintf(a.stdout, "(lags %d … %d not shown; --csv or --json give the whole curve)\n", show+1, len(c.MI.Nats)-1)
	}
	fmt.Fprintf(a.stdout, "estimator: %s\n", est)
	fmt.Fprintf(a.stdout, "autocorrelation: first zero at lag %d, 1/e decay at lag %d; suggested Theiler window %d samples\n",
		c.ACF.FirstZero, c.ACF.DecayTime, res.Theiler)
	fmt.Fprintf(a.stdout, "lag: %d samples = %s time units (%s)\n%s\n", c.Lag, fmtG(res.LagTime), c.Method, c.Reason)
	for _, w := range c.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", w)
	}
	return nil
}
