#!/bin/sh
# fuzz.sh - run each libFuzzer target until it has had SECONDS of CPU time,
# one after the other on one core: seeds from tests/fuzz/corpus/NAME and
# tests/fuzz/regress/NAME, the growing corpus in DIR/corpus/NAME, logs in
# DIR/logs. On a shared machine a run gets less than a whole core, so the
# CPU time is measured (/usr/bin/time) and the run continued on the same
# corpus until the budget is spent. A crash, leak, hang or out-of-memory input
# is moved to tests/fuzz/regress/NAME, which `make check` replays from then
# on; the run then fails. Figures go to DIR/fuzz-summary.tsv.
# usage: scripts/fuzz.sh DIR SECONDS NAME...
set -u
# absolute paths: a target may change directory in its initialisation
dir=$(cd "$1" && pwd); secs=$2; shift 2
src=$(pwd)
summary="$dir/fuzz-summary.tsv"
mkdir -p "$dir/logs"
[ -f "$summary" ] || printf 'target\tcpu_s\twall_s\truns\texecutions\texec_per_cpu_s\tcoverage\tinstrumented\tfeatures\tcorpus\tfindings\tcommit\tdate\n' > "$summary"
commit=$(git rev-parse --short HEAD 2>/dev/null || echo '?')
timer=""
[ -x /usr/bin/time ] && timer="/usr/bin/time"
status=0
# the OpenMP runtime's thread pool outlives the final leak check (tests/fuzz/lsan.supp)
LSAN_OPTIONS="suppressions=$src/tests/fuzz/lsan.supp${LSAN_OPTIONS:+:$LSAN_OPTIONS}"
export LSAN_OPTIONS
for n in "$@"; do
  case $n in
    units) maxlen=128 ;;
    cli) maxlen=1024 ;;
    csv) maxlen=4096 ;;
    *) maxlen=8192 ;;
  esac
  mkdir -p "$dir/corpus/$n" "$dir/artifacts/$n"
  dict=""
  [ -f "tests/fuzz/$n.dict" ] && dict="-dict=$src/tests/fuzz/$n.dict"
  seeds="$src/tests/fuzz/corpus/$n"
  [ -d "tests/fuzz/regress/$n" ] && seeds="$seeds $src/tests/fuzz/regress/$n"
  log="$dir/logs/$n.log"
  : > "$log"
  cpu=0; wall=0; runs=0; execs=0; rc=0
  start=$(date +%s)
  while [ "$cpu" -lt "$secs" ] && [ "$runs" -lt 6 ]; do
    left=$((secs - cpu)); [ "$left" -lt 10 ] && left=10
    echo "fuzz: $n: run $((runs + 1)), $left s (CPU so far ${cpu} s; log $log)"
    # shellcheck disable=SC2086
    if [ -n "$timer" ]; then
      $timer -f '%U %S' -o "$dir/logs/$n.cpu" "$dir/fuzz/fuzz_$n" "$dir/corpus/$n" $seeds $dict \
        -max_total_time="$left" -max_len=$maxlen -timeout=10 -rss_limit_mb=2048 -print_final_stats=1 \
        -artifact_prefix="$dir/artifacts/$n/" >> "$log" 2>&1
      rc=$?
      used=$(tail -n 1 "$dir/logs/$n.cpu" | awk '{printf "%d", $1 + $2 + 0.5}')
    else
      t0=$(date +%s)
      "$dir/fuzz/fuzz_$n" "$dir/corpus/$n" $seeds $dict -max_total_time="$left" -max_len=$maxlen -timeout=10 \
        -rss_limit_mb=2048 -print_final_stats=1 -artifact_prefix="$dir/artifacts/$n/" >> "$log" 2>&1
      rc=$?
      used=$(( $(date +%s) - t0 )) # no CPU timer here: wall-clock stands in for it
    fi
    cpu=$((cpu + used)); runs=$((runs + 1))
    e=$(sed -n 's/^stat::number_of_executed_units: *//p' "$log" | tail -n 1)
    execs=$((execs + ${e:-0}))
    [ $rc -ne 0 ] && break
    ls "$dir/artifacts/$n" | grep -q . && break
  done
  wall=$(( $(date +%s) - start ))
  last=$(grep -E '^#[0-9]+' "$log" | tail -n 1)
  cov=$(echo "$last" | sed -n 's/.*cov: \([0-9]*\).*/\1/p')
  ft=$(echo "$last" | sed -n 's/.*ft: \([0-9]*\).*/\1/p')
  corp=$(echo "$last" | sed -n 's/.*corp: \([0-9]*\/[0-9a-zA-Z]*\).*/\1/p')
  pcs=$(sed -n 's/^INFO: Loaded 1 modules *(\([0-9]*\) inline.*/\1/p' "$log" | head -n 1)
  rate=$([ "$cpu" -gt 0 ] && echo $((execs / cpu)) || echo '?')
  found=0
  for a in "$dir/artifacts/$n"/crash-* "$dir/artifacts/$n"/leak-* "$dir/artifacts/$n"/timeout-* \
           "$dir/artifacts/$n"/oom-* "$dir/artifacts/$n"/slow-unit-*; do
    [ -f "$a" ] || continue
    mkdir -p "tests/fuzz/regress/$n"
    mv "$a" "tests/fuzz/regress/$n/"
    found=$((found + 1))
    echo "fuzz: $n: $(basename "$a") -> tests/fuzz/regress/$n/"
  done
  printf '%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n' "$n" "$cpu" "$wall" "$runs" "$execs" "$rate" \
    "${cov:-?}" "${pcs:-?}" "${ft:-?}" "${corp:-?}" "$found" "$commit" "$(date -u +%Y-%m-%dT%H:%MZ)" >> "$summary"
  echo "fuzz: $n: ${cpu} CPU s in ${wall} s, ${execs} executions, cov ${cov:-?} of ${pcs:-?}, corpus ${corp:-?}, $found finding(s)"
  if [ $found -gt 0 ] || [ $rc -ne 0 ]; then status=1; fi
done
exit $status
