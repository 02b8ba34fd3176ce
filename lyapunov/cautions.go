package lyapunov

import (
	"fmt"
	"math"
)

// cautions fills r.Cautions with the warning signs of a divergence estimate.
func (r *Result) cautions(o Options) {
	ch := &r.Curves[r.Chosen]
	y := ch.MeanLog
	// Too few points for the embedding: Eckmann & Ruelle (1992) argue that exponents from N
	// points are trustworthy only when roughly log10 N exceeds the attractor dimension (from
	// memory; the dimension is at most m, so m is the conservative stand-in).
	if lg := math.Log10(float64(r.Vectors)); lg < float64(r.Dim) {
		r.Cautions = append(r.Cautions, fmt.Sprintf(
			"N = %d delay vectors may be too few for dimension %d: Eckmann & Ruelle (1992) argue that exponents from data need roughly log10 N > D (here log10 N = %.1f; D ≤ m)",
			r.Vectors, r.Dim, lg))
	}
	// Saturation at the first step.
	if len(y) > 1 && !math.IsNaN(y[0]) && !math.IsNaN(y[1]) {
		top := math.Inf(-1)
		for _, v := range y {
			if !math.IsNaN(v) {
				top = math.Max(top, v)
			}
		}
		r.FirstStepRise, r.TotalRise = y[1]-y[0], top-y[0]
		if r.TotalRise > 0 && r.FirstStepRise > 0.5*r.TotalRise {
			r.Cautions = append(r.Cautions, fmt.Sprintf(
				"the divergence curve saturates at the first step (%.2f of its total rise of %.2f nats happens between step 0 and 1): noise, or too large a lag, not deterministic divergence",
				r.FirstStepRise, r.TotalRise))
		}
	}
	if r.Repeats {
		r.Cautions = append(r.Cautions, r.repeatsText())
		return
	}
	if ch.FitErr == nil {
		if ch.Fit.Plateau && r.AutoRange && (r.From != 1 || r.To != r.Horizon) {
			r.Cautions = append(r.Cautions, fmt.Sprintf(
				"no stable stretch of the divergence curve raises the separation by a factor e within the %d steps, though the curve as a whole does rise: the slope is the mean growth over its rising part, steps %d…%d (up to 70 %% of its rise); the exponent is uncertain",
				r.Horizon, r.From, r.To))
		} else if ch.Fit.Plateau && r.AutoRange {
			r.Cautions = append(r.Cautions, fmt.Sprintf(
				"no stable stretch of the divergence curve raises the separation by a factor e: the separation stays bounded over the %d steps (periodic or quasiperiodic motion, noise, or a horizon too short for exponential growth to show — try a longer --horizon), so the slope is the mean growth over steps %d…%d and is expected near 0 for bounded motion%s",
				r.Horizon, r.From, r.To, map[bool]string{true: "; a positive slope is no evidence of chaos, so the interval reaches down to 0", false: ""}[r.LambdaPerSample > 0]))
		}
		if n := r.To - r.From; n < 4 {
			r.Cautions = append(r.Cautions, fmt.Sprintf(
				"the fit range spans only %d steps (%d…%d): the slope is poorly determined", n, r.From, r.To))
		}
		if r.Bootstrap.Reps > 0 && r.IntervalPerSample[0] <= 0 && r.LambdaPerSample > 0 {
			r.Cautions = append(r.Cautions, fmt.Sprintf(
				"the exponent is not significantly positive: the %.0f%% interval [%.4g, %.4g] per sample includes 0",
				100*r.Level, r.IntervalPerSample[0], r.IntervalPerSample[1]))
		}
	}
	if r.Method == Kantz && len(r.Curves) > 1 {
		r.epsCautions()
	}
}

// repeatsText says what the bound of an exactly repeating record means.
func (r *Result) repeatsText() string {
	ch := &r.Curves[r.Chosen]
	return fmt.Sprintf("periodic orbit: the neighbours of %d of the %d reference points repeat exactly (distance 0 at every one of the %d steps), so the divergence does not grow and λ1 is not positive: λ1 ≤ 0, reported as its upper bound 0 with the interval [0, 0] (distance 0 is drawn at the record's resolution, %.3g). A stable periodic orbit of a map has λ1 < 0, which a record lying exactly on its orbit cannot measure",
		ch.Repeating, ch.References, r.Horizon, r.Resolution)
}

// epsCautions warns when the Kantz curves depend on ε: their slopes differ by more than 25 %
// of the median (or some ε has no linear range while others do), or the curves for different ε
// have merged (spread below half the initial one) by the end of the fit range, i.e. the initial
// neighbourhood size is forgotten (noise; deterministic curves stay nearly parallel over their
// linear range; common practice after Kantz 1994).
func (r *Result) epsCautions() {
	lo, hi := math.Inf(1), math.Inf(-1)
	n, missing := 0, 0
	for _, s := range r.EpsSlopes {
		if math.IsNaN(s) {
			missing++
			continue
		}
		n++
		lo, hi = math.Min(lo, s), math.Max(hi, s)
	}
	med := r.LambdaPerSample
	switch {
	case n >= 2 && hi-lo > 0.25*math.Abs(med)+1e-12:
		r.Cautions = append(r.Cautions, fmt.Sprintf(
			"the slope depends strongly on ε: from %.4g to %.4g per sample over ε = %.3g … %.3g (noise or a poorly resolved attractor)",
			lo, hi, r.Curves[0].Eps, r.Curves[len(r.Curves)-1].Eps))
	case n >= 1 && missing > 0:
		r.Cautions = append(r.Cautions, fmt.Sprintf(
			"the slope depends strongly on ε: %d of the %d radii give no linear range", missing, len(r.Curves)))
	}
	// Spread of S over ε at step 0 and at the end of the fit range.
	spread := func(k int) float64 {
		a, b := math.Inf(1), math.Inf(-1)
		for _, c := range r.Curves {
			if k < len(c.MeanLog) && !math.IsNaN(c.MeanLog[k]) {
				a, b = math.Min(a, c.MeanLog[k]), math.Max(b, c.MeanLog[k])
			}
		}
		return b - a
	}
	s0 := spread(0)
	if s0 < 1e-9 {
		r.Cautions = append(r.Cautions, fmt.Sprintf(
			"the radii ε do not differ in effect: every ε holds the same %d nearest neighbours; give smaller --eps or a larger neighbour cap to see the ε dependence",
			r.MaxNeighbors))
		return
	}
	end := 1
	if r.Curves[r.Chosen].FitErr == nil {
		end = max(r.To, 1)
	}
	if s1 := spread(end); s1 < 0.5*s0 {
		r.Cautions = append(r.Cautions, fmt.Sprintf(
			"the divergence depends strongly on ε: the curves for different ε merge by step %d (their spread falls from %.2f to %.2f nats): the initial neighbourhood size is forgotten, as for noise",
			end, s0, s1))
	}
}

// RangeCheck is the check of an automatic fit range of a divergence curve: whether the range
// shows exponential growth at all, and how far the slope moves across the choices the
// estimate depends on.
type RangeCheck struct {
	// Growth is the rise of the chosen curve over the fit range, in nats (S(To) − S(From)
	// on the fitted line).
	Growth float64 `json:"growth"`
	// Steps is the length of the fit range in steps (To − From).
	Steps int `json:"steps"`
	// Bounded is true when the divergence curve has no exponential range: after the first
	// step (where measurement noise is resolved) it rises by less than one nat over the whole
	// horizon, or the fitted line rises by less than half a nat. λ1 is then not evidence of
	// exponential divergence.
	Bounded bool `json:"bounded"`
	// Unsure is true when the range is short (< 4 steps), rises by less than one nat, is no
	// stable stretch (a mean growth rate), or the slope differs across ε by more than 25 % of
	// its value.
	Unsure bool `json:"unsure"`
	// Reasons says in words why the range is bounded or unsure.
	Reasons []string `json:"reasons"`
	// Spread is the interval of λ1 (per time unit) widened to cover the slopes of every ε
	// that has a range as well as the bootstrap interval.
	Spread [2]float64 `json:"spread"`
}

// CheckRange checks the fit range of r (common practice after Kantz 1994, "A robust method to
// estimate the maximal Lyapunov exponent of a time series", Phys. Lett. A 185, 77, and
// Rosenstein, Collins & De Luca 1993, Physica D 65, 117: the exponent is read only where the
// curves for different ε are parallel straight lines over a range of real growth). The
// one-nat, half-nat, four-step and 25 % limits are judgement.
func (r *Result) CheckRange() RangeCheck {
	rc := RangeCheck{Spread: r.Interval}
	if r.Chosen < 0 || r.Chosen >= len(r.Curves) {
		rc.Bounded = true
		rc.Reasons = []string{"no divergence curve"}
		return rc
	}
	ch := &r.Curves[r.Chosen]
	if ch.FitErr != nil {
		rc.Bounded = true
		rc.Reasons = append(rc.Reasons, "no linear range: "+ch.FitErr.Error())
		return rc
	}
	if r.Repeats {
		rc.Bounded = true
		rc.Steps = r.To - r.From
		rc.Reasons = []string{r.repeatsText()}
		return rc
	}
	rc.Steps = r.To - r.From
	rc.Growth = ch.Fit.Line.Slope * float64(rc.Steps)
	// The rise after the first step: a jump at step 1 is measurement noise being resolved.
	later := r.TotalRise - math.Max(r.FirstStepRise, 0)
	switch {
	case later < 1:
		rc.Bounded = true
		if r.TotalRise > 0 && r.FirstStepRise > 0.5*r.TotalRise {
			rc.Reasons = append(rc.Reasons, fmt.Sprintf("the divergence curve saturates at the first step (%.2f of %.2f nats): noise, not deterministic divergence", r.FirstStepRise, r.TotalRise))
		} else {
			rc.Reasons = append(rc.Reasons, fmt.Sprintf("the separation grows by only %.2f nats after the first step over the whole horizon: the divergence stays bounded", later))
		}
	case rc.Growth < 0.5:
		rc.Bounded = true
		rc.Reasons = append(rc.Reasons, fmt.Sprintf("the separation grows by only %.2f nats over the fit range (steps %d…%d): no exponential range", rc.Growth, r.From, r.To))
	case rc.Growth < 1:
		rc.Unsure = true
		rc.Reasons = append(rc.Reasons, fmt.Sprintf("the separation grows by %.2f nats over the fit range, less than one", rc.Growth))
	}
	if ch.Fit.Plateau && !rc.Bounded {
		rc.Unsure = true
		rc.Reasons = append(rc.Reasons, "no stable stretch of the divergence curve: the slope is a mean growth rate")
	}
	if rc.Steps < 4 {
		rc.Unsure = true
		rc.Reasons = append(rc.Reasons, fmt.Sprintf("the fit range spans only %d steps", rc.Steps))
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	dt := r.Dt
	if dt <= 0 {
		dt = 1
	}
	for _, s := range r.EpsSlopes {
		if !math.IsNaN(s) {
			lo, hi = math.Min(lo, s/dt), math.Max(hi, s/dt)
		}
	}
	if hi >= lo {
		rc.Spread = [2]float64{math.Min(rc.Spread[0], lo), math.Max(rc.Spread[1], hi)}
		if hi-lo > 0.25*math.Abs(r.Lambda)+1e-12 {
			rc.Unsure = true
			rc.Reasons = append(rc.Reasons, fmt.Sprintf("the slope depends on ε: %.4g … %.4g per time unit", lo, hi))
		}
	}
	if rc.Reasons == nil {
		rc.Reasons = []string{}
	}
	return rc
}
