package main

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"

	"github.com/spf13/cobra"

	"unfold/report"
)

type batchOptions struct {
	report reportOptions
	list   string
	merge  string
	batchFlags
}

type batchParams struct {
	reportParams
	Jobs        int    `json:"jobs"`
	Shard       string `json:"shard"`
	RetryErrors bool   `json:"retry_errors"`
}

type batchBody struct {
	Directory string `json:"directory"`
	Inputs    int    `json:"inputs"`
	Skipped   int    `json:"skipped"`
	OK        int    `json:"ok"`
	Partial   int    `json:"partial"`
	Errors    int    `json:"errors"`
	Rows      int    `json:"summary_rows"`
	Summary   string `json:"summary"`
}

func newBatchCmd(a *app) *cobra.Command {
	o := &batchOptions{}
	cmd := &cobra.Command{
		Use:   "batch FILES... -o DIR",
		Short: "The report's chain over many files: one result folder each and summary.csv; resumable and shardable",
		Long: `batch runs the chain of 'unfold report' on every input — files, directories (walked for files
not starting with a dot), glob patterns (quote them to let unfold expand them) and the paths in
--list FILE (one per line, # comments) — with --jobs inputs at a time, and writes

  DIR/NAME-HASH/   the report of one input (result.json, report.html, figures/); NAME is the file
                   name without extensions, HASH 8 hex digits of the path as given;
  DIR/summary.csv  one row per result folder: file, samples, dt, lag, dimension, lambda_max, d2,
                   regime, confidence, status (ok, partial or error), error, entropy_rate,
                   statistical_complexity (of the causal states).

Each result is built in a temporary folder and renamed into place, so a crash or kill leaves no
half-written result. A second run skips every input whose folder holds a complete result for the
same input bytes (SHA-256) and says how many it skipped; --retry-errors analyses inputs whose
last result was an error again. One bad input gives an error row and never stops the batch: the
exit status is 0 unless results could not be written.

--shard K/N takes the K-th (K = 1 … N, 1-based) of N contiguous slices of the sorted inputs, so
that N runs (a cluster's job array) together cover every input exactly once. Each run rebuilds
summary.csv from the folders present; after all shards, 'unfold batch --merge DIR' rebuilds it
once more from every per-input result.`,
		Example: `  # every CSV of a directory, two inputs at a time, one thread each
  unfold batch --jobs 2 --threads 1 -o results 'recordings/*.csv'
  # the paths listed in a file, the 3rd of 8 shards
  unfold batch --list inputs.txt --shard 3/8 -o results
  # a Slurm job array (task ids 0 … N−1) and the merge when all tasks are done
  unfold batch --list inputs.txt --shard $((SLURM_ARRAY_TASK_ID+1))/$SLURM_ARRAY_TASK_COUNT -o results
  unfold batch --merge results`,
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runBatch(cmd, args, o)
		},
	}
	addInputFlags(cmd, &o.report.in)
	f := cmd.Flags()
	addReportFlags(f, &o.report)
	f.StringVar(&o.list, "list", "", "read input paths from this file, one per line (- for standard input)")
	addBatchFlags(f, &o.batchFlags, "inputs", "the sorted inputs")
	f.StringVar(&o.merge, "merge", "", "only rebuild DIR/summary.csv from the result folders in DIR")
	return cmd
}

func (a *app) runBatch(cmd *cobra.Command, args []string, o *batchOptions) error {
	if o.merge != "" {
		if len(args) > 0 || o.list != "" || o.shard != "" {
			return usagef("batch: --merge DIR takes no inputs, --list or --shard")
		}
		rows, err := report.Merge(o.merge)
		if err != nil {
			return err
		}
		if err := report.WriteSummary(o.merge, rows); err != nil {
			return err
		}
		sum := filepath.Join(o.merge, "summary.csv")
		a.notef("batch: %s rebuilt from %d result folders", sum, len(rows))
		if a.global.JSON {
			return a.emitJSON("batch", nil, struct {
				Merge string `json:"merge"`
			}{o.merge}, batchBody{Directory: o.merge, Rows: len(rows), Summary: sum})
		}
		return nil
	}
	ro := &o.report
	if ro.output == "" {
		return usagef("batch: give the output directory with -o DIR")
	}
	if err := checkReportOptions(ro); err != nil {
		return err
	}
	if o.jobs < 0 {
		return usagef("batch: --jobs must be ≥ 0")
	}
	k, n := 1, 1
	if o.shard != "" {
		var err error
		if k, n, err = report.ParseShard(o.shard); err != nil {
			return usagef("batch: %v", err)
		}
	}
	var list *os.File
	listName := o.list
	if o.list == "-" {
		list, listName = os.Stdin, "standard input"
	} else if o.list != "" {
		f, err := os.Open(o.list)
		if err != nil {
			return err
		}
		defer f.Close()
		list = f
	}
	if len(args) == 0 && list == nil {
		return usagef("batch: no inputs: give files, directories or patterns, or --list FILE")
	}
	var paths []string
	var err error
	if list != nil {
		paths, err = report.ListInputs(args, list, listName)
	} else {
		paths, err = report.ListInputs(args, nil, "")
	}
	if err != nil {
		return usagef("%v", err)
	}
	all := len(paths)
	paths = report.Shard(paths, k, n)
	jobs := o.jobs
	if jobs == 0 {
		jobs = max(1, runtime.NumCPU()/a.threads())
	}
	if n > 1 {
		a.notef("batch: shard %d/%d: %d of %d inputs, %d at a time", k, n, len(paths), all, jobs)
	} else {
		a.notef("batch: %d inputs, %d at a time", len(paths), jobs)
	}
	st, err := a.batchChain(cmd, paths, ro, jobs, o.retryErrors)
	sum := filepath.Join(ro.output, "summary.csv")
	a.notef("batch: %d analysed (%d ok, %d partial, %d errors), %d skipped (result complete, input unchanged); %s",
		st.OK+st.Partial+st.Errors, st.OK, st.Partial, st.Errors, st.Skipped, sum)
	if err != nil {
		return err
	}
	if a.global.JSON {
		p := batchParams{reportParams: a.newReportParams(ro),
			Jobs: jobs, Shard: fmt.Sprintf("%d/%d", k, n), RetryErrors: o.retryErrors}
		return a.emitJSON("batch", nil, p, batchBody{Directory: ro.output, Inputs: st.Inputs, Skipped: st.Skipped,
			OK: st.OK, Partial: st.Partial, Errors: st.Errors, Summary: sum})
	}
	return nil
}

// batchChain runs the report's chain on paths with the batch machinery (report.RunBatch: one
// result folder per input named report.ResultFolderName(path), skipped when complete); batch and
// sweep both call the chain here.
func (a *app) batchChain(cmd *cobra.Command, paths []string, ro *reportOptions, jobs int, retryErrors bool) (report.BatchStats, error) {
	// Each input runs on a quiet copy of the app: no per-stage lines or bars from parallel jobs.
	inner := *a
	inner.global.Quiet, inner.stderrTTY = true, false
	return report.RunBatch(paths, report.BatchOptions{Dir: ro.output, Jobs: jobs, RetryErrors: retryErrors, PNG: ro.png,
		Version: versionString(), Log: func(line string) { a.notef("%s", line) },
		Analyze: func(path string) (*report.Result, error) {
			s, in, err := inner.loadInput(path, &ro.in)
			if err != nil {
				return nil, err
			}
			return inner.runChain(cmd, []string{path}, path, filepath.Base(path), s, in, ro, false), nil
		}})
}
