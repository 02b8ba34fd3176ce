package series

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"codeberg.org/sbinet/npyio/npy"
	"gonum.org/v1/gonum/mat"
)

// AtomicFile is an output written to a temporary file in the target's directory and renamed
// over the target on Commit, so a reader never sees a half-written file and a failed run
// leaves the old file in place.
type AtomicFile struct {
	f      *os.File
	path   string
	done   bool
	failed error
}

// samePath reports whether a and b name the same file: the same cleaned absolute path, or
// os.SameFile on the existing files (which sees through links).
func samePath(a, b string) bool {
	aa, err1 := filepath.Abs(a)
	bb, err2 := filepath.Abs(b)
	if err1 == nil && err2 == nil && filepath.Clean(aa) == filepath.Clean(bb) {
		return true
	}
	sa, err1 := os.Stat(a)
	sb, err2 := os.Stat(b)
	return err1 == nil && err2 == nil && os.SameFile(sa, sb)
}

// CreateAtomic starts writing path. It refuses, with an *InputError, when path is the same file
// as any of the protected inputs (by clean path compare and os.SameFile); "" and "-" in protect
// are ignored.
func CreateAtomic(path string, protect ...string) (*AtomicFile, error) {
	if path == "" || path == "-" {
		return nil, &InputError{Path: path, Msg: "not a file name to write to"}
	}
	for _, p := range protect {
		if p == "" || p == "-" {
			continue
		}
		if samePath(path, p) {
			return nil, &InputError{Path: path, Msg: fmt.Sprintf("refusing to write over the input file %s", p)}
		}
	}
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, "."+base+".tmp-*")
	if err != nil {
		return nil, fmt.Errorf("creating %s: %w", path, err)
	}
	return &AtomicFile{f: f, path: path}, nil
}

// Name returns the target path.
func (f *AtomicFile) Name() string { return f.path }

// Write writes to the temporary file.
func (f *AtomicFile) Write(p []byte) (int, error) {
	if f.done {
		return 0, fmt.Errorf("writing %s: already committed or aborted", f.path)
	}
	n, err := f.f.Write(p)
	if err != nil && f.failed == nil {
		f.failed = err
	}
	return n, err
}

// Commit flushes the temporary file to disk and renames it over the target. The file gets the
// mode of the file it replaces, or 0644 for a new file. After a failed write Commit removes the
// temporary file and returns the write error.
func (f *AtomicFile) Commit() error {
	if f.done {
		return fmt.Errorf("committing %s: already committed or aborted", f.path)
	}
	if f.failed != nil {
		f.Abort()
		return fmt.Errorf("writing %s: %w", f.path, f.failed)
	}
	mode := os.FileMode(0o644)
	if st, err := os.Stat(f.path); err == nil {
		mode = st.Mode().Perm()
	}
	err := f.f.Sync()
	if err == nil {
		err = f.f.Chmod(mode)
	}
	if cerr := f.f.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Rename(f.f.Name(), f.path)
	}
	f.done = true
	if err != nil {
		os.Remove(f.f.Name())
		return fmt.Errorf("writing %s: %w", f.path, err)
	}
	return nil
}

// Abort removes the temporary file and leaves the target as it was; it is safe (a no-op) after
// Commit and may be deferred.
func (f *AtomicFile) Abort() error {
	if f.done {
		return nil
	}
	f.done = true
	cerr := f.f.Close()
	rerr := os.Remove(f.f.Name())
	if rerr != nil && !errors.Is(rerr, os.ErrNotExist) {
		return rerr
	}
	if cerr != nil && !errors.Is(cerr, os.ErrClosed) {
		return cerr
	}
	return nil
}

// csvField quotes a header name when CSV needs it.
func csvField(s string) string {
	if strings.ContainsAny(s, ",\"\n\r") || strings.TrimSpace(s) != s {
		return `"` + strings.ReplaceAll(s, `"`, `""`) + `"`
	}
	return s
}

// WriteCSV writes a header line (unless header is nil) and the columns, which must all have
// the same length, as comma-separated text with strconv 'g' −1 formatting (the shortest text
// that reads back to the same float64).
func WriteCSV(w io.Writer, header []string, cols ...[]float64) error {
	if header != nil && len(header) != len(cols) {
		return fmt.Errorf("write csv: %d header names for %d columns", len(header), len(cols))
	}
	n := 0
	for j, c := range cols {
		if j == 0 {
			n = len(c)
		} else if len(c) != n {
			return fmt.Errorf("write csv: column %d has %d values, column 1 has %d", j+1, len(c), n)
		}
	}
	bw := bufio.NewWriterSize(w, 64<<10)
	if header != nil {
		for j, h := range header {
			if j > 0 {
				bw.WriteByte(',')
			}
			bw.WriteString(csvField(h))
		}
		bw.WriteByte('\n')
	}
	buf := make([]byte, 0, 32)
	for i := 0; i < n; i++ {
		for j, c := range cols {
			if j > 0 {
				bw.WriteByte(',')
			}
			buf = strconv.AppendFloat(buf[:0], c[i], 'g', -1, 64)
			bw.Write(buf)
		}
		if err := bw.WriteByte('\n'); err != nil {
			return fmt.Errorf("write csv: %w", err)
		}
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("write csv: %w", err)
	}
	return nil
}

// WriteNpy writes data, rows×cols values in row-major order, as a 2-D float64 NumPy .npy
// array (a 1-D array when cols is 0) with codeberg.org/sbinet/npyio.
func WriteNpy(w io.Writer, rows, cols int, data []float64) error {
	if cols == 0 {
		if len(data) != rows {
			return fmt.Errorf("write npy: %d values for %d rows", len(data), rows)
		}
		return npy.Write(w, data)
	}
	if rows <= 0 || cols < 0 || len(data) != rows*cols {
		return fmt.Errorf("write npy: %d values for %d×%d", len(data), rows, cols)
	}
	return npy.Write(w, mat.NewDense(rows, cols, data))
}
