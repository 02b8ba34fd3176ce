package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/spf13/cobra"

	"unfold/analysis"
	"unfold/series"
	"unfold/symbolic"
)

// statesStream is the symbol stream `states` analyses, with where it came from.
type statesStream struct {
	symbols  []uint8
	k        int
	alphabet string
	in       *inputInfo
	origin   string                 // "stream" or "signal"
	part     symbolic.PartitionInfo // the partition that made the symbols
	notes    []string
}

// loadStatesStream reads path as a symbol stream when a sidecar lies beside it (checked against
// it), otherwise as a numeric record that it turns into symbols as `symbols` does (the symbols
// options in so). This is the only place where `states` leans on other commands' helpers.
func (a *app) loadStatesStream(cmd *cobra.Command, path string, so *symbolsOptions) (*statesStream, error) {
	sp := symbolic.SidecarPath(path)
	if path != "-" {
		if _, err := os.Stat(sp); err == nil {
			return readStatesStream(path)
		} else if !errors.Is(err, os.ErrNotExist) {
			return nil, err
		}
	}
	if err := analysis.CheckSymbols(so.options(), cmd.Flags().Changed("alphabet")); err != nil {
		return nil, err
	}
	s, in, err := a.loadInput(path, &so.in)
	if err != nil {
		return nil, err
	}
	run, _, err := a.env(&so.in).Symbols(path, s, so.options(), "")
	if err != nil {
		return nil, err
	}
	p := run.Part
	st := &statesStream{symbols: p.Apply(run.Values, nil), k: p.K(), alphabet: run.Alphabet, in: in, origin: "signal",
		part: symbolic.PartitionInfo{Kind: p.Kind, Thresholds: p.Thresholds, Score: p.Score, AppliedTo: run.Applied}, notes: noteList(run)}
	st.in.Samples = len(st.symbols)
	return st, nil
}

// readStatesStream reads a whole symbol stream written by `symbols`, checked against its sidecar.
func readStatesStream(path string) (*statesStream, error) {
	f, err := symbolic.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	x, err := f.ReadAll()
	if err != nil {
		return nil, err
	}
	sc := f.Sidecar()
	if sc.AlphabetSize < 2 {
		return nil, noAnswer(fmt.Errorf("states: %s: the alphabet has one symbol: there is one state and nothing to predict", path))
	}
	return &statesStream{symbols: x, k: sc.AlphabetSize, alphabet: sc.Alphabet, origin: "stream", part: sc.Partition,
		in: &inputInfo{Path: path, SHA256: f.SHA256(), Samples: len(x), Dt: 1}}, nil
}

// writeStatesFile writes one output file of `states` atomically, never over the input.
func writeStatesFile(name, input string, write func(io.Writer) error) error {
	out, err := series.CreateAtomic(name, input)
	if err != nil {
		return err
	}
	defer out.Abort()
	if err := write(out); err != nil {
		return fmt.Errorf("states: writing %s: %w", name, err)
	}
	return out.Commit()
}
