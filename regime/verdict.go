package regime

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"unfold/dimension"
	"unfold/embed"
	"unfold/fit"
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
	// Bounded is true when the estimate's own stage found no exponential range (the
	// divergence stays bounded; lyapunov.RangeCheck.Bounded): λ1 is then no evidence of chaos.
	Bounded bool
	// Unsure is true when the fit range was short, grew by less than one nat or depended on
	// ε (lyapunov.RangeCheck.Unsure); Why says why.
	Unsure bool
	Why    string
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
	// Used is true when the decision rule read the item; Why says what role it played or,
	// for an unused item, why it was not used.
	Used bool   `json:"used"`
	Why  string `json:"why"`
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
	// Alpha is the level of the rank tests (0 means 0.05). A test whose surrogate count
	// cannot reach it (one-sided: K ≥ 1/α − 1; two-sided: K ≥ 2/α − 1; Theiler & Prichard
	// 1996) is listed as unused.
	Alpha float64
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
	// Drift compares the spectra of the first and last thirds (SpectralDrift).
	Drift *Drift
	// Skipped lists the tests that could not be computed, as "name: reason"; Decide lists
	// them among the unused evidence.
	Skipped []string
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
	// DominantPeriod is the period (time units) of the strongest spectral line or, without
	// lines, of the strongest bin of the spectrum; 0 when there is none.
	DominantPeriod float64 `json:"dominant_period"`
	// Unused names the evidence items the rule did not use, each with the reason.
	Unused []string `json:"unused"`
}

// MinLineFraction is the share of the variance spectral lines must explain for a periodic or
// quasiperiodic verdict (judgement: lines that leave more than a tenth of the power broadband
// describe a noisy oscillation, not a periodic one).
const MinLineFraction = 0.9

// SurrogatesFor returns the fewest surrogates a rank test at level alpha needs:
// ⌈1/α⌉ − 1 one-sided and ⌈2/α⌉ − 1 two-sided (19 and 39 at 5 %, 99 one-sided at 1 %;
// Theiler & Prichard 1996, "Constrained-realization Monte-Carlo method for hypothesis
// testing", Physica D 94, 221).
func SurrogatesFor(alpha float64, side Side) int {
	k := 1 / alpha
	if side == TwoSided {
		k = 2 / alpha
	}
	return int(math.Ceil(k-1e-9)) - 1
}

// Decide applies the decision rule of the package comment to the evidence.
func Decide(ev *Evidence) *Verdict {
	alpha := ev.Alpha
	if alpha <= 0 {
		alpha = 0.05
	}
	v := &Verdict{Evidence: map[string]Item{}, Cautions: append([]string(nil), ev.Cautions...)}
	add := func(name string, it Item) {
		if math.IsNaN(it.Value) || math.IsInf(it.Value, 0) {
			it.Value, it.Used = 0, false
			it.Why = "the test produced no finite number"
		}
		v.Evidence[name] = it
	}
	const (
		support = "supporting evidence only: "
	)

	// Lines and the dominant cycle.
	lineKind := LineKind("")
	lineFrac := 0.0
	if l := ev.Lines; l != nil {
		lineKind, lineFrac = l.Kind, l.LineFraction
		v.DominantPeriod = dominantPeriod(l)
		it := Item{Value: l.LineFraction, Weight: 3, Used: true}
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
		if l.Kind != LinesBroadband && l.LineFraction < MinLineFraction {
			it.PointsTo = Stochastic + "|" + Chaotic + "|" + string(l.Kind)
			it.Why = fmt.Sprintf("the lines explain %.0f %% of the variance, less than the %.0f %% a %s verdict needs: a noisy oscillation", 100*l.LineFraction, 100*MinLineFraction, l.Kind)
		} else {
			it.Why = fmt.Sprintf("step 1: lines must explain at least %.0f %% of the variance for a periodic or quasiperiodic verdict", 100*MinLineFraction)
		}
		add("lines", it)
		if l.Kind != LinesBroadband && l.LineFraction < 0.95 {
			v.Cautions = append(v.Cautions, fmt.Sprintf("noise floor: %.0f %% of the power is broadband beside the lines", 100*(1-l.LineFraction)))
		}
	}
	if z := ev.ZeroOne; z != nil {
		it := Item{Value: z.K, Weight: 2, Detail: fmt.Sprintf("0-1 test K = %.3f (median over c, %d samples, subsampling step %d)", z.K, z.Samples, z.Subsample)}
		if z.K < 0.5 {
			it.PointsTo = Periodic + "|" + Quasiperiodic
		} else {
			it.PointsTo = Chaotic + "|" + Stochastic
		}
		it.Why = support + "K ≈ 1 also for noise, noisy oscillations and phase-diffusing signals (Gottwald & Melbourne 2009)"
		if z.Samples < 1000 {
			it.Why += fmt.Sprintf("; %d samples are too few for a reliable K", z.Samples)
		}
		add("zero_one", it)
	}
	// Rank tests: the level must be reachable with the surrogates at hand.
	predRej, tested := false, false
	if p := ev.Prediction; p != nil {
		need := SurrogatesFor(alpha, Smaller)
		it := Item{Value: p.Data, Weight: 3, Detail: fmt.Sprintf("prediction error %.3g against %d IAAFT surrogates %s: rank p = %.3g (one-sided, level %.2g), %.1f σ", p.Data, len(p.Surrogates), rangeString(p.Surrogates), p.P, alpha, p.Sigmas)}
		if len(p.Surrogates) < need {
			it.PointsTo = ""
			it.Why = fmt.Sprintf("%d surrogates cannot reach the one-sided level %.2g: a rank test needs at least %d (Theiler & Prichard 1996)", len(p.Surrogates), alpha, need)
		} else {
			tested, it.Used = true, true
			predRej = p.P <= alpha+1e-12
			switch {
			case predRej:
				it.PointsTo = Chaotic + "|" + Periodic + "|" + Quasiperiodic
				it.Why = "step 2: the nonlinear predictor beats the linear surrogates: deterministic structure"
			case maxOf(p.Surrogates) < 0.1:
				it.PointsTo = Periodic + "|" + Quasiperiodic
				it.Detail += "; the surrogates predict as well: the spectrum alone makes the signal predictable"
				it.Why = "step 2: the null is not rejected"
			default:
				it.PointsTo = Stochastic
				it.Why = "step 2: the null is not rejected"
			}
		}
		add("prediction_error", it)
	}
	revRej := false
	if r := ev.Reversal; r != nil {
		need := SurrogatesFor(alpha, TwoSided)
		it := Item{Value: r.Data, Weight: 1, Detail: fmt.Sprintf("time-reversal asymmetry %.3g against %d IAAFT surrogates %s: rank p = %.3g (two-sided, level %.2g), %.1f σ", r.Data, len(r.Surrogates), rangeString(r.Surrogates), r.P, alpha, r.Sigmas)}
		if len(r.Surrogates) < need {
			it.Why = fmt.Sprintf("%d surrogates cannot reach the two-sided level %.2g: a rank test needs at least %d (Theiler & Prichard 1996)", len(r.Surrogates), alpha, need)
		} else {
			revRej = r.P <= alpha+1e-12
			it.Why = support + "time irreversibility shows nonlinearity, not determinism (a nonlinear stochastic process is irreversible too)"
		}
		if revRej {
			it.PointsTo = Chaotic + "|" + Periodic + "|" + Quasiperiodic + "|" + Stochastic
		} else {
			it.PointsTo = Stochastic + "|" + Periodic + "|" + Quasiperiodic
		}
		add("time_reversal", it)
	}
	lyapPos, lyapNeg, lyapChaos := false, false, false
	if l := ev.Lyapunov; l != nil {
		// Growth below 1 % per delay time is indistinguishable from zero (judgement).
		small := 0.01 / (float64(max(ev.Lag, 1)) * math.Max(ev.Dt, 1e-300))
		lyapPos, lyapNeg = l.Lo > 0 && l.Value > small, l.Hi <= 0 || math.Abs(l.Value) <= small
		lyapChaos = lyapPos && !l.Bounded
		it := Item{Value: l.Value, Weight: 2, Used: true, Detail: fmt.Sprintf("largest Lyapunov exponent %.3g [%.3g, %.3g] nats per time unit", l.Value, l.Lo, l.Hi)}
		switch {
		case l.Bounded:
			it.PointsTo = Periodic + "|" + Quasiperiodic + "|" + Stochastic
			it.Detail += "; the divergence curve has no exponential range"
			if l.Why != "" {
				it.Detail += " (" + l.Why + ")"
			}
			it.Why = "step 3: bounded divergence is no evidence of chaos"
		case lyapPos:
			it.PointsTo = Chaotic + "|" + Stochastic // noise also gives positive estimates
			it.Why = "step 3: a positive λ1 with an exponential range"
		case lyapNeg:
			it.PointsTo = Periodic + "|" + Quasiperiodic
			it.Why = "step 3: λ1 is not positive"
		default:
			it.PointsTo = Periodic + "|" + Quasiperiodic + "|" + Chaotic
			it.Why = "step 3: λ1's interval includes zero"
		}
		if l.Unsure && !l.Bounded {
			it.Detail += "; the fit range is uncertain"
			if l.Why != "" {
				it.Detail += " (" + l.Why + ")"
			}
		}
		if math.IsNaN(l.Value) {
			it.Value = 0
			it.Detail = "no λ1: " + l.Why
		}
		add("lyapunov", it)
	}
	if d := ev.Dimension; d != nil {
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
		it.Why = support + "a finite D2 also appears for coloured noise (Osborne & Provenzale 1989, Physica D 35, 357)"
		add("correlation_dimension", it)
	}
	if ev.CaoNoiseLike != nil {
		it := Item{Value: ev.CaoE2Dev, Weight: 1, Detail: fmt.Sprintf("largest |E2(d) − 1| = %.3g (Cao 1997: ≈ 0 for noise)", ev.CaoE2Dev)}
		if *ev.CaoNoiseLike {
			it.PointsTo = Stochastic
		} else {
			it.PointsTo = Periodic + "|" + Quasiperiodic + "|" + Chaotic
		}
		it.Why = support + "E2 departs from 1 for coloured noise as well as for determinism"
		add("cao_e2", it)
	}
	drift := ev.Drift != nil && ev.Drift.Changed
	if d := ev.Drift; d != nil {
		// Weight 0: the item gates step 3 but does not vote for a regime.
		add("spectral_drift", Item{Value: d.Distance, Used: true, Detail: d.String(),
			Why: "step 3: a spectrum that moves between the thirds lets non-stationarity alone reject the surrogates"})
	}
	if drift {
		v.Cautions = append(v.Cautions, "non-stationary spectrum: "+ev.Drift.String()+"; a chirp, a drifting rhythm or a change of regime: surrogate tests and the exponent assume a stationary record")
	}

	// The decision rule (package comment).
	chaosEvidence := predRej && lyapChaos
	// Lines that explain most of the variance yield only to a firm exponent: a mean growth
	// rate without a stable exponential stretch is also what a phase-diffusing oscillation
	// gives.
	firmChaos := chaosEvidence && !ev.Lyapunov.Unsure
	// A saturated D2 near 1 on an oversampled record is a closed curve: a noisy limit cycle.
	// A chaotic flow needs D2 > 2 (judgement: below 1.5 the cycle is not in doubt). Maps
	// (lag 1) are exempt: the logistic map's chaotic attractor has D2 ≈ 1.
	cycleD2 := ev.Lag > 1 && ev.Dimension != nil && ev.Dimension.Saturated && ev.Dimension.D2 < 1.5
	cycle := ""
	if v.DominantPeriod > 0 {
		cycle = fmt.Sprintf("; dominant cycle: period %.4g time units", v.DominantPeriod)
		if lineKind != "" && lineKind != LinesBroadband {
			cycle += fmt.Sprintf(" (%.0f %% of the variance in lines)", 100*lineFrac)
		}
	}
	switch {
	case (lineKind == LinesPeriodic || lineKind == LinesQuasiperiodic) && lineFrac >= MinLineFraction && !firmChaos:
		v.Regime = string(lineKind)
		v.Rule = fmt.Sprintf("1: lines explained by %s carry %.0f %% of the variance (at least %.0f %%), and no firm chaos evidence (rejected null with a stable exponential divergence) contradicts",
			map[bool]string{true: "one fundamental", false: "incommensurate fundamentals"}[lineKind == LinesPeriodic], 100*lineFrac, 100*MinLineFraction)
	case !tested:
		v.Regime = Undetermined
		v.Rule = "2: no prediction test against enough surrogates was run, so noise cannot be excluded"
	case !predRej:
		v.Regime = Stochastic
		v.Rule = "2: the nonlinear prediction does not beat the IAAFT surrogates (a linear Gaussian process seen through a static monotone function): no evidence of low-dimensional determinism"
		if revRej {
			v.Rule += "; time reversal does reject the linear null: a nonlinear stochastic process or a noisy nonlinear oscillation"
		}
		v.Rule += cycle
	case drift:
		v.Regime = Undetermined
		v.Rule = "3: the null is rejected, but the spectrum changes between the first and last thirds: non-stationarity alone rejects stationary surrogates" + cycle
	case chaosEvidence && cycleD2:
		v.Regime = Undetermined
		v.Rule = fmt.Sprintf("3: the null is rejected and λ1 > 0, but D2 saturates at %.2f: a closed curve, as for a noisy or phase-diffusing limit cycle; a chaotic flow needs D2 > 2", ev.Dimension.D2) + cycle
	case chaosEvidence && ev.Lyapunov.Unsure && ev.Dimension != nil && !ev.Dimension.Saturated:
		// Neither number is firm: an exponent that depends on the fit choices and a D2 that
		// keeps growing with m are what a high-dimensional or nonlinear stochastic signal gives
		// too; low-dimensional chaos needs at least one of them settled.
		v.Regime = Undetermined
		v.Rule = "3: the null is rejected (nonlinear structure) and λ1 > 0, but λ1's fit range is uncertain and D2 does not saturate: low-dimensional chaos is not established" + cycle
	case chaosEvidence:
		v.Regime = Chaotic
		v.Rule = "3: the nonlinear prediction beats the surrogates and λ1 > 0 with an exponential range of the divergence"
	default:
		v.Regime = Undetermined
		why := "λ1 was not estimated"
		if l := ev.Lyapunov; l != nil {
			switch {
			case l.Bounded:
				why = "the divergence curve has no exponential range"
			case lyapNeg:
				why = "λ1 is not positive"
			default:
				why = "λ1's interval includes zero"
			}
		}
		v.Rule = "3: the null is rejected (deterministic structure), but " + why + ": chaos is not established" + cycle
	}
	if lineKind != "" && lineKind != LinesBroadband && ev.ZeroOne != nil && ev.ZeroOne.K >= 0.5 {
		v.Cautions = append(v.Cautions, fmt.Sprintf("the spectrum has lines but the 0-1 test gives K = %.2f: weakly chaotic, noisy or phase-diffusing motion", ev.ZeroOne.K))
	}
	if ev.Lyapunov != nil && ev.Lyapunov.Unsure && !ev.Lyapunov.Bounded {
		v.Cautions = append(v.Cautions, "the λ1 fit range is uncertain: "+ev.Lyapunov.Why)
	}
	// Confidence: the weighted share of the evidence that supports the regime.
	var agree, total float64
	names := make([]string, 0, len(v.Evidence))
	for name, it := range v.Evidence {
		names = append(names, name)
		if it.PointsTo == "" {
			continue
		}
		total += it.Weight
		if strings.Contains("|"+it.PointsTo+"|", "|"+v.Regime+"|") {
			agree += it.Weight
		}
	}
	slices.Sort(names)
	v.Unused = []string{}
	for _, name := range names {
		if it := v.Evidence[name]; !it.Used {
			v.Unused = append(v.Unused, name+": "+it.Why)
		}
	}
	for _, s := range ev.Skipped {
		v.Unused = append(v.Unused, s+" (not computed)")
	}
	if total > 0 && v.Regime != Undetermined {
		v.Confidence = agree / total
	}
	if ev.N < 2000 {
		v.Confidence *= 0.8
		v.Cautions = append(v.Cautions, fmt.Sprintf("too short: %d samples; surrogate tests and dimension estimates need a few thousand", ev.N))
	}
	if !ev.Stationary || drift {
		v.Confidence *= 0.9
	}
	v.Confidence = math.Round(v.Confidence*1000) / 1000
	if v.Cautions == nil {
		v.Cautions = []string{}
	}
	return v
}

// dominantPeriod returns 1/f of the strongest line, or of the strongest non-zero bin of the
// spectrum when there are no lines; 0 when there is no spectrum.
func dominantPeriod(l *Lines) float64 {
	if len(l.Peaks) > 0 && l.Peaks[0].Freq > 0 {
		return 1 / l.Peaks[0].Freq
	}
	if sp := l.Spectrum; sp != nil && len(sp.Power) > 2 {
		top := 1
		for i := 2; i < len(sp.Power); i++ {
			if sp.Power[i] > sp.Power[top] {
				top = i
			}
		}
		if sp.Freq[top] > 0 {
			return 1 / sp.Freq[top]
		}
	}
	return 0
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
	// Surrogates is the number of IAAFT surrogates (0 means DefaultSurrogates).
	Surrogates int
	// Alpha is the level of the rank tests (0 means 0.05).
	Alpha float64
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

// DefaultSurrogates is the default number of IAAFT surrogates: 39, the fewest for the
// two-sided time-reversal test at 5 % (Theiler & Prichard 1996); the one-sided prediction
// test then reaches p = 0.025, so a rejection at 5 % does not hang on the single most extreme
// surrogate and the verdict is steadier across seeds.
const DefaultSurrogates = 39

// Analysis is the outcome of Analyze: the verdict and everything it was decided from.
type Analysis struct {
	Verdict  *Verdict
	Evidence *Evidence
	// LagMethod, DimMethod say how the embedding was chosen ("given" when set).
	LagMethod, DimMethod string
	// Surrogates is the IAAFT set used by the tests.
	Surrogates *SurrogateSet
}

// Analyze gathers the evidence for x sampled every dt and decides the regime. Records of 48
// samples or more get an answer: a test the record is too short for is listed in
// Evidence.Skipped (and among the verdict's unused evidence) with the reason.
func Analyze(x []float64, dt float64, opt Options) (*Analysis, error) {
	if dt <= 0 {
		dt = 1
	}
	if len(x) < 48 {
		return nil, fmt.Errorf("regime: %d samples: need at least 48", len(x))
	}
	if err := series.CheckVariable(x); err != nil {
		return nil, fmt.Errorf("regime: %w", err)
	}
	if opt.Surrogates <= 0 {
		opt.Surrogates = DefaultSurrogates
	}
	if opt.MaxAnalysis <= 0 {
		opt.MaxAnalysis = 20000
	}
	threads := max(opt.Threads, 1)
	ev := &Evidence{N: len(x), Dt: dt, Lyapunov: opt.Lyapunov, Stationary: true, Alpha: opt.Alpha}
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
			ev.Cautions = append(ev.Cautions, lc.Cautions...)
		}
		if ev.Theiler <= 0 {
			ev.Theiler = embed.DefaultTheiler(lc.ACF)
		}
	}
	if opt.Embedding == nil {
		dc, err = embed.ChooseDimension(xa, embed.DimOptions{Lag: ev.Lag, Theiler: ev.Theiler, MaxDim: 8, Threads: threads})
	}
	if err != nil {
		ev.Skipped = append(ev.Skipped, "cao_e2: "+err.Error())
	} else if dc != nil {
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
			ev.Cautions = append(ev.Cautions, dc.Cautions...)
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
	skip := func(name string, err error) { ev.Skipped = append(ev.Skipped, name+": "+err.Error()) }
	if l, err := LineAnalysis(x, dt, LineOptions{}); err == nil {
		ev.Lines = l
	} else {
		skip("lines", err)
	}
	// Spectra of the first and last thirds.
	if d, err := SpectralDrift(x, dt); err == nil {
		ev.Drift = d
	} else {
		skip("spectral_drift", err)
	}
	// 0-1 test, subsampled by the delay for flows.
	if z, err := ZeroOne(x, ZeroOneOptions{Subsample: sub, Seed: opt.Seed}); err == nil {
		ev.ZeroOne = z
	} else {
		skip("zero_one", err)
	}
	// Largest Lyapunov exponent.
	if ev.Lyapunov == nil && !opt.NoLyapunov {
		r, err := lyapunov.Divergence(xa, lyapunov.Options{Lag: ev.Lag, Dim: ev.Dim, Theiler: ev.Theiler, Dt: dt, Seed: opt.Seed, Threads: threads})
		switch {
		case err == nil && r != nil && !math.IsNaN(r.Lambda):
			ev.Lyapunov = ExponentOf(r)
			// Agreement across m: the estimate at m + 1 must agree within 25 % (judgement, as
			// for ε in lyapunov.CheckRange); otherwise the exponent is uncertain and its
			// interval is widened to cover both.
			if e := ev.Lyapunov; !e.Bounded && ev.Dim < 10 {
				r2, err := lyapunov.Divergence(xa, lyapunov.Options{Lag: ev.Lag, Dim: ev.Dim + 1, Theiler: ev.Theiler, Dt: dt, Seed: opt.Seed, Threads: threads})
				if err == nil && !math.IsNaN(r2.Lambda) && math.Abs(r2.Lambda-r.Lambda) > 0.25*math.Abs(r.Lambda) {
					e.Unsure = true
					e.Lo, e.Hi = math.Min(e.Lo, r2.Lambda), math.Max(e.Hi, r2.Lambda)
					if e.Why != "" {
						e.Why += "; "
					}
					e.Why += fmt.Sprintf("λ1 = %.3g at m = %d but %.3g at m = %d", r.Lambda, ev.Dim, r2.Lambda, ev.Dim+1)
				}
			}
		case r != nil && errors.Is(err, fit.ErrNoRange):
			ev.Lyapunov = &Exponent{Value: math.NaN(), Lo: math.NaN(), Hi: math.NaN(), Bounded: true, Why: err.Error()}
		case err != nil:
			skip("lyapunov", err)
		}
	}
	// Correlation dimension.
	maxDim := min(max(ev.Dim+3, 5), 8)
	// D2 from at most 10⁴ samples: enough for dimensions up to 2·log10(10⁴) = 8 (Eckmann &
	// Ruelle 1992), at a quarter of the pair-counting cost of 2·10⁴.
	if opt.Dimension != nil {
		ev.Dimension = opt.Dimension
	} else if opt.NoDimension {
		ev.Skipped = append(ev.Skipped, "correlation_dimension: the correlation-dimension estimate gave no answer")
	} else if d, err := dimension.CorrelationDimension(xa[:min(len(xa), 10000)], dimension.Options{Lag: ev.Lag, MaxDim: maxDim, Theiler: ev.Theiler, Seed: opt.Seed, Threads: threads}); err == nil {
		ev.Dimension = d
	} else {
		skip("correlation_dimension", err)
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

// ExponentOf turns a divergence estimate into the verdict's λ1: the value, its interval
// widened to the spread across ε when the fit range is uncertain (lyapunov.RangeCheck), and
// whether the divergence has an exponential range at all.
func ExponentOf(r *lyapunov.Result) *Exponent {
	rc := r.CheckRange()
	e := &Exponent{Value: r.Lambda, Lo: r.Interval[0], Hi: r.Interval[1], Bounded: rc.Bounded, Unsure: rc.Unsure, Why: strings.Join(rc.Reasons, "; ")}
	if rc.Unsure {
		e.Lo, e.Hi = rc.Spread[0], rc.Spread[1]
	}
	return e
}

func maxOf(v []float64) float64 {
	m := math.Inf(-1)
	for _, x := range v {
		m = math.Max(m, x)
	}
	return m
}
