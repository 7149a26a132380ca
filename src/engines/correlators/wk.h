/* wk.h - exact psi-class intersection numbers <tau_{d_1} ... tau_{d_n}>_g on Mbar_{g,n}.
 *
 * Ownership: a wk_table is created by wk_table_new and owned by the caller, who must release it
 * with wk_table_free.  The table owns every memoised value; functions never keep pointers to the
 * caller's arrays after returning.  Result arguments (fmpq_t) must be initialised by the caller.
 * A table is not thread-safe; use one table per thread.
 *
 * Error policy: no function aborts on bad input.  Every failure is reported by a status code and
 * leaves the result set to zero.  Out-of-memory in this module's own allocations is reported as
 * WK_LIMIT (arithmetic inside FLINT/GMP follows their own allocation policy).
 */
#ifndef PSIKAPPA_CORRELATORS_WK_H
#define PSIKAPPA_CORRELATORS_WK_H

#include <stdatomic.h>
#include <signal.h>
#include <flint/fmpq.h>

#ifdef __cplusplus
extern "C" {
#endif

typedef struct wk_table wk_table;          /* opaque memo of <tau_d>_g */

/* WK_TOO_DEEP: the C stack was nearly full (util_stack_exhausted) when the recursion was
   entered, e.g. from deep user recursion; nothing was computed. */
enum { WK_OK = 0, WK_UNSTABLE = 1, WK_BADARG = 2, WK_LIMIT = 3, WK_CANCELLED = 4, WK_TOO_DEEP = 5 };

/* Largest 2g-2+n accepted: bounds the recursion depth (each recursive step lowers 2g-2+n by at
   least one), so the engine cannot overflow the C stack.  Larger requests return WK_LIMIT. */
#define WK_MAX_DEPTH 2000

/* Creates an empty memo table with no entry limit.
   Returns NULL only if memory is exhausted; the caller owns the result (free with wk_table_free). */
wk_table *wk_table_new(void);

/* Releases the table and every memoised value.
   Accepts NULL (does nothing). */
void wk_table_free(wk_table *T);

/* Sets the maximum number of memo entries (0 = unlimited, negative treated as 0).
   A computation that would need more entries stops with WK_LIMIT; existing entries stay valid. */
void wk_table_set_limit(wk_table *T, slong max_entries);

/* The entry limit set by wk_table_set_limit (0 = unlimited); 0 for a NULL table. */
slong wk_table_limit(const wk_table *T);

/* Makes long computations poll *flag (e.g. set by a signal handler) and stop with
   WK_CANCELLED once it is nonzero; NULL turns polling off. The flag is not owned. */
void wk_table_set_cancel(wk_table *T, atomic_int *flag);

/* Number of correlators currently memoised.
   Returns 0 for a NULL table. */
slong wk_table_entries(const wk_table *T);

/* res = <tau_{d[0]} ... tau_{d[n-1]}>_g (d unsorted, d_i >= 0); zero if sum d_i != 3g-3+n.
   WK_BADARG if g<0, n<0 or some d_i<0 (checked first); WK_UNSTABLE if 2g-2+n <= 0;
   WK_LIMIT if 2g-2+n > WK_MAX_DEPTH, the entry limit is hit or memory runs out. res is 0 on error. */
int wk_table_correlator(fmpq_t res, wk_table *T, slong g, const slong *d, slong n);

/* Upper bound on the memo entries needed to compute all correlators of Mbar_{g,n}: the number of
   multi-indices of genus g' <= g with n' <= n+g-g' points and degree 3g'-3+n' (see wk_estimate.c).
   Cheap (O((3g+n)(g+n)) flops); returns HUGE_VAL when the bound certainly exceeds 1e21, 0 if g<0 or n<0. */
double wk_estimate_entries(slong g, slong n);
/* Predicted seconds to fill `entries` table entries; with pf_estimate_seconds for the pushforward
   sum, the one time model of the reduction. */
double wk_estimate_seconds(double entries);

/* Model of the reduction of every coefficient of a volume polynomial V_{g,n}(L), 2 <= n <= 6 (one
   kappa_1 pushforward per sorted multi-index into one shared table, as the language does):
   single-core seconds and table entries reached, fitted on measurements (wk_estimate.c).  The
   bound wk_estimate_entries(g, n + 3g-3+n) is about 1000 times the table reached there. */
void wk_estimate_volume_reduction(double *seconds, double *entries, slong g, slong n);

/* What wk_closed_form found: no closed form applies, the degree does not match (the answer is 0
   however large g and n are), or a value from a closed formula. */
enum { WK_CLOSED_NONE = 0, WK_CLOSED_ZERO = 1, WK_CLOSED_VALUE = 2 };

/* Largest 3g-3+n for which wk_closed_form evaluates a formula (its numbers have O(D log D) bits). */
#define WK_CLOSED_MAX_DIM 100000

/* res = <tau_{d[0]} ... tau_{d[n-1]}>_g without any table, when a closed form applies
   (wk_closed.c): WK_CLOSED_ZERO if sum d_i != 3g-3+n; WK_CLOSED_VALUE for n = 1
   (1/(24^g g!)), for g = 0 ((n-3)!/prod d_i!) up to WK_CLOSED_MAX_DIM, for n = 2 up to genus
   WK_TWO_POINT_MAX_G (wk_two_point), and for every correlator that the string and dilaton
   equations reduce to those within WK_REDUCE_MAX_STEPS steps (wk_reduce.c); otherwise, and for
   invalid or unstable input (left to wk_table_correlator to report), WK_CLOSED_NONE.  res is 0
   unless WK_CLOSED_VALUE. */
int wk_closed_form(fmpq_t res, slong g, const slong *d, slong n);

/* The code wk_closed_form would return, without computing the value (cheap: at most
   WK_REDUCE_MAX_STEPS steps of the string and dilaton equations, O(n) each). */
int wk_closed_form_kind(slong g, const slong *d, slong n);

/* Largest genus of the two-point closed form (cost about g^2/6 steps on numbers of O(g log g)
   bits; bench_closed measured 0.9 s CPU at g = 3000 for the longest sum, k = 3g/2). */
#define WK_TWO_POINT_MAX_G 3000

/* Steps of the string and dilaton equations wk_closed_form tries before giving up (each removes
   one point; the string equation branches into one term per other nonzero index). */
#define WK_REDUCE_MAX_STEPS 4096

/* res = <tau_k tau_{3g-1-k}>_g by the closed form of wk_twopoint.c (no table).  Returns 1, or 0
   (res = 0) when g < 1, g > WK_TWO_POINT_MAX_G or k is outside 0..3g-1. */
int wk_two_point(fmpq_t res, slong g, slong k);

/* res = <tau_d>_g by a closed form when one applies (wk_closed_form), else from the table T.
   Status codes as for wk_table_correlator. */
int wk_correlator(fmpq_t res, wk_table *T, slong g, const slong *d, slong n);

/* The checks every correlator route makes first, in the documented order: WK_BADARG for a
   missing table (table_missing), a negative genus, count or index, then WK_UNSTABLE for
   Mbar_{0,n<=2} and Mbar_{1,0}; WK_OK otherwise.  Each route adds its own size limit. */
int wk_check_space(int table_missing, slong g, const slong *d, slong n);

/* Whether sum d_i = 3g-3+n (the dimension condition), for 0 <= g, n <= WORD_MAX / 8 and
   d_i >= 0; huge d_i cannot overflow. */
int wk_degree_matches(slong g, const slong *d, slong n);

#ifdef __cplusplus
}
#endif

#endif
