#!/bin/sh
# One task of the job array of docs/search.md ("Splitting a search over many jobs"), with
# the numbers made small: the test's sbatch line gives --array and --time, and the
# environment BILIN, TENSOR, RANK, SECONDS_T (bilin's own --time), LONG_TASK (this task
# runs 600 s instead, past the array's time limit) and RESUME (empty, or `--resume FILE`).
K=${SLURM_ARRAY_TASK_ID}
T=$SECONDS_T
[ "$K" = "${LONG_TASK:-}" ] && T=600
# shellcheck disable=SC2086
"$BILIN" search "$TENSOR" --rank "$RANK" --seed 1 --threads 1 --time "$T" \
    --checkpoint-every 1 --shard "$K/4" --out "result-$K.json" $RESUME
# exit code 1 (not found) is a normal outcome for most shards
