package regime

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"unfold/dimension"
	"unfold/embed"
	"unfold/lyapunov"
	"unfold/series"
)

// The regimes a verdict can name.
const (
	Periodic      = "periodic"
	Quasiperiodic = "quasiperiodic"
	Chaotic       = "chaotic"
	Stochastic    = "stochastic"
	Undetermined  = "undetermined"
)

// Exponent is a largest Lyapunov exponent with its interval, in nats per time unit, as
// package lyapunov estimates it; it is an input of the verdict.
type Exponent struct {
	Value, Lo, Hi float64
}

// Item is one row of the evidence table.
type Item struct {
	// Value is the test's number (see Detail for what it is).
	Value float64 `json:"value"`
	// Detail says in words what was measured.
	Detail string `json:"detail"`
	// PointsTo lists the regimes the result supports, joined by "|".
	PointsTo string `json:"points_to"`
	// Weight is the item's weight in the confidence.
	Weight float64 `json:"weight"`
}

// Evidence is everything the verdict is decided from. Every field is optional except N;
// missing tests are simply not used.
type Evidence struct {
	// N is the number of samples and Dt the sampling interval.
	N  int
	Dt float64
	// Lag, Dim and Theiler are the embedding used by the tests (samples).
	Lag, Dim, Theiler int
	Lines             *Lines
	ZeroOne           *ZeroOneResult
	// Prediction and Reversal are the rank tests against IAAFT surrogates.
	Prediction, Reversal *RankTest
	// Alpha is the level of the rank tests (0 means 0.05); MinSigmas the effect-size guard
	// (0 means 3).
	Alpha, MinSigmas float64
	// Lyapunov is λ1 with its interval (nats per time unit), when it was estimated.
	Lyapunov *Exponent
	// Dimension is the correlation-dimension result.
	Dimension *dimension.Result
	// CaoNoiseLike is non-nil when Cao's E2 was computed: true when |E2(d) − 1| < 0.1 for
	// all d (Cao 1997), and CaoE2Dev is the largest |E2(d) − 1|.
	CaoNoiseLike *bool
	CaoE2Dev     float64
	// Stationary is false when the record's halves and quarters differ (series.Describe).
	Stationary bool
	// Cautions collected while gathering the evidence.
	Cautions []string
}

// Verdict is the outcome of Decide.
type Verdict struct {
	Regime     string          `json:"regime"`
	Confidence float64         `json:"confidence"`
	Evidence   map[string]Item `json:"evidence"`
	Cautions   []string        `json:"cautions"`
	// Rule says which step of the decision rule gave the regime.
	Rule string `json:"rule"`
}

// Decide applies the decision rule of the package comment to the evidence.
func Decide(ev *Evidence) *Verdict {
	alpha := ev.Alpha
	if alpha <= 0 {
		alpha = 0.05
	}
	minS := ev.MinSigmas
	if minS <= 0 {
		minS = 3
	}
	v := &Verdict{Evidence: map[string]Item{}, Cautions: append([]string(nil), ev.Cautions...)}
	add := func(name string, it Item) {
		if math.IsNaN(it.Value) || math.IsInf(it.Value, 0) {
			return // a test that produced no number is left out of the table
		}
		v.Evidence[name] = it
	}

	lineKind := LineKind("")
	if l := ev.Lines; l != nil {
		lineKind = l.Kind
		it := Item{Value: l.LineFraction, Weight: 3}
		switch l.Kind {
		case LinesPeriodic:
			it.PointsTo = Periodic
			it.Detail = fmt.Sprintf("%d significant lines, harmonics of %.6g cycles per time unit; %.1f %% of the power in lines", len(l.Peaks), l.Fundamentals[0], 100*l.LineFraction)
		case LinesQuasiperiodic:
			it.PointsTo = Quasiperiodic
			it.Detail = fmt.Sprintf("%d significant lines, integer combinations of %d incommensurate frequencies %s; %.1f %% of the power in lines", len(l.Peaks), len(l.Fundamentals), fmtFloats(l.Fundamentals), 100*l.LineFraction)
		default:
			it.PointsTo = Chaotic + "|" + Stochastic
			it.Detail = fmt.Sprintf("broadband: %.1f %% of the power in %d significant lines", 100*l.LineFraction, len(l.Peaks))
		}
		add("lines", it)
		if l.Kind != LinesBroadband && l.LineFraction < 0.95 {
			v.Cautions = append(v.Cautions, fmt.Sprintf("noise floor: %.0f %% of the power is broadband beside the lines", 100*(1-l.LineFraction)))
		}
	}
	k := math.NaN()
	if z := ev.ZeroOne; z != nil {
		k = z.K
		it := Item{Value: z.K, Weight: 2, Detail: fmt.Sprintf("0-1 test K = %.3f (median over c, %d samples, subsampling step %d)", z.K, z.Samples, z.Subsample)}
		if z.K < 0.5 {
			it.PointsTo = Periodic + "|" + Quasiperiodic
		} else {
			it.PointsTo = Chaotic + "|" + Stochastic
		}
		add("zero_one", it)
	}
	nonlinear, tested := false, false
	if p := ev.Prediction; p != nil {
		tested = true
		rej := p.Rejects(alpha, minS)
		nonlinear = nonlinear || rej
		it := Item{Value: p.Data, Weight: 3, Detail: fmt.Sprintf("prediction error %.3g against IAAFT surrogates %s: p = %.3g, %.1f σ", p.Data, rangeString(p.Surrogates), p.P, p.Sigmas)}
		switch {
		case rej:
			it.PointsTo = Chaotic + "|" + Periodic + "|" + Quasiperiodic
		case maxOf(p.Surrogates) < 0.1:
			// The surrogates, which keep only the spectrum, predict almost perfectly too: the
			// spectrum alone makes the signal predictable, as for a line spectrum.
			it.PointsTo = Periodic + "|" + Quasiperiodic
			it.Detail += "; the surrogates predict as well: the spectrum alone makes the signal predictable"
		default:
			it.PointsTo = Stochastic
		}
		add("prediction_error", it)
	}
	if r := ev.Reversal; r != nil {
		tested = true
		a2 := math.Max(alpha, 2/float64(len(r.Surrogates)+1))
		rej := r.Rejects(a2, minS)
		nonlinear = nonlinear || rej
		it := Item{Value: r.Data, Weight: 1, Detail: fmt.Sprintf("time-reversal asymmetry %.3g against IAAFT surrogates %s: p = %.3g (two-sided, level %.2g), %.1f σ", r.Data, rangeString(r.Surrogates), r.P, a2, r.Sigmas)}
		if rej {
			it.PointsTo = Chaotic + "|" + Periodic + "|" + Quasiperiodic
		} else {
			it.PointsTo = Stochastic + "|" + Periodic + "|" + Quasiperiodic
		}
		add("time_reversal", it)
	}
	lyapPos, lyapNeg := false, false
	if l := ev.Lyapunov; l != nil {
		// Growth below 1 % per delay time is indistinguishable from zero (judgement).
		small := 0.01 / (float64(max(ev.Lag, 1)) * math.Max(ev.Dt, 1e-300))
		lyapPos, lyapNeg = l.Lo > 0 && l.Value > small, l.Hi <= 0 || math.Abs(l.Value) <= small
		it := Item{Value: l.Value, Weight: 2, Detail: fmt.Sprintf("largest Lyapunov exponent %.3g [%.3g, %.3g] nats per time unit", l.Value, l.Lo, l.Hi)}
		switch {
		case lyapPos:
			it.PointsTo = Chaotic + "|" + Stochastic // noise also gives positive estimates
		case lyapNeg:
			it.PointsTo = Periodic + "|" + Quasiperiodic
		default:
			it.PointsTo = Periodic + "|" + Quasiperiodic + "|" + Chaotic
		}
		add("lyapunov", it)
	}
	saturated := false
	if d := ev.Dimension; d != nil {
		saturated = d.Saturated
		it := Item{Value: d.D2, Weight: 1.5, Detail: fmt.Sprintf("correlation dimension %.3g [%.3g, %.3g] at m = %d, saturated %v", d.D2, d.Lo, d.Hi, d.Dim, d.Saturated)}
		switch {
		case !d.Saturated:
			it.PointsTo = Stochastic
		case d.D2 < 0.5 || math.Abs(d.D2-1) < 0.15:
			it.PointsTo = Periodic // a finite set of points (a map's cycle) or a closed curve
		case math.Abs(d.D2-math.Round(d.D2)) < 0.15:
			it.PointsTo = Quasiperiodic + "|" + Chaotic
		default:
			it.PointsTo = Chaotic
		}
		add("correlation_dimension", it)
	}
	if ev.CaoNoiseLike != nil {
		it := Item{Value: ev.CaoE2Dev, Weight: 1, Detail: fmt.Sprintf("largest |E2(d) − 1| = %.3g (Cao 1997: ≈ 0 for noise)", ev.CaoE2Dev)}
		if *ev.CaoNoiseLike {
			it.PointsTo = Stochastic
		} else {
			it.PointsTo = Periodic + "|" + Quasiperiodic + "|" + Chaotic
		}
		add("cao_e2", it)
	}

	// The decision rule (package comment).
	kRegular := math.IsNaN(k) || k < 0.5
	// For step 1 a saturated D2 says chaos only at a non-integer value: cycles and tori have
	// integer dimensions.
	fractal := saturated && ev.Dimension != nil && math.Abs(ev.Dimension.D2-math.Round(ev.Dimension.D2)) >= 0.15
	switch {
	case (lineKind == LinesPeriodic || lineKind == LinesQuasiperiodic) && chaosVotes(k, lyapPos, fractal) < 2:
		v.Regime = string(lineKind)
		v.Rule = "1: the power is in lines explained by " + map[bool]string{true: "one fundamental", false: "incommensurate fundamentals"}[lineKind == LinesPeriodic] + ", and fewer than two chaos indicators contradict"
	case !tested:
		v.Regime = Undetermined
		v.Rule = "2: no surrogate test was run, so noise cannot be excluded"
	case !nonlinear:
		v.Regime = Stochastic
		v.Rule = "2: the surrogate tests cannot tell the signal from a linear Gaussian process seen through a static monotone function"
	case chaosVotes(k, lyapPos, saturated) >= 2 && !lyapNeg:
		v.Regime = Chaotic
		v.Rule = "3: nonlinear determinism, and at least two of the chaos indicators agree: " + chaosWhy(k, lyapPos, saturated)
	default:
		v.Regime = Undetermined
		v.Rule = "3: the null is rejected, but the chaos indicators (0-1 test, λ1, D2 saturation) do not agree"
	}
	if lineKind != "" && lineKind != LinesBroadband && !kRegular {
		v.Cautions = append(v.Cautions, fmt.Sprintf("the spectrum is a line spectrum but the 0-1 test gives K = %.2f: weakly chaotic or phase-diffusing motion", k))
	}
	// Confidence: the weighted share of the evidence that supports the regime.
	var agree, total float64
	for _, it := range v.Evidence {
		total += it.Weight
		if strings.Contains("|"+it.PointsTo+"|", "|"+v.Regime+"|") {
			agree += it.Weight
		}
	}
	if total > 0 && v.Regime != Undetermined {
		v.Confidence = agree / total
	}
	if ev.N < 2000 {
		v.Confidence *= 0.8
		v.Cautions = append(v.Cautions, fmt.Sprintf("too short: %d samples; surrogate tests and dimension estimates need a few thousand", ev.N))
	}
	if !ev.Stationary {
		v.Confidence *= 0.9
	}
	v.Confidence = math.Round(v.Confidence*1000) / 1000
	if v.Cautions == nil {
		v.Cautions = []string{}
	}
	return v
}

func fmtFloats(f []float64) string {
	s := make([]string, len(f))
	for i, v := range f {
		s[i] = fmt.Sprintf("%.6g", v)
	}
	return "[" + strings.Join(s, ", ") + "]"
}

// Options configure Analyze. The zero value chooses everything automatically.
type Options struct {
	// Lag, Dim and Theiler override the embedding choices of package embed (0: choose).
	// Embedding, when not nil, is used instead of all three (its Theiler window 0 means no
	// window) and its dimension scan gives the Cao evidence; see ChooseEmbedding.
	Lag, Dim, Theiler int
	Embedding         *embed.Choice
	// Dimension is D2 with its scaling range when the caller estimated it; nil estimates it
	// with package dimension's defaults unless NoDimension is set.
	Dimension   *dimension.Result
	NoDimension bool
	// Surrogates is the number of IAAFT surrogates (0 means 19: one-sided 5 %).
	Surrogates int
	// Seed seeds surrogates, the 0-1 test's c and bootstraps.
	Seed uint64
	// Lyapunov is λ1 with its interval when the caller estimated it; nil estimates it with
	// package lyapunov's defaults (Kantz 1994 divergence curves) unless NoLyapunov is set.
	Lyapunov   *Exponent
	NoLyapunov bool
	// MaxAnalysis caps the samples used by the embedding choices, λ1 and the surrogate
	// statistics (0 means 20 000; D2 uses at most 10 000); the spectrum and the 0-1 test use
	// the whole record.
	MaxAnalysis int
	// Threads is the number of goroutines (0 = 1). Results do not depend on it.
	Threads int
	// Progress, when not nil, is called with (done, total) of the surrogate statistics.
	Progress func(done, total int)
}

// Analysis is the outcome of Analyze: the verdict and everything it was decided from.
type Analysis struct {
	Verdict  *Verdict
	Evidence *Evidence
	// LagMethod, DimMethod say how the embedding was chosen ("given" when set).
	LagMethod, DimMethod string
	// Surrogates is the IAAFT set used by the tests.
	Surrogates *SurrogateSet
}

// Analyze gathers the evidence for x sampled every dt and decides the regime.
func Analyze(x []float64, dt float64, opt Options) (*Analysis, error) {
	if dt <= 0 {
		dt = 1
	}
	if len(x) < 256 {
		return nil, fmt.Errorf("regime: %d samples: need at least 256", len(x))
	}
	if err := series.CheckVariable(x); err != nil {
		return nil, fmt.Errorf("regime: %w", err)
	}
	if opt.Surrogates <= 0 {
		opt.Surrogates = 19
	}
	if opt.MaxAnalysis <= 0 {
		opt.MaxAnalysis = 20000
	}
	threads := max(opt.Threads, 1)
	ev := &Evidence{N: len(x), Dt: dt, Lyapunov: opt.Lyapunov, Stationary: true}
	an := &Analysis{Evidence: ev, LagMethod: "given", DimMethod: "given"}
	if sm, err := series.Describe(&series.Series{Values: x, Dt: dt}); err == nil {
		ev.Stationary = sm.Stationarity.Stationary
		ev.Cautions = append(ev.Cautions, sm.Cautions...)
	}
	xa := x[:min(len(x), opt.MaxAnalysis)]
	if len(xa) < len(x) {
		ev.Cautions = append(ev.Cautions, fmt.Sprintf("embedding choices, λ1 and the surrogate tests use the first %d of %d samples (D2 at most 10 000)", len(xa), len(x)))
	}
	// Embedding.
	ev.Lag, ev.Dim, ev.Theiler = opt.Lag, opt.Dim, opt.Theiler
	dc, err := givenEmbedding(ev, an, opt.Embedding)
	if opt.Embedding == nil && (ev.Lag <= 0 || ev.Theiler <= 0) {
		lc, err := embed.ChooseLag(xa, embed.LagOptions{})
		if err != nil {
			return nil, fmt.Errorf("regime: lag: %w", err)
		}
		if ev.Lag <= 0 {
			ev.Lag, an.LagMethod = lc.Lag, lc.Method
		}
		if ev.Theiler <= 0 {
			ev.Theiler = embed.DefaultTheiler(lc.ACF)
		}
	}
	if opt.Embedding == nil {
		dc, err = embed.ChooseDimension(xa, embed.DimOptions{Lag: ev.Lag, Theiler: ev.Theiler, MaxDim: 8, Threads: threads})
	}
	if err == nil && dc != nil {
		finite := 0
		for _, c := range dc.Cao {
			if !math.IsNaN(c.E2) && !math.IsInf(c.E2, 0) {
				ev.CaoE2Dev = math.Max(ev.CaoE2Dev, math.Abs(c.E2-1))
				finite++
			}
		}
		if finite > 0 {
			nl := dc.NoiseLike
			ev.CaoNoiseLike = &nl
		}
		if ev.Dim <= 0 {
			ev.Dim, an.DimMethod = dc.Dimension, dc.Method
		}
	}
	if ev.Dim <= 0 {
		ev.Dim, an.DimMethod = 3, "default-3 (no rule applied)"
	}
	// Oversampled flows are subsampled for the 0-1 test (Gottwald & Melbourne 2009): every
	// ⌈τ/2⌉-th sample, so consecutive samples are about half a delay time apart (judgement:
	// phase-coherent flows such as Rössler's need steps of that order for K to approach 1).
	sub := max(1, (ev.Lag+1)/2)
	if ev.Lag >= 8 {
		ev.Cautions = append(ev.Cautions, fmt.Sprintf("oversampled: the delay is %d samples; the 0-1 test used a subsampling step of %d samples as Gottwald & Melbourne (2009) advise", ev.Lag, sub))
	}
	// Spectrum and lines (whole record).
	if l, err := LineAnalysis(x, dt, LineOptions{}); err == nil {
		ev.Lines = l
	}
	// 0-1 test, subsampled by the delay for flows.
	if z, err := ZeroOne(x, ZeroOneOptions{Subsample: sub, Seed: opt.Seed}); err == nil {
		ev.ZeroOne = z
	}
	// Largest Lyapunov exponent.
	if ev.Lyapunov == nil && !opt.NoLyapunov {
		r, err := lyapunov.Divergence(xa, lyapunov.Options{Lag: ev.Lag, Dim: ev.Dim, Theiler: ev.Theiler, Dt: dt, Seed: opt.Seed, Threads: threads})
		if err == nil && r != nil && !math.IsNaN(r.Lambda) {
			ev.Lyapunov = &Exponent{Value: r.Lambda, Lo: r.Interval[0], Hi: r.Interval[1]}
		}
	}
	// Correlation dimension.
	maxDim := min(max(ev.Dim+3, 5), 8)
	// D2 from at most 10⁴ samples: enough for dimensions up to 2·log10(10⁴) = 8 (Eckmann &
	// Ruelle 1992), at a quarter of the pair-counting cost of 2·10⁴.
	if opt.Dimension != nil {
		ev.Dimension = opt.Dimension
	} else if opt.NoDimension {
		// the caller's D2 estimate gave no answer: no D2 evidence
	} else if d, err := dimension.CorrelationDimension(xa[:min(len(xa), 10000)], dimension.Options{Lag: ev.Lag, MaxDim: maxDim, Theiler: ev.Theiler, Seed: opt.Seed, Threads: threads}); err == nil {
		ev.Dimension = d
	}
	// Surrogate tests.
	set, err := Surrogates(xa, SurrogateOptions{Method: IAAFT, Count: opt.Surrogates, Seed: opt.Seed, Threads: threads})
	if err != nil {
		return nil, fmt.Errorf("regime: %w", err)
	}
	an.Surrogates = set
	ev.Cautions = append(ev.Cautions, set.Cautions...)
	seg := xa[set.Start : set.Start+set.Length]
	horizon := max(1, ev.Lag/2)
	po := PredictOptions{Lag: ev.Lag, Dim: ev.Dim, Horizon: horizon, Theiler: ev.Theiler}
	stats := func(s []float64) (float64, float64, error) {
		pe, err := PredictionError(s, po)
		return pe, ReversalAsymmetry(s, ev.Lag), err
	}
	pd, rd, err := stats(seg)
	if err != nil {
		return nil, fmt.Errorf("regime: %w", err)
	}
	ps := make([]float64, len(set.Surrogates))
	rs := make([]float64, len(set.Surrogates))
	errs := make([]error, len(set.Surrogates))
	parallelFor(len(set.Surrogates), threads, opt.Progress, func(i int) {
		ps[i], rs[i], errs[i] = stats(set.Surrogates[i].Values)
	})
	if err := errors.Join(errs...); err != nil {
		return nil, fmt.Errorf("regime: %w", err)
	}
	pr := Rank("nonlinear prediction error", pd, ps, Smaller)
	rr := Rank("time-reversal asymmetry", rd, rs, TwoSided)
	ev.Prediction, ev.Reversal = &pr, &rr
	if ev.Dimension != nil {
		ev.Cautions = append(ev.Cautions, ev.Dimension.Cautions...)
	}
	an.Verdict = Decide(ev)
	return an, nil
}

func maxOf(v []float64) float64 {
	m := math.Inf(-1)
	for _, x := range v {
		m = math.Max(m, x)
	}
	return m
}

// chaosVotes counts the chaos indicators of step 3: the 0-1 test (K ≥ 0.5), λ1 clearly above
// zero, and D2 saturating.
func chaosVotes(k float64, lyapPos, saturated bool) int {
	n := 0
	if !math.IsNaN(k) && k >= 0.5 {
		n++
	}
	if lyapPos {
		n++
	}
	if saturated {
		n++
	}
	return n
}

func chaosWhy(k float64, lyapPos, saturated bool) string {
	var w []string
	if !math.IsNaN(k) && k >= 0.5 {
		w = append(w, fmt.Sprintf("0-1 test K = %.2f", k))
	}
	if lyapPos {
		w = append(w, "λ1 > 0 with its interval")
	}
	if saturated {
		w = append(w, "D2 saturates")
	}
	return strings.Join(w, ", ")
}
