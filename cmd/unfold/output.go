package main

import (
	"bufio"
	"bytes"
	"fmt"
	"path/filepath"
	"strconv"
	"strings"

	"codeberg.org/sbinet/npyio"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/plot"

	"unfold/embed"
	"unfold/figure"
	"unfold/series"
)

// Output helpers every command shares: figure and CSV files written atomically, number and
// name formatting.

// figureOf describes the record for the figure titles and axis labels.
func figureOf(path string, s *series.Series) figure.Record {
	title := filepath.Base(path)
	if path == "-" {
		title = "standard input"
	}
	return figure.Record{Title: title, Signal: s.Name, Unit: s.Unit, Dt: s.Dt, TimeUnit: s.TimeUnit}
}

// checkFigurePath accepts "" or a name ending in .png or .svg.
func checkFigurePath(p string) error {
	if p == "" {
		return nil
	}
	switch strings.ToLower(filepath.Ext(p)) {
	case ".png", ".svg":
		return nil
	}
	return usagef("figure %s: the name must end in .png or .svg", p)
}

// writeFigureFile draws rows into path (format from the extension) through an atomic file, on
// the project's canvas (figure.SizeFor).
func writeFigureFile(path, input string, rows [][]*plot.Plot) error {
	w, h := figure.SizeFor(rows)
	var buf bytes.Buffer
	if err := figure.Write(&buf, strings.TrimPrefix(strings.ToLower(filepath.Ext(path)), "."), w, h, rows); err != nil {
		return err
	}
	return writeBytesFile(path, input, buf.Bytes())
}

func writeBytesFile(path, input string, b []byte) error {
	f, err := series.CreateAtomic(path, input)
	if err != nil {
		return err
	}
	defer f.Abort()
	if _, err := f.Write(b); err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	return f.Commit()
}

// writeCSVFile writes columns with a header through an atomic file.
func writeCSVFile(path, input string, header []string, cols ...[]float64) error {
	f, err := series.CreateAtomic(path, input)
	if err != nil {
		return err
	}
	defer f.Abort()
	if err := series.WriteCSV(f, header, cols...); err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	return f.Commit()
}

func fmtG(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

const ln2 = 0.6931471805599453

// figureName is the input's name for figure titles.
func figureName(path string) string {
	if path == "-" {
		return "standard input"
	}
	return path
}

// writeVectors writes the delay vectors as CSV (header x(t),x(t+τ)… in samples) or .npy (an
// N×m float64 array), through an atomic file.
func writeVectors(path, input, ext string, e embed.Embedding, name string) error {
	if name == "" {
		name = "x"
	}
	f, err := series.CreateAtomic(path, input)
	if err != nil {
		return err
	}
	defer f.Abort()
	if ext == ".npy" {
		bw := bufio.NewWriterSize(f, 1<<20)
		if err := npyio.Write(bw, mat.NewDense(e.Len(), e.Dim, e.Dense())); err != nil {
			return fmt.Errorf("writing %s: %w", path, err)
		}
		if err := bw.Flush(); err != nil {
			return fmt.Errorf("writing %s: %w", path, err)
		}
		return f.Commit()
	}
	header := make([]string, e.Dim)
	cols := make([][]float64, e.Dim)
	for k := range header {
		if k == 0 {
			header[k] = name + "(t)"
		} else {
			header[k] = fmt.Sprintf("%s(t+%d)", name, k*e.Lag)
		}
		cols[k] = e.X[k*e.Lag : k*e.Lag+e.Len()]
	}
	if err := series.WriteCSV(f, header, cols...); err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	return f.Commit()
}
