#!/usr/bin/env bash
# A one-node Slurm cluster for the batch tests: `bash .ci/slurm.sh start` installs Debian's
# slurm-wlm and munge if missing, writes a configuration into a fresh temporary folder, starts a
# private munged, slurmctld and slurmd there and writes the caller's exports to .ci/.slurm-env;
# `bash .ci/slurm.sh stop` cancels its jobs, ends those daemons and removes the folder.
# Both are idempotent. Any failure prints one line naming the step and the log to read.
set -euo pipefail

repo=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
env_file="$repo/.ci/.slurm-env"
me="slurm.sh"

fail() { # fail STEP LOGFILE
  echo "$me: $1 failed; see $2" >&2
  exit 1
}

# The folder of the running cluster, read from the env file; empty when there is none.
cluster_dir() {
  [ -f "$env_file" ] || return 0
  sed -n 's/^export ARCSIFT_SLURM_DIR=//p' "$env_file" | head -n 1
}

# alive PID: the process exists and is not a zombie (a killed daemon whose parent, init here,
# has not reaped it yet still answers kill -0).
alive() {
  local state
  state=$(sed -n 's/^State:[[:space:]]*\(.\).*/\1/p' "/proc/$1/status" 2>/dev/null) || return 1
  [ -n "$state" ] && [ "$state" != Z ]
}

# pid_of FOLDER NAME: the pid in FOLDER/NAME.pid if that process is alive and is NAME.
pid_of() {
  local file="$1/$2.pid" pid
  [ -f "$file" ] || return 1
  pid=$(tr -dc '0-9' <"$file")
  [ -n "$pid" ] && [ "$(cat "/proc/$pid/comm" 2>/dev/null)" = "$2" ] && alive "$pid" && echo "$pid"
}

running() { # running FOLDER: all three daemons alive and the controller answers
  local dir="$1" daemon
  for daemon in munged slurmctld slurmd; do pid_of "$dir" "$daemon" >/dev/null || return 1; done
  SLURM_CONF="$dir/slurm.conf" timeout 10 sinfo -h -o %a >/dev/null 2>&1
}

# Two consecutive free TCP ports for slurmctld and slurmd, so that a cluster of another work tree,
# or a system Slurm on the default 6817/6818, does not collide with this one.
free_ports() {
  local port
  for port in $(seq 6817 2 6999); do
    if ! ss -Htln "( sport = :$port or sport = :$((port + 1)) )" | grep -q .; then
      echo "$port"
      return 0
    fi
  done
  return 1
}

install_packages() { # install_packages LOGFILE
  local need=()
  command -v slurmctld >/dev/null 2>&1 && command -v slurmd >/dev/null 2>&1 &&
    command -v sbatch >/dev/null 2>&1 || need+=(slurm-wlm)
  command -v munged >/dev/null 2>&1 || need+=(munge)
  [ "${#need[@]}" -eq 0 ] && return 0
  { apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${need[@]}"; } \
    >"$1" 2>&1 || fail "installing ${need[*]}" "$1"
}

# The key of Debian's munge package. Its postinst creates one; this covers a machine where the
# package is installed but the key was removed (munged cannot start without it).
ensure_munge_key() { # ensure_munge_key LOGFILE
  local key=/etc/munge/munge.key
  [ -s "$key" ] && return 0
  {
    mkdir -p /etc/munge &&
      { mungekey --create --keyfile="$key" 2>/dev/null ||
        dd if=/dev/urandom of="$key" bs=1 count=1024 status=none; } &&
      chmod 0400 "$key" &&
      { chown munge:munge /etc/munge "$key" 2>/dev/null || true; }
  } >>"$1" 2>&1 || fail "creating $key" "$1"
}

write_config() { # write_config FOLDER PORT
  local dir="$1" port="$2" node cpus memory
  node=$(hostname -s)
  cpus=$(nproc)
  # RealMemory in MiB from /proc/meminfo, as slurmd measures it; a larger value would drain the node.
  memory=$(awk '/^MemTotal:/ { print int($2 / 1024) }' /proc/meminfo)
  cat >"$dir/slurm.conf" <<EOF
# Written by .ci/slurm.sh: a single-node test cluster, all state under $dir.
ClusterName=arcsift-test
SlurmctldHost=$node(127.0.0.1)
SlurmctldPort=$port
SlurmdPort=$((port + 1))
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
AuthInfo=socket=$dir/munge.socket
CredType=cred/munge
StateSaveLocation=$dir/state
SlurmdSpoolDir=$dir/spool
SlurmctldPidFile=$dir/slurmctld.pid
SlurmdPidFile=$dir/slurmd.pid
SlurmctldLogFile=$dir/slurmctld.log
SlurmdLogFile=$dir/slurmd.log
SlurmctldDebug=info
SlurmdDebug=info
MailProg=/bin/true
# No cgroups: process tracking by parent pid, no CPU binding.
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
MpiDefault=none
# Several 1-CPU tasks share the node; memory is a consumable as on most clusters, with a default
# per CPU so that a job that asks for none does not claim the whole node.
SchedulerType=sched/backfill
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU_Memory
DefMemPerCPU=1024
# No accounting: job status comes from squeue and scontrol only.
AccountingStorageType=accounting_storage/none
JobAcctGatherType=jobacct_gather/none
JobCompType=jobcomp/none
# Short timeouts for tests. A cancelled task gets SIGKILL 2 s after SIGTERM. Finished jobs stay
# visible to scontrol for 120 s: long enough for a poll loop, or a test that looks a minute later,
# to read their final state; short enough that the controller's list stays small in a long session.
KillWait=2
MinJobAge=120
InactiveLimit=0
SlurmctldTimeout=30
SlurmdTimeout=30
MessageTimeout=10
Waittime=0
ReturnToService=2
NodeName=$node NodeAddr=127.0.0.1 CPUs=$cpus RealMemory=$memory State=UNKNOWN
PartitionName=main Nodes=$node Default=YES MaxTime=INFINITE State=UP
EOF
}

start() {
  local dir port node step
  dir=$(cluster_dir)
  if [ -n "$dir" ] && [ -d "$dir" ] && running "$dir"; then
    echo "$me: already running ($dir)" >&2
    cat "$env_file"
    return 0
  fi
  stop >/dev/null 2>&1 || true

  dir=$(mktemp -d /tmp/arcsift-slurm.XXXXXX)
  # munged wants its socket's folder searchable by all (it serves every user of the machine).
  chmod 0755 "$dir"
  mkdir -p "$dir/state" "$dir/spool"
  # The env file is written first, so that `stop` finds and removes a half-started cluster.
  printf 'export SLURM_CONF=%s\nexport ARCSIFT_SLURM_DIR=%s\n' "$dir/slurm.conf" "$dir" >"$env_file"
  install_packages "$dir/install.log"
  ensure_munge_key "$dir/install.log"

  port=$(free_ports) || fail "finding two free ports in 6817-7000" "the output of ss -tln"
  write_config "$dir" "$port"
  node=$(hostname -s)
  export SLURM_CONF="$dir/slurm.conf"

  # A private munged on its own socket, with a copy of the key owned by the user running it
  # (munged refuses a key that another user owns or that others can read).
  install -m 0400 /etc/munge/munge.key "$dir/munge.key"
  munged --key-file="$dir/munge.key" --socket="$dir/munge.socket" --pid-file="$dir/munged.pid" \
    --log-file="$dir/munged.log" --seed-file="$dir/munged.seed" >>"$dir/munged.log" 2>&1 ||
    fail "starting munged" "$dir/munged.log"
  munge --socket="$dir/munge.socket" -n 2>>"$dir/munged.log" |
    unmunge --socket="$dir/munge.socket" >/dev/null 2>>"$dir/munged.log" ||
    fail "checking munged (munge | unmunge)" "$dir/munged.log"

  slurmctld -f "$SLURM_CONF" -i >>"$dir/slurmctld.log" 2>&1 || fail "starting slurmctld" "$dir/slurmctld.log"
  slurmd -f "$SLURM_CONF" -N "$node" >>"$dir/slurmd.log" 2>&1 || fail "starting slurmd" "$dir/slurmd.log"

  # Wait (at most 60 s) for the node to register and turn idle.
  step="waiting for node $node to be idle"
  for _ in $(seq 1 120); do
    if [ "$(timeout 10 sinfo -h -N -n "$node" -o %T 2>/dev/null)" = idle ]; then
      echo "$me: started ($dir)" >&2
      cat "$env_file"
      return 0
    fi
    pid_of "$dir" slurmctld >/dev/null || fail "$step (slurmctld exited)" "$dir/slurmctld.log"
    pid_of "$dir" slurmd >/dev/null || fail "$step (slurmd exited)" "$dir/slurmd.log"
    sleep 0.5
  done
  fail "$step (60 s)" "$dir/slurmd.log and $dir/slurmctld.log"
}

# end_daemons FOLDER NAME...: SIGTERM those daemons of FOLDER together, SIGKILL any left after 10 s.
end_daemons() {
  local dir="$1" name pid left pids=()
  shift
  for name in "$@"; do
    pid=$(pid_of "$dir" "$name") && kill "$pid" 2>/dev/null && pids+=("$pid")
  done
  [ "${#pids[@]}" -eq 0 ] && return 0
  for _ in $(seq 1 100); do
    left=0
    for pid in "${pids[@]}"; do alive "$pid" && left=1; done
    [ "$left" -eq 0 ] && return 0
    sleep 0.1
  done
  kill -9 "${pids[@]}" 2>/dev/null || true
}

# end_orphans FOLDER: SIGKILL what a crashed controller left running: each slurmstepd of this
# cluster (slurmd starts them in the folder of its log, FOLDER) and every process below it.
end_orphans() {
  local pid child pids=() queue=()
  for pid in $(pgrep -x slurmstepd || true); do
    [ "$(readlink "/proc/$pid/cwd" 2>/dev/null)" = "$1" ] && queue+=("$pid")
  done
  while [ "${#queue[@]}" -gt 0 ]; do
    pid=${queue[0]}
    queue=("${queue[@]:1}")
    pids+=("$pid")
    for child in $(pgrep -P "$pid" || true); do queue+=("$child"); done
  done
  [ "${#pids[@]}" -eq 0 ] || kill -9 "${pids[@]}" 2>/dev/null || true
}

stop() {
  local dir jobs
  dir=$(cluster_dir)
  if [ -z "$dir" ] || [ ! -d "$dir" ]; then
    rm -f "$env_file"
    echo "$me: not running" >&2
    return 0
  fi
  # Cancel this cluster's jobs while its daemons still run: slurmstepd and the job's processes
  # outlive slurmd, so ending the daemons alone would leave running tasks behind.
  if pid_of "$dir" slurmctld >/dev/null && pid_of "$dir" slurmd >/dev/null; then
    export SLURM_CONF="$dir/slurm.conf"
    jobs=$(timeout 10 squeue -h -o %A 2>/dev/null | sort -u | tr '\n' ' ') || jobs=""
    # shellcheck disable=SC2086 # one argument per job id
    if [ -n "${jobs// /}" ] && timeout 10 scancel --full $jobs >/dev/null 2>&1; then
      for _ in $(seq 1 50); do
        [ -z "$(timeout 10 squeue -h -o %A 2>/dev/null)" ] && break
        sleep 0.2
      done
    fi
  fi
  # munged last: the two others still authenticate their last messages through it.
  end_daemons "$dir" slurmd slurmctld
  end_daemons "$dir" munged
  end_orphans "$dir"
  if [ -n "${ARCSIFT_SLURM_KEEP_LOGS:-}" ]; then
    { mkdir -p "$ARCSIFT_SLURM_KEEP_LOGS" && cp "$dir"/*.log "$ARCSIFT_SLURM_KEEP_LOGS"/; } 2>/dev/null || true
  fi
  case "$dir" in /tmp/arcsift-slurm.*) rm -rf "$dir" ;; esac
  rm -f "$env_file"
  echo "$me: stopped ($dir)" >&2
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  *)
    echo "usage: bash .ci/slurm.sh start|stop" >&2
    exit 2
    ;;
esac
