/* sgraph_enum.c - the two enumerations of stable graphs of type (g, n).
 *
 * By degeneration: contracting any edge of a stable graph with k edges gives a stable graph with
 * k-1 edges, so the graphs with k edges are the one-edge degenerations of those with k-1 edges:
 * at a vertex v either a loop (g_v -> g_v - 1), or a split of v into two vertices joined by a new
 * edge, the genus, legs, edges to other vertices and loops at v shared out (a loop may also
 * become an edge between the two halves).  Directly: vertex genera and leg counts, edge
 * multiplicities of total k, connected and stable, then every placement of the labelled legs.
 * Both deduplicate by the canonical form.
 */
#include <stdatomic.h>
#include <math.h>
#include <string.h>

#include "sgraph.h"
#include "sgraph_degen.h"

/* Largest 2g-2+n / 3g-3+n the enumerations accept (vertices and edges fit the fixed arrays). */
static int sg_type_ok(int g, int n)
{
    return g >= 0 && n >= 0 && n <= SG_MAX_N && 2 * g - 2 + n > 0 && 2 * g - 2 + n <= SG_MAX_V
           && 3 * g - 3 + n <= SG_MAX_E;
}

void sg_split_init(sg_split *S, sg_list *L, const sgraph *G, int v, slong max_graphs, sg_vertex_ok_fn ok)
{
    memset(S, 0, sizeof *S);
    S->L = L, S->G = G, S->v = v, S->u = G->nv, S->max_graphs = max_graphs, S->ok = ok, S->rc = SG_OK;
    for (int w = 0; w < G->nv; w++)
        if (w != v && G->m[v][w])
            S->nb[S->nnb++] = w;
}

static void split_emit(sg_split *S, sgraph *H)
{
    if (S->rc != SG_OK || !S->ok(H, S->v) || !S->ok(H, S->u))
        return;
    S->rc = sg_list_add(S->L, H, NULL);
    if (S->rc == SG_OK && S->max_graphs > 0 && S->L->len > S->max_graphs)
        S->rc = SG_LIMIT;
}

void sg_split_neighbours(sg_split *S, sgraph *H, int j)
{
    if (j == S->nnb) {
        split_emit(S, H);
        return;
    }
    int w = S->nb[j], total = S->G->m[S->v][w];
    for (int a = 0; a <= total; a++) {
        H->m[S->u][w] = H->m[w][S->u] = (unsigned char) a;
        H->m[S->v][w] = H->m[w][S->v] = (unsigned char) (total - a);
        sg_split_neighbours(S, H, j + 1);
    }
    H->m[S->u][w] = H->m[w][S->u] = 0;
    H->m[S->v][w] = H->m[w][S->v] = (unsigned char) total;
}

void sg_split_loops(sg_split *S, const sgraph *H0)
{
    int loops = S->G->m[S->v][S->v];
    for (int l1 = 0; l1 <= loops && S->rc == SG_OK; l1++)
        for (int l2 = 0; l1 + l2 <= loops && S->rc == SG_OK; l2++) {
            sgraph H = *H0;
            H.nv = S->G->nv + 1;
            H.ne = S->G->ne + 1;
            H.m[S->v][S->v] = (unsigned char) l1;
            H.m[S->u][S->u] = (unsigned char) l2;
            H.m[S->v][S->u] = H.m[S->u][S->v] = (unsigned char) (1 + loops - l1 - l2);
            sg_split_neighbours(S, &H, 0);
        }
}

static int labelled_vertex_ok(const sgraph *H, int v)
{
    return 2 * H->gv[v] - 2 + sgraph_valence(H, v) > 0;
}

/* All splits of vertex v of G: genus, legs (a subset moves to u), loops, then neighbours. */
static int split_vertex(sg_list *L, const sgraph *G, int v, slong max_graphs)
{
    sg_split S;
    int legs[SG_MAX_N], nl = 0;
    sg_split_init(&S, L, G, v, max_graphs, labelled_vertex_ok);
    for (int i = 0; i < G->n; i++)
        if (G->legv[i] == v)
            legs[nl++] = i;
    for (int g1 = 0; g1 <= G->gv[v] && S.rc == SG_OK; g1++)
        for (ulong mask = 0; mask < (1UL << nl) && S.rc == SG_OK; mask++) {
            sgraph H = *G;
            H.gv[v] = G->gv[v] - g1;
            H.gv[S.u] = g1;
            for (int k = 0; k < nl; k++)
                if (mask >> k & 1)
                    H.legv[legs[k]] = S.u;
            sg_split_loops(&S, &H);
        }
    return S.rc;
}

/* Appends to `next` every one-edge degeneration of every graph of `prev`. */
static int degenerate_all(sg_list *next, const sg_list *prev, slong max_graphs, atomic_int *cancel,
                          const sg_kind *kind)
{
    for (slong i = 0; i < prev->len; i++) {
        const sgraph *G = &prev->gr[i];
        if (cancel != NULL && *cancel)
            return SG_CANCELLED;
        for (int v = 0; v < G->nv; v++) {
            int rc;
            if (kind->genus(G, v) > 0) {
                sgraph H = *G;
                kind->lower_genus(&H, v);
                H.m[v][v]++;
                H.ne++;
                if ((rc = sg_list_add(next, &H, NULL)) != SG_OK)
                    return rc;
            }
            if (G->nv < SG_MAX_V && (rc = kind->split(next, G, v, max_graphs)) != SG_OK)
                return rc;
        }
    }
    return SG_OK;
}

static int labelled_genus(const sgraph *G, int v)
{
    return G->gv[v];
}

static void labelled_lower_genus(sgraph *H, int v)
{
    H->gv[v]--;
}

static int list_append_all(sg_list *L, const sg_list *from)
{
    for (slong i = 0; i < from->len; i++) {
        int rc = sg_list_add(L, &from->gr[i], NULL);
        if (rc != SG_OK)
            return rc;
    }
    return SG_OK;
}

int sg_enumerate_levels(sg_list *L, const sgraph *start, int dim, int edges, slong max_graphs, atomic_int *cancel,
                        const sg_kind *kind)
{
    sg_list cur, next;
    int rc;
    sg_list_init(&cur);
    rc = sg_list_add(&cur, start, NULL);
    for (int k = 0; rc == SG_OK && k <= (edges < 0 ? dim : edges); k++) {
        if (k > 0) {
            sg_list_init(&next);
            rc = degenerate_all(&next, &cur, max_graphs, cancel, kind);
            sg_list_clear(&cur);
            cur = next;
        }
        if (rc == SG_OK && (edges < 0 || k == edges))
            rc = list_append_all(L, &cur);
        if (rc == SG_OK && max_graphs > 0 && L->len > max_graphs)
            rc = SG_LIMIT;
    }
    sg_list_clear(&cur);
    return rc;
}

int sg_enumerate(sg_list *L, int g, int n, int edges, slong max_graphs, atomic_int *cancel)
{
    int dim = 3 * g - 3 + n;
    if (!sg_type_ok(g, n) || edges > dim)
        return SG_BADARG;
    if (max_graphs > 0 && sg_estimate_count(g, n) > (double) max_graphs)
        return SG_LIMIT;
    static const sg_kind labelled = {labelled_genus, labelled_lower_genus, split_vertex};
    sgraph T;
    sgraph_trivial(&T, g, n);
    return sg_enumerate_levels(L, &T, dim, edges, max_graphs, cancel, &labelled);
}

/* ---- the direct construction ---- */

typedef struct {
    sg_list *L;
    sgraph G;                     /* vertex genera and edges set; legs being placed */
    int nlegs[SG_MAX_V], left[SG_MAX_V];
    int k;                        /* edges wanted */
    atomic_int *cancel;
    int rc;
} direct_state;

static void direct_place_legs(direct_state *S, int i)
{
    if (S->rc != SG_OK)
        return;
    if (i == S->G.n) {
        S->rc = sg_list_add(S->L, &S->G, NULL);
        return;
    }
    for (int v = 0; v < S->G.nv; v++)
        if (S->left[v] > 0) {
            S->left[v]--;
            S->G.legv[i] = v;
            direct_place_legs(S, i + 1);
            S->left[v]++;
        }
}

/* Whether the edges of G join all its vertices. */
static int direct_connected(const sgraph *G)
{
    int seen[SG_MAX_V] = {0}, stack[SG_MAX_V], top = 0, count = 1;
    seen[0] = 1;
    stack[top++] = 0;
    while (top > 0) {
        int v = stack[--top];
        for (int w = 0; w < G->nv; w++)
            if (!seen[w] && G->m[v][w]) {
                seen[w] = 1;
                count++;
                stack[top++] = w;
            }
    }
    return count == G->nv;
}

/* With all edges set: stable and connected, then every placement of the legs. */
static void direct_finish(direct_state *S)
{
    int nv = S->G.nv;
    S->G.ne = S->k;
    for (int u = 0; u < nv; u++) {
        int val = S->nlegs[u];
        for (int x = 0; x < nv; x++)
            val += (x == u ? 2 : 1) * S->G.m[u][x];
        if (2 * S->G.gv[u] - 2 + val <= 0)
            return;
        S->left[u] = S->nlegs[u];
    }
    if (direct_connected(&S->G))
        direct_place_legs(S, 0);
}

/* Fills the upper triangle pair by pair (pair t = (pv[t], pw[t]), v <= w), `rest` edges to go. */
static void direct_edges(direct_state *S, const int *pv, const int *pw, int npairs, int t, int rest)
{
    if (S->rc != SG_OK)
        return;
    if (S->cancel != NULL && *S->cancel) {
        S->rc = SG_CANCELLED;
        return;
    }
    if (t == npairs) {
        if (rest == 0)
            direct_finish(S);
        return;
    }
    int v = pv[t], w = pw[t];
    for (int a = 0; a <= rest; a++) {
        S->G.m[v][w] = S->G.m[w][v] = (unsigned char) a;
        direct_edges(S, pv, pw, npairs, t + 1, rest - a);
    }
    S->G.m[v][w] = S->G.m[w][v] = 0;
}

/* Vertex data (g_v, legs_v) in non-increasing order from vertex j on, with sums left. */
static void direct_vertices(direct_state *S, int j, int gleft, int nleft)
{
    int nv = S->G.nv;
    if (S->rc != SG_OK)
        return;
    if (j == nv) {
        int pv[SG_MAX_V * (SG_MAX_V + 1) / 2], pw[SG_MAX_V * (SG_MAX_V + 1) / 2], np = 0;
        for (int v = 0; v < nv; v++)
            for (int w = v; w < nv; w++)
                pv[np] = v, pw[np++] = w;
        if (gleft == 0 && nleft == 0)
            direct_edges(S, pv, pw, np, 0, S->k);
        return;
    }
    for (int gv = gleft; gv >= 0; gv--)
        for (int nl = nleft; nl >= 0; nl--) {
            if (j > 0 && (gv > S->G.gv[j - 1] || (gv == S->G.gv[j - 1] && nl > S->nlegs[j - 1])))
                continue;
            S->G.gv[j] = gv;
            S->nlegs[j] = nl;
            direct_vertices(S, j + 1, gleft - gv, nleft - nl);
        }
}

int sg_enumerate_direct(sg_list *L, int g, int n, int edges, atomic_int *cancel)
{
    int dim = 3 * g - 3 + n;
    if (!sg_type_ok(g, n) || edges > dim)
        return SG_BADARG;
    for (int k = (edges < 0 ? 0 : edges); k <= (edges < 0 ? dim : edges); k++)
        for (int nv = 1; nv <= 2 * g - 2 + n && nv <= k + 1; nv++) {
            int h1 = k - nv + 1;
            if (h1 > g)
                continue;
            direct_state S;
            memset(&S, 0, sizeof S);
            S.L = L;
            S.G.g = g;
            S.G.n = n;
            S.G.nv = nv;
            S.k = k;
            S.cancel = cancel;
            direct_vertices(&S, 0, g - h1, n);
            if (S.rc != SG_OK)
                return S.rc;
        }
    return SG_OK;
}

double sg_estimate_count(int g, int n)
{
    /* Fitted to the measured counts (bench_strata): from (0,3), (1,1) or (g,0) with
       7 * prod_{k=3..g} 3(k-1) graphs (7, 42, 379, 4555 for g = 2..5), each further leg
       multiplies the count by about 2.6 (n + 1.2 g) - 3.5; the result lies within a factor of
       two above the counts of 3g-3+n <= 9. */
    double e = g == 0 ? 1.0 : g == 1 ? 2.0 : 7.0;
    int n0 = g == 0 ? 3 : g == 1 ? 1 : 0;
    if (g < 0 || n < 0 || 2 * g - 2 + n <= 0)
        return 0.0;
    for (int k = 3; k <= g && e <= 1e15; k++)
        e *= 3.0 * (k - 1);
    for (int k = n0; k < n && e <= 1e15; k++) {
        double r = 2.6 * (k + 1.2 * g) - 3.5;
        e *= r < 1.5 ? 1.5 : r;
    }
    return e > 1e15 ? HUGE_VAL : 1.3 * e;
}
