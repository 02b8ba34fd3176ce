package partition

import (
	"fmt"
	"math"
	"slices"

	"unfold/neighbors"
)

// SearchOptions set the generating-like partition search. The zero value works.
type SearchOptions struct {
	// Alphabet is K, the number of symbols; 0 means 2.
	Alphabet int
	// Dim and Lag are the state-space embedding of the values that symbolic neighbours are
	// checked in; 0 means Dim 2, Lag 1 (a return map).
	Dim, Lag int
	// Candidates is the number of cut positions tried per threshold on the coarse grid
	// (quantiles); 0 means 49. The best is refined on a finer grid around it.
	Candidates int
	// MaxPoints caps the number of values scored (the first MaxPoints are used); 0 means
	// 20000. The chosen partition applies to all values.
	MaxPoints int
	// Ratio is the distance ratio above which a symbolic neighbour is false; 0 means 10.
	Ratio float64
	// Threads is the number of goroutines of the neighbour search (0 = all cores).
	Threads int
}

// Candidate is one scored partition of the search.
type Candidate struct {
	Thresholds  []float64 `json:"thresholds"`
	SFNN        float64   `json:"sfnn"`
	EntropyRate float64   `json:"entropy_rate"`
}

// SearchResult is the chosen partition with the candidates it was chosen from.
type SearchResult struct {
	Partition
	// Candidates are all the partitions scored, in the order tried.
	Candidates []Candidate
	// WordLength is the length of the symbol words compared (symbols).
	WordLength int
	// RateLength is the word length of the entropy-rate estimates.
	RateLength int
	// Points is the number of values scored.
	Points int
	// Rule says in words how the best was picked.
	Rule string
	// Cautions are plain-word warnings.
	Cautions []string
}

// scorer holds what every candidate's score reuses: the state-space neighbour scale of every
// point and scratch buffers.
type scorer struct {
	x      []float64 // scored values
	k      int
	dim    int
	lag    int
	ratio  float64
	np     int       // number of points scored: embedding vectors with a full word
	scale  []float64 // distance to the 3rd nearest state-space neighbour
	word   int
	rateL  int
	sym    []uint8
	codes  []codeIdx
	pow    []uint64
	counts []int64
}

type codeIdx struct {
	code uint64
	i    int32
}

func newScorer(x []float64, k int, opt SearchOptions) (*scorer, error) {
	dim, lag := opt.Dim, opt.Lag
	if dim <= 0 {
		dim = 2
	}
	if lag <= 0 {
		lag = 1
	}
	ratio := opt.Ratio
	if ratio <= 0 {
		ratio = 10
	}
	n := len(x)
	ix, err := neighbors.FromEmbedding(x, lag, dim, neighbors.Euclidean)
	if err != nil {
		return nil, fmt.Errorf("partition search: %w", err)
	}
	const kn = 3
	_, dist := ix.AllKNN(kn, 0, 0, 0, opt.Threads, nil)
	ne := ix.Len()
	// word length: long enough that symbolic neighbours resolve the spacing of the points
	word := int(math.Ceil(math.Log(float64(n))/math.Log(float64(k)))) + 4
	maxW := 0
	for p := uint64(1); p <= math.MaxUint64/uint64(k)/uint64(k); p *= uint64(k) {
		maxW++
	}
	word = min(word, maxW, n/4)
	s := &scorer{x: x, k: k, dim: dim, lag: lag, ratio: ratio, word: word,
		np: min(ne, n-word+1), scale: make([]float64, ne)}
	// repeated values (quantised records) give zero neighbour distances: floor the scale at a
	// tenth of the median positive one so that ties do not make every neighbour false
	pos := make([]float64, 0, ne)
	for i := 0; i < ne; i++ {
		s.scale[i] = dist[i*kn+kn-1]
		if d := s.scale[i]; d > 0 && !math.IsInf(d, 0) {
			pos = append(pos, d)
		}
	}
	if len(pos) > 0 {
		slices.Sort(pos)
		floor := 0.1 * pos[len(pos)/2]
		for i, d := range s.scale {
			if !(d >= floor) {
				s.scale[i] = floor
			}
		}
	}
	s.pow = make([]uint64, word+1)
	s.pow[0] = 1
	for l := 1; l <= word; l++ {
		s.pow[l] = s.pow[l-1] * uint64(k)
	}
	// entropy-rate word length: K^L ≤ N/10 (common practice)
	s.rateL = 1
	for s.rateL < word && float64(s.pow[s.rateL+1]) <= float64(n)/10 {
		s.rateL++
	}
	s.counts = make([]int64, s.pow[s.rateL])
	s.codes = make([]codeIdx, s.np)
	return s, nil
}

func (s *scorer) dist(i, j int) float64 {
	var d float64
	for c := 0; c < s.dim; c++ {
		v := s.x[i+c*s.lag] - s.x[j+c*s.lag]
		d += v * v
	}
	return math.Sqrt(d)
}

// score returns the SFNN fraction and the entropy rate (bits per symbol) of partition p.
func (s *scorer) score(p *Partition) (sfnn, rate float64) {
	s.sym = p.Apply(s.x, s.sym)
	k := uint64(s.k)
	// words s_i … s_{i+L−1}, first symbol most significant
	var code uint64
	for i := 0; i < s.word-1; i++ {
		code = code*k + uint64(s.sym[i])
	}
	top := s.pow[s.word-1]
	n := len(s.x)
	for i := 0; i+s.word <= n; i++ {
		code = code*k + uint64(s.sym[i+s.word-1])
		if i < s.np {
			s.codes[i] = codeIdx{code, int32(i)}
		}
		code %= top
	}
	slices.SortFunc(s.codes, func(a, b codeIdx) int {
		switch {
		case a.code < b.code:
			return -1
		case a.code > b.code:
			return 1
		}
		return int(a.i - b.i)
	})
	lcp := func(a, b uint64) int {
		l := 0
		for l < s.word && a/s.pow[s.word-l-1] == b/s.pow[s.word-l-1] {
			l++
		}
		return l
	}
	false_ := 0
	for q := range s.codes {
		i := int(s.codes[q].i)
		best, bl := -1, -1
		if q > 0 {
			best, bl = int(s.codes[q-1].i), lcp(s.codes[q].code, s.codes[q-1].code)
		}
		if q+1 < len(s.codes) {
			if l := lcp(s.codes[q].code, s.codes[q+1].code); l > bl {
				best, bl = int(s.codes[q+1].i), l
			}
		}
		if best < 0 {
			continue
		}
		if d := s.dist(i, best); d > s.ratio*s.scale[i] && d > 0 {
			false_++
		}
	}
	sfnn = float64(false_) / float64(len(s.codes))
	rate = s.entropyRate()
	return sfnn, rate
}

// entropyRate returns H(L) − H(L−1) in bits (Miller–Madow corrected) of s.sym at L = rateL.
func (s *scorer) entropyRate() float64 {
	h := func(l int) float64 {
		if l == 0 {
			return 0
		}
		cnt := s.counts[:s.pow[l]]
		clear(cnt)
		var code uint64
		k := uint64(s.k)
		top := s.pow[l]
		for i, v := range s.sym {
			code = (code*k + uint64(v)) % top
			if i >= l-1 {
				cnt[code]++
			}
		}
		var tot, m int64
		var sum float64
		for _, c := range cnt {
			if c > 0 {
				tot += c
				m++
				sum += float64(c) * math.Log(float64(c))
			}
		}
		ft := float64(tot)
		return (math.Log(ft) - sum/ft + float64(m-1)/(2*ft)) / math.Ln2
	}
	return h(s.rateL) - h(s.rateL-1)
}

// Search finds a generating-like partition of the values x into K symbols. Every candidate is
// scored by its fraction of symbolic false nearest neighbours — after Kennel & Buhl (2003): the
// points are ordered by their words of the next WordLength symbols, the symbolic neighbour of a
// point is the adjacent one in that order with the longer common prefix, and it is false when
// its distance in the state-space embedding exceeds Ratio times the point's distance to its
// third nearest state-space neighbour — and by the entropy-rate estimate h(L) (Miller–Madow).
// A generating partition has few false symbolic neighbours and the largest entropy rate.
// The best is the candidate with the fewest false neighbours; candidates within two binomial
// standard errors of that fraction count as tied, and among them the largest entropy rate
// wins.
//
// For K = 2 the cut is scanned over a grid of quantiles and refined on a finer grid around the
// best; for K > 2 the quantile cuts are improved one at a time, two sweeps.
func Search(x []float64, opt SearchOptions) (*SearchResult, error) {
	k := opt.Alphabet
	if k == 0 {
		k = 2
	}
	if k < 2 || k > MaxAlphabet {
		return nil, fmt.Errorf("partition search: alphabet size %d; want 2 to %d", k, MaxAlphabet)
	}
	all := x
	mp := opt.MaxPoints
	if mp <= 0 {
		mp = 20000
	}
	if len(x) > mp {
		x = x[:mp]
	}
	if len(x) < 50*k {
		return nil, fmt.Errorf("partition search: %d values are too few for %d symbols (need %d)", len(x), k, 50*k)
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("partition search: value %d is %v", i, v)
		}
	}
	sc, err := newScorer(x, k, opt)
	if err != nil {
		return nil, err
	}
	sorted := slices.Clone(x)
	slices.Sort(sorted)
	nc := opt.Candidates
	if nc <= 0 {
		nc = 49
	}
	res := &SearchResult{WordLength: sc.word, RateLength: sc.rateL, Points: len(x)}
	try := func(th []float64) Candidate {
		p := &Partition{Thresholds: th}
		f, h := sc.score(p)
		c := Candidate{Thresholds: slices.Clone(th), SFNN: f, EntropyRate: h}
		res.Candidates = append(res.Candidates, c)
		return c
	}
	pick := func(cs []Candidate) Candidate {
		best := cs[0]
		for _, c := range cs[1:] {
			if c.SFNN < best.SFNN {
				best = c
			}
		}
		np := float64(sc.np)
		tol := 2*math.Sqrt(math.Max(best.SFNN*(1-best.SFNN), 1/np)/np) + 0.5/np
		win := best
		for _, c := range cs {
			if c.SFNN <= best.SFNN+tol && c.EntropyRate > win.EntropyRate {
				win = c
			}
		}
		return win
	}
	lo, hi := sorted[0], sorted[len(sorted)-1]
	valid := func(th []float64) bool {
		for i, v := range th {
			if !(v > lo && v <= hi) || (i > 0 && v <= th[i-1]) {
				return false
			}
		}
		return true
	}
	var best Candidate
	if k == 2 {
		var cs []Candidate
		for j := 1; j <= nc; j++ {
			q := 0.02 + 0.96*float64(j-1)/float64(nc-1)
			th := []float64{quantileSorted(sorted, q)}
			if valid(th) {
				cs = append(cs, try(th))
			}
		}
		if len(cs) == 0 {
			return nil, fmt.Errorf("partition search: the values take too few distinct values to cut")
		}
		best = pick(cs)
		// refine on a grid 0.1 of the coarse step wide, around the best
		step := 0.96 / float64(nc-1)
		qb := fracBelow(sorted, best.Thresholds[0])
		fine := []Candidate{best}
		for j := -10; j <= 10; j++ {
			th := []float64{quantileSorted(sorted, math.Min(math.Max(qb+step*float64(j)/10, 0.001), 0.999))}
			if valid(th) {
				fine = append(fine, try(th))
			}
		}
		best = pick(fine)
	} else {
		qp, err := Quantile(x, k)
		if err != nil {
			return nil, fmt.Errorf("partition search: %w", err)
		}
		th := slices.Clone(qp.Thresholds)
		best = try(th)
		for sweep := 0; sweep < 2; sweep++ {
			for j := range th {
				qlo, qhi := 0.01, 0.99
				if j > 0 {
					qlo = fracBelow(sorted, th[j-1])
				}
				if j+1 < len(th) {
					qhi = fracBelow(sorted, th[j+1])
				}
				cs := []Candidate{best}
				for c := 1; c < 24; c++ {
					t := slices.Clone(best.Thresholds)
					t[j] = quantileSorted(sorted, qlo+(qhi-qlo)*float64(c)/24)
					if valid(t) {
						cs = append(cs, try(t))
					}
				}
				best = pick(cs)
				th = slices.Clone(best.Thresholds)
			}
		}
	}
	res.Partition = Partition{Kind: "search", Thresholds: best.Thresholds, Score: best.SFNN, EntropyRate: best.EntropyRate}
	res.Rule = fmt.Sprintf("fewest symbolic false neighbours (words of %d symbols, ratio %g to the 3rd-neighbour distance in a %d-dimensional lag-%d embedding); ties within two standard errors broken by the largest entropy rate h(%d)", sc.word, sc.ratio, sc.dim, sc.lag, sc.rateL)
	if len(all) > len(x) {
		res.Cautions = append(res.Cautions, fmt.Sprintf("the search scored the first %d of %d values", len(x), len(all)))
	}
	if best.SFNN > 0.1 {
		res.Cautions = append(res.Cautions, fmt.Sprintf("%.0f%% of symbolic neighbours are false even for the best partition: no candidate is close to generating (noise, too few symbols, or a state space of higher dimension)", 100*best.SFNN))
	}
	return res, nil
}

// fracBelow returns the fraction of sorted s below v.
func fracBelow(s []float64, v float64) float64 {
	i, _ := slices.BinarySearch(s, v)
	if len(s) < 2 {
		return 0
	}
	return float64(i) / float64(len(s)-1)
}

// Score returns the SFNN fraction and entropy rate of a given partition of x, computed as in
// Search (the first opt.MaxPoints values).
func Score(x []float64, p *Partition, opt SearchOptions) (sfnn, rate float64, err error) {
	mp := opt.MaxPoints
	if mp <= 0 {
		mp = 20000
	}
	if len(x) > mp {
		x = x[:mp]
	}
	if len(x) < 50 {
		return math.NaN(), math.NaN(), fmt.Errorf("partition score: %d values are too few (need 50)", len(x))
	}
	sc, err := newScorer(x, p.K(), opt)
	if err != nil {
		return math.NaN(), math.NaN(), err
	}
	f, h := sc.score(p)
	return f, h, nil
}
