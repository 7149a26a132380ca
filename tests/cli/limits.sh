#!/usr/bin/env bash
# Command-line limits and the messages around them:
# - every option value out of its range is refused on the command line
#   (status 2, "psikappa: OPT expects ..., got 'X'"), never capped silently;
# - --time-limit holds within about a second, also inside the volume engine
#   and while another process keeps the results store locked; a limit too
#   small to arm the timer is refused, not ignored;
# - --max-seconds refuses a reduction predicted to be too slow;
# - load of a symbolic-link loop (or an unreadable file) says so;
# - a bare carriage return is an error; very long sums print in full.
# usage: limits.sh PATH/TO/psikappa
set -u
exe=$(cd "$(dirname "$1")" && pwd)/$(basename "$1")
export PSIKAPPA_STORE=off
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
pass=0; fail=0
check() { if [ "$1" = ok ]; then pass=$((pass + 1)); else fail=$((fail + 1)); echo "FAIL: $2"; fi; }
now() { date +%s.%N; }
elapsed_below() { python3 -c 'import sys; sys.exit(0 if float(sys.argv[2]) - float(sys.argv[1]) < float(sys.argv[3]) else 1)' "$@"; }

# refuse OPT VALUE EXPECTED-MESSAGE: status 2, exactly that one line on stderr, nothing run
refuse() {
  local opt=$1 val=$2 want=$3
  "$exe" "$opt" "$val" -e 'print "ran"' > "$tmp/out" 2> "$tmp/err"
  local status=$?
  if [ "$status" -eq 2 ] && [ ! -s "$tmp/out" ] && [ "$(cat "$tmp/err")" = "$want" ]; then
    check ok
  else
    check no "$opt $val: status $status, stderr '$(cat "$tmp/err")', want '$want'"
  fi
}
refuse --digits 0.5 "psikappa: --digits expects a whole number from 1 to 1000000, got '0.5'"
refuse --digits 1e9 "psikappa: --digits expects a whole number from 1 to 1000000, got '1e9'"
refuse --digits 0 "psikappa: --digits expects a whole number from 1 to 1000000, got '0'"
refuse --digits abc "psikappa: --digits expects a whole number from 1 to 1000000, got 'abc'"
refuse --precision 0 "psikappa: --precision expects a whole number from 1 to 100000, got '0'"
refuse --precision 1e6 "psikappa: --precision expects a whole number from 1 to 100000, got '1e6'"
refuse --precision -30 "psikappa: --precision expects a whole number from 1 to 100000, got '-30'"
refuse --precision 30x "psikappa: --precision expects a whole number from 1 to 100000, got '30x'"
refuse --max-depth 5000000 "psikappa: --max-depth expects a whole number from 1 to 1000000, got '5000000'"
refuse --max-depth 2.5 "psikappa: --max-depth expects a whole number from 1 to 1000000, got '2.5'"
refuse --max-terms 1e30 "psikappa: --max-terms expects a whole number from 1 to 1e15, got '1e30'"
refuse --max-table -4 "psikappa: --max-table expects a whole number from 1 to 1e15, got '-4'"
refuse --max-memory 0 "psikappa: --max-memory expects a number of gibibytes from 0.001 to 1048576, got '0'"
refuse --max-seconds inf "psikappa: --max-seconds expects a number of seconds from 0.001 to 1e9, got 'inf'"
refuse --time-limit 1e-7 "psikappa: --time-limit expects a number of seconds from 0.001 to 1e8, got '1e-7'"
refuse --time-limit 0.0000009 "psikappa: --time-limit expects a number of seconds from 0.001 to 1e8, got '0.0000009'"
refuse --time-limit nan "psikappa: --time-limit expects a number of seconds from 0.001 to 1e8, got 'nan'"
refuse --format yaml "psikappa: --format expects one of exact, decimal, latex, csv, json, got 'yaml'"
refuse --lib -e "psikappa: --lib expects a folder, got '-e'"
"$exe" --digits > /dev/null 2> "$tmp/err"; status=$?
[ "$status" -eq 2 ] && grep -qx "psikappa: --digits expects a whole number from 1 to 1000000, got nothing" "$tmp/err" \
  && check ok || check no "--digits without a value: status $status, $(cat "$tmp/err")"
# whole numbers may be written with an exponent, and the smallest time limit arms the timer
out=$("$exe" --max-terms 2e7 --digits 1e1 --format decimal -e 'pi' 2>&1)
[ "$out" = "3.141592654" ] && check ok || check no "--digits 1e1 --max-terms 2e7: got '$out'"
t0=$(now); "$exe" --time-limit 0.001 -e 'for i in 1..10^9 { }' > /dev/null 2>&1; status=$?; t1=$(now)
[ "$status" -eq 124 ] && elapsed_below "$t0" "$t1" 2 && check ok || check no "--time-limit 0.001: status $status"

# the volume engine stops within about a second of the limit (it used to run on for 10-15 s)
t0=$(now)
"$exe" --time-limit 1 --max-seconds 100000 -e 'int_{120,0} exp(2*pi^2*kappa_1)' > /dev/null 2> "$tmp/err"
status=$?; t1=$(now)
[ "$status" -eq 124 ] && grep -q "time limit reached" "$tmp/err" && elapsed_below "$t0" "$t1" 3 \
  && check ok || check no "volume engine under --time-limit 1: status $status after $(python3 -c "print(round($t1-$t0,1))") s"

# --max-seconds refuses a slow reduction before any work (estimate about 9 s)
t0=$(now)
"$exe" --max-seconds 2 -e 'int_{12,0} kappa_1^8*kappa_2^5*kappa_3^2*kappa_4*kappa_5' > /dev/null 2> "$tmp/err"
status=$?; t1=$(now)
[ "$status" -eq 1 ] && grep -q "above the limit of 2 s (raise it with --max-seconds S)" "$tmp/err" \
  && elapsed_below "$t0" "$t1" 1 && check ok || check no "--max-seconds 2 on a slow reduction: status $status, $(head -1 "$tmp/err")"

# a store locked by another process: the answers do not each wait out the busy timeout
unset PSIKAPPA_STORE
PSIKAPPA_STORE_ALL=1 "$exe" --store "$tmp/db.sqlite" -e 'int_{2,0} kappa_1^3' > /dev/null 2>&1
python3 - "$tmp/db.sqlite" "$tmp/locked" <<'PY' &
import sqlite3, sys, time
c = sqlite3.connect(sys.argv[1], isolation_level=None)
c.execute("BEGIN EXCLUSIVE")
open(sys.argv[2], "w").close()
time.sleep(15)
c.execute("COMMIT")
PY
locker=$!
for _ in $(seq 50); do [ -e "$tmp/locked" ] && break; sleep 0.1; done
t0=$(now)
PSIKAPPA_STORE_ALL=1 "$exe" --store "$tmp/db.sqlite" --time-limit 1 -e 'int_{3,0} kappa_1^6' -e 'int_{4,0} kappa_1^9' \
  -e 'for i in 1..10^9 { }' > /dev/null 2>&1
status=$?; t1=$(now)
kill "$locker" 2>/dev/null; wait "$locker" 2>/dev/null
[ "$status" -eq 124 ] && elapsed_below "$t0" "$t1" 3 && check ok \
  || check no "locked store under --time-limit 1: status $status after $(python3 -c "print(round($t1-$t0,1))") s"
export PSIKAPPA_STORE=off

# load of a symbolic-link loop says so (it used to say "cannot find")
ln -s loop_b.pk "$tmp/loop_a.pk"; ln -s loop_a.pk "$tmp/loop_b.pk"
printf 'print "before"\nload "loop_a.pk"\n' > "$tmp/main.pk"
(cd "$tmp" && "$exe" main.pk > out 2> err); status=$?
[ "$status" -eq 1 ] && [ "$(cat "$tmp/out")" = before ] \
  && grep -q "^main.pk:2:1: error: cannot load 'loop_a.pk': it is a loop of symbolic links (loop_a.pk)$" "$tmp/err" \
  && check ok || check no "load of a symlink loop: status $status, $(head -1 "$tmp/err")"
# an unreadable file (root reads everything: checked only for other users)
if [ "$(id -u)" -ne 0 ]; then
  printf 'print 1\n' > "$tmp/secret.pk"; chmod 000 "$tmp/secret.pk"
  printf 'load "secret.pk"\n' > "$tmp/main2.pk"
  (cd "$tmp" && "$exe" main2.pk > out 2> err); status=$?
  [ "$status" -eq 1 ] && grep -q "cannot load 'secret.pk': it is not readable (permission denied)" "$tmp/err" \
    && check ok || check no "load of an unreadable file: status $status, $(head -1 "$tmp/err")"
fi

# a bare carriage return in -e code is an error at its place, not a join of two lines
"$exe" -e $'print 1\rprint 2' > "$tmp/out" 2> "$tmp/err"; status=$?
[ "$status" -eq 1 ] && [ ! -s "$tmp/out" ] && grep -q "^<-e>:1:8: error: a carriage return" "$tmp/err" \
  && check ok || check no "bare CR in -e: status $status, $(head -1 "$tmp/err")"

# a sum of 300000 terms built by a loop prints in full, exact and LaTeX (the
# LaTeX printer recursed once per term and crashed; both copied the text once
# per level); the output is checked by its size and ends, not kept in a file
for fmt in exact latex; do
  "$exe" --format $fmt -e 'let c = sum_{i=1..300000} psi_1' -e 'c' > "$tmp/out" 2> "$tmp/err"; status=$?
  if [ $fmt = exact ]; then term='psi_1'; else term='\psi_{1}'; fi
  want=$(( 4 + (${#term} + 3) * 300000 - 3 + 1 ))   # "0 + " then the terms joined by " + ", newline
  size=$(wc -c < "$tmp/out")
  [ "$status" -eq 0 ] && [ ! -s "$tmp/err" ] && [ "$size" -eq "$want" ] && [ "$(head -c 4 "$tmp/out")" = "0 + " ] \
    && check ok || check no "printing a 300000-term sum in $fmt: status $status, $size bytes (want $want)"
done

echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ]
