/* mccount.h - the integrated counting polynomial of a multicurve type: for a stable graph Gamma
 * of type (g, n) with at least one edge (the dual graph of a multicurve gamma, every component
 * of weight 1),
 *     P_Gamma(L) = (1/|Aut Gamma|) int_{x_e >= 0, sum_e x_e <= L} prod_e x_e prod_v V_{g_v,n_v}(x_v) dx,
 * V the Weil-Petersson volume polynomials of the pieces of the cut surface (stack convention,
 * V_{1,1}(x) = (x^2 + 4 pi^2)/48; the legs carry length 0, both sides of a curve length x_e),
 * after Mirzakhani's integration formula ("Growth of the number of simple closed geodesics on
 * hyperbolic surfaces", Ann. of Math. 2008) with the symmetry factor 1/|Aut Gamma| of the
 * stack.  The vertex coefficients are [prod x_i^{2a_i}] V_{g,n} = int psi^a kappa_1^{D-|a|} /
 * (D-|a|)! (2 pi^2)^{D-|a|} / prod 2^{a_i} a_i! (pushforward.h), and
 * int_{simplex} prod x_e^{m_e} = prod m_e! / (sum m_e + |E|)! L^{sum m_e + |E|}.
 * P is homogeneous of degree 6g-6+2n in (L, pi); its leading coefficient (pi^0) is proportional,
 * with a factor depending on (g, n) only, to the primitive part of mvvol.h (both are Y of the
 * top-degree parts, see docs/conventions.md), so ratios of leading coefficients are Mirzakhani's
 * frequency ratios.
 *
 * Ownership: coef is the caller's (3g-3+n+1 initialised fmpq); T is the caller's.
 */
#ifndef PSIKAPPA_STRATA_MCCOUNT_H
#define PSIKAPPA_STRATA_MCCOUNT_H

#include <flint/fmpq.h>

#include "correlators/wk.h"
#include "sgraph.h"

/* coef[j] = coefficient of pi^{2j} L^{6g-6+2n-2j} in P_Gamma(L), j = 0..3g-3+n.  SG_OK,
   SG_BADARG (no edge), or SG_LIMIT / SG_CANCELLED from the vertex integrals. */
int mc_count_poly(fmpq *coef, const sgraph *G, wk_table *T);

#endif
