/* wk_kdv.h - psi-class correlators <tau_{d_1} ... tau_{d_n}>_g by a second, independent recursion:
 * the KdV equation in Witten's correlator form together with the string and dilaton equations
 * (wk_kdv.c derives the step and proves that it terminates).  It shares no code with the DVV engine
 * of wk.h: its own memo (rational values), its own keys, its own estimate.  It is slower than DVV
 * and exists so that results can be checked by a second route.
 *
 * Ownership: a wk_kdv_table is created by wk_kdv_table_new and owned by the caller, who releases it
 * with wk_kdv_table_free.  The table owns its memoised values and keeps no pointer to the caller's
 * arrays.  Result arguments (fmpq_t) must be initialised by the caller.  Not thread-safe.
 *
 * Error policy: nothing aborts on bad input.  Status codes are those of wk.h (WK_OK, WK_UNSTABLE,
 * WK_BADARG, WK_LIMIT, WK_CANCELLED); on error the result is zero.
 */
#ifndef PSIKAPPA_CORRELATORS_WK_KDV_H
#define PSIKAPPA_CORRELATORS_WK_KDV_H

#include <stdatomic.h>
#include <signal.h>
#include <flint/fmpq.h>
#include "wk.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef struct wk_kdv_table wk_kdv_table;   /* opaque memo of <tau_d>_g (second route) */

/* Largest nesting of the recursion (one level per memo entry under construction).  Deeper requests
   stop with WK_LIMIT, so the C stack is never exhausted.  Requests with 2g-2+n above
   WK_KDV_MAX_EULER are refused with WK_LIMIT before any work. */
#define WK_KDV_MAX_NEST 4000
#define WK_KDV_MAX_EULER 400

/* Creates an empty memo with no entry limit.
   Returns NULL only if memory is exhausted; the caller owns the result (wk_kdv_table_free). */
wk_kdv_table *wk_kdv_table_new(void);

/* Releases the table and every memoised value.
   Accepts NULL. */
void wk_kdv_table_free(wk_kdv_table *T);

/* Sets the maximum number of memo entries (0 or negative = unlimited).
   A computation that needs more stops with WK_LIMIT; existing entries stay valid. */
void wk_kdv_table_set_limit(wk_kdv_table *T, slong max_entries);

/* Makes the recursion poll *flag before each new entry and stop with WK_CANCELLED once it is
   nonzero; NULL turns polling off.  The flag is not owned. */
void wk_kdv_table_set_cancel(wk_kdv_table *T, atomic_int *flag);

/* Number of memoised correlators (0 for NULL). */
slong wk_kdv_table_entries(const wk_kdv_table *T);

/* Deepest nesting reached so far (0 for NULL); lets tests see how close WK_KDV_MAX_NEST is. */
slong wk_kdv_table_max_nest(const wk_kdv_table *T);

/* res = <tau_{d[0]} ... tau_{d[n-1]}>_g (d unsorted, d_i >= 0); zero if sum d_i != 3g-3+n.
   Status codes and their order as for wk_table_correlator, with WK_KDV_MAX_EULER in place of
   WK_MAX_DEPTH; WK_LIMIT also when the entry limit, WK_KDV_MAX_NEST or memory is exhausted. */
int wk_kdv_correlator(fmpq_t res, wk_kdv_table *T, slong g, const slong *d, slong n);

/* Upper bound on the memo entries wk_kdv_correlator needs for any correlator of Mbar_{g,n}: the
   number of stable multi-indices of genus g' <= g with at most n + 4(g-g') points (wk_kdv.c says
   why).  HUGE_VAL when g or n exceeds 1000 or the bound exceeds 1e300; 0 if g < 0 or n < 0. */
double wk_kdv_estimate_entries(slong g, slong n);

#ifdef __cplusplus
}
#endif

#endif
