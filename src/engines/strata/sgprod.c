/* sgprod.c - the product of two boundary strata by the generic-graph rule (T. Graber,
 * R. Pandharipande, "Constructions of nontautological classes on moduli spaces of curves",
 * Michigan Math. J. 51 (2003), appendix; as we state it, from memory):
 *     [A] . [B] = sum over graphs Gamma (1/|Aut Gamma|) sum over edge sets S, T with S u T = E(Gamma),
 *                 Gamma / (E - S) ~ A and Gamma / (E - T) ~ B, of xi_Gamma*( prod_{e in S n T} (-psi_e' - psi_e'') ),
 * Gamma / C denoting the contraction of the edges C.  Independent of the pull-back product of
 * sgint.c; tests compare the two.
 */
#include <string.h>
#include <flint/fmpq.h>
#include <flint/fmpz.h>

#include "sgint.h"

/* H = G with every edge outside `keep` (bit e for edge e of sg_dec_from_graph's order)
   contracted: vertices joined by contracted edges merge, a contracted loop adds one to the
   genus. */
static void contract(sgraph *H, const sg_dec *D, ulong keep)
{
    int root[SG_MAX_V], ne = (D->nh - D->n) / 2, gsum[SG_MAX_V] = {0}, nvert[SG_MAX_V] = {0}, ncon[SG_MAX_V] = {0};
    int id[SG_MAX_V], nv = 0;
    for (int v = 0; v < D->nv; v++)
        root[v] = v;
    for (int e = 0; e < ne; e++) {
        if (keep >> e & 1)
            continue;
        int a = D->vert[D->n + 2 * e], b = D->vert[D->n + 2 * e + 1];
        while (root[a] != a)
            a = root[a];
        while (root[b] != b)
            b = root[b];
        if (a != b)
            root[a < b ? b : a] = a < b ? a : b;
    }
    for (int v = 0; v < D->nv; v++) {
        int r = v;
        while (root[r] != r)
            r = root[r];
        root[v] = r;
    }
    for (int v = 0; v < D->nv; v++) {
        gsum[root[v]] += D->gv[v];
        nvert[root[v]]++;
    }
    for (int e = 0; e < ne; e++)
        if (!(keep >> e & 1))
            ncon[root[D->vert[D->n + 2 * e]]]++;
    memset(H, 0, sizeof *H);
    H->g = D->g;
    H->n = D->n;
    for (int v = 0; v < D->nv; v++)
        if (root[v] == v) {
            id[v] = nv;
            H->gv[nv++] = gsum[v] + ncon[v] - nvert[v] + 1;
        }
    H->nv = nv;
    for (int i = 0; i < D->n; i++)
        H->legv[i] = id[root[D->vert[i]]];
    for (int e = 0; e < ne; e++)
        if (keep >> e & 1) {
            int a = id[root[D->vert[D->n + 2 * e]]], b = id[root[D->vert[D->n + 2 * e + 1]]];
            H->m[a][b]++;
            if (a != b)
                H->m[b][a]++;
            H->ne++;
        }
}

static int bits(ulong x)
{
    int c = 0;
    for (; x; x &= x - 1)
        c++;
    return c;
}

/* Whether Gamma / (E - keep) is isomorphic to the graph with canonical key `key`. */
static int contracts_to(const sg_dec *D, ulong keep, const unsigned char *key)
{
    sgraph H, C;
    unsigned char k2[SG_KEY_BYTES];
    contract(&H, D, keep);
    return sgraph_canonical(&C, k2, NULL, &H) == SG_OK && memcmp(k2, key, SG_KEY_BYTES) == 0;
}

/* Terms of the excess prod_{e in X} (-psi_e' - psi_e''): every choice of a half per edge. */
static int push_excess(sg_terms *out, const fmpq_t c, const sg_dec *D, ulong X)
{
    int edges[SG_MAX_E], nx = 0, rc = SG_OK;
    for (int e = 0; e < (D->nh - D->n) / 2; e++)
        if (X >> e & 1)
            edges[nx++] = e;
    fmpq_t s;
    fmpq_init(s);
    for (ulong choice = 0; rc == SG_OK && choice < (1UL << nx); choice++) {
        sg_dec E = *D;
        for (int k = 0; k < nx; k++)
            E.pe[D->n + 2 * edges[k] + (int) (choice >> k & 1)]++;
        if (nx % 2)
            fmpq_neg(s, c);
        else
            fmpq_set(s, c);
        rc = sg_terms_push(out, s, &E);
    }
    fmpq_clear(s);
    return rc;
}

int sg_terms_product_graphs(sg_terms *out, const sgraph *A, const sgraph *B, slong max_graphs)
{
    sgraph CA, CB;
    unsigned char ka[SG_KEY_BYTES], kb[SG_KEY_BYTES];
    int rc;
    sg_terms_clear(out);
    if (A->g != B->g || A->n != B->n)
        return SG_BADARG;
    if ((rc = sgraph_canonical(&CA, ka, NULL, A)) != SG_OK || (rc = sgraph_canonical(&CB, kb, NULL, B)) != SG_OK)
        return rc;
    int lo = A->ne > B->ne ? A->ne : B->ne, hi = A->ne + B->ne, dim = 3 * A->g - 3 + A->n;
    fmpz_t aut;
    fmpq_t c;
    fmpz_init(aut);
    fmpq_init(c);
    for (int k = lo; rc == SG_OK && k <= hi && k <= dim; k++) {
        sg_list L;
        sg_list_init(&L);
        rc = sg_enumerate(&L, A->g, A->n, k, max_graphs, NULL);
        for (slong i = 0; rc == SG_OK && i < L.len; i++) {
            sg_dec D;
            sg_dec_from_graph(&D, &L.gr[i]);
            ulong all = (1UL << k) - 1;
            if ((rc = sgraph_aut(aut, &L.gr[i])) != SG_OK)
                break;
            fmpq_set_fmpz_frac(c, (fmpz[]){1}, aut);
            for (ulong S = 0; rc == SG_OK && S <= all; S++) {
                if (bits(S) != A->ne || !contracts_to(&D, S, ka))
                    continue;
                for (ulong T = 0; rc == SG_OK && T <= all; T++)
                    if ((S | T) == all && bits(T) == B->ne && contracts_to(&D, T, kb))
                        rc = push_excess(out, c, &D, S & T);
            }
        }
        sg_list_clear(&L);
    }
    fmpz_clear(aut);
    fmpq_clear(c);
    return rc;
}
