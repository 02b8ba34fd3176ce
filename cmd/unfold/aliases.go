package main

import (
	"fmt"
	"io"
	"strconv"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/analysis"
)

// One vocabulary: every command names a concept with one flag (--norm, --surrogates, --lag,
// --max-dim). The older spellings stay for one release as hidden, deprecated aliases: both
// names set the same variable, pflag prints "Flag --old has been deprecated, use --new" on
// stderr, and giving both names is a usage error (checkAliases).

// aliasOf is the flag annotation that names the flag an alias stands for.
const aliasOf = "unfold-alias-of"

// aliasFlag defines old on f as a hidden, deprecated spelling of the flag newName (already
// defined on f), sharing its value.
func aliasFlag(f *pflag.FlagSet, old, newName string) {
	nf := f.Lookup(newName)
	addAlias(f, &pflag.Flag{Name: old, Usage: nf.Usage, Value: nf.Value, DefValue: nf.DefValue, NoOptDefVal: nf.NoOptDefVal}, newName)
}

func addAlias(f *pflag.FlagSet, fl *pflag.Flag, newName string) {
	fl.Annotations = map[string][]string{aliasOf: {newName}}
	f.AddFlag(fl)
	_ = f.MarkDeprecated(fl.Name, "use --"+newName+" instead (the old name goes in the next release)")
}

// normValue is --norm euclidean|max; it also sets euclidean, the boolean the options carry.
type normValue struct {
	norm      string
	euclidean *bool
}

func (v *normValue) String() string { return v.norm }
func (v *normValue) Type() string   { return "string" }
func (v *normValue) Set(s string) error {
	n, err := analysis.ParseNorm(s)
	if err != nil {
		return fmt.Errorf("want euclidean or max")
	}
	v.norm, *v.euclidean = n.String(), s == "euclidean"
	return nil
}

// euclideanValue is the old boolean --euclidean, setting the same norm as --norm.
type euclideanValue struct{ n *normValue }

func (v euclideanValue) String() string { return strconv.FormatBool(*v.n.euclidean) }
func (v euclideanValue) Type() string   { return "bool" }
func (v euclideanValue) Set(s string) error {
	b, err := strconv.ParseBool(s)
	if err != nil {
		return err
	}
	if b {
		return v.n.Set("euclidean")
	}
	return v.n.Set("max")
}

// normFlag defines --norm euclidean|max bound to euclidean (its default from *euclidean) and
// the old --euclidean as its hidden alias.
func normFlag(f *pflag.FlagSet, euclidean *bool, usage string) {
	def := "max"
	if *euclidean {
		def = "euclidean"
	}
	v := &normValue{norm: def, euclidean: euclidean}
	f.Var(v, "norm", usage)
	addAlias(f, &pflag.Flag{Name: "euclidean", Usage: "use the Euclidean norm (old spelling of --norm euclidean)",
		Value: euclideanValue{v}, DefValue: "false", NoOptDefVal: "true"}, "norm")
}

// checkAliases refuses a command line that gives both an old and a new spelling of one flag.
func checkAliases(cmd *cobra.Command, _ []string) error {
	var err error
	cmd.Flags().VisitAll(func(f *pflag.Flag) {
		if to := f.Annotations[aliasOf]; f.Changed && len(to) == 1 && err == nil {
			if nf := cmd.Flags().Lookup(to[0]); nf != nil && nf.Changed {
				err = usagef("%s: --%s and --%s name the same setting: give --%s only", cmd.Name(), f.Name, to[0], to[0])
			}
		}
	})
	return err
}

// deprecationsTo sends pflag's deprecation notes of every command to w (stderr): cobra would
// print them on the command's output stream, which is stdout and must hold only the result.
func deprecationsTo(root *cobra.Command, w io.Writer) {
	var walk func(c *cobra.Command)
	walk = func(c *cobra.Command) {
		c.Flags().SetOutput(w)
		for _, s := range c.Commands() {
			walk(s)
		}
	}
	walk(root)
}
