package embed

import (
	"errors"
	"testing"
)

// TestChooseTheilerRule: TheilerAuto gives ChooseTheiler's window with its rule, 0 stays no
// window, a given lag and dimension are kept with RuleGiven.
func TestChooseTheilerRule(t *testing.T) {
	x := henonX(2000)
	w, err := ChooseTheiler(x)
	if err != nil {
		t.Fatal(err)
	}
	c, err := Choose(x, ChooseOptions{Lag: 1, Dim: 2, Theiler: TheilerAuto})
	if err != nil {
		t.Fatal(err)
	}
	if c.Theiler != (Chosen{w, TheilerACFDecay}) || c.Lag != (Chosen{1, RuleGiven}) || c.Dim != (Chosen{2, RuleGiven}) {
		t.Errorf("choice %+v %+v %+v; want lag 1 and dim 2 given, Theiler %d by %s", c.Lag, c.Dim, c.Theiler, w, TheilerACFDecay)
	}
	if c.DimChoice != nil || c.LagChoice != nil {
		t.Errorf("given lag and dimension were chosen again")
	}
	c, err = Choose(x, ChooseOptions{Lag: 1, Dim: 2, Theiler: 0})
	if err != nil {
		t.Fatal(err)
	}
	if c.Theiler != (Chosen{0, RuleGiven}) {
		t.Errorf("Theiler 0: got %+v, want no window (0, given)", c.Theiler)
	}
	if _, err := Choose(x, ChooseOptions{Theiler: -2}); err == nil {
		t.Errorf("Theiler −2 accepted")
	}
}

// TestChooseRemembersNoDimension: a scan where no dimension can be read (a square wave: every
// nearest neighbour is an exact duplicate, so neither criterion is defined) is kept in the
// choice with ErrNoDimension, not an error.
func TestChooseRemembersNoDimension(t *testing.T) {
	x := make([]float64, 2000)
	for i := range x {
		x[i] = float64(1 - 2*(i/10%2))
	}
	c, err := Choose(x, ChooseOptions{Lag: 1, Theiler: 0, DimOptions: DimOptions{MaxDim: 4}})
	if err != nil {
		t.Fatal(err)
	}
	if c.Dim.Value != 0 || !errors.Is(c.DimErr, ErrNoDimension) || c.DimChoice == nil {
		t.Errorf("dim %+v, DimErr %v: want 0 with ErrNoDimension and the scan kept", c.Dim, c.DimErr)
	}
}

// TestPublishedNames: FalseNeighbors and Cao are the curves of ChooseDimension's scan.
func TestPublishedNames(t *testing.T) {
	x := henonX(2000)
	opt := DimOptions{Lag: 1, MaxDim: 4}
	c, err := ChooseDimension(x, opt)
	if err != nil {
		t.Fatal(err)
	}
	f, err := FalseNeighbors(x, opt)
	if err != nil || len(f) != len(c.FNN) || f[1] != c.FNN[1] {
		t.Errorf("FalseNeighbors %v (%v), want %v", f, err, c.FNN)
	}
	e, err := Cao(x, opt)
	if err != nil || len(e) != len(c.Cao) || e[0] != c.Cao[0] {
		t.Errorf("Cao %v (%v), want %v", e, err, c.Cao)
	}
}
