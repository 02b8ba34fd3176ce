package main

import (
	"bytes"
	"flag"
	"io"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"unfold/neighbors"
	"unfold/series"
)

// BenchmarkReportFlow times `unfold report` (the chain, analysis.Run, and the page) on 10^5
// samples of the Lorenz flow (x, dt 0.01). Run it at a quiet time:
//
//	go test ./cmd/unfold/ -run '^$' -bench 'ReportFlow$' -benchtime 1x
//
// Besides ns/op it reports "kdtrees/op": the report's time as a multiple of the reference in
// the same run, building one kd-tree over the 3-dimensional delay vectors of the same record
// (neighbors.FromEmbedding, O(N log N)), so the number compares across machines. The per-stage
// wall times are in result.json under provenance.stages.
func BenchmarkReportFlow(b *testing.B) { benchReport(b, 100_000) }

// BenchmarkReportFlow1M is BenchmarkReportFlow on 10^6 samples; it runs only when named
// (-bench ReportFlow1M), as it takes about a minute.
func BenchmarkReportFlow1M(b *testing.B) {
	if f := flag.Lookup("test.bench"); f == nil || !strings.Contains(f.Value.String(), "1M") {
		b.Skip("runs only when named: -bench ReportFlow1M")
	}
	benchReport(b, 1_000_000)
}

func benchReport(b *testing.B, n int) {
	dir := b.TempDir()
	sig := filepath.Join(dir, "lorenz.csv")
	var se bytes.Buffer
	if code := run([]string{"simulate", "lorenz", "--n", strconv.Itoa(n), "-o", sig}, nil, io.Discard, &se); code != 0 {
		b.Fatalf("simulate: %s", se.String())
	}
	s, _, err := series.ReadFile(sig, nil, series.ReadOptions{Column: "x"})
	if err != nil {
		b.Fatal(err)
	}
	var ref, rep time.Duration
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		t0 := time.Now()
		if _, err := neighbors.FromEmbedding(s.Values, 11, 3, neighbors.Euclidean); err != nil {
			b.Fatal(err)
		}
		t1 := time.Now()
		if code := run([]string{"report", "-q", "--column", "x", "-o", filepath.Join(dir, "out"), sig}, nil, io.Discard, &se); code != 0 {
			b.Fatalf("report: exit %d: %s", code, se.String())
		}
		ref, rep = ref+t1.Sub(t0), rep+time.Since(t1)
	}
	b.ReportMetric(float64(rep)/float64(ref), "kdtrees/op")
}
