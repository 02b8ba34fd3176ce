package analysis

import (
	"fmt"

	"unfold/embed"
	"unfold/series"
)

// EmbedOptions are the options of the embed stage (the flags of `unfold embed` that shape its
// JSON).
type EmbedOptions struct {
	// Lag, Dim and MaxDim as for the dim stage (0: chosen); Theiler: embed.TheilerAuto
	// chooses, 0 is no window.
	Lag, Dim, MaxDim, Theiler int
	// Azimuth and Elevation orient the 3-D view, degrees.
	Azimuth, Elevation float64
	// Output, Plot and STP name the files written (recorded in the body; "" for none).
	Output, Plot, STP string
}

// DefaultEmbedOptions returns the defaults of `unfold embed`.
func DefaultEmbedOptions() EmbedOptions {
	return EmbedOptions{MaxDim: 10, Theiler: embed.TheilerAuto, Azimuth: -45, Elevation: 30}
}

// EmbedParams are the "parameters" of the embed stage.
type EmbedParams struct {
	PrepParams
	Lag       int     `json:"lag"`
	LagMethod string  `json:"lag_method"`
	Dim       int     `json:"dim"`
	DimMethod string  `json:"dim_method"`
	Theiler   int     `json:"theiler"`
	Azimuth   float64 `json:"azimuth"`
	Elevation float64 `json:"elevation"`
	Threads   int     `json:"threads"`
}

// STPJSON is one curve point of the space–time separation plot.
type STPJSON struct {
	Dt       int       `json:"dt"`
	Quantile []float64 `json:"distance"`
}

// STPBody is the space–time separation curve.
type STPBody struct {
	Fractions []float64 `json:"fractions"`
	Curve     []STPJSON `json:"curve"`
}

// EmbedResult is the JSON body of the embed stage.
type EmbedResult struct {
	Lag       int      `json:"lag"`
	LagTime   float64  `json:"lag_time"`
	Dimension int      `json:"dimension"`
	Vectors   int      `json:"vectors"`
	Output    string   `json:"output"`
	Plot      string   `json:"plot"`
	STP       string   `json:"stp_plot"`
	STPCurve  *STPBody `json:"space_time_separation,omitempty"`
	Cautions  []string `json:"cautions"`
}

// Embed builds the delay vectors of s in the embedding c (chosen here when nil, with o) and
// returns them with the JSON parameters and body of the embed stage; cautions are those of a
// given c to report.
func (e *Env) Embed(path string, s *series.Series, o EmbedOptions, c *embed.Choice, cautions []string) (embed.Embedding, *embed.Choice, EmbedParams, EmbedResult, error) {
	fail := func(err error) (embed.Embedding, *embed.Choice, EmbedParams, EmbedResult, error) {
		return embed.Embedding{}, nil, EmbedParams{}, EmbedResult{}, err
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return fail(err)
	}
	x := s.Values
	if c == nil {
		var err error
		if c, err = e.Choose("embed", path, x, embed.ChooseOptions{Lag: o.Lag, Dim: o.Dim, Theiler: o.Theiler,
			DimOptions: embed.DimOptions{MaxDim: o.MaxDim}}); err != nil {
			return fail(err)
		}
		cautions = c.Cautions
		if c.DimChoice != nil {
			cautions = append(cautions, c.DimChoice.Cautions...)
		}
	}
	if err := DimError("embed", path, c); err != nil {
		return fail(err)
	}
	lag, dim := c.Lag.Value, c.Dim.Value
	em, err := embed.New(x, lag, dim)
	if err != nil {
		return fail(NoAnswer(fmt.Errorf("embed: %s: %w", path, err)))
	}
	res := EmbedResult{Lag: lag, LagTime: float64(lag) * s.Dt, Dimension: dim, Vectors: em.Len(),
		Output: o.Output, Plot: o.Plot, STP: o.STP, Cautions: append([]string{}, cautions...)}
	p := EmbedParams{PrepParams: e.prepParams(s), Lag: lag, LagMethod: c.Lag.Rule, Dim: dim, DimMethod: c.Dim.Rule,
		Theiler: c.Theiler.Value, Azimuth: o.Azimuth, Elevation: o.Elevation, Threads: e.threads()}
	return em, c, p, res, nil
}
