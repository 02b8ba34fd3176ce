package models

import (
	"bufio"
	"bytes"
	"flag"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
)

// The demo record testdata/demo/strip.csv is made here; testdata/demo/README.md describes the
// same recipe. Regenerate it with
//
//	go test ./models -run TestDemoStrip -update-demo
var updateDemo = flag.Bool("update-demo", false, "rewrite testdata/demo/strip.csv from its recipe")

const (
	demoPath         = "../testdata/demo/strip.csv"
	demoSamples      = 20000
	demoPerPeriod    = 50    // samples per forcing period
	demoPeriods      = 100   // forcing periods dropped as transient
	demoForcingHz    = 5.0   // physical forcing frequency: one model time unit is 1/(2π·5) s
	demoMicrostrain  = 250.0 // microstrain per unit of the model's displacement x
	demoNoise        = 0.015 // sensor noise, fraction of the signal's standard deviation
	demoSeed         = 11
	demoTimeDigits   = 3 // seconds, 1 ms resolution (the sample interval is 4 ms)
	demoStrainDigits = 2 // microstrain, 0.01 µε resolution
)

// demoStrip simulates the two-well forced Duffing oscillator (Moon & Holmes 1979 parameters
// δ = 0.25, α = −1, β = 1, γ = 0.4, ω = 1) and returns the CSV text of the demo record.
func demoStrip() ([]byte, error) {
	spec, err := Lookup("duffing")
	if err != nil {
		return nil, err
	}
	dt := 2 * math.Pi / demoPerPeriod
	opt := spec.DefaultOptions()
	opt.N = demoSamples
	opt.Dt = dt
	opt.Transient = demoPeriods * 2 * math.Pi
	opt.Noise = demoNoise
	opt.Seed = demoSeed
	tr, err := spec.Simulate(Values{"delta": {0.25}, "alpha": {-1}, "beta": {1}, "gamma": {0.4}, "omega": {1}}, opt)
	if err != nil {
		return nil, err
	}
	var b bytes.Buffer
	b.WriteString("t,strain\n")
	secondsPerUnit := 1 / (2 * math.Pi * demoForcingHz)
	for i, x := range tr.Column("x") {
		b.WriteString(strconv.FormatFloat(float64(i)*dt*secondsPerUnit, 'f', demoTimeDigits, 64))
		b.WriteByte(',')
		b.WriteString(strconv.FormatFloat(demoMicrostrain*x, 'f', demoStrainDigits, 64))
		b.WriteByte('\n')
	}
	return b.Bytes(), nil
}

func readDemo(t *testing.T, data []byte) (tt, strain []float64) {
	t.Helper()
	sc := bufio.NewScanner(bytes.NewReader(data))
	line := 0
	for sc.Scan() {
		line++
		if line == 1 {
			if sc.Text() != "t,strain" {
				t.Fatalf("header %q, want t,strain", sc.Text())
			}
			continue
		}
		a, b, ok := strings.Cut(sc.Text(), ",")
		if !ok {
			t.Fatalf("line %d: %q is not two columns", line, sc.Text())
		}
		x, err1 := strconv.ParseFloat(a, 64)
		y, err2 := strconv.ParseFloat(b, 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("line %d: %q: not numbers", line, sc.Text())
		}
		tt, strain = append(tt, x), append(strain, y)
	}
	return tt, strain
}

// TestDemoStrip regenerates the demo record from its recipe and compares it with the committed
// file, so the README's recipe stays true. On amd64 the whole record must agree to the printed
// precision. Other architectures may fuse multiply–adds, and chaos amplifies the last-bit
// differences, so there only the first 1000 samples (20 forcing periods, before any divergence
// can grow to the printed precision) and the standard deviation (within 3 %) are compared.
func TestDemoStrip(t *testing.T) {
	fresh, err := demoStrip()
	if err != nil {
		t.Fatal(err)
	}
	if *updateDemo {
		tmp := demoPath + ".tmp"
		if err := os.WriteFile(tmp, fresh, 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.Rename(tmp, demoPath); err != nil {
			t.Fatal(err)
		}
		t.Logf("wrote %s (%d bytes)", filepath.Clean(demoPath), len(fresh))
	}
	committed, err := os.ReadFile(demoPath)
	if err != nil {
		t.Fatalf("%v (regenerate with: go test ./models -run TestDemoStrip -update-demo)", err)
	}
	if len(committed) > 1<<20 {
		t.Errorf("%s is %d bytes, keep it under 1 MB", demoPath, len(committed))
	}
	ct, cs := readDemo(t, committed)
	ft, fs := readDemo(t, fresh)
	if len(ct) != demoSamples || len(ft) != demoSamples {
		t.Fatalf("%d committed and %d regenerated samples, want %d", len(ct), len(ft), demoSamples)
	}
	// 4 ms sampling, 50 samples per 0.2 s forcing period.
	if d := ct[1] - ct[0]; math.Abs(d-0.004) > 1e-12 || math.Abs(ct[len(ct)-1]-0.004*(demoSamples-1)) > 1e-9 {
		t.Errorf("sampling %g s (last stamp %g), want 0.004 s", d, ct[len(ct)-1])
	}
	n := len(ct)
	if runtime.GOARCH != "amd64" {
		n = 1000
	}
	half := 0.5*math.Pow(10, -demoStrainDigits) + 1e-9
	for i := 0; i < n; i++ {
		if ct[i] != ft[i] || math.Abs(cs[i]-fs[i]) > half {
			t.Fatalf("sample %d: committed (%g, %g), regenerated (%g, %g)", i+1, ct[i], cs[i], ft[i], fs[i])
		}
	}
	if sc, sf := stdDev(cs), stdDev(fs); math.Abs(sc-sf) > 0.03*sc {
		t.Errorf("standard deviation %g committed, %g regenerated", sc, sf)
	}
	// The scenario: the strip jumps between both wells (x ≈ ±1, i.e. ±250 µε), so the record
	// has both signs and a spread of a few hundred microstrain.
	var neg, pos int
	for _, v := range cs {
		if v < -demoMicrostrain/2 {
			neg++
		}
		if v > demoMicrostrain/2 {
			pos++
		}
	}
	if neg < n/10 || pos < n/10 {
		t.Errorf("the record does not visit both wells: %d samples below −125 µε, %d above +125 µε", neg, pos)
	}
}
