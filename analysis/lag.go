package analysis

import (
	"fmt"

	"unfold/embed"
	"unfold/series"
)

// LagOptions are the options of the lag stage (the flags of `unfold lag`).
type LagOptions struct {
	// MaxLag is the largest lag scanned in samples (0: embed.DefaultMaxLag).
	MaxLag int
	// MI is the mutual-information estimator: embed.Histogram or embed.KSG.
	MI string
	// Bins is the bins per axis of the histogram estimator (0: from N); K and Points are the
	// neighbours and the pairs per lag of the KSG estimator.
	Bins, K, Points int
	// Z is the significance of a minimum, in standard errors.
	Z float64
}

// DefaultLagOptions returns the defaults of `unfold lag`.
func DefaultLagOptions() LagOptions {
	return LagOptions{MI: embed.Histogram, K: 4, Points: 20000, Z: 3}
}

// LagParams are the "parameters" of the lag stage.
type LagParams struct {
	PrepParams
	Estimator string  `json:"estimator"`
	Bins      int     `json:"bins,omitempty"`
	K         int     `json:"k,omitempty"`
	Points    int     `json:"points"`
	Theiler   int     `json:"ksg_theiler,omitempty"`
	MaxLag    int     `json:"max_lag"`
	Z         float64 `json:"z"`
	Threads   int     `json:"threads"`
}

// MIPoint is one point of the mutual-information curve.
type MIPoint struct {
	Lag       int     `json:"lag"`
	Bits      float64 `json:"bits"`
	ErrorBits float64 `json:"error_bits"`
}

// ACFPoint is one point of the autocorrelation.
type ACFPoint struct {
	Lag int     `json:"lag"`
	R   float64 `json:"r"`
}

// LagResult is the JSON body of the lag stage.
type LagResult struct {
	Lag                  int        `json:"lag"`
	LagTime              float64    `json:"lag_time"`
	Method               string     `json:"method"`
	Reason               string     `json:"reason"`
	BiasBits             float64    `json:"bias_bits"`
	AutocorrelationZero  int        `json:"autocorrelation_first_zero"`
	AutocorrelationDecay int        `json:"autocorrelation_decay"`
	Theiler              int        `json:"theiler"`
	MutualInformation    []MIPoint  `json:"mutual_information"`
	Autocorrelation      []ACFPoint `json:"autocorrelation"`
	Cautions             []string   `json:"cautions"`
}

// EmbedLagOptions checks o and returns the options of embed.ChooseLag.
func (e *Env) EmbedLagOptions(o LagOptions) (embed.LagOptions, error) {
	if o.MI != embed.Histogram && o.MI != embed.KSG {
		return embed.LagOptions{}, Usagef("lag: --mi %q: want hist or ksg", o.MI)
	}
	if o.MaxLag < 0 || o.Bins < 0 || o.K < 1 || o.Points < 1 || !(o.Z > 0) {
		return embed.LagOptions{}, Usagef("lag: --max-lag and --bins must be ≥ 0, --k and --points ≥ 1, --z > 0")
	}
	return embed.LagOptions{MaxLag: o.MaxLag, Z: o.Z, MI: embed.MIOptions{Estimator: o.MI, Bins: o.Bins,
		K: o.K, MaxPoints: o.Points, Threads: e.threads(), Progress: e.progress("lag: mutual information")}}, nil
}

// Lag chooses the lag of s (embed.ChooseLag) and returns the choice with the JSON parameters
// and body of the lag stage. path names the record in messages.
func (e *Env) Lag(path string, s *series.Series, o LagOptions) (*embed.LagChoice, LagParams, LagResult, error) {
	lo, err := e.EmbedLagOptions(o)
	if err != nil {
		return nil, LagParams{}, LagResult{}, err
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return nil, LagParams{}, LagResult{}, err
	}
	c, err := embed.ChooseLag(s.Values, lo)
	if err != nil {
		return nil, LagParams{}, LagResult{}, NoAnswer(fmt.Errorf("lag: %s: %w", path, err))
	}
	theiler, err := embed.ChooseTheiler(s.Values)
	if err != nil {
		return nil, LagParams{}, LagResult{}, NoAnswer(fmt.Errorf("lag: %s: %w", path, err))
	}
	return c, e.lagParams(s, c), lagResult(s, c, theiler), nil
}

func (e *Env) lagParams(s *series.Series, c *embed.LagChoice) LagParams {
	p := LagParams{PrepParams: e.prepParams(s), Estimator: c.MI.Estimator, MaxLag: c.MaxLag,
		Points: c.MI.Points, Z: c.Z, Threads: e.threads()}
	if c.MI.Estimator == embed.KSG {
		p.K, p.Theiler = c.MI.K, c.MI.Theiler
	} else {
		p.Bins = c.MI.Bins
	}
	return p
}

func lagResult(s *series.Series, c *embed.LagChoice, theiler int) LagResult {
	res := LagResult{Lag: c.Lag, LagTime: float64(c.Lag) * s.Dt, Method: c.Method, Reason: c.Reason,
		BiasBits: c.MI.Bias / ln2, AutocorrelationZero: c.ACF.FirstZero, AutocorrelationDecay: c.ACF.DecayTime,
		Theiler: theiler, Cautions: c.Cautions}
	if res.Cautions == nil {
		res.Cautions = []string{}
	}
	for k := range c.MI.Nats {
		res.MutualInformation = append(res.MutualInformation, MIPoint{Lag: k, Bits: c.MI.Bits(k), ErrorBits: c.MI.Err[k] / ln2})
		res.Autocorrelation = append(res.Autocorrelation, ACFPoint{Lag: k, R: c.ACF.R[k]})
	}
	return res
}
