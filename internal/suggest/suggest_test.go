package suggest

import "testing"

func TestClosest(t *testing.T) {
	for _, c := range []struct {
		s    string
		in   []string
		want string
	}{
		{"strian", []string{"t", "strain", "temp"}, "strain"},
		{"max-dimm", []string{"max-dim", "dim", "lag", "threads"}, "max-dim"},
		{"thraeds", []string{"max-dim", "dim", "lag", "threads"}, "threads"},
		{"zzzzzz", []string{"t", "strain", "temp"}, ""},
		{"x", nil, ""},
	} {
		if got := Closest(c.s, c.in); got != c.want {
			t.Errorf("Closest(%q, %v) = %q, want %q", c.s, c.in, got, c.want)
		}
	}
	// Exact values of the Levenshtein distance (worked by hand): kitten → sitting is 3.
	if d := editDistance("kitten", "sitting"); d != 3 {
		t.Errorf("editDistance(kitten, sitting) = %d, want 3", d)
	}
}
