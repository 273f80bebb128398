#!/usr/bin/env bash
# The cluster recipe of docs/search.md run on a real single-node Slurm cluster (slurmctld,
# slurmd and munge from the distribution's packages; .ci/run installs them):
#   1. a job array of 4 shards of one search; task 2 runs past the array's time limit, so
#      Slurm stops it (SIGTERM, then SIGKILL after KillWait);
#   2. task 2 is resubmitted with --resume on its checkpoint (same seed and shard);
#   3. `bilin merge` keeps the best; the merged scheme verifies, and no shard's best is lost.
# The cluster lives in a temporary directory with its own ports and munge socket, and is
# stopped on every exit. Without the packages it skips with a note, except under CI=true,
# where a missing or failing cluster fails the run.
set -euo pipefail
ROOT=$(cd "$(dirname "$0")/../.." && pwd)
BILIN=${BILIN:-$ROOT/target/release/bilin}
TENSOR=matmul:3,3,3
RANK=20 # below the best known 23 (Laderman 1976): every shard runs its full time

say() { echo "slurm recipe: $*"; }
fail() {
    echo "slurm recipe: FAILED: $*" >&2
    exit 1
}

missing=()
for c in munged slurmctld slurmd sbatch squeue scontrol; do
    command -v "$c" >/dev/null 2>&1 || missing+=("$c")
done
if [ ${#missing[@]} -gt 0 ]; then
    if [ "${CI:-}" = true ]; then
        fail "not installed: ${missing[*]} (apt-get install slurm-wlm munge)"
    fi
    say "skipped: not installed: ${missing[*]} (apt-get install slurm-wlm munge)"
    exit 0
fi
[ -x "$BILIN" ] || (cd "$ROOT" && cargo build --release --quiet)

WORK=$(mktemp -d /tmp/bilin-slurm.XXXXXX)
chmod 755 "$WORK"
export SLURM_CONF=$WORK/slurm.conf
stop_all() {
    scancel --quiet --user root >/dev/null 2>&1 || true
    for p in slurmd slurmctld munge/munged; do
        [ -f "$WORK/$p.pid" ] && kill "$(cat "$WORK/$p.pid")" 2>/dev/null || true
    done
    sleep 1
    rm -rf "$WORK"
}
trap stop_all EXIT

# munge with its own key and socket
mkdir -p "$WORK/munge" "$WORK/state" "$WORK/spool" "$WORK/jobs"
chmod 700 "$WORK/munge"
dd if=/dev/urandom of="$WORK/munge/munge.key" bs=1024 count=1 status=none
chmod 400 "$WORK/munge/munge.key"
munged --key-file="$WORK/munge/munge.key" --socket="$WORK/munge/munge.socket" \
    --pid-file="$WORK/munge/munged.pid" --log-file="$WORK/munge/munged.log" \
    --seed-file="$WORK/munge/munged.seed" --force ||
    fail "munged does not start: $(tail -3 "$WORK/munge/munged.log" 2>/dev/null)"

HOST=$(hostname -s)
PORT=$((20000 + $$ % 20000))
cat >"$SLURM_CONF" <<CONF
ClusterName=bilintest
SlurmctldHost=$HOST(127.0.0.1)
SlurmctldPort=$PORT
SlurmdPort=$((PORT + 1))
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=$WORK/munge/munge.socket
StateSaveLocation=$WORK/state
SlurmdSpoolDir=$WORK/spool
SlurmctldPidFile=$WORK/slurmctld.pid
SlurmdPidFile=$WORK/slurmd.pid
SlurmctldLogFile=$WORK/slurmctld.log
SlurmdLogFile=$WORK/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
SchedulerType=sched/backfill
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
SlurmdParameters=config_overrides
ReturnToService=2
KillWait=10
OverTimeLimit=0
MinJobAge=600
MpiDefault=none
NodeName=$HOST NodeAddr=127.0.0.1 CPUs=4 RealMemory=2000 State=UNKNOWN
PartitionName=test Nodes=$HOST Default=YES MaxTime=INFINITE State=UP
CONF
slurmctld -f "$SLURM_CONF" || fail "slurmctld does not start: $(tail -3 "$WORK/slurmctld.log")"
slurmd -f "$SLURM_CONF" || fail "slurmd does not start: $(tail -3 "$WORK/slurmd.log")"
for _ in $(seq 60); do
    sinfo -h -o %t 2>/dev/null | grep -q idle && break
    sleep 0.5
done
sinfo -h -o %t | grep -q idle || fail "the node is not idle: $(sinfo 2>&1); $(tail -3 "$WORK/slurmd.log")"
say "cluster up ($(sinfo -h -o '%P %a %D %t'))"

submit() { # ARRAY SECONDS LONG_TASK RESUME
    SECONDS_T=$2 LONG_TASK=$3 RESUME=$4 BILIN=$BILIN TENSOR=$TENSOR RANK=$RANK \
        sbatch --parsable --array="$1" --time=1 --cpus-per-task=1 --chdir="$WORK/jobs" \
        --output="$WORK/jobs/log-%a.txt" --export=ALL "$ROOT/tests/slurm/job.sh"
}
wait_job() { # JOBID, at most 240 s
    for _ in $(seq 480); do
        [ -z "$(squeue -h -j "$1" 2>/dev/null)" ] && return 0
        sleep 0.5
    done
    fail "job $1 still running after 240 s: $(squeue)"
}
state() { scontrol show job "$1" | sed -n 's/.*JobState=\([A-Z_]*\).*/\1/p' | head -1; }
rank_of() { # FILE: verify it and print its rank
    local out
    out=$("$BILIN" verify $TENSOR "$1") || fail "$1 does not verify: $out"
    echo "$out" | sed -n 's/^verified: rank \([0-9]*\) .*/\1/p'
}

# 1. the array: shards 0, 1, 3 stop after 10 s; shard 2 would run 600 s, and its 1-minute
#    limit stops it first
JOB=$(submit 0-3 10 2 "")
say "array job $JOB submitted (4 shards; shard 2 runs past the 1-minute limit)"
wait_job "$JOB"
for k in 0 1 3; do
    s=$(state "${JOB}_$k")
    [ "$s" = COMPLETED ] || [ "$s" = FAILED ] || fail "shard $k ended in state $s: $(cat "$WORK/jobs/log-$k.txt")"
done
s=$(state "${JOB}_2")
[ "$s" = TIMEOUT ] || fail "shard 2 ended in state $s, expected TIMEOUT: $(cat "$WORK/jobs/log-2.txt")"
grep -q "DUE TO TIME LIMIT" "$WORK/jobs/log-2.txt" || fail "no time-limit message: $(cat "$WORK/jobs/log-2.txt")"
grep -q "stop requested" "$WORK/jobs/log-2.txt" ||
    fail "bilin did not see the stop signal: $(cat "$WORK/jobs/log-2.txt")"
declare -A before
for k in 0 1 2 3; do
    [ -f "$WORK/jobs/result-$k.json.checkpoint.json" ] || fail "shard $k wrote no checkpoint"
    before[$k]=$(rank_of "$WORK/jobs/result-$k.json")
done
say "shard 2 stopped by its time limit (TIMEOUT) with its result written; ranks ${before[*]}"

# 2. shard 2 again, from its checkpoint
JOB3=$(submit 2 10 "" "--resume result-2.json.checkpoint.json")
wait_job "$JOB3"
grep -q '"seed":1' "$WORK/jobs/result-2.json.checkpoint.json" &&
    grep -q '"shard":\[2,4\]' "$WORK/jobs/result-2.json.checkpoint.json" ||
    fail "the resumed checkpoint lost its seed or shard: $(cat "$WORK/jobs/result-2.json.checkpoint.json")"
after2=$(rank_of "$WORK/jobs/result-2.json")
[ "$after2" -le "${before[2]}" ] || fail "shard 2 went from rank ${before[2]} to $after2"
say "shard 2 resumed (job $JOB3): rank ${before[2]} -> $after2"

# 3. merge
(cd "$WORK/jobs" && "$BILIN" merge --tensor $TENSOR result-*.json --out best.json) ||
    fail "merge failed"
best=$(rank_of "$WORK/jobs/best.json")
for k in 0 1 3; do
    [ "$best" -le "${before[$k]}" ] || fail "the merge lost shard $k's rank ${before[$k]}"
done
[ "$best" -le "$after2" ] || fail "the merge lost shard 2's rank $after2"
say "ok: merged rank $best verifies; every shard's best kept"
