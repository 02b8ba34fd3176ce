package lyapunov

// KantzExponent estimates the largest Lyapunov exponent of x by the method of H. Kantz (1994),
// "A robust method to estimate the maximal Lyapunov exponent of a time series", Physics Letters
// A 185, 77–87: for every reference point, the logarithm of the mean distance Δn steps later to
// all its neighbours within ε, averaged over reference points, one curve per ε; the slope of the
// linear range is λ_max. It is Divergence with opt.Method set to Kantz (the method constant of
// the same name); every other option keeps its meaning and default.
func KantzExponent(x []float64, opt Options) (*Result, error) {
	opt.Method = Kantz
	return Divergence(x, opt)
}

// RosensteinExponent estimates the largest Lyapunov exponent of x by the method of M. T.
// Rosenstein, J. J. Collins & C. J. De Luca (1993), "A practical method for calculating largest
// Lyapunov exponents from small data sets", Physica D 65, 117–134: for every reference point,
// the logarithm of the distance Δn steps later to its nearest neighbour outside the Theiler
// window, averaged over reference points; the slope of the linear range is λ_max. It is
// Divergence with opt.Method set to Rosenstein (the method constant of the same name).
func RosensteinExponent(x []float64, opt Options) (*Result, error) {
	opt.Method = Rosenstein
	return Divergence(x, opt)
}
