#!/usr/bin/env bash
# Allocation-failure injection: for a few short scripts, makes the k-th
# allocation through the memory hooks fail (PSIKAPPA_FAIL_ALLOC=k, see
# src/lang/memory.h), for k = 1, 2, ... up to the number of allocations the script
# makes (every k for the first 60, then a stride that keeps the whole test
# under about a minute), and requires each run to end cleanly: exit status 0
# (the failing allocation was not needed) or 1 with an "out of memory" error,
# never a signal (a crash or an abort) and never another status.
# usage: alloc-fail.sh PATH/TO/psikappa
set -u
exe=$1
export PSIKAPPA_STORE=off
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
runs=0
fail=0
dense=60                                  # every k up to here
budget=${PSIKAPPA_ALLOC_FAIL_RUNS:-120}   # runs per script beyond the dense start

check_script() {
  local name=$1; shift
  local count
  count=$(PSIKAPPA_FAIL_ALLOC=0 "$exe" "$@" 2>&1 >/dev/null | sed -n 's/^psikappa: \([0-9]*\) allocations$/\1/p')
  if [ -z "$count" ] || [ "$count" -lt 1 ]; then
    echo "FAIL $name: no allocation count (PSIKAPPA_FAIL_ALLOC=0)"; fail=1; return
  fi
  local stride=$(( (count - dense) / budget + 1 ))
  [ "$stride" -lt 1 ] && stride=1
  local k=1 status
  while [ "$k" -le "$count" ]; do
    PSIKAPPA_FAIL_ALLOC=$k "$exe" "$@" > "$tmp/out" 2> "$tmp/err" < /dev/null
    status=$?
    runs=$((runs + 1))
    if [ "$status" -ne 0 ] && ! { [ "$status" -eq 1 ] && grep -q "error: out of memory" "$tmp/err"; }; then
      echo "FAIL $name: allocation $k of $count failed with status $status; stderr:"
      head -5 "$tmp/err"
      fail=1
      return
    fi
    if [ "$k" -lt "$dense" ]; then k=$((k + 1)); else k=$((k + stride)); fi
  done
  echo "ok $name: $count allocations"
}

cat > "$tmp/classes.pk" <<'PK'
print int_{2,0} kappa_1^3, int_{1,2} (kappa_2 + psi_1*kappa_1)
explain int_{2,0} kappa_1^3
PK
check_script correlator -e '<tau_2 tau_3>_2' -e 'print <tau_1>_1 == 1/24'
check_script classes "$tmp/classes.pk"
check_script series -e 'var x' -e 'let s = exp(series(x + x^2, x, 12))' -e 'print coeff(s, x^5), log(s)'
check_script decimal --format decimal --digits 30 -e 'pi^2/6' -e 'decimal(1/7, 12)'
check_script lists -e 'let xs = seq_{g=1..5} <tau_{3*g-2}>_g' -e 'print xs, xs[3]' -e 'var L_{1..2}' -e '(L_1 + L_2)^3'
check_script volume -e 'V_{1,1}' -e 'int_{2,1} exp(2*pi^2*kappa_1)'
check_script errors -e 'let f(k) = f(k + 1)' -e 'f(0)'
echo "alloc-fail: $runs runs"
exit $fail
