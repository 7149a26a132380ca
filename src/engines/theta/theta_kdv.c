/* theta_kdv.c - Theta-psi numbers by the KdV equation, a route independent of theta_vir.c.
 *
 * The Brezin-Gross-Witten tau function, with the times of theta_vir.c (in which its Virasoro
 * operators take the Witten-Kontsevich form), is a tau function of the KdV hierarchy (P. Norbury,
 * "A new cohomology class on the moduli space of curves", 2017; from memory, confirmed by the
 * agreement of the two routes).  With <<X>> the derivative of F = sum_g F_g at t = 0, the KdV
 * equation in Witten's correlator form (E. Witten, "Two-dimensional gravity and intersection
 * theory on moduli space", Surveys in Diff. Geom. 1 (1991) 243-310; docs/conventions.md)
 *     (2k+1) <<tau_k tau_0^2>> = <<tau_{k-1} tau_0>> <<tau_0^3>> + 2 <<tau_{k-1} tau_0^2>> <<tau_0^2>>
 *                                + 1/4 <<tau_{k-1} tau_0^4>>
 * holds for F^Theta too.  Differentiating by t_M at t = 0 (I + J = M over positions of M):
 *   (2k+1) <tau_k tau_0^2 tau_M> = sum_{I+J=M} [ <tau_{k-1} tau_0 tau_I> <tau_0^3 tau_J>
 *                  + 2 <tau_{k-1} tau_0^2 tau_I> <tau_0^2 tau_J> ] + 1/4 <tau_{k-1} tau_0^4 tau_M> .
 * Genus is degree plus one, so with g the genus of <tau_k tau_M> (k >= 1) the products have
 * genera (k + |I|) + (1 + |J|) = g, each at most g-1, and the last term has genus g-1: every
 * right-hand term is of lower genus and the recursion ends, with no need for a string equation
 * (the Theta theory has none).  The left side is (2k+1)(2g-1+n)(2g+n) <tau_k tau_M>, n = |M|
 * points, by the tau_0 equation (theta_key.c).  In X = 2^(4g-1) prod (2d_i+1)!! <.>, after
 * multiplying by (2k-1)!! prod_M (2m+1)!!, the powers of two give
 *   (2g-1+n)(2g+n) X(tau_k tau_M) = 2 sum_{I+J=M} [ X(tau_{k-1} tau_0 tau_I) X(tau_0^3 tau_J)
 *        + 2 X(tau_{k-1} tau_0^2 tau_I) X(tau_0^2 tau_J) ] + 4 X_{g-1}(tau_{k-1} tau_0^4 tau_M) .
 * The division is checked: a remainder would mean that the routes disagree (THETA_INEXACT).
 */
#include <stdlib.h>
#include "theta_internal.h"

/* Adds c * [X(tau_{k-1} tau_0 tau_I) X(tau_0^3 tau_J) + 2 X(tau_{k-1} tau_0^2 tau_I) X(tau_0^2 tau_J)]
   for the current sub-multiset I of M.  b1, b2 hold nm + 4 entries each. */
static int kdv_add_split(theta_table *T, slong k, const theta_msets *M, slong *b1, slong *b2, fmpz_t x)
{
    static const slong zeros[4] = {0, 0, 0, 0};
    slong e[3] = {k - 1, 0, 0}, n1, n2, z;
    int st = WK_OK;
    fmpz_t y, w, acc, c;
    fmpz_init(y);
    fmpz_init(w);
    fmpz_init(acc);
    fmpz_init(c);
    for (z = 1; st == WK_OK && z <= 2; z++) {   /* z zeros beside tau_{k-1}, 4-z beside J */
        n1 = theta_msets_write(M, 1, e, 1 + z, b1);
        n2 = theta_msets_write(M, 0, zeros, 4 - z, b2);
        st = theta_eval(T, b1, n1, y);
        if (st == WK_OK)
            st = theta_eval(T, b2, n2, w);
        fmpz_mul(y, y, w);
        fmpz_addmul_ui(acc, y, (ulong) z);
    }
    theta_msets_count(c, M);
    fmpz_addmul(x, acc, c);
    fmpz_clear(y);
    fmpz_clear(w);
    fmpz_clear(acc);
    fmpz_clear(c);
    return st;
}

/* X(key) for a zero-free descending key by the equation of the file comment, k = key[0].
   Returns THETA_INEXACT if the final division leaves a remainder. */
int theta_kdv_step(theta_table *T, slong g, const slong *key, slong n, fmpz_t x)
{
    slong k = key[0], nm = n - 1, len;
    slong e[5] = {k - 1, 0, 0, 0, 0};
    slong *b1 = malloc((size_t) (2 * nm + 12) * sizeof(slong));
    theta_msets M;
    int st;
    fmpz_t s, r;
    if (b1 == NULL)
        return WK_LIMIT;
    fmpz_init(s);
    fmpz_init(r);
    st = theta_msets_init(&M, key + 1, nm);
    while (st == WK_OK) {
        st = kdv_add_split(T, k, &M, b1, b1 + nm + 6, s);
        if (!theta_msets_next(&M))
            break;
    }
    fmpz_mul_ui(s, s, 2);
    if (st == WK_OK) {
        len = theta_msets_write(&M, 0, e, 5, b1);    /* odometer reset: J = M */
        st = theta_eval(T, b1, len, r);
        fmpz_addmul_ui(s, r, 4);
    }
    fmpz_set_ui(r, (ulong) ((2 * g - 1 + nm) * (2 * g + nm)));
    if (st == WK_OK && !fmpz_divisible(s, r))
        st = THETA_INEXACT;
    if (st == WK_OK)
        fmpz_divexact(x, s, r);
    theta_msets_clear(&M);
    fmpz_clear(s);
    fmpz_clear(r);
    free(b1);
    return st;
}
