/* The router of int_{g,n}: describes the integrand once, answers what needs no route (a tree
   too large to walk, no term of the dimension, a result in the store), asks every route that
   applies for an estimate, runs the cheapest and, under --verify, runs its check and compares.
   Adding a route is a file with its `route` and one line in router_table. */
#include <stdlib.h>

#include "cancel.h"
#include "class_expand.h"
#include "classes/cxsize.h"
#include "diag.h"
#include "eval.h"
#include "hodge_lang.h"
#include "integrand_check.h"
#include "integrate.h"
#include "results.h"
#include "route.h"
#include "theta_lang.h"
#include "verify_account.h"

/* Every route that may answer an integral, in the order of preference among equal estimates.
   The time shift and Mumford's formula are not here: they only check other routes. */
static const route *const router_table[] = {
    &route_volume_engine,
    &route_reduction,
    &route_hodge_operator,
    &route_theta,
    &route_strata,
};
#define ROUTER_ROUTES ((slong)(sizeof router_table / sizeof router_table[0]))

/* Nodes of an integrand unfolded into a tree beyond which it is refused: a class built by
   repeated squaring (c = c*c) is a small graph standing for a tree of 2^k nodes, which no
   walker could visit. */
#define ROUTER_MAX_TREE 1e8

int integrate_tree_ok(const node *where, const value *integrand)
{
    if (integrand->kind != V_CLASS || cx_tree_size(integrand->cls, ROUTER_MAX_TREE) < ROUTER_MAX_TREE)
        return 1;
    diag_error(&where->loc, "this class expression shares its parts so often that written out it has more than "
                            "%.0e nodes (it was built by repeated squaring or the like); expand it in smaller steps",
               ROUTER_MAX_TREE);
    return 0;
}

/* The route to run: the cheapest of those that apply and are within the limits. When every
   one refuses, the refusal of the first is reported and NULL returned. */
static const route *router_choose(integral *q)
{
    const route *best = NULL, *first = NULL;
    route_cost best_cost, first_cost;
    for (slong i = 0; i < ROUTER_ROUTES; i++) {
        const route *r = router_table[i];
        if (!r->applies(q))
            continue;
        route_cost c = {0.0, NULL, ""};
        r->estimate(q, &c);
        if (q->expanded == -1)
            return NULL;             /* the expansion failed and said why */
        if (!first) {
            first = r;
            first_cost = c;
        }
        if (!c.refusal && (!best || c.seconds < best_cost.seconds)) {
            best = r;
            best_cost = c;
        }
    }
    if (!best && first)
        diag_error(&q->where->loc, "%s", first_cost.msg);
    return best;
}

/* Compares the value of the first route with its check's. Takes both references; returns
   first, or NULL after reporting a disagreement. */
static value *router_compare(integral *q, const route *r, value *first, value *second, const route_check *chk)
{
    interp *I = q->I;
    int same = fmpq_mpoly_equal(first->num, second->num, I->ring.ctx);
    value_release(second);
    if (!same) {
        diag_error(&q->where->loc, "verification failed: %s and %s disagree (please report this input)", r->name,
                   r->checked_by->name);
        value_release(first);
        return NULL;
    }
    if (chk->unchecked > 0)
        return verify_unchecked_value(I, q->where, first, VERIFY_WHY_MONOMIALS);
    verify_checked(I, VERIFY_VALUE, 1);
    return first;
}

/* --verify: the value of route r recomputed by its check and compared. Takes ownership of
   first; returns it, or NULL after reporting. */
static value *router_verify(integral *q, const route *r, value *first)
{
    interp *I = q->I;
    const route *check = r->checked_by;
    if (!check)
        return verify_unchecked_value(I, q->where, first, VERIFY_WHY_NO_SECOND_ROUTE);
    route_cost c = {0.0, NULL, ""};
    check->estimate(q, &c);
    if (c.refusal)
        return verify_unchecked_value(I, q->where, first, c.refusal);
    route_check chk = {0.0, 0.0, NULL};
    value *second = check->run(q, &chk);
    if (!second && (cancel_flag || !chk.out_of_reach)) {
        value_release(first);
        return NULL;           /* cancelled, or an error the check reported */
    }
    if (!second)
        return verify_unchecked_value(I, q->where, first, chk.out_of_reach);
    return router_compare(q, r, first, second, &chk);
}

/* Chooses, runs and (--verify) checks a route for q. */
static value *router_run(integral *q)
{
    const route *r = router_choose(q);
    value *v = r ? r->run(q, NULL) : NULL;
    if (v && q->I->verify)
        v = router_verify(q, r, v);
    return v;
}

/* The result of q from the store, or computed and then kept there. */
static value *router_run_stored(integral *q)
{
    interp *I = q->I;
    results_question rq;
    if (I->verify || q->integrand->kind != V_CLASS || !results_question_integral(I, q->g, q->n, q->integrand->cls, &rq))
        return router_run(q);
    value *r = value_new_num(&I->ring);
    if (!results_lookup(I, &rq, r->num)) {
        value_release(r);
        double t0 = results_clock();
        r = router_run(q);
        if (r)
            results_save(I, &rq, r->num, results_clock() - t0);
    }
    results_question_clear(&rq);
    return r;
}

/* A Theta integrand: its Theta-free part is an ordinary integral, its Theta-linear part goes to
   the Theta routes (Theta^2 = 0); an integral that is 0 for a reason of degree says so once. */
static value *router_theta(integral *q)
{
    interp *I = q->I;
    cx *free_part = NULL, *theta_part = NULL;
    int why = 0;
    if (!theta_split_integrand(I, q->where, q->g, q->integrand->cls, &free_part, &theta_part, &why))
        return NULL;
    if (!theta_part && !(why & THETA_ZERO_NOT))
        theta_warn_zero(I, q->where, q->g, q->n, why);
    value *a = free_part ? value_new_class(free_part, &I->ring) : NULL;
    value *b = theta_part ? value_new_class(theta_part, &I->ring) : NULL;
    value *ra = a ? integrate_value(I, q->where, q->g, q->n, a) : value_new_num(&I->ring);
    value *rb = NULL;
    if (ra && b) {
        integral t;
        integral_init(&t, I, q->where, q->g, q->n, b);
        t.theta_why = why;
        rb = router_run_stored(&t);
        integral_clear(&t);
    }
    if (ra && rb)
        fmpq_mpoly_add(ra->num, ra->num, rb->num, I->ring.ctx);
    if (ra && b && !rb) {
        value_release(ra);
        ra = NULL;
    }
    value_release(a);
    value_release(b);
    value_release(rb);
    return ra;
}

value *integrate_value(interp *I, const node *where, slong g, slong n, const value *integrand)
{
    if (!integrate_tree_ok(where, integrand))
        return NULL;
    if (theta_in_value(integrand) && !integrate_space_ok(I, where, g, n))
        return NULL;
    integral q;
    integral_init(&q, I, where, g, n, integrand);
    value *r = NULL;
    if (q.family == INTEGRAND_THETA) {
        r = router_theta(&q);
    } else if (integrand_is_zero(I, where, g, n, integrand)) {
        if (I->verify)
            verify_no_check_needed(I);
        r = value_new_num(&I->ring);
    } else if (integrate_space_ok(I, where, g, n)) {
        r = router_run_stored(&q);
    }
    integral_clear(&q);
    return r;
}
