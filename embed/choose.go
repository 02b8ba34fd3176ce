package embed

import (
	"errors"
	"fmt"
)

// Rules of the Theiler window and of given values, as reported in Chosen.Rule.
const (
	// RuleGiven: the value was given by the caller.
	RuleGiven = "given"
	// TheilerACFDecay: the Theiler window is the 1/e decay time of the autocorrelation
	// (DefaultTheiler over lags up to TheilerScan).
	TheilerACFDecay = "autocorrelation-1/e-decay"
)

// TheilerAuto asks Choose (and every command's --theiler) to choose the Theiler window; 0 means
// no window (only the point itself is excluded).
const TheilerAuto = -1

// TheilerScan is the largest lag of the autocorrelation scanned for its 1/e decay by
// ChooseTheiler: a record that stays correlated longer gets this window, with a caution.
const TheilerScan = 5000

// Chosen is one part of an embedding (lag, dimension or Theiler window): its value and the rule
// that gave it (RuleGiven, a Method… or Dim… constant, TheilerACFDecay).
type Chosen struct {
	Value int
	Rule  string
}

// ChooseOptions say what is given and how the rest is chosen. Use DefaultChooseOptions: its
// Theiler is TheilerAuto (the zero value of Theiler means no window).
type ChooseOptions struct {
	// Lag is the delay in samples; 0 chooses it by ChooseLag with LagOptions.
	Lag int
	// Dim is the embedding dimension; 0 chooses it by ChooseDimension with DimOptions
	// (whose Lag and Theiler are filled in here).
	Dim int
	// Theiler is the Theiler window in samples: TheilerAuto (−1) chooses it by
	// ChooseTheiler, 0 means no window.
	Theiler int
	// NoDim skips the dimension (for consumers that scan dimensions themselves).
	NoDim bool
	// LagOptions configure the lag choice (and its curves).
	LagOptions LagOptions
	// DimOptions configure the dimension scan; Lag and Theiler are set by Choose.
	DimOptions DimOptions
	// LagMethod and DimMethod, when not "", name the rules that chose a given Lag or Dim
	// upstream (a caller that chose them earlier); "" records RuleGiven.
	LagMethod, DimMethod string
}

// DefaultChooseOptions returns the defaults of every command: everything chosen, dimensions
// scanned up to 10.
func DefaultChooseOptions() ChooseOptions {
	return ChooseOptions{Theiler: TheilerAuto, DimOptions: DimOptions{MaxDim: 10}}
}

// Choice is one embedding choice of a record: lag, dimension and Theiler window, each with the
// rule behind it, and the curves the choices were read from. It is made once and handed to
// every estimator; a failed dimension choice is kept here (DimErr) and not retried.
type Choice struct {
	Lag, Dim, Theiler Chosen
	// LagChoice is the lag choice with its curves (nil when the lag was given).
	LagChoice *LagChoice
	// DimChoice is the dimension scan (nil when the dimension was given or skipped, or the scan
	// failed); when no dimension qualified, Dim.Value is 0 and DimErr says why.
	DimChoice *DimChoice
	// DimErr is why no dimension was chosen (nil when one was given or chosen, or NoDim).
	DimErr error
	// Cautions are the plain-word warnings of the lag and Theiler choices (the dimension
	// scan's are in DimChoice.Cautions).
	Cautions []string
}

// ErrNoDimension is wrapped by Choice.DimErr when the scan ran but no dimension up to MaxDim
// qualified.
var ErrNoDimension = errors.New("no embedding dimension qualifies")

// ChooseTheiler returns the default Theiler window of x: the 1/e decay time of its
// autocorrelation (FFT, lags up to min(N−1, TheilerScan)), the autocorrelation time that
// Theiler (1986, Spurious dimension from correlation algorithms applied to limited time-series
// data, Phys. Rev. A 34, 2427) asks to exclude; reading it at 1/e is common practice. Every
// command and the library use this one rule.
func ChooseTheiler(x []float64) (int, error) {
	acf, err := AutocorrelationFFT(x, min(len(x)-1, TheilerScan))
	if err != nil {
		return 0, fmt.Errorf("theiler window: %w", err)
	}
	return DefaultTheiler(acf), nil
}

// Choose makes the embedding choice for x: the lag (ChooseLag, unless given), the Theiler
// window (ChooseTheiler, unless given) and the dimension (ChooseDimension at that lag and
// window, unless given or NoDim). An error means the lag or the window could not be chosen;
// a dimension scan that gives no dimension is not an error but is recorded in DimErr.
func Choose(x []float64, opt ChooseOptions) (*Choice, error) {
	c := &Choice{Lag: Chosen{opt.Lag, RuleGiven}, Dim: Chosen{opt.Dim, RuleGiven}, Theiler: Chosen{opt.Theiler, RuleGiven}}
	if opt.Lag < 0 || opt.Dim < 0 || opt.Theiler < TheilerAuto {
		return nil, fmt.Errorf("embedding: lag %d, dimension %d, Theiler window %d: want lag ≥ 0, dimension ≥ 0, window ≥ −1", opt.Lag, opt.Dim, opt.Theiler)
	}
	if opt.LagMethod != "" {
		c.Lag.Rule = opt.LagMethod
	}
	if opt.DimMethod != "" {
		c.Dim.Rule = opt.DimMethod
	}
	if opt.Lag == 0 {
		lc, err := ChooseLag(x, opt.LagOptions)
		if err != nil {
			return nil, err
		}
		c.LagChoice, c.Lag = lc, Chosen{lc.Lag, lc.Method}
		c.Cautions = append(c.Cautions, lc.Cautions...)
	}
	if opt.Theiler == TheilerAuto {
		w, err := ChooseTheiler(x)
		if err != nil {
			return nil, err
		}
		c.Theiler = Chosen{w, TheilerACFDecay}
	}
	if opt.Dim > 0 || opt.NoDim {
		return c, nil
	}
	do := opt.DimOptions
	do.Lag, do.Theiler = c.Lag.Value, c.Theiler.Value
	dc, err := ChooseDimension(x, do)
	if err != nil {
		c.Dim, c.DimErr = Chosen{0, ""}, err
		return c, nil
	}
	c.DimChoice = dc
	c.Dim = Chosen{dc.Dimension, dc.Method}
	if dc.Dimension == 0 {
		c.DimErr = fmt.Errorf("%w up to %d (%s)", ErrNoDimension, dc.MaxDim, dc.Reason)
	}
	return c, nil
}
