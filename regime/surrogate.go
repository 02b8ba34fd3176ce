package regime

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"slices"
	"sync"

	"gonum.org/v1/gonum/dsp/fourier"

	"unfold/spectral"

	"unfold/internal/workers"
)

// Method is a way of generating surrogate data.
type Method int

// The surrogate methods. Each keeps a property of the data and randomises the rest, so that
// the surrogates realise a null hypothesis:
//   - Phase (Theiler et al. 1992): the periodogram |X_k|² exactly and the mean; the Fourier
//     phases are replaced by independent uniform ones. Null: a stationary linear Gaussian
//     process.
//   - AAFT (Theiler et al. 1992): the sorted values exactly and, approximately, the
//     periodogram: the data are mapped to a Gaussian of the same ranks, phase-randomised and
//     mapped back by rank. Null: a linear Gaussian process seen through a static monotone
//     function.
//   - IAAFT (Schreiber & Schmitz 1996): the same null as AAFT, with the periodogram matched
//     far more closely by alternating between imposing the data's Fourier amplitudes and the
//     data's sorted values until the rank order no longer changes.
const (
	Phase Method = iota + 1
	AAFT
	IAAFT
)

// String returns the method's name as used on the command line: phase, aaft or iaaft.
func (m Method) String() string {
	switch m {
	case Phase:
		return "phase"
	case AAFT:
		return "aaft"
	case IAAFT:
		return "iaaft"
	}
	return fmt.Sprintf("Method(%d)", int(m))
}

// ParseMethod returns the Method named by s (phase, aaft or iaaft).
func ParseMethod(s string) (Method, error) {
	switch s {
	case "phase", "ft":
		return Phase, nil
	case "aaft":
		return AAFT, nil
	case "iaaft":
		return IAAFT, nil
	}
	return 0, fmt.Errorf("unknown surrogate method %q (want phase, aaft or iaaft)", s)
}

// SurrogateOptions configure Surrogates. The zero value is not valid: Method and Count must be
// set.
type SurrogateOptions struct {
	// Method is Phase, AAFT or IAAFT.
	Method Method
	// Count is the number of surrogates (K). For a rank test at level α, K = 1/α − 1 for a
	// one-sided and 2/α − 1 for a two-sided test (19 and 39 at 5 %; Theiler et al. 1992,
	// Schreiber & Schmitz 2000).
	Count int
	// Seed seeds every random step. Surrogate i uses its own generator derived from Seed and
	// i, so the surrogates do not depend on the number of threads.
	Seed uint64
	// MaxIter caps the IAAFT iterations per surrogate (0 means 200).
	MaxIter int
	// MatchEnds picks the segment of the record whose first and last values and first
	// differences match best (Schreiber & Schmitz 2000, "Surrogate time series", Physica D
	// 142, 346, section on end-point mismatch): the Fourier methods treat the record as one
	// period of a periodic signal, and a jump between its ends shows up as spurious
	// high-frequency power. The segment is at least (1−MaxTrim) of the record.
	MatchEnds bool
	// MaxTrim is the largest fraction of the record MatchEnds may cut off (0 means 0.1).
	MaxTrim float64
	// Threads is the number of goroutines (≤ 0 means 1). Results do not depend on it.
	Threads int
}

// Surrogate is one surrogate series with its convergence record.
type Surrogate struct {
	// Values are the surrogate samples (the same length as the segment used).
	Values []float64
	// Iterations is the number of IAAFT iterations (0 for Phase and AAFT).
	Iterations int
	// SpectralError is the relative mismatch of Fourier amplitudes,
	// Σ(|S_k| − |X_k|)² / Σ|X_k|², of the returned series against the data (k ≥ 1).
	SpectralError float64
	// Converged is true when the IAAFT rank order reached a fixed point before MaxIter
	// (always true for Phase and AAFT, which are not iterative).
	Converged bool
}

// SurrogateSet is the result of Surrogates.
type SurrogateSet struct {
	Method Method
	Seed   uint64
	// Start and Length locate the segment of the record that the surrogates imitate:
	// samples [Start, Start+Length). Length is chosen so that its prime factors are at most 7
	// (fast transforms); with MatchEnds the segment also minimises the end-point mismatch.
	Start, Length int
	// EndMismatch is the end-point mismatch of the segment: the squared jump between its
	// first and last values plus the squared jump between its first and last differences,
	// relative to the segment's variance times its length (Schreiber & Schmitz 2000).
	EndMismatch float64
	Surrogates  []Surrogate
	// Cautions are plain-words warnings (segment shortened, IAAFT not converged, …).
	Cautions []string
}

// Surrogates generates opt.Count surrogates of x by opt.Method, in parallel across
// surrogates.
//
// References: J. Theiler, S. Eubank, A. Longtin, B. Galdrikian and J. D. Farmer (1992),
// "Testing for nonlinearity in time series: the method of surrogate data", Physica D 58,
// 77–94; T. Schreiber and A. Schmitz (1996), "Improved surrogate data for nonlinearity tests",
// Physical Review Letters 77, 635–638; T. Schreiber and A. Schmitz (2000), "Surrogate time
// series", Physica D 142, 346–382.
func Surrogates(x []float64, opt SurrogateOptions) (*SurrogateSet, error) {
	if opt.Method < Phase || opt.Method > IAAFT {
		return nil, errors.New("surrogates: no method given (phase, aaft or iaaft)")
	}
	if opt.Count < 1 {
		return nil, fmt.Errorf("surrogates: count %d: need at least one", opt.Count)
	}
	if len(x) < 16 {
		return nil, fmt.Errorf("surrogates: %d samples: need at least 16", len(x))
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("surrogates: sample %d is %v", i, v)
		}
	}
	if opt.MaxIter <= 0 {
		opt.MaxIter = 200
	}
	if opt.MaxTrim <= 0 || opt.MaxTrim >= 1 {
		opt.MaxTrim = 0.1
	}
	set := &SurrogateSet{Method: opt.Method, Seed: opt.Seed}
	if opt.MatchEnds {
		set.Start, set.Length, set.EndMismatch = matchEnds(x, opt.MaxTrim)
	} else {
		set.Length = spectral.LengthAtMost(len(x), maxFactor)
		set.EndMismatch = endMismatch(x[:set.Length])
	}
	if set.Length < len(x) {
		set.Cautions = append(set.Cautions, fmt.Sprintf("surrogates imitate samples %d…%d (%d of %d) so that the Fourier transform length has only small prime factors%s",
			set.Start, set.Start+set.Length-1, set.Length, len(x), map[bool]string{true: " and the ends match", false: ""}[opt.MatchEnds]))
	}
	if set.EndMismatch > 0.01 {
		set.Cautions = append(set.Cautions, fmt.Sprintf("the record's ends do not match (mismatch %.3g of the variance): Fourier surrogates get spurious high-frequency power; consider the end-matching option", set.EndMismatch))
	}
	seg := x[set.Start : set.Start+set.Length]
	g := newGenerator(seg)
	set.Surrogates = make([]Surrogate, opt.Count)
	threads := max(opt.Threads, 1)
	var wg sync.WaitGroup
	var guard workers.Guard
	next := make(chan int)
	for range min(threads, opt.Count) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var w *worker
			guard.Run(func() { w = g.newWorker() })
			for i := range next { // drained even after a panic, so the sender never blocks
				if w == nil || guard.Failed() {
					continue
				}
				guard.Run(func() {
					rng := SubRand(opt.Seed, uint64(i))
					set.Surrogates[i] = w.generate(opt.Method, rng, opt.MaxIter)
				})
			}
		}()
	}
	for i := range opt.Count {
		next <- i
	}
	close(next)
	wg.Wait()
	guard.Repanic()
	notConv := 0
	for _, s := range set.Surrogates {
		if !s.Converged {
			notConv++
		}
	}
	if notConv > 0 {
		set.Cautions = append(set.Cautions, fmt.Sprintf("%d of %d IAAFT surrogates did not reach a fixed rank order within %d iterations; their spectra match to the reported spectral error", notConv, opt.Count, opt.MaxIter))
	}
	return set, nil
}

// SubRand returns the random generator of the i-th independent task of a run seeded with
// seed. Each task's stream depends only on (seed, i), never on which goroutine runs it.
func SubRand(seed, i uint64) *rand.Rand {
	return rand.New(rand.NewPCG(splitmix(seed), splitmix(seed^(0x9e3779b97f4a7c15*(i+1)))))
}

// splitmix is the SplitMix64 finaliser (Steele, Lea & Flood 2014), used to decorrelate seeds.
func splitmix(z uint64) uint64 {
	z += 0x9e3779b97f4a7c15
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// endMismatch is the end-point mismatch γ of x: ((x_0 − x_{n−1})² + ((x_1 − x_0) −
// (x_{n−1} − x_{n−2}))²) / (n·var x).
func endMismatch(x []float64) float64 {
	n := len(x)
	_, v := meanVar(x)
	if v == 0 {
		return 0
	}
	jump := x[0] - x[n-1]
	slip := (x[1] - x[0]) - (x[n-1] - x[n-2])
	return (jump*jump + slip*slip) / (float64(n) * v)
}

// matchEnds returns the segment [start, start+length) with a fast transform length of at least
// (1−maxTrim)·len(x) samples that minimises the end-point mismatch, and its mismatch. The
// segment variances come from prefix sums.
func matchEnds(x []float64, maxTrim float64) (start, length int, mismatch float64) {
	n := len(x)
	s1 := make([]float64, n+1)
	s2 := make([]float64, n+1)
	for i, v := range x {
		s1[i+1] = s1[i] + v
		s2[i+1] = s2[i] + v*v
	}
	minLen := max(16, int(math.Ceil((1-maxTrim)*float64(n))))
	best := math.Inf(1)
	for l := spectral.LengthAtMost(n, maxFactor); l >= minLen; l = spectral.LengthAtMost(l-1, maxFactor) {
		for s := 0; s+l <= n; s++ {
			m := (s1[s+l] - s1[s]) / float64(l)
			v := (s2[s+l]-s2[s])/float64(l) - m*m
			if v <= 0 {
				continue
			}
			e := s + l - 1
			jump := x[s] - x[e]
			slip := (x[s+1] - x[s]) - (x[e] - x[e-1])
			g := (jump*jump + slip*slip) / (float64(l) * v)
			if g < best {
				best, start, length = g, s, l
			}
		}
		if l <= 16 {
			break
		}
	}
	if length == 0 {
		return 0, spectral.LengthAtMost(n, maxFactor), endMismatch(x[:spectral.LengthAtMost(n, maxFactor)])
	}
	return start, length, best
}

// generator holds what every surrogate of one segment shares: the Fourier amplitudes and the
// sorted values of the data.
type generator struct {
	n      int
	amp    []float64 // |X_k|, k = 0…n/2
	coef   []complex128
	sorted []float64
	order  []int32 // order[r] = index of the data's r-th smallest value (ties by index)
}

func newGenerator(x []float64) *generator {
	n := len(x)
	g := &generator{n: n, sorted: make([]float64, n), order: make([]int32, n)}
	pairs := make([]rankPair, n)
	for i, v := range x {
		pairs[i] = rankPair{v, int32(i)}
	}
	sortPairs(pairs)
	for r, p := range pairs {
		g.sorted[r], g.order[r] = p.v, p.i
	}
	fft := fourier.NewFFT(n)
	g.coef = fft.Coefficients(nil, x)
	g.amp = make([]float64, len(g.coef))
	for k, c := range g.coef {
		g.amp[k] = cmplx.Abs(c)
	}
	return g
}

// worker holds one goroutine's buffers.
type worker struct {
	g     *generator
	fft   *fourier.FFT
	coef  []complex128
	buf   []float64
	order []int32
	prev  []int32
	// radix-sort buffers
	keys, keys2 []uint64
	idx2        []int32
}

type rankPair struct {
	v float64
	i int32
}

func (g *generator) newWorker() *worker {
	return &worker{
		g:     g,
		fft:   fourier.NewFFT(g.n),
		coef:  make([]complex128, len(g.amp)),
		buf:   make([]float64, g.n),
		order: make([]int32, g.n),
		prev:  make([]int32, g.n),
	}
}

// generate returns one surrogate by method m.
func (w *worker) generate(m Method, rng *rand.Rand, maxIter int) Surrogate {
	n := w.g.n
	out := make([]float64, n)
	switch m {
	case Phase:
		w.randomPhases(out, w.g.amp, w.g.coef, rng)
		return Surrogate{Values: out, Converged: true, SpectralError: w.spectralError(out)}
	case AAFT:
		// Gaussian values with the data's rank order.
		gauss := make([]float64, n)
		for i := range gauss {
			gauss[i] = rng.NormFloat64()
		}
		slices.Sort(gauss)
		y := make([]float64, n)
		for r, idx := range w.g.order {
			y[idx] = gauss[r]
		}
		coef := w.fft.Coefficients(nil, y)
		amp := make([]float64, len(coef))
		for k, c := range coef {
			amp[k] = cmplx.Abs(c)
		}
		w.randomPhases(y, amp, coef, rng)
		w.remap(out, y)
		return Surrogate{Values: out, Converged: true, SpectralError: w.spectralError(out)}
	default:
		// IAAFT: start from a random shuffle of the data.
		copy(out, w.g.sorted)
		rng.Shuffle(n, func(i, j int) { out[i], out[j] = out[j], out[i] })
		w.ranksInto(w.prev, out)
		it, conv := 0, false
		for it < maxIter {
			it++
			w.fft.Coefficients(w.coef, out)
			for k, c := range w.coef {
				a := cmplx.Abs(c)
				if a == 0 {
					w.coef[k] = complex(w.g.amp[k], 0)
				} else {
					w.coef[k] = c * complex(w.g.amp[k]/a, 0)
				}
			}
			w.fft.Sequence(w.buf, w.coef)
			inv := 1 / float64(n)
			for i := range w.buf {
				w.buf[i] *= inv
			}
			w.remap(out, w.buf)
			if slices.Equal(w.order, w.prev) {
				conv = true
				break
			}
			w.order, w.prev = w.prev, w.order
		}
		return Surrogate{Values: out, Iterations: it, Converged: conv, SpectralError: w.spectralError(out)}
	}
}

// randomPhases writes into out the inverse transform of amplitudes amp with uniform random
// phases; the k = 0 term keeps its value and, for even n, the Nyquist term keeps its (real)
// value, so the result is real with exactly the given periodogram.
func (w *worker) randomPhases(out []float64, amp []float64, coef []complex128, rng *rand.Rand) {
	n := w.g.n
	w.coef[0] = coef[0]
	for k := 1; k < len(amp); k++ {
		if n%2 == 0 && k == len(amp)-1 {
			w.coef[k] = coef[k]
			continue
		}
		phi := 2 * math.Pi * rng.Float64()
		w.coef[k] = complex(amp[k]*math.Cos(phi), amp[k]*math.Sin(phi))
	}
	w.fft.Sequence(out, w.coef)
	inv := 1 / float64(n)
	for i := range out {
		out[i] *= inv
	}
}

// ranksInto writes into order the index permutation that sorts y (order[r] = index of the
// r-th smallest; ties by index). It is a least-significant-digit radix sort (11-bit digits)
// of the order-preserving integer images of the values, stable, so ties keep index order;
// it allocates nothing after the worker's first call.
func (w *worker) ranksInto(order []int32, y []float64) {
	n := len(y)
	if len(w.keys) != n {
		w.keys, w.keys2 = make([]uint64, n), make([]uint64, n)
		w.idx2 = make([]int32, n)
	}
	keys, idx := w.keys, order
	for i, v := range y {
		if v == 0 {
			v = 0 // −0 and +0 compare equal
		}
		b := math.Float64bits(v)
		if b>>63 == 1 {
			b = ^b
		} else {
			b |= 1 << 63
		}
		keys[i], idx[i] = b, int32(i)
	}
	k2, i2 := w.keys2, w.idx2
	var count [2048]int
	for shift := uint(0); shift < 64; shift += 11 {
		clear(count[:])
		for _, k := range keys {
			count[(k>>shift)&2047]++
		}
		if count[(keys[0]>>shift)&2047] == n {
			continue // every key has this digit: the pass would not move anything
		}
		sum := 0
		for d, c := range count {
			count[d] = sum
			sum += c
		}
		for j, k := range keys {
			d := (k >> shift) & 2047
			k2[count[d]], i2[count[d]] = k, idx[j]
			count[d]++
		}
		keys, k2 = k2, keys
		idx, i2 = i2, idx
	}
	if &idx[0] != &order[0] {
		copy(order, idx)
	}
}

// remap writes into out the data's sorted values in the rank order of y, and leaves the order
// in w.order.
func (w *worker) remap(out, y []float64) {
	w.ranksInto(w.order, y)
	for r, idx := range w.order {
		out[idx] = w.g.sorted[r]
	}
}

// spectralError returns Σ_{k≥1}(|S_k| − |X_k|)² / Σ_{k≥1}|X_k|² for the series s.
func (w *worker) spectralError(s []float64) float64 {
	w.fft.Coefficients(w.coef, s)
	var num, den float64
	for k := 1; k < len(w.coef); k++ {
		d := cmplx.Abs(w.coef[k]) - w.g.amp[k]
		num += d * d
		den += w.g.amp[k] * w.g.amp[k]
	}
	if den == 0 {
		return 0
	}
	return num / den
}

// sortPairs sorts p by value, ties by index.
func sortPairs(p []rankPair) {
	slices.SortFunc(p, func(a, b rankPair) int {
		if c := cmp.Compare(a.v, b.v); c != 0 {
			return c
		}
		return cmp.Compare(a.i, b.i)
	})
}
