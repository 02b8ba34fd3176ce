package series

import (
	"bytes"
	"compress/gzip"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestHeader checks the column names read for completion: a header after comments (plain and
// gzipped), and none for a file that starts with numbers.
func TestHeader(t *testing.T) {
	dir := t.TempDir()
	text := "# comment\n\ntime (s);strain [µε];x\n0;1,5;2\n"
	p := filepath.Join(dir, "a.csv")
	if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	var gz bytes.Buffer
	zw := gzip.NewWriter(&gz)
	zw.Write([]byte(text))
	zw.Close()
	pz := filepath.Join(dir, "a.csv.gz")
	if err := os.WriteFile(pz, gz.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, q := range []string{p, pz} {
		h, err := Header(q)
		if err != nil || strings.Join(h, "|") != "time (s)|strain [µε]|x" {
			t.Errorf("%s: %q, %v", q, h, err)
		}
	}
	pn := filepath.Join(dir, "n.csv")
	os.WriteFile(pn, []byte("0,1\n1,2\n"), 0o644)
	if h, err := Header(pn); err != nil || h != nil {
		t.Errorf("no header: %q, %v", h, err)
	}
	if _, err := Header(filepath.Join(dir, "missing.csv")); err == nil {
		t.Error("missing file: want an error")
	}
}
