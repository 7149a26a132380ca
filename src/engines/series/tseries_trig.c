/* tseries_trig.c - sin, cos, sinh, cosh of truncated series (tseries_trig.h). */
#include <flint/fmpq_poly.h>
#include <flint/fmpq_mpoly.h>
#include "series/tseries_internal.h"
#include "series/tseries_trig.h"

/* s = sin or sinh (f), c = cos or cosh (f) mod x^len by
   n s_n = sum_k k f_k c_{n-k},  n c_n = sign * sum_k k f_k s_{n-k}  (sign -1 for sin/cos). */
static void tsvec_sincos(tsvec *s, tsvec *c, const tsvec *f, int sign, const fmpq_mpoly_ctx_t ctx)
{
    slong n, k;
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, ctx);
    fmpq_mpoly_zero(s->c + 0, ctx);
    fmpq_mpoly_one(c->c + 0, ctx);
    for (n = 1; n < s->len; n++) {
        fmpq_mpoly_zero(s->c + n, ctx);
        fmpq_mpoly_zero(c->c + n, ctx);
        for (k = 1; k <= n && k < f->len; k++) {
            if (fmpq_mpoly_is_zero(f->c + k, ctx))
                continue;
            fmpq_mpoly_mul(t, f->c + k, c->c + (n - k), ctx);
            fmpq_mpoly_scalar_mul_si(t, t, k, ctx);
            fmpq_mpoly_add(s->c + n, s->c + n, t, ctx);
            fmpq_mpoly_mul(t, f->c + k, s->c + (n - k), ctx);
            fmpq_mpoly_scalar_mul_si(t, t, k, ctx);
            fmpq_mpoly_add(c->c + n, c->c + n, t, ctx);
        }
        fmpq_mpoly_scalar_div_si(s->c + n, s->c + n, n, ctx);
        fmpq_mpoly_scalar_div_si(c->c + n, c->c + n, sign * n, ctx);
    }
    fmpq_mpoly_clear(t, ctx);
}

/* The rational fast path: FLINT's series functions on the fmpq_poly of f. */
static void tseries_trig_rational(tseries *r, const fmpq_poly_t q, slong len, int which,
                                  const fmpq_mpoly_ctx_t ctx)
{
    fmpq_poly_t out;
    fmpq_poly_init(out);
    if (which == TS_SIN)
        fmpq_poly_sin_series(out, q, len);
    else if (which == TS_COS)
        fmpq_poly_cos_series(out, q, len);
    else if (which == TS_SINH)
        fmpq_poly_sinh_series(out, q, len);
    else
        fmpq_poly_cosh_series(out, q, len);
    tseries_set_fmpq_poly(r, out, ctx);
    fmpq_poly_clear(out);
}

/* See tseries_trig.h. */
int tseries_trig(tseries *r, const tseries *f, int which, const fmpq_mpoly_ctx_t ctx)
{
    slong var = tseries_var_of(f), order;
    int st = (f == NULL || which < TS_SIN || which > TS_COSH) ? TS_BADARG : tseries_check(f, ctx);
    fmpq_poly_t q;
    if (st == TS_OK && tseries_constant_kind(NULL, f, ctx) != 0 && f->order >= 0)
        st = TS_NEEDS_ZERO_CONSTANT;
    if (st == TS_OK && f->order > TSERIES_TRIG_MAX_ORDER)
        st = TS_BADARG;
    if (st != TS_OK) {
        tseries_set_error(r, var, ctx);
        return st;
    }
    order = f->order;
    fmpq_poly_init(q);
    if (tseries_get_fmpq_poly(q, f, ctx)) {
        r->var = var;
        r->order = order;
        tseries_trig_rational(r, q, order + 1, which, ctx);
    } else {
        tsvec fv, s, c;
        tsvec_init_series(&fv, f, ctx);
        tsvec_init(&s, order + 1, ctx);
        tsvec_init(&c, order + 1, ctx);
        tsvec_sincos(&s, &c, &fv, which >= TS_SINH ? 1 : -1, ctx);
        tseries_set_tsvec(r, which == TS_SIN || which == TS_SINH ? &s : &c, var, order, ctx);
        tsvec_clear(&fv, ctx), tsvec_clear(&s, ctx), tsvec_clear(&c, ctx);
    }
    fmpq_poly_clear(q);
    return st;
}
