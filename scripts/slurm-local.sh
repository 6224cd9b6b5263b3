#!/bin/sh
# A single-node Slurm on this machine, for trying and testing job arrays
# (scripts/slurm-scan.sh, scripts/slurm-ci.sh). No systemd: the daemons run
# in the background and are stopped by their pid files. Everything (config,
# munge key and socket, state, spool, logs, pid files) lives under one directory.
#
#   scripts/slurm-local.sh start [DIR]   install the Debian packages if missing, start munged, slurmctld, slurmd
#   scripts/slurm-local.sh stop  [DIR]   stop the three daemons (pid files under DIR/run)
#   scripts/slurm-local.sh env   [DIR]   print the export line for SLURM_CONF
#
# DIR defaults to $CIRCLET_SLURM_DIR or /tmp/circlet-slurm. Commands such as
# sbatch, squeue and scontrol find this cluster through SLURM_CONF=DIR/etc/slurm.conf.
# Tested with Debian 12's Slurm 22.05 and munge 0.5.15.
set -eu

cmd=${1:-}
dir=${2:-${CIRCLET_SLURM_DIR:-/tmp/circlet-slurm}}
case "$dir" in /*) ;; *) dir="$(pwd)/$dir" ;; esac
conf="$dir/etc/slurm.conf"

say() { printf 'slurm-local: %s\n' "$*" >&2; }

install_if_missing() {
  missing=""
  for pair in slurmctld:slurmctld slurmd:slurmd sbatch:slurm-client munged:munge; do
    command -v "${pair%%:*}" >/dev/null 2>&1 || PATH="$PATH:/usr/sbin" command -v "${pair%%:*}" >/dev/null 2>&1 ||
      missing="$missing ${pair#*:}"
  done
  [ -z "$missing" ] && return 0
  [ "$(id -u)" = 0 ] || { say "missing packages:$missing (run as root to install them)"; exit 1; }
  say "installing$missing from Debian (apt-get)"
  # Keep the packages' init scripts from starting system-wide daemons.
  created_policy=""
  if [ ! -e /usr/sbin/policy-rc.d ]; then
    printf '#!/bin/sh\nexit 101\n' > /usr/sbin/policy-rc.d && chmod +x /usr/sbin/policy-rc.d && created_policy=1
  fi
  DEBIAN_FRONTEND=noninteractive apt-get install -y --no-install-recommends $missing >"$dir/log/apt.log" 2>&1 ||
    { [ -n "$created_policy" ] && rm -f /usr/sbin/policy-rc.d; say "apt-get failed, see $dir/log/apt.log"; exit 1; }
  [ -n "$created_policy" ] && rm -f /usr/sbin/policy-rc.d
  return 0
}

pid_alive() { [ -f "$1" ] && kill -0 "$(cat "$1")" 2>/dev/null; }

stop_pidfile() {  # name pidfile
  if pid_alive "$2"; then
    pid=$(cat "$2")
    kill "$pid" 2>/dev/null || true
    i=0
    while kill -0 "$pid" 2>/dev/null && [ $i -lt 100 ]; do sleep 0.1; i=$((i + 1)); done
    if kill -0 "$pid" 2>/dev/null; then say "$1 (pid $pid) did not stop; sending KILL"; kill -9 "$pid" 2>/dev/null || true; fi
    say "stopped $1 (pid $pid)"
  fi
  rm -f "$2"
}

start() {
  mkdir -p "$dir/etc" "$dir/state" "$dir/spool" "$dir/log" "$dir/run" "$dir/munge"
  chmod 700 "$dir/munge"
  install_if_missing
  PATH="$PATH:/usr/sbin"
  if pid_alive "$dir/run/slurmctld.pid"; then say "already running in $dir"; return 0; fi
  host=$(hostname -s)
  cpus=$(nproc)
  # munge: a fresh key for this cluster; the socket under DIR (--force: /tmp's
  # permissions would otherwise be refused for a root-owned daemon).
  [ -f "$dir/munge/munge.key" ] || { dd if=/dev/urandom of="$dir/munge/munge.key" bs=1024 count=1 2>/dev/null; chmod 400 "$dir/munge/munge.key"; }
  munged --force --key-file="$dir/munge/munge.key" --socket="$dir/munge/munge.socket" \
    --pid-file="$dir/run/munged.pid" --log-file="$dir/log/munged.log" --seed-file="$dir/munge/munged.seed"
  cat >"$conf" <<EOF
# Written by scripts/slurm-local.sh: a one-node cluster under $dir
ClusterName=circlet
SlurmctldHost=$host(127.0.0.1)
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$dir/munge/munge.socket
StateSaveLocation=$dir/state
SlurmdSpoolDir=$dir/spool
SlurmctldPidFile=$dir/run/slurmctld.pid
SlurmdPidFile=$dir/run/slurmd.pid
SlurmctldLogFile=$dir/log/slurmctld.log
SlurmdLogFile=$dir/log/slurmd.log
SlurmctldPort=${CIRCLET_SLURMCTLD_PORT:-6817}
SlurmdPort=${CIRCLET_SLURMD_PORT:-6818}
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
MpiDefault=none
SchedulerType=sched/backfill
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
ReturnToService=2
# Slurm 22.05: without this a job depending on a failed one pends forever.
DependencyParameters=kill_invalid_depend
# Finished jobs stay visible to scontrol for 10 minutes (their state is checked there).
MinJobAge=600
NodeName=$host NodeAddr=127.0.0.1 CPUs=$cpus State=UNKNOWN
PartitionName=local Nodes=$host Default=YES MaxTime=INFINITE State=UP
EOF
  export SLURM_CONF="$conf"
  slurmctld -f "$conf"
  slurmd -f "$conf"
  i=0
  until sinfo -h -o '%t' 2>/dev/null | grep -Eq '^(idle|mix|alloc)'; do
    i=$((i + 1))
    if [ $i -gt 100 ]; then
      say "the node did not come up (another Slurm on ports 6817/6818? set CIRCLET_SLURMCTLD_PORT, CIRCLET_SLURMD_PORT); logs in $dir/log"
      tail -n 3 "$dir/log/slurmctld.log" "$dir/log/slurmd.log" >&2 2>/dev/null || true
      exit 1
    fi
    sleep 0.1
  done
  say "running in $dir ($cpus CPUs on $host); export SLURM_CONF=$conf"
}

case "$cmd" in
  start) start ;;
  stop)
    stop_pidfile slurmd "$dir/run/slurmd.pid"
    stop_pidfile slurmctld "$dir/run/slurmctld.pid"
    stop_pidfile munged "$dir/run/munged.pid"
    ;;
  env) echo "export SLURM_CONF=$conf" ;;
  *) echo "usage: $0 start|stop|env [DIR]" >&2; exit 2 ;;
esac
