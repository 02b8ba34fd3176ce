package spectral

// Smooth reports whether every prime factor of n is at most p (n is "p-smooth"). gonum's
// mixed-radix FFT has fast butterflies for 2, 3, 4 and 5 and a generic pass for other factors
// whose cost grows with the factor, so smooth lengths keep a transform O(n log n). Smooth(1, p)
// is true; n < 1 is never smooth.
func Smooth(n, p int) bool {
	if n < 1 {
		return false
	}
	for d := 2; d <= p && d <= n; d++ {
		for n%d == 0 {
			n /= d
		}
	}
	return n == 1
}

// LengthAtLeast returns the smallest p-smooth length ≥ n (at least 1): the transform length
// for zero padding a record of n samples.
func LengthAtLeast(n, p int) int {
	for l := max(n, 1); ; l++ {
		if Smooth(l, p) {
			return l
		}
	}
}

// LengthAtMost returns the largest p-smooth length ≤ n: the transform length for truncating a
// record of n samples. A record whose own length qualifies is used whole; for n ≤ 1 it returns
// n.
func LengthAtMost(n, p int) int {
	for l := n; l > 1; l-- {
		if Smooth(l, p) {
			return l
		}
	}
	return n
}
