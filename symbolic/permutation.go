package symbolic

import (
	"fmt"
	"math"
)

// MaxOrder is the largest permutation-entropy order (10! = 3 628 800 patterns).
const MaxOrder = 10

// Permutation is the permutation entropy of a numeric series (Bandt & Pompe 2002).
type Permutation struct {
	// Order is D, the number of samples in a pattern; Delay is the spacing of the samples.
	Order int `json:"order"`
	Delay int `json:"delay"`
	// Patterns is the number of windows counted, N − (D−1)·Delay.
	Patterns int `json:"patterns"`
	// Bits is H(D) = −Σ p(π) log2 p(π) over the ordinal patterns π.
	Bits float64 `json:"bits"`
	// Normalized is H(D)/log2(D!), 1 for white noise.
	Normalized float64 `json:"normalized"`
	// PerSymbol is H(D)/(D−1) in bits, which tends to the entropy rate of a piecewise-monotone
	// interval map as D grows (Bandt, Keller & Pompe 2002, Nonlinearity 15, 1595), slowly.
	PerSymbol float64 `json:"per_symbol"`
	// Observed is the number of different patterns seen; Forbidden = D! − Observed.
	Observed  int `json:"observed"`
	Forbidden int `json:"forbidden"`
	// Counts[i] is the number of windows with pattern index i (see PatternIndex).
	Counts []int64 `json:"-"`
}

// PatternIndex returns the index in [0, D!) of the ordinal pattern of w (D = len(w) ≤
// MaxOrder): the Lehmer code of the ranks, where rank r_j counts the samples of w smaller than
// w[j], equal values ranked by time (the earlier is the smaller, Bandt & Pompe 2002). Index 0 is
// the increasing pattern and D!−1 the decreasing one.
func PatternIndex(w []float64) int {
	d := len(w)
	idx := 0
	for j := 0; j < d; j++ {
		// number of later samples that are smaller than w[j] (inversions)
		inv := 0
		for i := j + 1; i < d; i++ {
			if w[i] < w[j] {
				inv++
			}
		}
		idx = idx*(d-j) + inv
	}
	return idx
}

// PermutationEntropy returns the permutation entropy of order d (2 ≤ d ≤ MaxOrder) of x with
// sample spacing delay ≥ 1.
func PermutationEntropy(x []float64, d, delay int) (*Permutation, error) {
	if d < 2 || d > MaxOrder {
		return nil, fmt.Errorf("permutation entropy: order %d must be between 2 and %d", d, MaxOrder)
	}
	if delay < 1 {
		return nil, fmt.Errorf("permutation entropy: delay %d must be at least 1", delay)
	}
	nw := len(x) - (d-1)*delay
	if nw < 1 {
		return nil, fmt.Errorf("permutation entropy: %d samples give no pattern of order %d at delay %d", len(x), d, delay)
	}
	for i, v := range x {
		if math.IsNaN(v) {
			return nil, fmt.Errorf("permutation entropy: sample %d is NaN", i)
		}
	}
	fact := 1
	for i := 2; i <= d; i++ {
		fact *= i
	}
	counts := make([]int64, fact)
	w := make([]float64, d)
	for t := 0; t < nw; t++ {
		for j := range w {
			w[j] = x[t+j*delay]
		}
		counts[PatternIndex(w)]++
	}
	p := &Permutation{Order: d, Delay: delay, Patterns: nw, Counts: counts}
	p.Bits = EntropyNats(counts, Plugin) / math.Ln2
	p.Normalized = p.Bits / math.Log2(float64(fact))
	p.PerSymbol = p.Bits / float64(d-1)
	for _, c := range counts {
		if c > 0 {
			p.Observed++
		}
	}
	p.Forbidden = fact - p.Observed
	return p, nil
}
