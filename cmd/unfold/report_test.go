package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strconv"
	"strings"
	"testing"

	"golang.org/x/net/html"

	"unfold/analysis"
	"unfold/series"
)

var updateGolden = flag.Bool("update", false, "rewrite the golden files of the report tests")

// structure lists every key path of a JSON value with its type ("a.b[].c: number"); arrays
// contribute the union of their elements' paths.
func structure(v any, path string, out map[string]bool) {
	switch x := v.(type) {
	case map[string]any:
		out[path+": object"] = true
		for k, e := range x {
			p := k
			if path != "" {
				p = path + "." + k
			}
			structure(e, p, out)
		}
	case []any:
		out[path+": array"] = true
		for _, e := range x {
			structure(e, path+"[]", out)
		}
	case string:
		out[path+": string"] = true
	case float64:
		out[path+": number"] = true
	case bool:
		out[path+": bool"] = true
	case nil:
		out[path+": null"] = true
	}
}

// lookup follows a dotted path through decoded JSON objects.
func lookup(m map[string]any, path string) any {
	var v any = m
	for _, k := range strings.Split(path, ".") {
		o, ok := v.(map[string]any)
		if !ok {
			return nil
		}
		v = o[k]
	}
	return v
}

// reportDemoStages are the stages of the report, in order (each draws one figure on the page),
// and reportDemoFigures the names of their figure files.
var (
	reportDemoStages  = []string{"inspect", "lag", "dim", "embed", "lyapunov", "fractal", "regime", "symbols", "entropy", "states"}
	reportDemoFigures = []string{"signal", "lag", "dim", "embed", "lyapunov", "fractal", "regime", "symbols", "entropy", "states"}
)

// TestReportDemoGolden is the golden test of result.json on the demo signal: the set of keys
// and their types must equal testdata/report/demo_structure.golden, and the numbers listed in
// testdata/report/demo_values.golden must agree within a relative 1e-6 (integers exactly).
// Values that vary from run to run (wall times, the start time, the commit) are only typed.
// Refresh both with `go test ./cmd/unfold/ -run ReportDemoGolden -update` after a deliberate
// change, and review the diff.
func TestReportDemoGolden(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	stdout, stderr, code := runCLI(t, "", "report", "--demo", "--threads", "2", "-o", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	checkDemoSummary(t, dir, stdout)
	for _, st := range reportDemoStages {
		if !strings.Contains(stderr, "  "+st+" ") {
			t.Errorf("no progress line for stage %s in:\n%s", st, stderr)
		}
	}
	b, err := os.ReadFile(filepath.Join(dir, "result.json"))
	if err != nil {
		t.Fatal(err)
	}
	m := decode(t, string(b))
	set := map[string]bool{}
	structure(m, "", set)
	var lines []string
	for k := range set {
		lines = append(lines, k)
	}
	sort.Strings(lines)
	got := strings.Join(lines, "\n") + "\n"
	paths := []string{"input.samples", "input.dt", "inspect.mean", "inspect.std", "inspect.dominant_period",
		"lag.lag", "lag.lag_time", "lag.theiler", "dim.dimension", "dim.lag", "dim.theiler", "embed.vectors", "embed.dimension",
		"lyapunov.lambda_max", "lyapunov.fit.from", "lyapunov.fit.to", "lyapunov.parameters.lag", "lyapunov.parameters.dim", "lyapunov.parameters.theiler",
		"fractal.d2", "fractal.dimension", "fractal.parameters.lag", "fractal.parameters.theiler", "fractal.parameters.max_dim",
		"regime.confidence", "regime.parameters.lag", "regime.parameters.dim", "regime.parameters.theiler", "regime.parameters.surrogates",
		"symbols.count", "symbols.alphabet_size", "symbols.partition.score", "symbols.parameters.section.lag", "symbols.parameters.section.level",
		"entropy.entropy_rate", "entropy.excess_entropy", "entropy.lz76", "entropy.input.samples", "entropy.parameters.rate_length",
		"states.states", "states.statistical_complexity", "states.entropy_rate", "states.history_length", "states.input.samples"}
	var vals bytes.Buffer
	for _, p := range paths {
		v, ok := lookup(m, p).(float64)
		if !ok {
			t.Fatalf("%s is not a number in result.json", p)
		}
		fmt.Fprintf(&vals, "%s %s\n", p, strconv.FormatFloat(v, 'g', -1, 64))
	}
	gs, gv := filepath.Join("..", "..", "testdata", "report", "demo_structure.golden"), filepath.Join("..", "..", "testdata", "report", "demo_values.golden")
	if *updateGolden {
		os.MkdirAll(filepath.Dir(gs), 0o755)
		os.WriteFile(gs, []byte(got), 0o644)
		os.WriteFile(gv, vals.Bytes(), 0o644)
	}
	want, err := os.ReadFile(gs)
	if err != nil {
		t.Fatal(err)
	}
	if got != string(want) {
		t.Errorf("result.json structure differs from %s:\n%s", gs, lineDiff(string(want), got))
	}
	wv, err := os.ReadFile(gv)
	if err != nil {
		t.Fatal(err)
	}
	for _, line := range strings.Split(strings.TrimSpace(string(wv)), "\n") {
		f := strings.Fields(line)
		w, _ := strconv.ParseFloat(f[1], 64)
		g, _ := lookup(m, f[0]).(float64)
		if math.Abs(g-w) > 1e-6*math.Max(math.Abs(w), 1e-12) {
			t.Errorf("%s = %v, golden %v", f[0], g, w)
		}
	}
	// provenance and stage objects (DESIGN.md §3: every stage object is a full command object)
	pv := m["provenance"].(map[string]any)
	if pv["input_sha256"] != lookup(m, "input.sha256") || len(pv["stages"].([]any)) != len(reportDemoStages) || m["status"] != "ok" {
		t.Errorf("provenance %v, status %v", pv, m["status"])
	}
	for _, k := range reportDemoStages {
		sha := lookup(m, k+".input.sha256")
		if k == "entropy" { // its input is the symbol stream; its source is the report's input
			sha = lookup(m, "entropy.source.sha256")
		}
		if k == "states" { // its input is the same symbol stream as the entropy stage's
			if lookup(m, "states.input.sha256") != lookup(m, "entropy.input.sha256") {
				t.Errorf("states input %v, entropy input %v", lookup(m, "states.input"), lookup(m, "entropy.input"))
			}
			sha = lookup(m, "input.sha256")
		}
		if lookup(m, k+".command") != k || sha != lookup(m, "input.sha256") {
			t.Errorf("%s: command %v, input %v", k, lookup(m, k+".command"), lookup(m, k+".input"))
		}
	}
	page, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	// one figure per stage that ran
	checkReportPage(t, page, len(reportDemoStages))
	checkStageFigures(t, page, map[string]string{"symbols": "symbols", "entropy": "entropy"})
	for _, f := range reportDemoFigures {
		if _, err := os.Stat(filepath.Join(dir, "figures", f+".svg")); err != nil {
			t.Error(err)
		}
	}
}

func lineDiff(want, got string) string {
	w, g := map[string]bool{}, map[string]bool{}
	for _, l := range strings.Split(want, "\n") {
		w[l] = true
	}
	for _, l := range strings.Split(got, "\n") {
		g[l] = true
	}
	var b strings.Builder
	for l := range w {
		if !g[l] {
			b.WriteString("- " + l + "\n")
		}
	}
	for l := range g {
		if !w[l] {
			b.WriteString("+ " + l + "\n")
		}
	}
	return b.String()
}

// checkReportPage parses the page: one figure with an inline svg per stage that ran, no script
// element, nothing fetched.
func checkReportPage(t *testing.T, page []byte, figures int) {
	t.Helper()
	doc, err := html.Parse(bytes.NewReader(page))
	if err != nil {
		t.Fatal(err)
	}
	n, bad := 0, 0
	var walk func(*html.Node)
	walk = func(x *html.Node) {
		if x.Type == html.ElementNode {
			if x.Data == "figure" {
				for c := x.FirstChild; c != nil; c = c.NextSibling {
					if c.Type == html.ElementNode && c.Data == "svg" {
						n++
					}
				}
			}
			if x.Data == "script" || x.Data == "link" || x.Data == "img" || x.Data == "iframe" {
				bad++
			}
		}
		for c := x.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(doc)
	if n != figures || bad != 0 {
		t.Fatalf("page: %d figures with an inline svg (want %d), %d script/link/img/iframe elements", n, figures, bad)
	}
}

// checkStageFigures asserts that the page's section of each stage (key → figure name) holds
// that figure with an inline svg.
func checkStageFigures(t *testing.T, page []byte, want map[string]string) {
	t.Helper()
	doc, err := html.Parse(bytes.NewReader(page))
	if err != nil {
		t.Fatal(err)
	}
	attr := func(x *html.Node, k string) string {
		for _, a := range x.Attr {
			if a.Key == k {
				return a.Val
			}
		}
		return ""
	}
	found := map[string]bool{}
	var walk func(x *html.Node, section string)
	walk = func(x *html.Node, section string) {
		if x.Type == html.ElementNode && x.Data == "section" {
			section = attr(x, "id")
		}
		if x.Type == html.ElementNode && x.Data == "figure" {
			for c := x.FirstChild; c != nil; c = c.NextSibling {
				if c.Type == html.ElementNode && c.Data == "svg" && attr(x, "id") == "fig-"+want[section] {
					found[section] = true
				}
			}
		}
		for c := x.FirstChild; c != nil; c = c.NextSibling {
			walk(c, section)
		}
	}
	walk(doc, "")
	for k, f := range want {
		if !found[k] {
			t.Errorf("page: the %s section has no figure %s with an inline svg", k, f)
		}
	}
}

// TestReportSameJSONAsCommands: the report's lag, dim, lyapunov and fractal objects are exactly
// what `unfold lag --json`, `unfold dim --json`, … print for the same file; its regime works in
// the same embedding with the lyapunov stage's λ1 and the fractal stage's D2; analysis.Run
// called as a library on the same record gives every stage object of result.json; a file name
// holding <script> appears escaped on the page.
func TestReportSameJSONAsCommands(t *testing.T) {
	dir := t.TempDir()
	p, raw := writeTX(t, dir, 3000, 0.01)
	evil := filepath.Join(dir, "x<script>alert(1)<script>.csv")
	if err := os.WriteFile(evil, raw, 0o644); err != nil {
		t.Fatal(err)
	}
	os.Remove(p)
	out := filepath.Join(dir, "rep")
	_, stderr, code := runCLI(t, "", "report", "-q", "--threads", "2", "-o", out, evil)
	if code != 0 && code != 1 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(out, "result.json"))
	if err != nil {
		t.Fatal(err)
	}
	m := decode(t, string(b))
	for _, c := range []string{"lag", "dim", "lyapunov", "fractal"} {
		so, se, code := runCLI(t, "", c, "--json", "-q", "--threads", "2", evil)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", c, code, se)
		}
		if want := decode(t, so); !reflect.DeepEqual(m[c], want) {
			t.Errorf("report's %q object differs from `unfold %s --json`", c, c)
		}
	}
	// one embedding and one D2 (issue 19): regime works in the embedding the report chose (the
	// Theiler window of dim, lyapunov and fractal) and takes λ1 from the lyapunov stage and D2
	// from the fractal stage
	rp, _ := lookup(m, "regime.parameters").(map[string]any)
	if rp == nil || rp["lyapunov_from"] != "lyapunov stage" || rp["dimension_from"] != "fractal stage" {
		t.Fatalf("regime parameters %v: want lyapunov_from = lyapunov stage, dimension_from = fractal stage", rp)
	}
	for _, c := range []string{"dim", "lyapunov", "fractal"} {
		if w := lookup(m, c+".parameters.theiler"); w != rp["theiler"] {
			t.Errorf("%s's Theiler window %v, regime's %v: want one window", c, w, rp["theiler"])
		}
	}
	if d2, ev := lookup(m, "fractal.d2"), lookup(m, "regime.evidence.correlation_dimension.value"); d2 == nil || d2 != ev {
		t.Errorf("regime's D2 evidence %v, fractal's D2 %v: want the same number", ev, d2)
	}
	if l1, ev := lookup(m, "lyapunov.lambda_max"), lookup(m, "regime.evidence.lyapunov.value"); l1 == nil || l1 != ev {
		t.Errorf("regime's λ1 evidence %v, lyapunov's λ1 %v: want the same number", ev, l1)
	}
	// the library: analysis.Run on the record as read gives the same objects (issue 19)
	rec, src, err := series.ReadFile(evil, nil, series.ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	lib, err := analysis.Run(context.Background(), rec, analysis.Options{Threads: 2, Path: evil, Version: versionString(),
		Input: &analysis.Input{Path: src.Path, SHA256: src.SHA256, Samples: rec.Len(), Dt: rec.Dt}})
	if err != nil {
		t.Fatal(err)
	}
	lb, err := json.Marshal(lib)
	if err != nil {
		t.Fatal(err)
	}
	lm := decode(t, string(lb))
	for _, k := range analysis.Keys {
		if _, ok := m[k]; ok && !reflect.DeepEqual(m[k], lm[k]) {
			a, _ := json.Marshal(m[k])
			b, _ := json.Marshal(lm[k])
			t.Errorf("analysis.Run's %q object differs from the report's:\n%s", k, lineDiff(string(a), string(b)))
		}
	}
	if lib.Embedding == nil || lib.Embedding.Lag.Value != int(lookup(m, "lag.lag").(float64)) || lib.Embedding.Dim.Value != int(lookup(m, "dim.dimension").(float64)) {
		t.Errorf("analysis.Run's embedding %+v differs from the report's lag and dimension", lib.Embedding)
	}
	page, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	if bytes.Contains(page, []byte("<script")) || !bytes.Contains(page, []byte("x&lt;script&gt;alert(1)&lt;script&gt;.csv")) {
		t.Fatal("the file name is not escaped on the page")
	}
	// one figure per stage whose object is in result.json (a stage with no answer and nothing to
	// show, such as symbols on too few section crossings and then entropy, has no section)
	shown := 0
	for _, st := range m["provenance"].(map[string]any)["stages"].([]any) {
		if _, ok := m[st.(map[string]any)["key"].(string)]; ok {
			shown++
		}
	}
	checkReportPage(t, page, shown)
}

// TestBatchShardsResumeCorrupt: two shards together analyse every input exactly once, a
// corrupt input gets an error row while the others complete, a second run skips all and says
// so, and --merge rebuilds the same summary.
func TestBatchShardsResumeCorrupt(t *testing.T) {
	in, out := t.TempDir(), filepath.Join(t.TempDir(), "res")
	for i := 0; i < 4; i++ {
		var b bytes.Buffer
		b.WriteString("x\n")
		x := 0.1 + 0.2*float64(i)
		for k := 0; k < 1500; k++ { // logistic map at r = 4 (chaotic), a different start each
			x = 4 * x * (1 - x)
			fmt.Fprintf(&b, "%.12g\n", x)
		}
		os.WriteFile(filepath.Join(in, fmt.Sprintf("m%d.csv", i)), b.Bytes(), 0o644)
	}
	os.WriteFile(filepath.Join(in, "bad.csv"), []byte("x\n1\n2\nnot-a-number\n"), 0o644)
	var logs []string
	for _, sh := range []string{"1/2", "2/2"} {
		_, se, code := runCLI(t, "", "batch", "--threads", "1", "--jobs", "2", "--shard", sh, "-o", out, in)
		if code != 0 {
			t.Fatalf("shard %s: exit %d: %s", sh, code, se)
		}
		logs = append(logs, se)
	}
	counts := map[string]int{}
	for _, se := range logs {
		for _, l := range strings.Split(se, "\n") {
			if strings.HasPrefix(l, "[") {
				f := strings.Fields(l)
				counts[strings.TrimSuffix(f[1], ":")]++
			}
		}
	}
	if len(counts) != 5 {
		t.Fatalf("shards analysed %d distinct inputs, want 5: %v", len(counts), counts)
	}
	for p, c := range counts {
		if c != 1 {
			t.Errorf("%s analysed %d times", p, c)
		}
	}
	rows := readCSV(t, filepath.Join(out, "summary.csv"))
	if len(rows) != 6 {
		t.Fatalf("summary.csv has %d lines, want header + 5", len(rows))
	}
	for _, r := range rows[1:] {
		isBad := strings.HasSuffix(r[0], "bad.csv")
		if isBad != (r[9] == "error") || (isBad && !strings.Contains(r[10], "bad.csv:4:")) {
			t.Errorf("row %v", r)
		}
		if !isBad && (r[1] != "1500" || r[3] == "" || r[9] == "error") {
			t.Errorf("row %v: want samples, lag and a status other than error", r)
		}
	}
	_, se, code := runCLI(t, "", "batch", "--threads", "1", "-o", out, in)
	if code != 0 || !strings.Contains(se, "0 analysed") || !strings.Contains(se, "5 skipped") {
		t.Fatalf("second run: exit %d: %s", code, se)
	}
	before, _ := os.ReadFile(filepath.Join(out, "summary.csv"))
	os.Remove(filepath.Join(out, "summary.csv"))
	if _, se, code := runCLI(t, "", "batch", "--merge", out); code != 0 {
		t.Fatalf("merge: exit %d: %s", code, se)
	}
	after, _ := os.ReadFile(filepath.Join(out, "summary.csv"))
	if !bytes.Equal(before, after) {
		t.Fatal("--merge does not rebuild the same summary.csv")
	}
}

func readCSV(t *testing.T, p string) [][]string {
	t.Helper()
	f, err := os.Open(p)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestCompletion: the completion scripts are written and complete our commands and flags.
func TestCompletion(t *testing.T) {
	for sh, head := range map[string]string{"bash": "# bash completion", "zsh": "#compdef unfold", "fish": "# fish completion"} {
		so, se, code := runCLI(t, "", "completion", sh)
		if code != 0 || !strings.HasPrefix(so, head) {
			t.Errorf("completion %s: exit %d, starts %.40q: %s", sh, code, so, se)
		}
	}
	so, _, _ := runCLI(t, "", "__complete", "ba")
	if !strings.Contains(so, "batch") {
		t.Errorf("no completion of 'ba' to batch: %q", so)
	}
	so, _, _ = runCLI(t, "", "__complete", "batch", "--sh")
	if !strings.Contains(so, "--shard") {
		t.Errorf("no completion of --sh to --shard: %q", so)
	}
}
