#!/usr/bin/env bash
# psikappa-volumes-mpi (property tests: two drivers of the same engine must agree):
# - the table over 1, 2 and 3 MPI processes is byte for byte the table of the threaded engine
#   (--table), and --check confirms it entry by entry in-process;
# - a rank that leaves mid-run (first batch, later batch, rank 0 itself) or reports a failed
#   batch makes the run fail: nonzero status, a message naming the rank, and no table at all.
# - psikappa --import-volumes takes the table of a 2-process run into a results store.
# usage: volumes.sh PATH/TO/mpiexec PATH/TO/psikappa-volumes-mpi [PATH/TO/psikappa]
set -u
mpiexec=$1
exe=$2
psikappa=${3:-}
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
pass=0; fail=0
check() { if [ "$1" = ok ]; then pass=$((pass + 1)); else fail=$((fail + 1)); echo "FAIL: $2"; fi; }
run_np() { local np=$1; shift; "$mpiexec" --oversubscribe --allow-run-as-root -np "$np" "$exe" "$@"; }

# same_table NP G N: the MPI table equals the threaded one, status 0, stderr empty
same_table() {
  local np=$1 g=$2 n=$3
  "$exe" --table --threads 2 "$g" "$n" > "$tmp/ref" 2> "$tmp/ref.err" || check no "--table $g $n failed"
  run_np "$np" "$g" "$n" > "$tmp/out" 2> "$tmp/err"
  local status=$?
  if [ "$status" -eq 0 ] && [ -s "$tmp/ref" ] && cmp -s "$tmp/ref" "$tmp/out" && [ ! -s "$tmp/err" ]; then
    check ok
  else
    check no "np $np, g <= $g, n <= $n: status $status, $(wc -l < "$tmp/out") of $(wc -l < "$tmp/ref") lines, stderr: $(head -3 "$tmp/err")"
  fi
}

same_table 2 30 3
if [ -n "$psikappa" ]; then
  cp "$tmp/out" "$tmp/mpi-30-3.txt"
  "$psikappa" --store "$tmp/imp.sqlite" --import-volumes "$tmp/mpi-30-3.txt" > "$tmp/imp.out" 2>&1 \
    && grep -q '^stored V_{g,n}, g <= 30, n <= 3 ' "$tmp/imp.out" && check ok \
    || check no "import of the 2-process table: $(cat "$tmp/imp.out")"
fi
same_table 1 12 3
same_table 3 12 3

# the line count is the number of stable (g, n): g <= 30, n <= 3 has 31*4 - 4 of them
[ "$(wc -l < "$tmp/ref")" -gt 0 ] && "$exe" --table 30 3 | awk 'END { exit !(NR == 120) }' \
  && check ok || check no "--table 30 3 does not print 120 lines"

run_np 2 --check 20 2 > "$tmp/out" 2> "$tmp/err"
status=$?
if [ "$status" -eq 0 ] && grep -q '^check: all 63 entries equal' "$tmp/err" && [ -s "$tmp/out" ]; then
  check ok
else
  check no "--check: status $status, stderr: $(cat "$tmp/err")"
fi

# faulty RANK-MESSAGE ARGS...: nonzero status, empty stdout, the message on stderr
faulty() {
  local want=$1; shift
  run_np 2 "$@" > "$tmp/out" 2> "$tmp/err"
  local status=$?
  if [ "$status" -ne 0 ] && [ ! -s "$tmp/out" ] && grep -q -- "$want" "$tmp/err"; then
    check ok
  else
    check no "$*: status $status, $(wc -c < "$tmp/out") bytes on stdout, stderr: $(head -5 "$tmp/err")"
  fi
}
faulty 'rank 1: leaving at batch 1' --fault-exit=1:1 30 3
faulty 'rank 1: leaving at batch 2' --fault-exit=1:2 30 3
faulty 'rank 0: leaving at batch 2' --fault-exit=0:2 30 3
faulty 'rank 1 failed on its share of primes: failure injected' --fault-fail=1:2 30 3

"$exe" 30 > /dev/null 2> "$tmp/err"
[ $? -eq 2 ] && grep -q '^usage:' "$tmp/err" && check ok || check no "missing argument not refused"

echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ]
