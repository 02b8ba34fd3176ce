package analysis_test

import (
	"context"
	"strings"
	"testing"

	"unfold/analysis"
	"unfold/internal/testsignals"
	"unfold/series"
)

// TestRunSkipsShortSymbols: 80 iterates of the logistic map (r = 4) are too few for the
// partition search (50 values per symbol: 100 for 2); the symbols stage is recorded as
// "skipped" with the record length it needs, entropy and states are skipped after it, and none
// of the three counts as a stage without an answer in Result.Err.
func TestRunSkipsShortSymbols(t *testing.T) {
	s := &series.Series{Values: testsignals.Logistic(80, 4, 0.3, 1001), Dt: 1, Name: "x"}
	res, err := analysis.Run(context.Background(), s, analysis.Options{Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"symbols", "entropy", "states"} {
		r := res.Stage(k)
		if r == nil || r.Status != analysis.StatusSkipped {
			t.Fatalf("stage %s: %+v, want skipped", k, r)
		}
	}
	if e := res.Stage("symbols").Error; !strings.Contains(e, "a record of at least 100 samples") {
		t.Errorf("symbols skipped with %q, want the record length it needs (100 samples)", e)
	}
	if err := res.Err(); err != nil && strings.Contains(err.Error(), "symbols") {
		t.Errorf("Err lists a skipped stage: %v", err)
	}
}
