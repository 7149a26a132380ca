/* spec_internal.h - the plan structure and the multiset enumerator shared by spec_plan.c
 * (counting, printing) and spec_eval.c (evaluation); also a test-only evaluation entry point.
 *
 * Enumeration tree: the root chooses m_0, then m_1; below, a node (i, D, B) has the dimension D
 * still to fill with parts k-1 (k >= 2) and the x-budget B left; it becomes a leaf when D = 0,
 * else it chooses a next active part index j >= i and a multiplicity m >= 1.  A child is entered
 * only if the rest can still be filled within budget (table minc), so every node has a leaf
 * below it and the work is at most (number of multisets) x (depth).
 * Ownership: the plan owns all its arrays; a walk borrows the plan and owns its d array.
 */
#ifndef PSIKAPPA_SERIES_SPEC_INTERNAL_H
#define PSIKAPPA_SERIES_SPEC_INTERNAL_H

#include "series/spec.h"

#define SPEC_INF WORD_MAX

struct spec_plan {
    slong g, order;          /* genus and N */
    int theta;               /* 1: the Brezin-Gross-Witten free energy (Theta-psi numbers) */
    slong shift;             /* internal index of t_k is k + shift (theta: 1, see spec.h) */
    slong dim0;              /* dimension to fill at m_0 = 0: 3g-3 (WK) or g-1 (theta) */
    slong nval;              /* valuations queried: val[0..nval-1] */
    slong *val;              /* v_k, -1 for t_k = 0 */
    slong m0max, m1max;      /* m_0 <= m0max, m_1 <= m1max */
    slong dmax;              /* largest dimension 3g-3+m_0 to fill (may be < 0: no multiset) */
    slong nparts;            /* active k >= 2 (0 <= v_k <= N), descending in part[] */
    slong *part;
    slong *minc;             /* (nparts+1) x (dmax+1): least budget filling D with part[i..] */
    char *used;              /* used[k], k = 0..max_k: t_k occurs in some multiset */
    slong max_k, max_points;
    double terms;
    double *by_m0;           /* multisets by m_0, m0max + 1 entries */
    double *by_xord;         /* multisets by lowest x-order sum v_k m_k, order + 1 entries */
};

typedef struct spec_walk spec_walk;

/* Edge callbacks: called before (enter) and after (leave) the subtree reached by taking m >= 1
   copies of tau_k as the (depth+1)-th distinct factor; w->used already includes them.
   Return SPEC_OK or an error code that stops the walk. */
typedef int (*spec_step_fn)(spec_walk *w, slong depth, slong k, slong m);

/* Called at every stable leaf (the multiset is w->d[0..w->n-1]) after depth factors.
   Returns SPEC_OK or an error code that stops the walk. */
typedef int (*spec_leaf_fn)(spec_walk *w, slong depth);

struct spec_walk {
    const spec_plan *P;
    slong *d, n;             /* current multiset as tau indices */
    slong m0, m1, used;      /* m_0, m_1 and budget spent sum v_k m_k */
    spec_step_fn enter, leave;
    spec_leaf_fn leaf;
    void *data;              /* the visitor's state */
};

/* Enumerates every multiset of the plan depth-first, calling enter / leave around every edge and
   leaf at every stable leaf (no callback may be NULL).  Returns SPEC_OK or the first error
   returned by a callback. */
int spec_walk_run(const spec_plan *P, spec_step_fn enter, spec_step_fn leave, spec_leaf_fn leaf,
                  void *data);

/* As spec_plan_evaluate; allow_fast = 0 forces the generic (tseries) path even when every series
   is rational (for tests comparing both paths). */
int spec_plan_evaluate_mode(tseries *res, const spec_plan *P, wk_table *T, const tseries *t,
                            const fmpq_mpoly_ctx_t ctx, int allow_fast);

/* As spec_plan_evaluate_corr, with a choice of path (allow_fast = 0: generic). */
int spec_plan_evaluate_corr_mode(tseries *res, const spec_plan *P, spec_corr_fn corr, void *cdata,
                                 const tseries *t, const fmpq_mpoly_ctx_t ctx, int allow_fast);

#endif
