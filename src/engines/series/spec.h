/* spec.h - the genus-g Witten-Kontsevich free energy at times given by truncated series.
 *
 *   F_g(t_0, t_1, ...) = sum over multisets (m_k copies of tau_k)
 *                        < prod_k tau_k^{m_k} >_g  prod_k t_k^{m_k} / m_k!
 *
 * is evaluated at t_k = t_k(x), truncated series in one main variable x, to order N in x.
 *
 * "Compile once": spec_plan_build looks only at the x-valuations v_k of the times (v_k = lowest
 * power of x in t_k, -1 for t_k = 0) and enumerates the multisets that can contribute at x-order
 * <= N under
 *     dimension   sum_{k>=2} (k-1) m_k = 3g-3+m_0          (m_1 free),
 *     stability   2g-2+sum_k m_k > 0,
 *     budget      sum_k v_k m_k <= N.
 * t_0 or t_1 with a nonzero constant term (v = 0) would make infinitely many multisets contribute
 * and is refused (SPEC_T0_CONSTANT / SPEC_T1_CONSTANT).  With v_0 >= 1, m_0 <= N / v_0 and only
 * k <= 3g-2+N/v_0 can occur.  The plan then counts its multisets (refusing more than max_terms
 * with SPEC_TOO_BIG before any correlator is evaluated) and spec_plan_evaluate sums them over
 * the enumeration tree (multisets sharing their first choices share a path): the powers
 * t_k^m/m! are computed once, each multiset costs one memoised correlator, and each tree edge
 * one truncated multiplication and addition (on constants when the factors below are constant;
 * all in fmpq_poly when every time is rational).
 *
 * Ownership: spec_plan_build allocates the plan, the caller releases it with spec_plan_free.
 * The plan keeps no pointer to the callback data or to the series.  Results are written to a
 * caller-initialised tseries.  The wk_table is the caller's and may be shared between plans.
 *
 * Error policy: nothing aborts on bad input; functions return SPEC_OK or a code below (or, for
 * spec_plan_build, the callback's own negative error code), and leave *P NULL / res as the
 * error series (zero, order -1).
 */
#ifndef PSIKAPPA_SERIES_SPEC_H
#define PSIKAPPA_SERIES_SPEC_H

#include <stdio.h>
#include "correlators/wk.h"
#include "series/tseries.h"

#ifdef __cplusplus
extern "C" {
#endif

enum {
    SPEC_OK = 0,
    SPEC_BADARG,       /* g or order out of [0, SPEC_MAX_*], max_terms <= 0, NULL pointers */
    SPEC_T0_CONSTANT,  /* t_0 has a nonzero constant term: infinitely many terms */
    SPEC_T1_CONSTANT,  /* t_1 has a nonzero constant term: infinitely many terms */
    SPEC_TOO_BIG,      /* more than max_terms multisets, or enumeration tables beyond SPEC_MAX_TABLE */
    SPEC_MISMATCH,     /* evaluate: a series has a lower valuation than planned, or mixed variables */
    SPEC_SERIES,       /* evaluate: a series operation failed (invalid series) */
    SPEC_WK            /* evaluate: the correlator engine failed (WK_LIMIT: memo limit or memory) */
};

#define SPEC_MAX_GENUS 1000
#define SPEC_MAX_ORDER 100000
/* Largest number of entries of the planner's pruning table (active k's times dimensions). */
#define SPEC_MAX_TABLE ((slong) 1 << 22)

typedef struct spec_plan spec_plan;   /* opaque */

/* Valuation callback: v_k of t_k (>= 0), -1 when t_k is identically zero, or an error code
   < -1 that spec_plan_build returns unchanged.  Called for k = 0, 1, 2, ... in increasing order,
   at most once per k, only for k <= 3g-2+N/v_0. */
typedef slong (*spec_valuation_fn)(void *data, slong k);

/* Builds the plan for F_g to x-order `order` from the valuations given by the callback and counts
   its multisets; *P = NULL on error.  Errors: SPEC_BADARG, SPEC_T0_CONSTANT, SPEC_T1_CONSTANT,
   SPEC_TOO_BIG (count > max_terms, checked before any evaluation), or the callback's code. */
int spec_plan_build(spec_plan **P, slong g, slong order, spec_valuation_fn valuation, void *data,
                    double max_terms);

/* The same for the genus-g Brezin-Gross-Witten free energy
       F^Theta_g(t_0, t_1, ...) = sum over multisets < Theta | prod_k tau_k^{m_k} >_g prod_k t_k^{m_k} / m_k!
   whose multisets satisfy sum_{k>=1} k m_k = g-1 (m_0 free; stability 2g-2+sum m_k > 0).  Only t_0
   must vanish at x = 0 (else SPEC_T0_CONSTANT): every m_k with k >= 1 is at most g-1, and only
   k <= g-1 occur.  Internally t_k takes the place of the Witten-Kontsevich t_{k+1}, so the same
   enumerator serves both.  Evaluate with spec_plan_evaluate_corr and a Theta correlator. */
int spec_plan_build_theta(spec_plan **P, slong g, slong order, spec_valuation_fn valuation, void *data,
                          double max_terms);

/* Whether P plans the Brezin-Gross-Witten free energy (spec_plan_build_theta). */
int spec_plan_is_theta(const spec_plan *P);

/* Largest number of points of a planned correlator (0 without a plan or multiset). */
slong spec_plan_max_points(const spec_plan *P);

/* Largest k whose t_k occurs in some planned multiset (spec_plan_evaluate reads t[0..max_k]);
   -1 when the plan has no multiset at all. */
slong spec_plan_max_k(const spec_plan *P);

/* Number of multisets (= correlators) spec_plan_evaluate will evaluate. */
double spec_plan_terms(const spec_plan *P);


/* Human-readable summary: g, N, the needed t_k with their valuations, the number of multisets by
   m_0 and by lowest x-order, the largest correlator and (Witten-Kontsevich plans only; the caller
   prints its own for Theta) the memo estimate. */
void spec_plan_print(FILE *out, const spec_plan *P);

/* res = F_g(t_0(x), ..., t_maxk(x)) + O(x^(order'+1)), order' = min(N, orders of the series used).
   t[k] (k = 0..spec_plan_max_k(P)) is read only when t_k occurs in a planned multiset; all read
   series must share one main variable and have valuation >= the planned one (else
   SPEC_MISMATCH).  Errors: SPEC_BADARG (NULL), SPEC_MISMATCH, SPEC_SERIES, SPEC_WK. */
int spec_plan_evaluate(tseries *res, const spec_plan *P, wk_table *T, const tseries *t,
                       const fmpq_mpoly_ctx_t ctx);

/* The correlator of a leaf: res = <tau_d[0] ... tau_d[n-1]>_g of the planned theory (d borrowed,
   unsorted).  Returns 0, or a nonzero engine status that stops the evaluation with SPEC_WK. */
typedef int (*spec_corr_fn)(void *data, fmpq_t res, slong g, const slong *d, slong n);

/* As spec_plan_evaluate, with the correlators given by corr (the caller's data cdata); the only
   way to evaluate a plan of spec_plan_build_theta. */
int spec_plan_evaluate_corr(tseries *res, const spec_plan *P, spec_corr_fn corr, void *cdata,
                            const tseries *t, const fmpq_mpoly_ctx_t ctx);

/* Releases the plan.
   Accepts NULL. */
void spec_plan_free(spec_plan *P);

#ifdef __cplusplus
}
#endif

#endif
