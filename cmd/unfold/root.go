package main

import (
	"github.com/spf13/cobra"

	"unfold/analysis"
)

// newRootCmd builds the command tree. Each command lives in a file of its own and is added
// here, one line each.
func newRootCmd(a *app) *cobra.Command {
	root := &cobra.Command{
		Use:   "unfold",
		Short: "Nonlinear time-series analysis: from one measured signal to a state-space picture, a regime verdict and symbol streams",
		Long: `unfold turns one measured scalar signal into a reconstructed state space, decides with
published criteria and surrogate tests whether the motion is periodic, quasiperiodic, chaotic or
noise, and writes symbol streams for later complexity analysis.

Every automatic choice is printed and can be overridden by a flag. --json prints one JSON object
on stdout; messages go to stderr. Exit status: 0 success, 1 the analysis ran but could not give
an answer (the message says why), 2 bad usage or bad input (the message says what and where).`,
		Example: `  unfold simulate lorenz --n 20000 -o lorenz.csv
  unfold inspect lorenz.csv
  unfold inspect --json --column x lorenz.csv`,
		Version:       versionString(),
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetVersionTemplate("unfold {{.Version}}\n")
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return &usageError{err} })
	pf := root.PersistentFlags()
	pf.BoolVar(&a.global.JSON, "json", false, "print exactly one JSON object on stdout instead of a table")
	pf.BoolVarP(&a.global.Quiet, "quiet", "q", false, "print no messages or progress on stderr")
	pf.Uint64Var(&a.global.Seed, "seed", 1, "seed of every random step (recorded in JSON output)")
	pf.IntVar(&a.global.Threads, "threads", 0, "worker goroutines for parallel work, at least 1 (default: all cores)")
	root.PersistentPreRunE = func(cmd *cobra.Command, args []string) error {
		if cmd.Flags().Changed("threads") {
			if err := analysis.CheckThreads(a.global.Threads); err != nil {
				return err
			}
		}
		return checkAliases(cmd, args)
	}

	root.AddCommand(
		newInspectCmd(a),
		newSimulateCmd(a),
		newLagCmd(a),
		newDimCmd(a),
		newEmbedCmd(a),
		newLyapunovCmd(a),
		newFractalCmd(a),
		newNullsCmd(a),
		newRegimeCmd(a),
		newSectionCmd(a),
		newSymbolsCmd(a),
		newEntropyCmd(a),
		newReportCmd(a),
		newBatchCmd(a),
		newCompletionCmd(),
		newDenoiseCmd(a),
		newStatesCmd(a),
		newSweepCmd(a),
	)
	deprecationsTo(root, a.stderr)
	registerCompletions(root)
	return root
}

// exactArgs is cobra.ExactArgs with a usage error (exit status 2) that names the command.
func exactArgs(n int) cobra.PositionalArgs {
	return func(cmd *cobra.Command, args []string) error {
		if len(args) != n {
			if n == 1 {
				return usagef("%s: expected one input file (or - for standard input), got %d arguments; see unfold %s --help", cmd.Name(), len(args), cmd.Name())
			}
			return usagef("%s: expected %d arguments, got %d; see unfold %s --help", cmd.Name(), n, len(args), cmd.Name())
		}
		return nil
	}
}
