package analysis

import (
	"fmt"
	"slices"

	"unfold/dimension"
	"unfold/embed"
	"unfold/regime"
	"unfold/series"
)

// RegimeOptions are the options of the regime stage (the flags of `unfold regime`).
type RegimeOptions struct {
	// Lag and Dim as for the dim stage (0: chosen); Theiler: embed.TheilerAuto chooses, 0 is
	// no window.
	Lag, Dim, Theiler int
	// Surrogates is the number of IAAFT surrogates (default regime.DefaultSurrogates: what the
	// stated level needs, regime.SurrogatesFor(0.05, regime.TwoSided)).
	Surrogates int
	// NoLyapunov leaves λ1 out of the evidence.
	NoLyapunov bool
}

// DefaultRegimeOptions returns the defaults of `unfold regime`.
func DefaultRegimeOptions() RegimeOptions {
	return RegimeOptions{Theiler: embed.TheilerAuto, Surrogates: regime.DefaultSurrogates}
}

// RegimeParams are the "parameters" of the regime stage.
type RegimeParams struct {
	Column     string `json:"column"`
	Lag        int    `json:"lag"`
	LagMethod  string `json:"lag_method"`
	Dim        int    `json:"dim"`
	DimMethod  string `json:"dim_method"`
	Theiler    int    `json:"theiler"`
	Surrogates int    `json:"surrogates"`
	Subsample  int    `json:"zero_one_subsample"`
	Seed       uint64 `json:"seed"`
	// LyapunovFrom is set in the chain when λ1 is the lyapunov stage's (not estimated here),
	// DimensionFrom when D2 is the fractal stage's.
	LyapunovFrom  string `json:"lyapunov_from,omitempty"`
	DimensionFrom string `json:"dimension_from,omitempty"`
}

// LinesJSON is the line analysis of the regime stage (regime.LineAnalysis): its kind, the
// significant lines' frequencies in ascending order and the generating frequencies, in
// cycles per time unit.
type LinesJSON struct {
	Kind         string    `json:"kind"`
	Frequencies  []float64 `json:"frequencies"`
	Fundamentals []float64 `json:"fundamentals"`
}

// RegimeResult is the JSON body of the regime stage.
type RegimeResult struct {
	Regime     string                 `json:"regime"`
	Confidence float64                `json:"confidence"`
	Rule       string                 `json:"rule"`
	Evidence   map[string]regime.Item `json:"evidence"`
	// Lines are the significant spectral lines the verdict read (null when the line
	// analysis could not run).
	Lines *LinesJSON         `json:"lines"`
	Tests []*regime.RankTest `json:"surrogate_tests"`
	// Unused names the evidence the verdict did not use, each with the reason (tests the
	// record is too short for among them).
	Unused []string `json:"unused"`
	// DominantPeriod is the period of the strongest cycle in time units (null when none).
	DominantPeriod *float64 `json:"dominant_period"`
	// SamplesUsed is the number of samples the surrogate tests ran on: a segment
	// [SurrogateSegment[0], SurrogateSegment[1]) of the first regime.Options.MaxAnalysis
	// (20 000) samples, trimmed for matching ends; a caution says so when it is fewer than
	// the record's.
	SamplesUsed      int      `json:"samples_used"`
	SurrogateSegment [2]int   `json:"surrogate_segment"`
	Cautions         []string `json:"cautions"`
}

// CheckRegime validates o.
func CheckRegime(o RegimeOptions) error {
	if o.Lag < 0 || o.Dim < 0 || o.Theiler < embed.TheilerAuto || o.Surrogates < 1 {
		return Usagef("regime: want --lag, --dim ≥ 0, --theiler ≥ -1 and --surrogates ≥ 1")
	}
	return nil
}

// RegimeEvidence is what earlier stages give the regime stage: the embedding (nil: chosen
// here as regime.ChooseEmbedding does), λ1 with its interval and D2.
type RegimeEvidence struct {
	Embedding *embed.Choice
	// Lyapunov is the lyapunov stage's λ1 (nil: estimated here unless NoLyapunov).
	Lyapunov   *regime.Exponent
	NoLyapunov bool
	// Dimension is the fractal stage's D2 (nil: estimated here unless NoDimension).
	Dimension   *dimension.Result
	NoDimension bool
}

// Regime gathers the evidence of s and decides the regime, with what the earlier stages give
// in ev, and returns the analysis (for the renderers) with the JSON parameters and body of the
// regime stage.
func (e *Env) Regime(path string, s *series.Series, o RegimeOptions, ev RegimeEvidence) (*regime.Analysis, RegimeParams, RegimeResult, error) {
	if err := CheckRegime(o); err != nil {
		return nil, RegimeParams{}, RegimeResult{}, err
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return nil, RegimeParams{}, RegimeResult{}, err
	}
	c := ev.Embedding
	if c == nil {
		var err error
		if c, err = regime.ChooseEmbedding(s.Values, o.Lag, o.Dim, o.Theiler, 0, e.threads()); err != nil {
			return nil, RegimeParams{}, RegimeResult{}, NoAnswer(fmt.Errorf("regime: %s: %w", path, err))
		}
	}
	an, err := regime.Analyze(s.Values, s.Dt, regime.Options{Embedding: c,
		Surrogates: o.Surrogates, Seed: e.Seed, Lyapunov: ev.Lyapunov, NoLyapunov: o.NoLyapunov || ev.NoLyapunov,
		Dimension: ev.Dimension, NoDimension: ev.NoDimension, Threads: e.threads(),
		Progress: e.progress("regime: surrogate tests")})
	if err != nil {
		return nil, RegimeParams{}, RegimeResult{}, NoAnswer(fmt.Errorf("regime: %s: %w", path, err))
	}
	evd, v := an.Evidence, an.Verdict
	sub := 0
	if evd.ZeroOne != nil {
		sub = evd.ZeroOne.Subsample
	}
	p := RegimeParams{Column: s.Name, Lag: evd.Lag, LagMethod: an.LagMethod, Dim: evd.Dim, DimMethod: an.DimMethod,
		Theiler: evd.Theiler, Surrogates: o.Surrogates, Subsample: sub, Seed: e.Seed}
	if ev.Lyapunov != nil && !o.NoLyapunov {
		p.LyapunovFrom = "lyapunov stage"
	}
	if ev.Dimension != nil {
		p.DimensionFrom = "fractal stage"
	}
	res := RegimeResult{Regime: v.Regime, Confidence: v.Confidence, Rule: v.Rule,
		Evidence: v.Evidence, Tests: []*regime.RankTest{evd.Prediction, evd.Reversal}, Unused: v.Unused, Cautions: v.Cautions}
	if v.DominantPeriod > 0 {
		res.DominantPeriod = Finite(v.DominantPeriod)
	}
	if res.Unused == nil {
		res.Unused = []string{}
	}
	if l := evd.Lines; l != nil {
		lj := &LinesJSON{Kind: string(l.Kind), Frequencies: []float64{}, Fundamentals: append([]float64{}, l.Fundamentals...)}
		for _, pk := range l.Peaks {
			lj.Frequencies = append(lj.Frequencies, pk.Freq)
		}
		slices.Sort(lj.Frequencies)
		res.Lines = lj
	}
	if set := an.Surrogates; set != nil {
		res.SamplesUsed, res.SurrogateSegment = set.Length, [2]int{set.Start, set.Start + set.Length}
	}
	return an, p, res, nil
}
