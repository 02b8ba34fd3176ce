package analysis

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"unfold/dimension"
	"unfold/embed"
	"unfold/series"
)

// FractalOptions are the options of the fractal stage (the flags of `unfold fractal`).
type FractalOptions struct {
	// Lag is the delay (0: chosen); Theiler the window (embed.TheilerAuto: chosen, 0: none).
	Lag, Theiler int
	// MaxDim is the largest embedding dimension.
	MaxDim int
	// Radii are the radii: "a,b,c" or "lo:hi:count" ("" automatic).
	Radii string
	// Euclidean uses the Euclidean norm instead of the maximum norm.
	Euclidean bool
	// ReferencePoints is the number of sampled reference points of the correlation sums (0:
	// dimension.DefaultReferencePoints); Exact counts all pairs instead (cost O(N²)).
	ReferencePoints int
	Exact           bool
}

// DefaultFractalOptions returns the defaults of `unfold fractal`.
func DefaultFractalOptions() FractalOptions {
	return FractalOptions{Theiler: embed.TheilerAuto, MaxDim: 8}
}

// ParseRadii reads "a,b,c" or "lo:hi:count".
func ParseRadii(s string) ([]float64, error) {
	if s == "" {
		return nil, nil
	}
	if p := strings.Split(s, ":"); len(p) == 3 {
		lo, e1 := strconv.ParseFloat(p[0], 64)
		hi, e2 := strconv.ParseFloat(p[1], 64)
		n, e3 := strconv.Atoi(p[2])
		if e1 != nil || e2 != nil || e3 != nil || !(lo > 0) || !(hi > lo) || n < 5 {
			return nil, Usagef("fractal: --radii %q: want lo:hi:count with 0 < lo < hi and count ≥ 5", s)
		}
		r := make([]float64, n)
		for k := range r {
			r[k] = lo * math.Pow(hi/lo, float64(k)/float64(n-1))
		}
		return r, nil
	}
	var r []float64
	for i, f := range strings.Split(s, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || !(v > 0) {
			return nil, Usagef("fractal: --radii %q: item %d (%q) is not a positive number", s, i+1, f)
		}
		r = append(r, v)
	}
	if len(r) < 5 {
		return nil, Usagef("fractal: --radii %q: need at least 5 radii", s)
	}
	return r, nil
}

// FractalParams are the "parameters" of the fractal stage.
type FractalParams struct {
	Column    string `json:"column"`
	Lag       int    `json:"lag"`
	LagMethod string `json:"lag_method"`
	MaxDim    int    `json:"max_dim"`
	Theiler   int    `json:"theiler"`
	TheilerBy string `json:"theiler_method"`
	Norm      string `json:"norm"`
	Radii     int    `json:"radii"`
	Exact     bool   `json:"exact"`
	Seed      uint64 `json:"seed"`
}

// CsumPoint is one correlation sum C(r) in one dimension.
type CsumPoint struct {
	Dimension int     `json:"dimension"`
	R         float64 `json:"r"`
	C         float64 `json:"c"`
}

// FractalDim is D2 (and Takens' estimate) in one dimension.
type FractalDim struct {
	Dimension int        `json:"dimension"`
	D2        *float64   `json:"d2"`
	Interval  [2]float64 `json:"interval"`
	Takens    *float64   `json:"takens"`
}

// FractalResult is the JSON body of the fractal stage.
type FractalResult struct {
	D2             float64      `json:"d2"`
	Interval       [2]float64   `json:"interval"`
	ScalingRange   [2]float64   `json:"scaling_range"`
	Saturated      bool         `json:"saturated"`
	Dimension      int          `json:"dimension"`
	Takens         *float64     `json:"takens"`
	PerDimension   []FractalDim `json:"per_dimension"`
	CorrelationSum []CsumPoint  `json:"correlation_sum"`
	// ReferencePoints is the number of reference points the sums were counted from (all
	// delay vectors when exact); Sampling says how, in words.
	ReferencePoints int      `json:"reference_points"`
	Sampling        string   `json:"sampling"`
	Cautions        []string `json:"cautions"`
}

// FractalRun is what Fractal found, for the renderers (table, CSV, figure).
type FractalRun struct {
	R                    *dimension.Result
	Lag, Theiler         int
	LagMethod, TheilerBy string
	Cautions             []string
}

// CheckFractal validates the flags of `fractal` (after --dim has been folded into
// --max-dim) and parses the radii.
func CheckFractal(o FractalOptions) ([]float64, error) {
	if o.Lag < 0 || o.MaxDim < 1 || o.MaxDim > 30 || o.ReferencePoints < 0 {
		return nil, Usagef("fractal: want --lag ≥ 0, 1 ≤ --max-dim ≤ 30 and --reference-points ≥ 0")
	}
	return ParseRadii(o.Radii)
}

// Fractal computes the correlation sums of s and D2 (dimension.CorrelationDimension) at the
// lag and Theiler window of c — chosen here from o when c is nil, else used as given with the
// cautions passed — and returns what the renderers need with the JSON parameters and body of
// the fractal stage. When the curves have no scaling range the run is returned (its curves can
// be drawn) with a no-answer error, and the body is empty.
func (e *Env) Fractal(path string, s *series.Series, o FractalOptions, c *embed.Choice, cautions []string) (*FractalRun, FractalParams, FractalResult, error) {
	fail := func(run *FractalRun, err error) (*FractalRun, FractalParams, FractalResult, error) {
		return run, FractalParams{}, FractalResult{}, err
	}
	radii, err := CheckFractal(o)
	if err != nil {
		return fail(nil, err)
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return fail(nil, err)
	}
	x := s.Values
	if c == nil {
		var err error
		if c, err = e.Choose("fractal", path, x, embed.ChooseOptions{Lag: o.Lag, Theiler: o.Theiler, NoDim: true}); err != nil {
			return fail(nil, err)
		}
		cautions = c.Cautions
		if c.Theiler.Rule != embed.RuleGiven {
			e.notef("Theiler window %d samples (%s)", c.Theiler.Value, c.Theiler.Rule)
		}
	}
	lag, lagMethod, theiler, theilerFrom := c.Lag.Value, c.Lag.Rule, c.Theiler.Value, c.Theiler.Rule
	cautions = append([]string{}, cautions...)
	r, derr := dimension.CorrelationDimension(x, dimension.Options{Lag: lag, MaxDim: o.MaxDim, Theiler: theiler,
		Radii: radii, Euclidean: o.Euclidean, Seed: e.Seed, Threads: e.threads(), Progress: e.progress("fractal: pair counts"),
		ReferencePoints: o.ReferencePoints, Exact: o.Exact, Index: e.Indexes.provider(x, lag, o.Euclidean)})
	if r == nil {
		return fail(nil, NoAnswer(fmt.Errorf("fractal: %s: %w", path, derr)))
	}
	cautions = append(cautions, r.Cautions...)
	run := &FractalRun{R: r, Lag: lag, Theiler: theiler, LagMethod: lagMethod, TheilerBy: theilerFrom, Cautions: cautions}
	if derr != nil {
		return fail(run, NoAnswer(fmt.Errorf("fractal: %s: %w", path, derr)))
	}
	res := FractalResult{D2: r.D2, Interval: [2]float64{r.Lo, r.Hi}, ScalingRange: [2]float64{r.RLo, r.RHi},
		Saturated: r.Saturated, Dimension: r.Dim, Takens: Finite(r.Takens), Cautions: cautions, CorrelationSum: []CsumPoint{},
		ReferencePoints: r.ReferencePoints, Sampling: r.Sampling}
	for _, c := range r.Curves {
		fd := FractalDim{Dimension: c.Dim}
		if c.Fitted {
			d2, tk := c.D2, c.Takens
			fd.D2, fd.Interval = &d2, [2]float64{c.Lo, c.Hi}
			if !math.IsNaN(tk) {
				fd.Takens = &tk
			}
		}
		res.PerDimension = append(res.PerDimension, fd)
		for k, rad := range r.Radii {
			res.CorrelationSum = append(res.CorrelationSum, CsumPoint{c.Dim, rad, c.C[k]})
		}
	}
	p := FractalParams{Column: s.Name, Lag: lag, LagMethod: lagMethod, MaxDim: r.MaxDim, Theiler: theiler,
		TheilerBy: theilerFrom, Norm: r.Norm, Radii: len(r.Radii), Exact: o.Exact, Seed: e.Seed}
	return run, p, res, nil
}
