package series

import (
	"strings"
	"testing"

	"unfold/internal/testsignals"
)

// TestGrowingSeasonality: R's AirPassengers (monthly airline passengers 1949–1960,
// help(AirPassengers)) has a seasonal cycle whose amplitude grows with the level — the
// textbook reason for its log transform (Box & Jenkins 1976, "Time Series Analysis", series
// G, from memory) — so Describe must caution; Nottingham temperatures (nottem) have a steady
// yearly cycle and must not.
func TestGrowingSeasonality(t *testing.T) {
	for _, c := range []struct {
		file string
		want bool
	}{{"airpassengers.csv", true}, {"nottem.csv", false}} {
		sm, err := Describe(&Series{Values: testsignals.OpenRecord(t, "r/"+c.file, 1), Dt: 1. / 12})
		if err != nil {
			t.Fatal(err)
		}
		got := false
		for _, s := range sm.Cautions {
			got = got || strings.Contains(s, "short-term fluctuations")
		}
		t.Logf("%s: ratio %.2f", c.file, sm.Stationarity.FluctuationRatio)
		if got != c.want {
			t.Errorf("%s: growing-fluctuation caution %v, want %v (ratio %.2f)", c.file, got, c.want, sm.Stationarity.FluctuationRatio)
		}
	}
}
