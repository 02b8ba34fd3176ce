package analysis

import (
	"fmt"
	"io"
	"math"

	"unfold/embed"
	"unfold/partition"
	"unfold/series"
	"unfold/symbolic"
)

// SymbolsOptions are the options of the symbols stage (the flags of `unfold symbols`).
type SymbolsOptions struct {
	// Output is the stream written (recorded in the body; "" when kept in memory).
	Output string
	// Kind is the partition: "search", "critical", "quantile" or "threshold"; Alphabet its
	// size K (search and quantile); Thresholds the cuts of "threshold".
	Kind       string
	Alphabet   int
	Thresholds []float64
	// Flow and Map force the record's kind (default: decided from the data).
	Flow, Map bool
	// Lag is the delay of the decision and the section (0: chosen).
	Lag int
	// Maxima, Level, Direction and Interp shape the section of a flow (see SectionOptions).
	Maxima                   bool
	Level, Direction, Interp string
	// Densest, for a flow without Maxima, takes both the section and the local maxima and
	// partitions whichever gives more values (the chain sets it: the densest valid source).
	Densest bool
}

// DefaultSymbolsOptions returns the defaults of `unfold symbols`.
func DefaultSymbolsOptions() SymbolsOptions {
	return SymbolsOptions{Kind: "search", Alphabet: 2, Level: "mean", Direction: "up", Interp: "linear"}
}

// SymbolsParams are the "parameters" of the symbols stage.
type SymbolsParams struct {
	Column     string           `json:"column"`
	Partition  string           `json:"partition"`
	Alphabet   int              `json:"alphabet"`
	Record     partition.Record `json:"record"`
	RecordFrom string           `json:"record_from"`
	Section    *SectionParams   `json:"section,omitempty"`
}

// PartitionJSON is the partition of the symbols stage.
type PartitionJSON struct {
	Kind        string    `json:"kind"`
	Thresholds  []float64 `json:"thresholds"`
	Score       *float64  `json:"score"`
	Criterion   string    `json:"criterion"`
	EntropyRate *float64  `json:"entropy_rate"`
	AppliedTo   string    `json:"applied_to"`
	Rule        string    `json:"rule,omitempty"`
}

// SymbolsResult is the JSON body of the symbols stage.
type SymbolsResult struct {
	Partition    PartitionJSON `json:"partition"`
	AlphabetSize int           `json:"alphabet_size"`
	Alphabet     string        `json:"alphabet"`
	Count        int64         `json:"count"`
	Counts       []int64       `json:"counts"`
	Output       string        `json:"output"`
	Sidecar      string        `json:"sidecar"`
	Cautions     []string      `json:"cautions"`
}

// Finite is v, or nil (null in JSON) when v is not a finite number: the one way a result
// field that may have no answer is written.
func Finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// CheckSymbols validates the flags of symbols before any work; alphabetGiven says
// whether --alphabet was set.
func CheckSymbols(o SymbolsOptions, alphabetGiven bool) error {
	if o.Flow && o.Map {
		return Usagef("symbols: --flow and --map exclude each other")
	}
	switch o.Kind {
	case "search", "critical", "quantile", "threshold":
	default:
		return Usagef("symbols: --partition %q: want search, critical, quantile or threshold", o.Kind)
	}
	if o.Kind == "threshold" && len(o.Thresholds) == 0 {
		return Usagef("symbols: --partition threshold needs --thresholds")
	}
	if o.Alphabet < 2 || o.Alphabet > symbolic.MaxAlphabet {
		return Usagef("symbols: --alphabet %d: want 2 to %d", o.Alphabet, symbolic.MaxAlphabet)
	}
	if o.Kind == "critical" && alphabetGiven && o.Alphabet != 2 {
		return Usagef("symbols: the critical-point partition is binary; --alphabet must be 2")
	}
	return nil
}

// SymbolsRun is what Symbols found: the values that were partitioned (the samples of a
// map-like record or the section of a flow-like one), the partition and the notes the command
// prints on stderr.
type SymbolsRun struct {
	Values    []float64 // what the partition is applied to
	ValueName string    // its name for axis labels: x, x(t+τ) or max_x
	Part      *partition.Partition
	Alphabet  string
	Rule      string
	Rec       partition.Record
	RecFrom   string
	Applied   string // "signal" or "section"
	Cautions  []string
	Notes     []string
}

// Symbols decides map or flow, takes the section of a flow and chooses the partition,
// as `symbols` does; lagFrom names where a given o.Lag came from ("" = given with --lag). The
// stream itself is written by WriteSymbols. The command and the report both use it.
func (e *Env) Symbols(path string, s *series.Series, o SymbolsOptions, lagFrom string) (*SymbolsRun, SymbolsParams, error) {
	if err := series.CheckVariable(s.Values); err != nil {
		return nil, SymbolsParams{}, err
	}
	run := &SymbolsRun{}
	lag, lagMethod := o.Lag, "given"
	if lag > 0 && lagFrom != "" {
		lagMethod = lagFrom
	}
	if lag <= 0 && !o.Map {
		c, err := embed.Choose(s.Values, embed.ChooseOptions{NoDim: true, LagOptions: embed.LagOptions{MI: embed.MIOptions{Threads: e.threads()}}})
		if err != nil {
			return run, SymbolsParams{}, NoAnswer(fmt.Errorf("symbols: %s: choosing the lag: %w", path, err))
		}
		e.notef("lag %d chosen (%s): %s", c.Lag.Value, c.Lag.Rule, c.LagChoice.Reason)
		lag, lagMethod = c.Lag.Value, c.Lag.Rule
		run.Cautions = append(run.Cautions, c.Cautions...)
	}
	rec := partition.DecideRecord(s.Values, max(lag, 1))
	recFrom := "data"
	switch {
	case o.Flow:
		rec.Kind, recFrom = "flow", "given (--flow)"
	case o.Map:
		rec.Kind, recFrom = "map", "given (--map)"
	default:
		run.Notes = append(run.Notes, rec.Reason)
	}
	values := s.Values
	applied, valueName := "signal", s.Name
	var secP *SectionParams
	if rec.Kind == "flow" {
		opt, lm, levelFrom, cs, err := e.SectionOpts(s.Values, max(lag, 1), 2, o.Level, o.Direction, o.Interp, o.Maxima)
		if err != nil {
			return run, SymbolsParams{}, err
		}
		if lm == "given" && (o.Lag <= 0 || lagFrom != "") {
			lm = lagMethod
		}
		run.Cautions = append(run.Cautions, cs...)
		sec, err := partition.TakeSection(s.Values, s.Dt, s.T0, opt)
		if o.Densest && !opt.Maxima && (err != nil || sec.Len() < SearchValues*o.Alphabet) {
			if mx, why := denserMaxima(s, opt, sec, max(lag, 1)); mx != nil {
				sec, err = mx, nil
				run.Cautions = append(run.Cautions, why)
			} else if why != "" {
				run.Notes = append(run.Notes, why)
			}
		}
		if err != nil {
			return run, SymbolsParams{}, NoAnswer(fmt.Errorf("symbols: %s: %w", path, err))
		}
		run.Cautions = append(run.Cautions, sec.Cautions...)
		values, applied = sec.Values(), "section"
		_, valueName = SectionColumns(sec, s.Name)
		secP = &SectionParams{Method: sec.Method, Level: sec.Level, LevelFrom: levelFrom, Direction: o.Direction, Interp: sec.Interp}
		if sec.Method == "hyperplane" {
			secP.Lag, secP.LagMethod, secP.Dim = sec.Lag, lm, sec.Dim
		}
		run.Notes = append(run.Notes, fmt.Sprintf("section: %d crossings (%s)", sec.Len(), sec.Method))
	}
	if need := SearchValues * o.Alphabet; o.Kind == "search" && len(values) < need {
		return run, SymbolsParams{}, Skip(fmt.Errorf("symbols: %s: %s", path, tooFewValues(len(values), need, o.Alphabet, s.Len(), applied)))
	}
	sopt := partition.SearchOptions{Alphabet: o.Alphabet, Threads: e.threads()}
	var p *partition.Partition
	var err error
	switch o.Kind {
	case "search":
		r, err := partition.Search(values, sopt)
		if err != nil {
			return run, SymbolsParams{}, NoAnswer(fmt.Errorf("symbols: %s: %w", path, err))
		}
		p, run.Rule = &r.Partition, r.Rule
		run.Cautions = append(run.Cautions, r.Cautions...)
	case "critical":
		c, err := partition.CriticalPoint(values, partition.CriticalOptions{})
		if err != nil {
			return run, SymbolsParams{}, NoAnswer(fmt.Errorf("symbols: %s: %w", path, err))
		}
		p = &c.Partition
		run.Rule = fmt.Sprintf("cut at the %s of the return map fitted by local quadratic regression (kernel half-width %.4g)", c.Extremum, c.Bandwidth)
	case "quantile":
		p, err = partition.Quantile(values, o.Alphabet)
		if err != nil {
			return run, SymbolsParams{}, NoAnswer(fmt.Errorf("symbols: %s: %w", path, err))
		}
	case "threshold":
		p, err = partition.Threshold(o.Thresholds)
		if err != nil {
			return run, SymbolsParams{}, Usagef("symbols: --thresholds: %v", err)
		}
	}
	if o.Kind != "search" {
		sopt.Alphabet = p.K()
		if f, h, err := partition.Score(values, p, sopt); err == nil {
			p.Score, p.EntropyRate = f, h
		} else {
			run.Cautions = append(run.Cautions, "the partition could not be scored: "+err.Error())
		}
	}
	alphabet, err := symbolic.DefaultAlphabet(p.K())
	if err != nil {
		return run, SymbolsParams{}, Usagef("symbols: %v", err)
	}
	run.Values, run.ValueName, run.Part, run.Alphabet = values, valueName, p, alphabet
	run.Rec, run.RecFrom, run.Applied = rec, recFrom, applied
	if run.Cautions == nil {
		run.Cautions = []string{}
	}
	params := SymbolsParams{Column: s.Name, Partition: o.Kind, Alphabet: p.K(), Record: rec, RecordFrom: recFrom, Section: secP}
	return run, params, nil
}

// WriteSymbols writes the stream of run to w (in chunks, over the run's alphabet) and returns
// its sidecar, with the source, command line and version given.
func (run *SymbolsRun) WriteSymbols(w io.Writer, name string, src symbolic.Source, command, version string) (*symbolic.Sidecar, error) {
	sw, err := symbolic.NewWriter(w, run.Alphabet)
	if err != nil {
		return nil, err
	}
	p, values := run.Part, run.Values
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
	info := symbolic.PartitionInfo{Kind: p.Kind, Thresholds: p.Thresholds, Score: p.Score, Criterion: partition.Criterion, AppliedTo: run.Applied}
	if math.IsNaN(info.Score) {
		info.Score = -1
		info.Criterion = "not scored (-1)"
	}
	return sw.Sidecar(info, src, command, version), nil
}

// Result is the JSON body of `symbols` for the stream with sidecar sc, written to output
// (and its sidecar to sidecar; both "" when the stream was kept in memory).
func (run *SymbolsRun) Result(sc *symbolic.Sidecar, output, sidecar string) SymbolsResult {
	p := run.Part
	return SymbolsResult{
		Partition: PartitionJSON{Kind: p.Kind, Thresholds: p.Thresholds, Score: Finite(p.Score), Criterion: partition.Criterion,
			EntropyRate: Finite(p.EntropyRate), AppliedTo: run.Applied, Rule: run.Rule},
		AlphabetSize: p.K(), Alphabet: run.Alphabet, Count: sc.Count, Counts: sc.Counts,
		Output: output, Sidecar: sidecar, Cautions: run.Cautions}
}

// SearchValues is the number of values per symbol the partition search needs (partition.Search
// refuses fewer than SearchValues·K).
const SearchValues = 50

// tooFewValues says why a record of n samples whose source (the signal or the section of a
// flow) gives have values is too short for k symbols, and how long a record would do.
func tooFewValues(have, need, k, n int, applied string) string {
	src := "the record gives"
	if applied == "section" {
		src = "the section (or the local maxima, whichever is denser) gives"
	}
	msg := fmt.Sprintf("%s %d values, too few for %d symbols (need %d)", src, have, k, need)
	if have > 0 {
		msg += fmt.Sprintf(": a record of at least %d samples", int(math.Ceil(float64(n)*float64(need)/float64(have))))
	} else {
		msg += ": a longer record"
	}
	return msg
}

// denserMaxima returns the local maxima of a flow as the values to partition when they are
// more than the section's crossings (sec, nil when the section failed) and not dominated by
// noise: at most one maximum per lag samples (the lag is about a quarter of a cycle, so that
// allows four maxima per cycle; noise makes a maximum every few samples: common practice). It
// says why, or why not.
func denserMaxima(s *series.Series, opt partition.SectionOptions, sec *partition.Section, lag int) (*partition.Section, string) {
	have := 0
	if sec != nil {
		have = sec.Len()
	}
	opt.Maxima = true
	mx, err := partition.TakeSection(s.Values, s.Dt, s.T0, opt)
	switch {
	case err != nil || mx.Len() <= have:
		return nil, ""
	case mx.Len() > s.Len()/lag:
		return nil, fmt.Sprintf("the local maxima (%d) are not used: more than one per lag (%d samples) means noise makes them", mx.Len(), lag)
	}
	return mx, fmt.Sprintf("symbols from the %d local maxima: the section gives only %d crossings", mx.Len(), have)
}
