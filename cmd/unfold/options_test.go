package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestOptionRanges: every out-of-range option value exits 2 before any work, with a message
// that names the flag and the allowed range (issue 13); unknown flags and columns get a
// "did you mean".
func TestOptionRanges(t *testing.T) {
	dir := t.TempDir()
	p, _ := writeTX(t, dir, 1000, 0.01)
	hdr := filepath.Join(dir, "h.csv")
	if err := os.WriteFile(hdr, []byte("t,strain,temp\n0,1,2\n1,2,3\n2,4,1\n3,1,1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"lag", "--threads", "0", p}, "--threads 0: want at least 1"},
		{[]string{"lag", "--threads", "-1", p}, "--threads -1: want at least 1"},
		{[]string{"inspect", "--dt", "0", p}, "--dt 0: want a positive"},
		{[]string{"inspect", "--dt", "-1", p}, "--dt -1: want a positive"},
		{[]string{"inspect", "--channel", "0", p}, "--channel 0: want at least 1"},
		{[]string{"inspect", "--decimate", "0", p}, "--decimate 0: want at least 1"},
		{[]string{"lyapunov", "--dim", "100", p}, "--dim 100 needs at least"},
		{[]string{"lyapunov", "--dim", "100", p}, "this record has 1000"},
		{[]string{"lyapunov", "--lag", "600", p}, "--lag 600: want at most 500"},
		{[]string{"dim", "--lag", "600", p}, "--lag 600: want at most 500"},
		{[]string{"lyapunov", "--theiler", "-2", p}, "--theiler -2"},
		{[]string{"dim", "--max-dim", "0", p}, "--max-dim ≥ 1"},
		{[]string{"regime", "--surrogates", "0", p}, "--surrogates ≥ 1"},
		{[]string{"symbols", "--alphabet", "1", "-o", filepath.Join(dir, "x.sym"), p}, "--alphabet 1: want 2 to"},
		{[]string{"dim", "--max-dimm", "3", p}, "did you mean --max-dim?"},
		{[]string{"dim", "--fnn-threshold", "1.5", p}, "--fnn-threshold 1.5: want a value between 0 and 1"},
		{[]string{"report", "--dim", "100", "-o", filepath.Join(dir, "rep"), p}, "--dim 100 needs at least"},
		{[]string{"report", "--lag", "600", "-o", filepath.Join(dir, "rep"), p}, "--lag 600: want at most 500"},
		{[]string{"lag", "--thraeds", "2", p}, "did you mean --threads?"},
		{[]string{"inspect", "--column", "strian", hdr}, `no column "strian"; did you mean "strain"? the columns are 1 "t", 2 "strain", 3 "temp"`},
	} {
		_, errOut, code := runCLI(t, "", c.args...)
		if code != exitBadInput || !strings.Contains(errOut, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want exit 2 and %q", c.args, code, errOut, c.want)
		}
	}
}

// TestInspectNotes: the reader's notes (decimal commas, ISO time stamps, the column taken
// among several) are printed by inspect, in the table and in the JSON "notes".
func TestInspectNotes(t *testing.T) {
	var b strings.Builder
	b.WriteString("date;a;b\n")
	for i := range 60 {
		fmt.Fprintf(&b, "2026-01-01T00:%02d:%02dZ;%d,%d;1,5\n", i/60, i%60, i%7, i%3)
	}
	p := filepath.Join(t.TempDir(), "dc.csv")
	if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := runCLI(t, "", "inspect", p)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, want := range []string{"decimal commas", "ISO-8601", `using "a"`} {
		if !strings.Contains(out, want) {
			t.Errorf("the table does not mention %q:\n%s", want, out)
		}
	}
	out, _, _ = runCLI(t, "", "inspect", "--json", p)
	m := decode(t, out)
	notes, _ := m["notes"].([]any)
	if len(notes) < 3 {
		t.Errorf("JSON notes = %v", m["notes"])
	}
}
