package states

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
)

// WriteDOT writes the state machine r as a Graphviz DOT digraph (an open format): one node per
// state labelled with its number and probability, one edge per transition labelled
// "symbol | probability". alphabet gives the character of each symbol; when it is shorter than
// the alphabet size the symbols are written as numbers.
func WriteDOT(w io.Writer, r *Result, alphabet string) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "digraph causal_states {\n")
	fmt.Fprintf(bw, "  // L = %d, alpha = %g, C_mu = %.4f bit, h_mu = %.4f bit/symbol\n",
		r.HistoryLength, r.Significance, r.StatisticalComplexity, r.EntropyRate)
	fmt.Fprintf(bw, "  rankdir=LR;\n  node [shape=circle];\n")
	for _, s := range r.States {
		fmt.Fprintf(bw, "  s%d [label=\"%d\\n%.3f\"];\n", s.ID, s.ID, s.Probability)
	}
	for _, t := range r.Transitions {
		fmt.Fprintf(bw, "  s%d -> s%d [label=%s];\n", t.From, t.To,
			strconv.Quote(SymbolName(t.Symbol, alphabet)+" | "+strconv.FormatFloat(t.Probability, 'f', 3, 64)))
	}
	fmt.Fprintf(bw, "}\n")
	return bw.Flush()
}

// SymbolName returns the character of symbol a in alphabet, or its number when the alphabet
// does not cover it.
func SymbolName(a int, alphabet string) string {
	if a < len(alphabet) {
		return alphabet[a : a+1]
	}
	return strconv.Itoa(a)
}

// SuffixString writes a history with the characters of alphabet (numbers separated by
// dots when the alphabet does not cover it); the empty history is "λ".
func SuffixString(h []uint8, alphabet string) string {
	if len(h) == 0 {
		return "λ"
	}
	b := make([]byte, 0, len(h))
	for i, s := range h {
		if int(s) < len(alphabet) {
			b = append(b, alphabet[s])
			continue
		}
		if i > 0 {
			b = append(b, '.')
		}
		b = strconv.AppendInt(b, int64(s), 10)
	}
	return string(b)
}
