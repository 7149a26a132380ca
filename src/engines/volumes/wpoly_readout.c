/* The read-out of W_a from the components of the recursion (wpoly_modp.c): the string equation
   solved over the subset ring J, then F_g(u, v) evaluated there. */
#include <stdlib.h>
#include <string.h>

#include "wpvol.h"
#include "wpoly.h"
#include "wpvol_internal.h"
#include "wpoly_internal.h"

/* z = x y in J (subset convolution over n points); z must not alias x or y. */
static void wpoly_jmul(ulong *z, const ulong *x, const ulong *y, const wpoly_ws_t *ws)
{
    slong M, T;

    for (M = 0; M < ws->nm; M++)
    {
        ulong s = 0;
        T = M;
        do
        {
            s = nmod_add(s, nmod_mul(x[T], y[M ^ T], ws->mod), ws->mod);
            T = (T - 1) & M;
        } while (T != M);
        z[M] = s;
    }
}

/* pw[k*nm ..] = u^k in J for 0 <= k <= n. */
static void wpoly_powers(ulong *pw, const ulong *u, const wpoly_ws_t *ws)
{
    slong k, nm = ws->nm;

    memset(pw, 0, (size_t) nm * sizeof(ulong));
    pw[0] = 1;
    for (k = 1; k <= ws->n; k++)
        wpoly_jmul(pw + k * nm, pw + (k - 1) * nm, u, ws);
}

/* y = sum_{k<=n} t_{k+j} u^k/k! + sum_i s_i u^{a_i-j}/(a_i-j)! (a_i >= j): I_j(u) in J at the
   shifted times, from the powers pw of u.  Weil-Petersson point: t_0 = t_1 = 0,
   t_k = (-1)^k/(k-1)! for k >= 2. */
static void wpoly_ij(ulong *y, const ulong *pw, const slong *a, slong j, const wpoly_ws_t *ws)
{
    slong k, i, nm = ws->nm;
    nmod_t mod = ws->mod;

    memset(y, 0, (size_t) nm * sizeof(ulong));
    for (k = 0; k <= ws->n; k++)
    {
        slong t = k + j;
        ulong c;
        if (t < 2)
            continue;
        c = nmod_mul(ws->ifact[t - 1], ws->ifact[k], mod);
        _nmod_vec_scalar_addmul_nmod(y, pw + k * nm, nm, (t & 1) ? nmod_neg(c, mod) : c, mod);
    }
    for (i = 0; i < ws->n; i++)
    {
        slong d = a[i] - j;
        if (d < 0 || d > ws->n)
            continue;
        for (k = 0; k < nm; k++)   /* s_i times u^d/d! */
            if (!(k & (WORD(1) << i)))
                y[k | (WORD(1) << i)] = nmod_add(y[k | (WORD(1) << i)],
                                                 nmod_mul(pw[d * nm + k], ws->ifact[d], mod), mod);
    }
}

/* W_a = [s_1...s_n] sum_S s^S sum_m f_m[S](u) v^{-m} with u = I_0(u), v = 1 - I_1(u) in J. */
ulong wpoly_readout(wpoly_ws_t *ws, const slong *a)
{
    slong nm = ws->nm, n = ws->n, g = ws->g, k, m, S, M;
    ulong buf[6 * (1 << WPOLY_MAX_POINTS) + (WPOLY_MAX_POINTS + 1) * (1 << WPOLY_MAX_POINTS)];
    ulong *u = buf, *vi = u + nm, *w = vi + nm, *x = w + nm, *y = x + nm, *acc = y + nm;
    ulong *pw = acc + nm;
    nmod_t mod = ws->mod;

    memset(u, 0, (size_t) nm * sizeof(ulong));
    for (k = 0; k <= n; k++)   /* u nilpotent: n+1 iterations reach the fixed point */
    {
        wpoly_powers(pw, u, ws);
        wpoly_ij(u, pw, a, 0, ws);
    }
    wpoly_powers(pw, u, ws);
    wpoly_ij(x, pw, a, 1, ws);   /* x = 1 - v = I_1 (nilpotent), 1/v = sum x^k */
    memset(vi, 0, (size_t) nm * sizeof(ulong));
    memset(y, 0, (size_t) nm * sizeof(ulong));
    y[0] = 1;
    for (k = 0; k <= n; k++)
    {
        _nmod_vec_add(vi, vi, y, nm, mod);
        wpoly_jmul(w, y, x, ws);
        memcpy(y, w, (size_t) nm * sizeof(ulong));
    }
    memset(acc, 0, (size_t) nm * sizeof(ulong));
    memset(w, 0, (size_t) nm * sizeof(ulong));
    w[0] = 1;
    for (m = 1; m <= 5 * g - 5; m++)
    {
        wpoly_jmul(y, w, vi, ws);   /* y = v^{-m} */
        memcpy(w, y, (size_t) nm * sizeof(ulong));
        if (m < 2 * g - 1)
            continue;
        for (S = 0; S < (WORD(1) << ws->q); S++)
        {
            const ulong *fm = ws->cur[S]->f + (m - (2 * g - 1)) * (ws->L + 1);
            memset(x, 0, (size_t) nm * sizeof(ulong));
            for (k = 0; k <= n; k++)   /* x = s^S f_m[S](u) */
                for (M = 0; M < nm; M++)
                    if (!(M & S))
                        x[M | S] = nmod_add(x[M | S], nmod_mul(fm[k], pw[k * nm + M], mod), mod);
            wpoly_jmul(y, x, w, ws);
            _nmod_vec_add(acc, acc, y, nm, mod);
        }
    }
    return acc[nm - 1];
}

/* Sets the perturbation exponents of multi-index a (sorted decreasingly). */
void wpoly_set_index(wpoly_ws_t *ws, const slong *a)
{
    slong i;

    ws->q = 0;
    for (i = 0; i < ws->n && a[i] >= 2; i++)
        ws->e[ws->q++] = a[i] - 2;
}
