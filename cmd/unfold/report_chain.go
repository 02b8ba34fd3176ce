package main

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"path/filepath"
	"strings"
	"time"
	"unfold/analysis"
	"unfold/report"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/demo"
	"unfold/embed"
	"unfold/series"
)

// cmdLine rebuilds the command as given for the provenance: the command path, every flag set
// and the arguments.
func cmdLine(cmd *cobra.Command, args []string) []string {
	parts := strings.Fields(cmd.CommandPath())
	cmd.Flags().Visit(func(f *pflag.Flag) {
		parts = append(parts, "--"+f.Name+"="+f.Value.String())
	})
	return append(parts, args...)
}

// commitID is the source commit recorded in the provenance.
func commitID() string {
	v := versionString()
	if i := strings.Index(v, "(commit "); i >= 0 {
		return strings.TrimSuffix(v[i+len("(commit "):], ")")
	}
	return "unknown"
}

// checkReportOptions validates the overrides before any work.
func checkReportOptions(o *reportOptions) error {
	if o.lag < 0 || o.dim < 0 || o.maxDim < 1 || o.maxLag < 0 {
		return usagef("report: want --lag, --dim and --max-lag ≥ 0 and --max-dim ≥ 1")
	}
	if o.mi != embed.Histogram && o.mi != embed.KSG {
		return usagef("report: --mi %q: want hist or ksg", o.mi)
	}
	if _, err := parseNorm(o.norm); err != nil {
		return err
	}
	return nil
}

// loadReportInput reads the input of a report: a file, standard input or the demo signal.
func (a *app) loadReportInput(path string, o *reportOptions) (*series.Series, *inputInfo, string, error) {
	if !o.demo {
		s, in, err := a.loadInput(path, &o.in)
		if err != nil {
			return nil, nil, "", err
		}
		title := filepath.Base(path)
		if path == "-" {
			title = "standard input"
		}
		return s, in, title, nil
	}
	b := demo.Strip()
	rd := o.in.read
	if rd.TimeUnit == "" {
		rd.TimeUnit = demo.TimeUnit
	}
	if rd.Unit == "" {
		rd.Unit = demo.Unit
	}
	s, err := series.Read(bytes.NewReader(b), demo.Name, rd)
	if err != nil {
		return nil, nil, "", err
	}
	if s, err = o.in.prep.Apply(s); err != nil {
		return nil, nil, "", err
	}
	h := sha256.Sum256(b)
	return s, &inputInfo{Path: demo.Path, SHA256: hex.EncodeToString(h[:]), Samples: s.Len(), Dt: s.Dt, Units: unitsOf(s)},
		demo.Name + " (built-in demo signal, synthetic)", nil
}

// runChain runs the chain (analysis.Run) on s and renders every stage's section; with
// progress, one line per stage goes to stderr.
func (a *app) runChain(cmd *cobra.Command, args []string, path, title string, s *series.Series, in *inputInfo, o *reportOptions, progress bool) *report.Result {
	p := a.newReportParams(o)
	p.prepParams = newPrepParams(s, &o.in)
	h := report.Header{Version: versionString(), Commit: commitID(), CommandLine: cmdLine(cmd, args),
		Seeds: map[string]uint64{"seed": a.global.Seed}, Parameters: p, Title: title,
		Input: report.Input{Path: in.Path, SHA256: in.SHA256, Samples: in.Samples, Dt: in.Dt, Units: in.Units}}
	if path == "" {
		path = in.Path
	}
	theiler, az, el := o.theiler, o.azimuth, o.elevation
	opt := analysis.Options{Lag: o.lag, Dim: o.dim, MaxDim: o.maxDim, Theiler: &theiler, MaxLag: o.maxLag, MI: o.mi,
		Norm: o.norm, Azimuth: &az, Elevation: &el, Threads: a.threads(), Seed: a.global.Seed, Path: path, Input: in,
		Version: versionString(), Read: o.in.read, Prep: o.in.prep, Notef: a.notef, Progress: a.progress}
	if progress {
		opt.After = func(key string, took time.Duration, err error) {
			if err != nil {
				a.notef("  %-9s %7.2f s  no answer: %v", key, took.Seconds(), err)
				return
			}
			a.notef("  %-9s %7.2f s", key, took.Seconds())
		}
	}
	fig := figureOf(path, s)
	if o.demo {
		fig.Title = demo.Name
	}
	view := report.View{Azimuth: o.azimuth, Elevation: o.elevation, Lag: o.lag}
	if o.staging != nil {
		opt.Partial = func(r *analysis.Result) {
			if err := o.staging.WritePartial(h, r, s, fig, view, report.WriteOptions{}); err != nil {
				a.notef("report: the page so far could not be written: %v", err)
			}
		}
	}
	res, err := analysis.Run(context.Background(), s, opt)
	if res == nil {
		res = &analysis.Result{Stages: []analysis.StageRecord{{Key: "inspect", Status: analysis.StatusError, Error: err.Error()}}}
	}
	return report.Build(h, res, s, fig, view)
}

// newReportParams returns the parameters of the report's chain as the JSON output records
// them (without the input preparation, which each input adds).
func (a *app) newReportParams(o *reportOptions) reportParams {
	return reportParams{Lag: o.lag, Dim: o.dim, MaxDim: o.maxDim, Theiler: o.theiler, MaxLag: o.maxLag, MI: o.mi,
		Norm: o.norm, Azimuth: o.azimuth, Elevation: o.elevation, PNG: o.png, Threads: a.threads()}
}

// printSummary writes the summary block of the page as a table on stdout.
func (a *app) printSummary(sm *report.Summary) error {
	if sm == nil {
		return nil
	}
	var rows [][]string
	for _, r := range sm.Rows() {
		rows = append(rows, []string{r[0], r[1]})
	}
	return a.table(rows)
}
