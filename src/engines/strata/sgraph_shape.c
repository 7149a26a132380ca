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
#include "sgraph_degen.h"

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

/* All splits of vertex v: genus and number of legs moving to the new vertex u, loops, then the
   edges to the neighbours. */
static int sh_split_vertex(sg_list *L, const sgraph *G, int v, slong max_graphs)
{
    sg_split S;
    int gv = sg_shape_genus(G, v), legs = sg_shape_legs(G, v);
    sg_split_init(&S, L, G, v, max_graphs, sh_stable);
    for (int g1 = 0; g1 <= gv && S.rc == SG_OK; g1++)
        for (int a = 0; a <= legs && S.rc == SG_OK; a++) {
            sgraph H = *G;
            sh_set(&H, v, gv - g1, legs - a);
            sh_set(&H, S.u, g1, a);
            sg_split_loops(&S, &H);
        }
    return S.rc;
}

static void sh_lower_genus(sgraph *H, int v)
{
    sh_set(H, v, sg_shape_genus(H, v) - 1, sg_shape_legs(H, v));
}

int sg_enumerate_shapes(sg_list *L, int g, int n, slong max_graphs, atomic_int *cancel)
{
    int dim = 3 * g - 3 + n;
    if (g < 0 || n < 0 || 2 * g - 2 + n <= 0 || g >= SG_SHAPE_BASE || n > SG_SHAPE_MAX_LEGS
        || 2 * g - 2 + n > SG_MAX_V || dim > SG_MAX_E)
        return SG_BADARG;
    sgraph T;
    sgraph_trivial(&T, g, 0);
    sh_set(&T, 0, g, n);
    static const sg_kind shapes = {sg_shape_genus, sh_lower_genus, sh_split_vertex};
    return sg_enumerate_levels(L, &T, dim, -1, max_graphs, cancel, &shapes);
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
