#!/usr/bin/env bash
# Starts a single-node Slurm cluster on the loopback interface, for the Slurm job-array test.
# Needs root. Installs Slurm and MUNGE from the distribution's packages when missing
# (apt-get update once, then apt-get install -y slurm-wlm munge), writes a one-node slurm.conf,
# starts munged, slurmctld and slurmd, and waits until the node accepts jobs.
# Idempotent: a cluster this script started and that is still running is left as it is.
# Daemon pids go to $STATE/pids; .ci/slurm/stop-cluster.sh stops exactly those.
set -euo pipefail

STATE=${OPGROWTH_SLURM_STATE:-/var/tmp/opgrowth-slurm}
CONF=/etc/slurm/slurm.conf
MARK="# opgrowth single-node test cluster"

say() { echo "start-cluster: $*" >&2; }

if [ "$(id -u)" -ne 0 ]; then say "needs root (installs packages, starts daemons)"; exit 1; fi

alive() { [ -n "${1:-}" ] && kill -0 "$1" 2>/dev/null; }

# Already running (started by us)?
if [ -f "$STATE/pids" ]; then
  all=1
  while read -r name pid; do alive "$pid" || all=0; done < "$STATE/pids"
  if [ "$all" = 1 ] && sinfo -h -o %T 2>/dev/null | grep -qxE '(idle|mixed|allocated)'; then
    say "cluster already running"; exit 0
  fi
  say "stale state from an earlier run: stopping what is left"
  "$(dirname "$0")/stop-cluster.sh" || true
fi

# Packages.
if ! command -v slurmctld >/dev/null || ! command -v sbatch >/dev/null || ! [ -x /usr/sbin/munged ]; then
  say "installing slurm-wlm and munge"
  export DEBIAN_FRONTEND=noninteractive
  # Keep the package scripts from starting daemons of their own: we start (and stop) ours by pid.
  policy=/usr/sbin/policy-rc.d
  own_policy=0
  if [ ! -e "$policy" ]; then printf '#!/bin/sh\nexit 101\n' > "$policy"; chmod +x "$policy"; own_policy=1; fi
  apt-get update -q
  apt-get install -y -q --no-install-recommends slurm-wlm munge
  [ "$own_policy" = 1 ] && rm -f "$policy"
fi

mkdir -p "$STATE/ctld" "$STATE/spool"
: > "$STATE/pids"

# MUNGE: key, runtime folders, daemon as the munge user.
install -d -o munge -g munge -m 0700 /etc/munge /var/lib/munge /var/log/munge
install -d -o munge -g munge -m 0755 /run/munge
if [ ! -s /etc/munge/munge.key ]; then
  if command -v mungekey >/dev/null; then runuser -u munge -- mungekey --create --keyfile=/etc/munge/munge.key
  else dd if=/dev/urandom of=/etc/munge/munge.key bs=1024 count=1 status=none; fi
fi
chown munge:munge /etc/munge/munge.key
chmod 0400 /etc/munge/munge.key
if ! munge -n 2>/dev/null | unmunge >/dev/null 2>&1; then
  rm -f /run/munge/munged.pid
  runuser -u munge -- /usr/sbin/munged
  for _ in $(seq 50); do [ -s /run/munge/munged.pid ] && break; sleep 0.1; done
  echo "munged $(cat /run/munge/munged.pid)" >> "$STATE/pids"
else
  say "munged already running (not started here, will not be stopped here)"
fi
munge -n | unmunge >/dev/null || { say "munged does not answer"; exit 1; }

# slurm.conf for one node on loopback. Never overwrite a configuration this script did not write.
if [ -f "$CONF" ] && ! head -n 1 "$CONF" | grep -qF "$MARK"; then
  say "$CONF exists and was not written by this script: not touching a real cluster's configuration"; exit 1
fi
host=$(hostname -s)
cpus=$(nproc)
mem_mb=$(awk '/MemTotal/ { printf "%d", $2 / 1024 * 0.9 }' /proc/meminfo)
mkdir -p /etc/slurm
cat > "$CONF" <<EOF
$MARK (written by .ci/slurm/start-cluster.sh; stop with stop-cluster.sh)
ClusterName=opgrowth-test
SlurmctldHost=${host}(127.0.0.1)
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
StateSaveLocation=$STATE/ctld
SlurmdSpoolDir=$STATE/spool
SlurmctldPidFile=$STATE/slurmctld.pid
SlurmdPidFile=$STATE/slurmd.pid
SlurmctldLogFile=$STATE/slurmctld.log
SlurmdLogFile=$STATE/slurmd.log
SlurmctldPort=6817
SlurmdPort=6818
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SchedulerType=sched/backfill
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
MpiDefault=none
MailProg=/bin/true
ReturnToService=2
SchedulerParameters=sched_interval=1
MinJobAge=60
NodeName=localhost NodeAddr=127.0.0.1 CPUs=$cpus RealMemory=$mem_mb State=UNKNOWN
PartitionName=debug Nodes=localhost Default=YES MaxTime=INFINITE State=UP
EOF

slurmctld
for _ in $(seq 100); do [ -s "$STATE/slurmctld.pid" ] && break; sleep 0.1; done
echo "slurmctld $(cat "$STATE/slurmctld.pid")" >> "$STATE/pids"
slurmd -N localhost
for _ in $(seq 100); do [ -s "$STATE/slurmd.pid" ] && break; sleep 0.1; done
echo "slurmd $(cat "$STATE/slurmd.pid")" >> "$STATE/pids"

# Wait for the node to come up (a few tenths of a second usually).
for i in $(seq 150); do
  state=$(sinfo -h -n localhost -o %T 2>/dev/null || true)
  case "$state" in
    idle|mixed|allocated) say "cluster up: node localhost $state, $cpus CPUs, ${mem_mb} MB (pids in $STATE/pids)"; exit 0 ;;
    down*|drain*) scontrol update nodename=localhost state=resume >/dev/null 2>&1 || true ;;
  esac
  sleep 0.2
done
say "node did not become idle; see $STATE/slurmctld.log and $STATE/slurmd.log"
exit 1
