/* The language's bridge to the Hodge engine: names lambda_j, ch_k; int_{g,n} of integrands with
   Hodge classes by a closed form or the operator route; --verify by the second route.  explain is
   in hodge_lang_explain.c. */
#include <stdlib.h>
#include <string.h>

#include "cancel.h"
#include "classes/cpoly.h"
#include "class_expand.h"
#include "diag.h"
#include "hodge/hodge.h"
#include "hodge_lang.h"
#include "strbuf.h"
#include "util.h"
#include "verify_account.h"

int hodge_lang_name(interp *I, const node *n, value **out)
{
    const char *t = n->text;
    size_t skip = strncmp(t, "lambda_", 7) == 0 ? 7 : strncmp(t, "ch_", 3) == 0 ? 3 : 0;
    if (skip == 0 || t[skip] == '\0' || strspn(t + skip, "0123456789") != strlen(t + skip))
        return 0;
    *out = NULL;
    while (t[skip] == '0' && t[skip + 1] != '\0')   /* leading zeros: lambda_01 is lambda_1 */
        skip++;
    if (strlen(t + skip) > 6 || atol(t + skip) > HODGE_MAX_INDEX) {
        diag_error(&n->loc, "%s: Hodge class indices go up to %d", t, HODGE_MAX_INDEX);
        return 1;
    }
    slong j = atol(t + skip);
    cx *c = t[0] == 'l' ? cx_lambda(j, I->ring.ctx, n) : cx_ch(j, I->ring.ctx, n);
    *out = value_new_class(c, &I->ring);
    return 1;
}

int hodge_lang_subscript(interp *I, scope *s, const node *n, value **out)
{
    int is_lambda = strcmp(n->text, "lambda") == 0;
    slong j;
    if (!is_lambda && strcmp(n->text, "ch") != 0)
        return 0;
    *out = NULL;
    if (n->list->len != 1) {
        diag_error(&n->loc, "%s_{j} takes one index", n->text);
        return 1;
    }
    const node *idx = n->list->items[0];
    if (!eval_slong(I, s, idx, is_lambda ? "lambda index" : "ch index", 0, &j))
        return 1;
    if (j > HODGE_MAX_INDEX) {
        diag_error(&idx->loc, "%s index %ld: Hodge class indices go up to %d", n->text, (long)j, HODGE_MAX_INDEX);
        return 1;
    }
    cx *c = is_lambda ? cx_lambda(j, I->ring.ctx, n) : cx_ch(j, I->ring.ctx, n);
    *out = value_new_class(c, &I->ring);
    return 1;
}

int hodge_lang_applies(const value *integrand)
{
    return integrand->kind == V_CLASS && cx_has_hodge(integrand->cls);
}

void hodge_lang_clear(interp *I)
{
    hodge_free(I->hodge);
    I->hodge = NULL;
}

/* The engine context, created on first use with the correlator table and the limits. */
hodge_ctx *hodge_lang_ctx(interp *I)
{
    if (I->hodge == NULL) {
        I->hodge = hodge_new(I->wk);
        if (I->hodge == NULL)
            return NULL;
        hodge_set_cancel(I->hodge, &cancel_flag);
        hodge_set_limit(I->hodge, I->lim.max_table > 1e15 ? (slong)1e15 : (slong)I->lim.max_table);
    }
    return I->hodge;
}

/* Expands the integrand with the Hodge slots, reporting errors at the responsible node. */
static int hodge_lang_expand(cpoly *P, const node *where, const value *integrand)
{
    return class_expand_reported(P, where, integrand->cls);
}

/* What the term callbacks share. */
typedef struct {
    interp *I;
    hodge_ctx *H;
    slong g;
    fmpq_mpoly_struct *res;
    double estimate;        /* largest state estimate over the terms */
    int mismatch;           /* --verify found a difference */
    double checked;         /* --verify: terms the second route reached */
    double unchecked;       /* --verify: terms out of the second route's reach */
    const char *why;        /* the reason of the last unchecked term */
} hodge_run;

#define HODGE_WHY_GRR_LIMIT "Mumford's formula reached the memo limit of --max-table"
#define HODGE_WHY_FP_TABLE "the Faber-Pandharipande operator's estimate is above --max-table"
#define HODGE_WHY_FP_LIMIT "the Faber-Pandharipande operator reached the memo limit of --max-table"

/* Total degree of the lambda and ch factors of a term. */
static slong hodge_lang_degree(const slong *lmult, slong lmax, const slong *cmult, slong cmax)
{
    slong s = 0;
    for (slong j = 1; j <= lmax; j++)
        s += j * lmult[j];
    for (slong k = 1; k <= cmax; k++)
        s += k * cmult[k];
    return s;
}

/* The memo states the operator route would need for a term (hodge_estimate_states). */
static double hodge_lang_term_states(slong g, slong n, const slong *kmult, slong kmax, const slong *lmult, slong lmax,
                                     const slong *cmult, slong cmax)
{
    slong kdeg = 0;
    for (slong j = 1; j <= kmax; j++)
        kdeg += kmult[j];
    return hodge_estimate_states(g, n + kdeg, hodge_lang_degree(lmult, lmax, cmult, cmax));
}

/* Terms with a closed form (hodge_closed.c) need no memo and are left out of the estimate. */
static int hodge_lang_estimate_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                                    const slong *lmult, slong lmax, const slong *cmult, slong cmax,
                                    const fmpq_mpoly_t coeff)
{
    hodge_run *R = data;
    (void)coeff;
    if (R->g == 0 && hodge_lang_degree(lmult, lmax, cmult, cmax) > 0)
        return 0;               /* E = 0 in genus 0: no work */
    if (hodge_closed_kind(R->g, psi, n, kmult, kmax, lmult, lmax, cmult, cmax) != HODGE_CLOSED_NONE)
        return 0;
    double e = hodge_lang_term_states(R->g, n, kmult, kmax, lmult, lmax, cmult, cmax);
    if (e > R->estimate)
        R->estimate = e;
    return 0;
}

/* With --verify, w = the term by the route that did not give v: the operator after a closed form
   (when its estimate is within --max-table), Mumford's formula after the operator; compares and
   counts.  Returns WK_OK or WK_CANCELLED. */
static int hodge_lang_second(hodge_run *R, const fmpq_t v, int closed, const slong *psi, slong n, const slong *kmult,
                             slong kmax, const slong *lmult, slong lmax, const slong *cmult, slong cmax)
{
    int route = closed ? HODGE_ROUTE_FP : HODGE_ROUTE_GRR, st = WK_LIMIT;
    const char *why = closed ? HODGE_WHY_FP_LIMIT : HODGE_WHY_GRR_LIMIT;
    fmpq_t w;
    fmpq_init(w);
    if (closed && hodge_lang_term_states(R->g, n, kmult, kmax, lmult, lmax, cmult, cmax) > R->I->lim.max_table)
        why = HODGE_WHY_FP_TABLE;
    else
        st = hodge_integral_lambda(w, R->H, route, R->g, psi, n, kmult, kmax, lmult, lmax, cmult, cmax, 0);
    if (st == WK_OK) {
        R->checked++;
        R->mismatch |= !fmpq_equal(v, w);
    } else if (st != WK_CANCELLED) {
        R->unchecked++;
        R->why = why;
        st = WK_OK;
    }
    fmpq_clear(w);
    return st;
}

/* One term by its closed form, else by the operator route; with --verify also by a second route
   (hodge_lang_second).  Adds coeff times the value to the result. */
static int hodge_lang_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                           const slong *lmult, slong lmax, const slong *cmult, slong cmax,
                           const fmpq_mpoly_t coeff)
{
    hodge_run *R = data;
    fmpq_t v;
    fmpq_mpoly_t t;
    if (R->g == 0 && hodge_lang_degree(lmult, lmax, cmult, cmax) > 0)
        return WK_OK;           /* E = 0 in genus 0 */
    fmpq_init(v);
    int closed = hodge_closed_kind(R->g, psi, n, kmult, kmax, lmult, lmax, cmult, cmax) != HODGE_CLOSED_NONE;
    int st = closed ? hodge_closed_integral(v, R->g, psi, n, kmult, kmax, lmult, lmax, cmult, cmax)
                    : hodge_integral_lambda(v, R->H, HODGE_ROUTE_FP, R->g, psi, n, kmult, kmax, lmult, lmax, cmult,
                                            cmax, 0);
    if (st == WK_OK && R->I->verify)
        st = hodge_lang_second(R, v, closed, psi, n, kmult, kmax, lmult, lmax, cmult, cmax);
    if (st == WK_OK) {
        fmpq_mpoly_init(t, R->I->ring.ctx);
        fmpq_mpoly_scalar_mul_fmpq(t, coeff, v, R->I->ring.ctx);
        fmpq_mpoly_add(R->res, R->res, t, R->I->ring.ctx);
        fmpq_mpoly_clear(t, R->I->ring.ctx);
    }
    fmpq_clear(v);
    return st;
}

/* Reports an engine status other than WK_OK at where. */
void hodge_lang_report(interp *I, const node *where, int st)
{
    if (st == WK_CANCELLED || cancel_flag)
        eval_cancelled(where);
    else if (st == WK_LIMIT)
        diag_error(&where->loc, "the Hodge integral reached the memo limit of %.3g states (raise it with "
                                "--max-table N)", I->lim.max_table);
    else
        diag_error(&where->loc, "the Hodge engine rejected this request (code %d)", st);
}

/* Expands and refuses by estimate; returns 1 when P is ready to integrate. */
int hodge_lang_prepare(interp *I, const node *where, cpoly *P, const value *integrand)
{
    hodge_run R = {I, NULL, P->g, NULL, 0, 0, 0, 0, NULL};
    if (!hodge_lang_expand(P, where, integrand))
        return 0;
    cpoly_foreach_top_hodge(P, hodge_lang_estimate_term, &R);
    if (R.estimate <= I->lim.max_table)
        return 1;
    char amount[48];
    if (R.estimate > 1e18)
        snprintf(amount, sizeof amount, "more than 1e18");
    else
        snprintf(amount, sizeof amount, "about %.3g", R.estimate);
    diag_error(&where->loc, "this Hodge integral on Mbar_{%ld,%ld} needs %s memo states, above the limit of "
                            "%.3g (raise it with --max-table N)",
               (long)P->g, (long)P->n, amount, I->lim.max_table);
    return 0;
}

/* The --verify account of one integral: its terms, and the value (checked when every term was).
   Takes ownership of r; returns it, or NULL when --verify=strict refused an unchecked value. */
static value *hodge_lang_account(interp *I, const node *where, const hodge_run *R, value *r)
{
    if (!I->verify)
        return r;
    verify_checked(I, VERIFY_MONOMIAL, R->checked);
    if (R->unchecked > 0) {
        verify_unchecked(I, NULL, VERIFY_MONOMIAL, R->unchecked, R->why);
        return verify_unchecked_value(I, where, r, VERIFY_WHY_MONOMIALS);
    }
    verify_checked(I, VERIFY_VALUE, 1);
    return r;
}

/* The first lambda_j with j > g in e, or in genus 0 the first lambda_j or ch_k of positive index
   (E = 0): a class that is zero on the space.  Walks along a, recursing on b, depth-limited. */
static const cx *hodge_lang_zero_class(const cx *e, slong g, int depth)
{
    if (depth > 4000 || util_stack_exhausted())
        return NULL;
    for (; e; e = e->a) {
        if ((e->kind == CX_LAMBDA && e->index > g) || (g == 0 && e->kind == CX_CH && e->index > 0))
            return e;
        const cx *f = e->b ? hodge_lang_zero_class(e->b, g, depth + 1) : NULL;
        if (f != NULL)
            return f;
    }
    return NULL;
}

/* A warning when an integral came out 0 and its integrand holds a class that is zero on the space
   (lambda_j above the rank, or a Hodge class in genus 0): the likely slip is the index or the genus. */
static void hodge_lang_warn_zero(interp *I, const node *where, slong g, slong n, const value *integrand,
                                 const value *r)
{
    const cx *z = fmpq_mpoly_is_zero(r->num, I->ring.ctx) ? hodge_lang_zero_class(integrand->cls, g, 0) : NULL;
    if (z == NULL)
        return;
    const node *at = z->origin != NULL ? z->origin : where;
    const char *name = z->kind == CX_LAMBDA ? "lambda" : "ch";
    if (g == 0)
        diag_warning(&at->loc, "%s_%ld is the zero class on Mbar_{0,%ld} (the Hodge bundle is 0 in genus 0): the "
                               "integral is 0", name, (long)z->index, (long)n);
    else
        diag_warning(&at->loc, "lambda_%ld is the zero class on Mbar_{%ld,%ld} (the Hodge bundle has rank %ld): the "
                               "integral is 0", (long)z->index, (long)g, (long)n, (long)g);
}

value *hodge_lang_integrate(interp *I, const node *where, slong g, slong n, const value *integrand)
{
    cpoly P;
    value *r = NULL;
    cpoly_init_hodge(&P, g, n, I->lim.max_class_terms, I->ring.ctx);
    if (hodge_lang_prepare(I, where, &P, integrand)) {
        hodge_run R = {I, hodge_lang_ctx(I), g, NULL, 0, 0, 0, 0, NULL};
        r = value_new_num(&I->ring);
        R.res = r->num;
        int st = R.H ? cpoly_foreach_top_hodge(&P, hodge_lang_term, &R) : WK_LIMIT;
        if (st != WK_OK || R.mismatch) {
            if (R.mismatch)
                diag_error(&where->loc, "verification failed: the two routes for Hodge integrals (closed form or "
                                        "Faber-Pandharipande operator, and the operator or Mumford's formula) "
                                        "disagree (please report this input)");
            else
                hodge_lang_report(I, where, st);
            value_release(r);
            r = NULL;
        } else {
            hodge_lang_warn_zero(I, where, g, n, integrand, r);
            r = hodge_lang_account(I, where, &R, r);
        }
    }
    cpoly_clear(&P);
    return r;
}
