/* Expression evaluation. Every function returns a new reference, or NULL
   after reporting an error at the node responsible. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cancel.h"
#include "diag.h"
#include "hodge_lang.h"
#include "interp.h"
#include "oldsyntax.h"
#include "theta_lang.h"
#include "real_ops.h"
#include "series_ops.h"
#include "util.h"
#include "value_str.h"
#include "integrate.h"
#include "specialise.h"
#include "eval.h"
#include "builtins.h"
#include "failure.h"
#include "eval_arith.h"

value *eval_fail(const node *n, const char *msg)
{
    diag_error(&n->loc, "%s", msg);
    return NULL;
}

static value *eval_number(interp *I, const node *n)
{
    value *v = value_new_num(&I->ring);
    fmpq_t q;
    fmpq_init(q);
    const char *dot = strchr(n->text, '.');
    if (!dot) {
        fmpz_set_str(fmpq_numref(q), n->text, 10);
    } else {
        char *digits = xasprintf("%.*s%s", (int)(dot - n->text), n->text, dot + 1);
        fmpz_set_str(fmpq_numref(q), digits, 10);
        fmpz_set_ui(fmpq_denref(q), 10);
        fmpz_pow_ui(fmpq_denref(q), fmpq_denref(q), strlen(dot + 1));
        fmpq_canonicalise(q);
        free(digits);
    }
    fmpq_mpoly_set_fmpq(v->num, q, I->ring.ctx);
    fmpq_clear(q);
    return v;
}

/* Explains why q is not an acceptable integer >= lo; NULL when it is. */
static char *eval_slong_problem(const fmpq_t q, const char *what, slong lo)
{
    if (!fmpz_is_one(fmpq_denref(q))) {
        char *t = fmpq_get_str(NULL, 10, q);
        char *msg = xasprintf("%s must be an integer, got %s", what, t);
        flint_free(t);
        return msg;
    }
    /* a bound of -2^40 or less is no bound: the size check below names the limit */
    if (lo > -(WORD(1) << 40) && fmpz_cmp_si(fmpq_numref(q), lo) < 0) {
        char *t = fmpz_get_str(NULL, 10, fmpq_numref(q));
        char *msg = xasprintf("%s must be an integer >= %ld, got %s", what, (long)lo, t);
        flint_free(t);
        return msg;
    }
    fmpz_t cap;
    fmpz_init_set_ui(cap, UWORD(1) << 40);
    int over = fmpz_cmpabs(fmpq_numref(q), cap) > 0;
    fmpz_clear(cap);
    if (over) {
        int neg = fmpz_sgn(fmpq_numref(q)) < 0;
        return xasprintf("%s is too %s (about %s10^%ld; nothing %s %s2^40 = %s1099511627776 is accepted here)",
                         what, neg ? "small" : "large", neg ? "-" : "", (long)fmpz_sizeinbase(fmpq_numref(q), 10) - 1,
                         neg ? "below" : "above", neg ? "-" : "", neg ? "-" : "");
    }
    return NULL;
}

/* Why the number v (with pi or formal variables in it) is not an integer,
   showing v when it is short. The caller frees the message. */
static char *eval_not_rational(interp *I, const value *v, const char *what)
{
    char *t = value_get_str(v, &I->ring);
    char *msg = strlen(t) <= 40 ? xasprintf("%s must be an integer, got %s", what, t)
                                : xasprintf("%s must be an integer, got an expression in pi or formal variables",
                                            what);
    free(t);
    return msg;
}

int eval_slong(interp *I, scope *s, const node *n, const char *what, slong lo, slong *out)
{
    value *v = eval_expr(I, s, n);
    if (!v)
        return 0;
    fmpq_t q;
    fmpq_init(q);
    char *msg = NULL;
    if (v->kind == V_NUM && !scalar_get_fmpq(q, v->num, &I->ring))
        msg = eval_not_rational(I, v, what);
    else if (v->kind != V_NUM)
        msg = xasprintf("%s must be an integer, got a %s", what, value_kind_name(v));
    else
        msg = eval_slong_problem(q, what, lo);
    int ok = msg == NULL;
    if (ok)
        *out = fmpz_get_si(fmpq_numref(q));
    else
        diag_error(&n->loc, "%s", msg);
    free(msg);
    fmpq_clear(q);
    value_release(v);
    return ok;
}

static value *eval_class_gen(interp *I, scope *s, const node *n)
{
    slong i;
    int is_psi = n->kind == N_PSI;
    if (!eval_slong(I, s, n->a, is_psi ? "psi index" : "kappa index", is_psi ? 1 : 0, &i))
        return NULL;
    cx *c = is_psi ? cx_psi(i, I->ring.ctx, n) : cx_kappa(i, I->ring.ctx, n);
    return value_new_class(c, &I->ring);
}

int eval_truth(interp *I, scope *s, const node *n, int *truth)
{
    value *c = eval_expr(I, s, n);
    if (!c)
        return 0;
    int ok = c->kind == V_NUM;
    if (ok)
        *truth = !fmpq_mpoly_is_zero(c->num, I->ring.ctx);
    else
        eval_fail(n, "a condition must be a number (0 is false)");
    value_release(c);
    return ok;
}

static value *eval_if(interp *I, scope *s, const node *n)
{
    int truth;
    if (!eval_truth(I, s, n->a, &truth))
        return NULL;
    return eval_expr(I, s, truth ? n->b : n->c);
}

/* and / or evaluate their right operand only when it decides the result. */
static value *eval_logic(interp *I, scope *s, const node *n)
{
    int a, b = 0;
    if (!eval_truth(I, s, n->a, &a))
        return NULL;
    if (n->op == '~')
        return value_new_si(&I->ring, !a);
    if ((n->op == '&' && a) || (n->op == '|' && !a)) {
        if (!eval_truth(I, s, n->b, &b))
            return NULL;
        return value_new_si(&I->ring, b);
    }
    return value_new_si(&I->ring, a);
}

/* Collects the multi-index of a correlator; returns its length or -1. */
static slong eval_insertions(interp *I, scope *s, const node *n, slong **d)
{
    slong len = 0, cap = 8;
    *d = xmalloc(cap * sizeof(slong));
    for (int i = 0; i < n->list->len; i++) {
        const node *ins = n->list->items[i];
        slong k, times = 1;
        if (!eval_slong(I, s, ins->a, "tau index", 0, &k))
            return -1;
        if (ins->b && !eval_slong(I, s, ins->b, "repetition count", 0, &times))
            return -1;
        if (len + times > I->lim.max_dim + 3) {
            diag_error(&ins->loc, "too many insertions (limit %ld)", (long)I->lim.max_dim + 3);
            return -1;
        }
        while (len + times > cap)
            cap *= 2;
        *d = xrealloc(*d, cap * sizeof(slong));
        for (slong t = 0; t < times; t++)
            (*d)[len++] = k;
    }
    return len;
}

static value *eval_correlator(interp *I, scope *s, const node *n)
{
    slong g, *d = NULL;
    value *r = NULL;
    slong len = eval_insertions(I, s, n, &d);
    if (len >= 0 && eval_slong(I, s, n->a, "genus", 0, &g))
        r = n->text ? theta_correlator_value(I, n, g, d, len) : integrate_correlator(I, n, g, d, len);
    free(d);
    return r;
}

static value *eval_integral(interp *I, scope *s, const node *n)
{
    slong g, npts;
    if (!eval_slong(I, s, n->a, "genus", 0, &g) || !eval_slong(I, s, n->b, "number of points", 0, &npts))
        return NULL;
    value *c = eval_expr(I, s, n->c);
    if (!c)
        return NULL;
    value *r = c->kind == V_STR || c->kind == V_LIST || c->kind == V_SERIES
                   ? eval_fail(n->c, "int_{g,n} integrates a class expression or a number")
                                : integrate_value(I, n, g, npts, c);
    value_release(c);
    return r;
}

/* Memory of one item of a list, measured for small integers (the value, its
   polynomial and the allocator's overhead): a lower bound for any item. */
#define EVAL_LIST_ITEM_BYTES 320.0

static value *eval_list(interp *I, scope *s, const node *n)
{
    value *v = value_new_list(n->list->len, &I->ring);
    for (slong i = 0; i < v->len; i++)
        if (!(v->items[i] = eval_expr(I, s, n->list->items[i]))) {
            value_release(v);
            return NULL;
        }
    return v;
}

/* Sets the items of the list v to the values of body for i = lo..hi;
   returns v, or NULL (v released) after an error. */
static value *eval_seq_fill(interp *I, scope *s, const node *n, slong lo, slong hi, value *v)
{
    for (slong i = lo; i <= hi; i++) {
        if (failure_cancelled(n)) {
            value_release(v);
            return NULL;
        }
        scope *body = scope_new(s);
        scope_bind_value(body, n->text, value_new_si(&I->ring, i));
        v->items[i - lo] = eval_expr(I, body, n->c);
        scope_free(body);
        if (!v->items[i - lo]) {
            value_release(v);
            return NULL;
        }
    }
    return v;
}

/* Refuses a list of len items before it is built; the lists that a seq
   being built around it will hold count too (seq_{i=1..N} seq_{j=1..M} E
   holds N M values). */
static int eval_seq_size_ok(interp *I, const node *n, slong len)
{
    double total = I->list_outer * (double)len;
    if (total <= I->lim.max_table)
        return 1;
    diag_error(&n->loc, "%s would hold %.3g values (at least %.2g GB of memory), above the limit of %.3g "
               "(raise it with --max-table N)", I->list_outer > 1 ? "this list and the lists around it" : "this list",
               total, total * EVAL_LIST_ITEM_BYTES / 1e9, I->lim.max_table);
    return 0;
}

/* seq_{i=a..b} body: the list of the values of body. */
static value *eval_seq(interp *I, scope *s, const node *n, slong lo, slong hi)
{
    slong len = hi >= lo ? hi - lo + 1 : 0;
    if (!eval_seq_size_ok(I, n, len))
        return NULL;
    double outer = I->list_outer;
    value *v = value_new_list(len, &I->ring);
    I->list_outer = outer * (double)(len > 0 ? len : 1);
    v = eval_seq_fill(I, s, n, lo, hi, v);
    I->list_outer = outer;
    return v;
}

/* sum_{i=a..b} body and prod_{i=a..b} body, each term in a fresh scope. */
static value *eval_sum(interp *I, scope *s, const node *n)
{
    slong lo, hi;
    if (!eval_slong(I, s, n->a, "range start", WORD_MIN / 2, &lo)
        || !eval_slong(I, s, n->b, "range end", WORD_MIN / 2, &hi))
        return NULL;
    if (n->op == 'L')
        return eval_seq(I, s, n, lo, hi);
    node op = *n;
    op.kind = N_BINOP;
    op.a = op.b = NULL;
    value *acc = value_new_si(&I->ring, n->op == '*');
    for (slong i = lo; acc && i <= hi; i++) {
        if (failure_cancelled(n)) {
            value_release(acc);
            return NULL;
        }
        scope *body = scope_new(s);
        scope_bind_value(body, n->text, value_new_si(&I->ring, i));
        value *t = eval_expr(I, body, n->c);
        scope_free(body);
        value *next = NULL;
        if (t && (t->kind == V_STR || t->kind == V_LIST))
            eval_fail(n->c, "sum and prod need numbers, classes or series");
        else if (t && (acc->kind == V_REAL || t->kind == V_REAL))
            next = real_arith(I, &op, op.op, acc, t);
        else if (t && (acc->kind == V_SERIES || t->kind == V_SERIES))
            next = series_arith(I, &op, op.op, acc, t);
        else if (t)
            next = acc->kind == V_NUM && t->kind == V_NUM ? eval_arith_num(I, &op, acc, t)
                                                          : eval_arith_class(I, &op, acc, t);
        value_release(t);
        value_release(acc);
        acc = next;
    }
    return acc;
}

static value *eval_user_call(interp *I, scope *s, const node *n, const node *def)
{
    if (n->list->len != def->list->len) {
        char *msg = xasprintf("'%s' takes %d argument%s, got %d", n->text, def->list->len,
                              def->list->len == 1 ? "" : "s", n->list->len);
        eval_fail(n, msg);
        free(msg);
        return NULL;
    }
    if (failure_cancelled(n))
        return NULL;
    if (I->depth >= I->lim.max_depth) {
        char *msg = xasprintf("calls nested more than %d deep (endless recursion? raise with --max-depth)",
                              I->lim.max_depth);
        eval_fail(n, msg);
        free(msg);
        return NULL;
    }
    scope *frame = scope_new(I->globals);
    for (int i = 0; i < n->list->len; i++) {
        value *arg = eval_expr(I, s, n->list->items[i]);
        if (!arg) {
            scope_free(frame);
            return NULL;
        }
        scope_bind_value(frame, def->list->items[i]->text, arg);
    }
    I->depth++;
    value *r = eval_expr(I, frame, def->a);
    I->depth--;
    scope_free(frame);
    return r;
}

static value *eval_call(interp *I, scope *s, const node *n)
{
    binding *b = scope_lookup(s, n->text);
    if (b && b->kind == B_FUNCTION)
        return eval_user_call(I, s, n, b->def);
    value *r;
    if (!b && builtin_call(I, s, n, &r))
        return r;
    const char *renamed = b ? NULL : oldsyntax_renamed_function(n->text);
    if (renamed)
        return eval_fail(n, renamed);
    char *msg = b ? xasprintf("'%s' is not a function", n->text)
                  : xasprintf("undefined function '%s'", n->text);
    eval_fail(n, msg);
    free(msg);
    return NULL;
}

/* Cancels pi * (1/pi) in a number made by a builtin, an integral or a sum
   (their products of coefficients do not know about 1/pi); v may be NULL. */
static value *eval_tidy(interp *I, value *v)
{
    if (v && v->kind == V_NUM)
        scalar_normalise(v->num, &I->ring);
    return v;
}

value *eval_expr(interp *I, scope *s, const node *n)
{
    if (util_stack_exhausted())
        return eval_fail(n, "evaluation nested too deeply for the stack (a very long chain of operators, "
                            "or deep recursion: try --max-depth lower, or split the expression)");
    switch (n->kind) {
    case N_NUMBER:
        return eval_number(I, n);
    case N_STRING:
        return value_new_str(xstrdup(n->text), &I->ring);
    case N_PI: {
        value *v = value_new_num(&I->ring);
        scalar_set_gen(v->num, &I->ring, SCALAR_PI);
        return v;
    }
    case N_NAME:
        if (theta_is_class_name(n->text) && !scope_lookup(s, n->text))
            return theta_class_value(I, n);
        return eval_name(I, s, n);
    case N_INDEXED:
        return eval_indexed(I, s, n);
    case N_SUBSCRIPT:
        return eval_subscript(I, s, n);
    case N_CALL:
        return eval_tidy(I, eval_call(I, s, n));
    case N_PSI:
    case N_KAPPA:
        return eval_class_gen(I, s, n);
    case N_CORR:
        return eval_correlator(I, s, n);
    case N_NEG:
        return eval_neg(I, s, n);
    case N_BINOP:
        return eval_binop(I, s, n);
    case N_COMPARE:
        return eval_compare(I, s, n);
    case N_FACTORIAL:
        return eval_factorial(I, s, n);
    case N_INTEGRAL:
        return eval_tidy(I, eval_integral(I, s, n));
    case N_IF:
        return eval_if(I, s, n);
    case N_LOGIC:
        return eval_logic(I, s, n);
    case N_SUM:
        return eval_tidy(I, eval_sum(I, s, n));
    case N_SPEC:
        return specialise_value(I, s, n);
    case N_LIST:
        return eval_list(I, s, n);
    default:
        return eval_fail(n, "not an expression");
    }
}
