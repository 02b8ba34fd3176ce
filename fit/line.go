// Package fit holds the numerics that more than one estimator of unfold needs: an ordinary
// least-squares line with the standard errors of its coefficients, the automatic detection of a
// linear (scaling) range in a curve, and bootstrap percentile intervals.
//
// The package exists because the same three steps end every curve-reading estimator: the
// largest Lyapunov exponent is the slope of a divergence curve over its linear range, the
// correlation dimension the slope of log C(r) against log r over its scaling range, and both
// need an interval that does not come from the regression alone. Reading the range by eye is
// the step users get wrong most often, so it is done here once, with one stated criterion (see
// ScalingRange).
//
// References:
//   - N. R. Draper and H. Smith (1998), Applied Regression Analysis, 3rd ed., Wiley, ch. 1
//     (least squares, standard errors of the coefficients).
//   - B. Efron and R. J. Tibshirani (1993), An Introduction to the Bootstrap, Chapman & Hall,
//     ch. 13 (percentile intervals).
package fit

import (
	"errors"
	"fmt"
	"math"
)

// Line is a straight line y = Intercept + Slope·x fitted by ordinary least squares, with the
// usual standard errors of its coefficients (residual variance on N−2 degrees of freedom).
// With N = 2 points the standard errors are zero and meaningless.
type Line struct {
	Slope, Intercept     float64
	SlopeSE, InterceptSE float64 // standard errors of Slope and Intercept
	R2                   float64 // coefficient of determination (1 when the points are collinear)
	N                    int     // points in the fit
}

// At returns the line's value at x.
func (l Line) At(x float64) float64 { return l.Intercept + l.Slope*x }

// ErrDegenerate reports a fit that has no unique line: fewer than two points, or all x equal.
var ErrDegenerate = errors.New("fit: fewer than two distinct x values")

// LeastSquares fits y = a + b·x to the points (x[i], y[i]) by ordinary least squares.
// x and y must have the same length and finite values. The sums are centred first (two-pass),
// so the result is accurate when the x values are large and close together.
func LeastSquares(x, y []float64) (Line, error) {
	if len(x) != len(y) {
		return Line{}, fmt.Errorf("fit: %d x values but %d y values", len(x), len(y))
	}
	n := len(x)
	if n < 2 {
		return Line{}, ErrDegenerate
	}
	var mx, my float64
	for i := range n {
		if math.IsNaN(x[i]) || math.IsInf(x[i], 0) || math.IsNaN(y[i]) || math.IsInf(y[i], 0) {
			return Line{}, fmt.Errorf("fit: point %d (%g, %g) is not finite", i, x[i], y[i])
		}
		mx += x[i]
		my += y[i]
	}
	mx /= float64(n)
	my /= float64(n)
	var sxx, sxy, syy float64
	for i := range n {
		dx, dy := x[i]-mx, y[i]-my
		sxx += dx * dx
		sxy += dx * dy
		syy += dy * dy
	}
	if sxx == 0 {
		return Line{}, ErrDegenerate
	}
	b := sxy / sxx
	a := my - b*mx
	l := Line{Slope: b, Intercept: a, N: n, R2: 1}
	var ssr float64
	for i := range n {
		r := y[i] - a - b*x[i]
		ssr += r * r
	}
	if syy > 0 {
		l.R2 = 1 - ssr/syy
	}
	if n > 2 {
		s2 := ssr / float64(n-2)
		l.SlopeSE = math.Sqrt(s2 / sxx)
		l.InterceptSE = math.Sqrt(s2 * (1/float64(n) + mx*mx/sxx))
	}
	return l, nil
}

// slope returns the least-squares slope of the points x[lo:hi], y[lo:hi] without allocating,
// or NaN when a value is not finite or all x are equal. It is the local slope of ScalingRange.
func slope(x, y []float64, lo, hi int) float64 {
	n := float64(hi - lo)
	var mx, my float64
	for i := lo; i < hi; i++ {
		mx += x[i]
		my += y[i]
	}
	mx /= n
	my /= n
	var sxx, sxy float64
	for i := lo; i < hi; i++ {
		dx := x[i] - mx
		sxx += dx * dx
		sxy += dx * (y[i] - my)
	}
	b := sxy / sxx
	if math.IsInf(b, 0) || math.IsNaN(b) || sxx == 0 {
		return math.NaN()
	}
	return b
}
