#!/usr/bin/env bash
# A throw-away single-node Slurm cluster on this machine, for test/batch/slurm.test.ts (run as root).
#   slurm-cluster.sh start DIR   makes a munge key, a minimal slurm.conf and starts munged, slurmctld and slurmd,
#                                all with their files under DIR; waits until the node is idle. Prints
#                                "SLURM_CONF=DIR/slurm.conf" (export it for sbatch, squeue, sinfo).
#   slurm-cluster.sh stop DIR    stops the three daemons started by "start" (by the pids in DIR) and nothing else.
# Needs Debian's slurm-wlm and munge packages (apt-get install -y slurm-wlm munge). No cgroups, no accounting.
set -euo pipefail
cmd=${1:?start or stop}
dir=$(realpath -m "${2:?a folder for the cluster files}")
conf="$dir/slurm.conf"

stop() {
  for name in slurmd slurmctld munged; do
    if [ -f "$dir/$name.pid" ]; then
      pid=$(cat "$dir/$name.pid")
      kill "$pid" 2>/dev/null || true
      for _ in $(seq 1 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
      kill -9 "$pid" 2>/dev/null || true
      rm -f "$dir/$name.pid"
    fi
  done
}

if [ "$cmd" = stop ]; then
  # jobs of this cluster first (SLURM_CONF points at it), so no job step outlives the daemons
  if [ -f "$dir/slurmctld.pid" ] && kill -0 "$(cat "$dir/slurmctld.pid")" 2>/dev/null; then
    SLURM_CONF="$conf" scancel --quiet --full --user=root 2>/dev/null || true
    for _ in $(seq 1 30); do [ -z "$(SLURM_CONF="$conf" squeue -h 2>/dev/null)" ] && break; sleep 0.2; done
  fi
  stop
  exit 0
fi
[ "$cmd" = start ] || { echo "usage: $0 start|stop DIR" >&2; exit 2; }
for tool in munged mungekey slurmctld slurmd sbatch sinfo; do
  command -v "$tool" >/dev/null 2>&1 || { echo "slurm-cluster: $tool is missing: apt-get install -y slurm-wlm munge" >&2; exit 3; }
done
[ "$(id -u)" = 0 ] || { echo "slurm-cluster: run as root (slurmd starts jobs as their user)" >&2; exit 3; }

mkdir -p "$dir/munge" "$dir/state" "$dir/spool" "$dir/log"
chmod 700 "$dir/munge"
mungekey --create --keyfile="$dir/munge/munge.key" --force
chmod 400 "$dir/munge/munge.key"
munged --key-file="$dir/munge/munge.key" --socket="$dir/munge/socket" --pid-file="$dir/munged.pid" \
  --log-file="$dir/log/munged.log" --seed-file="$dir/munge/seed" --force

# Ports from the pid, so two runs at once do not meet.
port=$((20000 + ($$ % 20000)))
cat > "$conf" <<CONF
ClusterName=motebench-test
SlurmctldHost=localhost
SlurmctldPort=$port
SlurmdPort=$((port + 1))
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CryptoType=crypto/munge
AuthInfo=socket=$dir/munge/socket
StateSaveLocation=$dir/state
SlurmdSpoolDir=$dir/spool
SlurmctldPidFile=$dir/slurmctld.pid
SlurmdPidFile=$dir/slurmd.pid
SlurmctldLogFile=$dir/log/slurmctld.log
SlurmdLogFile=$dir/log/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
SchedulerType=sched/backfill
MpiDefault=none
ReturnToService=2
SlurmctldTimeout=30
SlurmdTimeout=30
InactiveLimit=0
MinJobAge=30
KillWait=5
Waittime=0
NodeName=localhost CPUs=2 RealMemory=1000 State=UNKNOWN
PartitionName=debug Nodes=localhost Default=YES MaxTime=10 State=UP
CONF

export SLURM_CONF="$conf"
slurmctld -i -f "$conf"
slurmd -f "$conf"
for _ in $(seq 1 100); do
  state=$(sinfo -h -N -o '%T' 2>/dev/null | head -1 || true)
  if [ "$state" = idle ]; then echo "SLURM_CONF=$conf"; exit 0; fi
  sleep 0.2
done
echo "slurm-cluster: the node did not become idle in 20 s (state: ${state:-none}); logs:" >&2
tail -n 20 "$dir/log/slurmctld.log" "$dir/log/slurmd.log" >&2 || true
stop
exit 1
