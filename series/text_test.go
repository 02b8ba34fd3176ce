package series

import (
	"bytes"
	"compress/gzip"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

func readString(t *testing.T, content, name string, opt ReadOptions) (*Series, error) {
	t.Helper()
	return Read(strings.NewReader(content), name, opt)
}

func sameFloats(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] && !(math.Abs(a[i]-b[i]) <= 1e-12*math.Max(1, math.Abs(b[i]))) {
			return false
		}
	}
	return true
}

func TestReadTextGood(t *testing.T) {
	cases := []struct {
		name, file, content string
		opt                 ReadOptions
		want                []float64
		dt, t0              float64
		col, tunit          string
		gaps                int
	}{
		{name: "one column no header", file: "a.txt", content: "1\n2.5\n-3e2\n", want: []float64{1, 2.5, -300}, dt: 1, col: "x"},
		{name: "t,x comma", file: "a.csv", content: "t,x\n0,1\n0.02,2\n0.04,3\n", want: []float64{1, 2, 3}, dt: 0.02, col: "x"},
		{name: "tab", file: "a.tsv", content: "time\tv\n10\t1\n11\t2\n12\t3\n", want: []float64{1, 2, 3}, dt: 1, t0: 10, col: "v"},
		{name: "runs of spaces", file: "a.dat", content: "  seconds    a\n 0.5   1\n 1.0   2\n 1.5     3\n", want: []float64{1, 2, 3}, dt: 0.5, t0: 0.5, col: "a", tunit: "s"},
		{name: "CRLF and BOM", file: "a.csv", content: "\xef\xbb\xbfyear,x\r\n2000,1\r\n2001,2\r\n", want: []float64{1, 2}, dt: 1, t0: 2000, col: "x", tunit: "y"},
		{name: "column by name", file: "a.csv", content: "t,a,b\n0,1,10\n1,2,20\n", opt: ReadOptions{Column: "b"}, want: []float64{10, 20}, dt: 1, col: "b"},
		{name: "column by index", file: "a.csv", content: "t,a,b\n0,1,10\n1,2,20\n", opt: ReadOptions{Column: "3"}, want: []float64{10, 20}, dt: 1, col: "b"},
		{name: "column by name ignoring case", file: "a.csv", content: "t,Alpha\n0,1\n1,2\n", opt: ReadOptions{Column: "alpha"}, want: []float64{1, 2}, dt: 1, col: "Alpha"},
		{name: "default is first numeric of several", file: "a.csv", content: "label,t,a,b\nq,0,1,10\nr,1,2,20\n", want: []float64{1, 2}, dt: 1, col: "a"},
		{name: "time column by option", file: "a.csv", content: "clock,a\n0,1\n0.5,2\n1,3\n", opt: ReadOptions{TimeColumn: "clock"}, want: []float64{1, 2, 3}, dt: 0.5, col: "a"},
		{name: "time column none", file: "a.csv", content: "t,a\n0,1\n0.5,2\n", opt: ReadOptions{TimeColumn: "none"}, want: []float64{0, 0.5}, dt: 1, col: "t"},
		{name: "dt overrides time", file: "a.csv", content: "t,a\n0,1\n7,2\n8,3\n", opt: ReadOptions{Dt: 0.1}, want: []float64{1, 2, 3}, dt: 0.1, col: "a"},
		{name: "headerless two columns", file: "a.csv", content: "0,5\n1,6\n", want: []float64{0, 1}, dt: 1, col: "column 1"},
		{name: "quoted fields with comma", file: "a.csv", content: "\"name, long\",\"t\",\"x\"\n\"a,b\",0,1\n\"c\"\"d\",1,2\n", want: []float64{1, 2}, dt: 1, col: "x"},
		{name: "gaps linear", file: "a.csv", content: "x\n1\nNA\n\n3\nNaN\n", opt: ReadOptions{Gaps: "linear"}, want: []float64{1, 2, 3, 3}, dt: 1, col: "x", gaps: 2},
		{name: "gaps linear leading", file: "a.csv", content: "x\n\"\"\n-Inf\n4\n6\n", opt: ReadOptions{Gaps: "linear"}, want: []float64{4, 4, 4, 6}, dt: 1, col: "x", gaps: 2},
		{name: "gaps drop keeps time step", file: "a.csv", content: "t,x\n0,1\n2,NA\n4,3\n6,4\n", opt: ReadOptions{Gaps: "drop"}, want: []float64{1, 3, 4}, dt: 2, col: "x", gaps: 1},
		{name: "semicolon with text column", file: "a.csv", content: "t;x;note\n0;1;ok\n1;2;fine\n", want: []float64{1, 2}, dt: 1, col: "x"},
		{name: "trailing delimiter", file: "a.csv", content: "t,x,\n0,1,\n1,2,\n", want: []float64{1, 2}, dt: 1, col: "x"},
		{name: "hex and exponent forms", file: "a.csv", content: "x\n1E3\n0x1p-2\n+.5\n", want: []float64{1000, 0.25, 0.5}, dt: 1, col: "x"},
		// Stamps rounded to two decimals of k/3: steps 0.33 and 0.34 are uniform within the
		// written precision (common practice: the tolerance is the stamps' rounding).
		{name: "rounded stamps", file: "a.csv", content: "t,x\n0.00,1\n0.33,2\n0.67,3\n1.00,4\n1.33,5\n1.67,6\n2.00,7\n", want: []float64{1, 2, 3, 4, 5, 6, 7}, dt: 2.0 / 6, col: "x"},
		{name: "g-format rounded stamps", file: "a.csv", content: "t,x\n0,1\n0.33,2\n0.67,3\n1,4\n1.33,5\n", want: []float64{1, 2, 3, 4, 5}, dt: 1.33 / 4, col: "x"},
		// 360 Hz stamps written to 6 significant digits (printf %.6g, as the ECG of
		// testdata/ecg): past 10 s they have one decimal fewer
		{name: "significant-digit stamps across a decade", file: "a.csv", content: "t,x\n9.98889,0\n9.99167,1\n9.99444,2\n9.99722,3\n10,4\n10.0028,5\n10.0056,6\n10.0083,7\n10.0111,8\n10.0139,9\n",
			want: []float64{0, 1, 2, 3, 4, 5, 6, 7, 8, 9}, dt: (10.0139 - 9.98889) / 9, t0: 9.98889, col: "x"},
		{name: "no stamp precision but 1% jitter", file: "a.csv", content: "t,x\n0.000,1\n1.004,2\n1.998,3\n3.003,4\n", want: []float64{1, 2, 3, 4}, dt: 3.003 / 3, col: "x"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := readString(t, c.content, c.file, c.opt)
			if err != nil {
				t.Fatal(err)
			}
			if !sameFloats(s.Values, c.want) {
				t.Errorf("values %v, want %v", s.Values, c.want)
			}
			if math.Abs(s.Dt-c.dt) > 1e-12*c.dt {
				t.Errorf("dt %v, want %v", s.Dt, c.dt)
			}
			if s.T0 != c.t0 {
				t.Errorf("t0 %v, want %v", s.T0, c.t0)
			}
			if s.Name != c.col {
				t.Errorf("name %q, want %q", s.Name, c.col)
			}
			if s.TimeUnit != c.tunit {
				t.Errorf("time unit %q, want %q", s.TimeUnit, c.tunit)
			}
			if s.GapsFilled != c.gaps {
				t.Errorf("gaps filled %d, want %d", s.GapsFilled, c.gaps)
			}
		})
	}
}

// TestReadMonthlyStamps: monthly samples as decimal years written to 14 significant digits
// (as R writes time(ts) with 12 observations a year) are uniform at dt = 1/12 year.
func TestReadMonthlyStamps(t *testing.T) {
	var b strings.Builder
	b.WriteString("\"\",\"time\",\"value\"\n")
	for k := 0; k < 480; k++ {
		fmt.Fprintf(&b, "\"%d\",%s,%d\n", k+1, strconv.FormatFloat(1959+float64(k)/12, 'g', 14, 64), k%12)
	}
	s, err := readString(t, b.String(), "monthly.csv", ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// exact: (t_last − t_first)/(N − 1) = (479/12)/479 = 1/12, within the 1e-10 rounding.
	if math.Abs(s.Dt-1.0/12) > 1e-12 || s.Len() != 480 || s.Name != "value" || s.T0 != 1959 || s.TimeUnit != "" {
		t.Errorf("dt %v len %d name %q t0 %v unit %q", s.Dt, s.Len(), s.Name, s.T0, s.TimeUnit)
	}
}

func TestReadFixtures(t *testing.T) {
	dir := filepath.Join("..", "testdata", "series")
	cases := []struct {
		file  string
		opt   ReadOptions
		want  []float64
		name  string
		dt    float64
		tunit string
	}{
		{file: "r_style.csv", want: []float64{9.5, 2.7, 5, 24.4, 42}, name: "spots", dt: 1, tunit: "y"},
		{file: "write_table.txt", want: []float64{1.5, -2, 3.25}, name: "x", dt: 0.25},
		{file: "write_table.txt", opt: ReadOptions{Column: "y"}, want: []float64{10, 20, 30}, name: "y", dt: 0.25},
		{file: "semicolon_comments.csv", want: []float64{1.25, 1.5, 1.75, 2}, name: "strain", dt: 10, tunit: "ms"},
	}
	for _, c := range cases {
		s, src, err := ReadFile(filepath.Join(dir, c.file), nil, c.opt)
		if err != nil {
			t.Errorf("%s: %v", c.file, err)
			continue
		}
		if !sameFloats(s.Values, c.want) || s.Name != c.name || s.Dt != c.dt || s.TimeUnit != c.tunit {
			t.Errorf("%s: values %v name %q dt %v unit %q", c.file, s.Values, s.Name, s.Dt, s.TimeUnit)
		}
		if src.Format != FormatCSV || len(src.SHA256) != 64 || src.Bytes == 0 || len(src.Notes) == 0 {
			t.Errorf("%s: source %+v", c.file, src)
		}
	}
}

// TestReadFileGzipAndStdin: the same record through a plain file, a .gz file and standard
// input gives the same values; the hash is of the bytes as stored.
func TestReadFileGzipAndStdin(t *testing.T) {
	var b strings.Builder
	b.WriteString("t,x\n")
	for i := 0; i < 30000; i++ {
		fmt.Fprintf(&b, "%s,%s\n", strconv.FormatFloat(float64(i)*0.02, 'f', 2, 64), strconv.FormatFloat(math.Sin(float64(i)*0.1), 'g', -1, 64))
	}
	dir := t.TempDir()
	plain := filepath.Join(dir, "sig.csv")
	if err := os.WriteFile(plain, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	var zb bytes.Buffer
	zw := gzip.NewWriter(&zb)
	zw.Write([]byte(b.String()))
	zw.Close()
	gz := filepath.Join(dir, "sig.csv.gz")
	if err := os.WriteFile(gz, zb.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	s1, src1, err := ReadFile(plain, nil, ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	s2, src2, err := ReadFile(gz, nil, ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	s3, src3, err := ReadFile("-", strings.NewReader(b.String()), ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	s4, _, err := ReadFile("-", bytes.NewReader(zb.Bytes()), ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for i, s := range []*Series{s1, s2, s3, s4} {
		if s.Len() != 30000 || math.Abs(s.Dt-0.02) > 1e-15 || !sameFloats(s.Values, s1.Values) {
			t.Errorf("reading %d: len %d dt %v", i, s.Len(), s.Dt)
		}
	}
	if !src2.Gzip || src1.Gzip || src1.SHA256 != src3.SHA256 || src1.SHA256 == src2.SHA256 || src2.Bytes != int64(zb.Len()) {
		t.Errorf("sources %+v %+v %+v", src1, src2, src3)
	}
}

func TestReadTextBad(t *testing.T) {
	cases := []struct {
		name, file, content string
		opt                 ReadOptions
		line, col           int
		msg                 string
	}{
		{name: "empty file", file: "e.csv", content: "", msg: "empty series"},
		{name: "only comments", file: "e.csv", content: "# nothing\n\n", msg: "empty series"},
		{name: "header only", file: "e.csv", content: "t,x\n", line: 1, msg: "no data lines"},
		{name: "non-numeric cell", file: "b.csv", content: "t,x\n0,1\n1,abc\n", line: 3, col: 3, msg: `"abc" in column "x" is not a number`},
		{name: "non-numeric quoted", file: "b.csv", content: "x\n1\n\"1 2\"\n", line: 3, col: 1, msg: "not a number"},
		{name: "unclosed quote", file: "b.csv", content: "x\n1\n\"12\n", line: 3, col: 1, msg: "not a number"},
		{name: "NaN refused", file: "b.csv", content: "t,x\n0,1\n1,NaN\n", line: 3, col: 3, msg: "--gaps"},
		{name: "Inf refused", file: "b.csv", content: "x\n1\n2\n  Inf\n", line: 4, col: 3, msg: "gap"},
		{name: "empty cell refused", file: "b.csv", content: "x,y\n1,2\n,3\n", line: 3, col: 1, msg: "an empty cell"},
		{name: "NA refused", file: "b.txt", content: "x y\n1 2\nNA 3\n", line: 3, col: 1, msg: "gap"},
		{name: "all gaps", file: "b.csv", content: "x\nNA\nNaN\n", opt: ReadOptions{Gaps: "drop"}, msg: "every value"},
		{name: "unknown gaps policy", file: "b.csv", content: "x\n1\n", opt: ReadOptions{Gaps: "zero"}, msg: "unknown --gaps"},
		{name: "unknown column", file: "b.csv", content: "t,a,b\n0,1,2\n", opt: ReadOptions{Column: "c"}, line: 1, msg: `the columns are 1 "t", 2 "a", 3 "b"`},
		{name: "column index out of range", file: "b.csv", content: "1,2\n3,4\n", opt: ReadOptions{Column: "3"}, msg: "no header line; give a 1-based index from 1 to 2"},
		{name: "unknown time column", file: "b.csv", content: "t,a\n0,1\n", opt: ReadOptions{TimeColumn: "clock"}, line: 1, msg: `no time column "clock"`},
		{name: "same column twice", file: "b.csv", content: "t,a\n0,1\n", opt: ReadOptions{Column: "a", TimeColumn: "a"}, line: 1, msg: "both"},
		{name: "ragged long", file: "b.csv", content: "t,x\n0,1\n1,2,3\n", line: 3, col: 5, msg: "ragged rows: this row has 3 fields, the header on line 1 has 2"},
		{name: "ragged short", file: "b.csv", content: "t,x,y\n0,1,2\n1,2\n", line: 3, col: 4, msg: "ragged rows"},
		{name: "ragged first row", file: "b.csv", content: "t,x,y,z\n0,1\n", line: 2, col: 1, msg: "ragged rows"},
		{name: "ragged headerless", file: "b.txt", content: "1 2\n3 4\n5\n", line: 3, col: 2, msg: "the first data row has 2"},
		{name: "no numeric column", file: "b.csv", content: "t,a\n0,x\n", line: 2, msg: "no numeric signal column"},
		{name: "time repeats", file: "b.csv", content: "t,x\n0,1\n1,2\n1,3\n", line: 4, col: 1, msg: "repeats"},
		{name: "time goes back", file: "b.csv", content: "t,x\n0,1\n1,2\n0.5,3\n", line: 4, col: 1, msg: "before the previous"},
		{name: "time gap", file: "b.csv", content: "t,x\n0.00,1\n0.10,2\n0.20,3\n0.40,4\n", line: 5, col: 1, msg: "a gap"},
		{name: "time jitter", file: "b.csv", content: "t,x\n0.000,1\n1.000,2\n2.000,3\n3.050,4\n", line: 5, col: 1, msg: "--dt"},
		{name: "time extra sample", file: "b.csv", content: "t,x\n0,1\n10,2\n20,3\n21,4\n", line: 5, col: 1, msg: "extra or repeated"},
		{name: "integer stamps gap", file: "b.csv", content: "t,x\n0,1\n1,2\n2,3\n4,4\n", line: 5, col: 1, msg: "a gap"},
		{name: "g-format stamps gap", file: "b.csv", content: "t,x\n0,1\n0.5,2\n1,3\n1.5,4\n2.5,5\n", line: 6, col: 1, msg: "a gap"},
		{name: "monthly stamps gap", file: "b.csv", content: "year,x\n1959,1\n1959.0833333333,2\n1959.1666666667,3\n1959.25,4\n1959.4166666667,5\n", line: 6, col: 1, msg: "a gap"},
		{name: "rounded stamps gap", file: "b.csv", content: "t,x\n0.00,1\n0.33,2\n0.67,3\n1.00,4\n1.67,5\n", line: 6, col: 1, msg: "a gap"},
		{name: "time not a number", file: "b.csv", content: "t,x\n0,1\nnoon,2\n", line: 3, col: 1, msg: "is not a number"},
		{name: "time missing", file: "b.csv", content: "t,x\n0,1\n,2\n", line: 3, col: 1, msg: "missing"},
		{name: "binary with csv extension", file: "b.csv", content: "ab\x00\x01cd", msg: "the name says text but the content is binary data"},
		{name: "npy with csv extension", file: "b.csv", content: "\x93NUMPY\x01\x00", msg: "a NumPy .npy file"},
		{name: "gz extension not gzip", file: "b.csv.gz", content: "x\n1\n", msg: "not gzip"},
		{name: "csv with npy extension", file: "b.npy", content: "x\n1\n", msg: "the name says a NumPy .npy file but the content is text"},
		{name: "text with wav extension", file: "b.wav", content: "x\n1\n", msg: "the name says a WAV file"},
		{name: "binary no extension", file: "blob", content: "\x00\x01\x02", msg: "--format f32le or f64le"},
		{name: "raw extension needs format", file: "b.raw", content: "abc", msg: "--format f32le"},
		{name: "unknown format", file: "b.csv", content: "x\n1\n", opt: ReadOptions{Format: "xls"}, msg: "unknown --format"},
		{name: "corrupt gzip", file: "b.gz", content: "\x1f\x8b\x08\x00\x00\x00\x00\x00\x00\x03garbage", msg: "gzip"},
		{name: "long line", file: "b.csv", content: strings.Repeat("1", maxLine+10), line: 1, msg: "longer than"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := readString(t, c.content, c.file, c.opt)
			var ie *InputError
			if !errors.As(err, &ie) {
				t.Fatalf("error %v (%T), want an *InputError", err, err)
			}
			if ie.Path != c.file || ie.Line != c.line || ie.Column != c.col {
				t.Errorf("at %s:%d:%d, want %s:%d:%d (%v)", ie.Path, ie.Line, ie.Column, c.file, c.line, c.col, ie)
			}
			if !strings.Contains(ie.Error(), c.msg) {
				t.Errorf("message %q does not contain %q", ie.Error(), c.msg)
			}
			want := fmt.Sprintf("%s:%d:%d: ", c.file, c.line, c.col)
			if c.line > 0 && c.col > 0 && !strings.HasPrefix(ie.Error(), want) {
				t.Errorf("message %q does not start with %q", ie.Error(), want)
			}
		})
	}
}

func TestReadFileMissing(t *testing.T) {
	_, _, err := ReadFile(filepath.Join(t.TempDir(), "nope.csv"), nil, ReadOptions{})
	if !errors.Is(err, os.ErrNotExist) {
		t.Errorf("error %v, want not-exist", err)
	}
	_, _, err = ReadFile(t.TempDir(), nil, ReadOptions{})
	var ie *InputError
	if !errors.As(err, &ie) {
		t.Errorf("directory: error %v, want *InputError", err)
	}
}

// TestParseFloatMatchesStrconv: the fast path equals strconv.ParseFloat bit for bit.
func TestParseFloatMatchesStrconv(t *testing.T) {
	inputs := []string{"0", "-0", "1", "-1", "0.1", "0.3", "1.5e10", "123456789012345678", "9007199254740993",
		"1e22", "1e23", "1e-22", "1e-23", "3.14159265358979", "2.2250738585072014e-308", "1.7976931348623157e308",
		"0.000000000000000000001", "12345678901234567890", "4.9e-324", ".5", "5.", "+7", "1e", "e1", "1..2", "--1",
		"inf", "NaN", "0x10", "1_0", "", "-", "1e+05", "00012.50", "99999999999999999999e-5"}
	for _, s := range inputs {
		checkParse(t, s)
	}
	for i := 0; i < 2000; i++ {
		x := math.Float64frombits(uint64(i)*0x9E3779B97F4A7C15) / 1e10
		for _, f := range []byte{'g', 'e', 'f'} {
			checkParse(t, strconv.FormatFloat(x, f, i%20, 64))
		}
	}
}

func checkParse(t *testing.T, s string) {
	t.Helper()
	got, ok := parseFloat([]byte(s))
	want, err := strconv.ParseFloat(s, 64)
	if (err == nil) != ok || (ok && math.Float64bits(got) != math.Float64bits(want) && !(math.IsNaN(got) && math.IsNaN(want))) {
		t.Errorf("parseFloat(%q) = %v, %v; strconv %v, %v", s, got, ok, want, err)
	}
}

func TestStampQuantum(t *testing.T) {
	for s, want := range map[string]float64{"12.34": 0.01, "1959": 1, "1959.0833333333": 1e-10, "1.5e-3": 1e-4, "1.50E-3": 1e-5, "7e2": 100, "-0.5": 0.1} {
		if got := stampQuantum([]byte(s)); math.Abs(got-want) > 1e-9*want {
			t.Errorf("stampQuantum(%q) = %v, want %v", s, got, want)
		}
	}
}

// TestReadRExports reads the series exported from R's datasets package (testdata/r, written by
// write.csv: quoted header, row names, decimal-year stamps to 15 significant digits). The
// lengths and sampling are facts of those datasets (R documentation of co2: monthly 1959–1997,
// 468 values; nottem: monthly 1920–1939, 240; lynx: yearly 1821–1934, 114).
func TestReadRExports(t *testing.T) {
	cases := []struct {
		file, name, unit string
		n                int
		dt, t0           float64
	}{
		{"co2.csv", "co2", "", 468, 1.0 / 12, 1959},
		{"nottem.csv", "nottem", "", 240, 1.0 / 12, 1920},
		{"lynx.csv", "lynx", "y", 114, 1, 1821},
	}
	for _, c := range cases {
		s, _, err := ReadFile(filepath.Join("..", "testdata", "r", c.file), nil, ReadOptions{})
		if err != nil {
			t.Errorf("%s: %v", c.file, err)
			continue
		}
		// The stamps are rounded to ~1e-11 years, so dt is 1/12 to about 1e-10.
		if s.Len() != c.n || s.Name != c.name || s.TimeUnit != c.unit || math.Abs(s.Dt-c.dt) > 1e-9 || s.T0 != c.t0 {
			t.Errorf("%s: %d samples of %q, dt %v, t0 %v, unit %q", c.file, s.Len(), s.Name, s.Dt, s.T0, s.TimeUnit)
		}
	}
}
