#!/usr/bin/env bash
# The job-array recipe of docs/cli.md ("Sweeps as a batch scheduler's job array") on a real
# one-node Slurm started here: a small counter-extension sweep in 3 array tasks, a merge job that
# depends on the array, and the merged reports compared byte for byte with the unsharded sweep.
#
#   slurm_job_array.sh TICKBENCH SCENARIO FIRMWARE WORKDIR
#
# Exits 77 (CTest's skip code for this test) with the reason when Slurm or munge is not installed
# (scripts/lib/setup.sh installs them) or when not run as root (the daemons are started here).
set -euo pipefail

tickbench="$1"
scenario="$2"
firmware="$3"
work="$4"

for tool in munged slurmctld slurmd sbatch squeue sinfo; do
    if ! command -v "$tool" >/dev/null 2>&1; then
        echo "skipped: '$tool' is not installed (Debian packages slurm-wlm and munge;" \
            "scripts/lib/setup.sh installs them)"
        exit 77
    fi
done
if [[ "$(id -u)" != 0 ]]; then
    echo "skipped: starting the Slurm daemons needs root"
    exit 77
fi

rm -rf "$work"
mkdir -p "$work"
chmod 700 "$work"
work="$(cd "$work" && pwd)"
pids=()
cleanup() {
    local p
    for p in "${pids[@]}"; do kill "$p" 2>/dev/null || true; done
    for p in "${pids[@]}"; do wait "$p" 2>/dev/null || true; done
}
trap cleanup EXIT

fail() {
    echo "FAILED: $*" >&2
    for log in "$work"/*.log; do
        [[ -f "$log" ]] && { echo "--- $log" >&2; tail -n 30 "$log" >&2; }
    done
    exit 1
}

# munge: a key and a socket of our own, so that nothing of the machine's set-up is touched.
mkdir -p "$work/munge"
chmod 700 "$work/munge"
dd if=/dev/urandom of="$work/munge/munge.key" bs=1024 count=1 status=none
chmod 400 "$work/munge/munge.key"
munged --force --key-file="$work/munge/munge.key" --socket="$work/munge/munge.sock" \
    --pid-file="$work/munge/munged.pid" --log-file="$work/munge.log" \
    --seed-file="$work/munge/munge.seed" ||
    fail "munged did not start"
pids+=("$(cat "$work/munge/munged.pid")")

host="$(hostname -s)"
# Ports off the defaults, so that a Slurm the machine may run is left alone.
ctld_port=$((20000 + RANDOM % 20000))
slurmd_port=$((ctld_port + 1))
mkdir -p "$work/state" "$work/spool"
cat >"$work/slurm.conf" <<EOF
ClusterName=tickbench
SlurmctldHost=$host
SlurmctldPort=$ctld_port
SlurmdPort=$slurmd_port
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$work/munge/munge.sock
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
SchedulerType=sched/builtin
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
MpiDefault=none
ReturnToService=2
NodeName=$host CPUs=$(nproc) State=UNKNOWN
PartitionName=sweeps Nodes=$host Default=YES MaxTime=INFINITE State=UP
EOF
export SLURM_CONF="$work/slurm.conf"
slurmctld -D -i -f "$SLURM_CONF" >"$work/slurmctld.out" 2>&1 &
pids+=("$!")
slurmd -D -f "$SLURM_CONF" >"$work/slurmd.out" 2>&1 &
pids+=("$!")

# The node is ready when it is idle; a minute at most.
ready=0
for _ in $(seq 1 120); do
    if sinfo -h -N -o '%T' 2>/dev/null | grep -q '^idle'; then
        ready=1
        break
    fi
    sleep 0.5
done
((ready)) || fail "the one-node Slurm did not come up within a minute ($(sinfo -h -N 2>&1 || true))"

# The recipe of docs/cli.md, with 3 array tasks.
cat >"$work/sweep-array.sh" <<EOF
#!/bin/sh
"$tickbench" sweep "$scenario" --firmware "$firmware" \\
    --vary param.variant=naive,careful --vary start-offset=0..20 --waves none \\
    --shard "\${SLURM_ARRAY_TASK_ID}/3" --out "sweep-\${SLURM_ARRAY_TASK_ID}"
EOF
cd "$work"
array_job="$(sbatch --parsable --array=1-3 --chdir="$work" --output="$work/task-%a.out" \
    sweep-array.sh)" || fail "sbatch of the array"
merge_job="$(sbatch --parsable --dependency="afterany:$array_job" --chdir="$work" \
    --output="$work/merge.out" \
    --wrap "\"$tickbench\" merge sweep-1 sweep-2 sweep-3 --out sweep; echo exit \$? > merge.code")" ||
    fail "sbatch of the merge"

# Both jobs leave the queue when done; five minutes at most.
for _ in $(seq 1 600); do
    if [[ -z "$(squeue -h -j "$array_job,$merge_job" 2>/dev/null)" ]]; then break; fi
    sleep 0.5
done
[[ -z "$(squeue -h -j "$array_job,$merge_job" 2>/dev/null)" ]] ||
    fail "the jobs did not finish within five minutes: $(squeue 2>&1)"
[[ -f "$work/merge.code" ]] || fail "the merge job did not run ($(cat "$work/merge.out" 2>&1))"

# The naive read fails at some offsets of 0..20 (expected_sweep.txt): the sweep's exit code is 3.
[[ "$(cat "$work/merge.code")" == "exit 3" ]] ||
    fail "merge: $(cat "$work/merge.code"), expected exit 3: $(cat "$work/merge.out")"
set +e
"$tickbench" sweep "$scenario" --firmware "$firmware" --vary param.variant=naive,careful \
    --vary start-offset=0..20 --waves none --out "$work/whole" >/dev/null 2>&1
code=$?
set -e
[[ "$code" == 3 ]] || fail "the unsharded sweep exited $code, expected 3"
for f in sweep.jsonl junit.xml summary.txt; do
    cmp "$work/sweep/$f" "$work/whole/$f" || fail "merged $f differs from the unsharded sweep's"
done
echo "job array of 3 tasks and the merge job ran on Slurm; merged reports equal the unsharded sweep"
