#!/usr/bin/env bash
# unfold-array.sh — run `unfold batch` (or `unfold sweep`) as a Slurm job array, with a
# dependent merge job.
#
#   deploy/slurm/unfold-array.sh -o /shared/out --shards 8 --threads 2 /shared/data/*.csv
#   deploy/slurm/unfold-array.sh -o /shared/out --shards 8 --list paths.txt --dry-run
#   deploy/slurm/unfold-array.sh -o /shared/sweep-out --shards 8 --sweep /shared/sweep/list.csv
#
# With --sweep LIST (a sweep's LIST: a CSV with a path column and the control parameter's
# column, as `unfold simulate --sweep` writes it) every task runs
# `unfold sweep LIST --shard K/N -o OUT` and the merge job `unfold sweep LIST --merge -o OUT`,
# which rebuilds OUT/sweep.csv and OUT/sweep.html (and prints the route in its log). The
# records are the LIST's paths (relative ones beside LIST); --parameter NAME goes to the tasks
# and to the merge. LIST is read for the sizes only as plain comma-separated cells (no quoted
# commas); unfold itself reads it as CSV.
#
# It writes, under OUT/slurm/:
#   inputs.txt      the inputs as absolute paths, one per line (every task reads the same list);
#   array.sbatch    the array job: --array=0-(N-1), one task per shard;
#   merge.sbatch    the merge job, submitted with --dependency=afterok:ARRAYJOB;
#   logs/           per-task output and error files (shard-ARRAYJOB_TASK.out/.err, merge-JOB.*).
# Then it submits both jobs and prints "array JOBID" and "merge JOBID" on stdout, or with
# --dry-run prints the two scripts and submits nothing (no Slurm needed).
#
# Index base: the Slurm array index is 0-based (--array=0-(N-1)) and unfold's --shard K/N is
# 1-based, so task SLURM_ARRAY_TASK_ID runs --shard $((SLURM_ARRAY_TASK_ID+1))/N.
#
# Resources per task:
#   --cpus-per-task = JOBS x THREADS (unfold batch --jobs JOBS --threads THREADS; by default
#                     JOBS = 1, so it equals --threads);
#   --mem           = 256 MiB + JOBS x 64 x (size of the largest input in bytes), rounded up to
#                     whole MiB; a .gz input counts 8 times its size. Override with --mem.
#   Measured (unfold lyapunov, fractal and regime on 10^5 Lorenz samples, a 6.5 MB CSV, one
#   thread): at most 45 MiB, about 450 bytes per sample with the Go runtime. The factor 64
#   covers text (about 65 bytes per sample) with a wide margin and float64 files (8 bytes per
#   sample); for float32, raw f32le or 16-bit WAV inputs give --mem, about
#   256 MiB + JOBS x 0.5 KiB x samples.
#
# Resume: unfold batch skips inputs whose result is complete and whose SHA-256 is unchanged,
# so running this again with the same OUT after a failed or cancelled task finishes only the
# missing inputs; the shard slices are stable (path order), so each task finds its own.
set -euo pipefail

usage() {
  cat <<'USAGE'
usage: unfold-array.sh -o OUT [options] (FILE... | --list FILE | --sweep LIST)

  -o, --out DIR        unfold batch output folder (on a file system every node sees)
  -n, --shards N       array size = shard count (default 4; at most the number of inputs)
      --threads T      threads per input (default 1)
      --jobs J         inputs in parallel per task (default 1); --cpus-per-task = J x T
      --mem SIZE       memory per task (Slurm syntax, e.g. 4G); default from the input size
      --time LIMIT     time limit per task (Slurm syntax, e.g. 2:00:00)
      --partition P    Slurm partition
      --account A      Slurm account
      --unfold PATH    the unfold binary (default: unfold on PATH)
      --list FILE      read input paths from FILE, one per line
      --sweep LIST     run `unfold sweep LIST` per task and `unfold sweep LIST --merge` at the end
      --parameter NAME with --sweep: the LIST column of the control parameter
      --dry-run        write and print the scripts, submit nothing (needs no Slurm)
      --wait           submit, then wait until the merge job has ended (sbatch --wait)
  -- ARGS...           further arguments for every `unfold batch`/`unfold sweep` task (e.g. --seed 7)
USAGE
}

die() { echo "unfold-array.sh: $*" >&2; exit 2; }
abspath() { case "$1" in /*) printf '%s\n' "$1" ;; *) printf '%s/%s\n' "$(pwd)" "$1" ;; esac; }
posint() { [[ "$2" =~ ^[1-9][0-9]*$ ]] || die "$1 must be a positive integer, got '$2'"; }

out="" shards=4 threads=1 jobs=1 mem="" timelimit="" partition="" account=""
unfold_bin="" list="" sweep="" parameter="" dry=0 wait=0
inputs=() extra=()
while [ $# -gt 0 ]; do
  case "$1" in
    -o|--out) out=${2?}; shift 2 ;;
    -n|--shards) shards=${2?}; shift 2 ;;
    --threads) threads=${2?}; shift 2 ;;
    --jobs) jobs=${2?}; shift 2 ;;
    --mem) mem=${2?}; shift 2 ;;
    --time) timelimit=${2?}; shift 2 ;;
    --partition) partition=${2?}; shift 2 ;;
    --account) account=${2?}; shift 2 ;;
    --unfold) unfold_bin=${2?}; shift 2 ;;
    --list) list=${2?}; shift 2 ;;
    --sweep) sweep=${2?}; shift 2 ;;
    --parameter) parameter=${2?}; shift 2 ;;
    --dry-run) dry=1; shift ;;
    --wait) wait=1; shift ;;
    -h|--help) usage; exit 0 ;;
    --) shift; extra=("$@"); break ;;
    -*) die "unknown option $1 (see --help)" ;;
    *) inputs+=("$1"); shift ;;
  esac
done

[ -n "$out" ] || { usage >&2; die "missing -o OUT"; }
posint --shards "$shards"; posint --threads "$threads"; posint --jobs "$jobs"
if [ -n "$mem" ] && ! [[ "$mem" =~ ^[0-9]+[KMGT]?$ ]]; then die "--mem must look like 4096M or 4G, got '$mem'"; fi
if [ -n "$list" ]; then
  [ -r "$list" ] || die "--list $list: cannot read it"
  while IFS= read -r line || [ -n "$line" ]; do
    line=${line%$'\r'}
    case "$line" in ''|'#'*) continue ;; esac
    inputs+=("$line")
  done <"$list"
fi
if [ -n "$sweep" ]; then
  [ -z "$list" ] && [ ${#inputs[@]} -eq 0 ] || die "--sweep LIST takes its records from LIST: give no files or --list"
  [ -r "$sweep" ] || die "--sweep $sweep: cannot read it"
  sweep=$(abspath "$sweep")
  # The path column of the header (case-insensitive), then that cell of every record line.
  pathcol=0 lineno=0
  while IFS= read -r line || [ -n "$line" ]; do
    lineno=$((lineno + 1))
    line=${line%$'\r'}
    case "$line" in ''|'#'*) continue ;; esac
    IFS=, read -r -a cells <<<"$line"
    if [ "$pathcol" = 0 ]; then
      for i in "${!cells[@]}"; do
        c=${cells[$i]//[[:space:]\"]/}
        [ "${c,,}" = path ] && pathcol=$((i + 1))
      done
      [ "$pathcol" != 0 ] || die "--sweep $sweep:$lineno: no column named path in the header"
      continue
    fi
    p=${cells[$((pathcol - 1))]:-}
    p=${p#"${p%%[![:space:]]*}"}; p=${p%"${p##*[![:space:]]}"}; p=${p#\"}; p=${p%\"}
    [ -n "$p" ] || die "--sweep $sweep:$lineno: empty path"
    case "$p" in /*) ;; *) p="$(dirname "$sweep")/$p" ;; esac
    inputs+=("$p")
  done <"$sweep"
  [ -z "$parameter" ] || [[ "$parameter" =~ ^[^[:space:]]+$ ]] || die "--parameter '$parameter': a column name without white space"
elif [ -n "$parameter" ]; then
  die "--parameter goes with --sweep LIST"
fi
[ ${#inputs[@]} -gt 0 ] || die "no inputs: give files, directories, --list FILE or --sweep LIST"

if [ -z "$unfold_bin" ]; then unfold_bin=$(command -v unfold || true); fi
[ -n "$unfold_bin" ] || die "unfold is not on PATH; give --unfold PATH"
unfold_bin=$(abspath "$unfold_bin")
[ -x "$unfold_bin" ] || die "--unfold $unfold_bin is not an executable file"

# Inputs as absolute paths; the largest file decides the memory.
abs=() largest=0
for p in "${inputs[@]}"; do
  case "$p" in *$'\n'*) die "input path with a newline: not supported" ;; esac
  [ -e "$p" ] || die "input $p: no such file or directory"
  a=$(abspath "$p"); abs+=("$a")
  while IFS= read -r -d '' f; do
    s=$(stat -c %s "$f")
    case "$f" in *.gz) s=$((s * 8)) ;; esac
    [ "$s" -gt "$largest" ] && largest=$s
  done < <(find "$a" -type f -print0)
done
[ "$shards" -le ${#abs[@]} ] || shards=${#abs[@]}
cpus=$((jobs * threads))
if [ -z "$mem" ]; then
  mib=$(( (256 * 1048576 + jobs * 64 * largest + 1048575) / 1048576 ))
  mem="${mib}M"
fi

out=$(abspath "$out")
case "$out" in *[[:space:]]*) die "-o $out: a path with white space cannot go on #SBATCH lines; choose another" ;; esac
dir="$out/slurm"
mkdir -p "$dir/logs"
printf '%s\n' "${abs[@]}" >"$dir/inputs.txt.tmp"
mv "$dir/inputs.txt.tmp" "$dir/inputs.txt"

q() { printf '%q' "$1"; }
extra_q=""
for e in "${extra[@]+"${extra[@]}"}"; do extra_q+=" $(q "$e")"; done
# What each task and the merge job run.
if [ -n "$sweep" ]; then
  cmdname=sweep
  param_q=""
  [ -z "$parameter" ] || param_q=" --parameter $(q "$parameter")"
  task_cmd="sweep $(q "$sweep") -o $(q "$out")$param_q"
  merge_cmd="sweep $(q "$sweep") --merge -o $(q "$out")$param_q"
  merge_what="$out/sweep.csv and $out/sweep.html"
  merge_mem=$mem # the merge reads every record again (for the diagram and the spectral lines)
else
  cmdname=batch
  task_cmd="batch --list $(q "$dir/inputs.txt") -o $(q "$out")"
  merge_cmd="batch --merge $(q "$out")"
  merge_what="$out/summary.csv"
  merge_mem=256M
fi
opt_lines() {
  [ -z "$timelimit" ] || echo "#SBATCH --time=$timelimit"
  [ -z "$partition" ] || echo "#SBATCH --partition=$partition"
  [ -z "$account" ] || echo "#SBATCH --account=$account"
}

{
  cat <<HEAD
#!/bin/bash
# unfold $cmdname as a Slurm job array: ${#abs[@]} inputs in $shards shards (written by unfold-array.sh).
# The array index is 0-based (--array=0-$((shards - 1))) and unfold's --shard K/N is 1-based:
# task SLURM_ARRAY_TASK_ID runs shard SLURM_ARRAY_TASK_ID+1 of $shards.
# Memory: 256 MiB + $jobs x 64 x $largest bytes (largest input). CPUs: --jobs $jobs x --threads $threads.
#SBATCH --job-name=unfold-$cmdname
#SBATCH --array=0-$((shards - 1))
#SBATCH --cpus-per-task=$cpus
#SBATCH --mem=$mem
#SBATCH --output=$dir/logs/shard-%A_%a.out
#SBATCH --error=$dir/logs/shard-%A_%a.err
HEAD
  opt_lines
  cat <<BODY
set -euo pipefail
# The shard count is written here, not read from SLURM_ARRAY_TASK_COUNT, so that re-submitting
# part of the array (sbatch --array=2 array.sbatch) keeps the same slices.
shards=$shards
if [ "\${SLURM_ARRAY_TASK_ID:-x}" = x ] || [ "\$SLURM_ARRAY_TASK_ID" -ge "\$shards" ]; then
  echo "array.sbatch: SLURM_ARRAY_TASK_ID must be 0..\$((shards - 1)), got '\${SLURM_ARRAY_TASK_ID:-}'" >&2
  exit 2
fi
exec $(q "$unfold_bin") $task_cmd \\
  --jobs $jobs --threads $threads --shard "\$((SLURM_ARRAY_TASK_ID + 1))/\$shards"$extra_q
BODY
} >"$dir/array.sbatch.tmp"
mv "$dir/array.sbatch.tmp" "$dir/array.sbatch"

{
  cat <<HEAD
#!/bin/bash
# Rebuilds $merge_what from the per-input results once every array task has succeeded
# (submitted with --dependency=afterok:ARRAYJOB).
#SBATCH --job-name=unfold-merge
#SBATCH --cpus-per-task=1
#SBATCH --mem=$merge_mem
#SBATCH --output=$dir/logs/merge-%j.out
#SBATCH --error=$dir/logs/merge-%j.err
HEAD
  opt_lines
  cat <<BODY
set -euo pipefail
exec $(q "$unfold_bin") $merge_cmd
BODY
} >"$dir/merge.sbatch.tmp"
mv "$dir/merge.sbatch.tmp" "$dir/merge.sbatch"

if [ "$dry" = 1 ]; then
  echo "# --- $dir/array.sbatch"
  cat "$dir/array.sbatch"
  echo "# --- $dir/merge.sbatch (submitted with --dependency=afterok:ARRAYJOB --kill-on-invalid-dep=yes)"
  cat "$dir/merge.sbatch"
  exit 0
fi

command -v sbatch >/dev/null 2>&1 || die "sbatch is not on PATH (use --dry-run to only write the scripts)"
arrayid=$(sbatch --parsable "$dir/array.sbatch")
arrayid=${arrayid%%;*}
[[ "$arrayid" =~ ^[0-9]+$ ]] || die "sbatch gave no job id for the array: '$arrayid'"
echo "array $arrayid"
echo "submitted array job $arrayid ($shards tasks); logs in $dir/logs" >&2
if [ "$wait" = 1 ]; then
  # sbatch --wait exits with the merge job's exit status (non-zero when it failed or was
  # cancelled because an array task failed).
  sbatch --wait --parsable --dependency="afterok:$arrayid" --kill-on-invalid-dep=yes "$dir/merge.sbatch" |
    sed -u 's/^\([0-9]*\).*/merge \1/'
  exit 0
fi
mergeid=$(sbatch --parsable --dependency="afterok:$arrayid" --kill-on-invalid-dep=yes "$dir/merge.sbatch")
mergeid=${mergeid%%;*}
echo "merge $mergeid"
echo "submitted merge job $mergeid after array job $arrayid; it writes $merge_what" >&2
