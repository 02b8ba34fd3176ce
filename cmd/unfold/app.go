package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"runtime"
	"runtime/debug"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"

	"unfold/analysis"
	"unfold/series"
)

// version is the release of the toolkit; commit is set at build time with
// -ldflags "-X main.commit=$(git rev-parse --short HEAD)" and otherwise read from the build info.
const version = "0.1.0-dev"

var commit string // set by the linker only; never written at run time

// Exit statuses (DESIGN.md §3).
const (
	exitOK       = 0
	exitNoAnswer = 1 // the analysis ran but could not give an answer
	exitBadInput = 2 // bad usage or bad input
	exitInternal = 3 // an internal error (a recovered panic)
)

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

// usageError is bad usage: a wrong flag value or argument count (exit status 2).
type usageError struct{ err error }

func (e *usageError) Error() string { return e.err.Error() }
func (e *usageError) Unwrap() error { return e.err }

// usagef returns a usage error (exit status 2).
func usagef(format string, args ...any) error {
	return &usageError{fmt.Errorf(format, args...)}
}

// noAnswerError means the analysis ran but could not give an answer (exit status 1); the
// message says why.
type noAnswerError struct{ err error }

func (e *noAnswerError) Error() string { return e.err.Error() }
func (e *noAnswerError) Unwrap() error { return e.err }

// noAnswer wraps err as "ran but no answer" (exit status 1).
func noAnswer(err error) error { return &noAnswerError{err} }

// exitCode maps an error returned by a command to the process exit status.
func exitCode(err error) int {
	var ie *series.InputError
	var ue *usageError
	var na *noAnswerError
	var ana *analysis.NoAnswerError
	var aue *analysis.UsageError
	var ce *series.ErrConstant
	var pe *fs.PathError
	switch {
	case err == nil:
		return exitOK
	case errors.As(err, &na), errors.As(err, &ana), errors.As(err, &ce):
		return exitNoAnswer
	case errors.As(err, &ie), errors.As(err, &ue), errors.As(err, &aue), errors.As(err, &pe):
		return exitBadInput
	default:
		return exitNoAnswer
	}
}

// run executes the command line and returns the exit status. A panic is an internal error
// (exit status 3): one line naming the inputs, the stack only with UNFOLD_DEBUG=1.
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) (code int) {
	defer func() {
		if p := recover(); p != nil {
			fmt.Fprintf(stderr, "unfold: internal error, please report: %v (input %s)\n", p, inputsOf(args))
			if os.Getenv("UNFOLD_DEBUG") == "1" {
				stderr.Write(debug.Stack())
			}
			code = exitInternal
		}
	}()
	a := &app{stdin: stdin, stdout: stdout, stderr: stderr}
	if f, ok := stderr.(*os.File); ok {
		a.stderrTTY = term.IsTerminal(int(f.Fd()))
	}
	root := newRootCmd(a)
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(stdout)
	root.SetErr(stderr)
	err := root.Execute()
	if err != nil {
		fmt.Fprintf(stderr, "unfold: %v\n", err)
		if strings.Contains(err.Error(), "unknown command") || strings.Contains(err.Error(), "unknown flag") {
			return exitBadInput
		}
	}
	return exitCode(err)
}

// inputsOf names the inputs of a command line for an internal-error message: the arguments
// that are existing files or "-".
func inputsOf(args []string) string {
	var in []string
	for _, a := range args {
		if a == "-" {
			in = append(in, "standard input")
		} else if st, err := os.Stat(a); err == nil && !st.IsDir() {
			in = append(in, strconv.Quote(a))
		}
	}
	if len(in) == 0 {
		return "none"
	}
	return strings.Join(in, ", ")
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
