package series

import (
	"strings"
	"testing"
)

// TestUnitsFromHeader checks that the header's "(unit)" and "[unit]" give Series.TimeUnit and
// Series.Unit, and that ReadOptions.TimeUnit and Unit override them.
func TestUnitsFromHeader(t *testing.T) {
	in := "time (s),strain [µε]\n0,1\n0.5,2\n1,4\n1.5,3\n"
	s, err := Read(strings.NewReader(in), "h.csv", ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if s.TimeUnit != "s" || s.Unit != "µε" || s.Name != "strain" || s.Dt != 0.5 {
		t.Errorf("time unit %q, unit %q, name %q, dt %g: want s, µε, strain, 0.5", s.TimeUnit, s.Unit, s.Name, s.Dt)
	}
	s, err = Read(strings.NewReader("t [ks];U (mV)\n0;1\n1;2\n2;4\n"), "h.csv", ReadOptions{Column: "U"})
	if err != nil {
		t.Fatal(err)
	}
	if s.TimeUnit != "ks" || s.Unit != "mV" || s.Name != "U" {
		t.Errorf("time unit %q, unit %q, name %q: want ks, mV, U", s.TimeUnit, s.Unit, s.Name)
	}
	s, err = Read(strings.NewReader(in), "h.csv", ReadOptions{TimeUnit: "Minutes", Unit: "mm"})
	if err != nil {
		t.Fatal(err)
	}
	if s.TimeUnit != "min" || s.Unit != "mm" {
		t.Errorf("with the options: time unit %q, unit %q, want min, mm", s.TimeUnit, s.Unit)
	}
	for h, want := range map[string][2]string{"x": {"x", ""}, "f(x)": {"f(x)", ""}, "U[mV]": {"U", "mV"}, "[a]": {"[a]", ""}, "a [b] c": {"a [b] c", ""}, "p (kPa)": {"p", "kPa"}} {
		if n, u := SplitUnit(h); n != want[0] || u != want[1] {
			t.Errorf("SplitUnit(%q) = %q, %q, want %q, %q", h, n, u, want[0], want[1])
		}
	}
}
