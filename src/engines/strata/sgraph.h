/* sgraph.h - stable graphs of type (g, n): vertices with a genus, legs 1..n, edges and loops,
 * every vertex stable (2 g_v - 2 + n_v > 0, n_v counting legs and half-edges).
 *
 * A graph is stored by its edge multiplicities: m[v][w] = m[w][v] edges between v != w and
 * m[v][v] loops at v, plus the vertex of each leg.  Isomorphisms fix the legs; |Aut| counts
 * automorphisms of the graph with its half-edges: vertex permutations, permutations of parallel
 * edges and flips of loops, so |Aut| = |Aut_V| prod_{v<w} m_vw! prod_v (2^{m_vv} m_vv!).
 *
 * Two enumerations (sgraph_enum.c): by degeneration (every graph with k edges is a one-edge
 * degeneration of a graph with k-1 edges) and directly (vertex genera, leg counts and edge
 * multiplicities, then the labelled legs); both deduplicate by the canonical form
 * (sgraph_canon.c: colour refinement, then the least code over the permutations inside colour
 * classes, with prefix pruning).
 *
 * Ownership: an sg_list owns its graphs; sg_list_init / sg_list_clear pair.  Graphs are plain
 * values (no pointers) and may be copied with assignment.
 * Error policy: nothing aborts; functions return SG_OK or an error code.
 */
#ifndef PSIKAPPA_STRATA_SGRAPH_H
#define PSIKAPPA_STRATA_SGRAPH_H

#include <stdatomic.h>
#include <signal.h>
#include <flint/flint.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>

#ifdef __cplusplus
extern "C" {
#endif

#define SG_MAX_V 24   /* vertices: at most 2g-2+n */
#define SG_MAX_N 24   /* legs */
#define SG_MAX_E 32   /* edges: at most 3g-3+n */

enum { SG_OK = 0, SG_BADARG = 1, SG_LIMIT = 2, SG_CANCELLED = 3, SG_NOMEM = 4 };

typedef struct {
    int g, n;                          /* type of the graph */
    int nv, ne;                        /* vertices, edges (loops included) */
    int gv[SG_MAX_V];                  /* genus of each vertex */
    int legv[SG_MAX_N];                /* vertex of leg i+1 */
    unsigned char m[SG_MAX_V][SG_MAX_V];
} sgraph;

/* Canonical code: equal for isomorphic graphs only (sgraph_key). */
#define SG_KEY_BYTES (2 + SG_MAX_V + SG_MAX_V * (SG_MAX_V + 1) / 2 + SG_MAX_N)

typedef struct {
    slong len, alloc;
    sgraph *gr;
    unsigned char *keys;     /* len keys of SG_KEY_BYTES */
    slong *slot;             /* open addressing on keys, -1 empty */
    slong nslots;
} sg_list;

void sg_list_init(sg_list *L);
void sg_list_clear(sg_list *L);

/* Adds the canonical form of G unless an isomorphic graph is present.  *added (may be NULL)
   says whether it was new.  SG_OK, SG_NOMEM, or SG_LIMIT when the canonical form would need
   more than SG_CANON_MAX_PERMS permutations. */
int sg_list_add(sg_list *L, const sgraph *G, int *added);

/* Index of the graph isomorphic to G in L, or -1. */
slong sg_list_find(const sg_list *L, const sgraph *G);

/* The one-vertex graph of type (g, n). */
void sgraph_trivial(sgraph *G, int g, int n);

/* Valence n_v of vertex v (legs plus half-edges). */
int sgraph_valence(const sgraph *G, int v);

/* Whether G is a consistent stable graph of its type: connected, every vertex stable, genus
   sum g_v + ne - nv + 1 = g, legs on existing vertices, ne the number of edges. */
int sgraph_is_valid(const sgraph *G);

#define SG_CANON_MAX_PERMS 2000000

/* C = canonical relabelling of G, key = its code (SG_KEY_BYTES, zero padded), *autv (may be
   NULL) = |Aut_V| the vertex permutations preserving G.  SG_OK or SG_LIMIT. */
int sgraph_canonical(sgraph *C, unsigned char *key, slong *autv, const sgraph *G);

/* aut = |Aut G| (legs fixed; edge permutations and loop flips included). */
int sgraph_aut(fmpz_t aut, const sgraph *G);

/* All stable graphs of type (g, n) with exactly `edges` edges (edges < 0: every number),
   appended to L (which should be empty), by degeneration.  Refuses with SG_LIMIT before work
   when sg_estimate_count exceeds max_graphs (<= 0: no limit), or when L would exceed it.
   *cancel (may be NULL) is polled.  SG_BADARG for unstable or oversized (g, n). */
int sg_enumerate(sg_list *L, int g, int n, int edges, slong max_graphs, atomic_int *cancel);

/* The same set by the direct construction (independent of sg_enumerate except for the
   canonical form); for tests. */
int sg_enumerate_direct(sg_list *L, int g, int n, int edges, atomic_int *cancel);

/* A rough upper estimate of the number of stable graphs of type (g, n) (all edge counts), from
   the genus-0 count and growth per genus; used to refuse before enumerating.  HUGE_VAL when
   beyond 1e15. */
double sg_estimate_count(int g, int n);

/* Shapes (sgraph_shape.c): stable graphs of type (g, n) with unlabelled legs, stored as sgraphs
   of type (g, 0) whose vertex code gv[v] = g_v + SG_SHAPE_BASE n_v holds the genus and the
   number of legs of the vertex (so g < SG_SHAPE_BASE, n <= SG_SHAPE_MAX_LEGS: the code is one
   byte of the canonical key).  Not valid sgraphs: expand them with sg_shape_label. */
#define SG_SHAPE_BASE 16
#define SG_SHAPE_MAX_LEGS 15
int sg_shape_genus(const sgraph *S, int v);
int sg_shape_legs(const sgraph *S, int v);
/* All shapes of type (g, n), every number of edges, appended to L (which should be empty);
   SG_LIMIT when L would exceed max_graphs (<= 0: no limit), SG_BADARG outside the ranges above
   or for unstable (g, n).  *cancel (may be NULL) is polled. */
int sg_enumerate_shapes(sg_list *L, int g, int n, slong max_graphs, atomic_int *cancel);
/* G = a labelled stable graph over the shape S (legs 1..n placed vertex by vertex). */
void sg_shape_label(sgraph *G, const sgraph *S);
/* w = n! / (|Aut S| prod_v n_v!) = sum of 1/|Aut Gamma| over the labelled graphs Gamma over S
   (up to isomorphism); SG_OK or the error of sgraph_aut. */
int sg_shape_weight(fmpq_t w, const sgraph *S);

/* Writes a readable form "[g=1; legs 1,2 | loop]" style (sgraph_print.c) into buf of size sz;
   returns the length that was needed. */
slong sgraph_snprint(char *buf, slong sz, const sgraph *G);

#ifdef __cplusplus
}
#endif

#endif
