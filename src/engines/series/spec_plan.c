/* spec_plan.c - planning the specialisation of F_g: valuations, pruning table, enumeration of
 * the contributing multisets, counting and printing (see spec.h and spec_internal.h).
 */
#include <limits.h>
#include <stdlib.h>
#include "series/spec_internal.h"
#include "util.h"

static int spec_walk_node(spec_walk *w, slong i, slong D, slong B, slong depth);
static int spec_walk_m1(spec_walk *w, slong D, slong B, slong depth);

/* Least budget needed to fill dimension D with the parts part[i..] (SPEC_INF if impossible).
   Reads the table built by spec_plan_minc. */
static slong spec_minc(const spec_plan *P, slong i, slong D)
{
    return P->minc[i * (P->dmax + 1) + D];
}

/* Appends m copies of tau_k to the current multiset and charges their valuation.
   The d array has room for every multiset of the plan. */
static void spec_walk_push(spec_walk *w, slong k, slong m)
{
    slong j;
    for (j = 0; j < m; j++)
        w->d[w->n++] = k;
    w->used += m * (k < w->P->nval && w->P->val[k] > 0 ? w->P->val[k] : 0);
}

/* Removes the last m entries (all equal to k) pushed by spec_walk_push.
   Exact inverse of the push. */
static void spec_walk_pop(spec_walk *w, slong k, slong m)
{
    w->n -= m;
    w->used -= m * (k < w->P->nval && w->P->val[k] > 0 ? w->P->val[k] : 0);
}

/* Visits the leaf if the multiset is stable (2g-2+n > 0).
   Returns the leaf callback's status. */
static int spec_walk_leaf(spec_walk *w, slong depth)
{
    if (2 * w->P->g - 2 + w->n <= 0)
        return SPEC_OK;
    return w->leaf(w, depth);
}

/* Takes m >= 1 copies of part j at a node, then recurses on the remaining dimension and budget,
   surrounded by the enter / leave callbacks.  Returns the first error of the subtree. */
static int spec_walk_take(spec_walk *w, slong j, slong m, slong D, slong B, slong depth)
{
    slong k = w->P->part[j];
    int st;
    spec_walk_push(w, k, m);
    st = w->enter(w, depth, k, m);
    if (st == SPEC_OK)
        st = spec_walk_node(w, j + 1, D, B, depth + 1);
    if (st == SPEC_OK)
        st = w->leave(w, depth, k, m);
    spec_walk_pop(w, k, m);
    return st;
}

/* Takes m copies of tau_k (k = 0 or 1; nothing for m = 0) and walks the parts for dimension D
   and budget B, or the m_1 level when k = 0.  Returns the first error of the subtree. */
static int spec_walk_low(spec_walk *w, slong k, slong m, slong D, slong B, slong depth)
{
    int st = SPEC_OK;
    slong d1 = depth + (m > 0);
    if (k == 1)
        w->m1 = m;
    spec_walk_push(w, k, m);
    if (m > 0)
        st = w->enter(w, depth, k, m);
    if (st == SPEC_OK)
        st = k == 0 ? spec_walk_m1(w, D, B, d1) : spec_walk_node(w, 0, D, B, d1);
    if (st == SPEC_OK && m > 0)
        st = w->leave(w, depth, k, m);
    spec_walk_pop(w, k, m);
    return st;
}

/* Node (i, D, B): a leaf when D = 0, else every feasible (part j >= i, multiplicity m >= 1).
   Only children whose rest is fillable within budget are entered. */
static int spec_walk_node(spec_walk *w, slong i, slong D, slong B, slong depth)
{
    const spec_plan *P = w->P;
    slong j, m, k, v;
    int st;
    if (D == 0)
        return spec_walk_leaf(w, depth);
    if (util_stack_exhausted())   /* depth is below sqrt(2D) here; reached only from deep user code */
        return SPEC_TOO_BIG;
    for (j = i; j < P->nparts; j++) {
        k = P->part[j];
        v = P->val[k];
        for (m = 1; m * (k - 1) <= D && m * v <= B; m++) {
            if (spec_minc(P, j + 1, D - m * (k - 1)) > B - m * v)
                continue;
            st = spec_walk_take(w, j, m, D - m * (k - 1), B - m * v, depth);
            if (st != SPEC_OK)
                return st;
        }
    }
    return SPEC_OK;
}

/* Chooses m_1 (bounded by the budget B) for a fixed m_0, then walks the parts.
   depth counts the distinct factors taken so far. */
static int spec_walk_m1(spec_walk *w, slong D, slong B, slong depth)
{
    const spec_plan *P = w->P;
    slong m1, v1 = P->val[1];
    int st = SPEC_OK;
    for (m1 = 0; m1 <= P->m1max && m1 * v1 <= B && st == SPEC_OK; m1++)
        if (spec_minc(P, 0, D) <= B - m1 * v1)
            st = spec_walk_low(w, 1, m1, D, B - m1 * v1, depth);
    return st;
}

/* Enumerates every multiset of the plan (m_0 outermost).
   Returns SPEC_OK or the first callback error. */
int spec_walk_run(const spec_plan *P, spec_step_fn enter, spec_step_fn leave, spec_leaf_fn leaf,
                  void *data)
{
    spec_walk w;
    slong m0, D;
    int st = SPEC_OK;
    w.P = P, w.enter = enter, w.leave = leave, w.leaf = leaf, w.data = data;
    w.n = 0, w.used = 0, w.m1 = 0;
    w.d = xmalloc((size_t) (P->m0max + P->m1max + FLINT_MAX(P->dmax, 0) + 1) * sizeof(slong));
    for (m0 = 0; m0 <= P->m0max && st == SPEC_OK; m0++) {
        D = P->dim0 + m0;
        if (D < 0)
            continue;
        w.m0 = m0;
        st = spec_walk_low(&w, 0, m0, D, P->order - m0 * FLINT_MAX(P->val[0], 0), 0);
    }
    free(w.d);
    return st;
}

/* Builds minc[i][D] = least sum of valuations filling D with parts part[i..] (unbounded
   knapsack from the last part backwards; SPEC_INF when impossible). */
static void spec_plan_minc(spec_plan *P)
{
    slong i, D, c, v, W = P->dmax + 1, best;
    P->minc = xmalloc((size_t) ((P->nparts + 1) * W) * sizeof(slong));
    for (D = 0; D < W; D++)
        P->minc[P->nparts * W + D] = D == 0 ? 0 : SPEC_INF;
    for (i = P->nparts - 1; i >= 0; i--) {
        c = P->part[i] - 1;
        v = P->val[P->part[i]];
        for (D = 0; D < W; D++) {
            best = P->minc[(i + 1) * W + D];
            if (D >= c && P->minc[i * W + D - c] != SPEC_INF)
                best = FLINT_MIN(best, P->minc[i * W + D - c] + v);
            P->minc[i * W + D] = best;
        }
    }
}

/* The valuation of the internal t_k: the caller's t_{k - shift}; below the shift (the
   Witten-Kontsevich t_0 of a Theta plan, which has no dimension-raising time) identically zero. */
static slong spec_plan_valuation(const spec_plan *P, spec_valuation_fn valuation, void *data, slong k)
{
    return k < P->shift ? -1 : valuation(data, k - P->shift);
}

/* Queries v_0 and v_1 and derives the bounds m0max, m1max, dmax.
   Returns SPEC_OK, SPEC_T0_CONSTANT, SPEC_T1_CONSTANT or the callback's error. */
static int spec_plan_query_low(spec_plan *P, spec_valuation_fn valuation, void *data, slong *v)
{
    slong k;
    for (k = 0; k < 2; k++) {
        v[k] = spec_plan_valuation(P, valuation, data, k);
        if (v[k] < -1)
            return v[k] < INT_MIN ? INT_MIN : (int) v[k];
        if (v[k] == 0)   /* internal t_1 is the caller's t_0 in a Theta plan */
            return k == 0 || P->theta ? SPEC_T0_CONSTANT : SPEC_T1_CONSTANT;
    }
    P->m0max = v[0] >= 1 ? P->order / v[0] : 0;
    P->m1max = v[1] >= 1 ? P->order / v[1] : 0;
    P->dmax = P->dim0 + P->m0max;
    return SPEC_OK;
}

/* Queries all valuations (k <= dmax+1) and lists the active parts (k >= 2, 0 <= v_k <= N) in
   descending order.  Returns SPEC_OK or the callback's error. */
static int spec_plan_query(spec_plan *P, spec_valuation_fn valuation, void *data)
{
    slong v[2], k;
    int st = spec_plan_query_low(P, valuation, data, v);
    if (st != SPEC_OK)
        return st;
    P->nval = FLINT_MAX(2, P->dmax + 2);
    P->val = xmalloc((size_t) P->nval * sizeof(slong));
    P->part = xmalloc((size_t) P->nval * sizeof(slong));
    P->val[0] = v[0], P->val[1] = v[1];
    for (k = 2; k < P->nval; k++) {
        P->val[k] = spec_plan_valuation(P, valuation, data, k);
        if (P->val[k] < -1)
            return P->val[k] < INT_MIN ? INT_MIN : (int) P->val[k];
    }
    for (k = P->nval - 1; k >= 2; k--)
        if (P->val[k] >= 0 && P->val[k] <= P->order)
            P->part[P->nparts++] = k;
    return SPEC_OK;
}

typedef struct {
    spec_plan *P;
    double limit;
} spec_counter;

/* Counting visitor, enter: records that t_k is used.
   Never fails. */
static int spec_count_enter(spec_walk *w, slong depth, slong k, slong m)
{
    spec_counter *c = w->data;
    (void) depth, (void) m;
    c->P->used[k] = 1;
    c->P->max_k = FLINT_MAX(c->P->max_k, k);
    return SPEC_OK;
}

/* Counting visitor, leave: nothing to do.
   Never fails. */
static int spec_count_leave(spec_walk *w, slong depth, slong k, slong m)
{
    (void) w, (void) depth, (void) k, (void) m;
    return SPEC_OK;
}

/* Counting visitor, leaf: counts the multiset by m_0 and lowest x-order.
   SPEC_TOO_BIG as soon as the count exceeds the limit. */
static int spec_count_leaf(spec_walk *w, slong depth)
{
    spec_counter *c = w->data;
    (void) depth;
    if (++c->P->terms > c->limit)
        return SPEC_TOO_BIG;
    c->P->by_m0[c->P->theta ? w->m1 : w->m0] += 1.0;
    c->P->by_xord[w->used] += 1.0;
    c->P->max_points = FLINT_MAX(c->P->max_points, w->n);
    return SPEC_OK;
}

/* Builds the pruning table and counts the multisets (at most max_terms).
   Returns SPEC_OK or SPEC_TOO_BIG. */
static int spec_plan_count(spec_plan *P, double max_terms)
{
    spec_counter c;
    if (P->dmax < 0)
        return SPEC_OK;
    if ((double) (P->nparts + 1) * (double) (P->dmax + 1) > (double) SPEC_MAX_TABLE)
        return SPEC_TOO_BIG;
    spec_plan_minc(P);
    c.P = P;
    c.limit = max_terms;
    return spec_walk_run(P, spec_count_enter, spec_count_leave, spec_count_leaf, &c);
}

/* Allocates an empty plan for genus g and order N, of the Witten-Kontsevich free energy or (theta)
   of the Brezin-Gross-Witten one.  Never fails (out of memory exits through xmalloc). */
static spec_plan *spec_plan_new(slong g, slong order, int theta)
{
    spec_plan *P = xcalloc(1, sizeof(spec_plan));
    P->g = g;
    P->order = order;
    P->max_k = -1;
    P->theta = theta;
    P->shift = theta ? 1 : 0;
    P->dim0 = theta ? g - 1 : 3 * g - 3;
    return P;
}

/* Plans F_g (theta = 0) or F^Theta_g (theta = 1) to x-order N.
   *P is NULL on error. */
static int spec_plan_build_kind(spec_plan **P, slong g, slong order, spec_valuation_fn valuation, void *data,
                                double max_terms, int theta)
{
    spec_plan *Q;
    int st;
    if (P == NULL)
        return SPEC_BADARG;
    *P = NULL;
    if (g < 0 || g > SPEC_MAX_GENUS || order < 0 || order > SPEC_MAX_ORDER || valuation == NULL
        || !(max_terms > 0))
        return SPEC_BADARG;
    Q = spec_plan_new(g, order, theta);
    st = spec_plan_query(Q, valuation, data);
    if (st == SPEC_OK) {
        Q->by_m0 = xcalloc((size_t) ((theta ? Q->m1max : Q->m0max) + 1), sizeof(double));
        Q->by_xord = xcalloc((size_t) (order + 1), sizeof(double));
        Q->used = xcalloc((size_t) Q->nval, 1);
        st = spec_plan_count(Q, max_terms);
    }
    if (st != SPEC_OK) {
        spec_plan_free(Q);
        return st;
    }
    *P = Q;
    return SPEC_OK;
}

/* Plans F_g to x-order N (see spec.h).
   *P is NULL on error. */
int spec_plan_build(spec_plan **P, slong g, slong order, spec_valuation_fn valuation, void *data,
                    double max_terms)
{
    return spec_plan_build_kind(P, g, order, valuation, data, max_terms, 0);
}

/* Plans F^Theta_g to x-order N (see spec.h).
   *P is NULL on error. */
int spec_plan_build_theta(spec_plan **P, slong g, slong order, spec_valuation_fn valuation, void *data,
                          double max_terms)
{
    return spec_plan_build_kind(P, g, order, valuation, data, max_terms, 1);
}

/* Whether the plan is of the Brezin-Gross-Witten free energy.
   0 for NULL. */
int spec_plan_is_theta(const spec_plan *P)
{
    return P != NULL && P->theta;
}

/* Largest number of points of a planned correlator.
   0 for NULL. */
slong spec_plan_max_points(const spec_plan *P)
{
    return P == NULL ? 0 : P->max_points;
}

/* Largest used k in the caller's indices, -1 when there is no multiset.
   -1 for NULL. */
slong spec_plan_max_k(const spec_plan *P)
{
    return P == NULL || P->max_k < 0 ? -1 : P->max_k - P->shift;
}

/* Number of planned multisets.
   0 for NULL. */
double spec_plan_terms(const spec_plan *P)
{
    return P == NULL ? 0.0 : P->terms;
}

/* Prints the needed times with their valuations.
   Part of spec_plan_print. */
static void spec_plan_print_times(FILE *out, const spec_plan *P)
{
    slong k;
    fprintf(out, "  needed times (k: valuation in x):");
    for (k = 0; k <= P->max_k; k++)
        if (P->used[k])
            fprintf(out, " t_%ld:%ld", (long) (k - P->shift), (long) P->val[k]);
    fprintf(out, P->max_k < 0 ? " none\n" : "\n");
}

/* Prints the nonzero entries of a count array as "label=i: count".
   Part of spec_plan_print. */
static void spec_plan_print_counts(FILE *out, const char *title, const char *label,
                                   const double *cnt, slong len)
{
    slong i;
    fprintf(out, "  %s:", title);
    for (i = 0; i < len; i++)
        if (cnt[i] > 0)
            fprintf(out, " %s%ld: %.0f", label, (long) i, cnt[i]);
    fprintf(out, "\n");
}

/* Human-readable summary of the plan.
   Prints "(no plan)" for NULL. */
void spec_plan_print(FILE *out, const spec_plan *P)
{
    if (P == NULL) {
        fprintf(out, "(no plan)\n");
        return;
    }
    fprintf(out, "plan for %s_%ld to x^%ld: %.0f correlator%s, largest with %ld point%s\n",
            P->theta ? "FTheta" : "F", (long) P->g, (long) P->order, P->terms, P->terms == 1 ? "" : "s",
            (long) P->max_points, P->max_points == 1 ? "" : "s");
    spec_plan_print_times(out, P);
    spec_plan_print_counts(out, "correlators by m_0", "m_0=", P->by_m0, (P->theta ? P->m1max : P->m0max) + 1);
    spec_plan_print_counts(out, "correlators by lowest x-order", "x^", P->by_xord, P->order + 1);
    if (P->theta)
        return;
    double entries = wk_estimate_entries(P->g, P->max_points);
    fprintf(out, "  memo estimate: at most %.3g correlator entr%s\n", entries, entries == 1 ? "y" : "ies");
}

/* Releases every array of the plan and the plan.
   Accepts NULL. */
void spec_plan_free(spec_plan *P)
{
    if (P == NULL)
        return;
    free(P->val);
    free(P->part);
    free(P->minc);
    free(P->used);
    free(P->by_m0);
    free(P->by_xord);
    free(P);
}
