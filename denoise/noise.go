package denoise

import (
	"fmt"
	"math"

	"unfold/neighbors"
)

// noiseRefs is the largest number of reference points of the noise estimate.
const noiseRefs = 1000

// NoiseEstimate is the noise level read from the local covariances of the delay vectors.
type NoiseEstimate struct {
	// Sigma is the estimated standard deviation of the measurement noise, in signal units.
	Sigma float64
	// Eps is the neighbourhood radius chosen from it (EpsFactor·Sigma).
	Eps float64
	// Steps are the radii tried and the estimates they gave, in order.
	Steps []NoiseStep
	// Rule says how it was computed, in words.
	Rule string
	// Cautions are plain-words warnings.
	Cautions []string
}

// NoiseStep is one step of the fixed-point search of EstimateNoise.
type NoiseStep struct {
	Eps   float64 `json:"eps"`
	Sigma float64 `json:"sigma"`
	// Used is the number of reference points with enough neighbours.
	Used int `json:"used"`
}

// EstimateNoise estimates the noise level of x for the embedding and manifold dimension of
// opt (defaults as in Reduce) and the radius ε = EpsFactor·σ̂ Reduce would use.
//
// Rule (our own, stated; the idea that measurement noise fills the directions transverse to
// the local manifold isotropically with variance σ² is that of Grassberger et al. 1993): for up
// to 1000 evenly spaced reference vectors, the covariance of the ε-neighbourhood is
// diagonalised and the mean of its m−q smallest eigenvalues taken; σ̂ is the square root of the
// median of these over the references with at least max(MinNeighbors, 2m) neighbours. Starting from
// ε = std/4 (std the record's standard deviation), ε is replaced by EpsFactor·σ̂ until it changes
// by less than 2 % or would grow (at most 16 steps). On clean deterministic data the transverse
// variance comes only from curvature, so ε shrinks until neighbourhoods become too sparse
// (fewer than half the references with enough neighbours); the radius is then bisected
// geometrically between the sparse and the last good radius down to a ratio of 1.1, and the
// smallest radius with enough neighbours is kept.
func EstimateNoise(x []float64, opt Options) (*NoiseEstimate, error) {
	o, err := opt.resolve(len(x))
	if err != nil {
		return nil, err
	}
	ix, err := neighbors.FromEmbedding(x, o.Lag, o.Dim, o.norm())
	if err != nil {
		return nil, fmt.Errorf("denoise: %w", err)
	}
	return estimateNoise(ix, x, o)
}

func estimateNoise(ix *neighbors.Index, x []float64, o Options) (*NoiseEstimate, error) {
	var mean, ss float64
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	std := math.Sqrt(ss / float64(len(x)))
	if std == 0 {
		return nil, fmt.Errorf("%w: the record is constant: nothing to reduce", ErrInput)
	}
	nv := ix.Len()
	nref := min(nv, noiseRefs)
	m := o.Dim
	wk := newWorker(ix, m, 1)
	minNb := max(o.MinNeighbors, 2*m) // a covariance needs enough points, whatever the method
	vals := make([]float64, 0, nref)
	est := func(eps float64) (float64, int) {
		vals = vals[:0]
		for r := 0; r < nref; r++ {
			i := int(int64(r) * int64(nv) / int64(nref))
			if wk.neighbourhood(ix, i, eps, o.Theiler, nil) < minNb || !wk.eigen(m) {
				continue
			}
			var s float64
			for k := 0; k < m-o.Q; k++ {
				s += max(wk.w[k], 0)
			}
			vals = append(vals, s/float64(m-o.Q))
		}
		if len(vals)*2 < nref {
			return 0, len(vals)
		}
		return math.Sqrt(median(vals)), len(vals)
	}
	ne := &NoiseEstimate{Rule: fmt.Sprintf("median over %d reference vectors of the rms spread in the %d least-variance directions of their ε-neighbourhoods, ε iterated to ε = %g·σ̂ from std/4", nref, m-o.Q, o.EpsFactor)}
	eps := std / 4
	good := 0.0   // smallest radius with enough neighbours so far
	sparse := 0.0 // largest radius found too sparse below good
	var goodSigma float64
	for step := 0; step < 16; step++ {
		sigma, used := est(eps)
		ne.Steps = append(ne.Steps, NoiseStep{Eps: eps, Sigma: sigma, Used: used})
		if used*2 < nref {
			if good == 0 {
				if eps >= std {
					break
				}
				eps = min(2*eps, std) // too sparse from the start: widen
				continue
			}
			// too sparse: bisect (geometrically) towards the last good radius
			sparse = eps
			if good/sparse < 1.1 {
				break
			}
			eps = math.Sqrt(good * sparse)
			continue
		}
		good, goodSigma = eps, sigma
		next := min(o.EpsFactor*sigma, std)
		if sparse > 0 {
			// between a sparse and a good radius: keep bisecting unless the rule asks for more
			if next >= eps {
				break
			}
			if good/sparse < 1.1 {
				break
			}
			eps = max(next, math.Sqrt(good*sparse))
			continue
		}
		if next <= 0 || math.Abs(next-eps) < 0.02*eps {
			break
		}
		if next > eps {
			// the estimate grew (the radius truncated the noise): accept the larger radius
			good, eps = next, next
			if sigma2, used2 := est(eps); used2*2 >= nref {
				ne.Steps = append(ne.Steps, NoiseStep{Eps: eps, Sigma: sigma2, Used: used2})
				goodSigma = sigma2
			}
			break
		}
		eps = next
	}
	if good == 0 {
		return nil, fmt.Errorf("%w: no radius up to the standard deviation gives %d neighbours for half the reference points: the record is too short for m = %d", ErrInput, minNb, m)
	}
	ne.Sigma, ne.Eps = goodSigma, good
	if last := ne.Steps[len(ne.Steps)-1]; last.Used*2 < nref {
		ne.Cautions = append(ne.Cautions, fmt.Sprintf("the noise estimate stopped at ε = %.4g where neighbourhoods became sparse: the record may be nearly noise-free, or too short for m = %d", good, m))
	}
	return ne, nil
}
