package main

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"sort"

	"github.com/spf13/cobra"

	"unfold/report"
)

// sweepOptions are the flags of sweep: those of batch (the report's flags, --jobs, --shard,
// --retry-errors) plus the parameter column and --merge.
type sweepOptions struct {
	report    reportOptions
	parameter string
	merge     bool
	batchFlags
}

type sweepParams struct {
	reportParams
	List        string `json:"list"`
	Parameter   string `json:"parameter"`
	Jobs        int    `json:"jobs"`
	Shard       string `json:"shard"`
	Merge       bool   `json:"merge"`
	RetryErrors bool   `json:"retry_errors"`
}

func newSweepCmd(a *app) *cobra.Command {
	o := &sweepOptions{}
	cmd := &cobra.Command{
		Use:   "sweep LIST -o DIR",
		Short: "The chain over records taken at many values of a control parameter: sweep.csv, sweep.html and the route in words",
		Long: `sweep reads LIST, a CSV file with a path column (relative paths are read beside LIST) and
one numeric column whose header names the control parameter (r, Re, drive_V, …; choose it with
--parameter when there are several; other columns are kept as labels). It runs the chain of
'unfold report' on every record with the machinery of 'unfold batch' — one result folder per
record in DIR, resumable, --jobs, --shard K/N — and writes

  DIR/sweep.csv   one row per record sorted by the parameter: the parameter's own column, regime,
                  confidence, lag, dimension, lambda_max, lambda_lo, lambda_hi, d2, d2_lo, d2_hi,
                  entropy_rate, statistical_complexity, frequencies (the significant spectral
                  lines, ";"-separated), status, path and the label columns;
  DIR/sweep.html  one self-contained page: the bifurcation-style diagram (samples of a map,
                  maxima of a flow, against the parameter), λ1 with its interval coloured by the
                  verdict, D2 with its interval, the spectral lines against the parameter and
                  the complexity–entropy plane (when the records have those columns);

and prints the route in words ("periodic up to r = 3.56, chaotic from r = 3.58; …"). A
transition is located only to within the spacing of the sweep. Records may differ in length,
sampling and units; each row keeps its own.

A second run skips the records whose result is complete and unchanged and says how many.
--shard K/N runs the K-th of N slices of the records (sorted by path), for a cluster's job
array; each run rebuilds sweep.csv and sweep.html from the result folders present (records
not yet analysed have status "missing"), and 'unfold sweep LIST --merge -o DIR' rebuilds them
once more without analysing anything.`,
		Example: `  # from scratch: a logistic-map sweep r = 3.50 … 4.00 (step 0.02), then its analysis
  unfold simulate logistic --sweep r=3.5:4:0.02 --n 4000 -o logistic-sweep
  unfold sweep logistic-sweep/list.csv --jobs 2 -o logistic-results
  # open logistic-results/sweep.html; run the second command again to resume after a stop
  # the 2nd of 4 shards, and the merge when every shard is done
  unfold sweep logistic-sweep/list.csv --shard 2/4 -o logistic-results
  unfold sweep logistic-sweep/list.csv --merge -o logistic-results
  # a list with several numeric columns: name the control parameter
  unfold sweep runs.csv --parameter drive_V -o drive-results`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runSweep(cmd, args[0], o)
		},
	}
	addInputFlags(cmd, &o.report.in)
	f := cmd.Flags()
	addReportFlags(f, &o.report)
	f.StringVar(&o.parameter, "parameter", "", "the LIST column holding the control parameter (default: the only numeric column besides path)")
	addBatchFlags(f, &o.batchFlags, "records", "the records sorted by path")
	f.BoolVar(&o.merge, "merge", false, "analyse nothing: only rebuild DIR/sweep.csv and DIR/sweep.html from the result folders in DIR")
	return cmd
}

func (a *app) runSweep(cmd *cobra.Command, listPath string, o *sweepOptions) error {
	ro := &o.report
	if ro.output == "" {
		return usagef("sweep: give the output directory with -o DIR")
	}
	if fi, err := os.Stat(ro.output); err == nil && !fi.IsDir() {
		return usagef("sweep: -o %s is a file, not a directory", ro.output)
	}
	list, err := report.ReadSweepList(listPath, o.parameter)
	if err != nil {
		return err
	}
	var st report.BatchStats
	jobs, k, n := o.jobs, 1, 1
	if o.merge {
		if o.shard != "" || o.retryErrors {
			return usagef("sweep: --merge analyses nothing: it takes no --shard or --retry-errors")
		}
		if fi, err := os.Stat(ro.output); err != nil || !fi.IsDir() {
			return usagef("sweep: --merge: no result folder %s: run 'unfold sweep %s -o %s' first", ro.output, listPath, ro.output)
		}
	} else {
		if o.jobs < 0 {
			return usagef("sweep: --jobs must be ≥ 0")
		}
		if o.shard != "" {
			if k, n, err = report.ParseShard(o.shard); err != nil {
				return usagef("sweep: %v", err)
			}
		}
		if jobs == 0 {
			jobs = max(1, runtime.NumCPU()/a.threads())
		}
		// The shards slice the paths in sorted order, as batch does, so that the split depends
		// only on the set of records; the folder names are those of list.Paths().
		paths := append([]string(nil), list.Paths()...)
		sort.Strings(paths)
		part := report.Shard(paths, k, n)
		if n > 1 {
			a.notef("sweep: shard %d/%d: %d of %d records, %d at a time", k, n, len(part), len(paths), jobs)
		} else {
			a.notef("sweep: %d records, %d at a time", len(part), jobs)
		}
		st, err = a.sweepChain(cmd, part, o, jobs)
		a.notef("sweep: %d analysed (%d ok, %d partial, %d errors), %d skipped (result complete, input unchanged)",
			st.OK+st.Partial+st.Errors, st.OK, st.Partial, st.Errors, st.Skipped)
		if err != nil {
			return err
		}
	}
	rows := report.SweepRows(ro.output, list, report.SweepOptions{Read: ro.in.read})
	if err := report.WriteSweep(ro.output, list, rows, report.SweepPageOptions{Version: versionString()}); err != nil {
		return err
	}
	csvPath, htmlPath := filepath.Join(ro.output, "sweep.csv"), filepath.Join(ro.output, "sweep.html")
	a.notef("sweep: wrote %s and %s", csvPath, htmlPath)
	tr := report.Transitions(list.Parameter, rows)
	if a.global.JSON {
		p := sweepParams{reportParams: a.newReportParams(ro),
			List: listPath, Parameter: list.Parameter, Jobs: jobs, Shard: fmt.Sprintf("%d/%d", k, n), Merge: o.merge, RetryErrors: o.retryErrors}
		return a.emitJSON("sweep", nil, p, newSweepBody(ro.output, csvPath, htmlPath, list, st, rows, tr))
	}
	return a.renderSweep(list, rows, tr, htmlPath)
}

// sweepChain checks the report's options and runs the chain on paths as batch does
// (batchChain: one result folder per record, skipped when complete).
func (a *app) sweepChain(cmd *cobra.Command, paths []string, o *sweepOptions, jobs int) (report.BatchStats, error) {
	if err := checkReportOptions(&o.report); err != nil {
		return report.BatchStats{}, err
	}
	return a.batchChain(cmd, paths, &o.report, jobs, o.retryErrors)
}
