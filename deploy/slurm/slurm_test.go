package slurm

import (
	"encoding/csv"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"syscall"
	"testing"
	"time"
)

// The scheduler test runs only where deploy/slurm/test.sh has brought up a single-node Slurm
// and set UNFOLD_SLURM_TEST=1 (and SLURM_CONF); elsewhere it skips and says so.

// slurmEnv skips the test unless a Slurm set up for it is up.
func slurmEnv(t *testing.T) string {
	t.Helper()
	if os.Getenv("UNFOLD_SLURM_TEST") == "" {
		t.Skip("Slurm integration test skipped: run bash deploy/slurm/test.sh (it installs and starts a single-node Slurm and sets UNFOLD_SLURM_TEST=1)")
	}
	for _, tool := range []string{"sbatch", "scontrol", "scancel", "bash", "go"} {
		if _, err := exec.LookPath(tool); err != nil {
			t.Fatalf("UNFOLD_SLURM_TEST is set but %s is not on PATH", tool)
		}
	}
	work := os.Getenv("UNFOLD_SLURM_WORK")
	if work == "" {
		return t.TempDir()
	}
	d, err := os.MkdirTemp(work, "t")
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// mustRun runs a command and fails the test with its output if it fails.
func mustRun(t *testing.T, dir, name string, args ...string) string {
	t.Helper()
	cmd := exec.Command(name, args...)
	cmd.Dir = dir
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("%s %s: %v\n%s", name, strings.Join(args, " "), err, out)
	}
	return string(out)
}

// readSummary reads DIR/summary.csv into rows keyed by the file column; every file must
// appear exactly once.
func readSummary(t *testing.T, dir string) (header []string, rows map[string][]string) {
	t.Helper()
	f, err := os.Open(filepath.Join(dir, "summary.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("%s/summary.csv: %v", dir, err)
	}
	if len(recs) == 0 {
		t.Fatalf("%s/summary.csv is empty", dir)
	}
	header = recs[0]
	want := []string{"file", "samples", "dt", "lag", "dimension", "lambda_max", "d2", "regime", "confidence", "status", "error",
		"entropy_rate", "statistical_complexity"}
	if strings.Join(header, ",") != strings.Join(want, ",") {
		t.Fatalf("%s/summary.csv header %v, want %v", dir, header, want)
	}
	rows = map[string][]string{}
	for i, r := range recs[1:] {
		if _, dup := rows[r[0]]; dup {
			t.Errorf("%s/summary.csv line %d: %s appears twice", dir, i+2, r[0])
		}
		rows[r[0]] = r
	}
	return header, rows
}

// checkSummary asserts that the summary has one row per input, the corrupt one with status
// error, and every row equal to the plain (unsharded, unscheduled) run's.
func checkSummary(t *testing.T, dir string, inputs []string, corrupt string, plain map[string][]string) {
	t.Helper()
	header, rows := readSummary(t, dir)
	if len(rows) != len(inputs) {
		t.Errorf("%s/summary.csv has %d rows, want %d (one per input)", dir, len(rows), len(inputs))
	}
	status := indexOf(header, "status")
	for _, in := range inputs {
		r, ok := rows[in]
		if !ok {
			t.Errorf("%s/summary.csv: no row for %s", dir, in)
			continue
		}
		if in == corrupt {
			if r[status] != "error" {
				t.Errorf("corrupt input %s: status %q, want error", in, r[status])
			}
		} else if r[status] == "error" {
			t.Errorf("input %s: status error: %v", in, r)
		}
		if p := plain[in]; strings.Join(p, "\x00") != strings.Join(r, "\x00") {
			t.Errorf("input %s: row under Slurm\n  %v\nplain unfold batch\n  %v", in, r, p)
		}
	}
}

func indexOf(xs []string, x string) int {
	for i, v := range xs {
		if v == x {
			return i
		}
	}
	return -1
}

// jobStates returns the state of every job (array tasks one by one) of the given job id.
func jobStates(t *testing.T, id string) map[string]string {
	t.Helper()
	out, err := exec.Command("scontrol", "show", "job", "-o", id).CombinedOutput()
	if err != nil {
		t.Fatalf("scontrol show job %s: %v\n%s", id, err, out)
	}
	st := map[string]string{}
	reTask := regexp.MustCompile(`ArrayTaskId=(\S+)`)
	reState := regexp.MustCompile(`JobState=(\S+)`)
	reID := regexp.MustCompile(`^JobId=(\S+)`)
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		s := reState.FindStringSubmatch(line)
		if s == nil {
			continue
		}
		key := ""
		if m := reTask.FindStringSubmatch(line); m != nil {
			key = m[1]
		} else if m := reID.FindStringSubmatch(line); m != nil {
			key = m[1]
		}
		st[key] = s[1]
	}
	return st
}

func active(state string) bool {
	switch state {
	case "PENDING", "RUNNING", "COMPLETING", "CONFIGURING", "SUSPENDED", "REQUEUED", "RESIZING":
		return true
	}
	return false
}

// waitJob polls until no task of job id is pending or running and returns the final states.
func waitJob(t *testing.T, id string, limit time.Duration) map[string]string {
	t.Helper()
	deadline := time.Now().Add(limit)
	for {
		st := jobStates(t, id)
		busy := false
		for _, s := range st {
			busy = busy || active(s)
		}
		if !busy && len(st) > 0 {
			return st
		}
		if time.Now().After(deadline) {
			t.Fatalf("job %s still active after %v: %v", id, limit, st)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// snapshot returns, for every result folder in dir (a top-level folder not starting with a
// dot, outside dir/slurm, holding result.json), the size and modification time of its
// result.json: a result written again gets a new time.
func snapshot(t *testing.T, dir string) map[string]string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	snap := map[string]string{}
	for _, e := range ents {
		if !e.IsDir() || e.Name() == "slurm" || strings.HasPrefix(e.Name(), ".") {
			continue
		}
		info, err := os.Stat(filepath.Join(dir, e.Name(), "result.json"))
		if err != nil {
			continue
		}
		snap[e.Name()] = fmt.Sprintf("%d %d", info.Size(), info.ModTime().UnixNano())
	}
	return snap
}

// submit runs unfold-array.sh over the list into out with 3 shards and returns the array and
// merge job ids it printed.
func submit(t *testing.T, dir, gen, out, bin, list string) (arrayID, mergeID string) {
	t.Helper()
	so := mustRun(t, dir, "bash", gen, "-o", out, "--shards", "3", "--threads", "1", "--unfold", bin, "--list", list)
	ids := map[string]string{}
	for _, line := range strings.Split(strings.TrimSpace(so), "\n") {
		if f := strings.Fields(line); len(f) == 2 {
			ids[f[0]] = f[1]
		}
	}
	if ids["array"] == "" || ids["merge"] == "" {
		t.Fatalf("unfold-array.sh printed no job ids: %q", so)
	}
	return ids["array"], ids["merge"]
}

// waitDone waits for the array and its merge job (polling scontrol: sbatch --wait polls at
// intervals of up to half a minute) and fails unless every task and the merge completed.
func waitDone(t *testing.T, arrayID, mergeID string) {
	t.Helper()
	for task, s := range waitJob(t, arrayID, 3*time.Minute) {
		if s != "COMPLETED" {
			t.Errorf("array job %s task %s: %s, want COMPLETED", arrayID, task, s)
		}
	}
	if s := waitJob(t, mergeID, time.Minute)[mergeID]; s != "COMPLETED" {
		t.Fatalf("merge job %s: %s, want COMPLETED", mergeID, s)
	}
}

// TestSlurmArray runs the generated array on a real Slurm over eight small inputs in three
// shards (task 1 has inputs 3–5 of 8 in path order):
//
//  1. an array in which task 1 is cancelled mid-run: the third input is a named pipe that no
//     one writes, so task 1 finishes input 3, then blocks on input 4 until it is cancelled;
//  2. input 4 becomes a regular signal and a plain `unfold batch` of all inputs gives the
//     reference summary;
//  3. a full array + merge in a fresh folder: summary.csv equals the plain one, the corrupt
//     input has status error;
//  4. run 1 is submitted again: the merge's summary.csv equals the plain one and only the two
//     inputs task 1 had not finished were computed.
func TestSlurmArray(t *testing.T) {
	dir := slurmEnv(t)
	bin := filepath.Join(dir, "unfold")
	t0 := time.Now()
	mustRun(t, "../..", "go", "build", "-o", bin, "./cmd/unfold")
	help, err := exec.Command(bin, "batch", "--help").CombinedOutput()
	if err != nil || !strings.Contains(string(help), "--shard") || !strings.Contains(string(help), "--merge") {
		t.Skipf("Slurm integration test skipped: this unfold has no batch command with --shard and --merge yet (%v)", err)
	}
	t.Logf("built unfold in %v", time.Since(t0).Round(time.Millisecond))
	gen, err := filepath.Abs("unfold-array.sh")
	if err != nil {
		t.Fatal(err)
	}
	var jobs []string
	t.Cleanup(func() { // nothing of ours may stay queued or blocked
		if len(jobs) > 0 {
			exec.Command("scancel", jobs...).Run()
		}
	})

	// Small signals of our own model systems, one corrupt file and one named pipe.
	data := filepath.Join(dir, "data")
	if err := os.Mkdir(data, 0o755); err != nil {
		t.Fatal(err)
	}
	names := []string{"s0-lorenz", "s1-rossler", "s2-henon", "s3-logistic", "s4-sines", "s5-corrupt", "s6-ar", "s7-noise"}
	var inputs []string
	for _, name := range names {
		inputs = append(inputs, filepath.Join(data, name+".csv"))
	}
	simulate := func(p string) {
		model := strings.TrimSuffix(filepath.Base(p), ".csv")[3:]
		mustRun(t, dir, bin, "simulate", model, "--n", "3000", "--quiet", "-o", p)
	}
	corrupt, pipe := inputs[5], inputs[3]
	for i, p := range inputs {
		switch i {
		case 5:
			if err := os.WriteFile(p, []byte("t,x\n0,0.5\n1,0.25\n2,not-a-number\n3,0.75\n"), 0o644); err != nil {
				t.Fatal(err)
			}
		case 3:
			if err := syscall.Mkfifo(p, 0o644); err != nil {
				t.Fatal(err)
			}
		default:
			simulate(p)
		}
	}
	list := filepath.Join(dir, "inputs.txt")
	if err := os.WriteFile(list, []byte(strings.Join(inputs, "\n")+"\n"), 0o644); err != nil {
		t.Fatal(err)
	}

	// 1. Task 1 cancelled mid-run.
	t1 := time.Now()
	resumed := filepath.Join(dir, "resumed")
	arrayID, mergeID := submit(t, dir, gen, resumed, bin, list)
	jobs = append(jobs, arrayID, mergeID)
	victim := arrayID + "_1"
	deadline := time.Now().Add(60 * time.Second)
	for {
		// Until the scheduler splits it off, a pending task is listed in a range ("1-2").
		st, split := jobStates(t, victim)["1"]
		done, _ := filepath.Glob(filepath.Join(resumed, "s2-henon-*", "result.json"))
		if st == "RUNNING" && len(done) == 1 {
			break
		}
		if split && !active(st) {
			t.Fatalf("task %s ended (%s) before it could be cancelled", victim, st)
		}
		if time.Now().After(deadline) {
			t.Fatalf("task %s: state %s, %d results of its first input after 60 s", victim, st, len(done))
		}
		time.Sleep(50 * time.Millisecond)
	}
	mustRun(t, dir, "scancel", victim)
	st := waitJob(t, arrayID, 60*time.Second)
	for task, want := range map[string]string{"0": "COMPLETED", "1": "CANCELLED", "2": "COMPLETED"} {
		if st[task] != want {
			t.Errorf("array job %s task %s: %s, want %s (states %v)", arrayID, task, st[task], want, st)
		}
	}
	if ms := waitJob(t, mergeID, 30*time.Second)[mergeID]; ms == "COMPLETED" {
		t.Errorf("merge job %s ran although task 1 was cancelled (afterok)", mergeID)
	}
	before := snapshot(t, resumed)
	if len(before) != len(inputs)-2 {
		t.Errorf("after cancelling task 1: %d result folders, want %d (all but inputs 4 and 5): %v", len(before), len(inputs)-2, before)
	}
	t.Logf("array with task 1 cancelled mid-run: %v", time.Since(t1).Round(time.Millisecond))

	// 2. The blocked input becomes a signal; the plain run of all inputs is the reference.
	if err := os.Remove(pipe); err != nil {
		t.Fatal(err)
	}
	simulate(pipe)
	t2 := time.Now()
	plainDir := filepath.Join(dir, "plain")
	// The exit status is 0 with a bad input (its row says error); summary.csv must be there.
	mustRun(t, dir, bin, "batch", "--list", list, "-o", plainDir, "--threads", "1", "--jobs", "1", "--quiet")
	_, plain := readSummary(t, plainDir)
	t.Logf("plain unfold batch over %d inputs: %v", len(inputs), time.Since(t2).Round(time.Millisecond))

	// 3. The whole array and its merge in a fresh folder.
	t3 := time.Now()
	full := filepath.Join(dir, "full")
	arrayID, mergeID = submit(t, dir, gen, full, bin, list)
	jobs = append(jobs, arrayID, mergeID)
	waitDone(t, arrayID, mergeID)
	t.Logf("array of 3 shards + merge under Slurm: %v", time.Since(t3).Round(time.Millisecond))
	checkSummary(t, full, inputs, corrupt, plain)
	for k := 0; k < 3; k++ {
		logs, _ := filepath.Glob(filepath.Join(full, "slurm/logs", fmt.Sprintf("shard-%s_%d.err", arrayID, k)))
		if len(logs) != 1 {
			t.Errorf("task %d: no error file shard-%s_%d.err in %s/slurm/logs", k, arrayID, k, full)
		}
	}

	// 4. Run 1 submitted again: it computes only the two inputs task 1 had not finished.
	t4 := time.Now()
	arrayID, mergeID = submit(t, dir, gen, resumed, bin, list)
	jobs = append(jobs, arrayID, mergeID)
	waitDone(t, arrayID, mergeID)
	t.Logf("resubmitted array + merge: %v", time.Since(t4).Round(time.Millisecond))
	checkSummary(t, resumed, inputs, corrupt, plain)
	after := snapshot(t, resumed)
	for f, v := range before {
		if w := after[f]; w != v {
			t.Errorf("resumed run wrote %s/result.json again (size and time %s, then %s): only missing inputs may be computed", f, v, w)
		}
	}
	if len(after) != len(inputs) {
		t.Errorf("after the resumed run: %d result folders, want %d", len(after), len(inputs))
	}
	t.Logf("Slurm test total %v", time.Since(t0).Round(time.Millisecond))
}
