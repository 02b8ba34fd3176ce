package main

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/partition"
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
The file is written to a temporary name and renamed, and never over the input.`,
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
	f.StringVarP(&o.output, "output", "o", "", "symbol stream to write (its sidecar is OUT.json beside it)")
	f.StringVar(&o.kind, "partition", "search", "partition: search, critical, quantile or threshold")
	f.IntVar(&o.alphabet, "alphabet", 2, "alphabet size K (search and quantile)")
	f.Float64SliceVar(&o.thresholds, "thresholds", nil, "cut values for --partition threshold, comma separated")
	f.BoolVar(&o.flow, "flow", false, "treat the record as a sampled flow (partition its section)")
	f.BoolVar(&o.mapR, "map", false, "treat the record as a map (partition the samples)")
	f.IntVar(&o.lag, "lag", 0, "lag in samples for the map/flow decision and the section (default: chosen from the mutual information)")
	f.BoolVar(&o.maxima, "maxima", false, "flows: use the local maxima of the signal as the section")
	f.StringVar(&o.level, "level", "mean", "flows: where the section plane cuts the first delay coordinate")
	f.StringVar(&o.direction, "direction", "up", "flows: section crossing direction: up, down or both")
	f.StringVar(&o.interp, "interp", "linear", "flows: interpolation between samples: linear or cubic")
}

type symbolsParams struct {
	Column     string           `json:"column"`
	Partition  string           `json:"partition"`
	Alphabet   int              `json:"alphabet"`
	Record     partition.Record `json:"record"`
	RecordFrom string           `json:"record_from"`
	Section    *sectionParams   `json:"section,omitempty"`
}

type partitionJSON struct {
	Kind        string    `json:"kind"`
	Thresholds  []float64 `json:"thresholds"`
	Score       *float64  `json:"score"`
	Criterion   string    `json:"criterion"`
	EntropyRate *float64  `json:"entropy_rate"`
	AppliedTo   string    `json:"applied_to"`
	Rule        string    `json:"rule,omitempty"`
}

type symbolsResult struct {
	Partition    partitionJSON `json:"partition"`
	AlphabetSize int           `json:"alphabet_size"`
	Alphabet     string        `json:"alphabet"`
	Count        int64         `json:"count"`
	Counts       []int64       `json:"counts"`
	Output       string        `json:"output"`
	Sidecar      string        `json:"sidecar"`
	Cautions     []string      `json:"cautions"`
}

func finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
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

// checkSymbolsOptions validates the flags of symbols before any work; alphabetGiven says
// whether --alphabet was set.
func checkSymbolsOptions(o *symbolsOptions, alphabetGiven bool) error {
	if o.flow && o.mapR {
		return usagef("symbols: --flow and --map exclude each other")
	}
	switch o.kind {
	case "search", "critical", "quantile", "threshold":
	default:
		return usagef("symbols: --partition %q: want search, critical, quantile or threshold", o.kind)
	}
	if o.kind == "threshold" && len(o.thresholds) == 0 {
		return usagef("symbols: --partition threshold needs --thresholds")
	}
	if o.alphabet < 2 || o.alphabet > symbolic.MaxAlphabet {
		return usagef("symbols: --alphabet %d: want 2 to %d", o.alphabet, symbolic.MaxAlphabet)
	}
	if o.kind == "critical" && alphabetGiven && o.alphabet != 2 {
		return usagef("symbols: the critical-point partition is binary; --alphabet must be 2")
	}
	return nil
}

// symbolsRun is what symbolsCompute found: the values that were partitioned (the samples of a
// map-like record or the section of a flow-like one), the partition and the notes the command
// prints on stderr.
type symbolsRun struct {
	values    []float64 // what the partition is applied to
	valueName string    // its name for axis labels: x, x(t+τ) or max_x
	part      *partition.Partition
	alphabet  string
	rule      string
	rec       partition.Record
	recFrom   string
	applied   string // "signal" or "section"
	cautions  []string
	notes     []string
}

// symbolsCompute decides map or flow, takes the section of a flow and chooses the partition,
// as `symbols` does; lagFrom names where a given o.lag came from ("" = given with --lag). The
// stream itself is written by writeSymbols. The command and the report both use it.
func (a *app) symbolsCompute(path string, s *series.Series, o *symbolsOptions, lagFrom string) (*symbolsRun, symbolsParams, error) {
	if err := series.CheckVariable(s.Values); err != nil {
		return nil, symbolsParams{}, err
	}
	run := &symbolsRun{}
	lag, lagMethod := o.lag, "given"
	if lag > 0 && lagFrom != "" {
		lagMethod = lagFrom
	}
	if lag <= 0 && !o.mapR {
		l, lm, _, _, cs, err := a.embeddingDefaults(s.Values, 0, 0)
		if err != nil {
			return run, symbolsParams{}, noAnswer(fmt.Errorf("symbols: %s: choosing the lag: %w", path, err))
		}
		lag, lagMethod = l, lm
		run.cautions = append(run.cautions, cs...)
	}
	rec := partition.DecideRecord(s.Values, max(lag, 1))
	recFrom := "data"
	switch {
	case o.flow:
		rec.Kind, recFrom = "flow", "given (--flow)"
	case o.mapR:
		rec.Kind, recFrom = "map", "given (--map)"
	default:
		run.notes = append(run.notes, rec.Reason)
	}
	values := s.Values
	applied, valueName := "signal", s.Name
	var secP *sectionParams
	if rec.Kind == "flow" {
		opt, lm, levelFrom, cs, err := a.sectionOpts(s.Values, max(lag, 1), 2, o.level, o.direction, o.interp, o.maxima)
		if err != nil {
			return run, symbolsParams{}, err
		}
		if lm == "given" && (o.lag <= 0 || lagFrom != "") {
			lm = lagMethod
		}
		run.cautions = append(run.cautions, cs...)
		sec, err := partition.TakeSection(s.Values, s.Dt, s.T0, opt)
		if err != nil {
			return run, symbolsParams{}, noAnswer(fmt.Errorf("symbols: %s: %w", path, err))
		}
		run.cautions = append(run.cautions, sec.Cautions...)
		values, applied = sec.Values(), "section"
		_, valueName = sectionColumns(sec, s.Name)
		secP = &sectionParams{Method: sec.Method, Level: sec.Level, LevelFrom: levelFrom, Direction: o.direction, Interp: sec.Interp}
		if sec.Method == "hyperplane" {
			secP.Lag, secP.LagMethod, secP.Dim = sec.Lag, lm, sec.Dim
		}
		run.notes = append(run.notes, fmt.Sprintf("section: %d crossings (%s)", sec.Len(), sec.Method))
	}
	sopt := partition.SearchOptions{Alphabet: o.alphabet, Threads: a.threads()}
	var p *partition.Partition
	var err error
	switch o.kind {
	case "search":
		r, err := partition.Search(values, sopt)
		if err != nil {
			return run, symbolsParams{}, noAnswer(fmt.Errorf("symbols: %s: %w", path, err))
		}
		p, run.rule = &r.Partition, r.Rule
		run.cautions = append(run.cautions, r.Cautions...)
	case "critical":
		c, err := partition.CriticalPoint(values, partition.CriticalOptions{})
		if err != nil {
			return run, symbolsParams{}, noAnswer(fmt.Errorf("symbols: %s: %w", path, err))
		}
		p = &c.Partition
		run.rule = fmt.Sprintf("cut at the %s of the return map fitted by local quadratic regression (kernel half-width %.4g)", c.Extremum, c.Bandwidth)
	case "quantile":
		p, err = partition.Quantile(values, o.alphabet)
		if err != nil {
			return run, symbolsParams{}, noAnswer(fmt.Errorf("symbols: %s: %w", path, err))
		}
	case "threshold":
		p, err = partition.Threshold(o.thresholds)
		if err != nil {
			return run, symbolsParams{}, usagef("symbols: --thresholds: %v", err)
		}
	}
	if o.kind != "search" {
		sopt.Alphabet = p.K()
		if f, h, err := partition.Score(values, p, sopt); err == nil {
			p.Score, p.EntropyRate = f, h
		} else {
			run.cautions = append(run.cautions, "the partition could not be scored: "+err.Error())
		}
	}
	alphabet, err := symbolic.DefaultAlphabet(p.K())
	if err != nil {
		return run, symbolsParams{}, usagef("symbols: %v", err)
	}
	run.values, run.valueName, run.part, run.alphabet = values, valueName, p, alphabet
	run.rec, run.recFrom, run.applied = rec, recFrom, applied
	if run.cautions == nil {
		run.cautions = []string{}
	}
	params := symbolsParams{Column: s.Name, Partition: o.kind, Alphabet: p.K(), Record: rec, RecordFrom: recFrom, Section: secP}
	return run, params, nil
}

// writeSymbols writes the stream of run to w (in chunks, over the run's alphabet) and returns
// its sidecar, with the source, command line and version given.
func (run *symbolsRun) writeSymbols(w io.Writer, name string, src symbolic.Source, command string) (*symbolic.Sidecar, error) {
	sw, err := symbolic.NewWriter(w, run.alphabet)
	if err != nil {
		return nil, err
	}
	p, values := run.part, run.values
	buf := make([]uint8, 0, 1<<15)
	for i := 0; i < len(values); i += 1 << 15 {
		buf = p.Apply(values[i:min(i+1<<15, len(values))], buf)
		if err := sw.Write(buf); err != nil {
			return nil, fmt.Errorf("symbols: writing %s: %w", name, err)
		}
	}
	if err := sw.Close(); err != nil {
		return nil, fmt.Errorf("symbols: writing %s: %w", name, err)
	}
	info := symbolic.PartitionInfo{Kind: p.Kind, Thresholds: p.Thresholds, Score: p.Score, Criterion: partition.Criterion, AppliedTo: run.applied}
	if math.IsNaN(info.Score) {
		info.Score = -1
		info.Criterion = "not scored (-1)"
	}
	return sw.Sidecar(info, src, command, versionString()), nil
}

// result is the JSON body of `symbols` for the stream with sidecar sc, written to output
// (and its sidecar to sidecar; both "" when the stream was kept in memory).
func (run *symbolsRun) result(sc *symbolic.Sidecar, output, sidecar string) symbolsResult {
	p := run.part
	return symbolsResult{
		Partition: partitionJSON{Kind: p.Kind, Thresholds: p.Thresholds, Score: finite(p.Score), Criterion: partition.Criterion,
			EntropyRate: finite(p.EntropyRate), AppliedTo: run.applied, Rule: run.rule},
		AlphabetSize: p.K(), Alphabet: run.alphabet, Count: sc.Count, Counts: sc.Counts,
		Output: output, Sidecar: sidecar, Cautions: run.cautions}
}

func (a *app) runSymbols(cmd *cobra.Command, path string, o *symbolsOptions) error {
	if o.output == "" || o.output == "-" {
		return usagef("symbols: give the stream to write with -o OUT.sym")
	}
	if err := checkSymbolsOptions(o, cmd.Flags().Changed("alphabet")); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	run, params, err := a.symbolsCompute(path, s, o, "")
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
	sc, err := run.writeSymbols(out, o.output, symbolic.Source{Path: in.Path, SHA256: in.SHA256}, commandLine(cmd, []string{path}))
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
		return a.emitJSON("symbols", in, params, run.result(sc, o.output, sidePath))
	}
	p := run.part
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
	rows := [][]string{
		{"file", path},
		{"record", run.rec.Kind + " (" + run.recFrom + "), symbols from the " + run.applied},
		{"partition", p.Kind + " at " + thresholdText(p.Thresholds)},
		{"score", g(p.Score) + " (symbolic false-neighbour fraction; lower is better)"},
		{"entropy rate", g(p.EntropyRate) + " bits/symbol"},
		{"alphabet", run.alphabet},
		{"symbols", strconv.FormatInt(sc.Count, 10)},
		{"written", o.output + " and " + sidePath},
	}
	if run.rule != "" {
		rows = append(rows, []string{"rule", run.rule})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range run.cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}

// noteList is the stderr notes of a run (none when there is no run).
func noteList(run *symbolsRun) []string {
	if run == nil {
		return nil
	}
	return run.notes
}

// thresholdText lists cut values with 6 significant digits, comma separated.
func thresholdText(th []float64) string {
	t := make([]string, len(th))
	for i, v := range th {
		t[i] = strconv.FormatFloat(v, 'g', 6, 64)
	}
	return strings.Join(t, ", ")
}
