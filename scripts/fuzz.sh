#!/bin/sh
# fuzz.sh - run each libFuzzer target for SECONDS on one core, one after the
# other: seeds from tests/fuzz/corpus/NAME and tests/fuzz/regress/NAME, the
# growing corpus in DIR/corpus/NAME, logs in DIR/logs. A crash, leak, hang or
# out-of-memory input is copied to tests/fuzz/regress/NAME, which `make check`
# replays from then on; the run then fails.
# usage: scripts/fuzz.sh DIR SECONDS NAME...
set -u
# absolute paths: a target may change directory in its initialisation
dir=$(cd "$1" && pwd); secs=$2; shift 2
src=$(pwd)
summary="$dir/fuzz-summary.tsv"
mkdir -p "$dir/logs"
[ -f "$summary" ] || printf 'target\tseconds\texecutions\texec/s\tcoverage\tfeatures\tcorpus\tfindings\tdate\n' > "$summary"
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
  echo "fuzz: $n for ${secs} s (log $log)"
  # shellcheck disable=SC2086
  "$dir/fuzz/fuzz_$n" "$dir/corpus/$n" $seeds $dict -max_total_time="$secs" -max_len=$maxlen \
    -timeout=10 -rss_limit_mb=2048 -print_final_stats=1 -artifact_prefix="$dir/artifacts/$n/" > "$log" 2>&1
  rc=$?
  execs=$(sed -n 's/^stat::number_of_executed_units: *//p' "$log" | tail -n 1)
  rate=$(sed -n 's/^stat::average_exec_per_sec: *//p' "$log" | tail -n 1)
  last=$(grep -E '^#[0-9]+' "$log" | tail -n 1)
  cov=$(echo "$last" | sed -n 's/.*cov: \([0-9]*\).*/\1/p')
  ft=$(echo "$last" | sed -n 's/.*ft: \([0-9]*\).*/\1/p')
  corp=$(echo "$last" | sed -n 's/.*corp: \([0-9]*\/[0-9a-zA-Z]*\).*/\1/p')
  found=0
  for a in "$dir/artifacts/$n"/crash-* "$dir/artifacts/$n"/leak-* "$dir/artifacts/$n"/timeout-* \
           "$dir/artifacts/$n"/oom-* "$dir/artifacts/$n"/slow-unit-*; do
    [ -f "$a" ] || continue
    mkdir -p "tests/fuzz/regress/$n"
    mv "$a" "tests/fuzz/regress/$n/"
    found=$((found + 1))
    echo "fuzz: $n: $(basename "$a") -> tests/fuzz/regress/$n/"
  done
  printf '%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n' "$n" "$secs" "${execs:-?}" "${rate:-?}" "${cov:-?}" "${ft:-?}" \
    "${corp:-?}" "$found" "$(date -u +%Y-%m-%dT%H:%MZ)" >> "$summary"
  echo "fuzz: $n: ${execs:-?} executions, cov ${cov:-?}, ft ${ft:-?}, corpus ${corp:-?}, $found finding(s), exit $rc"
  if [ $found -gt 0 ] || [ $rc -ne 0 ]; then status=1; fi
done
exit $status
