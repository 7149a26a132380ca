#!/usr/bin/env bash
# The results store: a cached answer is identical to a fresh one, and a
# damaged store file is reported and rebuilt, never trusted.
set -u
exe=$1
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
export PSIKAPPA_STORE_ALL=1
unset PSIKAPPA_STORE
cat > "$tmp/q.pk" <<'PK'
var s, L_{1..2}
int_{2,1} (kappa_1^2*kappa_2 + psi_1^4)
int_{1,2} exp(s*kappa_1 + L_1^2*psi_1/2 + L_2^2*psi_2/2)
int_{3,0} exp(2*pi^2*kappa_1)
PK
pass=0; fail=0
check() { if [ "$1" = ok ]; then pass=$((pass + 1)); else fail=$((fail + 1)); echo "FAIL: $2"; fi; }
"$exe" --no-store "$tmp/q.pk" > "$tmp/fresh" 2>&1
"$exe" --store "$tmp/db.sqlite" "$tmp/q.pk" > "$tmp/first" 2>&1
"$exe" --store "$tmp/db.sqlite" "$tmp/q.pk" > "$tmp/cached" 2>&1
cmp -s "$tmp/fresh" "$tmp/first" && check ok || check no "first stored run differs from a run without store"
cmp -s "$tmp/fresh" "$tmp/cached" && check ok || check no "cached answers differ from fresh ones"
rows=$(python3 -c 'import sqlite3,sys; print(sqlite3.connect(sys.argv[1]).execute("select count(*) from results").fetchone()[0])' "$tmp/db.sqlite")
[ "$rows" -ge 3 ] && check ok || check no "expected at least 3 stored answers, found $rows"
head -c 4096 /dev/urandom > "$tmp/db.sqlite"
"$exe" --store "$tmp/db.sqlite" "$tmp/q.pk" > "$tmp/after" 2> "$tmp/after.err"
cmp -s "$tmp/fresh" "$tmp/after" && check ok || check no "answers after corruption differ"
grep -qi "corrupt\|damaged\|not a database" "$tmp/after.err" && check ok || { check no "corruption was not reported"; cat "$tmp/after.err"; }
"$exe" --store "$tmp/db.sqlite" "$tmp/q.pk" > "$tmp/again" 2> "$tmp/again.err"
cmp -s "$tmp/fresh" "$tmp/again" && [ ! -s "$tmp/again.err" ] && check ok || check no "rebuilt store does not serve clean answers"
echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ]
