#!/usr/bin/env bash
# The Slurm array job against a real single-node Slurm on this machine:
# installs slurmctld, slurmd and munge from Debian if missing, starts them
# on localhost with a configuration of their own in a temporary folder,
# runs a batch as a 3-task array job (scripts/slurm/lccsim-array.sbatch)
# followed by the merge job, and checks that the merged summary equals that
# of one run of the whole batch. Needs root (or sudo) for the daemons.
# Labelled `cluster`: the default test command skips it; run it with
#   bash scripts/test-cluster.sh
set -euo pipefail
lccsim=$(readlink -f "$1")
src=$(readlink -f "$2")
SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi

missing=()
for p in slurmctld slurmd slurm-client munge; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -gt 0 ]; then
  $SUDO env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
fi

work=$(mktemp -d /tmp/lccsim-slurm.XXXXXX)
chmod 755 "$work"
cleanup() {
  [ -f "$work/slurmd.pid" ] && $SUDO kill "$(cat "$work/slurmd.pid")" 2>/dev/null || true
  [ -f "$work/slurmctld.pid" ] && $SUDO kill "$(cat "$work/slurmctld.pid")" 2>/dev/null || true
  [ -f "$work/munged.pid" ] && $SUDO kill "$(cat "$work/munged.pid")" 2>/dev/null || true
  sleep 1
  $SUDO rm -rf "$work"
}
trap cleanup EXIT

# munge: a key and a daemon of our own.
mkdir -p "$work/munge"
$SUDO dd if=/dev/urandom of="$work/munge/munge.key" bs=1024 count=1 status=none
$SUDO chmod 400 "$work/munge/munge.key"
$SUDO munged --force --key-file="$work/munge/munge.key" --socket="$work/munge/munge.socket" \
  --pid-file="$work/munged.pid" --log-file="$work/munged.log" --seed-file="$work/munge/seed"

cpus=$(nproc)
cat > "$work/slurm.conf" <<CONF
ClusterName=lccsim-test
SlurmctldHost=localhost
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
AuthInfo=socket=$work/munge/munge.socket
CredType=cred/munge
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
MpiDefault=none
ReturnToService=2
SlurmctldPidFile=$work/slurmctld.pid
SlurmdPidFile=$work/slurmd.pid
SlurmdSpoolDir=$work/spool
StateSaveLocation=$work/state
SlurmctldLogFile=$work/slurmctld.log
SlurmdLogFile=$work/slurmd.log
SlurmctldPort=16817
SlurmdPort=16818
JobCompType=jobcomp/none
AccountingStorageType=accounting_storage/none
NodeName=localhost CPUs=$cpus State=UNKNOWN
PartitionName=test Nodes=localhost Default=YES MaxTime=INFINITE State=UP
CONF
mkdir -p "$work/spool" "$work/state"
export SLURM_CONF="$work/slurm.conf"
$SUDO env SLURM_CONF="$SLURM_CONF" slurmctld -f "$SLURM_CONF"
$SUDO env SLURM_CONF="$SLURM_CONF" slurmd -f "$SLURM_CONF"
for _ in $(seq 1 30); do
  sinfo -h -o %T 2>/dev/null | grep -qE "idle|mixed" && break
  sleep 1
done
sinfo -h -o %T | grep -qE "idle|mixed" || { echo "slurm did not come up"; cat "$work"/*.log; exit 1; }

netlist=$src/circuits/traction_substation_faults.lcc
out=$work/sharded
mkdir -p "$out"
cd "$work"
jid=$(LCCSIM=$lccsim sbatch --parsable --export=ALL --array=0-2 --cpus-per-task=1 \
      "$src/scripts/slurm/lccsim-array.sbatch" "$netlist" "$out")
LCCSIM=$lccsim sbatch --wait --export=ALL --dependency=afterok:"$jid" \
  "$src/scripts/slurm/lccsim-merge.sbatch" "$out" > /dev/null
"$lccsim" run "$netlist" --out "$work/single" --formats csv,json > /dev/null
cmp "$out/summary.csv" "$work/single/summary.csv"
cmp "$out/summary.json" "$work/single/summary.json"
ls "$out"/summary-shard-*-of-3.csv > /dev/null
echo "slurm array of 3 shards, merged = single run"
