package main

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"unfold/report"
)

// readSweepCSV reads DIR/sweep.csv: its bytes, header and rows.
func readSweepCSV(t *testing.T, dir string) ([]byte, []string, [][]string) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, "sweep.csv"))
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(strings.NewReader(string(b))).ReadAll()
	if err != nil || len(recs) < 1 {
		t.Fatalf("sweep.csv: %v\n%s", err, b)
	}
	return b, recs[0], recs[1:]
}

// TestSweepLogistic simulates a small logistic-map sweep and analyses it. The facts (x' =
// r x (1 − x)): period doubling accumulates at r∞ = 3.5699456… (Feigenbaum 1978, "Quantitative
// universality for a class of nonlinear transformations", J. Stat. Phys. 19, 25), so r = 3.5
// (stable period 4) is periodic and r = 3.6 lies beyond r∞ (λ ≈ +0.18 there, from memory);
// the period-3 window opens at r = 1 + √8 = 3.8284271 (exact, tangent bifurcation of f³), so
// r = 3.82843 (just above it) and r = 3.835 are periodic; λ = ln 2 at r = 4 (exact: conjugacy
// to the tent map), λ < 0 on periodic orbits.
func TestSweepLogistic(t *testing.T) {
	dir := t.TempDir()
	recs, res := filepath.Join(dir, "recs"), filepath.Join(dir, "res")
	if _, errs, code := runCLI(t, "", "simulate", "logistic", "--sweep", "r=4,3.835,3.5,3.82843,3.6", "--n", "2000", "-o", recs); code != 0 {
		t.Fatalf("simulate: exit %d: %s", code, errs)
	}
	out, errs, code := runCLI(t, "", "sweep", filepath.Join(recs, "list.csv"), "--jobs", "2", "-o", res)
	if code != 0 {
		t.Fatalf("sweep: exit %d: %s", code, errs)
	}
	_, h, rows := readSweepCSV(t, res)
	// The columns of issue 17, the parameter's own name first.
	if got, want := strings.Join(h, ","), "r,regime,confidence,lag,dimension,lambda_max,lambda_lo,lambda_hi,d2,d2_lo,d2_hi,"+
		"entropy_rate,statistical_complexity,frequencies,status,path"; got != want {
		t.Fatalf("header\n%s\nwant\n%s", got, want)
	}
	col := map[string]int{}
	for i, c := range h {
		col[c] = i
	}
	// Sorted by r although the list is not.
	wantR := []float64{3.5, 3.6, 3.82843, 3.835, 4}
	if len(rows) != len(wantR) {
		t.Fatalf("%d rows, want %d", len(rows), len(wantR))
	}
	num := func(row []string, c string) float64 {
		v, err := strconv.ParseFloat(row[col[c]], 64)
		if err != nil {
			return math.NaN()
		}
		return v
	}
	wantRegime := []string{"periodic", "chaotic", "periodic", "periodic", "chaotic"}
	for i, row := range rows {
		if r := num(row, "r"); r != wantR[i] {
			t.Errorf("row %d: r = %v, want %v (sorted)", i, r, wantR[i])
		}
		if got := row[col["regime"]]; got != wantRegime[i] {
			t.Errorf("r = %v: regime %q, want %q", wantR[i], got, wantRegime[i])
		}
		lam, lo, hi := num(row, "lambda_max"), num(row, "lambda_lo"), num(row, "lambda_hi")
		switch {
		case wantRegime[i] == "chaotic" && !(lo > 0):
			t.Errorf("r = %v: λ1 = %v, interval from %v: want it above zero", wantR[i], lam, lo)
		case wantRegime[i] == "periodic" && !(lam <= 0 && hi <= 0 && lo <= lam && lam <= hi):
			// λ1 < 0 on a stable periodic orbit; a record lying exactly on its orbit (it
			// repeats to the last bit, as r = 3.5 and 3.835 do here) only shows that the
			// divergence does not grow: the bound λ1 ≤ 0, reported as 0 with [0, 0].
			t.Errorf("r = %v: λ1 = %v [%v, %v] on a periodic orbit, want it and its interval ≤ 0", wantR[i], lam, lo, hi)
		}
		// No impossible number: D2 ≥ 0 with its interval around it (a correlation sum never
		// decreases with r). (D2 is read at the fractal stage's own m, which sweep.csv does
		// not carry, so D2 ≤ m is checked in package dimension.)
		if d, lo, hi := num(row, "d2"), num(row, "d2_lo"), num(row, "d2_hi"); !(lo >= 0 && lo <= d && d <= hi) {
			t.Errorf("r = %v: D2 = %v [%v, %v], want 0 ≤ lo ≤ D2 ≤ hi", wantR[i], d, lo, hi)
		}
		if st := row[col["status"]]; st != report.StatusOK && st != report.StatusPartial {
			t.Errorf("r = %v: status %q", wantR[i], st)
		}
	}
	// λ = ln 2 at r = 4 within ±5 % (CHECKS.md, suggested tolerance for maps with N = 2000–5000),
	// and its interval holds ln 2.
	if lam, lo, hi := num(rows[4], "lambda_max"), num(rows[4], "lambda_lo"), num(rows[4], "lambda_hi"); math.Abs(lam-math.Ln2) > 0.05*math.Ln2 || !(lo <= math.Ln2 && math.Ln2 <= hi) {
		t.Errorf("r = 4: λ1 = %v [%v, %v], want ln 2 = %.6f ± 5 %% inside the interval", lam, lo, hi, math.Ln2)
	}
	// D2 = 1 at r = 4 with logarithmic corrections (the invariant density 1/(π√(x(1−x))) has a
	// divergent ∫ρ²; CHECKS.md §4 suggests [0.9, 1.05]): logged, not asserted, because the
	// fractal stage reads D2 in higher m where 2000 points fall short.
	if d := num(rows[4], "d2"); !(d >= 0.9 && d <= 1.05) {
		t.Logf("r = 4: D2 = %v outside [0.9, 1.05] (CHECKS.md §4)", d)
	}
	// r = 3.82843 lies just above the window's tangent bifurcation, where the period-3 orbit
	// attracts slowly and the record still converges: there the sign can be measured.
	if lam, hi := num(rows[2], "lambda_max"), num(rows[2], "lambda_hi"); !(lam < 0 && hi < 0) {
		t.Errorf("r = 3.82843: λ1 = %v, interval up to %v; want both below 0", lam, hi)
	}
	want := "periodic up to r = 3.5, chaotic at r = 3.6; periodic again in r = 3.82843 … 3.835; chaotic again from r = 4."
	if !strings.Contains(out, want+"\n") {
		t.Errorf("the transitions line is not printed; want %q in\n%s", want, out)
	}
	if b, err := os.ReadFile(filepath.Join(res, "sweep.html")); err != nil || !strings.Contains(string(b), want) {
		t.Errorf("sweep.html does not state the transitions (%v)", err)
	}
}

// sweepJSON is the part of sweep --json the tests read.
type sweepJSON struct {
	Inputs, Skipped, OK, Partial, Errors int
	Transitions                          []string
	Cautions                             []string
	Rows                                 []struct {
		Value     float64
		Status    string
		LambdaMax *float64 `json:"lambda_max"`
	}
}

// TestSweepResume interrupts a sweep after the first of two shards: the full run then skips
// the finished record, and --merge gives the sweep.csv of a one-shot run.
func TestSweepResume(t *testing.T) {
	dir := t.TempDir()
	recs := filepath.Join(dir, "recs")
	if _, errs, code := runCLI(t, "", "simulate", "logistic", "--sweep", "r=3.5,3.835,4", "--n", "1000", "-o", recs); code != 0 {
		t.Fatalf("simulate: exit %d: %s", code, errs)
	}
	list := filepath.Join(recs, "list.csv")
	sweep := func(res string, args ...string) sweepJSON {
		t.Helper()
		out, errs, code := runCLI(t, "", append([]string{"sweep", list, "--json", "--jobs", "2", "-o", res}, args...)...)
		if code != 0 {
			t.Fatalf("sweep %v: exit %d: %s", args, code, errs)
		}
		var js sweepJSON
		if err := json.Unmarshal([]byte(out), &js); err != nil {
			t.Fatalf("sweep %v: stdout is not one JSON object: %v\n%s", args, err, out)
		}
		return js
	}
	one := filepath.Join(dir, "one")
	sweep(one)
	oneCSV, _, _ := readSweepCSV(t, one)

	res := filepath.Join(dir, "res")
	// Shard 1 of 2 takes the first ⌊3/2⌋ = 1 of the paths in sorted order (report.Shard).
	js := sweep(res, "--shard", "1/2")
	missing := 0
	for _, r := range js.Rows {
		if r.Status == "missing" {
			missing++
		}
	}
	if js.Inputs != 1 || js.Skipped != 0 || missing != 2 || len(js.Cautions) == 0 {
		t.Errorf("shard 1/2: %d inputs, %d skipped, %d missing rows, cautions %q; want 1, 0, 2 and a caution", js.Inputs, js.Skipped, missing, js.Cautions)
	}
	js = sweep(res)
	if js.Inputs != 3 || js.Skipped != 1 || js.OK+js.Partial+js.Errors != 2 {
		t.Errorf("resumed run: %d inputs, %d skipped, %d analysed; want 3, 1 and 2", js.Inputs, js.Skipped, js.OK+js.Partial+js.Errors)
	}
	for _, r := range js.Rows {
		if r.LambdaMax != nil && math.IsNaN(*r.LambdaMax) {
			t.Errorf("r = %v: NaN in JSON", r.Value)
		}
	}
	resumed, _, _ := readSweepCSV(t, res)
	if err := os.Remove(filepath.Join(res, "sweep.csv")); err != nil {
		t.Fatal(err)
	}
	js = sweep(res, "--merge")
	if js.Inputs != 0 || len(js.Rows) != 3 || len(js.Transitions) == 0 {
		t.Errorf("--merge: %d inputs, %d rows, transitions %q; want 0, 3 and some", js.Inputs, len(js.Rows), js.Transitions)
	}
	merged, _, _ := readSweepCSV(t, res)
	if string(merged) != string(oneCSV) || string(resumed) != string(oneCSV) {
		t.Errorf("sweep.csv after shards and merge differs from a one-shot run:\none-shot\n%s\nresumed\n%s\nmerged\n%s", oneCSV, resumed, merged)
	}
}

// TestSweepBadList checks the refusals: bad input exits with status 2 and says where.
func TestSweepBadList(t *testing.T) {
	dir := t.TempDir()
	list := filepath.Join(dir, "list.csv")
	if err := os.WriteFile(list, []byte("file,r\na.csv,3.5\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errs, code := runCLI(t, "", "sweep", list, "-o", filepath.Join(dir, "res"))
	if code != 2 || !strings.Contains(errs, list+":1:1: no column named path") {
		t.Errorf("no path column: exit %d, %q; want 2 and %s:1:1", code, errs, list)
	}
	if err := os.WriteFile(list, []byte("path,r\na.csv,3.5\nb.csv,three\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errs, code = runCLI(t, "", "sweep", list, "-o", filepath.Join(dir, "res"))
	if code != 2 || !strings.Contains(errs, list+":3:7:") {
		t.Errorf("bad parameter: exit %d, %q; want 2 and %s:3:7", code, errs, list)
	}
	for _, args := range [][]string{
		{"sweep", list}, // no -o
		{"sweep", filepath.Join(dir, "none.csv"), "-o", dir},      // no such list
		{"sweep", list, "--shard", "3/2", "-o", dir},              // K > N
		{"sweep", list, "--merge", "-o", filepath.Join(dir, "x")}, // nothing to merge
	} {
		if err := os.WriteFile(list, []byte("path,r\na.csv,3.5\n"), 0o644); err != nil {
			t.Fatal(err)
		}
		if _, errs, code := runCLI(t, "", args...); code != 2 {
			t.Errorf("%v: exit %d (%s), want 2", args, code, errs)
		}
	}
}

// TestSweepRelativeList: a LIST given by a relative path, with relative record paths (as
// `simulate --sweep` writes it), finds the result folders the batch wrote (they are named after
// the records' resolved absolute paths); no row is "missing".
func TestSweepRelativeList(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	if _, errs, code := runCLI(t, "", "simulate", "logistic", "--sweep", "r=3.5,4", "--n", "1200", "-o", "sw"); code != 0 {
		t.Fatalf("simulate: exit %d: %s", code, errs)
	}
	if _, errs, code := runCLI(t, "", "sweep", "sw/list.csv", "--jobs", "2", "-o", "out"); code != 0 {
		t.Fatalf("sweep: exit %d: %s", code, errs)
	}
	_, h, rows := readSweepCSV(t, "out")
	st := -1
	for i, c := range h {
		if c == "status" {
			st = i
		}
	}
	if st < 0 || len(rows) != 2 {
		t.Fatalf("header %v, %d rows", h, len(rows))
	}
	for _, r := range rows {
		if r[st] == "missing" {
			t.Errorf("row %v: missing, want the batch's result", r)
		}
	}
}
