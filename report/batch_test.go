package report

import (
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestShardCovers checks that the N shards are disjoint and cover every input exactly once.
func TestShardCovers(t *testing.T) {
	for total := 0; total <= 23; total++ {
		paths := make([]string, total)
		for i := range paths {
			paths[i] = fmt.Sprintf("f%03d", i)
		}
		for n := 1; n <= 7; n++ {
			seen := map[string]int{}
			for k := 1; k <= n; k++ {
				for _, p := range Shard(paths, k, n) {
					seen[p]++
				}
			}
			if len(seen) != total {
				t.Fatalf("%d inputs, %d shards: %d covered", total, n, len(seen))
			}
			for p, c := range seen {
				if c != 1 {
					t.Fatalf("%d inputs, %d shards: %s in %d shards", total, n, p, c)
				}
			}
		}
	}
}

func TestParseShard(t *testing.T) {
	if k, n, err := ParseShard("3/8"); err != nil || k != 3 || n != 8 {
		t.Fatalf("3/8: %d %d %v", k, n, err)
	}
	for _, bad := range []string{"0/4", "5/4", "1", "a/b", "1/0", "-1/2"} {
		if _, _, err := ParseShard(bad); err == nil {
			t.Errorf("%q accepted", bad)
		}
	}
}

func TestFolderName(t *testing.T) {
	a, b := FolderName("x/run 1.csv.gz"), FolderName("y/run 1.csv.gz")
	if a == b || !strings.HasPrefix(a, "run_1-") || strings.ContainsAny(a, " /") {
		t.Fatalf("folder names %q, %q", a, b)
	}
	if FolderName("./x/run 1.csv.gz") != a {
		t.Fatal("the folder name must not depend on ./ in the path")
	}
	if n := FolderName("../.."); strings.HasPrefix(n, ".") || n == "" {
		t.Fatalf("folder name %q", n)
	}
}

func TestListInputs(t *testing.T) {
	dir := t.TempDir()
	for _, p := range []string{"a.csv", "b.csv", "sub/c.csv", ".hidden.csv", "sub/.skip/d.csv"} {
		p = filepath.Join(dir, p)
		os.MkdirAll(filepath.Dir(p), 0o755)
		os.WriteFile(p, []byte("1\n2\n"), 0o644)
	}
	got, err := ListInputs([]string{dir, filepath.Join(dir, "*.csv")}, strings.NewReader("# comment\n\n"+filepath.Join(dir, "b.csv")+"\n"), "list")
	if err != nil {
		t.Fatal(err)
	}
	want := []string{filepath.Join(dir, "a.csv"), filepath.Join(dir, "b.csv"), filepath.Join(dir, "sub/c.csv")}
	if strings.Join(got, "|") != strings.Join(want, "|") {
		t.Fatalf("got %v, want %v", got, want)
	}
	if _, err := ListInputs([]string{filepath.Join(dir, "missing.csv")}, nil, ""); err == nil {
		t.Error("a missing file was accepted")
	}
	if _, err := ListInputs([]string{filepath.Join(dir, "*.npy")}, nil, ""); err == nil {
		t.Error("a pattern matching nothing was accepted")
	}
}

// TestRunBatchResumeAndErrors: a failing and a panicking input give error rows and the others
// complete; a second run skips everything; a changed input is analysed again; leftover
// temporary folders are ignored by the merge.
func TestRunBatchResumeAndErrors(t *testing.T) {
	in, out := t.TempDir(), t.TempDir()
	var paths []string
	for i := 0; i < 5; i++ {
		p := filepath.Join(in, fmt.Sprintf("s%d.csv", i))
		os.WriteFile(p, []byte(fmt.Sprintf("%d\n", i)), 0o644)
		paths = append(paths, p)
	}
	opt := BatchOptions{Dir: out, Jobs: 3, Version: "v", Analyze: func(p string) (*Result, error) {
		switch filepath.Base(p) {
		case "s1.csv":
			return nil, errors.New("s1.csv: line 1, column 1: not a number")
		case "s2.csv":
			panic("boom")
		}
		sum, _ := FileSHA256(p)
		return Run(Header{Version: "v", Input: Input{Path: p, SHA256: sum, Samples: 1, Dt: 1}}, fakeStages(p)[1:2], nil, nil), nil
	}}
	os.MkdirAll(filepath.Join(out, ".tmp-left-over"), 0o755)
	os.WriteFile(filepath.Join(out, ".tmp-left-over", "result.json"), []byte("{"), 0o644)
	st, err := RunBatch(paths, opt)
	if err != nil {
		t.Fatal(err)
	}
	if st.OK != 3 || st.Errors != 2 || st.Skipped != 0 {
		t.Fatalf("first run: %+v", st)
	}
	rows := readSummary(t, out)
	if len(rows) != 5 {
		t.Fatalf("summary has %d rows, want 5", len(rows))
	}
	for _, r := range rows {
		wantErr := strings.HasSuffix(r[0], "s1.csv") || strings.HasSuffix(r[0], "s2.csv")
		if (r[9] == StatusError) != wantErr || (wantErr && r[10] == "") || (!wantErr && r[3] != "7") {
			t.Errorf("row %v", r)
		}
	}
	st, err = RunBatch(paths, opt)
	if err != nil || st.Skipped != 5 {
		t.Fatalf("second run: %+v %v: want all 5 skipped", st, err)
	}
	os.WriteFile(paths[0], []byte("changed\n"), 0o644)
	opt.RetryErrors = true
	st, err = RunBatch(paths, opt)
	if err != nil || st.Skipped != 2 || st.OK != 1 || st.Errors != 2 {
		t.Fatalf("third run: %+v %v: want the changed input and the two errors again", st, err)
	}
	var h resultHead
	b, _ := os.ReadFile(filepath.Join(out, FolderName(paths[0]), "result.json"))
	json.Unmarshal(b, &h)
	if sum, _ := FileSHA256(paths[0]); h.Input.SHA256 != sum {
		t.Fatal("the re-analysed result does not carry the new SHA-256")
	}
	if len(readSummary(t, out)) != 5 {
		t.Fatal("summary rows after the third run")
	}
}

func readSummary(t *testing.T, dir string) [][]string {
	t.Helper()
	f, err := os.Open(filepath.Join(dir, "summary.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(recs[0], ",") != strings.Join(SummaryHeader(), ",") {
		t.Fatalf("header %v", recs[0])
	}
	return recs[1:]
}
