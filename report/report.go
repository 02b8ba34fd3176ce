// Package report runs the whole analysis chain of one signal as an ordered list of stages and
// writes what it found: result.json (every stage's JSON object under its key, with provenance),
// a self-contained HTML page (inline SVG figures and CSS, no scripts, no fetched fonts, one
// column that prints on A4) and the figures as files for reuse. It also runs the chain over
// many inputs (batch): a worker pool, one result folder per input, resumable by the inputs'
// SHA-256, shardable across a cluster's job array, and a summary.csv rebuilt from the
// per-input results.
//
// The package knows nothing of the stages' methods: the command line builds the stage list
// from the same functions its single commands use, so the report's "lag" object is exactly
// what `unfold lag --json` prints.
package report

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"unfold/analysis"
	"unfold/figure"
	"unfold/internal/safejson"
	"unfold/series"
)

// Figure is one figure of a stage: a grid of plots (rows of equal length) drawn on a canvas of
// Width × Height, saved as figures/NAME.svg (and NAME.png on request) and inlined in the page.
type Figure struct {
	Name    string // file stem, e.g. "lag"; unique within a report
	Caption string // one sentence shown under the figure
	Width   vg.Length
	Height  vg.Length
	Rows    [][]*plot.Plot
	svg     []byte // drawn by Run, inside the stage's wall time
}

// Section is what one stage returns.
type Section struct {
	// JSON is the stage's JSON object, exactly as the stage's single command prints it with
	// --json (including its own "command", "input" and "parameters").
	JSON json.RawMessage
	// Summary holds the rows (label, value) of the table shown on the page.
	Summary [][2]string
	// Figures are drawn on the page in order.
	Figures []Figure
	// Cautions are shown under the table.
	Cautions []string
	// Evidence, when not empty, is shown as a table of plain sentences after the rows (the
	// regime stage's evidence).
	Evidence []EvidenceLine
}

// Stage is one step of the chain. Run may use the results of the stages before it (the
// command line shares them through closures); an error ends only this stage: it is recorded
// and the next stages still run.
type Stage struct {
	Key   string // the key in result.json (DESIGN.md §3), e.g. "lag"
	Title string // the section heading on the page
	Run   func() (*Section, error)
	// Took is time spent on the stage before Run (computing it elsewhere), added to its wall
	// time.
	Took time.Duration
}

// Input is the "input" object of the JSON output (DESIGN.md §3).
type Input struct {
	Path    string  `json:"path"`
	SHA256  string  `json:"sha256"`
	Samples int     `json:"samples"`
	Dt      float64 `json:"dt"`
	// Units are written as the top-level "units" object of result.json.
	Units analysis.Units `json:"-"`
}

// StageRecord is the provenance of one stage: its wall time (computing and drawing its
// figures) and whether it gave an answer.
type StageRecord struct {
	Key     string  `json:"key"`
	Seconds float64 `json:"seconds"`
	Status  string  `json:"status"` // "ok", "skipped" (the stage does not apply) or "error"
	Error   string  `json:"error,omitempty"`
}

// Provenance records how a result was made.
type Provenance struct {
	Version     string            `json:"version"`
	Commit      string            `json:"commit"`
	CommandLine []string          `json:"command_line"`
	Seeds       map[string]uint64 `json:"seeds"`
	InputSHA256 string            `json:"input_sha256"`
	Started     string            `json:"started"` // RFC 3339, UTC
	WallSeconds float64           `json:"wall_seconds"`
	Stages      []StageRecord     `json:"stages"`
}

// Status values of a result (the "status" column of summary.csv).
const (
	StatusOK      = "ok"      // every stage gave an answer
	StatusPartial = "partial" // the input was read but at least one stage gave no answer
	StatusError   = "error"   // the input could not be analysed at all
)

// Header is what the caller states about the run: the envelope of result.json.
type Header struct {
	Version     string            // the toolkit's version string
	Commit      string            // the source commit ("unknown" when not known)
	CommandLine []string          // os.Args as run
	Seeds       map[string]uint64 // every seed used, by name
	Input       Input
	Parameters  any    // the report's own parameters (overrides given), a JSON object
	Title       string // shown as the page heading (the input's file name)
}

// Result is the outcome of Run: the stages' sections in order and the provenance.
type Result struct {
	Header     Header
	Provenance Provenance
	Keys       []string            // stage keys in the order they ran (including failed ones)
	Titles     map[string]string   // stage key → heading
	Sections   map[string]*Section // stage key → section (only for stages that gave an answer)
	Errors     map[string]string   // stage key → why it gave no answer
	// Summary is the block at the top of the page (Build sets it; nil: the page has none).
	Summary *Summary
	Skipped map[string]string // stage key → why it does not apply (not an error)
}

// Status is StatusOK when every stage gave an answer or was skipped (did not apply, with its
// reason), else StatusPartial.
func (r *Result) Status() string {
	if len(r.Errors) > 0 {
		return StatusPartial
	}
	return StatusOK
}

// NoAnswer is nil when Status is StatusOK; otherwise an error naming why each stage without
// an answer gave none, in stage order (the report is still written).
func (r *Result) NoAnswer() error {
	var why []string
	for _, k := range r.Keys {
		if e, ok := r.Errors[k]; ok {
			why = append(why, e)
		}
	}
	if len(why) == 0 {
		return nil
	}
	return errors.New("some stages gave no answer (the report is written): " + strings.Join(why, "; "))
}

// Run runs the stages in order. before is called with a stage's key before it runs and after
// with its key, wall time and error (nil on success) once it has run; either may be nil.
func Run(h Header, stages []Stage, before func(key string), after func(key string, took time.Duration, err error)) *Result {
	start := time.Now()
	h.Title, h.Input.Path = series.CleanText(h.Title), series.CleanText(h.Input.Path) // input text is made valid UTF-8
	r := &Result{Header: h, Titles: map[string]string{}, Sections: map[string]*Section{}, Errors: map[string]string{}, Skipped: map[string]string{}}
	r.Provenance = Provenance{Version: h.Version, Commit: h.Commit, CommandLine: h.CommandLine, Seeds: h.Seeds,
		InputSHA256: h.Input.SHA256, Started: start.UTC().Format(time.RFC3339), Stages: []StageRecord{}}
	if r.Provenance.Seeds == nil {
		r.Provenance.Seeds = map[string]uint64{}
	}
	if r.Provenance.CommandLine == nil {
		r.Provenance.CommandLine = []string{}
	}
	var extra time.Duration // Took of every stage
	for _, st := range stages {
		extra += st.Took
		if before != nil {
			before(st.Key)
		}
		t0 := time.Now()
		sec, err := st.Run()
		if err == nil && (sec == nil || !json.Valid(sec.JSON)) {
			err = fmt.Errorf("%s: the stage returned no valid JSON object", st.Key)
		}
		if sec != nil {
			for i := range sec.Figures {
				f := &sec.Figures[i]
				if f.svg != nil {
					continue // drawn by the stage itself (the state-transition diagram)
				}
				var b bytes.Buffer
				if ferr := figure.Write(&b, "svg", f.Width, f.Height, f.Rows); ferr != nil {
					if err == nil {
						err = fmt.Errorf("%s: figure %s: %w", st.Key, f.Name, ferr)
					}
					continue
				}
				f.svg = b.Bytes()
			}
		}
		took := time.Since(t0) + st.Took
		rec := StageRecord{Key: st.Key, Seconds: took.Seconds(), Status: StatusOK}
		r.Keys = append(r.Keys, st.Key)
		r.Titles[st.Key] = st.Title
		switch {
		case analysis.IsSkip(err):
			rec.Status, rec.Error = analysis.StatusSkipped, err.Error()
			r.Skipped[st.Key] = err.Error()
		case err != nil:
			rec.Status, rec.Error = StatusError, err.Error()
			r.Errors[st.Key] = err.Error()
		}
		if sec != nil && json.Valid(sec.JSON) {
			r.Sections[st.Key] = sec // a stage without an answer may still show its curves
		}
		r.Provenance.Stages = append(r.Provenance.Stages, rec)
		if after != nil {
			after(st.Key, took, err)
		}
	}
	r.Provenance.WallSeconds = (time.Since(start) + extra).Seconds()
	return r
}

// JSON returns result.json: "command" ("report"), "version", "input", "units", "parameters",
// "status", "summary" (the page's summary block; null without one), "provenance", then each stage's object under its key in the order the stages ran.
func (r *Result) JSON() ([]byte, error) {
	var buf bytes.Buffer
	var nulled []string
	put := func(key string, v any) error {
		b, null, err := safejson.Marshal(v) // a non-finite number is written as null
		if err != nil {
			return fmt.Errorf("report: encoding %s: %w", key, err)
		}
		for _, p := range null {
			nulled = append(nulled, strings.TrimSuffix(key+"."+p, "."))
		}
		if buf.Len() > 1 {
			buf.WriteByte(',')
		}
		k, _ := json.Marshal(key)
		buf.Write(k)
		buf.WriteByte(':')
		buf.Write(b)
		return nil
	}
	params := r.Header.Parameters
	if params == nil {
		params = struct{}{}
	}
	buf.WriteByte('{')
	for _, kv := range []struct {
		k string
		v any
	}{{"command", "report"}, {"version", r.Header.Version}, {"input", r.Header.Input}, {"units", r.Header.Input.Units}, {"parameters", params},
		{"status", r.Status()}, {"summary", r.Summary}, {"provenance", r.Provenance}} {
		if err := put(kv.k, kv.v); err != nil {
			return nil, err
		}
	}
	for _, k := range r.Keys {
		if s, ok := r.Sections[k]; ok {
			if err := put(k, s.JSON); err != nil {
				return nil, err
			}
		}
	}
	if len(nulled) > 0 {
		if err := put("cautions", safejson.Cautions(nulled)); err != nil {
			return nil, err
		}
	}
	buf.WriteByte('}')
	var out bytes.Buffer
	if err := json.Indent(&out, buf.Bytes(), "", "  "); err != nil {
		return nil, fmt.Errorf("report: result.json: %w", err)
	}
	out.WriteByte('\n')
	return out.Bytes(), nil
}

// WriteOptions say what WriteDir writes besides result.json and report.html.
type WriteOptions struct {
	PNG     bool     // also figures/NAME.png
	Protect []string // paths never written over (the input)
}

// WriteDir writes DIR/result.json, DIR/report.html and DIR/figures/*.svg (and .png), each
// through a temporary file renamed into place. It returns the paths written.
func (r *Result) WriteDir(dir string, opt WriteOptions) ([]string, error) {
	figDir := filepath.Join(dir, "figures")
	if err := os.MkdirAll(figDir, 0o755); err != nil {
		return nil, fmt.Errorf("report: %w", err)
	}
	var written []string
	write := func(path string, b []byte) error {
		f, err := series.CreateAtomic(path, opt.Protect...)
		if err != nil {
			return err
		}
		defer f.Abort()
		if _, err := f.Write(b); err != nil {
			return fmt.Errorf("report: writing %s: %w", path, err)
		}
		if err := f.Commit(); err != nil {
			return err
		}
		written = append(written, path)
		return nil
	}
	svgs := map[string][]byte{}
	for _, k := range r.Keys {
		s, ok := r.Sections[k]
		if !ok {
			continue
		}
		for _, fg := range s.Figures {
			if fg.svg == nil {
				continue // the figure could not be drawn; the stage's error says why
			}
			svgs[fg.Name] = fg.svg
			if err := write(filepath.Join(figDir, fg.Name+".svg"), fg.svg); err != nil {
				return written, err
			}
			if opt.PNG && fg.Rows != nil {
				var p bytes.Buffer
				if err := figure.Write(&p, "png", fg.Width, fg.Height, fg.Rows); err != nil {
					return written, fmt.Errorf("report: figure %s: %w", fg.Name, err)
				}
				if err := write(filepath.Join(figDir, fg.Name+".png"), p.Bytes()); err != nil {
					return written, err
				}
			}
		}
	}
	js, err := r.JSON()
	if err != nil {
		return written, err
	}
	if err := write(filepath.Join(dir, "result.json"), js); err != nil {
		return written, err
	}
	var page bytes.Buffer
	if err := r.writeHTML(&page, svgs); err != nil {
		return written, err
	}
	if err := write(filepath.Join(dir, "report.html"), page.Bytes()); err != nil {
		return written, err
	}
	return written, nil
}
