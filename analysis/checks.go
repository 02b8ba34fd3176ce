package analysis

import (
	"unfold/embed"
)

// MinVectorsPerDim is the number of delay vectors per dimension an embedding needs before
// any stage can estimate anything in it: 10·m vectors (common practice: a handful of
// neighbours per point in each direction).
const MinVectorsPerDim = 10

// SamplesFor returns the samples an embedding of dimension dim at lag lag needs: the span
// (dim−1)·lag of one delay vector plus MinVectorsPerDim·dim vectors.
func SamplesFor(dim, lag int) int {
	if lag < 1 {
		lag = 1
	}
	return (dim-1)*lag + MinVectorsPerDim*dim
}

// CheckEmbedding validates a given lag, dimension and Theiler window against a record of n
// samples (0 lag or dimension: chosen, not checked; the lag is taken as 1 when the dimension
// is checked before the lag is chosen). It returns a usage error that names the flag and the
// allowed range.
func CheckEmbedding(n, lag, dim, theiler int) error {
	if lag < 0 {
		return Usagef("--lag %d: want at least 1 (or 0 to choose it)", lag)
	}
	if dim < 0 {
		return Usagef("--dim %d: want at least 1 (or 0 to choose it)", dim)
	}
	if theiler < embed.TheilerAuto {
		return Usagef("--theiler %d: want -1 (chosen), 0 (none) or a positive window in samples", theiler)
	}
	if n <= 0 {
		return nil
	}
	if lag > n/2 {
		return Usagef("--lag %d: want at most %d (half of this record's %d samples)", lag, n/2, n)
	}
	if dim > 0 {
		l := max(lag, 1)
		if need := SamplesFor(dim, l); need > n {
			return Usagef("--dim %d needs at least %d samples at lag %d; this record has %d", dim, need, l, n)
		}
	}
	if theiler > 0 && theiler >= n/2 {
		return Usagef("--theiler %d: want less than %d (half of this record's %d samples)", theiler, n/2, n)
	}
	return nil
}

// CheckThreads validates a worker count given on the command line.
func CheckThreads(n int) error {
	if n < 1 {
		return Usagef("--threads %d: want at least 1", n)
	}
	return nil
}

// CheckFraction validates a value that must lie strictly between 0 and 1 (a significance,
// a horizon fraction…), naming its flag.
func CheckFraction(flag string, v float64) error {
	if !(v > 0 && v < 1) {
		return Usagef("--%s %g: want a value between 0 and 1 (exclusive)", flag, v)
	}
	return nil
}
