/* wpoly_modp.c - the coefficients W_a of V_{g,n}(L) (wpoly.h) modulo one word-size prime.
 *
 * Method (docs/volumes-engine.md, "Volume polynomials with few points").  W_a is
 * d_{a_1}...d_{a_n} F_g at the Weil-Petersson point, i.e. the coefficient of s_1...s_n of F_g
 * with t_{a_i} shifted by s_i, over the ring J = Z_p[s_1..s_n]/(s_i^2) (an element of J is
 * the array of its 2^n components, indexed by subsets as bit masks; the product is the subset
 * convolution).  The multi-index is sorted decreasingly, so the q points with a_i >= 2 are
 * the first q: only they change I_2, by E_i = s_i u^{e_i}/e_i!, e_i = a_i - 2, and the KdV
 * recursion of the volume engine (valid for any I_2 with I_2(0) invertible) runs over
 * J[[u]] with components indexed by the subsets of these q points.  Over J,
 *     (d_0 X)[S] = d_0 X[S] - v^{-1} sum_{i in S} E_i d/dv X[S \ i]
 * (the cross term sends row c_m v^{-m} of X[S\i] to m u^{e_i}/e_i! c_m v^{-m-2}), products
 * are subset convolutions of biv products, and F_g = sum_m f_m v^{-m} follows top-down from
 * d_0 F_g as in wpvol_modp.c with 1/I_2 over J.  The component S = {} is the plain recursion:
 * it is computed once per prime and shared by all multi-indices.  A component only depends on
 * the exponents of its own points, so it is kept and reused while they do not change (the
 * order of wpoly_indices varies the last point fastest), and with n >= 2 the one-point
 * components are kept for every exponent (per prime).
 * Finally u solves the string equation u = I_0(u) in J (nilpotent, n+1 iterations),
 * v = 1 - I_1(u), and F_g(u, v) needs each f_m to order n in u.
 *
 * Products: with a prime p = c 2^k + 1 (the driver's default) every d_0^2 F_h component is
 * transformed once (the component {} once per prime, for all multi-indices) and each genus
 * and component needs one pointwise multiply-accumulate and one inverse transform, as in
 * wpvol_modp.c; other primes use FLINT's Kronecker products (same results).
 *
 * Truncation: the perturbations are series in u, so the set {d + o <= S} of wpvol_modp.c is
 * still closed; the top-down step loses one order per row, so order n of the lowest row
 * f_{2g-1} needs S = 3g + n - 4 (rows of L = S + 1 terms, triangular).  The unused equation
 * c_{2g} = f_{2g-1}' is then checked at all its n orders for every component.
 */
#include <stdlib.h>
#include <string.h>

#include "wpvol.h"
#include "wpoly.h"
#include "wpvol_internal.h"
#include "wpoly_internal.h"

/* d_0^{sel+1} F_h, component S, of the current multi-index. */
static wpvol_biv_struct *wpoly_at(const wpoly_ws_t *ws, int sel, slong h, slong S)
{
    return &ws->cur[S]->X[sel][h];
}

/* Y += the cross term of point i on X: row c_m of X adds m u^{e_i}/e_i! c_m to row m+2 of Y
   (Y = d_0 X in shape; a triangular row keeps its own length). */
static void wpoly_cross(wpvol_biv_t Y, const wpvol_biv_t X, slong e, const wpoly_ws_t *ws)
{
    slong r;

    for (r = 0; r < X->rows; r++)
    {
        slong l = wpvol_biv_rowlen(X, r);
        ulong s = nmod_mul((ulong) (X->mlo + r) % ws->mod.n, ws->ifact[e], ws->mod);
        if (l > e)
            _nmod_vec_scalar_addmul_nmod(Y->c + (r + 1) * Y->len + e, X->c + r * X->len,
                                         l - e, s, ws->mod);
    }
}

/* Y = (d_0 X)[S] over J from the components X[T], T subset of S, X = d_0^{sel+1} F_h. */
static void wpoly_d0(wpvol_biv_t Y, int sel, slong h, slong S, const wpoly_ws_t *ws)
{
    slong i;

    wpvol_biv_d0(Y, wpoly_at(ws, sel, h, S), ws->ctx);
    for (i = 0; i < ws->q; i++)
        if (S & (WORD(1) << i))
            wpoly_cross(Y, wpoly_at(ws, sel, h, S ^ (WORD(1) << i)), ws->e[i], ws);
}

/* R += 1/2 sum_{h=1}^{G-1} sum_{T subset S} B_h[T] B_{G-h}[S\T]: each product once per pair
   {(h,T), (G-h,S\T)}; the two coincide only for S = {}, h = G/2 (the halved square).
   Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpoly_products(wpvol_biv_t R, slong G, slong S, wpoly_ws_t *ws)
{
    slong h, T;
    int ok = 1;

    for (h = 1; ok && 2 * h <= G; h++)
    {
        T = S;
        do
        {
            const wpvol_biv_struct *x = wpoly_at(ws, WPOLY_B, h, T);
            const wpvol_biv_struct *y = wpoly_at(ws, WPOLY_B, G - h, S ^ T);
            if (2 * h < G)
                ok = wpvol_biv_addmul(R, x, y, ws->L, 1, ws->mod) == 0;
            else if (S == 0)
                ok = wpvol_biv_addmul(R, x, x, ws->L, ws->ctx->inv[2], ws->mod) == 0;
            else if (T < (S ^ T))
                ok = wpvol_biv_addmul(R, x, y, ws->L, 1, ws->mod) == 0;
            T = (T - 1) & S;
        } while (ok && T != S);
    }
    return ok ? WPVOL_OK : WPVOL_NOMEM;
}

/* Transform length for the products of genus G (rows 3h-1 and 3(G-h)-1 in slots 2L-1). */
static slong wpoly_ntt_len(slong G, slong L)
{
    slong need = (3 * G - 2) * (2 * L - 1), T = 1;

    while (T < need)
        T *= 2;
    return T;
}

/* hat[h][S] = length-Tmax transform of the Kronecker image of B[h][S]; its first T_G entries
   are the transform of length T_G (the image fills less than T_G).  WPVOL_OK or WPVOL_NOMEM. */
static int wpoly_hat(wpoly_ws_t *ws, slong h, slong S)
{
    const wpvol_biv_struct *b = wpoly_at(ws, WPOLY_B, h, S);
    slong r, slot = 2 * ws->L - 1, T = ws->Tmax;
    ulong **x = ws->cur[S]->hat + h;

    if (*x == NULL && (*x = wpvol_words_alloc(T)) == NULL)
        return WPVOL_NOMEM;
    memset(*x, 0, (size_t) T * sizeof(ulong));
    for (r = 0; r < b->rows; r++)
        memcpy(*x + r * slot, b->c + r * b->len, (size_t) wpvol_biv_rowlen(b, r) * sizeof(ulong));
    wpvol_ntt_fwd(*x, T, ws->F);
    return WPVOL_OK;
}

/* The sum of wpoly_products times 2 T_G by cached transforms: the same pairs, one pointwise
   sum (wpvol_ntt_dot2 doubles it; the halved square of S = {} enters undoubled) and one
   inverse transform; product row i is row i+1 of R. */
static void wpoly_products_ntt(wpvol_biv_t R, slong G, slong S, wpoly_ws_t *ws)
{
    slong h, T, r, np = 0, TG = wpoly_ntt_len(G, ws->L), slot = 2 * ws->L - 1;
    const ulong *sq = NULL;

    for (h = 1; 2 * h <= G; h++)
    {
        T = S;
        do
        {
            if (2 * h < G || (S != 0 && T < (S ^ T)))
            {
                ws->pa[np] = ws->cur[T]->hat[h];
                ws->pb[np++] = ws->cur[S ^ T]->hat[G - h];
            }
            else if (S == 0)
                sq = ws->cur[0]->hat[h];
            T = (T - 1) & S;
        } while (T != S);
    }
    wpvol_ntt_dot2(ws->buf, ws->pa, ws->pb, np, sq, TG, ws->mod);
    wpvol_ntt_inv(ws->buf, TG, ws->F);
    for (r = 0; r + 1 < R->rows; r++)
        _nmod_vec_add(R->c + (r + 1) * R->len, R->c + (r + 1) * R->len, ws->buf + r * slot,
                      wpvol_biv_rowlen(R, r + 1), ws->mod);
}

/* A[G][S] = (d_0 F_G)[S] from the lower genera: C = d_0 B_{G-1}, D = d_0 C, the bracket
   R = D/12 + products, then c_m = r_{m+1}/m.  Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpoly_step(wpoly_ws_t *ws, slong G, slong S)
{
    wpvol_biv_struct *A = wpoly_at(ws, WPOLY_A, G, S), *D = &ws->Dv;
    slong r, L = ws->L;
    ulong k = 1, kinv = 1;
    int st = WPVOL_OK;

    if (ws->use_ntt)   /* the transforms deliver 2 T_G times the products: scale D alike */
    {
        k = nmod_mul(2, (ulong) wpoly_ntt_len(G, L) % ws->mod.n, ws->mod);
        kinv = nmod_inv(k, ws->mod);
    }
    wpoly_d0(wpoly_at(ws, WPOLY_C, G - 1, S), WPOLY_B, G - 1, S, ws);
    D->mlo = 2 * G + 1;
    D->rows = 3 * G - 2;
    wpoly_d0(D, WPOLY_C, G - 1, S, ws);
    A->mlo = 2 * G + 1;
    _nmod_vec_scalar_mul_nmod(A->c, D->c, A->rows * L, nmod_mul(ws->ctx->inv[12], k, ws->mod),
                              ws->mod);
    if (ws->use_ntt)
        wpoly_products_ntt(A, G, S, ws);
    else
        st = wpoly_products(A, G, S, ws);
    A->mlo = 2 * G;
    for (r = 0; r < A->rows; r++)
        _nmod_vec_scalar_mul_nmod(A->c + r * L, A->c + r * L, wpvol_biv_rowlen(A, r),
                                  nmod_mul(ws->ctx->inv[2 * G + r], kinv, ws->mod), ws->mod);
    return st;
}

/* The genus recursion for the components list[0..len) (increasing; the other subsets are
   available): A_1 = I_2/24 v^{-2} over J (E_i/24 in component {i}), then A_h and B_h up to
   genus g.  Returns WPVOL_OK, WPVOL_NOMEM or WPVOL_CANCELLED. */
static int wpoly_genera(wpoly_ws_t *ws, const slong *list, slong len)
{
    slong h, k, i;
    int st = WPVOL_OK;

    for (k = 0; k < len; k++)
    {
        slong S = list[k];
        wpvol_biv_struct *A = wpoly_at(ws, WPOLY_A, 1, S);
        memset(A->c, 0, (size_t) ws->L * sizeof(ulong));
        if (S == 0)
            _nmod_vec_scalar_mul_nmod(A->c, ws->ctx->i2, ws->L, ws->ctx->inv[24], ws->mod);
        for (i = 0; i < ws->q; i++)
            if (S == (WORD(1) << i) && ws->e[i] < ws->L)
                A->c[ws->e[i]] = nmod_mul(ws->ifact[ws->e[i]], ws->ctx->inv[24], ws->mod);
    }
    for (h = 1; h <= ws->g && st == WPVOL_OK; h++)
    {
        if (wpvol_cancelled())
            return WPVOL_CANCELLED;
        for (k = 0; k < len && st == WPVOL_OK && h >= 2; k++)   /* many subsets: poll per step */
            st = wpvol_cancelled() ? WPVOL_CANCELLED : wpoly_step(ws, h, list[k]);
        for (k = 0; k < len && h < ws->g && st == WPVOL_OK; k++)
        {
            wpoly_d0(wpoly_at(ws, WPOLY_B, h, list[k]), WPOLY_A, h, list[k], ws);
            if (ws->use_ntt)
                st = wpoly_hat(ws, h, list[k]);
        }
    }
    return st;
}

/* F_g[S] = sum_m f_m[S] v^{-m} from c_j = f_{j-1}' + (j-2) (I_2 f_{j-2})[S], top power down:
   f_{j-2}[S] = (1/I_2)((c_j - f_{j-1}')/(j-2) - sum_{i in S} E_i f_{j-2}[S\i]).  Then the
   unused equation c_{2g} = f_{2g-1}' is checked at its n orders.
   Returns WPVOL_OK or WPVOL_INTERNAL. */
static int wpoly_topdown(wpoly_ws_t *ws, slong S)
{
    slong g = ws->g, L = ws->L, W = L + 1, flo = 2 * g - 1, top = 5 * g - 3, j, k, i;
    const wpvol_biv_struct *A = wpoly_at(ws, WPOLY_A, g, S);
    ulong *f = ws->cur[S]->f, *tmp = ws->tmp;
    const ulong *c;
    nmod_t mod = ws->mod;

    memset(f, 0, (size_t) ws->fsz * sizeof(ulong));
    for (j = top; j >= 2 * g + 1; j--)
    {
        slong l = L - (top - j);
        const ulong *fu = f + (j - 1 - flo) * W;
        c = wpvol_biv_row(A, j);
        for (k = 0; k < l; k++)
            tmp[k] = nmod_mul(nmod_sub(c[k], nmod_mul((ulong) (k + 1), fu[k + 1], mod), mod),
                              ws->ctx->inv[j - 2], mod);
        for (i = 0; i < ws->q; i++)
            if ((S & (WORD(1) << i)) && ws->e[i] < l)
                _nmod_vec_scalar_addmul_nmod(tmp + ws->e[i],
                                             ws->cur[S ^ (WORD(1) << i)]->f
                                                 + (j - 2 - flo) * W,
                                             l - ws->e[i], nmod_neg(ws->ifact[ws->e[i]], mod),
                                             mod);
        _nmod_poly_mullow(f + (j - 2 - flo) * W, tmp, l, ws->ctx->i2inv, l, l, mod);
    }
    c = wpvol_biv_row(A, 2 * g);
    for (k = 0; k < L - (top - 2 * g); k++)
        if (c[k] != nmod_mul((ulong) (k + 1), f[k + 1], mod))
            return WPVOL_INTERNAL;
    return WPVOL_OK;
}

/* Transform products when p - 1 is divisible by Tmax and p < 2^62 (tables made on first use,
   refilled for later primes), FLINT products otherwise.  Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpoly_setup_products(wpoly_ws_t *ws)
{
    ws->use_ntt = 0;
    if (ws->mod.n >= (UWORD(1) << 62) || (ws->mod.n - 1) % (ulong) ws->Tmax != 0)
        return WPVOL_OK;
    if (ws->F->n == 0)
    {
        int e = wpvol_ntt_init(ws->F, ws->mod, ws->Tmax);
        if (e == -1)
            return WPVOL_NOMEM;
        if (e != 0)
            return WPVOL_OK;
    }
    else if (wpvol_ntt_set_prime(ws->F, ws->mod) != 0)
        return WPVOL_OK;
    ws->use_ntt = 1;
    return WPVOL_OK;
}

/* Per-prime factorials up to the largest index used (exponents, scale (D-|a|)!), the
   series of ctx and the product method.  Returns WPVOL_OK or WPVOL_NOMEM. */
static int wpoly_prime_setup(wpoly_ws_t *ws, nmod_t mod)
{
    slong k;

    ws->mod = mod;
    if (wpoly_setup_products(ws) != WPVOL_OK)
        return WPVOL_NOMEM;
    if (wpvol_ctx_init(ws->ctx, mod, ws->L, 5 * ws->g + 30) != 0)
        return WPVOL_NOMEM;
    ws->fact[0] = 1;
    for (k = 1; k < ws->nfact; k++)
        ws->fact[k] = nmod_mul(ws->fact[k - 1], (ulong) k, mod);
    ws->ifact[ws->nfact - 1] = nmod_inv(ws->fact[ws->nfact - 1], mod);
    for (k = ws->nfact - 1; k > 0; k--)
        ws->ifact[k - 1] = nmod_mul(ws->ifact[k], (ulong) k, mod);
    return WPVOL_OK;
}

/* Allocates the arrays of a component block on first use.  Returns 1 on success (a failed
   block stays partly allocated and is released by wpoly_ws_free). */
static int wpoly_comp_alloc(wpoly_ws_t *ws, wpoly_comp_t *c)
{
    slong h, g = ws->g;
    int ok, sel;

    if (c->f != NULL)
        return 1;
    for (sel = 0; sel < 3; sel++)
        if (c->X[sel] == NULL && (c->X[sel] = calloc((size_t) (g + 1), sizeof(wpvol_biv_struct))) == NULL)
            return 0;
    if (c->hat == NULL && (c->hat = calloc((size_t) (g + 1), sizeof(ulong *))) == NULL)
        return 0;
    ok = 1;
    for (h = 1; ok && h <= g; h++)
    {
        ok = c->X[WPOLY_A][h].c != NULL
             || wpvol_biv_init(&c->X[WPOLY_A][h], 2 * h, 3 * h - 2, ws->L, 1) == 0;
        if (ok && h < g)
            ok = (c->X[WPOLY_B][h].c != NULL
                  || wpvol_biv_init(&c->X[WPOLY_B][h], 2 * h + 1, 3 * h - 1, ws->L, 1) == 0)
                 && (c->X[WPOLY_C][h].c != NULL
                     || wpvol_biv_init(&c->X[WPOLY_C][h], 2 * h + 2, 3 * h, ws->L, 1) == 0);
    }
    if (ok)
        c->f = calloc((size_t) ws->fsz, sizeof(ulong));
    return ok && c->f != NULL;
}

/* Points cur[S] at the block of every component of the current index and lists (increasing)
   the components whose block is stale: one-point components (n >= 2) by exponent, the others
   by mask, reused while their exponents are unchanged.  Returns the list length, or -1 if a
   block cannot be allocated. */
static slong wpoly_plan(wpoly_ws_t *ws, slong *list)
{
    slong S, i, len = 0;

    for (S = 1; S < (WORD(1) << ws->q); S++)
    {
        wpoly_comp_t *c;
        int fresh = 1;
        if (ws->n >= 2 && (S & (S - 1)) == 0)
        {
            for (i = 0; (S >> i) != 1; i++)
                ;
            c = &ws->comp[ws->nm + ws->e[i]];
        }
        else
        {
            c = &ws->comp[S];
            for (i = 0; i < ws->q; i++)
                if ((S & (WORD(1) << i)) && c->sig[i] != ws->e[i])
                    fresh = 0;
        }
        if (!wpoly_comp_alloc(ws, c))
            return -1;
        ws->cur[S] = c;
        if (c->epoch == ws->epoch && fresh)
            continue;
        c->epoch = 0;   /* stale until computed */
        for (i = 0; i < ws->q; i++)
            c->sig[i] = (S & (WORD(1) << i)) ? ws->e[i] : -1;
        list[len++] = S;
    }
    return len;
}

/* Recomputes the stale components of the current index (recursion, then top-down) and marks
   them valid for this prime.  Returns a status code. */
static int wpoly_update(wpoly_ws_t *ws)
{
    slong list[1 << WPOLY_MAX_POINTS] = { 0 }, len = wpoly_plan(ws, list), k;
    int st;

    if (len < 0)
        return WPVOL_NOMEM;
    st = wpoly_genera(ws, list, len);
    for (k = 0; k < len && st == WPVOL_OK; k++)
        st = wpoly_topdown(ws, list[k]);
    for (k = 0; k < len && st == WPVOL_OK; k++)
        ws->cur[list[k]]->epoch = ws->epoch;
    return st;
}

/* See wpvol_internal.h. */
int wpoly_modp_run(wpoly_ws_t *ws, ulong *res, nmod_t mod)
{
    slong k, D, i, zero = 0;
    int st;

    if (ws == NULL)
        return WPVOL_NOMEM;
    D = 3 * ws->g - 3 + ws->n;
    if (mod.n <= (ulong) (ws->nfact + ws->L + 5 * ws->g + 30))
        return WPVOL_BADARG;
    ws->epoch++;
    st = wpoly_prime_setup(ws, mod);
    ws->q = 0;
    ws->cur[0] = &ws->comp[0];
    if (st == WPVOL_OK && !wpoly_comp_alloc(ws, ws->cur[0]))
        st = WPVOL_NOMEM;
    if (st == WPVOL_OK)
        st = wpoly_genera(ws, &zero, 1);
    if (st == WPVOL_OK)
        st = wpoly_topdown(ws, 0);
    if (st == WPVOL_OK && ws->adjoint && ws->n == 1 && ws->use_ntt)
    {
        st = wpoly_adj_run(ws, res);
        k = ws->nidx;   /* all indices done */
    }
    else
        k = 0;
    for (; k < ws->nidx && st == WPVOL_OK; k++)
    {
        const slong *a = ws->idx + k * ws->n;
        slong s = 0;
        wpoly_set_index(ws, a);
        st = wpoly_update(ws);
        for (i = 0; i < ws->n; i++)
            s += a[i];
        if (st == WPVOL_OK)
            res[k] = nmod_mul(wpoly_readout(ws, a), ws->fact[D - s], mod);
    }
    wpvol_ctx_clear(ws->ctx);
    if (st != WPVOL_OK)
        memset(res, 0, (size_t) ws->nidx * sizeof(ulong));
    return st;
}

/* Releases a component block (safe on a partly allocated one). */
static void wpoly_comp_clear(wpoly_comp_t *c, slong g)
{
    slong h;
    int sel;

    for (sel = 0; sel < 3; sel++)
        for (h = 0; c->X[sel] != NULL && h <= g; h++)
            wpvol_biv_clear(&c->X[sel][h]);
    for (h = 0; c->hat != NULL && h <= g; h++)
        free(c->hat[h]);
    for (sel = 0; sel < 3; sel++)
        free(c->X[sel]);
    free(c->hat);
    free(c->f);
}

/* See wpvol_internal.h. */
void wpoly_ws_free(wpoly_ws_t *ws)
{
    slong k;

    if (ws == NULL)
        return;
    wpoly_adj_free(ws);
    for (k = 0; ws->comp != NULL && k < ws->ncomp; k++)
        wpoly_comp_clear(&ws->comp[k], ws->g);
    free(ws->comp);
    free(ws->buf);
    free(ws->pa);
    wpvol_ntt_clear(ws->F);
    wpvol_biv_clear(&ws->Dv);
    free(ws->tmp);
    free(ws->fact);
    free(ws);
}

/* See wpvol_internal.h. */
void wpoly_ws_set_adjoint(wpoly_ws_t *ws, int on)
{
    if (ws != NULL)
        ws->adjoint = on != 0;
}

/* See wpvol_internal.h.  Component blocks are allocated on first use. */
wpoly_ws_t *wpoly_ws_new(slong g, slong n, slong extra, const slong *idx, slong nidx)
{
    wpoly_ws_t *ws = calloc(1, sizeof(wpoly_ws_t));
    slong nb;
    int ok;

    if (ws == NULL)
        return NULL;
    ws->g = g;
    ws->n = n;
    ws->nm = WORD(1) << n;
    ws->L = 3 * g + n - 3 + extra;
    ws->idx = idx;
    ws->nidx = nidx;
    ws->fsz = (3 * g - 2) * (ws->L + 1);
    ws->nfact = 3 * g + n + 2;
    ws->ncomp = ws->nm + (n >= 2 ? 3 * g + n - 4 : 0);
    nb = (g + 1) * ws->nm;
    ws->comp = calloc((size_t) ws->ncomp, sizeof(wpoly_comp_t));
    ws->tmp = calloc((size_t) ws->L, sizeof(ulong));
    ws->Tmax = wpoly_ntt_len(g, ws->L);
    ws->buf = wpvol_words_alloc(ws->Tmax);
    ws->pa = malloc((size_t) (2 * nb) * sizeof(ulong *));
    ws->fact = malloc((size_t) (2 * ws->nfact) * sizeof(ulong));
    ok = ws->comp != NULL && ws->tmp != NULL && ws->fact != NULL && ws->buf != NULL
         && ws->pa != NULL && wpvol_biv_init(&ws->Dv, 0, 3 * g - 2, ws->L, 1) == 0;
    if (!ok)
    {
        wpoly_ws_free(ws);
        return NULL;
    }
    ws->ifact = ws->fact + ws->nfact;
    ws->pb = ws->pa + nb;
    return ws;
}
