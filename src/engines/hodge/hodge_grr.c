/* hodge_grr.c - Hodge integrals by Mumford's Grothendieck-Riemann-Roch formula (first route).
 *
 * D. Mumford, "Towards an enumerative geometry of the moduli space of curves", in Arithmetic and
 * Geometry II, Progr. Math. 36 (1983) 271-328, section 5, with marked points and the
 * Arbarello-Cornalba kappa classes (as in Faber-Pandharipande 2000, section 2):
 *     ch_{2l-1}(E) = B_{2l}/(2l)! [ kappa_{2l-1} - sum_i psi_i^{2l-1}
 *                    + 1/2 sum_xi xi_*( sum_{a=0}^{2l-2} (-1)^a psi'^a psi''^{2l-2-a} ) ],
 * xi running over the gluing maps Mbar_{g-1,n+2} -> Mbar_{g,n} (branches n+1, n+2) and
 * Mbar_{g_1, I + *} x Mbar_{g_2, J + *} -> Mbar_{g,n} for ordered (g_1, I), (g_2, J); the factor
 * 1/2 accounts for the order of the two branches (xi has degree 2 onto the divisor, also for
 * the symmetric splitting g_1 = g_2, n = 0).  ch_{2l}(E) = 0 for l >= 1.  Check on Mbar_{1,1}:
 * 1/12 (1/24 - 1/24 + 1/2) = 1/24 = int lambda_1.
 * Pull-backs along xi: psi_i goes to psi_i on the component holding leg i; kappa_a to the sum of
 * kappa_a over the components; ch_k(E) to ch_k(E_{g-1}) (E restricts to E_{g-1} plus a trivial
 * line) or to ch_k(E_1) + ch_k(E_2).  Products are pulled back factor by factor, so each kappa
 * and ch factor goes to one side or the other (labelled factors: binomial weights).
 * One ch factor (the smallest index) is removed per step; with none left the psi-kappa integral
 * goes to the pushforward reduction (correlators/pushforward.h), memoised.  Points with psi
 * exponent 0 or 1 are removed first by the string and dilaton equations with kappa classes
 * (gr_string_dilaton).  No code is shared with hodge_fp.c.
 */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include "correlators/pushforward.h"
#include "hodge_internal.h"

/* An integrand: psi exponents d[0..n-1], kappa multiplicities km[1..kmax], ch ones cm[1..cmax]. */
typedef hodge_mono gr_mono;

/* Allocates M with room for n psi exponents and the given index ranges, all zero; 0 on failure. */
static int gr_alloc(gr_mono *M, slong g, slong n, slong kmax, slong cmax)
{
    slong *p = calloc((size_t) (n + kmax + cmax + 3), sizeof(slong));
    if (p == NULL)
        return 0;
    M->g = g, M->n = n, M->kmax = kmax, M->cmax = cmax;
    M->d = p, M->km = p + n, M->cm = p + n + kmax + 1;
    return 1;
}

static void gr_free(gr_mono *M)
{
    free(M->d);
}

static int gr_eval(fmpq_t res, hodge_ctx *H, const gr_mono *M);

/* The sum that Mumford's formula is evaluated into: the sink of its terms when computing. */
typedef struct {
    hodge_ctx *H;
    fmpq_t acc;
} gr_sum;

/* Sink of one term: acc += w * int A (* int B, evaluated only when int A is nonzero). */
static int gr_sum_term(void *data, const fmpq_t w, const gr_mono *A, const gr_mono *B)
{
    gr_sum *S = data;
    fmpq_t v1, v2;
    int st;
    fmpq_init(v1);
    fmpq_init(v2);
    st = gr_eval(v1, S->H, A);
    if (B != NULL && st == WK_OK && !fmpq_is_zero(v1)) {
        st = gr_eval(v2, S->H, B);
        fmpq_mul(v1, v1, v2);
    }
    fmpq_mul(v1, v1, w);
    fmpq_add(S->acc, S->acc, v1);
    fmpq_clear(v1);
    fmpq_clear(v2);
    return st;
}

/* acc += c * integral of M (c an integer). */
static int gr_accumulate(fmpq_t acc, hodge_ctx *H, const gr_mono *M, const fmpz_t c)
{
    fmpq_t v;
    int st;
    fmpq_init(v);
    st = gr_eval(v, H, M);
    fmpq_mul_fmpz(v, v, c);
    fmpq_add(acc, acc, v);
    fmpq_clear(v);
    return st;
}

/* A copy of S with one ch_k fewer, room for extra more legs (zero) and kappa indices up to kx. */
static int gr_copy_less(gr_mono *M, const gr_mono *S, slong k, slong extra, slong kx)
{
    slong kmax = S->kmax > kx ? S->kmax : kx;
    if (!gr_alloc(M, S->g, S->n + extra, kmax, S->cmax))
        return 0;
    memcpy(M->d, S->d, (size_t) S->n * sizeof(slong));
    memcpy(M->km, S->km, (size_t) (S->kmax + 1) * sizeof(slong));
    memcpy(M->cm, S->cm, (size_t) (S->cmax + 1) * sizeof(slong));
    M->cm[k]--;
    return 1;
}

/* The interior terms, S without one ch_k: fn(+1, S kappa_k), then fn(-1, S psi_i^k) for each i. */
static int gr_interior(hodge_term_fn fn, void *data, const gr_mono *S, slong k)
{
    gr_mono M;
    fmpq_t w;
    int st;
    if (!gr_copy_less(&M, S, k, 0, k))
        return WK_LIMIT;
    fmpq_init(w);
    fmpq_one(w);
    M.km[k]++;
    st = fn(data, w, &M, NULL);
    M.km[k]--;
    fmpq_neg(w, w);
    for (slong i = 0; i < M.n && st == WK_OK; i++) {
        M.d[i] += k;
        st = fn(data, w, &M, NULL);
        M.d[i] -= k;
    }
    fmpq_clear(w);
    gr_free(&M);
    return st;
}

/* The irreducible boundary, S without one ch_k (k = 2l-1): fn((-1)^a/2, S psi_{n+1}^a
   psi_{n+2}^{2l-2-a} on Mbar_{g-1,n+2}) for a = 0..2l-2. */
static int gr_irreducible(hodge_term_fn fn, void *data, const gr_mono *S, slong k)
{
    gr_mono M;
    fmpq_t w;
    int st = WK_OK;
    if (!gr_copy_less(&M, S, k, 2, 0))
        return WK_LIMIT;
    M.g = S->g - 1;
    fmpq_init(w);
    for (slong a = 0; a <= k - 1 && st == WK_OK; a++) {
        M.d[S->n] = a, M.d[S->n + 1] = k - 1 - a;
        fmpq_set_si(w, a % 2 ? -1 : 1, 2);
        st = fn(data, w, &M, NULL);
    }
    fmpq_clear(w);
    gr_free(&M);
    return st;
}

/* The factors shared out at a separating node: legs grouped by exponent, kappa and ch factors
   by index; side 1 takes x[i] of the count[i] members of group i. */
typedef struct {
    slong ng;
    slong *kind, *value, *count, *x;   /* kind: 0 leg, 1 kappa, 2 ch */
    gr_mono side[2];
    slong k;                           /* the removed ch index, 2l-1 */
    fmpz_t two;                        /* the factor 1/2 of the boundary terms */
} gr_groups;

/* Fills side s (0: the x[i], 1: the rest) of genus gs with its legs, the node of exponent
   node, and its kappa and ch factors. */
static void gr_fill_side(gr_groups *G, int s, slong gs, slong node)
{
    gr_mono *M = &G->side[s];
    slong n = 0;
    memset(M->km, 0, (size_t) (M->kmax + 1) * sizeof(slong));
    memset(M->cm, 0, (size_t) (M->cmax + 1) * sizeof(slong));
    for (slong i = 0; i < G->ng; i++) {
        slong c = s == 0 ? G->x[i] : G->count[i] - G->x[i];
        if (G->kind[i] == 0)
            for (slong j = 0; j < c; j++)
                M->d[n++] = G->value[i];
        else
            (G->kind[i] == 1 ? M->km : M->cm)[G->value[i]] = c;
    }
    M->d[n++] = node;
    M->n = n, M->g = gs;
}

/* fn((-1)^a w/2, side 1, side 2) for each genus g_1 of side 1, with the current shares x. */
static int gr_split_leaf(hodge_term_fn fn, void *data, gr_groups *G, slong g, const fmpz_t w)
{
    slong n1 = 1, deg1 = 0, ch1 = 0, chall = 0;
    int st = WK_OK;
    fmpq_t wq;
    for (slong i = 0; i < G->ng; i++) {
        n1 += G->kind[i] == 0 ? G->x[i] : 0;
        deg1 += G->x[i] * G->value[i];
        ch1 += G->kind[i] == 2 ? G->x[i] : 0;
        chall += G->kind[i] == 2 ? G->count[i] : 0;
    }
    fmpq_init(wq);
    for (slong g1 = 0; g1 <= g && st == WK_OK; g1++) {
        slong a = 3 * g1 - 3 + n1 - deg1;
        if (a < 0 || a > G->k - 1 || (g1 == 0 && ch1 > 0) || (g1 == g && ch1 < chall))
            continue;
        gr_fill_side(G, 0, g1, a);
        gr_fill_side(G, 1, g - g1, G->k - 1 - a);
        if (2 * g1 - 2 + G->side[0].n <= 0 || 2 * (g - g1) - 2 + G->side[1].n <= 0)
            continue;
        fmpq_set_fmpz_frac(wq, w, G->two);
        if (a % 2)
            fmpq_neg(wq, wq);
        st = fn(data, wq, &G->side[0], &G->side[1]);
    }
    fmpq_clear(wq);
    return st;
}

/* Depth-first over the groups from i on, w the product of the binomials chosen so far. */
static int gr_split_dfs(hodge_term_fn fn, void *data, gr_groups *G, slong g, slong i, const fmpz_t w)
{
    fmpz_t w2, b;
    int st = WK_OK;
    if (i == G->ng)
        return gr_split_leaf(fn, data, G, g, w);
    fmpz_init(w2);
    fmpz_init(b);
    for (slong x = 0; x <= G->count[i] && st == WK_OK; x++) {
        G->x[i] = x;
        fmpz_bin_uiui(b, (ulong) G->count[i], (ulong) x);
        fmpz_mul(w2, w, b);
        st = gr_split_dfs(fn, data, G, g, i + 1, w2);
    }
    fmpz_clear(w2);
    fmpz_clear(b);
    return st;
}

/* Appends a group (kind, value, count) when count > 0. */
static void gr_group_add(gr_groups *G, slong kind, slong value, slong count)
{
    if (count <= 0)
        return;
    G->kind[G->ng] = kind, G->value[G->ng] = value, G->count[G->ng] = count, G->x[G->ng] = 0;
    G->ng++;
}

/* The ordered separating boundary terms for S without one ch_k, through fn (gr_split_leaf). */
static int gr_separating(hodge_term_fn fn, void *data, const gr_mono *S, slong k)
{
    slong cap = S->n + S->kmax + S->cmax + 1;
    slong *p = calloc((size_t) (4 * cap), sizeof(slong));
    gr_groups G;
    fmpz_t one;
    int st = WK_LIMIT;
    if (p == NULL)
        return WK_LIMIT;
    G.ng = 0, G.k = k;
    G.kind = p, G.value = p + cap, G.count = p + 2 * cap, G.x = p + 3 * cap;
    fmpz_init_set_ui(G.two, 2);
    for (slong i = 0, c; i < S->n; i += c) {
        for (c = 1; i + c < S->n && S->d[i + c] == S->d[i]; c++)
            ;
        gr_group_add(&G, 0, S->d[i], c);
    }
    for (slong j = 1; j <= S->kmax; j++)
        gr_group_add(&G, 1, j, S->km[j]);
    for (slong j = 1; j <= S->cmax; j++)
        gr_group_add(&G, 2, j, S->cm[j] - (j == k));
    fmpz_init_set_ui(one, 1);
    if (gr_alloc(&G.side[0], 0, S->n + 1, S->kmax, S->cmax)) {
        if (gr_alloc(&G.side[1], 0, S->n + 1, S->kmax, S->cmax)) {
            st = gr_split_dfs(fn, data, &G, S->g, 0, one);
            gr_free(&G.side[1]);
        }
        gr_free(&G.side[0]);
    }
    fmpz_clear(one);
    fmpz_clear(G.two);
    free(p);
    return st;
}

/* The terms of Mumford's formula for one ch_k of S (without the weight B_{k+1}/(k+1)!). */
static int gr_terms(hodge_term_fn fn, void *data, const gr_mono *S, slong k)
{
    int st = gr_interior(fn, data, S, k);
    if (st == WK_OK)
        st = gr_irreducible(fn, data, S, k);
    if (st == WK_OK)
        st = gr_separating(fn, data, S, k);
    return st;
}

/* res = int S with one ch_k, k = 2l-1 the smallest ch index of S, replaced by Mumford's formula
   (removing small indices first visits about a third of the states the largest-first order
   does, measured on lambda_j lambda_k psi^a in genus 8). */
static int gr_step(fmpq_t res, hodge_ctx *H, const gr_mono *S)
{
    slong k = 1;
    while (S->cm[k] == 0)
        k += 2;
    gr_sum sum;
    fmpq_t c;
    int st;
    sum.H = H;
    fmpq_init(sum.acc);
    fmpq_init(c);
    st = gr_terms(gr_sum_term, &sum, S, k);
    hodge_coef(c, H, (k + 1) / 2);
    fmpq_mul(res, sum.acc, c);
    fmpq_clear(sum.acc);
    fmpq_clear(c);
    return st;
}

/* Memo key of a normalised integrand (d sorted, kmax and cmax trimmed); key has room for
   n + kmax + cmax + 3 entries.  Returns the length. */
static slong gr_key(slong *key, const gr_mono *S)
{
    slong len = 0;
    key[len++] = S->g;
    key[len++] = S->n;
    for (slong i = 0; i < S->n; i++)
        key[len++] = S->d[i];
    key[len++] = S->kmax;
    for (slong j = 1; j <= S->kmax; j++)
        key[len++] = S->km[j];
    for (slong j = 1; j <= S->cmax; j++)
        key[len++] = S->cm[j];
    return len;
}

/* Removing a point with psi exponent e in {0, 1} (string and dilaton equations with kappa and
   ch factors): on Mbar_{g,n+1}, kappa_b = pi^* kappa_b + psi_{n+1}^b and psi_{n+1} kills the
   difference psi_i - pi^* psi_i, so for the kappa factors K and pulled-back X
     int psi_{n+1}^e psi^d K X = [e = 0] sum_i int psi^{d - e_i} K X + [e = 1] (2g-2+n) int psi^d K X
                                 + sum_{S nonempty in K} int psi^d kappa_{b_S + e - 1} (K - S) X,
   b_S the sum of the indices in S, kappa_0 = 2g-2+n on Mbar_{g,n}.  Sub-multisets S are counted
   with their binomial multiplicities.  M is S without its last point, room for kappa up to kx. */
static int gr_drop_kappa(fmpq_t acc, hodge_ctx *H, gr_mono *M, const slong *km, slong kmax, slong b,
                         slong bs, slong e, const fmpz_t w)
{
    fmpz_t w2, c;
    int st = WK_OK;
    if (b > kmax) {
        slong idx = bs + e - 1;
        if (bs == 0)
            return WK_OK;
        if (idx == 0) {
            fmpz_init_set_si(w2, 2 * M->g - 2 + M->n);
            fmpz_mul(w2, w2, w);
            st = gr_accumulate(acc, H, M, w2);
            fmpz_clear(w2);
            return st;
        }
        M->km[idx]++;
        st = gr_accumulate(acc, H, M, w);
        M->km[idx]--;
        return st;
    }
    fmpz_init(w2);
    fmpz_init(c);
    for (slong s = 0; s <= km[b] && st == WK_OK; s++) {
        fmpz_bin_uiui(c, (ulong) km[b], (ulong) s);
        fmpz_mul(w2, w, c);
        M->km[b] = km[b] - s;
        st = gr_drop_kappa(acc, H, M, km, kmax, b + 1, bs + s * b, e, w2);
    }
    M->km[b] = km[b];
    fmpz_clear(w2);
    fmpz_clear(c);
    return st;
}

/* res = int S on Mbar_{g,n} with d sorted and d[n-1] in {0, 1}, Mbar_{g,n-1} stable: the point
   n is removed by the formula above. */
static int gr_string_dilaton(fmpq_t res, hodge_ctx *H, const gr_mono *S)
{
    slong e = S->d[S->n - 1], kx = S->kmax + 1;
    gr_mono M;
    fmpz_t w;
    int st = WK_OK;
    for (slong j = 1; j <= S->kmax; j++)
        kx += j * S->km[j];
    if (!gr_alloc(&M, S->g, S->n - 1, kx, S->cmax))
        return WK_LIMIT;
    memcpy(M.d, S->d, (size_t) (S->n - 1) * sizeof(slong));
    memcpy(M.km, S->km, (size_t) (S->kmax + 1) * sizeof(slong));
    memcpy(M.cm, S->cm, (size_t) (S->cmax + 1) * sizeof(slong));
    fmpz_init_set_si(w, e == 1 ? 2 * S->g - 3 + S->n : 1);
    fmpq_zero(res);
    if (e == 1)
        st = gr_accumulate(res, H, &M, w);
    for (slong i = 0; e == 0 && i < M.n && st == WK_OK; i++) {
        if (M.d[i] == 0)
            continue;
        M.d[i]--;
        st = gr_accumulate(res, H, &M, w);
        M.d[i]++;
    }
    fmpz_one(w);
    if (st == WK_OK)
        st = gr_drop_kappa(res, H, &M, S->km, S->kmax, 1, 0, e, w);
    fmpz_clear(w);
    gr_free(&M);
    return st;
}

/* Memoised value of a normalised integrand: the pushforward reduction without ch factors (the
   same psi-kappa integrals recur on many boundary strata), else one step of Mumford's formula. */
static int gr_memo(fmpq_t res, hodge_ctx *H, const gr_mono *S)
{
    slong *key = malloc((size_t) (S->n + S->kmax + S->cmax + 3) * sizeof(slong));
    slong len;
    const fmpq *hit;
    int st;
    if (key == NULL)
        return WK_LIMIT;
    len = gr_key(key, S);
    hit = keymap_get(&H->memo[HODGE_ROUTE_GRR], key, len);
    if (hit != NULL) {
        fmpq_set(res, hit);
        free(key);
        return WK_OK;
    }
    st = hodge_poll(H, HODGE_ROUTE_GRR);
    if (st == WK_OK)
        st = S->cmax == 0 ? pf_integral(res, H->T, S->g, S->d, S->n, S->km, S->kmax) : gr_step(res, H, S);
    if (st == WK_OK)
        keymap_set(&H->memo[HODGE_ROUTE_GRR], key, len, res);
    free(key);
    return st;
}

/* Degree of the integrand: psi exponents plus the weighted kappa and ch multiplicities. */
static slong gr_degree(const gr_mono *S)
{
    slong deg = 0;
    for (slong i = 0; i < S->n; i++)
        deg += S->d[i];
    for (slong j = 1; j <= S->kmax; j++)
        deg += j * S->km[j];
    for (slong j = 1; j <= S->cmax; j++)
        deg += j * S->cm[j];
    return deg;
}

/* res = int over Mbar_{g,n} of the integrand M (zero for unstable spaces and wrong degrees). */
static int gr_eval(fmpq_t res, hodge_ctx *H, const gr_mono *M)
{
    gr_mono S = *M;
    int st;
    fmpq_zero(res);
    while (S.kmax > 0 && S.km[S.kmax] == 0)
        S.kmax--;
    while (S.cmax > 0 && S.cm[S.cmax] == 0)
        S.cmax--;
    if (2 * S.g - 2 + S.n <= 0 || gr_degree(&S) != 3 * S.g - 3 + S.n)
        return WK_OK;
    if (S.cmax == 0 && S.kmax == 0)
        return wk_table_correlator(res, H->T, S.g, S.d, S.n);
    if (S.g == 0 && S.cmax > 0)
        return WK_OK;                   /* E = 0 in genus 0 */
    for (slong j = 2; j <= S.cmax; j += 2)
        if (S.cm[j] > 0)
            return WK_OK;               /* ch_{2j} = 0 */
    if (!gr_alloc(&S, S.g, S.n, S.kmax, S.cmax))
        return WK_LIMIT;
    memcpy(S.d, M->d, (size_t) S.n * sizeof(slong));
    memcpy(S.km, M->km, (size_t) (S.kmax + 1) * sizeof(slong));
    memcpy(S.cm, M->cm, (size_t) (S.cmax + 1) * sizeof(slong));
    hodge_sort_desc(S.d, S.n);
    if (S.n > 0 && S.d[S.n - 1] <= 1 && 2 * S.g - 3 + S.n > 0)
        st = gr_string_dilaton(res, H, &S);
    else
        st = gr_memo(res, H, &S);
    gr_free(&S);
    if (st != WK_OK)
        fmpq_zero(res);
    return st;
}

int hodge_grr_integral(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n,
                       const slong *km, slong kmax, const slong *cm, slong cmax)
{
    static const slong zero = 0;
    gr_mono M;
    M.g = g, M.n = n, M.kmax = kmax, M.cmax = cmax;
    M.d = (slong *) d;
    M.km = kmax > 0 ? (slong *) km : (slong *) &zero;
    M.cm = cmax > 0 ? (slong *) cm : (slong *) &zero;
    return gr_eval(res, H, &M);
}

int hodge_mono_vanishes(const hodge_mono *M)
{
    slong kmax = M->kmax, cmax = M->cmax;
    gr_mono S = *M;
    while (kmax > 0 && M->km[kmax] == 0)
        kmax--;
    while (cmax > 0 && M->cm[cmax] == 0)
        cmax--;
    S.kmax = kmax, S.cmax = cmax;
    if (M->g < 0 || 2 * M->g - 2 + M->n <= 0 || gr_degree(&S) != 3 * M->g - 3 + M->n)
        return 1;
    if (M->g == 0 && cmax > 0)
        return 1;
    for (slong j = 2; j <= cmax; j += 2)
        if (M->cm[j] > 0)
            return 1;
    return 0;
}

int hodge_mumford_terms(fmpq_t weight, hodge_ctx *H, const hodge_mono *S, slong k, hodge_term_fn fn, void *data)
{
    fmpq_zero(weight);
    if (H == NULL || S == NULL || fn == NULL || k < 1 || k % 2 == 0 || k > S->cmax || S->cm[k] <= 0
        || hodge_check_args(H, HODGE_ROUTE_GRR, S->g, S->d, S->n, S->km, S->kmax, S->cm, S->cmax) != WK_OK)
        return WK_BADARG;
    hodge_coef(weight, H, (k + 1) / 2);
    return gr_terms(fn, data, S, k);
}
