package series

import (
	"bytes"
	"math"
	"strings"
	"testing"
)

func readNotes(t *testing.T, content string, opt ReadOptions) (*Series, []string) {
	t.Helper()
	s, info, err := read(strings.NewReader(content), "h.csv", opt)
	if err != nil {
		t.Fatal(err)
	}
	return s, info.notes
}

func hasNote(notes []string, part string) bool {
	for _, n := range notes {
		if strings.Contains(n, part) {
			return true
		}
	}
	return false
}

func TestReadDecimalCommas(t *testing.T) {
	cases := []struct {
		name, content string
		want          []float64
		dt            float64
	}{
		{"semicolon with header", "t;x\n0;0,0047\n0,5;-1,25\n1,0;2e-3\n", []float64{0.0047, -1.25, 2e-3}, 0.5},
		{"semicolon headerless", "0,0047;1\n0,0050;2\n", []float64{0.0047, 0.005}, 1},
		{"tab", "time\tv\n0,25\t1,5\n0,50\t2,5\n0,75\t3\n", []float64{1.5, 2.5, 3}, 0.25},
		{"integers then commas", "t;x\n0;1\n1;2,5\n", []float64{1, 2.5}, 1},
		{"time integers then commas", "t;x\n0;1\n1;2\n2;2,5\n", []float64{1, 2, 2.5}, 1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, notes := readNotes(t, c.content, ReadOptions{})
			if !sameFloats(s.Values, c.want) || math.Abs(s.Dt-c.dt) > 1e-12 {
				t.Errorf("values %v dt %v, want %v dt %v", s.Values, s.Dt, c.want, c.dt)
			}
			if !hasNote(notes, "decimal commas") {
				t.Errorf("no note on decimal commas in %q", notes)
			}
		})
	}
	// A comma-delimited file never reads decimal commas, and a point in a decimal-comma file
	// is refused where it stands.
	for _, c := range []struct{ content, msg string }{
		{"t;x\n0;0,5\n1;1.5\n", "h.csv:3:3: \"1.5\" in column \"x\" is not a number (this file writes decimal commas"},
		{"x;y\n1.5;2,5\n3.5;4,5\n", "decimal comma is read only"},
	} {
		s, err := Read(strings.NewReader(c.content), "h.csv", ReadOptions{Column: "y"})
		if c.msg == "decimal comma is read only" {
			if err == nil || !strings.Contains(err.Error(), c.msg) {
				t.Errorf("%q: got %v, %v; want an error with %q", c.content, s, err, c.msg)
			}
			continue
		}
		_, err = Read(strings.NewReader(c.content), "h.csv", ReadOptions{})
		if err == nil || !strings.HasPrefix(err.Error(), c.msg) {
			t.Errorf("%q: error %v, want prefix %q", c.content, err, c.msg)
		}
	}
}

func TestReadISOStamps(t *testing.T) {
	cases := []struct {
		name, content string
		opt           ReadOptions
		dt            float64
		col           string
	}{
		{"zulu", "time,x\n2026-01-01T00:00:00Z,1\n2026-01-01T00:00:10Z,2\n2026-01-01T00:00:20Z,3\n", ReadOptions{}, 10, "x"},
		{"space no zone", "date;v\n2026-01-01 00:00:00;1\n2026-01-01 00:01:00;2\n2026-01-01 00:02:00;3\n", ReadOptions{}, 60, "v"},
		{"fraction and offset", "stamp,v\n2026-01-01T01:00:00.000+01:00,1\n2026-01-01T00:00:00.250Z,2\n2026-01-01T01:00:00.500+0100,3\n", ReadOptions{}, 0.25, "v"},
		{"negative offset crosses midnight", "when,v\n2025-12-31T23:59:59-05:00,1\n2026-01-01T04:59:59.5Z,2\n2026-01-01T05:00:00Z,3\n", ReadOptions{}, 0.5, "v"},
		{"headerless", "2026-03-01T00:00:00Z 5\n2026-03-01T00:00:02Z 6\n", ReadOptions{}, 2, "column 2"},
		{"leap day", "t,v\n2024-02-28,1\n2024-02-29,2\n2024-03-01,3\n", ReadOptions{}, 86400, "v"},
		{"by option", "clock,v\n2026-01-01T00:00:00Z,1\n2026-01-01T00:00:01Z,2\n", ReadOptions{TimeColumn: "clock"}, 1, "v"},
		{"dt given", "t,v\n2026-01-01T00:00:00Z,1\n2026-01-01T00:07:00Z,2\n", ReadOptions{Dt: 3}, 3, "v"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, notes := readNotes(t, c.content, c.opt)
			// exact: the stamps are written 1 s, 1 min, 0.25 s … apart.
			if math.Abs(s.Dt-c.dt) > 1e-9*c.dt || s.Name != c.col || s.T0 != 0 {
				t.Errorf("dt %v name %q t0 %v, want %v %q 0 (notes %q)", s.Dt, s.Name, s.T0, c.dt, c.col, notes)
			}
			if c.opt.Dt == 0 && (s.TimeUnit != "s" || !hasNote(notes, "ISO-8601")) {
				t.Errorf("time unit %q notes %q", s.TimeUnit, notes)
			}
		})
	}
	bad := []struct{ content, prefix, msg string }{
		{"t,x\n2026-01-01T00:00:00Z,1\n2026-01-01T00:00:10Z,2\n2026-01-01T00:00:30Z,3\n", "h.csv:4:1: ", "a gap"},
		{"t,x\n2026-01-01T00:00:00Z,1\n2026-01-01T00:00:00Z,2\n", "h.csv:3:1: ", "repeats"},
		{"t,x\n2026-01-01T00:00:00Z,1\n2026-02-30T00:00:00Z,2\n", "h.csv:3:1: ", "not an ISO-8601 date-time"},
		{"t,x\n2026-01-01T00:00:00Z,1\nnoon,2\n", "h.csv:3:1: ", "not an ISO-8601"},
		{"t,x\n2026-01-01T00:00:00Z,1\n2026-01-01T00:00:01Z,a\n", "h.csv:3:22: ", "not a number"},
	}
	for _, c := range bad {
		_, err := Read(strings.NewReader(c.content), "h.csv", ReadOptions{})
		if err == nil || !strings.HasPrefix(err.Error(), c.prefix) || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%q: error %v, want %q…%q", c.content, err, c.prefix, c.msg)
		}
	}
}

func TestISOStampParse(t *testing.T) {
	// exact: Unix times of these instants (2026-01-01T00:00:00Z = 1767225600, from the
	// calendar: 56 years of which 14 leap years since 1970).
	for _, c := range []struct {
		in        string
		sec, nsec int64
		q         float64
		ok        bool
	}{
		{"2026-01-01T00:00:00Z", 1767225600, 0, 1, true},
		{"2026-01-01 00:00:00", 1767225600, 0, 1, true},
		{"2026-01-01T02:00:00+02:00", 1767225600, 0, 1, true},
		{"2026-01-01T00:00:00.123456789123Z", 1767225600, 123456789, 1e-9, true},
		{"2026-01-01T00:00", 1767225600, 0, 60, true},
		{"2026-01-01", 1767225600, 0, 86400, true},
		{"2026-13-01", 0, 0, 0, false},
		{"2026-01-01T24:00:00Z", 0, 0, 0, false},
		{"2026-01-01T00:00:60Z", 0, 0, 0, false},
		{"2026-01-01T00:00:00.Z", 0, 0, 0, false},
		{"2026-01-01+01:00", 0, 0, 0, false},
		{"2026-01-01T00:00:00Zx", 0, 0, 0, false},
		{"2026-1-1", 0, 0, 0, false},
	} {
		sec, nsec, q, ok := isoStamp([]byte(c.in))
		if ok != c.ok || (ok && (sec != c.sec || nsec != c.nsec || q != c.q)) {
			t.Errorf("%q: %d %d %g %v, want %d %d %g %v", c.in, sec, nsec, q, ok, c.sec, c.nsec, c.q, c.ok)
		}
	}
}

func TestReadColumnChoiceNote(t *testing.T) {
	_, notes := readNotes(t, "t,x,y,z\n0,1,2,3\n1,2,3,4\n", ReadOptions{})
	if !hasNote(notes, `3 numeric columns: using "x" (the first besides the time column); choose with --column`) {
		t.Errorf("notes %q", notes)
	}
	_, notes = readNotes(t, "a b\n1 2\n3 4\n", ReadOptions{})
	if !hasNote(notes, `2 numeric columns: using "a" (the first); choose with --column`) {
		t.Errorf("notes %q", notes)
	}
}

// TestReadTextNoAllocPerRow: decimal commas and ISO stamps keep the reader's promise of no
// allocation per row (common practice: testing.AllocsPerRun over two sizes).
func TestReadTextNoAllocPerRow(t *testing.T) {
	mk := func(n int) []byte {
		var b bytes.Buffer
		b.WriteString("time;x\n")
		for i := 0; i < n; i++ {
			b.WriteString("2026-01-01T00:00:")
			b.WriteByte(byte('0' + i/10%6))
			b.WriteByte(byte('0' + i%10))
			b.WriteString(".5Z;0,")
			b.WriteByte(byte('1' + i%9))
			b.WriteByte('\n')
		}
		return b.Bytes()
	}
	small, large := mk(10), mk(59)
	allocs := func(b []byte) float64 {
		return testing.AllocsPerRun(5, func() {
			if _, err := Read(bytes.NewReader(b), "a.csv", ReadOptions{}); err != nil {
				t.Fatal(err)
			}
		})
	}
	if a, b := allocs(small), allocs(large); b-a > 4 { // values slice growth only
		t.Errorf("allocations grow with rows: %v for 10 rows, %v for 59", a, b)
	}
}

// TestSeriesCarriesNotes: the notes travel with the record (through preprocessing), so that
// inspect can say that decimal commas were read.
func TestSeriesCarriesNotes(t *testing.T) {
	s, err := Read(strings.NewReader("t;x\n0;0,5\n1;1,5\n2;2,5\n"), "h.csv", ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := (Prep{From: "1"}).Apply(s)
	if err != nil {
		t.Fatal(err)
	}
	if !hasNote(p.Notes, `decimal commas: numbers are written like "0,5" (read as 0.5)`) {
		t.Errorf("notes %q", p.Notes)
	}
}
