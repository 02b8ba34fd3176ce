package dimension

import "math"

// Takens returns the Takens maximum-likelihood estimate of the correlation dimension from the
// correlation sum c[k] at the increasing radii[k], using the radii up to radii[top] as the
// upper cut-off r0 (F. Takens 1985, "On the numerical determination of the dimension of an
// attractor", Lecture Notes in Mathematics 1125, 99–106): D = C(r0) / ∫_0^{r0} C(r) d ln r.
// The integral is taken by the trapezoid rule in ln r over the given radii from the smallest
// radius r1 with a non-zero sum, and below r1 by the power-law tail C(r1)/D, which gives
// D = (C(r0) − C(r1)) / ∫_{r1}^{r0} C d ln r. It returns NaN when that integral is not
// positive (no pairs up to r0). CorrelationDimension reports it at the top of the scaling
// range of each curve (Curve.Takens).
func Takens(radii, c []float64, top int) float64 {
	logr := make([]float64, top+1)
	for k := range logr {
		logr[k] = math.Log(radii[k])
	}
	return takens(logr, c, top)
}
