/* mvvol.c - Masur-Veech volumes by the stable-graph formula (mvvol.h states it and its source).
 * For each graph the vertex polynomials N_{g_v,n_v} are expanded monomial by monomial (vertex
 * after vertex, the exponents collected per edge), then Z and Y act edge by edge.
 */
#include <stdatomic.h>
#include <stdlib.h>
#include <string.h>
#include <flint/arith.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "mvvol.h"
#include "sgint.h"

void mv_zeta_even(fmpq_t r, slong k)
{
    fmpz_t f;
    fmpz_init(f);
    arith_bernoulli_number(r, (ulong) (2 * k));
    fmpq_mul_2exp(r, r, (ulong) (2 * k - 1));
    fmpz_fac_ui(f, (ulong) (2 * k));
    fmpq_div_fmpz(r, r, f);
    if (k % 2 == 0)
        fmpq_neg(r, r);
    fmpz_clear(f);
}

typedef struct {
    const sg_dec *D;
    const mv_source *src;
    slong ex[SG_MAX_E];           /* sum over the two halves of 2 d_h, per edge */
    slong d[SG_MAX_H];            /* d_h of the current monomial */
    fmpq *zr;                     /* zr[k] = zeta(2k)/pi^{2k}, k <= kmax */
    fmpq_t vol, prim;
    int rc;
} mv_state;

static int mv_correlator(fmpq_t r, const mv_source *src, slong g, const slong *d, slong n)
{
    int st = src->K != NULL ? wk_kdv_correlator(r, src->K, g, d, n) : wk_correlator(r, src->T, g, d, n);
    return st == WK_OK ? SG_OK : st == WK_CANCELLED ? SG_CANCELLED : SG_LIMIT;
}

/* All monomials chosen: coeff times Z (into vol) and Y (into prim) of prod_e b_e^{1 + ex[e]}. */
static void mv_leaf(mv_state *S, const fmpq_t coeff)
{
    fmpq_t z, y;
    fmpz_t f;
    fmpq_init(z);
    fmpq_init(y);
    fmpz_init(f);
    fmpq_set(z, coeff);
    fmpq_set(y, coeff);
    for (int e = 0; e < (S->D->nh - S->D->n) / 2; e++) {
        slong m = 1 + S->ex[e];
        fmpz_fac_ui(f, (ulong) m);
        fmpq_mul_fmpz(z, z, f);
        fmpq_mul_fmpz(y, y, f);
        fmpq_mul(z, z, S->zr + (m + 1) / 2);
    }
    fmpq_add(S->vol, S->vol, z);
    fmpq_add(S->prim, S->prim, y);
    fmpq_clear(z);
    fmpq_clear(y);
    fmpz_clear(f);
}

static void mv_vertex(mv_state *S, int v, const fmpq_t coeff);

/* Distributes `rest` of vertex v's degree over its non-leg half-edges hv[j..]. */
static void mv_compose(mv_state *S, int v, const int *hv, int nh, int j, slong rest, const fmpq_t coeff)
{
    const sg_dec *D = S->D;
    if (S->rc != SG_OK)
        return;
    if (j == nh) {
        if (rest != 0)
            return;
        slong dv[SG_MAX_H];
        int nv = 0, deg_half = 0;
        fmpq_t c, x;
        fmpz_t f;
        fmpq_init(c);
        fmpq_init(x);
        fmpz_init(f);
        for (int h = 0; h < D->nh; h++)
            if (D->vert[h] == v)
                dv[nv++] = h < D->n ? 0 : S->d[h];
        S->rc = mv_correlator(x, S->src, D->gv[v], dv, nv);
        fmpq_mul(c, coeff, x);
        for (int k = 0; k < nv; k++) {
            fmpz_fac_ui(f, (ulong) dv[k]);
            fmpq_div_fmpz(c, c, f);
        }
        deg_half = 5 * D->gv[v] - 6 + 2 * nv;     /* N_{g,n} carries 2^{-(5g-6+2n)} */
        if (deg_half >= 0)
            fmpq_div_2exp(c, c, (ulong) deg_half);
        else
            fmpq_mul_2exp(c, c, (ulong) -deg_half);
        if (S->rc == SG_OK && !fmpq_is_zero(c))
            mv_vertex(S, v + 1, c);
        fmpq_clear(c);
        fmpq_clear(x);
        fmpz_clear(f);
        return;
    }
    int h = hv[j], e = (h - D->n) / 2;
    for (slong k = 0; k <= rest; k++) {
        S->d[h] = k;
        S->ex[e] += 2 * k;
        mv_compose(S, v, hv, nh, j + 1, rest - k, coeff);
        S->ex[e] -= 2 * k;
    }
    S->d[h] = 0;
}

static void mv_vertex(mv_state *S, int v, const fmpq_t coeff)
{
    const sg_dec *D = S->D;
    if (v == D->nv) {
        mv_leaf(S, coeff);
        return;
    }
    int hv[SG_MAX_H], nh = 0, nv = 0;
    for (int h = 0; h < D->nh; h++)
        if (D->vert[h] == v) {
            nv++;
            if (h >= D->n)
                hv[nh++] = h;
        }
    mv_compose(S, v, hv, nh, 0, 3 * D->gv[v] - 3 + nv, coeff);
}

/* c = 2^{6g-5+2n} (4g-4+n)! / (6g-7+2n)! */
static void mv_constant(fmpq_t c, int g, int n)
{
    fmpz_t a, b;
    fmpz_init(a);
    fmpz_init(b);
    fmpz_fac_ui(a, (ulong) (4 * g - 4 + n));
    fmpz_mul_2exp(a, a, (ulong) (6 * g - 5 + 2 * n));
    fmpz_fac_ui(b, (ulong) (6 * g - 7 + 2 * n));
    fmpq_set_fmpz_frac(c, a, b);
    fmpz_clear(a);
    fmpz_clear(b);
}

int mv_graph(fmpq_t vol, fmpq_t prim, const sgraph *G, const mv_source *src)
{
    mv_state S;
    sg_dec D;
    int dim = 3 * G->g - 3 + G->n, kmax = dim + 1;
    if (vol != NULL)
        fmpq_zero(vol);
    if (prim != NULL)
        fmpq_zero(prim);
    if (G->ne == 0)
        return SG_OK;
    if (dim < 1)
        return SG_BADARG;
    memset(&S, 0, sizeof S);
    sg_dec_from_graph(&D, G);
    S.D = &D;
    S.src = src;
    S.zr = _fmpq_vec_init(kmax + 1);
    for (slong k = 1; k <= kmax; k++)
        mv_zeta_even(S.zr + k, k);
    fmpq_init(S.vol);
    fmpq_init(S.prim);
    fmpq_t one, c;
    fmpz_t aut;
    fmpq_init(one);
    fmpq_init(c);
    fmpz_init(aut);
    fmpq_one(one);
    mv_vertex(&S, 0, one);
    if (S.rc == SG_OK)
        S.rc = sgraph_aut(aut, G);
    if (S.rc == SG_OK) {
        mv_constant(c, G->g, G->n);
        fmpq_div_fmpz(c, c, aut);
        fmpq_div_2exp(c, c, (ulong) (G->nv - 1));
        if (vol != NULL)
            fmpq_mul(vol, S.vol, c);
        if (prim != NULL)
            fmpq_mul(prim, S.prim, c);
    }
    _fmpq_vec_clear(S.zr, kmax + 1);
    fmpq_clear(S.vol);
    fmpq_clear(S.prim);
    fmpq_clear(one);
    fmpq_clear(c);
    fmpz_clear(aut);
    return S.rc;
}

/* The term of one graph of a list: x = its share of the volume. */
typedef int (*mv_term_fn)(fmpq_t x, const sgraph *G, const mv_source *src);

static int mv_graph_term(fmpq_t x, const sgraph *G, const mv_source *src)
{
    return mv_graph(x, NULL, G, src);
}

/* vol = the sum of term over the graphs of L with at least one edge; 0 on any failure. */
static int mv_sum(fmpq_t vol, const sg_list *L, const mv_source *src, atomic_int *cancel, mv_term_fn term)
{
    fmpq_t x;
    int rc = SG_OK;
    fmpq_init(x);
    fmpq_zero(vol);
    for (slong i = 0; rc == SG_OK && i < L->len; i++) {
        if (cancel != NULL && *cancel)
            rc = SG_CANCELLED;
        else if (L->gr[i].ne > 0 && (rc = term(x, &L->gr[i], src)) == SG_OK)
            fmpq_add(vol, vol, x);
    }
    if (rc != SG_OK)
        fmpq_zero(vol);
    fmpq_clear(x);
    return rc;
}

int mv_volume_of(fmpq_t vol, const sg_list *L, const mv_source *src, atomic_int *cancel)
{
    return mv_sum(vol, L, src, cancel, mv_graph_term);
}

/* x = Vol(Gamma) summed over the labelled graphs over the shape S: mv_graph of one of them
   (which divides by its own |Aut|) times |Aut Gamma| times the groupoid weight of S. */
static int mv_shape_term(fmpq_t x, const sgraph *S, const mv_source *src)
{
    sgraph G;
    fmpq_t w;
    fmpz_t aut;
    int rc;
    fmpq_init(w);
    fmpz_init(aut);
    sg_shape_label(&G, S);
    rc = mv_graph(x, NULL, &G, src);
    if (rc == SG_OK)
        rc = sgraph_aut(aut, &G);
    if (rc == SG_OK)
        rc = sg_shape_weight(w, S);
    if (rc == SG_OK) {
        fmpq_mul_fmpz(x, x, aut);
        fmpq_mul(x, x, w);
    }
    fmpq_clear(w);
    fmpz_clear(aut);
    return rc;
}

/* The graphs (labelled or shapes) of (g, n), as sg_enumerate / sg_enumerate_shapes list them. */
typedef int (*mv_list_fn)(sg_list *L, int g, int n, slong max_graphs, atomic_int *cancel);

static int mv_list_labelled(sg_list *L, int g, int n, slong max_graphs, atomic_int *cancel)
{
    return sg_enumerate(L, g, n, -1, max_graphs, cancel);
}

/* vol = the sum of term over the graphs that list gives for (g, n). */
static int mv_volume_with(fmpq_t vol, int g, int n, const mv_source *src, slong max_graphs, atomic_int *cancel,
                          mv_list_fn list, mv_term_fn term)
{
    sg_list L;
    fmpq_zero(vol);
    if (g < 0 || n < 0 || 2 * g - 2 + n <= 0 || 3 * g - 3 + n < 1)
        return SG_BADARG;
    sg_list_init(&L);
    int rc = list(&L, g, n, max_graphs, cancel);
    if (rc == SG_OK)
        rc = mv_sum(vol, &L, src, cancel, term);
    sg_list_clear(&L);
    return rc;
}

int mv_volume(fmpq_t vol, int g, int n, const mv_source *src, slong max_graphs, atomic_int *cancel)
{
    return mv_volume_with(vol, g, n, src, max_graphs, cancel, mv_list_labelled, mv_graph_term);
}

int mv_volume_by_shapes(fmpq_t vol, int g, int n, const mv_source *src, slong max_graphs, atomic_int *cancel)
{
    return mv_volume_with(vol, g, n, src, max_graphs, cancel, sg_enumerate_shapes, mv_shape_term);
}
