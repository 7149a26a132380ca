/* Laurent polynomials in pi: 1/pi is a ring variable of its own, and every
   operation that may put pi and 1/pi in one term ends with scalar_normalise.
   FLINT has no Laurent or rational-function type for several variables, so
   only powers of pi (with rational multiples) are invertible here. */
#include <stdlib.h>

#include "scalar.h"
#include "util.h"

slong scalar_pinv_degree(const fmpq_mpoly_t p, const scalar_ring *R)
{
    return fmpq_mpoly_is_zero(p, R->ctx) ? 0 : fmpq_mpoly_degree_si(p, SCALAR_PINV, R->ctx);
}

/* r = p with the exponents of pi and 1/pi of every term replaced by
   (e_pi + k, e_pinv) reduced so that at most one of them is nonzero. */
static void scalar_shift_pi(fmpq_mpoly_t r, const fmpq_mpoly_t p, slong k, const scalar_ring *R)
{
    fmpq_mpoly_t out;
    fmpq_mpoly_init(out, R->ctx);
    fmpq_t c;
    fmpq_init(c);
    ulong *exp = xcalloc(SCALAR_MAX_VARS, sizeof(ulong));
    for (slong i = 0; i < fmpq_mpoly_length(p, R->ctx); i++) {
        fmpq_mpoly_get_term_coeff_fmpq(c, p, i, R->ctx);
        fmpq_mpoly_get_term_exp_ui(exp, p, i, R->ctx);
        slong net = (slong)exp[SCALAR_PI] - (slong)exp[SCALAR_PINV] + k;
        exp[SCALAR_PI] = net > 0 ? (ulong)net : 0;
        exp[SCALAR_PINV] = net < 0 ? (ulong)(-net) : 0;
        fmpq_mpoly_push_term_fmpq_ui(out, c, exp, R->ctx);
    }
    fmpq_mpoly_sort_terms(out, R->ctx);
    fmpq_mpoly_combine_like_terms(out, R->ctx);
    fmpq_mpoly_swap(r, out, R->ctx);
    free(exp);
    fmpq_clear(c);
    fmpq_mpoly_clear(out, R->ctx);
}

void scalar_normalise(fmpq_mpoly_t p, const scalar_ring *R)
{
    if (scalar_pinv_degree(p, R) == 0 || fmpq_mpoly_degree_si(p, SCALAR_PI, R->ctx) <= 0)
        return;
    scalar_shift_pi(p, p, 0, R);
}

void scalar_mul_pi_pow(fmpq_mpoly_t r, const fmpq_mpoly_t p, slong k, const scalar_ring *R)
{
    if (k == 0 && r == p) {
        scalar_normalise(r, R);
        return;
    }
    scalar_shift_pi(r, p, k, R);
}

/* The smallest net power of pi over the terms of p (p nonzero). */
static slong scalar_pi_valuation(const fmpq_mpoly_t p, const scalar_ring *R)
{
    ulong *exp = xcalloc(SCALAR_MAX_VARS, sizeof(ulong));
    slong v = WORD_MAX;
    for (slong i = 0; i < fmpq_mpoly_length(p, R->ctx); i++) {
        fmpq_mpoly_get_term_exp_ui(exp, p, i, R->ctx);
        slong net = (slong)exp[SCALAR_PI] - (slong)exp[SCALAR_PINV];
        if (net < v)
            v = net;
    }
    free(exp);
    return v;
}

int scalar_is_unit(const fmpq_mpoly_t b, const scalar_ring *R)
{
    if (fmpq_mpoly_is_zero(b, R->ctx))
        return 0;
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, R->ctx);
    scalar_mul_pi_pow(t, b, -scalar_pi_valuation(b, R), R);
    int unit = fmpq_mpoly_is_fmpq(t, R->ctx);
    fmpq_mpoly_clear(t, R->ctx);
    return unit;
}

int scalar_div(fmpq_mpoly_t r, const fmpq_mpoly_t a, const fmpq_mpoly_t b, const scalar_ring *R)
{
    /* a = pi^va a0, b = pi^vb b0 with a0, b0 polynomials prime to pi (no 1/pi);
       since pi is prime in Q[x, pi], b0 divides pi^j a0 only when it divides a0 */
    if (fmpq_mpoly_is_zero(a, R->ctx)) {
        fmpq_mpoly_zero(r, R->ctx);
        return 1;
    }
    slong va = scalar_pi_valuation(a, R), vb = scalar_pi_valuation(b, R);
    fmpq_mpoly_t a0, b0;
    fmpq_mpoly_init(a0, R->ctx);
    fmpq_mpoly_init(b0, R->ctx);
    scalar_mul_pi_pow(a0, a, -va, R);
    scalar_mul_pi_pow(b0, b, -vb, R);
    int ok = 1;
    if (fmpq_mpoly_is_fmpq(b0, R->ctx)) {
        fmpq_t c;
        fmpq_init(c);
        fmpq_mpoly_get_fmpq(c, b0, R->ctx);
        fmpq_mpoly_scalar_div_fmpq(a0, a0, c, R->ctx);
        fmpq_clear(c);
    } else {
        ok = fmpq_mpoly_divides(a0, a0, b0, R->ctx);
    }
    if (ok)
        scalar_mul_pi_pow(r, a0, va - vb, R);
    else
        fmpq_mpoly_zero(r, R->ctx);
    fmpq_mpoly_clear(a0, R->ctx);
    fmpq_mpoly_clear(b0, R->ctx);
    return ok;
}
