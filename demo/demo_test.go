package demo

import (
	"bytes"
	"os"
	"testing"
)

// TestCopyMatchesTestdata checks that the embedded copy equals the documented file.
func TestCopyMatchesTestdata(t *testing.T) {
	want, err := os.ReadFile("../" + Path)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(Strip(), want) {
		t.Fatalf("demo/strip.csv differs from %s: copy it again", Path)
	}
}
