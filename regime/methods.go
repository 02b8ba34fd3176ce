package regime

// IAAFTSurrogates returns count surrogates of x by the iterative amplitude-adjusted Fourier
// transform of T. Schreiber and A. Schmitz (1996), "Improved surrogate data for nonlinearity
// tests", Physical Review Letters 77, 635–638: each keeps the data's values exactly and their
// periodogram closely, by alternating between imposing the Fourier amplitudes and the sorted
// values until the rank order no longer changes. It is Surrogates with Method IAAFT (the method
// constant of the same name) and the other options at their zero values (at most 200
// iterations, the longest leading segment whose length has prime factors ≤ 7, one thread).
func IAAFTSurrogates(x []float64, count int, seed uint64) (*SurrogateSet, error) {
	return Surrogates(x, SurrogateOptions{Method: IAAFT, Count: count, Seed: seed})
}

// AAFTSurrogates returns count amplitude-adjusted Fourier-transform surrogates of x (J. Theiler,
// S. Eubank, A. Longtin, B. Galdrikian and J. D. Farmer 1992, "Testing for nonlinearity in time
// series: the method of surrogate data", Physica D 58, 77–94): the data's values exactly and,
// approximately, their periodogram. It is Surrogates with Method AAFT and the other options at
// their zero values.
func AAFTSurrogates(x []float64, count int, seed uint64) (*SurrogateSet, error) {
	return Surrogates(x, SurrogateOptions{Method: AAFT, Count: count, Seed: seed})
}

// PhaseSurrogates returns count random-phase (Fourier-transform) surrogates of x (Theiler et
// al. 1992, "Testing for nonlinearity in time series: the method of surrogate data"): the
// periodogram and the mean exactly, with independent uniform Fourier phases. It is Surrogates
// with Method Phase and the other options at their zero values.
func PhaseSurrogates(x []float64, count int, seed uint64) (*SurrogateSet, error) {
	return Surrogates(x, SurrogateOptions{Method: Phase, Count: count, Seed: seed})
}
