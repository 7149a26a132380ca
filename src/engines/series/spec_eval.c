/* spec_eval.c - evaluation of a planned specialisation of F_g (see spec.h).
 *
 * The powers t_k^m/m! are computed once.  The plan's enumeration tree is summed bottom-up: a
 * leaf contributes its correlator <multiset>_g, and each edge "m copies of tau_k" multiplies the
 * sum of the subtree below it by t_k^m/m! (one multiplication and one addition per edge).  Sums
 * below constant factors stay constants, and a subtree below budget u is only kept to x-order
 * N - u, so the long series arithmetic happens near the root only.  When every used series is
 * rational the whole computation runs on fmpq_poly (one conversion in, one out); otherwise on
 * tseries with polynomial coefficients.
 */
#include <stdlib.h>
#include <flint/fmpq_poly.h>
#include "series/spec_internal.h"
#include "series/tseries_internal.h"
#include "util.h"

typedef struct {
    const spec_plan *P;
    const fmpq_mpoly_ctx_struct *ctx;
    spec_corr_fn corr;           /* the leaf correlators and their data */
    void *cdata;
    slong *dx;                   /* a leaf's indices in the caller's numbering */
    slong len;                   /* coefficients kept: order' + 1 */
    slong *mmax;                 /* highest power stored per k (-1: t_k unused) */
    fmpq_t cval;                 /* the current leaf's correlator */
    /* rational mode */
    fmpq_poly_struct **qpow;     /* qpow[k][m] = t_k^m/m! */
    fmpq_poly_struct *qacc;      /* sums of the subtrees by depth */
    fmpq_poly_t qtmp;
    /* generic mode */
    tseries **spow;
    tseries *sacc;
    tseries stmp;
} spec_eval;

/* Highest power of t_k any multiset of the plan can use (-1 when t_k is not used).
   From the dimension (k >= 2), the budget and the m_0 / m_1 bounds. */
static slong spec_eval_mmax(const spec_plan *P, slong k)
{
    slong v = P->val[k], m;
    if (!P->used[k])
        return -1;
    if (k == 0)
        return P->m0max;
    if (k == 1)
        return P->m1max;
    m = P->dmax / (k - 1);
    return v > 0 ? FLINT_MIN(m, P->order / v) : m;
}

/* Checks the series that the plan reads: valid, one main variable, valuation not below plan.
   Sets *var, *order (min of N and their orders) and *rational (all rational). */
static int spec_eval_check(const spec_plan *P, const tseries *t, const fmpq_mpoly_ctx_t ctx,
                           slong *var, slong *order, int *rational)
{
    slong k, v;
    int first = 1;
    *order = P->order;
    *rational = 1;
    for (k = 0; k <= P->max_k; k++) {
        if (!P->used[k])
            continue;
        const tseries *tk = t + (k - P->shift);   /* used internal k are >= shift */
        if (tseries_check(tk, ctx) != TS_OK)
            return SPEC_SERIES;
        if (!first && tk->var != *var)
            return SPEC_MISMATCH;
        *var = tk->var, first = 0;
        v = tseries_valuation(tk, ctx);
        if (v != -1 && v < P->val[k])
            return SPEC_MISMATCH;
        *order = FLINT_MIN(*order, tk->order);
        *rational = *rational && tseries_is_rational(tk, ctx);
    }
    return SPEC_OK;
}

/* Budget spent above the edge (depth, k, m): w->used without the m copies of tau_k.
   Used to truncate the subtree sums to the precision they are needed at. */
static slong spec_eval_used_above(const spec_walk *w, slong k, slong m)
{
    return w->used - m * FLINT_MAX(w->P->val[k], 0);
}

/* Rational mode, enter: the child's sum starts at 0.
   Never fails. */
static int spec_eval_qenter(spec_walk *w, slong depth, slong k, slong m)
{
    spec_eval *E = w->data;
    (void) k, (void) m;
    fmpq_poly_zero(E->qacc + depth + 1);
    return SPEC_OK;
}

/* Rational mode, leave: qacc[depth] += t_k^m/m! * qacc[depth+1], truncated to the precision
   order' - (budget above) the node needs.  Never fails. */
static int spec_eval_qleave(spec_walk *w, slong depth, slong k, slong m)
{
    spec_eval *E = w->data;
    slong len = E->len - spec_eval_used_above(w, k, m);
    if (len <= 0)
        return SPEC_OK;
    fmpq_poly_mullow(E->qtmp, E->qpow[k] + m, E->qacc + depth + 1, len);
    fmpq_poly_add(E->qacc + depth, E->qacc + depth, E->qtmp);
    return SPEC_OK;
}

/* E->cval = the correlator of the current leaf, in the caller's indices.
   SPEC_WK when the correlator engine fails. */
static int spec_eval_leaf_value(spec_eval *E, const spec_walk *w)
{
    slong i;
    for (i = 0; i < w->n; i++)
        E->dx[i] = w->d[i] - E->P->shift;
    return E->corr(E->cdata, E->cval, E->P->g, E->dx, w->n) != 0 ? SPEC_WK : SPEC_OK;
}

/* Rational mode, leaf: qacc[depth] += <d>_g.
   SPEC_WK when the correlator engine fails. */
static int spec_eval_qleaf(spec_walk *w, slong depth)
{
    spec_eval *E = w->data;
    if (spec_eval_leaf_value(E, w) != SPEC_OK)
        return SPEC_WK;
    fmpq_poly_set_fmpq(E->qtmp, E->cval);
    fmpq_poly_add(E->qacc + depth, E->qacc + depth, E->qtmp);
    return SPEC_OK;
}

/* Generic mode, enter: the child's sum starts at 0.
   Never fails. */
static int spec_eval_senter(spec_walk *w, slong depth, slong k, slong m)
{
    spec_eval *E = w->data;
    (void) k, (void) m;
    fmpq_mpoly_zero(E->sacc[depth + 1].p, E->ctx);
    return SPEC_OK;
}

/* Generic mode, leave: sacc[depth] += t_k^m/m! * sacc[depth+1].
   SPEC_SERIES if a series operation fails. */
static int spec_eval_sleave(spec_walk *w, slong depth, slong k, slong m)
{
    spec_eval *E = w->data;
    if (tseries_mul(&E->stmp, E->spow[k] + m, E->sacc + depth + 1, E->ctx) != TS_OK
        || tseries_add(E->sacc + depth, E->sacc + depth, &E->stmp, E->ctx) != TS_OK)
        return SPEC_SERIES;
    return SPEC_OK;
}

/* Generic mode, leaf: sacc[depth] += <d>_g.
   SPEC_WK when the correlator engine fails. */
static int spec_eval_sleaf(spec_walk *w, slong depth)
{
    spec_eval *E = w->data;
    if (spec_eval_leaf_value(E, w) != SPEC_OK)
        return SPEC_WK;
    fmpq_mpoly_add_fmpq(E->sacc[depth].p, E->sacc[depth].p, E->cval, E->ctx);
    return SPEC_OK;
}

/* Rational mode: qpow[k][0..mmax] from t_k truncated to len terms.
   t_k must be rational (checked). */
static void spec_eval_qpowers(spec_eval *E, const tseries *tk, slong k)
{
    slong m, mm = E->mmax[k];
    fmpq_poly_t t;
    fmpq_poly_init(t);
    tseries_get_fmpq_poly(t, tk, E->ctx);
    fmpq_poly_truncate(t, E->len);
    E->qpow[k] = xmalloc((size_t) (mm + 1) * sizeof(fmpq_poly_struct));
    for (m = 0; m <= mm; m++) {
        fmpq_poly_init(E->qpow[k] + m);
        if (m == 0)
            fmpq_poly_one(E->qpow[k]);
        else {
            fmpq_poly_mullow(E->qpow[k] + m, E->qpow[k] + m - 1, t, E->len);
            fmpq_poly_scalar_div_si(E->qpow[k] + m, E->qpow[k] + m, m);
        }
    }
    fmpq_poly_clear(t);
}

/* Generic mode: spow[k][0..mmax] from t_k truncated to the common order.
   Returns SPEC_OK or SPEC_SERIES. */
static int spec_eval_spowers(spec_eval *E, const tseries *tk, slong k)
{
    slong m, mm = E->mmax[k];
    fmpq_t inv;
    int st = TS_OK;
    fmpq_init(inv);
    E->spow[k] = xmalloc((size_t) (mm + 1) * sizeof(tseries));
    for (m = 0; m <= mm; m++) {
        tseries_init(E->spow[k] + m, tk->var, E->len - 1, E->ctx);
        if (m == 0)
            fmpq_mpoly_one(E->spow[k][0].p, E->ctx);
        else if (st == TS_OK) {
            st = tseries_mul(E->spow[k] + m, E->spow[k] + m - 1, tk, E->ctx);
            fmpq_set_si(inv, 1, m);
            if (st == TS_OK)
                st = tseries_scalar_mul_fmpq(E->spow[k] + m, E->spow[k] + m, inv, E->ctx);
        }
    }
    fmpq_clear(inv);
    return st == TS_OK ? SPEC_OK : SPEC_SERIES;
}

/* Allocates the evaluation state: power bounds per k, stacks (depth <= nparts + 2).
   rational selects the mode; powers are filled by the caller. */
static void spec_eval_init(spec_eval *E, const spec_plan *P, slong var, slong order, int rational,
                           const fmpq_mpoly_ctx_t ctx)
{
    slong k, depth = P->nparts + 3;
    E->P = P, E->ctx = ctx, E->len = order + 1;
    fmpq_init(E->cval);
    E->dx = xmalloc((size_t) (P->max_points + 1) * sizeof(slong));
    E->mmax = xmalloc((size_t) (P->max_k + 1) * sizeof(slong));
    for (k = 0; k <= P->max_k; k++)
        E->mmax[k] = spec_eval_mmax(P, k);
    E->qpow = rational ? xcalloc((size_t) (P->max_k + 1), sizeof(fmpq_poly_struct *)) : NULL;
    E->spow = rational ? NULL : xcalloc((size_t) (P->max_k + 1), sizeof(tseries *));
    E->qacc = rational ? xmalloc((size_t) depth * sizeof(fmpq_poly_struct)) : NULL;
    E->sacc = rational ? NULL : xmalloc((size_t) depth * sizeof(tseries));
    for (k = 0; k < depth; k++) {
        if (rational)
            fmpq_poly_init(E->qacc + k);
        else
            tseries_init(E->sacc + k, var, order, ctx);
    }
    fmpq_poly_init(E->qtmp);
    tseries_init(&E->stmp, var, order, ctx);
}

/* Releases the powers of one k in either mode.
   Accepts k whose powers were never allocated. */
static void spec_eval_clear_powers(spec_eval *E, slong k)
{
    slong m;
    for (m = 0; m <= E->mmax[k]; m++) {
        if (E->qpow != NULL && E->qpow[k] != NULL)
            fmpq_poly_clear(E->qpow[k] + m);
        if (E->spow != NULL && E->spow[k] != NULL)
            tseries_clear(E->spow[k] + m, E->ctx);
    }
    if (E->qpow != NULL)
        free(E->qpow[k]);
    if (E->spow != NULL)
        free(E->spow[k]);
}

/* Releases everything spec_eval_init and the power builders allocated.
   E is unusable afterwards. */
static void spec_eval_clear(spec_eval *E)
{
    slong k, depth = E->P->nparts + 3;
    for (k = 0; k <= E->P->max_k; k++)
        spec_eval_clear_powers(E, k);
    for (k = 0; k < depth; k++) {
        if (E->qacc != NULL)
            fmpq_poly_clear(E->qacc + k);
        if (E->sacc != NULL)
            tseries_clear(E->sacc + k, E->ctx);
    }
    free(E->qacc), free(E->sacc), free(E->qpow), free(E->spow), free(E->mmax);
    fmpq_poly_clear(E->qtmp);
    tseries_clear(&E->stmp, E->ctx);
    fmpq_clear(E->cval);
    free(E->dx);
}

/* Computes the powers, walks the plan and stores the sum in res (order len - 1).
   Returns SPEC_OK or the first error. */
static int spec_eval_run(tseries *res, spec_eval *E, const tseries *t, slong var, int rational)
{
    slong k;
    int st = SPEC_OK;
    for (k = 0; k <= E->P->max_k && st == SPEC_OK; k++)
        if (E->mmax[k] >= 0) {
            if (rational)
                spec_eval_qpowers(E, t + (k - E->P->shift), k);
            else
                st = spec_eval_spowers(E, t + (k - E->P->shift), k);
        }
    if (st == SPEC_OK && E->P->dmax >= 0)
        st = rational ? spec_walk_run(E->P, spec_eval_qenter, spec_eval_qleave, spec_eval_qleaf, E)
                      : spec_walk_run(E->P, spec_eval_senter, spec_eval_sleave, spec_eval_sleaf, E);
    if (st != SPEC_OK)
        return st;
    res->var = var;
    res->order = E->len - 1;
    if (rational)
        tseries_set_fmpq_poly(res, E->qacc, E->ctx);
    else
        tseries_set_mpoly(res, E->sacc[0].p, E->ctx);
    return SPEC_OK;
}

/* Evaluation with given correlators and a choice of path (allow_fast = 0 forces the generic one).
   Contract of spec_plan_evaluate_corr otherwise. */
int spec_plan_evaluate_corr_mode(tseries *res, const spec_plan *P, spec_corr_fn corr, void *cdata,
                                 const tseries *t, const fmpq_mpoly_ctx_t ctx, int allow_fast)
{
    spec_eval E;
    slong var, order;
    int rational, st;
    if (res == NULL)
        return SPEC_BADARG;
    var = res->var;
    if (P == NULL || corr == NULL || (t == NULL && P->max_k >= 0))
        st = SPEC_BADARG;
    else
        st = spec_eval_check(P, t, ctx, &var, &order, &rational);
    if (st == SPEC_OK) {
        E.corr = corr, E.cdata = cdata;
        spec_eval_init(&E, P, var, order, rational && allow_fast, ctx);
        st = spec_eval_run(res, &E, t, var, rational && allow_fast);
        spec_eval_clear(&E);
    }
    if (st != SPEC_OK)
        tseries_set_error(res, var, ctx);
    return st;
}

/* The Witten-Kontsevich correlator of a leaf from the caller's table.
   Returns the table's status. */
static int spec_eval_wk_corr(void *data, fmpq_t res, slong g, const slong *d, slong n)
{
    return wk_table_correlator(res, (wk_table *) data, g, d, n);
}

/* Evaluation of a Witten-Kontsevich plan with a choice of path.
   Contract of spec_plan_evaluate otherwise. */
int spec_plan_evaluate_mode(tseries *res, const spec_plan *P, wk_table *T, const tseries *t,
                            const fmpq_mpoly_ctx_t ctx, int allow_fast)
{
    if (res != NULL && (T == NULL || (P != NULL && P->theta))) {
        tseries_set_error(res, res->var, ctx);
        return SPEC_BADARG;
    }
    return spec_plan_evaluate_corr_mode(res, P, spec_eval_wk_corr, T, t, ctx, allow_fast);
}

/* res = F_g at the times t (see spec.h).
   Rational fast path when every used series is rational. */
int spec_plan_evaluate(tseries *res, const spec_plan *P, wk_table *T, const tseries *t,
                       const fmpq_mpoly_ctx_t ctx)
{
    return spec_plan_evaluate_mode(res, P, T, t, ctx, 1);
}

/* res = the planned free energy at the times t with the caller's correlators (see spec.h).
   Rational fast path when every used series is rational. */
int spec_plan_evaluate_corr(tseries *res, const spec_plan *P, spec_corr_fn corr, void *cdata,
                            const tseries *t, const fmpq_mpoly_ctx_t ctx)
{
    return spec_plan_evaluate_corr_mode(res, P, corr, cdata, t, ctx, 1);
}
