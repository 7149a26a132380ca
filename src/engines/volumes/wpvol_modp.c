/* wpvol_modp.c - all V_{g,n}, g <= G, n <= N, modulo one word-size prime.
 *
 * Method (derivation in docs/volumes-engine.md).  F_g is the genus-g Witten-Kontsevich free
 * energy at t_0 = x, t_1 free, t_k = (-1)^k/(k-1)! (k >= 2), so that n! [x^n] F_g = V_{g,n}
 * at t_1 = 0.  In the coordinates u = d_0^2 F_0 and v = 1 - I_1 (I_k = sum_n t_{n+k} u^n/n!):
 *     d_0 = v^{-1} (d/du - I_2(u) d/dv),   d_0 F_1 = I_2 / (24 v^2),
 *     d/dv (d_0 F_g) = -[ 1/2 sum_{h=1}^{g-1} d_0^2 F_h d_0^2 F_{g-h} + 1/12 d_0^4 F_{g-1} ],
 * and d_0 F_g = sum_{m=2g}^{5g-3} c_m(u) v^{-m} has no v^0 term, so c_m = r_{m+1}/m where r_j
 * is the coefficient of v^{-j} of the bracket.  Along t_1 = 0, v = J_0(2 sqrt u) and
 * x = int_0^u v, which turns d_0 F_g into a series in x (volumes with n >= 1).  F_g itself
 * (n = 0) follows from d_0 F_g = sum_m (f_{m-1}' + (m-2) I_2 f_{m-2}) v^{-m} solved from the
 * top power of v down (F_g = sum_m f_m v^{-m}, m in [2g-1, 5g-5]).
 *
 * Truncation.  With d = (top power) - m the distance of a row from the top and o the order in
 * u, d_0 maps (d, o) to (d+1, o-1) and (d, o+r), and products add both d and o, so the set
 * {d + o <= S} is closed under every operation used.  One S serves all genera (see
 * wpvol_modp_tri); every genus is stored as rows of length L = S+1, the row at distance d
 * holding L - d meaningful terms (triangular biv).
 *
 * Products.  The sum over h of d_0^2 F_h d_0^2 F_{g-h} is computed with the Kronecker
 * substitution (row r in slot r(2L-1)); with a prime p = c 2^k + 1 each d_0^2 F_h is
 * transformed once (wpvol_ntt.c, truncated transforms at the points of genus G) and every
 * genus needs one pointwise multiply-accumulate (shared by the genera of a block, see
 * wpvol_modp_block_sums) and one inverse truncated transform.  Any other prime uses FLINT's
 * products (same results).
 */
#include <stdlib.h>
#include <string.h>

#include "wpvol.h"
#include "wpvol_internal.h"

/* Total-degree bound S: every genus keeps the terms u^o v^{-m} with d + o <= S, where
   d = (top power of v) - m.  n >= 1 needs all rows of genus g to order N-1 (d <= 3g-3), and the
   top-down step for V_{g,0} needs d + o <= 3g-4 (one more for its consistency check). */
static slong wpvol_modp_tri(slong G, slong N)
{
    slong s = N >= 1 ? 3 * G + N - 4 : 3 * G - 3;
    return FLINT_MAX(s, 0);
}

/* Stored series length of every genus (the rectangle hull of the triangle). */
static slong wpvol_modp_len(slong G, slong N)
{
    return 1 + wpvol_modp_tri(G, N);
}

/* Longest series used for (G, N) (the prime must exceed it so that factorials are units).
   Covers the rows, the top-down inverse 1/I_2 and the x-series. */
slong wpvol_modp_maxlen(slong G, slong N)
{
    slong l = FLINT_MAX(wpvol_modp_len(G, N), 3 * G + 1);
    return FLINT_MAX(l, N + 2);
}

/* Transform length for the products of genus g: the Kronecker images of B_h and B_{g-h}
   (rows 3h-1 and 3(g-h)-1, slot 2L-1) have a product of (3g-3) slots plus one row. */
static slong wpvol_modp_ntt_len(slong g, slong L)
{
    slong need = (3 * g - 2) * (2 * L - 1), T = 1;

    while (T < need)
        T *= 2;
    return T;
}

/* Transform points used for genus g: the product's length rounded up to a multiple of
   WPVOL_TFT_GRAIN, at most T (truncated transforms: the first n points of the bit-reversed
   transform of length T). */
static slong wpvol_modp_ntt_pts(slong g, slong L)
{
    slong need = (3 * g - 2) * (2 * L - 1), q = WPVOL_TFT_GRAIN;

    return FLINT_MIN(wpvol_modp_ntt_len(g, L), (need + q - 1) / q * q);
}

/* Buffers for one (G, N), reused for every prime a worker thread handles (allocating them
 * per prime costs more in page faults than the arithmetic of small genera).  Owned by the
 * creator (wpvol_ws_new / wpvol_ws_free). */
struct wpvol_ws_struct
{
    slong G, N, L;           /* L: series length of every row */
    slong Tmax;              /* largest transform length (genus G products) */
    slong npts;              /* points used of it (wpvol_modp_ntt_pts(G, L)) */
    wpvol_biv_struct *B;     /* B[h] = d_0^2 F_h, 1 <= h < G, each owning its rows */
    ulong *abuf, *cbuf, *dbuf; /* (3G+1)*L words each: A_g (and the bracket), C, D */
    ulong **hat;             /* hat[h]: npts words, allocated on first use and kept */
    ulong *buf;              /* Tmax words: product of the transforms */
    ulong *part;             /* WPVOL_GBLOCK * npts words: partial sums of a genus block */
    slong blk0;              /* first genus of the block whose partial sums are in part */
    wpvol_ntt_t F;           /* transform tables (allocated on first use, refilled per prime) */
};

/* Per-prime state of one run (lives on the stack of wpvol_modp_run). */
typedef struct
{
    wpvol_ws_t *ws;
    slong G, N, L;
    nmod_t mod;
    wpvol_ctx_t ctx;
    ulong *res;            /* caller's result array */
    ulong *fact;           /* k! for 0 <= k <= N+1 */
    ulong *iv;             /* 1/J_0(2 sqrt u) mod u^N */
    nmod_poly_t ux;        /* u(x): inverse series of x(u) = int_0^u J_0(2 sqrt s) ds */
    int use_ntt;           /* products by cached transforms (else FLINT Kronecker products) */
} wpvol_run_t;

/* Prepares factorials, u(x) and 1/J_0 for the outputs; these only depend on N.
   Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpvol_modp_setup(wpvol_run_t *st)
{
    slong k, N = st->N, nx = FLINT_MAX(N, 2);
    ulong *ifact, *j0;
    nmod_t mod = st->mod;
    nmod_poly_t xu;

    st->fact = malloc((size_t) (2 * (N + 2) + 2 * nx) * sizeof(ulong));
    if (st->fact == NULL)
        return WPVOL_NOMEM;
    ifact = st->fact + (N + 2);
    st->iv = ifact + (N + 2);
    j0 = st->iv + nx;
    st->fact[0] = 1;
    for (k = 1; k < N + 2; k++)
        st->fact[k] = nmod_mul(st->fact[k - 1], (ulong) k, mod);
    ifact[N + 1] = nmod_inv(st->fact[N + 1], mod);
    for (k = N + 1; k > 0; k--)
        ifact[k - 1] = nmod_mul(ifact[k], (ulong) k, mod);
    /* J_0(2 sqrt u) = sum (-1)^k u^k/k!^2 = v at t_1 = 0 */
    for (k = 0; k < nx; k++)
    {
        ulong t = k <= N + 1 ? nmod_mul(ifact[k], ifact[k], mod) : 0;
        j0[k] = (k & 1) ? nmod_neg(t, mod) : t;
    }
    wpvol_series_inv(st->iv, j0, nx, mod);
    /* x(u) = sum_{k>=1} (-1)^{k-1} u^k/(k!(k-1)!) (genus-0 string equation at t_1 = 0) */
    nmod_poly_init_preinv(xu, mod.n, mod.ninv);
    for (k = 1; k <= nx && k <= N + 1; k++)
    {
        ulong t = nmod_mul(ifact[k], ifact[k - 1], mod);
        nmod_poly_set_coeff_ui(xu, k, (k & 1) ? t : nmod_neg(t, mod));
    }
    nmod_poly_revert_series(st->ux, xu, nx);
    nmod_poly_clear(xu);
    return WPVOL_OK;
}

/* Genus 0: d_0^2 F_0 = u, so V_{0,n} = (n-2)! [x^{n-2}] u(x) for n >= 3.
   Writes res[n] for 0 <= n <= N (unstable entries 0). */
static void wpvol_modp_genus0(wpvol_run_t *st)
{
    slong n;

    for (n = 0; n <= st->N; n++)
        st->res[n] = n >= 3 ? nmod_mul(st->fact[n - 2],
                                       nmod_poly_get_coeff_ui(st->ux, n - 2), st->mod) : 0;
}

/* V_{g,n} for 1 <= n <= N from A = d_0 F_g: substitute v^{-1} = 1/J_0 (Horner in v^{-1}),
   then u = u(x); V_{g,n} = (n-1)! [x^{n-1}].  Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpvol_modp_outputs(wpvol_run_t *st, slong g, const wpvol_biv_t A)
{
    slong N = st->N, m, n, top = A->mlo + A->rows - 1;
    ulong *acc, *tmp;
    nmod_poly_t w, wx;

    if (N < 1)
        return WPVOL_OK;
    acc = calloc((size_t) (2 * N), sizeof(ulong));
    if (acc == NULL)
        return WPVOL_NOMEM;
    tmp = acc + N;
    for (m = top; m >= 1; m--)
    {
        const ulong *row = wpvol_biv_row(A, m);
        if (row != NULL)
            _nmod_vec_add(acc, acc, row, N, st->mod);
        _nmod_poly_mullow(tmp, acc, N, st->iv, N, N, st->mod);
        memcpy(acc, tmp, (size_t) N * sizeof(ulong));
    }
    nmod_poly_init_preinv(w, st->mod.n, st->mod.ninv);
    nmod_poly_init_preinv(wx, st->mod.n, st->mod.ninv);
    for (n = 0; n < N; n++)
        nmod_poly_set_coeff_ui(w, n, acc[n]);
    nmod_poly_compose_series(wx, w, st->ux, N);
    for (n = 1; n <= N; n++)
        st->res[g * (N + 1) + n] = nmod_mul(st->fact[n - 1],
                                            nmod_poly_get_coeff_ui(wx, n - 1), st->mod);
    nmod_poly_clear(w);
    nmod_poly_clear(wx);
    free(acc);
    return WPVOL_OK;
}

/* V_{g,0} = F_g(u=0, v=1) = sum_m f_m(0) where c_j = f_{j-1}' + (j-2) I_2 f_{j-2}, solved from
   j = 5g-3 down; f_m is kept to order m-2g+2, one more than needed, so that the unused equation
   j = 2g can be checked at order 0.  Returns WPVOL_OK, WPVOL_NOMEM or WPVOL_INTERNAL. */
static int wpvol_modp_topdown(wpvol_run_t *st, slong g, const wpvol_biv_t A)
{
    slong j, k, flo = 2 * g - 1, fhi = 5 * g - 5, lmax = fhi - 2 * g + 4;
    nmod_t mod = st->mod;
    ulong *f, *tmp, sum = 0;
    int status = WPVOL_OK;

    f = calloc((size_t) ((fhi - flo + 2) * lmax + lmax), sizeof(ulong));
    if (f == NULL)
        return WPVOL_NOMEM;
    tmp = f + (fhi - flo + 2) * lmax;   /* f_m at f + (m-flo)*lmax; row fhi+1 stays zero */
    for (j = 5 * g - 3; j >= 2 * g + 1; j--)
    {
        slong l = j - 2 * g + 1;                  /* length of f_{j-2} */
        const ulong *c = wpvol_biv_row(A, j);
        const ulong *fu = f + (j - 1 - flo) * lmax; /* f_{j-1}, length l+1 */
        ulong *fd = f + (j - 2 - flo) * lmax;

        for (k = 0; k < l; k++)
            tmp[k] = nmod_sub(c[k], nmod_mul((ulong) (k + 1), fu[k + 1], mod), mod);
        wpvol_ctx_mul_i2inv(fd, tmp, l, st->ctx);
        _nmod_vec_scalar_mul_nmod(fd, fd, l, st->ctx->inv[j - 2], mod);
    }
    /* equation j = 2g: c_{2g} = f_{2g-1}' (there is no f_{2g-2}) */
    if (wpvol_biv_row(A, 2 * g)[0] != f[1])
        status = WPVOL_INTERNAL;
    for (j = flo; j <= fhi; j++)
        sum = nmod_add(sum, f[(j - flo) * lmax], mod);
    st->res[g * (st->N + 1)] = sum;
    free(f);
    return status;
}

/* Makes hat[h] the first npts values of the length-Tmax transform of the Kronecker image of
   B[h] (rows in slots of width 2L-1, each row only to its meaningful length), computed in the
   product buffer (free between genera) and kept.  Only one transform per B[h] is needed: the
   first n values of a bit-reversed transform are those of every shorter power-of-two length
   that the data fits, so each genus reads the prefix it needs.
   Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpvol_modp_hat(wpvol_run_t *st, slong h)
{
    wpvol_ws_t *ws = st->ws;
    const wpvol_biv_struct *b = &ws->B[h];
    slong r, slot = 2 * st->L - 1, n = ws->npts;
    ulong *x = ws->buf;

    if (ws->hat[h] == NULL)
    {
        ws->hat[h] = wpvol_words_alloc(n);
        if (ws->hat[h] == NULL)
            return WPVOL_NOMEM;
    }
    memset(x, 0, (size_t) (b->rows * slot) * sizeof(ulong));
    for (r = 0; r < b->rows; r++)
        memcpy(x + r * slot, b->c + r * b->len, (size_t) wpvol_biv_rowlen(b, r) * sizeof(ulong));
    wpvol_ntt_fwd_trunc(x, ws->Tmax, n, b->rows * slot, ws->F);
    memcpy(ws->hat[h], x, (size_t) n * sizeof(ulong));
    return WPVOL_OK;
}

/* Genus blocks: from genus WPVOL_GBLOCK_FROM on, the genera are taken WPVOL_GBLOCK at a time.
   When a block starts at genus g0, the pairs (h, g'-h) of every genus g' of the block with both
   h, g'-h < g0 are summed in one pass (wpvol_ntt_dot2_many), which reads each cached transform
   once for the whole block instead of once per genus; the few pairs with a member >= g0 are
   added when g' is reached.  The pointwise sums are bounded by memory bandwidth, so this cuts
   their cost by about the block size at large g (results are unchanged: exact sums mod p). */
#define WPVOL_GBLOCK 8
#define WPVOL_GBLOCK_FROM 16
_Static_assert(WPVOL_GBLOCK == 8, "wpvol_simd_dot_window sums exactly eight genera");

/* The pairs (h, g-h) of genus g with h < g-h and lo <= g-h <= hi (the larger member in
   [lo, hi]) and h outside [skip_lo, skip_hi], appended to the pointer lists at *np; returns
   the transform of the square (h = g-h) if g is even and lo <= g/2 <= hi, else NULL. */
static const ulong *wpvol_modp_pairs(ulong **a, ulong **b, slong *np, const wpvol_ws_t *ws,
                                     slong g, slong lo, slong hi, slong skip_lo, slong skip_hi)
{
    slong h;

    for (h = 1; 2 * h < g; h++)
        if (g - h >= lo && g - h <= hi && (h < skip_lo || h > skip_hi))
        {
            a[*np] = ws->hat[h];
            b[*np] = ws->hat[g - h];
            (*np)++;
        }
    return g % 2 == 0 && g / 2 >= lo && g / 2 <= hi ? ws->hat[g / 2] : NULL;
}

/* The pairs h = WPVOL_GBLOCK..whi that every genus of the block at g0 has with both members
   below g0 (h < g0 - h), for the vector code's window (wpvol_simd_dot_window), which loads
   each factor once for all eight genera; whi < WPVOL_GBLOCK (an empty window) where that code
   does not run or the block is short. */
static slong wpvol_modp_window(const wpvol_run_t *st, slong g0, slong count)
{
    if (count != WPVOL_GBLOCK || !wpvol_simd_for(st->mod.n) || g0 > 4096)
        return 0;
    return (g0 - 1) / 2;
}

/* part[j] = 2 sum_{h < g'-h < g0} hat_h hat_{g'-h} (+ the square if g'/2 < g0) for the genera
   g' = g0 + j of the block starting at g0, each at its own points.
   Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpvol_modp_block_sums(wpvol_run_t *st, slong g0)
{
    wpvol_ws_t *ws = st->ws;
    slong j, count = FLINT_MIN((slong) WPVOL_GBLOCK, ws->G - g0 + 1), np = 0;
    slong wlo = WPVOL_GBLOCK, whi = wpvol_modp_window(st, g0, count);
    wpvol_dot_t d[WPVOL_GBLOCK];
    ulong **a = malloc((size_t) (count * g0) * sizeof(ulong *) * 2), **b;

    if (a == NULL)
        return WPVOL_NOMEM;
    b = a + count * g0;
    for (j = 0; j < count; j++)
    {
        slong gp = g0 + j, start = np;
        /* both members < g0, and not in the window summed by the vector code */
        d[j].sq = wpvol_modp_pairs(a, b, &np, ws, gp, 1, g0 - 1, wlo, whi);
        d[j].out = ws->part + j * ws->npts;
        d[j].a = a + start;
        d[j].b = b + start;
        d[j].npairs = np - start;
        d[j].add = whi >= wlo ? d[j].out : NULL;
        d[j].n = wpvol_modp_ntt_pts(gp, st->L);
    }
    if (whi >= wlo)
    {
        ulong *out[WPVOL_GBLOCK];
        for (j = 0; j < count; j++)
            out[j] = d[j].out;
        wpvol_simd_dot_window(out, ws->hat, g0, wlo, whi, d[count - 1].n, st->mod.n);
    }
    wpvol_ntt_dot2_many(d, count, st->mod);
    free(a);
    ws->blk0 = g0;
    return WPVOL_OK;
}

/* buf = 2 sum_{h<g-h} hat_h hat_{g-h} + square (the sum over ordered pairs) at the n points of
   genus g, from the block's partial sums when g is in a genus block.
   Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpvol_modp_genus_sum(wpvol_run_t *st, slong g, slong n)
{
    wpvol_ws_t *ws = st->ws;
    slong np = 0, g0 = 1;
    ulong *pa[64], *pb[64], **a = pa, **b = pb;   /* np <= g/2 pointers each */
    wpvol_dot_t d;

    if (g >= WPVOL_GBLOCK_FROM && ws->part != NULL)
    {
        g0 = g - (g - WPVOL_GBLOCK_FROM) % WPVOL_GBLOCK;
        if (ws->blk0 != g0 && wpvol_modp_block_sums(st, g0) != WPVOL_OK)
            return WPVOL_NOMEM;
    }
    if (g / 2 > 64)
    {
        a = malloc((size_t) (2 * (g / 2)) * sizeof(ulong *));
        if (a == NULL)
            return WPVOL_NOMEM;
        b = a + g / 2;
    }
    /* the pairs not in the block's sums: larger member >= g0 (without a block, g0 = 1: all) */
    d.sq = wpvol_modp_pairs(a, b, &np, ws, g, g0, g, 1, 0);
    d.out = ws->buf;
    d.a = a;
    d.b = b;
    d.npairs = np;
    d.add = g0 == 1 ? NULL : ws->part + (g - g0) * ws->npts;   /* the block's sums */
    d.n = n;
    wpvol_ntt_dot2_many(&d, 1, st->mod);
    if (a != pa)
        free(a);
    return WPVOL_OK;
}

/* A (rows v^{-(2g+1)}..) += 2 * 1/2 sum_{h=1}^{g-1} B_h B_{g-h} with one pointwise sum over
   prefixes of the cached transforms and a single inverse truncated transform: each B_h is
   transformed once in all.  Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpvol_modp_products_ntt(wpvol_run_t *st, slong g, wpvol_biv_t A)
{
    wpvol_ws_t *ws = st->ws;
    slong r, T = wpvol_modp_ntt_len(g, st->L), n = wpvol_modp_ntt_pts(g, st->L);
    slong slot = 2 * st->L - 1;

    if (wpvol_modp_genus_sum(st, g, n) != WPVOL_OK)
        return WPVOL_NOMEM;
    memset(ws->buf + n, 0, (size_t) (T - n) * sizeof(ulong));   /* the product is shorter */
    wpvol_ntt_inv_trunc(ws->buf, T, n, ws->F);
    /* product row i is v^{-(2g+2+i)}, i.e. row i+1 of A */
    for (r = 0; r + 1 < A->rows; r++)
        _nmod_vec_add(A->c + (r + 1) * A->len, A->c + (r + 1) * A->len, ws->buf + r * slot,
                      wpvol_biv_rowlen(A, r + 1), st->mod);
    return WPVOL_OK;
}

/* The same sum with FLINT products (any prime), without the factor 2: each unordered pair
   once, the square halved.  Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpvol_modp_products_flint(wpvol_run_t *st, slong g, wpvol_biv_t A)
{
    wpvol_biv_struct *B = st->ws->B;
    slong h;
    int ok = 1;

    for (h = 1; ok && 2 * h < g; h++)
        ok = wpvol_biv_addmul(A, &B[h], &B[g - h], st->L, 1, st->mod) == 0;
    if (ok && g % 2 == 0)
        ok = wpvol_biv_addmul(A, &B[g / 2], &B[g / 2], st->L, st->ctx->inv[2], st->mod) == 0;
    return ok ? WPVOL_OK : WPVOL_NOMEM;
}

/* Points b at caller-owned storage with the given shape (triangular); b does not own it and
   must not be cleared. */
static void wpvol_modp_view(wpvol_biv_t b, ulong *buf, slong mlo, slong rows, slong len)
{
    b->mlo = mlo;
    b->rows = rows;
    b->len = len;
    b->tri = 1;
    b->c = buf;
}

/* A = d_0 F_g (a view on ws->abuf) from the stored B[h] = d_0^2 F_h (h < g): the bracket R
   (rows v^{-(2g+1)} .. v^{-(5g-2)}), then c_m = r_{m+1}/m in place.
   Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpvol_modp_step(wpvol_run_t *st, slong g, wpvol_biv_t A)
{
    wpvol_ws_t *ws = st->ws;
    slong r, len = st->L;
    const wpvol_biv_struct *prev = &ws->B[g - 1];
    nmod_t mod = st->mod;
    ulong k = 1, kinv = 1;
    wpvol_biv_t C, D;
    int status;

    /* transforms deliver the product sum over ordered pairs, i.e. multiplied by k = 2: scale
       the other term by k too and divide by k together with 1/m at the end */
    if (st->use_ntt)
    {
        k = 2;
        kinv = nmod_inv(k, mod);
    }
    /* d_0^4 F_{g-1} = d_0^2 (B[g-1]); each d_0 adds one row */
    wpvol_modp_view(C, ws->cbuf, prev->mlo + 1, prev->rows + 1, len);
    wpvol_modp_view(D, ws->dbuf, prev->mlo + 2, prev->rows + 2, len);
    wpvol_modp_view(A, ws->abuf, 2 * g + 1, 3 * g - 2, len);
    wpvol_biv_d0(C, prev, st->ctx);
    wpvol_biv_d0(D, C, st->ctx);
    _nmod_vec_scalar_mul_nmod(A->c, D->c, A->rows * len, nmod_mul(st->ctx->inv[12], k, mod), mod);
    status = st->use_ntt ? wpvol_modp_products_ntt(st, g, A) : wpvol_modp_products_flint(st, g, A);
    if (status != WPVOL_OK)
        return status;
    /* d/dv sum c_m v^{-m} = -sum m c_m v^{-m-1} = -R: row r of R (v^{-(2g+1+r)}) / (2g+r) */
    A->mlo = 2 * g;
    for (r = 0; r < A->rows; r++)
        _nmod_vec_scalar_mul_nmod(A->c + r * len, A->c + r * len, wpvol_biv_rowlen(A, r),
                                  nmod_mul(st->ctx->inv[2 * g + r], kinv, mod), mod);
    return WPVOL_OK;
}

/* Volumes of genus g >= 1 from A = d_0 F_g, and B[g] = d_0 A when a later genus needs it.
   Returns WPVOL_OK, WPVOL_NOMEM or WPVOL_INTERNAL. */
static int wpvol_modp_finish_genus(wpvol_run_t *st, slong g, const wpvol_biv_t A)
{
    int status = wpvol_modp_outputs(st, g, A);

    if (status == WPVOL_OK && g >= 2)
        status = wpvol_modp_topdown(st, g, A);
    if (status == WPVOL_OK && g < st->G)
    {
        wpvol_biv_d0(&st->ws->B[g], A, st->ctx);
        if (st->use_ntt)
            status = wpvol_modp_hat(st, g);
    }
    return status;
}

/* Genus loop: A_1 = I_2/24 v^{-2}, then A_g from the recursion, keeping only B[h] = d_0 A_h.
   Returns WPVOL_OK, WPVOL_NOMEM or WPVOL_INTERNAL. */
static int wpvol_modp_genera(wpvol_run_t *st)
{
    slong g;
    wpvol_biv_t A;
    int status;

    wpvol_modp_view(A, st->ws->abuf, 2, 1, st->L);
    _nmod_vec_scalar_mul_nmod(A->c, st->ctx->i2, st->L, st->ctx->inv[24], st->mod);
    status = wpvol_modp_finish_genus(st, 1, A);
    for (g = 2; g <= st->G && status == WPVOL_OK; g++)
    {
        if (wpvol_cancelled())   /* one prime of a large table takes seconds: poll per genus */
            return WPVOL_CANCELLED;
        status = wpvol_modp_step(st, g, A);
        if (status == WPVOL_OK)
            status = wpvol_modp_finish_genus(st, g, A);
    }
    return status;
}

/* Chooses the product method: cached transforms when p - 1 is divisible by the largest
   transform length and p < 2^62 (the driver picks such primes), FLINT products otherwise or
   when not allowed.  Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpvol_modp_setup_products(wpvol_run_t *st, int allow_ntt)
{
    wpvol_ws_t *ws = st->ws;
    st->use_ntt = 0;
    if (!allow_ntt || st->G < 2 || st->mod.n >= (UWORD(1) << 62)
        || (st->mod.n - 1) % (ulong) ws->Tmax != 0)
        return WPVOL_OK;
    if (ws->F->n == 0)
    {
        int e = wpvol_ntt_init(ws->F, st->mod, ws->Tmax);
        if (e == -1)
            return WPVOL_NOMEM;
        if (e != 0)
            return WPVOL_OK;
    }
    else if (wpvol_ntt_set_prime(ws->F, st->mod) != 0)
        return WPVOL_OK;
    if (ws->buf == NULL)
    {
        ws->buf = wpvol_words_alloc(ws->Tmax);
        if (ws->buf == NULL)
            return WPVOL_NOMEM;
    }
    if (ws->part == NULL && ws->G >= WPVOL_GBLOCK_FROM)
    {
        ws->part = wpvol_words_alloc(WPVOL_GBLOCK * ws->npts);
        if (ws->part == NULL)
            return WPVOL_NOMEM;
    }
    ws->blk0 = 0;   /* the partial sums belong to the previous prime */
    st->use_ntt = 1;
    return WPVOL_OK;
}

/* Frees a workspace and everything it owns (NULL allowed). */
void wpvol_ws_free(wpvol_ws_t *ws)
{
    slong h;

    if (ws == NULL)
        return;
    for (h = 0; ws->B != NULL && h <= ws->G; h++)
        wpvol_biv_clear(&ws->B[h]);
    for (h = 0; ws->hat != NULL && h <= ws->G; h++)
        free(ws->hat[h]);
    free(ws->B);
    free(ws->hat);
    free(ws->abuf);
    free(ws->cbuf);
    free(ws->dbuf);
    free(ws->buf);
    free(ws->part);
    wpvol_ntt_clear(ws->F);
    free(ws);
}

/* Workspace for tables up to (G, N): the rows of every B[h] and the buffers of one genus;
   transform memory is added on first use.  Returns NULL if memory is exhausted. */
wpvol_ws_t *wpvol_ws_new(slong G, slong N)
{
    wpvol_ws_t *ws = calloc(1, sizeof(wpvol_ws_t));
    slong h, rows = 3 * G + 1;
    int ok;

    if (ws == NULL)
        return NULL;
    ws->G = G;
    ws->N = N;
    ws->L = wpvol_modp_len(G, N);
    ws->Tmax = G >= 2 ? wpvol_modp_ntt_len(G, ws->L) : 1;
    ws->npts = G >= 2 ? wpvol_modp_ntt_pts(G, ws->L) : 1;
    ws->B = calloc((size_t) (G + 1), sizeof(wpvol_biv_struct));
    ws->hat = calloc((size_t) (G + 1), sizeof(ulong *));
    ws->abuf = calloc((size_t) (rows * ws->L), sizeof(ulong));
    ws->cbuf = calloc((size_t) (rows * ws->L), sizeof(ulong));
    ws->dbuf = calloc((size_t) (rows * ws->L), sizeof(ulong));
    ok = ws->B != NULL && ws->hat != NULL && ws->abuf != NULL
         && ws->cbuf != NULL && ws->dbuf != NULL;
    for (h = 1; ok && h < G; h++)
        ok = wpvol_biv_init(&ws->B[h], 2 * h + 1, 3 * h - 1, ws->L, 1) == 0;
    if (!ok)
    {
        wpvol_ws_free(ws);
        return NULL;
    }
    return ws;
}

/* See wpvol_internal.h. */
slong wpvol_ws_genus(const wpvol_ws_t *ws)
{
    return ws->G;
}

slong wpvol_ws_points(const wpvol_ws_t *ws)
{
    return ws->N;
}

/* Per-prime run on a workspace (see wpvol_internal.h).  Returns WPVOL_OK, WPVOL_BADARG,
   WPVOL_NOMEM or WPVOL_INTERNAL (res zero on error). */
int wpvol_modp_run(wpvol_ws_t *ws, ulong *res, nmod_t mod, int allow_ntt)
{
    wpvol_run_t st;
    slong G, N, maxlen;
    int status;

    if (ws == NULL || res == NULL)
        return WPVOL_BADARG;
    G = ws->G;
    N = ws->N;
    maxlen = wpvol_modp_maxlen(G, N);
    if (mod.n <= (ulong) (maxlen + 5 * G + 30))
        return WPVOL_BADARG;
    memset(res, 0, (size_t) (G + 1) * (size_t) (N + 1) * sizeof(ulong));
    memset(&st, 0, sizeof(st));
    st.ws = ws;
    st.G = G;
    st.N = N;
    st.L = ws->L;
    st.mod = mod;
    st.res = res;
    nmod_poly_init_preinv(st.ux, mod.n, mod.ninv);
    status = wpvol_ctx_init(st.ctx, mod, maxlen, 5 * G + 30) == 0 ? WPVOL_OK : WPVOL_NOMEM;
    if (status == WPVOL_OK)
        status = wpvol_modp_setup(&st);
    if (status == WPVOL_OK)
        status = wpvol_modp_setup_products(&st, allow_ntt);
    if (status == WPVOL_OK && st.use_ntt && wpvol_ctx_attach_ntt(st.ctx, ws->F, st.L) != 0)
        status = WPVOL_NOMEM;
    if (status == WPVOL_OK)
    {
        wpvol_modp_genus0(&st);
        if (G >= 1)
            status = wpvol_modp_genera(&st);
    }
    free(st.fact);
    wpvol_ctx_clear(st.ctx);
    nmod_poly_clear(st.ux);
    if (status != WPVOL_OK)
        memset(res, 0, (size_t) (G + 1) * (size_t) (N + 1) * sizeof(ulong));
    return status;
}

/* One-shot form with a temporary workspace. */
int wpvol_modp_table_ex(ulong *res, slong G, slong N, nmod_t mod, int allow_ntt)
{
    wpvol_ws_t *ws;
    int status;

    if (G < 0 || N < 0 || res == NULL)
        return WPVOL_BADARG;
    ws = wpvol_ws_new(G, N);
    if (ws == NULL)
        return WPVOL_NOMEM;
    status = wpvol_modp_run(ws, res, mod, allow_ntt);
    wpvol_ws_free(ws);
    return status;
}

/* Default entry point: transforms whenever the prime allows them. */
int wpvol_modp_table(ulong *res, slong G, slong N, nmod_t mod)
{
    return wpvol_modp_table_ex(res, G, N, mod, 1);
}
