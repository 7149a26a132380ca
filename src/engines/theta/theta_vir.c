/* theta_vir.c - Theta-psi numbers by the Virasoro constraints of the Brezin-Gross-Witten tau
 * function, written as a DVV-type recursion.
 *
 * Z = exp(sum_g hbar^{2g-2} F_g), F_g = sum_n 1/n! sum_d <Theta | tau_{d_1}..tau_{d_n}>_g t_{d_1}..t_{d_n},
 * is annihilated for m >= 0 by (P. Norbury, "A new cohomology class on the moduli space of curves",
 * 2017; N. Do, P. Norbury, "Topological recursion on the Bessel curve", Commun. Number Theory Phys.
 * 12 (2018) 53-73; operators written from memory, normalisation fixed below)
 *   L_m = -(2m+1)!!/2 d/dt_m + 1/2 sum_k (2k+2m+1)!!/(2k-1)!! t_k d/dt_{k+m}
 *         + hbar^2/4 sum_{r+s=m-1} (2r+1)!!(2s+1)!! d^2/dt_r dt_s + delta_{m,0}/16 .
 * These are the Witten-Kontsevich operators with the index of the derivative term lowered by one.
 * Normalisation: L_0 on the t-independent genus-1 part reads -<Theta|tau_0>_1/2 + 1/16 = 0, i.e.
 * int_{Mbar_{1,1}} Theta = 1/8; on the other coefficients L_0 is the tau_0 equation of theta_key.c
 * (sum_j (2d_j+1) = 2g-2+n because sum d_j = g-1), derived there from Theta_{g,n+1} =
 * psi_{n+1} pi^* Theta_{g,n}.  The quadratic term is confirmed by <Theta|tau_1>_2 = 3/128 (Norbury
 * 2017) and by the agreement with the KdV route (theta_kdv.c) on every number tested.
 * The coefficient of t_S/|Aut| in L_m Z / Z, m >= 1, gives (with <.> = <Theta | .>):
 *   (2m+1)!! <tau_m tau_S>_g = sum_j (2m+2d_j+1)!!/(2d_j-1)!! <tau_{m+d_j} tau_{S\j}>_g
 *       + 1/2 sum_{r+s=m-1} (2r+1)!!(2s+1)!! [ <tau_r tau_s tau_S>_{g-1}
 *                                              + sum_{g1+g2=g, I+J=S} <tau_r tau_I>_{g1} <tau_s tau_J>_{g2} ].
 * In X = 2^(4g-1) prod (2d_i+1)!! <.> (theta_internal.h) the double factorials cancel and
 *   X(tau_m tau_S) = sum_j (2d_j+1) X(tau_{m+d_j} tau_{S\j}) + 8 sum_{r+s=m-1} X_{g-1}(tau_r tau_s tau_S)
 *                    + sum_{r+s=m-1} sum_{I+J=S} X(tau_r tau_I) X(tau_s tau_J) ,
 * (powers of two: 2^(4g-2)/2^(4g-5) = 8 and 2^(4g-2)/2^(4g1-1+4g2-1) = 1), so X is an integer
 * (X(tau_0) = 2^3/8 = 1).  Every genus is fixed by the degree; every term has genus < g or one
 * point fewer, so the recursion ends.  The step applies it with m the largest index of the key.
 */
#include <stdlib.h>
#include "theta_internal.h"

/* First sum: replace one copy of each distinct value v of S by v + m (weight mult * (2v+1)).
   Keys stay at genus g with one point fewer. */
static int vir_sum_first(theta_table *T, slong m, const theta_msets *M, slong *buf, slong ns, fmpz_t x)
{
    slong i, j, o;
    int st = WK_OK;
    fmpz_t y;
    fmpz_init(y);
    for (i = 0; st == WK_OK && i < M->p; i++) {
        for (j = 0, o = 0; j < M->p; j++) {
            slong c, k = M->mul[j] - (j == i);
            for (c = 0; c < k; c++)
                buf[o++] = M->val[j];
        }
        buf[o++] = M->val[i] + m;
        theta_key_sort(buf, o);
        st = theta_eval(T, buf, ns, y);
        fmpz_mul_ui(y, y, (ulong) (M->mul[i] * (2 * M->val[i] + 1)));
        fmpz_add(x, x, y);
    }
    fmpz_clear(y);
    return st;
}

/* Genus-lowering sum 8 sum_{r+s=m-1} X_{g-1}(tau_r tau_s tau_S).
   Ordered pairs (r, s): the pair and its mirror are separate terms of the operator. */
static int vir_sum_lower(theta_table *T, slong m, const theta_msets *M, slong *buf, slong ns, fmpz_t x)
{
    slong r, rs[2];
    int st = WK_OK;
    fmpz_t y;
    fmpz_init(y);
    for (r = 0; st == WK_OK && r <= m - 1; r++) {
        rs[0] = r;
        rs[1] = m - 1 - r;
        theta_msets_write(M, 0, rs, 2, buf);  /* odometer at zero: the complement J is all of S */
        st = theta_eval(T, buf, ns + 2, y);
        fmpz_addmul_ui(x, y, 8);
    }
    fmpz_clear(y);
    return st;
}

/* Splitting sum over r + s = m-1 and sub-multisets I of S (J the complement).
   Each factor's genus is its degree plus one, so no genus loop is needed. */
static int vir_sum_split(theta_table *T, slong m, theta_msets *M, slong *b1, slong *b2, fmpz_t x)
{
    slong r, s, n1, n2;
    int st = WK_OK;
    fmpz_t y, z, c;
    fmpz_init(y);
    fmpz_init(z);
    fmpz_init(c);
    do {
        theta_msets_count(c, M);
        for (r = 0; st == WK_OK && r <= m - 1; r++) {
            s = m - 1 - r;
            n1 = theta_msets_write(M, 1, &r, 1, b1);
            n2 = theta_msets_write(M, 0, &s, 1, b2);
            st = theta_eval(T, b1, n1, y);
            if (st == WK_OK)
                st = theta_eval(T, b2, n2, z);
            fmpz_mul(y, y, z);
            fmpz_addmul(x, y, c);
        }
    } while (st == WK_OK && theta_msets_next(M));
    fmpz_clear(y);
    fmpz_clear(z);
    fmpz_clear(c);
    return st;
}

/* X(key) for a zero-free descending key by the recursion of the file comment, m = key[0].
   Returns WK_OK or the first error of a sub-evaluation (WK_LIMIT when memory runs out). */
int theta_vir_step(theta_table *T, slong g, const slong *key, slong n, fmpz_t x)
{
    slong m = key[0], ns = n - 1;
    slong *buf;
    theta_msets M;
    int st;
    (void) g;
    fmpz_zero(x);
    buf = malloc((size_t) (2 * ns + 6) * sizeof(slong));
    if (buf == NULL)
        return WK_LIMIT;
    st = theta_msets_init(&M, key + 1, ns);
    if (st == WK_OK)
        st = vir_sum_first(T, m, &M, buf, ns, x);
    if (st == WK_OK)
        st = vir_sum_lower(T, m, &M, buf, ns, x);
    if (st == WK_OK)
        st = vir_sum_split(T, m, &M, buf, buf + ns + 3, x);
    theta_msets_clear(&M);
    free(buf);
    return st;
}
