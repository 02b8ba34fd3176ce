package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/demo"
	"unfold/embed"
	"unfold/figure"
	"unfold/report"
	"unfold/series"
)

// reportOptions are the flags of `report` (and of `batch`, which runs the same chain). The
// overrides carry the single commands' names; a zero or negative value means "choose".
type reportOptions struct {
	in        inputOptions
	output    string
	demo      bool
	png       bool
	lag       int
	dim       int
	maxDim    int
	theiler   int
	maxLag    int
	mi        string
	norm      string
	azimuth   float64
	elevation float64
}

// reportParams are the "parameters" of result.json: the overrides as given (0 or -1 = chosen
// by the stage's own rule, recorded in the stage's own "parameters").
type reportParams struct {
	prepParams
	Lag       int     `json:"lag"`
	Dim       int     `json:"dim"`
	MaxDim    int     `json:"max_dim"`
	Theiler   int     `json:"theiler"`
	MaxLag    int     `json:"max_lag"`
	MI        string  `json:"mi"`
	Norm      string  `json:"norm"`
	Azimuth   float64 `json:"azimuth"`
	Elevation float64 `json:"elevation"`
	PNG       bool    `json:"png"`
	Threads   int     `json:"threads"`
}

func newReportCmd(a *app) *cobra.Command {
	o := &reportOptions{}
	cmd := &cobra.Command{
		Use:   "report FILE -o DIR",
		Short: "The whole chain on one signal: result.json, a self-contained HTML page and the figures",
		Long: `report runs the analysis chain on one signal, each stage choosing what is not given by its
own published rule (the same as the single command of that name), and writes

  DIR/result.json   every stage's JSON object under its key (inspect, lag, dim, embed, …) exactly
                    as the single command prints it with --json, plus "provenance": version,
                    commit, command line, seeds, input SHA-256 and the wall time of every stage;
  DIR/report.html   one self-contained page (inline figures and style, no scripts, nothing
                    fetched) that reads top to bottom and prints on A4 in one column;
  DIR/figures/      every figure as .svg (and .png with --png) for reuse.

Stages run now: inspect (the signal and its spectrum), lag, dim, embed (the state-space
picture) and lyapunov (the divergence curve, with the defaults of 'unfold lyapunov' on the lag,
dimension and Theiler window chosen above), fractal (the local slopes of the correlation sums,
with the defaults of 'unfold fractal' on that lag and Theiler window) and regime (the verdict
with its evidence and cautions, with the defaults of 'unfold regime' — 19 IAAFT surrogates — on
that embedding and the lyapunov stage's exponent), symbols (the defaults of 'unfold symbols' on
the lag chosen above: the return map with the partition's cut(s); the stream and its sidecar are
kept in memory, not written, so "output" and "sidecar" are empty) and entropy (the defaults of
'unfold entropy' on that stream: the block-entropy and entropy-rate curves). A stage that gives no
answer is recorded with its reason and the others still run. One line per stage goes to stderr
with its wall time (and a bar for long stages when stderr is a terminal).

--demo analyses the demo signal built into the binary (testdata/demo/strip.csv: a synthetic
strain record, see testdata/demo/README.md).`,
		Example: `  # the demo signal: open demo-report/report.html in a browser
  unfold report --demo -o demo-report
  # a recording, with a given lag and dimension and PNG copies of the figures
  unfold report --lag 12 --dim 3 --png -o lorenz-report lorenz.csv
  # the column named "strain" of a semicolon-separated file, every 2nd sample
  unfold report --column strain --decimate 2 -o run7 run7.csv`,
		Args: func(cmd *cobra.Command, args []string) error {
			if o.demo {
				if len(args) != 0 {
					return usagef("report: --demo takes no input file, got %d arguments", len(args))
				}
				return nil
			}
			return exactArgs(1)(cmd, args)
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			path := ""
			if len(args) == 1 {
				path = args[0]
			}
			return a.runReport(cmd, path, args, o)
		},
	}
	addInputFlags(cmd, &o.in)
	addReportFlags(cmd.Flags(), o)
	cmd.Flags().BoolVar(&o.demo, "demo", false, "analyse the demo signal built into the binary instead of a file")
	return cmd
}

// addReportFlags binds the flags report and batch share.
func addReportFlags(f *pflag.FlagSet, o *reportOptions) {
	f.StringVarP(&o.output, "output", "o", "", "output directory (created if missing)")
	f.BoolVar(&o.png, "png", false, "also write every figure as PNG")
	f.IntVar(&o.lag, "lag", 0, "delay in samples for the stages after lag (default: the lag stage's choice)")
	f.IntVar(&o.dim, "dim", 0, "embedding dimension for the stages after dim (default: the dim stage's choice)")
	f.IntVar(&o.maxDim, "max-dim", 10, "largest dimension scanned by the dim stage")
	f.IntVar(&o.theiler, "theiler", -1, "Theiler window in samples (default: 1/e decay time of the autocorrelation)")
	f.IntVar(&o.maxLag, "max-lag", 0, "largest lag scanned by the lag stage (default: as 'unfold lag')")
	f.StringVar(&o.mi, "mi", embed.Histogram, "mutual-information estimator of the lag stage: hist or ksg")
	f.StringVar(&o.norm, "norm", "euclidean", "distance of the dim and lyapunov stages: euclidean or max")
	f.Float64Var(&o.azimuth, "azimuth", -45, "rotation of the 3-D state-space view, degrees")
	f.Float64Var(&o.elevation, "elevation", 30, "elevation of the 3-D state-space view, degrees")
}

// cmdLine rebuilds the command as given for the provenance: the command path, every flag set
// and the arguments.
func cmdLine(cmd *cobra.Command, args []string) []string {
	parts := strings.Fields(cmd.CommandPath())
	cmd.Flags().Visit(func(f *pflag.Flag) {
		parts = append(parts, "--"+f.Name+"="+f.Value.String())
	})
	return append(parts, args...)
}

// commitID is the source commit recorded in the provenance.
func commitID() string {
	v := versionString()
	if i := strings.Index(v, "(commit "); i >= 0 {
		return strings.TrimSuffix(v[i+len("(commit "):], ")")
	}
	return "unknown"
}

// checkReportOptions validates the overrides before any work.
func checkReportOptions(o *reportOptions) error {
	if o.lag < 0 || o.dim < 0 || o.maxDim < 1 || o.maxLag < 0 {
		return usagef("report: want --lag, --dim and --max-lag ≥ 0 and --max-dim ≥ 1")
	}
	if o.mi != embed.Histogram && o.mi != embed.KSG {
		return usagef("report: --mi %q: want hist or ksg", o.mi)
	}
	if _, err := parseNorm(o.norm); err != nil {
		return err
	}
	return nil
}

// loadReportInput reads the input of a report: a file, standard input or the demo signal.
func (a *app) loadReportInput(path string, o *reportOptions) (*series.Series, *inputInfo, string, error) {
	if !o.demo {
		s, in, err := a.loadInput(path, &o.in)
		if err != nil {
			return nil, nil, "", err
		}
		title := filepath.Base(path)
		if path == "-" {
			title = "standard input"
		}
		return s, in, title, nil
	}
	b := demo.Strip()
	s, err := series.Read(bytes.NewReader(b), demo.Name, o.in.read)
	if err != nil {
		return nil, nil, "", err
	}
	if s, err = o.in.prep.Apply(s); err != nil {
		return nil, nil, "", err
	}
	h := sha256.Sum256(b)
	return s, &inputInfo{Path: demo.Path, SHA256: hex.EncodeToString(h[:]), Samples: s.Len(), Dt: s.Dt},
		demo.Name + " (built-in demo signal, synthetic)", nil
}

func (a *app) runReport(cmd *cobra.Command, path string, args []string, o *reportOptions) error {
	if o.output == "" {
		return usagef("report: give the output directory with -o DIR")
	}
	if err := checkReportOptions(o); err != nil {
		return err
	}
	if fi, err := os.Stat(o.output); err == nil && !fi.IsDir() {
		return usagef("report: -o %s is a file, not a directory", o.output)
	}
	s, in, title, err := a.loadReportInput(path, o)
	if err != nil {
		return err
	}
	a.notef("report: %s: %d samples, dt %s", title, s.Len(), fmtG(s.Dt))
	res := a.runChain(cmd, args, path, title, s, in, o, true)
	protect := []string{}
	if !o.demo {
		protect = append(protect, path)
	}
	if _, err := res.WriteDir(o.output, report.WriteOptions{PNG: o.png, Protect: protect}); err != nil {
		return err
	}
	a.notef("report: wrote %s, %s and %s (%.1f s)", filepath.Join(o.output, "report.html"),
		filepath.Join(o.output, "result.json"), filepath.Join(o.output, "figures"), res.Provenance.WallSeconds)
	if a.global.JSON {
		b, err := res.JSON()
		if err != nil {
			return err
		}
		if _, err := a.stdout.Write(b); err != nil {
			return err
		}
	} else {
		rows := [][]string{{"stage", "wall time (s)", "status"}}
		for _, st := range res.Provenance.Stages {
			rows = append(rows, []string{st.Key, fmt.Sprintf("%.2f", st.Seconds), st.Status})
		}
		if err := a.table(rows); err != nil {
			return err
		}
		fmt.Fprintf(a.stdout, "page: %s\n", filepath.Join(o.output, "report.html"))
	}
	if res.Status() != report.StatusOK {
		var why []string
		for _, k := range res.Keys {
			if e, ok := res.Errors[k]; ok {
				why = append(why, e)
			}
		}
		return noAnswer(errors.New("report: some stages gave no answer (the report is written): " + strings.Join(why, "; ")))
	}
	return nil
}

// runChain runs the report's stages on s; with progress, one line per stage goes to stderr.
func (a *app) runChain(cmd *cobra.Command, args []string, path, title string, s *series.Series, in *inputInfo, o *reportOptions, progress bool) *report.Result {
	p := reportParams{prepParams: newPrepParams(s, &o.in), Lag: o.lag, Dim: o.dim, MaxDim: o.maxDim, Theiler: o.theiler,
		MaxLag: o.maxLag, MI: o.mi, Norm: o.norm, Azimuth: o.azimuth, Elevation: o.elevation, PNG: o.png, Threads: a.threads()}
	h := report.Header{Version: versionString(), Commit: commitID(), CommandLine: cmdLine(cmd, args),
		Seeds: map[string]uint64{"seed": a.global.Seed}, Parameters: p, Title: title,
		Input: report.Input{Path: in.Path, SHA256: in.SHA256, Samples: in.Samples, Dt: in.Dt}}
	if path == "" {
		path = in.Path
	}
	var after func(string, time.Duration, error)
	if progress {
		after = func(key string, took time.Duration, err error) {
			if err != nil {
				a.notef("  %-9s %7.2f s  no answer: %v", key, took.Seconds(), err)
				return
			}
			a.notef("  %-9s %7.2f s", key, took.Seconds())
		}
	}
	return report.Run(h, a.reportStages(path, s, in, o), nil, after)
}

// chainState carries the choices of earlier stages to the later ones.
type chainState struct {
	lag                  int
	lagMethod, dimMethod string
	dim                  int
	// theiler is the Theiler window in samples (-1 until given or chosen by the dim stage) and
	// theilerFrom how it was chosen ("" when not yet known).
	theiler     int
	theilerFrom string
	// title names the input in the figure titles.
	title string
	// lambda is λ1 of the lyapunov stage (nats per time unit; nil when it gave none) and
	// lambdaInterval its interval; the regime stage uses them as its λ1 evidence.
	lambda         *float64
	lambdaInterval [2]float64
}

// reportStages builds the stage list from the same functions the single commands use, so that
// each stage's JSON is what that command prints with --json.
func (a *app) reportStages(path string, s *series.Series, in *inputInfo, o *reportOptions) []report.Stage {
	st := &chainState{lag: o.lag, dim: o.dim, theiler: o.theiler}
	if st.theiler >= 0 {
		st.theilerFrom = "given"
	}
	if st.lag > 0 {
		st.lagMethod = "given"
	}
	if st.dim > 0 {
		st.dimMethod = "given"
	}
	fig := figureOf(path, s)
	if o.demo {
		fig.Title = demo.Name
	}
	st.title = fig.Title
	envelope := func(command string, params, body any) ([]byte, error) {
		return buildJSON(command, in, params, body)
	}
	sym := &symbolStream{} // the symbols stage's stream, read by the entropy stage
	stages := []report.Stage{
		{Key: "inspect", Title: "The signal", Run: func() (*report.Section, error) {
			io := &inspectOptions{in: o.in}
			p, res, sm, err := inspectCompute(path, s, io)
			if err != nil {
				return nil, err
			}
			js, err := envelope("inspect", p, res)
			if err != nil {
				return nil, err
			}
			f, err := report.SignalFigure("signal", s.Name, s.Unit, fig.TimeUnit, s.Values, s.Dt, 1500)
			if err != nil {
				return nil, fmt.Errorf("inspect: figure: %w", err)
			}
			g := fmtG
			unit := ""
			if s.Unit != "" {
				unit = " " + s.Unit
			}
			return &report.Section{JSON: js, Figures: []report.Figure{f}, Cautions: sm.Cautions, Summary: [][2]string{
				{"signal", s.Name},
				{"samples", strconv.Itoa(sm.Samples)},
				{"sampling interval", g(sm.Dt) + " time units (duration " + g(sm.Duration) + ")"},
				{"mean ± std", g(sm.Mean) + " ± " + g(sm.Std) + unit},
				{"range", g(sm.Min) + " … " + g(sm.Max) + unit},
				{"quantization step", g(sm.Quantization) + unit},
				{"dominant period", g(sm.DominantPeriod) + " time units (" + g(sm.DominantPeriod/sm.Dt) + " samples)"},
				{"gaps filled", strconv.Itoa(sm.GapsFilled)},
				{"stationary", fmt.Sprintf("%v (mean shift %.1f, variance shift %.1f standard errors)",
					sm.Stationarity.Stationary, sm.Stationarity.MeanShift, sm.Stationarity.VarianceShift)},
			}}, nil
		}},
		{Key: "lag", Title: "Delay: mutual information and autocorrelation", Run: func() (*report.Section, error) {
			lo := &lagOptions{}
			addLagFlags(pflag.NewFlagSet("lag", pflag.ContinueOnError), lo)
			lo.in, lo.maxLag, lo.mi = o.in, o.maxLag, o.mi
			c, p, res, err := a.lagCompute(path, s, lo)
			if err != nil {
				return nil, err
			}
			if st.lag == 0 {
				st.lag, st.lagMethod = c.Lag, c.Method
			}
			js, err := envelope("lag", p, res)
			if err != nil {
				return nil, err
			}
			rows, err := figure.LagPlots(c, fig)
			if err != nil {
				return nil, fmt.Errorf("lag: figure: %w", err)
			}
			sum := [][2]string{
				{"chosen lag", fmt.Sprintf("%d samples = %s time units", c.Lag, fmtG(res.LagTime))},
				{"rule", c.Method + ": " + c.Reason},
				{"estimator", p.Estimator},
				{"autocorrelation", acfText(res.AutocorrelationZero, res.AutocorrelationDecay, p.MaxLag)},
				{"suggested Theiler window", strconv.Itoa(res.Theiler) + " samples"},
			}
			if o.lag > 0 {
				sum = append(sum, [2]string{"lag used downstream", strconv.Itoa(o.lag) + " samples (given with --lag)"})
			}
			return &report.Section{JSON: js, Summary: sum, Cautions: res.Cautions, Figures: []report.Figure{{Name: "lag",
				Caption: "Mutual information (bits) and autocorrelation against the delay; the chosen lag is marked.",
				Width:   figure.Width, Height: figure.HeightFor(len(rows)), Rows: rows}}}, nil
		}},
		{Key: "dim", Title: "Dimension: false neighbours and Cao's E1/E2", Run: func() (*report.Section, error) {
			do := &dimOptions{}
			addDimFlags(pflag.NewFlagSet("dim", pflag.ContinueOnError), do)
			do.in, do.lag, do.theiler, do.maxDim, do.norm = o.in, st.lag, o.theiler, o.maxDim, o.norm
			c, p, res, err := a.dimCompute(path, s, do, st.lagMethod)
			if err != nil {
				return nil, err
			}
			if st.theiler < 0 {
				st.theiler, st.theilerFrom = p.Theiler, p.TheilerFrom
			}
			js, err := envelope("dim", p, res)
			if err != nil {
				return nil, err
			}
			rows, err := figure.DimPlots(c, fig)
			if err != nil {
				return nil, fmt.Errorf("dim: figure: %w", err)
			}
			chosen := "none up to " + strconv.Itoa(c.MaxDim)
			if c.Dimension > 0 {
				chosen = strconv.Itoa(c.Dimension)
			}
			sec := &report.Section{JSON: js, Cautions: res.Cautions, Summary: [][2]string{
				{"chosen dimension", chosen},
				{"rule", c.Method + ": " + c.Reason},
				{"false neighbours / Cao", dimText(c.FNNDim, c.MaxDim) + " / " + dimText(c.CaoDim, c.MaxDim)},
				{"consistent with noise (E2 ≈ 1)", strconv.FormatBool(c.NoiseLike)},
				{"lag, Theiler window", fmt.Sprintf("%d samples (%s), %d samples (%s)", p.Lag, p.LagMethod, p.Theiler, p.TheilerFrom)},
			}, Figures: []report.Figure{{Name: "dim",
				Caption: "False-neighbour fraction and Cao's E1, E2 against the dimension; the chosen dimension is marked.",
				Width:   figure.Width, Height: figure.HeightFor(len(rows)), Rows: rows}}}
			if c.Dimension == 0 {
				return sec, noAnswer(fmt.Errorf("dim: %s", c.Reason))
			}
			if st.dim == 0 {
				st.dim, st.dimMethod = c.Dimension, c.Method
			}
			return sec, nil
		}},
		{Key: "embed", Title: "State-space picture", Run: func() (*report.Section, error) {
			eo := &embedOptions{}
			addEmbedFlags(pflag.NewFlagSet("embed", pflag.ContinueOnError), eo)
			eo.in, eo.lag, eo.dim, eo.theiler, eo.maxDim = o.in, st.lag, st.dim, o.theiler, o.maxDim
			eo.azimuth, eo.elevation, eo.plot = o.azimuth, o.elevation, "figures/embed.svg"
			e, _, p, res, err := a.embedCompute(path, s, eo, st.lagMethod, st.dimMethod)
			if err != nil {
				return nil, err
			}
			js, err := envelope("embed", p, res)
			if err != nil {
				return nil, err
			}
			rows, err := figure.StateSpacePlots(e, fig, figure.StateSpaceOptions{Azimuth: o.azimuth, Elevation: o.elevation, DensityAbove: 3000, Bins: 140})
			if err != nil {
				return nil, fmt.Errorf("embed: figure: %w", err)
			}
			w, h := figure.SizeFor(rows)
			return &report.Section{JSON: js, Cautions: res.Cautions, Summary: [][2]string{
				{"delay vectors", fmt.Sprintf("%d of dimension %d at lag %d samples", res.Vectors, res.Dimension, res.Lag)},
				{"lag / dimension from", p.LagMethod + " / " + p.DimMethod},
			}, Figures: []report.Figure{{Name: "embed",
				Caption: "The delay plot x(t+τ) against x(t) and, for m ≥ 3, an oblique view of (x(t), x(t+τ), x(t+2τ)).",
				Width:   w, Height: h, Rows: rows}}}, nil
		}},
		a.lyapunovStage(path, s, o, st, envelope),
		a.fractalStage(path, s, o, st, envelope),
		a.regimeStage(path, s, o, st, envelope),
		// Every stage of the chain (issue 8) is in; each is built from the same compute function
		// as its single command, under the keys of DESIGN.md §3. summary.csv reads lambda_max,
		// d2, regime and confidence from those keys.
		a.symbolsStage(path, s, in, o, st, sym, envelope),
		a.entropyStage(sym),
	}
	return stages
}

// dimText is a dimension found by one criterion, or "none up to MAX" when it found none.
func dimText(d, maxDim int) string {
	if d <= 0 {
		return "none up to " + strconv.Itoa(maxDim)
	}
	return strconv.Itoa(d)
}

// acfText describes the autocorrelation's first zero and 1/e decay (0 = not reached in the scan).
func acfText(zero, decay, maxLag int) string {
	z, d := "no zero up to lag "+strconv.Itoa(maxLag), "no 1/e decay up to lag "+strconv.Itoa(maxLag)
	if zero > 0 {
		z = "first zero at lag " + strconv.Itoa(zero)
	}
	if decay > 0 {
		d = "1/e decay at lag " + strconv.Itoa(decay)
	}
	return z + ", " + d
}
