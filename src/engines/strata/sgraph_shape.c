/* sgraph_shape.c - stable graphs with unlabelled legs ("shapes"), for sums whose terms do not
 * depend on which leg sits at which vertex, such as the Masur-Veech volume (every leg carries
 * b = 0).  Labelled legs make the graphs of Mbar_{0,12} number about 10^10; their shapes number
 * a few thousand.
 *
 * A shape is an sgraph of type (g, 0) whose vertex code gv[v] = g_v + SG_SHAPE_BASE n_v holds the
 * genus g_v and the number n_v of legs of vertex v.  The canonical form and |Aut| of
 * sgraph_canon.c then treat the legs as unlabelled: a vertex permutation must preserve both
 * numbers.  Groupoid count (labellings of the n leg slots modulo the automorphisms of the shape,
 * which permute the n_v legs of each vertex freely): the labelled graphs Gamma over a shape S have
 *     sum 1/|Aut Gamma| = n! / (|Aut S| prod_v n_v!)      (sg_shape_weight).
 * The enumeration is the degeneration of sgraph_enum.c with leg counts in place of leg subsets.
 */
#include <stdatomic.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>

#include "sgraph.h"

int sg_shape_genus(const sgraph *S, int v)
{
    return S->gv[v] % SG_SHAPE_BASE;
}

int sg_shape_legs(const sgraph *S, int v)
{
    return S->gv[v] / SG_SHAPE_BASE;
}

static void sh_set(sgraph *S, int v, int gv, int legs)
{
    S->gv[v] = gv + SG_SHAPE_BASE * legs;
}

/* Legs plus half-edges at v. */
static int sh_valence(const sgraph *S, int v)
{
    return sg_shape_legs(S, v) + sgraph_valence(S, v);
}

static int sh_stable(const sgraph *S, int v)
{
    return 2 * sg_shape_genus(S, v) - 2 + sh_valence(S, v) > 0;
}

typedef struct {
    sg_list *L;
    const sgraph *G;
    int v, u;                     /* vertex split, new vertex */
    int nb[SG_MAX_V], nnb;        /* neighbours w != v of v */
    slong max_graphs;
    int rc;
} sh_split;

static void sh_emit(sh_split *S, const sgraph *H)
{
    if (S->rc != SG_OK || !sh_stable(H, S->v) || !sh_stable(H, S->u))
        return;
    S->rc = sg_list_add(S->L, H, NULL);
    if (S->rc == SG_OK && S->max_graphs > 0 && S->L->len > S->max_graphs)
        S->rc = SG_LIMIT;
}

/* Shares the edges to the neighbours nb[j..] between v and u. */
static void sh_neighbours(sh_split *S, sgraph *H, int j)
{
    if (j == S->nnb) {
        sh_emit(S, H);
        return;
    }
    int w = S->nb[j], total = S->G->m[S->v][w];
    for (int a = 0; a <= total && S->rc == SG_OK; a++) {
        H->m[S->u][w] = H->m[w][S->u] = (unsigned char) a;
        H->m[S->v][w] = H->m[w][S->v] = (unsigned char) (total - a);
        sh_neighbours(S, H, j + 1);
    }
    H->m[S->u][w] = H->m[w][S->u] = 0;
    H->m[S->v][w] = H->m[w][S->v] = (unsigned char) total;
}

/* All splits of vertex v: genus and number of legs moving to the new vertex u, loops, then the
   edges to the neighbours. */
static int sh_split_vertex(sg_list *L, const sgraph *G, int v, slong max_graphs)
{
    sh_split S = {L, G, v, G->nv, {0}, 0, max_graphs, SG_OK};
    int gv = sg_shape_genus(G, v), legs = sg_shape_legs(G, v), loops = G->m[v][v];
    for (int w = 0; w < G->nv; w++)
        if (w != v && G->m[v][w])
            S.nb[S.nnb++] = w;
    for (int g1 = 0; g1 <= gv; g1++)
        for (int a = 0; a <= legs; a++)
            for (int l1 = 0; l1 <= loops; l1++)
                for (int l2 = 0; l1 + l2 <= loops; l2++) {
                    sgraph H = *G;
                    H.nv = G->nv + 1;
                    H.ne = G->ne + 1;
                    sh_set(&H, v, gv - g1, legs - a);
                    sh_set(&H, S.u, g1, a);
                    H.m[v][v] = (unsigned char) l1;
                    H.m[S.u][S.u] = (unsigned char) l2;
                    H.m[v][S.u] = H.m[S.u][v] = (unsigned char) (1 + loops - l1 - l2);
                    sh_neighbours(&S, &H, 0);
                    if (S.rc != SG_OK)
                        return S.rc;
                }
    return SG_OK;
}

/* Appends to `next` every one-edge degeneration of every shape of `prev`. */
static int sh_degenerate_all(sg_list *next, const sg_list *prev, slong max_graphs, atomic_int *cancel)
{
    for (slong i = 0; i < prev->len; i++) {
        const sgraph *G = &prev->gr[i];
        if (cancel != NULL && *cancel)
            return SG_CANCELLED;
        for (int v = 0; v < G->nv; v++) {
            int rc;
            if (sg_shape_genus(G, v) > 0) {
                sgraph H = *G;
                sh_set(&H, v, sg_shape_genus(G, v) - 1, sg_shape_legs(G, v));
                H.m[v][v]++;
                H.ne++;
                if ((rc = sg_list_add(next, &H, NULL)) != SG_OK)
                    return rc;
            }
            if (G->nv < SG_MAX_V && (rc = sh_split_vertex(next, G, v, max_graphs)) != SG_OK)
                return rc;
        }
    }
    return SG_OK;
}

int sg_enumerate_shapes(sg_list *L, int g, int n, slong max_graphs, atomic_int *cancel)
{
    sg_list cur, next;
    int dim = 3 * g - 3 + n, rc = SG_OK;
    if (g < 0 || n < 0 || 2 * g - 2 + n <= 0 || g >= SG_SHAPE_BASE || n > SG_SHAPE_MAX_LEGS
        || 2 * g - 2 + n > SG_MAX_V || dim > SG_MAX_E)
        return SG_BADARG;
    sg_list_init(&cur);
    sgraph T;
    sgraph_trivial(&T, g, 0);
    sh_set(&T, 0, g, n);
    rc = sg_list_add(&cur, &T, NULL);
    for (int k = 0; rc == SG_OK && k <= dim; k++) {
        if (k > 0) {
            sg_list_init(&next);
            rc = sh_degenerate_all(&next, &cur, max_graphs, cancel);
            sg_list_clear(&cur);
            cur = next;
        }
        for (slong i = 0; rc == SG_OK && i < cur.len; i++)
            rc = sg_list_add(L, &cur.gr[i], NULL);
        if (rc == SG_OK && max_graphs > 0 && L->len > max_graphs)
            rc = SG_LIMIT;
    }
    sg_list_clear(&cur);
    return rc;
}

void sg_shape_label(sgraph *G, const sgraph *S)
{
    int n = 0;
    *G = *S;
    for (int v = 0; v < S->nv; v++) {
        G->gv[v] = sg_shape_genus(S, v);
        for (int k = 0; k < sg_shape_legs(S, v); k++)
            G->legv[n++] = v;
    }
    G->n = n;
}

int sg_shape_weight(fmpq_t w, const sgraph *S)
{
    fmpz_t aut, f;
    int n = 0, rc;
    fmpz_init(aut);
    fmpz_init(f);
    rc = sgraph_aut(aut, S);
    fmpq_zero(w);
    if (rc == SG_OK) {
        for (int v = 0; v < S->nv; v++) {
            fmpz_fac_ui(f, (ulong) sg_shape_legs(S, v));
            fmpz_mul(aut, aut, f);
            n += sg_shape_legs(S, v);
        }
        fmpz_fac_ui(f, (ulong) n);
        fmpq_set_fmpz_frac(w, f, aut);
    }
    fmpz_clear(aut);
    fmpz_clear(f);
    return rc;
}
