package series

import (
	"bufio"
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
)

// Source describes where a record came from.
type Source struct {
	// Path is the file name as given ("-" for standard input).
	Path string
	// SHA256 is the hex SHA-256 of the bytes as stored (the compressed bytes for a .gz file).
	SHA256 string
	// Bytes is the number of bytes as stored.
	Bytes int64
	// Format is the format read: "csv", "npy", "f32le", "f64le" or "wav".
	Format string
	// Gzip is true when the bytes were gzip-compressed.
	Gzip bool
	// Notes are the automatic choices made while reading, in plain words (the column, the
	// delimiter, the time column, dt, gaps filled), for the command line to show.
	Notes []string
}

// Formats ReadOptions.Format accepts.
const (
	FormatCSV   = "csv"
	FormatNpy   = "npy"
	FormatF32LE = "f32le"
	FormatF64LE = "f64le"
	FormatWAV   = "wav"
)

// ReadFile reads one record from path ("-" = stdin), detecting gzip by its magic bytes (or the
// .gz extension) and the format from the extension and the content unless opt.Format is set.
// A file whose content is not what its extension says is an *InputError. The returned Source
// holds the SHA-256 of the bytes as stored.
func ReadFile(path string, stdin io.Reader, opt ReadOptions) (*Series, Source, error) {
	src := Source{Path: path}
	var f io.Reader
	if path == "-" {
		if stdin == nil {
			return nil, src, &InputError{Path: path, Msg: "no standard input"}
		}
		f = stdin
	} else {
		fh, err := os.Open(path)
		if err != nil {
			return nil, src, err
		}
		defer fh.Close()
		if st, err := fh.Stat(); err == nil && st.IsDir() {
			return nil, src, &InputError{Path: path, Msg: "is a directory, not a file"}
		}
		f = fh
	}
	h := sha256.New()
	cr := &countReader{r: io.TeeReader(f, h)}
	s, info, err := read(cr, path, opt)
	if err != nil {
		return nil, src, err
	}
	// Hash the whole input even when the reader stopped early.
	if _, err := io.Copy(io.Discard, cr); err != nil {
		return nil, src, fmt.Errorf("reading %s: %w", path, err)
	}
	src.SHA256 = hex.EncodeToString(h.Sum(nil))
	src.Bytes = cr.n
	src.Format = info.format
	src.Gzip = info.gzip
	src.Notes = info.notes
	return s, src, nil
}

// Read reads one record from r. name is used in error messages and for detection by
// extension ("" or "-" for none). Delimited text is read as a stream in bounded memory;
// WAV input is held in memory while it is read.
//
// Delimited text: the delimiter (tab, semicolon, comma or runs of spaces) is detected from the
// first line that is not blank or a '#' comment; that line is a header when one of its cells
// is neither a number nor a gap. Quoted cells are read as in CSV (as R's write.csv writes them,
// with an empty-named row-name column first). A time column (opt.TimeColumn, or a header named
// t, time, seconds, year, "time (s)", …) gives Dt = (t_last − t_first)/(N − 1); every step must
// equal the mean step within the precision the stamps are written with or 1% of the step,
// whichever is larger. Gaps (empty, NA, NaN, ±Inf cells) are refused unless opt.Gaps is "drop"
// or "linear"; with a time column the steps are checked over all rows, dropped or not.
// Errors in the content are *InputError with the line and the byte column of the cell.
func Read(r io.Reader, name string, opt ReadOptions) (*Series, error) {
	s, _, err := read(r, name, opt)
	return s, err
}

// readInfo is what read learnt besides the record.
type readInfo struct {
	format string
	gzip   bool
	notes  []string
}

type countReader struct {
	r io.Reader
	n int64
}

func (c *countReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	c.n += int64(n)
	return n, err
}

// gzipErrReader turns errors of a gzip stream into input errors.
type gzipErrReader struct {
	r    io.Reader
	path string
}

func (g *gzipErrReader) Read(p []byte) (int, error) {
	n, err := g.r.Read(p)
	if err != nil && err != io.EOF {
		var ie *InputError
		if !errors.As(err, &ie) {
			err = &InputError{Path: g.path, Msg: fmt.Sprintf("corrupt or truncated gzip data: %v", err)}
		}
	}
	return n, err
}

// formatByExt returns the format an extension claims ("" when it claims none) and whether the
// name ends in .gz.
func formatByExt(name string) (format string, gz bool, raw bool) {
	n := strings.ToLower(name)
	if strings.HasSuffix(n, ".gz") {
		gz = true
		n = strings.TrimSuffix(n, ".gz")
	}
	switch filepath.Ext(n) {
	case ".csv", ".tsv", ".txt", ".dat", ".tab", ".asc", ".ssv", ".prn":
		format = FormatCSV
	case ".npy":
		format = FormatNpy
	case ".wav", ".wave":
		format = FormatWAV
	case ".f32", ".f32le":
		format = FormatF32LE
	case ".f64", ".f64le":
		format = FormatF64LE
	case ".raw", ".bin":
		raw = true
	}
	return format, gz, raw
}

// sniff says what the first bytes of a stream look like.
func sniff(head []byte) string {
	switch {
	case bytes.HasPrefix(head, []byte("\x93NUMPY")):
		return FormatNpy
	case len(head) >= 12 && string(head[:4]) == "RIFF" && string(head[8:12]) == "WAVE":
		return FormatWAV
	case bytes.HasPrefix(head, []byte{0x1f, 0x8b}):
		return "gzip"
	case bytes.IndexByte(head, 0) >= 0:
		return "binary"
	}
	return FormatCSV
}

// describe names a sniffed kind for a message.
func describe(kind string) string {
	switch kind {
	case FormatNpy:
		return "a NumPy .npy file"
	case FormatWAV:
		return "a WAV file"
	case "gzip":
		return "gzip data"
	case "binary":
		return "binary data"
	}
	return "text"
}

func read(r io.Reader, name string, opt ReadOptions) (*Series, readInfo, error) {
	var info readInfo
	path := name
	if path == "" {
		path = "input"
	}
	extFormat, extGz, extRaw := formatByExt(name)
	format := strings.ToLower(strings.TrimSpace(opt.Format))
	switch format {
	case "", FormatCSV, FormatNpy, FormatF32LE, FormatF64LE, FormatWAV:
	case "text", "tsv", "txt":
		format = FormatCSV
	default:
		return nil, info, &InputError{Path: path, Msg: fmt.Sprintf("unknown --format %q: use csv, npy, f32le, f64le or wav", opt.Format)}
	}
	if opt.Gaps != "" {
		if err := checkGaps(opt.Gaps, path); err != nil {
			return nil, info, err
		}
	}
	br := bufio.NewReaderSize(r, 16<<10)
	head, err := br.Peek(512)
	if err != nil && err != io.EOF && err != bufio.ErrBufferFull {
		return nil, info, fmt.Errorf("reading %s: %w", path, err)
	}
	var in io.Reader = br
	kind := sniff(head)
	if kind == "gzip" {
		zr, err := gzip.NewReader(br)
		if err != nil {
			return nil, info, &InputError{Path: path, Msg: fmt.Sprintf("corrupt gzip header: %v", err)}
		}
		info.gzip = true
		br = bufio.NewReaderSize(&gzipErrReader{r: zr, path: path}, 16<<10)
		in = br
		head, err = br.Peek(512)
		if err != nil && err != io.EOF && err != bufio.ErrBufferFull {
			return nil, info, err
		}
		kind = sniff(head)
	} else if extGz && format == "" {
		return nil, info, &InputError{Path: path, Msg: fmt.Sprintf("the name ends in .gz but the content is %s, not gzip data", describe(kind))}
	}
	if format == "" {
		switch {
		case extFormat == FormatF32LE || extFormat == FormatF64LE:
			format = extFormat
		case extFormat != "" && extFormat != kind:
			return nil, info, &InputError{Path: path, Msg: fmt.Sprintf("the name says %s but the content is %s; give --format to read it anyway", describe(extFormat), describe(kind))}
		case extFormat != "":
			format = extFormat
		case kind == "binary" || kind == "gzip" || extRaw:
			return nil, info, &InputError{Path: path, Msg: fmt.Sprintf("%s of no known format: for raw little-endian floats give --format f32le or f64le", describe(kind))}
		default:
			format = kind
		}
	}
	info.format = format
	var s *Series
	switch format {
	case FormatCSV:
		s, info.notes, err = readText(in, path, opt)
	case FormatNpy:
		s, info.notes, err = readNpy(in, path, opt)
	case FormatF32LE, FormatF64LE:
		s, err = readRaw(in, path, format, opt)
	case FormatWAV:
		s, info.notes, err = readWAV(in, path, opt)
	}
	if err != nil {
		return nil, info, err
	}
	if u := strings.TrimSpace(opt.TimeUnit); u != "" {
		s.TimeUnit = u
		if c := TimeUnitOf(u); c != "" {
			s.TimeUnit = c // "seconds" → "s": Prep converts times with a unit suffix
		}
	}
	if u := strings.TrimSpace(opt.Unit); u != "" {
		s.Unit = u
	}
	s.Notes = info.notes
	return s, info, nil
}
