/* builtins_strata.c - stratumint(g, n, B, C): int_{Mbar_{g,n}} [B] * C for a boundary class B and
 * a class expression C in psi and kappa (or a number).  B is either
 *   k                       the k-th graph of stablegraphs_{g,n} (1-based): its stratum class
 *                           (1/|Aut|) xi_*(1), or
 *   [D_1, ..., D_m]         the product of boundary divisors, each "irr" (delta_irr) or
 *                           [h, [legs]] (delta_{h,S}, S the legs on the genus-h side),
 *   [k, D_1, ..., D_m]      the stratum of the k-th graph times those divisors,
 *   [k1, k2]                the product of two strata, by the generic-graph rule (sgprod.c),
 * with the conventions of docs/conventions.md ("Boundary strata").  Products of divisors are
 * pulled back one at a time with the excess term (src/strata/sgint.h).
 */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>
#include <flint/fmpq_vec.h>

#include "builtins.h"
#include "class_expand.h"
#include "classes/cpoly.h"
#include "diag.h"
#include "strata/mccount.h"
#include "strata/sgint.h"
#include "strata_lang.h"
#include "util.h"
#include "verify_account.h"

static value *bst_fail(const node *at, char *msg)
{
    diag_error(&at->loc, "%s", msg);
    free(msg);
    return NULL;
}

/* Reads one divisor ("irr" or [h, [legs]]) of Mbar_{g,n}; 0 after an error at `at`. */
static int bst_divisor(interp *I, const node *at, const value *v, slong g, slong n, sg_divisor *D)
{
    memset(D, 0, sizeof *D);
    if (v->kind == V_STR && strcmp(v->str, "irr") == 0) {
        D->irr = 1;
        if (g >= 1)
            return 1;
        bst_fail(at, xasprintf("Mbar_{0,%ld} has no divisor delta_irr (it needs genus >= 1)", (long) n));
        return 0;
    }
    slong h;
    if (v->kind != V_LIST || v->len != 2 || v->items[1]->kind != V_LIST || v->items[0]->kind != V_NUM
        || !scalar_get_slong(&h, v->items[0]->num, &I->ring)) {
        bst_fail(at, xasprintf("a boundary divisor is \"irr\" or [h, [legs]], e.g. [1, [1, 2]] for delta_{1,{1,2}}"));
        return 0;
    }
    const value *S = v->items[1];
    int ns = 0;
    D->h = (int) h;
    for (slong i = 0; i < S->len; i++) {
        slong leg;
        if (S->items[i]->kind != V_NUM || !scalar_get_slong(&leg, S->items[i]->num, &I->ring) || leg < 1 || leg > n
            || (D->S >> (leg - 1) & 1)) {
            bst_fail(at, xasprintf("the legs of a divisor of Mbar_{%ld,%ld} are distinct integers in 1..%ld", (long) g,
                                   (long) n, (long) n));
            return 0;
        }
        D->S |= 1UL << (leg - 1);
        ns++;
    }
    if (h < 0 || h > g || 2 * h - 1 + ns <= 0 || 2 * (g - h) - 1 + (n - ns) <= 0) {
        bst_fail(at, xasprintf("delta_{%ld,S} with %d legs on the genus-%ld side does not exist on Mbar_{%ld,%ld} "
                               "(both sides must be stable)", (long) h, ns, (long) h, (long) g, (long) n));
        return 0;
    }
    return 1;
}

/* L = the stratum of the k-th graph (value v) of Mbar_{g,n}, *codim its edges; 0 after an error. */
static int bst_graph(interp *I, const node *at, const value *v, slong g, slong n, sg_terms *L, slong *codim,
                     sgraph *out)
{
    slong k;
    sg_list all;
    if (v->kind != V_NUM || !scalar_get_slong(&k, v->num, &I->ring) || k < 1) {
        bst_fail(at, xasprintf("expected a graph number k >= 1 (the k-th of stablegraphs_{g,n}) or a list of divisors"));
        return 0;
    }
    if (!strata_lang_graphs(I, at, (int) g, (int) n, -1, &all))
        return 0;
    if (k > all.len) {
        bst_fail(at, xasprintf("Mbar_{%ld,%ld} has %ld stable graphs, not %ld", (long) g, (long) n, (long) all.len,
                               (long) k));
        sg_list_clear(&all);
        return 0;
    }
    *codim = all.gr[k - 1].ne;
    if (out != NULL)
        *out = all.gr[k - 1];
    int rc = L != NULL ? sg_terms_push_stratum(L, &all.gr[k - 1]) : SG_OK;
    sg_list_clear(&all);
    return rc == SG_OK;
}

/* L = [A] . [B] for B = [k1, k2], two graph numbers: by the generic-graph rule, or (second
   route) by the pull-back of a divisor when one of the two has one edge, else the rule with the
   factors exchanged. */
static int bst_two_graphs(interp *I, const node *at, value *B, slong g, slong n, sg_terms *L, slong *codim,
                          int second)
{
    sgraph A, C;
    slong ca, cb;
    if (!bst_graph(I, at, B->items[0], g, n, NULL, &ca, &A) || !bst_graph(I, at, B->items[1], g, n, NULL, &cb, &C))
        return 0;
    *codim = ca + cb;
    int rc;
    if (second && (A.ne == 1 || C.ne == 1)) {
        const sgraph *D = A.ne == 1 ? &A : &C, *other = A.ne == 1 ? &C : &A;
        sg_divisor d = {D->nv == 1, D->gv[0], 0};
        for (int i = 0; i < D->n && D->nv == 2; i++)
            if (D->legv[i] == 0)
                d.S |= 1UL << i;
        sg_terms O;
        sg_terms_init(&O);
        rc = sg_terms_push_stratum(&O, other);
        if (rc == SG_OK)
            rc = sg_terms_times_divisor(L, &O, &d, 0);
        sg_terms_clear(&O);
    } else
        rc = second ? sg_terms_product_graphs(L, &C, &A, 0) : sg_terms_product_graphs(L, &A, &C, 0);
    if (rc != SG_OK)
        bst_fail(at, xasprintf("this product of strata is beyond the stable-graph engine's limits"));
    return rc == SG_OK;
}

/* L = the class B (argument 2) on Mbar_{g,n}, *codim its degree; 0 after an error.  B is a graph
   number, or a list of divisors optionally led by a graph number; `reverse` multiplies the
   divisors in the reverse order (the graph, when given, stays first). */
static int bst_boundary(interp *I, const node *call, value *B, slong g, slong n, sg_terms *L, slong *codim,
                        int reverse)
{
    const node *at = call->list->items[2];
    if (B->kind == V_NUM)
        return bst_graph(I, at, B, g, n, L, codim, NULL);
    if (B->kind != V_LIST || B->len == 0) {
        bst_fail(at, xasprintf("expected a graph number or a nonempty list of boundary divisors"));
        return 0;
    }
    slong first = 0;
    *codim = 0;
    if (B->len == 2 && B->items[0]->kind == V_NUM && B->items[1]->kind == V_NUM)
        return bst_two_graphs(I, at, B, g, n, L, codim, reverse);
    if (B->items[0]->kind == V_NUM) {
        if (!bst_graph(I, at, B->items[0], g, n, L, codim, NULL))
            return 0;
        first = 1;
    }
    *codim += B->len - first;
    for (slong j = first; j < B->len; j++) {
        slong i = reverse ? B->len - 1 - (j - first) : j;
        sg_divisor D;
        sgraph G;
        if (!bst_divisor(I, at, B->items[i], g, n, &D))
            return 0;
        int rc;
        if (j == 0) {
            sg_divisor_graph(&G, (int) g, (int) n, &D);
            rc = sg_terms_push_stratum(L, &G);
        } else {
            sg_terms P;
            sg_terms_init(&P);
            rc = sg_terms_times_divisor(&P, L, &D, 0);
            sg_terms_clear(L);
            *L = P;
        }
        if (rc != SG_OK) {
            bst_fail(at, xasprintf("this product of divisors is beyond the stable-graph engine's limits"));
            return 0;
        }
    }
    return 1;
}

typedef struct {
    interp *I;
    const sg_terms *L;
    fmpq_mpoly_struct *acc;
    int rc;
    int shift;                 /* vertex integrals by the time shift (second route) */
} bst_run;

static int bst_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax, const fmpq_mpoly_t coeff)
{
    bst_run *R = data;
    fmpq_t x;
    fmpq_mpoly_t t;
    (void) n;
    if (kmax > SG_KMAX)
        return R->rc = SG_LIMIT;
    fmpq_init(x);
    fmpq_mpoly_init(t, R->I->ring.ctx);
    R->rc = R->shift ? sg_terms_integral_shift(x, R->I->wk, R->L, psi, kmult, (int) kmax)
                     : sg_terms_integral(x, R->I->wk, R->L, psi, kmult, (int) kmax);
    fmpq_mpoly_scalar_mul_fmpq(t, coeff, x, R->I->ring.ctx);
    fmpq_mpoly_add(R->acc, R->acc, t, R->I->ring.ctx);
    fmpq_clear(x);
    fmpq_mpoly_clear(t, R->I->ring.ctx);
    return R->rc;
}

/* int [B] C with the divisors of B multiplied in the given order (reverse: last first) and the
   vertex integrals by the pushforward or (second) the time shift; NULL after an error. */
static value *bst_compute(interp *I, const node *call, value **args, slong g, slong n, int second)
{
    slong codim = 0;
    sg_terms L;
    sg_terms_init(&L);
    value *r = NULL;
    if (bst_boundary(I, call, args[2], g, n, &L, &codim, second)) {
        r = value_new_num(&I->ring);
        slong dim = 3 * g - 3 + n;
        if (codim <= dim) {
            cpoly P;
            cx *c = value_to_class(args[3]);
            cpoly_init_degree(&P, g, n, dim - codim, I->lim.max_class_terms, I->ring.ctx);
            bst_run R = {I, &L, r->num, SG_OK, second};
            if (!class_expand_reported(&P, call->list->items[3], c) || cpoly_foreach_top(&P, bst_term, &R) != 0) {
                if (R.rc != SG_OK)
                    diag_error(&call->loc, "the vertex integrals of this stratum are beyond the engine's limits");
                value_release(r);
                r = NULL;
            }
            cx_release(c);
            cpoly_clear(&P);
        }
    }
    sg_terms_clear(&L);
    return r;
}

/* --verify: the divisors pulled back in the reverse order (other vertex degenerations and
   excess terms at every step) and every vertex integral by the time shift instead of the
   pushforward, compared. */
static value *bst_verify(interp *I, const node *call, value **args, slong g, slong n, value *r)
{
    verify_second_begin(I);
    value *s = bst_compute(I, call, args, g, n, 1);
    verify_second_end(I);
    if (s == NULL) {
        value_release(r);
        return NULL;
    }
    int same = fmpq_mpoly_equal(r->num, s->num, I->ring.ctx);
    value_release(s);
    if (!same) {
        value_release(r);
        diag_error(&call->loc, "verification failed: the second route (divisors in the reverse order, vertex "
                               "integrals by the time shift) differs (please report this input)");
        return NULL;
    }
    verify_checked(I, VERIFY_VALUE, 1);
    return r;
}

static value *bst_stratumint(interp *I, const node *call, value **args)
{
    slong g, n;
    if (!builtin_get_slong(I, call, args, 0, 0, 1000, &g) || !builtin_get_slong(I, call, args, 1, 0, SG_MAX_N, &n))
        return NULL;
    if (2 * g - 2 + n <= 0 || 3 * g - 3 + n > SG_MAX_E || 2 * g - 2 + n > SG_MAX_V)
        return bst_fail(call, xasprintf(2 * g - 2 + n <= 0 ? "Mbar_{%ld,%ld} is not stable (2g-2+n must be positive)"
                                                           : "Mbar_{%ld,%ld} is too large for the stable-graph engine",
                                        (long) g, (long) n));
    if (args[3]->kind != V_CLASS && args[3]->kind != V_NUM)
        return bst_fail(call->list->items[3], xasprintf("expected a class expression in psi and kappa, got a %s",
                                                        value_kind_name(args[3])));
    value *r = bst_compute(I, call, args, g, n, 0);
    if (r != NULL && I->verify)
        r = bst_verify(I, call, args, g, n, r);
    return r;
}

/* multicurvepoly(g, n, k, x): P_Gamma(x) of mccount.h for the k-th graph of stablegraphs_{g,n}. */
static value *bst_multicurvepoly(interp *I, const node *call, value **args)
{
    slong g, n, k, var;
    sg_list all;
    if (!builtin_get_slong(I, call, args, 0, 0, 1000, &g) || !builtin_get_slong(I, call, args, 1, 0, SG_MAX_N, &n)
        || !builtin_get_slong(I, call, args, 2, 1, WORD_MAX, &k) || (var = builtin_get_var(I, call, args, 3)) < 0)
        return NULL;
    if (2 * g - 2 + n <= 0 || 3 * g - 3 + n > SG_MAX_E || 2 * g - 2 + n > SG_MAX_V)
        return bst_fail(call, xasprintf("Mbar_{%ld,%ld} is not stable or too large for the stable-graph engine",
                                        (long) g, (long) n));
    if (!strata_lang_graphs(I, call->list->items[2], (int) g, (int) n, -1, &all))
        return NULL;
    if (k > all.len || all.gr[k - 1].ne == 0) {
        value *r = bst_fail(call->list->items[2], k > all.len
            ? xasprintf("Mbar_{%ld,%ld} has %ld stable graphs, not %ld", (long) g, (long) n, (long) all.len, (long) k)
            : xasprintf("graph %ld of Mbar_{%ld,%ld} has no edge: it is not the dual graph of a multicurve", (long) k,
                        (long) g, (long) n));
        sg_list_clear(&all);
        return r;
    }
    slong dim = 3 * g - 3 + n;
    fmpq *coef = _fmpq_vec_init(dim + 1);
    value *r = NULL;
    if (mc_count_poly(coef, &all.gr[k - 1], I->wk) != SG_OK)
        diag_error(&call->loc, "the vertex integrals of this multicurve are beyond the engine's limits");
    else {
        fmpq_mpoly_t x, p, t;
        fmpq_mpoly_init(x, I->ring.ctx);
        fmpq_mpoly_init(p, I->ring.ctx);
        fmpq_mpoly_init(t, I->ring.ctx);
        scalar_set_gen(x, &I->ring, (int) var);
        scalar_set_gen(p, &I->ring, SCALAR_PI);
        r = value_new_num(&I->ring);
        for (slong j = 0; j <= dim; j++) {
            fmpq_mpoly_t u;
            fmpq_mpoly_init(u, I->ring.ctx);
            fmpq_mpoly_pow_ui(t, x, (ulong) (2 * dim - 2 * j), I->ring.ctx);
            fmpq_mpoly_pow_ui(u, p, (ulong) (2 * j), I->ring.ctx);
            fmpq_mpoly_mul(t, t, u, I->ring.ctx);
            fmpq_mpoly_scalar_mul_fmpq(t, t, coef + j, I->ring.ctx);
            fmpq_mpoly_add(r->num, r->num, t, I->ring.ctx);
            fmpq_mpoly_clear(u, I->ring.ctx);
        }
        fmpq_mpoly_clear(x, I->ring.ctx);
        fmpq_mpoly_clear(p, I->ring.ctx);
        fmpq_mpoly_clear(t, I->ring.ctx);
    }
    _fmpq_vec_clear(coef, dim + 1);
    sg_list_clear(&all);
    if (r != NULL && I->verify)
        r = verify_unchecked_value(I, call, r, "no second route for counting polynomials (their leading "
                                               "coefficients are checked against the volumes in the unit tests)");
    return r;
}

const builtin builtins_strata[] = {
    {"stratumint", 4, bst_stratumint,
     "stratumint(g, n, B, C): int_{Mbar_{g,n}} [B] C, B a graph number or a list of divisors \"irr\" / [h, [legs]]"},
    {"multicurvepoly", 4, bst_multicurvepoly,
     "multicurvepoly(g, n, k, x): the integrated counting polynomial of the multicurve with the k-th graph of stablegraphs_{g,n}"},
    {NULL, 0, NULL, NULL},
};
