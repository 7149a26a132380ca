/* The check of the reduction: every monomial again by a second, independent method, the
   Kaufmann-Manin-Zagier time shift for monomials with kappa classes and the KdV recursion for
   psi-only ones; a monomial out of their reach keeps the reduction's value and is counted. */
#include <stdlib.h>
#include <string.h>

#include "cancel.h"
#include "correlators/kappashift.h"
#include "correlators/pushforward.h"
#include "correlators/wk.h"
#include "diag.h"
#include "integrate.h"
#include "progress.h"
#include "route.h"
#include "route_reduction.h"
#include "verify_account.h"

/* Data of the second route of --verify: the progress of the first route's callback (its fallback)
   and how many monomials went by a second route or could not (their reasons go to the account). */
typedef struct {
    reduction_run run;
    double checked, unchecked;
} shift_check;

/* Whether the time shift for this kappa monomial is within --max-terms, --max-table and
   --max-seconds, estimated as for the first route: NULL if so, else the reason.  Its correlators
   have at most n plus the kappa degree points, and are the pushforward's (with other
   coefficients), so none needs the table when all of those have closed forms. */
static const char *shift_refusal(interp *I, slong g, const slong *psi, slong n, const slong *kmult, slong kmax)
{
    double work = ks_estimate_work(kmult, kmax);
    slong K = ks_kappa_degree(kmult, kmax);
    if (K < 0 || work > I->lim.max_terms)
        return VERIFY_WHY_SHIFT_TERMS;
    if (pf_all_closed(g, psi, n, kmult, kmax))
        return NULL;
    if (integrate_table_estimate(g, n, n + K, work) > I->lim.max_table)
        return VERIFY_WHY_SHIFT_TABLE;
    return pf_estimate_seconds(g, work) > I->lim.max_seconds ? VERIFY_WHY_SHIFT_TIME : NULL;
}

/* One monomial by its second route: the time shift when it holds kappa classes, the KdV recursion
   when it is psi only; out of reach (estimate or table limit), the first route's value. */
static int shift_monomial(fmpq_t res, void *data, slong g, const slong *psi, slong n, const slong *kmult,
                          slong kmax)
{
    shift_check *s = data;
    interp *I = s->run.I;
    if (cancel_flag)
        return INTEGRATE_CANCELLED;
    int rc = WK_LIMIT;
    const char *why = kmax > 0 ? shift_refusal(I, g, psi, n, kmult, kmax) : NULL;
    if (kmax > 0 && !why) {
        rc = ks_integral(res, I->wk, g, psi, n, kmult, kmax, &cancel_flag);
        why = VERIFY_WHY_SHIFT_LIMIT;
    } else if (kmax == 0) {
        rc = integrate_compute_kdv(I, res, g, psi, n, &why);
    }
    if (rc == WK_OK) {
        s->checked++;
        verify_checked(I, VERIFY_MONOMIAL, 1);
        progress_update(&s->run.bar, ++s->run.done);
        return WK_OK;
    }
    if (rc == WK_CANCELLED || cancel_flag)
        return INTEGRATE_CANCELLED;
    s->unchecked++;
    verify_unchecked(I, NULL, VERIFY_MONOMIAL, 1, why);
    return reduction_compute_first(res, &s->run, g, psi, n, kmult, kmax);
}

static int shift_applies(integral *q)
{
    return q->family == INTEGRAND_PSI_KAPPA;
}

/* Monomials beyond the time shift's limits keep the reduction's value (shift_monomial), so the
   route as a whole is never refused; the expansion must exist. */
static void shift_estimate(integral *q, route_cost *cost)
{
    if (!integral_expansion(q))
        cost->refusal = VERIFY_WHY_REDUCTION_FAILED;
}

static value *shift_integrate(integral *q, route_check *check)
{
    interp *I = q->I;
    const cpoly *P = integral_expansion(q);
    if (!P)
        return NULL;
    shift_check s;
    s.run.I = I;
    s.run.done = 0;
    s.checked = 0;
    s.unchecked = 0;
    char what[64];
    snprintf(what, sizeof what, "int_{%ld,%ld}: second route", (long)P->g, (long)P->n);
    progress_start(&s.run.bar, what, (double)P->len);
    value *r = value_new_num(&I->ring);
    int rc = cpoly_integrate(r->num, P, shift_monomial, &s);
    progress_end(&s.run.bar);
    if (check) {
        check->checked = s.checked;
        check->unchecked = s.unchecked;
    }
    if (rc == WK_OK)
        return r;
    integrate_report_engine(q->where, rc);
    value_release(r);
    return NULL;
}

const route route_time_shift = {
    "the second route (time shift for kappa classes, KdV recursion for psi classes)", shift_applies,
    shift_estimate, shift_integrate, NULL,
};
