/* hodge_internal.h - the context shared by the two Hodge routes (memo tables, Mumford's
 * coefficients B_{2l}/(2l)!, limits), and the entry points of each route.  Not a public header.
 *
 * Ownership: the context owns both keymaps and the coefficient vector; the wk_table is borrowed.
 */
#ifndef PSIKAPPA_HODGE_INTERNAL_H
#define PSIKAPPA_HODGE_INTERNAL_H

#include <stdatomic.h>
#include <flint/fmpq.h>
#include <flint/fmpq_poly.h>
#include "keymap.h"
#include "hodge.h"

struct hodge_ctx {
    wk_table *T;                       /* psi correlators, borrowed */
    keymap memo[2];                    /* one per route, keyed by normalised states */
    atomic_int *cancel;     /* polled on each memo miss, not owned */
    slong limit;                       /* states allowed per route, 0 = unlimited */
    fmpq *bcoef;                       /* bcoef[l] = B_{2l}/(2l)!, l = 0..nbcoef-1 */
    slong nbcoef;
    /* the generating-polynomial route (hodge_pair.c), sharing nothing with the two above */
    keymap pair_memo;                  /* (g, n, sorted psi) -> index into pair_vals */
    fmpq_poly_struct *pair_vals;       /* the polynomials P(g, d), owned */
    slong pair_len, pair_cap;
    fmpq *pair_bern;                   /* pair_bern[l] = B_{2l}/(2l), l = 0..pair_nbern-1 */
    slong pair_nbern;
    int pair_full;                     /* 1: keep the coefficients above the rank (tests) */
};

/* Releases the memo of hodge_pair.c and leaves it empty and usable. */
void hodge_pair_clear(hodge_ctx *H);

/* Sets c = B_{2l}/(2l)! (Bernoulli number B_2 = 1/6), extending the cached table.
   l >= 1 and at most HODGE_MAX_INDEX. */
void hodge_coef(fmpq_t c, hodge_ctx *H, slong l);

/* WK_CANCELLED if the cancel flag is set, WK_LIMIT if the route's memo exceeds the limit, else WK_OK. */
int hodge_poll(const hodge_ctx *H, int route);

/* Sorts d[0..n-1] in descending order (insertion sort: n is small). */
void hodge_sort_desc(slong *d, slong n);

/* WK_OK when the arguments of hodge_integral are acceptable, else WK_BADARG or WK_UNSTABLE. */
int hodge_check_args(const hodge_ctx *H, int route, slong g, const slong *d, slong n,
                     const slong *kmult, slong kmax, const slong *cmult, slong cmax);

/* Route entry points: the arguments are already checked (nonnegative, stable, bounded) by
   hodge_integral; cm[1..cmax] are the ch multiplicities, km[1..kmax] the kappa ones; top: times
   lambda_g, kept whole (hodge_fp.c). */
int hodge_grr_integral(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n,
                       const slong *km, slong kmax, const slong *cm, slong cmax);
int hodge_fp_integral(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n,
                      const slong *km, slong kmax, const slong *cm, slong cmax, int top);

/* hodge_integral times lambda_g when top is nonzero, the class kept whole by the operator route
   (HODGE_ROUTE_FP only when top is set). */
int hodge_integral_top(fmpq_t res, hodge_ctx *H, int route, slong g, const slong *d, slong n,
                       const slong *kmult, slong kmax, const slong *cmult, slong cmax, int top);

/* Advances the mixed-radix counter x[0..r-1] (digit i runs over 0..lim[i], digit 0 fastest);
   0 once it wraps back to all zeros.  The kappa expansion of hodge_fp.c and the splitting
   enumeration of hodge_pair.c count with it. */
static inline int hodge_counter_next(slong *x, const slong *lim, slong r)
{
    for (slong i = 0; i < r; i++) {
        if (x[i] < lim[i]) {
            x[i]++;
            return 1;
        }
        x[i] = 0;
    }
    return 0;
}

#endif
