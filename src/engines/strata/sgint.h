/* sgint.h - integrals of decorated boundary strata of Mbar_{g,n} against psi and kappa classes,
 * and products with boundary divisors.
 *
 * Convention (docs/conventions.md, "Boundary strata"): for a stable graph Gamma with gluing map
 * xi_Gamma: prod_v Mbar_{g_v,n_v} -> Mbar_{g,n} and a class alpha on the product,
 *     [Gamma, alpha] = (1/|Aut Gamma|) xi_Gamma*(alpha),
 * so int_{Mbar_{1,1}} delta_irr = 1/2.  xi^* psi_i = psi at leg i on its vertex and
 * xi^* kappa_a = sum_v kappa_a(v), so
 *     int [Gamma, alpha] psi^a kappa^b = (1/|Aut|) sum over the ways to share the kappa factors
 *     among the vertices of prod_v int_{Mbar_v} (...)   (vertex integrals by pushforward.h).
 *
 * A class is held as a list of terms coeff * xi_Gamma*(alpha) with alpha a product of psi
 * classes at half-edges and kappa monomials at vertices (sg_dec); the 1/|Aut| is in coeff.
 * The product with a boundary divisor D pulls D back along xi_Gamma: at each vertex the
 * one-edge degenerations whose new edge has the type of D (each with its own 1/|Aut|), and for
 * each edge of Gamma of that type the excess term -psi' - psi'' (the normal bundle of the branch).
 *
 * Ownership: sg_terms owns its array (sg_terms_init / sg_terms_clear).  The wk_table is the
 * caller's.  Error policy: SG_* codes of sgraph.h; WK_* failures of the vertex integrals are
 * returned as SG_LIMIT (memory, limits) or SG_CANCELLED.
 */
#ifndef PSIKAPPA_STRATA_SGINT_H
#define PSIKAPPA_STRATA_SGINT_H

#include <flint/fmpq.h>

#include "correlators/wk.h"
#include "sgraph.h"

#ifdef __cplusplus
extern "C" {
#endif

#define SG_MAX_H (SG_MAX_N + 2 * SG_MAX_E)
#define SG_KMAX 32

typedef struct {
    int g, n, nv, nh;             /* half-edges 0..n-1 are the legs 1..n */
    int gv[SG_MAX_V];
    int vert[SG_MAX_H];           /* vertex of each half-edge */
    int opp[SG_MAX_H];            /* other half of its edge, -1 for a leg */
    int pe[SG_MAX_H];             /* exponent of psi at the half-edge */
    int kap[SG_MAX_V][SG_KMAX + 1];   /* kappa_j multiplicities at each vertex (j >= 1) */
} sg_dec;

typedef struct {
    fmpq_t coeff;
    sg_dec d;
} sg_term;

typedef struct {
    slong len, alloc;
    sg_term *t;
} sg_terms;

/* A boundary divisor: delta_irr (irr = 1) or delta_{h,S} (legs in S, bit i for leg i+1). */
typedef struct {
    int irr, h;
    ulong S;
} sg_divisor;

void sg_terms_init(sg_terms *L);
void sg_terms_clear(sg_terms *L);
/* Appends coeff * d (copies both).  SG_OK or SG_NOMEM. */
int sg_terms_push(sg_terms *L, const fmpq_t coeff, const sg_dec *d);

/* The undecorated decoration of G (no psi, no kappa); half-edges of edges in the order of G. */
void sg_dec_from_graph(sg_dec *D, const sgraph *G);

/* L += [G] = (1/|Aut G|) xi_G*(1). */
int sg_terms_push_stratum(sg_terms *L, const sgraph *G);

/* The graph of the divisor D on Mbar_{g,n}: SG_BADARG when D does not exist there (g = 0 for
   delta_irr, an unstable side, S outside 1..n). */
int sg_divisor_graph(sgraph *G, int g, int n, const sg_divisor *D);

/* out = D * L (out is emptied first; L is not changed).  SG_BADARG when a term carries kappa
   classes at a vertex (pull-backs of vertex kappas are not shared out here). */
int sg_terms_times_divisor(sg_terms *out, const sg_terms *L, const sg_divisor *D, slong max_graphs);

/* out = [A] . [B] by the generic-graph rule of Graber-Pandharipande (sgprod.c), independent of
   sg_terms_times_divisor; out is emptied first.  SG_BADARG when the types differ. */
int sg_terms_product_graphs(sg_terms *out, const sgraph *A, const sgraph *B, slong max_graphs);

/* res = int_{prod Mbar_v} xi^*(prod psi_i^{a_i} prod_j kappa_j^{kmult[j]}) * alpha, without any
   1/|Aut| (a may be NULL: no psi; kmult[0] ignored, kmax <= SG_KMAX). */
int sg_dec_integral(fmpq_t res, wk_table *T, const sg_dec *D, const slong *a, const slong *kmult, int kmax);

/* res = sum of coeff * sg_dec_integral over the terms of L. */
int sg_terms_integral(fmpq_t res, wk_table *T, const sg_terms *L, const slong *a, const slong *kmult, int kmax);

/* The same with every vertex integral by the Kaufmann-Manin-Zagier time shift (kappashift.h)
   instead of the set-partition pushforward: the second route of --verify. */
int sg_terms_integral_shift(fmpq_t res, wk_table *T, const sg_terms *L, const slong *a, const slong *kmult, int kmax);

#ifdef __cplusplus
}
#endif

#endif
