#!/usr/bin/env bash
# Runs one script and compares what it prints with the files beside it:
#   X.pk      the script (run from its own folder, so paths in messages are stable)
#   X.out     expected standard output (required)
#   X.err     expected standard error (absent: stderr must be empty)
#   X.status  expected exit status (absent: 1 when X.err exists, else 0)
#   X.args    extra command-line options, one line (optional)
set -u
# Golden tests never touch the user's results store.
export PSIKAPPA_STORE=off
exe=$1
script=$2
dir=$(dirname "$script")
base=${script%.pk}
name=$(basename "$script")
want_status=0
[ -f "$base.err" ] && want_status=1
[ -f "$base.status" ] && want_status=$(cat "$base.status")
args=()
[ -f "$base.args" ] && read -r -a args < "$base.args"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
(cd "$dir" && "$exe" "${args[@]}" "$name" > "$tmp/out" 2> "$tmp/err" < /dev/null)
status=$?
fail=0
if [ ! -f "$base.out" ]; then
  echo "missing $base.out; actual output:"; cat "$tmp/out"; fail=1
elif ! diff -u "$base.out" "$tmp/out"; then
  echo "stdout differs for $name"; fail=1
fi
if [ -f "$base.err" ]; then
  diff -u "$base.err" "$tmp/err" || { echo "stderr differs for $name"; fail=1; }
elif [ -s "$tmp/err" ]; then
  echo "unexpected stderr for $name:"; cat "$tmp/err"; fail=1
fi
if [ "$status" != "$want_status" ]; then
  echo "exit status $status, expected $want_status for $name"; fail=1
fi
exit $fail
