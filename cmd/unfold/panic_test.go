package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// panicWriter panics on every write: a stand-in for a panic anywhere below a command.
type panicWriter struct{}

func (panicWriter) Write([]byte) (int, error) { panic("boom") }

// TestRunRecoversPanic: a panic becomes exit status 3 with one line naming the input and no
// stack trace (DESIGN.md §3: internal error, never a panic trace).
func TestRunRecoversPanic(t *testing.T) {
	in := filepath.Join(t.TempDir(), "sig.csv")
	os.WriteFile(in, []byte("x\n1\n2\n3\n4\n5\n6\n7\n8\n9\n"), 0o644)
	for _, debug := range []string{"", "1"} {
		t.Setenv("UNFOLD_DEBUG", debug)
		var errs bytes.Buffer
		code := run([]string{"inspect", in}, strings.NewReader(""), panicWriter{}, &errs)
		msg := errs.String()
		if code != 3 || !strings.HasPrefix(msg, "unfold: internal error, please report: ") ||
			!strings.Contains(msg, "boom") || !strings.Contains(msg, "(input \""+in+"\")\n") {
			t.Errorf("UNFOLD_DEBUG=%q: exit %d, stderr %q", debug, code, msg)
		}
		if hasStack := strings.Contains(msg, "goroutine "); hasStack != (debug == "1") {
			t.Errorf("UNFOLD_DEBUG=%q: stack on stderr is %v", debug, hasStack)
		}
	}
}
