#!/usr/bin/env bash
# Faults of the results store, as embedded databases are tested: the program
# killed (kill -9) at random points of a loop that writes answers, the file
# truncated at every page boundary, two writers at once, a read-only file and
# a read-only folder, a full disk (a 2 MiB tmpfs when one can be mounted, else
# a file-size limit). After each fault the store may be reported damaged or
# unusable, but every answer printed must equal the one of a run without the
# store, and the store must come back clean.
set -u
exe=$(cd "$(dirname "$1")" && pwd)/$(basename "$1")
tmp=$(mktemp -d)
mounted=""
cleanup() { [ -n "$mounted" ] && umount "$mounted" 2>/dev/null; rm -rf "$tmp"; }
trap cleanup EXIT
chmod 755 "$tmp"
export PSIKAPPA_STORE_ALL=1
unset PSIKAPPA_STORE
pass=0; fail=0
check() { if [ "$1" = ok ]; then pass=$((pass + 1)); else fail=$((fail + 1)); echo "FAIL: $2"; fi; }
integrity() { python3 -c 'import sqlite3,sys; print(sqlite3.connect(sys.argv[1]).execute("pragma integrity_check").fetchone()[0])' "$1" 2>&1; }
rows() { python3 -c 'import sqlite3,sys; print(sqlite3.connect(sys.argv[1]).execute("select count(*) from results").fetchone()[0])' "$1" 2>&1; }

# q.pk: 78 integrals (each one row); big.pk: some 400, to be killed while it writes
cat > "$tmp/q.pk" <<'PK'
for g in 1..4 {
  for n in 1..3 {
    for k in 1..(3*g - 3 + n) {
      print g, n, k, int_{g,n} kappa_1^k*psi_1^(3*g - 3 + n - k)
    }
  }
}
PK
sed 's/1\.\.4/1..7/; s/1\.\.3/1..4/' "$tmp/q.pk" > "$tmp/big.pk"
"$exe" --no-store "$tmp/q.pk" > "$tmp/q.want" || check no "reference run failed"
"$exe" --no-store "$tmp/big.pk" > "$tmp/big.want" || check no "reference run failed"
# runs the script with the store; the answers must be right; $3: "clean" (nothing on stderr) or "any"
run() {
  local st; "$exe" --store "$1" "$tmp/$2.pk" > "$tmp/out" 2> "$tmp/err"; st=$?
  cmp -s "$tmp/out" "$tmp/$2.want" && [ $st -eq 0 ] && check ok || { check no "$4: wrong answers or status $st"; head -3 "$tmp/err"; }
  [ "$3" = any ] || [ ! -s "$tmp/err" ] && check ok || { check no "$4: unexpected messages"; head -3 "$tmp/err"; }
}

# 1. kill -9 at random points of the write loop
db=$tmp/killed.sqlite
RANDOM=42
for i in $(seq 1 12); do
  "$exe" --store "$db" "$tmp/big.pk" > /dev/null 2>&1 &
  pid=$!
  sleep "0.$(printf '%03d' $((RANDOM % 400)))"
  kill -9 $pid 2>/dev/null
  wait $pid 2>/dev/null
  [ -s "$db" ] || continue
  [ "$(integrity "$db")" = ok ] && check ok || check no "kill -9 round $i: integrity check fails"
done
run "$db" big clean "after kill -9"
run "$db" big clean "after kill -9, all answers stored"
ls "$tmp"/killed.sqlite.damaged-* > /dev/null 2>&1 && check no "kill -9 made a damaged store" || check ok

# 2. truncation at every page boundary of a store (and one byte short of each)
base=$tmp/base.sqlite
run "$base" q clean "building the store"
size=$(stat -c %s "$base")
pages=$((size / 4096))
for p in $(seq 0 $pages); do
  for cut in $((p * 4096)) $((p * 4096 - 1)); do
    [ $cut -lt 0 ] || [ $cut -ge "$size" ] && continue
    rm -f "$tmp"/cut.sqlite*
    cp "$base" "$tmp/cut.sqlite"
    truncate -s $cut "$tmp/cut.sqlite"
    run "$tmp/cut.sqlite" q any "truncated to $cut bytes"
    if [ $cut -lt 100 ]; then   # no header left: not recognisable as a store, refused and left alone
      grep -q "refused" "$tmp/err" && check ok || check no "truncated to $cut bytes: not refused"
      [ "$(stat -c %s "$tmp/cut.sqlite")" = $cut ] && check ok || check no "truncated to $cut bytes: file changed"
    else
      grep -q "damaged" "$tmp/err" && check ok || { check no "truncated to $cut bytes: damage not reported"; cat "$tmp/err"; }
      [ "$(stat -c %s "$tmp/cut.sqlite.damaged-1")" = $cut ] && check ok || check no "truncated copy ($cut) not kept"
      run "$tmp/cut.sqlite" q clean "rebuilt after truncation to $cut"
    fi
  done
done

# 3. two writers at once (and a third reading while they write)
db=$tmp/two.sqlite
for round in 1 2 3; do
  rm -f "$db"*
  "$exe" --store "$db" "$tmp/big.pk" > "$tmp/w1" 2> "$tmp/e1" &
  p1=$!
  "$exe" --store "$db" "$tmp/big.pk" > "$tmp/w2" 2> "$tmp/e2" &
  p2=$!
  "$exe" --store "$db" "$tmp/q.pk" > "$tmp/w3" 2> "$tmp/e3"
  wait $p1; s1=$?; wait $p2; s2=$?
  cmp -s "$tmp/w1" "$tmp/big.want" && cmp -s "$tmp/w2" "$tmp/big.want" && cmp -s "$tmp/w3" "$tmp/q.want" \
    && [ $s1 = 0 ] && [ $s2 = 0 ] && check ok || check no "two writers, round $round: answers differ"
  cat "$tmp/e1" "$tmp/e2" "$tmp/e3" | grep -q . && { check no "two writers, round $round: messages"; cat "$tmp/e1" "$tmp/e2"; } || check ok
  [ "$(integrity "$db")" = ok ] && check ok || check no "two writers: integrity"
done
run "$db" big clean "after two writers"

# 4. read-only file and read-only folder (as an unprivileged user when run as root)
as_user=()
if [ "$(id -u)" = 0 ]; then
  if command -v setpriv > /dev/null; then as_user=(setpriv --reuid=65534 --regid=65534 --clear-groups); else as_user=(skip); fi
fi
if [ "${as_user[0]:-}" != skip ]; then
  ro=$tmp/ro; mkdir "$ro"
  run "$ro/full.sqlite" q clean "building a store to make read-only"
  chmod 444 "$ro/full.sqlite"
  chmod 555 "$ro"
  for what in "read-only file in a read-only folder" "missing file in a read-only folder"; do
    f=$ro/full.sqlite; [ "$what" = "missing file in a read-only folder" ] && f=$ro/missing.sqlite
    "${as_user[@]}" "$exe" --store "$f" "$tmp/q.pk" > "$tmp/out" 2> "$tmp/err"; st=$?
    cmp -s "$tmp/out" "$tmp/q.want" && [ $st = 0 ] && check ok || { check no "$what: answers or status $st"; cat "$tmp/err"; }
    "${as_user[@]}" "$exe" --store "$f" "$tmp/big.pk" > "$tmp/out" 2> "$tmp/err"; st=$?
    cmp -s "$tmp/out" "$tmp/big.want" && [ $st = 0 ] && check ok || { check no "$what, new answers: status $st"; cat "$tmp/err"; }
  done
  chmod 755 "$ro"
  "${as_user[@]}" "$exe" --store "$ro/full.sqlite" "$tmp/big.pk" > "$tmp/out" 2> "$tmp/err"; st=$?
  cmp -s "$tmp/out" "$tmp/big.want" && [ $st = 0 ] && check ok || { check no "read-only file, new answers: status $st"; cat "$tmp/err"; }
  grep -q "results store" "$tmp/err" && check ok || check no "read-only file: failing writes not reported"
  chmod 644 "$ro/full.sqlite"
  [ "$(integrity "$ro/full.sqlite")" = ok ] && check ok || check no "read-only file: integrity"
  run "$ro/full.sqlite" big any "read-only file made writable again"
else
  echo "note: read-only cases skipped (running as root without setpriv)"
fi

# 5. a full disk: a 2 MiB tmpfs when it can be mounted, else a file-size limit
disk=$tmp/disk; mkdir "$disk"
if mount -t tmpfs -o size=2m tmpfs "$disk" 2> /dev/null; then
  mounted=$disk
  limit=()
else
  limit=(ulimit -f 48)   # 48 KiB per file
fi
run "$disk/s.sqlite" q clean "a store on the small disk"
if [ -n "$mounted" ]; then
  dd if=/dev/zero of="$disk/filler" bs=4k 2> /dev/null   # fills the disk
else
  :
fi
( [ ${#limit[@]} -gt 0 ] && "${limit[@]}"; "$exe" --store "$disk/s.sqlite" "$tmp/big.pk" > "$tmp/out" 2> "$tmp/err"; echo $? > "$tmp/st" )
cmp -s "$tmp/out" "$tmp/big.want" && [ "$(cat "$tmp/st")" = 0 ] && check ok || { check no "full disk: answers or status"; cat "$tmp/err"; }
grep -q "cannot keep new answers\|cannot use results store" "$tmp/err" && check ok || { check no "full disk: not reported"; cat "$tmp/err"; }
( [ ${#limit[@]} -gt 0 ] && "${limit[@]}"; "$exe" --store "$disk/new.sqlite" "$tmp/q.pk" > "$tmp/out" 2> "$tmp/err"; echo $? > "$tmp/st" )
cmp -s "$tmp/out" "$tmp/q.want" && [ "$(cat "$tmp/st")" = 0 ] && check ok || { check no "new store on a full disk: answers or status"; cat "$tmp/err"; }
rm -f "$disk/filler" "$disk"/new.sqlite*
[ "$(integrity "$disk/s.sqlite")" = ok ] && check ok || check no "full disk: integrity"
run "$disk/s.sqlite" q clean "full disk, space freed"
if [ -z "$mounted" ]; then
  run "$disk/s.sqlite" big any "file-size limit lifted"
else
  run "$disk/s.sqlite" big clean "space freed, new answers"
  run "$disk/s.sqlite" big clean "space freed, answers stored"
fi
ls "$disk"/*.damaged-* > /dev/null 2>&1 && check no "a full disk made the store look damaged" || check ok
echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ]
