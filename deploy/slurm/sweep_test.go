package slurm

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// TestSweepDryRun checks the scripts written for a sweep (--sweep LIST) against the rules
// stated in unfold-array.sh: the records are LIST's paths (relative ones beside LIST), the
// array has one task per shard (capped at the number of records), every task runs
// `unfold sweep LIST --shard K/N` with the 1-based K, and the merge job runs
// `unfold sweep LIST --merge`, both with --parameter.
func TestSweepDryRun(t *testing.T) {
	gen := generator(t)
	dir := t.TempDir()
	log := filepath.Join(dir, "unfold.log")
	bin := fakeTool(t, dir, "unfold", log, "")
	recs := filepath.Join(dir, "recs")
	if err := os.Mkdir(recs, 0o755); err != nil {
		t.Fatal(err)
	}
	writeSized(t, filepath.Join(recs, "r=3.5.csv"), 1000)
	writeSized(t, filepath.Join(recs, "r=3.6.csv"), 1<<20) // 1 MiB: the largest
	writeSized(t, filepath.Join(dir, "far.csv"), 10)
	list := filepath.Join(recs, "list.csv")
	body := "r,Path,run\n# a comment\n3.5,r=3.5.csv,a\n3.6,\"r=3.6.csv\",b\n3.7," + filepath.Join(dir, "far.csv") + ",c\n"
	if err := os.WriteFile(list, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	so, se, err := run(t, nil, dir, "bash", gen, "-o", "out", "--shards", "5", "--sweep", "recs/list.csv",
		"--parameter", "r", "--unfold", bin, "--dry-run", "--", "--seed", "7")
	if err != nil {
		t.Fatalf("dry run: %v\n%s", err, se)
	}
	array, err := os.ReadFile(filepath.Join(dir, "out/slurm/array.sbatch"))
	if err != nil {
		t.Fatal(err)
	}
	a := string(array)
	if !strings.Contains(so, a) {
		t.Errorf("dry run did not print the array script")
	}
	if got := sbatchLine(t, a, "array"); got != "0-2" { // 5 shards asked, 3 records
		t.Errorf("--array=%s, want 0-2", got)
	}
	if got := sbatchLine(t, a, "job-name"); got != "unfold-sweep" {
		t.Errorf("--job-name=%s", got)
	}
	// 256 MiB + 1 × 64 × 1 MiB (the largest record named by the list).
	if got := sbatchLine(t, a, "mem"); got != "320M" {
		t.Errorf("--mem=%s, want 320M", got)
	}
	merge, err := os.ReadFile(filepath.Join(dir, "out/slurm/merge.sbatch"))
	if err != nil {
		t.Fatal(err)
	}
	if got := sbatchLine(t, string(merge), "mem"); got != "320M" { // the merge reads each record again
		t.Errorf("merge --mem=%s, want 320M", got)
	}
	outDir := filepath.Join(dir, "out")
	for id := 0; id < 3; id++ {
		os.Remove(log)
		_, se, err := run(t, []string{fmt.Sprintf("SLURM_ARRAY_TASK_ID=%d", id)}, dir, "bash", filepath.Join(outDir, "slurm/array.sbatch"))
		if err != nil {
			t.Fatalf("task %d: %v\n%s", id, err, se)
		}
		got, _ := os.ReadFile(log)
		want := strings.Join([]string{"sweep", list, "-o", outDir, "--parameter", "r", "--jobs", "1", "--threads", "1",
			"--shard", fmt.Sprintf("%d/3", id+1), "--seed", "7", "--"}, "\n") + "\n"
		if string(got) != want {
			t.Errorf("task %d ran\n%s\nwant\n%s", id, got, want)
		}
	}
	os.Remove(log)
	if _, se, err := run(t, nil, dir, "bash", filepath.Join(outDir, "slurm/merge.sbatch")); err != nil {
		t.Fatalf("merge: %v\n%s", err, se)
	}
	got, _ := os.ReadFile(log)
	if want := strings.Join([]string{"sweep", list, "--merge", "-o", outDir, "--parameter", "r", "--"}, "\n") + "\n"; string(got) != want {
		t.Errorf("merge ran\n%s\nwant\n%s", got, want)
	}

	// Refusals: exit status 2 and a message that names the problem.
	noPath := filepath.Join(dir, "nopath.csv")
	missing := filepath.Join(dir, "missing.csv")
	os.WriteFile(noPath, []byte("file,r\na.csv,1\n"), 0o644)
	os.WriteFile(missing, []byte("path,r\nnot-there.csv,1\n"), 0o644)
	for _, tc := range []struct {
		args []string
		msg  string
	}{
		{[]string{"--sweep", list, "far.csv"}, "give no files"},
		{[]string{"--parameter", "r", "far.csv"}, "--parameter goes with --sweep"},
		{[]string{"--sweep", noPath}, "nopath.csv:1: no column named path"},
		{[]string{"--sweep", missing}, "not-there.csv: no such file"},
	} {
		_, se, err := run(t, nil, dir, "bash", append([]string{gen, "-o", "out2", "--unfold", bin, "--dry-run"}, tc.args...)...)
		if ee, ok := err.(*exec.ExitError); !ok || ee.ExitCode() != 2 {
			t.Errorf("%v: err %v, want exit status 2", tc.args, err)
		}
		if !strings.Contains(se, tc.msg) {
			t.Errorf("%v: message %q does not name %q", tc.args, se, tc.msg)
		}
	}
}
