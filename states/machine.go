package states

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/mathext"
)

// hist is one history: its length and code.
type hist struct{ l, h int }

// cstate is a state under construction.
type cstate struct {
	members []hist
	pooled  []int64 // next-symbol counts summed over the members
}

// machine is CSSR at one history length over shared counts.
type machine struct {
	c      *counts
	L      int
	alpha  float64
	assign [][]int32 // assign[l][h]: the state of history h of length l, −1 when none
	st     []*cstate
}

func (c *counts) reconstruct(L int, alpha float64) *Result {
	m := &machine{c: c, L: L, alpha: alpha, assign: make([][]int32, L+1)}
	for l := 0; l <= L; l++ {
		a := make([]int32, c.pow[l])
		for i := range a {
			a[i] = -1
		}
		m.assign[l] = a
	}
	m.sufficiency()
	m.determinise()
	return m.result()
}

func (m *machine) add(s int, h hist) {
	st := m.st[s]
	st.members = append(st.members, h)
	k := m.c.k
	for a, v := range m.c.words[h.l][h.h*k : h.h*k+k] {
		st.pooled[a] += v
	}
	m.assign[h.l][h.h] = int32(s)
}

func (m *machine) newState(h hist) {
	m.st = append(m.st, &cstate{pooled: make([]int64, m.c.k)})
	m.add(len(m.st)-1, h)
}

// sufficiency is the homogenisation phase of Shalizi & Klinkner (2004): for l = 0 … L−1, each
// history w of length l in state S is extended into the past by every symbol a; the child aw
// stays in S unless its next-symbol distribution differs from S's at level α, in which case it
// joins the other state that fits it best (the largest p-value above α) or starts a new one.
func (m *machine) sufficiency() {
	k := m.c.k
	m.newState(hist{0, 0})
	for l := 0; l < m.L; l++ {
		ns := len(m.st)
		for s := 0; s < ns; s++ {
			nm := len(m.st[s].members)
			for i := 0; i < nm; i++ {
				w := m.st[s].members[i]
				if w.l != l {
					continue
				}
				for a := 0; a < k; a++ {
					child := hist{l + 1, a*m.c.pow[l] + w.h}
					cc := m.c.words[l+1][child.h*k : child.h*k+k]
					if sum(cc) == 0 {
						continue
					}
					if ChiSquareTest(cc, m.st[s].pooled) > m.alpha {
						m.add(s, child)
						continue
					}
					best, bestP := -1, m.alpha
					for j, o := range m.st {
						if j == s {
							continue
						}
						if p := ChiSquareTest(cc, o.pooled); p > bestP {
							best, bestP = j, p
						}
					}
					if best >= 0 {
						m.add(best, child)
					} else {
						m.newState(child)
					}
				}
			}
		}
	}
}

// successor returns the state reached from history h (length < L) on symbol a, or −1 when h
// was never followed by a.
func (m *machine) successor(h hist, a int) int {
	k := m.c.k
	if m.c.words[h.l][h.h*k+a] == 0 {
		return -1
	}
	if h.l < m.L {
		return int(m.assign[h.l+1][h.h*k+a])
	}
	// a history of the longest length: drop its oldest symbol
	return int(m.assign[m.L][(h.h*k+a)%m.c.pow[m.L]])
}

// determinise splits states until each symbol leads from all histories of a state (of length
// below L) to one state (Shalizi & Klinkner 2004, the recursion phase). A history whose
// successor on a is unknown (never seen) follows the state's most frequent successor on a.
// Histories of length L go with their parent (the history one symbol shorter) when it is in
// the same state, else with the largest group; a state of length-L histories only uses the
// successor of the history shifted by one symbol.
func (m *machine) determinise() {
	k := m.c.k
	for changed := true; changed; {
		changed = false
		for s := 0; s < len(m.st); s++ {
			st := m.st[s]
			short := false
			for _, h := range st.members {
				if h.l < m.L {
					short = true
					break
				}
			}
			uses := func(h hist) bool { return h.l < m.L || !short }
			// the state's most frequent successor on each symbol
			major := make([]int, k)
			for a := range k {
				tally := map[int]int64{}
				for _, h := range st.members {
					if !uses(h) {
						continue
					}
					if t := m.successor(h, a); t >= 0 {
						tally[t] += m.c.words[h.l][h.h*k+a]
					}
				}
				major[a] = -1
				var bn int64
				for t, n := range tally {
					if n > bn || (n == bn && t < major[a]) {
						major[a], bn = t, n
					}
				}
			}
			groups := map[string]int{}
			var order [][]hist
			var weight []int64
			key := make([]byte, 0, 4*k)
			groupOf := make([]int, len(st.members))
			for i, h := range st.members {
				groupOf[i] = -1
				if !uses(h) {
					continue
				}
				key = key[:0]
				for a := range k {
					t := m.successor(h, a)
					if t < 0 {
						t = major[a]
					}
					key = fmt.Appendf(key, "%d,", t)
				}
				g, ok := groups[string(key)]
				if !ok {
					g = len(order)
					groups[string(key)] = g
					order = append(order, nil)
					weight = append(weight, 0)
				}
				groupOf[i] = g
				order[g] = append(order[g], h)
				weight[g] += m.c.histCount(h.l, h.h)
			}
			if len(order) <= 1 {
				continue
			}
			changed = true
			keep := 0
			for g := range weight {
				if weight[g] > weight[keep] {
					keep = g
				}
			}
			// place the histories left out (length L) with their parent's group
			where := map[hist]int{}
			for i, h := range st.members {
				if groupOf[i] >= 0 {
					where[h] = groupOf[i]
				}
			}
			for i, h := range st.members {
				if groupOf[i] >= 0 {
					continue
				}
				g := keep
				if pg, ok := where[hist{h.l - 1, h.h % m.c.pow[h.l-1]}]; ok {
					g = pg
				}
				order[g] = append(order[g], h)
			}
			// rebuild: the kept group stays in s, the others become new states
			m.st[s] = &cstate{pooled: make([]int64, k)}
			for _, h := range order[keep] {
				m.add(s, h)
			}
			for g, hs := range order {
				if g == keep {
					continue
				}
				m.newState(hs[0])
				ns := len(m.st) - 1
				for _, h := range hs[1:] {
					m.add(ns, h)
				}
			}
		}
	}
}

// result removes the transient states (those outside the closed strongly connected components of
// the transition graph), computes the stationary distribution and the measures.
func (m *machine) result() *Result {
	k, ns := m.c.k, len(m.st)
	next := make([][]int, ns) // next[s][a]: successor state or −1
	for s, st := range m.st {
		next[s] = make([]int, k)
		for a := range k {
			next[s][a] = -1
			if st.pooled[a] == 0 {
				continue
			}
			var bn int64
			for _, h := range st.members {
				if t := m.successor(h, a); t >= 0 {
					if n := m.c.words[h.l][h.h*k+a]; n > bn {
						next[s][a], bn = t, n
					}
				}
			}
		}
	}
	keep := closedClasses(next)
	res := &Result{K: k, N: m.c.n, HistoryLength: m.L, Significance: m.alpha, Cautions: []string{}}
	// stationary distribution of the lazy chain (same π, no periodicity) by power iteration
	pi := make([]float64, ns)
	nxt := make([]float64, ns)
	var tot float64
	for s, st := range m.st {
		if keep[s] {
			pi[s] = float64(sum(st.pooled))
			tot += pi[s]
		}
	}
	if tot == 0 {
		return res
	}
	for s := range pi {
		pi[s] /= tot
	}
	prob := func(s, a int) float64 { return float64(m.st[s].pooled[a]) / float64(sum(m.st[s].pooled)) }
	for it := 0; it < 200000; it++ {
		for s := range nxt {
			nxt[s] = pi[s] / 2
		}
		for s := range pi {
			if !keep[s] || pi[s] == 0 {
				continue
			}
			var out float64
			for a := range k {
				if t := next[s][a]; t >= 0 && keep[t] {
					out += prob(s, a)
				}
			}
			for a := range k {
				if t := next[s][a]; t >= 0 && keep[t] {
					nxt[t] += pi[s] / 2 * prob(s, a) / out
				}
			}
		}
		var d float64
		for s := range pi {
			d += math.Abs(nxt[s] - pi[s])
		}
		pi, nxt = nxt, pi
		if d < 1e-14 {
			break
		}
	}
	// number the kept states by falling probability
	var ids []int
	for s := range m.st {
		if keep[s] {
			ids = append(ids, s)
		} else {
			res.Transient++
		}
	}
	sort.SliceStable(ids, func(i, j int) bool { return pi[ids[i]] > pi[ids[j]] })
	var rare []int
	newID := make([]int, ns)
	for i := range newID {
		newID[i] = -1
	}
	for i, s := range ids {
		newID[s] = i
	}
	for i, s := range ids {
		st := m.st[s]
		n := float64(sum(st.pooled))
		p := make([]float64, k)
		var h float64
		for a := range k {
			p[a] = float64(st.pooled[a]) / n
			if p[a] > 0 {
				h -= p[a] * math.Log2(p[a])
			}
		}
		state := State{ID: i, Probability: pi[s], Next: p, Count: m.visits(st)}
		for _, hs := range st.members {
			if hs.l > 0 && int(m.assign[hs.l-1][hs.h%m.c.pow[hs.l-1]]) == s {
				continue
			}
			state.SuffixCount++
			if len(state.Suffixes) < MaxSuffixes {
				state.Suffixes = append(state.Suffixes, decode(hs, k))
			}
		}
		res.States = append(res.States, state)
		if pi[s] > 0 {
			res.StatisticalComplexity -= pi[s] * math.Log2(pi[s])
		}
		res.EntropyRate += pi[s] * h
		for a := range k {
			if t := next[s][a]; t >= 0 && keep[t] && p[a] > 0 {
				res.Transitions = append(res.Transitions, Transition{From: i, Symbol: a, To: newID[t], Probability: p[a]})
			}
		}
		if state.Count < MinStateCount {
			rare = append(rare, i)
		}
	}
	if len(rare) > 0 {
		res.Cautions = append(res.Cautions, fmt.Sprintf("%d of %d states are seen fewer than %d times (states %v): their distributions are poorly estimated and they may be spurious; try a shorter history length",
			len(rare), len(res.States), MinStateCount, rare[:min(len(rare), 10)]))
	}
	// guard the bounds against rounding
	res.StatisticalComplexity = max(res.StatisticalComplexity, 0)
	res.EntropyRate = min(max(res.EntropyRate, 0), math.Log2(float64(k)))
	return res
}

// visits counts the positions whose history of the deepest length held by the state lies in it.
func (m *machine) visits(st *cstate) int64 {
	deep := 0
	for _, h := range st.members {
		deep = max(deep, h.l)
	}
	var n int64
	for _, h := range st.members {
		if h.l == deep {
			n += m.c.histCount(h.l, h.h)
		}
	}
	return n
}

func decode(h hist, k int) []uint8 {
	out := make([]uint8, h.l)
	v := h.h
	for i := h.l - 1; i >= 0; i-- {
		out[i] = uint8(v % k)
		v /= k
	}
	return out
}

func sum(v []int64) int64 {
	var n int64
	for _, x := range v {
		n += x
	}
	return n
}

// closedClasses marks the states in closed strongly connected components of the graph s → next[s][a]
// (Tarjan 1972, "Depth-first search and linear graph algorithms", SIAM J. Comput. 1, 146).
func closedClasses(next [][]int) []bool {
	n := len(next)
	index := make([]int, n)
	low := make([]int, n)
	on := make([]bool, n)
	comp := make([]int, n)
	for i := range index {
		index[i] = -1
	}
	var stack []int
	idx, nc := 0, 0
	var visit func(v int)
	visit = func(v int) {
		index[v], low[v] = idx, idx
		idx++
		stack = append(stack, v)
		on[v] = true
		for _, w := range next[v] {
			if w < 0 {
				continue
			}
			if index[w] < 0 {
				visit(w)
				low[v] = min(low[v], low[w])
			} else if on[w] {
				low[v] = min(low[v], index[w])
			}
		}
		if low[v] == index[v] {
			for {
				w := stack[len(stack)-1]
				stack = stack[:len(stack)-1]
				on[w] = false
				comp[w] = nc
				if w == v {
					break
				}
			}
			nc++
		}
	}
	for v := range n {
		if index[v] < 0 {
			visit(v)
		}
	}
	closed := make([]bool, nc)
	for i := range closed {
		closed[i] = true
	}
	for v := range n {
		for _, w := range next[v] {
			if w >= 0 && comp[w] != comp[v] {
				closed[comp[v]] = false
			}
		}
	}
	keep := make([]bool, n)
	for v := range n {
		keep[v] = closed[comp[v]]
	}
	return keep
}

// ChiSquareTest returns the p-value of the χ² test that two count vectors over the same
// categories come from one distribution, with unequal sample sizes (W. H. Press et al. 2007,
// Numerical Recipes, 3rd ed., §14.3.2): χ² = Σ (√(n_y/n_x)·x_i − √(n_x/n_y)·y_i)² / (x_i + y_i)
// with one degree of freedom fewer than the categories seen. Empty vectors give 1.
func ChiSquareTest(x, y []int64) float64 {
	nx, ny := float64(sum(x)), float64(sum(y))
	if nx == 0 || ny == 0 {
		return 1
	}
	rx, ry := math.Sqrt(ny/nx), math.Sqrt(nx/ny)
	var stat float64
	df := -1
	for i := range x {
		t := float64(x[i] + y[i])
		if t == 0 {
			continue
		}
		df++
		d := float64(x[i])*rx - float64(y[i])*ry
		stat += d * d / t
	}
	if df <= 0 {
		return 1
	}
	return mathext.GammaIncRegComp(float64(df)/2, stat/2)
}
