/* hodge_pair.c - psi classes times at most two lambda classes by one generating polynomial per
 * state (the third Hodge route; no code shared with hodge_fp.c or hodge_grr.c).
 *
 * With Lambda(x) = sum_j lambda_j x^j = exp(sum_{k odd} (k-1)! x^k ch_k) (hodge_lambda.c), the
 * product Lambda(x) Lambda(y) is exp(sum_k s_k ch_k) with s_k = (k-1)! (x^k + y^k).  For a state
 * (g, d) let P(g, d) = int_{Mbar_{g,n}} prod psi_i^{d_i} Lambda(x) Lambda(y), a homogeneous
 * polynomial of degree m = 3g-3+n-|d| whose coefficient of x^j y^{m-j} is int psi^d lambda_j
 * lambda_{m-j}.  The operator equation of C. Faber, R. Pandharipande, "Hodge integrals and
 * Gromov-Witten theory", Invent. Math. 139 (2000), section 2, reads for F(t, s)
 *     dF/ds_{2l-1} = c_l [ F_{t_{2l}} - sum_i t_i F_{t_{i+2l-1}}
 *                          + 1/2 sum_a (-1)^a (F_{t_a t_{2l-2-a}} + F_{t_a} F_{t_{2l-2-a}}) ],
 * c_l = B_{2l}/(2l)!, with F on the right at the same s.  Since s_k is homogeneous of degree k in
 * (x, y), the Euler operator x d/dx + y d/dy is sum_k k s_k d/ds_k, so
 *     m P(g, d) = sum_{l >= 1} (B_{2l}/(2l)) (x^{2l-1} + y^{2l-1}) T_l(g, d),
 *     T_l(g, d) = P(g, d + {2l}) - sum_i P(g, d + (2l-1) e_i)
 *                 + 1/2 sum_a (-1)^a P(g-1, d + {a, 2l-2-a})
 *                 + 1/2 sum_a (-1)^a sum_{g_1 + g_2 = g, I + J = points} P(g_1, {a} + d_I) P(g_2, {2l-2-a} + d_J),
 * a recursion on the degree m: the ch factors never appear, the products of the polynomials
 * distribute them.  Unstable states are 0, genus 0 carries only m = 0 (E = 0), m = 0 is the
 * Witten-Kontsevich number, and the string and dilaton equations (E is pulled back along the
 * forgetful map) remove psi exponents 0 and 1 before the memo.  E has rank g, so coefficients
 * with an exponent above g vanish and are dropped (unless H->pair_full, for tests).
 * A polynomial homogeneous of degree m is stored as the univariate fmpq_poly of x with y = 1
 * (coefficient j is that of x^j y^{m-j}); products and the factor x^k + y^k (X^k + 1) keep this
 * form.  The memo maps (g, n, sorted d) to an index into H->pair_vals.
 */
#include <stdlib.h>
#include <string.h>
#include <flint/arith.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_poly.h>
#include "hodge_internal.h"

#define HP_STACK 48         /* psi vectors up to this length live on the stack */

static int hp_value(fmpq_poly_t res, hodge_ctx *H, slong g, const slong *d, slong n);

void hodge_pair_clear(hodge_ctx *H)
{
    keymap_clear(&H->pair_memo);
    for (slong i = 0; i < H->pair_len; i++)
        fmpq_poly_clear(H->pair_vals + i);
    free(H->pair_vals);
    for (slong l = 0; l < H->pair_nbern; l++)
        fmpq_clear(H->pair_bern + l);
    free(H->pair_bern);
    H->pair_vals = NULL, H->pair_bern = NULL;
    H->pair_len = H->pair_cap = H->pair_nbern = 0;
    keymap_init(&H->pair_memo);
}

/* B_{2l}/(2l), cached; NULL if memory is exhausted.  1 <= l <= HODGE_MAX_INDEX. */
static const fmpq *hp_bern(hodge_ctx *H, slong l)
{
    if (l >= H->pair_nbern) {
        slong na = l + 8;
        fmpq *b = realloc(H->pair_bern, (size_t) na * sizeof(fmpq));
        if (b == NULL)
            return NULL;
        H->pair_bern = b;
        for (slong i = H->pair_nbern; i < na; i++) {
            fmpq_init(b + i);
            if (i > 0) {
                fmpz_t t;
                fmpz_init_set_si(t, 2 * i);
                arith_bernoulli_number(b + i, (ulong) (2 * i));
                fmpq_div_fmpz(b + i, b + i, t);
                fmpz_clear(t);
            }
        }
        H->pair_nbern = na;
    }
    return H->pair_bern + l;
}

/* Drops the coefficients of x^j y^{m-j} with j > g or m - j > g (rank g). */
static void hp_truncate(fmpq_poly_t p, const hodge_ctx *H, slong g, slong m)
{
    if (H->pair_full)
        return;
    fmpq_poly_truncate(p, g + 1);
    for (slong j = 0; j < m - g && j < fmpq_poly_length(p); j++)
        fmpq_poly_set_coeff_si(p, j, 0);
}

/* Whether (g, n points, psi degree s) has a nonzero P: stable, 0 <= m, genus 0 only with m = 0,
   and m <= 2g (rank).  Sets *m. */
static int hp_live(const hodge_ctx *H, slong g, slong n, slong s, slong *m)
{
    *m = 3 * g - 3 + n - s;
    if (g < 0 || 2 * g - 2 + n <= 0 || *m < 0 || (g == 0 && *m > 0))
        return 0;
    return H->pair_full || *m <= 2 * g;
}

/* acc += c * P(g, e) for the integer c. */
static int hp_add_si(fmpq_poly_t acc, hodge_ctx *H, slong c, slong g, const slong *e, slong n, fmpq_poly_t tmp)
{
    int st = hp_value(tmp, H, g, e, n);
    if (st == WK_OK && !fmpq_poly_is_zero(tmp)) {
        fmpq_poly_scalar_mul_si(tmp, tmp, c);
        fmpq_poly_add(acc, acc, tmp);
    }
    return st;
}

/* The string (d[n-1] = 0) or dilaton (d[n-1] = 1) equation on sorted d, Mbar_{g,n-1} stable. */
static int hp_string_dilaton(fmpq_poly_t res, hodge_ctx *H, slong g, slong *d, slong n)
{
    fmpq_poly_t t;
    int st = WK_OK;
    fmpq_poly_init(t);
    if (d[n - 1] == 1)
        st = hp_add_si(res, H, 2 * g - 3 + n, g, d, n - 1, t);
    for (slong j = 0; d[n - 1] == 0 && j < n - 1 && st == WK_OK; j++) {
        slong c = 1;
        if (d[j] == 0 || (j > 0 && d[j] == d[j - 1]))
            continue;
        while (j + c < n - 1 && d[j + c] == d[j])
            c++;
        d[j]--;
        st = hp_add_si(res, H, c, g, d, n - 1, t);
        d[j]++;
    }
    fmpq_poly_clear(t);
    return st;
}

/* The legs of a splitting: distinct values val[0..r-1] with counts cnt, the part x going to side 1;
   the polynomials of each side for the node exponents a (side 1) and b (side 2). */
typedef struct {
    slong r, val[HP_STACK], cnt[HP_STACK], x[HP_STACK];
    slong e1[HP_STACK + 1], e2[HP_STACK + 1];
    slong lmax;                     /* the brackets T_1..T_lmax of the state */
    fmpq_poly_struct *A, *B, *S;    /* A[a], B[b] for a, b < 2 lmax - 1; S[l] sums side products */
} hp_legs;

/* Compares the splitting (g1, x) with its mirror image (g2, cnt - x), which gives the same
   terms (a and b exchanged): -1, 0 (its own image) or 1. */
static int hp_mirror_cmp(const hp_legs *L, slong g1, slong g2)
{
    if (g1 != g2)
        return g1 < g2 ? -1 : 1;
    for (slong i = 0; i < L->r; i++)
        if (L->x[i] != L->cnt[i] - L->x[i])
            return L->x[i] < L->cnt[i] - L->x[i] ? -1 : 1;
    return 0;
}

/* The node exponents t for which a side of genus h with k legs of psi degree s plus the node
   is live (hp_live): lo..hi within 0..tmax; empty when lo > hi. */
static void hp_node_range(const hodge_ctx *H, slong h, slong k, slong s, slong tmax, slong *lo, slong *hi)
{
    slong top = 3 * h - 2 + k - s;          /* m of the side at t = 0 */
    *lo = 0, *hi = top < tmax ? top : tmax;
    if (2 * h - 1 + k <= 0)
        *hi = -1;                           /* unstable */
    else if (h == 0)
        *lo = top;                          /* genus 0: m = 0 only */
    else if (!H->pair_full && top - 2 * h > 0)
        *lo = top - 2 * h;                  /* m <= 2h (rank) */
    if (*lo < 0)
        *lo = 0;
}

/* prod binom(cnt_i, x_i) (at most 2^n, n < HP_STACK); e1, e2 filled with the legs of each side. */
static ulong hp_legs_fill(hp_legs *L, slong *n1, slong *n2)
{
    ulong w = 1;
    *n1 = *n2 = 0;
    for (slong i = 0; i < L->r; i++) {
        ulong b = 1;
        for (slong t = 0; t < L->x[i]; t++)
            b = b * (ulong) (L->cnt[i] - t) / (ulong) (t + 1);
        w *= b;
        for (slong c = 0; c < L->cnt[i]; c++)
            if (c < L->x[i])
                L->e1[(*n1)++] = L->val[i];
            else
                L->e2[(*n2)++] = L->val[i];
    }
    return w;
}

/* S[l] += w sum_{a + b = 2l-2} (-1)^a A[a] B[b] for the current splitting, the sides fetched once
   for all l: a in alo..ahi, b in blo..bhi. */
static int hp_split_one(hp_legs *L, hodge_ctx *H, slong g1, slong g2, slong n1, slong n2, slong alo, slong ahi,
                        slong blo, slong bhi, ulong w, fmpq_poly_t t)
{
    int st = WK_OK;
    for (slong a = alo; a <= ahi && st == WK_OK; a++) {
        L->e1[n1] = a;
        st = hp_value(L->A + a, H, g1, L->e1, n1 + 1);
    }
    for (slong b = blo; b <= bhi && st == WK_OK; b++) {
        L->e2[n2] = b;
        st = hp_value(L->B + b, H, g2, L->e2, n2 + 1);
    }
    for (slong a = alo; a <= ahi && st == WK_OK; a++) {
        if (fmpq_poly_is_zero(L->A + a))
            continue;
        for (slong b = blo + ((blo + a) % 2); b <= bhi && a + b <= 2 * L->lmax - 2; b += 2) {
            if (fmpq_poly_is_zero(L->B + b))
                continue;
            fmpq_poly_mul(t, L->A + a, L->B + b);
            fmpq_poly_scalar_mul_ui(t, t, w);
            (a % 2 ? fmpq_poly_sub : fmpq_poly_add)(L->S + (a + b) / 2 + 1, L->S + (a + b) / 2 + 1, t);
        }
    }
    return st;
}

/* L->S[l] = the separating boundary sums of T_l (without their factor 1/2), l = 1..L->lmax, for
   sorted d[0..n-1]; a splitting and its mirror image are summed once, doubled. */
static int hp_split(hp_legs *L, hodge_ctx *H, slong g, const slong *d, slong n)
{
    slong s = 0, tmax = 2 * L->lmax - 2;
    fmpq_poly_t t;
    int st = WK_OK;
    L->r = 0;
    for (slong i = 0; i < n; i++) {
        if (i == 0 || d[i] != d[i - 1])
            L->val[L->r] = d[i], L->cnt[L->r++] = 0;
        L->cnt[L->r - 1]++;
        s += d[i];
    }
    fmpq_poly_init(t);
    for (slong g1 = 0; 2 * g1 <= g && st == WK_OK; g1++) {
        memset(L->x, 0, (size_t) L->r * sizeof(slong));
        do {
            slong n1 = 0, s1 = 0, alo, ahi, blo, bhi;
            int side = hp_mirror_cmp(L, g1, g - g1);
            if (side > 0)
                continue;               /* its mirror image is summed instead, twice */
            for (slong i = 0; i < L->r; i++)
                n1 += L->x[i], s1 += L->x[i] * L->val[i];
            hp_node_range(H, g1, n1, s1, tmax, &alo, &ahi);
            hp_node_range(H, g - g1, n - n1, s - s1, tmax, &blo, &bhi);
            if (alo > ahi || blo > bhi || alo + blo > tmax)
                continue;
            slong k1, k2;
            ulong w = hp_legs_fill(L, &k1, &k2) << (side < 0);
            st = hp_split_one(L, H, g1, g - g1, k1, k2, alo, ahi, blo, bhi, w, t);
        } while (st == WK_OK && hodge_counter_next(L->x, L->cnt, L->r));
    }
    fmpq_poly_clear(t);
    return st;
}

/* T += T_l(g, d) of the file comment except the separating sums; d sorted, n + 2 <= HP_STACK.
   half receives the terms with a factor 1/2. */
static int hp_bracket(fmpq_poly_t T, fmpq_poly_t half, hodge_ctx *H, slong g, const slong *d, slong n, slong l)
{
    slong e[HP_STACK];
    fmpq_poly_t t;
    int st;
    fmpq_poly_init(t);
    memcpy(e, d, (size_t) n * sizeof(slong));
    e[n] = 2 * l;
    st = hp_add_si(T, H, 1, g, e, n + 1, t);
    for (slong i = 0; i < n && st == WK_OK; i++) {
        slong c = 1;
        if (i > 0 && d[i] == d[i - 1])
            continue;
        while (i + c < n && d[i + c] == d[i])
            c++;
        e[i] += 2 * l - 1;
        st = hp_add_si(T, H, -c, g, e, n, t);
        e[i] -= 2 * l - 1;
    }
    /* irreducible: a and 2l-2-a give the same state with the same sign */
    for (slong a = 0; a <= l - 1 && st == WK_OK; a++) {
        e[n] = a, e[n + 1] = 2 * l - 2 - a;
        st = hp_add_si(a == l - 1 ? half : T, H, a % 2 ? -1 : 1, g - 1, e, n + 2, t);
    }
    fmpq_poly_clear(t);
    return st;
}

/* Allocates the scratch of one state with brackets 1..lmax; NULL if memory is exhausted. */
static hp_legs *hp_legs_new(slong lmax)
{
    hp_legs *L = malloc(sizeof(hp_legs));
    fmpq_poly_struct *p = malloc((size_t) (6 * lmax + 2) * sizeof(fmpq_poly_struct));
    if (L == NULL || p == NULL) {
        free(L);
        free(p);
        return NULL;
    }
    for (slong i = 0; i < 6 * lmax + 2; i++)
        fmpq_poly_init(p + i);
    L->lmax = lmax, L->A = p, L->B = p + 2 * lmax, L->S = p + 4 * lmax;
    return L;
}

static void hp_legs_free(hp_legs *L)
{
    for (slong i = 0; i < 6 * L->lmax + 2; i++)
        fmpq_poly_clear(L->A + i);
    free(L->A);
    free(L);
}

/* res = P(g, d) of degree m >= 1 by the Euler recursion (file comment); d sorted, entries >= 2.
   The separating sums of all brackets come from one pass over the splittings. */
static int hp_euler(fmpq_poly_t res, hodge_ctx *H, slong g, const slong *d, slong n, slong m)
{
    slong lmax = (m + 1) / 2;
    hp_legs *L = hp_legs_new(lmax);
    fmpq_poly_t T, U;
    int st;
    if (L == NULL)
        return WK_LIMIT;
    fmpq_poly_init(T);
    fmpq_poly_init(U);
    fmpq_poly_zero(res);
    st = hp_split(L, H, g, d, n);
    for (slong l = 1; l <= lmax && st == WK_OK; l++) {
        const fmpq *b;
        fmpq_poly_zero(T);
        st = hp_bracket(T, L->S + l, H, g, d, n, l);
        fmpq_poly_scalar_div_si(U, L->S + l, 2);
        fmpq_poly_add(T, T, U);
        b = hp_bern(H, l);          /* after the bracket: the recursion may move the cache */
        if (b == NULL)
            st = WK_LIMIT;
        if (st != WK_OK || fmpq_poly_is_zero(T))
            continue;
        fmpq_poly_shift_left(U, T, 2 * l - 1);
        fmpq_poly_add(U, U, T);
        fmpq_poly_scalar_mul_fmpq(U, U, b);
        fmpq_poly_add(res, res, U);
    }
    fmpq_poly_scalar_div_si(res, res, m);
    hp_truncate(res, H, g, m);
    fmpq_poly_clear(T);
    fmpq_poly_clear(U);
    hp_legs_free(L);
    return st;
}

/* Stores res under key; WK_LIMIT if memory is exhausted. */
static int hp_store(hodge_ctx *H, const slong *key, slong klen, const fmpq_poly_t res)
{
    fmpq_t idx;
    if (H->pair_len == H->pair_cap) {
        slong nc = H->pair_cap < 64 ? 64 : 2 * H->pair_cap;
        fmpq_poly_struct *v = realloc(H->pair_vals, (size_t) nc * sizeof(fmpq_poly_struct));
        if (v == NULL)
            return WK_LIMIT;
        H->pair_vals = v, H->pair_cap = nc;
    }
    fmpq_poly_init(H->pair_vals + H->pair_len);
    fmpq_poly_set(H->pair_vals + H->pair_len, res);
    fmpq_init(idx);
    fmpq_set_si(idx, H->pair_len++, 1);
    keymap_set(&H->pair_memo, key, klen, idx);
    fmpq_clear(idx);
    return WK_OK;
}

/* Memoised P of a state with sorted d and m >= 1: the string or dilaton equation when an exponent
   is 0 or 1 (those states are met again and again), else the recursion. */
static int hp_memo(fmpq_poly_t res, hodge_ctx *H, slong g, slong *d, slong n, slong m)
{
    slong key[HP_STACK + 2];
    const fmpq *hit;
    int st;
    key[0] = g, key[1] = n;
    memcpy(key + 2, d, (size_t) n * sizeof(slong));
    hit = keymap_get(&H->pair_memo, key, n + 2);
    if (hit != NULL) {
        fmpq_poly_set(res, H->pair_vals + fmpz_get_si(fmpq_numref(hit)));
        return WK_OK;
    }
    if (H->cancel != NULL && *H->cancel)
        return WK_CANCELLED;
    if (H->limit > 0 && H->pair_memo.len > H->limit)
        return WK_LIMIT;
    if (n > 0 && d[n - 1] <= 1 && 2 * g - 3 + n > 0)
        st = hp_string_dilaton(res, H, g, d, n);
    else
        st = hp_euler(res, H, g, d, n, m);
    if (st == WK_OK && H->limit > 0 && H->pair_memo.len >= H->limit)
        st = WK_LIMIT;                  /* states finished during the recursion count too */
    if (st == WK_OK)
        st = hp_store(H, key, n + 2, res);
    return st;
}

/* res = P(g, d): zero where hp_live says so, the correlator for m = 0, else string, dilaton or
   the memoised recursion. */
static int hp_value(fmpq_poly_t res, hodge_ctx *H, slong g, const slong *din, slong n)
{
    slong s = 0, m, d[HP_STACK];
    int st;
    fmpq_poly_zero(res);
    for (slong i = 0; i < n; i++)
        s += din[i];
    if (!hp_live(H, g, n, s, &m))
        return WK_OK;
    if (n + 2 > HP_STACK)
        return WK_LIMIT;
    if (m == 0) {
        fmpq_t c;
        fmpq_init(c);
        st = wk_table_correlator(c, H->T, g, din, n);
        fmpq_poly_set_fmpq(res, c);
        fmpq_clear(c);
        return st;
    }
    memcpy(d, din, (size_t) n * sizeof(slong));
    hodge_sort_desc(d, n);
    st = hp_memo(res, H, g, d, n, m);
    if (st != WK_OK)
        fmpq_poly_zero(res);
    return st;
}

/* The argument checks of hodge_pair_poly: WK_OK, WK_BADARG or WK_UNSTABLE. */
static int hodge_pair_poly_check(const hodge_ctx *H, slong g, const slong *d, slong n)
{
    if (H == NULL || g < 0 || n < 0 || g > HODGE_MAX_INDEX || (n > 0 && d == NULL))
        return WK_BADARG;
    for (slong i = 0; i < n; i++)
        if (d[i] < 0 || d[i] > HODGE_MAX_INDEX)
            return WK_BADARG;
    return 2 * g - 2 + n <= 0 ? WK_UNSTABLE : WK_OK;
}

int hodge_pair_poly(fmpq_poly_t res, hodge_ctx *H, slong g, const slong *d, slong n)
{
    int st = hodge_pair_poly_check(H, g, d, n);
    fmpq_poly_zero(res);
    if (st != WK_OK)
        return st;
    if (n + 2 > HP_STACK)
        return WK_LIMIT;
    return hp_value(res, H, g, d, n);
}

int hodge_pair_integral(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n, slong j, slong k)
{
    fmpq_poly_t p;
    slong s = j + k;
    int st;
    fmpq_zero(res);
    if (j < 0 || k < 0 || j > HODGE_MAX_INDEX || k > HODGE_MAX_INDEX)
        return WK_BADARG;
    for (slong i = 0; d != NULL && i < n; i++)
        s += d[i];
    if (H != NULL && !H->pair_full && g >= 0 && (j > g || k > g || (j == g && k == g)))
        return hodge_pair_poly_check(H, g, d, n);   /* 0: above the rank, or lambda_g^2 (Mumford) */
    fmpq_poly_init(p);
    st = hodge_pair_poly(p, H, g, d, n);
    if (st == WK_OK && s == 3 * g - 3 + n)
        fmpq_poly_get_coeff_fmpq(res, p, j);
    fmpq_poly_clear(p);
    return st;
}
