package analysis

import (
	"errors"
	"fmt"
	"math"

	"unfold/embed"
	"unfold/fit"
	"unfold/lyapunov"
	"unfold/neighbors"
	"unfold/series"
)

// LyapunovOptions are the options of the lyapunov stage (the flags of `unfold lyapunov`).
type LyapunovOptions struct {
	// Lag, Dim and MaxDim as for the dim stage (0: chosen); Theiler: embed.TheilerAuto
	// chooses, 0 is no window.
	Lag, Dim, MaxDim, Theiler int
	// Method is "kantz" or "rosenstein"; Norm "euclidean" or "max".
	Method, Norm string
	// Horizon is the steps each pair is followed (0: automatic).
	Horizon int
	// Eps are the Kantz radii (nil: automatic); MaxNeighbors caps the neighbours within ε.
	Eps          []float64
	MaxNeighbors int
	// FitFrom and FitTo give the fit range (−1: automatic).
	FitFrom, FitTo int
	// Reps is the bootstrap resamples.
	Reps int
	// ReferencePoints is the number of reference points followed (0:
	// lyapunov.DefaultReferencePoints).
	ReferencePoints int
	// Spectrum also estimates the whole spectrum from local linear maps, with Neighbors per
	// fit and Evolve steps per map (0: automatic).
	Spectrum          bool
	Neighbors, Evolve int
}

// DefaultLyapunovOptions returns the defaults of `unfold lyapunov`.
func DefaultLyapunovOptions() LyapunovOptions {
	return LyapunovOptions{MaxDim: 10, Theiler: embed.TheilerAuto, Method: "kantz", Norm: "euclidean",
		MaxNeighbors: 32, FitFrom: -1, FitTo: -1, Reps: 500}
}

// LyapunovParams are the "parameters" of the lyapunov stage.
type LyapunovParams struct {
	PrepParams
	Lag          int       `json:"lag"`
	LagMethod    string    `json:"lag_method"`
	Dim          int       `json:"dim"`
	DimMethod    string    `json:"dim_method"`
	Theiler      int       `json:"theiler"`
	TheilerFrom  string    `json:"theiler_from"`
	Method       string    `json:"method"`
	Norm         string    `json:"norm"`
	Horizon      int       `json:"horizon"`
	Eps          []float64 `json:"eps,omitempty"`
	MaxNeighbors int       `json:"max_neighbors,omitempty"`
	FitFrom      *int      `json:"fit_from"`
	FitTo        *int      `json:"fit_to"`
	Blocks       int       `json:"bootstrap_blocks"`
	Reps         int       `json:"bootstrap_reps"`
	Level        float64   `json:"interval_level"`
	Seed         uint64    `json:"seed"`
	Threads      int       `json:"threads"`
	Spectrum     bool      `json:"spectrum"`
	Neighbors    int       `json:"spectrum_neighbors,omitempty"`
	Evolve       int       `json:"spectrum_evolve,omitempty"`
}

// LyapunovFit is the fit range of λ1 and how it was found.
type LyapunovFit struct {
	From      int    `json:"from"`
	To        int    `json:"to"`
	Automatic bool   `json:"automatic"`
	Criterion string `json:"criterion"`
}

// DivergencePoint is one step of the divergence curve.
type DivergencePoint struct {
	Step    int     `json:"step"`
	MeanLog float64 `json:"mean_log"`
	Pairs   int64   `json:"pairs"`
}

// EpsCurveJSON is the divergence curve of one Kantz radius and its slope.
type EpsCurveJSON struct {
	Eps                float64  `json:"eps"`
	References         int      `json:"references"`
	LambdaMax          *float64 `json:"lambda_max"`
	LambdaMaxPerSample *float64 `json:"lambda_max_per_sample"`
	Fit                *[2]int  `json:"fit"`
}

// LyapunovResult is the JSON body of the lyapunov stage.
type LyapunovResult struct {
	LambdaMax          *float64          `json:"lambda_max"`
	LambdaMaxPerSample *float64          `json:"lambda_max_per_sample"`
	Interval           *[2]float64       `json:"interval"`
	IntervalPerSample  *[2]float64       `json:"interval_per_sample"`
	Fit                *LyapunovFit      `json:"fit"`
	Eps                *float64          `json:"eps,omitempty"`
	Curves             []EpsCurveJSON    `json:"curves,omitempty"`
	Divergence         []DivergencePoint `json:"divergence"`
	References         int               `json:"reference_points"`
	Sampling           string            `json:"sampling"`
	Reason             string            `json:"reason,omitempty"`
	RangeCheck         *RangeCheckJSON   `json:"range_check,omitempty"`
	Spectrum           []float64         `json:"spectrum,omitempty"`
	SpectrumPerSample  []float64         `json:"spectrum_per_sample,omitempty"`
	KaplanYorke        *float64          `json:"kaplan_yorke_dimension,omitempty"`
	SpectrumNote       string            `json:"spectrum_note,omitempty"`
	Cautions           []string          `json:"cautions"`
}

// LyapunovRun is what Lyapunov found, for the renderers (table, CSV, figure).
type LyapunovRun struct {
	R                               *lyapunov.Result
	Spectrum                        *lyapunov.SpectrumResult
	Method                          lyapunov.Method
	LagMethod, DimMethod, TheilerBy string
}

// CheckLyapunov validates the flags of `lyapunov`.
func CheckLyapunov(o LyapunovOptions) (lyapunov.Method, neighbors.Norm, error) {
	method, err := lyapunov.ParseMethod(o.Method)
	if err != nil {
		return 0, 0, Usagef("lyapunov: --method %q: want kantz or rosenstein", o.Method)
	}
	norm, err := ParseNorm(o.Norm)
	if err != nil {
		return 0, 0, err
	}
	if o.Lag < 0 || o.Dim < 0 || o.Horizon < 0 || o.ReferencePoints < 0 || o.MaxNeighbors < 1 || o.Reps < 2 || o.MaxDim < 1 || o.Neighbors < 0 || o.Evolve < 0 {
		return 0, 0, Usagef("lyapunov: want --lag, --dim, --horizon, --reference-points, --neighbors, --evolve ≥ 0, --max-neighbors ≥ 1, --reps ≥ 2, --max-dim ≥ 1")
	}
	if err := CheckEmbedding(0, o.Lag, o.Dim, o.Theiler); err != nil {
		return 0, 0, fmt.Errorf("lyapunov: %w", err)
	}
	if (o.FitFrom >= 0) != (o.FitTo >= 0) {
		return 0, 0, Usagef("lyapunov: give both --fit-from and --fit-to, or neither")
	}
	if o.FitTo >= 0 && o.FitTo <= o.FitFrom {
		return 0, 0, Usagef("lyapunov: --fit-to %d must be larger than --fit-from %d", o.FitTo, o.FitFrom)
	}
	return method, norm, nil
}

// Lyapunov estimates the largest exponent of s (lyapunov.Divergence, and the spectrum on
// request) in the embedding c — chosen here from o when c is nil (then with the choice's
// cautions), else used as given with the cautions passed — and returns what the renderers need
// with the JSON parameters and body of the lyapunov stage. When the curve has no linear range
// the run, parameters and body are returned with a no-answer error (the body then carries the
// curve and the reason).
func (e *Env) Lyapunov(path string, s *series.Series, o LyapunovOptions, c *embed.Choice, cautions []string) (*LyapunovRun, LyapunovParams, LyapunovResult, error) {
	fail := func(err error) (*LyapunovRun, LyapunovParams, LyapunovResult, error) {
		return nil, LyapunovParams{}, LyapunovResult{}, err
	}
	method, norm, err := CheckLyapunov(o)
	if err != nil {
		return fail(err)
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return fail(err)
	}
	x := s.Values
	if c == nil {
		co := embed.ChooseOptions{Lag: o.Lag, Dim: o.Dim, Theiler: o.Theiler, DimOptions: embed.DimOptions{MaxDim: o.MaxDim, Norm: norm}}
		var err error
		if c, err = e.Choose("lyapunov", path, x, co); err != nil {
			return fail(err)
		}
		cautions = c.Cautions
		if c.DimChoice != nil {
			cautions = append(cautions, c.DimChoice.Cautions...)
		}
		if c.Theiler.Rule != embed.RuleGiven {
			e.notef("Theiler window %d samples (%s)", c.Theiler.Value, c.Theiler.Rule)
		}
	}
	if err := DimError("lyapunov", path, c); err != nil {
		return fail(err)
	}
	lag, theiler, theilerFrom, dim := c.Lag.Value, c.Theiler.Value, c.Theiler.Rule, c.Dim.Value
	lagMethod, dimMethod := c.Lag.Rule, c.Dim.Rule
	opt := lyapunov.Options{Lag: lag, Dim: dim, Theiler: theiler, Method: method, Norm: norm,
		Horizon: o.Horizon, Eps: o.Eps, MaxNeighbors: o.MaxNeighbors, Dt: s.Dt, Reps: o.Reps,
		Seed: e.Seed, Threads: e.threads(), Progress: e.progress("lyapunov: divergence"),
		ReferencePoints: o.ReferencePoints}
	var ix *neighbors.Index
	if e.Indexes != nil || o.Spectrum {
		// One index for the curves, the spectrum and the other stages of the run that embed
		// alike; when it cannot be built, Divergence says why.
		ix, _ = e.Indexes.Get(x, lag, dim, norm)
	}
	opt.Index = ix
	if o.FitTo >= 0 {
		opt.FitFrom, opt.FitTo = o.FitFrom, o.FitTo
	}
	r, derr := lyapunov.Divergence(x, opt)
	if r == nil {
		if derr == nil {
			derr = errors.New("no result")
		}
		return fail(NoAnswer(fmt.Errorf("lyapunov: %s: %w", path, derr)))
	}
	var sp *lyapunov.SpectrumResult
	if o.Spectrum {
		sp, err = lyapunov.Spectrum(x, lyapunov.SpectrumOptions{Lag: lag, Dim: dim, Theiler: theiler, Norm: norm,
			Neighbors: o.Neighbors, Evolve: o.Evolve, Dt: s.Dt, Threads: e.threads(), Progress: e.progress("lyapunov: local maps"), Index: ix})
		if err != nil {
			return fail(NoAnswer(fmt.Errorf("lyapunov: %s: spectrum: %w", path, err)))
		}
	}
	res := LyapunovResult{References: r.ReferencePoints, Sampling: lyapunovSampling(r), Cautions: append(append([]string{}, cautions...), r.Cautions...)}
	ch := r.Curves[r.Chosen]
	for k, v := range ch.MeanLog {
		if !math.IsNaN(v) {
			res.Divergence = append(res.Divergence, DivergencePoint{Step: k, MeanLog: v, Pairs: ch.Pairs[k]})
		}
	}
	if derr == nil {
		res.LambdaMax, res.LambdaMaxPerSample = &r.Lambda, &r.LambdaPerSample
		res.Interval, res.IntervalPerSample = &r.Interval, &r.IntervalPerSample
		checkRange(r, &res, s.Dt)
		crit := "given"
		if r.AutoRange {
			ro := r.RangeOptions
			crit = fmt.Sprintf("longest non-plateau range whose %d-step local slopes stay within %g·|median| + %.3g of their median (at least %d points; plateau: rise under %g nat)",
				ro.Window, ro.RelTol, ro.AbsTol, ro.MinPoints, ro.FlatRise)
			if ch.Fit.Plateau {
				crit = "no range rises by a factor e: the whole horizon after the first step (bounded curve)"
			}
		}
		res.Fit = &LyapunovFit{From: r.From, To: r.To, Automatic: r.AutoRange, Criterion: crit}
	} else {
		res.Reason = derr.Error()
	}
	if method == lyapunov.Kantz {
		res.Eps = &ch.Eps
		for e, c := range r.Curves {
			ej := EpsCurveJSON{Eps: c.Eps, References: c.References}
			if c.FitErr == nil {
				ps := r.EpsSlopes[e]
				pt := ps / s.Dt
				ej.LambdaMaxPerSample, ej.LambdaMax = &ps, &pt
				ej.Fit = &[2]int{c.Fit.From, c.Fit.To}
			}
			res.Curves = append(res.Curves, ej)
		}
	}
	if sp != nil {
		res.Spectrum, res.SpectrumPerSample = sp.Exponents, sp.PerSample
		res.KaplanYorke, res.SpectrumNote = &sp.KaplanYorke, sp.Note
		res.Cautions = append(res.Cautions, sp.Cautions...)
	}
	if res.Cautions == nil {
		res.Cautions = []string{}
	}
	p := LyapunovParams{PrepParams: e.prepParams(s), Lag: lag, LagMethod: lagMethod, Dim: dim,
		DimMethod: dimMethod, Theiler: theiler, TheilerFrom: theilerFrom, Method: method.String(),
		Norm: norm.String(), Horizon: r.Horizon, Blocks: r.Blocks, Reps: r.Reps, Level: r.Level,
		Seed: e.Seed, Threads: e.threads(), Spectrum: o.Spectrum}
	if method == lyapunov.Kantz {
		p.Eps, p.MaxNeighbors = make([]float64, len(r.Curves)), r.MaxNeighbors
		for e, c := range r.Curves {
			p.Eps[e] = c.Eps
		}
	}
	if o.FitTo >= 0 {
		ff, ft := o.FitFrom, o.FitTo
		p.FitFrom, p.FitTo = &ff, &ft
	}
	if sp != nil {
		p.Neighbors, p.Evolve = sp.Neighbors, sp.Evolve
	}
	run := &LyapunovRun{R: r, Spectrum: sp, Method: method, LagMethod: lagMethod, DimMethod: dimMethod, TheilerBy: theilerFrom}
	var noFit error
	if derr != nil {
		if errors.Is(derr, fit.ErrNoRange) {
			noFit = NoAnswer(fmt.Errorf("lyapunov: %s: %w; give --fit-from and --fit-to to fit a range anyway", path, derr))
		} else {
			noFit = NoAnswer(fmt.Errorf("lyapunov: %s: %w", path, derr))
		}
	}
	return run, p, res, noFit
}

// lyapunovSampling says in words how the reference points of r were chosen.
func lyapunovSampling(r *lyapunov.Result) string {
	adm := r.Vectors - r.Horizon
	if r.ReferencePoints >= adm {
		return fmt.Sprintf("exact: every one of the %d delay vectors that can be followed for %d steps is a reference point", adm, r.Horizon)
	}
	return fmt.Sprintf("sampled: %d reference points (one drawn at random from each of %d equal stretches of the record, seed %d) out of %d delay vectors that can be followed for %d steps; their neighbours sought among all of these",
		r.ReferencePoints, r.ReferencePoints, r.Seed, adm, r.Horizon)
}
