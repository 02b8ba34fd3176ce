package regime

import (
	"sync"

	"unfold/internal/workers"
)

// maxFactor is the largest prime factor allowed in the FFT lengths of this package (surrogates,
// line analysis, 0-1 test): gonum's fftpack has fast butterflies for 2, 3, 4 and 5 and a generic
// pass for other factors whose cost grows with the factor, so lengths with only small factors
// keep every transform O(n log n) (spectral.Smooth).
const maxFactor = 7

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

// parallelFor runs fn(i) for i in [0, n) on threads goroutines; progress, when not nil, is
// called with (done, n) from one goroutine at a time.
func parallelFor(n, threads int, progress func(done, total int), fn func(i int)) {
	next := make(chan int)
	done := make(chan struct{}, n)
	var wg sync.WaitGroup
	var guard workers.Guard
	for range max(1, min(threads, n)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next { // drained even after a panic, so every item is counted
				if !guard.Failed() {
					guard.Run(func() { fn(i) })
				}
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
	guard.Repanic()
}
