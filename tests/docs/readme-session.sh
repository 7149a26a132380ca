#!/usr/bin/env bash
# Runs the terminal session shown in a Markdown file (README.md's "first look"):
# every line "$ psikappa ARGS" inside a fenced block is run with the built
# binary, and must print exactly the lines that follow it up to the next "$ "
# line or the end of the block. With a third argument, also writes what was
# printed there, so that two builds can be compared (tools/check).
set -u
export PSIKAPPA_STORE=off
exe=$1
doc=$2
record=${3:-}
psikappa() { "$exe" "$@"; }
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
awk -v dir="$tmp" '
  /^```/            { inblock = !inblock; cmd = ""; next }
  inblock && /^\$ psikappa/ { n++; cmd = dir "/c" n; sub(/^\$ /, ""); print > cmd; printf "" > (cmd ".want"); next }
  inblock && /^\$ / { cmd = ""; next }
  inblock && cmd != "" { print >> (cmd ".want") }
' "$doc"
pass=0; fail=0
[ -z "$record" ] || : > "$record"
for c in "$tmp"/c*; do
  case $c in *.want|*.got) continue;; esac
  [ -e "$c" ] || continue
  eval "$(cat "$c")" > "$c.got" 2>&1
  [ -z "$record" ] || { cat "$c"; cat "$c.got"; } >> "$record"
  if diff -u "$c.want" "$c.got"; then pass=$((pass + 1))
  else echo "differs: $(cat "$c")"; fail=$((fail + 1)); fi
done
echo "$pass passed, $fail failed"
[ "$pass" -gt 0 ] && [ "$fail" -eq 0 ]
