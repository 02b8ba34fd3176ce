package lyapunov

import (
	"math"
	"slices"
	"testing"
)

// TestDivergenceSampledReferences: on 40 000 Lorenz samples the default follows
// DefaultReferencePoints sampled reference points (stated in the result), gives the same
// curves for any thread count, and λ1 stays within the tolerance of TestDivergenceLorenz:
// 0.9056 per time unit (Sprott 2003 App. A, CHECKS.md §2, tag V + C) ± 15 % (issue 5).
func TestDivergenceSampledReferences(t *testing.T) {
	if testing.Short() {
		t.Skip("40 000 samples")
	}
	x := lorenzX(40000, 0.01)
	var prev *Result
	for _, th := range []int{1, 2} {
		r, err := Divergence(x, Options{Lag: 12, Dim: 3, Theiler: 20, Dt: 0.01, Threads: th, Seed: 3})
		if err != nil {
			t.Fatal(err)
		}
		if r.ReferencePoints != DefaultReferencePoints {
			t.Errorf("%d reference points, want the default %d", r.ReferencePoints, DefaultReferencePoints)
		}
		if math.Abs(r.Lambda-0.9056) > 0.15*0.9056 {
			t.Errorf("λ = %.4f per time unit, want 0.9056 ± 15%%", r.Lambda)
		}
		if prev != nil {
			for e := range r.Curves {
				if !slices.Equal(r.Curves[e].MeanLog, prev.Curves[e].MeanLog) {
					t.Fatalf("threads %d: curve %d differs", th, e)
				}
			}
			if r.Lambda != prev.Lambda || r.Interval != prev.Interval {
				t.Fatalf("threads %d: λ %v %v, before %v %v", th, r.Lambda, r.Interval, prev.Lambda, prev.Interval)
			}
		}
		prev = r
	}
	// All reference points (a negative count): the count is every admissible vector.
	r, err := Divergence(x[:12000], Options{Lag: 12, Dim: 3, Theiler: 20, Dt: 0.01, ReferencePoints: -1, Method: Rosenstein})
	if err != nil {
		t.Fatal(err)
	}
	if want := r.Vectors - r.Horizon; r.ReferencePoints != want {
		t.Errorf("all reference points: %d, want N_v − horizon = %d", r.ReferencePoints, want)
	}
}

// TestDefaultHorizonShortRecord: the default horizon fits a short record. 289 samples (the
// length of a yearly record in issue 14) at lag 10 and dimension 4 used to get the uncapped
// horizon of 300 steps and no reference point; capped at a quarter of the 259 delay vectors
// (64 steps) three quarters of them remain reference points.
func TestDefaultHorizonShortRecord(t *testing.T) {
	if got := DefaultHorizonFor(289, 10, 4); got != 64 {
		t.Errorf("DefaultHorizonFor(289, 10, 4) = %d, want 259/4 = 64", got)
	}
	if got := DefaultHorizonFor(1_000_000, 10, 4); got != DefaultHorizon(10, 4) {
		t.Errorf("long record: horizon %d, want the uncapped %d", got, DefaultHorizon(10, 4))
	}
	x := henonX(289)
	r, err := Divergence(x, Options{Lag: 10, Dim: 4, Theiler: 1, Method: Rosenstein})
	if err != nil && r == nil {
		t.Fatalf("289 samples: %v", err)
	}
	if r.Horizon != 64 || r.ReferencePoints != 259-64 {
		t.Errorf("289 samples: horizon %d with %d reference points, want 64 and 195", r.Horizon, r.ReferencePoints)
	}
}
