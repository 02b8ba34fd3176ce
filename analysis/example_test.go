package analysis_test

import (
	"context"
	"fmt"

	"unfold/analysis"
	"unfold/series"
)

// The whole chain on 3000 iterates of the Hénon map (a = 1.4, b = 0.3; Hénon 1976): every
// stage runs with the defaults of `unfold report`, on one embedding choice.
func ExampleRun() {
	x := make([]float64, 3000)
	u, v := 0.1, 0.1
	for i := -100; i < len(x); i++ { // 100 iterates of transient
		u, v = 1-1.4*u*u+v, 0.3*u
		if i >= 0 {
			x[i] = u
		}
	}
	s := &series.Series{Values: x, Dt: 1, Name: "x"}
	res, err := analysis.Run(context.Background(), s, analysis.Options{Threads: 2})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("lag", res.Embedding.Lag.Value, "by", res.Embedding.Lag.Rule)
	fmt.Println("dimension", res.Embedding.Dim.Value)
	fmt.Println("Theiler window", res.Embedding.Theiler.Value, "by", res.Embedding.Theiler.Rule)
	fmt.Println("regime's D2 is the fractal stage's:", res.Regime.Analysis.Evidence.Dimension == res.Fractal.Run.R)
	for _, st := range res.Stages[:3] {
		fmt.Println(st.Key, st.Status)
	}
	// Output:
	// lag 1 by decorrelated-within-one-sample-lag-1
	// dimension 2
	// Theiler window 1 by autocorrelation-1/e-decay
	// regime's D2 is the fractal stage's: true
	// inspect ok
	// lag ok
	// dim ok
}
