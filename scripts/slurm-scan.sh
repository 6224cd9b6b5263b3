#!/bin/sh
# Runs `circlet scan` on a Slurm cluster as a job array plus a dependent merge.
#
#   scripts/slurm-scan.sh -k TASKS -o OUT [-c CPUS] [--circlet PATH] [--no-wait] [--sbatch 'OPTIONS'] -- SCAN-OPTIONS
#
# e.g.  scripts/slurm-scan.sh -k 4 -o /scratch/scan -- --t 6..30 --modulus 24 --verify
#
# Array task i (SLURM_ARRAY_TASK_ID) of k (SLURM_ARRAY_TASK_COUNT) runs
#   circlet scan SCAN-OPTIONS --shard i/k --threads CPUS --resume -o OUT/shard-i
# (--resume: a requeued or resubmitted task continues from its database), and
# one job depending on the whole array (afterok) runs
#   circlet scan-merge OUT/shard-0 ... OUT/shard-(k-1) -o OUT/merged
# which checks that every job of the scan appears exactly once. The script then
# waits for the merge job, checks its final state with scontrol (sbatch --wait
# returns 0 even for a cancelled job), and prints OUT/merged/summary.txt.
# Exit status: 0 when the merge COMPLETED; 1 otherwise (states and logs named).
# OUT must be on a file system every node sees. Logs: OUT/slurm-*.out.
# With --no-wait the job ids are printed and the script returns at once.
set -eu

k=""
out=""
cpus=1
circlet=""
wait=1
extra=""
while [ $# -gt 0 ]; do
  case "$1" in
    -k) k=$2; shift 2 ;;
    -o) out=$2; shift 2 ;;
    -c) cpus=$2; shift 2 ;;
    --circlet) circlet=$2; shift 2 ;;
    --no-wait) wait=0; shift ;;
    --sbatch) extra=$2; shift 2 ;;
    --) shift; break ;;
    *) echo "slurm-scan: unknown option $1 (scan options go after --)" >&2; exit 2 ;;
  esac
done
[ -n "$k" ] && [ -n "$out" ] || { echo "usage: $0 -k TASKS -o OUT [-c CPUS] [--circlet PATH] [--no-wait] -- SCAN-OPTIONS" >&2; exit 2; }
case "$k" in '' | *[!0-9]*) echo "slurm-scan: -k expects a positive integer" >&2; exit 2 ;; esac
[ "$k" -ge 1 ] || { echo "slurm-scan: -k expects a positive integer" >&2; exit 2; }
for a in "$@"; do
  case "$a" in -o | --output | --shard | --resume | --threads) echo "slurm-scan: $a is set by this script" >&2; exit 2 ;; esac
done
if [ -z "$circlet" ]; then circlet=$(cd "$(dirname "$0")/.." && pwd)/build/circlet; fi
case "$circlet" in /*) ;; *) circlet="$(pwd)/$circlet" ;; esac
[ -x "$circlet" ] || { echo "slurm-scan: $circlet is not an executable" >&2; exit 2; }
mkdir -p "$out"
out=$(cd "$out" && pwd)

# The scan options, each single-quoted for the job scripts.
quoted=""
for a in "$@"; do
  quoted="$quoted '$(printf '%s' "$a" | sed "s/'/'\\\\''/g")'"
done

shards=""
i=0
while [ $i -lt "$k" ]; do shards="$shards '$out/shard-$i'"; i=$((i + 1)); done

# shellcheck disable=SC2086
array=$(sbatch --parsable --job-name=circlet-scan --array="0-$((k - 1))" --cpus-per-task="$cpus" \
  --output="$out/slurm-scan-%A_%a.out" $extra \
  --wrap "exec '$circlet' scan $quoted --shard \"\$SLURM_ARRAY_TASK_ID/\$SLURM_ARRAY_TASK_COUNT\" --threads $cpus --resume -o \"$out/shard-\$SLURM_ARRAY_TASK_ID\"")
array=${array%%;*}
# shellcheck disable=SC2086
merge=$(sbatch --parsable --job-name=circlet-scan-merge --dependency="afterok:$array" --kill-on-invalid-dep=yes \
  --output="$out/slurm-merge-%j.out" $extra \
  --wrap "rm -rf '$out/merged' && exec '$circlet' scan-merge $shards -o '$out/merged'")
merge=${merge%%;*}
echo "slurm-scan: array job $array ($k tasks), merge job $merge; output in $out" >&2
[ "$wait" = 1 ] || { echo "$array $merge"; exit 0; }

state_of() { scontrol -o show job "$1" 2>/dev/null | tr ' ' '\n' | sed -n 's/^JobState=//p' | head -n 1; }
while :; do
  s=$(state_of "$merge")
  case "$s" in
    COMPLETED) break ;;
    PENDING | RUNNING | CONFIGURING | COMPLETING | SUSPENDED | REQUEUED | RESIZING | "") sleep 0.5 ;;
    *)
      echo "slurm-scan: the merge job $merge ended $s" >&2
      scontrol -o show job "$array" 2>/dev/null | tr ' ' '\n' | grep -E '^(JobId|ArrayTaskId|JobState|ExitCode)=' | paste - - - - >&2 || true
      for f in "$out"/slurm-*.out; do [ -s "$f" ] && { echo "--- $f" >&2; tail -n 5 "$f" >&2; }; done
      exit 1
      ;;
  esac
done
cat "$out/merged/summary.txt"
