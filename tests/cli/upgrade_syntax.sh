#!/usr/bin/env bash
# tools/upgrade-syntax: an old script is rewritten to the subscript notation
# as expected, a second run changes nothing, and the rewritten script prints
# what the old one printed. The old values are those of the bracket syntax,
# where an integrand reached over + and -: int[2,0] kappa_1^3 - 1 integrated
# the difference (43/2880; the 1 has degree 0). Values: <tau_1>_1 = 1/24 and
# <tau_2^3>_2 = 7/240 (Witten 1991; the latter from memory, as in
# tests/unit/wk_published.h); int over Mbar_{0,n} of kappa_1^(n-3) = 1, 1, 5 for
# n = 3, 4, 5 (Kaufmann, Manin, Zagier, "Higher Weil-Petersson volumes of moduli
# spaces of stable n-pointed curves", 1996); int over Mbar_{2,0} of kappa_1^3 =
# 43/2880 (docs/conventions.md); V_{1,1}(L) = (L^2 + 4 pi^2)/48 in the stack
# normalisation (Mirzakhani 2007, halved; docs/conventions.md); the table as in
# docs/language.md; int over Mbar_{1,2} of psi_1 kappa_1 = <tau_0 tau_1 tau_2>_1
# = 1/12 by the string equation (a property check); int over Mbar_{1,1} of
# psi_1 + kappa_1 = 1/24 + 1/24 (Witten 1991; kappa_1 = psi_1 there).
set -u
exe=$1
root=$(cd "$(dirname "$0")/../.." && pwd)
tool=$root/tools/upgrade-syntax
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
export PSIKAPPA_STORE=off
cat > "$tmp/old.pk" <<'PK'
# int[2,0] in a comment
var x, L[1..2]
int[2,0] kappa_1^3 - 1
int[1,1] psi_1 + int[1,1] psi_1
2 * int[1,1] psi_1 * int[0,3] 1
sum[i = 1..3] i + 1
print seq[n = 3..5] int[0, n] kappa_1^(n-3), <tau[1+1]^3>_(1+1)
L[1] + L[x - x + 2]
int[1,2] psi[1] * kappa[1]
table[g = 1..2, n = 1..2] int[g, n] kappa_1^(3*g - 3 + n)
F[1] with t_0 = x, t_k = 0 for k >= 1, order x^3
wpvolume(1, 1)
print "int[1,1] psi_1 =", int[1,1] psi_1
print (int[1,1] psi_1 +
    kappa_1)
PK
cat > "$tmp/want.pk" <<'PK'
# int[2,0] in a comment
var x, L_{1..2}
int_{2,0} (kappa_1^3 - 1)
int_{1,1} (psi_1 + (int_{1,1} psi_1))
2 * int_{1,1} psi_1 * (int_{0,3} 1)
sum_{i=1..3} i + 1
print seq_{n=3..5} int_{0,n} kappa_1^(n-3), <tau_{1+1}^3>_{1+1}
L_1 + L_{x - x + 2}
int_{1,2} psi_1 * kappa_1
table_{g=1..2, n=1..2} int_{g,n} kappa_1^(3*g - 3 + n)
F_1 with t_0 = x, t_k = 0 for k >= 1, order x^3
V_{1,1}
print "int[1,1] psi_1 =", int_{1,1} psi_1
print (int_{1,1} (psi_1 +
    kappa_1))
PK
cat > "$tmp/want.out" <<'OUT'
43/2880
1/24
1/12
7
[1, 1, 5] 7/240
L_1 + L_2
1/12
g\n       1        2
  1    1/24      1/8
  2  29/128  787/128
O(x^4)
L_1^2/48 + pi^2/12
int[1,1] psi_1 = 1/24
1/12
OUT
pass=0; fail=0
check() { if [ "$1" = ok ]; then pass=$((pass + 1)); else fail=$((fail + 1)); echo "FAIL: $2"; fi; }
cp "$tmp/old.pk" "$tmp/new.pk"
python3 "$tool" "$tmp/new.pk"
diff -u "$tmp/want.pk" "$tmp/new.pk" && check ok || check no "rewritten script differs"
python3 "$tool" --check "$tmp/new.pk" > /dev/null && check ok || check no "a second run would change the script"
(cd "$tmp" && "$exe" new.pk > got.out 2> got.err)
diff -u "$tmp/want.out" "$tmp/got.out" && [ ! -s "$tmp/got.err" ] && check ok || { check no "rewritten script prints otherwise"; cat "$tmp/got.err"; }
python3 "$tool" --text - < "$tmp/old.pk" | grep -q '^# int_{2,0} in a comment$' && check ok || check no "--text leaves a comment"
python3 "$tool" --text - < "$tmp/old.pk" | grep -q '^print "int_{1,1} psi_1 =", int_{1,1} psi_1$' && check ok || check no "--text leaves a string"
(cd "$tmp" && "$exe" old.pk > /dev/null 2> old.err)
grep -q 'var L\[1..2\] is written var L_{1..2}' "$tmp/old.err" && check ok || check no "the old script does not name the new form"
echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ]
