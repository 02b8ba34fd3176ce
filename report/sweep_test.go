package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"unfold/models"
	"unfold/regime"
	"unfold/series"
)

func TestParseSweepListErrors(t *testing.T) {
	cases := []struct {
		name, text, param string
		want              []string // substrings of the error
		line, col         int
	}{
		{"no path column", "file,r\na.csv,3.5\n", "", []string{"no column named path", "path,r"}, 1, 1},
		{"no numeric column", "path,run\na.csv,first\n", "", []string{"no numeric column"}, 1, 0},
		{"two numeric columns", "path,r,run\na.csv,3.5,1\n", "", []string{`"r", "run"`, "--parameter NAME"}, 1, 0},
		{"non-numeric cell", "path,r\na.csv,3.5\nb.csv, x3\n", "", []string{"must be a finite number", `"x3"`}, 3, 8},
		{"unknown --parameter", "path,r\na.csv,3.5\n", "Re", []string{`no column "Re"`}, 1, 0},
		{"empty path", "path,r\n,3.5\n", "", []string{"empty path"}, 2, 1},
		{"duplicate", "path,r\na.csv,3.5\n./a.csv,3.6\n", "", []string{"already listed on line 2"}, 3, 1},
		{"header only", "path,r\n", "", []string{"names no record"}, 1, 0},
		{"empty", "", "", []string{"empty"}, 0, 0},
	}
	for _, c := range cases {
		_, err := ParseSweepList(strings.NewReader(c.text), "list.csv", "/data", c.param)
		var ie *series.InputError
		if !errors.As(err, &ie) {
			t.Errorf("%s: error %v is not an *series.InputError", c.name, err)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q does not say %q", c.name, err, w)
			}
		}
		if ie.Line != c.line || ie.Column != c.col {
			t.Errorf("%s: error at %d:%d, want %d:%d (%v)", c.name, ie.Line, ie.Column, c.line, c.col, err)
		}
	}
}

func TestParseSweepList(t *testing.T) {
	text := "# a comment\nrun,path,drive_V,note\n1,a.csv,2.5,first\n2,/abs/b.csv,1.5,\"second, quoted\"\n"
	l, err := ParseSweepList(strings.NewReader(text), "list.csv", "/data/sweep", "drive_V")
	if err != nil {
		t.Fatal(err)
	}
	if l.Parameter != "drive_V" || strings.Join(l.Labels, "|") != "run|note" {
		t.Errorf("parameter %q labels %q", l.Parameter, l.Labels)
	}
	if p := l.Paths(); p[0] != "/data/sweep/a.csv" || p[1] != "/abs/b.csv" {
		t.Errorf("paths %q: relative ones are resolved against the list's folder", p)
	}
	if e := l.Entries[1]; e.Value != 1.5 || e.Labels[1] != "second, quoted" || e.Line != 4 {
		t.Errorf("entry 2 = %+v", e)
	}
	// Without --parameter the only numeric column is taken... here two are numeric (run and
	// drive_V): refused with both names.
	if _, err := ParseSweepList(strings.NewReader(text), "list.csv", "/data", ""); err == nil || !strings.Contains(err.Error(), `"run", "drive_V"`) {
		t.Errorf("two candidates: %v", err)
	}
}

// logisticRows are hand-made rows over r = 3.50 … 4.00 (step 0.02) and r = 3.835 that encode
// the logistic map's published facts: period doubling accumulates at r∞ = 3.5699456…
// (Feigenbaum 1978, "Quantitative universality for a class of nonlinear transformations",
// J. Stat. Phys. 19, 25), the period-3 window opens at r = 1 + √8 (exact; Myrberg 1963, the
// tangent bifurcation of f³), λ = ln 2 at r = 4 (exact: conjugate to the tent map), λ < 0 in
// periodic windows. The window's end (chaos again at r ≈ 3.857, the crisis of the period-3
// band) is from memory; the smaller windows (period 5 near r = 3.74) are left out.
func logisticRows() []SweepRow {
	const rInf = 3.5699456
	w0, w1 := 1+math.Sqrt(8), 3.857
	var rows []SweepRow
	add := func(r float64) {
		row := SweepRow{Value: r, Status: StatusOK, Path: fmt.Sprintf("r=%.3f.csv", r), LambdaLo: math.NaN(), LambdaHi: math.NaN(),
			D2: math.NaN(), D2Lo: math.NaN(), D2Hi: math.NaN(), Confidence: 0.9, EntropyRate: math.NaN(), Complexity: math.NaN()}
		if r < rInf || (r >= w0 && r < w1) {
			row.Regime, row.LambdaMax, row.LineKind, row.Fundamentals = "periodic", -0.1, "periodic", []float64{0.125}
		} else {
			row.Regime, row.LambdaMax, row.LineKind = "chaotic", 0.2+(r-3.6), "broadband"
		}
		if r == 4 {
			row.LambdaMax = math.Ln2
		}
		row.LambdaLo, row.LambdaHi = row.LambdaMax-0.03, row.LambdaMax+0.03
		rows = append(rows, row)
	}
	for i := 0; i <= 25; i++ {
		add(math.Round((3.5+0.02*float64(i))*100) / 100)
	}
	add(3.835)
	SortSweepRows(rows)
	return rows
}

func TestTransitionsLogistic(t *testing.T) {
	tr := Transitions("r", logisticRows())
	want := []string{
		"periodic up to r = 3.56, chaotic from r = 3.58; periodic again in r = 3.835 … 3.84; chaotic again from r = 3.86.",
		"λ1 is first positive (its interval above zero) at r = 3.58.",
		"The spectrum turns broadband at r = 3.58.",
		"The spectrum turns broadband at r = 3.86.",
	}
	if strings.Join(tr, "\n") != strings.Join(want, "\n") {
		t.Fatalf("transitions:\n%s\nwant:\n%s", strings.Join(tr, "\n"), strings.Join(want, "\n"))
	}
	// The named boundaries bracket the published values: 3.56 < r∞ = 3.5699456 < 3.58
	// (Feigenbaum 1978) and 3.82 < 1 + √8 = 3.8284 < 3.835 (exact).
	if !(3.56 < 3.5699456 && 3.5699456 < 3.58 && 3.82 < 1+math.Sqrt(8) && 1+math.Sqrt(8) < 3.835) {
		t.Fatal("the grid does not bracket the facts")
	}
}

func TestTransitionsQuasiperiodicAndEdges(t *testing.T) {
	// Two incommensurate sines whose amplitude ratio is swept stay quasiperiodic with two
	// independent lines (a torus: common practice).
	var rows []SweepRow
	for _, a := range []float64{0.25, 0.5, 1} {
		rows = append(rows, SweepRow{Value: a, Regime: "quasiperiodic", LineKind: "quasiperiodic",
			Fundamentals: []float64{0.1, 0.1618}, LambdaMax: math.NaN(), LambdaLo: math.NaN()})
	}
	tr := Transitions("A", rows)
	if len(tr) != 2 || tr[0] != "quasiperiodic throughout, A = 0.25 … 1." ||
		!strings.HasPrefix(tr[1], "2 incommensurate frequencies in the spectral lines from A = 0.25") {
		t.Errorf("quasiperiodic sweep: %q", tr)
	}
	if tr := Transitions("r", nil); len(tr) != 1 || !strings.Contains(tr[0], "No record") {
		t.Errorf("no rows: %q", tr)
	}
	// A middle run of one record is named by its single value.
	rows = []SweepRow{{Value: 1, Regime: "periodic"}, {Value: 2, Regime: "chaotic"}, {Value: 3, Regime: "periodic"}, {Value: 4, Regime: "chaotic"}}
	for i := range rows {
		rows[i].LambdaMax, rows[i].LambdaLo = math.NaN(), math.NaN()
	}
	if tr := Transitions("c", rows); tr[0] != "periodic up to c = 1, chaotic at c = 2; periodic again at c = 3; chaotic again from c = 4." {
		t.Errorf("single-value runs: %q", tr[0])
	}
}

// writeSweepFixture lays out a batch folder as RunBatch does for three logistic-map records
// (written by package models) and returns the list.
func writeSweepFixture(t *testing.T) (string, *SweepList) {
	t.Helper()
	in, out := t.TempDir(), t.TempDir()
	spec, err := models.Lookup("logistic")
	if err != nil {
		t.Fatal(err)
	}
	list := "path,r,batch\nr4.csv,4,b\nr35.csv,3.5,a\nr38.csv,3.835,a\nr39.csv,3.9,c\n"
	if err := os.WriteFile(filepath.Join(in, "list.csv"), []byte(list), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, r := range []float64{4, 3.5, 3.835} {
		opt := spec.DefaultOptions()
		opt.N, opt.Transient = 1000, 500
		tr, err := spec.Simulate(models.Values{"r": {r}}, opt)
		if err != nil {
			t.Fatal(err)
		}
		name := map[float64]string{4: "r4.csv", 3.5: "r35.csv", 3.835: "r38.csv"}[r]
		var b bytes.Buffer
		if err := series.WriteCSV(&b, []string{"x"}, tr.Column("x")); err != nil {
			t.Fatal(err)
		}
		path := filepath.Join(in, name)
		if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		// the regime stage's line analysis of the record, as the chain writes it
		la, err := regime.LineAnalysis(tr.Column("x"), 1, regime.LineOptions{})
		if err != nil {
			t.Fatal(err)
		}
		var freqs []float64
		for _, pk := range la.Peaks {
			freqs = append(freqs, pk.Freq)
		}
		slices.Sort(freqs)
		lines := map[string]any{"kind": string(la.Kind), "frequencies": freqs, "fundamentals": la.Fundamentals}
		res := map[string]any{
			"command": "report", "status": StatusOK,
			"input":      map[string]any{"path": path, "sha256": "x", "samples": 1000, "dt": 1},
			"parameters": map[string]any{"column": "x"},
			"lag":        map[string]any{"lag": 1}, "dim": map[string]any{"dimension": 2},
			"lyapunov": map[string]any{"lambda_max": -0.2, "interval": []any{-0.25, -0.15}},
			"fractal":  map[string]any{"d2": 0.1, "interval": []any{nil, 0.2}},
			"regime":   map[string]any{"regime": "periodic", "confidence": 0.9, "lines": lines},
		}
		if r == 4 {
			res["lyapunov"] = map[string]any{"lambda_max": 0.69, "interval": []any{0.66, 0.72}}
			res["regime"] = map[string]any{"regime": "chaotic", "confidence": 0.8, "lines": lines}
			res["states"] = map[string]any{"statistical_complexity": 0, "entropy_rate": 1}
		}
		if r == 3.5 {
			res["states"] = map[string]any{"statistical_complexity": 2, "entropy_rate": 0}
		}
		b2, _ := json.Marshal(res)
		folder := filepath.Join(out, ResultFolderName(path))
		if err := os.MkdirAll(folder, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(folder, "result.json"), b2, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	l, err := ReadSweepList(filepath.Join(in, "list.csv"), "")
	if err != nil {
		t.Fatal(err)
	}
	return out, l
}

func TestWriteSweepCSV(t *testing.T) {
	dir, l := writeSweepFixture(t)
	rows := SweepRows(dir, l, SweepOptions{})
	if err := WriteSweep(dir, l, rows, SweepPageOptions{Version: "test"}); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(filepath.Join(dir, "sweep.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	wantHead := "r,regime,confidence,lag,dimension,lambda_max,lambda_lo,lambda_hi,d2,d2_lo,d2_hi,entropy_rate,statistical_complexity,frequencies,status,path,batch"
	if got := strings.Join(recs[0], ","); got != wantHead {
		t.Fatalf("header\n%s\nwant\n%s", got, wantHead)
	}
	if len(recs) != 5 {
		t.Fatalf("%d rows, want 4 and the header", len(recs)-1)
	}
	col := func(name string) int {
		for i, h := range recs[0] {
			if h == name {
				return i
			}
		}
		t.Fatalf("no column %s", name)
		return -1
	}
	var order []string
	for _, r := range recs[1:] {
		order = append(order, r[0])
	}
	if strings.Join(order, " ") != "3.5 3.835 3.9 4" {
		t.Errorf("rows not sorted by r: %v", order)
	}
	r35, r38, r39, r4 := recs[1], recs[2], recs[3], recs[4]
	if r39[col("status")] != "missing" || r39[col("regime")] != "" || r39[col("batch")] != "c" {
		t.Errorf("row without a result: %q", r39)
	}
	if r4[col("lambda_max")] != "0.69" || r4[col("lambda_lo")] != "0.66" || r4[col("regime")] != "chaotic" || r4[col("entropy_rate")] != "1" || r4[col("statistical_complexity")] != "0" {
		t.Errorf("r = 4 row: %q", r4)
	}
	// Absent states keys and a null interval end give empty cells.
	if r38[col("entropy_rate")] != "" || r38[col("statistical_complexity")] != "" || r38[col("d2_lo")] != "" || r38[col("d2_hi")] != "0.2" {
		t.Errorf("r = 3.835 row: %q", r38)
	}
	// At r = 3.5 the logistic map is on a period-4 orbit (the second period doubling is at
	// r = 1 + √6 ≈ 3.449 and the third near 3.544; May 1976, "Simple mathematical models with
	// very complicated dynamics", Nature 261, 459): its spectrum has lines at 1/4 and 1/2
	// cycle per iteration, and the diagram shows four values.
	fr := r35[col("frequencies")]
	if !strings.Contains(fr, "0.25") || !strings.Contains(fr, "0.5") {
		t.Errorf("r = 3.5 lines %q, want 0.25 and 0.5 cycles per iteration", fr)
	}
	for _, r := range rows {
		if r.Value == 3.5 {
			distinct := map[string]bool{}
			for _, v := range r.Points {
				distinct[fmt.Sprintf("%.6f", v)] = true
			}
			if len(distinct) != 4 || r.PointsAreMaxima || len(r.Points) != 200 {
				t.Errorf("r = 3.5: %d points (%d distinct, maxima %v); want 200 samples on 4 values", len(r.Points), len(distinct), r.PointsAreMaxima)
			}
		}
	}
	if r35[col("path")] != l.Entries[1].Path {
		t.Errorf("path %q, want %q", r35[col("path")], l.Entries[1].Path)
	}
}

func TestSweepPage(t *testing.T) {
	dir, l := writeSweepFixture(t)
	rows := SweepRows(dir, l, SweepOptions{})
	if err := WriteSweep(dir, l, rows, SweepPageOptions{Version: "test"}); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(filepath.Join(dir, "sweep.html"))
	if err != nil {
		t.Fatal(err)
	}
	page := string(b)
	if n := strings.Count(page, "<figure"); n != 5 {
		t.Errorf("%d figures, want 5", n)
	}
	for _, id := range []string{"fig-bifurcation", "fig-lyapunov", "fig-dimension", "fig-lines", "fig-plane"} {
		if !strings.Contains(page, `id="`+id+`"`) {
			t.Errorf("no figure %s", id)
		}
	}
	svgs := regexp.MustCompile(`(?s)<svg.*?</svg>`).FindAllString(page, -1)
	if len(svgs) != 5 {
		t.Fatalf("%d SVG elements, want 5", len(svgs))
	}
	for i, s := range svgs {
		d := xml.NewDecoder(strings.NewReader(s))
		for {
			_, err := d.Token()
			if err == io.EOF {
				break
			}
			if err != nil {
				t.Fatalf("SVG %d is not well-formed XML: %v", i+1, err)
			}
		}
		// Text in a sans-serif face (the page's style), never the plotting library's serif default.
		if strings.Contains(s, "Serif") && !strings.Contains(s, "Sans") {
			t.Errorf("SVG %d uses a serif face", i+1)
		}
	}
	for _, want := range []string{"support expert judgement", "chaotic from r = 4", "nats", "<th>batch</th>", "<script"} {
		has := strings.Contains(page, want)
		if want == "<script" && has {
			t.Error("the page carries a script")
		} else if want != "<script" && !has {
			t.Errorf("the page does not say %q", want)
		}
	}
	// Okabe–Ito vermilion marks chaos in the key.
	if !strings.Contains(page, "#d55e00") {
		t.Error("no Okabe–Ito colour in the key")
	}
}

func TestBifurcationPoints(t *testing.T) {
	// A finely sampled sine (50 samples per period, phase off the grid) is a flow: its maxima,
	// refined by the parabola through three samples, are the amplitude 1 (exact: max sin = 1;
	// the parabola's error is of order (2π/50)⁴/24·… < 1e-3).
	x := make([]float64, 1000)
	for i := range x {
		x[i] = math.Sin(2*math.Pi*float64(i)/50 + 0.3)
	}
	pts, maxima := BifurcationPoints(x, 5)
	if !maxima || len(pts) != 5 {
		t.Fatalf("sine: maxima %v, %d points; want 5 maxima", maxima, len(pts))
	}
	for _, v := range pts {
		if math.Abs(v-1) > 1e-3 {
			t.Errorf("sine maximum %v, want 1", v)
		}
	}
	// A period-2 map orbit (lag-1 autocorrelation −1) is a map: its last values are kept.
	y := make([]float64, 300)
	for i := range y {
		y[i] = 0.3 + 0.4*float64(i%2)
	}
	pts, maxima = BifurcationPoints(y, 0)
	if maxima || len(pts) != 200 || pts[199] != y[299] {
		t.Errorf("period-2 orbit: maxima %v, %d points", maxima, len(pts))
	}
}

func TestSweepRowsUnreadableResult(t *testing.T) {
	dir := t.TempDir()
	l := &SweepList{Parameter: "r", Entries: []SweepEntry{{Path: "/nowhere/a.csv", Value: 2}, {Path: "/nowhere/b.csv", Value: 1}}}
	folder := filepath.Join(dir, FolderName("/nowhere/a.csv"))
	if err := os.MkdirAll(folder, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(folder, "result.json"), []byte("{broken"), 0o644); err != nil {
		t.Fatal(err)
	}
	rows := SweepRows(dir, l, SweepOptions{})
	if rows[0].Value != 1 || rows[0].Status != "missing" || rows[1].Status != StatusError || !strings.Contains(rows[1].Error, "result.json") {
		t.Errorf("rows %+v", rows)
	}
}
