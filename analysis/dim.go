package analysis

import (
	"unfold/embed"
	"unfold/series"
)

// DimOptions are the options of the dim stage (the flags of `unfold dim`).
type DimOptions struct {
	// Lag is the delay in samples (0: chosen); Theiler the Theiler window (embed.TheilerAuto:
	// chosen, 0: none).
	Lag, Theiler int
	// MaxDim is the largest dimension scanned.
	MaxDim int
	// RTol, ATol and Threshold are the false-neighbour criteria (see embed.DimOptions).
	RTol, ATol, Threshold float64
	// Norm is "euclidean" or "max".
	Norm string
}

// DefaultDimOptions returns the defaults of `unfold dim`.
func DefaultDimOptions() DimOptions {
	return DimOptions{Theiler: embed.TheilerAuto, MaxDim: 10, RTol: 15, ATol: 2, Threshold: 0.01, Norm: "euclidean"}
}

// DimParams are the "parameters" of the dim stage.
type DimParams struct {
	PrepParams
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

// FNNJSON is the false-neighbour result in one dimension.
type FNNJSON struct {
	Dimension  int     `json:"dimension"`
	Fraction   float64 `json:"fraction"`
	Criterion1 float64 `json:"criterion1"`
	Criterion2 float64 `json:"criterion2"`
	Points     int     `json:"points"`
}

// CaoJSON is Cao's E1 and E2 in one dimension.
type CaoJSON struct {
	Dimension int     `json:"dimension"`
	E1        float64 `json:"e1"`
	E2        float64 `json:"e2"`
}

// DimResult is the JSON body of the dim stage.
type DimResult struct {
	Dimension      int       `json:"dimension"`
	Lag            int       `json:"lag"`
	LagTime        float64   `json:"lag_time"`
	Theiler        int       `json:"theiler"`
	Method         string    `json:"method"`
	Reason         string    `json:"reason"`
	FNNDimension   int       `json:"fnn_dimension"`
	CaoDimension   int       `json:"cao_dimension"`
	NoiseLike      bool      `json:"consistent_with_noise"`
	FalseNeighbors []FNNJSON `json:"false_neighbors"`
	Cao            []CaoJSON `json:"cao"`
	Cautions       []string  `json:"cautions"`
}

// CheckDim validates o.
func CheckDim(o DimOptions) error {
	if _, err := ParseNorm(o.Norm); err != nil {
		return err
	}
	if err := CheckFraction("fnn-threshold", o.Threshold); err != nil {
		return err
	}
	if o.MaxDim < 1 || o.Lag < 0 || !(o.RTol > 0) || !(o.ATol > 0) {
		return Usagef("dim: want --max-dim ≥ 1, --lag ≥ 0, --rtol > 0 and --atol > 0 (got %d, %d, %g, %g)", o.MaxDim, o.Lag, o.RTol, o.ATol)
	}
	if o.Theiler < embed.TheilerAuto {
		return Usagef("dim: want --theiler ≥ -1")
	}
	return nil
}

// ChooseOptions returns the embedding choice the dim stage asks for.
func (o DimOptions) ChooseOptions() embed.ChooseOptions {
	norm, _ := ParseNorm(o.Norm)
	return embed.ChooseOptions{Lag: o.Lag, Theiler: o.Theiler, DimOptions: embed.DimOptions{MaxDim: o.MaxDim,
		RTol: o.RTol, ATol: o.ATol, Threshold: o.Threshold, Norm: norm}}
}

// Dim chooses the dimension of s (embed.Choose) and returns the choice with the JSON parameters
// and body of the dim stage; the choice keeps a dimension that did not qualify (Dim.Value 0).
func (e *Env) Dim(path string, s *series.Series, o DimOptions) (*embed.Choice, DimParams, DimResult, error) {
	if err := CheckDim(o); err != nil {
		return nil, DimParams{}, DimResult{}, err
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return nil, DimParams{}, DimResult{}, err
	}
	c, err := e.Choose("dim", path, s.Values, o.ChooseOptions())
	if err != nil {
		return nil, DimParams{}, DimResult{}, err
	}
	if c.DimChoice == nil {
		return nil, DimParams{}, DimResult{}, NoAnswer(fmtErr("dim", path, c.DimErr))
	}
	p, res := e.DimJSON(s, c, c.Cautions)
	return c, p, res, nil
}

// DimJSON is the JSON parameters and body of the dim stage for the choice c (which has a
// dimension scan); cautions are those of the lag and Theiler choices to report with it.
func (e *Env) DimJSON(s *series.Series, c *embed.Choice, cautions []string) (DimParams, DimResult) {
	dc := c.DimChoice
	lag, theiler := c.Lag.Value, c.Theiler.Value
	res := DimResult{Dimension: dc.Dimension, Lag: lag, LagTime: float64(lag) * s.Dt, Theiler: theiler,
		Method: dc.Method, Reason: dc.Reason, FNNDimension: dc.FNNDim, CaoDimension: dc.CaoDim, NoiseLike: dc.NoiseLike,
		Cautions: append(append([]string{}, cautions...), dc.Cautions...)}
	for _, p := range dc.FNN {
		res.FalseNeighbors = append(res.FalseNeighbors, FNNJSON{p.Dim, p.Fraction, p.Criterion1, p.Criterion2, p.Points})
	}
	res.Cao = []CaoJSON{}
	for _, p := range dc.Cao {
		res.Cao = append(res.Cao, CaoJSON{p.Dim, p.E1, p.E2})
	}
	p := DimParams{PrepParams: e.prepParams(s), Lag: lag, LagMethod: c.Lag.Rule, MaxDim: dc.MaxDim,
		Theiler: theiler, TheilerFrom: c.Theiler.Rule, RTol: dc.RTol, ATol: dc.ATol, FNNThreshold: dc.Threshold,
		Norm: dc.Norm.String(), Threads: e.threads()}
	return p, res
}
