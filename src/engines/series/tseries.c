/* tseries.c - basic operations on truncated power series: life cycle, access, ring operations,
 * division, derivative and integral (contracts in tseries.h and tseries_internal.h).
 */
#include <flint/fmpq_poly.h>
#include "series/tseries_internal.h"

/* GCC 11-12 with -fsanitize=address at -O2 reports a false -Wstringop-overread inside FLINT's
   inline mpoly wrappers (degrees_fit_si, sort_terms, combine_like_terms): it takes the context
   for an 8-byte object.  Silenced for this file only, for GCC only. */
#if defined(__GNUC__) && !defined(__clang__) && __GNUC__ >= 11
#pragma GCC diagnostic ignored "-Wstringop-overread"
#endif

/* Initialises s as 0 + O(x^(order+1)).
   Must be paired with tseries_clear. */
void tseries_init(tseries *s, slong var, slong order, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_init(s->p, ctx);
    s->var = var;
    s->order = order < -1 ? -1 : order;
}

/* Releases the polynomial of s.
   s may be re-initialised afterwards. */
void tseries_clear(tseries *s, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_clear(s->p, ctx);
}

/* Returns TS_OK for a valid series: var in range, -1 <= order <= TSERIES_MAX_ORDER, slong-sized
   exponents.  Used at the entry of every operation. */
int tseries_check(const tseries *s, const fmpq_mpoly_ctx_t ctx)
{
    if (s == NULL || s->var < 0 || s->var >= fmpq_mpoly_ctx_nvars(ctx) || s->order < -1
        || s->order > TSERIES_MAX_ORDER)
        return TS_BADARG;
    return fmpq_mpoly_degrees_fit_si(s->p, ctx) ? TS_OK : TS_BADARG;
}

/* Checks both operands and that they share the main variable.
   Returns TS_OK, TS_BADARG or TS_VAR_MISMATCH. */
int tseries_check_pair(const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx)
{
    int st = tseries_check(a, ctx);
    if (st == TS_OK)
        st = tseries_check(b, ctx);
    if (st == TS_OK && a->var != b->var)
        st = TS_VAR_MISMATCH;
    return st;
}

/* Sets r to the error result: zero with order -1 in the variable var.
   Called on every failure path. */
void tseries_set_error(tseries *r, slong var, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_zero(r->p, ctx);
    r->var = var;
    r->order = -1;
}

/* Drops the terms of p of x-degree above order (p = 0 for order < 0).
   Cheap when nothing has to be dropped. */
static void tseries_drop_high(fmpq_mpoly_t p, slong var, slong order, const fmpq_mpoly_ctx_t ctx)
{
    tsvec v;
    if (fmpq_mpoly_degree_si(p, var, ctx) <= order)
        return;
    tsvec_init(&v, order + 1, ctx);
    tsvec_from_mpoly(&v, p, var, ctx);
    tsvec_to_mpoly(p, &v, var, ctx);
    tsvec_clear(&v, ctx);
}

/* s = p truncated to s->order.
   p may be s->p; an invalid var leaves p untruncated (reported by later operations). */
void tseries_set_mpoly(tseries *s, const fmpq_mpoly_t p, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_set(s->p, p, ctx);
    if (s->var >= 0 && s->var < fmpq_mpoly_ctx_nvars(ctx) && fmpq_mpoly_degrees_fit_si(p, ctx))
        tseries_drop_high(s->p, s->var, s->order, ctx);
}

/* r = a (polynomial, var and order).
   Aliasing allowed. */
void tseries_set(tseries *r, const tseries *a, const fmpq_mpoly_ctx_t ctx)
{
    if (r == a)
        return;
    fmpq_mpoly_set(r->p, a->p, ctx);
    r->var = a->var;
    r->order = a->order;
}

/* Lowers the order of s to order (never raises it) and drops higher terms.
   An invalid s is left unchanged. */
void tseries_truncate(tseries *s, slong order, const fmpq_mpoly_ctx_t ctx)
{
    if (tseries_check(s, ctx) != TS_OK || order >= s->order)
        return;
    s->order = order < -1 ? -1 : order;
    tseries_drop_high(s->p, s->var, s->order, ctx);
}

/* Smallest x exponent among the terms of s, -1 for the zero series.
   -2 for an invalid series. */
slong tseries_valuation(const tseries *s, const fmpq_mpoly_ctx_t ctx)
{
    slong i, e, v = -1;
    if (tseries_check(s, ctx) != TS_OK)
        return -2;
    for (i = 0; i < fmpq_mpoly_length(s->p, ctx); i++) {
        e = fmpq_mpoly_get_term_var_exp_si(s->p, i, s->var, ctx);
        if (v < 0 || e < v)
            v = e;
    }
    return v;
}

/* 1 when p involves at most the main variable.
   An invalid s gives 0. */
int tseries_is_rational(const tseries *s, const fmpq_mpoly_ctx_t ctx)
{
    if (tseries_check(s, ctx) != TS_OK)
        return 0;
    return fmpq_mpoly_is_fmpq_poly(s->p, s->var, ctx);
}

/* q = known part of s as a univariate polynomial; returns 0 (q untouched) if not rational.
   s must be valid. */
int tseries_get_fmpq_poly(fmpq_poly_t q, const tseries *s, const fmpq_mpoly_ctx_t ctx)
{
    if (!fmpq_mpoly_is_fmpq_poly(s->p, s->var, ctx))
        return 0;
    return fmpq_mpoly_get_fmpq_poly(q, s->p, s->var, ctx);
}

/* s->p = q truncated to s->order.
   s->var must be valid. */
void tseries_set_fmpq_poly(tseries *s, const fmpq_poly_t q, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_poly_t t;
    fmpq_poly_init(t);
    fmpq_poly_set(t, q);
    fmpq_poly_truncate(t, s->order + 1);
    fmpq_mpoly_set_fmpq_poly(s->p, t, s->var, ctx);
    fmpq_poly_clear(t);
}

/* v = the s->order + 1 known coefficients of s.
   Paired with tsvec_clear. */
void tsvec_init_series(tsvec *v, const tseries *s, const fmpq_mpoly_ctx_t ctx)
{
    tsvec_init(v, s->order + 1, ctx);
    tsvec_from_mpoly(v, s->p, s->var, ctx);
}

/* r = sum v->c[i] x^i with the given var and order.
   v->len must equal order + 1. */
void tseries_set_tsvec(tseries *r, const tsvec *v, slong var, slong order, const fmpq_mpoly_ctx_t ctx)
{
    tsvec_to_mpoly(r->p, v, var, ctx);
    r->var = var;
    r->order = order;
}

/* Classifies the x^0 coefficient: 0 zero polynomial, 1 nonzero rational (stored in c when
   c != NULL), 2 involves other variables.  s must be valid. */
int tseries_constant_kind(fmpq_t c, const tseries *s, const fmpq_mpoly_ctx_t ctx)
{
    int kind;
    fmpq_mpoly_t c0;
    fmpq_mpoly_init(c0, ctx);
    tseries_coeff(c0, s, 0, ctx);
    if (fmpq_mpoly_is_zero(c0, ctx))
        kind = 0;
    else if (!fmpq_mpoly_is_fmpq(c0, ctx))
        kind = 2;
    else {
        kind = 1;
        if (c != NULL)
            fmpq_mpoly_get_fmpq(c, c0, ctx);
    }
    fmpq_mpoly_clear(c0, ctx);
    return kind;
}

/* r = a + b (sign = 1) or a - b (sign = -1) truncated to the smaller order.
   Shared body of tseries_add and tseries_sub. */
static int tseries_addsub(tseries *r, const tseries *a, const tseries *b, int sign,
                          const fmpq_mpoly_ctx_t ctx)
{
    slong var = tseries_var_of(a), order;
    int st = tseries_check_pair(a, b, ctx);
    if (st != TS_OK) {
        tseries_set_error(r, var, ctx);
        return st;
    }
    order = FLINT_MIN(a->order, b->order);
    if (sign > 0)
        fmpq_mpoly_add(r->p, a->p, b->p, ctx);
    else
        fmpq_mpoly_sub(r->p, a->p, b->p, ctx);
    r->var = var;
    r->order = order;
    tseries_drop_high(r->p, var, order, ctx);
    return TS_OK;
}

/* r = a + b, order min(a->order, b->order).
   TS_BADARG / TS_VAR_MISMATCH on bad operands. */
int tseries_add(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_addsub(r, a, b, 1, ctx);
}

/* r = a - b, order min(a->order, b->order).
   TS_BADARG / TS_VAR_MISMATCH on bad operands. */
int tseries_sub(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_addsub(r, a, b, -1, ctx);
}

/* r = c * a.
   TS_BADARG for an invalid a. */
int tseries_scalar_mul_fmpq(tseries *r, const tseries *a, const fmpq_t c, const fmpq_mpoly_ctx_t ctx)
{
    int st = tseries_check(a, ctx);
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(a), ctx);
        return st;
    }
    fmpq_mpoly_scalar_mul_fmpq(r->p, a->p, c, ctx);
    r->var = a->var;
    r->order = a->order;
    return TS_OK;
}

/* Rational fast path of the product: fmpq_poly_mullow.
   a and b valid, rational, same var. */
static void tseries_rational_mul(tseries *r, const fmpq_poly_t a, const fmpq_poly_t b, slong var,
                                 slong order, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_poly_t q;
    fmpq_poly_init(q);
    if (order >= 0)
        fmpq_poly_mullow(q, a, b, order + 1);
    r->var = var;
    r->order = order;
    tseries_set_fmpq_poly(r, q, ctx);
    fmpq_poly_clear(q);
}

typedef void (*tsvec_binary_fn)(tsvec *r, const tsvec *a, const tsvec *b, const fmpq_mpoly_ctx_t ctx);

/* r = op(a, b) on coefficient vectors, to order min(a->order, b->order), once the operands
   passed their check (st); on a failed check r becomes the error series and st is returned. */
static int tseries_generic_binary(tseries *r, const tseries *a, const tseries *b, int st, tsvec_binary_fn op,
                                  const fmpq_mpoly_ctx_t ctx)
{
    slong var = tseries_var_of(a), order;
    tsvec va, vb, vr;
    if (st != TS_OK) {
        tseries_set_error(r, var, ctx);
        return st;
    }
    order = FLINT_MIN(a->order, b->order);
    tsvec_init_series(&va, a, ctx);
    tsvec_init_series(&vb, b, ctx);
    tsvec_init(&vr, order + 1, ctx);
    op(&vr, &va, &vb, ctx);
    tseries_set_tsvec(r, &vr, var, order, ctx);
    tsvec_clear(&vr, ctx);
    tsvec_clear(&vb, ctx);
    tsvec_clear(&va, ctx);
    return TS_OK;
}

/* Generic product by truncated convolution of the coefficient vectors.
   Same contract as tseries_mul. */
int tseries_generic_mul(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_generic_binary(r, a, b, tseries_check_pair(a, b, ctx), tsvec_mullow, ctx);
}

/* r = a * b, order min(a->order, b->order); fmpq_poly fast path when both are rational.
   TS_BADARG / TS_VAR_MISMATCH on bad operands. */
int tseries_mul(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_poly_t pa, pb;
    int st = tseries_check_pair(a, b, ctx), done = 0;
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(a), ctx);
        return st;
    }
    fmpq_poly_init(pa);
    fmpq_poly_init(pb);
    if (tseries_get_fmpq_poly(pa, a, ctx) && tseries_get_fmpq_poly(pb, b, ctx)) {
        tseries_rational_mul(r, pa, pb, a->var, FLINT_MIN(a->order, b->order), ctx);
        done = 1;
    }
    fmpq_poly_clear(pb);
    fmpq_poly_clear(pa);
    return done ? TS_OK : tseries_generic_mul(r, a, b, ctx);
}

/* Checks a division: both operands valid, same var, divisor's constant a nonzero rational.
   Returns TS_OK or the error code. */
static int tseries_div_check(const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx)
{
    int st = tseries_check_pair(a, b, ctx), kind;
    if (st != TS_OK)
        return st;
    kind = tseries_constant_kind(NULL, b, ctx);
    return kind == 0 ? TS_DIVZERO : kind == 2 ? TS_NOT_RATIONAL : TS_OK;
}

/* Generic quotient by the coefficient recurrence of tsvec_div.
   Same contract as tseries_div. */
int tseries_generic_div(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_generic_binary(r, a, b, tseries_div_check(a, b, ctx), tsvec_div, ctx);
}

/* r = a / b; fmpq_poly_div_series when both are rational (b(0) checked nonzero first).
   Errors: TS_DIVZERO, TS_NOT_RATIONAL, TS_BADARG, TS_VAR_MISMATCH. */
int tseries_div(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_poly_t pa, pb, q;
    slong order;
    int st = tseries_div_check(a, b, ctx), done = 0;
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(a), ctx);
        return st;
    }
    order = FLINT_MIN(a->order, b->order);
    fmpq_poly_init(pa);
    fmpq_poly_init(pb);
    fmpq_poly_init(q);
    if (tseries_get_fmpq_poly(pa, a, ctx) && tseries_get_fmpq_poly(pb, b, ctx)) {
        fmpq_poly_div_series(q, pa, pb, order + 1);
        r->var = a->var;
        r->order = order;
        tseries_set_fmpq_poly(r, q, ctx);
        done = 1;
    }
    fmpq_poly_clear(q);
    fmpq_poly_clear(pb);
    fmpq_poly_clear(pa);
    return done ? TS_OK : tseries_generic_div(r, a, b, ctx);
}

/* r = d a / d var (order - 1 for the main variable).
   TS_BADARG for an invalid a or var. */
int tseries_derivative(tseries *r, const tseries *a, slong var, const fmpq_mpoly_ctx_t ctx)
{
    int st = tseries_check(a, ctx);
    if (st == TS_OK && (var < 0 || var >= fmpq_mpoly_ctx_nvars(ctx)))
        st = TS_BADARG;
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(a), ctx);
        return st;
    }
    fmpq_mpoly_derivative(r->p, a->p, var, ctx);
    r->order = a->order - (var == a->var && a->order >= 0);
    r->var = a->var;
    return TS_OK;
}

/* r = antiderivative of a in var vanishing at var = 0 (order + 1 for the main variable).
   TS_BADARG for an invalid a or var. */
int tseries_integral(tseries *r, const tseries *a, slong var, const fmpq_mpoly_ctx_t ctx)
{
    int st = tseries_check(a, ctx);
    if (st == TS_OK && (var < 0 || var >= fmpq_mpoly_ctx_nvars(ctx)))
        st = TS_BADARG;
    if (st == TS_OK && var == a->var && a->order >= TSERIES_MAX_ORDER)
        st = TS_BADARG;
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(a), ctx);
        return st;
    }
    fmpq_mpoly_integral(r->p, a->p, var, ctx);
    r->order = a->order + (var == a->var);
    r->var = a->var;
    return TS_OK;
}

/* c = coefficient of x^n (0 outside 0..order or for an invalid s).
   c must not be s->p. */
void tseries_coeff(fmpq_mpoly_t c, const tseries *s, slong n, const fmpq_mpoly_ctx_t ctx)
{
    ulong e = (ulong) n;
    if (tseries_check(s, ctx) != TS_OK || n < 0 || n > s->order) {
        fmpq_mpoly_zero(c, ctx);
        return;
    }
    fmpq_mpoly_get_coeff_vars_ui(c, s->p, &s->var, &e, 1, ctx);
}

/* r = known part of s at x = x0.
   TS_BADARG (r = 0) for an invalid s or if FLINT refuses the evaluation. */
int tseries_eval_fmpq(fmpq_mpoly_t r, const tseries *s, const fmpq_t x0, const fmpq_mpoly_ctx_t ctx)
{
    if (tseries_check(s, ctx) != TS_OK || !fmpq_mpoly_evaluate_one_fmpq(r, s->p, s->var, x0, ctx)) {
        fmpq_mpoly_zero(r, ctx);
        return TS_BADARG;
    }
    return TS_OK;
}
