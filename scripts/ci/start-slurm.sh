#!/usr/bin/env bash
# Starts a one-node SLURM cluster on this machine, as root and without systemd, from Debian's
# slurm-wlm and munge packages (installed here when missing): munged runs as the munge user, the
# machine's hostname is both controller and only node, and state and spool folders live under
# /var/spool. Idempotent: daemons already running are left alone. Ends once `sinfo` shows the node
# idle. The tests of `headroom measure --on slurm` use this cluster (test/cluster/slurm.test.ts).
set -euo pipefail

if [ "$(id -u)" != 0 ]; then
  echo "start-slurm.sh: must run as root" >&2
  exit 1
fi
export DEBIAN_FRONTEND=noninteractive
if ! command -v slurmctld >/dev/null || ! command -v slurmd >/dev/null || ! command -v munged >/dev/null ||
  ! command -v sbatch >/dev/null; then
  apt-get update -qq
  apt-get install -y -qq --no-install-recommends slurm-wlm munge >/dev/null
fi

host="$(hostname -s)"
cpus="$(nproc)"
memory_mb="$(awk '/MemTotal/ { print int($2 / 1024 * 0.9) }' /proc/meminfo)"

# munge: a key, folders owned by the munge user, the daemon started as that user.
mkdir -p /etc/munge /var/lib/munge /var/log/munge /run/munge
if [ ! -s /etc/munge/munge.key ]; then
  dd if=/dev/urandom of=/etc/munge/munge.key bs=1024 count=1 status=none
fi
chown -R munge:munge /etc/munge /var/lib/munge /var/log/munge /run/munge
chmod 0700 /etc/munge /var/lib/munge /var/log/munge
chmod 0755 /run/munge
chmod 0400 /etc/munge/munge.key
if ! munge -n 2>/dev/null | unmunge >/dev/null 2>&1; then
  su -s /bin/sh munge -c /usr/sbin/munged
  for _ in $(seq 50); do munge -n 2>/dev/null | unmunge >/dev/null 2>&1 && break; sleep 0.2; done
fi

mkdir -p /etc/slurm /var/spool/slurmctld /var/spool/slurmd /var/log/slurm
conf=/etc/slurm/slurm.conf
want="$(cat <<CONF
# Written by headroom's scripts/ci/start-slurm.sh: a one-node cluster for tests.
ClusterName=headroom-ci
SlurmctldHost=${host}
SlurmUser=root
AuthType=auth/munge
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
SchedulerType=sched/backfill
StateSaveLocation=/var/spool/slurmctld
SlurmdSpoolDir=/var/spool/slurmd
SlurmctldPidFile=/var/spool/slurmctld/slurmctld.pid
SlurmdPidFile=/var/spool/slurmd/slurmd.pid
SlurmctldLogFile=/var/log/slurm/slurmctld.log
SlurmdLogFile=/var/log/slurm/slurmd.log
ReturnToService=2
MpiDefault=none
NodeName=${host} CPUs=${cpus} RealMemory=${memory_mb} State=UNKNOWN
PartitionName=debug Nodes=${host} Default=YES MaxTime=INFINITE State=UP
CONF
)"
if [ ! -f "$conf" ] || [ "$(cat "$conf")" != "$want" ]; then
  printf '%s\n' "$want" >"$conf"
  # A changed configuration needs the daemons restarted.
  for pidfile in /var/spool/slurmd/slurmd.pid /var/spool/slurmctld/slurmctld.pid; do
    [ -s "$pidfile" ] && kill "$(cat "$pidfile")" 2>/dev/null || true
  done
  sleep 1
fi

running() { [ -s "$1" ] && kill -0 "$(cat "$1")" 2>/dev/null; }
running /var/spool/slurmctld/slurmctld.pid || /usr/sbin/slurmctld
running /var/spool/slurmd/slurmd.pid || /usr/sbin/slurmd

for _ in $(seq 120); do
  state="$(sinfo -h -n "$host" -o %t 2>/dev/null || true)"
  case "$state" in
    idle | mix | alloc) echo "start-slurm.sh: node ${host} is ${state}"; exit 0 ;;
    down* | drain* ) scontrol update NodeName="$host" State=RESUME 2>/dev/null || true ;;
  esac
  sleep 0.5
done
echo "start-slurm.sh: the node did not become idle; see /var/log/slurm/" >&2
sinfo >&2 || true
exit 1
