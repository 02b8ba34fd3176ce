package analysis

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"time"

	"unfold/embed"
	"unfold/regime"
	"unfold/series"
	"unfold/symbolic"
)

// DefaultSeed is the seed of a zero Options (the command line's --seed default).
const DefaultSeed = 1

// Options configure Run. The zero value means exactly the defaults of `unfold report`:
// everything chosen, dimensions scanned up to 10, the histogram mutual information, the
// Euclidean norm, seed 1, all cores.
type Options struct {
	// Lag and Dim are the delay and embedding dimension for the stages after lag and dim
	// (0: the lag and dim stages' choices).
	Lag, Dim int
	// MaxDim is the largest dimension scanned by the dim stage (0: 10).
	MaxDim int
	// Theiler is the Theiler window in samples: nil (or −1) chooses it (embed.ChooseTheiler),
	// 0 means no window.
	Theiler *int
	// MaxLag is the largest lag scanned by the lag stage (0: embed.DefaultMaxLag).
	MaxLag int
	// MI is the mutual-information estimator of the lag stage: embed.Histogram ("" too) or
	// embed.KSG.
	MI string
	// Norm is the distance of the dim and lyapunov stages: "euclidean" ("" too) or "max".
	Norm string
	// Azimuth and Elevation orient the 3-D state-space view in degrees (nil: −45 and 30).
	Azimuth, Elevation *float64
	// Threads is the number of goroutines (0: all cores); Seed seeds every random step
	// (0: DefaultSeed).
	Threads int
	Seed    uint64
	// Path names the record in messages ("": its Name); Input is the "input" object of every
	// stage (nil: the samples and Dt of s); Version is the "version" of every stage.
	Path    string
	Input   *Input
	Version string
	// Read and Prep are how s was read and prepared, recorded in the parameters (Run does
	// not apply them).
	Read series.ReadOptions
	Prep series.Prep
	// Notef and Progress receive messages and progress (see Env); nil is silent.
	Notef    func(format string, args ...any)
	Progress func(label string) func(done, total int)
	// After, when not nil, is called after every stage with its key, wall time and error.
	After func(key string, took time.Duration, err error)
	// Partial, when not nil, is called after After with the result so far (the stages done,
	// in order), so a page can be written while the chain runs. It must not keep res past the
	// call's return except to read it.
	Partial func(res *Result)
}

// Stage statuses, as in StageRecord.Status.
const (
	StatusOK    = "ok"
	StatusError = "error"
)

// StageRecord is how one stage went: its key, status, why it gave no answer and its wall time.
type StageRecord struct {
	Key     string  `json:"key"`
	Status  string  `json:"status"`
	Error   string  `json:"error,omitempty"`
	Seconds float64 `json:"seconds"`
}

// InspectStage is the inspect stage: its JSON object and the summary of the record.
type InspectStage struct {
	Output[InspectParams, InspectResult]
	Summary *series.Summary `json:"-"`
}

// LagStage is the lag stage: its JSON object and the lag choice with its curves.
type LagStage struct {
	Output[LagParams, LagResult]
	Choice *embed.LagChoice `json:"-"`
}

// DimStage is the dim stage: its JSON object and the dimension scan.
type DimStage struct {
	Output[DimParams, DimResult]
	Choice *embed.DimChoice `json:"-"`
}

// EmbedStage is the embed stage: its JSON object and the delay vectors.
type EmbedStage struct {
	Output[EmbedParams, EmbedResult]
	Embedding embed.Embedding `json:"-"`
}

// LyapunovStage is the lyapunov stage: its JSON object and the divergence curves.
type LyapunovStage struct {
	Output[LyapunovParams, LyapunovResult]
	Run *LyapunovRun `json:"-"`
}

// FractalStage is the fractal stage: its JSON object and the correlation sums.
type FractalStage struct {
	Output[FractalParams, FractalResult]
	Run *FractalRun `json:"-"`
}

// RegimeStage is the regime stage: its JSON object and the analysis (evidence, verdict,
// surrogates).
type RegimeStage struct {
	Output[RegimeParams, RegimeResult]
	Analysis *regime.Analysis `json:"-"`
}

// SymbolsStage is the symbols stage: its JSON object, the partition and the stream (in
// memory, with its sidecar).
type SymbolsStage struct {
	Output[SymbolsParams, SymbolsResult]
	Run     *SymbolsRun       `json:"-"`
	Stream  []byte            `json:"-"`
	Sidecar *symbolic.Sidecar `json:"-"`
}

// EntropyStage is the entropy stage: its JSON object.
type EntropyStage struct {
	Output[EntropyParams, EntropyResult]
}

// StatesStage is the states stage: its JSON object and the causal-state machine.
type StatesStage struct {
	Output[StatesParams, StatesResult]
	Run *StatesRun `json:"-"`
}

// Result is the outcome of Run: one field per stage (nil when the stage gave no JSON object),
// the embedding chosen once, and how each stage went. json.Marshal gives each stage's object
// under its key (inspect, lag, dim, embed, lyapunov, fractal, regime, symbols, entropy, states),
// exactly as the single command prints it with --json, and "stages".
type Result struct {
	Inspect  *InspectStage  `json:"inspect,omitempty"`
	Lag      *LagStage      `json:"lag,omitempty"`
	Dim      *DimStage      `json:"dim,omitempty"`
	Embed    *EmbedStage    `json:"embed,omitempty"`
	Lyapunov *LyapunovStage `json:"lyapunov,omitempty"`
	Fractal  *FractalStage  `json:"fractal,omitempty"`
	Regime   *RegimeStage   `json:"regime,omitempty"`
	Symbols  *SymbolsStage  `json:"symbols,omitempty"`
	Entropy  *EntropyStage  `json:"entropy,omitempty"`
	States   *StatesStage   `json:"states,omitempty"`
	// Embedding is the one embedding choice handed to every estimator (nil when the lag
	// could not be chosen).
	Embedding *embed.Choice `json:"-"`
	// FractalCurves are the correlation sums also when the fractal stage found no scaling
	// range (no JSON object then).
	FractalCurves *FractalRun `json:"-"`
	// Stages say how each stage went, in the order they ran.
	Stages []StageRecord `json:"stages"`
}

// Keys are the stage keys in the order Run runs them.
var Keys = []string{"inspect", "lag", "dim", "embed", "lyapunov", "fractal", "regime", "symbols", "entropy", "states"}

// Stage returns the record of the stage key (nil when it did not run).
func (r *Result) Stage(key string) *StageRecord {
	for i := range r.Stages {
		if r.Stages[i].Key == key {
			return &r.Stages[i]
		}
	}
	return nil
}

// Err is nil when every stage gave an answer or was skipped (did not apply), else an error
// listing why each did not.
func (r *Result) Err() error {
	var errs []error
	for _, st := range r.Stages {
		if st.Status != StatusOK && st.Status != StatusSkipped {
			errs = append(errs, errors.New(st.Error))
		}
	}
	return errors.Join(errs...)
}

// EntropyStreamName is the "input.path" of the entropy object: the stream is the symbols
// stage's, kept in memory.
const EntropyStreamName = "symbols stage stream (in memory)"

// Run runs the analysis chain on s — inspect, lag, dim, embed, lyapunov, fractal, regime,
// symbols, entropy, states — each with the defaults of its single command. The lag, the dimension and
// the Theiler window are chosen once (embed.Choose) and handed to every estimator; regime
// takes λ1 from the lyapunov stage and D2 from the fractal stage. A stage that gives no answer
// is recorded with its reason and the chain goes on where it can. ctx is checked between
// stages; when it is cancelled Run returns what it has with ctx's error. Any other error is
// recorded in the stages, not returned.
func Run(ctx context.Context, s *series.Series, opt Options) (*Result, error) {
	if s == nil || s.Len() == 0 {
		return nil, errors.New("analysis: no samples")
	}
	theiler := embed.TheilerAuto
	if opt.Theiler != nil {
		theiler = *opt.Theiler
	}
	if opt.Lag < 0 || opt.Dim < 0 || opt.MaxDim < 0 || opt.MaxLag < 0 || theiler < embed.TheilerAuto {
		return nil, Usagef("analysis: want Lag, Dim, MaxDim, MaxLag ≥ 0 and Theiler ≥ −1")
	}
	maxDim := opt.MaxDim
	if maxDim == 0 {
		maxDim = 10
	}
	mi, norm := opt.MI, opt.Norm
	if mi == "" {
		mi = embed.Histogram
	}
	if norm == "" {
		norm = "euclidean"
	}
	if _, err := ParseNorm(norm); err != nil {
		return nil, err
	}
	az, el := -45.0, 30.0
	if opt.Azimuth != nil {
		az = *opt.Azimuth
	}
	if opt.Elevation != nil {
		el = *opt.Elevation
	}
	seed := opt.Seed
	if seed == 0 {
		seed = DefaultSeed
	}
	path := opt.Path
	if path == "" {
		path = s.Name
	}
	in := opt.Input
	if in == nil {
		in = &Input{Path: path, Samples: s.Len(), Dt: s.Dt, Units: Units{Time: s.TimeUnit, Signal: s.Unit}}
	}
	if opt.Prep.Detrend == "" {
		opt.Prep.Detrend = "none" // as the command line records it
	}
	e := &Env{Threads: opt.Threads, Seed: seed, Notef: opt.Notef, Progress: opt.Progress, Read: opt.Read, Prep: opt.Prep}
	res := &Result{Stages: []StageRecord{}}

	var lag int
	var lagMethod string
	if opt.Lag > 0 {
		lag, lagMethod = opt.Lag, embed.RuleGiven
	}
	var lagErr error
	var c *embed.Choice
	var chooseErr error
	var lambda *regime.Exponent
	var noLyap bool
	var d2 *FractalRun
	var scaleExp int
	// noEmbedding is the answer of a stage that needs the embedding when none was chosen.
	noEmbedding := func(key string) error {
		if c != nil {
			return nil
		}
		return NoAnswer(fmt.Errorf("%s: %s: no embedding (%v)", key, path, chooseErr))
	}

	stages := []struct {
		key string
		run func() error
	}{
		{"inspect", func() error {
			p, b, sm, err := e.Inspect(path, s)
			if err != nil {
				return err
			}
			st := &InspectStage{Output: newOutput("inspect", opt.Version, in, p, b), Summary: sm}
			res.Inspect = st
			return nil
		}},
		{"lag", func() error {
			lo := DefaultLagOptions()
			lo.MaxLag, lo.MI = opt.MaxLag, mi
			ch, p, b, err := e.Lag(path, s, lo)
			if err != nil {
				lagErr = err
				return err
			}
			if lag == 0 {
				lag, lagMethod = ch.Lag, ch.Method
			}
			st := &LagStage{Output: newOutput("lag", opt.Version, in, p, b), Choice: ch}
			res.Lag = st
			return nil
		}},
		{"dim", func() error {
			if lag == 0 {
				chooseErr = fmt.Errorf("dim: %s: no lag (the lag stage gave no answer: %v)", path, lagErr)
				return NoAnswer(chooseErr)
			}
			do := DefaultDimOptions()
			do.Lag, do.Theiler, do.MaxDim, do.Norm = lag, theiler, maxDim, norm
			co := do.ChooseOptions()
			co.LagMethod = lagMethod
			if err := series.CheckVariable(s.Values); err != nil {
				chooseErr = err
				return err
			}
			ch, err := e.Choose("dim", path, s.Values, co)
			if err != nil {
				chooseErr = err
				return err
			}
			if res.Lag != nil {
				ch.LagChoice = res.Lag.Choice
			}
			c = ch
			res.Embedding = c
			if c.DimChoice == nil {
				return NoAnswer(fmt.Errorf("dim: %s: %w", path, c.DimErr))
			}
			p, b := e.DimJSON(s, c, nil)
			st := &DimStage{Output: newOutput("dim", opt.Version, in, p, b), Choice: c.DimChoice}
			res.Dim = st
			var noDim error
			if c.DimChoice.Dimension == 0 {
				noDim = NoAnswer(fmt.Errorf("dim: %s", c.DimChoice.Reason))
			}
			if opt.Dim > 0 {
				c.Dim, c.DimErr = embed.Chosen{Value: opt.Dim, Rule: embed.RuleGiven}, nil
			}
			return noDim
		}},
		{"embed", func() error {
			if err := noEmbedding("embed"); err != nil {
				return err
			}
			eo := DefaultEmbedOptions()
			eo.Azimuth, eo.Elevation, eo.Plot = az, el, "figures/embed.svg"
			em, _, p, b, err := e.Embed(path, s, eo, c, nil)
			if err != nil {
				return err
			}
			st := &EmbedStage{Output: newOutput("embed", opt.Version, in, p, b), Embedding: em}
			res.Embed = st
			return nil
		}},
		{"lyapunov", func() error {
			noLyap = true
			if err := noEmbedding("lyapunov"); err != nil {
				return err
			}
			lo := DefaultLyapunovOptions()
			lo.Norm, lo.MaxDim = norm, maxDim
			e.Indexes = shareIndexes(s.Values, c, norm, DefaultFractalOptions()) // one index for lyapunov and fractal when they embed alike
			run, p, b, noFit := e.Lyapunov(path, s, lo, c, nil)
			if run == nil {
				return noFit
			}
			st := &LyapunovStage{Output: newOutput("lyapunov", opt.Version, in, p, b), Run: run}
			res.Lyapunov = st
			if b.LambdaMax != nil {
				lambda = regime.ExponentOf(run.R)
				noLyap = false
			}
			return noFit
		}},
		{"fractal", func() error {
			if err := noEmbedding("fractal"); err != nil {
				return err
			}
			// dimension.CorrelationDimension needs N ≥ 2·W + 100 (W the Theiler window)
			if need := 2*c.Theiler.Value + 100; s.Len() < need {
				return Skip(fmt.Errorf("fractal: %s: %d samples are too few for the correlation dimension with a Theiler window of %d: a record of at least %d samples",
					path, s.Len(), c.Theiler.Value, need))
			}
			run, p, b, err := e.Fractal(path, s, DefaultFractalOptions(), c, nil)
			res.FractalCurves = run
			if err != nil {
				return err
			}
			d2 = run
			st := &FractalStage{Output: newOutput("fractal", opt.Version, in, p, b), Run: run}
			res.Fractal = st
			return nil
		}},
		{"regime", func() error {
			if err := noEmbedding("regime"); err != nil {
				return err
			}
			ev := RegimeEvidence{Embedding: c, Lyapunov: lambda, NoLyapunov: noLyap, NoDimension: d2 == nil}
			if d2 != nil {
				ev.Dimension = d2.R
			}
			an, p, b, err := e.Regime(path, s, DefaultRegimeOptions(), ev)
			if err != nil {
				return err
			}
			st := &RegimeStage{Output: newOutput("regime", opt.Version, in, p, b), Analysis: an}
			res.Regime = st
			return nil
		}},
		{"symbols", func() error {
			so := DefaultSymbolsOptions()
			so.Lag, so.Densest = lag, true
			if err := CheckSymbols(so, false); err != nil {
				return err
			}
			run, p, err := e.Symbols(path, s, so, lagMethod)
			if err != nil {
				return err
			}
			var buf bytes.Buffer
			sc, err := run.WriteSymbols(&buf, "the report's symbol stream", symbolic.Source{Path: in.Path, SHA256: in.SHA256},
				"unfold report (symbols stage)", opt.Version)
			if err != nil {
				return err
			}
			st := &SymbolsStage{Output: newOutput("symbols", opt.Version, in, p, run.Result(sc, "", "")), Run: run, Stream: buf.Bytes(), Sidecar: sc}
			res.Symbols = st
			return nil
		}},
		{"entropy", func() error {
			if res.Symbols == nil {
				if r := res.Stage("symbols"); r != nil && r.Status == StatusSkipped {
					return Skip(errors.New("entropy: no symbol stream (the symbols stage was skipped)"))
				}
				return NoAnswer(errors.New("entropy: no symbol stream (the symbols stage gave no answer)"))
			}
			ein, p, b, err := e.Entropy(EntropyStreamName, bytes.NewReader(res.Symbols.Stream), res.Symbols.Sidecar, DefaultEntropyOptions())
			if err != nil {
				return err
			}
			st := &EntropyStage{Output: newOutput("entropy", opt.Version, ein, p, b)}
			res.Entropy = st
			return nil
		}},
		{"states", func() error { return e.statesStage(res, opt.Version) }},
	}
	for _, stg := range stages {
		if err := ctx.Err(); err != nil {
			return res, err
		}
		t0 := time.Now()
		err := stg.run()
		took := time.Since(t0)
		rec := StageRecord{Key: stg.key, Status: StatusOK, Seconds: took.Seconds()}
		switch {
		case IsSkip(err):
			rec.Status, rec.Error = StatusSkipped, err.Error()
		case err != nil:
			rec.Status, rec.Error = StatusError, err.Error()
		}
		res.Stages = append(res.Stages, rec)
		if opt.After != nil {
			opt.After(stg.key, took, err)
		}
		if opt.Partial != nil {
			opt.Partial(res)
		}
		if stg.key == "inspect" {
			s, scaleExp = scaledForChain(s) // inspect states the record as given
		}
	}
	Unscale(res, scaleExp)
	return res, nil
}
