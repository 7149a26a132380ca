/* mvvol.h - Masur-Veech volumes Vol Q_{g,n} of the principal strata of quadratic differentials
 * by the stable-graph formula of Delecroix-Goujard-Zograf-Zorich ("Masur-Veech volumes,
 * frequencies of simple closed geodesics and intersection numbers of moduli spaces of curves",
 * Duke Math. J. 170, 2021):
 *     Vol Q_{g,n} = sum over stable graphs Gamma of type (g,n) with at least one edge of Vol(Gamma),
 *     Vol(Gamma) = c_{g,n} / (2^{|V|-1} |Aut Gamma|) * Z( prod_e b_e prod_v N_{g_v,n_v}(b_v) ),
 *     c_{g,n} = 2^{6g-5+2n} (4g-4+n)! / (6g-7+2n)!,
 *     N_{g,n}(b_1..b_n) = sum_{|d| = 3g-3+n} <tau_d>_g / (2^{5g-6+2n} prod d_i!) prod b_i^{2 d_i}
 * (b_i = 0 at the legs; both half-edges of an edge e carry b_e), and the linear operator
 *     Z: prod_e b_e^{m_e} -> prod_e m_e! zeta(m_e + 1).
 * Every m_e is odd, so Vol(Gamma) = (rational) pi^{6g-6+2n}; only the rational is returned.
 * The primitive part (weights all 1) replaces Z by Y: b^m -> m!; it is proportional to
 * Mirzakhani's frequency of the multicurve whose dual graph is Gamma.
 *
 * Ownership: nothing retained; T is the caller's.  Errors: SG_* codes (sgraph.h); WK failures
 * of the correlators are SG_LIMIT / SG_CANCELLED.
 */
#ifndef PSIKAPPA_STRATA_MVVOL_H
#define PSIKAPPA_STRATA_MVVOL_H

#include <stdatomic.h>
#include <flint/fmpq.h>

#include "correlators/wk.h"
#include "correlators/wk_kdv.h"
#include "sgraph.h"

#ifdef __cplusplus
extern "C" {
#endif

/* Source of the correlators <tau_d>: the DVV table T (wk_correlator) when K is NULL, else the
   independent KdV recursion K (wk_kdv.h; for --verify and tests).  Neither is owned. */
typedef struct {
    wk_table *T;
    wk_kdv_table *K;
} mv_source;

/* vol = Vol(Gamma) / pi^{6g-6+2n} and prim = the same with Y in place of Z (either may be
   NULL).  vol = prim = 0 for the graph without edges. */
int mv_graph(fmpq_t vol, fmpq_t prim, const sgraph *G, const mv_source *src);

/* vol = Vol Q_{g,n} / pi^{6g-6+2n} summed over the graphs of L (all graphs of (g,n)). */
int mv_volume_of(fmpq_t vol, const sg_list *L, const mv_source *src, atomic_int *cancel);

/* The same after enumerating the graphs (max_graphs as sg_enumerate).  SG_BADARG for
   2g-2+n <= 0 or 3g-3+n < 1 (no quadratic differentials with a cylinder). */
int mv_volume(fmpq_t vol, int g, int n, const mv_source *src, slong max_graphs, atomic_int *cancel);

/* The same sum over the shapes of (g, n) (graphs with unlabelled legs, sgraph.h): one term per
   shape, weighted by the number of its labellings over their automorphisms; the labelled graphs
   are never listed (Mbar_{0,12}: about 10^10 of them, a few thousand shapes).  Same errors,
   and SG_BADARG when g or n is beyond the shapes' ranges (g < SG_SHAPE_BASE,
   n <= SG_SHAPE_MAX_LEGS); max_graphs bounds the number of shapes. */
int mv_volume_by_shapes(fmpq_t vol, int g, int n, const mv_source *src, slong max_graphs, atomic_int *cancel);
/* zeta(2k) / pi^{2k} = (-1)^{k+1} B_{2k} 2^{2k-1} / (2k)! for k >= 1. */
void mv_zeta_even(fmpq_t r, slong k);

#ifdef __cplusplus
}
#endif

#endif
