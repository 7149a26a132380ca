/* Arithmetic of values: negation, + - * / ^, comparisons and factorials, each with the size
   checks that refuse a result too large to hold before computing it. New references, or NULL
   after reporting at the node responsible. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "diag.h"
#include "eval.h"
#include "eval_arith.h"
#include "interp.h"
#include "real_ops.h"
#include "series_ops.h"
#include "util.h"
#include "value_str.h"

/* Exponents and factorial arguments beyond these would not fit in memory. */
#define EVAL_MAX_RESULT_BITS 200000000.0

value *eval_neg(interp *I, scope *s, const node *n)
{
    value *a = eval_expr(I, s, n->a);
    if (!a)
        return NULL;
    if (a->kind == V_STR || a->kind == V_LIST) {
        const char *msg = a->kind == V_STR ? "cannot negate a string" : "cannot negate a list";
        value_release(a);
        return eval_fail(n, msg);
    }
    value *r;
    if (a->kind == V_NUM) {
        r = value_new_num(&I->ring);
        fmpq_mpoly_neg(r->num, a->num, I->ring.ctx);
    } else if (a->kind == V_SERIES || a->kind == V_REAL) {
        value *m = value_new_si(&I->ring, -1);
        r = a->kind == V_REAL ? real_arith(I, n, '*', m, a) : series_arith(I, n, '*', m, a);
        value_release(m);
    } else {
        value *m = value_new_si(&I->ring, -1);
        r = value_new_class(cx_mul(value_to_class(m), value_to_class(a)), &I->ring);
        value_release(m);
    }
    value_release(a);
    return r;
}

/* log2 |x| (0 for x = 0), so that the size of x^e is e log2 |x| bits. */
static double eval_log2_abs(const fmpz_t x)
{
    if (fmpz_is_zero(x))
        return 0.0;
    fmpz_t a;
    fmpz_init(a);
    fmpz_abs(a, x);
    double r = fmpz_dlog(a) / M_LN2;
    fmpz_clear(a);
    return r;
}

/* Checks that base^e stays within memory before computing it. */
static int eval_pow_size_ok(interp *I, const node *n, const value *base, slong e)
{
    double bits = 1.0;
    fmpq_t q;
    fmpq_init(q);
    if (scalar_get_fmpq(q, base->num, &I->ring))
        bits = eval_log2_abs(fmpq_numref(q)) + eval_log2_abs(fmpq_denref(q));
    else
        bits = 64.0 * fmpq_mpoly_length(base->num, I->ring.ctx);
    fmpq_clear(q);
    if (fmpq_mpoly_is_zero(base->num, I->ring.ctx) || fmpq_mpoly_is_one(base->num, I->ring.ctx))
        return 1;
    double est = bits * (double)(e < 0 ? -e : e);
    if (est <= EVAL_MAX_RESULT_BITS)
        return 1;
    diag_error(&n->loc, "this power would need about %.3g bits, above the limit of %.3g", est,
               EVAL_MAX_RESULT_BITS);
    return 0;
}

/* Refuses a power of a polynomial with too many terms: in v variables of total
   degree d, a^e has at most binomial(v + d e, v) terms. */
static int eval_pow_terms_ok(interp *I, const node *n, const value *a, slong e)
{
    slong deg[SCALAR_MAX_VARS], v = 0;
    if (e <= 1 || fmpq_mpoly_length(a->num, I->ring.ctx) <= 1)
        return 1;
    fmpq_mpoly_degrees_si(deg, a->num, I->ring.ctx);
    for (int i = 0; i < SCALAR_MAX_VARS; i++)
        v += deg[i] > 0;
    double D = (double)fmpq_mpoly_total_degree_si(a->num, I->ring.ctx) * (double)e;
    double terms = exp(lgamma(v + D + 1) - lgamma(v + 1.0) - lgamma(D + 1));
    if (terms <= (double)I->lim.max_class_terms)
        return 1;
    diag_error(&n->loc, "this power would have about %.3g terms, above the limit of %.3g (raise it with --max-terms N)",
               terms, (double)I->lim.max_class_terms);
    return 0;
}

static value *eval_pow_num(interp *I, const node *n, const value *a, slong e)
{
    if (!eval_pow_size_ok(I, n, a, e) || !eval_pow_terms_ok(I, n, a, e))
        return NULL;
    value *r = value_new_num(&I->ring);
    if (e >= 0) {
        fmpq_mpoly_pow_ui(r->num, a->num, (ulong)e, I->ring.ctx);
        scalar_normalise(r->num, &I->ring);
        return r;
    }
    fmpq_t q;
    fmpq_init(q);
    int ok = scalar_get_fmpq(q, a->num, &I->ring) && !fmpq_is_zero(q);
    if (ok) {
        fmpq_inv(q, q);
        fmpq_pow_si(q, q, -e);
        fmpq_mpoly_set_fmpq(r->num, q, I->ring.ctx);
    } else if (scalar_is_unit(a->num, &I->ring)) {
        /* a rational times a power of pi: its inverse is in the ring */
        fmpq_mpoly_t one;
        fmpq_mpoly_init(one, I->ring.ctx);
        fmpq_mpoly_one(one, I->ring.ctx);
        ok = scalar_div(one, one, a->num, &I->ring);
        fmpq_mpoly_pow_ui(r->num, one, (ulong)-e, I->ring.ctx);
        scalar_normalise(r->num, &I->ring);
        fmpq_mpoly_clear(one, I->ring.ctx);
    }
    fmpq_clear(q);
    if (ok)
        return r;
    value_release(r);
    return eval_fail(n, fmpq_mpoly_is_zero(a->num, I->ring.ctx)
                            ? "division by zero: 0 to a negative power"
                            : "a polynomial to a negative power is not a polynomial (only a number "
                              "times a power of pi is invertible)");
}

static value *eval_pow(interp *I, scope *s, const node *n, value *a)
{
    slong e;
    if (!eval_slong(I, s, n->b, "exponent", a->kind == V_CLASS ? 0 : WORD_MIN / 2, &e))
        return NULL;
    if (a->kind == V_NUM)
        return eval_pow_num(I, n, a, e);
    if (a->kind == V_SERIES)
        return series_pow(I, n, a, e);
    if (a->kind == V_REAL)
        return real_pow(I, n, a, e);
    if (a->kind == V_STR || a->kind == V_LIST)
        return eval_fail(n, "only numbers, classes and series have powers");
    return value_new_class(cx_pow(value_to_class(a), e, n), &I->ring);
}

/* Exact division of scalars: by a number times a power of pi always (values
   are Laurent polynomials in pi), by anything else only when it divides exactly. */
static value *eval_div_num(interp *I, const node *n, const value *a, const value *b)
{
    const node *divisor = n->b != NULL ? n->b : n;   /* the error points at what fails */
    if (fmpq_mpoly_is_zero(b->num, I->ring.ctx))
        return eval_fail(divisor, "division by zero");
    value *r = value_new_num(&I->ring);
    if (scalar_div(r->num, a->num, b->num, &I->ring))
        return r;
    value_release(r);
    return eval_fail(divisor, "the divisor does not divide exactly (values are polynomials in the variables, Laurent "
                        "in pi: only a number times a power of pi can always be divided by; there are no "
                        "rational functions)");
}

value *eval_arith_num(interp *I, const node *n, const value *a, const value *b)
{
    if (n->op == '/')
        return eval_div_num(I, n, a, b);
    value *r = value_new_num(&I->ring);
    if (n->op == '+')
        fmpq_mpoly_add(r->num, a->num, b->num, I->ring.ctx);
    else if (n->op == '-')
        fmpq_mpoly_sub(r->num, a->num, b->num, I->ring.ctx);
    else
        fmpq_mpoly_mul(r->num, a->num, b->num, I->ring.ctx);
    scalar_normalise(r->num, &I->ring);
    return r;
}

value *eval_arith_class(interp *I, const node *n, const value *a, const value *b)
{
    if (n->op == '/') {
        if (b->kind != V_NUM)
            return eval_fail(n, "cannot divide by a class");
        value *one = value_new_si(&I->ring, 1);
        value *inv = eval_div_num(I, n, one, b);
        value_release(one);
        if (!inv)
            return NULL;
        value *r = value_new_class(cx_mul(value_to_class(a), value_to_class(inv)), &I->ring);
        value_release(inv);
        return r;
    }
    cx *ca = value_to_class(a), *cb = value_to_class(b);
    if (n->op == '-') {
        value *m = value_new_si(&I->ring, -1);
        cb = cx_mul(value_to_class(m), cb);
        value_release(m);
    }
    return value_new_class(n->op == '*' ? cx_mul(ca, cb) : cx_add(ca, cb), &I->ring);
}

value *eval_binop(interp *I, scope *s, const node *n)
{
    value *a = eval_expr(I, s, n->a);
    if (!a)
        return NULL;
    if (n->op == '^') {
        value *r = eval_pow(I, s, n, a);
        value_release(a);
        return r;
    }
    value *b = eval_expr(I, s, n->b);
    value *r = NULL;
    if (b && (a->kind == V_STR || b->kind == V_STR))
        eval_fail(n, "arithmetic on strings is not defined");
    else if (b && (a->kind == V_LIST || b->kind == V_LIST))
        eval_fail(n, "arithmetic on lists is not defined (build a new list with seq_{i=a..b} E)");
    else if (b && (a->kind == V_REAL || b->kind == V_REAL))
        r = real_arith(I, n, n->op, a, b);
    else if (b && (a->kind == V_SERIES || b->kind == V_SERIES))
        r = series_arith(I, n, n->op, a, b);
    else if (b && a->kind == V_NUM && b->kind == V_NUM)
        r = eval_arith_num(I, n, a, b);
    else if (b)
        r = eval_arith_class(I, n, a, b);
    value_release(a);
    value_release(b);
    return r;
}

/* Compares two scalars; ordering needs rational constants. Returns -2 on error. */
static int eval_compare_values(interp *I, const node *n, const value *a, const value *b)
{
    if ((a->kind == V_REAL && (b->kind == V_REAL || b->kind == V_NUM))
        || (b->kind == V_REAL && a->kind == V_NUM))
        return real_compare(I, n, a, b);
    if (a->kind != V_NUM || b->kind != V_NUM) {
        eval_fail(n, "only numbers can be compared");
        return -2;
    }
    if (n->op == CMP_EQ || n->op == CMP_NE)
        return fmpq_mpoly_equal(a->num, b->num, I->ring.ctx) ? 0 : 1;
    fmpq_t x, y;
    fmpq_init(x);
    fmpq_init(y);
    int c = -2;
    if (scalar_get_fmpq(x, a->num, &I->ring) && scalar_get_fmpq(y, b->num, &I->ring))
        c = fmpq_cmp(x, y);
    else
        eval_fail(n, "ordering needs rational numbers (pi and variables have no exact order here)");
    fmpq_clear(x);
    fmpq_clear(y);
    return c;
}

value *eval_compare(interp *I, scope *s, const node *n)
{
    value *a = eval_expr(I, s, n->a);
    value *b = a ? eval_expr(I, s, n->b) : NULL;
    int c = b ? eval_compare_values(I, n, a, b) : -2;
    value_release(a);
    value_release(b);
    if (c == -2)
        return NULL;
    int truth = n->op == CMP_EQ ? c == 0 : n->op == CMP_NE ? c != 0 : n->op == CMP_LT ? c < 0
              : n->op == CMP_LE ? c <= 0 : n->op == CMP_GT ? c > 0 : c >= 0;
    return value_new_si(&I->ring, truth);
}

value *eval_factorial(interp *I, scope *s, const node *n)
{
    slong k;
    int dbl = n->op == 2;
    if (!eval_slong(I, s, n->a, dbl ? "argument of !!" : "argument of !", dbl ? -1 : 0, &k))
        return NULL;
    double bits = k > 1 ? (double)k * (log2((double)k) - 1.4426950408889634) / (dbl ? 2.0 : 1.0) : 1.0;
    if (bits > EVAL_MAX_RESULT_BITS) {
        diag_error(&n->loc, "this factorial would need about %.3g bits, above the limit of %.3g", bits,
                   EVAL_MAX_RESULT_BITS);
        return NULL;
    }
    fmpz_t f;
    fmpz_init(f);
    if (!dbl) {
        fmpz_fac_ui(f, (ulong)k);
    } else if (k <= 0) {
        fmpz_one(f);
    } else if (k % 2 == 0) {
        /* (2m)!! = 2^m m! */
        fmpz_fac_ui(f, (ulong)(k / 2));
        fmpz_mul_2exp(f, f, (ulong)(k / 2));
    } else {
        /* (2m+1)!! = (2m+1)! / (2^m m!) */
        fmpz_t d;
        fmpz_init(d);
        fmpz_fac_ui(f, (ulong)k);
        fmpz_fac_ui(d, (ulong)(k / 2));
        fmpz_mul_2exp(d, d, (ulong)(k / 2));
        fmpz_divexact(f, f, d);
        fmpz_clear(d);
    }
    value *r = value_new_num(&I->ring);
    fmpq_mpoly_set_fmpz(r->num, f, I->ring.ctx);
    fmpz_clear(f);
    return r;
}
