package symbolic

import (
	"bytes"
	"fmt"
	"io"
	"math/rand/v2"
	"testing"
)

// BenchmarkLZ76 compares the linear-time automaton with the Kaspar–Schuster scan (the
// reference) on fair random bits.
func BenchmarkLZ76(b *testing.B) {
	for _, n := range []int{10_000, 100_000} {
		s := fairSymbols(n, 1)
		b.Run(fmt.Sprintf("automaton/n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				Complexity(s, 2)
			}
		})
		b.Run(fmt.Sprintf("kaspar-schuster/n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				ksComplexity(s)
			}
		})
	}
}

// BenchmarkBlockCounter counts words of lengths 1…16 of 10^6 fair bits.
func BenchmarkBlockCounter(b *testing.B) {
	s := fairSymbols(1_000_000, 2)
	b.ReportAllocs()
	for b.Loop() {
		c, _ := NewBlockCounter(2, 16)
		c.Add(s)
	}
}

// BenchmarkPermutation is the permutation entropy of order 5 of 10^6 samples.
func BenchmarkPermutation(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 1))
	x := make([]float64, 1_000_000)
	for i := range x {
		x[i] = rng.Float64()
	}
	b.ReportAllocs()
	for b.Loop() {
		PermutationEntropy(x, 5, 1)
	}
}

// BenchmarkStream writes and reads back 10^6 symbols.
func BenchmarkStream(b *testing.B) {
	s := fairSymbols(1_000_000, 3)
	b.ReportAllocs()
	for b.Loop() {
		var buf bytes.Buffer
		w, _ := NewWriter(&buf, "01")
		w.Write(s)
		w.Close()
		sc := w.Sidecar(PartitionInfo{}, Source{}, "", "")
		r, _ := NewReader(&buf, sc, "x")
		dst := make([]uint8, 1<<15)
		for {
			if _, err := r.Read(dst); err != nil {
				break
			}
		}
	}
}

// TestStreamBoundedMemory: reading a long stream allocates nothing per Read call, so memory
// does not grow with the stream (only the caller's buffer is used).
func TestStreamBoundedMemory(t *testing.T) {
	s := fairSymbols(2_000_000, 4)
	var buf bytes.Buffer
	w, _ := NewWriter(&buf, "01")
	if err := w.Write(s); err != nil {
		t.Fatal(err)
	}
	w.Close()
	sc := w.Sidecar(PartitionInfo{}, Source{}, "", "")
	r, _ := NewReader(bytes.NewReader(buf.Bytes()), sc, "x")
	dst := make([]uint8, 4096)
	allocs := testing.AllocsPerRun(200, func() {
		if _, err := r.Read(dst); err != nil && err != io.EOF {
			t.Fatal(err)
		}
	})
	if allocs != 0 {
		t.Errorf("Read allocates %.1f times per call, want 0", allocs)
	}
}
