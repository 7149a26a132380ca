/* The Hodge routes of int_{g,n} (integrands with lambda_j or ch_k): the Faber-Pandharipande
   operator (src/engines/hodge/hodge_fp.c) answers, Mumford's Grothendieck-Riemann-Roch formula
   (src/engines/hodge/hodge_grr.c) checks it term by term. */
#include <stdio.h>

#include "cancel.h"
#include "classes/cpoly.h"
#include "diag.h"
#include "eval.h"
#include "hodge/hodge.h"
#include "hodge_lang.h"
#include "route.h"
#include "verify_account.h"
#include "failure.h"

/* What the term callbacks share. */
typedef struct {
    interp *I;
    hodge_ctx *H;
    slong g;
    fmpq_mpoly_struct *res;
    double estimate;        /* largest state estimate over the terms */
    route_check *check;     /* NULL: the operator; else Mumford's formula, counting its reach */
} hodge_run;

static int hodge_route_estimate_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                                     const slong *lmult, slong lmax, const slong *cmult, slong cmax,
                                     const fmpq_mpoly_t coeff)
{
    hodge_run *R = data;
    slong kdeg = 0, hdeg = hodge_lang_degree(lmult, lmax, cmult, cmax);
    (void)psi, (void)coeff;
    if (R->g == 0 && hdeg > 0)
        return 0;               /* E = 0 in genus 0: no work */
    for (slong j = 1; j <= kmax; j++)
        kdeg += kmult[j];
    double e = hodge_estimate_states(R->g, n + kdeg, hdeg);
    if (e > R->estimate)
        R->estimate = e;
    return 0;
}

/* One term by the operator or, as the check, by Mumford's formula; a term out of the formula's
   reach (its memo limit) takes the operator's value and is counted as unchecked. Adds coeff
   times the value to the result. */
static int hodge_route_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                            const slong *lmult, slong lmax, const slong *cmult, slong cmax, const fmpq_mpoly_t coeff)
{
    hodge_run *R = data;
    if (R->g == 0 && hodge_lang_degree(lmult, lmax, cmult, cmax) > 0)
        return WK_OK;           /* E = 0 in genus 0 */
    fmpq_t v;
    fmpq_init(v);
    int st = WK_LIMIT;
    if (R->check) {
        st = hodge_integral_lambda(v, R->H, HODGE_ROUTE_GRR, R->g, psi, n, kmult, kmax, lmult, lmax, cmult, cmax, 0);
        if (st == WK_OK)
            R->check->checked++;
        else if (st == WK_LIMIT)
            R->check->unchecked++;
    }
    if (st == WK_LIMIT)
        st = hodge_integral_lambda(v, R->H, HODGE_ROUTE_FP, R->g, psi, n, kmult, kmax, lmult, lmax, cmult, cmax, 0);
    if (st == WK_OK) {
        fmpq_mpoly_t t;
        fmpq_mpoly_init(t, R->I->ring.ctx);
        fmpq_mpoly_scalar_mul_fmpq(t, coeff, v, R->I->ring.ctx);
        fmpq_mpoly_add(R->res, R->res, t, R->I->ring.ctx);
        fmpq_mpoly_clear(t, R->I->ring.ctx);
    }
    fmpq_clear(v);
    return st;
}

/* Reports an engine status other than WK_OK at where: a cancellation first, then the code. */
static void hodge_route_report(interp *I, const node *where, int st)
{
    char limit[160];
    snprintf(limit, sizeof limit, "the Hodge integral reached the memo limit of %.3g states (raise it with "
             "--max-table N)", I->lim.max_table);
    const failure_words words[] = {{WK_LIMIT, limit}, {0, NULL}};
    failure_report(where, "the Hodge engine", st, WK_CANCELLED, words);
}

static int hodge_route_applies(integral *q)
{
    return q->family == INTEGRAND_HODGE;
}

/* The largest memo the terms need against --max-table. The states are the figure the engine
   can predict; as the only route of its family, nothing compares it with seconds yet. */
static void hodge_route_estimate(integral *q, route_cost *cost)
{
    const cpoly *P = integral_expansion(q);
    if (!P) {
        cost->refusal = "the expansion of the Hodge integrand failed";
        return;
    }
    interp *I = q->I;
    hodge_run R = {I, NULL, P->g, NULL, 0, NULL};
    cpoly_foreach_top_hodge(P, hodge_route_estimate_term, &R);
    cost->seconds = R.estimate;
    if (R.estimate <= I->lim.max_table)
        return;
    char amount[48];
    if (R.estimate > 1e18)
        snprintf(amount, sizeof amount, "more than 1e18");
    else
        snprintf(amount, sizeof amount, "about %.3g", R.estimate);
    snprintf(cost->msg, sizeof cost->msg, "this Hodge integral on Mbar_{%ld,%ld} needs %s memo states, above the "
             "limit of %.3g (raise it with --max-table N)", (long)P->g, (long)P->n, amount, I->lim.max_table);
    cost->refusal = "the Hodge memo estimate is above --max-table";
}

/* The integral by the operator (check NULL) or by Mumford's formula (check not NULL). */
static value *hodge_route_run(integral *q, route_check *check)
{
    interp *I = q->I;
    const cpoly *P = integral_expansion(q);
    if (!P)
        return NULL;
    hodge_run R = {I, hodge_lang_ctx(I), P->g, NULL, 0, check};
    value *r = value_new_num(&I->ring);
    R.res = r->num;
    int st = R.H ? cpoly_foreach_top_hodge(P, hodge_route_term, &R) : WK_LIMIT;
    if (st == WK_OK)
        return r;
    hodge_route_report(I, q->where, st);
    value_release(r);
    return NULL;
}

static value *hodge_route_operator(integral *q, route_check *check)
{
    (void)check;   /* the operator has no limit below its estimate: as a check it runs in full */
    return hodge_route_run(q, NULL);
}

static value *hodge_route_mumford(integral *q, route_check *check)
{
    route_check own = {0.0, 0.0, NULL};
    return hodge_route_run(q, check ? check : &own);
}

const route route_hodge_operator = {
    "the Faber-Pandharipande operator", hodge_route_applies, hodge_route_estimate, hodge_route_operator,
    &route_hodge_mumford,
};

const route route_hodge_mumford = {
    "Mumford's formula", hodge_route_applies, hodge_route_estimate, hodge_route_mumford, NULL,
};
