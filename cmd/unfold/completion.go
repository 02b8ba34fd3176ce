package main

import (
	"github.com/spf13/cobra"
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
