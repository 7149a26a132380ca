/* pushforward.h - mixed psi-kappa integrals on Mbar_{g,n} as combinations of psi correlators.
 *
 * Expansion by the forgetful-map pushforward formula (Arbarello-Cornalba 1996;
 * Kaufmann-Manin-Zagier 1996):
 *   int prod psi_i^{d_i} prod_j kappa_{b_j} = sum over set partitions P of the m kappa factors of
 *   (-1)^{m-|P|} < prod tau_{d_i} prod_{B in P} tau_{b_B + 1} >_g ,   b_B = sum of b_j in block B.
 * Equal kappa indices are grouped: the multiset partitions of the kappa multiset are enumerated,
 * each with its multiplicity (number of set partitions giving it), so kappa_1^m costs one term per
 * integer partition of m.  Terms giving the same sorted correlator are merged.
 *
 * Ownership: a pf_expansion owns its terms and their d arrays; initialise with pf_expansion_init
 * and release with pf_expansion_clear.  pf_expand replaces the previous contents of E.
 * Input arrays are only read during the call.  Out-of-memory is reported as WK_LIMIT.
 */
#ifndef PSIKAPPA_CORRELATORS_PUSHFORWARD_H
#define PSIKAPPA_CORRELATORS_PUSHFORWARD_H

#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include "wk.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef struct { fmpz_t coeff; slong n; slong *d; } pf_term;  /* coeff * <tau_d[0..n-1]>_g, d sorted descending */
typedef struct { slong g; slong len, alloc; pf_term *terms; } pf_expansion;

/* Initialises E as an empty expansion (g = 0, no terms).
   Must be paired with pf_expansion_clear. */
void pf_expansion_init(pf_expansion *E);

/* Releases all terms of E and leaves it empty (it may be reused or cleared again).
   Accepts NULL. */
void pf_expansion_clear(pf_expansion *E);

/* Expands int_{Mbar_{g,n}} prod psi_i^{d_i} prod_j kappa_j^{kmult[j]} (j = 1..kmax; kmult[0] is
   ignored, kappa_0 being a scalar the caller handles) into E, terms sorted by (n, d) and non-zero.
   E is left empty when the degree differs from 3g-3+n (the integral is then zero).  Returns WK_OK,
   WK_BADARG, WK_UNSTABLE, or WK_LIMIT if more than max_terms multiset partitions (0 = no limit)
   or memory runs out; E is empty after any error. */
int pf_expand(pf_expansion *E, slong g, const slong *d, slong n, const slong *kmult, slong kmax, slong max_terms);

/* Number of multiset partitions pf_expand would enumerate (as a double, may be huge); 0 on bad
   input.  Exact when counting costs at most 1e8 steps, else HUGE_VAL (then the count exceeds 5000). */
double pf_estimate_terms(const slong *kmult, slong kmax);

/* res = sum of coeff * <tau_d>_g over the terms of E: each by a closed form when one applies
   (wk_closed_form: string, dilaton, one and two points, genus 0), else with the memo T.
   Returns the first error of wk_table_correlator (res is then 0), or WK_BADARG for NULL arguments. */
int pf_expansion_evaluate(fmpq_t res, wk_table *T, const pf_expansion *E);

/* Most terms pf_all_closed expands to look at them one by one. */
#define PF_CLOSED_MAX_TERMS 256

/* Whether every correlator of the expansion of int prod psi_i^{d_i} prod_j kappa_j^{kmult[j]}
   has a closed form (wk_closed_form_kind), so that the integral needs no table (pf_closed.c).
   0 when the expansion has more than PF_CLOSED_MAX_TERMS multiset partitions, on bad input or
   when memory runs out; 1 when the degree does not match (the integral is 0). */
int pf_all_closed(slong g, const slong *d, slong n, const slong *kmult, slong kmax);

/* Predicted seconds to evaluate `terms` pushforward terms of kappa monomials in genus g with a
   fresh table (pf_closed.c): an a-priori estimate, so that long reductions are refused before any
   work.  HUGE_VAL for absurd inputs. */
double pf_estimate_seconds(slong g, double terms);

/* Convenience: expand (no term limit) then evaluate; zero when degrees do not match 3g-3+n.
   Status codes as for pf_expand and pf_expansion_evaluate; res is 0 on error. */
int pf_integral(fmpq_t res, wk_table *T, slong g, const slong *d, slong n, const slong *kmult, slong kmax);

#ifdef __cplusplus
}
#endif

#endif
