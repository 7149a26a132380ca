/* theta.h - intersection numbers of Norbury's class Theta with psi and kappa classes.
 *
 * Theta_{g,n} in H^{4g-4+2n}(Mbar_{g,n}) (P. Norbury, "A new cohomology class on the moduli space
 * of curves", Geom. Topol. 27 (2023), arXiv:1712.03662) has degree 2g-2+n, satisfies
 * Theta_{g,n+1} = psi_{n+1} pi^* Theta_{g,n}, vanishes in genus 0 and int_{Mbar_{1,1}} Theta = 1/8.
 * The Theta-psi numbers
 *     <Theta | tau_{d_1} ... tau_{d_n}>_g = int_{Mbar_{g,n}} Theta_{g,n} psi_1^{d_1} ... psi_n^{d_n}
 * vanish unless d_1 + ... + d_n = g-1.  Two independent routes compute them (theta_vir.c: the
 * Virasoro constraints of the Brezin-Gross-Witten tau function in DVV form; theta_kdv.c: the KdV
 * equation), each with its own memo table of the container of src/engines/correlators/wk_memo.c.
 * Both use the one geometric fact <Theta | tau_0 tau_S>_g = (2g-2+|S|) <Theta | tau_S>_g, which
 * follows from Theta_{g,n+1} = psi_{n+1} pi^* Theta_{g,n} (derivation in theta_key.c).
 *
 * Ownership: a theta_table is created by theta_table_new and released by theta_table_free; it owns
 * its memo.  No function keeps pointers to the caller's arrays.  fmpq_t results must be initialised
 * by the caller.  Not thread-safe (one table per thread).
 * Error policy: status codes of correlators/wk.h (WK_OK, WK_UNSTABLE, WK_BADARG, WK_LIMIT,
 * WK_CANCELLED) plus THETA_INEXACT (a division of the KdV route was not exact, which would mean the
 * two routes disagree); nothing aborts; results are zero on error.
 */
#ifndef PSIKAPPA_THETA_THETA_H
#define PSIKAPPA_THETA_THETA_H

#include <stdatomic.h>
#include <signal.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include "correlators/wk.h"

#ifdef __cplusplus
extern "C" {
#endif

enum { THETA_ROUTE_VIRASORO = 0, THETA_ROUTE_KDV = 1 };
enum { THETA_INEXACT = 16 };

/* Largest genus accepted: every recursive step lowers the genus or the number of points of a key
   with at most g-1 points, so the nesting stays below 2 * THETA_MAX_GENUS. */
#define THETA_MAX_GENUS 400

typedef struct theta_table theta_table;

/* Creates an empty memo for one route (THETA_ROUTE_VIRASORO or THETA_ROUTE_KDV).
   Returns NULL on a bad route or when memory is exhausted; the caller owns the result. */
theta_table *theta_table_new(int route);

/* Releases the table and its memo.
   Accepts NULL. */
void theta_table_free(theta_table *T);

/* Maximum number of memo entries (0 = unlimited); more stop the computation with WK_LIMIT. */
void theta_table_set_limit(theta_table *T, slong max_entries);

/* Polls *flag (not owned; NULL = off) before each new entry and stops with WK_CANCELLED. */
void theta_table_set_cancel(theta_table *T, atomic_int *flag);

/* Number of memoised values (0 for NULL).  Keys are partitions of g-1 (no index 0). */
slong theta_table_entries(const theta_table *T);

/* res = <Theta | tau_{d[0]} ... tau_{d[n-1]}>_g (d unsorted); zero if sum d_i != g-1, in
   particular in genus 0.  WK_BADARG for g < 0, n < 0 or d_i < 0; WK_UNSTABLE if 2g-2+n <= 0;
   WK_LIMIT if g > THETA_MAX_GENUS or memory / the entry limit is exhausted. */
int theta_correlator(fmpq_t res, theta_table *T, slong g, const slong *d, slong n);

/* Upper bound on the memo entries for all Theta-psi numbers of genus <= g: the number of
   partitions of 0..g-1 (HUGE_VAL above 1e18, 0 for g < 1). */
double theta_estimate_entries(slong g);

/* res = int_{Mbar_{g,n}} Theta psi^d prod_{j=1..kmax} kappa_j^{kmult[j]} by the pushforward
   formula (theta_kappa.c): sum over set partitions P of the kappa factors of
   (-1)^{m-|P|} <Theta | tau_d prod_{B in P} tau_{b_B}>_g.  kmult[0] is ignored (kappa_0 = 2g-2+n
   is the caller's).  Zero unless sum d + sum_j j kmult[j] = g-1.  Status codes as above;
   WK_LIMIT also if more than max_terms block choices (0 = no limit) would be enumerated. */
int theta_kappa_pushforward(fmpq_t res, theta_table *T, slong g, const slong *d, slong n,
                            const slong *kmult, slong kmax, slong max_terms);

/* Receives one term coeff * <Theta | tau_key[0..len-1]>_g of a pushforward expansion (key in no
   particular order, borrowed for the call).  A nonzero return stops the enumeration with it. */
typedef int (*theta_term_fn)(void *data, slong g, const slong *key, slong len, const fmpz_t coeff);

/* The terms of theta_kappa_pushforward, handed to fn one set-partition group at a time (equal
   correlators are not merged).  Nothing is called when the degrees do not match.  Status codes as
   for theta_kappa_pushforward, or the first nonzero return of fn. */
int theta_kappa_terms(slong g, const slong *d, slong n, const slong *kmult, slong kmax, slong max_terms,
                      theta_term_fn fn, void *data);

/* The same integral by the time shift t_k -> t_k - p_k(s) (k >= 1) with exp(-sum_j s_j z^j) =
   sum_k p_k(s) z^k: prod_j kmult[j]! times the coefficient of prod s_j^{kmult[j]}. */
int theta_kappa_shift(fmpq_t res, theta_table *T, slong g, const slong *d, slong n,
                      const slong *kmult, slong kmax);

/* res = int_{Mbar_{g,n}} Theta psi^d kappa_1^k / k!, k = g-1-sum d_i (zero if k < 0), by the time
   shift with s_1 only: the sum over partitions lambda of k of
   (-1)^{k+len(lambda)} / (prod lambda_i! prod mult!) <Theta | tau_d tau_lambda>_g.  This is the
   coefficient of (2 pi^2)^k prod_i (L_i^2/2)^{d_i}/d_i! in the super volume V^Theta_{g,n}(L). */
int theta_volume_coeff(fmpq_t res, theta_table *T, slong g, const slong *d, slong n);

#ifdef __cplusplus
}
#endif

#endif
