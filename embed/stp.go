package embed

import (
	"fmt"
	"math"
	"slices"

	"unfold/neighbors"
)

// STPOptions set the space–time separation plot.
type STPOptions struct {
	// MaxDt is the largest time separation, in samples; 0 means 4× the default Theiler window
	// chosen by the caller, or 200 when that is not known — the command passes it.
	MaxDt int
	// Steps is the number of separations sampled in 1 … MaxDt; 0 means min(MaxDt, 100).
	Steps int
	// Fractions are the contour levels: for each separation, the distance below which that
	// fraction of pairs lies; nil means 0.01, 0.1, 0.25, 0.5, 0.75, 0.9.
	Fractions []float64
	// MaxPairs caps the pairs per separation (evenly spaced in time); 0 means 50000.
	MaxPairs int
	// Norm is the distance (Euclidean by default).
	Norm neighbors.Norm
}

// STP is a space–time separation plot (Provenzale, Smith, Vio & Murante 1992, Physica D 58,
// 31): for each time separation Δt, the distances ||v_i − v_{i+Δt}|| of the delay vectors
// summarised by quantile contours. Where the contours stop rising (or start oscillating
// around a level) temporal correlation no longer dominates the neighbourhoods: a Theiler
// window must reach at least that far.
type STP struct {
	Dt        []int       // time separations in samples
	Fractions []float64   // contour levels
	Dist      [][]float64 // Dist[f][k]: the Fractions[f] quantile of the distances at Dt[k]
	Pairs     int         // pairs per separation at most
}

// SpaceTimeSeparation computes the plot for the embedding e.
func SpaceTimeSeparation(e Embedding, opt STPOptions) (*STP, error) {
	if err := e.Validate(); err != nil {
		return nil, err
	}
	n := e.Len()
	maxDt := opt.MaxDt
	if maxDt <= 0 {
		maxDt = 200
	}
	maxDt = min(maxDt, n/2)
	if maxDt < 1 {
		return nil, fmt.Errorf("space-time separation: %d vectors are too few: %w", n, ErrTooShort)
	}
	steps := opt.Steps
	if steps <= 0 {
		steps = min(maxDt, 100)
	}
	fr := opt.Fractions
	if fr == nil {
		fr = []float64{0.01, 0.1, 0.25, 0.5, 0.75, 0.9}
	}
	for _, f := range fr {
		if !(f > 0 && f < 1) {
			return nil, fmt.Errorf("space-time separation: fraction %v outside (0, 1)", f)
		}
	}
	maxPairs := opt.MaxPairs
	if maxPairs <= 0 {
		maxPairs = 50000
	}
	s := &STP{Fractions: slices.Clone(fr), Dist: make([][]float64, len(fr))}
	prev := 0
	for k := 1; k <= steps; k++ {
		dt := int(math.Round(float64(k) * float64(maxDt) / float64(steps)))
		if dt <= prev {
			continue
		}
		prev = dt
		s.Dt = append(s.Dt, dt)
	}
	d := make([]float64, 0, min(n, maxPairs))
	for _, dt := range s.Dt {
		avail := n - dt
		stride := max(1, (avail+maxPairs-1)/maxPairs)
		d = d[:0]
		for i := 0; i < avail; i += stride {
			var acc float64
			for c := 0; c < e.Dim; c++ {
				u := e.X[i+c*e.Lag] - e.X[i+dt+c*e.Lag]
				if opt.Norm == neighbors.Max {
					acc = math.Max(acc, math.Abs(u))
				} else {
					acc += u * u
				}
			}
			if opt.Norm != neighbors.Max {
				acc = math.Sqrt(acc)
			}
			d = append(d, acc)
		}
		s.Pairs = max(s.Pairs, len(d))
		slices.Sort(d)
		for f, q := range fr {
			pos := q * float64(len(d)-1)
			lo := int(pos)
			hi := min(lo+1, len(d)-1)
			s.Dist[f] = append(s.Dist[f], d[lo]+(pos-float64(lo))*(d[hi]-d[lo]))
		}
	}
	return s, nil
}
