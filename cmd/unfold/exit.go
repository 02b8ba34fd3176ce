package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"runtime/debug"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
	"golang.org/x/term"

	"unfold/analysis"
	"unfold/internal/suggest"
	"unfold/series"
)

// Exit statuses (DESIGN.md §3).
const (
	exitOK       = 0
	exitNoAnswer = 1 // the analysis ran but could not give an answer
	exitBadInput = 2 // bad usage or bad input
	exitInternal = 3 // an internal error (a recovered panic)
)

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
				if w, ok := p.(interface{ WorkerStack() []byte }); ok {
					fmt.Fprintln(stderr, "worker goroutine:")
					stderr.Write(w.WorkerStack())
					fmt.Fprintln(stderr, "calling goroutine:")
				}
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
		err = suggestFlag(root, args, err)
		fmt.Fprintf(stderr, "unfold: %v\n", err)
		if strings.Contains(err.Error(), "unknown command") || strings.Contains(err.Error(), "unknown flag") || strings.Contains(err.Error(), "unknown shorthand") {
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

// suggestFlag adds "did you mean --NAME?" to an unknown-flag error, with the flag of the
// command named by args nearest to the unknown one by edit distance.
func suggestFlag(root *cobra.Command, args []string, err error) error {
	msg := err.Error()
	const mark = "unknown flag: --"
	i := strings.Index(msg, mark)
	if i < 0 {
		return err
	}
	bad, _, _ := strings.Cut(msg[i+len(mark):], " ")
	bad, _, _ = strings.Cut(bad, "=")
	cmd, _, ferr := root.Find(args)
	if ferr != nil || cmd == nil {
		cmd = root
	}
	var names []string
	add := func(f *pflag.Flag) { names = append(names, f.Name) }
	cmd.Flags().VisitAll(add)
	cmd.InheritedFlags().VisitAll(add)
	if best := suggest.Closest(bad, names); best != "" {
		return &usageError{fmt.Errorf("%w; did you mean --%s?", err, best)}
	}
	return err
}
