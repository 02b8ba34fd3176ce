package analysis

import (
	"fmt"
	"strings"

	"unfold/lyapunov"
)

// RangeCheckJSON is the lyapunov stage's check of its fit range (lyapunov.RangeCheck): the
// growth over the range in nats, its length in steps, whether the divergence is bounded or the
// range unsure and why, the spread of λ1 across ε (per time unit), and the bootstrap interval
// over reference points, which "interval" replaces by the spread when the range is unsure.
type RangeCheckJSON struct {
	lyapunov.RangeCheck
	Bootstrap [2]float64 `json:"bootstrap_interval"`
	Widened   bool       `json:"widened"`
}

// checkRange checks the fit range of r and, when it is unsure, widens the interval of res to
// the spread across ε (the same interval regime.ExponentOf hands the verdict, so the page
// shows one λ1) and says so in a caution.
func checkRange(r *lyapunov.Result, res *LyapunovResult, dt float64) {
	rc := r.CheckRange()
	for _, v := range []float64{rc.Growth, rc.Spread[0], rc.Spread[1], r.Interval[0], r.Interval[1]} {
		if Finite(v) == nil {
			res.Cautions = append(res.Cautions, "the fit range could not be checked (a non-finite slope or interval)")
			return
		}
	}
	j := &RangeCheckJSON{RangeCheck: rc, Bootstrap: r.Interval}
	if j.Reasons == nil {
		j.Reasons = []string{}
	}
	res.RangeCheck = j
	why := strings.Join(rc.Reasons, "; ")
	switch {
	case rc.Unsure:
		j.Widened = true
		iv := rc.Spread
		ps := [2]float64{iv[0] * dt, iv[1] * dt}
		res.Interval, res.IntervalPerSample = &iv, &ps
		res.Cautions = append(res.Cautions, fmt.Sprintf("the fit range is unsure (%s): the interval is widened to the spread across ε, [%.4g, %.4g] per time unit, not only the bootstrap over reference points", why, iv[0], iv[1]))
	case rc.Bounded:
		res.Cautions = append(res.Cautions, "the divergence has no exponential range ("+why+"): λ1 is not evidence of chaos")
	}
}
