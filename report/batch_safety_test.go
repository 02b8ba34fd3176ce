package report

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"
)

// okAnalyze is a batch analysis that always answers (one stage, from fakeStages).
func okAnalyze(p string) (*Result, error) {
	sum, _ := FileSHA256(p)
	return Run(Header{Version: "v", Input: Input{Path: p, SHA256: sum, Samples: 1, Dt: 1}}, fakeStages(p)[1:2], nil, nil), nil
}

func writeInputs(t *testing.T, dir string, names ...string) []string {
	t.Helper()
	var ps []string
	for i, n := range names {
		p := filepath.Join(dir, n)
		os.MkdirAll(filepath.Dir(p), 0o755)
		if err := os.WriteFile(p, []byte(fmt.Sprintf("%d\n", i)), 0o644); err != nil {
			t.Fatal(err)
		}
		ps = append(ps, p)
	}
	return ps
}

// TestBatchNeverReadsItsOutput: `batch -o d/results d` run twice lists the same two inputs
// both times (its summary.csv, result.json and figures are never inputs), and so does a run
// over a directory holding another batch's folder.
func TestBatchNeverReadsItsOutput(t *testing.T) {
	d := t.TempDir()
	writeInputs(t, d, "a.csv", "b.csv")
	out := filepath.Join(d, "results")
	for run := 1; run <= 2; run++ {
		paths, err := ListInputs([]string{d}, nil, "")
		if err != nil {
			t.Fatal(err)
		}
		if len(paths) != 2 {
			t.Fatalf("run %d: inputs %q, want a.csv and b.csv", run, paths)
		}
		st, err := RunBatch(paths, BatchOptions{Dir: out, Jobs: 2, Version: "v", Analyze: okAnalyze})
		if err != nil {
			t.Fatal(err)
		}
		if rows := readSummary(t, out); len(rows) != 2 {
			t.Fatalf("run %d: %d summary rows, want 2", run, len(rows))
		}
		if run == 2 && st.Skipped != 2 {
			t.Errorf("run 2: %+v, want both skipped", st)
		}
	}
	// Files inside the output folder given explicitly are left out too, with a log line.
	var logs []string
	st, err := RunBatch([]string{filepath.Join(out, "summary.csv"), filepath.Join(d, "a.csv")},
		BatchOptions{Dir: out, Version: "v", Analyze: okAnalyze, Log: func(l string) { logs = append(logs, l) }})
	if err != nil || st.Inputs != 1 || !strings.Contains(strings.Join(logs, "\n"), "inside the output folder") {
		t.Errorf("explicit file in the output: %+v %v %q", st, err, logs)
	}
	// A copy of a result folder elsewhere is not an input either, nor its figures.
	other := t.TempDir()
	os.CopyFS(filepath.Join(other, "copy"), os.DirFS(filepath.Join(out, ResultFolderName(filepath.Join(d, "a.csv")))))
	writeInputs(t, other, "c.csv")
	paths, err := ListInputs([]string{other, filepath.Join(other, "copy", "result.json")}, nil, "")
	if err != nil || len(paths) != 1 || filepath.Base(paths[0]) != "c.csv" {
		t.Errorf("inputs beside a result folder: %q %v", paths, err)
	}
}

// TestBatchOneFileManyNames: relative, absolute, ./d/../d/x.csv and a symbolic link are one
// input and one row.
func TestBatchOneFileManyNames(t *testing.T) {
	d := t.TempDir()
	p := writeInputs(t, d, "x.csv")[0]
	link := filepath.Join(t.TempDir(), "link.csv")
	if err := os.Symlink(p, link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	wd, _ := os.Getwd()
	rel, err := filepath.Rel(wd, p)
	if err != nil {
		t.Fatal(err)
	}
	names := []string{rel, p, filepath.Join(d, "..", filepath.Base(d), ".", "x.csv"), link}
	paths, err := ListInputs(names, nil, "")
	if err != nil || len(paths) != 1 || paths[0] != CanonicalPath(p) {
		t.Fatalf("ListInputs: %q %v", paths, err)
	}
	out := t.TempDir()
	st, err := RunBatch(names, BatchOptions{Dir: out, Jobs: 2, Version: "v", Analyze: okAnalyze})
	if err != nil || st.Inputs != 1 || st.OK != 1 {
		t.Fatalf("RunBatch: %+v %v", st, err)
	}
	if rows := readSummary(t, out); len(rows) != 1 {
		t.Fatalf("%d rows", len(rows))
	}
}

// TestBatchKillBetweenRenames: a kill after the old result was moved aside and before the new
// one was renamed in leaves .old-NAME-…; merge puts it back and lists it, and a resumed run
// skips it as complete.
func TestBatchKillBetweenRenames(t *testing.T) {
	in, out := t.TempDir(), t.TempDir()
	paths := writeInputs(t, in, "a.csv", "b.csv")
	opt := BatchOptions{Dir: out, Version: "v", Analyze: okAnalyze}
	if _, err := RunBatch(paths, opt); err != nil {
		t.Fatal(err)
	}
	name := ResultFolderName(paths[0])
	// The state a kill leaves: the result moved aside, a half-written new one in .tmp-.
	if err := os.Rename(filepath.Join(out, name), filepath.Join(out, oldPrefix+name+"-zz1")); err != nil {
		t.Fatal(err)
	}
	os.MkdirAll(filepath.Join(out, tmpPrefix+name+"-123"), 0o755)
	os.WriteFile(filepath.Join(out, tmpPrefix+name+"-123", "result.json"), []byte(`{"status":`), 0o644)
	rows, err := Merge(out)
	if err != nil || len(rows) != 2 || rows[0][9] != StatusOK || rows[1][9] != StatusOK {
		t.Fatalf("merge: %q %v", rows, err)
	}
	if _, err := os.Stat(filepath.Join(out, name, "result.json")); err != nil {
		t.Fatal("the old result was not put back:", err)
	}
	old := filepath.Join(out, tmpPrefix+name+"-123")
	past := time.Now().Add(-time.Hour)
	os.Chtimes(old, past, past)
	st, err := RunBatch(paths, opt)
	if err != nil || st.Skipped != 2 {
		t.Fatalf("resume: %+v %v, want both skipped", st, err)
	}
	if _, err := os.Stat(old); !errors.Is(err, os.ErrNotExist) {
		t.Error("the leftover .tmp- folder was not cleaned")
	}
}

// TestBatchMergeReportsMissing: an input a batch took on whose result never appeared (a kill
// during its analysis) is a "missing" row, not dropped.
func TestBatchMergeReportsMissing(t *testing.T) {
	in, out := t.TempDir(), t.TempDir()
	paths := writeInputs(t, in, "a.csv", "b.csv")
	if _, err := RunBatch(paths, BatchOptions{Dir: out, Version: "v", Analyze: okAnalyze}); err != nil {
		t.Fatal(err)
	}
	os.RemoveAll(filepath.Join(out, ResultFolderName(paths[1])))
	rows, err := Merge(out)
	if err != nil || len(rows) != 2 {
		t.Fatalf("%q %v", rows, err)
	}
	if rows[1][0] != CanonicalPath(paths[1]) || rows[1][9] != StatusMissing || !strings.Contains(rows[1][10], "run the batch again") {
		t.Errorf("row %q", rows[1])
	}
}

// TestCleanLeftoversAge: leftovers last changed before the run started are removed; those of
// a batch running at the same time (changed later) are kept. The times are set, not waited for.
func TestCleanLeftoversAge(t *testing.T) {
	dir := t.TempDir()
	start := time.Now()
	for n, age := range map[string]time.Duration{".tmp-a-1": -time.Hour, ".old-a-x-2": -time.Minute, ".tmp-b-3": time.Minute, "keep-1": -time.Hour} {
		p := filepath.Join(dir, n)
		os.MkdirAll(p, 0o755)
		os.Chtimes(p, start.Add(age), start.Add(age))
	}
	// .old-a-x-2 has no complete result: it is not put back, only removed as stale.
	if err := CleanLeftovers(dir, start); err != nil {
		t.Fatal(err)
	}
	ents, _ := os.ReadDir(dir)
	var names []string
	for _, e := range ents {
		names = append(names, e.Name())
	}
	if strings.Join(names, ",") != ".tmp-b-3,keep-1" {
		t.Errorf("left %q, want .tmp-b-3 and keep-1", names)
	}
}

// TestBatchConcurrent: four batches at once on one folder, each replacing every result
// (error results with --retry-errors), never fail and leave one complete result per input.
func TestBatchConcurrent(t *testing.T) {
	in, out := t.TempDir(), t.TempDir()
	paths := writeInputs(t, in, "a.csv", "b.csv", "c.csv")
	fail := func(p string) (*Result, error) { return nil, errors.New("no") }
	var wg sync.WaitGroup
	errs := make(chan error, 8)
	for b := 0; b < 4; b++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for round := 0; round < 3; round++ {
				if _, err := RunBatch(paths, BatchOptions{Dir: out, Jobs: 2, Version: "v", RetryErrors: true, Analyze: fail}); err != nil {
					errs <- err
					return
				}
			}
		}()
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		t.Error(err)
	}
	rows, err := Merge(out)
	if err != nil || len(rows) != 3 {
		t.Fatalf("%q %v", rows, err)
	}
	for _, r := range rows {
		if r[9] != StatusError || r[10] != "no" {
			t.Errorf("row %q", r)
		}
	}
}

// TestReplaceDirSwaps: replacing a non-empty result folder leaves exactly the new content
// and no temporary folder.
func TestReplaceDirSwaps(t *testing.T) {
	dir := t.TempDir()
	dst, tmp := filepath.Join(dir, "r"), filepath.Join(dir, ".tmp-r-1")
	for p, content := range map[string]string{dst: "old", tmp: "new"} {
		os.MkdirAll(p, 0o755)
		os.WriteFile(filepath.Join(p, "result.json"), []byte(content), 0o644)
		os.WriteFile(filepath.Join(p, content+".only"), nil, 0o644)
	}
	if err := replaceDir(tmp, dst); err != nil {
		t.Fatal(err)
	}
	ents, _ := os.ReadDir(dir)
	b, _ := os.ReadFile(filepath.Join(dst, "result.json"))
	_, oldOnly := os.Stat(filepath.Join(dst, "old.only"))
	if len(ents) != 1 || string(b) != "new" || oldOnly == nil {
		t.Errorf("entries %d, result %q, old file present %v", len(ents), b, oldOnly == nil)
	}
}

// TestUserSummaryIsAnInput: a data folder holding the user's own summary.csv is not taken for
// a result folder.
func TestUserSummaryIsAnInput(t *testing.T) {
	d := t.TempDir()
	writeInputs(t, d, "a.csv", "summary.csv")
	paths, err := ListInputs([]string{d}, nil, "")
	if err != nil || len(paths) != 2 {
		t.Errorf("inputs %q %v, want a.csv and summary.csv", paths, err)
	}
}
