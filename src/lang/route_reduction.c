/* The reference route of int_{g,n}: the class expanded into psi-kappa monomials, each reduced
   to Witten-Kontsevich correlators by the pushforward (src/engines/correlators/pushforward.c) and
   memoised for the session. Its check is the time shift (route_time_shift.c). */
#include <stdlib.h>
#include <string.h>

#include "cancel.h"
#include "correlators/pushforward.h"
#include "correlators/wk.h"
#include "diag.h"
#include "integrate.h"
#include "progress.h"
#include "route.h"
#include "route_reduction.h"
#include "util.h"
#include "verify_account.h"

typedef struct {
    interp *I;
    slong g;
    double terms;
    slong points;
    int table;     /* some monomial needs the correlator table (no closed form) */
} integrate_estimate;

/* Adds one monomial's reduction terms and points to the estimate; monomials with a closed form
   need neither, so they are not counted. */
static int integrate_estimate_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                                   const fmpq_mpoly_t coeff)
{
    (void)coeff;
    integrate_estimate *e = data;
    if (kmax == 0 ? wk_closed_form_kind(e->g, psi, n) != WK_CLOSED_NONE : pf_all_closed(e->g, psi, n, kmult, kmax))
        return 0;   /* answered by closed forms, without the table */
    e->table = 1;
    e->terms += pf_estimate_terms(kmult, kmax);
    slong pts = n;
    for (slong j = 1; j <= kmax; j++)
        pts += kmult[j];
    if (pts > e->points)
        e->points = pts;
    return 0;
}

const char *reduction_cost_refusal(interp *I, const cpoly *P, char *msg, size_t len, double *seconds)
{
    integrate_estimate e = {I, P->g, 0.0, P->n, 0};
    cpoly_foreach_top(P, integrate_estimate_term, &e);
    double entries = integrate_table_estimate(P->g, P->n, e.points, e.terms);
    double secs = pf_estimate_seconds(P->g, e.terms) + wk_estimate_seconds(entries);
    *seconds = e.table ? secs : 0.0;
    if (!e.table)
        return NULL;
    if (e.terms > I->lim.max_terms) {
        snprintf(msg, len, "this integral reduces to about %.3g correlator terms, above the limit of %.3g "
                 "(raise it with --max-terms N)", e.terms, I->lim.max_terms);
        return VERIFY_WHY_REDUCTION_TERMS;
    }
    if (entries > I->lim.max_table) {
        snprintf(msg, len, "correlators of genus %ld with %ld point%s need about %.3g table entries, above the "
                 "limit of %.3g (raise it with --max-table N)", (long)P->g, (long)e.points,
                 e.points == 1 ? "" : "s", entries, I->lim.max_table);
        return VERIFY_WHY_REDUCTION_TABLE;
    }
    if (secs > I->lim.max_seconds) {
        snprintf(msg, len, "the reduction of this integral (%.3g correlator terms in genus %ld) needs about "
                 "%.3g s, above the limit of %.3g s (raise it with --max-seconds S)", e.terms, (long)P->g,
                 secs, I->lim.max_seconds);
        return VERIFY_WHY_REDUCTION_TIME;
    }
    return NULL;
}

/* Memoised integral of one monomial; psi is sorted so that symmetric
   monomials share an entry. */
int reduction_monomial(fmpq_t res, void *data, slong g, const slong *psi, slong n, const slong *kmult,
                       slong kmax)
{
    reduction_run *run = data;
    interp *I = run->I;
    progress_update(&run->bar, ++run->done);
    if (cancel_flag)
        return INTEGRATE_CANCELLED;
    slong len = 2 + n + kmax;
    slong *key = xmalloc((len + 1) * sizeof(slong));
    key[0] = g;
    key[1] = n;
    memcpy(key + 2, psi, n * sizeof(slong));
    for (slong i = 2; i < 2 + n; i++)   /* insertion sort: n is small */
        for (slong j = i; j > 2 && key[j - 1] < key[j]; j--) {
            slong t = key[j];
            key[j] = key[j - 1];
            key[j - 1] = t;
        }
    memcpy(key + 2 + n, kmult + 1, kmax * sizeof(slong));
    const fmpq *hit = keymap_get(&I->integrals, key, len);
    int rc = WK_OK;
    if (hit) {
        fmpq_set(res, hit);
    } else {
        rc = pf_integral(res, I->wk, g, key + 2, n, kmult, kmax);
        if (rc == WK_OK)
            keymap_set(&I->integrals, key, len, res);
    }
    free(key);
    return rc;
}

/* The first route for one monomial: a closed form for psi-only monomials that have one (they were
   left out of the estimate), else the memoised reduction of reduction_monomial. */
int reduction_compute_first(fmpq_t res, void *data, slong g, const slong *psi, slong n, const slong *kmult,
                            slong kmax)
{
    reduction_run *run = data;
    if (kmax == 0 && wk_closed_form(res, g, psi, n) != WK_CLOSED_NONE) {
        progress_update(&run->bar, ++run->done);
        return cancel_flag ? INTEGRATE_CANCELLED : WK_OK;
    }
    return reduction_monomial(res, data, g, psi, n, kmult, kmax);
}


static int reduction_applies(integral *q)
{
    return q->family == INTEGRAND_PSI_KAPPA;
}

static void reduction_estimate(integral *q, route_cost *cost)
{
    const cpoly *P = integral_expansion(q);
    if (!P) {
        cost->refusal = VERIFY_WHY_REDUCTION_FAILED;
        return;
    }
    cost->refusal = reduction_cost_refusal(q->I, P, cost->msg, sizeof cost->msg, &cost->seconds);
}

/* Every monomial of the expansion by the reduction. As a check, a table that reached its limit
   (the estimate was too low) makes the value out of reach, not an error. */
static value *reduction_integrate(integral *q, route_check *check)
{
    interp *I = q->I;
    const cpoly *P = integral_expansion(q);
    if (!P)
        return NULL;
    value *r = value_new_num(&I->ring);
    reduction_run run;
    run.I = I;
    run.done = 0;
    char what[64];
    snprintf(what, sizeof what, "int_{%ld,%ld}: monomials", (long)q->g, (long)q->n);
    progress_start(&run.bar, what, (double)P->len);
    int rc = cpoly_integrate(r->num, P, reduction_compute_first, &run);
    progress_end(&run.bar);
    if (rc == WK_OK)
        return r;
    value_release(r);
    if (rc == WK_LIMIT && check && !cancel_flag)
        check->out_of_reach = VERIFY_WHY_REDUCTION_LIMIT;
    else
        integrate_report_engine(q->where, rc);
    return NULL;
}

const route route_reduction = {
    "the pushforward reduction", reduction_applies, reduction_estimate, reduction_integrate, &route_time_shift,
};
