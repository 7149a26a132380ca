/* Builtins on series and polynomials: coeff, diff, integral, compose,
   revert, log, at, series, trunc. */
#include <stdio.h>
#include <stdlib.h>

#include "builtins.h"
#include "real_funcs.h"
#include "diag.h"
#include "series_ops.h"
#include "util.h"

/* Finishes a series result: returns r, or reports rc and returns NULL. */
static value *series_done(value *r, int rc, const node *call, const char *what)
{
    if (rc == TS_OK)
        return r;
    value_release(r);
    series_report(call, rc, what);
    return NULL;
}

static int series_arg(interp *I, const node *call, value **args, int i)
{
    if (args[i]->kind == V_SERIES)
        return 1;
    (void)I;
    builtin_fail_at(call, i, "expected a series here (make one with series(P, x, N) or F_{g} with ...)");
    return 0;
}

/* coeff(P, m): the coefficient of the monomial m in P, as a polynomial in the
   variables m does not involve. */
static value *bs_coeff_poly(interp *I, const node *call, const fmpq_mpoly_t p, const fmpq_mpoly_t m)
{
    slong vars[SCALAR_MAX_VARS];
    ulong exps[SCALAR_MAX_VARS], e[SCALAR_MAX_VARS];
    if (fmpq_mpoly_length(m, I->ring.ctx) != 1)
        return builtin_fail_at(call, 1, "expected a monomial such as x^3 or L_1^2*L_2^2");
    fmpq_mpoly_get_term_exp_ui(e, m, 0, I->ring.ctx);
    slong nv = 0;
    for (slong v = 0; v < SCALAR_MAX_VARS; v++)
        if (e[v] > 0) {
            vars[nv] = v;
            exps[nv++] = e[v];
        }
    value *r = value_new_num(&I->ring);
    if (nv == 0)
        fmpq_mpoly_set(r->num, p, I->ring.ctx);
    else
        fmpq_mpoly_get_coeff_vars_ui(r->num, p, vars, exps, nv, I->ring.ctx);
    return r;
}

static value *bs_coeff(interp *I, const node *call, value **args)
{
    if (args[1]->kind != V_NUM)
        return builtin_fail_at(call, 1, "expected a monomial such as x^3");
    if (args[0]->kind == V_NUM)
        return bs_coeff_poly(I, call, args[0]->num, args[1]->num);
    if (!series_arg(I, call, args, 0))
        return NULL;
    const tseries *s = args[0]->ser;
    slong deg = fmpq_mpoly_is_one(args[1]->num, I->ring.ctx) ? 0 : -1;
    if (deg < 0 && fmpq_mpoly_length(args[1]->num, I->ring.ctx) == 1) {
        slong d = fmpq_mpoly_degree_si(args[1]->num, s->var, I->ring.ctx);
        if (d > 0 && fmpq_mpoly_total_degree_si(args[1]->num, I->ring.ctx) == d)
            deg = d;
    }
    if (deg < 0)
        return builtin_fail_at(call, 1, "expected a power of the series variable, such as x^3");
    if (deg > s->order)
        return builtin_fail_at(call, 1, "this coefficient is beyond the known order of the series");
    value *r = value_new_num(&I->ring);
    tseries_coeff(r->num, s, deg, I->ring.ctx);
    return r;
}

/* coeff_in(P, x, k): the coefficient of x^k in P, a polynomial in the other variables. */
static value *bs_coeff_in(interp *I, const node *call, value **args)
{
    slong var = builtin_get_var(I, call, args, 1), k;
    if (var < 0 || !builtin_get_slong(I, call, args, 2, 0, WORD(1) << 30, &k))
        return NULL;
    if (args[0]->kind == V_SERIES) {
        if (args[0]->ser->var != var)
            return builtin_fail_at(call, 1, "this is not the variable of the series");
        if (k > args[0]->ser->order)
            return builtin_fail_at(call, 2, "this coefficient is beyond the known order of the series");
        value *r = value_new_num(&I->ring);
        tseries_coeff(r->num, args[0]->ser, k, I->ring.ctx);
        return r;
    }
    if (args[0]->kind != V_NUM)
        return builtin_fail_at(call, 0, "expected a polynomial or a series");
    slong vars[1] = {var};
    ulong exps[1] = {(ulong)k};
    value *r = value_new_num(&I->ring);
    fmpq_mpoly_get_coeff_vars_ui(r->num, args[0]->num, vars, exps, 1, I->ring.ctx);
    return r;
}

static value *bs_calculus(interp *I, const node *call, value **args, int integrate)
{
    slong var = builtin_get_var(I, call, args, 1);
    if (var < 0)
        return NULL;
    if (args[0]->kind == V_NUM) {
        value *r = value_new_num(&I->ring);
        if (integrate)
            fmpq_mpoly_integral(r->num, args[0]->num, var, I->ring.ctx);
        else
            fmpq_mpoly_derivative(r->num, args[0]->num, var, I->ring.ctx);
        return r;
    }
    if (!series_arg(I, call, args, 0))
        return NULL;
    const tseries *s = args[0]->ser;
    value *r = value_new_series(s->var, s->order, &I->ring);
    int rc = integrate ? tseries_integral(r->ser, s, var, I->ring.ctx) : tseries_derivative(r->ser, s, var, I->ring.ctx);
    return series_done(r, rc, call, integrate ? "integral" : "diff");
}

static value *bs_diff(interp *I, const node *call, value **args)
{
    return bs_calculus(I, call, args, 0);
}

static value *bs_integral(interp *I, const node *call, value **args)
{
    return bs_calculus(I, call, args, 1);
}

static value *bs_compose(interp *I, const node *call, value **args)
{
    if (!series_arg(I, call, args, 0))
        return NULL;
    const tseries *f = args[0]->ser;
    tseries g;
    tseries_init(&g, f->var, f->order, I->ring.ctx);
    value *r = NULL;
    if (series_from_value(I, &g, args[1], call->list->items[1])
        && series_size_ok(I, call, "this compose", SERIES_COST_COMPOSE, f, &g, f->order, 0)) {
        r = value_new_series(f->var, f->order, &I->ring);
        r = series_done(r, tseries_compose(r->ser, f, &g, I->ring.ctx), call, "compose");
    }
    tseries_clear(&g, I->ring.ctx);
    return r;
}

static value *bs_unary(interp *I, const node *call, value **args, int which)
{
    if (!series_arg(I, call, args, 0))
        return NULL;
    const tseries *f = args[0]->ser;
    if (!series_size_ok(I, call, which == 0 ? "this revert" : "this log",
                        which == 0 ? SERIES_COST_COMPOSE : SERIES_COST_LOG, f, NULL, f->order, 0))
        return NULL;
    value *r = value_new_series(f->var, f->order, &I->ring);
    int rc = which == 0 ? tseries_revert(r->ser, f, I->ring.ctx) : tseries_log(r->ser, f, I->ring.ctx);
    return series_done(r, rc, call, which == 0 ? "revert" : "log");
}

static value *bs_revert(interp *I, const node *call, value **args)
{
    return bs_unary(I, call, args, 0);
}

static value *bs_log(interp *I, const node *call, value **args)
{
    if (real_applies(I, args[0]))   /* a number or a real: the natural logarithm */
        return real_unary(I, call, RF_LOG, args[0]);
    return bs_unary(I, call, args, 1);
}

static value *bs_at(interp *I, const node *call, value **args)
{
    fmpq_t x0;
    fmpq_init(x0);
    value *r = NULL;
    if (!series_arg(I, call, args, 0))
        ;
    else if (args[1]->kind == V_REAL || (args[1]->kind == V_NUM && !scalar_get_fmpq(x0, args[1]->num, &I->ring))) {
        /* a polynomial, a number in pi or a real: substitute into the known terms */
        value *p = value_new_num(&I->ring);
        ulong a[SCALAR_MAX_VARS] = {0};
        a[args[0]->ser->var] = 1;
        fmpq_mpoly_set(p->num, args[0]->ser->p, I->ring.ctx);
        r = subs_apply(I, call, p, a, args[1]);
        value_release(p);
    } else if (args[1]->kind != V_NUM)
        builtin_fail_at(call, 1, "expected a number, a polynomial or a real");
    else {
        r = value_new_num(&I->ring);
        tseries_eval_fmpq(r->num, args[0]->ser, x0, I->ring.ctx);
    }
    fmpq_clear(x0);
    return r;
}

/* A polynomial is exact: series(P, x, N) refuses to drop its terms beyond x^N, naming them (a series
   can be shortened on purpose: series(series(P, x, D), x, N)).  Returns 0 after reporting. */
static int bs_series_keeps_all(interp *I, const node *call, const value *p, slong var, slong order)
{
    if (p->kind != V_NUM)
        return 1;
    slong deg = fmpq_mpoly_degree_si(p->num, var, I->ring.ctx);
    if (deg <= order)
        return 1;
    const char *x = I->ring.names[var];
    char range[64];
    snprintf(range, sizeof range, deg == order + 1 ? "%ld" : "%ld to %ld", (long)(order + 1), (long)deg);
    diag_error(&call->list->items[0]->loc, "this polynomial has terms up to %s^%ld, and series(..., %s, %ld) would "
               "drop those of degree %s in %s; give the order %ld, or shorten on purpose with "
               "series(series(..., %s, %ld), %s, %ld)", x, (long)deg, x, (long)order, range, x, (long)deg, x,
               (long)deg, x, (long)order);
    return 0;
}

/* Largest order a series may be given: keeps memory bounded. */
#define BS_MAX_ORDER 100000

static value *bs_series(interp *I, const node *call, value **args)
{
    slong var = builtin_get_var(I, call, args, 1), order;
    if (var < 0 || !builtin_get_slong(I, call, args, 2, 0, BS_MAX_ORDER, &order))
        return NULL;
    if (args[0]->kind == V_SERIES && args[0]->ser->var != var)
        return builtin_fail_at(call, 0, "the series is in another variable");
    if (args[0]->kind != V_NUM && args[0]->kind != V_SERIES)
        return builtin_fail_at(call, 0, "expected a number, polynomial or series");
    if (!bs_series_keeps_all(I, call, args[0], var, order))
        return NULL;
    value *r = value_new_series(var, order, &I->ring);
    if (!series_from_value(I, r->ser, args[0], call->list->items[0])) {
        value_release(r);
        return NULL;
    }
    return r;
}

static value *bs_trunc(interp *I, const node *call, value **args)
{
    if (!series_arg(I, call, args, 0))
        return NULL;
    value *r = value_new_num(&I->ring);
    fmpq_mpoly_set(r->num, args[0]->ser->p, I->ring.ctx);
    return r;
}

const builtin builtins_series[] = {
    {"coeff", 2, bs_coeff, "coeff(S, x^n) or coeff(P, monomial)"},
    {"coeff_in", 3, bs_coeff_in, "coeff_in(P, x, k): coefficient of x^k"},
    {"diff", 2, bs_diff, "diff(S, x)"},
    {"integral", 2, bs_integral, "integral(S, x)"},
    {"compose", 2, bs_compose, "compose(f, g) = f(g(x))"},
    {"revert", 1, bs_revert, "revert(f): the inverse series"},
    {"log", 1, bs_log, "log(S) for S with constant term 1"},
    {"at", 2, bs_at, "at(S, x0)"},
    {"series", 3, bs_series, "series(P, x, N)"},
    {"trunc", 1, bs_trunc, "trunc(S): the known terms as a polynomial"},
    {NULL, 0, NULL, NULL},
};
