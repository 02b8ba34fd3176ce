package series

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func ramp(n int, dt, t0 float64, unit string) *Series {
	s := &Series{Values: make([]float64, n), Dt: dt, T0: t0, TimeUnit: unit, Name: "x"}
	for i := range s.Values {
		s.Values[i] = float64(i)
	}
	return s
}

func TestPrepRange(t *testing.T) {
	cases := []struct {
		name     string
		s        *Series
		from, to string
		first, n int
		t0       float64
	}{
		{"indices", ramp(100, 0.5, 0, ""), "10", "20", 10, 10, 5},
		{"seconds", ramp(100, 0.5, 0, "s"), "2.5s", "5s", 5, 5, 2.5},
		{"milliseconds", ramp(100, 0.5, 0, "s"), "2500ms", "", 5, 95, 2.5},
		{"minutes on a seconds record", ramp(200, 1, 0, "s"), "1min", "2min", 60, 60, 60},
		{"own unit", ramp(100, 0.25, 10, ""), "11t", "12.1t", 4, 5, 11},
		{"years on a year clock", ramp(120, 1.0/12, 1959, "y"), "1960y", "1961y", 12, 12, 1960},
		{"days on an hour record", ramp(100, 1, 0, "h"), "1d", "", 24, 76, 24},
		{"between samples rounds up", ramp(10, 1, 0, "s"), "2.2s", "4.5s", 3, 2, 3},
		{"before the start", ramp(10, 1, 5, "s"), "1s", "100s", 0, 10, 5},
		{"to past the end", ramp(10, 1, 0, ""), "", "1000", 0, 10, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			out, err := Prep{From: c.from, To: c.to}.Apply(c.s)
			if err != nil {
				t.Fatal(err)
			}
			if out.Len() != c.n || out.Values[0] != float64(c.first) || math.Abs(out.T0-c.t0) > 1e-9 || out.Dt != c.s.Dt {
				t.Errorf("len %d first %v t0 %v dt %v; want %d %d %v", out.Len(), out.Values[0], out.T0, out.Dt, c.n, c.first, c.t0)
			}
		})
	}
}

func TestPrepBad(t *testing.T) {
	s := ramp(10, 1, 0, "")
	for _, p := range []Prep{
		{From: "2.5s"},         // the record states no unit
		{From: "2.5"},          // neither an index nor a time
		{From: "3parsecs"},     // unknown unit
		{From: "-1"},           // negative index
		{From: "5", To: "5"},   // empty range
		{From: "20"},           // past the end
		{Detrend: "quadratic"}, // unknown detrend
		{Decimate: -2},
	} {
		_, err := p.Apply(s)
		var ie *InputError
		if !errors.As(err, &ie) {
			t.Errorf("%+v: error %v, want *InputError", p, err)
		}
	}
	c := &Series{Values: []float64{2, 2, 2}, Dt: 1}
	var ce *ErrConstant
	if _, err := (Prep{Standardize: true}).Apply(c); !errors.As(err, &ce) {
		t.Errorf("standardize constant: %v, want *ErrConstant", err)
	}
}

func TestPrepTransforms(t *testing.T) {
	s := &Series{Values: make([]float64, 101), Dt: 0.1, Name: "x"}
	for i := range s.Values {
		s.Values[i] = 3 + 0.5*float64(i) + math.Sin(float64(i)) // a line plus an oscillation
	}
	orig := append([]float64{}, s.Values...)
	d, err := Prep{Decimate: 4}.Apply(s)
	if err != nil {
		t.Fatal(err)
	}
	if d.Len() != 26 || d.Dt != 0.4 || d.Values[1] != s.Values[4] || d.Values[25] != s.Values[100] {
		t.Errorf("decimate: len %d dt %v", d.Len(), d.Dt)
	}
	lin := &Series{Values: make([]float64, 50), Dt: 1}
	for i := range lin.Values {
		lin.Values[i] = -2 + 0.75*float64(i)
	}
	// Exact: least squares fits a straight line exactly, leaving zero residuals.
	r, err := Prep{Detrend: "linear"}.Apply(lin)
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range r.Values {
		if math.Abs(v) > 1e-12 {
			t.Fatalf("linear detrend of a line left %v", v)
		}
	}
	m, _ := Prep{Detrend: "mean"}.Apply(s)
	st, _ := Prep{Standardize: true}.Apply(s)
	var sm, ss, s2 float64
	for i := range s.Values {
		sm += m.Values[i]
		ss += st.Values[i]
		s2 += st.Values[i] * st.Values[i]
	}
	n := float64(s.Len())
	if math.Abs(sm/n) > 1e-12 || math.Abs(ss/n) > 1e-12 || math.Abs(s2/n-1) > 1e-12 {
		t.Errorf("mean after detrend %v, after standardize %v, variance %v", sm/n, ss/n, s2/n)
	}
	if !sameFloats(s.Values, orig) {
		t.Error("Apply changed its input")
	}
}

func TestAtomicFile(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "in.csv")
	os.WriteFile(in, []byte("x\n1\n"), 0o644)
	out := filepath.Join(dir, "out.csv")
	f, err := CreateAtomic(out, in, "-")
	if err != nil {
		t.Fatal(err)
	}
	if err := WriteCSV(f, []string{"t", "x,y"}, []float64{0, 0.1}, []float64{1.5, 1e-300}); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) {
		t.Error("target exists before Commit")
	}
	if err := f.Commit(); err != nil {
		t.Fatal(err)
	}
	if err := f.Abort(); err != nil {
		t.Errorf("Abort after Commit: %v", err)
	}
	b, _ := os.ReadFile(out)
	if string(b) != "t,\"x,y\"\n0,1.5\n0.1,1e-300\n" {
		t.Errorf("wrote %q", b)
	}
	// Round trip through the reader: 'g' −1 formatting reads back bit for bit.
	s, err := Read(bytes.NewReader(b), "out.csv", ReadOptions{Column: "x,y", Dt: 1})
	if err != nil || s.Values[1] != 1e-300 {
		t.Errorf("read back: %v %v", s, err)
	}
	// Refusals: the same path, a different spelling of it, and a hard link.
	link := filepath.Join(dir, "link.csv")
	os.Link(in, link)
	for _, target := range []string{in, filepath.Join(dir, ".", "sub", "..", "in.csv"), link} {
		if _, err := CreateAtomic(target, in); err == nil {
			t.Errorf("CreateAtomic(%s) over the input did not refuse", target)
		}
	}
	// Abort leaves nothing behind.
	g, _ := CreateAtomic(filepath.Join(dir, "gone.csv"))
	g.Write([]byte("partial"))
	g.Abort()
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.Contains(e.Name(), "tmp") || e.Name() == "gone.csv" {
			t.Errorf("left behind %s", e.Name())
		}
	}
	if err := WriteCSV(&bytes.Buffer{}, nil, []float64{1}, []float64{1, 2}); err == nil {
		t.Error("WriteCSV accepted columns of different lengths")
	}
}

func TestWriteNpyRoundTrip(t *testing.T) {
	var b bytes.Buffer
	if err := WriteNpy(&b, 3, 2, []float64{1, 10, 2, 20, 3, 30}); err != nil {
		t.Fatal(err)
	}
	s, err := Read(bytes.NewReader(b.Bytes()), "v.npy", ReadOptions{Column: "2"})
	if err != nil || !sameFloats(s.Values, []float64{10, 20, 30}) {
		t.Errorf("read back %v, %v", s, err)
	}
	b.Reset()
	if err := WriteNpy(&b, 2, 0, []float64{5, 6}); err != nil {
		t.Fatal(err)
	}
	if s, err := Read(bytes.NewReader(b.Bytes()), "v.npy", ReadOptions{}); err != nil || !sameFloats(s.Values, []float64{5, 6}) {
		t.Errorf("1-D read back %v, %v", s, err)
	}
	if WriteNpy(&b, 2, 2, []float64{1}) == nil {
		t.Error("WriteNpy accepted a wrong length")
	}
}
