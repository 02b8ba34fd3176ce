package series

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"unfold/internal/suggest"
)

// maxLine bounds the length of one text line; a longer "line" is taken as a sign that the
// input is not delimited text.
const maxLine = 1 << 20

// lineReader hands out the lines of a stream from one reused buffer. A line is valid until the
// next call of next.
type lineReader struct {
	r      io.Reader
	path   string
	buf    []byte
	lo, hi int
	eof    bool
	line   int // number of the last line returned (1-based)
}

func newLineReader(r io.Reader, path string) *lineReader {
	return &lineReader{r: r, path: path, buf: make([]byte, 16<<10)}
}

// next returns the next line without its terminator ("\n" or "\r\n"), or io.EOF.
func (lr *lineReader) next() ([]byte, error) {
	for {
		if i := bytes.IndexByte(lr.buf[lr.lo:lr.hi], '\n'); i >= 0 {
			l := lr.buf[lr.lo : lr.lo+i]
			lr.lo += i + 1
			lr.line++
			return trimCR(l), nil
		}
		if lr.eof {
			if lr.lo < lr.hi {
				l := lr.buf[lr.lo:lr.hi]
				lr.lo = lr.hi
				lr.line++
				return trimCR(l), nil
			}
			return nil, io.EOF
		}
		if lr.lo > 0 {
			n := copy(lr.buf, lr.buf[lr.lo:lr.hi])
			lr.lo, lr.hi = 0, n
		}
		if lr.hi == len(lr.buf) {
			if len(lr.buf) >= maxLine {
				return nil, &InputError{Path: lr.path, Line: lr.line + 1,
					Msg: fmt.Sprintf("line longer than %d bytes: this does not look like delimited text (give --format if it is binary)", maxLine)}
			}
			nb := make([]byte, 2*len(lr.buf))
			copy(nb, lr.buf[:lr.hi])
			lr.buf = nb
		}
		n, err := lr.r.Read(lr.buf[lr.hi:])
		lr.hi += n
		if err == io.EOF {
			lr.eof = true
		} else if err != nil {
			return nil, err
		}
	}
}

func trimCR(l []byte) []byte {
	if n := len(l); n > 0 && l[n-1] == '\r' {
		return l[:n-1]
	}
	return l
}

// span is one field of a line: the bytes line[lo:hi] (inside the quotes for a quoted field);
// start is the byte offset where the field begins (its opening quote, if any).
type span struct {
	lo, hi, start int
	quoted        bool
	bad           bool // text after a closing quote, or an unclosed quote
	escaped       bool // contains doubled quotes ("")
}

// isBlank reports whether the line is empty or only spaces and tabs.
func isBlank(l []byte) bool {
	for _, c := range l {
		if c != ' ' && c != '\t' {
			return false
		}
	}
	return true
}

// isComment reports whether the first non-blank character of the line is '#'.
func isComment(l []byte) bool {
	for _, c := range l {
		if c == ' ' || c == '\t' {
			continue
		}
		return c == '#'
	}
	return false
}

// quotedEnd returns the index of the quote closing a quoted field whose content starts at i,
// whether the content holds doubled quotes, and ok=false when the quote is never closed.
func quotedEnd(line []byte, i int) (end int, escaped, ok bool) {
	for i < len(line) {
		j := bytes.IndexByte(line[i:], '"')
		if j < 0 {
			return len(line), escaped, false
		}
		i += j
		if i+1 < len(line) && line[i+1] == '"' {
			escaped = true
			i += 2
			continue
		}
		return i, escaped, true
	}
	return len(line), escaped, false
}

// splitFields splits line into fields separated by delim, or by runs of spaces and tabs when
// delim is ' ', appending them to dst[:0]. Quoted fields ("a,b", "say ""hi""") are honoured.
func splitFields(line []byte, delim byte, dst []span) []span {
	dst = dst[:0]
	n := len(line)
	i := 0
	if delim == ' ' {
		for {
			for i < n && (line[i] == ' ' || line[i] == '\t') {
				i++
			}
			if i == n {
				return dst
			}
			f := span{start: i}
			if line[i] == '"' {
				end, esc, ok := quotedEnd(line, i+1)
				f.lo, f.hi, f.quoted, f.escaped, f.bad = i+1, end, true, esc, !ok
				i = min(end+1, n)
				if i < n && line[i] != ' ' && line[i] != '\t' {
					f.bad = true
				}
				for i < n && line[i] != ' ' && line[i] != '\t' {
					i++
				}
			} else {
				f.lo = i
				for i < n && line[i] != ' ' && line[i] != '\t' {
					i++
				}
				f.hi = i
			}
			dst = append(dst, f)
		}
	}
	for {
		for i < n && (line[i] == ' ' || (line[i] == '\t' && delim != '\t')) {
			i++
		}
		f := span{start: i}
		if i < n && line[i] == '"' {
			end, esc, ok := quotedEnd(line, i+1)
			f.lo, f.hi, f.quoted, f.escaped, f.bad = i+1, end, true, esc, !ok
			i = min(end+1, n)
			for i < n && (line[i] == ' ' || (line[i] == '\t' && delim != '\t')) {
				i++
			}
			if i < n && line[i] != delim {
				f.bad = true
				j := bytes.IndexByte(line[i:], delim)
				if j < 0 {
					i = n
				} else {
					i += j
				}
			}
		} else {
			f.lo = i
			j := bytes.IndexByte(line[i:], delim)
			if j < 0 {
				i = n
			} else {
				i += j
			}
			hi := i
			for hi > f.lo && (line[hi-1] == ' ' || (line[hi-1] == '\t' && delim != '\t')) {
				hi--
			}
			f.hi = hi
		}
		dst = append(dst, f)
		if i >= n {
			return dst
		}
		i++ // the delimiter
		if i == n {
			dst = append(dst, span{lo: n, hi: n, start: n})
			return dst
		}
	}
}

// fieldText returns the text of a field as a string (quotes removed, doubled quotes undone).
func fieldText(line []byte, f span) string {
	s := string(line[f.lo:f.hi])
	if f.escaped {
		s = strings.ReplaceAll(s, `""`, `"`)
	}
	return s
}

// detectDelimiter chooses the delimiter from the first content line: a tab if there is one
// outside quotes, else a semicolon, else a comma, else runs of spaces. A semicolon wins over a
// comma because files that separate fields with semicolons often write decimal commas.
func detectDelimiter(line []byte) byte {
	var tab, semi, comma bool
	inq := false
	for _, c := range line {
		switch {
		case c == '"':
			inq = !inq
		case inq:
		case c == '\t':
			tab = true
		case c == ';':
			semi = true
		case c == ',':
			comma = true
		}
	}
	switch {
	case tab:
		return '\t'
	case semi:
		return ';'
	case comma:
		return ','
	}
	return ' '
}

// delimiterName is the delimiter in words, for notes.
func delimiterName(d byte) string {
	switch d {
	case '\t':
		return "tab"
	case ';':
		return "semicolon"
	case ',':
		return "comma"
	}
	return "spaces"
}

// cellKind classifies a cell.
type cellKind int

const (
	cellNumber cellKind = iota // a finite number
	cellGap                    // empty, NA, NaN or ±Inf
	cellText                   // anything else
	cellStamp                  // an ISO-8601 date-time (a text cell that is a time stamp)
)

// naTokens are the spellings of a missing value besides the empty cell and NaN/Inf.
func isNAToken(b []byte) bool {
	switch string(b) { // no allocation: the conversion is only compared
	case "NA", "N/A", "na", "n/a", "null", "NULL", "None", "-":
		return true
	}
	return false
}

// classify parses a cell.
func classify(b []byte, bad bool) (float64, cellKind) {
	if bad {
		return 0, cellText
	}
	if len(b) == 0 {
		return 0, cellGap
	}
	v, ok := parseFloat(b)
	if !ok {
		if isNAToken(b) {
			return 0, cellGap
		}
		return 0, cellText
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return v, cellGap
	}
	return v, cellNumber
}

// timeUnits maps words of a time column's name to a unit.
func timeUnitOf(word string) string {
	switch word {
	case "s", "sec", "secs", "second", "seconds":
		return "s"
	case "ms", "msec", "millisecond", "milliseconds":
		return "ms"
	case "min", "mins", "minute", "minutes":
		return "min"
	case "h", "hr", "hrs", "hour", "hours":
		return "h"
	case "d", "day", "days":
		return "d"
	case "y", "yr", "yrs", "year", "years":
		return "y"
	}
	return ""
}

// nameWords splits a column name into lower-case words of letters and digits.
func nameWords(name string) []string {
	return strings.FieldsFunc(strings.ToLower(name), func(r rune) bool {
		return !(r >= 'a' && r <= 'z' || r >= '0' && r <= '9')
	})
}

// timeName reports whether a column name denotes time and the unit it states ("" if none).
// The first word must be one of t, time, times, timestamp, date, decimal (as in "decimal
// year") or a unit word (s, sec, seconds, ms, min, minutes, hours, days, year, …); the unit is
// the first unit word in the name ("time (s)", "t_ms", "year").
func timeName(name string) (bool, string) {
	w := nameWords(name)
	if len(w) == 0 {
		return false, ""
	}
	switch w[0] {
	case "t", "time", "times", "timestamp", "date", "decimal":
	case "h", "d": // too often a signal's name
		return false, ""
	default:
		if timeUnitOf(w[0]) == "" {
			return false, ""
		}
	}
	for _, x := range w {
		if u := timeUnitOf(x); u != "" {
			return true, u
		}
	}
	return true, ""
}

// columnList describes the columns for an error message.
func columnList(names []string, ncol int) string {
	if names == nil {
		return fmt.Sprintf("the file has no header line; give a 1-based index from 1 to %d", ncol)
	}
	var b strings.Builder
	b.WriteString("the columns are ")
	for j, n := range names {
		if j > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "%d %q", j+1, n)
		if n == "" && j == 0 {
			b.WriteString(" (row names)")
		}
	}
	return b.String()
}

// noColumn is the message for a column spec that names no column: with the header name
// nearest to spec by edit distance ("did you mean"), when one is near, and the columns.
func noColumn(spec string, names []string, ncol int) string {
	if best := suggest.Closest(spec, names); best != "" {
		return fmt.Sprintf("no column %q; did you mean %q? %s", spec, best, columnList(names, ncol))
	}
	return fmt.Sprintf("no column %q: %s", spec, columnList(names, ncol))
}

// resolveColumn finds a column by name (exact, then ignoring case and surrounding spaces) or by
// 1-based index; it returns −1 when there is none.
func resolveColumn(spec string, names []string, ncol int) int {
	spec = CleanText(spec)
	for j, n := range names {
		if n == spec {
			return j
		}
	}
	for j, n := range names {
		if strings.EqualFold(strings.TrimSpace(n), strings.TrimSpace(spec)) {
			return j
		}
	}
	for j, n := range names { // "strain" names the column "strain [µε]"
		if bare, u := SplitUnit(n); u != "" && strings.EqualFold(bare, strings.TrimSpace(spec)) {
			return j
		}
	}
	if k, err := strconv.Atoi(strings.TrimSpace(spec)); err == nil && k >= 1 && k <= ncol {
		return k - 1
	}
	return -1
}

// SplitUnit splits a column header that states its unit in brackets or parentheses at its
// end — "strain [µε]", "U[mV]", "time (s)" — into the name and the unit. Parentheses count
// only after a space ("x(t)" is a name). A header without such a suffix (or with nothing
// before or inside it) is returned whole with an empty unit.
func SplitUnit(header string) (name, unit string) {
	h := strings.TrimSpace(header)
	open := byte(0)
	switch {
	case strings.HasSuffix(h, "]"):
		open = '['
	case strings.HasSuffix(h, ")"):
		open = '('
	default:
		return header, ""
	}
	i := strings.LastIndexByte(h, open)
	if i <= 0 {
		return header, ""
	}
	if open == '(' && h[i-1] != ' ' && h[i-1] != '\t' {
		return header, "" // "x(t)", "f(x)": a name, not a unit
	}
	name, unit = strings.TrimSpace(h[:i]), strings.TrimSpace(h[i+1:len(h)-1])
	if name == "" || unit == "" || strings.ContainsAny(unit, "[]()") {
		return header, ""
	}
	return name, unit
}

// TimeUnitOf returns the canonical spelling of a time unit word ("s", "ms", "min", "h", "d",
// "y" for "seconds", "msec", "minutes", …) and "" for a word that is not one.
func TimeUnitOf(word string) string { return timeUnitOf(strings.ToLower(strings.TrimSpace(word))) }

// timeCheck verifies, line by line, that time stamps advance by a constant step within the
// precision they are written with.
//
// The precision q of the column is the finest one among its stamps (the most decimals seen):
// writers that drop trailing zeros ("1959.25" next to "1959.0833333333") write every stamp
// to that precision. A step may differ from the mean step by the rounding of two stamps and of
// the mean (q·(1 + 1/(n−1))) when q is at most a quarter of the step, so that a gap or a
// repeat (a deviation of a whole step) is never mistaken for rounding; and by 1% of the step
// in any case.
type timeCheck struct {
	n         int
	t0, prev  float64
	quantum   float64 // finest precision of the stamps seen
	maxSig    int     // most significant digits seen in a stamp
	name      string
	path      string
	fieldNo   int
	firstLine int
}

// add checks the next stamp t written with precision q, found on line:col.
func (c *timeCheck) add(t, q float64, line, col int) error {
	if c.n == 0 || q < c.quantum {
		c.quantum = q
	}
	if t != 0 && q > 0 {
		c.maxSig = max(c.maxSig, int(math.Floor(math.Log10(math.Abs(t))))+1-int(math.Round(math.Log10(q))))
	}
	if c.n == 0 {
		c.t0, c.prev, c.n, c.firstLine = t, t, 1, line
		return nil
	}
	step := t - c.prev
	hint := "the time column is not uniformly sampled; resample the record, or give --dt to ignore the time column"
	if step == 0 {
		return &InputError{Path: c.path, Line: line, Column: col,
			Msg: fmt.Sprintf("time %s repeats the previous stamp in column %q: %s", fmtG(t), c.name, hint)}
	}
	if step < 0 {
		return &InputError{Path: c.path, Line: line, Column: col,
			Msg: fmt.Sprintf("time %s is before the previous stamp %s in column %q (times must increase): %s", fmtG(t), fmtG(c.prev), c.name, hint)}
	}
	if c.n >= 2 {
		mean := (c.prev - c.t0) / float64(c.n-1)
		// Two stamps each rounded to ±q/2 make a step uncertain by q; the mean of the n−1
		// steps so far is uncertain by q/(n−1). Allow that, or 1% of the step, whichever is
		// larger, plus float64 round-off of the stamps themselves.
		// A writer of significant digits (%.6g) rounds larger stamps more coarsely: the step
		// between two stamps is uncertain by the coarser of their precisions at the most
		// significant digits seen.
		q2 := math.Max(c.quantum, math.Max(c.sigQuantum(t), c.sigQuantum(c.prev)))
		prec := 0.0
		if 4*c.quantum <= mean {
			prec = c.quantum * (1 + 1/float64(c.n-1)) * (1 + 1e-9)
		}
		if 4*q2 <= mean {
			prec = math.Max(prec, (q2+c.quantum/float64(c.n-1))*(1+1e-9))
		}
		tol := math.Max(prec, 0.01*mean) + 8*0x1p-52*math.Max(math.Abs(t), math.Abs(c.prev))
		if math.Abs(step-mean) > tol {
			what := "jitter"
			switch {
			case step > 1.5*mean:
				what = "a gap"
			case step < 0.5*mean:
				what = "an extra or repeated sample"
			}
			return &InputError{Path: c.path, Line: line, Column: col,
				Msg: fmt.Sprintf("time step %s (from %s to %s) differs from the step %s of the lines before by more than the rounding of the stamps (written to %s) and 1%% of the step — %s: %s",
					fmtG(step), fmtG(c.prev), fmtG(t), fmtG(mean), fmtG(c.quantum), what, hint)}
		}
	}
	c.prev = t
	c.n++
	return nil
}

// sigQuantum is the precision of the stamp t written with the most significant digits seen
// (0 when none is known).
func (c *timeCheck) sigQuantum(t float64) float64 {
	if t == 0 || c.maxSig <= 0 {
		return 0
	}
	return math.Pow(10, math.Floor(math.Log10(math.Abs(t)))+1-float64(c.maxSig))
}

// fmtG formats a number for a message.
func fmtG(x float64) string { return strconv.FormatFloat(x, 'g', 10, 64) }

// readText reads delimited text (see ReadOptions and Read).
func readText(r io.Reader, path string, opt ReadOptions) (*Series, []string, error) {
	lr := newLineReader(r, path)
	var notes []string
	first := true
	// nextContent returns the next line that is neither blank nor a comment.
	nextContent := func() ([]byte, error) {
		for {
			l, err := lr.next()
			if err != nil {
				return nil, err
			}
			if first {
				first = false
				l = bytes.TrimPrefix(l, []byte("\xef\xbb\xbf")) // UTF-8 byte-order mark
			}
			if isBlank(l) || isComment(l) {
				continue
			}
			return l, nil
		}
	}
	line, err := nextContent()
	if err == io.EOF {
		return nil, nil, &InputError{Path: path, Msg: "empty series: the file holds no data lines"}
	}
	if err != nil {
		return nil, nil, err
	}
	delim := detectDelimiter(line)
	fields := splitFields(line, delim, make([]span, 0, 16))
	commaDelim := delim == ';' || delim == '\t'
	cr := cellReader{comma: commaDelim && decimalCommaRow(line, fields)}

	// A header is a first line with a cell that is neither a number nor a gap.
	var names []string
	headerLine := 0
	for _, f := range fields {
		if _, k := cr.classify(line[f.lo:f.hi], f.bad); k == cellText && !isStampCell(line, f) {
			headerLine = lr.line
			break
		}
	}
	if headerLine > 0 {
		names = make([]string, len(fields))
		for j, f := range fields {
			names[j] = CleanText(fieldText(line, f))
		}
		line, err = nextContent()
		if err == io.EOF {
			return nil, nil, &InputError{Path: path, Line: headerLine, Msg: "empty series: a header line but no data lines"}
		}
		if err != nil {
			return nil, nil, err
		}
		fields = splitFields(line, delim, fields)
		if commaDelim && !cr.comma {
			cr.comma = decimalCommaRow(line, fields)
		}
	}
	if cr.comma {
		notes = append(notes, fmt.Sprintf("decimal commas: numbers are written like %q (read as %s)", commaExample(line, fields), commaExampleValue(line, fields)))
	}
	ncol := len(fields)
	if names != nil && len(names) == ncol-1 {
		// A header with one name fewer than the rows have fields: the rows start with row
		// names (as R's write.table writes them).
		names = append([]string{""}, names...)
	}
	if names != nil && len(names) != ncol {
		return nil, nil, &InputError{Path: path, Line: lr.line, Column: 1,
			Msg: fmt.Sprintf("ragged rows: this row has %d fields, the header on line %d has %d", ncol, headerLine, len(names))}
	}
	kinds := make([]cellKind, ncol)
	for j, f := range fields {
		b := line[f.lo:f.hi]
		if _, kinds[j] = cr.classify(b, f.bad); kinds[j] == cellText && !f.bad && looksISO(b) {
			if _, _, _, ok := isoStamp(b); ok {
				kinds[j] = cellStamp
			}
		}
	}
	numeric := func(j int) bool { return kinds[j] == cellNumber || kinds[j] == cellGap }
	timeLike := func(j int) bool { return numeric(j) || kinds[j] == cellStamp }

	// Time column.
	tcol := -1
	timeUnit := ""
	switch spec := strings.TrimSpace(opt.TimeColumn); {
	case spec == "none" || spec == "-":
	case spec != "":
		tcol = resolveColumn(spec, names, ncol)
		if tcol < 0 {
			return nil, nil, &InputError{Path: path, Line: headerLine,
				Msg: "no time column" + strings.TrimPrefix(noColumn(spec, names, ncol), "no column")}
		}
		if names != nil {
			_, timeUnit = timeName(names[tcol])
		}
	case names != nil:
		for j, n := range names {
			if ok, u := timeName(n); ok && timeLike(j) {
				tcol, timeUnit = j, u
				notes = append(notes, fmt.Sprintf("time column %q (by its name)", n))
				break
			}
		}
	}
	if tcol < 0 && strings.TrimSpace(opt.TimeColumn) == "" {
		for j, k := range kinds {
			if k == cellStamp {
				tcol = j
				notes = append(notes, fmt.Sprintf("time column %d (ISO-8601 date-times)", j+1))
				if names != nil && names[j] != "" {
					notes[len(notes)-1] = fmt.Sprintf("time column %q (ISO-8601 date-times)", names[j])
				}
				break
			}
		}
	}
	if tcol >= 0 && timeUnit == "" && names != nil {
		_, timeUnit = SplitUnit(names[tcol]) // "time [ks]": a unit the reader does not convert
	}
	isoTime := tcol >= 0 && kinds[tcol] == cellStamp
	if isoTime {
		timeUnit = "s"
	}

	// Value column.
	vcol := -1
	colName := func(j int) string {
		if names != nil && names[j] != "" {
			return names[j]
		}
		if ncol == 1 {
			return "x"
		}
		return "column " + strconv.Itoa(j+1)
	}
	if spec := strings.TrimSpace(opt.Column); spec != "" {
		vcol = resolveColumn(spec, names, ncol)
		if vcol < 0 {
			return nil, nil, &InputError{Path: path, Line: headerLine,
				Msg: noColumn(spec, names, ncol)}
		}
		if vcol == tcol {
			if opt.TimeColumn != "" {
				return nil, nil, &InputError{Path: path, Line: headerLine,
					Msg: fmt.Sprintf("column %q is both the signal (--column) and the time column (--time-column)", colName(vcol))}
			}
			tcol, timeUnit = -1, ""
			notes = notes[:0]
		}
	} else {
		var cand []int
		for j := 0; j < ncol; j++ {
			if j == tcol || !numeric(j) || (names != nil && names[j] == "" && j == 0) {
				continue
			}
			cand = append(cand, j)
		}
		if len(cand) == 0 {
			return nil, nil, &InputError{Path: path, Line: lr.line,
				Msg: fmt.Sprintf("no numeric signal column: %s", columnList(names, ncol))}
		}
		vcol = cand[0]
		switch {
		case len(cand) == 1:
			notes = append(notes, fmt.Sprintf("signal column %q (the only numeric column besides time)", colName(vcol)))
		case tcol >= 0:
			notes = append(notes, fmt.Sprintf("%d numeric columns: using %q (the first besides the time column); choose with --column", len(cand), colName(vcol)))
		default:
			notes = append(notes, fmt.Sprintf("%d numeric columns: using %q (the first); choose with --column", len(cand), colName(vcol)))
		}
	}
	notes = append(notes, "delimiter: "+delimiterName(delim))
	if err := checkGaps(opt.Gaps, path); err != nil {
		return nil, nil, err
	}

	useTime := tcol >= 0 && opt.Dt <= 0
	if tcol >= 0 && !useTime {
		notes = append(notes, fmt.Sprintf("time column %q not used for sampling (--dt given)", colName(tcol)))
	}
	tc := timeCheck{path: path, fieldNo: tcol}
	if tcol >= 0 {
		tc.name = colName(tcol)
	}
	g := gapFiller{policy: opt.Gaps}
	var sec0, nsec0 int64 // the first ISO-8601 stamp; times are counted from it
	stamp0 := ""
	sawPoint := false // a number of the signal column was written with a decimal point
	for {
		if len(fields) != ncol {
			col := 1
			if len(fields) > ncol {
				col = fields[ncol].start + 1
			} else {
				col = len(line) + 1
			}
			want := fmt.Sprintf("the first data row has %d", ncol)
			if names != nil {
				want = fmt.Sprintf("the header on line %d has %d", headerLine, ncol)
			}
			return nil, nil, &InputError{Path: path, Line: lr.line, Column: col,
				Msg: fmt.Sprintf("ragged rows: this row has %d fields, %s", len(fields), want)}
		}
		f := fields[vcol]
		v, k := cr.classify(line[f.lo:f.hi], f.bad)
		if k == cellText && commaDelim && !cr.comma && !sawPoint && decimalCommaRow(line, fields) {
			// The rows so far held whole numbers only, which read the same either way; this
			// is the first row that shows the decimal comma.
			cr.comma = true
			notes = append(notes, fmt.Sprintf("decimal commas: numbers are written like %q (read as %s), first on line %d", commaExample(line, fields), commaExampleValue(line, fields), lr.line))
			v, k = cr.classify(line[f.lo:f.hi], f.bad)
		} else if k == cellNumber && !cr.comma && bytes.IndexByte(line[f.lo:f.hi], '.') >= 0 {
			sawPoint = true
		}
		switch k {
		case cellNumber:
			g.value(v)
		case cellGap:
			if opt.Gaps == gapsRefuse {
				what := "an empty cell"
				if f.hi > f.lo {
					what = fmt.Sprintf("%q", line[f.lo:f.hi])
				}
				return nil, nil, &InputError{Path: path, Line: lr.line, Column: f.start + 1,
					Msg: fmt.Sprintf("%s in column %q is a gap (missing, NaN or infinite): %s", what, colName(vcol), gapHint)}
			}
			g.gap()
		default:
			return nil, nil, &InputError{Path: path, Line: lr.line, Column: f.start + 1,
				Msg: fmt.Sprintf("%q in column %q is not a number%s", clip(line[f.lo:f.hi]), colName(vcol), cr.hint(line[f.lo:f.hi]))}
		}
		if useTime && isoTime {
			f := fields[tcol]
			b := line[f.lo:f.hi]
			sec, nsec, q, ok := isoStamp(b)
			if !ok || f.bad {
				return nil, nil, &InputError{Path: path, Line: lr.line, Column: f.start + 1,
					Msg: fmt.Sprintf("time %q in column %q is not an ISO-8601 date-time like the first ones (2026-01-01T00:00:00Z, 2026-01-01 00:00:00.5, 2026-01-01T01:00:00+01:00)", clip(b), tc.name)}
			}
			if tc.n == 0 {
				sec0, nsec0 = sec, nsec
				stamp0 = string(b)
			}
			t := float64(sec-sec0) + float64(nsec-nsec0)*1e-9
			if err := tc.add(t, q, lr.line, f.start+1); err != nil {
				return nil, nil, err
			}
		} else if useTime {
			f := fields[tcol]
			b, okc := cr.text(line[f.lo:f.hi])
			t, k := classify(b, f.bad)
			if !okc {
				k = cellText
			}
			if k != cellNumber {
				what := "is not a number"
				if k == cellGap {
					what = "is missing or not finite"
				}
				return nil, nil, &InputError{Path: path, Line: lr.line, Column: f.start + 1,
					Msg: fmt.Sprintf("time %q in column %q %s", clip(b), tc.name, what)}
			}
			if err := tc.add(t, stampQuantum(b), lr.line, f.start+1); err != nil {
				return nil, nil, err
			}
		}
		line, err = nextContent()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, nil, err
		}
		fields = splitFields(line, delim, fields)
	}
	vals := g.finish()
	if len(vals) == 0 {
		return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("empty series: every value of column %q is a gap", colName(vcol))}
	}
	s := &Series{Values: vals, Dt: 1, Name: colName(vcol), GapsFilled: g.filled, TimeUnit: timeUnit}
	if names != nil {
		s.Name, s.Unit = SplitUnit(s.Name)
	}
	if names == nil && ncol == 1 {
		s.Name = "x"
	}
	switch {
	case opt.Dt > 0:
		s.Dt = opt.Dt
	case useTime && tc.n >= 2:
		s.Dt = (tc.prev - tc.t0) / float64(tc.n-1)
		s.T0 = tc.t0
		s.TimeName = tc.name
		if isoTime {
			notes = append(notes, fmt.Sprintf("dt %s s from the ISO-8601 date-times of column %q (times counted in seconds from %s)", fmtG(s.Dt), tc.name, stamp0))
		} else {
			notes = append(notes, fmt.Sprintf("dt %s from the time column %q", fmtG(s.Dt), tc.name))
		}
	case useTime:
		s.T0 = tc.t0
		s.TimeName = tc.name
	}
	if g.filled > 0 {
		notes = append(notes, fmt.Sprintf("%d gaps filled (--gaps %s)", g.filled, opt.Gaps))
	}
	return s, notes, nil
}

// clip shortens a cell for a message.
func clip(b []byte) string {
	if len(b) > 40 {
		return string(b[:40]) + "…"
	}
	return string(b)
}
