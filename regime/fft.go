package regime

import (
	"math"
	"sync"
)

// maxFactor is the largest prime factor allowed in an FFT length: gonum's fftpack has fast
// butterflies for 2, 3, 4 and 5 and a generic pass for other factors whose cost grows with the
// factor, so lengths with only small factors keep every transform O(n log n).
const maxFactor = 7

// smooth reports whether every prime factor of n is at most maxFactor.
func smooth(n int) bool {
	if n < 1 {
		return false
	}
	for _, p := range []int{2, 3, 5, 7} {
		for n%p == 0 {
			n /= p
		}
	}
	return n == 1
}

// FFTLength returns the largest length ≤ n whose prime factors are all at most 7, so that the
// Fourier transforms of surrogate generation stay fast. Records whose own length qualifies
// (10⁴, 4096, 10⁵, …) are used whole.
func FFTLength(n int) int {
	for l := n; l > 1; l-- {
		if smooth(l) {
			return l
		}
	}
	return n
}

// fftLengthAtLeast returns the smallest length ≥ n whose prime factors are all at most 7.
func fftLengthAtLeast(n int) int {
	for l := max(n, 1); ; l++ {
		if smooth(l) {
			return l
		}
	}
}

// meanVar returns the mean and the (population) variance of x.
func meanVar(x []float64) (mean, variance float64) {
	if len(x) == 0 {
		return 0, 0
	}
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	for _, v := range x {
		d := v - mean
		variance += d * d
	}
	return mean, variance / float64(len(x))
}

// hann fills w with the periodic-free (symmetric) Hann window of len(w) points and returns
// the sum of its squares.
func hann(w []float64) float64 {
	n := len(w)
	var ss float64
	for i := range w {
		w[i] = 0.5 - 0.5*math.Cos(2*math.Pi*float64(i)/float64(n))
		ss += w[i] * w[i]
	}
	return ss
}

// parallelFor runs fn(i) for i in [0, n) on threads goroutines; progress, when not nil, is
// called with (done, n) from one goroutine at a time.
func parallelFor(n, threads int, progress func(done, total int), fn func(i int)) {
	next := make(chan int)
	done := make(chan struct{}, n)
	var wg sync.WaitGroup
	for range max(1, min(threads, n)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				fn(i)
				done <- struct{}{}
			}
		}()
	}
	go func() {
		for i := range n {
			next <- i
		}
		close(next)
	}()
	for k := 1; k <= n; k++ {
		<-done
		if progress != nil {
			progress(k, n)
		}
	}
	wg.Wait()
}
