// Package suggest finds the nearest of a set of names to a mistyped one, for "did you mean"
// hints in error messages, by the edit distance of Levenshtein (1966, "Binary codes capable of
// correcting deletions, insertions, and reversals", Soviet Physics Doklady 10, 707).
package suggest

import (
	"math"
	"sort"
	"strings"
)

// Closest returns the candidate nearest to s by edit distance (Levenshtein 1966), or "" when
// none is within a third of the longer name (at least 2 edits). Ties go to the first in
// sorted order.
func Closest(s string, candidates []string) string {
	c := append([]string(nil), candidates...)
	sort.Strings(c)
	best, bestD := "", math.MaxInt
	for _, x := range c {
		if d := editDistance(strings.ToLower(s), strings.ToLower(x)); d < bestD {
			best, bestD = x, d
		}
	}
	limit := max(2, max(len(s), len(best))/3)
	if best == "" || bestD > limit {
		return ""
	}
	return best
}

// editDistance is the Levenshtein distance of a and b in bytes (a transposition counts 2).
func editDistance(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}
