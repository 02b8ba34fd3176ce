package partition

import (
	"fmt"
	"math"
)

// Record says whether a signal is map-like (one sample per iteration) or flow-like (a sampled
// continuous trajectory).
type Record struct {
	// Kind is "map" or "flow".
	Kind string `json:"kind"`
	// R1 is the autocorrelation at lag 1.
	R1 float64 `json:"r1"`
	// Lag is the chosen embedding lag the decision used (samples).
	Lag int `json:"lag"`
	// Reason says in words why.
	Reason string `json:"reason"`
}

// FlowR1 is the lag-1 autocorrelation from which a record with a chosen lag of at least 2 is
// taken as a sampled flow (common practice: a flow sampled finely enough to embed is smooth
// from sample to sample; a chaotic map decorrelates in a step or two).
const FlowR1 = 0.8

// DecideRecord decides from the data whether x is map-like or flow-like: flow-like when the
// lag-1 autocorrelation is at least FlowR1 and the chosen lag is at least 2, map-like otherwise.
func DecideRecord(x []float64, lag int) Record {
	r1 := lag1(x)
	rec := Record{R1: r1, Lag: lag}
	if r1 >= FlowR1 && lag >= 2 {
		rec.Kind = "flow"
		rec.Reason = fmt.Sprintf("flow-like: autocorrelation %.3f at lag 1 (≥ %.1f) and chosen lag %d (≥ 2): successive samples are close, so symbols are cut at Poincaré-section crossings", r1, FlowR1, lag)
	} else {
		rec.Kind = "map"
		rec.Reason = fmt.Sprintf("map-like: autocorrelation %.3f at lag 1 and chosen lag %d (a flow needs ≥ %.1f and ≥ 2): symbols are cut sample by sample", r1, lag, FlowR1)
	}
	return rec
}

func lag1(x []float64) float64 {
	n := len(x)
	if n < 3 {
		return math.NaN()
	}
	var m float64
	for _, v := range x {
		m += v
	}
	m /= float64(n)
	var c0, c1 float64
	for i, v := range x {
		d := v - m
		c0 += d * d
		if i+1 < n {
			c1 += d * (x[i+1] - m)
		}
	}
	if c0 == 0 {
		return math.NaN()
	}
	return c1 / c0
}
