/* sgraph_canon.c - canonical form and automorphism count of stable graphs, and the
 * deduplicating list.  Vertices are first coloured by label-free invariants (genus, loops,
 * the legs carried, valence), refined by the multiset of (neighbour colour, multiplicity)
 * until stable; the canonical order puts colours in increasing order and, inside each colour
 * class, takes the permutation with the least lower-triangle multiplicity code.  Vertices with
 * legs are alone in their class (their legs are labelled), so only leg-free vertices permute.
 */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>

#include "hash.h"
#include "sgraph.h"

#define SIG_LEN (4 + 2 * SG_MAX_V)

void sgraph_trivial(sgraph *G, int g, int n)
{
    memset(G, 0, sizeof *G);
    G->g = g;
    G->n = n;
    G->nv = 1;
    G->gv[0] = g;
}

int sgraph_valence(const sgraph *G, int v)
{
    int val = 0;
    for (int i = 0; i < G->n; i++)
        val += G->legv[i] == v;
    for (int w = 0; w < G->nv; w++)
        val += (w == v ? 2 : 1) * G->m[v][w];
    return val;
}

/* Whether all vertices are reachable from vertex 0 along edges. */
static int sgraph_connected(const sgraph *G)
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

int sgraph_is_valid(const sgraph *G)
{
    int ne = 0, gsum = 0;
    if (G->nv < 1 || G->nv > SG_MAX_V || G->n < 0 || G->n > SG_MAX_N || G->g < 0)
        return 0;
    for (int i = 0; i < G->n; i++)
        if (G->legv[i] < 0 || G->legv[i] >= G->nv)
            return 0;
    for (int v = 0; v < G->nv; v++) {
        if (G->gv[v] < 0 || 2 * G->gv[v] - 2 + sgraph_valence(G, v) <= 0)
            return 0;
        gsum += G->gv[v];
        for (int w = v; w < G->nv; w++) {
            if (G->m[v][w] != G->m[w][v])
                return 0;
            ne += G->m[v][w];
        }
    }
    return ne == G->ne && gsum + ne - G->nv + 1 == G->g && sgraph_connected(G);
}

static int sig_cmp(const int *a, const int *b)
{
    for (int k = 0; k < SIG_LEN; k++)
        if (a[k] != b[k])
            return a[k] < b[k] ? -1 : 1;
    return 0;
}

/* Replaces colour[v] by the rank of sig[v] among the distinct signatures; returns the number
   of distinct colours.  Ranks depend only on the signatures, not on the vertex numbering. */
static int colour_rank(int *colour, int sig[][SIG_LEN], int nv)
{
    int order[SG_MAX_V], ncol = 0;
    for (int v = 0; v < nv; v++) {           /* insertion sort of vertex indices by signature */
        int k = v;
        while (k > 0 && sig_cmp(sig[order[k - 1]], sig[v]) > 0) {
            order[k] = order[k - 1];
            k--;
        }
        order[k] = v;
    }
    for (int k = 0; k < nv; k++) {
        if (k > 0 && sig_cmp(sig[order[k - 1]], sig[order[k]]) != 0)
            ncol++;
        colour[order[k]] = ncol;
    }
    return nv > 0 ? ncol + 1 : 0;
}

/* Colour refinement: initial invariants, then neighbourhoods until the colour count is stable. */
static void colour_refine(int *colour, const sgraph *G)
{
    int sig[SG_MAX_V][SIG_LEN], ncol, prev = 0;
    memset(sig, 0, sizeof sig);
    for (int v = 0; v < G->nv; v++) {
        int first = 0, count = 0;
        for (int i = G->n - 1; i >= 0; i--)
            if (G->legv[i] == v) {
                first = i + 1;
                count++;
            }
        /* a vertex with legs: its least leg identifies it; leg-free vertices sort last */
        sig[v][0] = first > 0 ? first : SG_MAX_N + 1;
        sig[v][1] = G->gv[v];
        sig[v][2] = G->m[v][v];
        sig[v][3] = sgraph_valence(G, v) - count;
    }
    ncol = colour_rank(colour, sig, G->nv);
    while (ncol > prev) {
        prev = ncol;
        for (int v = 0; v < G->nv; v++) {
            int pairs[SG_MAX_V], np = 0;
            sig[v][0] = colour[v];
            for (int w = 0; w < G->nv; w++)
                if (w != v && G->m[v][w])
                    pairs[np++] = colour[w] * 256 + G->m[v][w];
            for (int a = 1; a < np; a++)
                for (int b = a; b > 0 && pairs[b - 1] > pairs[b]; b--) {
                    int t = pairs[b];
                    pairs[b] = pairs[b - 1];
                    pairs[b - 1] = t;
                }
            for (int k = 1; k < SIG_LEN; k++)
                sig[v][k] = k - 1 < np ? pairs[k - 1] + 1 : 0;
        }
        ncol = colour_rank(colour, sig, G->nv);
    }
}

typedef struct {
    const sgraph *G;
    int cell_start[SG_MAX_V];     /* first position of the colour class of each position */
    int cell_end[SG_MAX_V];
    int bycolour[SG_MAX_V];       /* vertices sorted by colour */
    int perm[SG_MAX_V];           /* position -> vertex, being built */
    int used[SG_MAX_V];
    int best[SG_MAX_V];
    unsigned char cur[SG_MAX_V][SG_MAX_V], bestcode[SG_MAX_V][SG_MAX_V];
    int have_best;
    slong count, visited;
} canon_state;

/* Fills row p of the code for the current partial permutation and compares rows 0..p with
   the best code so far: -1, 0, 1 (-1 when there is no best yet).  The whole prefix is compared
   because the best may have changed since the earlier rows were filled. */
static int canon_prefix_cmp(canon_state *S, int p)
{
    for (int q = 0; q <= p; q++)
        S->cur[p][q] = S->G->m[S->perm[p]][S->perm[q]];
    if (!S->have_best)
        return -1;
    for (int r = 0; r <= p; r++)
        for (int q = 0; q <= r; q++)
            if (S->cur[r][q] != S->bestcode[r][q])
                return S->cur[r][q] < S->bestcode[r][q] ? -1 : 1;
    return 0;
}

/* Depth-first search over the positions; a branch whose prefix exceeds the best is cut. */
static int canon_search(canon_state *S, int p)
{
    int nv = S->G->nv;
    if (++S->visited > SG_CANON_MAX_PERMS)
        return SG_LIMIT;
    for (int k = S->cell_start[p]; k < S->cell_end[p]; k++) {
        int v = S->bycolour[k];
        if (S->used[v])
            continue;
        S->used[v] = 1;
        S->perm[p] = v;
        int c = canon_prefix_cmp(S, p);
        if (c <= 0 && p + 1 == nv) {
            if (c < 0) {
                memcpy(S->best, S->perm, sizeof S->best);
                memcpy(S->bestcode, S->cur, sizeof S->cur);
                S->have_best = 1;
                S->count = 1;
            } else
                S->count++;
        } else if (c <= 0) {
            int rc = canon_search(S, p + 1);
            if (rc != SG_OK)
                return rc;
        }
        S->used[v] = 0;
    }
    return SG_OK;
}

int sgraph_canonical(sgraph *C, unsigned char *key, slong *autv, const sgraph *G)
{
    canon_state S;
    int colour[SG_MAX_V], pos[SG_MAX_V], k = 0;
    memset(&S, 0, sizeof S);
    S.G = G;
    colour_refine(colour, G);
    for (int c = 0; k < G->nv; c++) {
        int start = k;
        for (int v = 0; v < G->nv; v++)
            if (colour[v] == c)
                S.bycolour[k++] = v;
        for (int p = start; p < k; p++) {
            S.cell_start[p] = start;
            S.cell_end[p] = k;
        }
    }
    int rc = canon_search(&S, 0);
    if (rc != SG_OK)
        return rc;
    memset(C, 0, sizeof *C);
    C->g = G->g;
    C->n = G->n;
    C->nv = G->nv;
    C->ne = G->ne;
    for (int p = 0; p < G->nv; p++) {
        pos[S.best[p]] = p;
        C->gv[p] = G->gv[S.best[p]];
        for (int q = 0; q < G->nv; q++)
            C->m[p][q] = G->m[S.best[p]][S.best[q]];
    }
    for (int i = 0; i < G->n; i++)
        C->legv[i] = pos[G->legv[i]];
    if (key != NULL) {
        int b = 0;
        memset(key, 0, SG_KEY_BYTES);
        key[b++] = (unsigned char) C->nv;
        key[b++] = (unsigned char) C->ne;
        for (int p = 0; p < C->nv; p++)
            key[b++] = (unsigned char) C->gv[p];
        for (int p = 0; p < C->nv; p++)
            for (int q = 0; q <= p; q++)
                key[b++] = C->m[p][q];
        for (int i = 0; i < C->n; i++)
            key[b++] = (unsigned char) C->legv[i];
    }
    if (autv != NULL)
        *autv = S.count;
    return SG_OK;
}

int sgraph_aut(fmpz_t aut, const sgraph *G)
{
    sgraph C;
    slong autv;
    int rc = sgraph_canonical(&C, NULL, &autv, G);
    fmpz_set_si(aut, rc == SG_OK ? autv : 0);
    if (rc != SG_OK)
        return rc;
    for (int v = 0; v < G->nv; v++)
        for (int w = v; w < G->nv; w++) {
            fmpz_t f;
            fmpz_init(f);
            fmpz_fac_ui(f, G->m[v][w]);
            fmpz_mul(aut, aut, f);
            if (w == v)
                fmpz_mul_2exp(aut, aut, G->m[v][v]);
            fmpz_clear(f);
        }
    return SG_OK;
}

void sg_list_init(sg_list *L)
{
    memset(L, 0, sizeof *L);
}

void sg_list_clear(sg_list *L)
{
    free(L->gr);
    free(L->keys);
    free(L->slot);
    memset(L, 0, sizeof *L);
}

static ulong key_hash(const unsigned char *key)
{
    return hash_bytes(key, SG_KEY_BYTES);
}

/* Slot of key: where it is, or the empty slot where it would go. */
static slong list_slot(const sg_list *L, const unsigned char *key)
{
    slong s = (slong) (key_hash(key) & (ulong) (L->nslots - 1));
    while (L->slot[s] >= 0 && memcmp(L->keys + L->slot[s] * SG_KEY_BYTES, key, SG_KEY_BYTES) != 0)
        s = (s + 1) & (L->nslots - 1);
    return s;
}

static int list_grow(sg_list *L)
{
    slong na = L->alloc ? 2 * L->alloc : 64, ns = 4 * na;
    sgraph *gr = realloc(L->gr, (size_t) na * sizeof *gr);
    if (gr == NULL)
        return SG_NOMEM;
    L->gr = gr;
    unsigned char *keys = realloc(L->keys, (size_t) na * SG_KEY_BYTES);
    if (keys == NULL)
        return SG_NOMEM;
    L->keys = keys;
    slong *slot = malloc((size_t) ns * sizeof *slot);
    if (slot == NULL)
        return SG_NOMEM;
    free(L->slot);
    L->slot = slot;
    L->nslots = ns;
    L->alloc = na;
    for (slong s = 0; s < ns; s++)
        slot[s] = -1;
    for (slong i = 0; i < L->len; i++)
        slot[list_slot(L, L->keys + i * SG_KEY_BYTES)] = i;
    return SG_OK;
}

int sg_list_add(sg_list *L, const sgraph *G, int *added)
{
    sgraph C;
    unsigned char key[SG_KEY_BYTES];
    int rc = sgraph_canonical(&C, key, NULL, G);
    if (added != NULL)
        *added = 0;
    if (rc != SG_OK)
        return rc;
    if (L->len == L->alloc && (rc = list_grow(L)) != SG_OK)
        return rc;
    slong s = list_slot(L, key);
    if (L->slot[s] >= 0)
        return SG_OK;
    L->gr[L->len] = C;
    memcpy(L->keys + L->len * SG_KEY_BYTES, key, SG_KEY_BYTES);
    L->slot[s] = L->len++;
    if (added != NULL)
        *added = 1;
    return SG_OK;
}

slong sg_list_find(const sg_list *L, const sgraph *G)
{
    sgraph C;
    unsigned char key[SG_KEY_BYTES];
    if (L->len == 0 || sgraph_canonical(&C, key, NULL, G) != SG_OK)
        return -1;
    return L->slot[list_slot(L, key)];
}
