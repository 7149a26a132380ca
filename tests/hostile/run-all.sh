#!/usr/bin/env bash
# Runs every hostile case (or the ones named) through tests/golden/run-one.sh:
#
#   tests/hostile/run-all.sh PSIKAPPA [CASE ...]
#
# PSIKAPPA is the psikappa executable; a CASE is a name such as div_literal
# or a path to its .pk file. Each case must finish within
# PSIKAPPA_HOSTILE_TIMEOUT seconds (default 60).
#
# With PSIKAPPA_VALGRIND=1 each case is then run a second time under valgrind
# (memcheck, full leak check; definite and indirect leaks count as errors).
# The output must still match, and any valgrind error fails the case; the
# valgrind report is printed. The timeout under valgrind is
# PSIKAPPA_VALGRIND_TIMEOUT seconds (default 900).
#
# Prints one line per case (PASS or FAIL, with the differences of a failure)
# and ends with "N passed, N failed". Exit status 0 when nothing failed.
set -u
here=$(cd "$(dirname "$0")" && pwd)
run_one="$here/../golden/run-one.sh"
if [ $# -lt 1 ]; then
  echo "usage: $0 PSIKAPPA [CASE ...]" >&2
  exit 2
fi
exe=$1
shift
case $exe in /*) ;; *) exe="$(pwd)/$exe" ;; esac
if [ ! -x "$exe" ]; then
  echo "$0: $exe is not an executable" >&2
  exit 2
fi
timeout_native=${PSIKAPPA_HOSTILE_TIMEOUT:-60}
timeout_valgrind=${PSIKAPPA_VALGRIND_TIMEOUT:-900}
use_valgrind=${PSIKAPPA_VALGRIND:-0}

cases=()
if [ $# -gt 0 ]; then
  for c in "$@"; do
    c=${c%.pk}
    c=${c##*/}
    cases+=("$here/$c.pk")
  done
else
  cases=("$here"/*.pk)
fi

tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

if [ "$use_valgrind" = 1 ]; then
  if ! command -v valgrind >/dev/null; then
    echo "$0: PSIKAPPA_VALGRIND=1 but valgrind is not installed" >&2
    exit 2
  fi
  # run-one.sh runs "$exe" from the case's folder; this wrapper puts valgrind
  # in front of it and keeps valgrind's report out of the compared stderr.
  cat > "$tmp/under-valgrind" <<EOF
#!/bin/sh
exec valgrind -q --error-exitcode=99 --leak-check=full --show-leak-kinds=definite,indirect \\
  --errors-for-leak-kinds=definite,indirect --log-file="$tmp/valgrind.log" "$exe" "\$@"
EOF
  chmod +x "$tmp/under-valgrind"
fi

passed=0
failed=0
for script in "${cases[@]}"; do
  name=$(basename "$script" .pk)
  if [ ! -f "$script" ]; then
    echo "FAIL $name: no such case $script"
    failed=$((failed + 1))
    continue
  fi
  timeout "$timeout_native" "$run_one" "$exe" "$script" > "$tmp/report" 2>&1
  rc=$?
  if [ "$rc" = 0 ] && [ "$use_valgrind" = 1 ]; then
    rm -f "$tmp/valgrind.log"
    timeout "$timeout_valgrind" "$run_one" "$tmp/under-valgrind" "$script" > "$tmp/report" 2>&1
    rc=$?
    if [ "$rc" != 0 ] || [ -s "$tmp/valgrind.log" ]; then
      [ "$rc" = 0 ] && rc=1
      { echo "(under valgrind)"; [ -f "$tmp/valgrind.log" ] && cat "$tmp/valgrind.log"; } >> "$tmp/report"
    fi
  fi
  if [ "$rc" = 0 ]; then
    echo "PASS $name"
    passed=$((passed + 1))
  else
    [ "$rc" = 124 ] && echo "timed out" >> "$tmp/report"
    echo "FAIL $name"
    # Reports of the binary and very long cases are cut to stay readable.
    head -c 4000 "$tmp/report" | sed 's/^/    /'
    echo
    failed=$((failed + 1))
  fi
done
echo "$passed passed, $failed failed"
[ "$failed" = 0 ]
