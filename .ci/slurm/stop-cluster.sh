#!/usr/bin/env bash
# Stops the daemons .ci/slurm/start-cluster.sh started, by the pids it recorded (slurmd, slurmctld,
# then munged), and nothing else. Safe to run when nothing is running.
set -uo pipefail

STATE=${OPGROWTH_SLURM_STATE:-/var/tmp/opgrowth-slurm}
say() { echo "stop-cluster: $*" >&2; }

if [ ! -f "$STATE/pids" ]; then say "no cluster recorded in $STATE"; exit 0; fi

# Reverse start order: compute daemon, controller, then authentication.
for name in slurmd slurmctld munged; do
  pid=$(awk -v n="$name" '$1 == n { print $2 }' "$STATE/pids")
  [ -n "$pid" ] || continue
  if kill -0 "$pid" 2>/dev/null; then
    kill -TERM "$pid"
    for _ in $(seq 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
    if kill -0 "$pid" 2>/dev/null; then say "$name ($pid) ignored TERM: sending KILL"; kill -KILL "$pid"; fi
    say "stopped $name ($pid)"
  fi
done
rm -f "$STATE/pids"
exit 0
