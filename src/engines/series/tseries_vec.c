/* tseries_vec.c - coefficient vectors of truncated series and the generic recurrences
 * (coefficients in Q[other variables]); see tseries_internal.h for the contracts.
 */
#include <stdlib.h>
#include "series/tseries_internal.h"
#include "util.h"

/* GCC 11-12 with -fsanitize=address at -O2 reports a false -Wstringop-overread inside FLINT's
   inline mpoly wrappers (degrees_fit_si, sort_terms, combine_like_terms): it takes the context
   for an 8-byte object.  Silenced for this file only, for GCC only. */
#if defined(__GNUC__) && !defined(__clang__) && __GNUC__ >= 11
#pragma GCC diagnostic ignored "-Wstringop-overread"
#endif

/* Allocates len zero coefficients.
   Must be paired with tsvec_clear. */
void tsvec_init(tsvec *v, slong len, const fmpq_mpoly_ctx_t ctx)
{
    slong i;
    v->len = len < 0 ? 0 : len;
    v->c = v->len ? xmalloc((size_t) v->len * sizeof(fmpq_mpoly_struct)) : NULL;
    for (i = 0; i < v->len; i++)
        fmpq_mpoly_init(v->c + i, ctx);
}

/* Releases the coefficients.
   v is left empty and may be cleared again. */
void tsvec_clear(tsvec *v, const fmpq_mpoly_ctx_t ctx)
{
    slong i;
    for (i = 0; i < v->len; i++)
        fmpq_mpoly_clear(v->c + i, ctx);
    free(v->c);
    v->c = NULL;
    v->len = 0;
}

/* Splits p by the power of x: each term goes, with its x exponent zeroed, to c[exponent].
   One pass over the terms, then each coefficient is put in canonical form. */
void tsvec_from_mpoly(tsvec *v, const fmpq_mpoly_t p, slong var, const fmpq_mpoly_ctx_t ctx)
{
    slong i, e, nv = fmpq_mpoly_ctx_nvars(ctx), len = fmpq_mpoly_length(p, ctx);
    ulong *exp = xmalloc((size_t) nv * sizeof(ulong));
    fmpq_t c;
    fmpq_init(c);
    for (i = 0; i < v->len; i++)
        fmpq_mpoly_zero(v->c + i, ctx);
    for (i = 0; i < len; i++) {
        e = fmpq_mpoly_get_term_var_exp_si(p, i, var, ctx);
        if (e >= v->len)
            continue;
        fmpq_mpoly_get_term_exp_ui(exp, p, i, ctx);
        exp[var] = 0;
        fmpq_mpoly_get_term_coeff_fmpq(c, p, i, ctx);
        fmpq_mpoly_push_term_fmpq_ui(v->c + e, c, exp, ctx);
    }
    for (i = 0; i < v->len; i++) {
        fmpq_mpoly_sort_terms(v->c + i, ctx);
        fmpq_mpoly_combine_like_terms(v->c + i, ctx);
    }
    fmpq_clear(c);
    free(exp);
}

/* p = sum_i c[i] x^i by pushing every term with its x exponent set to i.
   The coefficients must not involve x. */
void tsvec_to_mpoly(fmpq_mpoly_t p, const tsvec *v, slong var, const fmpq_mpoly_ctx_t ctx)
{
    slong i, j, nv = fmpq_mpoly_ctx_nvars(ctx);
    ulong *exp = xmalloc((size_t) nv * sizeof(ulong));
    fmpq_t c;
    fmpq_init(c);
    fmpq_mpoly_zero(p, ctx);
    for (i = 0; i < v->len; i++)
        for (j = 0; j < fmpq_mpoly_length(v->c + i, ctx); j++) {
            fmpq_mpoly_get_term_exp_ui(exp, v->c + i, j, ctx);
            exp[var] = (ulong) i;
            fmpq_mpoly_get_term_coeff_fmpq(c, v->c + i, j, ctx);
            fmpq_mpoly_push_term_fmpq_ui(p, c, exp, ctx);
        }
    fmpq_mpoly_sort_terms(p, ctx);
    fmpq_mpoly_combine_like_terms(p, ctx);
    fmpq_clear(c);
    free(exp);
}

/* Coefficient i of v, or NULL when it lies beyond v's length or is zero.
   Lets the recurrences skip zero products cheaply. */
static const fmpq_mpoly_struct *tsvec_get(const tsvec *v, slong i, const fmpq_mpoly_ctx_t ctx)
{
    if (i < 0 || i >= v->len || fmpq_mpoly_is_zero(v->c + i, ctx))
        return NULL;
    return v->c + i;
}

/* acc += a * b for possibly absent (NULL = zero) factors, t scratch.
   Used by every convolution below. */
static void tsvec_addmul(fmpq_mpoly_t acc, const fmpq_mpoly_struct *a, const fmpq_mpoly_struct *b,
                         fmpq_mpoly_t t, const fmpq_mpoly_ctx_t ctx)
{
    if (a == NULL || b == NULL)
        return;
    fmpq_mpoly_mul(t, a, b, ctx);
    fmpq_mpoly_add(acc, acc, t, ctx);
}

/* r = a * b truncated to r->len terms (schoolbook convolution).
   r must be distinct from a and b. */
void tsvec_mullow(tsvec *r, const tsvec *a, const tsvec *b, const fmpq_mpoly_ctx_t ctx)
{
    slong k, i;
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, ctx);
    for (k = 0; k < r->len; k++) {
        fmpq_mpoly_zero(r->c + k, ctx);
        for (i = 0; i <= k; i++)
            tsvec_addmul(r->c + k, tsvec_get(a, i, ctx), tsvec_get(b, k - i, ctx), t, ctx);
    }
    fmpq_mpoly_clear(t, ctx);
}

/* q_k = (a_k - sum_{i=1..k} b_i q_{k-i}) / b_0, with b_0 a nonzero rational constant.
   q must be distinct from a and b. */
void tsvec_div(tsvec *q, const tsvec *a, const tsvec *b, const fmpq_mpoly_ctx_t ctx)
{
    slong k, i;
    fmpq_t b0;
    fmpq_mpoly_t t, s;
    fmpq_init(b0);
    fmpq_mpoly_init(t, ctx);
    fmpq_mpoly_init(s, ctx);
    fmpq_mpoly_get_fmpq(b0, b->c, ctx);
    for (k = 0; k < q->len; k++) {
        fmpq_mpoly_zero(t, ctx);
        for (i = 1; i <= k; i++)
            tsvec_addmul(t, tsvec_get(b, i, ctx), tsvec_get(q, k - i, ctx), s, ctx);
        if (k < a->len)
            fmpq_mpoly_sub(q->c + k, a->c + k, t, ctx);
        else
            fmpq_mpoly_neg(q->c + k, t, ctx);
        fmpq_mpoly_scalar_div_fmpq(q->c + k, q->c + k, b0, ctx);
    }
    fmpq_mpoly_clear(s, ctx);
    fmpq_mpoly_clear(t, ctx);
    fmpq_clear(b0);
}

/* g_0 = 1, k g_k = sum_{j=1..k} j f_j g_{k-j}  (from g' = f' g).
   g must be distinct from f; f_0 is ignored (must be 0). */
void tsvec_exp(tsvec *g, const tsvec *f, const fmpq_mpoly_ctx_t ctx)
{
    slong k, j;
    fmpq_mpoly_t t, jf;
    fmpq_mpoly_init(t, ctx);
    fmpq_mpoly_init(jf, ctx);
    for (k = 0; k < g->len; k++) {
        if (k == 0) {
            fmpq_mpoly_one(g->c, ctx);
            continue;
        }
        fmpq_mpoly_zero(g->c + k, ctx);
        for (j = 1; j <= k; j++) {
            if (tsvec_get(f, j, ctx) == NULL)
                continue;
            fmpq_mpoly_scalar_mul_si(jf, f->c + j, j, ctx);
            tsvec_addmul(g->c + k, jf, tsvec_get(g, k - j, ctx), t, ctx);
        }
        fmpq_mpoly_scalar_div_si(g->c + k, g->c + k, k, ctx);
    }
    fmpq_mpoly_clear(jf, ctx);
    fmpq_mpoly_clear(t, ctx);
}

/* g_0 = 0, k g_k = k f_k - sum_{j=1..k-1} j g_j f_{k-j}  (from f g' = f', f_0 = 1).
   g must be distinct from f. */
void tsvec_log(tsvec *g, const tsvec *f, const fmpq_mpoly_ctx_t ctx)
{
    slong k, j;
    fmpq_mpoly_t t, s, jg;
    fmpq_mpoly_init(t, ctx);
    fmpq_mpoly_init(s, ctx);
    fmpq_mpoly_init(jg, ctx);
    for (k = 0; k < g->len; k++) {
        fmpq_mpoly_zero(g->c + k, ctx);
        if (k == 0)
            continue;
        fmpq_mpoly_zero(s, ctx);
        for (j = 1; j < k; j++) {
            if (tsvec_get(g, j, ctx) == NULL)
                continue;
            fmpq_mpoly_scalar_mul_si(jg, g->c + j, j, ctx);
            tsvec_addmul(s, jg, tsvec_get(f, k - j, ctx), t, ctx);
        }
        fmpq_mpoly_scalar_div_si(s, s, k, ctx);
        if (k < f->len)
            fmpq_mpoly_sub(g->c + k, f->c + k, s, ctx);
        else
            fmpq_mpoly_neg(g->c + k, s, ctx);
    }
    fmpq_mpoly_clear(jg, ctx);
    fmpq_mpoly_clear(s, ctx);
    fmpq_mpoly_clear(t, ctx);
}

/* Copies the first dst->len coefficients of src (zero beyond src's length).
   dst distinct from src. */
static void tsvec_copy(tsvec *dst, const tsvec *src, const fmpq_mpoly_ctx_t ctx)
{
    slong i;
    for (i = 0; i < dst->len; i++) {
        if (i < src->len)
            fmpq_mpoly_set(dst->c + i, src->c + i, ctx);
        else
            fmpq_mpoly_zero(dst->c + i, ctx);
    }
}

/* Exchanges the coefficient arrays of two vectors of equal length.
   O(1). */
static void tsvec_swap(tsvec *a, tsvec *b)
{
    tsvec t = *a;
    *a = *b;
    *b = t;
}

/* r = f^e mod x^len by right-to-left binary powering (r distinct from f).
   e = 0 gives 1 (also for f = 0). */
void tsvec_pow_ui(tsvec *r, const tsvec *f, ulong e, const fmpq_mpoly_ctx_t ctx)
{
    slong i, n = r->len;
    tsvec base, t;
    if (n == 0)
        return;
    tsvec_init(&base, n, ctx);
    tsvec_init(&t, n, ctx);
    tsvec_copy(&base, f, ctx);
    for (i = 0; i < n; i++)
        fmpq_mpoly_zero(r->c + i, ctx);
    fmpq_mpoly_one(r->c, ctx);
    while (e != 0) {
        if (e & 1) {
            tsvec_mullow(&t, r, &base, ctx);
            tsvec_swap(&t, r);
        }
        e >>= 1;
        if (e != 0) {
            tsvec_mullow(&t, &base, &base, ctx);
            tsvec_swap(&t, &base);
        }
    }
    tsvec_clear(&t, ctx);
    tsvec_clear(&base, ctx);
}

/* Horner: r = (...(f_{n-1} g + f_{n-2}) g + ...) g + f_0 mod x^n, n = r->len.
   r distinct from f and g; g_0 must be 0. */
void tsvec_compose(tsvec *r, const tsvec *f, const tsvec *g, const fmpq_mpoly_ctx_t ctx)
{
    slong i, n = r->len;
    tsvec t;
    tsvec_init(&t, n, ctx);
    for (i = 0; i < n; i++)
        fmpq_mpoly_zero(r->c + i, ctx);
    for (i = FLINT_MIN(n, f->len) - 1; i >= 0; i--) {
        tsvec_mullow(&t, r, g, ctx);
        tsvec_swap(&t, r);
        fmpq_mpoly_add(r->c, r->c, f->c + i, ctx);
    }
    tsvec_clear(&t, ctx);
}

/* Lagrange inversion: h = z / f(z) = 1 / (f_1 + f_2 z + ...), [x^m] r = [z^(m-1)] h^m / m.
   r distinct from f; f_0 = 0 and f_1 a nonzero rational. */
void tsvec_revert(tsvec *r, const tsvec *f, const fmpq_mpoly_ctx_t ctx)
{
    slong m, n = r->len;
    tsvec one, shifted, h, hm, t;
    if (n == 0)
        return;
    fmpq_mpoly_zero(r->c, ctx);
    tsvec_init(&one, 1, ctx);
    tsvec_init(&shifted, n - 1, ctx);
    tsvec_init(&h, n - 1, ctx);
    tsvec_init(&hm, n - 1, ctx);
    tsvec_init(&t, n - 1, ctx);
    fmpq_mpoly_one(one.c, ctx);
    for (m = 0; m < n - 1; m++)
        if (m + 1 < f->len)
            fmpq_mpoly_set(shifted.c + m, f->c + m + 1, ctx);
    if (n > 1) {
        tsvec_div(&h, &one, &shifted, ctx);
        fmpq_mpoly_one(hm.c, ctx);
    }
    for (m = 1; m < n; m++) {
        tsvec_mullow(&t, &hm, &h, ctx);
        tsvec_swap(&t, &hm);
        fmpq_mpoly_scalar_div_si(r->c + m, hm.c + m - 1, m, ctx);
    }
    tsvec_clear(&t, ctx);
    tsvec_clear(&hm, ctx);
    tsvec_clear(&h, ctx);
    tsvec_clear(&shifted, ctx);
    tsvec_clear(&one, ctx);
}
