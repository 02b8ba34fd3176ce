package analysis

import (
	"context"
	"encoding/binary"
	"encoding/json"
	"math"
	"testing"

	"unfold/series"
)

// chainRecord turns fuzzer bytes into a short record: the first byte picks the coding — 0:
// little-endian float64s (non-finite values, which no reader lets through, become 0), else
// signed bytes times a scale 2^(first byte − 128) — and at most maxChainSamples samples.
func chainRecord(b []byte) []float64 {
	const maxChainSamples = 400
	if len(b) == 0 {
		return nil
	}
	mode, b := b[0], b[1:]
	var x []float64
	if mode == 0 {
		for len(b) >= 8 && len(x) < maxChainSamples {
			v := math.Float64frombits(binary.LittleEndian.Uint64(b))
			if math.IsNaN(v) || math.IsInf(v, 0) {
				v = 0
			}
			x = append(x, v)
			b = b[8:]
		}
		return x
	}
	scale := math.Ldexp(1, int(mode)-128)
	for _, c := range b {
		if len(x) == maxChainSamples {
			break
		}
		x = append(x, float64(int8(c))*scale)
	}
	return x
}

// f64bytes codes x for chainRecord's float64 mode.
func f64bytes(x []float64) []byte {
	b := []byte{0}
	for _, v := range x {
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(v))
	}
	return b
}

// FuzzChain runs the whole chain (Run) on short records from the fuzzer's bytes: it must not
// panic, and the result must marshal to valid JSON (issue 13). The seed corpus — the
// degenerate records of issue 13 — runs as a normal test.
func FuzzChain(f *testing.F) {
	fill := func(n int, g func(i int) float64) []float64 {
		x := make([]float64, n)
		for i := range x {
			x[i] = g(i)
		}
		return x
	}
	for _, x := range [][]float64{
		fill(10, func(int) float64 { return 3 }),
		fill(200, func(int) float64 { return math.Copysign(0, -1) }),
		fill(300, func(i int) float64 { return 1e-310 * float64(i%3) }),
		fill(300, func(i int) float64 { return math.Sin(2 * math.Pi * float64(i) / 25) }),
		fill(300, func(i int) float64 { return float64(1 - 2*(i/10%2)) }),
		fill(300, func(i int) float64 { return float64(i % 3) }),
		{1, 2},
		{5},
		fill(300, func(i int) float64 { return 1.5e308 * math.Sin(0.7*float64(i)) }),
	} {
		f.Add(f64bytes(x))
	}
	logistic := []byte{120}
	v := 0.3
	for range 300 {
		v = 4 * v * (1 - v)
		logistic = append(logistic, byte(int8(v*250-125)))
	}
	f.Add(logistic)
	f.Fuzz(func(t *testing.T, b []byte) {
		x := chainRecord(b)
		if len(x) == 0 {
			return
		}
		s := &series.Series{Name: "x", Values: x, Dt: 1}
		res, err := Run(context.Background(), s, Options{Threads: 1})
		if err != nil && res == nil {
			return // refused as a whole (no samples)
		}
		js, err := json.Marshal(res)
		if err != nil {
			t.Fatalf("%d samples: json.Marshal: %v", len(x), err)
		}
		if !json.Valid(js) {
			t.Fatalf("%d samples: invalid JSON", len(x))
		}
	})
}
