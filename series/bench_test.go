package series

import (
	"bytes"
	"math"
	"os"
	"runtime"
	"strconv"
	"testing"
)

// benchText returns a "t,x" CSV of n rows: time stamps to 4 decimals at dt 0.002 and values
// written with 'g' −1 (17 significant digits mostly), as a simulator would write them.
func benchText(n int) []byte {
	b := make([]byte, 0, n*32)
	b = append(b, "t,x\n"...)
	for i := 0; i < n; i++ {
		b = strconv.AppendFloat(b, float64(i)*0.002, 'f', 4, 64)
		b = append(b, ',')
		b = strconv.AppendFloat(b, math.Sin(float64(i)*0.01)*3.7, 'g', -1, 64)
		b = append(b, '\n')
	}
	return b
}

// BenchmarkReadText measures the delimited-text reader (detection, splitting, both columns
// parsed, time-uniformity check) in MB/s of input.
func BenchmarkReadText(b *testing.B) {
	data := benchText(200000)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		s, err := Read(bytes.NewReader(data), "bench.csv", ReadOptions{})
		if err != nil || s.Len() != 200000 {
			b.Fatal(err)
		}
	}
}

// BenchmarkParseFloatFields is the reference: strconv.ParseFloat over the same fields, split
// beforehand (so it does no line scanning), reported over the same bytes.
func BenchmarkParseFloatFields(b *testing.B) {
	data := benchText(200000)
	var fields []string
	for _, line := range bytes.Split(bytes.TrimSpace(data), []byte("\n"))[1:] {
		for _, f := range bytes.Split(line, []byte(",")) {
			fields = append(fields, string(f))
		}
	}
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		var sum float64
		for _, f := range fields {
			v, err := strconv.ParseFloat(f, 64)
			if err != nil {
				b.Fatal(err)
			}
			sum += v
		}
		if sum == 0 {
			b.Fatal("zero sum")
		}
	}
}

// TestReadTextBoundedAllocation: reading 10^6 rows allocates only the growing values slice and
// a fixed buffer — the number of allocations does not grow with the number of lines (only
// logarithmically, through the doublings of the values slice), and the bytes allocated stay
// within a small multiple of the 8 bytes per value that the result needs.
func TestReadTextBoundedAllocation(t *testing.T) {
	measure := func(n int) (mallocs, bytes uint64) {
		data := benchText(n)
		var m0, m1 runtime.MemStats
		runtime.GC()
		runtime.ReadMemStats(&m0)
		s, err := Read(bytesReader(data), "alloc.csv", ReadOptions{})
		runtime.ReadMemStats(&m1)
		if err != nil || s.Len() != n {
			t.Fatalf("read %d rows: %v", n, err)
		}
		return m1.Mallocs - m0.Mallocs, m1.TotalAlloc - m0.TotalAlloc
	}
	small, _ := measure(100000)
	big, bigBytes := measure(1000000)
	t.Logf("allocations: %d for 10^5 rows, %d for 10^6 rows; %d bytes for 10^6 rows", small, big, bigBytes)
	// Ten times the lines: a handful more doublings of the values slice, not 9·10^5 more.
	if big > small+40 || big > 400 {
		t.Errorf("allocations grow with the lines: %d for 10^5 rows, %d for 10^6", small, big)
	}
	// Doubling growth allocates at most about 2·8·n·(1+1/2+…) ≈ 4·8·n bytes for n values.
	if bigBytes > 4*8*1000000+1<<20 {
		t.Errorf("allocated %d bytes for 10^6 values", bigBytes)
	}
}

func bytesReader(b []byte) *bytes.Reader { return bytes.NewReader(b) }

// TestReadBigFile reads the file named by $UNFOLD_BIG_FILE (skipped when unset) and logs the
// samples and the bytes allocated, to check by hand that a 10^7-row file reads in memory
// proportional to the values only:
//
//	awk 'BEGIN{print "t,x"; for(i=0;i<1e7;i++) printf "%.3f,%.9f\n", i*0.001, sin(i*0.01)}' >/tmp/big.csv
//	UNFOLD_BIG_FILE=/tmp/big.csv go test ./series -run BigFile -v
func TestReadBigFile(t *testing.T) {
	path := os.Getenv("UNFOLD_BIG_FILE")
	if path == "" {
		t.Skip("set UNFOLD_BIG_FILE to a large text file")
	}
	var m0, m1 runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&m0)
	s, src, err := ReadFile(path, nil, ReadOptions{})
	runtime.ReadMemStats(&m1)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%d samples, dt %v, from %d bytes; allocated %d bytes (%.1f per sample) in %d allocations; heap in use %d MB",
		s.Len(), s.Dt, src.Bytes, m1.TotalAlloc-m0.TotalAlloc, float64(m1.TotalAlloc-m0.TotalAlloc)/float64(s.Len()),
		m1.Mallocs-m0.Mallocs, m1.HeapInuse>>20)
}
