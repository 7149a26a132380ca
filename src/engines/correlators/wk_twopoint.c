/* wk_twopoint.c - the two-point correlators <tau_k tau_{3g-1-k}>_g in closed form, without a table.
 *
 * Source: the two-point function of R. Dijkgraaf ("Intersection theory, integrable hierarchies and
 * topological field theory", 1992; quoted from memory, and checked against the DVV recursion on
 * random (g, k) and against the published genus-2 and genus-3 values in tests/unit/test_closed.c):
 *     sum_{g,k} <tau_k tau_{3g-1-k}>_g w^k z^{3g-1-k}
 *         = 1/(w+z) exp((w^3+z^3)/24) sum_{m>=0} m!/(2m+1)! (wz(w+z)/2)^m .
 * Derivation of the coefficient.  The part of total degree 3g of the numerator is
 *     sum_{m+a=g} (w^3+z^3)^a / (24^a a!) * m!/(2m+1)! (wz)^m (w+z)^m / 2^m ,
 * and w^3+z^3 = (w+z)(w^2-wz+z^2), so every term with a+m >= 1 is divisible by w+z:
 *     m >= 1:  (w^3+z^3)^a (w+z)^{m-1} (wz)^m ,   m = 0:  (w^3+z^3)^{g-1} (w^2-wz+z^2).
 * The coefficient of w^k z^{3g-1-k} is then C_0 = C(g-1,(k-2)/3) - C(g-1,(k-1)/3) + C(g-1,k/3)
 * (binomials with a fractional index are 0) and, for m >= 1,
 *     C_m = sum_i C(a,i) C(m-1, k-m-3i)   (0 <= k-m-3i <= m-1),
 * so <tau_k tau_{3g-1-k}>_g = sum_m c_m C_m with c_m = m! / ((2m+1)! 24^a a! 2^m).
 * Over the common denominator M = (2g+1)! 24^g g! 2^g the weights w_m = c_m M are integers:
 * w_0 = (2g+1)! 2^g and w_{m+1} = w_m 6 (g-m) / (2m+3) exactly.  Cost: about g^2/6 steps on
 * integers of O(g log g) bits.
 */
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include "wk.h"

/* x = C(n, k) for any slong k (0 outside 0..n).
   n >= 0. */
static void wk_tp_binom(fmpz_t x, slong n, slong k)
{
    if (k < 0 || k > n)
        fmpz_zero(x);
    else
        fmpz_bin_uiui(x, (ulong) n, (ulong) k);
}

/* s = C_0 = C(g-1,(k-2)/3) - C(g-1,(k-1)/3) + C(g-1,k/3), exactly one of which has an integer index.
   g >= 1, 0 <= k <= 3g-1. */
static void wk_tp_first(fmpz_t s, slong g, slong k)
{
    if (k % 3 == 2)
        wk_tp_binom(s, g - 1, (k - 2) / 3);
    else if (k % 3 == 1)
        wk_tp_binom(s, g - 1, (k - 1) / 3), fmpz_neg(s, s);
    else
        wk_tp_binom(s, g - 1, k / 3);
}

/* s = C_m = sum_i C(a,i) C(m-1, k-m-3i) over 0 <= k-m-3i <= m-1, 0 <= i <= a, with the binomials
   updated step by step (exact divisions) rather than recomputed.  m >= 1, a >= 0. */
static void wk_tp_inner(fmpz_t s, slong a, slong m, slong k)
{
    slong lo = k - 2 * m + 1, i = lo > 0 ? (lo + 2) / 3 : 0, hi = (k - m) / 3, j;
    fmpz_t ca, cb, t;
    fmpz_zero(s);
    if (k - m < 0 || i > a || i > hi)
        return;
    hi = hi < a ? hi : a;
    fmpz_init(ca);
    fmpz_init(cb);
    fmpz_init(t);
    j = k - m - 3 * i;
    wk_tp_binom(ca, a, i);
    wk_tp_binom(cb, m - 1, j);
    for (; i <= hi; i++, j -= 3) {
        fmpz_mul(t, ca, cb);
        fmpz_add(s, s, t);
        if (i == hi)
            break;
        fmpz_mul_ui(ca, ca, (ulong) (a - i));               /* C(a, i+1) */
        fmpz_divexact_ui(ca, ca, (ulong) (i + 1));
        fmpz_mul_ui(cb, cb, (ulong) (j * (j - 1)));         /* C(m-1, j-3), j >= 3 here */
        fmpz_mul_ui(cb, cb, (ulong) (j - 2));
        fmpz_divexact_ui(cb, cb, (ulong) ((m - j) * (m - j + 1)));
        fmpz_divexact_ui(cb, cb, (ulong) (m - j + 2));
    }
    fmpz_clear(ca);
    fmpz_clear(cb);
    fmpz_clear(t);
}

/* den = M = (2g+1)! 24^g g! 2^g and w = w_0 = (2g+1)! 2^g (see the file comment).
   g >= 1. */
static void wk_tp_start(fmpz_t den, fmpz_t w, slong g)
{
    fmpz_t f;
    fmpz_init(f);
    fmpz_fac_ui(w, (ulong) (2 * g + 1));
    fmpz_mul_2exp(w, w, (ulong) g);
    fmpz_set_ui(f, 24);
    fmpz_pow_ui(f, f, (ulong) g);
    fmpz_mul(den, w, f);
    fmpz_fac_ui(f, (ulong) g);
    fmpz_mul(den, den, f);
    fmpz_clear(f);
}

int wk_two_point(fmpq_t res, slong g, slong k)
{
    slong m;
    fmpz_t w, c, sum;
    fmpq_zero(res);
    if (g < 1 || g > WK_TWO_POINT_MAX_G || k < 0 || k > 3 * g - 1)
        return 0;
    fmpz_init(w);
    fmpz_init(c);
    fmpz_init(sum);
    wk_tp_start(fmpq_denref(res), w, g);
    wk_tp_first(c, g, k);
    fmpz_mul(sum, w, c);
    for (m = 1; m <= g; m++) {
        fmpz_mul_ui(w, w, (ulong) (6 * (g - m + 1)));       /* w_m from w_{m-1} */
        fmpz_divexact_ui(w, w, (ulong) (2 * m + 1));
        wk_tp_inner(c, g - m, m, k);
        fmpz_addmul(sum, w, c);
    }
    fmpz_swap(fmpq_numref(res), sum);
    fmpq_canonicalise(res);
    fmpz_clear(w);
    fmpz_clear(c);
    fmpz_clear(sum);
    return 1;
}
