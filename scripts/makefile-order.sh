#!/bin/sh
# makefile-order.sh - the Makefile reads pkg-config flags only after the deps
# step, never when make reads it (on a fresh machine the packages the flags
# come from do not exist yet at that moment). A fake pkg-config first on PATH
# logs every call, prints a marker flag and fails; then:
#   1. make -n of the deps stamp alone must not call it at all (nothing at parse time);
#   2. make -n of the whole build must list the deps step before the first
#      command that carries the marker (the flags are expanded after it).
# Run by `make check`; needs no packages.
set -u
root=$(cd "$(dirname "$0")/.." && pwd)
tmp=$(mktemp -d /tmp/sinkrate-mk-XXXXXX)
trap 'rm -rf "$tmp"' EXIT INT TERM
unset MAKEFLAGS MFLAGS MAKELEVEL
fail() { echo "makefile-order: FAIL: $*"; exit 1; }

mkdir "$tmp/bin"
cat > "$tmp/bin/pkg-config" <<'EOS'
#!/bin/sh
echo "$*" >> "$SR_PKG_LOG"
echo "-DFAKE_PKG_CONFIG_FLAG"
exit 1
EOS
chmod +x "$tmp/bin/pkg-config"
SR_PKG_LOG="$tmp/calls"
export SR_PKG_LOG
: > "$SR_PKG_LOG"
b="$tmp/build"

PATH="$tmp/bin:$PATH" make -n -C "$root" --no-print-directory B="$b" "$b/.deps-ok" > "$tmp/stamp.out" 2>&1 ||
  fail "make -n of the deps stamp failed: $(head -3 "$tmp/stamp.out")"
[ -s "$SR_PKG_LOG" ] && fail "pkg-config ran while make read the Makefile: $(head -1 "$SR_PKG_LOG")"
grep -q 'scripts/deps.sh build' "$tmp/stamp.out" || fail "the deps stamp does not run scripts/deps.sh build"

PATH="$tmp/bin:$PATH" make -n -C "$root" --no-print-directory B="$b" all > "$tmp/all.out" 2>&1 ||
  fail "make -n of the build failed: $(head -3 "$tmp/all.out")"
deps=$(grep -n 'scripts/deps.sh build' "$tmp/all.out" | head -1 | cut -d: -f1)
flag=$(grep -n 'FAKE_PKG_CONFIG_FLAG' "$tmp/all.out" | head -1 | cut -d: -f1)
[ -n "$deps" ] || fail "the build plan has no deps step"
[ -n "$flag" ] || fail "the build plan never asks pkg-config for its flags"
[ "$deps" -lt "$flag" ] || fail "pkg-config flags are used (line $flag) before the deps step (line $deps)"
# one pkg-config call per set of flags: cached after their first use
calls=$(wc -l < "$SR_PKG_LOG")
[ "$calls" -le 3 ] || fail "pkg-config ran $calls times; the flags should be read once each"
echo "makefile-order: pkg-config flags are read after the deps step ($calls call(s), none at parse time)"
