package regime

import (
	"errors"
	"fmt"

	"unfold/embed"
)

// givenEmbedding copies an embedding chosen by the caller (embed.Choose) into the evidence:
// lag, dimension and Theiler window as chosen (a window of 0 is no window), the rules behind
// them, and the dimension scan whose Cao E2 is evidence. With c nil it does nothing and returns
// (nil, nil).
func givenEmbedding(ev *Evidence, an *Analysis, c *embed.Choice) (*embed.DimChoice, error) {
	if c == nil {
		return nil, nil
	}
	ev.Lag, ev.Dim, ev.Theiler = c.Lag.Value, c.Dim.Value, max(c.Theiler.Value, 0)
	an.LagMethod, an.DimMethod = c.Lag.Rule, c.Dim.Rule
	if c.DimChoice == nil {
		return nil, errors.New("regime: no dimension scan given")
	}
	return c.DimChoice, nil
}

// ChooseEmbedding makes the embedding choice of Analyze for x by embed.Choose, with the
// Theiler window of the whole record (embed.ChooseTheiler) when theiler is embed.TheilerAuto
// and 0 meaning no window: the lag and the dimension scan (up to 8, which also gives the Cao
// evidence) on the first maxAnalysis samples (0 means 20 000), as Analyze does. A dimension
// given (> 0) replaces the scan's choice; the scan still runs for its evidence. Pass the
// result as Options.Embedding.
func ChooseEmbedding(x []float64, lag, dim, theiler, maxAnalysis, threads int) (*embed.Choice, error) {
	if maxAnalysis <= 0 {
		maxAnalysis = 20000
	}
	rule := embed.RuleGiven
	if theiler == embed.TheilerAuto {
		w, err := embed.ChooseTheiler(x)
		if err != nil {
			return nil, fmt.Errorf("regime: %w", err)
		}
		theiler, rule = w, embed.TheilerACFDecay
	}
	xa := x[:min(len(x), maxAnalysis)]
	c, err := embed.Choose(xa, embed.ChooseOptions{Lag: lag, Theiler: theiler,
		DimOptions: embed.DimOptions{MaxDim: 8, Threads: max(threads, 1)}})
	if err != nil {
		return nil, fmt.Errorf("regime: %w", err)
	}
	c.Theiler.Rule = rule
	if dim > 0 {
		c.Dim, c.DimErr = embed.Chosen{Value: dim, Rule: embed.RuleGiven}, nil
	}
	return c, nil
}
