/* tseries_fun.c - exp, log, powers, composition and reversion of truncated series.
 *
 * Each operation checks its preconditions first (so FLINT's series functions, which abort on a
 * wrong constant or linear term, are only called on valid input), then takes the fmpq_poly fast
 * path when all operands are rational and the generic recurrence of tseries_vec.c otherwise.
 */
#include <flint/fmpq_poly.h>
#include "series/tseries_internal.h"

typedef int (*ts_check_fn)(const tseries *f, const fmpq_mpoly_ctx_t ctx);
typedef void (*ts_vec_fn)(tsvec *r, const tsvec *f, const fmpq_mpoly_ctx_t ctx);
typedef void (*ts_poly_fn)(fmpq_poly_t r, const fmpq_poly_t f, slong n);

/* Precondition of exp: valid f whose x^0 coefficient is the zero polynomial.
   Returns TS_OK or the error code. */
static int tseries_exp_check(const tseries *f, const fmpq_mpoly_ctx_t ctx)
{
    int st = tseries_check(f, ctx);
    if (st == TS_OK && tseries_constant_kind(NULL, f, ctx) != 0)
        st = TS_NEEDS_ZERO_CONSTANT;
    return st;
}

/* Precondition of log: valid f whose x^0 coefficient is exactly 1.
   Returns TS_OK or the error code. */
static int tseries_log_check(const tseries *f, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_t c;
    int st = tseries_check(f, ctx);
    fmpq_init(c);
    if (st == TS_OK && (tseries_constant_kind(c, f, ctx) != 1 || !fmpq_is_one(c)))
        st = TS_NEEDS_UNIT_CONSTANT;
    fmpq_clear(c);
    return st;
}

/* Precondition of revert: f(0) = 0 and a known, nonzero, rational linear coefficient.
   Returns TS_OK or the error code. */
static int tseries_revert_check(const tseries *f, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_t c1;
    int st = tseries_exp_check(f, ctx);
    if (st != TS_OK)
        return st;
    fmpq_mpoly_init(c1, ctx);
    tseries_coeff(c1, f, 1, ctx);
    if (fmpq_mpoly_is_zero(c1, ctx))
        st = TS_NEEDS_LINEAR_TERM;
    else if (!fmpq_mpoly_is_fmpq(c1, ctx))
        st = TS_NOT_RATIONAL;
    fmpq_mpoly_clear(c1, ctx);
    return st;
}

/* Generic unary operation: check, unpack, apply op, repack (result order f->order).
   The result is the error value when the check fails. */
static int tseries_generic_unary(tseries *r, const tseries *f, ts_check_fn check, ts_vec_fn op,
                                 const fmpq_mpoly_ctx_t ctx)
{
    tsvec vf, vr;
    int st = check(f, ctx);
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(f), ctx);
        return st;
    }
    tsvec_init_series(&vf, f, ctx);
    tsvec_init(&vr, f->order + 1, ctx);
    op(&vr, &vf, ctx);
    tseries_set_tsvec(r, &vr, f->var, f->order, ctx);
    tsvec_clear(&vr, ctx);
    tsvec_clear(&vf, ctx);
    return TS_OK;
}

/* Unary operation with fmpq_poly fast path for rational f, else the generic path.
   poly_op is only called after check succeeded and with n >= 1. */
static int tseries_unary(tseries *r, const tseries *f, ts_check_fn check, ts_vec_fn op,
                         ts_poly_fn poly_op, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_poly_t pf, q;
    int st = check(f, ctx), done = 0;
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(f), ctx);
        return st;
    }
    fmpq_poly_init(pf);
    fmpq_poly_init(q);
    if (f->order >= 0 && tseries_get_fmpq_poly(pf, f, ctx)) {
        poly_op(q, pf, f->order + 1);
        r->var = f->var;
        r->order = f->order;
        tseries_set_fmpq_poly(r, q, ctx);
        done = 1;
    }
    fmpq_poly_clear(q);
    fmpq_poly_clear(pf);
    return done ? TS_OK : tseries_generic_unary(r, f, check, op, ctx);
}

/* exp(f) by the generic recurrence.
   Same contract as tseries_exp. */
int tseries_generic_exp(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_generic_unary(r, f, tseries_exp_check, tsvec_exp, ctx);
}

/* r = exp(f); fmpq_poly_exp_series for rational f.
   TS_NEEDS_ZERO_CONSTANT unless f(0) = 0. */
int tseries_exp(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_unary(r, f, tseries_exp_check, tsvec_exp, fmpq_poly_exp_series, ctx);
}

/* log(f) by the generic recurrence.
   Same contract as tseries_log. */
int tseries_generic_log(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_generic_unary(r, f, tseries_log_check, tsvec_log, ctx);
}

/* r = log(f); fmpq_poly_log_series for rational f.
   TS_NEEDS_UNIT_CONSTANT unless f(0) = 1. */
int tseries_log(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_unary(r, f, tseries_log_check, tsvec_log, fmpq_poly_log_series, ctx);
}

/* Reversion by Lagrange inversion.
   Same contract as tseries_revert. */
int tseries_generic_revert(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_generic_unary(r, f, tseries_revert_check, tsvec_revert, ctx);
}

/* r = inverse series of f; fmpq_poly_revert_series for rational f.
   Errors: TS_NEEDS_ZERO_CONSTANT, TS_NEEDS_LINEAR_TERM, TS_NOT_RATIONAL, TS_BADARG. */
int tseries_revert(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx)
{
    return tseries_unary(r, f, tseries_revert_check, tsvec_revert, fmpq_poly_revert_series, ctx);
}

/* Precondition of f^e: valid f; for e < 0 a nonzero rational constant term; for huge |e| a
   constant term 0 or +-1.  Returns TS_OK or the error code. */
static int tseries_pow_check(const tseries *f, slong e, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_t c;
    int kind, st = tseries_check(f, ctx);
    if (st != TS_OK)
        return st;
    fmpq_init(c);
    kind = tseries_constant_kind(c, f, ctx);
    if (e < 0 && kind != 1)
        st = kind == 0 ? TS_NEEDS_UNIT_CONSTANT : TS_NOT_RATIONAL;
    else if ((e > TSERIES_POW_MAX || e < -TSERIES_POW_MAX) && kind != 0
             && !(kind == 1 && fmpz_is_pm1(fmpq_numref(c)) && fmpz_is_one(fmpq_denref(c))))
        st = TS_BADARG;
    fmpq_clear(c);
    return st;
}

/* |e| as an unsigned number (correct for WORD_MIN).
   Never fails. */
static ulong tseries_abs_exponent(slong e)
{
    return e >= 0 ? (ulong) e : (ulong) (-(e + 1)) + 1;
}

/* f^e by binary powering of f (e >= 0) or of 1/f (e < 0), on coefficient vectors.
   Same contract as tseries_pow_si. */
int tseries_generic_pow_si(tseries *r, const tseries *f, slong e, const fmpq_mpoly_ctx_t ctx)
{
    tsvec vf, vb, vr;
    int st = tseries_pow_check(f, e, ctx);
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(f), ctx);
        return st;
    }
    tsvec_init_series(&vf, f, ctx);
    tsvec_init(&vb, f->order + 1, ctx);
    tsvec_init(&vr, f->order + 1, ctx);
    if (e < 0 && vb.len > 0) {
        fmpq_mpoly_one(vr.c, ctx);                 /* vr = 1 as numerator */
        tsvec_div(&vb, &vr, &vf, ctx);
    } else
        tsvec_from_mpoly(&vb, f->p, f->var, ctx);
    tsvec_pow_ui(&vr, &vb, tseries_abs_exponent(e), ctx);
    tseries_set_tsvec(r, &vr, f->var, f->order, ctx);
    tsvec_clear(&vr, ctx);
    tsvec_clear(&vb, ctx);
    tsvec_clear(&vf, ctx);
    return TS_OK;
}

/* Fast path of f^e for rational f: fmpq_poly_inv_series (e < 0) then fmpq_poly_pow_trunc.
   Preconditions checked by the caller; order >= 0. */
static void tseries_rational_pow(tseries *r, const fmpq_poly_t pf, slong e, slong var, slong order,
                                 const fmpq_mpoly_ctx_t ctx)
{
    fmpq_poly_t b, q;
    fmpq_poly_init(b);
    fmpq_poly_init(q);
    if (e < 0)
        fmpq_poly_inv_series(b, pf, order + 1);
    else
        fmpq_poly_set(b, pf);
    fmpq_poly_pow_trunc(q, b, tseries_abs_exponent(e), order + 1);
    r->var = var;
    r->order = order;
    tseries_set_fmpq_poly(r, q, ctx);
    fmpq_poly_clear(q);
    fmpq_poly_clear(b);
}

/* r = f^e; fast path for rational f.
   Errors: TS_NEEDS_UNIT_CONSTANT, TS_NOT_RATIONAL (e < 0), TS_BADARG. */
int tseries_pow_si(tseries *r, const tseries *f, slong e, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_poly_t pf;
    int st = tseries_pow_check(f, e, ctx), done = 0;
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(f), ctx);
        return st;
    }
    fmpq_poly_init(pf);
    if (f->order >= 0 && tseries_get_fmpq_poly(pf, f, ctx)) {
        tseries_rational_pow(r, pf, e, f->var, f->order, ctx);
        done = 1;
    }
    fmpq_poly_clear(pf);
    return done ? TS_OK : tseries_generic_pow_si(r, f, e, ctx);
}

/* Precondition of f(g): valid operands with the same var and g(0) = 0.
   Returns TS_OK or the error code. */
static int tseries_compose_check(const tseries *f, const tseries *g, const fmpq_mpoly_ctx_t ctx)
{
    int st = tseries_check_pair(f, g, ctx);
    if (st == TS_OK && tseries_constant_kind(NULL, g, ctx) != 0)
        st = TS_NEEDS_ZERO_CONSTANT;
    return st;
}

/* f(g) by Horner's rule on coefficient vectors.
   Same contract as tseries_compose. */
int tseries_generic_compose(tseries *r, const tseries *f, const tseries *g, const fmpq_mpoly_ctx_t ctx)
{
    slong order;
    tsvec vf, vg, vr;
    int st = tseries_compose_check(f, g, ctx);
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(f), ctx);
        return st;
    }
    order = FLINT_MIN(f->order, g->order);
    tsvec_init(&vf, order + 1, ctx);
    tsvec_from_mpoly(&vf, f->p, f->var, ctx);
    tsvec_init_series(&vg, g, ctx);
    tsvec_init(&vr, order + 1, ctx);
    tsvec_compose(&vr, &vf, &vg, ctx);
    tseries_set_tsvec(r, &vr, f->var, order, ctx);
    tsvec_clear(&vr, ctx);
    tsvec_clear(&vg, ctx);
    tsvec_clear(&vf, ctx);
    return TS_OK;
}

/* r = f(g(x)), order min(f->order, g->order); fmpq_poly_compose_series when both are rational.
   Errors: TS_NEEDS_ZERO_CONSTANT, TS_VAR_MISMATCH, TS_BADARG. */
int tseries_compose(tseries *r, const tseries *f, const tseries *g, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_poly_t pf, pg, q;
    slong order;
    int st = tseries_compose_check(f, g, ctx), done = 0;
    if (st != TS_OK) {
        tseries_set_error(r, tseries_var_of(f), ctx);
        return st;
    }
    order = FLINT_MIN(f->order, g->order);
    fmpq_poly_init(pf);
    fmpq_poly_init(pg);
    fmpq_poly_init(q);
    if (order >= 0 && tseries_get_fmpq_poly(pf, f, ctx) && tseries_get_fmpq_poly(pg, g, ctx)) {
        fmpq_poly_compose_series(q, pf, pg, order + 1);
        r->var = f->var;
        r->order = order;
        tseries_set_fmpq_poly(r, q, ctx);
        done = 1;
    }
    fmpq_poly_clear(q);
    fmpq_poly_clear(pg);
    fmpq_poly_clear(pf);
    return done ? TS_OK : tseries_generic_compose(r, f, g, ctx);
}
