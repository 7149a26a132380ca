/* hodge_lambda.c - lambda classes as polynomials in the ch classes, and integrals with lambdas.
 *
 * c(E) = sum_j lambda_j = exp(sum_{k>=1} (-1)^{k-1} (k-1)! ch_k(E)) (for a line bundle with
 * c_1 = x, ch_k = x^k/k! and the exponent is log(1 + x)).  With ch_{2k} = 0 only odd k remain
 * and the sign is +1.  Differentiating, j lambda_j = sum_{k odd, k <= j} k! ch_k lambda_{j-k}
 * (Newton's identities), e.g. lambda_1 = ch_1, lambda_2 = ch_1^2/2, lambda_3 = ch_1^3/6 + 2 ch_3.
 */
#include <math.h>
#include <stdlib.h>
#include <flint/fmpz.h>
#include <flint/fmpq_mpoly.h>
#include "hodge_internal.h"

/* L[0..J] = lambda_0..lambda_J in R (variable v is ch_{2v+1}); L initialised by the caller. */
static void hodge_lambda_table(fmpq_mpoly_struct *L, slong J, const fmpq_mpoly_ctx_t R)
{
    fmpq_mpoly_t t;
    fmpz_t f;
    fmpq_mpoly_init(t, R);
    fmpz_init(f);
    fmpq_mpoly_one(L + 0, R);
    for (slong j = 1; j <= J; j++) {
        fmpq_mpoly_zero(L + j, R);
        for (slong k = 1; k <= j; k += 2) {
            fmpq_mpoly_gen(t, (k - 1) / 2, R);
            fmpq_mpoly_mul(t, t, L + j - k, R);
            fmpz_fac_ui(f, (ulong) k);
            fmpq_mpoly_scalar_mul_fmpz(t, t, f, R);
            fmpq_mpoly_add(L + j, L + j, t, R);
        }
        fmpq_mpoly_scalar_div_si(L + j, L + j, j, R);
    }
    fmpq_mpoly_clear(t, R);
    fmpz_clear(f);
}

int hodge_lambda_ch_poly(fmpq_mpoly_t P, const slong *lmult, slong lmax, const fmpq_mpoly_ctx_t R)
{
    slong deg = 0;
    fmpq_mpoly_struct *L;
    fmpq_mpoly_one(P, R);
    if (lmax < 0 || (lmax > 0 && lmult == NULL))
        return WK_BADARG;
    while (lmax > 0 && lmult[lmax] == 0)
        lmax--;
    for (slong j = 1; j <= lmax; j++) {
        if (lmult[j] < 0 || lmult[j] > HODGE_MAX_INDEX)
            return WK_BADARG;
        deg += j * lmult[j];
    }
    if (fmpq_mpoly_ctx_nvars(R) < (deg + 1) / 2)
        return WK_BADARG;
    L = malloc((size_t) (lmax + 1) * sizeof(fmpq_mpoly_struct));
    if (L == NULL)
        return WK_LIMIT;
    for (slong j = 0; j <= lmax; j++)
        fmpq_mpoly_init(L + j, R);
    hodge_lambda_table(L, lmax, R);
    for (slong j = 1; j <= lmax; j++) {
        if (lmult[j] == 0)
            continue;
        fmpq_mpoly_pow_ui(L + j, L + j, (ulong) lmult[j], R);
        fmpq_mpoly_mul(P, P, L + j, R);
    }
    for (slong j = 0; j <= lmax; j++)
        fmpq_mpoly_clear(L + j, R);
    free(L);
    return WK_OK;
}

/* Total degree of psi^d kappa^kmult ch^cmult (index 0 of kmult and cmult ignored). */
static slong hodge_degree(const slong *d, slong n, const slong *kmult, slong kmax, const slong *cmult, slong cmax)
{
    slong s = 0;
    for (slong i = 0; i < n; i++)
        s += d[i];
    for (slong j = 1; j <= kmax; j++)
        s += j * kmult[j];
    for (slong j = 1; j <= cmax; j++)
        s += j * cmult[j];
    return s;
}

/* res = sum over the terms c * prod ch_{2v+1}^{e_v} of P of c * hodge_integral(... cmult + e),
   times lambda_g (kept whole by the operator route) if top. */
static int hodge_integrate_ch_poly(fmpq_t res, hodge_ctx *H, int route, slong g, const slong *d, slong n,
                                   const slong *kmult, slong kmax, const slong *cmult, slong cmax,
                                   const fmpq_mpoly_t P, const fmpq_mpoly_ctx_t R, int top)
{
    slong nv = fmpq_mpoly_ctx_nvars(R), cm2max = cmax > 2 * nv - 1 ? cmax : 2 * nv - 1;
    slong *e = calloc((size_t) (nv + cm2max + 2), sizeof(slong)), *cm2;
    fmpq_t c, v;
    int st = WK_OK;
    if (e == NULL)
        return WK_LIMIT;
    cm2 = e + nv;
    fmpq_init(c);
    fmpq_init(v);
    for (slong t = 0; t < fmpq_mpoly_length(P, R) && st == WK_OK; t++) {
        fmpq_mpoly_get_term_exp_si(e, P, t, R);
        fmpq_mpoly_get_term_coeff_fmpq(c, P, t, R);
        for (slong k = 0; k <= cm2max; k++)
            cm2[k] = k <= cmax && k > 0 ? cmult[k] : 0;
        for (slong u = 0; u < nv; u++)
            cm2[2 * u + 1] += e[u];
        st = hodge_integral_top(v, H, route, g, d, n, kmult, kmax, cm2, cm2max, top);
        fmpq_mul(v, v, c);
        fmpq_add(res, res, v);
    }
    fmpq_clear(c);
    fmpq_clear(v);
    free(e);
    return st;
}

/* Prepares lambda_g to be kept whole by the operator route (hodge_fp.c, where it makes the leaves
   closed forms): lambda_g itself, or lambda_{g-1}^2, which Mumford's relation c(E) c(E^dual) = 1
   in degree 2g-2 turns into 2 lambda_{g-2} lambda_g (the other terms hold lambda_j with j > g).
   lm[1..lmax] (lmax <= g) are the lambda multiplicities, rewritten to those left to expand.
   Returns the factor of the result (1 or 2), or 0 when lambda_g cannot be kept (lm unchanged). */
static int hodge_lambda_keep_top(slong *lm, slong lmax, slong g)
{
    if (lmax == g && lm[g] == 1) {
        lm[g] = 0;
        return 1;
    }
    if (g >= 2 && lmax == g - 1 && lm[g - 1] >= 2) {
        lm[g - 1] -= 2;
        if (g >= 3)
            lm[g - 2]++;
        return 2;
    }
    return 0;
}

int hodge_integral_lambda(fmpq_t res, hodge_ctx *H, int route, slong g, const slong *d, slong n,
                          const slong *kmult, slong kmax, const slong *lmult, slong lmax,
                          const slong *cmult, slong cmax, int expand_all)
{
    slong ldeg = 0, nv, *lm;
    int keep;
    fmpq_mpoly_ctx_t R;
    fmpq_mpoly_t P;
    int st;
    fmpq_zero(res);
    if (lmax < 0 || (lmax > 0 && lmult == NULL))
        return WK_BADARG;
    for (slong j = 1; j <= lmax; j++)
        if (lmult[j] < 0 || lmult[j] > HODGE_MAX_INDEX || lmax > HODGE_MAX_INDEX)
            return WK_BADARG;
    while (lmax > 0 && lmult[lmax] == 0)
        lmax--;
    for (slong j = 1; j <= lmax; j++)
        ldeg += j * lmult[j];
    if (lmax == 0)
        return hodge_integral(res, H, route, g, d, n, kmult, kmax, cmult, cmax);
    st = hodge_check_args(H, route, g, d, n, kmult, kmax, cmult, cmax);
    /* lambda_j = 0 for j > g (E has rank g) and lambda_g^2 = 0 (the top-degree part of Mumford's
       relation c(E) c(E^dual) = 1, checked through the ch expansion by tests/unit/test_hodge.c) */
    if (st != WK_OK || (lmax > g && !expand_all) || (lmax == g && lmult[g] >= 2 && !expand_all)
        || hodge_degree(d, n, kmult, kmax, cmult, cmax) + ldeg != 3 * g - 3 + n)
        return st;
    nv = (ldeg + 1) / 2;
    fmpq_mpoly_ctx_init(R, nv, ORD_LEX);
    fmpq_mpoly_init(P, R);
    lm = calloc((size_t) (lmax + 1), sizeof(slong));
    st = lm == NULL ? WK_LIMIT : WK_OK;
    for (slong j = 1; j <= lmax && st == WK_OK; j++)
        lm[j] = lmult[j];
    keep = st == WK_OK && route == HODGE_ROUTE_FP && !expand_all ? hodge_lambda_keep_top(lm, lmax, g) : 0;
    if (st == WK_OK)
        st = hodge_lambda_ch_poly(P, lm, lmax, R);
    if (st == WK_OK)
        st = hodge_integrate_ch_poly(res, H, route, g, d, n, kmult, kmax, cmult, cmax, P, R, keep != 0);
    if (st == WK_OK && keep == 2)
        fmpq_mul_2exp(res, res, 1);
    free(lm);
    if (st != WK_OK)
        fmpq_zero(res);
    fmpq_mpoly_clear(P, R);
    fmpq_mpoly_ctx_clear(R);
    return st;
}

/* Number of partitions of m (as a double; m <= 4000). */
static double hodge_partitions(slong m)
{
    double *p = calloc((size_t) m + 1, sizeof(double)), r;
    if (p == NULL)
        return HUGE_VAL;
    p[0] = 1;
    for (slong k = 1; k <= m; k++)
        for (slong s = k; s <= m; s++)
            p[s] += p[s - k];
    r = p[m];
    free(p);
    return r;
}

/* Largest number of sub-multisets, prod (m_k + 1), of a multiset of odd parts of sum <= c. */
static double hodge_submultisets(slong c)
{
    double *best = malloc(((size_t) c + 1) * sizeof(double)), r;
    if (best == NULL)
        return HUGE_VAL;
    for (slong s = 0; s <= c; s++)
        best[s] = 1;
    for (slong k = c - (c % 2 == 0); k >= 1; k -= 2)       /* odd parts, largest first */
        for (slong s = c; s >= k; s--)
            for (slong m = 1; m * k <= s; m++)
                if ((m + 1) * best[s - m * k] > best[s])
                    best[s] = (m + 1) * best[s - m * k];
    r = best[c];
    free(best);
    return r;
}

/* Memo states of the operator route (hodge_fp.c) are (g', psi multiset, ch sub-multiset),
   counted here by the psi multisets of sum <= D, at most p(D), as if the string and dilaton
   equations left only exponents >= 2; the route also memoises the states with exponents 0 and 1
   and the psi-only correlators it meets.  Measured against the route: 262307 states for
   lambda_12 lambda_11 psi_1^11 on Mbar_{12,1}, where this gives 1.1e7 (generous, not proven). */
double hodge_estimate_states(slong g, slong n, slong cdeg)
{
    slong D = 3 * g - 3 + n;
    double p;
    if (g < 0 || n < 0 || cdeg < 0)
        return 0;
    if (D < 1)
        return 1;
    if (D > 4000 || cdeg > 4000)
        return HUGE_VAL;
    p = (g + 1.0) * hodge_partitions(D) * hodge_submultisets(cdeg);
    return p > 1e18 ? HUGE_VAL : p;
}
