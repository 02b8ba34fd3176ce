package report

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"unfold/series"
)

// A sweep is a series of records taken at many values of one control parameter (a Reynolds
// number, a drive voltage, a map's r). Its LIST is a CSV file: a "path" column naming each
// record, one numeric column whose header names the control parameter, and any other columns,
// kept as labels. The records are analysed as a batch (one result folder per record, named by
// FolderName) and the sweep reads the results back into one row per record, sorted by the
// parameter.

// SweepList is a parsed LIST file.
type SweepList struct {
	// Path is the LIST file as given.
	Path string
	// Parameter is the header of the control-parameter column ("r", "Re", "drive_V").
	Parameter string
	// Labels are the headers of the other columns (besides path), in file order.
	Labels []string
	// Entries are the records in file order.
	Entries []SweepEntry
}

// SweepEntry is one record of a LIST.
type SweepEntry struct {
	// Path is the record's path: as written when absolute, else resolved against the LIST's
	// folder, and cleaned. It is the path the batch analyses (and names its folder after).
	Path string
	// Value is the control parameter.
	Value float64
	// Labels are the cells of the label columns, in the order of SweepList.Labels.
	Labels []string
	// Line is the line of the LIST the entry was read from.
	Line int
}

// Paths returns the records' paths in LIST order, as the batch runs them.
func (l *SweepList) Paths() []string {
	out := make([]string, len(l.Entries))
	for i, e := range l.Entries {
		out[i] = e.Path
	}
	return out
}

// ReadSweepList reads a LIST file. parameter names the control-parameter column; "" means
// the only column whose first value is a number. Errors in the content are *series.InputError
// with the line and byte column.
func ReadSweepList(path, parameter string) (*SweepList, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("sweep: %w", err)
	}
	defer f.Close()
	return ParseSweepList(f, path, filepath.Dir(path), parameter)
}

// ParseSweepList reads a LIST from r; name is used in errors and dir is the folder that
// relative paths are resolved against. Blank lines and lines starting with # are skipped.
func ParseSweepList(r io.Reader, name, dir, parameter string) (*SweepList, error) {
	bad := func(line, col int, format string, args ...any) error {
		return &series.InputError{Path: name, Line: line, Column: col, Msg: fmt.Sprintf(format, args...)}
	}
	cr := csv.NewReader(r)
	cr.Comment = '#'
	cr.TrimLeadingSpace = true
	header, err := cr.Read()
	if err == io.EOF {
		return nil, bad(0, 0, "the list is empty: give a header line with a path column and the control parameter's column (e.g. path,r)")
	}
	if err != nil {
		return nil, csvInputError(name, err)
	}
	hline, _ := cr.FieldPos(0)
	pathCol := -1
	for i, h := range header {
		header[i] = strings.TrimSpace(h)
		if strings.EqualFold(header[i], "path") {
			if pathCol >= 0 {
				_, c := cr.FieldPos(i)
				return nil, bad(hline, c, "two path columns")
			}
			pathCol = i
		}
	}
	if pathCol < 0 {
		return nil, bad(hline, 1, "no column named path in the header %q: the list needs a path column naming each record and a column for the control parameter (e.g. path,r)", strings.Join(header, ","))
	}
	type rec struct {
		cells []string
		line  int
		cols  []int
	}
	var recs []rec
	for {
		cells, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvInputError(name, err)
		}
		rc := rec{cells: cells, cols: make([]int, len(cells))}
		for i := range cells {
			rc.line, rc.cols[i] = cr.FieldPos(i)
			cells[i] = strings.TrimSpace(cells[i])
		}
		recs = append(recs, rc)
	}
	if len(recs) == 0 {
		return nil, bad(hline, 0, "the list names no record (only a header)")
	}
	isNum := func(s string) bool {
		x, err := strconv.ParseFloat(s, 64)
		return err == nil && !math.IsNaN(x) && !math.IsInf(x, 0)
	}
	pcol := -1
	if parameter != "" {
		for i, h := range header {
			if h == parameter && i != pathCol {
				pcol = i
			}
		}
		if pcol < 0 {
			for i, h := range header {
				if strings.EqualFold(h, parameter) && i != pathCol {
					pcol = i
				}
			}
		}
		if pcol < 0 {
			return nil, bad(hline, 0, "no column %q for the control parameter (columns: %s)", parameter, strings.Join(header, ", "))
		}
	} else {
		var cands []int
		for i := range header {
			if i != pathCol && isNum(recs[0].cells[i]) {
				cands = append(cands, i)
			}
		}
		names := func(idx []int) string {
			var s []string
			for _, i := range idx {
				s = append(s, strconv.Quote(header[i]))
			}
			return strings.Join(s, ", ")
		}
		switch {
		case len(cands) == 0:
			return nil, bad(hline, 0, "no numeric column for the control parameter: besides path the list needs one column of numbers whose header names the parameter (e.g. path,r)")
		case len(cands) > 1:
			return nil, bad(hline, 0, "%d numeric columns could be the control parameter (%s): choose one with --parameter NAME", len(cands), names(cands))
		}
		pcol = cands[0]
	}
	l := &SweepList{Path: name, Parameter: header[pcol]}
	var labelCols []int
	for i, h := range header {
		if i != pathCol && i != pcol {
			labelCols = append(labelCols, i)
			l.Labels = append(l.Labels, h)
		}
	}
	seen := map[string]int{}
	for _, rc := range recs {
		p := rc.cells[pathCol]
		if p == "" {
			return nil, bad(rc.line, rc.cols[pathCol], "empty path")
		}
		v, err := strconv.ParseFloat(rc.cells[pcol], 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, bad(rc.line, rc.cols[pcol], "the control parameter %s must be a finite number, got %q", l.Parameter, rc.cells[pcol])
		}
		if !filepath.IsAbs(p) {
			p = filepath.Join(dir, p)
		}
		p = filepath.Clean(p)
		if first, dup := seen[p]; dup {
			return nil, bad(rc.line, rc.cols[pathCol], "the record %s is already listed on line %d", p, first)
		}
		seen[p] = rc.line
		e := SweepEntry{Path: p, Value: v, Line: rc.line}
		for _, c := range labelCols {
			e.Labels = append(e.Labels, rc.cells[c])
		}
		l.Entries = append(l.Entries, e)
	}
	return l, nil
}

// csvInputError turns an encoding/csv parse error into an *series.InputError.
func csvInputError(name string, err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &series.InputError{Path: name, Line: pe.Line, Column: pe.Column, Msg: pe.Err.Error()}
	}
	return fmt.Errorf("sweep: reading %s: %w", name, err)
}

// SweepRow is one record of a sweep: the control parameter, its labels and what the chain
// found. A number that is absent (the stage did not run, gave no answer, or wrote null) is
// NaN; Lag and Dimension are 0 when absent.
type SweepRow struct {
	Value  float64  // the control parameter
	Path   string   // the record
	Labels []string // the LIST's label cells
	Status string   // "ok", "partial", "error", or "missing" when no result was found
	Error  string   // why the record or a stage gave no answer

	Samples        int
	Dt             float64 // sampling interval in the record's time units
	TimeUnit, Unit string  // the record's time unit and signal unit, when the file states them

	Regime            string // verdict
	Confidence        float64
	Lag, Dimension    int
	LambdaMax         float64 // largest Lyapunov exponent, nats per time unit
	LambdaLo          float64
	LambdaHi          float64
	D2, D2Lo, D2Hi    float64 // correlation dimension and its interval
	EntropyRate       float64 // hμ of the causal states, bits per symbol
	Complexity        float64 // statistical complexity Cμ, bits
	Frequencies       []float64
	LineKind          string    // "periodic", "quasiperiodic" or "broadband" (the line analysis); "" when not run
	Fundamentals      []float64 // the generating frequencies of the lines (cycles per time unit)
	Points            []float64 // bifurcation-diagram values: maxima (flows) or samples (maps)
	PointsAreMaxima   bool
	RecordReadMessage string // why the record itself could not be read again, if so
}

// SweepHeader returns the header of sweep.csv for a parameter and label columns. A label
// whose name is taken by a fixed column is written as label_NAME.
func SweepHeader(parameter string, labels []string) []string {
	h := []string{parameter, "regime", "confidence", "lag", "dimension", "lambda_max", "lambda_lo",
		"lambda_hi", "d2", "d2_lo", "d2_hi", "entropy_rate", "statistical_complexity", "frequencies",
		"status", "path"}
	taken := map[string]bool{}
	for _, x := range h {
		taken[x] = true
	}
	for _, l := range labels {
		if taken[l] {
			l = "label_" + l
		}
		taken[l] = true
		h = append(h, l)
	}
	return h
}

// fmtNum writes a number for the CSV: empty when absent (NaN) or not finite.
func fmtNum(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

func fmtInt(n int) string {
	if n <= 0 {
		return ""
	}
	return strconv.Itoa(n)
}

// FormatFrequencies writes the spectral lines in ascending frequency, separated by ";",
// each with 6 significant digits.
func FormatFrequencies(f []float64) string {
	s := make([]string, len(f))
	for i, v := range f {
		s[i] = strconv.FormatFloat(v, 'g', 6, 64)
	}
	return strings.Join(s, ";")
}

// record returns the row's cells in the order of SweepHeader.
func (r *SweepRow) record() []string {
	out := []string{fmtNum(r.Value), r.Regime, fmtNum(r.Confidence), fmtInt(r.Lag), fmtInt(r.Dimension),
		fmtNum(r.LambdaMax), fmtNum(r.LambdaLo), fmtNum(r.LambdaHi), fmtNum(r.D2), fmtNum(r.D2Lo),
		fmtNum(r.D2Hi), fmtNum(r.EntropyRate), fmtNum(r.Complexity), FormatFrequencies(r.Frequencies),
		r.Status, r.Path}
	return append(out, r.Labels...)
}

// SortSweepRows sorts rows by the control parameter (ties by path), in place.
func SortSweepRows(rows []SweepRow) {
	sort.SliceStable(rows, func(i, j int) bool {
		if rows[i].Value != rows[j].Value {
			return rows[i].Value < rows[j].Value
		}
		return rows[i].Path < rows[j].Path
	})
}

// WriteSweepCSV writes the rows (sorted by the parameter) as CSV with SweepHeader.
func WriteSweepCSV(w io.Writer, parameter string, labels []string, rows []SweepRow) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(SweepHeader(parameter, labels)); err != nil {
		return err
	}
	for i := range rows {
		rec := rows[i].record()
		for len(rec) < 16+len(labels) {
			rec = append(rec, "")
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// writeFileAtomic writes b to path through a temporary file renamed into place.
func writeFileAtomic(path string, b []byte) error {
	f, err := series.CreateAtomic(path)
	if err != nil {
		return err
	}
	defer f.Abort()
	if _, err := f.Write(b); err != nil {
		return fmt.Errorf("sweep: writing %s: %w", path, err)
	}
	return f.Commit()
}
