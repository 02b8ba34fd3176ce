package report

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"unfold/analysis"
	"unfold/figure"
	"unfold/series"
)

// Staging is a report folder being built in a temporary sibling of its destination: the page
// fills in there while the chain runs, and Commit swaps the complete folder in, so the
// destination always holds one run's complete output and a failure loses nothing of it.
type Staging struct {
	// Dir is the temporary folder (DST's parent/.tmp-NAME-…); Dst the destination.
	Dir, Dst string
}

// ErrNotReportFolder is returned by StageDir when the destination exists and holds something
// other than one report's output: it is never replaced.
var ErrNotReportFolder = errors.New("exists and is not a report folder")

// StageDir checks, before any work, that dst can be written — its parent is created, and the
// temporary sibling in which the report is built is made there — and that dst is either
// missing, empty or one report's output folder (never a batch folder or a folder of other
// files, and never a folder that holds one of the inputs in protect). The returned Staging
// is removed by Abort or moved to dst by Commit.
func StageDir(dst string, protect ...string) (*Staging, error) {
	dst = filepath.Clean(dst)
	if err := checkReplaceable(dst, protect); err != nil {
		return nil, err
	}
	parent := filepath.Dir(dst)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, fmt.Errorf("report: -o %s: %w", dst, err)
	}
	tmp, err := os.MkdirTemp(parent, tmpPrefix+filepath.Base(dst)+"-")
	if err != nil {
		return nil, fmt.Errorf("report: -o %s: cannot write beside it: %w", dst, err)
	}
	if err := os.Chmod(tmp, 0o755); err != nil {
		os.RemoveAll(tmp)
		return nil, fmt.Errorf("report: -o %s: %w", dst, err)
	}
	// A probe file: some file systems let a folder be made but not filled.
	probe := filepath.Join(tmp, ".probe")
	if err := os.WriteFile(probe, []byte("unfold\n"), 0o644); err != nil {
		os.RemoveAll(tmp)
		return nil, fmt.Errorf("report: -o %s: cannot write beside it: %w", dst, err)
	}
	os.Remove(probe)
	return &Staging{Dir: tmp, Dst: dst}, nil
}

// checkReplaceable refuses a destination that a report must not replace.
func checkReplaceable(dst string, protect []string) error {
	fi, err := os.Stat(dst)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return fmt.Errorf("report: -o %s: %w", dst, err)
	}
	if !fi.IsDir() {
		return &fs.PathError{Op: "report -o", Path: dst, Err: errors.New("is a file, not a folder")}
	}
	canon := CanonicalPath(dst)
	for _, p := range protect {
		if within(CanonicalPath(p), canon) {
			return &fs.PathError{Op: "report -o", Path: dst, Err: fmt.Errorf("holds the input %s; give another output folder", p)}
		}
	}
	ents, err := os.ReadDir(dst)
	if err != nil {
		return fmt.Errorf("report: -o %s: %w", dst, err)
	}
	if len(ents) == 0 {
		return nil
	}
	_, serr := os.Stat(filepath.Join(dst, inputsDir))
	if serr == nil || isSummary(filepath.Join(dst, "summary.csv")) {
		return &fs.PathError{Op: "report -o", Path: dst, Err: errors.New("is a batch folder; give another output folder")}
	}
	if _, err := readResultHead(filepath.Join(dst, "result.json")); err != nil {
		return &fs.PathError{Op: "report -o", Path: dst, Err: fmt.Errorf("%w (it has no result.json of unfold); give a new or empty folder", ErrNotReportFolder)}
	}
	return nil
}

// Page is where the page being built is: Dir/report.html.
func (st *Staging) Page() string { return filepath.Join(st.Dir, "report.html") }

// WritePartial writes the page, result.json and figures of the stages of res done so far into
// the temporary folder (the page is readable while the chain runs).
func (st *Staging) WritePartial(h Header, res *analysis.Result, s *series.Series, fig figure.Record, view View, opt WriteOptions) error {
	_, err := BuildPartial(h, res, s, fig, view).WriteDir(st.Dir, opt)
	return err
}

// Commit writes r into the temporary folder and swaps it in as the destination (one
// rename, or one atomic exchange with the old folder, which is then removed).
func (st *Staging) Commit(r *Result, opt WriteOptions) ([]string, error) {
	written, err := r.WriteDir(st.Dir, opt)
	if err != nil {
		return nil, err
	}
	if err := replaceDir(st.Dir, st.Dst); err != nil {
		return nil, fmt.Errorf("report: -o %s: %w", st.Dst, err)
	}
	for i, p := range written {
		if rel, err := filepath.Rel(st.Dir, p); err == nil {
			written[i] = filepath.Join(st.Dst, rel)
		}
	}
	return written, nil
}

// Abort removes the temporary folder (after a failure; the destination is untouched).
func (st *Staging) Abort() { os.RemoveAll(st.Dir) }

// BuildPartial is Build with only the stages of res that have run (the page of a chain still
// running has one section per finished stage, and its title says how many are done).
func BuildPartial(h Header, res *analysis.Result, s *series.Series, fig figure.Record, view View) *Result {
	done := map[string]bool{}
	for _, r := range res.Stages {
		done[r.Key] = true
	}
	var stages []Stage
	all := Stages(res, s, fig, view)
	for _, st := range all {
		if done[st.Key] {
			stages = append(stages, st)
		}
	}
	if len(stages) < len(all) {
		h.Title += fmt.Sprintf(" — running… (%d of %d stages done; this page is rewritten after each)", len(stages), len(all))
	}
	return Run(h, stages, nil, nil)
}
