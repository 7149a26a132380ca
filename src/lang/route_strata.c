/* The strata routes of int_{g,n} (integrands with boundary divisors, strata_class.h): the
   integrand is expanded into terms (product of divisors) x (psi-kappa class R); the product of
   the divisors is a sum of decorated strata by pulling back one divisor at a time with the
   excess term (src/engines/strata/sgint.c), and each stratum is integrated against R vertex by
   vertex.  The check multiplies the divisors of every term in the reverse order and integrates
   every vertex by the time shift instead of the pushforward. */
#include <stdio.h>
#include <stdlib.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>

#include "cancel.h"
#include "class_expand.h"
#include "classes/cpoly.h"
#include "diag.h"
#include "hodge_lang.h"
#include "print.h"
#include "route.h"
#include "source.h"
#include "strata_class.h"
#include "strbuf.h"
#include "theta_lang.h"

/* About 30 table entries' worth of memory per stable graph, as for stablegraphs_{g,n}. */
#define STRATA_ROUTE_TABLE_PER_GRAPH 30.0

typedef struct {
    integral *q;
    const sg_terms *L;
    fmpq_mpoly_struct *acc;
    int rc;
    int shift;
} strata_run;

static int strata_monomial(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                           const fmpq_mpoly_t coeff)
{
    strata_run *R = data;
    interp *I = R->q->I;
    (void)n;
    if (kmax > SG_KMAX)
        return R->rc = SG_LIMIT;
    fmpq_t x;
    fmpq_mpoly_t t;
    fmpq_init(x);
    fmpq_mpoly_init(t, I->ring.ctx);
    R->rc = R->shift ? sg_terms_integral_shift(x, I->wk, R->L, psi, kmult, (int)kmax)
                     : sg_terms_integral(x, I->wk, R->L, psi, kmult, (int)kmax);
    fmpq_mpoly_scalar_mul_fmpq(t, coeff, x, I->ring.ctx);
    fmpq_mpoly_add(R->acc, R->acc, t, I->ring.ctx);
    fmpq_clear(x);
    fmpq_mpoly_clear(t, I->ring.ctx);
    return R->rc;
}

static int strata_engine_error(integral *q, int rc)
{
    diag_error(&q->where->loc, rc == SG_CANCELLED ? "interrupted"
                               : rc == SG_NOMEM   ? "out of memory while multiplying boundary strata"
                                                  : "this product of boundary strata is beyond the stable-graph "
                                                    "engine's limits");
    return 0;
}

/* L = the strata of t (at most two: the whole space, one, or their product by the generic-graph
   rule, exchanged when reverse) as decorated strata; *used = the number of t's factors taken. */
static int strata_of_graphs(integral *q, const sc_term *t, sg_terms *L, int reverse, int *used)
{
    sgraph G[2];
    int ns = 0, rc;
    while (ns < t->nf && t->d[ns]->kind == CX_STRATUM)
        ns++;
    if (ns > 2) {
        diag_error(&q->where->loc, "a product of more than two strata stratum_{g,n,k} is not supported (a stratum "
                                   "times divisors is)");
        return 0;
    }
    for (int i = 0; i < ns; i++)
        if (!sc_stratum_graph(q->I, &G[i], q->where, q->g, q->n, t->d[i]))
            return 0;
    *used = ns;
    if (ns == 2)
        rc = reverse ? sg_terms_product_graphs(L, &G[1], &G[0], 0) : sg_terms_product_graphs(L, &G[0], &G[1], 0);
    else {
        if (ns == 0)
            sgraph_trivial(&G[0], (int)q->g, (int)q->n);
        rc = sg_terms_push_stratum(L, &G[0]);
    }
    return rc == SG_OK || strata_engine_error(q, rc);
}

/* L = the product of the factors of t as decorated strata: its strata, then its divisors one at
   a time in the sorted order or (reverse) the opposite one; 0 after reporting. */
static int strata_product(integral *q, const sc_term *t, sg_terms *L, int reverse)
{
    sg_divisor D[SC_MAX_FACTORS];
    int ns = 0, nd;
    if (!strata_of_graphs(q, t, L, reverse, &ns))
        return 0;
    nd = t->nf - ns;
    for (int i = 0; i < nd; i++)
        if (!sc_divisor_on(&D[reverse ? nd - 1 - i : i], q->where, q->g, q->n, t->d[ns + i]))
            return 0;
    int rc = SG_OK;
    for (int i = 0; rc == SG_OK && i < nd; i++) {
        sg_terms P;
        sg_terms_init(&P);
        rc = sg_terms_times_divisor(&P, L, &D[i], 0);
        sg_terms_clear(L);
        *L = P;
    }
    return rc == SG_OK || strata_engine_error(q, rc);
}

/* acc += int (divisors of t) * (t's rest); *nstrata (may be NULL) = the strata of the product. */
static int strata_term(integral *q, const sc_term *t, fmpq_mpoly_struct *acc, int second, slong *nstrata)
{
    interp *I = q->I;
    slong dim = 3 * q->g - 3 + q->n, codim = 0;
    for (int i = 0; i < t->nf; i++)
        codim += t->d[i]->kind == CX_STRATUM ? t->d[i]->index : 1;
    sg_terms L;
    sg_terms_init(&L);
    int ok = strata_product(q, t, &L, second);
    if (nstrata)
        *nstrata = L.len;
    if (ok && codim <= dim) {
        cpoly P;
        cpoly_init_degree(&P, q->g, q->n, dim - codim, I->lim.max_class_terms, I->ring.ctx);
        strata_run R = {q, &L, acc, SG_OK, second};
        ok = class_expand_reported(&P, q->where, t->rest);
        if (ok && cpoly_foreach_top(&P, strata_monomial, &R) != 0)
            ok = strata_engine_error(q, R.rc);
        cpoly_clear(&P);
    }
    sg_terms_clear(&L);
    return ok;
}

/* Refuses what the walk does not take (Theta, Hodge classes beside divisors); 1 when fine. */
static int strata_families_ok(integral *q)
{
    const value *v = q->integrand;
    if (!theta_in_value(v) && !hodge_lang_applies(v))
        return 1;
    diag_error(&q->where->loc, "boundary divisors are integrated with psi and kappa classes only, not with %s",
               theta_in_value(v) ? "Theta" : "the Hodge classes lambda_j and ch_k");
    return 0;
}

/* Every term by the pull-back product (second = 0) or by its check; NULL after reporting. */
static value *strata_walk(integral *q, int second)
{
    if (!strata_families_ok(q))
        return NULL;
    sc_terms T;
    sc_terms_init(&T);
    value *r = NULL;
    if (sc_expand_integrand(&T, q->where, q->integrand->cls, 3 * q->g - 3 + q->n)) {
        r = value_new_num(&q->I->ring);
        for (slong i = 0; r && i < T.len; i++)
            if ((cancel_flag && !strata_engine_error(q, SG_CANCELLED)) || !strata_term(q, &T.t[i], r->num, second, NULL)) {
                value_release(r);
                r = NULL;
            }
    }
    sc_terms_clear(&T);
    return r;
}

static int strata_route_applies(integral *q)
{
    return q->family == INTEGRAND_STRATA;
}

/* The engine's size limits and the estimated number of stable graphs against --max-table. */
static void strata_route_estimate(integral *q, route_cost *cost)
{
    slong g = q->g, n = q->n;
    if (n > SG_MAX_N || 3 * g - 3 + n > SG_MAX_E || 2 * g - 2 + n > SG_MAX_V) {
        snprintf(cost->msg, sizeof cost->msg, "Mbar_{%ld,%ld} is too large for the stable-graph engine (at most %d "
                 "legs, %d edges, %d vertices)", (long)g, (long)n, SG_MAX_N, SG_MAX_E, SG_MAX_V);
        cost->refusal = "the space is beyond the stable-graph engine";
        return;
    }
    double est = sg_estimate_count((int)g, (int)n), lim = q->I->lim.max_table / STRATA_ROUTE_TABLE_PER_GRAPH;
    cost->seconds = est * 1e-6;
    if (est > lim) {
        snprintf(cost->msg, sizeof cost->msg, "Mbar_{%ld,%ld} has about %.2g stable graphs (estimate), more than the "
                 "%.2g allowed (--max-table / %g); raise --max-table", (long)g, (long)n, est, lim,
                 STRATA_ROUTE_TABLE_PER_GRAPH);
        cost->refusal = "the stable-graph estimate is above --max-table";
    }
}

static value *strata_route_pullback(integral *q, route_check *check)
{
    (void)check;
    return strata_walk(q, 0);
}

static value *strata_route_reverse(integral *q, route_check *check)
{
    (void)check;   /* runs in full within the first route's estimate */
    return strata_walk(q, 1);
}

int strata_route_explain(integral *q)
{
    if (!strata_families_ok(q))
        return 0;
    interp *I = q->I;
    sc_terms T;
    sc_terms_init(&T);
    int ok = sc_expand_integrand(&T, q->where, q->integrand->cls, 3 * q->g - 3 + q->n);
    const char *line;
    const srcloc *at = &q->where->loc;
    size_t len = source_line(at->src, at->first_line, &line);
    if (at->last_line == at->first_line && (size_t)at->last_column <= len + 1)
        fprintf(I->out, "%.*s\n", at->last_column - at->first_column, line + at->first_column - 1);
    if (ok)
        fprintf(I->out, "  = %ld product%s of boundary divisors, each as decorated strata against a psi-kappa class:\n",
            (long)T.len, T.len == 1 ? "" : "s");
    for (slong i = 0; ok && i < T.len; i++) {
        value *v = value_new_num(&I->ring);
        slong nstrata = 0;
        ok = strata_term(q, &T.t[i], v->num, 0, &nstrata);
        strbuf b;
        strbuf_init(&b);
        for (int k = 0; k < T.t[i].nf; k++) {
            print_boundary(&b, T.t[i].d[k], 0);
            strbuf_putc(&b, k + 1 < T.t[i].nf ? '*' : ' ');
        }
        char *rest = print_class(T.t[i].rest, &I->ring), *val = ok ? scalar_get_str(v->num, &I->ring) : NULL;
        if (ok)
            fprintf(I->out, "    %s%s(%ld %s) times %s: %s\n", T.t[i].nf ? "" : "[no divisor] ", b.data,
                    (long)nstrata, nstrata == 1 ? "stratum" : "strata", rest, val);
        free(rest);
        free(val);
        strbuf_clear(&b);
        value_release(v);
    }
    sc_terms_clear(&T);
    return ok;
}

const route route_strata = {
    "the boundary pull-back product", strata_route_applies, strata_route_estimate, strata_route_pullback,
    &route_strata_reverse,
};

const route route_strata_reverse = {
    "the reverse-order product with time-shift vertices", strata_route_applies, strata_route_estimate,
    strata_route_reverse, NULL,
};
