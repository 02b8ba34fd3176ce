package report

import (
	"strings"
	"testing"

	"unfold/analysis"
	"unfold/regime"
	"unfold/series"
)

// TestPerTime checks the unit of an exponent per time unit (DESIGN.md §3: nats per time unit;
// the issue: nats per second when the time unit is seconds).
func TestPerTime(t *testing.T) {
	for u, want := range map[string]string{"s": "nats per second", "ms": "nats per ms", "min": "nats per minute",
		"h": "nats per hour", "": "nats per time unit", "cycle": "nats per cycle"} {
		if got := PerTime(u); got != want {
			t.Errorf("PerTime(%q) = %q, want %q", u, got, want)
		}
	}
}

// TestSummarizeUnitsAndRanking checks Summarize on a hand-made result: the units pass through,
// the verdict is put in words, and the cautions are ranked (non-stationarity before length,
// noise and anything else; symbol-stage cautions only to make up two).
func TestSummarizeUnitsAndRanking(t *testing.T) {
	res := &analysis.Result{
		Inspect: &analysis.InspectStage{Summary: &series.Summary{Cautions: []string{"the record looks non-stationary: segment means differ"}}},
		Regime:  &analysis.RegimeStage{},
		Symbols: &analysis.SymbolsStage{},
	}
	res.Regime.Body = analysis.RegimeResult{Regime: regime.Stochastic, Confidence: 0.7,
		Cautions: []string{"an unranked caution", "noise floor: 40 % of the power is broadband", "too short: 900 samples"}}
	res.Symbols.Body.Cautions = []string{"a symbol caution"}
	sm := Summarize(res, analysis.Units{Time: "ms", Signal: "V"})
	if sm.Units.Time != "ms" || sm.Units.Signal != "V" {
		t.Errorf("units %+v, want ms and V", sm.Units)
	}
	if sm.Verdict != "stochastic — moderate evidence (confidence 0.70)" {
		t.Errorf("verdict %q", sm.Verdict)
	}
	want := []string{"the record looks non-stationary: segment means differ", "too short: 900 samples", "noise floor: 40 % of the power is broadband"}
	if strings.Join(sm.Cautions, "|") != strings.Join(want, "|") {
		t.Errorf("cautions %q, want %q", sm.Cautions, want)
	}
	if sm.Figure != "regime" {
		t.Errorf("first figure %q, want the regime evidence for a stochastic verdict", sm.Figure)
	}
	if sm.Lambda != nil || sm.D2 != nil || !strings.Contains(sm.EmbeddingText(), "no lag chosen") {
		t.Errorf("estimates from stages that did not run: λ %v, D2 %v, %q", sm.Lambda, sm.D2, sm.EmbeddingText())
	}
	res.Inspect = nil
	res.Regime.Body.Cautions = nil
	if got := TopCautions(res); len(got) != 1 || got[0] != "a symbol caution" {
		t.Errorf("with no verdict-stage cautions, want the symbol stage's: %q", got)
	}
}

// TestSig3 checks the page's three-significant-digit numbers (trailing zeros kept).
func TestSig3(t *testing.T) {
	for v, want := range map[float64]string{2.2990: "2.30", 3.6504: "3.65", 100: "100", 0.00919: "0.00919", -0.5: "-0.500"} {
		if got := sig3(v); got != want {
			t.Errorf("sig3(%g) = %q, want %q", v, got, want)
		}
	}
}
