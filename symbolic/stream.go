package symbolic

import (
	"bufio"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"hash"
	"io"
	"os"
	"strings"

	"unfold/series"
)

// StreamFormat is the value of the sidecar's "format" field.
const StreamFormat = "unfold symbol stream"

// StreamFormatVersion is the version of the stream and sidecar layout written by this package.
const StreamFormatVersion = 1

// DefaultLineWidth is the number of symbols per line a Writer puts in a stream.
const DefaultLineWidth = 80

// alphabetChars are the characters of the default alphabets, in order.
const alphabetChars = "0123456789abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ"

// MaxAlphabet is the largest alphabet size a stream can hold.
const MaxAlphabet = len(alphabetChars)

// DefaultAlphabet returns the alphabet of k symbols used by the toolkit: the digits 0–9, then
// the letters a–z and A–Z (k ≤ MaxAlphabet).
func DefaultAlphabet(k int) (string, error) {
	if k < 1 || k > MaxAlphabet {
		return "", fmt.Errorf("symbolic: alphabet size %d must be between 1 and %d", k, MaxAlphabet)
	}
	return alphabetChars[:k], nil
}

// checkAlphabet reports whether a is a valid alphabet: 1 to MaxAlphabet distinct printable
// ASCII characters, none of them white space.
func checkAlphabet(a string) error {
	if len(a) < 1 || len(a) > MaxAlphabet {
		return fmt.Errorf("alphabet %q must have between 1 and %d characters", a, MaxAlphabet)
	}
	var seen [256]bool
	for i := 0; i < len(a); i++ {
		c := a[i]
		if c <= ' ' || c > '~' {
			return fmt.Errorf("alphabet %q: character %d (%q) is not a printable, non-space ASCII character", a, i+1, c)
		}
		if seen[c] {
			return fmt.Errorf("alphabet %q: character %q appears twice", a, c)
		}
		seen[c] = true
	}
	return nil
}

// PartitionInfo describes the partition that turned a signal into symbols.
type PartitionInfo struct {
	// Kind is "search", "critical", "quantile" or "threshold".
	Kind string `json:"kind"`
	// Thresholds are the increasing cut values; symbol k means a value in
	// [Thresholds[k−1], Thresholds[k]) (with −∞ and +∞ at the ends).
	Thresholds []float64 `json:"thresholds"`
	// Score is the partition's score (see Criterion); lower is better.
	Score float64 `json:"score"`
	// Criterion names what Score measures.
	Criterion string `json:"criterion,omitempty"`
	// AppliedTo is "signal" (a map-like record, partitioned sample by sample) or "section"
	// (a flow-like record, partitioned at its Poincaré-section crossings).
	AppliedTo string `json:"applied_to,omitempty"`
}

// Source names the file the symbols were made from.
type Source struct {
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
}

// Sidecar is the JSON file beside a symbol stream.
type Sidecar struct {
	Format        string `json:"format"`
	FormatVersion int    `json:"format_version"`
	// Alphabet lists the symbols in order: character k is symbol k.
	Alphabet     string `json:"alphabet"`
	AlphabetSize int    `json:"alphabet_size"`
	// Count is the number of symbols in the stream.
	Count int64 `json:"count"`
	// Counts[k] is the number of occurrences of symbol k.
	Counts []int64 `json:"counts"`
	// LineWidth is the number of symbols per line (line breaks carry no meaning).
	LineWidth int `json:"line_width"`
	// StreamSHA256 is the SHA-256 of the symbol characters alone (line breaks excluded).
	StreamSHA256 string        `json:"stream_sha256"`
	Partition    PartitionInfo `json:"partition"`
	Source       Source        `json:"source"`
	// Command is the exact command line that wrote the stream.
	Command string `json:"command"`
	// Version is the version of the program that wrote the stream.
	Version string `json:"version"`
}

// SidecarPath returns the name of the sidecar of the stream at path: path + ".json".
func SidecarPath(path string) string { return path + ".json" }

// WriteSidecar writes sc as indented JSON to w.
func WriteSidecar(w io.Writer, sc *Sidecar) error {
	b, err := json.MarshalIndent(sc, "", "  ")
	if err != nil {
		return fmt.Errorf("symbolic: encoding sidecar: %w", err)
	}
	b = append(b, '\n')
	_, err = w.Write(b)
	return err
}

// ReadSidecar decodes and checks a sidecar read from r; path names it in errors, which are
// *series.InputError for bad content.
func ReadSidecar(r io.Reader, path string) (*Sidecar, error) {
	dec := json.NewDecoder(r)
	var sc Sidecar
	if err := dec.Decode(&sc); err != nil {
		var se *json.SyntaxError
		var te *json.UnmarshalTypeError
		switch {
		case errors.As(err, &se):
			return nil, &series.InputError{Path: path, Msg: fmt.Sprintf("sidecar is not valid JSON at byte %d: %v", se.Offset, err)}
		case errors.As(err, &te):
			return nil, &series.InputError{Path: path, Msg: fmt.Sprintf("sidecar field %q has the wrong type: %v", te.Field, err)}
		default:
			return nil, &series.InputError{Path: path, Msg: fmt.Sprintf("reading sidecar: %v", err)}
		}
	}
	bad := func(format string, a ...any) error {
		return &series.InputError{Path: path, Msg: "sidecar: " + fmt.Sprintf(format, a...)}
	}
	if sc.Format != StreamFormat {
		return nil, bad("format is %q, want %q", sc.Format, StreamFormat)
	}
	if sc.FormatVersion < 1 || sc.FormatVersion > StreamFormatVersion {
		return nil, bad("format_version %d is not supported (this program reads 1 to %d)", sc.FormatVersion, StreamFormatVersion)
	}
	if err := checkAlphabet(sc.Alphabet); err != nil {
		return nil, bad("%v", err)
	}
	if sc.AlphabetSize != len(sc.Alphabet) {
		return nil, bad("alphabet_size %d does not match the alphabet %q (%d symbols)", sc.AlphabetSize, sc.Alphabet, len(sc.Alphabet))
	}
	if len(sc.Counts) != sc.AlphabetSize {
		return nil, bad("counts has %d entries for an alphabet of %d symbols", len(sc.Counts), sc.AlphabetSize)
	}
	var total int64
	for k, c := range sc.Counts {
		if c < 0 {
			return nil, bad("count of symbol %q is negative (%d)", sc.Alphabet[k], c)
		}
		total += c
	}
	if total != sc.Count {
		return nil, bad("counts add up to %d, but count is %d", total, sc.Count)
	}
	return &sc, nil
}

// Writer writes a symbol stream to an io.Writer in bounded memory, keeping the counts and the
// hash the sidecar needs. Call Close at the end (it does not close the underlying writer).
type Writer struct {
	w        *bufio.Writer
	alphabet string
	width    int
	col      int
	counts   []int64
	n        int64
	h        hash.Hash
	line     []byte
	err      error
}

// NewWriter returns a Writer of symbols over alphabet (symbol k is written as alphabet[k])
// with DefaultLineWidth symbols per line.
func NewWriter(w io.Writer, alphabet string) (*Writer, error) {
	if err := checkAlphabet(alphabet); err != nil {
		return nil, fmt.Errorf("symbolic: %w", err)
	}
	return &Writer{w: bufio.NewWriterSize(w, 1<<16), alphabet: alphabet, width: DefaultLineWidth,
		counts: make([]int64, len(alphabet)), h: sha256.New(), line: make([]byte, 0, DefaultLineWidth)}, nil
}

// Write appends symbols (indices into the alphabet) to the stream. An index outside the
// alphabet is an error and nothing of that call is written.
func (w *Writer) Write(symbols []uint8) error {
	if w.err != nil {
		return w.err
	}
	k := len(w.alphabet)
	for i, s := range symbols {
		if int(s) >= k {
			return fmt.Errorf("symbolic: symbol %d at position %d is outside the alphabet of %d", s, w.n+int64(i), k)
		}
	}
	for _, s := range symbols {
		w.line = append(w.line, w.alphabet[s])
		w.counts[s]++
		w.n++
		if len(w.line) == w.width {
			w.flushLine()
		}
	}
	return w.err
}

func (w *Writer) flushLine() {
	if len(w.line) == 0 || w.err != nil {
		return
	}
	w.h.Write(w.line)
	w.line = append(w.line, '\n')
	if _, err := w.w.Write(w.line); err != nil {
		w.err = fmt.Errorf("symbolic: writing stream: %w", err)
	}
	w.line = w.line[:0]
}

// Close writes the last line and flushes the buffer.
func (w *Writer) Close() error {
	w.flushLine()
	if w.err != nil {
		return w.err
	}
	if err := w.w.Flush(); err != nil {
		w.err = fmt.Errorf("symbolic: writing stream: %w", err)
	}
	return w.err
}

// Count returns the number of symbols written.
func (w *Writer) Count() int64 { return w.n }

// Sidecar returns the sidecar of what has been written (after Close), with the partition,
// source, command and version filled in from the arguments.
func (w *Writer) Sidecar(p PartitionInfo, src Source, command, version string) *Sidecar {
	if p.Thresholds == nil {
		p.Thresholds = []float64{}
	}
	return &Sidecar{Format: StreamFormat, FormatVersion: StreamFormatVersion, Alphabet: w.alphabet,
		AlphabetSize: len(w.alphabet), Count: w.n, Counts: append([]int64(nil), w.counts...),
		LineWidth: w.width, StreamSHA256: hex.EncodeToString(w.h.Sum(nil)),
		Partition: p, Source: src, Command: command, Version: version}
}

// Reader reads a symbol stream in bounded memory and checks it against its sidecar: every
// character must be in the alphabet (line breaks and other white space are skipped), and at the
// end the total, the per-symbol counts and the hash must match. Errors are *series.InputError
// with the line and column of the offending character.
type Reader struct {
	r      *bufio.Reader
	sc     *Sidecar
	path   string
	lookup [256]int16
	counts []int64
	n      int64
	line   int
	col    int
	h      hash.Hash
	buf    []byte
	done   bool
	err    error
}

// NewReader returns a Reader of the stream r described by sc; path names it in errors.
func NewReader(r io.Reader, sc *Sidecar, path string) (*Reader, error) {
	if sc == nil {
		return nil, errors.New("symbolic: a stream needs its sidecar")
	}
	if err := checkAlphabet(sc.Alphabet); err != nil {
		return nil, &series.InputError{Path: path, Msg: "sidecar: " + err.Error()}
	}
	rd := &Reader{r: bufio.NewReaderSize(r, 1<<16), sc: sc, path: path, counts: make([]int64, len(sc.Alphabet)),
		line: 1, h: sha256.New(), buf: make([]byte, 0, 4096)}
	for i := range rd.lookup {
		rd.lookup[i] = -1
	}
	for k := 0; k < len(sc.Alphabet); k++ {
		rd.lookup[sc.Alphabet[k]] = int16(k)
	}
	return rd, nil
}

// Sidecar returns the sidecar the reader checks against.
func (r *Reader) Sidecar() *Sidecar { return r.sc }

// Read fills dst with the next symbols (indices into the alphabet) and returns how many. At
// the end of a stream that matches its sidecar it returns 0, io.EOF.
func (r *Reader) Read(dst []uint8) (int, error) {
	if r.err != nil {
		return 0, r.err
	}
	if r.done {
		return 0, io.EOF
	}
	n := 0
	for n < len(dst) {
		c, err := r.r.ReadByte()
		if err == io.EOF {
			r.flushHash()
			if err := r.finish(); err != nil {
				r.err = err
				return n, err
			}
			r.done = true
			if n == 0 {
				return 0, io.EOF
			}
			return n, nil
		}
		if err != nil {
			r.err = &series.InputError{Path: r.path, Line: r.line, Msg: fmt.Sprintf("reading stream: %v", err)}
			return n, r.err
		}
		r.col++
		if c == '\n' {
			r.line++
			r.col = 0
			continue
		}
		if c == ' ' || c == '\t' || c == '\r' {
			continue
		}
		s := r.lookup[c]
		if s < 0 {
			r.err = &series.InputError{Path: r.path, Line: r.line, Column: r.col,
				Msg: fmt.Sprintf("character %q is not in the alphabet %q of the sidecar", c, r.sc.Alphabet)}
			return n, r.err
		}
		dst[n] = uint8(s)
		n++
		r.counts[s]++
		r.n++
		r.buf = append(r.buf, c)
		if len(r.buf) == cap(r.buf) {
			r.flushHash()
		}
	}
	return n, nil
}

func (r *Reader) flushHash() {
	r.h.Write(r.buf)
	r.buf = r.buf[:0]
}

// finish compares what was read with the sidecar.
func (r *Reader) finish() error {
	bad := func(format string, a ...any) error {
		return &series.InputError{Path: r.path, Line: r.line, Msg: "stream does not match its sidecar: " + fmt.Sprintf(format, a...)}
	}
	if r.n != r.sc.Count {
		return bad("it holds %d symbols, the sidecar says %d", r.n, r.sc.Count)
	}
	for k, c := range r.counts {
		if k < len(r.sc.Counts) && c != r.sc.Counts[k] {
			return bad("symbol %q occurs %d times, the sidecar says %d", r.sc.Alphabet[k], c, r.sc.Counts[k])
		}
	}
	if r.sc.StreamSHA256 != "" {
		if got := hex.EncodeToString(r.h.Sum(nil)); !strings.EqualFold(got, r.sc.StreamSHA256) {
			return bad("its SHA-256 is %s, the sidecar says %s (same counts, different order)", got, r.sc.StreamSHA256)
		}
	}
	return nil
}

// ReadAll reads the whole stream into memory (one byte per symbol) and checks it.
func (r *Reader) ReadAll() ([]uint8, error) {
	out := make([]uint8, 0, max(0, min(r.sc.Count, 1<<30)))
	buf := make([]uint8, 1<<15)
	for {
		n, err := r.Read(buf)
		out = append(out, buf[:n]...)
		if err == io.EOF {
			return out, nil
		}
		if err != nil {
			return nil, err
		}
	}
}

// File is an open symbol stream with its sidecar.
type File struct {
	*Reader
	f *os.File
	h hash.Hash // of the file's bytes as read
}

// Open opens the stream at path and reads its sidecar from SidecarPath(path).
func Open(path string) (*File, error) {
	sp := SidecarPath(path)
	sf, err := os.Open(sp)
	if err != nil {
		if errors.Is(err, os.ErrNotExist) {
			return nil, &series.InputError{Path: path, Msg: fmt.Sprintf("no sidecar %s beside the symbol stream (write streams with unfold symbols)", sp)}
		}
		return nil, fmt.Errorf("symbolic: %w", err)
	}
	sc, err := ReadSidecar(sf, sp)
	sf.Close()
	if err != nil {
		return nil, err
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("symbolic: %w", err)
	}
	h := sha256.New()
	r, err := NewReader(io.TeeReader(f, h), sc, path)
	if err != nil {
		f.Close()
		return nil, err
	}
	return &File{Reader: r, f: f, h: h}, nil
}

// SHA256 is the hex SHA-256 of the stream file's bytes read so far: the file's own hash once
// the stream has been read to its end (the input hash of the JSON envelope).
func (f *File) SHA256() string { return hex.EncodeToString(f.h.Sum(nil)) }

// Close closes the stream file.
func (f *File) Close() error { return f.f.Close() }
