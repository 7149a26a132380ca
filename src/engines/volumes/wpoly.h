/* wpoly.h - the coefficients of the Weil-Petersson volume polynomials V_{g,n}(L_1..L_n) with
 * few points, in polynomial time:
 *     W_a = int_{Mbar_{g,n}} psi_1^{a_1} ... psi_n^{a_n} kappa_1^{D-|a|} / (D-|a|)!,
 * D = 3g-3+n (Arbarello-Cornalba kappa_1), so that
 *     [L_1^{2a_1} ... L_n^{2a_n}] V_{g,n}(L) = W_a (2 pi^2)^{D-|a|} / prod_i (2^{a_i} a_i!).
 * Method (derivatives of the free energy in the directions t_{a_i} at the Weil-Petersson point,
 * by the KdV recursion of the volume engine over a ring of dual numbers), truncation and cost:
 * docs/volumes-engine.md, section "Volume polynomials with few points".
 *
 * Ownership, reentrancy and error policy as in wpvol.h: the caller owns `out` (initialised
 * fmpq entries), the engine keeps no pointer after returning; on error `out` is all zero.
 * The cancel flag of wpvol_set_cancel is polled between primes and between multi-indices.
 */
#ifndef PSIKAPPA_VOLUMES_WPOLY_H
#define PSIKAPPA_VOLUMES_WPOLY_H

#include <flint/fmpq.h>

#include "wpvol.h"

#ifdef __cplusplus
extern "C" {
#endif

/* Largest number of points supported (the ring of dual numbers has 2^n components). */
#define WPOLY_MAX_POINTS 6

/* Number of sorted multi-indices a_1 >= a_2 >= ... >= a_n >= 0 with |a| <= 3g-3+n, i.e. the
   length of the output of wpoly_coeffs; 0 if (g, n) is outside 2 <= g, 1 <= n <=
   WPOLY_MAX_POINTS.  If idx != NULL it receives them, n entries each, in the output order:
   lexicographic in (a_1, ..., a_n) (for n = 1: a = 0, 1, ..., D). */
slong wpoly_indices(slong *idx, slong g, slong n);

/* out[k] = W_a for the k-th multi-index a of wpoly_indices (out holds that many initialised
   fmpq).  threads >= 1 worker threads (one prime per thread at a time).  Returns WPVOL_OK,
   WPVOL_BADARG (g < 2, n < 1, n > WPOLY_MAX_POINTS, threads < 1, out NULL), WPVOL_LIMIT
   (estimate beyond WPVOL_MAX_SECONDS / WPVOL_MAX_BYTES), WPVOL_NOMEM, WPVOL_INTERNAL (a
   built-in consistency check failed) or WPVOL_CANCELLED; on error every entry is 0. */
int wpoly_coeffs(fmpq *out, slong g, slong n, int threads);

/* As wpoly_coeffs with explicit driver settings (prime_bits, min_primes as in wpvol_table_ex)
   and extra >= 0 orders of truncation beyond the proven bound (results must not change: for
   tests).  *primes_used (may be NULL) receives the number of primes used. */
int wpoly_coeffs_ex(fmpq *out, slong g, slong n, int threads, int prime_bits, slong min_primes,
                    slong extra, slong *primes_used);

/* The routes for n = 1: AUTO (the transposed recursion when n = 1 and at least 3 indices
   are asked, else per index), PER_INDEX (one perturbed run of the recursion per index, as
   for n >= 2) and TRANSPOSED (all indices from one run of the transposed recursion,
   wpoly_adjoint.c; n = 1 only, per index otherwise).  Same results. */
enum { WPOLY_ROUTE_AUTO = 0, WPOLY_ROUTE_PER_INDEX = 1, WPOLY_ROUTE_TRANSPOSED = 2 };

/* As wpoly_coeffs_ex with the route chosen (WPVOL_BADARG for another value). */
int wpoly_coeffs_route(fmpq *out, slong g, slong n, int threads, int prime_bits,
                       slong min_primes, slong extra, int route, slong *primes_used);

/* out[k] = W_a for the k-th of the nidx >= 1 multi-indices in idx (n entries each, sorted
   decreasingly, entries >= 0, sum <= 3g-3+n; borrowed), e.g. a single coefficient.  Return
   codes as wpoly_coeffs (WPVOL_BADARG also for an invalid idx). */
int wpoly_coeffs_at(fmpq *out, slong g, slong n, const slong *idx, slong nidx, int threads);

/* As wpoly_coeffs_at with the route chosen (WPOLY_ROUTE_*; WPVOL_BADARG for another value). */
int wpoly_coeffs_at_route(fmpq *out, slong g, slong n, const slong *idx, slong nidx, int threads,
                          int route);

/* Rough single-core *seconds and peak *bytes of wpoly_coeffs(., g, n, .) (0 for unsupported
   (g, n)).  Cheap. */
void wpoly_estimate(double *seconds, double *bytes, slong g, slong n);

/* The same for wpoly_coeffs_at(., g, n, idx, nidx, .) (0 for invalid arguments). */
void wpoly_estimate_at(double *seconds, double *bytes, slong g, slong n, const slong *idx,
                       slong nidx);

/* The same for wpoly_coeffs_at_route (route as there). */
void wpoly_estimate_at_route(double *seconds, double *bytes, slong g, slong n, const slong *idx,
                             slong nidx, int route);

#ifdef __cplusplus
}
#endif

#endif
