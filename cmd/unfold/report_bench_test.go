package main

import (
	"bytes"
	"io"
	"path/filepath"
	"testing"
)

// BenchmarkReportFlow times `unfold report` on 10^5 samples of the Lorenz flow (x, dt 0.01),
// stages and page together. Run it at a quiet time:
//
//	go test ./cmd/unfold/ -run '^$' -bench ReportFlow -benchtime 3x
//
// The per-stage wall times of each run are in result.json under provenance.stages.
func BenchmarkReportFlow(b *testing.B) {
	dir := b.TempDir()
	sig := filepath.Join(dir, "lorenz.csv")
	var se bytes.Buffer
	if code := run([]string{"simulate", "lorenz", "--n", "100000", "-o", sig}, nil, io.Discard, &se); code != 0 {
		b.Fatalf("simulate: %s", se.String())
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if code := run([]string{"report", "-q", "--column", "x", "-o", filepath.Join(dir, "out"), sig}, nil, io.Discard, &se); code != 0 {
			b.Fatalf("report: exit %d: %s", code, se.String())
		}
	}
}
