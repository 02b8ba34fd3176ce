#!/usr/bin/env bash
# Integration test of unfold's Slurm deployment against a real single-node Slurm on this machine.
#
#   bash deploy/slurm/test.sh          # install (if needed), start, test, stop
#
# It installs the Debian packages slurmctld, slurmd, slurm-client and munge (without
# recommends, with a policy-rc.d that forbids the package scripts to start services), starts
# munged, slurmctld and slurmd by hand in foreground mode in the background with a one-node
# configuration under a temporary folder, keeps their PIDs, runs the Go integration test
# (deploy/slurm, UNFOLD_SLURM_TEST=1), waits for the job steps to end and stops exactly the
# daemons it started, by PID.
#
# Exit status: 0 when the test passed, or when Slurm could not be installed or started here
# (then it prints "SKIP: ..." and why); non-zero when Slurm was up and the test failed.
set -uo pipefail
cd "$(dirname "$0")/../.."
repo=$(pwd)

skip() { echo "SKIP: Slurm integration test: $*"; exit 0; }
t0=$(date +%s.%N)
elapsed() { awk -v a="$t0" -v b="$(date +%s.%N)" 'BEGIN{printf "%.1f", b-a}'; }

[ "$(id -u)" = 0 ] || skip "needs root to install and run the Slurm daemons (running as uid $(id -u))"

# --- install -------------------------------------------------------------------------------
need_install() {
  for b in slurmctld slurmd sbatch scontrol munged setpriv; do
    command -v "$b" >/dev/null 2>&1 || return 0
  done
  return 1
}
if need_install; then
  command -v apt-get >/dev/null 2>&1 || skip "Slurm is not installed and there is no apt-get"
  # Forbid the package scripts to start services; restore what was there afterwards.
  prc=/usr/sbin/policy-rc.d; saved=""
  if [ -e "$prc" ]; then saved=$(mktemp); cp -p "$prc" "$saved"; fi
  printf '#!/bin/sh\n# written by unfold deploy/slurm/test.sh: no service starts during install\nexit 101\n' >"$prc"
  chmod 755 "$prc"
  log=$(mktemp)
  inst() {
    DEBIAN_FRONTEND=noninteractive timeout 300 apt-get install -y -q --no-install-recommends \
      -o Dpkg::Use-Pty=0 -o DPkg::Lock::Timeout=60 slurmctld slurmd slurm-client munge >>"$log" 2>&1
  }
  ok=0
  if inst; then ok=1
  else
    echo "apt-get install failed; running apt-get update and trying once more" >&2
    DEBIAN_FRONTEND=noninteractive timeout 300 apt-get update -q >>"$log" 2>&1 && inst && ok=1
  fi
  if [ -n "$saved" ]; then cp -p "$saved" "$prc"; rm -f "$saved"; else rm -f "$prc"; fi
  if [ "$ok" != 1 ]; then
    tail -n 15 "$log" | sed 's/^/  apt: /'
    rm -f "$log"
    skip "could not install slurmctld slurmd slurm-client munge from Debian (apt output above)"
  fi
  rm -f "$log"
  echo "installed Slurm and munge in $(elapsed) s"
fi
command -v go >/dev/null 2>&1 || skip "go is not on PATH"

# --- configure and start -------------------------------------------------------------------
work=$(mktemp -d /tmp/unfold-slurm.XXXXXX)
chmod 755 "$work"
mkdir -p "$work/munge" "$work/state" "$work/spool" "$work/jobs"
chown munge:munge "$work/munge"; chmod 755 "$work/munge"
chmod 1777 "$work/jobs"

pids=()
stop_all() {
  # Job steps (slurmstepd) linger a moment after a job ends; let them finish first.
  if [ -n "${SLURM_CONF:-}" ]; then
    for _ in $(seq 1 50); do
      [ -z "$(squeue -h 2>/dev/null)" ] && break
      sleep 0.2
    done
  fi
  for _ in $(seq 1 50); do
    ps -eo comm= | grep -qx slurmstepd || break
    sleep 0.2
  done
  # Stop in reverse order of start, only the PIDs we started.
  for ((i=${#pids[@]}-1; i>=0; i--)); do
    kill -TERM "${pids[i]}" 2>/dev/null
    for _ in $(seq 1 50); do kill -0 "${pids[i]}" 2>/dev/null || break; sleep 0.1; done
    kill -KILL "${pids[i]}" 2>/dev/null
    wait "${pids[i]}" 2>/dev/null
  done
  pids=()
}
cleanup() {
  stop_all
  if [ -n "${UNFOLD_SLURM_KEEP:-}" ]; then echo "kept $work"; else rm -rf "$work"; fi
}
trap cleanup EXIT
trap 'exit 130' INT TERM

show_logs() {
  for f in "$work"/munge/munged.log "$work"/slurmctld.log "$work"/slurmd.log; do
    [ -f "$f" ] && { echo "--- $f"; tail -n 20 "$f"; }
  done
}

node=$(hostname -s)
cpus=$(nproc)
mem=$(slurmd -C 2>/dev/null | sed -n 's/.*RealMemory=\([0-9]*\).*/\1/p')
mem=${mem:-1024}
ctlport=${UNFOLD_SLURMCTLD_PORT:-16817}
dport=${UNFOLD_SLURMD_PORT:-16818}
sock="$work/munge/munge.socket.2"

cat >"$work/slurm.conf" <<CONF
# One-node Slurm for unfold's integration test (written by deploy/slurm/test.sh).
ClusterName=unfoldtest
SlurmctldHost=$node(127.0.0.1)
SlurmctldPort=$ctlport
SlurmdPort=$dport
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$sock
StateSaveLocation=$work/state
SlurmdSpoolDir=$work/spool
SlurmctldPidFile=$work/slurmctld.pid
SlurmdPidFile=$work/slurmd.pid
SlurmctldLogFile=$work/slurmctld.log
SlurmdLogFile=$work/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
MpiDefault=none
SchedulerType=sched/backfill
SchedulerParameters=batch_sched_delay=0
SelectType=select/cons_tres
SelectTypeParameters=CR_Core_Memory
DefMemPerCPU=256
ReturnToService=2
MinJobAge=600
NodeName=$node NodeAddr=127.0.0.1 CPUs=$cpus RealMemory=$mem State=UNKNOWN
PartitionName=test Nodes=$node Default=YES MaxTime=INFINITE State=UP
CONF
export SLURM_CONF="$work/slurm.conf"

setpriv --reuid=munge --regid=munge --init-groups \
  munged --foreground --socket="$sock" --log-file="$work/munge/munged.log" \
  --pid-file="$work/munge/munged.pid" --seed-file="$work/munge/munged.seed" \
  >"$work/munged.out" 2>&1 &
pids+=($!)
for _ in $(seq 1 50); do [ -S "$sock" ] && break; sleep 0.1; done
[ -S "$sock" ] || { cat "$work/munged.out"; show_logs; skip "munged did not start"; }

slurmctld -D -i >"$work/slurmctld.out" 2>&1 &
pids+=($!)
slurmd -D -N "$node" >"$work/slurmd.out" 2>&1 &
pids+=($!)

up=0
for _ in $(seq 1 150); do
  state=$(sinfo -h -N -o '%T' 2>/dev/null | head -n1)
  case "$state" in idle*|mixed*|allocated*) up=1; break ;; esac
  sleep 0.2
done
if [ "$up" != 1 ]; then
  cat "$work/slurmctld.out" "$work/slurmd.out"; show_logs
  skip "slurmctld/slurmd did not bring node $node up within 30 s (last state: ${state:-none})"
fi
echo "Slurm up (node $node, $cpus CPUs, ${mem} MB) $(elapsed) s after start"

# --- the test -------------------------------------------------------------------------------
if [ -n "${UNFOLD_SLURM_UP_ONLY:-}" ]; then
  echo "UNFOLD_SLURM_UP_ONLY set: Slurm is up; SLURM_CONF=$SLURM_CONF; press Ctrl-C to stop"
  wait "${pids[0]}"; exit 0
fi
tstart=$(date +%s.%N)
UNFOLD_SLURM_TEST=1 UNFOLD_SLURM_WORK="$work/jobs" go test -count=1 -timeout 5m -v -run 'Slurm' ./deploy/slurm/ 2>&1
rc=$?
echo "Slurm integration test: go test exit $rc, $(awk -v a="$tstart" -v b="$(date +%s.%N)" 'BEGIN{printf "%.1f", b-a}') s (total with install and start $(elapsed) s)"
[ $rc = 0 ] || { show_logs; }
exit $rc
