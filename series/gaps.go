package series

import "fmt"

// Gap policies of ReadOptions.Gaps.
const (
	gapsRefuse = ""
	gapsDrop   = "drop"
	gapsLinear = "linear"
)

// checkGaps validates a ReadOptions.Gaps value.
func checkGaps(policy, path string) error {
	switch policy {
	case gapsRefuse, gapsDrop, gapsLinear:
		return nil
	}
	return &InputError{Path: path, Msg: fmt.Sprintf("unknown --gaps value %q: use drop or linear (or leave it out to refuse gaps)", policy)}
}

// gapFiller collects values and fills gaps (NaN, ±Inf or empty cells) by the chosen policy:
// "drop" leaves them out, "linear" interpolates between the neighbouring valid values and
// repeats the nearest valid value before the first and after the last one.
type gapFiller struct {
	policy   string
	vals     []float64
	pending  int // gaps waiting for the next valid value (linear)
	filled   int
	haveLast bool
	last     float64
}

// push appends v, doubling the capacity when it is full (fewer bytes allocated over a long
// read than append's gentler growth of large slices).
func (g *gapFiller) push(v float64) {
	if len(g.vals) == cap(g.vals) {
		nv := make([]float64, len(g.vals), 2*cap(g.vals)+1024)
		copy(nv, g.vals)
		g.vals = nv
	}
	g.vals = append(g.vals, v)
}

// value appends a valid sample.
func (g *gapFiller) value(v float64) {
	if g.pending > 0 {
		if g.haveLast {
			step := (v - g.last) / float64(g.pending+1)
			for k := 1; k <= g.pending; k++ {
				g.push(g.last + step*float64(k))
			}
		} else {
			for k := 0; k < g.pending; k++ {
				g.push(v)
			}
		}
		g.pending = 0
	}
	g.push(v)
	g.last, g.haveLast = v, true
}

// gap records a missing sample; the caller has checked that the policy allows gaps.
func (g *gapFiller) gap() {
	g.filled++
	if g.policy == gapsLinear {
		g.pending++
	}
}

// finish fills trailing gaps and returns the values.
func (g *gapFiller) finish() []float64 {
	if g.pending > 0 && g.haveLast {
		for k := 0; k < g.pending; k++ {
			g.push(g.last)
		}
	}
	g.pending = 0
	return g.vals
}

// gapHint is the advice appended to a gap error.
const gapHint = "give --gaps drop or --gaps linear to fill gaps"
