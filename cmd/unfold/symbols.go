package main

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/analysis"
	"unfold/report"
	"unfold/series"
	"unfold/symbolic"
)

type symbolsOptions struct {
	in         inputOptions
	output     string
	kind       string
	alphabet   int
	thresholds []float64
	flow, mapR bool
	lag        int
	maxima     bool
	level      string
	direction  string
	interp     string
}

func newSymbolsCmd(a *app) *cobra.Command {
	o := &symbolsOptions{}
	cmd := &cobra.Command{
		Use:   "symbols FILE -o OUT.sym",
		Short: "Choose a partition and write the symbol stream",
		Long: `symbols turns a signal into a stream of symbols and writes it with a JSON sidecar (OUT.sym.json)
that holds the alphabet, the partition (kind, thresholds, score), the source file and its SHA-256,
the counts and the exact command.

Map-like or flow-like is decided from the data — flow-like when the autocorrelation at lag 1 is at
least 0.8 and the chosen lag at least 2 — and shown; --map or --flow overrides it. A map-like record
is partitioned sample by sample; a flow-like one at its Poincaré-section crossings (as in unfold
section: the plane through the mean, upward, the first in-plane coordinate x(t+τ); --maxima takes
the local maxima instead).

Partitions (--partition):
  search     (default) the generating-like partition: candidates are scored by their fraction of
             symbolic false nearest neighbours (Kennel & Buhl 2003) and by their entropy rate, and
             the best is kept; the score is that fraction (lower is better)
  critical   a binary cut at the extremum of the return map x_{n+1} = f(x_n), fitted by local
             quadratic regression (the critical point of a unimodal map)
  quantile   K equally populated symbols (--alphabet K)
  threshold  the cuts given with --thresholds
The file is written to a temporary name and renamed, and never over the input.

Cost as a function of N: the partition search scores at most the first 20 000 values, whatever
N; writing the stream is O(N) (O(N log N) for quantile cuts); memory O(N).`,
		Example: `  # map-like record: search a binary generating-like partition
  unfold symbols --json --alphabet 2 logistic.csv -o logistic.sym
  # a flow: symbols from the maxima of z, cut at the critical point of the return map
  unfold symbols --column z --flow --maxima --partition critical lorenz.csv -o lorenz.sym
  # four equally populated symbols, sample by sample
  unfold symbols --map --partition quantile --alphabet 4 signal.csv -o signal.sym
  # given cuts
  unfold symbols --partition threshold --thresholds -0.5,0.5 signal.csv -o signal.sym`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runSymbols(cmd, args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	addSymbolsFlags(cmd.Flags(), o)
	return cmd
}

// addSymbolsFlags binds the flags of symbols (the report takes their defaults from here).
func addSymbolsFlags(f *pflag.FlagSet, o *symbolsOptions) {
	d := analysis.DefaultSymbolsOptions()
	f.StringVarP(&o.output, "output", "o", "", "symbol stream to write (its sidecar is OUT.json beside it)")
	f.StringVar(&o.kind, "partition", d.Kind, "partition: search, critical, quantile or threshold")
	f.IntVar(&o.alphabet, "alphabet", d.Alphabet, "alphabet size K (search and quantile)")
	f.Float64SliceVar(&o.thresholds, "thresholds", d.Thresholds, "cut values for --partition threshold, comma separated")
	f.BoolVar(&o.flow, "flow", d.Flow, "treat the record as a sampled flow (partition its section)")
	f.BoolVar(&o.mapR, "map", d.Map, "treat the record as a map (partition the samples)")
	f.IntVar(&o.lag, "lag", d.Lag, "lag in samples for the map/flow decision and the section (default: chosen from the mutual information)")
	f.BoolVar(&o.maxima, "maxima", d.Maxima, "flows: use the local maxima of the signal as the section")
	f.StringVar(&o.level, "level", d.Level, "flows: where the section plane cuts the first delay coordinate")
	f.StringVar(&o.direction, "direction", d.Direction, "flows: section crossing direction: up, down or both")
	f.StringVar(&o.interp, "interp", d.Interp, "flows: interpolation between samples: linear or cubic")
}

type symbolsRun = analysis.SymbolsRun

func (o *symbolsOptions) options() analysis.SymbolsOptions {
	return analysis.SymbolsOptions{Output: o.output, Kind: o.kind, Alphabet: o.alphabet, Thresholds: o.thresholds,
		Flow: o.flow, Map: o.mapR, Lag: o.lag, Maxima: o.maxima, Level: o.level, Direction: o.direction, Interp: o.interp}
}

// commandLine rebuilds the command as given: the command path, every flag set and the arguments.
func commandLine(cmd *cobra.Command, args []string) string {
	parts := []string{cmd.CommandPath()}
	cmd.Flags().Visit(func(f *pflag.Flag) {
		parts = append(parts, "--"+f.Name+"="+f.Value.String())
	})
	parts = append(parts, args...)
	return strings.Join(parts, " ")
}

func (a *app) runSymbols(cmd *cobra.Command, path string, o *symbolsOptions) error {
	if o.output == "" || o.output == "-" {
		return usagef("symbols: give the stream to write with -o OUT.sym")
	}
	if err := analysis.CheckSymbols(o.options(), cmd.Flags().Changed("alphabet")); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	run, params, err := a.env(&o.in).Symbols(path, s, o.options(), "")
	for _, n := range noteList(run) {
		a.notef("%s", n)
	}
	if err != nil {
		return err
	}
	sidePath := symbolic.SidecarPath(o.output)
	out, err := series.CreateAtomic(o.output, path)
	if err != nil {
		return err
	}
	defer out.Abort()
	side, err := series.CreateAtomic(sidePath, path)
	if err != nil {
		return err
	}
	defer side.Abort()
	sc, err := run.WriteSymbols(out, o.output, symbolic.Source{Path: in.Path, SHA256: in.SHA256}, commandLine(cmd, []string{path}), versionString())
	if err != nil {
		return err
	}
	if err := symbolic.WriteSidecar(side, sc); err != nil {
		return fmt.Errorf("symbols: writing %s: %w", sidePath, err)
	}
	if err := out.Commit(); err != nil {
		return err
	}
	if err := side.Commit(); err != nil {
		return err
	}
	if a.global.JSON {
		return a.emitJSON("symbols", in, params, run.Result(sc, o.output, sidePath))
	}
	p := run.Part
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
	rows := [][]string{
		{"file", path},
		{"record", run.Rec.Kind + " (" + run.RecFrom + "), symbols from the " + run.Applied},
		{"partition", p.Kind + " at " + report.ThresholdText(p.Thresholds)},
		{"score", g(p.Score) + " (symbolic false-neighbour fraction; lower is better)"},
		{"entropy rate", g(p.EntropyRate) + " bits/symbol"},
		{"alphabet", run.Alphabet},
		{"symbols", strconv.FormatInt(sc.Count, 10)},
		{"written", o.output + " and " + sidePath},
	}
	if run.Rule != "" {
		rows = append(rows, []string{"rule", run.Rule})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range run.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}

// noteList is the stderr notes of a run (none when there is no run).
func noteList(run *symbolsRun) []string {
	if run == nil {
		return nil
	}
	return run.Notes
}
