/* wpvol_series.c - truncated (bi)variate power series modulo a word-size prime, for the
 * Weil-Petersson volume engine (see wpvol_internal.h for the data layout and ownership).
 */
#include <stdlib.h>
#include <string.h>

#include "wpvol_internal.h"

/* Zeroed biv of the requested shape.
   Returns 0, or -1 (with b->c == NULL) if the allocation failed. */
int wpvol_biv_init(wpvol_biv_t b, slong mlo, slong rows, slong len, int tri)
{
    b->mlo = mlo;
    b->rows = rows;
    b->len = len;
    b->tri = tri;
    b->c = NULL;
    if (rows <= 0 || len <= 0)
        return 0;
    b->c = calloc((size_t) rows * (size_t) len, sizeof(ulong));
    if (b->c == NULL)
    {
        b->rows = 0;
        return -1;
    }
    return 0;
}

/* Frees the coefficient block; b becomes an empty biv.
   Harmless on an empty or failed biv (free(NULL) is a no-op). */
void wpvol_biv_clear(wpvol_biv_t b)
{
    free(b->c);
    b->c = NULL;
    b->rows = 0;
}

/* Meaningful length of row r: the full length, or for a triangular biv one term less per row
   below the top (the truncation d + o <= len-1 of the engine). */
slong wpvol_biv_rowlen(const wpvol_biv_t b, slong r)
{
    slong l = b->tri ? b->len - (b->rows - 1 - r) : b->len;

    return FLINT_MAX(l, 0);
}

/* Pointer to the row of v^{-m}, NULL when m is not stored.
   The pointer stays valid until b is cleared. */
ulong *wpvol_biv_row(const wpvol_biv_t b, slong m)
{
    if (m < b->mlo || m >= b->mlo + b->rows || b->c == NULL)
        return NULL;
    return b->c + (m - b->mlo) * b->len;
}

/* Y = v^{-1}(d/du - I_2 d/dv) X: the row c_m of X sends c_m' to v^{-(m+1)} and m I_2 c_m to
   v^{-(m+2)} (d/dv v^{-m} = -m v^{-m-1}).  Y must have the shape documented in the header.
   Triangular rows are multiplied only to their own length (the cost is quadratic in it). */
void wpvol_biv_d0(wpvol_biv_t Y, const wpvol_biv_t X, const wpvol_ctx_t ctx)
{
    slong r, k, len = X->len;
    nmod_t mod = ctx->mod;
    ulong *tmp;

    if (Y->c == NULL)
        return;
    memset(Y->c, 0, (size_t) Y->rows * (size_t) Y->len * sizeof(ulong));
    if (X->c == NULL || len <= 0)
        return;
    tmp = Y->c + (Y->rows - 1) * len;   /* last row of Y is written only by the last X row */
    for (r = 0; r < X->rows; r++)
    {
        const ulong *x = X->c + r * len;
        ulong *y1 = Y->c + r * len;         /* row m+1 */
        ulong *y2 = Y->c + (r + 1) * len;   /* row m+2 */
        ulong m = (ulong) (X->mlo + r) % mod.n;
        slong l = wpvol_biv_rowlen(X, r);

        for (k = 0; k + 1 < l; k++)
            y1[k] = nmod_add(y1[k], nmod_mul((ulong) (k + 1), x[k + 1], mod), mod);
        if (l == 0)
            continue;
        if (r + 1 == X->rows)
        {
            /* y2 is the last row (== tmp), still zero: compute in place */
            wpvol_ctx_mul_i2(y2, x, l, ctx);
            _nmod_vec_scalar_mul_nmod(y2, y2, l, m, mod);
        }
        else
        {
            ulong *t = tmp;   /* the last row is free scratch until the last iteration */
            wpvol_ctx_mul_i2(t, x, l, ctx);
            _nmod_vec_scalar_addmul_nmod(y2, t, l, m, mod);
            memset(t, 0, (size_t) l * sizeof(ulong));
        }
    }
}

/* Copies the first t terms of each of the rows of X into slots of width `slot` of dst (which
   is zero elsewhere); the Kronecker substitution v^{-1} -> u^slot keeps rows apart. */
static void wpvol_biv_pack(ulong *dst, const wpvol_biv_t X, slong t, slong slot)
{
    slong r, n = (X->rows - 1) * slot + t;

    memset(dst, 0, (size_t) n * sizeof(ulong));
    for (r = 0; r < X->rows; r++)
        memcpy(dst + r * slot, X->c + r * X->len,
               (size_t) FLINT_MIN(t, wpvol_biv_rowlen(X, r)) * sizeof(ulong));
}

/* R += s X Y truncated to t terms per row, by one univariate product (Kronecker substitution
   with slot 2t-1, wide enough that no row of the product spills into the next).
   Returns 0 or -1 on failed scratch allocation. */
int wpvol_biv_addmul(wpvol_biv_t R, const wpvol_biv_t X, const wpvol_biv_t Y, slong t, ulong s,
                     nmod_t mod)
{
    slong slot, lx, ly, lp, r, off;
    ulong *px, *py, *pp;
    int square = (X == Y);

    if (X->rows <= 0 || Y->rows <= 0 || t <= 0 || X->c == NULL || Y->c == NULL)
        return 0;
    slot = 2 * t - 1;
    lx = (X->rows - 1) * slot + t;
    ly = (Y->rows - 1) * slot + t;
    lp = lx + ly - 1;
    px = malloc((size_t) (lx + (square ? 0 : ly) + lp) * sizeof(ulong));
    if (px == NULL)
        return -1;
    py = square ? px : px + lx;
    pp = px + lx + (square ? 0 : ly);
    wpvol_biv_pack(px, X, t, slot);
    if (!square)
        wpvol_biv_pack(py, Y, t, slot);
    if (lx >= ly)
        _nmod_poly_mul(pp, px, lx, py, ly, mod);
    else
        _nmod_poly_mul(pp, py, ly, px, lx, mod);
    off = X->mlo + Y->mlo - R->mlo;
    for (r = 0; r < X->rows + Y->rows - 1; r++)
    {
        ulong *dst = R->c + (off + r) * R->len;
        _nmod_vec_scalar_addmul_nmod(dst, pp + r * slot, t, s, mod);
    }
    free(px);
    return 0;
}

/* res = 1/a mod u^n by the triangular recurrence res_k = -a_0^{-1} sum_{i=1..k} a_i res_{k-i}.
   O(n^2) operations; n is at most a few thousand here. */
void wpvol_series_inv(ulong *res, const ulong *a, slong n, nmod_t mod)
{
    slong k, i;
    ulong a0inv;

    if (n <= 0)
        return;
    a0inv = nmod_inv(a[0], mod);
    res[0] = a0inv;
    for (k = 1; k < n; k++)
    {
        ulong acc = 0;
        for (i = 1; i <= k; i++)
            acc = nmod_add(acc, nmod_mul(a[i], res[k - i], mod), mod);
        res[k] = nmod_neg(nmod_mul(acc, a0inv, mod), mod);
    }
}

/* Fills fact[0..n) with k! mod p and ifact[0..n) with their inverses (one modular inversion).
   Requires p > n-1 so that every factorial is a unit. */
static void wpvol_series_factorials(ulong *fact, ulong *ifact, slong n, nmod_t mod)
{
    slong k;

    fact[0] = 1;
    for (k = 1; k < n; k++)
        fact[k] = nmod_mul(fact[k - 1], (ulong) k, mod);
    ifact[n - 1] = nmod_inv(fact[n - 1], mod);
    for (k = n - 1; k > 0; k--)
        ifact[k - 1] = nmod_mul(ifact[k], (ulong) k, mod);
}

/* Builds I_2 = sum (-1)^k u^k/(k!(k+1)!), its inverse, and 1/k for k < invlen.
   Returns 0 or -1 on exhausted memory (ctx left empty). */
int wpvol_ctx_init(wpvol_ctx_t ctx, nmod_t mod, slong len, slong invlen)
{
    slong k, nf = FLINT_MAX(len + 1, invlen) + 1;
    ulong *fact, *ifact;

    memset(ctx, 0, sizeof(wpvol_ctx_struct));
    ctx->mod = mod;
    ctx->len = len;
    ctx->invlen = invlen;
    ctx->i2 = calloc((size_t) len, sizeof(ulong));
    ctx->i2inv = calloc((size_t) len, sizeof(ulong));
    ctx->inv = calloc((size_t) FLINT_MAX(invlen, 1), sizeof(ulong));
    fact = malloc((size_t) nf * 2 * sizeof(ulong));
    if (ctx->i2 == NULL || ctx->i2inv == NULL || ctx->inv == NULL || fact == NULL)
    {
        free(fact);
        wpvol_ctx_clear(ctx);
        return -1;
    }
    ifact = fact + nf;
    wpvol_series_factorials(fact, ifact, nf, mod);
    for (k = 0; k < len; k++)
    {
        ulong t = nmod_mul(ifact[k], ifact[k + 1], mod);
        ctx->i2[k] = (k & 1) ? nmod_neg(t, mod) : t;
    }
    wpvol_series_inv(ctx->i2inv, ctx->i2, len, mod);
    for (k = 1; k < invlen; k++)
        ctx->inv[k] = nmod_mul(ifact[k], fact[k - 1], mod);
    free(fact);
    return 0;
}

/* Frees the series of ctx and leaves it empty (safe to call twice). */
void wpvol_ctx_clear(wpvol_ctx_t ctx)
{
    free(ctx->i2);
    free(ctx->i2inv);
    free(ctx->inv);
    free(ctx->i2hat);
    free(ctx->work);
    memset(ctx, 0, sizeof(wpvol_ctx_struct));
}

/* Points used for a row of l terms times I_2 cut to K terms (the product's l + K - 1 terms,
   rounded up to a multiple of 64 so that the truncated transforms stay shallow). */
static slong wpvol_ctx_row_pts(slong l, slong K)
{
    return (l + K - 1 + 63) / 64 * 64;
}

/* Terms of I_2 kept for truncation k (k = 0, 1, ...): (k+1) WPVOL_ROW_STEP, at most len. */
static slong wpvol_ctx_row_cut(const wpvol_ctx_t ctx, slong k)
{
    return FLINT_MIN((k + 1) * WPVOL_ROW_STEP, ctx->len);
}

/* Caches, for every truncation K of I_2 and of 1/I_2 (multiples of WPVOL_ROW_STEP up to
   maxrow), the first points of the transform of the series cut to K terms that any row of
   l <= K terms needs.
   Returns 0, or -1 on exhausted memory (ctx then classical only). */
int wpvol_ctx_attach_ntt(wpvol_ctx_t ctx, const wpvol_ntt_struct *F, slong maxrow)
{
    slong k, tlen = 1, nk = (maxrow + WPVOL_ROW_STEP - 1) / WPVOL_ROW_STEP;

    while (tlen < wpvol_ctx_row_pts(maxrow, wpvol_ctx_row_cut(ctx, nk - 1)))
        tlen *= 2;
    if (maxrow <= WPVOL_ROW_MIN || F == NULL || F->n < tlen)
        return 0;
    ctx->work = wpvol_words_alloc(tlen);
    ctx->i2hat = wpvol_words_alloc(4 * nk * tlen);
    if (ctx->work == NULL || ctx->i2hat == NULL)
        return -1;   /* ctx->ntt still NULL: classical path; blocks freed by clear */
    for (k = 0; k < 2 * nk; k++)   /* I_2, then 1/I_2 */
    {
        slong K = wpvol_ctx_row_cut(ctx, k % nk), n = FLINT_MIN(tlen, wpvol_ctx_row_pts(K, K));
        ulong *h = ctx->i2hat + 2 * k * tlen;
        memcpy(h, k < nk ? ctx->i2 : ctx->i2inv, (size_t) K * sizeof(ulong));
        wpvol_ntt_fwd_trunc(h, tlen, n, K, F);
        wpvol_ntt_shoup_vec(h + tlen, h, n, ctx->mod);
    }
    ctx->tlen = tlen;
    ctx->nk = nk;
    ctx->ntt = F;
    return 0;
}

/* res = x S mod u^l for S = I_2 (which = 0) or 1/I_2 (which = 1): classical for short rows
   (cheaper below a few hundred terms), else truncated transforms at the l + K - 1 points of
   the product by S cut to K >= l terms (exact: the product has no more terms, and terms of S
   beyond K do not reach u^{l-1}). */
static void wpvol_ctx_mul_series(ulong *res, const ulong *x, slong l, const wpvol_ctx_t ctx,
                                 int which)
{
    slong k, K, n, N = 1;
    const ulong *h, *hpre;
    ulong *w = ctx->work;

    if (ctx->ntt == NULL || l <= WPVOL_ROW_MIN)
    {
        const ulong *S = which ? ctx->i2inv : ctx->i2;
        if (l >= 1 && l <= WPVOL_SIMD_MULLOW_MAX && wpvol_simd_for(ctx->mod.n))
            wpvol_simd_mullow(res, x, S, l, ctx->mod.n);
        else
            _nmod_poly_mullow(res, x, l, S, l, l, ctx->mod);
        return;
    }
    k = (l + WPVOL_ROW_STEP - 1) / WPVOL_ROW_STEP - 1;
    K = wpvol_ctx_row_cut(ctx, k);
    n = wpvol_ctx_row_pts(l, K);
    while (N < n)
        N *= 2;
    h = ctx->i2hat + 2 * (k + which * ctx->nk) * ctx->tlen;
    hpre = h + ctx->tlen;
    memcpy(w, x, (size_t) l * sizeof(ulong));
    wpvol_ntt_fwd_trunc(w, N, n, l, ctx->ntt);
    wpvol_ntt_mul_shoup_vec(w, h, hpre, n, ctx->mod);
    memset(w + n, 0, (size_t) (N - n) * sizeof(ulong));
    wpvol_ntt_inv_trunc(w, N, n, ctx->ntt);
    memcpy(res, w, (size_t) l * sizeof(ulong));
}

void wpvol_ctx_mul_i2(ulong *res, const ulong *x, slong l, const wpvol_ctx_t ctx)
{
    wpvol_ctx_mul_series(res, x, l, ctx, 0);
}

void wpvol_ctx_mul_i2inv(ulong *res, const ulong *x, slong l, const wpvol_ctx_t ctx)
{
    wpvol_ctx_mul_series(res, x, l, ctx, 1);
}
