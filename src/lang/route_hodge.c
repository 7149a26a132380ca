/* The Hodge routes of int_{g,n} (integrands with lambda_j or ch_k): closed forms where they apply
   (src/engines/hodge/hodge_closed.c) and the Faber-Pandharipande operator (hodge_fp.c) answer;
   the check takes each term by the other route: the operator after a closed form, Mumford's
   Grothendieck-Riemann-Roch formula (hodge_grr.c) after the operator. */
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
    (void)coeff;
    if (R->g == 0 && hdeg > 0)
        return 0;               /* E = 0 in genus 0: no work */
    if (hodge_closed_kind(R->g, psi, n, kmult, kmax, lmult, lmax, cmult, cmax) != HODGE_CLOSED_NONE)
        return 0;               /* a closed form (hodge_closed.c): no memo */
    for (slong j = 1; j <= kmax; j++)
        kdeg += kmult[j];
    double e = hodge_estimate_states(R->g, n + kdeg, hdeg);
    if (e > R->estimate)
        R->estimate = e;
    return 0;
}

#define HODGE_WHY_GRR_LIMIT "Mumford's formula reached the memo limit of --max-table"
#define HODGE_WHY_FP_TABLE "the Faber-Pandharipande operator's estimate is above --max-table"
#define HODGE_WHY_FP_LIMIT "the Faber-Pandharipande operator reached the memo limit of --max-table"

/* The memo states the operator would need for a term (hodge_estimate_states). */
static double hodge_route_states(slong g, slong n, const slong *kmult, slong kmax, slong hdeg)
{
    slong kdeg = 0;
    for (slong j = 1; j <= kmax; j++)
        kdeg += kmult[j];
    return hodge_estimate_states(g, n + kdeg, hdeg);
}

/* The check of one term: the operator when the answer came from a closed form (within
   --max-table), else Mumford's formula. WK_LIMIT (counted, with its reason) when out of reach. */
static int hodge_route_check_term(fmpq_t v, hodge_run *R, int closed, const slong *psi, slong n, const slong *kmult,
                                  slong kmax, const slong *lmult, slong lmax, const slong *cmult, slong cmax)
{
    const char *why = closed ? HODGE_WHY_FP_LIMIT : HODGE_WHY_GRR_LIMIT;
    int st = WK_LIMIT;
    if (closed && hodge_route_states(R->g, n, kmult, kmax, hodge_lang_degree(lmult, lmax, cmult, cmax))
                      > R->I->lim.max_table)
        why = HODGE_WHY_FP_TABLE;
    else
        st = hodge_integral_lambda(v, R->H, closed ? HODGE_ROUTE_FP : HODGE_ROUTE_GRR, R->g, psi, n, kmult, kmax,
                                   lmult, lmax, cmult, cmax, 0);
    if (st == WK_OK) {
        R->check->checked++;
        verify_checked(R->I, VERIFY_MONOMIAL, 1);
    } else if (st == WK_LIMIT) {
        R->check->unchecked++;
        verify_unchecked(R->I, NULL, VERIFY_MONOMIAL, 1, why);
    }
    return st;
}

/* One term: by its closed form, else by the operator; as the check, by the other route of
   hodge_route_check_term (out of its reach, the first route's value). Adds coeff times the value
   to the result. */
static int hodge_route_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                            const slong *lmult, slong lmax, const slong *cmult, slong cmax, const fmpq_mpoly_t coeff)
{
    hodge_run *R = data;
    if (R->g == 0 && hodge_lang_degree(lmult, lmax, cmult, cmax) > 0)
        return WK_OK;           /* E = 0 in genus 0 */
    int closed = hodge_closed_kind(R->g, psi, n, kmult, kmax, lmult, lmax, cmult, cmax) != HODGE_CLOSED_NONE;
    fmpq_t v;
    fmpq_init(v);
    int st = R->check ? hodge_route_check_term(v, R, closed, psi, n, kmult, kmax, lmult, lmax, cmult, cmax)
                      : WK_LIMIT;
    if (st == WK_LIMIT)
        st = closed ? hodge_closed_integral(v, R->g, psi, n, kmult, kmax, lmult, lmax, cmult, cmax)
                    : hodge_integral_lambda(v, R->H, HODGE_ROUTE_FP, R->g, psi, n, kmult, kmax, lmult, lmax, cmult,
                                            cmax, 0);
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
    if (st == WK_OK && !check)
        hodge_lang_warn_zero(I, q->where, q->g, q->n, q->integrand, r);
    if (st == WK_OK)
        return r;
    hodge_lang_report(I, q->where, st);
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
    "the second Hodge route (the operator after a closed form, Mumford's formula after the operator)",
    hodge_route_applies, hodge_route_estimate, hodge_route_mumford, NULL,
};
