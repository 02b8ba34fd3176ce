package main

import (
	"fmt"
	"path/filepath"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/analysis"
	"unfold/report"
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
	// staging, when not nil, is the folder the page is written into after every stage.
	staging *report.Staging
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
with its evidence and cautions, with the defaults of 'unfold regime' — 39 IAAFT surrogates — on
that embedding and the lyapunov stage's exponent), symbols (the defaults of 'unfold symbols' on
the lag chosen above: the return map with the partition's cut(s); the stream and its sidecar are
kept in memory, not written, so "output" and "sidecar" are empty) and entropy (the defaults of
'unfold entropy' on that stream: the block-entropy and entropy-rate curves) and states (the
defaults of 'unfold states' on that stream: the causal states and their diagram). A stage that
gives no answer is recorded with its reason and the others still run (exit status 1); a stage
that does not apply to the record (too short a record or stream) is "skipped" with its reason and
what to give, and does not count as missing. One line per stage goes to stderr
with its wall time (and a bar for long stages when stderr is a terminal); stdout gets the
summary that opens the page: the verdict, λ1 and D2 with units, the embedding, the cautions
that matter most and the figure to read first.

--demo analyses the demo signal built into the binary (testdata/demo/strip.csv: a synthetic
strain record, see testdata/demo/README.md).

Cost as a function of N: the sum of the stages' costs (see each command's help), about
O(N log N) in all: every quadratic step is bounded (sampled reference points, the first 20 000
samples for the surrogate tests); memory O(N · m).`,
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
	d, e := analysis.DefaultDimOptions(), analysis.DefaultEmbedOptions()
	f.StringVarP(&o.output, "output", "o", "", "output directory (created if missing)")
	f.BoolVar(&o.png, "png", false, "also write every figure as PNG")
	f.IntVar(&o.lag, "lag", 0, "delay in samples for the stages after lag (default: the lag stage's choice)")
	f.IntVar(&o.dim, "dim", 0, "embedding dimension for the stages after dim (default: the dim stage's choice)")
	f.IntVar(&o.maxDim, "max-dim", d.MaxDim, "largest dimension scanned by the dim stage")
	f.IntVar(&o.theiler, "theiler", d.Theiler, "Theiler window in samples (default: 1/e decay time of the autocorrelation)")
	f.IntVar(&o.maxLag, "max-lag", 0, "largest lag scanned by the lag stage (default: as 'unfold lag')")
	f.StringVar(&o.mi, "mi", analysis.DefaultLagOptions().MI, "mutual-information estimator of the lag stage: hist or ksg")
	f.StringVar(&o.norm, "norm", d.Norm, "distance of the dim and lyapunov stages: euclidean or max")
	f.Float64Var(&o.azimuth, "azimuth", e.Azimuth, "rotation of the 3-D state-space view, degrees")
	f.Float64Var(&o.elevation, "elevation", e.Elevation, "elevation of the 3-D state-space view, degrees")
}

func (a *app) runReport(cmd *cobra.Command, path string, args []string, o *reportOptions) error {
	if o.output == "" {
		return usagef("report: give the output directory with -o DIR")
	}
	if err := checkReportOptions(o); err != nil {
		return err
	}
	protect := []string{}
	if !o.demo && path != "-" {
		protect = append(protect, path)
	}
	stg, err := report.StageDir(o.output, protect...)
	if err != nil {
		return &usageError{err}
	}
	defer stg.Abort()
	s, in, title, err := a.loadReportInput(path, o)
	if err != nil {
		return err
	}
	if err := analysis.CheckEmbedding(s.Len(), o.lag, o.dim, o.theiler); err != nil {
		return fmt.Errorf("report: %s: %w", title, err)
	}
	a.notef("report: %s: %d samples, dt %s", title, s.Len(), fmtG(s.Dt))
	a.notef("report: the page fills in at %s; it moves to %s when the chain ends", stg.Page(), o.output)
	o.staging = stg
	res := a.runChain(cmd, args, path, title, s, in, o, true)
	if _, err := stg.Commit(res, report.WriteOptions{PNG: o.png, Protect: protect}); err != nil {
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
		// the stage times went to stderr as the stages ran (and are in the page's provenance):
		// stdout has the summary, as at the top of the page
		if err := a.printSummary(res.Summary); err != nil {
			return err
		}
		fmt.Fprintf(a.stdout, "page: %s\n", filepath.Join(o.output, "report.html"))
	}
	if err := res.NoAnswer(); err != nil {
		return noAnswer(fmt.Errorf("report: %w", err))
	}
	return nil
}
