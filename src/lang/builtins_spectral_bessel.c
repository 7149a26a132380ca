/* Spectral curves of Bessel type in the language: curve_over_z(x, w) is the curve x = c*z^2,
   y = w/z.  When w(0) != 0 the odd part of y has a simple pole at the branch point and the
   correlators insert Norbury's class Theta (src/engines/spectral/spectral.h, kind SP_CURVE_BESSEL); the
   value holds z*y_odd (an even series with a nonzero constant term), which is how omega and the
   other readers tell the kinds apart.  When w(0) = 0, y = w/z is an ordinary curve and the value is
   the one curve(x, w/z) would give.  Conventions: docs/conventions.md, "Spectral curves". */
#include <stdlib.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>

#include "builtins_spectral.h"
#include "diag.h"
#include "spectral/spectral.h"
#include "theta/theta.h"
#include "util.h"

int bsp_series_kind(interp *I, const tseries *s)
{
    fmpq_mpoly_t c;
    int bessel;
    fmpq_mpoly_init(c, I->ring.ctx);
    tseries_coeff(c, s, 0, I->ring.ctx);
    bessel = !fmpq_mpoly_is_zero(c, I->ring.ctx);
    fmpq_mpoly_clear(c, I->ring.ctx);
    return bessel ? SP_CURVE_BESSEL : SP_CURVE_AIRY;
}

slong bsp_curve_needs(interp *I, const value *curve, slong g, slong n)
{
    if (curve->kind == V_SERIES && bsp_series_kind(I, curve->ser) == SP_CURVE_BESSEL)
        return g > 0 ? g - 1 : 0;
    return 3 * g - 3 + n;
}

/* 1 when p has a term of odd degree in z. */
static int bsp_has_odd_terms(interp *I, const fmpq_mpoly_t p, slong z)
{
    ulong e[SCALAR_MAX_VARS];
    for (slong i = 0; i < fmpq_mpoly_length(p, I->ring.ctx); i++) {
        fmpq_mpoly_get_term_exp_ui(e, p, i, I->ring.ctx);
        if (e[z] % 2)
            return 1;
    }
    return 0;
}

int bsp_check_bessel(interp *I, const node *at, const tseries *s)
{
    fmpq_mpoly_t c;
    int rational;
    fmpq_mpoly_init(c, I->ring.ctx);
    tseries_coeff(c, s, 0, I->ring.ctx);
    rational = fmpq_mpoly_is_fmpq(c, I->ring.ctx);
    fmpq_mpoly_clear(c, I->ring.ctx);
    if (!rational) {
        diag_error(&at->loc, "the coefficient of 1/z in y must be a nonzero rational number (rescale y; "
                             "symbolic coefficients are allowed from z on)");
        return 0;
    }
    if (bsp_has_odd_terms(I, s->p, s->var)) {
        diag_error(&at->loc, "this series is not a curve: a curve of Bessel type holds z*y_odd(z), even in z "
                             "with a nonzero constant term; make it with curve_over_z(z^2/2, w) for y = w/z");
        return 0;
    }
    return 1;
}

int bsp_refuse_bessel(interp *I, const node *call, const bsp_curve *C, slong g, slong n)
{
    double memo = theta_estimate_entries(g), est = sp_shift_estimate_kind(SP_CURVE_BESSEL, g, n, C->K);
    if (g > THETA_MAX_GENUS || memo > I->lim.max_table) {
        diag_error(&call->loc, "omega_{%ld,%ld} of this curve needs Theta-psi numbers of genus %ld, about %.3g "
                               "of them, above the table's limit (--max-table)", (long) g, (long) n, (long) g, memo);
        return 0;
    }
    if (est > I->lim.max_terms) {
        diag_error(&call->loc, "omega_{%ld,%ld} needs about %.3g Theta-psi numbers, above the limit of %.3g "
                               "(raise it with --max-terms N)", (long) g, (long) n, est, I->lim.max_terms);
        return 0;
    }
    return 1;
}

/* value of curve_over_z: r->ser->p = 2c * (even part of w), then either kept (Bessel kind) or
   divided by z (w(0) = 0: the Airy kind, known to one order less). */
value *bsp_curve_over_z(interp *I, const node *call, value **args)
{
    slong z;
    fmpq_t c;
    value *r = NULL;
    const value *w = args[1];
    fmpq_init(c);
    if (!bsp_read_x(I, call, args[0], &z, c))
        goto done;
    if ((w->kind != V_SERIES && w->kind != V_NUM) || (w->kind == V_SERIES && w->ser->var != z)) {
        builtin_fail_at(call, 1, w->kind == V_SERIES ? "w is a series in another variable than the z of x = c*z^2"
                                                     : "w must be a polynomial or a series in z (the curve is y = w/z)");
        goto done;
    }
    if (w->kind == V_NUM && fmpq_mpoly_degree_si(w->num, z, I->ring.ctx) > TSERIES_MAX_ORDER) {
        builtin_fail_at(call, 1, "w has too high a degree in z");
        goto done;
    }
    fmpq_mul_2exp(c, c, 1);
    r = value_new_series(z, w->kind == V_SERIES ? w->ser->order : TSERIES_MAX_ORDER, &I->ring);
    bsp_parity_part(r->ser->p, w->kind == V_SERIES ? w->ser->p : w->num, z, c, 0, I->ring.ctx);
    if (bsp_series_kind(I, r->ser) == SP_CURVE_AIRY) {          /* y = w/z has no pole */
        fmpq_mpoly_t zp;
        fmpq_mpoly_init(zp, I->ring.ctx);
        fmpq_mpoly_gen(zp, z, I->ring.ctx);
        fmpq_mpoly_divides(r->ser->p, r->ser->p, zp, I->ring.ctx);
        fmpq_mpoly_clear(zp, I->ring.ctx);
        r->ser->order = r->ser->order - 1;
    }
    if (!(bsp_series_kind(I, r->ser) == SP_CURVE_BESSEL ? bsp_check_bessel(I, call->list->items[1], r->ser)
                                                        : bsp_check_curve(I, call->list->items[1], r->ser))) {
        value_release(r);
        r = NULL;
    }
done:
    fmpq_clear(c);
    return r;
}
