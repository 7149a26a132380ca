#!/usr/bin/env bash
# Standard output is whole lines or nothing, and every failure to write it is
# reported with a nonzero status: a full device, a closed pipe while SIGPIPE
# is ignored, a file-size limit, an error in the middle of a print statement,
# and SIGTERM or SIGHUP arriving while lines are being printed.
set -u
exe=$1
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
export PSIKAPPA_STORE=off
pass=0; fail=0
check() { if [ "$1" = ok ]; then pass=$((pass + 1)); else fail=$((fail + 1)); echo "FAIL: $2"; fi; }

# a full device: every kind of output
fullcase() {
  "$exe" "$@" > /dev/full 2> "$tmp/err"
  local st=$?
  [ $st -ne 0 ] && grep -q "cannot write the output: No space left on device" "$tmp/err" && check ok \
    || { check no "/dev/full with $*: status $st"; cat "$tmp/err"; }
}
fullcase -e '1+1'
fullcase -e 'print 1, 2'
fullcase --version
fullcase --help
fullcase -e 'table_{g=1..3, n=1..2} g + n'
fullcase -e 'explain int_{1,1} kappa_1'
# standard output closed: reported, and a picture written meanwhile does not receive the output
"$exe" -e "svgplot(\"$tmp/c.svg\", [1, 2, 3], \"index\")" -e 'print 12345' >&- 2> "$tmp/err"
st=$?
[ $st -ne 0 ] && grep -q "cannot write the output: Bad file descriptor" "$tmp/err" && check ok || { check no "closed stdout: status $st"; cat "$tmp/err"; }
grep -q 12345 "$tmp/c.svg" && check no "output went into another file" || check ok
# stdout closed at the reader's end, SIGPIPE ignored: EPIPE is reported
( trap '' PIPE; "$exe" -e 'for i in 1..200000 { print i }' 2> "$tmp/err"; echo $? > "$tmp/st" ) | head -c 10 > /dev/null
st=$(cat "$tmp/st")
[ "$st" -ne 0 ] && grep -q "cannot write the output: Broken pipe" "$tmp/err" && check ok || { check no "EPIPE: status $st"; cat "$tmp/err"; }
# a file-size limit on the output file (SIGXFSZ must not kill the program silently)
( ulimit -f 8; "$exe" -e 'for i in 1..100000 { print i }' > "$tmp/limited" 2> "$tmp/err"; echo $? > "$tmp/st" )
st=$(cat "$tmp/st")
[ "$st" -ne 0 ] && grep -q "cannot write the output: File too large" "$tmp/err" && check ok || { check no "file-size limit: status $st"; cat "$tmp/err"; }
[ "$(tail -c 1 "$tmp/limited" | od -An -c | tr -d ' ')" = '\n' ] && check ok || check no "file-size limit left a half line"

# a picture that cannot be written whole is not left half-written (nor its temporary file)
( ulimit -f 1; "$exe" -e "svgplot(\"$tmp/p.svg\", seq_{n=1..300} n^2, \"index\")" > /dev/null 2> "$tmp/err"; echo $? > "$tmp/st" )
[ "$(cat "$tmp/st")" = 1 ] && grep -q "error while writing" "$tmp/err" && check ok || { check no "svgplot over a size limit"; cat "$tmp/err"; }
ls "$tmp"/p.svg* > /dev/null 2>&1 && check no "svgplot left a partial file" || check ok
"$exe" -e "svgplot(\"$tmp/p.svg\", seq_{n=1..300} n^2, \"index\")" > /dev/null && tail -1 "$tmp/p.svg" | grep -q '</svg>' \
  && check ok || check no "svgplot does not write a whole picture"

# an error in the middle of a print statement leaves nothing of that statement
"$exe" -e 'print 7' -e 'print 1, 2, 1/0' > "$tmp/out" 2> "$tmp/err"
[ $? -eq 1 ] && [ "$(cat "$tmp/out")" = 7 ] && check ok || { check no "error mid print left:"; od -c "$tmp/out"; }
"$exe" --format json -e 'print 1, 2, psi_1 + 1/0' > "$tmp/out" 2> "$tmp/err"
[ ! -s "$tmp/out" ] && check ok || { check no "error mid print (json) left:"; od -c "$tmp/out"; }

# SIGTERM / SIGHUP while printing: the output ends with a complete line, the status is 128+signal
whole_lines() {  # file: every line is a number, the file ends with a newline
  [ ! -s "$1" ] && return 0
  [ "$(tail -c 1 "$1" | od -An -c | tr -d ' ')" = '\n' ] && ! grep -qv '^[0-9][0-9]* [0-9][0-9]*$' "$1"
}
script='for i in 1..100000000 { print i, 123456789012345678901234567890123456789*i }'
for sig in TERM HUP TERM HUP TERM; do
  for delay in 0.05 0.2 0.4; do
    "$exe" -e "$script" > "$tmp/sig.out" 2> "$tmp/sig.err" &
    pid=$!
    sleep $delay
    kill -s $sig $pid
    wait $pid
    st=$?
    want=$((128 + $(kill -l $sig)))
    [ $st -eq $want ] && check ok || check no "SIG$sig after $delay s: status $st, want $want"
    whole_lines "$tmp/sig.out" && check ok || { check no "SIG$sig after $delay s left a partial line"; tail -c 80 "$tmp/sig.out" | od -c | tail -3; }
  done
done
# the same through a pipe to a slow reader
"$exe" -e "$script" 2> /dev/null | (sleep 0.3; cat) > "$tmp/pipe.out" &
sleep 0.2
pkill -TERM -P $$ -x psikappa 2>/dev/null || kill -TERM %1 2>/dev/null
wait
whole_lines "$tmp/pipe.out" && check ok || check no "SIGTERM with a pipe left a partial line"
echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ]
