#!/usr/bin/env bash
# cmake --install into a temporary prefix, then the installed binary run from
# another folder: it must print what the build's binary prints, find the
# standard library installed beside it (a marker appended to the installed
# copy proves which copy was read), and the manual page must be installed.
set -u
build=$1
built_exe=$2
export PSIKAPPA_STORE=off
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
fail=0; pass=0
check() { if eval "$2"; then pass=$((pass + 1)); else echo "FAIL: $1"; fail=$((fail + 1)); fi; }

cmake --install "$build" --prefix "$tmp/prefix" > "$tmp/install.log" 2>&1 || { cat "$tmp/install.log"; exit 1; }
check "binary installed" '[ -x "$tmp/prefix/bin/psikappa" ]'
check "manual page installed" '[ -s "$tmp/prefix/share/man/man1/psikappa.1" ]'
check "standard library installed" '[ -s "$tmp/prefix/share/psikappa/lib/volumes.pk" ]'
printf '\nlet installed_copy_marker = 7\n' >> "$tmp/prefix/share/psikappa/lib/volumes.pk"

mkdir -p "$tmp/elsewhere"
cat > "$tmp/elsewhere/use.pk" <<'PK'
load "volumes.pk"
print installed_copy_marker
print <tau_2 tau_3>_2
PK
(cd "$tmp/elsewhere" && "$tmp/prefix/bin/psikappa" use.pk) > "$tmp/out" 2>&1
check "installed binary reads its own standard library" '[ "$(cat "$tmp/out")" = "$(printf "7\n29/5760")" ]'
(cd "$tmp/elsewhere" && "$tmp/prefix/bin/psikappa" -e '<tau_4>_2' -e '<tau_1^4>_1') > "$tmp/a" 2>&1
(cd "$tmp/elsewhere" && "$built_exe" -e '<tau_4>_2' -e '<tau_1^4>_1') > "$tmp/b" 2>&1
check "installed and built binaries agree" 'cmp -s "$tmp/a" "$tmp/b"'
[ "$fail" -eq 0 ] || { echo "output of the installed binary:"; cat "$tmp/out"; }
echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ]
