package main

import (
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
		{[]string{"lag", "--thraeds", "2", p}, "did you mean --threads?"},
		{[]string{"inspect", "--column", "strian", hdr}, `no column "strian"; did you mean "strain"? the columns are 1 "t", 2 "strain", 3 "temp"`},
	} {
		_, errOut, code := runCLI(t, "", c.args...)
		if code != exitBadInput || !strings.Contains(errOut, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want exit 2 and %q", c.args, code, errOut, c.want)
		}
	}
}
