package symbolic

import (
	"fmt"
	"math"
)

// LZ76 is the Lempel–Ziv (1976) complexity of a sequence.
type LZ76 struct {
	// Phrases is c(n), the number of phrases of the exhaustive history (the last phrase may be
	// incomplete), counted as Kaspar & Schuster (1987) do.
	Phrases int `json:"phrases"`
	// Length is n, the number of symbols.
	Length int `json:"length"`
	// AlphabetSize is k, the base of the normalisation.
	AlphabetSize int `json:"alphabet_size"`
	// Normalized is c(n) / (n / log_k n): it tends to 1 for an i.i.d. uniform source and to the
	// entropy rate in log-base-k units for a stationary ergodic source (Lempel & Ziv 1976).
	// Finite random sequences give values slightly above 1.
	Normalized float64 `json:"normalized"`
}

// Complexity returns the Lempel–Ziv (1976) complexity of s over an alphabet of k symbols.
//
// A new phrase starts at position l and is the shortest word s[l:l+m] that does not occur
// starting at any position before l (occurrences may overlap the phrase itself), exactly the
// phrase rule of Kaspar & Schuster (1987). Instead of their quadratic scan this runs in linear
// time: a suffix automaton of s records for every state the end of the first occurrence of its
// words, so "does s[l:l+m] occur starting before l" is one comparison per extended symbol.
// Memory is about 2n states of k transitions (int32) for k ≤ 8, and a map of the transitions
// that exist (at most 3n) for larger alphabets.
func Complexity(s []uint8, k int) (*LZ76, error) {
	n := len(s)
	if k < 2 {
		return nil, fmt.Errorf("lz76: the alphabet must have at least 2 symbols (has %d)", k)
	}
	if n < 1 {
		return nil, fmt.Errorf("lz76: the sequence is empty")
	}
	if n > math.MaxInt32/2-1 {
		return nil, fmt.Errorf("lz76: %d symbols are too many (at most %d)", n, math.MaxInt32/2-1)
	}
	for i, v := range s {
		if int(v) >= k {
			return nil, fmt.Errorf("lz76: symbol %d at position %d is outside the alphabet of %d", v, i, k)
		}
	}
	a := newAutomaton(n, k)
	for _, v := range s {
		a.extend(v)
	}
	c := 0
	for l := 0; l < n; {
		c++
		st := int32(0)
		m := 0
		for l+m < n {
			st = a.get(st, s[l+m])
			m++
			// first occurrence of s[l:l+m] starts at first[st] − m + 1
			if int(a.first[st])-m+1 >= l {
				break // new word: the phrase ends here
			}
		}
		l += m
	}
	res := &LZ76{Phrases: c, Length: n, AlphabetSize: k}
	if n > 1 {
		res.Normalized = float64(c) * math.Log(float64(n)) / math.Log(float64(k)) / float64(n)
	}
	return res, nil
}

// denseAlphabet is the largest alphabet whose automaton transitions are stored densely.
const denseAlphabet = 8

// automaton is a suffix automaton (Blumer et al. 1985).
type automaton struct {
	k     int
	next  []int32         // next[state*k+c], −1 when absent (k ≤ denseAlphabet)
	edges map[int64]int32 // state*k+c → state (k > denseAlphabet)
	link  []int32
	len   []int32
	first []int32 // end position of the first occurrence of the state's words
	last  int32
	size  int32
	pos   int32
}

func newAutomaton(n, k int) *automaton {
	capStates := 2*n + 1
	a := &automaton{k: k, link: make([]int32, capStates),
		len: make([]int32, capStates), first: make([]int32, capStates), size: 1}
	if k <= denseAlphabet {
		a.next = make([]int32, capStates*k)
		for i := range a.next {
			a.next[i] = -1
		}
	} else {
		a.edges = make(map[int64]int32, 2*n)
	}
	a.link[0] = -1
	a.first[0] = -1
	return a
}

func (a *automaton) get(st int32, c uint8) int32 {
	if a.next != nil {
		return a.next[int(st)*a.k+int(c)]
	}
	if v, ok := a.edges[int64(st)*int64(a.k)+int64(c)]; ok {
		return v
	}
	return -1
}

func (a *automaton) set(st int32, c uint8, to int32) {
	if a.next != nil {
		a.next[int(st)*a.k+int(c)] = to
		return
	}
	a.edges[int64(st)*int64(a.k)+int64(c)] = to
}

// cloneEdges copies the transitions of q to cl.
func (a *automaton) cloneEdges(cl, q int32) {
	k := a.k
	if a.next != nil {
		copy(a.next[int(cl)*k:int(cl)*k+k], a.next[int(q)*k:int(q)*k+k])
		return
	}
	for c := 0; c < k; c++ {
		if v, ok := a.edges[int64(q)*int64(k)+int64(c)]; ok {
			a.edges[int64(cl)*int64(k)+int64(c)] = v
		}
	}
}

func (a *automaton) extend(c uint8) {
	cur := a.size
	a.size++
	a.len[cur] = a.len[a.last] + 1
	a.first[cur] = a.pos
	a.pos++
	p := a.last
	for p != -1 && a.get(p, c) == -1 {
		a.set(p, c, cur)
		p = a.link[p]
	}
	if p == -1 {
		a.link[cur] = 0
	} else {
		q := a.get(p, c)
		if a.len[p]+1 == a.len[q] {
			a.link[cur] = q
		} else {
			cl := a.size
			a.size++
			a.len[cl] = a.len[p] + 1
			a.cloneEdges(cl, q)
			a.link[cl] = a.link[q]
			a.first[cl] = a.first[q]
			for p != -1 && a.get(p, c) == q {
				a.set(p, c, cl)
				p = a.link[p]
			}
			a.link[q] = cl
			a.link[cur] = cl
		}
	}
	a.last = cur
}
