// Package slurm holds no library code: it is the home of the tests of unfold's Slurm
// deployment (the array-script generator unfold-slurm.sh beside it and its run on a real
// single-node Slurm, driven by test.sh). It exists so that `go test ./...` runs the
// generator's dry-run test and skips the scheduler test with a message where no Slurm is up.
package slurm
