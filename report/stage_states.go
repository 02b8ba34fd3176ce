package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strconv"

	"unfold/analysis"
	"unfold/figure"
)

// statesStage renders the chain's "states" stage: the causal states of the symbols stage's
// stream (Shalizi & Klinkner 2004) with the state-transition diagram (figure.StateDiagram,
// drawn here as SVG).
func statesStage(res *analysis.Result) Stage {
	return Stage{Key: "states", Title: "Causal states of the symbol stream", Run: func() (*Section, error) {
		if res.States == nil {
			return nil, stageErr(res, "states")
		}
		st := res.States
		js, err := json.Marshal(st)
		if err != nil {
			return nil, err
		}
		var svg bytes.Buffer
		if err := figure.StateDiagram(&svg, st.Run.R, st.Run.Alphabet); err != nil {
			return nil, fmt.Errorf("states: figure: %w", err)
		}
		b, p := st.Body, st.Params
		g := func(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }
		return &Section{JSON: js, Cautions: b.Cautions, Summary: [][2]string{
			{"stream", fmt.Sprintf("%d symbols over %q from the symbols stage (in memory)", st.Input.Samples, p.Alphabet)},
			{"states", fmt.Sprintf("%d recurrent (%d transient removed)", b.States, b.TransientRemoved)},
			{"statistical complexity Cμ", g(b.StatisticalComplexity) + " bits"},
			{"entropy rate hμ", g(b.EntropyRate) + " bits/symbol"},
			{"history length", fmt.Sprintf("L = %d (%s)", b.HistoryLength, b.LengthRule)},
			{"significance", fmt.Sprintf("α = %g (χ² homogeneity test)", b.Significance)},
			{"method", "causal-state splitting reconstruction (Shalizi & Klinkner 2004); Cμ = H[π] (Crutchfield & Young 1989)"},
		}, Figures: []Figure{{Name: "states",
			Caption: "The causal states (circles sized by probability) and their transitions, each arrow labelled \"symbol | probability\".",
			svg:     svg.Bytes()}}}, nil
	}}
}
