// Package embed reconstructs a state space from one scalar record by delay embedding
// (Takens 1981, "Detecting strange attractors in turbulence", LNM 898; Packard, Crutchfield,
// Farmer & Shaw 1980, "Geometry from a time series", PRL 45, 712) and chooses its two
// parameters with published criteria:
//
//   - the lag from the first significant minimum of the mutual information (Fraser & Swinney
//     1986, "Independent coordinates for strange attractors from mutual information", PRA 33,
//     1134), estimated with equiprobable bins or with the k-nearest-neighbour estimator of
//     Kraskov, Stögbauer & Grassberger (2004, "Estimating mutual information", PRE 69, 066138),
//     with the autocorrelation (first zero, 1/e decay) beside it;
//   - the dimension from false nearest neighbours (Kennel, Brown & Abarbanel 1992,
//     "Determining embedding dimension for phase-space reconstruction using a geometrical
//     construction", PRA 45, 3403) and Cao's E1/E2 (Cao 1997, "Practical method for
//     determining the minimum embedding dimension of a scalar time series", Physica D 110, 43);
//   - the Theiler window (Theiler 1986, "Spurious dimension from correlation algorithms
//     applied to limited time-series data", PRA 34, 2427) from the autocorrelation time, with
//     the space–time separation plot (Provenzale, Smith, Vio & Murante 1992, "Distinguishing
//     between low-dimensional dynamics and randomness in measured time series", Physica D 58,
//     31) to check it.
//
// The figures of these curves and of the state-space picture are in plot.go: they belong to
// the nouns of this package, and the report package reuses them, so they live here rather than
// in a separate plotting package.
package embed

import (
	"errors"
	"fmt"
)

// Embedding is a delay embedding of a scalar record as a view: vector i is
// (X[i], X[i+Lag], …, X[i+(Dim−1)·Lag]) and nothing is copied until Dense is called.
// There are Len() = len(X) − (Dim−1)·Lag vectors.
type Embedding struct {
	X   []float64 // the scalar record
	Lag int       // delay between coordinates, in samples (≥ 1)
	Dim int       // embedding dimension (≥ 1)
}

// New returns the embedding of x with the given lag and dimension, checking that at least one
// vector exists.
func New(x []float64, lag, dim int) (Embedding, error) {
	e := Embedding{X: x, Lag: lag, Dim: dim}
	if err := e.Validate(); err != nil {
		return Embedding{}, err
	}
	return e, nil
}

// ErrTooShort reports a record too short for the requested embedding.
var ErrTooShort = errors.New("record too short for the embedding")

// Validate checks that the lag and dimension are positive and that at least one vector exists.
func (e Embedding) Validate() error {
	if e.Lag < 1 {
		return fmt.Errorf("embed: lag %d must be at least 1", e.Lag)
	}
	if e.Dim < 1 {
		return fmt.Errorf("embed: dimension %d must be at least 1", e.Dim)
	}
	if e.Len() < 1 {
		return fmt.Errorf("embed: %d samples give no vector at lag %d, dimension %d (need more than %d): %w",
			len(e.X), e.Lag, e.Dim, (e.Dim-1)*e.Lag, ErrTooShort)
	}
	return nil
}

// Len returns the number of delay vectors, len(X) − (Dim−1)·Lag (0 when negative).
func (e Embedding) Len() int {
	n := len(e.X) - (e.Dim-1)*e.Lag
	if n < 0 {
		return 0
	}
	return n
}

// Span returns (Dim−1)·Lag, the number of samples a vector reaches beyond its first one.
func (e Embedding) Span() int { return (e.Dim - 1) * e.Lag }

// At returns coordinate k (0 ≤ k < Dim) of vector i (0 ≤ i < Len()), that is X[i+k·Lag].
func (e Embedding) At(i, k int) float64 { return e.X[i+k*e.Lag] }

// Vector writes vector i into dst (grown when shorter than Dim) and returns dst[:Dim].
func (e Embedding) Vector(i int, dst []float64) []float64 {
	if cap(dst) < e.Dim {
		dst = make([]float64, e.Dim)
	}
	dst = dst[:e.Dim]
	for k := range dst {
		dst[k] = e.X[i+k*e.Lag]
	}
	return dst
}

// Dense returns the vectors as a row-major Len()×Dim matrix (a copy of Len()·Dim values).
func (e Embedding) Dense() []float64 {
	n := e.Len()
	out := make([]float64, n*e.Dim)
	for i := 0; i < n; i++ {
		row := out[i*e.Dim : (i+1)*e.Dim]
		for k := range row {
			row[k] = e.X[i+k*e.Lag]
		}
	}
	return out
}
