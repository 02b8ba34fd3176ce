package report

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"golang.org/x/net/html"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
)

func fakeStages(name string) []Stage {
	sig := make([]float64, 500)
	for i := range sig {
		sig[i] = float64(i%17) - 8
	}
	return []Stage{
		{Key: "inspect", Title: "The signal", Run: func() (*Section, error) {
			f, err := SignalFigure("signal", name, "V", "s", sig, 0.01, 200)
			if err != nil {
				return nil, err
			}
			return &Section{JSON: json.RawMessage(`{"command":"inspect","mean":0.5}`), Figures: []Figure{f},
				Summary: [][2]string{{"signal", name}}, Cautions: []string{"caution about " + name}}, nil
		}},
		{Key: "lag", Title: "Delay", Run: func() (*Section, error) {
			p := plot.New()
			p.Title.Text = name
			return &Section{JSON: json.RawMessage(`{"command":"lag","lag":7}`),
				Figures: []Figure{{Name: "lag", Caption: "c", Width: 4 * vg.Inch, Height: 3 * vg.Inch, Rows: [][]*plot.Plot{{p}}}}}, nil
		}},
		{Key: "dim", Title: "Dimension", Run: func() (*Section, error) { return nil, errors.New("dim: no dimension up to 10") }},
	}
}

// TestRunJSONAndPage checks result.json's order and provenance, and that the page parses, has
// one figure per stage that answered, no script element, and the input's text escaped.
func TestRunJSONAndPage(t *testing.T) {
	name := `x<script>alert(1)</script>.csv`
	h := Header{Version: "v", Commit: "c", CommandLine: []string{"unfold", "report", name}, Seeds: map[string]uint64{"seed": 3},
		Input: Input{Path: name, SHA256: "ab", Samples: 500, Dt: 0.01}, Title: name}
	var before, after []string
	r := Run(h, fakeStages(name), func(k string) { before = append(before, k) },
		func(k string, _ time.Duration, err error) { after = append(after, k) })
	if strings.Join(before, ",") != "inspect,lag,dim" || strings.Join(after, ",") != "inspect,lag,dim" {
		t.Fatalf("callbacks: before %v, after %v", before, after)
	}
	if r.Status() != StatusPartial || r.Errors["dim"] == "" {
		t.Fatalf("status %q errors %v: want partial with dim's reason", r.Status(), r.Errors)
	}
	dir := t.TempDir()
	if _, err := r.WriteDir(dir, WriteOptions{PNG: true}); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(filepath.Join(dir, "result.json"))
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	if m["command"] != "report" || m["status"] != StatusPartial {
		t.Fatalf("head: %v", m)
	}
	if m["lag"].(map[string]any)["lag"].(float64) != 7 {
		t.Fatalf("lag object not kept as given: %v", m["lag"])
	}
	if _, ok := m["dim"]; ok {
		t.Fatal("a stage without JSON must be absent")
	}
	pv := m["provenance"].(map[string]any)
	if st := pv["stages"].([]any); len(st) != 3 || st[2].(map[string]any)["status"] != StatusError {
		t.Fatalf("provenance stages: %v", pv["stages"])
	}
	if pv["seeds"].(map[string]any)["seed"].(float64) != 3 || pv["input_sha256"] != "ab" {
		t.Fatalf("provenance: %v", pv)
	}
	// keys in the order of the stages, after the head
	if i, j := bytes.Index(b, []byte(`"inspect"`)), bytes.Index(b, []byte(`"lag": {`)); !(i > 0 && j > i) {
		t.Fatalf("stage order in result.json: inspect at %d, lag at %d", i, j)
	}
	for _, f := range []string{"signal.svg", "signal.png", "lag.svg", "lag.png"} {
		if _, err := os.Stat(filepath.Join(dir, "figures", f)); err != nil {
			t.Error(err)
		}
	}
	page, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	checkPage(t, page, 2)
}

// checkPage parses the page and counts figures holding an inline svg; there must be no script
// element, no external reference and no unescaped "<script".
func checkPage(t *testing.T, page []byte, figures int) {
	t.Helper()
	doc, err := html.Parse(bytes.NewReader(page))
	if err != nil {
		t.Fatal(err)
	}
	n, scripts, external := 0, 0, 0
	var walk func(*html.Node, bool)
	walk = func(x *html.Node, inFig bool) {
		if x.Type == html.ElementNode {
			switch x.Data {
			case "script":
				scripts++
			case "figure":
				inFig = true
			case "svg":
				if inFig {
					n++
					inFig = false
				}
			}
			for _, a := range x.Attr {
				if (a.Key == "src" || a.Key == "href") && !strings.HasPrefix(a.Val, "#") && !strings.HasPrefix(a.Val, "data:") {
					external++
				}
			}
		}
		for c := x.FirstChild; c != nil; c = c.NextSibling {
			walk(c, inFig)
		}
	}
	walk(doc, false)
	if n != figures || scripts != 0 || external != 0 {
		t.Fatalf("page: %d figures with svg (want %d), %d script elements, %d external references", n, figures, scripts, external)
	}
	if bytes.Contains(bytes.ToLower(page), []byte("<script")) {
		t.Fatal("page contains an unescaped <script")
	}
}
