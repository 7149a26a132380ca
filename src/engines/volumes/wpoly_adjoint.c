/* wpoly_adjoint.c - all one-point coefficients W_a of V_{g,1}(L) modulo one prime by one run
 * of the transposed (adjoint) recursion, instead of one perturbed run per a.
 *
 * Why it works (docs/volumes-engine.md, "Volume polynomials with few points").  For n = 1 and
 * a >= 2 the component {1} of the recursion over J = Z_p[s]/(s^2) is a linear function of the
 * perturbation series E = u^{a-2}/(a-2)! added to I_2, with coefficients taken from the
 * shared component {} (the plain recursion), and the read-out is W_a = sum_m f_m[{1}](0)
 * (u = 0 and v = 1 in J when a >= 2).  Writing this linear map E -> W as lambda(E) =
 * sum_k lambda_k E_k, W_a = lambda_{a-2}/(a-2)!: the vector lambda is the image of the
 * read-out functional under the transposed map (transposition principle).  Every elementary
 * step of the forward recursion (wpoly_modp.c) is transposed here, in reverse order:
 *   - a truncated product by a fixed series, x -> (c x) mod u^l, becomes the correlation
 *     y -> sum_{k >= j} c_{k-j} y_k (a product of reversed vectors);
 *   - d/du becomes its transpose, y_k -> (k+1) y_k moved to index k+1;
 *   - the genus products B_h[{}] B_{G-h}[{1}] become correlations with B_h[{}], evaluated by
 *     the cached transforms of B_h[{}] (length T_g) against the transform of the cyclically
 *     reversed image of the adjoint of the bracket of genus G (exact: the supports fit into
 *     T_g, see wpoly_adj_products);
 *   - the cross terms and the division by I_2 in the top-down step likewise.
 * The result is identical to the per-index route (tests/unit/test_wpoly_adjoint.c).
 * Cost per prime: one forward run of the plain recursion plus about (g^2/2) pointwise products
 * of length T_g, 2g transforms and O(g L^2) quadratic row products, for all a at once.
 * Only for primes with transforms (p - 1 divisible by T_g); wpoly_modp.c uses the per-index
 * route for the others.
 */
#include <stdlib.h>
#include <string.h>

#include "wpvol.h"
#include "wpoly.h"
#include "wpvol_internal.h"
#include "wpoly_internal.h"

/* Adjoint buffers of one workspace (owned by it, allocated on first use). */
struct wpoly_adj_struct
{
    wpvol_biv_struct *bB;     /* [h], 1 <= h < g: adjoint of B_h[{1}] */
    wpvol_biv_t bA, bC;       /* adjoint of A_G (then of the bracket R and of D), of C_{G-1} */
    ulong **rhat;             /* [G], 2 <= G <= g: transform of the reversed adjoint bracket */
    ulong *bE, *bf, *s1, *s2; /* L, fsz, L, L words */
};

/* x[j] += s sum_{k=j}^{l-1} c[k-j] y[k] for j < l: the transpose of y -> (c y) mod u^l. */
static void wpoly_adj_corr(ulong *x, const ulong *c, const ulong *y, slong l, ulong s,
                           wpoly_ws_t *ws)
{
    ulong *r = ws->adj->s1, *z = ws->adj->s2;
    slong k;

    if (l <= 0)
        return;
    for (k = 0; k < l; k++)
        r[k] = y[l - 1 - k];
    _nmod_poly_mullow(z, r, l, c, l, l, ws->mod);
    for (k = 0; k < l; k++)
        x[k] = nmod_add(x[k], nmod_mul(z[l - 1 - k], s, ws->mod), ws->mod);
}

/* bX += d_0^T bY, where Y = d_0 X in shape (X gives the shape; bY has one row more). */
static void wpoly_adj_d0(wpvol_biv_struct *bX, const wpvol_biv_struct *bY, wpoly_ws_t *ws)
{
    slong r, k;

    for (r = 0; r < bX->rows; r++)
    {
        slong l = wpvol_biv_rowlen(bX, r);
        ulong *x = bX->c + r * bX->len;
        const ulong *y1 = bY->c + r * bY->len, *y2 = y1 + bY->len;
        for (k = 0; k + 1 < l; k++)
            x[k + 1] = nmod_add(x[k + 1], nmod_mul((ulong) (k + 1), y1[k], ws->mod), ws->mod);
        wpoly_adj_corr(x, ws->ctx->i2, y2, l, (ulong) (bX->mlo + r) % ws->mod.n, ws);
    }
}

/* bE += the transpose of E -> cross term of E on the base component X0 (wpoly_cross), given
   the adjoint bY of its target. */
static void wpoly_adj_cross(const wpvol_biv_struct *bY, const wpvol_biv_struct *X0, wpoly_ws_t *ws)
{
    slong r;

    for (r = 0; r < X0->rows; r++)
        wpoly_adj_corr(ws->adj->bE, X0->c + r * X0->len, bY->c + (r + 1) * bY->len,
                       wpvol_biv_rowlen(X0, r), (ulong) (X0->mlo + r) % ws->mod.n, ws);
}

/* Shapes a scratch biv (storage of the largest shape) and zeroes it. */
static void wpoly_adj_shape(wpvol_biv_struct *b, slong mlo, slong rows)
{
    b->mlo = mlo;
    b->rows = rows;
    memset(b->c, 0, (size_t) (rows * b->len) * sizeof(ulong));
}

/* Transposed top-down step of the component {1} seeded with the read-out functional
   (bf row m = [u^0], all m): writes the adjoint of A_g into adj->bA and adds to bE. */
static void wpoly_adj_topdown(wpoly_ws_t *ws)
{
    struct wpoly_adj_struct *ad = ws->adj;
    slong g = ws->g, L = ws->L, W = L + 1, flo = 2 * g - 1, top = 5 * g - 3, j, k, m;
    const ulong *f0 = ws->comp[0].f;
    ulong *bt = ws->tmp;
    nmod_t mod = ws->mod;

    memset(ad->bf, 0, (size_t) ws->fsz * sizeof(ulong));
    for (m = 2 * g - 1; m <= 5 * g - 5; m++)
        ad->bf[(m - flo) * W] = 1;
    wpoly_adj_shape(ad->bA, 2 * g, 3 * g - 2);
    for (j = 2 * g + 1; j <= top; j++)
    {
        slong l = L - (top - j);
        ulong *ba = ad->bA->c + (j - 2 * g) * L, *bu = ad->bf + (j - 1 - flo) * W;
        ulong iv = ws->ctx->inv[j - 2];
        memset(bt, 0, (size_t) l * sizeof(ulong));
        wpoly_adj_corr(bt, ws->ctx->i2inv, ad->bf + (j - 2 - flo) * W, l, 1, ws);
        wpoly_adj_corr(ad->bE, f0 + (j - 2 - flo) * W, bt, l, nmod_neg(1, mod), ws);
        for (k = 0; k < l; k++)
        {
            ulong t = nmod_mul(bt[k], iv, mod);
            ba[k] = nmod_add(ba[k], t, mod);
            bu[k + 1] = nmod_sub(bu[k + 1], nmod_mul((ulong) (k + 1), t, mod), mod);
        }
    }
}

/* The transform of the adjoint bracket bR of genus G (shape of A_G read as r_{2G+1+r}), its
   rows r >= 1 (those the products reach) packed in slots r-1 of width 2L-1 and reversed cyclically (t -> -t mod T): with it the correlations of
   bR with the B_h[{}] are cyclic convolutions of length T = Tmax.  Exact: the correlation
   needed at positions q < N_y touches positions s - q of the image of B_h (length N_x), and
   N_x + N_y = (3G-3)(2L-1) + 1 <= T, so nothing wraps. */
static int wpoly_adj_rhat(wpoly_ws_t *ws, slong G)
{
    struct wpoly_adj_struct *ad = ws->adj;
    slong r, k, T = ws->Tmax, slot = 2 * ws->L - 1;
    ulong *x, *p = ws->buf;

    if (ad->rhat[G] == NULL && (ad->rhat[G] = malloc((size_t) T * sizeof(ulong))) == NULL)
        return WPVOL_NOMEM;
    x = ad->rhat[G];
    memset(p, 0, (size_t) T * sizeof(ulong));
    for (r = 1; r < ad->bA->rows; r++)   /* product slot i is bracket row i+1 */
        memcpy(p + (r - 1) * slot, ad->bA->c + r * ad->bA->len,
               (size_t) wpvol_biv_rowlen(ad->bA, r) * sizeof(ulong));
    x[0] = p[0];
    for (k = 1; k < T; k++)
        x[k] = p[T - k];
    wpvol_ntt_fwd(x, T, ws->F);
    return WPVOL_OK;
}

/* bB_k += sum_{G=k+1}^{g} (correlation of bR_G with B_{G-k}[{}]): one pointwise sum of the
   cached transforms and one inverse transform (2 T times the result, scaled back). */
static void wpoly_adj_products(wpoly_ws_t *ws, slong k)
{
    struct wpoly_adj_struct *ad = ws->adj;
    slong G, np = 0, T = ws->Tmax, slot = 2 * ws->L - 1, r, o;
    wpvol_biv_struct *b = &ad->bB[k];
    ulong sc = nmod_inv(nmod_mul(2, (ulong) T % ws->mod.n, ws->mod), ws->mod);

    for (G = k + 1; G <= ws->g; G++)
    {
        ws->pa[np] = ad->rhat[G];
        ws->pb[np++] = ws->comp[0].hat[G - k];
    }
    wpvol_ntt_dot2(ws->buf, ws->pa, ws->pb, np, NULL, T, ws->mod);
    wpvol_ntt_inv(ws->buf, T, ws->F);
    for (r = 0; r < b->rows; r++)
    {
        ulong *y = b->c + r * b->len;
        for (o = 0; o < wpvol_biv_rowlen(b, r); o++)
        {
            slong q = r * slot + o;
            ulong v = ws->buf[q == 0 ? 0 : T - q];
            y[o] = nmod_add(y[o], nmod_mul(v, sc, ws->mod), ws->mod);
        }
    }
}

/* Transposed step of genus G >= 2 (wpoly_step): from the adjoint of A_G (in adj->bA) to the
   bracket (rows scaled by 1/(2G+r)), its transform for the products, D = 12 x bracket part,
   then C_{G-1} = d_0 B_{G-1} + cross and D = d_0 C_{G-1} + cross transposed. */
static int wpoly_adj_step(wpoly_ws_t *ws, slong G)
{
    struct wpoly_adj_struct *ad = ws->adj;
    const wpoly_comp_t *c0 = &ws->comp[0];
    slong r;
    int st;

    for (r = 0; r < ad->bA->rows; r++)
        _nmod_vec_scalar_mul_nmod(ad->bA->c + r * ws->L, ad->bA->c + r * ws->L,
                                  wpvol_biv_rowlen(ad->bA, r), ws->ctx->inv[2 * G + r], ws->mod);
    st = wpoly_adj_rhat(ws, G);
    if (st != WPVOL_OK)
        return st;
    _nmod_vec_scalar_mul_nmod(ad->bA->c, ad->bA->c, ad->bA->rows * ws->L, ws->ctx->inv[12],
                              ws->mod);
    ad->bA->mlo = 2 * G + 1;   /* now the adjoint of D */
    wpoly_adj_shape(ad->bC, 2 * G, 3 * G - 3);
    wpoly_adj_d0(ad->bC, ad->bA, ws);
    wpoly_adj_cross(ad->bA, &c0->X[WPOLY_C][G - 1], ws);
    wpoly_adj_d0(&ad->bB[G - 1], ad->bC, ws);
    wpoly_adj_cross(ad->bC, &c0->X[WPOLY_B][G - 1], ws);
    return WPVOL_OK;
}

/* The vector lambda (adj->bE) of the linear map E -> W for the current prime; the component
   {} (comp[0], with its transforms) must be computed.  Returns a status code. */
static int wpoly_adj_lambda(wpoly_ws_t *ws)
{
    struct wpoly_adj_struct *ad = ws->adj;
    slong G, h, k, g = ws->g;
    int st = WPVOL_OK;

    memset(ad->bE, 0, (size_t) ws->L * sizeof(ulong));
    for (h = 1; h < g; h++)
        memset(ad->bB[h].c, 0, (size_t) (ad->bB[h].rows * ad->bB[h].len) * sizeof(ulong));
    wpoly_adj_topdown(ws);
    for (G = g; G >= 1 && st == WPVOL_OK; G--)
    {
        if (wpvol_cancelled())
            return WPVOL_CANCELLED;
        if (G < g)
        {
            wpoly_adj_products(ws, G);
            wpoly_adj_shape(ad->bA, 2 * G, 3 * G - 2);
            wpoly_adj_d0(ad->bA, &ad->bB[G], ws);
            wpoly_adj_cross(&ad->bB[G], &ws->comp[0].X[WPOLY_A][G], ws);
        }
        if (G >= 2)
            st = wpoly_adj_step(ws, G);
    }
    for (k = 0; k < ws->L; k++)   /* A_1[{1}] = E/24 */
        ad->bE[k] = nmod_add(ad->bE[k], nmod_mul(ad->bA->c[k], ws->ctx->inv[24], ws->mod),
                             ws->mod);
    return st;
}

/* Allocates the adjoint buffers on first use.  Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpoly_adj_alloc(wpoly_ws_t *ws)
{
    struct wpoly_adj_struct *ad;
    slong h, g = ws->g, L = ws->L;
    int ok;

    if (ws->adj != NULL)
        return WPVOL_OK;
    if ((ad = calloc(1, sizeof(*ad))) == NULL)
        return WPVOL_NOMEM;
    ws->adj = ad;
    ad->bB = calloc((size_t) (g + 1), sizeof(wpvol_biv_struct));
    ad->rhat = calloc((size_t) (g + 1), sizeof(ulong *));
    ad->bE = malloc((size_t) (3 * L + ws->fsz) * sizeof(ulong));
    ok = ad->bB != NULL && ad->rhat != NULL && ad->bE != NULL
         && wpvol_biv_init(ad->bA, 0, 3 * g - 2, L, 1) == 0
         && wpvol_biv_init(ad->bC, 0, 3 * g - 3, L, 1) == 0;
    for (h = 1; ok && h < g; h++)
        ok = wpvol_biv_init(&ad->bB[h], 2 * h + 1, 3 * h - 1, L, 1) == 0;
    if (!ok)
        return WPVOL_NOMEM;
    ad->s1 = ad->bE + L;
    ad->s2 = ad->s1 + L;
    ad->bf = ad->s2 + L;
    return WPVOL_OK;
}

/* See wpoly_internal.h. */
void wpoly_adj_free(wpoly_ws_t *ws)
{
    struct wpoly_adj_struct *ad = ws->adj;
    slong h;

    if (ad == NULL)
        return;
    for (h = 0; ad->bB != NULL && h <= ws->g; h++)
        wpvol_biv_clear(&ad->bB[h]);
    for (h = 0; ad->rhat != NULL && h <= ws->g; h++)
        free(ad->rhat[h]);
    wpvol_biv_clear(ad->bA);
    wpvol_biv_clear(ad->bC);
    free(ad->bB);
    free(ad->rhat);
    free(ad->bE);
    free(ad);
    ws->adj = NULL;
}

/* See wpoly_internal.h. */
int wpoly_adj_run(wpoly_ws_t *ws, ulong *res)
{
    slong k, D = 3 * ws->g - 2;
    int st = wpoly_adj_alloc(ws);

    if (st == WPVOL_OK)
        st = wpoly_adj_lambda(ws);
    for (k = 0; k < ws->nidx && st == WPVOL_OK; k++)
    {
        slong a = ws->idx[k];
        ulong w;
        if (a < 2)
        {
            wpoly_set_index(ws, &a);
            w = wpoly_readout(ws, &a);
        }
        else
            w = nmod_mul(ws->adj->bE[a - 2], ws->ifact[a - 2], ws->mod);
        res[k] = nmod_mul(w, ws->fact[D - a], ws->mod);
    }
    return st;
}
