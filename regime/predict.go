package regime

import (
	"fmt"
	"math"

	"unfold/neighbors"
)

// PredictOptions configure PredictionError.
type PredictOptions struct {
	// Lag and Dim are the delay (samples) and embedding dimension.
	Lag, Dim int
	// Horizon is the prediction step in samples (0 means 1).
	Horizon int
	// Neighbors is the number of neighbours averaged (0 means 10).
	Neighbors int
	// Theiler excludes neighbours with |i − j| ≤ Theiler.
	Theiler int
	// References caps the number of points predicted, spread evenly over the record
	// (0 means 2000).
	References int
}

// PredictionError returns the normalised error of the locally constant predictor of x: each
// reference delay vector's future x_{i+(m−1)τ+h} is predicted by the mean future of its k
// nearest neighbours (maximum norm, Theiler window), and the root-mean-square error is divided
// by the standard deviation of x (1 means no better than predicting the mean). A deterministic
// signal predicts well; its surrogates, which keep only the linear correlations, do not.
//
// Reference: J. D. Farmer and J. J. Sidorowich (1987), "Predicting chaotic time series",
// Physical Review Letters 59, 845–848; used as a surrogate-test statistic as in Theiler et al.
// (1992) and Schreiber & Schmitz (2000).
func PredictionError(x []float64, opt PredictOptions) (float64, error) {
	if opt.Horizon <= 0 {
		opt.Horizon = 1
	}
	if opt.Neighbors <= 0 {
		opt.Neighbors = 10
	}
	if opt.References <= 0 {
		opt.References = 2000
	}
	if opt.Lag < 1 || opt.Dim < 1 {
		return 0, fmt.Errorf("prediction error: lag %d and dimension %d must be ≥ 1", opt.Lag, opt.Dim)
	}
	span := (opt.Dim - 1) * opt.Lag
	n := len(x) - opt.Horizon
	if n-span < 2*opt.Theiler+opt.Neighbors+10 {
		return 0, fmt.Errorf("prediction error: %d samples are too few for dimension %d, lag %d, horizon %d", len(x), opt.Dim, opt.Lag, opt.Horizon)
	}
	ix, err := neighbors.FromEmbedding(x[:n], opt.Lag, opt.Dim, neighbors.Max)
	if err != nil {
		return 0, fmt.Errorf("prediction error: %w", err)
	}
	_, v := meanVar(x)
	if v == 0 {
		return 0, fmt.Errorf("prediction error: the record is constant")
	}
	nv := ix.Len()
	step := max(1, nv/opt.References)
	s := ix.NewSearcher()
	q := make([]float64, opt.Dim)
	var nb []neighbors.Neighbor
	var sum float64
	count := 0
	for i := 0; i < nv; i += step {
		for k := range q {
			q[k] = x[i+k*opt.Lag]
		}
		nb = s.KNN(q, opt.Neighbors, neighbors.Query{Self: i, Theiler: opt.Theiler}, nb)
		if len(nb) == 0 {
			continue
		}
		var p float64
		for _, b := range nb {
			p += x[b.Index+span+opt.Horizon]
		}
		p /= float64(len(nb))
		d := x[i+span+opt.Horizon] - p
		sum += d * d
		count++
	}
	if count == 0 {
		return 0, fmt.Errorf("prediction error: no point has neighbours")
	}
	return math.Sqrt(sum/float64(count)) / math.Sqrt(v), nil
}
