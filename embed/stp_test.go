package embed

import (
	"math"
	"testing"
)

// TestSTPNoise: for independent noise the distance distribution does not depend on the time
// separation (exact), so each contour is flat; for m = 1, |x_i − x_j| of two independent
// standard Gaussians is half-normal with scale √2, whose median is √2·0.674490 = 0.953873
// (exact: Φ⁻¹(0.75) = 0.674490).
func TestSTPNoise(t *testing.T) {
	x := whiteNoise(50000, 41)
	s, err := SpaceTimeSeparation(Embedding{X: x, Lag: 1, Dim: 1}, STPOptions{MaxDt: 20, Fractions: []float64{0.5}})
	if err != nil {
		t.Fatal(err)
	}
	for k, v := range s.Dist[0] {
		if math.Abs(v-0.953873) > 0.03 {
			t.Errorf("Δt = %d: median distance %.4f, want 0.9539 ± 0.03", s.Dt[k], v)
		}
	}
}

// TestSTPSine: for a sine of period P sampled without noise, m = 1, the distance at Δt = P is
// 0 for every pair and grows from Δt = 0 (exact periodicity).
func TestSTPSine(t *testing.T) {
	x := sine(5000, 50)
	s, err := SpaceTimeSeparation(Embedding{X: x, Lag: 12, Dim: 2}, STPOptions{MaxDt: 100, Steps: 100})
	if err != nil {
		t.Fatal(err)
	}
	last := len(s.Fractions) - 1
	if s.Dt[49] != 50 || s.Dist[last][49] > 1e-9 {
		t.Errorf("Δt = %d: 90%% distance %.3g, want 0 at the period", s.Dt[49], s.Dist[last][49])
	}
	if !(s.Dist[last][24] > 1) {
		t.Errorf("half period: 90%% distance %.3g, want > 1", s.Dist[last][24])
	}
}

// TestEmbeddingView checks the view against its definition and Dense.
func TestEmbeddingView(t *testing.T) {
	x := []float64{0, 1, 2, 3, 4, 5, 6, 7, 8, 9}
	e, err := New(x, 3, 3)
	if err != nil {
		t.Fatal(err)
	}
	if e.Len() != 4 {
		t.Fatalf("Len %d, want 10 − 2·3 = 4", e.Len())
	}
	d := e.Dense()
	v := e.Vector(2, nil)
	if v[0] != 2 || v[1] != 5 || v[2] != 8 || e.At(3, 2) != 9 || d[2*3+1] != 5 || len(d) != 12 {
		t.Errorf("vector 2 %v, At(3,2) %v, dense %v", v, e.At(3, 2), d)
	}
	if _, err := New(x, 5, 3); err == nil {
		t.Error("lag 5, dimension 3 on 10 samples: want an error")
	}
}
