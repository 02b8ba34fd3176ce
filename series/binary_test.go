package series

import (
	"bytes"
	"compress/gzip"
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"codeberg.org/sbinet/npyio/npy"
	"github.com/go-audio/audio"
	"github.com/go-audio/wav"
	"gonum.org/v1/gonum/mat"
)

func npyBytes(t testing.TB, v any) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := npy.Write(&b, v); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// npyHandmade writes a version-1 .npy file with the given dictionary and data (for headers
// npyio does not write, such as Fortran order).
func npyHandmade(dict string, data []byte) []byte {
	for (10+len(dict)+1)%64 != 0 {
		dict += " "
	}
	dict += "\n"
	var b bytes.Buffer
	b.WriteString("\x93NUMPY\x01\x00")
	binary.Write(&b, binary.LittleEndian, uint16(len(dict)))
	b.WriteString(dict)
	b.Write(data)
	return b.Bytes()
}

func gz(b []byte) []byte {
	var z bytes.Buffer
	w := gzip.NewWriter(&z)
	w.Write(b)
	w.Close()
	return z.Bytes()
}

func TestReadNpy(t *testing.T) {
	f64 := []float64{1.5, -2, 3.25, 1e300}
	dense := mat.NewDense(3, 2, []float64{1, 10, 2, 20, 3, 30}) // rows (1,10) (2,20) (3,30)
	le := func(vals ...float64) []byte {
		var b bytes.Buffer
		binary.Write(&b, binary.LittleEndian, vals)
		return b.Bytes()
	}
	cases := []struct {
		name string
		data []byte
		opt  ReadOptions
		want []float64
		col  string
	}{
		{"float64", npyBytes(t, f64), ReadOptions{}, f64, "x"},
		{"float32", npyBytes(t, []float32{0.5, -1.25}), ReadOptions{}, []float64{0.5, -1.25}, "x"},
		{"int16", npyBytes(t, []int16{-3, 7}), ReadOptions{}, []float64{-3, 7}, "x"},
		{"int32", npyBytes(t, []int32{-300000, 7}), ReadOptions{}, []float64{-300000, 7}, "x"},
		{"int64", npyBytes(t, []int64{1 << 40, -1}), ReadOptions{}, []float64{1 << 40, -1}, "x"},
		{"uint8", npyBytes(t, []uint8{0, 255}), ReadOptions{}, []float64{0, 255}, "x"},
		{"2-D default column", npyBytes(t, dense), ReadOptions{}, []float64{1, 2, 3}, "column 1"},
		{"2-D column 2", npyBytes(t, dense), ReadOptions{Column: "2"}, []float64{10, 20, 30}, "column 2"},
		{"2-D Fortran order", npyHandmade("{'descr': '<f8', 'fortran_order': True, 'shape': (3, 2), }", le(1, 2, 3, 10, 20, 30)), ReadOptions{Column: "2"}, []float64{10, 20, 30}, "column 2"},
		{"big-endian", npyHandmade("{'descr': '>f8', 'fortran_order': False, 'shape': (2,), }", func() []byte {
			var b bytes.Buffer
			binary.Write(&b, binary.BigEndian, []float64{7, -8})
			return b.Bytes()
		}()), ReadOptions{}, []float64{7, -8}, "x"},
		{"gaps linear", npyBytes(t, []float64{1, math.NaN(), 3}), ReadOptions{Gaps: "linear"}, []float64{1, 2, 3}, "x"},
		{"gzipped", gz(npyBytes(t, f64)), ReadOptions{}, f64, "x"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			name := "a.npy"
			if c.name == "gzipped" {
				name = "a.npy.gz"
			}
			s, err := Read(bytes.NewReader(c.data), name, c.opt)
			if err != nil {
				t.Fatal(err)
			}
			if !sameFloats(s.Values, c.want) || s.Name != c.col || s.Dt != 1 {
				t.Errorf("values %v name %q dt %v; want %v %q", s.Values, s.Name, s.Dt, c.want, c.col)
			}
		})
	}
	// Detection by content (standard input has no extension).
	s, src, err := ReadFile("-", bytes.NewReader(npyBytes(t, f64)), ReadOptions{Dt: 0.5})
	if err != nil || src.Format != FormatNpy || !sameFloats(s.Values, f64) || s.Dt != 0.5 {
		t.Errorf("stdin npy: %v %+v", err, src)
	}
}

func TestReadRaw(t *testing.T) {
	var b32, b64 bytes.Buffer
	binary.Write(&b32, binary.LittleEndian, []float32{1, -2.5, 3})
	binary.Write(&b64, binary.LittleEndian, []float64{1, -2.5, 3, math.Pi})
	s, err := Read(bytes.NewReader(b32.Bytes()), "x.bin", ReadOptions{Format: "f32le"})
	if err != nil || !sameFloats(s.Values, []float64{1, -2.5, 3}) {
		t.Errorf("f32le: %v %v", s, err)
	}
	s, err = Read(bytes.NewReader(b64.Bytes()), "x.f64", ReadOptions{Dt: 2})
	if err != nil || !sameFloats(s.Values, []float64{1, -2.5, 3, math.Pi}) || s.Dt != 2 {
		t.Errorf("f64le by extension: %v %v", s, err)
	}
	s, err = Read(bytes.NewReader(gz(b64.Bytes())), "-", ReadOptions{Format: "f64le"})
	if err != nil || s.Len() != 4 {
		t.Errorf("gzipped f64le: %v %v", s, err)
	}
	// More than one buffer of samples.
	big := make([]float64, 20000)
	for i := range big {
		big[i] = float64(i)
	}
	var bb bytes.Buffer
	binary.Write(&bb, binary.LittleEndian, big)
	s, err = Read(bytes.NewReader(bb.Bytes()), "-", ReadOptions{Format: "f64le"})
	if err != nil || !sameFloats(s.Values, big) {
		t.Errorf("large f64le: %v", err)
	}
}

// wavFile writes a WAV file with go-audio/wav and returns its bytes.
func wavFile(t testing.TB, rate, bits, chans, format int, frames [][]float64) []byte {
	t.Helper()
	p := filepath.Join(t.TempDir(), "w.wav")
	f, err := os.Create(p)
	if err != nil {
		t.Fatal(err)
	}
	e := wav.NewEncoder(f, rate, bits, chans, format)
	if format == wavFloat {
		for _, fr := range frames {
			for _, v := range fr {
				if err := e.WriteFrame(float32(v)); err != nil {
					t.Fatal(err)
				}
			}
		}
	} else {
		buf := &audio.IntBuffer{Format: &audio.Format{NumChannels: chans, SampleRate: rate}, SourceBitDepth: bits}
		for _, fr := range frames {
			for _, v := range fr {
				buf.Data = append(buf.Data, int(math.Round(v*math.Ldexp(1, bits-1))))
			}
		}
		if err := e.Write(buf); err != nil {
			t.Fatal(err)
		}
	}
	if err := e.Close(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	b, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	if format == wavFloat {
		// Encoder.WriteFrame counts every sample as a frame, so Close writes a data size
		// NumChans times too large; put the true size (the file holds a 44-byte header).
		binary.LittleEndian.PutUint32(b[40:], uint32(len(b)-44))
	}
	return b
}

func TestReadWAV(t *testing.T) {
	frames := [][]float64{{0.5, -0.25}, {-1, 0.125}, {0.75, 0}}
	for _, c := range []struct {
		bits, format int
	}{{16, wavPCM}, {24, wavPCM}, {32, wavPCM}, {32, wavFloat}} {
		b := wavFile(t, 8000, c.bits, 2, c.format, frames)
		for ch := 1; ch <= 2; ch++ {
			s, err := Read(bytes.NewReader(b), "a.wav", ReadOptions{Channel: ch})
			if err != nil {
				t.Fatalf("%d-bit format %d: %v", c.bits, c.format, err)
			}
			want := []float64{frames[0][ch-1], frames[1][ch-1], frames[2][ch-1]}
			// The frames are exact multiples of 2^-3, so every encoding holds them exactly.
			if !sameFloats(s.Values, want) || s.Dt != 1.0/8000 || s.TimeUnit != "s" || s.Name != fmt.Sprintf("channel %d", ch) {
				t.Errorf("%d-bit format %d channel %d: %v dt %v name %q", c.bits, c.format, ch, s.Values, s.Dt, s.Name)
			}
		}
	}
	b := wavFile(t, 100, 16, 1, wavPCM, frames[:2])
	s, src, err := ReadFile("-", bytes.NewReader(gz(b)), ReadOptions{})
	if err != nil || src.Format != FormatWAV || !src.Gzip || s.Dt != 0.01 || s.Len() != 4 { // two 2-value frames written as mono: 4 samples
		t.Errorf("gzipped WAV from stdin: %v %+v", err, src)
	}
}

func TestReadBinaryBad(t *testing.T) {
	good := npyBytes(t, []float64{1, 2, 3, 4})
	w16 := wavFile(t, 8000, 16, 2, wavPCM, [][]float64{{0.5, 0.25}, {0, 0}, {0.5, 0.5}})
	odd := append([]byte{}, w16...)
	odd = odd[:len(odd)-1]
	binary.LittleEndian.PutUint32(odd[40:], 11) // data chunk of 11 bytes (frames of 4)
	cases := []struct {
		name, file string
		data       []byte
		opt        ReadOptions
		msg        string
	}{
		{"npy truncated data", "a.npy", good[:len(good)-3], ReadOptions{}, "truncated .npy file: the header promises 4 values"},
		{"npy truncated header", "a.npy", good[:20], ReadOptions{}, "truncated"},
		{"npy magic only", "a.npy", good[:7], ReadOptions{}, "truncated header"},
		{"npy no newline", "a.npy", []byte("\x93NUMPY\x01\x00\x04\x00{}  "), ReadOptions{}, "newline"},
		{"npy bad dict", "a.npy", npyHandmade("{'shape': (2,), 'descr': '<f8', 'fortran_order': False}", make([]byte, 16)), ReadOptions{}, "dictionary"},
		{"npy 3-D", "a.npy", npyHandmade("{'descr': '<f8', 'fortran_order': False, 'shape': (1, 1, 1), }", make([]byte, 8)), ReadOptions{}, "only 1-D"},
		{"npy complex", "a.npy", npyHandmade("{'descr': '<c16', 'fortran_order': False, 'shape': (1,), }", make([]byte, 16)), ReadOptions{}, "unsupported .npy element type"},
		{"npy huge shape", "a.npy", npyHandmade("{'descr': '<f8', 'fortran_order': False, 'shape': (2000000000,), }", make([]byte, 16)), ReadOptions{}, "truncated .npy file"},
		{"npy empty", "a.npy", npyHandmade("{'descr': '<f8', 'fortran_order': False, 'shape': (0,), }", nil), ReadOptions{}, "empty series"},
		{"npy column out of range", "a.npy", good, ReadOptions{Column: "2"}, "from 1 to 1"},
		{"npy NaN", "a.npy", npyBytes(t, []float64{1, math.NaN()}), ReadOptions{}, "row 2 of the array is NaN"},
		{"npy is text", "a.npy", []byte("1\n2\n"), ReadOptions{}, "content is text"},
		{"npy forced on text", "a.csv", []byte("1\n2\n"), ReadOptions{Format: "npy"}, "no \\x93NUMPY magic"},
		{"raw not whole", "a.f32", make([]byte, 10), ReadOptions{}, "10 bytes is not a whole number of 4-byte f32le samples (2 bytes left over)"},
		{"raw empty", "-", nil, ReadOptions{Format: "f64le"}, "empty series"},
		{"raw NaN", "-", []byte{0, 0, 0xc0, 0x7f}, ReadOptions{Format: "f32le"}, "sample 1 (byte offset 0) is NaN"},
		{"wav truncated data", "a.wav", w16[:len(w16)-5], ReadOptions{}, "truncated WAV file: the data chunk says 12 bytes, the file holds 7"},
		{"wav truncated header", "a.wav", w16[:30], ReadOptions{}, "truncated WAV file"},
		{"wav partial frame", "a.wav", odd, ReadOptions{}, "not a whole number of 4-byte frames"},
		{"wav no channel", "a.wav", w16, ReadOptions{Channel: 3}, "no channel 3: the file has 2"},
		{"wav is text", "a.wav", []byte("RIFF is a word\n"), ReadOptions{}, "content is text"},
		{"wav forced on npy", "a.bin", good, ReadOptions{Format: "wav"}, "not a WAV file"},
		{"wav 8-bit unsupported float", "a.wav", func() []byte {
			b := append([]byte{}, w16...)
			binary.LittleEndian.PutUint16(b[20:], wavFloat) // float with 16 bits
			return b
		}(), ReadOptions{}, "unsupported WAV encoding"},
		{"gzip truncated", "a.npy.gz", gz(good)[:30], ReadOptions{}, "gzip"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Read(bytes.NewReader(c.data), c.file, c.opt)
			var ie *InputError
			if !errors.As(err, &ie) {
				t.Fatalf("error %v (%T), want *InputError", err, err)
			}
			if ie.Path != c.file || ie.Line != 0 || ie.Column != 0 {
				t.Errorf("at %s:%d:%d, want %s with no line", ie.Path, ie.Line, ie.Column, c.file)
			}
			if !strings.Contains(ie.Error(), c.msg) {
				t.Errorf("message %q does not contain %q", ie.Error(), c.msg)
			}
		})
	}
}
