package partition

import (
	"fmt"
	"math"
	"slices"
	"sort"
)

// Partition cuts real values into K = len(Thresholds)+1 symbols: symbol k means a value v with
// Thresholds[k−1] ≤ v < Thresholds[k] (−∞ and +∞ at the ends).
type Partition struct {
	// Kind is "search", "critical", "quantile" or "threshold".
	Kind string
	// Thresholds are the strictly increasing cut values.
	Thresholds []float64
	// Score is the fraction of symbolic false nearest neighbours (see SFNN); lower is better,
	// 0 when every symbolic neighbour is also a state-space neighbour. NaN when not scored.
	Score float64
	// EntropyRate is the entropy-rate estimate of the symbols in bits per symbol (NaN when not
	// scored).
	EntropyRate float64
}

// Criterion names what Partition.Score measures.
const Criterion = "symbolic false nearest neighbour fraction (Kennel & Buhl 2003); lower is better"

// K returns the alphabet size.
func (p *Partition) K() int { return len(p.Thresholds) + 1 }

// Symbol returns the symbol of v.
func (p *Partition) Symbol(v float64) uint8 {
	return uint8(sort.Search(len(p.Thresholds), func(i int) bool { return p.Thresholds[i] > v }))
}

// Apply writes the symbols of x into dst (grown as needed) and returns it.
func (p *Partition) Apply(x []float64, dst []uint8) []uint8 {
	dst = slices.Grow(dst[:0], len(x))[:len(x)]
	if len(p.Thresholds) == 1 {
		c := p.Thresholds[0]
		for i, v := range x {
			if v >= c {
				dst[i] = 1
			} else {
				dst[i] = 0
			}
		}
		return dst
	}
	for i, v := range x {
		dst[i] = p.Symbol(v)
	}
	return dst
}

// MaxAlphabet is the largest alphabet a partition makes.
const MaxAlphabet = 62

// Threshold returns the partition at the given cut values (sorted here; they must be finite
// and distinct).
func Threshold(thresholds []float64) (*Partition, error) {
	if len(thresholds) < 1 || len(thresholds) >= MaxAlphabet {
		return nil, fmt.Errorf("partition: %d thresholds; want 1 to %d", len(thresholds), MaxAlphabet-1)
	}
	th := slices.Clone(thresholds)
	slices.Sort(th)
	for i, v := range th {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("partition: threshold %v is not a finite number", v)
		}
		if i > 0 && th[i-1] == v {
			return nil, fmt.Errorf("partition: threshold %v is given twice", v)
		}
	}
	return &Partition{Kind: "threshold", Thresholds: th, Score: math.NaN(), EntropyRate: math.NaN()}, nil
}

// Quantile returns the partition of x into k equally populated symbols: the cuts are the
// sample quantiles j/k, j = 1 … k−1.
func Quantile(x []float64, k int) (*Partition, error) {
	if k < 2 || k > MaxAlphabet {
		return nil, fmt.Errorf("partition: alphabet size %d; want 2 to %d", k, MaxAlphabet)
	}
	if len(x) < k {
		return nil, fmt.Errorf("partition: %d values cannot fill %d symbols", len(x), k)
	}
	s := slices.Clone(x)
	slices.Sort(s)
	th := make([]float64, 0, k-1)
	for j := 1; j < k; j++ {
		v := quantileSorted(s, float64(j)/float64(k))
		if len(th) > 0 && v <= th[len(th)-1] {
			return nil, fmt.Errorf("partition: the %d-quantiles of the values are not distinct (too many repeated values for %d symbols)", k, k)
		}
		th = append(th, v)
	}
	return &Partition{Kind: "quantile", Thresholds: th, Score: math.NaN(), EntropyRate: math.NaN()}, nil
}

// quantileSorted returns the q-quantile of sorted s by linear interpolation between order
// statistics.
func quantileSorted(s []float64, q float64) float64 {
	pos := q * float64(len(s)-1)
	i := int(pos)
	if i >= len(s)-1 {
		return s[len(s)-1]
	}
	f := pos - float64(i)
	return s[i] + f*(s[i+1]-s[i])
}
