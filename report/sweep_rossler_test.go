package report

import (
	"slices"
	"testing"

	"unfold/internal/testsignals"
	"unfold/models"
)

// branches counts the distinct values among pts: sorted, a gap wider than tol starts a new
// branch.
func branches(pts []float64, tol float64) int {
	s := slices.Clone(pts)
	slices.Sort(s)
	n := 1
	for i := 1; i < len(s); i++ {
		if s[i]-s[i-1] > tol {
			n++
		}
	}
	return n
}

// TestBifurcationPointsRossler: the Rössler flow x' = −y − z, y' = x + a y, z' = b + z(x − c)
// with a = b = 0.2 goes through period doubling as c grows from about 2.5 to 4.2 and is
// chaotic at c = 5.7 (Rössler 1976, "An equation for continuous chaos", Phys. Lett. A 57, 397;
// the periods 1, 2 and 4 at c = 2.5, 3.5 and 4 are from memory). The local maxima of x that
// the sweep's bifurcation diagram draws must show 1, 2 and 4 branches there, and many at 5.7.
func TestBifurcationPointsRossler(t *testing.T) {
	const dt = 0.05
	for _, tc := range []struct {
		c    float64
		want int // 0: many (chaos)
	}{{2.5, 1}, {3.5, 2}, {4, 4}, {5.7, 0}} {
		s := testsignals.Sub(dt, 10, 1000)
		x := testsignals.Flow(models.Rossler{A: 0.2, B: 0.2, C: tc.c}, []float64{1, 1, 1}, 26000, s, 0)[0]
		pts, maxima := BifurcationPoints(x, 0)
		if !maxima || len(pts) < 150 {
			t.Fatalf("c = %v: %d points, maxima %v; want the local maxima of a sampled flow", tc.c, len(pts), maxima)
		}
		lo, hi := slices.Min(pts), slices.Max(pts)
		// Branches: values closer than 1 % of the maxima's span, or 0.01, are one branch
		// (the parabolic refinement at Δt = 0.05 is far finer; judgement).
		got := branches(pts, max(0.01*(hi-lo), 0.01))
		switch {
		case tc.want > 0 && got != tc.want:
			t.Errorf("c = %v: %d branches of the maxima (%.4g … %.4g), want %d", tc.c, got, lo, hi, tc.want)
		case tc.want == 0 && got < 20:
			t.Errorf("c = %v: %d branches of the maxima, want many (chaos)", tc.c, got)
		}
	}
}
