// Package analysis is the whole chain of unfold as a library: Run reads nothing and writes
// nothing; it takes one record (a *series.Series) and runs the stages of `unfold report` —
// inspect, lag, dim, embed, lyapunov, fractal, regime, symbols, entropy — each with the
// defaults of its single command, and returns a typed Result.
//
// The lag, the embedding dimension and the Theiler window are chosen once per record
// (embed.Choose) and handed to every estimator; regime takes λ1 from the lyapunov stage and D2
// from the fractal stage instead of estimating its own. A stage that gives no answer is
// recorded with its reason (Result.Stages) and the chain goes on where it can.
//
// Each stage is also a method of Env (Env.Lag, Env.Dim, Env.Embed, Env.Lyapunov, Env.Fractal,
// Env.Regime, Env.Section, Env.Symbols, Env.Entropy, Env.Inspect) returning the stage's JSON
// parameters and body: the command line prints exactly these with --json, and
// json.Marshal(result) gives the same objects under the stage keys, so result.json, the single
// commands and a Go program agree.
//
// The package exists because the chain had no home below the command line (DESIGN.md §2: it
// sits above the estimator packages and below figure, report and cmd).
package analysis
