/* The Theta routes of int_{g,n} (Theta-linear integrands; the router splits off the rest): each
   term Theta * R becomes <Theta | ...>_g numbers by the pushforward on the Virasoro table
   (src/engines/theta/theta_kappa.c); the check recomputes every monomial by the time shift on the KdV
   table (src/engines/theta/theta_shift.c). */
#include <stdio.h>

#include "classes/cpoly.h"
#include "correlators/pushforward.h"
#include "diag.h"
#include "route.h"
#include "theta_lang.h"
#include "verify_account.h"

/* Largest kappa degree whose time shift the check runs (p(40) = 37338 partitions, each with a
   polynomial product); larger monomials keep the pushforward's value, counted as unchecked. */
#define THETA_ROUTE_SHIFT_MAX 40

typedef struct {
    interp *I;
    fmpq_mpoly_struct *acc;      /* the integral so far */
    slong g;
    int rc;
    slong monomials;             /* monomials of degree g-1 visited */
    route_check *check;          /* NULL: the pushforward; else the time shift, counting its reach */
} theta_run;

/* v = int Theta psi^d kappa^kmult by the time shift; WK_LIMIT when out of its reach (counted). */
static int theta_route_shift(fmpq_t v, theta_run *R, const slong *psi, slong n, const slong *kmult, slong kmax)
{
    slong deg = 0;
    for (slong j = 1; j <= kmax; j++)
        deg += j * kmult[j];
    const char *why = "the Theta time shift runs up to kappa degree 40";
    int rc = WK_LIMIT;
    if (deg <= THETA_ROUTE_SHIFT_MAX) {
        theta_table *K = theta_lang_table(R->I, THETA_ROUTE_KDV);
        rc = K ? theta_kappa_shift(v, K, R->g, psi, n, kmult, kmax) : WK_LIMIT;
        why = "the Theta time shift's table reached its limit";
    }
    if (rc == WK_OK) {
        R->check->checked++;
        verify_checked(R->I, VERIFY_MONOMIAL, 1);
    } else if (rc == WK_LIMIT) {
        R->check->unchecked++;
        verify_unchecked(R->I, NULL, VERIFY_MONOMIAL, 1, why);
    }
    return rc;
}

/* One monomial c * psi^d kappa^kmult of R: acc += c * int Theta psi^d kappa^kmult, by the time
   shift when checking (out of its reach, and otherwise, by the pushforward). */
static int theta_run_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                          const fmpq_mpoly_t coeff)
{
    theta_run *R = data;
    interp *I = R->I;
    R->monomials++;
    fmpq_t v;
    fmpq_init(v);
    int rc = R->check ? theta_route_shift(v, R, psi, n, kmult, kmax) : WK_LIMIT;
    if (rc == WK_LIMIT) {
        theta_table *T = theta_lang_table(I, THETA_ROUTE_VIRASORO);
        slong maxt = I->lim.max_terms > 1e18 ? 0 : (slong)I->lim.max_terms;
        rc = T ? theta_kappa_pushforward(v, T, R->g, psi, n, kmult, kmax, maxt) : WK_LIMIT;
    }
    if (rc == WK_OK) {
        fmpq_mpoly_t t;
        fmpq_mpoly_init(t, I->ring.ctx);
        fmpq_mpoly_scalar_mul_fmpq(t, coeff, v, I->ring.ctx);
        fmpq_mpoly_add(R->acc, R->acc, t, I->ring.ctx);
        fmpq_mpoly_clear(t, I->ring.ctx);
    }
    fmpq_clear(v);
    R->rc = rc;
    return rc;
}

/* Adds the multiset partitions of one monomial's kappa factors (its number of Theta correlator
   terms, the count of src/engines/correlators/pushforward.c) to the double at data. */
static int theta_cost_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                           const fmpq_mpoly_t coeff)
{
    (void)psi;
    (void)n;
    (void)coeff;
    *(double *)data += kmax > 0 ? pf_estimate_terms(kmult, kmax) : 1.0;
    return 0;
}

/* Refuses, before any work, a term whose reduction has more than --max-terms terms. */
static int theta_cost_ok(interp *I, const node *where, const cpoly *P)
{
    double terms = 0.0;
    cpoly_foreach_top(P, theta_cost_term, &terms);
    if (terms <= I->lim.max_terms)
        return 1;
    diag_error(&where->loc, "this integral reduces to about %.3g Theta correlator terms, above the limit of %.3g "
                            "(raise it with --max-terms N)", terms, I->lim.max_terms);
    return 0;
}

/* What the term walk of one integral shares. */
typedef struct {
    integral *q;
    fmpq_mpoly_struct *acc;
    route_check *check;
    slong monomials;
} theta_walk;

/* acc += int_{Mbar_{g,n}} Theta * rest for one Theta-linear term (only the part of rest of
   degree g-1 counts). Returns 0 after reporting an error. */
static int theta_route_term(void *data, const cx *term, int order, cx *rest)
{
    theta_walk *W = data;
    integral *q = W->q;
    interp *I = q->I;
    if (order != TH_LINEAR) {          /* the router passes Theta-linear terms only */
        theta_report_bad(q->where, term, order);
        return 0;
    }
    cpoly P;
    cpoly_init_degree(&P, q->g, q->n, q->g - 1, I->lim.max_class_terms, I->ring.ctx);
    int ok = theta_expand_rest(&P, q->where, rest) && theta_cost_ok(I, q->where, &P);
    if (ok) {
        theta_run R = {I, W->acc, q->g, WK_OK, 0, W->check};
        cpoly_foreach_top(&P, theta_run_term, &R);
        W->monomials += R.monomials;
        ok = R.rc == WK_OK;
        if (!ok)
            theta_lang_report(I, q->where, R.rc);
    }
    cpoly_clear(&P);
    return ok;
}

static int theta_route_applies(integral *q)
{
    return q->family == INTEGRAND_THETA;
}

/* The Theta tables of genus g against the engine's reach and --max-table (the table's entries
   stand for the time: one route, nothing to compare them with yet). */
static void theta_route_estimate(integral *q, route_cost *cost)
{
    if (q->g == 0)
        return;                         /* Theta_{0,n} = 0 */
    cost->seconds = theta_estimate_entries(q->g);
    if (q->g > THETA_MAX_GENUS) {
        snprintf(cost->msg, sizeof cost->msg, "Theta integrals are computed up to genus %d, not %ld",
                 THETA_MAX_GENUS, (long)q->g);
        cost->refusal = "the genus is beyond the Theta engine";
    } else if (cost->seconds > q->I->lim.max_table) {
        snprintf(cost->msg, sizeof cost->msg, "Theta numbers of genus %ld need about %.3g table entries, above the "
                 "limit of %.3g (raise it with --max-table N)", (long)q->g, cost->seconds, q->I->lim.max_table);
        cost->refusal = "the Theta table estimate is above --max-table";
    }
}

/* Every Theta-linear term by the pushforward (check NULL) or by the time shift (check). */
static value *theta_route_walk(integral *q, route_check *check)
{
    value *r = value_new_num(&q->I->ring);
    theta_walk W = {q, r->num, check, 0};
    if (q->g > 0 && !theta_each_term(q->integrand->cls, theta_route_term, &W)) {
        value_release(r);
        return NULL;
    }
    int why = q->theta_why | (q->g == 0 ? THETA_ZERO_GENUS0 : W.monomials > 0 ? THETA_ZERO_NOT : THETA_ZERO_DEGREE);
    if (!(why & THETA_ZERO_NOT))
        theta_warn_zero(q->I, q->where, q->g, q->n, why);
    return r;
}

static value *theta_route_pushforward(integral *q, route_check *check)
{
    (void)check;   /* no limit below its estimate: as a check it runs in full */
    return theta_route_walk(q, NULL);
}

static value *theta_route_time_shift(integral *q, route_check *check)
{
    route_check own = {0.0, 0.0, NULL};
    return theta_route_walk(q, check ? check : &own);
}

const route route_theta = {
    "the Theta pushforward", theta_route_applies, theta_route_estimate, theta_route_pushforward,
    &route_theta_shift,
};

const route route_theta_shift = {
    "the Theta time shift", theta_route_applies, theta_route_estimate, theta_route_time_shift, NULL,
};
