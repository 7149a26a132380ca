/* Builtin functions of the language: exp, binomial, numer, denom, decimal,
   real, dim. */
#include <stdlib.h>
#include <string.h>

#include "builtins.h"
#include "real_ops.h"
#include "real_funcs.h"
#include "theta_lang.h"
#include "diag.h"
#include "series_ops.h"
#include "util.h"
#include "value_str.h"
#include "eval.h"

static value *builtin_fail(const node *at, const char *msg)
{
    diag_error(&at->loc, "%s", msg);
    return NULL;
}

value *builtin_fail_at(const node *call, int i, const char *msg)
{
    return builtin_fail(i >= 0 && i < call->list->len ? call->list->items[i] : call, msg);
}

slong builtin_get_var(interp *I, const node *call, value **args, int i)
{
    const value *v = args[i];
    if (v->kind == V_NUM && fmpq_mpoly_length(v->num, I->ring.ctx) == 1)
        for (slong k = 0; k < I->ring.nvars; k++)
            if (fmpq_mpoly_is_gen(v->num, k, I->ring.ctx))
                return k;
    builtin_fail_at(call, i, "expected a formal variable declared with var");
    return -1;
}

static value *builtin_exp(interp *I, const node *call, value **args)
{
    if (args[0]->kind == V_CLASS)
        return value_new_class(cx_exp(value_to_class(args[0]), call), &I->ring);
    if (args[0]->kind == V_SERIES) {
        if (!series_size_ok(I, call, "this exp", SERIES_COST_EXP, args[0]->ser, NULL, args[0]->ser->order, 0))
            return NULL;
        value *r = value_new_series(args[0]->ser->var, args[0]->ser->order, &I->ring);
        int rc = tseries_exp(r->ser, args[0]->ser, I->ring.ctx);
        if (rc == TS_OK)
            return r;
        value_release(r);
        series_report(call, rc, "exp");
        return NULL;
    }
    if (real_applies(I, args[0]))
        return real_unary(I, call, RF_EXP, args[0]);
    if (args[0]->kind != V_NUM) {
        char *msg = xasprintf("exp() takes a class expression, a power series or a number, got a %s",
                              value_kind_name(args[0]));
        builtin_fail(call->list->items[0], msg);
        free(msg);
        return NULL;
    }
    return builtin_fail(call, "exp() of a polynomial in formal variables has no value here (substitute numbers "
                              "first with subs, or make it a series with series(P, x, N))");
}

/* What argument v is, for "expected an integer, got ...": the number
   itself when it is short, else its kind. The caller frees it. */
static char *builtin_describe(interp *I, const value *v)
{
    if (v->kind == V_NUM) {
        char *t = value_get_str(v, &I->ring);
        if (strlen(t) <= 30)
            return t;
        free(t);
        return xstrdup(scalar_is_pi_only(v->num, &I->ring) ? "a long number" : "a polynomial");
    }
    return xasprintf("a %s", value_kind_name(v));
}

/* Why the integer q is outside [lo, hi]; an integer too large to show is
   named by its size. The caller frees the message. */
static char *builtin_range_problem(const fmpz_t q, slong lo, slong hi)
{
    if (fmpz_fits_si(q))
        return xasprintf("expected an integer between %ld and %ld here", (long)lo, (long)hi);
    return xasprintf("this integer (about %s10^%ld) is too %s here: expected an integer between %ld and %ld",
                     fmpz_sgn(q) < 0 ? "-" : "", (long)fmpz_sizeinbase(q, 10) - 1,
                     fmpz_sgn(q) > 0 ? "large" : "small", (long)lo, (long)hi);
}

/* Reads argument i as a slong within [lo, hi]. */
int builtin_get_slong(interp *I, const node *call, value **args, int i, slong lo, slong hi, slong *out)
{
    const node *at = call->list->items[i];
    fmpq_t q;
    fmpq_init(q);
    char *msg = NULL;
    if (args[i]->kind != V_NUM || !scalar_get_fmpq(q, args[i]->num, &I->ring) || !fmpz_is_one(fmpq_denref(q))) {
        char *what = builtin_describe(I, args[i]);
        msg = xasprintf("expected an integer here, got %s", what);
        free(what);
    } else if (fmpz_cmp_si(fmpq_numref(q), lo) < 0 || fmpz_cmp_si(fmpq_numref(q), hi) > 0) {
        msg = builtin_range_problem(fmpq_numref(q), lo, hi);
    } else {
        *out = fmpz_get_si(fmpq_numref(q));
    }
    fmpq_clear(q);
    if (msg)
        builtin_fail(at, msg);
    free(msg);
    return msg == NULL;
}

static value *builtin_binomial(interp *I, const node *call, value **args)
{
    slong n, k;
    if (!builtin_get_slong(I, call, args, 0, -1000000000, 1000000000, &n)
        || !builtin_get_slong(I, call, args, 1, -1000000000, 1000000000, &k))
        return NULL;
    if (k > 1000000)
        return builtin_fail(call->list->items[1], "binomial(n, k) is limited to k <= 1000000");
    /* binomial(n, k) = n (n-1) ... (n-k+1) / k!; for n < 0 it is
       (-1)^k binomial(k-n-1, k) */
    fmpz_t r;
    fmpz_init(r);
    if (k >= 0 && (n < 0 || k <= n)) {
        /* top = n, or k-n-1 for negative n; binomial = rising factorial / k!,
           both by binary splitting, which stays fast for huge arguments */
        ulong top = n >= 0 ? (ulong)n : (ulong)(k - n - 1);
        fmpz_t f;
        fmpz_init(f);
        fmpz_rfac_uiui(r, top - (ulong)k + 1, (ulong)k);
        fmpz_fac_ui(f, (ulong)k);
        fmpz_divexact(r, r, f);
        fmpz_clear(f);
        if (n < 0 && k % 2)
            fmpz_neg(r, r);
    }
    value *v = value_new_num(&I->ring);
    fmpq_mpoly_set_fmpz(v->num, r, I->ring.ctx);
    fmpz_clear(r);
    return v;
}

static value *builtin_part(interp *I, const node *call, value *arg, int numer)
{
    fmpq_t q;
    fmpq_init(q);
    value *v = NULL;
    if (arg->kind == V_NUM && scalar_get_fmpq(q, arg->num, &I->ring)) {
        v = value_new_num(&I->ring);
        fmpq_mpoly_set_fmpz(v->num, numer ? fmpq_numref(q) : fmpq_denref(q), I->ring.ctx);
    } else {
        builtin_fail(call, "numer() and denom() take a rational number");
    }
    fmpq_clear(q);
    return v;
}

static value *builtin_numer(interp *I, const node *call, value **args)
{
    return builtin_part(I, call, args[0], 1);
}

static value *builtin_denom(interp *I, const node *call, value **args)
{
    return builtin_part(I, call, args[0], 0);
}

/* real(x, digits): a certified ball for x, to continue numerically. */
static value *builtin_real(interp *I, const node *call, value **args)
{
    slong digits;
    if (!builtin_get_slong(I, call, args, 1, 1, OUT_MAX_DIGITS, &digits))
        return NULL;
    return real_from_exact(I, call->list->items[0], args[0], digits);
}

/* decimal(x, digits): x to the given number of correct significant digits. */
static value *builtin_decimal(interp *I, const node *call, value **args)
{
    slong digits;
    if (args[0]->kind == V_REAL) {
        if (!builtin_get_slong(I, call, args, 1, 1, OUT_MAX_DIGITS, &digits))
            return NULL;
        if (!arb_is_exact(args[0]->re) && arb_rel_accuracy_bits(args[0]->re) < (slong)(digits * 3.3219280948873623))
            return builtin_fail(call, "this real is not known to that many digits (make it with more digits)");
        char *t = arb_get_str(args[0]->re, digits, ARB_STR_NO_RADIUS);
        value *r = value_new_str(xstrdup(t), &I->ring);
        flint_free(t);
        return r;
    }
    if (args[0]->kind != V_NUM || !scalar_is_pi_only(args[0]->num, &I->ring))
        return builtin_fail(call->list->items[0], "decimal() needs a number (pi allowed, no formal variables)");
    if (!builtin_get_slong(I, call, args, 1, 1, OUT_MAX_DIGITS, &digits))
        return NULL;
    return value_new_str(out_decimal(args[0]->num, &I->ring, digits, 0), &I->ring);
}

/* dim(g, n) = 3g-3+n, the dimension of Mbar_{g,n} (stable spaces only). */
static value *builtin_dim(interp *I, const node *call, value **args)
{
    slong g, n;
    if (!builtin_get_slong(I, call, args, 0, 0, WORD(1) << 40, &g)
        || !builtin_get_slong(I, call, args, 1, 0, WORD(1) << 40, &n))
        return NULL;
    if (2 * g - 2 + n <= 0) {
        char *msg = xasprintf("Mbar_{%ld,%ld} is not a stable moduli space (needs 2g-2+n > 0), so it has no "
                              "dimension here", (long)g, (long)n);
        builtin_fail(call, msg);
        free(msg);
        return NULL;
    }
    return value_new_si(&I->ring, 3 * g - 3 + n);
}

const builtin builtins_core[] = {
    {"exp", 1, builtin_exp, "exp(C) for a class expression C"},
    {"binomial", 2, builtin_binomial, "binomial(n, k)"},
    {"numer", 1, builtin_numer, "numer(q)"},
    {"denom", 1, builtin_denom, "denom(q)"},
    {"decimal", 2, builtin_decimal, "decimal(x, digits)"},
    {"real", 2, builtin_real, "real(x, digits): x as a certified real with that many correct digits"},
    {"dim", 2, builtin_dim, "dim(g, n) = 3g-3+n, the dimension of Mbar_{g,n}"},
    {"supervolume", 2, theta_builtin_supervolume, "supervolume(g, n): V^Theta_{g,n}(L_1..L_n)"},
    {NULL, 0, NULL, NULL},
};

static const builtin *builtin_find(const char *name)
{
    const builtin *tables[] = {builtins_core,    builtins_series, builtins_toolkit_factorial,
                               builtins_toolkit, builtins_spectral, builtins_strata,
                               builtins_real,    builtins_subs};
    for (size_t t = 0; t < sizeof tables / sizeof tables[0]; t++)
        for (const builtin *b = tables[t]; b->name; b++)
            if (strcmp(b->name, name) == 0)
                return b;
    return NULL;
}

int builtin_call(interp *I, scope *s, const node *call, value **result)
{
    const builtin *b = builtin_find(call->text);
    if (!b)
        return 0;
    *result = NULL;
    if (call->list->len != b->nargs) {
        char *msg = xasprintf("'%s' takes %d argument%s, got %d (usage: %s)", b->name, b->nargs,
                              b->nargs == 1 ? "" : "s", call->list->len, b->usage);
        builtin_fail(call, msg);
        free(msg);
        return 1;
    }
    value *args[4] = {NULL, NULL, NULL, NULL};
    int i;
    for (i = 0; i < b->nargs; i++)
        if (!(args[i] = eval_expr(I, s, call->list->items[i])))
            break;
    if (i == b->nargs)
        *result = b->fn(I, call, args);
    for (int j = 0; j < b->nargs; j++)
        value_release(args[j]);
    return 1;
}
