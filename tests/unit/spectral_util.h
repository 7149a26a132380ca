/* spectral_util.h - helpers shared by the spectral-curve unit tests (header-only, test code only):
 * one context with the variables pi, L1..L4, a1..a6, curves built from strings, and a table of
 * W_{g,n}[d] or V_{g,n} coefficients turned into a symmetric polynomial in L1..Ln (or 1/z).
 */
#ifndef PSIKAPPA_TESTS_SPECTRAL_UTIL_H
#define PSIKAPPA_TESTS_SPECTRAL_UTIL_H

#include <stdlib.h>
#include <string.h>
#include <flint/fmpq_mpoly.h>
#include <flint/fmpz.h>
#include "spectral/spectral.h"

#define SPU_NVARS 11
#define SPU_PI 0
#define SPU_L(i) (i)            /* L1..L4 are variables 1..4 */
#define SPU_A(i) (4 + (i))      /* a1..a6 are variables 5..10 */

static const char *spu_names[SPU_NVARS] = {"pi", "L1", "L2", "L3", "L4", "a1", "a2", "a3", "a4", "a5", "a6"};

/* Sets P from a string in the names above; returns 0 on success. */
static inline int spu_set(fmpq_mpoly_t P, const char *s, const fmpq_mpoly_ctx_t ctx)
{
    return fmpq_mpoly_set_str_pretty(P, s, spu_names, ctx);
}

/* Allocates and zeroes K+1 coefficients (free with spu_curve_free). */
static inline fmpq_mpoly_struct *spu_curve_new(slong K, const fmpq_mpoly_ctx_t ctx)
{
    slong k;
    fmpq_mpoly_struct *y = flint_malloc((size_t) (K + 1) * sizeof(fmpq_mpoly_struct));
    for (k = 0; k <= K; k++)
        fmpq_mpoly_init(y + k, ctx);
    return y;
}

static inline void spu_curve_free(fmpq_mpoly_struct *y, slong K, const fmpq_mpoly_ctx_t ctx)
{
    slong k;
    for (k = 0; k <= K; k++)
        fmpq_mpoly_clear(y + k, ctx);
    flint_free(y);
}

/* y_k = (-1)^k (2 pi)^{2k} / (2k+1)! for k = 0..K: the odd curve sin(2 pi z)/(2 pi). */
static inline fmpq_mpoly_struct *spu_curve_jt(slong K, const fmpq_mpoly_ctx_t ctx)
{
    slong k;
    fmpz_t f;
    fmpq_mpoly_struct *y = spu_curve_new(K, ctx);
    fmpz_init(f);
    for (k = 0; k <= K; k++) {
        fmpq_mpoly_gen(y + k, SPU_PI, ctx);
        fmpq_mpoly_scalar_mul_si(y + k, y + k, 2, ctx);
        fmpq_mpoly_pow_ui(y + k, y + k, (ulong) (2 * k), ctx);
        fmpz_fac_ui(f, (ulong) (2 * k + 1));
        fmpq_mpoly_scalar_div_fmpz(y + k, y + k, f, ctx);
        if (k % 2)
            fmpq_mpoly_neg(y + k, y + k, ctx);
    }
    fmpz_clear(f);
    return y;
}

/* Visits the exponent tuples e in [0..D]^n with |e| <= D: adds T[sort(e)] * prod X_i^{2 e_i}
   (X_i the variable of index var0 + i) to P. */
static inline void spu_poly_walk(fmpq_mpoly_t P, const sp_table *T, slong var0, slong *e, slong i,
                                 slong R, const fmpq_mpoly_ctx_t ctx)
{
    slong v, j, k, r, s[16];
    fmpq_mpoly_t m;
    if (i == T->n) {
        memcpy(s, e, (size_t) T->n * sizeof(slong));
        for (j = 1; j < T->n; j++)                         /* sort decreasingly */
            for (k = j; k > 0 && s[k - 1] < s[k]; k--)
                v = s[k], s[k] = s[k - 1], s[k - 1] = v;
        r = sp_table_find(T, s);
        if (r < 0)
            return;
        fmpq_mpoly_init(m, ctx);
        fmpq_mpoly_set(m, T->c + r, ctx);
        for (j = 0; j < T->n; j++) {
            fmpq_mpoly_t x;
            fmpq_mpoly_init(x, ctx);
            fmpq_mpoly_gen(x, var0 + j, ctx);
            fmpq_mpoly_pow_ui(x, x, (ulong) (2 * e[j]), ctx);
            fmpq_mpoly_mul(m, m, x, ctx);
            fmpq_mpoly_clear(x, ctx);
        }
        fmpq_mpoly_add(P, P, m, ctx);
        fmpq_mpoly_clear(m, ctx);
        return;
    }
    for (v = 0; v <= R; v++) {
        e[i] = v;
        spu_poly_walk(P, T, var0, e, i + 1, R - v, ctx);
    }
}

/* P = sum over all d (every ordering) of T[d] prod L_i^{2 d_i}, in L1..Ln (n <= 4). */
static inline void spu_table_poly(fmpq_mpoly_t P, const sp_table *T, const fmpq_mpoly_ctx_t ctx)
{
    slong e[16];
    fmpq_mpoly_zero(P, ctx);
    spu_poly_walk(P, T, SPU_L(1), e, 0, 3 * T->g - 3 + T->n, ctx);
}

#endif
