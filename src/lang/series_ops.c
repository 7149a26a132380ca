#include "series_ops.h"

#include <stdlib.h>

#include "diag.h"
#include "util.h"

void series_report(const node *at, int rc, const char *what)
{
    const char *why;
    switch (rc) {
    case TS_VAR_MISMATCH:
        why = "the series are in different variables";
        break;
    case TS_DIVZERO:
        why = "the divisor has zero constant term (division by zero)";
        break;
    case TS_NEEDS_ZERO_CONSTANT:
        why = "it needs a series with zero constant term";
        break;
    case TS_NEEDS_UNIT_CONSTANT:
        why = "it needs a series with constant term 1";
        break;
    case TS_NEEDS_LINEAR_TERM:
        why = "it needs zero constant term and a nonzero rational linear term";
        break;
    case TS_NOT_RATIONAL:
        why = "the leading coefficient must be a nonzero rational number";
        break;
    default:
        why = "invalid argument";
    }
    diag_error(&at->loc, "%s is not defined here: %s", what, why);
}

int series_from_value(interp *I, tseries *out, const value *v, const node *at)
{
    if (v->kind == V_NUM) {
        tseries_set_mpoly(out, v->num, I->ring.ctx);
        return 1;
    }
    if (v->kind == V_SERIES && v->ser->var == out->var) {
        tseries_set_mpoly(out, v->ser->p, I->ring.ctx);
        if (v->ser->order < out->order)
            out->order = v->ser->order;
        return 1;
    }
    diag_error(&at->loc, v->kind == V_SERIES ? "the series are in different variables"
                                             : "expected a number or a series here, got a %s",
               value_kind_name(v));
    return 0;
}

/* The series operand fixing variable and order: the one of lower order. */
static const tseries *series_shape(const value *a, const value *b)
{
    if (a->kind != V_SERIES)
        return b->ser;
    if (b->kind != V_SERIES)
        return a->ser;
    return a->ser->order <= b->ser->order ? a->ser : b->ser;
}

value *series_arith(interp *I, const node *n, int op, const value *a, const value *b)
{
    if (a->kind == V_CLASS || b->kind == V_CLASS || a->kind == V_STR || b->kind == V_STR) {
        diag_error(&n->loc, "a series can only be combined with numbers and series");
        return NULL;
    }
    const tseries *shape = series_shape(a, b);
    if (op == '/' && a->kind == V_SERIES && b->kind == V_NUM && !fmpq_mpoly_is_fmpq(b->num, I->ring.ctx)
        && fmpq_mpoly_degree_si(b->num, a->ser->var, I->ring.ctx) == 0) {
        /* a constant that is not a rational number, e.g. sin(2*pi*Z)/(2*pi): exact when it divides
           every known coefficient */
        value *r = value_new_series(a->ser->var, a->ser->order, &I->ring);
        if (fmpq_mpoly_divides(r->ser->p, a->ser->p, b->num, I->ring.ctx))
            return r;
        value_release(r);
    }
    tseries x, y;
    tseries_init(&x, shape->var, shape->order, I->ring.ctx);
    tseries_init(&y, shape->var, shape->order, I->ring.ctx);
    value *r = NULL;
    if (series_from_value(I, &x, a, n->a ? n->a : n) && series_from_value(I, &y, b, n->b ? n->b : n)
        && (op == '+' || op == '-'
            || series_size_ok(I, n, op == '*' ? "this product" : "this division",
                              op == '*' ? SERIES_COST_PRODUCT : SERIES_COST_QUOTIENT, &x, &y, shape->order, 0))) {
        r = value_new_series(shape->var, shape->order, &I->ring);
        int rc = op == '+' ? tseries_add(r->ser, &x, &y, I->ring.ctx)
               : op == '-' ? tseries_sub(r->ser, &x, &y, I->ring.ctx)
               : op == '*' ? tseries_mul(r->ser, &x, &y, I->ring.ctx)
                           : tseries_div(r->ser, &x, &y, I->ring.ctx);
        if (rc != TS_OK) {
            series_report(n, rc, op == '/' ? "this division" : "this operation");
            value_release(r);
            r = NULL;
        }
    }
    tseries_clear(&x, I->ring.ctx);
    tseries_clear(&y, I->ring.ctx);
    return r;
}

value *series_pow(interp *I, const node *n, const value *a, slong e)
{
    if (!series_size_ok(I, n, "this power", SERIES_COST_POWER, a->ser, NULL, a->ser->order, (double)e))
        return NULL;
    value *r = value_new_series(a->ser->var, a->ser->order, &I->ring);
    int rc = tseries_pow_si(r->ser, a->ser, e, I->ring.ctx);
    if (rc == TS_OK)
        return r;
    series_report(n, rc, "this power");
    value_release(r);
    return NULL;
}
