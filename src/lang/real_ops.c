#include "real_ops.h"

#include "diag.h"
#include "scalar_arb.h"

#define REAL_LOG2_10 3.3219280948873623

/* Working precision of a ball: enough bits for its own accuracy plus a margin. */
static slong real_prec(const arb_t x)
{
    slong bits = arb_is_exact(x) ? 64 : arb_rel_accuracy_bits(x);
    return (bits < 64 ? 64 : bits) + 32;
}

/* Converts an operand to a ball at precision prec; 0 after reporting. */
static int real_operand(interp *I, const node *n, arb_t r, const value *v, slong prec)
{
    if (v->kind == V_REAL) {
        arb_set(r, v->re);
        return 1;
    }
    if (v->kind == V_NUM && scalar_is_pi_only(v->num, &I->ring)) {
        scalar_get_arb(r, v->num, &I->ring, prec);
        return 1;
    }
    diag_error(&n->loc, "a real number combines only with numbers (pi allowed) and reals, not a %s",
               v->kind == V_NUM ? "polynomial in formal variables" : value_kind_name(v));
    return 0;
}

value *real_arith(interp *I, const node *n, int op, const value *a, const value *b)
{
    slong prec = a->kind == V_REAL ? real_prec(a->re) : real_prec(b->re);
    if (a->kind == V_REAL && b->kind == V_REAL && real_prec(b->re) > prec)
        prec = real_prec(b->re);
    arb_t x, y;
    arb_init(x);
    arb_init(y);
    value *r = NULL;
    if (real_operand(I, n, x, a, prec) && real_operand(I, n, y, b, prec)) {
        if (op == '/' && arb_contains_zero(y)) {
            diag_error(&n->loc, "division by a real that may be zero (its ball contains 0)");
        } else {
            r = value_new_real(&I->ring);
            if (op == '+')
                arb_add(r->re, x, y, prec);
            else if (op == '-')
                arb_sub(r->re, x, y, prec);
            else if (op == '*')
                arb_mul(r->re, x, y, prec);
            else
                arb_div(r->re, x, y, prec);
        }
    }
    arb_clear(x);
    arb_clear(y);
    return r;
}

int real_compare(interp *I, const node *n, const value *a, const value *b)
{
    slong prec = a->kind == V_REAL ? real_prec(a->re) : real_prec(b->re);
    arb_t x, y;
    arb_init(x);
    arb_init(y);
    int c = -2;
    if (real_operand(I, n, x, a, prec) && real_operand(I, n, y, b, prec)) {
        if (arb_lt(x, y))
            c = -1;
        else if (arb_gt(x, y))
            c = 1;
        else if (arb_is_exact(x) && arb_equal(x, y))
            c = 0;
        else
            diag_error(&n->loc, "the order of these reals is not decided at their precision (their balls overlap)");
    }
    arb_clear(x);
    arb_clear(y);
    return c;
}

value *real_pow(interp *I, const node *n, const value *a, slong e)
{
    if (e < 0 && arb_contains_zero(a->re)) {
        diag_error(&n->loc, "a negative power of a real that may be zero");
        return NULL;
    }
    value *r = value_new_real(&I->ring);
    fmpz_t ez;
    fmpz_init_set_si(ez, e);
    arb_pow_fmpz(r->re, a->re, ez, real_prec(a->re));
    fmpz_clear(ez);
    return r;
}

value *real_from_exact(interp *I, const node *at, const value *x, slong digits)
{
    if (x->kind == V_REAL)
        return value_ref((value *)x);
    if (x->kind != V_NUM || !scalar_is_pi_only(x->num, &I->ring)) {
        diag_error(&at->loc, "real() needs a number (pi allowed, no formal variables)");
        return NULL;
    }
    value *r = value_new_real(&I->ring);
    slong want = (slong)(digits * REAL_LOG2_10) + 4;
    for (slong prec = want + 32;; prec *= 2) {
        scalar_get_arb(r->re, x->num, &I->ring, prec);
        if (arb_is_exact(r->re) || arb_rel_accuracy_bits(r->re) >= want || prec > 64 * want + 100000)
            break;
    }
    return r;
}
