package denoise

import (
	"fmt"

	"gonum.org/v1/gonum/mat"
)

// MaxPolyOrder is the largest detrending polynomial order accepted.
const MaxPolyOrder = 30

// PolyDetrend removes from x the least-squares polynomial of the given order in the sample
// index and returns the residual and the fitted trend. The polynomial is fitted in the basis
// of Legendre polynomials of t = 2i/(n−1) − 1 ∈ [−1, 1] (well conditioned for every order up to
// MaxPolyOrder) by a QR least-squares solve (gonum/mat); an exact polynomial of that order is
// removed to round-off. Order 0 removes the mean, order 1 a straight line.
func PolyDetrend(x []float64, order int) (residual, trend []float64, err error) {
	n := len(x)
	if order < 0 || order > MaxPolyOrder {
		return nil, nil, fmt.Errorf("%w: polynomial order %d, want 0 … %d", ErrInput, order, MaxPolyOrder)
	}
	if n <= order {
		return nil, nil, fmt.Errorf("%w: a polynomial of order %d needs more than %d samples, got %d", ErrInput, order, order, n)
	}
	p := order + 1
	a := mat.NewDense(n, p, nil)
	row := make([]float64, p)
	for i := 0; i < n; i++ {
		legendre(tOf(i, n), row)
		a.SetRow(i, row)
	}
	var qr mat.QR
	qr.Factorize(a)
	var c mat.Dense
	if err := qr.SolveTo(&c, false, mat.NewDense(n, 1, append([]float64(nil), x...))); err != nil {
		return nil, nil, fmt.Errorf("polynomial detrend of order %d: %w", order, err)
	}
	coef := c.RawMatrix().Data
	residual = make([]float64, n)
	trend = make([]float64, n)
	for i := 0; i < n; i++ {
		var s float64
		for k, v := range a.RawRowView(i) {
			s += coef[k] * v
		}
		trend[i] = s
		residual[i] = x[i] - s
	}
	return residual, trend, nil
}

// tOf maps sample index i of n to [−1, 1].
func tOf(i, n int) float64 {
	if n <= 1 {
		return 0
	}
	return 2*float64(i)/float64(n-1) - 1
}

// legendre fills p with P_0(t) … P_{len(p)−1}(t) by Bonnet's recurrence
// (k+1)P_{k+1} = (2k+1) t P_k − k P_{k−1}.
func legendre(t float64, p []float64) {
	p[0] = 1
	if len(p) > 1 {
		p[1] = t
	}
	for k := 1; k+1 < len(p); k++ {
		p[k+1] = (float64(2*k+1)*t*p[k] - float64(k)*p[k-1]) / float64(k+1)
	}
}
