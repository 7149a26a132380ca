/* hodge.h - exact Hodge integrals: psi, kappa and Chern classes of the Hodge bundle E on Mbar_{g,n}.
 *
 *     int_{Mbar_{g,n}} prod_i psi_i^{d_i} prod_j kappa_j^{kmult[j]} prod_k ch_k(E)^{cmult[k]}
 *
 * ch_k is the k-th Chern character component of E (rank g); ch_{2k} = 0 for k >= 1 (Mumford) and
 * ch_0 = g is a number the caller substitutes, as kappa_0 = 2g-2+n.  Two independent routes:
 *
 *  HODGE_ROUTE_GRR: Mumford's Grothendieck-Riemann-Roch formula for ch_{2l-1}(E) removes one ch
 *    factor at a time; its kappa term stays a kappa class, its boundary terms are integrals on the
 *    boundary spaces with the other factors pulled back; with no ch factor left the psi-kappa
 *    integral goes to the pushforward reduction (correlators/pushforward.h).  hodge_grr.c.
 *  HODGE_ROUTE_FP: kappa classes are first traded for extra points (pi^* kappa_b = kappa_b -
 *    psi_{n+1}^b), then the ch factors are removed by the coefficient form of the operator of
 *    Faber-Pandharipande acting on the Witten-Kontsevich generating function, with the string and
 *    dilaton equations (which hold for Hodge integrals) removing psi exponents 0 and 1.  hodge_fp.c.
 *
 * lambda_j = c_j(E) from the ch classes by c(E) = exp(sum_k (-1)^{k-1} (k-1)! ch_k) (hodge_lambda.c).
 * Conventions and sources: docs/conventions.md, section "The Hodge bundle".
 *
 * Ownership: a hodge_ctx is created by hodge_new and released by hodge_free; it keeps a pointer to
 * the caller's wk_table (not owned, must outlive the context) and owns its two memo tables.
 * Input arrays are only read during a call; result fmpq_t are initialised by the caller.
 * Error policy: nothing aborts on bad input; status codes are those of wk.h, res is 0 on error.
 * A context is not thread-safe.
 */
#ifndef PSIKAPPA_HODGE_HODGE_H
#define PSIKAPPA_HODGE_HODGE_H

#include <stdatomic.h>
#include <signal.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>
#include <flint/fmpq_poly.h>
#include "correlators/wk.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef struct hodge_ctx hodge_ctx;

enum { HODGE_ROUTE_GRR = 0, HODGE_ROUTE_FP = 1 };

/* hodge_entries of the generating-polynomial route (hodge_pair.c), which is not a route of
   hodge_integral. */
enum { HODGE_MEMO_PAIR = 2 };

/* Largest ch index and number of ch factors accepted (bounds recursion depth and key sizes). */
#define HODGE_MAX_INDEX 400

/* A new context computing psi correlators with T (not owned; T must outlive the context).
   Returns NULL if memory is exhausted; free with hodge_free. */
hodge_ctx *hodge_new(wk_table *T);

/* Releases the context and its memo tables (not the wk_table).  Accepts NULL. */
void hodge_free(hodge_ctx *H);

/* Makes long computations poll *flag and stop with WK_CANCELLED once it is nonzero (NULL: off).
   The flag is not owned. */
void hodge_set_cancel(hodge_ctx *H, atomic_int *flag);

/* Stops a computation with WK_LIMIT once the memo table of its route holds more than max_entries
   states (0 = unlimited). */
void hodge_set_limit(hodge_ctx *H, slong max_entries);

/* Number of memoised states of the route, or of HODGE_MEMO_PAIR (for benchmarks and estimates). */
slong hodge_entries(const hodge_ctx *H, int route);

/* res = int_{Mbar_{g,n}} prod psi_i^{d[i]} prod_{j=1..kmax} kappa_j^{kmult[j]}
   prod_{k=1..cmax} ch_k^{cmult[k]} by the given route (kmult[0], cmult[0] are ignored).
   Zero when the degree is not 3g-3+n.  Returns WK_OK, WK_BADARG (negative entries, a route that
   does not exist, indices above HODGE_MAX_INDEX), WK_UNSTABLE, WK_LIMIT or WK_CANCELLED. */
int hodge_integral(fmpq_t res, hodge_ctx *H, int route, slong g, const slong *d, slong n,
                   const slong *kmult, slong kmax, const slong *cmult, slong cmax);

/* The ch polynomial of prod_{j=1..lmax} lambda_j^{lmult[j]} in the ring R whose variable v
   stands for ch_{2v+1} (v = 0..nvars-1, nvars >= (total lambda degree + 1)/2): P is set to the
   degree-matching part of prod_j [c(E)]_j with c(E) = exp(sum_{k odd} (k-1)! ch_k).  Even ch
   are zero and do not appear.  P is initialised by the caller in R.  Returns WK_OK or WK_BADARG
   (negative multiplicities, too few variables). */
int hodge_lambda_ch_poly(fmpq_mpoly_t P, const slong *lmult, slong lmax, const fmpq_mpoly_ctx_t R);

/* res = int_{Mbar_{g,n}} prod psi^d prod kappa^kmult prod_{j} lambda_j^{lmult[j]} prod_k ch_k^{cmult[k]}
   by the given route: lambda_j with j > g makes the integral 0 (E has rank g), and so does
   lambda_g^2 (Mumford's relation), unless expand_all is nonzero, when every lambda is expanded
   into ch classes (tests use this to check the vanishing).  Status codes as for hodge_integral. */
int hodge_integral_lambda(fmpq_t res, hodge_ctx *H, int route, slong g, const slong *d, slong n,
                          const slong *kmult, slong kmax, const slong *lmult, slong lmax,
                          const slong *cmult, slong cmax, int expand_all);

/* One integrand of Mumford's reduction: psi exponents d[0..n-1] on Mbar_{g,n}, kappa
   multiplicities km[1..kmax] and ch multiplicities cm[1..cmax] (index 0 unused). */
typedef struct {
    slong g, n, kmax, cmax;
    slong *d, *km, *cm;
} hodge_mono;

/* Receives one term of Mumford's formula: w times int A, times int B when B is not NULL (the two
   sides of a separating node).  A and B are valid during the call only.  A status other than
   WK_OK stops the enumeration and is returned. */
typedef int (*hodge_term_fn)(void *data, const fmpq_t w, const hodge_mono *A, const hodge_mono *B);

/* The step of the Grothendieck-Riemann-Roch route (hodge_grr.c) for one factor ch_k of S (k odd,
   S->cm[k] > 0): int S = weight * sum of the terms passed to fn, weight = B_{k+1}/(k+1)!; the
   terms are the kappa term, the psi terms, the irreducible and the ordered separating boundary
   terms with their signs and factors 1/2 (terms of a side that cannot carry them are left out;
   some left in may still vanish, see hodge_mono_vanishes).  For explain.  Returns WK_OK,
   WK_BADARG (k not a ch factor of S, bad S) or the first status of fn other than WK_OK. */
int hodge_mumford_terms(fmpq_t weight, hodge_ctx *H, const hodge_mono *S, slong k, hodge_term_fn fn, void *data);

/* Whether int M is 0 for a reason seen without computing: an unstable space, a degree other than
   3g-3+n, ch classes in genus 0 (E = 0) or an even ch index (Mumford). */
int hodge_mono_vanishes(const hodge_mono *M);

/* The third route (hodge_pair.c): psi classes times at most two lambda classes through
   P(g, d) = int_{Mbar_{g,n}} prod psi_i^{d_i} Lambda(x) Lambda(y), Lambda(x) = sum_j lambda_j x^j,
   a homogeneous polynomial of degree m = 3g-3+n-|d| computed by the operator of
   Faber-Pandharipande turned into a recursion on m by the Euler operator x d/dx + y d/dy.
   res (initialised by the caller) is set to P(g, d) with y = 1: its coefficient of x^j is
   int psi^d lambda_j lambda_{m-j}.  Coefficients with j > g or m - j > g are 0 (E has rank g)
   and dropped, unless hodge_set_pair_full(H, 1).  Memoised in H.  Returns WK_OK, WK_BADARG,
   WK_UNSTABLE, WK_LIMIT (memo limit, memory, or more than 45 points) or WK_CANCELLED. */
int hodge_pair_poly(fmpq_poly_t res, hodge_ctx *H, slong g, const slong *d, slong n);

/* res = int_{Mbar_{g,n}} prod psi_i^{d_i} lambda_j lambda_k by hodge_pair_poly (lambda_0 = 1;
   0 when the degree is not 3g-3+n).  Status codes as for hodge_pair_poly. */
int hodge_pair_integral(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n, slong j, slong k);

/* Whether hodge_pair_poly keeps the coefficients above the rank (1) or drops them (0, the
   default); a change empties its memo.  For tests of the vanishing above the rank. */
void hodge_set_pair_full(hodge_ctx *H, int full);

/* Closed forms (hodge_closed.c), no memo: which one an integrand is, if any. */
enum { HODGE_CLOSED_NONE = 0, HODGE_CLOSED_TOP_PAIR = 1, HODGE_CLOSED_CUBED = 2 };

/* res = int_{Mbar_{g,n}} prod psi_i^{a_i} lambda_g lambda_{g-1} for g >= 2, n >= 1, every a_i >= 1,
   sum a_i = g-2+n (Getzler-Pandharipande; n = 1 Faber-Pandharipande).  WK_OK or WK_BADARG. */
int hodge_closed_top_pair(fmpq_t res, slong g, const slong *a, slong n);

/* res = int_{Mbar_g} lambda_{g-1}^3 for 2 <= g <= HODGE_MAX_INDEX (Faber-Pandharipande).
   WK_OK or WK_BADARG. */
int hodge_closed_lambda_cubed(fmpq_t res, slong g);

/* HODGE_CLOSED_TOP_PAIR when the integrand (arguments as for hodge_integral_lambda) is
   prod psi^a lambda_g lambda_{g-1} with all a_i >= 1 and no kappa or ch factor,
   HODGE_CLOSED_CUBED when it is lambda_{g-1}^3 on Mbar_g, else HODGE_CLOSED_NONE. */
int hodge_closed_kind(slong g, const slong *d, slong n, const slong *kmult, slong kmax, const slong *lmult,
                      slong lmax, const slong *cmult, slong cmax);

/* res = the integral by its closed form when hodge_closed_kind names one (WK_OK), else 0 and
   WK_BADARG. */
int hodge_closed_integral(fmpq_t res, slong g, const slong *d, slong n, const slong *kmult, slong kmax,
                          const slong *lmult, slong lmax, const slong *cmult, slong cmax);

/* A generous estimate of the memo states the operator route needs for an integral of total ch
   (or lambda) degree cdeg on Mbar_{g,n} (hodge_lambda.c): (g+1) p(3g-3+n) times the largest
   number of sub-multisets of odd ch indices of sum cdeg; HUGE_VAL beyond 1e18.  Used to refuse
   absurd requests before work starts. */
double hodge_estimate_states(slong g, slong n, slong cdeg);

#ifdef __cplusplus
}
#endif

#endif
