package main

import (
	"fmt"
	"strconv"
	"strings"

	"unfold/states"
)

type stateJSON struct {
	ID          int                `json:"id"`
	Probability float64            `json:"probability"`
	Count       int64              `json:"count"`
	Next        map[string]float64 `json:"next"`
	Suffixes    []string           `json:"suffixes"`
	SuffixCount int                `json:"suffix_count"`
}

type transitionJSON struct {
	From        int     `json:"from"`
	Symbol      string  `json:"symbol"`
	To          int     `json:"to"`
	Probability float64 `json:"probability"`
}

// statesResult is the JSON body of `states` (DESIGN.md §3).
type statesResult struct {
	States                int              `json:"states"`
	StatisticalComplexity float64          `json:"statistical_complexity"`
	EntropyRate           float64          `json:"entropy_rate"`
	HistoryLength         int              `json:"history_length"`
	LengthRule            string           `json:"length_rule"`
	Significance          float64          `json:"significance"`
	StateList             []stateJSON      `json:"state_list"`
	Transitions           []transitionJSON `json:"transitions"`
	TransientRemoved      int              `json:"transient_removed"`
	Scan                  []states.ScanRow `json:"scan,omitempty"`
	Cautions              []string         `json:"cautions"`
}

// statesBody turns a reconstruction into the JSON body, naming symbols by the alphabet.
func statesBody(r *states.Result, alphabet string, scan []states.ScanRow) statesResult {
	b := statesResult{States: len(r.States), StatisticalComplexity: r.StatisticalComplexity, EntropyRate: r.EntropyRate,
		HistoryLength: r.HistoryLength, LengthRule: r.LengthRule, Significance: r.Significance,
		StateList: []stateJSON{}, Transitions: []transitionJSON{}, TransientRemoved: r.Transient, Scan: scan, Cautions: r.Cautions}
	for _, s := range r.States {
		sj := stateJSON{ID: s.ID, Probability: s.Probability, Count: s.Count, Next: map[string]float64{}, SuffixCount: s.SuffixCount}
		for a, p := range s.Next {
			sj.Next[states.SymbolName(a, alphabet)] = p
		}
		for _, h := range s.Suffixes {
			sj.Suffixes = append(sj.Suffixes, states.SuffixString(h, alphabet))
		}
		b.StateList = append(b.StateList, sj)
	}
	for _, t := range r.Transitions {
		b.Transitions = append(b.Transitions, transitionJSON{From: t.From, Symbol: states.SymbolName(t.Symbol, alphabet), To: t.To, Probability: t.Probability})
	}
	if b.Cautions == nil {
		b.Cautions = []string{}
	}
	return b
}

// statesTable prints the human-readable summary of `states`.
func (a *app) statesTable(path string, st *statesStream, b statesResult) error {
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
