// Command unfold is the command line of the unfold toolkit: from one measured signal to a
// reconstructed state space, a regime verdict with its evidence, and symbol streams.
//
// Run `unfold --help` for the commands and `unfold COMMAND --help` for worked examples.
package main

import "os"

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}
