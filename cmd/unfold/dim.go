package main

import (
	"errors"
	"fmt"
	"strconv"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/embed"
	"unfold/figure"
	"unfold/neighbors"
	"unfold/series"
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
dimension up to --max-dim qualifies.`,
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
	f.IntVar(&o.lag, "lag", 0, "delay in samples (default: chosen from the mutual information, as 'unfold lag')")
	f.IntVar(&o.maxDim, "max-dim", 10, "largest dimension scanned")
	f.IntVar(&o.theiler, "theiler", -1, "Theiler window in samples: neighbours closer in time are excluded (default: 1/e decay time of the autocorrelation; 0 excludes only the point itself)")
	f.Float64Var(&o.rtol, "rtol", 15, "false-neighbour distance-ratio threshold R_tol")
	f.Float64Var(&o.atol, "atol", 2, "false-neighbour size threshold A_tol (in RMS deviations of the signal)")
	f.Float64Var(&o.threshold, "fnn-threshold", 0.01, "false fraction below which a dimension is accepted")
	f.StringVar(&o.norm, "norm", "euclidean", "distance: euclidean or max")
	f.StringVar(&o.csvPath, "csv", "", "write the curves to this CSV file (dimension, fnn_fraction, criterion1, criterion2, e1, e2)")
	f.StringVar(&o.plot, "plot", "", "draw the curves with the chosen dimension marked (.png or .svg)")
}

type dimParams struct {
	prepParams
	Lag          int     `json:"lag"`
	LagMethod    string  `json:"lag_method"`
	MaxDim       int     `json:"max_dim"`
	Theiler      int     `json:"theiler"`
	TheilerFrom  string  `json:"theiler_from"`
	RTol         float64 `json:"rtol"`
	ATol         float64 `json:"atol"`
	FNNThreshold float64 `json:"fnn_threshold"`
	Norm         string  `json:"norm"`
	Threads      int     `json:"threads"`
}

type fnnJSON struct {
	Dimension  int     `json:"dimension"`
	Fraction   float64 `json:"fraction"`
	Criterion1 float64 `json:"criterion1"`
	Criterion2 float64 `json:"criterion2"`
	Points     int     `json:"points"`
}

type caoJSON struct {
	Dimension int     `json:"dimension"`
	E1        float64 `json:"e1"`
	E2        float64 `json:"e2"`
}

type dimResult struct {
	Dimension      int       `json:"dimension"`
	Lag            int       `json:"lag"`
	LagTime        float64   `json:"lag_time"`
	Theiler        int       `json:"theiler"`
	Method         string    `json:"method"`
	Reason         string    `json:"reason"`
	FNNDimension   int       `json:"fnn_dimension"`
	CaoDimension   int       `json:"cao_dimension"`
	NoiseLike      bool      `json:"consistent_with_noise"`
	FalseNeighbors []fnnJSON `json:"false_neighbors"`
	Cao            []caoJSON `json:"cao"`
	Cautions       []string  `json:"cautions"`
}

// parseNorm reads --norm.
func parseNorm(s string) (neighbors.Norm, error) {
	switch s {
	case "euclidean":
		return neighbors.Euclidean, nil
	case "max":
		return neighbors.Max, nil
	}
	return 0, usagef("--norm %q: want euclidean or max", s)
}

// embeddingDefaults returns the lag (chosen when lag ≤ 0) with the rule that gave it, and the
// Theiler window (the 1/e decay time when theiler < 0) with where it came from.
func (a *app) embeddingDefaults(x []float64, lag, theiler int) (int, string, int, string, []string, error) {
	var cautions []string
	lagMethod := "given"
	if lag <= 0 {
		c, err := embed.ChooseLag(x, embed.LagOptions{MI: embed.MIOptions{Threads: a.threads()}})
		if err != nil {
			return 0, "", 0, "", nil, err
		}
		lag, lagMethod = c.Lag, c.Method
		cautions = append(cautions, c.Cautions...)
		a.notef("lag %d chosen (%s): %s", lag, c.Method, c.Reason)
	}
	from := "given"
	if theiler < 0 {
		acf, err := embed.AutocorrelationFFT(x, min(len(x)-1, 5000))
		if err != nil {
			return 0, "", 0, "", nil, err
		}
		theiler, from = embed.DefaultTheiler(acf), "autocorrelation-1/e-decay"
	}
	return lag, lagMethod, theiler, from, cautions, nil
}

// chooseDimension is the dimension choice of the commands that embed (embed, lyapunov) when
// --dim is not given: embed.ChooseDimension with the lag and Theiler window already chosen, its
// reason printed on stderr. A record for which no dimension up to maxDim qualifies is a
// "no answer" that says so and suggests --dim.
func (a *app) chooseDimension(command, path string, x []float64, lag, theiler, maxDim int, norm neighbors.Norm) (*embed.DimChoice, error) {
	c, err := embed.ChooseDimension(x, embed.DimOptions{Lag: lag, MaxDim: maxDim, Theiler: theiler,
		Norm: norm, Threads: a.threads(), Progress: a.progress("false neighbours")})
	if err != nil {
		return nil, noAnswer(fmt.Errorf("%s: %s: choosing the dimension: %w", command, path, err))
	}
	if c.Dimension == 0 {
		return nil, noAnswer(fmt.Errorf("%s: %s: no embedding dimension up to %d qualifies (%s); give --dim", command, path, maxDim, c.Reason))
	}
	a.notef("dimension %d chosen (%s): %s", c.Dimension, c.Method, c.Reason)
	return c, nil
}

// embeddingChoice is the delay embedding a command works in, each part with the rule that gave it.
type embeddingChoice struct {
	lag, theiler, dim                 int
	lagMethod, theilerFrom, dimMethod string
	cautions                          []string
}

// chooseEmbedding fills in what the flags leave open — lag ≤ 0, theiler < 0, dim 0 — by embed's
// rules (embeddingDefaults, chooseDimension). lagMethod and dimMethod name the rules a caller
// already used for lag and dim (the report's earlier stages); "" means given, or chosen here.
func (a *app) chooseEmbedding(command, path string, x []float64, lag, theiler, dim, maxDim int, norm neighbors.Norm, lagMethod, dimMethod string) (embeddingChoice, error) {
	lag, method, theiler, theilerFrom, cautions, err := a.embeddingDefaults(x, lag, theiler)
	if err != nil {
		return embeddingChoice{}, noAnswer(fmt.Errorf("%s: %s: %w", command, path, err))
	}
	if lagMethod == "" {
		lagMethod = method
	}
	if dimMethod == "" {
		dimMethod = "given"
	}
	if dim == 0 {
		c, err := a.chooseDimension(command, path, x, lag, theiler, maxDim, norm)
		if err != nil {
			return embeddingChoice{}, err
		}
		dim, dimMethod = c.Dimension, c.Method
		cautions = append(cautions, c.Cautions...)
	}
	return embeddingChoice{lag: lag, theiler: theiler, dim: dim, lagMethod: lagMethod,
		theilerFrom: theilerFrom, dimMethod: dimMethod, cautions: cautions}, nil
}

// checkDimOptions validates the flags of `dim`.
func checkDimOptions(o *dimOptions) (neighbors.Norm, error) {
	norm, err := parseNorm(o.norm)
	if err != nil {
		return 0, err
	}
	if o.maxDim < 1 || o.lag < 0 || !(o.rtol > 0) || !(o.atol > 0) || !(o.threshold > 0 && o.threshold < 1) {
		return 0, usagef("dim: want --max-dim ≥ 1, --lag ≥ 0, --rtol > 0, --atol > 0, 0 < --fnn-threshold < 1")
	}
	return norm, nil
}

// dimCompute chooses the dimension of s and returns the choice with the JSON parameters and
// body of `dim`; the command and the report both use it. lagMethod names the rule that chose
// o.lag when a caller chose it already (the report's lag stage); "" means o.lag was given (or
// is 0, to be chosen here).
func (a *app) dimCompute(path string, s *series.Series, o *dimOptions, lagMethod string) (*embed.DimChoice, dimParams, dimResult, error) {
	norm, err := checkDimOptions(o)
	if err != nil {
		return nil, dimParams{}, dimResult{}, err
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return nil, dimParams{}, dimResult{}, err
	}
	lag, method, theiler, theilerFrom, cautions, err := a.embeddingDefaults(s.Values, o.lag, o.theiler)
	if err != nil {
		return nil, dimParams{}, dimResult{}, noAnswer(fmt.Errorf("dim: %s: %w", path, err))
	}
	if lagMethod == "" {
		lagMethod = method
	}
	c, err := embed.ChooseDimension(s.Values, embed.DimOptions{Lag: lag, MaxDim: o.maxDim, Theiler: theiler,
		RTol: o.rtol, ATol: o.atol, Threshold: o.threshold, Norm: norm, Threads: a.threads(),
		Progress: a.progress("false neighbours")})
	if err != nil {
		return nil, dimParams{}, dimResult{}, noAnswer(fmt.Errorf("dim: %s: %w", path, err))
	}
	res := dimResult{Dimension: c.Dimension, Lag: lag, LagTime: float64(lag) * s.Dt, Theiler: theiler,
		Method: c.Method, Reason: c.Reason, FNNDimension: c.FNNDim, CaoDimension: c.CaoDim, NoiseLike: c.NoiseLike,
		Cautions: append(cautions, c.Cautions...)}
	if res.Cautions == nil {
		res.Cautions = []string{}
	}
	for _, p := range c.FNN {
		res.FalseNeighbors = append(res.FalseNeighbors, fnnJSON{p.Dim, p.Fraction, p.Criterion1, p.Criterion2, p.Points})
	}
	res.Cao = []caoJSON{}
	for _, p := range c.Cao {
		res.Cao = append(res.Cao, caoJSON{p.Dim, p.E1, p.E2})
	}
	p := dimParams{prepParams: newPrepParams(s, &o.in), Lag: lag, LagMethod: lagMethod, MaxDim: c.MaxDim,
		Theiler: theiler, TheilerFrom: theilerFrom, RTol: c.RTol, ATol: c.ATol, FNNThreshold: c.Threshold,
		Norm: norm.String(), Threads: a.threads()}
	return c, p, res, nil
}

func (a *app) runDim(path string, o *dimOptions) error {
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	norm, err := checkDimOptions(o)
	if err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	c, p, res, err := a.dimCompute(path, s, o, "")
	if err != nil {
		return err
	}
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
		if err := writeFigureFile(o.plot, path, figure.Width, figure.HeightFor(len(rows)), rows); err != nil {
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
