package report

import (
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"unfold/analysis"
)

// TestSkippedStageAndStatesColumns: a stage that does not apply (analysis.Skip) is recorded as
// "skipped" with its reason, shown on the page as "skipped: why", and leaves the result "ok";
// summary.csv takes the states object's entropy rate and statistical complexity into its last
// two columns, and its error column stays empty.
func TestSkippedStageAndStatesColumns(t *testing.T) {
	why := "symbols: the record gives 48 values, too few for 2 symbols (need 100): a record of at least 100 samples"
	stages := []Stage{
		{Key: "lag", Title: "Delay", Run: func() (*Section, error) {
			return &Section{JSON: json.RawMessage(`{"command":"lag","lag":7}`)}, nil
		}},
		{Key: "symbols", Title: "Symbols", Run: func() (*Section, error) { return nil, analysis.Skip(errors.New(why)) }},
		{Key: "states", Title: "States", Run: func() (*Section, error) {
			return &Section{JSON: json.RawMessage(`{"command":"states","states":1,"entropy_rate":1,"statistical_complexity":0}`)}, nil
		}},
	}
	r := Run(Header{Version: "v", Input: Input{Path: "a.csv", SHA256: "x", Samples: 48, Dt: 1}}, stages, nil, nil)
	if r.Status() != StatusOK || len(r.Errors) != 0 || r.Skipped["symbols"] != why {
		t.Fatalf("status %s, errors %v, skipped %v", r.Status(), r.Errors, r.Skipped)
	}
	if st := r.Provenance.Stages[1]; st.Status != analysis.StatusSkipped || st.Error != why {
		t.Errorf("provenance %+v", st)
	}
	dir := t.TempDir()
	if _, err := r.WriteDir(filepath.Join(dir, "a"), WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	page, err := os.ReadFile(filepath.Join(dir, "a", "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(page), "skipped: symbols: the record gives 48 values") {
		t.Error("the page does not say why symbols was skipped")
	}
	rows, err := Merge(dir)
	if err != nil || len(rows) != 1 {
		t.Fatalf("merge: %v %v", rows, err)
	}
	if row := rows[0]; row[9] != StatusOK || row[10] != "" || row[11] != "1" || row[12] != "0" {
		t.Errorf("row %q: want status ok, no error, entropy_rate 1, statistical_complexity 0", row)
	}
}
