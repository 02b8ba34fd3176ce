package main

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"unfold/models"
	"unfold/series"
)

// sweepListName is the LIST that simulate --sweep writes beside the records.
const sweepListName = "list.csv"

// bindSimulateSweep adds --sweep to simulate: with it, simulate writes one record per value of
// a model parameter into the folder given by -o, and the LIST naming them (path and the
// parameter), ready for the sweep command. Without it simulate runs as before.
func bindSimulateSweep(a *app, cmd *cobra.Command) {
	var spec string
	cmd.Flags().StringVar(&spec, "sweep", "", "write one record per value of a model parameter into the folder -o DIR, and DIR/"+sweepListName+
		" (path,NAME): NAME=START:STOP:STEP (stop included) or NAME=V1,V2,…; an element of a list parameter as NAME[K]=…")
	cmd.Example += `
  # a logistic-map sweep, r = 3.50 … 4.00 in steps of 0.02: 26 records and their list
  unfold simulate logistic --sweep r=3.5:4:0.02 --n 4000 -o logistic-sweep
  # the Rössler flow at c = 2.5 … 6, and two sines whose second amplitude is swept
  unfold simulate rossler --sweep c=2.5:6:0.5 -o rossler-sweep
  unfold simulate sines --sweep 'amplitudes[2]=0.1,0.3,1' -o sines-sweep`
	run := cmd.RunE
	cmd.RunE = func(c *cobra.Command, args []string) error {
		if !c.Flags().Changed("sweep") {
			return run(c, args)
		}
		return a.runSimulateSweep(c, args, spec, run)
	}
}

type simulateSweepParams struct {
	Model     string    `json:"model"`
	Parameter string    `json:"parameter"`
	Values    []float64 `json:"values"`
}

type simulateSweepWritten struct {
	Output string   `json:"output"`
	List   string   `json:"list"`
	Files  []string `json:"files"`
}

// runSimulateSweep runs simulate once per grid value, with the swept parameter's flag and -o
// set for that value, then writes the LIST.
func (a *app) runSimulateSweep(c *cobra.Command, args []string, spec string, run func(*cobra.Command, []string) error) error {
	flags := c.Flags()
	model, err := models.Lookup(args[0])
	if err != nil {
		return usagef("simulate: %v", err)
	}
	name, gridText, ok := strings.Cut(spec, "=")
	if !ok {
		return usagef("simulate: --sweep %q: write NAME=START:STOP:STEP or NAME=V1,V2,… (e.g. --sweep r=3.5:4:0.02)", spec)
	}
	p, err := model.ParseSweepParam(name)
	if err != nil {
		return usagef("simulate: --sweep: %v", err)
	}
	grid, err := models.ParseGrid(gridText)
	if err != nil {
		return usagef("simulate: --sweep: %v", err)
	}
	if b, _ := flags.GetBool("lyapunov"); b {
		return usagef("simulate: --sweep writes records; --lyapunov is not available with it")
	}
	dir, _ := flags.GetString("output")
	if dir == "" {
		return usagef("simulate: --sweep writes one file per value: give the folder with -o DIR")
	}
	given := models.Values{}
	if fl := flags.Lookup(p.Name); fl != nil && flags.Changed(p.Name) {
		if p.Index == 0 {
			return usagef("simulate: --%s and --sweep %s both set %s; give it once", p.Name, p.Name, p.Name)
		}
		if l, ok := fl.Value.(*floatList); ok {
			given[p.Name] = append([]float64(nil), (*l)...)
		}
	}
	values, err := model.SweepValues(given, p, grid)
	if err != nil {
		return usagef("simulate: --sweep: %v", err)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("simulate: %w", err)
	}
	dec := models.GridDecimals(grid)
	label := p.Label()
	files := make([]string, len(grid))
	stdout, quiet := a.stdout, a.global.Quiet
	defer func() { a.stdout, a.global.Quiet = stdout, quiet }()
	a.stdout, a.global.Quiet = io.Discard, true // one summary at the end instead of one per file
	for i, v := range grid {
		files[i] = label + "=" + strconv.FormatFloat(v, 'f', dec, 64) + ".csv"
		if err := flags.Set(p.Name, fullPrecision(values[i][p.Name])); err != nil {
			return fmt.Errorf("simulate: --sweep: setting %s: %w", p.Name, err)
		}
		if err := flags.Set("output", filepath.Join(dir, files[i])); err != nil {
			return fmt.Errorf("simulate: --sweep: %w", err)
		}
		if err := run(c, args); err != nil {
			return fmt.Errorf("%s = %s: %w", label, shortest(v), err)
		}
	}
	a.stdout, a.global.Quiet = stdout, quiet
	list := filepath.Join(dir, sweepListName)
	if err := writeSweepList(list, label, files, grid); err != nil {
		return err
	}
	if a.global.JSON {
		return a.emitJSON("simulate", nil, simulateSweepParams{Model: model.Name, Parameter: label, Values: grid},
			simulateSweepWritten{Output: dir, List: list, Files: files})
	}
	a.notef("simulate: wrote %d records of %s (%s = %s … %s) to %s and their list %s\n  next: unfold sweep %s -o RESULTS",
		len(grid), model.Name, label, shortest(grid[0]), shortest(grid[len(grid)-1]), dir, list, list)
	return nil
}

func fullPrecision(v []float64) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = strconv.FormatFloat(x, 'g', -1, 64)
	}
	return strings.Join(s, ",")
}

func shortest(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// writeSweepList writes the LIST: a path column (file names, relative to the list's folder)
// and the parameter's column.
func writeSweepList(path, label string, files []string, grid []float64) error {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	_ = w.Write([]string{"path", label})
	for i, f := range files {
		_ = w.Write([]string{f, shortest(grid[i])})
	}
	w.Flush()
	if err := w.Error(); err != nil {
		return fmt.Errorf("simulate: %s: %w", path, err)
	}
	f, err := series.CreateAtomic(path)
	if err != nil {
		return err
	}
	defer f.Abort()
	if _, err := f.Write(b.Bytes()); err != nil {
		return fmt.Errorf("simulate: %s: %w", path, err)
	}
	return f.Commit()
}
