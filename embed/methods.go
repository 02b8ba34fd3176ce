package embed

// FalseNeighbors returns the false-nearest-neighbour fraction in dimensions m = 1 … MaxDim at
// the lag and Theiler window of opt: M. B. Kennel, R. Brown and H. D. I. Abarbanel (1992),
// "Determining embedding dimension for phase-space reconstruction using a geometrical
// construction", Physical Review A 45, 3403. It is the scan of ChooseDimension (which also
// gives Cao's E1/E2 from the same neighbour search); use that when both are wanted.
func FalseNeighbors(x []float64, opt DimOptions) ([]FNNPoint, error) {
	c, err := ChooseDimension(x, opt)
	if err != nil {
		return nil, err
	}
	return c.FNN, nil
}

// Cao returns Cao's E1(d) and E2(d), d = 1 … MaxDim−1, at the lag and Theiler window of opt:
// L. Cao (1997), "Practical method for determining the minimum embedding dimension of a scalar
// time series", Physica D 110, 43. It is the scan of ChooseDimension (which also gives the
// false-neighbour fractions from the same neighbour search); use that when both are wanted.
func Cao(x []float64, opt DimOptions) ([]CaoPoint, error) {
	c, err := ChooseDimension(x, opt)
	if err != nil {
		return nil, err
	}
	return c.Cao, nil
}
