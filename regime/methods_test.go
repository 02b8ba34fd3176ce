package regime

import (
	"slices"
	"testing"
)

// TestSurrogateEntryPoints: the named entry points are Surrogates with the method set (the
// same series for the same seed), and IAAFT keeps the data's values exactly (exact rank
// remap; Schreiber & Schmitz 1996, CHECKS.md §7, tag E).
func TestSurrogateEntryPoints(t *testing.T) {
	x := cubed(ar1(1000, 0.8, 5))
	sorted := slices.Sorted(slices.Values(x[:1000]))
	for _, c := range []struct {
		m  Method
		fn func([]float64, int, uint64) (*SurrogateSet, error)
	}{{IAAFT, IAAFTSurrogates}, {AAFT, AAFTSurrogates}, {Phase, PhaseSurrogates}} {
		got, err := c.fn(x, 2, 7)
		if err != nil {
			t.Fatal(err)
		}
		want, err := Surrogates(x, SurrogateOptions{Method: c.m, Count: 2, Seed: 7})
		if err != nil {
			t.Fatal(err)
		}
		if got.Method != c.m || len(got.Surrogates) != 2 {
			t.Fatalf("%v: method %v, %d surrogates", c.m, got.Method, len(got.Surrogates))
		}
		for i := range got.Surrogates {
			if !slices.Equal(got.Surrogates[i].Values, want.Surrogates[i].Values) {
				t.Errorf("%v: surrogate %d differs from Surrogates", c.m, i)
			}
			if c.m == IAAFT && !slices.Equal(slices.Sorted(slices.Values(got.Surrogates[i].Values)), sorted) {
				t.Errorf("IAAFT surrogate %d does not keep the data's values", i)
			}
		}
	}
}
