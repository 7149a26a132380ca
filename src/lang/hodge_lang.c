/* The language's bridge to the Hodge engine: which integrands hold Hodge classes, the session's
   engine context, the report of its failures and the warning for a class that is zero on the
   space; the names are in hodge_names.c, the routes in route_hodge.c, explain in
   hodge_lang_explain.c. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cancel.h"
#include "classes/cpoly.h"
#include "class_expand.h"
#include "diag.h"
#include "hodge/hodge.h"
#include "hodge_lang.h"
#include "util.h"
#include "failure.h"

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


slong hodge_lang_degree(const slong *lmult, slong lmax, const slong *cmult, slong cmax)
{
    slong s = 0;
    for (slong j = 1; j <= lmax; j++)
        s += j * lmult[j];
    for (slong k = 1; k <= cmax; k++)
        s += k * cmult[k];
    return s;
}

void hodge_lang_report(interp *I, const node *where, int st)
{
    char limit[160];
    snprintf(limit, sizeof limit, "the Hodge integral reached the memo limit of %.3g states (raise it with "
             "--max-table N)", I->lim.max_table);
    const failure_words words[] = {{WK_LIMIT, limit}, {0, NULL}};
    failure_report(where, "the Hodge engine", st, WK_CANCELLED, words);
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
void hodge_lang_warn_zero(interp *I, const node *where, slong g, slong n, const value *integrand,
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
