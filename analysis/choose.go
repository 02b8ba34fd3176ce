package analysis

import (
	"fmt"

	"unfold/embed"
	"unfold/neighbors"
)

// ParseNorm reads a norm name: "euclidean" or "max".
func ParseNorm(s string) (neighbors.Norm, error) {
	switch s {
	case "euclidean":
		return neighbors.Euclidean, nil
	case "max":
		return neighbors.Max, nil
	}
	return 0, Usagef("--norm %q: want euclidean or max", s)
}

// Choose makes the embedding choice of x by embed.Choose with the worker count and progress
// of e, says on Notef what it chose and why, and wraps a failure as a no-answer error of
// command on path. A dimension scan that gives no dimension is not an error here: it is kept
// in the choice (see DimError).
func (e *Env) Choose(command, path string, x []float64, o embed.ChooseOptions) (*embed.Choice, error) {
	if err := CheckEmbedding(len(x), o.Lag, o.Dim, o.Theiler); err != nil {
		return nil, fmt.Errorf("%s: %s: %w", command, path, err)
	}
	o.LagOptions.MI.Threads = e.threads()
	o.DimOptions.Threads = e.threads()
	o.DimOptions.Progress = e.progress(command + ": false neighbours")
	c, err := embed.Choose(x, o)
	if err != nil {
		return nil, NoAnswer(fmt.Errorf("%s: %s: %w", command, path, err))
	}
	if o.Dim > 0 && o.Lag == 0 {
		if err := CheckEmbedding(len(x), c.Lag.Value, o.Dim, 0); err != nil {
			return nil, fmt.Errorf("%s: %s: %w (with the chosen lag; give a smaller --dim or a longer record)", command, path, err)
		}
	}
	if c.LagChoice != nil {
		e.notef("lag %d chosen (%s): %s", c.Lag.Value, c.Lag.Rule, c.LagChoice.Reason)
	}
	if c.DimChoice != nil && c.DimErr == nil && o.Dim == 0 {
		e.notef("dimension %d chosen (%s): %s", c.Dim.Value, c.Dim.Rule, c.DimChoice.Reason)
	}
	return c, nil
}

// DimError is the no-answer error of command on path when the choice c has no dimension
// (nil when it has one): the scan failed, or no dimension up to its largest qualified.
func DimError(command, path string, c *embed.Choice) error {
	if c.Dim.Value > 0 {
		return nil
	}
	if c.DimChoice == nil {
		return NoAnswer(fmt.Errorf("%s: %s: choosing the dimension: %w", command, path, c.DimErr))
	}
	return NoAnswer(fmt.Errorf("%s: %s: no embedding dimension up to %d qualifies (%s); give --dim", command, path, c.DimChoice.MaxDim, c.DimChoice.Reason))
}
