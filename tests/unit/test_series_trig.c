/* test_series_trig.c - sin, cos, sinh, cosh of truncated series (src/engines/series/tseries_trig.h).
 *
 * 1. Taylor coefficients of sin x, cos x, sinh x, cosh x: (-1)^k/(2k+1)!, ... (textbook series).
 * 2. Property tests (identities): sin^2 + cos^2 = 1 and cosh^2 - sinh^2 = 1, on random series
 *    with rational coefficients (FLINT's series functions) and with a symbolic coefficient (the
 *    generic recurrence), and the generic path against the rational one after substituting a
 *    rational value for the symbol.
 * 3. Errors: nonzero constant term, huge order.
 */
#include <flint/fmpq_mpoly.h>
#include <flint/fmpq_poly.h>
#include <flint/fmpz.h>
#include <flint/ulong_extras.h>
#include "series/tseries_trig.h"
#include "unit.h"

static unit_report rep;

/* Checks f(x) for the four functions against the Taylor series to order 15. */
static void test_taylor(const fmpq_mpoly_ctx_t ctx)
{
    tseries x, r;
    fmpq_mpoly_t c;
    fmpq_t e;
    fmpz_t f;
    tseries_init(&x, 0, 15, ctx);
    tseries_init(&r, 0, 15, ctx);
    fmpq_mpoly_init(c, ctx), fmpq_init(e), fmpz_init(f);
    fmpq_mpoly_gen(x.p, 0, ctx);
    for (int which = TS_SIN; which <= TS_COSH; which++) {
        UNIT_CHECK(&rep, tseries_trig(&r, &x, which, ctx) == TS_OK, "trig %d of x", which);
        for (slong k = 0; k <= 15; k++) {
            int odd = which == TS_SIN || which == TS_SINH;
            fmpz_fac_ui(f, (ulong) k);
            fmpq_set_si(e, k % 2 == odd, 1);
            fmpq_div_fmpz(e, e, f);
            if ((which == TS_SIN || which == TS_COS) && (k / 2) % 2)
                fmpq_neg(e, e);
            tseries_coeff(c, &r, k, ctx);
            UNIT_CHECK(&rep, fmpq_mpoly_equal_fmpq(c, e, ctx), "Taylor coefficient %ld of function %d", (long) k, which);
        }
    }
    tseries_clear(&x, ctx), tseries_clear(&r, ctx);
    fmpq_mpoly_clear(c, ctx), fmpq_clear(e), fmpz_clear(f);
}

/* A random series sum_{k=1}^{N} c_k x^k with small rational c_k, plus a*x^2 when sym is set
   (variable 1 is the symbol a). */
static void random_series(tseries *f, flint_rand_t st, int sym, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_t t;
    fmpq_t c;
    fmpq_mpoly_init(t, ctx), fmpq_init(c);
    fmpq_mpoly_zero(f->p, ctx);
    for (slong k = 1; k <= f->order; k++) {
        fmpq_set_si(c, (slong) n_randint(st, 11) - 5, 1 + n_randint(st, 4));
        fmpq_mpoly_gen(t, 0, ctx);
        fmpq_mpoly_pow_ui(t, t, (ulong) k, ctx);
        fmpq_mpoly_scalar_mul_fmpq(t, t, c, ctx);
        fmpq_mpoly_add(f->p, f->p, t, ctx);
    }
    if (sym) {
        fmpq_mpoly_gen(t, 0, ctx);
        fmpq_mpoly_pow_ui(t, t, 2, ctx);
        fmpq_mpoly_t a;
        fmpq_mpoly_init(a, ctx);
        fmpq_mpoly_gen(a, 1, ctx);
        fmpq_mpoly_mul(t, t, a, ctx);
        fmpq_mpoly_add(f->p, f->p, t, ctx);
        fmpq_mpoly_clear(a, ctx);
    }
    fmpq_mpoly_clear(t, ctx), fmpq_clear(c);
}

/* Identities on random series, and the generic path at a = 3/2 against the rational path. */
static void test_identities(flint_rand_t st, const fmpq_mpoly_ctx_t ctx)
{
    long it, iters = unit_iterations(100);
    for (it = 0; it < iters; it++) {
        int sym = (int) (it % 2);
        tseries f, s, c, s2, c2, one, fs, rs;
        tseries_init(&f, 0, 12, ctx), tseries_init(&s, 0, 12, ctx), tseries_init(&c, 0, 12, ctx);
        tseries_init(&s2, 0, 12, ctx), tseries_init(&c2, 0, 12, ctx), tseries_init(&one, 0, 12, ctx);
        tseries_init(&fs, 0, 12, ctx), tseries_init(&rs, 0, 12, ctx);
        random_series(&f, st, sym, ctx);
        for (int hyp = 0; hyp <= 1; hyp++) {
            tseries_trig(&s, &f, hyp ? TS_SINH : TS_SIN, ctx);
            tseries_trig(&c, &f, hyp ? TS_COSH : TS_COS, ctx);
            tseries_mul(&s2, &s, &s, ctx);
            tseries_mul(&c2, &c, &c, ctx);
            if (hyp)
                tseries_sub(&one, &c2, &s2, ctx);
            else
                tseries_add(&one, &c2, &s2, ctx);
            UNIT_CHECK(&rep, fmpq_mpoly_is_one(one.p, ctx) && one.order == 12,
                       "identity %s, symbolic %d (property test)", hyp ? "cosh^2 - sinh^2" : "sin^2 + cos^2", sym);
        }
        if (sym) {                                  /* substitute a = 3/2 into f and into sin(f) */
            fmpq_t v;
            fmpq_init(v);
            fmpq_set_si(v, 3, 2);
            fmpq_mpoly_evaluate_one_fmpq(fs.p, f.p, 1, v, ctx);
            tseries_trig(&rs, &fs, TS_SIN, ctx);
            tseries_trig(&s, &f, TS_SIN, ctx);
            fmpq_mpoly_evaluate_one_fmpq(s.p, s.p, 1, v, ctx);
            UNIT_CHECK(&rep, fmpq_mpoly_equal(s.p, rs.p, ctx), "generic path against rational path");
            fmpq_clear(v);
        }
        tseries_clear(&f, ctx), tseries_clear(&s, ctx), tseries_clear(&c, ctx), tseries_clear(&s2, ctx);
        tseries_clear(&c2, ctx), tseries_clear(&one, ctx), tseries_clear(&fs, ctx), tseries_clear(&rs, ctx);
    }
}

/* Error codes: a constant term, an order beyond the limit. */
static void test_errors(const fmpq_mpoly_ctx_t ctx)
{
    tseries f, r;
    tseries_init(&f, 0, 5, ctx), tseries_init(&r, 0, 5, ctx);
    fmpq_mpoly_one(f.p, ctx);
    UNIT_CHECK(&rep, tseries_trig(&r, &f, TS_COS, ctx) == TS_NEEDS_ZERO_CONSTANT && r.order == -1, "constant term");
    fmpq_mpoly_gen(f.p, 0, ctx);
    f.order = TSERIES_TRIG_MAX_ORDER + 1;
    UNIT_CHECK(&rep, tseries_trig(&r, &f, TS_SIN, ctx) == TS_BADARG, "order beyond the limit");
    tseries_clear(&f, ctx), tseries_clear(&r, ctx);
}

int main(void)
{
    fmpq_mpoly_ctx_t ctx;
    flint_rand_t st;
    flint_randinit(st);
    fmpq_mpoly_ctx_init(ctx, 2, ORD_LEX);
    test_taylor(ctx);
    test_identities(st, ctx);
    test_errors(ctx);
    fmpq_mpoly_ctx_clear(ctx);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_series_trig", &rep);
}
