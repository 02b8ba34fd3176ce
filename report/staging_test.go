package report

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"

	"unfold/analysis"
	"unfold/figure"
	"unfold/series"
)

// TestStagingReplacesWhole: a report over an existing report folder replaces it whole (a file
// of the old run is gone), and the temporary sibling is gone after the swap.
func TestStagingReplacesWhole(t *testing.T) {
	dir := t.TempDir()
	dst := filepath.Join(dir, "out")
	old := &Result{Header: Header{Version: "old", Input: Input{Path: "x.csv"}}, Titles: map[string]string{}, Sections: map[string]*Section{}, Errors: map[string]string{}}
	if _, err := old.WriteDir(dst, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dst, "figures", "stale.svg"), []byte("<svg/>"), 0o644); err != nil {
		t.Fatal(err)
	}
	st, err := StageDir(dst)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Abort()
	nw := &Result{Header: Header{Version: "new", Input: Input{Path: "x.csv"}}, Titles: map[string]string{}, Sections: map[string]*Section{}, Errors: map[string]string{}}
	if _, err := st.Commit(nw, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dst, "figures", "stale.svg")); err == nil {
		t.Error("a file of the old run survived the replacement")
	}
	b, err := os.ReadFile(filepath.Join(dst, "result.json"))
	if err != nil || !strings.Contains(string(b), `"version": "new"`) {
		t.Errorf("result.json is not the new run's: %v %.200s", err, b)
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 1 {
		t.Errorf("leftovers beside the folder: %v", ents)
	}
}

// TestStagingRefuses: a destination that is not a report folder, that holds the input, or
// whose parent cannot be written is refused before any work, and nothing of it is lost.
func TestStagingRefuses(t *testing.T) {
	dir := t.TempDir()
	mine := filepath.Join(dir, "mine")
	os.MkdirAll(mine, 0o755)
	os.WriteFile(filepath.Join(mine, "data.csv"), []byte("x\n1\n"), 0o644)
	if _, err := StageDir(mine); err == nil {
		t.Error("a folder of other files was accepted as a report destination")
	}
	if _, err := StageDir(filepath.Join(dir, "empty"), filepath.Join(dir, "empty", "in.csv")); err != nil {
		t.Errorf("a new folder was refused: %v", err)
	}
	file := filepath.Join(dir, "file")
	os.WriteFile(file, nil, 0o644)
	if _, err := StageDir(filepath.Join(file, "out")); err == nil {
		t.Error("a destination under a file was accepted")
	}
	if b, err := os.ReadFile(filepath.Join(mine, "data.csv")); err != nil || string(b) != "x\n1\n" {
		t.Errorf("the refused folder changed: %v %q", err, b)
	}
}

// TestPartialPages: the page written after stage k of the chain has k sections (issue 14: the
// page is readable while the chain runs).
func TestPartialPages(t *testing.T) {
	x := make([]float64, 600)
	for i := range x {
		x[i] = math.Sin(0.3*float64(i)) + 0.5*math.Sin(0.071*float64(i)*float64(i%7))
	}
	s := &series.Series{Name: "x", Values: x, Dt: 1}
	st, err := StageDir(filepath.Join(t.TempDir(), "out"))
	if err != nil {
		t.Fatal(err)
	}
	defer st.Abort()
	k, total := 0, len(Stages(&analysis.Result{}, s, figure.Record{}, View{}))
	opt := analysis.Options{Threads: 1, Partial: func(r *analysis.Result) {
		k++
		if err := st.WritePartial(Header{Title: "x"}, r, s, figure.Record{}, View{}, WriteOptions{}); err != nil {
			t.Errorf("after stage %d: %v", k, err)
			return
		}
		b, err := os.ReadFile(st.Page())
		if err != nil {
			t.Fatal(err)
		}
		page := string(b)
		n := strings.Count(page, "<section id=")
		for _, other := range []string{"provenance", "summary", "glossary"} { // not stages
			n -= strings.Count(page, `<section id="`+other+`"`)
		}
		if n != k {
			t.Errorf("after stage %d the page has %d sections", k, n)
		}
		if running := strings.Contains(string(b), "running…"); running != (k < total) {
			t.Errorf("after stage %d: the page says running: %v", k, running)
		}
	}}
	if _, err := analysis.Run(context.Background(), s, opt); err != nil {
		t.Fatal(err)
	}
	if k < 5 {
		t.Errorf("Partial was called %d times", k)
	}
}

// TestResultJSONNonFinite: result.json never fails: a non-finite number anywhere is written as
// null with a top-level caution naming the field.
func TestResultJSONNonFinite(t *testing.T) {
	r := &Result{Header: Header{Version: "v", Input: Input{Path: "x.csv", Dt: math.NaN()}, Parameters: map[string]float64{"azimuth": math.Inf(1)}},
		Titles: map[string]string{}, Sections: map[string]*Section{}, Errors: map[string]string{}}
	b, err := r.JSON()
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatalf("invalid JSON: %v", err)
	}
	if in := m["input"].(map[string]any); in["dt"] != nil {
		t.Errorf("dt = %v, want null", in["dt"])
	}
	c := fmt.Sprint(m["cautions"])
	if !strings.Contains(c, "input.dt") || !strings.Contains(c, "parameters.azimuth") {
		t.Errorf("cautions %s do not name input.dt and parameters.azimuth", c)
	}
}

// TestTitleCleaned: a file name with bytes that are not UTF-8 reaches the page and result.json
// as valid UTF-8 (series.CleanText).
func TestTitleCleaned(t *testing.T) {
	bad := "run\xff\xfe.csv"
	r := Run(Header{Title: bad, Input: Input{Path: "/d/" + bad}}, nil, nil, nil)
	b, err := r.JSON()
	if err != nil || !utf8.Valid(b) {
		t.Fatalf("result.json: %v, valid UTF-8 %v", err, utf8.Valid(b))
	}
	var page bytes.Buffer
	if err := r.writeHTML(&page, nil); err != nil {
		t.Fatal(err)
	}
	if !utf8.Valid(page.Bytes()) || !strings.Contains(page.String(), "run") {
		t.Error("the page is not valid UTF-8 or lost the name")
	}
}
