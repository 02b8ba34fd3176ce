package analysis

import (
	"crypto/sha256"
	"errors"
	"fmt"

	"unfold/states"
	"unfold/symbolic"
)

// StatesOptions are the options of the states stage (the flags of `unfold states`).
type StatesOptions struct {
	// MaxLength is the longest history length L (0: states.DefaultMaxLength, the rule
	// states.LengthRule).
	MaxLength int
	// Significance is α of the χ² homogeneity test (0: states.DefaultOptions).
	Significance float64
	// Scan also reconstructs at L = 1 … L (the body's "scan").
	Scan bool
}

// DefaultStatesOptions returns the defaults of `unfold states` (states.DefaultOptions).
func DefaultStatesOptions() StatesOptions {
	d := states.DefaultOptions()
	return StatesOptions{MaxLength: d.MaxLength, Significance: d.Significance}
}

// StatesParams are the "parameters" of the states stage.
type StatesParams struct {
	HistoryLength int                    `json:"history_length"`
	LengthRule    string                 `json:"length_rule"`
	Significance  float64                `json:"significance"`
	Alphabet      string                 `json:"alphabet"`
	From          string                 `json:"from"`
	Partition     symbolic.PartitionInfo `json:"partition"`
}

// StateJSON is one recurrent causal state in the JSON body: its probability, visits,
// next-symbol distribution (by symbol name) and the shortest suffixes that identify it.
type StateJSON struct {
	ID          int                `json:"id"`
	Probability float64            `json:"probability"`
	Count       int64              `json:"count"`
	Next        map[string]float64 `json:"next"`
	Suffixes    []string           `json:"suffixes"`
	SuffixCount int                `json:"suffix_count"`
}

// TransitionJSON is one edge of the state machine in the JSON body.
type TransitionJSON struct {
	From        int     `json:"from"`
	Symbol      string  `json:"symbol"`
	To          int     `json:"to"`
	Probability float64 `json:"probability"`
}

// StatesResult is the JSON body of the states stage (DESIGN.md §3): the same object from
// `unfold states --json` and under "states" in result.json.
type StatesResult struct {
	States                int              `json:"states"`
	StatisticalComplexity float64          `json:"statistical_complexity"`
	EntropyRate           float64          `json:"entropy_rate"`
	HistoryLength         int              `json:"history_length"`
	LengthRule            string           `json:"length_rule"`
	Significance          float64          `json:"significance"`
	StateList             []StateJSON      `json:"state_list"`
	Transitions           []TransitionJSON `json:"transitions"`
	TransientRemoved      int              `json:"transient_removed"`
	Scan                  []states.ScanRow `json:"scan,omitempty"`
	Cautions              []string         `json:"cautions"`
}

// StatesBody turns a reconstruction into the JSON body, naming symbols by the alphabet.
func StatesBody(r *states.Result, alphabet string, scan []states.ScanRow) StatesResult {
	b := StatesResult{States: len(r.States), StatisticalComplexity: r.StatisticalComplexity, EntropyRate: r.EntropyRate,
		HistoryLength: r.HistoryLength, LengthRule: r.LengthRule, Significance: r.Significance,
		StateList: []StateJSON{}, Transitions: []TransitionJSON{}, TransientRemoved: r.Transient, Scan: scan, Cautions: r.Cautions}
	for _, s := range r.States {
		sj := StateJSON{ID: s.ID, Probability: s.Probability, Count: s.Count, Next: map[string]float64{}, SuffixCount: s.SuffixCount}
		for a, p := range s.Next {
			sj.Next[states.SymbolName(a, alphabet)] = p
		}
		for _, h := range s.Suffixes {
			sj.Suffixes = append(sj.Suffixes, states.SuffixString(h, alphabet))
		}
		b.StateList = append(b.StateList, sj)
	}
	for _, t := range r.Transitions {
		b.Transitions = append(b.Transitions, TransitionJSON{From: t.From, Symbol: states.SymbolName(t.Symbol, alphabet), To: t.To, Probability: t.Probability})
	}
	if b.Cautions == nil {
		b.Cautions = []string{}
	}
	return b
}

// StatesRun is what States found: the machine and the stream's alphabet.
type StatesRun struct {
	R        *states.Result
	Alphabet string
}

// States reconstructs the causal states of the symbols x (each < k, named by alphabet) by
// causal-state splitting reconstruction (Shalizi & Klinkner 2004) and returns the run with the
// JSON parameters and body of `states` (the caller fills the parameters' From and Partition).
// A stream too short for the history length is refused with the length it needs: as a usage
// error when the length was given, else as a skip (the stage does not apply to so short a
// stream). The command and the report both use it.
func (e *Env) States(path string, x []uint8, k int, alphabet string, o StatesOptions) (*StatesRun, StatesParams, StatesResult, error) {
	if o.MaxLength < 0 {
		return nil, StatesParams{}, StatesResult{}, Usagef("states: --max-length must be ≥ 1")
	}
	if o.Significance == 0 {
		o.Significance = states.DefaultOptions().Significance
	}
	if !(o.Significance > 0 && o.Significance < 1) {
		return nil, StatesParams{}, StatesResult{}, Usagef("states: --significance %g must lie between 0 and 1", o.Significance)
	}
	if k < 2 {
		return nil, StatesParams{}, StatesResult{}, Skip(fmt.Errorf("states: %s: the alphabet has one symbol: there is one state and nothing to predict", path))
	}
	opt := states.Options{MaxLength: o.MaxLength, Significance: o.Significance}
	res, err := states.Reconstruct(x, k, opt)
	var short *states.ErrTooShort
	switch {
	case errors.As(err, &short) && o.MaxLength > 0:
		return nil, StatesParams{}, StatesResult{}, Usagef("states: %s: %v", path, err)
	case errors.As(err, &short):
		return nil, StatesParams{}, StatesResult{}, Skip(fmt.Errorf("states: %s: %w: a longer record", path, err))
	case err != nil:
		return nil, StatesParams{}, StatesResult{}, NoAnswer(fmt.Errorf("states: %s: %w", path, err))
	}
	var scan []states.ScanRow
	if o.Scan {
		opt.MaxLength = res.HistoryLength
		if scan, err = states.Scan(x, k, opt); err != nil {
			return nil, StatesParams{}, StatesResult{}, NoAnswer(fmt.Errorf("states: %s: %w", path, err))
		}
	}
	p := StatesParams{HistoryLength: res.HistoryLength, LengthRule: res.LengthRule, Significance: res.Significance, Alphabet: alphabet}
	return &StatesRun{R: res, Alphabet: alphabet}, p, StatesBody(res, alphabet, scan), nil
}

// StatesStreamName is the "input.path" of the states object in the chain: the stream is the
// symbols stage's, kept in memory.
const StatesStreamName = EntropyStreamName

// statesStage is the chain's states stage: the causal states of the symbols stage's stream,
// skipped (with the reason) when there is no stream or it is too short.
func (e *Env) statesStage(res *Result, version string) error {
	if res.Symbols == nil {
		why := "the symbols stage gave no answer"
		if r := res.Stage("symbols"); r != nil && r.Status == StatusSkipped {
			why = "the symbols stage was skipped"
		}
		return Skip(fmt.Errorf("states: no symbol stream (%s)", why))
	}
	sy := res.Symbols
	p := sy.Run.Part
	x := p.Apply(sy.Run.Values, nil)
	run, params, body, err := e.States(StatesStreamName, x, p.K(), sy.Run.Alphabet, DefaultStatesOptions())
	if err != nil {
		return err
	}
	params.From, params.Partition = "stream", sy.Sidecar.Partition
	in := &Input{Path: StatesStreamName, SHA256: fmt.Sprintf("%x", sha256.Sum256(sy.Stream)), Samples: len(x), Dt: 1}
	st := &StatesStage{Output: newOutput("states", version, in, params, body), Run: run}
	res.States = st
	return nil
}
