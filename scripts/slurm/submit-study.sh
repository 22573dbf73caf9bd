#!/bin/bash
# Submit a railpulse study to Slurm as a job array of N shards and a merge job that runs after it:
#
#   scripts/slurm/submit-study.sh --shards N --dir STUDY_DIR [--sbatch OPTION]... -- SCENARIO --vary PATH=SPEC ...
#   scripts/slurm/submit-study.sh --resubmit 3[,5...] --dir STUDY_DIR [--sbatch OPTION]...
#
# Everything after -- is passed to `railpulse sweep` (not --shard, --jobs or --out: each task sets those).
# --sbatch passes an option to both sbatch calls, e.g. --sbatch --time=01:00:00 --sbatch --cpus-per-task=8
# (--cpus-per-task applies to the shards only). --resubmit runs the named shards again (they continue where they
# stopped) and submits a new merge after them. Prints the job IDs.
set -euo pipefail

fail() {
  echo "submit-study: $*" >&2
  exit 2
}

here=$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)
home=$(cd "$here/../.." && pwd)
shards=''
study_dir=''
resubmit=''
sbatch_options=()
shard_options=()
while [ $# -gt 0 ]; do
  case $1 in
    --shards) shards=${2:-}; shift 2 ;;
    --dir) study_dir=${2:-}; shift 2 ;;
    --resubmit) resubmit=${2:-}; shift 2 ;;
    --sbatch)
      case ${2:-} in
        --cpus-per-task=* | -c*) shard_options+=("$2") ;;
        *) sbatch_options+=("${2:-}") ;;
      esac
      shift 2 ;;
    --) shift; break ;;
    *) fail "unknown option '$1' (see the head of $0)" ;;
  esac
done
[ -n "$study_dir" ] || fail "give --dir STUDY_DIR"
mkdir -p "$study_dir/logs"
study_dir=$(cd "$study_dir" && pwd)

if [ -n "$resubmit" ]; then
  [ $# -eq 0 ] || fail "--resubmit takes no sweep arguments: they are in $study_dir/sweep.args"
  [ -f "$study_dir/shards" ] && [ -f "$study_dir/sweep.args" ] || fail "$study_dir was not submitted with this script"
  shards=$(cat "$study_dir/shards")
  [[ $resubmit =~ ^[0-9]+(,[0-9]+)*$ ]] || fail "--resubmit takes shard numbers such as 3 or 2,5, got '$resubmit'"
  IFS=, read -r -a tasks <<<"$resubmit"
  for task in "${tasks[@]}"; do ((task >= 1 && task <= shards)) || fail "shard $task is not one of 1..$shards"; done
  array=$resubmit
else
  [[ $shards =~ ^[1-9][0-9]*$ ]] || fail "give --shards N (a whole number ≥ 1)"
  [ $# -gt 0 ] || fail "give the sweep's arguments after --, e.g. -- scenario.json --vary armature.mass=10g:80g:15"
  for arg in "$@"; do
    case $arg in --shard | --shard=* | --jobs | --jobs=* | --out | --out=*) fail "$arg is set by each array task; leave it out" ;; esac
  done
  args_file=$study_dir/sweep.args
  printf '%s\0' "$@" >"$args_file.new"
  if [ -f "$args_file" ] && ! cmp -s "$args_file" "$args_file.new"; then
    rm -f "$args_file.new"
    fail "$study_dir holds another study's arguments; choose another --dir"
  fi
  mv "$args_file.new" "$args_file"
  if [ -f "$study_dir/shards" ] && [ "$(cat "$study_dir/shards")" != "$shards" ]; then fail "$study_dir was split into $(cat "$study_dir/shards") shards"; fi
  echo "$shards" >"$study_dir/shards"
  array=1-$shards
fi

common=(--parsable --chdir="$PWD" --export="ALL,RAILPULSE_HOME=$home" "${sbatch_options[@]}")
array_job=$(sbatch "${common[@]}" "${shard_options[@]}" --array="$array" \
  --output="$study_dir/logs/shard-%a-job%A.out" "$here/sweep-shard.sbatch" "$study_dir" "$shards")
array_job=${array_job%%;*}
merge_job=$(sbatch "${common[@]}" --dependency="afterany:$array_job" --kill-on-invalid-dep=yes \
  --output="$study_dir/logs/merge-job%j.out" "$here/merge-study.sbatch" "$study_dir" "$shards")
merge_job=${merge_job%%;*}
echo "array job $array_job (shards $array of $shards), merge job $merge_job -> $study_dir/merged"
