#!/usr/bin/env bash
# Runs every example of a Markdown document: a ```pk block followed by an
# ```output block must print exactly that output (stdout and stderr together,
# so that documented error messages are checked too).
set -u
# Golden tests never touch the user's results store.
export PSIKAPPA_STORE=off
exe=$1
doc=$2
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
awk -v dir="$tmp" '
  /^```pk$/     { n++; mode = "pk"; file = dir "/ex" n ".pk"; printf "" > file; next }
  /^```output$/ { mode = "out"; file = dir "/ex" n ".expected"; printf "" > file; next }
  /^```/        { mode = ""; next }
  mode != ""    { print >> file }
' "$doc"
pass=0; fail=0
for pk in "$tmp"/ex*.pk; do
  [ -e "$pk" ] || continue
  want=${pk%.pk}.expected
  [ -f "$want" ] || continue
  # each example runs as example.pk in a folder of its own, so messages name a stable file
  run="${pk%.pk}.dir"
  mkdir -p "$run" && cp "$pk" "$run/example.pk"
  (cd "$run" && "$exe" example.pk > "${pk%.pk}.actual" 2>&1)
  if diff -u "$want" "${pk%.pk}.actual" > "${pk%.pk}.diff"; then
    pass=$((pass + 1))
  else
    fail=$((fail + 1))
    echo "example $(basename "$pk") of $doc differs:"; cat "$(basename "$pk")" 2>/dev/null; cat "$pk"; cat "${pk%.pk}.diff"
  fi
done
echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ] && [ "$pass" -gt 0 ]
