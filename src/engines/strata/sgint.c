/* sgint.c - integrals of decorated strata and products with boundary divisors (sgint.h). */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>

#include "correlators/kappashift.h"
#include "correlators/pushforward.h"
#include "sgint.h"

void sg_terms_init(sg_terms *L)
{
    memset(L, 0, sizeof *L);
}

void sg_terms_clear(sg_terms *L)
{
    for (slong i = 0; i < L->len; i++)
        fmpq_clear(L->t[i].coeff);
    free(L->t);
    memset(L, 0, sizeof *L);
}

int sg_terms_push(sg_terms *L, const fmpq_t coeff, const sg_dec *d)
{
    if (L->len == L->alloc) {
        slong na = L->alloc ? 2 * L->alloc : 16;
        sg_term *t = realloc(L->t, (size_t) na * sizeof *t);
        if (t == NULL)
            return SG_NOMEM;
        L->t = t;
        L->alloc = na;
    }
    fmpq_init(L->t[L->len].coeff);
    fmpq_set(L->t[L->len].coeff, coeff);
    L->t[L->len].d = *d;
    L->len++;
    return SG_OK;
}

void sg_dec_from_graph(sg_dec *D, const sgraph *G)
{
    memset(D, 0, sizeof *D);
    D->g = G->g;
    D->n = G->n;
    D->nv = G->nv;
    memcpy(D->gv, G->gv, sizeof D->gv);
    for (int i = 0; i < G->n; i++) {
        D->vert[i] = G->legv[i];
        D->opp[i] = -1;
    }
    D->nh = G->n;
    for (int v = 0; v < G->nv; v++)
        for (int w = v; w < G->nv; w++)
            for (int k = 0; k < G->m[v][w]; k++) {
                int h = D->nh;
                D->vert[h] = v, D->vert[h + 1] = w;
                D->opp[h] = h + 1, D->opp[h + 1] = h;
                D->nh += 2;
            }
}

int sg_terms_push_stratum(sg_terms *L, const sgraph *G)
{
    sg_dec D;
    fmpz_t aut;
    fmpq_t c;
    fmpz_init(aut);
    fmpq_init(c);
    int rc = sgraph_aut(aut, G);
    if (rc == SG_OK) {
        fmpq_set_fmpz_frac(c, (fmpz[]){1}, aut);
        sg_dec_from_graph(&D, G);
        rc = sg_terms_push(L, c, &D);
    }
    fmpz_clear(aut);
    fmpq_clear(c);
    return rc;
}

int sg_divisor_graph(sgraph *G, int g, int n, const sg_divisor *D)
{
    ulong all = n >= 64 ? ~0UL : (1UL << n) - 1;
    if (g < 0 || n < 0 || n > SG_MAX_N || 2 * g - 2 + n <= 0)
        return SG_BADARG;
    sgraph_trivial(G, g, n);
    G->ne = 1;
    if (D->irr) {
        if (g < 1)
            return SG_BADARG;
        G->gv[0] = g - 1;
        G->m[0][0] = 1;
        return SG_OK;
    }
    int ns = 0;
    for (int i = 0; i < n; i++)
        ns += (int) (D->S >> i & 1);
    if ((D->S & ~all) != 0 || D->h < 0 || D->h > g || 2 * D->h - 1 + ns <= 0
        || 2 * (g - D->h) - 1 + (n - ns) <= 0)
        return SG_BADARG;
    G->nv = 2;
    G->gv[0] = D->h;
    G->gv[1] = g - D->h;
    G->m[0][1] = G->m[1][0] = 1;
    for (int i = 0; i < n; i++)
        G->legv[i] = (D->S >> i & 1) ? 0 : 1;
    return SG_OK;
}

/* ---- integrals ---- */

typedef struct {
    wk_table *T;
    const sg_dec *D;
    const slong *a, *kmult;
    int kmax;
    slong kv[SG_MAX_V][SG_KMAX + 1];   /* kappa multiplicities at each vertex, being shared out */
    fmpq_t sum;
    int rc;
    int shift;                         /* vertex integrals by the time shift */
} int_state;

/* Adds coeff * prod_v (vertex integral) for the current sharing of the kappa factors. */
static void int_leaf(int_state *S, const fmpz_t coeff)
{
    const sg_dec *D = S->D;
    fmpq_t prod, x;
    fmpq_init(prod);
    fmpq_init(x);
    fmpq_set_fmpz_frac(prod, coeff, (fmpz[]){1});
    for (int v = 0; v < D->nv && !fmpq_is_zero(prod); v++) {
        slong d[SG_MAX_H];
        int nv = 0;
        for (int h = 0; h < D->nh; h++)
            if (D->vert[h] == v)
                d[nv++] = D->pe[h] + (h < D->n && S->a != NULL ? S->a[h] : 0);
        int st = S->shift ? ks_integral(x, S->T, D->gv[v], d, nv, S->kv[v], S->kmax, NULL)
                          : pf_integral(x, S->T, D->gv[v], d, nv, S->kv[v], S->kmax);
        if (st != WK_OK) {
            S->rc = st == WK_CANCELLED ? SG_CANCELLED : SG_LIMIT;
            break;
        }
        fmpq_mul(prod, prod, x);
    }
    if (S->rc == SG_OK)
        fmpq_add(S->sum, S->sum, prod);
    fmpq_clear(prod);
    fmpq_clear(x);
}

/* Shares kmult[j] (rest still to place) among vertices v.. ; coeff collects the binomials. */
static void int_share(int_state *S, int j, int v, slong rest, const fmpz_t coeff)
{
    if (S->rc != SG_OK)
        return;
    if (j > S->kmax) {
        int_leaf(S, coeff);
        return;
    }
    if (v == S->D->nv - 1 || rest == 0) {
        S->kv[v][j] += rest;
        int_share(S, j + 1, 0, j + 1 <= S->kmax ? S->kmult[j + 1] : 0, coeff);
        S->kv[v][j] -= rest;
        return;
    }
    fmpz_t c;
    fmpz_init(c);
    for (slong k = 0; k <= rest; k++) {
        fmpz_bin_uiui(c, (ulong) rest, (ulong) k);
        fmpz_mul(c, c, coeff);
        S->kv[v][j] += k;
        int_share(S, j, v + 1, rest - k, c);
        S->kv[v][j] -= k;
    }
    fmpz_clear(c);
}

static int dec_integral(fmpq_t res, wk_table *T, const sg_dec *D, const slong *a, const slong *kmult, int kmax,
                        int shift)
{
    int_state S;
    static const slong none[1] = {0};
    if (kmult == NULL)
        kmult = none, kmax = 0;
    if (kmax < 0 || kmax > SG_KMAX)
        return SG_BADARG;
    memset(&S, 0, sizeof S);
    S.T = T, S.D = D, S.a = a, S.kmult = kmult, S.kmax = kmax, S.shift = shift;
    for (int v = 0; v < D->nv; v++)
        for (int j = 1; j <= kmax; j++)
            S.kv[v][j] = D->kap[v][j];
    for (int v = 0; v < D->nv; v++)
        for (int j = kmax + 1; j <= SG_KMAX; j++)
            if (D->kap[v][j] != 0)
                return SG_BADARG;
    fmpq_init(S.sum);
    fmpz_t one;
    fmpz_init_set_ui(one, 1);
    if (kmax == 0)
        int_leaf(&S, one);
    else
        int_share(&S, 1, 0, kmult[1], one);
    fmpq_set(res, S.sum);
    if (S.rc != SG_OK)
        fmpq_zero(res);
    fmpz_clear(one);
    fmpq_clear(S.sum);
    return S.rc;
}

int sg_dec_integral(fmpq_t res, wk_table *T, const sg_dec *D, const slong *a, const slong *kmult, int kmax)
{
    return dec_integral(res, T, D, a, kmult, kmax, 0);
}

static int terms_integral(fmpq_t res, wk_table *T, const sg_terms *L, const slong *a, const slong *kmult, int kmax,
                          int shift)
{
    fmpq_t x;
    fmpq_init(x);
    fmpq_zero(res);
    for (slong i = 0; i < L->len; i++) {
        int rc = dec_integral(x, T, &L->t[i].d, a, kmult, kmax, shift);
        if (rc != SG_OK) {
            fmpq_zero(res);
            fmpq_clear(x);
            return rc;
        }
        fmpq_addmul(res, L->t[i].coeff, x);
    }
    fmpq_clear(x);
    return SG_OK;
}

int sg_terms_integral(fmpq_t res, wk_table *T, const sg_terms *L, const slong *a, const slong *kmult, int kmax)
{
    return terms_integral(res, T, L, a, kmult, kmax, 0);
}

int sg_terms_integral_shift(fmpq_t res, wk_table *T, const sg_terms *L, const slong *a, const slong *kmult, int kmax)
{
    return terms_integral(res, T, L, a, kmult, kmax, 1);
}

/* ---- products with a divisor ---- */

/* Whether the edge of half-edge h has the type of D: non-separating for delta_irr; for
   delta_{h,S}, one side of genus h with the legs S (or the complement). */
static int edge_has_type(const sg_dec *E, int h, const sg_divisor *D)
{
    int seen[SG_MAX_V] = {0}, stack[SG_MAX_V], top = 0, size = 1, inner = 0, gsum = 0;
    ulong legs = 0, all = E->n >= 64 ? ~0UL : (1UL << E->n) - 1;
    seen[E->vert[h]] = 1;
    stack[top++] = E->vert[h];
    while (top > 0) {
        int v = stack[--top];
        for (int k = E->n; k < E->nh; k++)
            if (k != h && k != E->opp[h] && E->vert[k] == v && !seen[E->vert[E->opp[k]]]) {
                seen[E->vert[E->opp[k]]] = 1;
                size++;
                stack[top++] = E->vert[E->opp[k]];
            }
    }
    if (seen[E->vert[E->opp[h]]])
        return D->irr;
    if (D->irr)
        return 0;
    for (int v = 0; v < E->nv; v++)
        gsum += seen[v] ? E->gv[v] : 0;
    for (int k = E->n; k < E->nh; k++)
        inner += k != h && k != E->opp[h] && seen[E->vert[k]];
    for (int i = 0; i < E->n; i++)
        if (seen[E->vert[i]])
            legs |= 1UL << i;
    int gC = gsum + inner / 2 - size + 1;
    return (gC == D->h && legs == D->S) || (gC == E->g - D->h && legs == (all & ~D->S));
}

/* E = d with vertex v replaced by the one-edge graph Gv of (g_v, n_v), whose legs are the
   half-edges hv[] at v. */
static void splice_vertex(sg_dec *E, const sg_dec *d, int v, const int *hv, const sgraph *Gv)
{
    int map[2] = {v, d->nv}, h = d->nh;
    *E = *d;
    if (Gv->nv == 2) {
        E->nv = d->nv + 1;
        E->gv[d->nv] = Gv->gv[1];
    }
    E->gv[v] = Gv->gv[0];
    for (int i = 0; i < Gv->n; i++)
        E->vert[hv[i]] = map[Gv->legv[i]];
    E->vert[h] = v;
    E->vert[h + 1] = Gv->nv == 2 ? map[1] : v;
    E->opp[h] = h + 1, E->opp[h + 1] = h;
    E->pe[h] = E->pe[h + 1] = 0;
    E->nh = h + 2;
}

/* Terms of D * (c, d) from the degenerations inside vertex v. */
static int times_divisor_vertex(sg_terms *out, const fmpq_t c, const sg_dec *d, int v, const sg_divisor *D,
                                slong max_graphs)
{
    int hv[SG_MAX_H], nvh = 0, rc;
    for (int h = 0; h < d->nh; h++)
        if (d->vert[h] == v)
            hv[nvh++] = h;
    if (3 * d->gv[v] - 3 + nvh < 1)
        return SG_OK;
    if (nvh > SG_MAX_N || d->nh + 2 > SG_MAX_H || d->nv + 1 > SG_MAX_V)
        return SG_LIMIT;
    sg_list Lv;
    sg_list_init(&Lv);
    rc = sg_enumerate(&Lv, d->gv[v], nvh, 1, max_graphs, NULL);
    fmpz_t aut;
    fmpq_t cc;
    fmpz_init(aut);
    fmpq_init(cc);
    for (slong i = 0; rc == SG_OK && i < Lv.len; i++) {
        sg_dec E;
        splice_vertex(&E, d, v, hv, &Lv.gr[i]);
        if (!edge_has_type(&E, E.nh - 2, D))
            continue;
        if ((rc = sgraph_aut(aut, &Lv.gr[i])) != SG_OK)
            break;
        fmpq_div_fmpz(cc, c, aut);
        rc = sg_terms_push(out, cc, &E);
    }
    fmpz_clear(aut);
    fmpq_clear(cc);
    sg_list_clear(&Lv);
    return rc;
}

int sg_terms_times_divisor(sg_terms *out, const sg_terms *L, const sg_divisor *D, slong max_graphs)
{
    fmpq_t neg;
    fmpq_init(neg);
    int rc = SG_OK;
    sg_terms_clear(out);
    for (slong i = 0; rc == SG_OK && i < L->len; i++) {
        const sg_dec *d = &L->t[i].d;
        for (int v = 0; v < d->nv; v++)
            for (int j = 1; j <= SG_KMAX; j++)
                if (d->kap[v][j] != 0)
                    rc = SG_BADARG;
        for (int v = 0; rc == SG_OK && v < d->nv; v++)
            rc = times_divisor_vertex(out, L->t[i].coeff, d, v, D, max_graphs);
        fmpq_neg(neg, L->t[i].coeff);
        for (int h = d->n; rc == SG_OK && h < d->nh; h++) {
            if (!edge_has_type(d, h, D))
                continue;
            sg_dec E = *d;            /* excess: -psi at each half of the edge, one at a time */
            E.pe[h]++;
            rc = sg_terms_push(out, neg, &E);
        }
    }
    fmpq_clear(neg);
    return rc;
}
