#!/usr/bin/env bash
# The results store from the command line: a cached answer is identical to a
# fresh one (also for integrands whose printed form is elided), a damaged store
# is reported, kept aside and rebuilt, and files that are not a psikappa store
# (garbage, another program's database, a pipe, a device, a folder) are refused
# and left exactly as they were, with no journal created beside them.
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
int_{2,1} lambda_1*psi_1^3
int_{2,1} kappa_1*psi_1^3
(int_{2,1} ch_1*psi_1^3) + (int_{2,1} lambda_2*psi_1^2)
PK
pass=0; fail=0
check() { if [ "$1" = ok ]; then pass=$((pass + 1)); else fail=$((fail + 1)); echo "FAIL: $2"; fi; }
sql() { python3 -c 'import sqlite3,sys; print(sqlite3.connect(sys.argv[1]).execute(sys.argv[2]).fetchone()[0])' "$@"; }
"$exe" --no-store "$tmp/q.pk" > "$tmp/fresh" 2>&1
"$exe" --store "$tmp/db.sqlite" "$tmp/q.pk" > "$tmp/first" 2>&1
"$exe" --store "$tmp/db.sqlite" "$tmp/q.pk" > "$tmp/cached" 2>&1
cmp -s "$tmp/fresh" "$tmp/first" && check ok || check no "first stored run differs from a run without store"
cmp -s "$tmp/fresh" "$tmp/cached" && check ok || check no "cached answers differ from fresh ones"
rows=$(sql "$tmp/db.sqlite" "select count(*) from results")
[ "$rows" -ge 3 ] && check ok || check no "expected at least 3 stored answers, found $rows"
[ "$(sql "$tmp/db.sqlite" "pragma application_id")" = 1886612273 ] && check ok || check no "application id not set"

# Integrals with Norbury's class Theta go through the store like the others: stored once, and a
# second run answers the same from it.
cat > "$tmp/theta.pk" <<'PK'
int_{5,1} Theta*exp(2*pi^2*kappa_1 + psi_1)
int_{4,2} Theta*kappa_1*kappa_2*psi_1^0
PK
"$exe" --no-store "$tmp/theta.pk" > "$tmp/theta.fresh" 2>&1
"$exe" --store "$tmp/theta.sqlite" "$tmp/theta.pk" > "$tmp/theta.first" 2>&1
"$exe" --store "$tmp/theta.sqlite" "$tmp/theta.pk" > "$tmp/theta.cached" 2>&1
cmp -s "$tmp/theta.fresh" "$tmp/theta.first" && cmp -s "$tmp/theta.fresh" "$tmp/theta.cached" && check ok \
  || check no "Theta answers through the store differ from fresh ones"
[ "$(sql "$tmp/theta.sqlite" "select count(*) from results where label like '%Theta%'")" = 2 ] && check ok \
  || check no "the two Theta integrals were not stored"

# Two integrands that differ deep inside a long product (the printed form is elided there):
# each gets its own answer, in the same run and in the next one.
cat > "$tmp/deep.pk" <<'PK'
let a = int_{15,1} prod_{i=1..140000} (if i == 1 then psi_1*kappa_1^42 else 1)
let b = int_{15,1} prod_{i=1..140000} (if i == 1 then 2*psi_1*kappa_1^42 else 1)
print b/a
let c = int_{15,1} prod_{i=1..140000} (if i == 139999 then 3*psi_1*kappa_1^42 else 1)
print c/a
PK
printf '2\n3\n' > "$tmp/deep.want"
for run in 1 2; do
  "$exe" --store "$tmp/deep.sqlite" "$tmp/deep.pk" > "$tmp/deep.out" 2>&1
  cmp -s "$tmp/deep.want" "$tmp/deep.out" && check ok || { check no "deep integrands, run $run:"; cat "$tmp/deep.out"; }
done

# An interior page overwritten: reported, kept aside under a new name, rebuilt; twice.
for n in 1 2; do
  "$exe" --store "$tmp/db.sqlite" "$tmp/q.pk" > /dev/null 2>&1
  size=$(stat -c %s "$tmp/db.sqlite")
  [ "$size" -ge 8192 ] || { check no "store too small to damage ($size bytes)"; continue; }
  head -c 4096 /dev/urandom | dd of="$tmp/db.sqlite" bs=4096 seek=1 conv=notrunc status=none
  "$exe" --store "$tmp/db.sqlite" "$tmp/q.pk" > "$tmp/after" 2> "$tmp/after.err"
  cmp -s "$tmp/fresh" "$tmp/after" && check ok || check no "answers after damage differ ($n)"
  grep -q "damaged.*kept as $tmp/db.sqlite.damaged-$n" "$tmp/after.err" && check ok \
    || { check no "damage $n was not reported with its new name"; cat "$tmp/after.err"; }
  [ "$(stat -c %s "$tmp/db.sqlite.damaged-$n")" = "$size" ] && check ok || check no "damaged copy $n not kept whole"
done
[ -f "$tmp/db.sqlite.damaged-1" ] && check ok || check no "first damaged copy was overwritten or removed"
"$exe" --store "$tmp/db.sqlite" "$tmp/q.pk" > "$tmp/again" 2> "$tmp/again.err"
cmp -s "$tmp/fresh" "$tmp/again" && [ ! -s "$tmp/again.err" ] && check ok || check no "rebuilt store does not serve clean answers"

# Refused, untouched: garbage, another program's database (WAL mode too), a newer format.
digest() { if [ -f "$1" ]; then sha256sum "$1"; else stat -c '%F %i' "$1"; fi; }   # a pipe would block
refused() {  # path, word expected in the message, what
  local before; before=$(digest "$1")
  "$exe" --store "$1" "$tmp/q.pk" > "$tmp/r.out" 2> "$tmp/r.err"
  local st=$?
  cmp -s "$tmp/fresh" "$tmp/r.out" && [ $st = 0 ] && check ok || check no "$3: answers or status ($st) wrong"
  grep -q "refused results store $1: .*$2" "$tmp/r.err" && check ok || { check no "$3: no refusal message"; cat "$tmp/r.err"; }
  [ "$(digest "$1")" = "$before" ] && check ok || check no "$3: file changed"
  for side in -wal -shm -journal .damaged-1; do
    [ -e "$1$side" ] && check no "$3: $1$side was created" || check ok
  done
}
: > "$tmp/empty.sqlite"
refused "$tmp/empty.sqlite" "empty file" "an empty file"
head -c 8192 /dev/urandom > "$tmp/garbage.sqlite"
refused "$tmp/garbage.sqlite" "not an SQLite database" "garbage"
python3 -c 'import sqlite3,sys; c=sqlite3.connect(sys.argv[1]); c.execute("create table accounts(id, balance)"); c.execute("insert into accounts values(1, 2.5)"); c.commit()' "$tmp/other.sqlite"
refused "$tmp/other.sqlite" "another program" "another program's database"
python3 -c 'import sqlite3,sys; c=sqlite3.connect(sys.argv[1]); c.execute("pragma journal_mode=wal"); c.execute("pragma application_id=42"); c.execute("create table t(x)"); c.commit(); c.close()' "$tmp/walother.sqlite"
refused "$tmp/walother.sqlite" "0x0000002a" "another program's WAL database"
cp "$tmp/db.sqlite" "$tmp/newer.sqlite"
python3 -c 'import sqlite3,sys; c=sqlite3.connect(sys.argv[1]); c.execute("pragma user_version=7"); c.commit(); c.close()' "$tmp/newer.sqlite"
refused "$tmp/newer.sqlite" "newer" "a newer format"
mkfifo "$tmp/fifo"
refused "$tmp/fifo" "pipe" "a named pipe"
ln -s "$tmp/nowhere/x.sqlite" "$tmp/dangling"
refused "$tmp/dangling" "symbolic link to nothing" "a dangling symbolic link"
[ -e "$tmp/nowhere" ] && check no "a dangling link's target folder was created" || check ok
mkdir "$tmp/folder"
refused "$tmp/folder" "folder" "a folder"
# a device: nothing may appear in /dev (only checked when /dev/null-journal is not there already)
if [ ! -e /dev/null-journal ] && [ ! -e /dev/null-wal ]; then
  "$exe" --store /dev/null "$tmp/q.pk" > "$tmp/r.out" 2> "$tmp/r.err"
  grep -q "refused results store /dev/null: it is a device" "$tmp/r.err" && check ok || { check no "device not refused"; cat "$tmp/r.err"; }
  [ -e /dev/null-journal ] || [ -e /dev/null-wal ] && check no "a journal appeared in /dev" || check ok
  cmp -s "$tmp/fresh" "$tmp/r.out" && check ok || check no "answers with a device as store"
fi
echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ]
