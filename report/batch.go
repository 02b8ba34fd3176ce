package report

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync"
	"time"

	"unfold/analysis"
	"unfold/series"
)

// ListInputs returns the inputs named by args and by the lines of list (nil for none): each
// argument is a file, a directory (walked recursively for regular files whose names do not
// start with a dot) or a glob pattern (filepath.Match syntax). In list, blank lines and lines
// starting with # are ignored. Each path is made absolute with its symbolic links resolved
// (CanonicalPath), so one file named three ways is one input; the paths are deduplicated and
// sorted, which is the order --shard slices. Result folders of unfold (IsResultFolder) and
// the files inside them are never inputs. A path that does not exist or a pattern that
// matches nothing is an error that names it.
func ListInputs(args []string, list io.Reader, listName string) ([]string, error) {
	var names []string
	if list != nil {
		sc := bufio.NewScanner(list)
		sc.Buffer(make([]byte, 64*1024), 1<<20)
		line := 0
		for sc.Scan() {
			line++
			s := strings.TrimSpace(sc.Text())
			if s == "" || strings.HasPrefix(s, "#") {
				continue
			}
			names = append(names, s)
		}
		if err := sc.Err(); err != nil {
			return nil, fmt.Errorf("batch: reading %s after line %d: %w", listName, line, err)
		}
	}
	names = append(names, args...)
	seen := map[string]bool{}
	var out []string
	add := func(p string) {
		if inResultFolder(p) {
			return
		}
		p = CanonicalPath(p)
		if !seen[p] {
			seen[p] = true
			out = append(out, p)
		}
	}
	for _, n := range names {
		fi, err := os.Stat(n)
		switch {
		case err == nil && fi.IsDir():
			err := filepath.WalkDir(n, func(p string, d fs.DirEntry, err error) error {
				if err != nil {
					return err
				}
				if p != n && strings.HasPrefix(d.Name(), ".") {
					if d.IsDir() {
						return filepath.SkipDir
					}
					return nil
				}
				if d.IsDir() && IsResultFolder(p) {
					return filepath.SkipDir
				}
				if d.Type().IsRegular() {
					add(p)
				}
				return nil
			})
			if err != nil {
				return nil, fmt.Errorf("batch: listing %s: %w", n, err)
			}
		case err == nil:
			add(n)
		case strings.ContainsAny(n, "*?["):
			m, gerr := filepath.Glob(n)
			if gerr != nil {
				return nil, fmt.Errorf("batch: pattern %q: %w", n, gerr)
			}
			if len(m) == 0 {
				return nil, fmt.Errorf("batch: pattern %q matches no file", n)
			}
			for _, p := range m {
				if strings.HasPrefix(filepath.Base(p), ".") {
					continue // as a shell would: patterns do not match hidden files
				}
				if fi, err := os.Stat(p); err == nil && fi.Mode().IsRegular() {
					add(p)
				}
			}
		default:
			return nil, fmt.Errorf("batch: %w", err)
		}
	}
	sort.Strings(out)
	return out, nil
}

// CanonicalPath returns the absolute form of path with every symbolic link resolved, which
// identifies an input however it is spelled (relative, absolute, ./d/../d/x.csv, through a
// link). When the links cannot be resolved (the file is missing) it returns the cleaned
// absolute path.
func CanonicalPath(path string) string {
	abs, err := filepath.Abs(path)
	if err != nil {
		return filepath.Clean(path)
	}
	if r, err := filepath.EvalSymlinks(abs); err == nil {
		return r
	}
	return abs
}

// IsResultFolder reports whether dir is a folder unfold wrote: a batch folder (it holds a
// summary.csv with the batch's header, or the batch's .inputs record) or one input's result
// folder (it holds a complete result.json). A user's own summary.csv does not count.
func IsResultFolder(dir string) bool {
	if _, err := os.Stat(filepath.Join(dir, inputsDir)); err == nil {
		return true
	}
	if isSummary(filepath.Join(dir, "summary.csv")) {
		return true
	}
	_, err := readResultHead(filepath.Join(dir, "result.json"))
	return err == nil
}

// isSummary reports whether path is a summary.csv written by a batch (its first line is
// SummaryHeader), not a user's file of the same name.
func isSummary(path string) bool {
	f, err := os.Open(path)
	if err != nil {
		return false
	}
	defer f.Close()
	head := make([]byte, 256)
	n, _ := io.ReadFull(f, head)
	line, _, _ := strings.Cut(string(head[:n]), "\n")
	return strings.TrimSuffix(line, "\r") == strings.Join(SummaryHeader(), ",")
}

// inResultFolder reports whether the file path lies in a result folder: its folder, or one of
// the two above it (figures/ of a result inside a batch folder).
func inResultFolder(path string) bool {
	d := filepath.Dir(CanonicalPath(path))
	for i := 0; i < 3; i++ {
		if IsResultFolder(d) {
			return true
		}
		up := filepath.Dir(d)
		if up == d {
			break
		}
		d = up
	}
	return false
}

// within reports whether path lies inside dir (both canonical).
func within(path, dir string) bool {
	rel, err := filepath.Rel(dir, path)
	return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator)) && !filepath.IsAbs(rel)
}

// ParseShard reads "K/N" (1 ≤ K ≤ N; K is 1-based).
func ParseShard(s string) (k, n int, err error) {
	a, b, ok := strings.Cut(s, "/")
	k, err1 := strconv.Atoi(strings.TrimSpace(a))
	n, err2 := strconv.Atoi(strings.TrimSpace(b))
	if !ok || err1 != nil || err2 != nil || n < 1 || k < 1 || k > n {
		return 0, 0, fmt.Errorf("--shard %q: want K/N with 1 ≤ K ≤ N (K is 1-based)", s)
	}
	return k, n, nil
}

// Shard returns the k-th (1-based) of n contiguous, disjoint slices of paths: items
// ⌊(k−1)·len/n⌋ … ⌊k·len/n⌋−1. Over k = 1…n the slices cover every path exactly once; with
// sorted paths the split depends only on the set of inputs.
func Shard(paths []string, k, n int) []string {
	if n <= 1 {
		return paths
	}
	lo, hi := (k-1)*len(paths)/n, k*len(paths)/n
	return paths[lo:hi]
}

// FolderName is the name of an input's result folder inside the batch directory: the file
// name without extensions, reduced to letters, digits, '.', '-' and '_', and the first 8 hex
// digits of the SHA-256 of the cleaned path as given (so equal file names in different
// directories do not collide).
func FolderName(path string) string {
	base := filepath.Base(path)
	for _, ext := range []string{".gz"} {
		base = strings.TrimSuffix(base, ext)
	}
	base = strings.TrimSuffix(base, filepath.Ext(base))
	var b strings.Builder
	for _, r := range base {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '-', r == '_', r == '.':
			b.WriteRune(r)
		default:
			b.WriteByte('_')
		}
	}
	name := strings.TrimLeft(b.String(), ".")
	if len(name) > 60 {
		name = name[:60]
	}
	if name == "" {
		name = "input"
	}
	h := sha256.Sum256([]byte(filepath.Clean(path)))
	return name + "-" + hex.EncodeToString(h[:4])
}

// ResultFolderName is the name of the result folder RunBatch gives the input at path, however the
// path is spelled: FolderName of its CanonicalPath.
func ResultFolderName(path string) string { return FolderName(CanonicalPath(path)) }

// FileSHA256 is the hex SHA-256 of a file's bytes as stored (as series.ReadFile records it).
func FileSHA256(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", fmt.Errorf("reading %s: %w", path, err)
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// BatchOptions configure RunBatch.
type BatchOptions struct {
	Dir         string // the batch directory: one folder per input and summary.csv
	Jobs        int    // inputs analysed at the same time (at least 1)
	RetryErrors bool   // analyse again inputs whose last result was an error
	PNG         bool   // also write PNG figures
	Version     string // written into error results
	// Analyze runs the chain on one input. An error means the input could not be analysed at
	// all (its row gets status "error"); stages without an answer are inside the Result.
	Analyze func(path string) (*Result, error)
	// Log receives one line per input (it is called from one goroutine at a time); may be nil.
	Log func(line string)
}

// BatchStats counts what RunBatch did.
type BatchStats struct {
	Inputs, Skipped, OK, Partial, Errors int
}

// RunBatch analyses every path with opt.Jobs workers, writes each result into its folder
// (built complete in a temporary sibling folder and put in place by one rename, so a kill
// leaves either the old or the new result, never a mix), skips inputs whose folder holds a
// complete result with the same input SHA-256, and finally rebuilds DIR/summary.csv from
// every result folder present (as Merge does).
//
// Inputs are identified by CanonicalPath (one file named several ways is analysed once);
// paths inside opt.Dir or inside any unfold result folder are left out with a log line.
// Before the work starts, leftovers of killed runs older than this run are cleaned
// (CleanLeftovers). Several batches may run at once on one folder: each replacement retries
// when another batch replaced the same folder in between.
func RunBatch(paths []string, opt BatchOptions) (BatchStats, error) {
	start := time.Now()
	if err := os.MkdirAll(opt.Dir, 0o755); err != nil {
		return BatchStats{}, fmt.Errorf("batch: %w", err)
	}
	logf := func(format string, args ...any) {
		if opt.Log != nil {
			opt.Log(fmt.Sprintf(format, args...))
		}
	}
	opt.Dir = CanonicalPath(opt.Dir)
	seen := map[string]bool{}
	var keep []string
	for _, p := range paths {
		c := CanonicalPath(p)
		switch {
		case seen[c]:
			continue
		case within(c, opt.Dir):
			logf("batch: %s left out: it is inside the output folder %s", p, opt.Dir)
			continue
		case inResultFolder(c):
			logf("batch: %s left out: it is inside a result folder of unfold", p)
			continue
		}
		seen[c] = true
		keep = append(keep, c)
	}
	paths = keep
	st := BatchStats{Inputs: len(paths)}
	if err := CleanLeftovers(opt.Dir, start); err != nil {
		return st, err
	}
	jobs := max(opt.Jobs, 1)
	var mu sync.Mutex
	work := make(chan int)
	var wg sync.WaitGroup
	var firstErr error
	done := 0
	for w := 0; w < jobs; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range work {
				p := paths[i]
				t0 := time.Now()
				status, msg, err := runOne(p, opt)
				mu.Lock()
				done++
				switch {
				case err != nil:
					if firstErr == nil {
						firstErr = err
					}
					logf("[%d/%d] %s: could not write the result: %v", done, len(paths), p, err)
				case status == "skipped":
					st.Skipped++
					logf("[%d/%d] %s: skipped (result complete, input unchanged)", done, len(paths), p)
				default:
					switch status {
					case StatusOK:
						st.OK++
					case StatusPartial:
						st.Partial++
					default:
						st.Errors++
					}
					line := fmt.Sprintf("[%d/%d] %s: %s (%.1f s)", done, len(paths), p, status, time.Since(t0).Seconds())
					if msg != "" {
						line += ": " + msg
					}
					logf("%s", line)
				}
				mu.Unlock()
			}
		}()
	}
	for i := range paths {
		work <- i
	}
	close(work)
	wg.Wait()
	rows, err := Merge(opt.Dir)
	if err != nil {
		return st, err
	}
	if err := WriteSummary(opt.Dir, rows); err != nil {
		return st, err
	}
	return st, firstErr
}

// runOne analyses one input unless its result is complete; it returns the status written
// ("skipped" when nothing was done) and a short message.
func runOne(path string, opt BatchOptions) (string, string, error) {
	name := ResultFolderName(path)
	folder := filepath.Join(opt.Dir, name)
	sum, herr := FileSHA256(path)
	if herr == nil {
		if prev, err := readResultHead(filepath.Join(folder, "result.json")); err == nil &&
			prev.Input.SHA256 == sum && (prev.Status != StatusError || !opt.RetryErrors) {
			return "skipped", "", nil
		}
	}
	if err := recordInput(opt.Dir, name, path); err != nil {
		return "", "", err
	}
	var res *Result
	aerr := herr
	if aerr == nil {
		res, aerr = analyze(opt.Analyze, path)
	}
	status, msg := StatusError, ""
	var errJSON []byte
	if aerr != nil {
		msg = aerr.Error()
		b, err := errorResult(opt.Version, path, sum, msg)
		if err != nil {
			return "", "", err
		}
		errJSON = b
	} else {
		status = res.Status()
		if status == StatusPartial {
			msg = "no answer from " + strings.Join(failedKeys(res), ", ")
		}
	}
	// The folder is written only now that the analysis is done, so a temporary folder lives
	// for the seconds of writing; if another batch starting meanwhile cleaned it away, write
	// it again.
	var err error
	for attempt := 0; attempt < 3; attempt++ {
		if err = writeAndReplace(folder, path, res, errJSON, opt); err == nil || !errors.Is(err, fs.ErrNotExist) {
			break
		}
	}
	return status, msg, err
}

// writeAndReplace writes one input's result (res, or the error result errJSON) into a new
// temporary sibling of folder and puts it in place.
func writeAndReplace(folder, path string, res *Result, errJSON []byte, opt BatchOptions) error {
	tmp, err := os.MkdirTemp(opt.Dir, tmpPrefix+filepath.Base(folder)+"-")
	if err != nil {
		return fmt.Errorf("batch: %w", err)
	}
	defer os.RemoveAll(tmp)
	if errJSON != nil {
		if err := os.WriteFile(filepath.Join(tmp, "result.json"), errJSON, 0o644); err != nil {
			return fmt.Errorf("batch: %w", err)
		}
	} else if _, err := res.WriteDir(tmp, WriteOptions{PNG: opt.PNG, Protect: []string{path}}); err != nil {
		return err
	}
	return replaceDir(tmp, folder)
}

// analyze calls f and turns a panic inside one input's analysis into that input's error, so
// that one bad input never stops the batch.
func analyze(f func(string) (*Result, error), path string) (r *Result, err error) {
	defer func() {
		if p := recover(); p != nil {
			r, err = nil, fmt.Errorf("internal error while analysing %s: %v", path, p)
		}
	}()
	return f(path)
}

func failedKeys(r *Result) []string {
	var ks []string
	for _, k := range r.Keys {
		if _, ok := r.Errors[k]; ok {
			ks = append(ks, k)
		}
	}
	return ks
}

// Names of the batch folder's own entries. Entries starting with a dot are never result
// folders and never inputs.
const (
	tmpPrefix = ".tmp-"   // a result being written, or an old result just swapped out
	oldPrefix = ".old-"   // an old result moved aside (where folders cannot be swapped)
	inputsDir = ".inputs" // one file per input a batch took on: its path
)

// replaceDir makes the complete folder tmp the result folder dst.
//
// When dst does not exist this is one rename. When it does, the two folders are swapped in one
// atomic step where the system can (Linux: renameat2 RENAME_EXCHANGE) and the old result,
// now at tmp, is removed. Elsewhere the old result is first renamed to .old-NAME-…, which
// CleanLeftovers and Merge restore when a kill struck before the second rename. Another batch
// replacing the same folder at the same time makes a step fail; it is retried, and the last
// complete result wins.
func replaceDir(tmp, dst string) error {
	var err error
	for attempt := 0; attempt < 50; attempt++ {
		if err = os.Rename(tmp, dst); err == nil {
			return nil
		}
		if !errors.Is(err, fs.ErrExist) {
			return fmt.Errorf("batch: %w", err)
		}
		err = exchange(tmp, dst)
		switch {
		case err == nil:
			if rerr := os.RemoveAll(tmp); rerr != nil {
				return fmt.Errorf("batch: removing the old result: %w", rerr)
			}
			return nil
		case errors.Is(err, fs.ErrNotExist):
			continue // dst went away in between: rename again
		case !errors.Is(err, errors.ErrUnsupported):
			return fmt.Errorf("batch: %w", err)
		}
		old := filepath.Join(filepath.Dir(dst), oldPrefix+filepath.Base(dst)+"-"+strconv.FormatInt(time.Now().UnixNano(), 36)+strconv.Itoa(attempt))
		if err = os.Rename(dst, old); err != nil {
			if errors.Is(err, fs.ErrNotExist) {
				continue
			}
			return fmt.Errorf("batch: %w", err)
		}
		err = os.Rename(tmp, dst)
		if err == nil {
			os.RemoveAll(old)
			return nil
		}
		// Another batch put its result in place in between: that one is newer than old.
		os.RemoveAll(old)
		if !errors.Is(err, fs.ErrExist) {
			return fmt.Errorf("batch: %w", err)
		}
	}
	return fmt.Errorf("batch: replacing %s: other runs kept replacing it (%v)", dst, err)
}

// CleanLeftovers tidies the batch folder dir before a run that started at start: an old
// result moved aside (.old-NAME-…) whose folder NAME is missing — a kill struck between the
// two renames of a replacement — is put back; other .old-* and .tmp-* entries last changed
// before start are removed (those of a batch running at the same time are newer and kept;
// one written by a batch at the very moment is moved away whole, and that batch writes it
// again).
func CleanLeftovers(dir string, start time.Time) error {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return fmt.Errorf("batch: %w", err)
	}
	restoreOld(dir, ents)
	ents, err = os.ReadDir(dir)
	if err != nil {
		return fmt.Errorf("batch: %w", err)
	}
	for _, e := range ents {
		n := e.Name()
		if !strings.HasPrefix(n, tmpPrefix) && !strings.HasPrefix(n, oldPrefix) {
			continue
		}
		fi, err := e.Info()
		if err != nil || !fi.ModTime().Before(start) {
			continue
		}
		// Move it out of the way in one rename first: a batch still writing into it then
		// fails to rename it into place and writes again, instead of publishing a folder
		// half removed. Removal is best effort; what stays is cleaned next time.
		trash, err := os.MkdirTemp(dir, tmpPrefix+"trash-")
		if err != nil {
			return fmt.Errorf("batch: %w", err)
		}
		_ = os.Rename(filepath.Join(dir, n), filepath.Join(trash, n))
		os.RemoveAll(trash)
	}
	return nil
}

// restoreOld renames each .old-NAME-… folder holding a complete result back to NAME when
// NAME is missing (the newest when there are several).
func restoreOld(dir string, ents []os.DirEntry) {
	for i := len(ents) - 1; i >= 0; i-- { // names sort by time within one NAME: newest first
		n := ents[i].Name()
		if !ents[i].IsDir() || !strings.HasPrefix(n, oldPrefix) {
			continue
		}
		k := strings.LastIndexByte(n, '-')
		if k <= len(oldPrefix) {
			continue
		}
		dst := filepath.Join(dir, n[len(oldPrefix):k])
		if _, err := os.Stat(dst); !errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if _, err := readResultHead(filepath.Join(dir, n, "result.json")); err == nil {
			os.Rename(filepath.Join(dir, n), dst)
		}
	}
}

// recordInput notes in dir/.inputs that this batch took on the input path (result folder
// name), so that Merge can name the inputs whose result is missing.
func recordInput(dir, name, path string) error {
	rec := filepath.Join(dir, inputsDir)
	if err := os.MkdirAll(rec, 0o755); err != nil {
		return fmt.Errorf("batch: %w", err)
	}
	p := filepath.Join(rec, name)
	if b, err := os.ReadFile(p); err == nil && string(b) == path+"\n" {
		return nil
	}
	f, err := os.CreateTemp(rec, ".tmp-")
	if err != nil {
		return fmt.Errorf("batch: %w", err)
	}
	_, werr := f.WriteString(path + "\n")
	cerr := f.Close()
	if werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Rename(f.Name(), p)
	}
	if werr != nil {
		os.Remove(f.Name())
		return fmt.Errorf("batch: %w", werr)
	}
	return nil
}

// errorResult is the result.json of an input that could not be analysed.
func errorResult(version, path, sum, msg string) ([]byte, error) {
	b, err := json.MarshalIndent(map[string]any{
		"command": "report", "version": version,
		"input":  map[string]any{"path": path, "sha256": sum},
		"status": StatusError, "error": msg,
	}, "", "  ")
	if err != nil {
		return nil, err
	}
	return append(b, '\n'), nil
}

// resultHead is the part of result.json that a batch summary and a sweep read back.
type resultHead struct {
	Input struct {
		Path    string   `json:"path"`
		SHA256  string   `json:"sha256"`
		Samples *int     `json:"samples"`
		Dt      *float64 `json:"dt"`
	} `json:"input"`
	Status     string `json:"status"`
	Error      string `json:"error"`
	Parameters struct {
		Column string `json:"column"`
		Gaps   string `json:"gaps"`
	} `json:"parameters"`
	Provenance *Provenance `json:"provenance"`
	Lag        *struct {
		Lag *int `json:"lag"`
	} `json:"lag"`
	Dim *struct {
		Dimension *int `json:"dimension"`
	} `json:"dim"`
	Lyapunov *struct {
		LambdaMax *float64   `json:"lambda_max"`
		Interval  []*float64 `json:"interval"`
	} `json:"lyapunov"`
	Fractal *struct {
		D2       *float64   `json:"d2"`
		Interval []*float64 `json:"interval"`
	} `json:"fractal"`
	Regime *struct {
		Regime     *string  `json:"regime"`
		Confidence *float64 `json:"confidence"`
		Lines      *struct {
			Kind         string    `json:"kind"`
			Frequencies  []float64 `json:"frequencies"`
			Fundamentals []float64 `json:"fundamentals"`
		} `json:"lines"`
	} `json:"regime"`
	States *struct {
		EntropyRate           *float64 `json:"entropy_rate"`
		StatisticalComplexity *float64 `json:"statistical_complexity"`
	} `json:"states"`
}

// decodeResult reads the result.json at path as it stands, complete or not. A file that
// cannot be read gives the reader's error (fs.ErrNotExist when there is none); one that is
// not valid JSON gives the decoder's error after the path.
func decodeResult(path string) (*resultHead, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var h resultHead
	if err := json.Unmarshal(b, &h); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return &h, nil
}

// readResultHead reads the result.json at path and refuses one without a status or an
// input path (a run that did not finish writing it).
func readResultHead(path string) (*resultHead, error) {
	h, err := decodeResult(path)
	if err != nil {
		return nil, err
	}
	if h.Status == "" || h.Input.Path == "" {
		return nil, fmt.Errorf("%s: not a complete result", path)
	}
	return h, nil
}

// SummaryHeader returns the header of summary.csv.
func SummaryHeader() []string {
	return []string{"file", "samples", "dt", "lag", "dimension", "lambda_max", "d2", "regime", "confidence", "status", "error",
		"entropy_rate", "statistical_complexity"}
}

// Row is one line of summary.csv: the fields of SummaryHeader as text (empty when the stage
// did not run or gave no answer). The causal states' entropy rate and statistical complexity
// come last, after the error, so the earlier columns keep their places.
type Row [13]string

// StatusMissing is the status of a summary row for an input a batch took on whose result
// folder is missing (the run was killed or is still going).
const StatusMissing = "missing"

// Merge reads every result folder of dir (sub-directories holding result.json; names starting
// with a dot are temporary and ignored) and returns the summary rows sorted by file. An old
// result moved aside by a replacement that a kill interrupted is put back first. Every input
// a batch took on (dir/.inputs) whose result folder is missing gets a row with status
// "missing" that says so.
func Merge(dir string) ([]Row, error) {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return nil, fmt.Errorf("batch: %w", err)
	}
	restoreOld(dir, ents)
	if ents, err = os.ReadDir(dir); err != nil {
		return nil, fmt.Errorf("batch: %w", err)
	}
	var rows []Row
	if recs, err := os.ReadDir(filepath.Join(dir, inputsDir)); err == nil {
		for _, r := range recs {
			if strings.HasPrefix(r.Name(), ".") {
				continue
			}
			if _, err := os.Stat(filepath.Join(dir, r.Name(), "result.json")); !errors.Is(err, fs.ErrNotExist) {
				continue
			}
			b, err := os.ReadFile(filepath.Join(dir, inputsDir, r.Name()))
			if err != nil {
				continue
			}
			rows = append(rows, Row{0: strings.TrimSpace(string(b)), 9: StatusMissing,
				10: "no result: the batch that took this input on did not finish it; run the batch again to resume"})
		}
	}
	for _, e := range ents {
		if !e.IsDir() || strings.HasPrefix(e.Name(), ".") {
			continue
		}
		p := filepath.Join(dir, e.Name(), "result.json")
		if _, err := os.Stat(p); errors.Is(err, fs.ErrNotExist) {
			continue
		}
		h, err := readResultHead(p)
		if err != nil {
			rows = append(rows, Row{0: e.Name(), 9: StatusError, 10: err.Error()})
			continue
		}
		rows = append(rows, h.row())
	}
	sort.Slice(rows, func(i, j int) bool { return rows[i][0] < rows[j][0] })
	return rows, nil
}

func (h *resultHead) row() Row {
	g := func(v *float64) string {
		if v == nil {
			return ""
		}
		return strconv.FormatFloat(*v, 'g', -1, 64)
	}
	n := func(v *int) string {
		if v == nil {
			return ""
		}
		return strconv.Itoa(*v)
	}
	r := Row{0: series.CleanText(h.Input.Path), 1: n(h.Input.Samples), 2: g(h.Input.Dt), 9: h.Status, 10: series.CleanText(h.Error)}
	if h.Lag != nil {
		r[3] = n(h.Lag.Lag)
	}
	if h.Dim != nil {
		r[4] = n(h.Dim.Dimension)
	}
	if h.Lyapunov != nil {
		r[5] = g(h.Lyapunov.LambdaMax)
	}
	if h.Fractal != nil {
		r[6] = g(h.Fractal.D2)
	}
	if h.Regime != nil {
		if h.Regime.Regime != nil {
			r[7] = *h.Regime.Regime
		}
		r[8] = g(h.Regime.Confidence)
	}
	if h.States != nil {
		r[11], r[12] = g(h.States.EntropyRate), g(h.States.StatisticalComplexity)
	}
	if r[10] == "" && h.Provenance != nil {
		var msgs []string
		for _, s := range h.Provenance.Stages {
			if s.Status != StatusOK && s.Status != analysis.StatusSkipped {
				msgs = append(msgs, s.Key+": "+s.Error)
			}
		}
		r[10] = strings.Join(msgs, "; ")
	}
	return r
}

// WriteSummary writes dir/summary.csv (header SummaryHeader) through a temporary file.
func WriteSummary(dir string, rows []Row) error {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	_ = w.Write(SummaryHeader())
	for _, r := range rows {
		_ = w.Write(r[:])
	}
	w.Flush()
	if err := w.Error(); err != nil {
		return fmt.Errorf("batch: summary: %w", err)
	}
	f, err := series.CreateAtomic(filepath.Join(dir, "summary.csv"))
	if err != nil {
		return err
	}
	defer f.Abort()
	if _, err := f.Write(b.Bytes()); err != nil {
		return fmt.Errorf("batch: summary: %w", err)
	}
	return f.Commit()
}
