package main

import "github.com/spf13/pflag"

// batchFlags are the flags of the batch machinery that batch and sweep share.
type batchFlags struct {
	jobs        int
	shard       string
	retryErrors bool
}

// addBatchFlags binds --jobs, --shard and --retry-errors; items names what the command
// analyses ("inputs", "records") and sorted how its shards are cut from them.
func addBatchFlags(f *pflag.FlagSet, o *batchFlags, items, sorted string) {
	f.IntVar(&o.jobs, "jobs", 0, items+" analysed at the same time (default: cores / --threads, at least 1)")
	f.StringVar(&o.shard, "shard", "", "analyse only the K-th of N slices of "+sorted+", as K/N with K = 1 … N")
	f.BoolVar(&o.retryErrors, "retry-errors", false, "analyse again the "+items+" whose last result was an error")
}
