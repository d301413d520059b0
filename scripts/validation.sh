#!/bin/sh
# validation.sh - write docs/validation.md from the log the tests append to.
set -eu
log=${1:-build/validation.tsv}
cat <<'HEAD'
# Validation: every outside check

Written by `make check` from the checks the tests make (tests/testutil.h,
CHECK_REL / CHECK_ABS): each row is one assertion against a value from outside
the project, with its source. Do not edit by hand.

Sources marked "from memory" are values recalled, not read in a publication;
"common practice" marks a fact of the trade. See ../shared/references in the
development tree, and docs/method.md for the equations.

> These are preliminary engineering estimates. Nothing here validates a
> parachute that carries people.

HEAD
if [ ! -s "$log" ]; then echo "(no checks logged)"; exit 0; fi
total=$(wc -l < "$log")
failed=$(awk -F'\t' '$7 != "pass"' "$log" | wc -l)
echo "$total checks, $failed failed."
echo
awk -F'\t' '
  $1 != cur { cur = $1; printf "\n## %s\n\n| quantity | source | expected | result | tolerance | |\n| --- | --- | --- | --- | --- | --- |\n", cur }
  { gsub(/\|/, "/", $2); gsub(/\|/, "/", $3); printf "| %s | %s | %s | %s | %s | %s |\n", $2, $3, $4, $5, $6, $7 }
' "$log"
