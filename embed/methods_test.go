package embed

import (
	"slices"
	"testing"

	"unfold/neighbors"
)

// TestMethodEntryPoints: FalseNeighbors and Cao give the curves ChooseDimension reads (the same
// scan), and on the Hénon map they show the published behaviour.
func TestMethodEntryPoints(t *testing.T) {
	x := henonX(5000)
	opt := DimOptions{Lag: 1, MaxDim: 5, Theiler: 1, Norm: neighbors.Max, Threads: 2}
	c, err := ChooseDimension(x, opt)
	if err != nil {
		t.Fatal(err)
	}
	fnn, err := FalseNeighbors(x, opt)
	if err != nil {
		t.Fatal(err)
	}
	cao, err := Cao(x, opt)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(fnn, c.FNN) || !slices.Equal(cao, c.Cao) {
		t.Fatalf("entry points differ from ChooseDimension:\n%v\n%v\n%v\n%v", fnn, c.FNN, cao, c.Cao)
	}
	// Hénon x at τ = 1: FNN(1) > 50 %, FNN(2) < 1 % (KBA 1992; CHECKS.md §5, M).
	if fnn[0].Fraction <= 0.5 || fnn[1].Fraction >= 0.01 {
		t.Errorf("FNN(1) = %.4f, FNN(2) = %.4f: want > 0.5 and < 0.01 (KBA 1992, M)", fnn[0].Fraction, fnn[1].Fraction)
	}
	// E1(1) < 0.9 < E1(2): minimum embedding dimension 2 (Cao 1997; CHECKS.md §5, M).
	if !(cao[0].E1 < 0.9 && cao[1].E1 > 0.9) {
		t.Errorf("E1(1) = %.3f, E1(2) = %.3f: want < 0.9 and > 0.9 (Cao 1997, M)", cao[0].E1, cao[1].E1)
	}
	if _, err := FalseNeighbors(x, DimOptions{}); err == nil {
		t.Error("FalseNeighbors accepted lag 0")
	}
}
