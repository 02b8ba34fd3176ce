package symbolic

import (
	"math"
	"testing"

	"unfold/internal/testsignals"
	"unfold/partition"
)

// lorenzXZ integrates the Lorenz system (10, 28, 8/3) of package models by RK4 with step h
// from (1, 1, 1), drops t = 50 and returns x and z every step, the first one step past the
// transient (internal/testsignals; CHECKS.md §13).
func lorenzXZ(n int, h float64) (xs, zs []float64) {
	xs, _, zs = testsignals.LorenzXYZ(n, testsignals.Sampling{Step: h, Skip: testsignals.Steps(50, h) + 1})
	return xs, zs
}

func TestLorenzSectionEntropy(t *testing.T) {
	// Pesin's identity: the entropy per crossing of a generating partition of the section is
	// λ1·T_return nats. λ1 = 0.9056 per unit time (Sprott 2003, App. A; CHECKS.md §2, V via
	// Sprott's page 0.906). The section is the maxima of z, one per loop around either wing
	// (Lorenz 1963's return map, a cusp map); the maxima of x are not, since some loops of a
	// wing have none. The binary partition found by the search cuts the map at its cusp.
	// Tolerance 20 % (issue 7).
	const dt = 0.01
	n := 300_000
	if testing.Short() {
		n = 150_000
	}
	_, z := lorenzXZ(n, dt)
	sec, err := partition.TakeSection(z, dt, 0, partition.SectionOptions{Maxima: true})
	if err != nil {
		t.Fatal(err)
	}
	v := sec.Values()
	p, err := partition.Search(v, partition.SearchOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// the cusp of the Lorenz map lies near z = 38.5 (from memory; wide check)
	if c := p.Thresholds[0]; !(c > 36 && c < 41) {
		t.Errorf("Lorenz z maxima: cut %.3f should be at the cusp near 38.5", c)
	}
	s := p.Apply(v, nil)
	res, err := BlockEntropies(s, 2, 0, Grassberger)
	if err != nil {
		t.Fatal(err)
	}
	want := 0.9056 * sec.MeanReturn / math.Ln2
	if math.Abs(res.EntropyRate-want) > 0.2*want {
		t.Errorf("Lorenz: h = %.3f bits/crossing (L* = %d, %d crossings, T = %.4f), want λ1·T/ln 2 = %.3f ± 20%%",
			res.EntropyRate, res.RateLength, sec.Len(), sec.MeanReturn, want)
	}
	t.Logf("Lorenz: %d crossings, T = %.4f, cut %.3f, h = %.4f bits (L* = %d), Pesin %.4f", sec.Len(), sec.MeanReturn, p.Thresholds[0], res.EntropyRate, res.RateLength, want)
}
