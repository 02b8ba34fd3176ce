package states

import "testing"

// countReference tallies the same words as count with a map keyed by the word as a string: the
// obvious implementation the flat code arrays replace.
func countReference(x []uint8, lmax int) map[string]int64 {
	m := map[string]int64{}
	for t := range x {
		for l := 0; l <= lmax && l <= t; l++ {
			m[string(x[t-l:t+1])]++
		}
	}
	return m
}

func TestCountMatchesReference(t *testing.T) {
	// the flat tables hold exactly the word counts of the map reference
	x := even(5000, 3)
	c := count(x, 2, 4)
	ref := countReference(x, 4)
	var n int
	for l := 0; l <= 4; l++ {
		for code, v := range c.words[l] {
			if v == 0 {
				continue
			}
			n++
			w := decode(hist{l + 1, code}, 2)
			if ref[string(w)] != v {
				t.Fatalf("word %v: %d, reference %d", w, v, ref[string(w)])
			}
		}
	}
	if n != len(ref) {
		t.Fatalf("%d words, reference %d", n, len(ref))
	}
}

// BenchmarkCount and BenchmarkCountReference compare the word counting of 10^6 symbols at L = 8
// (read the ratio of the two ns/op).
func BenchmarkCount(b *testing.B) {
	x := even(1_000_000, 1)
	b.ReportAllocs()
	for b.Loop() {
		count(x, 2, 8)
	}
}

func BenchmarkCountReference(b *testing.B) {
	x := even(1_000_000, 1)
	b.ReportAllocs()
	for b.Loop() {
		countReference(x, 8)
	}
}

// BenchmarkReconstruct1M is the whole reconstruction of 10^6 symbols at the automatic L.
func BenchmarkReconstruct1M(b *testing.B) {
	x := even(1_000_000, 1)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Reconstruct(x, 2, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
