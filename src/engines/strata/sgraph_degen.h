/* sgraph_degen.h - the pieces of the enumeration by degeneration that the labelled graphs
 * (sgraph_enum.c) and the shapes (sgraph_shape.c) share: sharing a split vertex's edges between
 * its two halves, and the loop over edge counts.  Not a public header.
 */
#ifndef PSIKAPPA_STRATA_SGRAPH_DEGEN_H
#define PSIKAPPA_STRATA_SGRAPH_DEGEN_H

#include <stdatomic.h>
#include "sgraph.h"

/* Whether vertex v of H is stable (legs counted as the graph kind stores them). */
typedef int (*sg_vertex_ok_fn)(const sgraph *H, int v);

/* One split of vertex v of G into v and a new vertex u; graphs found are added to L. */
typedef struct {
    sg_list *L;
    const sgraph *G;
    int v, u;                     /* vertex split, new vertex */
    int nb[SG_MAX_V], nnb;        /* neighbours w != v of v */
    slong max_graphs;
    sg_vertex_ok_fn ok;
    int rc;
} sg_split;

void sg_split_init(sg_split *S, sg_list *L, const sgraph *G, int v, slong max_graphs, sg_vertex_ok_fn ok);
/* Shares the edges to the neighbours nb[j..] between v and u in H (restored afterwards) and adds
   every result whose two halves are stable; S->rc holds the first error. */
void sg_split_neighbours(sg_split *S, sgraph *H, int j);

/* The splits of S->v with the genus and legs already shared out in H0: every distribution of
   the loops of v (kept at v, moved to u, or turned into v-u edges), then the neighbours; one new
   v-u edge always. */
void sg_split_loops(sg_split *S, const sgraph *H0);

/* What distinguishes the kinds of graph: the genus of a vertex, lowering it by one, and all the
   splits of a vertex (graphs added to L). */
typedef struct {
    int (*genus)(const sgraph *G, int v);
    void (*lower_genus)(sgraph *H, int v);
    int (*split)(sg_list *L, const sgraph *G, int v, slong max_graphs);
} sg_kind;

/* From the one-vertex graph `start`, the graphs with 0, 1, ..., dim edges (only `edges` edges
   when edges >= 0) appended to L, each level the one-edge degenerations (a loop at a vertex of
   positive genus, or a split) of the one before; SG_LIMIT once L exceeds max_graphs (> 0). */
int sg_enumerate_levels(sg_list *L, const sgraph *start, int dim, int edges, slong max_graphs, atomic_int *cancel,
                        const sg_kind *kind);

#endif
