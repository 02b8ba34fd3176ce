package main

import (
	"strings"

	"github.com/spf13/cobra"

	"unfold/models"
	"unfold/series"
)

// newCompletionCmd is `unfold completion bash|zsh|fish`: cobra's generators, in a command of
// our own so that the script goes to the command's output stream and every shell has a worked
// example in its help (cobra's default command captures os.Stdout when it is made).
func newCompletionCmd() *cobra.Command {
	cmd := &cobra.Command{
		Use:   "completion bash|zsh|fish",
		Short: "Write the shell completion script for bash, zsh or fish",
		Long: `completion writes a script that lets the shell complete unfold's commands, flags and file
names. Load it in the current shell or save it where the shell looks for completions.`,
		Example: `  # bash, for this shell only and then for every new one
  source <(unfold completion bash)
  unfold completion bash > ~/.local/share/bash-completion/completions/unfold
  # zsh and fish
  unfold completion zsh > "${fpath[1]}/_unfold"
  unfold completion fish > ~/.config/fish/completions/unfold.fish`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return usagef("completion: name the shell: bash, zsh or fish; see unfold completion --help")
		},
	}
	shells := []struct {
		name, example string
		gen           func(c *cobra.Command) error
	}{
		{"bash", "  source <(unfold completion bash)", func(c *cobra.Command) error { return c.Root().GenBashCompletionV2(c.OutOrStdout(), true) }},
		{"zsh", `  unfold completion zsh > "${fpath[1]}/_unfold"`, func(c *cobra.Command) error { return c.Root().GenZshCompletion(c.OutOrStdout()) }},
		{"fish", "  unfold completion fish > ~/.config/fish/completions/unfold.fish", func(c *cobra.Command) error { return c.Root().GenFishCompletion(c.OutOrStdout(), true) }},
	}
	for _, sh := range shells {
		gen := sh.gen
		cmd.AddCommand(&cobra.Command{
			Use:     sh.name,
			Short:   "Write the completion script for " + sh.name,
			Example: sh.example,
			Args:    cobra.NoArgs,
			RunE:    func(c *cobra.Command, _ []string) error { return gen(c) },
		})
	}
	return cmd
}

// flagWords are the values a flag takes, for shell completion: by flag name for every command
// that has the flag, or by "command --flag" where commands give one name different values.
// They repeat the lists in the flags' help texts.
var flagWords = map[string][]string{
	"format":            {"csv", "npy", "f32le", "f64le", "wav"},
	"norm":              {"euclidean", "max"},
	"partition":         {"search", "critical", "quantile", "threshold"},
	"estimator":         {"grassberger", "miller-madow", "plugin"},
	"gaps":              {"drop", "linear"},
	"detrend":           {"none", "mean", "linear"},
	"mi":                {"hist", "ksg"},
	"direction":         {"up", "down", "both"},
	"interp":            {"linear", "cubic"},
	"nulls --method":    {"phase", "aaft", "iaaft"},
	"lyapunov --method": {"kantz", "rosenstein"},
	"denoise --method":  {"projective", "constant", "none"},
}

// registerCompletions adds value completion to every command of root: model names for
// simulate, the words of flagWords, and the column names of the FILE already on the command
// line for --column and --time-column (read from its header by series.Header).
func registerCompletions(root *cobra.Command) {
	var walk func(c *cobra.Command)
	walk = func(c *cobra.Command) {
		for name, words := range flagWords {
			cmdName, flag, scoped := strings.Cut(name, " --")
			if scoped && cmdName != c.Name() {
				continue
			}
			if !scoped {
				flag = name
			}
			if c.LocalFlags().Lookup(flag) == nil {
				continue
			}
			if _, ok := flagWords[c.Name()+" --"+flag]; ok && !scoped {
				continue
			}
			_ = c.RegisterFlagCompletionFunc(flag, cobra.FixedCompletions(words, cobra.ShellCompDirectiveNoFileComp))
		}
		for _, col := range []string{"column", "time-column"} {
			if c.LocalFlags().Lookup(col) != nil {
				_ = c.RegisterFlagCompletionFunc(col, completeColumns)
			}
		}
		for _, s := range c.Commands() {
			walk(s)
		}
	}
	walk(root)
	if sim, _, err := root.Find([]string{"simulate"}); err == nil && sim != root {
		sim.ValidArgsFunction = func(_ *cobra.Command, args []string, _ string) ([]cobra.Completion, cobra.ShellCompDirective) {
			if len(args) > 0 {
				return nil, cobra.ShellCompDirectiveNoFileComp
			}
			var names []cobra.Completion
			for _, s := range models.Catalog() {
				names = append(names, cobra.CompletionWithDesc(s.Name, s.Title))
			}
			return names, cobra.ShellCompDirectiveNoFileComp
		}
	}
}

// completeColumns lists the column names of the first FILE argument given (a file with a
// header line), or nothing.
func completeColumns(_ *cobra.Command, args []string, _ string) ([]cobra.Completion, cobra.ShellCompDirective) {
	for _, a := range args {
		if a == "-" {
			continue
		}
		names, err := series.Header(a)
		if err != nil {
			continue
		}
		var out []cobra.Completion
		for _, n := range names {
			if n != "" {
				out = append(out, n)
			}
		}
		return out, cobra.ShellCompDirectiveNoFileComp
	}
	return nil, cobra.ShellCompDirectiveNoFileComp
}
