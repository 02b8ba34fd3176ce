package slurm

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// fakeTool writes an executable shell script named name into dir that appends its arguments,
// one per line followed by a line "--", to log, and then runs body.
func fakeTool(t *testing.T, dir, name, log, body string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	src := fmt.Sprintf("#!/bin/sh\nfor a in \"$@\"; do printf '%%s\\n' \"$a\" >> %q; done\necho -- >> %q\n%s\n", log, log, body)
	if err := os.WriteFile(p, []byte(src), 0o755); err != nil {
		t.Fatal(err)
	}
	return p
}

// writeSized writes a file of exactly n bytes.
func writeSized(t *testing.T, path string, n int) {
	t.Helper()
	if err := os.WriteFile(path, make([]byte, n), 0o644); err != nil {
		t.Fatal(err)
	}
}

func generator(t *testing.T) string {
	t.Helper()
	p, err := filepath.Abs("unfold-array.sh")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("bash is not on PATH")
	}
	return p
}

func run(t *testing.T, env []string, dir, name string, args ...string) (string, string, error) {
	t.Helper()
	cmd := exec.Command(name, args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), env...)
	var so, se strings.Builder
	cmd.Stdout, cmd.Stderr = &so, &se
	err := cmd.Run()
	return so.String(), se.String(), err
}

func sbatchLine(t *testing.T, script, key string) string {
	t.Helper()
	m := regexp.MustCompile(`(?m)^#SBATCH --` + regexp.QuoteMeta(key) + `=(.*)$`).FindStringSubmatch(script)
	if m == nil {
		t.Fatalf("no #SBATCH --%s line in\n%s", key, script)
	}
	return m[1]
}

// TestDryRun checks the written array and merge scripts against the rules stated in
// unfold-array.sh: array size = shard count (0-based index), --cpus-per-task = jobs × threads,
// --mem = 256 MiB + jobs × 64 × largest input (a .gz counting 8×), per-task log files.
func TestDryRun(t *testing.T) {
	gen := generator(t)
	dir := t.TempDir()
	log := filepath.Join(dir, "unfold.log")
	bin := fakeTool(t, dir, "unfold", log, "")
	writeSized(t, filepath.Join(dir, "a.csv"), 1<<20)      // 1 MiB
	writeSized(t, filepath.Join(dir, "b.csv"), 1000)       // small
	writeSized(t, filepath.Join(dir, "c.csv.gz"), 200<<10) // counts 8 × 200 KiB = 1.6 MiB: the largest
	sub := filepath.Join(dir, "more")
	if err := os.Mkdir(sub, 0o755); err != nil {
		t.Fatal(err)
	}
	writeSized(t, filepath.Join(sub, "d.csv"), 10)

	// A stand-in sbatch first on PATH records any call: the dry run must make none.
	tools := filepath.Join(dir, "bin")
	if err := os.Mkdir(tools, 0o755); err != nil {
		t.Fatal(err)
	}
	slog := filepath.Join(dir, "sbatch.log")
	fakeTool(t, tools, "sbatch", slog, "exit 1")
	so, se, err := run(t, []string{"PATH=" + tools + ":/usr/bin:/bin"}, dir, "bash", gen, "-o", "out", "--shards", "3",
		"--jobs", "2", "--threads", "3", "--unfold", bin, "--time", "1:00:00", "--dry-run",
		"a.csv", "b.csv", "c.csv.gz", "more", "--", "--seed", "7")
	if err != nil {
		t.Fatalf("dry run: %v\n%s", err, se)
	}
	if _, err := os.Stat(slog); err == nil {
		t.Errorf("the dry run called sbatch")
	}
	array, err := os.ReadFile(filepath.Join(dir, "out/slurm/array.sbatch"))
	if err != nil {
		t.Fatal(err)
	}
	a := string(array)
	if !strings.Contains(so, a) {
		t.Errorf("dry run did not print the array script")
	}
	if got := sbatchLine(t, a, "array"); got != "0-2" { // 3 shards, 0-based index
		t.Errorf("--array=%s, want 0-2", got)
	}
	if got := sbatchLine(t, a, "cpus-per-task"); got != "6" { // jobs 2 × threads 3
		t.Errorf("--cpus-per-task=%s, want 6", got)
	}
	// 256 MiB + 2 × 64 × (8 × 200 KiB) = 256 MiB + 200 MiB.
	if got := sbatchLine(t, a, "mem"); got != "456M" {
		t.Errorf("--mem=%s, want 456M", got)
	}
	if got := sbatchLine(t, a, "time"); got != "1:00:00" {
		t.Errorf("--time=%s", got)
	}
	outDir := filepath.Join(dir, "out")
	if got := sbatchLine(t, a, "output"); got != outDir+"/slurm/logs/shard-%A_%a.out" {
		t.Errorf("--output=%s", got)
	}
	if got := sbatchLine(t, a, "error"); got != outDir+"/slurm/logs/shard-%A_%a.err" {
		t.Errorf("--error=%s", got)
	}
	list, err := os.ReadFile(filepath.Join(dir, "out/slurm/inputs.txt"))
	if err != nil {
		t.Fatal(err)
	}
	wantList := strings.Join([]string{dir + "/a.csv", dir + "/b.csv", dir + "/c.csv.gz", sub}, "\n") + "\n"
	if string(list) != wantList {
		t.Errorf("inputs.txt =\n%s\nwant\n%s", list, wantList)
	}
	merge, err := os.ReadFile(filepath.Join(dir, "out/slurm/merge.sbatch"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(merge), "batch --merge "+outDir+"\n") {
		t.Errorf("merge script does not run unfold batch --merge %s:\n%s", outDir, merge)
	}

	// Each task, run as Slurm would with its 0-based index, runs the 1-based shard.
	for id := 0; id < 3; id++ {
		os.Remove(log)
		_, se, err := run(t, []string{fmt.Sprintf("SLURM_ARRAY_TASK_ID=%d", id), "SLURM_ARRAY_TASK_COUNT=3"},
			dir, "bash", filepath.Join(dir, "out/slurm/array.sbatch"))
		if err != nil {
			t.Fatalf("task %d: %v\n%s", id, err, se)
		}
		got, _ := os.ReadFile(log)
		want := strings.Join([]string{"batch", "--list", outDir + "/slurm/inputs.txt", "-o", outDir,
			"--jobs", "2", "--threads", "3", "--shard", fmt.Sprintf("%d/3", id+1), "--seed", "7", "--"}, "\n") + "\n"
		if string(got) != want {
			t.Errorf("task %d ran\n%s\nwant\n%s", id, got, want)
		}
	}
	// An index outside the array is refused.
	if _, _, err := run(t, []string{"SLURM_ARRAY_TASK_ID=3"}, dir, "bash", filepath.Join(dir, "out/slurm/array.sbatch")); err == nil {
		t.Errorf("task 3 of a 0-2 array ran")
	}
}

// TestSubmit checks the submission with a stand-in sbatch: the merge job depends on the
// array job by afterok and is cancelled if that dependency can never be met.
func TestSubmit(t *testing.T) {
	gen := generator(t)
	dir := t.TempDir()
	bin := fakeTool(t, dir, "unfold", filepath.Join(dir, "unfold.log"), "")
	tools := filepath.Join(dir, "bin")
	if err := os.Mkdir(tools, 0o755); err != nil {
		t.Fatal(err)
	}
	slog := filepath.Join(dir, "sbatch.log")
	fakeTool(t, tools, "sbatch", slog, `n=$(grep -c '^--$' `+slog+`); echo "$((41 + n));cluster"`)
	writeSized(t, filepath.Join(dir, "a.csv"), 100)
	writeSized(t, filepath.Join(dir, "b.csv"), 100)
	so, se, err := run(t, []string{"PATH=" + tools + ":/usr/bin:/bin"}, dir, "bash", gen, "-o", "out",
		"--unfold", bin, "--shards", "8", "a.csv", "b.csv")
	if err != nil {
		t.Fatalf("submit: %v\n%s", err, se)
	}
	if so != "array 42\nmerge 43\n" {
		t.Errorf("stdout %q, want array 42, merge 43", so)
	}
	calls, _ := os.ReadFile(slog)
	out := filepath.Join(dir, "out")
	want := "--parsable\n" + out + "/slurm/array.sbatch\n--\n" +
		"--parsable\n--dependency=afterok:42\n--kill-on-invalid-dep=yes\n" + out + "/slurm/merge.sbatch\n--\n"
	if string(calls) != want {
		t.Errorf("sbatch calls\n%s\nwant\n%s", calls, want)
	}
	array, _ := os.ReadFile(filepath.Join(out, "slurm/array.sbatch"))
	if got := sbatchLine(t, string(array), "array"); got != "0-1" { // 8 shards asked, 2 inputs
		t.Errorf("--array=%s, want 0-1 (shards capped at the number of inputs)", got)
	}
}

// TestBadUsage checks that bad input is refused with exit status 2 and a message naming it.
func TestBadUsage(t *testing.T) {
	gen := generator(t)
	dir := t.TempDir()
	bin := fakeTool(t, dir, "unfold", filepath.Join(dir, "unfold.log"), "")
	for _, tc := range []struct {
		args []string
		msg  string
	}{
		{[]string{"-o", "out", "--unfold", bin, "missing.csv"}, "missing.csv"},
		{[]string{"--unfold", bin, "x"}, "missing -o"},
		{[]string{"-o", "out", "--unfold", bin, "--shards", "0", "x"}, "--shards"},
		{[]string{"-o", "out", "--unfold", bin, "--mem", "lots", "x"}, "--mem"},
		{[]string{"-o", "out", "--unfold", bin}, "no inputs"},
	} {
		_, se, err := run(t, nil, dir, "bash", append([]string{gen}, tc.args...)...)
		if ee, ok := err.(*exec.ExitError); !ok || ee.ExitCode() != 2 {
			t.Errorf("%v: err %v, want exit status 2", tc.args, err)
		}
		if !strings.Contains(se, tc.msg) {
			t.Errorf("%v: message %q does not name %q", tc.args, se, tc.msg)
		}
	}
}
