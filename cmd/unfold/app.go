package main

import (
	"fmt"
	"io"
	"runtime"
	"strings"
	"text/tabwriter"

	"github.com/schollz/progressbar/v3"

	"unfold/analysis"
)

// version is the release of the toolkit; commit is set at build time with
// -ldflags "-X main.commit=$(git rev-parse --short HEAD)" and otherwise read from the build info.
const version = "0.1.0-dev"

var commit string // set by the linker only; never written at run time

// app carries what every command shares: the standard streams and the global options.
type app struct {
	stdin  io.Reader
	stdout io.Writer
	stderr io.Writer
	// stderrTTY is true when stderr is a terminal: progress bars are drawn only then.
	stderrTTY bool
	global    globalOptions
}

// globalOptions are the flags every command has (persistent flags of the root command).
type globalOptions struct {
	JSON    bool
	Quiet   bool
	Seed    uint64
	Threads int
}

// threads returns the number of worker goroutines to use (--threads, default all cores).
func (a *app) threads() int {
	if a.global.Threads > 0 {
		return a.global.Threads
	}
	return runtime.NumCPU()
}

// notef prints a message on stderr unless --quiet is given.
func (a *app) notef(format string, args ...any) {
	if a.global.Quiet {
		return
	}
	fmt.Fprintf(a.stderr, format, args...)
	if !strings.HasSuffix(format, "\n") {
		fmt.Fprintln(a.stderr)
	}
}

// progress returns a callback that draws a progress bar on stderr for long work, or nil when
// stderr is not a terminal or --quiet is given. Callers pass it to the all-points drivers,
// which call it with (done, total).
func (a *app) progress(label string) func(done, total int) {
	if a.global.Quiet || !a.stderrTTY {
		return nil
	}
	var bar *progressbar.ProgressBar
	return func(done, total int) {
		if bar == nil {
			bar = progressbar.NewOptions(total,
				progressbar.OptionSetWriter(a.stderr),
				progressbar.OptionSetDescription(label),
				progressbar.OptionClearOnFinish(),
				progressbar.OptionThrottle(100_000_000),
				progressbar.OptionSetWidth(30))
		}
		_ = bar.Set(done)
		if done >= total {
			_ = bar.Finish()
			bar = nil
		}
	}
}

// inputInfo is the "input" object of every JSON output (DESIGN.md §3).
type inputInfo = analysis.Input

// emitJSON writes exactly one JSON object on stdout: "command", "version", "input" (when in is
// not nil) and "parameters", followed by the fields of body (a struct or map that marshals to a
// JSON object), in that order.
func (a *app) emitJSON(command string, in *inputInfo, params any, body any) error {
	b, err := buildJSON(command, in, params, body)
	if err != nil {
		return err
	}
	_, err = a.stdout.Write(b)
	return err
}

// buildJSON returns the indented JSON object that emitJSON prints (with its final newline).
func buildJSON(command string, in *inputInfo, params any, body any) ([]byte, error) {
	return analysis.Envelope(command, versionString(), in, params, body)
}

// env is what the analysis stages share, from the global flags and the input flags in.
func (a *app) env(in *inputOptions) *analysis.Env {
	return &analysis.Env{Threads: a.threads(), Seed: a.global.Seed, Notef: a.notef, Progress: a.progress,
		Read: in.read, Prep: in.prep}
}

// table writes rows as aligned columns on stdout (the human output of a command).
func (a *app) table(rows [][]string) error {
	tw := tabwriter.NewWriter(a.stdout, 2, 4, 2, ' ', 0)
	for _, r := range rows {
		fmt.Fprintln(tw, strings.Join(r, "\t"))
	}
	return tw.Flush()
}
