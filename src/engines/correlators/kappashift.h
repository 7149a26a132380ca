/* kappashift.h - mixed psi-kappa integrals by the time shift of Kaufmann-Manin-Zagier, a route
 * independent of the set-partition pushforward of pushforward.h.
 *
 * With exp(-sum_j s_j z^j) = sum_k p_k(s) z^k (R. Kaufmann, Yu. Manin, D. Zagier, "Higher
 * Weil-Petersson volumes of moduli spaces of stable n-pointed curves", Comm. Math. Phys. 181 (1996)
 * 763-787; the convention is stated in docs/conventions.md):
 *     int prod psi_i^{d_i} exp(sum_j s_j kappa_j) = < prod tau_{d_i} exp(- sum_{k>=1} p_k(s) tau_{k+1}) >_g,
 * so int prod psi_i^{d_i} prod_j kappa_j^{m_j} is prod_j m_j! times the coefficient of prod s_j^{m_j}
 * of the right-hand side: a sum over multisets of extra points tau_{k+1}, each of multiplicity e_k,
 * weighted by the coefficient of s^m in prod_k (-p_k)^{e_k} / e_k!.
 *
 * Ownership: nothing is retained; the wk_table (psi correlators) is the caller's and may be shared.
 * Error policy: nothing aborts on bad input; status codes are those of wk.h, res is 0 on error.
 */
#ifndef PSIKAPPA_CORRELATORS_KAPPASHIFT_H
#define PSIKAPPA_CORRELATORS_KAPPASHIFT_H

#include <stdatomic.h>
#include <signal.h>
#include <flint/fmpq.h>
#include "wk.h"

#ifdef __cplusplus
extern "C" {
#endif

/* res = int_{Mbar_{g,n}} prod psi_i^{d_i} prod_{j=1..kmax} kappa_j^{kmult[j]} (kmult[0] is ignored:
   kappa_0 is a number the caller substitutes), zero when the degree is not 3g-3+n.  Correlators
   come from T; *cancel (may be NULL, not owned) is polled once per correlator.  Returns WK_OK,
   WK_BADARG, WK_UNSTABLE, WK_CANCELLED, or WK_LIMIT (memory, memo limit of T). */
int ks_integral(fmpq_t res, wk_table *T, slong g, const slong *d, slong n, const slong *kmult, slong kmax,
                atomic_int *cancel);

/* Work of ks_integral as a double: an upper bound on the correlators it evaluates (partitions of the
   kappa degree into parts k whose p_k is not truncated away) times the monomials of its truncated
   polynomials.  HUGE_VAL when that exceeds 1e18 or the kappa degree exceeds 10000; 0 on bad input. */
double ks_estimate_work(const slong *kmult, slong kmax);

/* Kappa degree sum_j j kmult[j] (j >= 1): ks_integral's correlators have at most n plus this many
   points.  -1 on bad input or overflow. */
slong ks_kappa_degree(const slong *kmult, slong kmax);

#ifdef __cplusplus
}
#endif

#endif
