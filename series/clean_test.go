package series

import (
	"encoding/xml"
	"strings"
	"testing"
	"unicode/utf8"
)

func TestCleanText(t *testing.T) {
	for in, want := range map[string]string{
		"strain (µε)":       "strain (µε)",
		"  x  ":             "x",
		"a\xffb":            "a\uFFFDb",
		"\xc3\x28":          "\uFFFD(",
		"a\tb\r\nc":         "a b  c",
		"be\x00l\x07l\x7f":  "bell",
		"\u202Eevil\u202C":  "evil",
		"x\u0085y\uFFFEz":   "xyz",
		"\xed\xa0\x80 half": "\uFFFD\uFFFD\uFFFD half", // an encoded surrogate is not UTF-8
		"":                  "",
		"\uFFFD kept":       "\uFFFD kept",
	} {
		got := CleanText(in)
		if got != want {
			t.Errorf("CleanText(%q) = %q, want %q", in, got, want)
		}
		if !utf8.ValidString(got) {
			t.Errorf("CleanText(%q) = %q is not UTF-8", in, got)
		}
		// Every result is valid XML character data (the reference library's decoder).
		var v struct {
			A string `xml:"a,attr"`
		}
		if err := xml.Unmarshal([]byte(`<t a="`+xmlEscape(got)+`"/>`), &v); err != nil {
			t.Errorf("CleanText(%q) = %q is not XML: %v", in, got, err)
		}
	}
}

func xmlEscape(s string) string {
	var b strings.Builder
	_ = xml.EscapeText(&b, []byte(s))
	return b.String()
}

func TestReadCleansHeaderNames(t *testing.T) {
	s, notes := readNotes(t, "t,\xff\xfeampl\x01itude\n0,1\n1,2\n", ReadOptions{})
	if s.Name != "\uFFFD\uFFFDamplitude" {
		t.Errorf("name %q", s.Name)
	}
	for _, n := range notes {
		if !utf8.ValidString(n) {
			t.Errorf("note %q is not UTF-8", n)
		}
	}
	// The column can be chosen by the raw bytes or by the cleaned name.
	for _, spec := range []string{"\xff\xfeampl\x01itude", "\uFFFD\uFFFDamplitude"} {
		if _, err := Read(strings.NewReader("t,\xff\xfeampl\x01itude,b\n0,1,2\n1,2,3\n"), "h.csv", ReadOptions{Column: spec}); err != nil {
			t.Errorf("--column %q: %v", spec, err)
		}
	}
}
