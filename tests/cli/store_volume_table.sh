#!/usr/bin/env bash
# The volume engine's table in the results store: a first run keeps the table it computed, a
# second run answers other V_{g,n} of that table from the store (proved by a time limit the
# engine's own estimate refuses), with the same text as a run without the store; a run stopped
# by its time limit while the table is being computed leaves no table in the store.
set -u
exe=$1
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
export PSIKAPPA_STORE_ALL=1
unset PSIKAPPA_STORE
pass=0; fail=0
check() { if [ "$1" = ok ]; then pass=$((pass + 1)); else fail=$((fail + 1)); echo "FAIL: $2"; fi; }
sql() { python3 -c 'import sqlite3,sys; print(sqlite3.connect(sys.argv[1]).execute(sys.argv[2]).fetchone()[0])' "$@"; }
tables() { sql "$1" "select count(*) from results where label like '%volume table%' or label like 'index of the volume tables'"; }

# First run: one value of genus 20 makes the table g <= 20, n <= 6.
echo 'int_{20,0} kappa_1^57' > "$tmp/first.pk"
"$exe" --store "$tmp/db.sqlite" --volume-engine "$tmp/first.pk" > "$tmp/first.out" 2>&1
st=$?
[ $st = 0 ] && check ok || { check no "first run failed ($st)"; cat "$tmp/first.out"; }
head=$(sql "$tmp/db.sqlite" "select substr(answer, 1, 19) from results where label like '%volume table%'")
[ "$head" = "volume-table-1 20 6" ] && check ok || check no "no table g <= 20, n <= 6 stored (found: $head)"

# Second run: other entries of that table. Under --max-seconds 0.001 the engine refuses to
# compute them (checked without the store), so an answer can only come from the store.
cat > "$tmp/second.pk" <<'PK'
int_{13,2} kappa_1^38
int_{17,0} exp(2*pi^2*kappa_1)
V_{19,0}
int_{3,6} kappa_1^12
PK
"$exe" --no-store --volume-engine "$tmp/second.pk" > "$tmp/fresh.out" 2>&1
"$exe" --no-store --volume-engine --max-seconds 0.001 "$tmp/second.pk" > "$tmp/refused.out" 2>&1
st=$?
[ $st != 0 ] && grep -q "above --max-seconds\|limits: 0.001 s" "$tmp/refused.out" && check ok \
  || { check no "without the store the time limit did not refuse ($st)"; cat "$tmp/refused.out"; }
"$exe" --store "$tmp/db.sqlite" --volume-engine --max-seconds 0.001 "$tmp/second.pk" > "$tmp/stored.out" 2>&1
st=$?
[ $st = 0 ] && cmp -s "$tmp/fresh.out" "$tmp/stored.out" && check ok \
  || { check no "second run did not answer from the stored table ($st)"; diff "$tmp/fresh.out" "$tmp/stored.out" | head; }

# A value beyond the stored table is computed (and the larger table replaces the smaller one).
echo 'int_{22,1} kappa_1^64' > "$tmp/beyond.pk"
"$exe" --no-store --volume-engine "$tmp/beyond.pk" > "$tmp/beyond.fresh" 2>&1
"$exe" --store "$tmp/db.sqlite" --volume-engine "$tmp/beyond.pk" > "$tmp/beyond.out" 2>&1
cmp -s "$tmp/beyond.fresh" "$tmp/beyond.out" && check ok || check no "a value beyond the stored table differs"
head=$(sql "$tmp/db.sqlite" "select substr(answer, 1, 19) from results where label like '%volume table%'")
[ "$head" = "volume-table-1 22 6" ] && check ok || check no "the larger table did not replace the smaller ($head)"

# Interrupted: the time limit stops the engine during the table g <= 60; nothing of it is stored.
echo 'int_{60,0} kappa_1^177' > "$tmp/long.pk"
"$exe" --store "$tmp/cut.sqlite" --volume-engine --time-limit 0.5 "$tmp/long.pk" > "$tmp/long.out" 2>&1
st=$?
[ $st != 0 ] && check ok || check no "the run under --time-limit 0.5 was not stopped"
n=$( [ -f "$tmp/cut.sqlite" ] && tables "$tmp/cut.sqlite" || echo 0)
[ "$n" = 0 ] && check ok || check no "an interrupted run left $n table rows"

# Concurrent writers: six runs at once store tables none of which covers another; the index must
# list every stored table (each run reads the index, writes its table and rewrites the index in
# one transaction; without it, about one table in ten dropped out of the index here).
for spec in "14 0" "11 2" "8 4" "6 7" "4 10" "3 13"; do
  set -- $spec
  echo "int_{$1,$2} kappa_1^$((3 * $1 - 3 + $2))" > "$tmp/c_$1_$2.pk"
done
for round in 1 2 3; do
  rm -f "$tmp/conc.sqlite"*
  for f in "$tmp"/c_*.pk; do
    "$exe" --store "$tmp/conc.sqlite" --volume-engine "$f" > "$f.out" 2>&1 &
  done
  wait
  listed=$(sql "$tmp/conc.sqlite" "select answer from results where label like 'index of the volume tables'" | grep -c .)
  stored=$(sql "$tmp/conc.sqlite" "select count(*) from results where label like '%(volume table)'")
  [ "$stored" -ge 2 ] && [ "$listed" = "$stored" ] && check ok \
    || check no "concurrent round $round: $stored tables stored, $listed listed in the index"
done

# Import (--import-volumes): a table file in the format of psikappa-volumes-mpi, here written by
# this program itself for g <= 20, n <= 3, goes into a fresh store after every value is checked
# modulo one more prime; a later run reads its entries under a time limit the engine refuses.
cat > "$tmp/gen.pk" <<'PK'
for g in 0..20 {
    for n in 0..3 {
        if 2*g - 2 + n > 0 {
            print g, n, int_{g,n} kappa_1^(3*g - 3 + n) / (3*g - 3 + n)!
        }
    }
}
PK
"$exe" --no-store --volume-engine "$tmp/gen.pk" > "$tmp/t20.txt" 2>&1
[ "$(wc -l < "$tmp/t20.txt")" = 80 ] && check ok || { check no "the table file for the import"; head "$tmp/t20.txt"; }
unset PSIKAPPA_STORE_ALL
"$exe" --store "$tmp/imp.sqlite" --import-volumes "$tmp/t20.txt" > "$tmp/imp.out" 2>&1 \
  && grep -q "^stored V_{g,n}, g <= 20, n <= 3 from .* (every value checked modulo the prime " "$tmp/imp.out" \
  && check ok || { check no "import of a good table"; cat "$tmp/imp.out"; }
printf 'int_{17,2} kappa_1^53\nV_{19,0}\n' > "$tmp/use.pk"
"$exe" --no-store --volume-engine "$tmp/use.pk" > "$tmp/use.fresh" 2>&1
"$exe" --no-store --volume-engine --max-seconds 0.001 "$tmp/use.pk" > /dev/null 2>&1 && check no "no refusal without the store" || check ok
"$exe" --store "$tmp/imp.sqlite" --volume-engine --max-seconds 0.001 "$tmp/use.pk" > "$tmp/use.out" 2>&1 \
  && cmp -s "$tmp/use.fresh" "$tmp/use.out" && check ok || { check no "reading the imported table"; cat "$tmp/use.out"; }
# Refused, with the line, and nothing stored: a changed value (still in lowest terms), a file cut
# short, a line missing inside, a line that is not "g n value", and the store off.
bad_import() {   # NAME EXPECTED-MESSAGE-PART: imports $tmp/NAME.txt into a fresh store
  "$exe" --store "$tmp/$1.sqlite" --import-volumes "$tmp/$1.txt" > "$tmp/$1.out" 2>&1
  local st=$?
  local n=$( [ -f "$tmp/$1.sqlite" ] && tables "$tmp/$1.sqlite" || echo 0)
  [ $st = 1 ] && grep -q -- "$2" "$tmp/$1.out" && [ "$n" = 0 ] && check ok \
    || { check no "import of $1: status $st, $n table rows"; cat "$tmp/$1.out"; }
}
sed 's|^5 2 .*|5 2 1/7|' "$tmp/t20.txt" > "$tmp/changed.txt"
bad_import changed ":19: error: V_{5,2} does not agree with this engine modulo the prime"
sed '$d' "$tmp/t20.txt" > "$tmp/short.txt"
bad_import short "the table ends inside a genus"
sed '/^7 1 /d' "$tmp/t20.txt" > "$tmp/gap.txt"
bad_import gap ":26: error: expected V_{7,1} here, found V_{7,2}"
sed 's|^3 3 .*|3 3 2/4|' "$tmp/t20.txt" > "$tmp/notlow.txt"
bad_import notlow ":12: error: not a line \"g n numerator/denominator\" in lowest terms"
"$exe" --store "$tmp/slow.sqlite" --max-seconds 0.001 --import-volumes "$tmp/t20.txt" > "$tmp/slow.out" 2>&1
[ $? = 1 ] && grep -q "checking this table takes one prime of the volume engine" "$tmp/slow.out" \
  && [ "$( [ -f "$tmp/slow.sqlite" ] && tables "$tmp/slow.sqlite" || echo 0)" = 0 ] && check ok \
  || { check no "the check's cost not held to --max-seconds"; cat "$tmp/slow.out"; }
"$exe" --store "$tmp/dev.sqlite" --import-volumes /dev/zero > "$tmp/dev.out" 2>&1
[ $? = 1 ] && grep -q "not a regular file" "$tmp/dev.out" && check ok || { check no "import of /dev/zero"; cat "$tmp/dev.out"; }
"$exe" --no-store --import-volumes "$tmp/t20.txt" > "$tmp/off.out" 2>&1
[ $? = 1 ] && grep -q "the results store is off" "$tmp/off.out" && check ok || { check no "import with the store off"; cat "$tmp/off.out"; }

echo "store_volume_table: $pass passed, $fail failed"
[ $fail = 0 ]
