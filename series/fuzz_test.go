package series

import (
	"bytes"
	"encoding/binary"
	"errors"
	"math"
	"strconv"
	"testing"
)

// checkFuzzResult asserts what every reader promises on arbitrary bytes: no panic, an
// *InputError for bad input, and otherwise a non-empty finite record with a positive Dt.
func checkFuzzResult(t *testing.T, s *Series, err error) {
	t.Helper()
	if err != nil {
		var ie *InputError
		if !errors.As(err, &ie) {
			t.Fatalf("error %v (%T) is not an *InputError", err, err)
		}
		return
	}
	if s.Len() == 0 || !(s.Dt > 0) || math.IsInf(s.Dt, 0) {
		t.Fatalf("record of %d samples with dt %v", s.Len(), s.Dt)
	}
	for i, v := range s.Values {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("sample %d is %v", i, v)
		}
	}
}

func FuzzReadText(f *testing.F) {
	for _, s := range []string{
		"t,x\n0,1\n0.02,2\n0.04,3\n",
		"\"\",\"year\",\"spots\"\n\"1\",1900,9.5\n\"2\",1901,NA\n",
		"# c\n1\n2\n\n3\n",
		"time (s)\tv\n0.0\t1e3\n0.5\t-2\n",
		"a;b\n1;2\n3\n",
		"\"x\" \"y\"\n\"1\" 2 3\n",
		"t,x\n0,1\n0,2\n",
		"x\n\"1\"\"\n",
		"t;x\n0;0,0047\n0,5;-1,25\n",
		"0,0047\t1\n0,0050\t2\n",
		"t;x\n0;1\n1;2,5\n2;1.5\n",
		"time,x\n2026-01-01T00:00:00Z,1\n2026-01-01T00:00:10Z,2\n",
		"date;v\n2026-01-01 00:00:00.5+01:00;1\n2026-01-01 00:00:01-0000;2\n",
		"2026-03-01T00:00:00Z 5\n2026-02-30T00:00:02Z 6\n",
		"t,x,y,z\n0,1,2,3\n1,2,3,4\n",
		"\xff\xfe\x01name,x\n1,2\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, b []byte) {
		for _, gaps := range []string{"", "linear", "drop"} {
			s, err := Read(bytes.NewReader(b), "f.csv", ReadOptions{Format: "csv", Gaps: gaps})
			checkFuzzResult(t, s, err)
		}
	})
}

func FuzzReadNpy(f *testing.F) {
	f.Add(npyBytes(f, []float64{1, 2, 3}))
	f.Add(npyBytes(f, []float32{1, 2}))
	f.Add(npyBytes(f, []int16{-1, 2}))
	f.Add(npyBytes(f, []uint64{7}))
	f.Add(npyHandmade("{'descr': '<f8', 'fortran_order': True, 'shape': (2, 2), }", make([]byte, 32)))
	f.Add(npyHandmade("{'descr': '>i4', 'fortran_order': False, 'shape': (3,), }", make([]byte, 12)))
	f.Fuzz(func(t *testing.T, b []byte) {
		s, err := Read(bytes.NewReader(b), "f.npy", ReadOptions{Format: "npy", Gaps: "linear"})
		checkFuzzResult(t, s, err)
		s, err = Read(bytes.NewReader(b), "f.npy", ReadOptions{Format: "npy", Column: "2"})
		checkFuzzResult(t, s, err)
	})
}

func FuzzReadRaw(f *testing.F) {
	var b bytes.Buffer
	binary.Write(&b, binary.LittleEndian, []float64{1, math.NaN(), 3})
	f.Add(b.Bytes())
	f.Add([]byte{0, 0, 0x80, 0x3f, 1})
	f.Add([]byte{})
	f.Fuzz(func(t *testing.T, b []byte) {
		for _, format := range []string{"f32le", "f64le"} {
			for _, gaps := range []string{"", "drop", "linear"} {
				s, err := Read(bytes.NewReader(b), "-", ReadOptions{Format: format, Gaps: gaps})
				checkFuzzResult(t, s, err)
				if err == nil && gaps == "" && s.Len()*map[string]int{"f32le": 4, "f64le": 8}[format] != len(b) {
					t.Fatalf("%s: %d samples from %d bytes", format, s.Len(), len(b))
				}
			}
		}
	})
}

func FuzzReadWAV(f *testing.F) {
	frames := [][]float64{{0.5, -0.25}, {-1, 0.125}}
	f.Add(wavFile(f, 8000, 16, 2, wavPCM, frames))
	f.Add(wavFile(f, 44100, 24, 1, wavPCM, frames))
	f.Add(wavFile(f, 100, 32, 2, wavFloat, frames))
	f.Add([]byte("RIFF\x00\x00\x00\x00WAVELIST\xff\xff\xff\x00"))
	f.Fuzz(func(t *testing.T, b []byte) {
		for ch := 1; ch <= 2; ch++ {
			s, err := Read(bytes.NewReader(b), "f.wav", ReadOptions{Format: "wav", Channel: ch, Gaps: "linear"})
			checkFuzzResult(t, s, err)
		}
	})
}

// FuzzParseFloat: the fast parser agrees with strconv.ParseFloat bit for bit.
func FuzzParseFloat(f *testing.F) {
	for _, s := range []string{"0", "-0.0", "1e22", "9007199254740993", "0.1", "1.7976931348623157e308", "nan", "1e-400", "0x1p3"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		got, ok := parseFloat([]byte(s))
		want, err := strconv.ParseFloat(s, 64)
		if (err == nil) != ok || (ok && math.Float64bits(got) != math.Float64bits(want) && !(math.IsNaN(got) && math.IsNaN(want))) {
			t.Fatalf("parseFloat(%q) = %v, %v; strconv %v, %v", s, got, ok, want, err)
		}
	})
}
