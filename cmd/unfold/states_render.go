package main

import (
	"fmt"
	"strconv"
	"strings"

	"unfold/analysis"
)

// statesTable prints the human-readable summary of `states`.
func (a *app) statesTable(path string, st *statesStream, b analysis.StatesResult) error {
	g := func(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }
	rows := [][]string{
		{"file", path},
		{"symbols", fmt.Sprintf("%d over %q (from a %s)", st.in.Samples, st.alphabet, st.origin)},
		{"history length", fmt.Sprintf("L = %d (%s)", b.HistoryLength, b.LengthRule)},
		{"significance", fmt.Sprintf("α = %g", b.Significance)},
		{"states", fmt.Sprintf("%d recurrent (%d transient removed)", b.States, b.TransientRemoved)},
		{"statistical complexity", g(b.StatisticalComplexity) + " bits"},
		{"entropy rate", g(b.EntropyRate) + " bits/symbol"},
		{"", ""},
		{"state", "probability", "visits", "next symbol", "suffixes"},
	}
	for _, s := range b.StateList {
		var next []string
		for _, c := range st.alphabet {
			if p, ok := s.Next[string(c)]; ok && p > 0 {
				next = append(next, fmt.Sprintf("%c %.3f", c, p))
			}
		}
		suf := strings.Join(s.Suffixes[:min(len(s.Suffixes), 6)], " ")
		if s.SuffixCount > 6 {
			suf += fmt.Sprintf(" … (%d)", s.SuffixCount)
		}
		rows = append(rows, []string{strconv.Itoa(s.ID), g(s.Probability), strconv.FormatInt(s.Count, 10), strings.Join(next, ", "), suf})
	}
	rows = append(rows, []string{"", ""}, []string{"from", "symbol", "to", "probability"})
	for _, t := range b.Transitions {
		rows = append(rows, []string{strconv.Itoa(t.From), t.Symbol, strconv.Itoa(t.To), g(t.Probability)})
	}
	if len(b.Scan) > 0 {
		rows = append(rows, []string{"", ""}, []string{"L", "states", "Cμ bits", "hμ bits/symbol"})
		for _, r := range b.Scan {
			rows = append(rows, []string{strconv.Itoa(r.Length), strconv.Itoa(r.States), g(r.StatisticalComplexity), g(r.EntropyRate)})
		}
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range b.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}
