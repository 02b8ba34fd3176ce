package main

import (
	"io"

	"github.com/spf13/cobra"

	"unfold/analysis"
	"unfold/figure"
	"unfold/states"
)

type statesOptions struct {
	sym          symbolsOptions
	maxLength    int
	significance float64
	scan         bool
	plot, dot    string
}

func newStatesCmd(a *app) *cobra.Command {
	o := &statesOptions{}
	def := analysis.DefaultStatesOptions()
	cmd := &cobra.Command{
		Use:   "states FILE",
		Short: "Causal states of a symbol stream, statistical complexity and entropy rate",
		Long: `states reconstructs the causal states of a symbol stream by causal-state splitting
reconstruction (CSSR; Shalizi & Klinkner 2004): histories of up to L symbols are grouped into
states whose next-symbol distributions do not differ by a χ² test at level α, the states are split
until each symbol leads to one state, and transient states are removed. It reports:
  the recurrent states (probability, the shortest suffixes that identify them, next-symbol
    distribution, visits) and their transitions (from, symbol, to, probability);
  the statistical complexity Cμ = H[π] in bits (Crutchfield & Young 1989), what the process
    remembers of its past;
  the entropy rate hμ = Σ π(s) H[next symbol | s] in bits per symbol (never above log2 K).

FILE is a symbol stream written by unfold symbols (checked against its sidecar FILE.json), or a
numeric record, which is first turned into symbols as unfold symbols does (its --partition,
--alphabet, --map/--flow … options apply).

L (--max-length) is by default
  ` + states.LengthRule + `;
a stream shorter than 5·K^(L+1) symbols is refused with the length it needs. --scan reconstructs at
L = 1 … L so you see where the states, Cμ and hμ settle.

Cost as a function of the stream length N: O(N · L) to count the histories, then tests over
at most K^(L+1) ≤ N/50 histories; memory O(K^(L+1)).`,
		Example: `  unfold symbols --alphabet 2 logistic.csv -o logistic.sym
  unfold states logistic.sym
  # a numeric record: symbols from the generating-like partition, then the states
  unfold states --json --alphabet 2 logistic.csv
  # history length 6, α = 0.01, scan over L, the diagram as SVG and as Graphviz DOT
  unfold states --max-length 6 --significance 0.01 --scan --plot states.svg --dot states.dot stream.sym`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error { return a.runStates(cmd, args[0], o) },
	}
	addInputFlags(cmd, &o.sym.in)
	addSymbolsFlags(cmd.Flags(), &o.sym)
	_ = cmd.Flags().MarkHidden("output")
	f := cmd.Flags()
	f.IntVar(&o.maxLength, "max-length", def.MaxLength, "longest history length L (default: automatic, "+states.LengthRule+")")
	f.Float64Var(&o.significance, "significance", def.Significance, "level α of the χ² homogeneity test")
	f.BoolVar(&o.scan, "scan", false, "also reconstruct at L = 1 … L and report states, Cμ and hμ per L")
	f.StringVar(&o.plot, "plot", "", "write the state-transition diagram to this SVG file")
	f.StringVar(&o.dot, "dot", "", "write the state machine as Graphviz DOT to this file")
	return cmd
}

func (a *app) runStates(cmd *cobra.Command, path string, o *statesOptions) error {
	if !(o.significance > 0 && o.significance < 1) {
		return usagef("states: --significance %g must lie between 0 and 1", o.significance)
	}
	st, err := a.loadStatesStream(cmd, path, &o.sym)
	if err != nil {
		return err
	}
	for _, n := range st.notes {
		a.notef("%s", n)
	}
	run, p, body, err := a.env(&o.sym.in).States(path, st.symbols, st.k, st.alphabet,
		analysis.StatesOptions{MaxLength: o.maxLength, Significance: o.significance, Scan: o.scan})
	if err != nil {
		return err
	}
	res := run.R
	if o.plot != "" {
		if err := writeStatesFile(o.plot, path, func(w io.Writer) error { return figure.StateDiagram(w, res, st.alphabet) }); err != nil {
			return err
		}
	}
	if o.dot != "" {
		if err := writeStatesFile(o.dot, path, func(w io.Writer) error { return states.WriteDOT(w, res, st.alphabet) }); err != nil {
			return err
		}
	}
	if a.global.JSON {
		p.From, p.Partition = st.origin, st.part
		return a.emitJSON("states", st.in, p, body)
	}
	return a.statesTable(path, st, body)
}
