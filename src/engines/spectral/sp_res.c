/* sp_res.c - omega_{g,n} of a spectral curve by the topological recursion itself (spectral.h),
 * independent of the correlator and volume engines.
 *
 * Kernel (B. Eynard, N. Orantin, "Invariants of algebraic curves and topological expansion", 2007):
 *     omega_{g,n+1}(z_0, J) = Res_{z=0} K(z_0, z) [ omega_{g-1,n+2}(z, -z, J)
 *                              + sum' omega_{g_1}(z, I) omega_{g_2}(-z, J \ I) ],
 *     K(z_0, z) = (1/2) int_{-z}^{z} B(z_0, .) / ((y(z) - y(-z)) dx(z)) = dz_0 / (2 (z_0^2 - z^2) y_odd(z) dz),
 * sum' over g_1 + g_2 = g and I in J, without omega_{0,1}.  Write omega_{g,n} = sum W[d] prod dz_i /
 * z_i^{2d_i+2} and 1/y_odd(z) = z^{-1} sum_k r_k z^{2k}.  Every term of the bracket is -T(z) dz^2 with
 * T(z) = sum_p T[p] z^{-2p} a Laurent polynomial in z^2 (omega(-z) = -omega(z) as a form, since W
 * has even powers), and the residue picks
 *     W_{g,n+1}[d_0, J] = -(1/2) sum_k r_k T[k + d_0],
 *     T[p] = sum_{a+b=p-2} W_{g-1,n+2}[a, b, J]                           (first term; 1/4 at p = 1
 *                                                                          for B(z,-z) when g=1, J empty)
 *          + sum' sum_{a+b=p-2} W_{g_1}[a, I] W_{g_2}[b, J \ I]             (stable factors)
 *          + sum_{i in J} 2 (2 d_i + 1) W_{g,|J|}[p + d_i - 1, J \ i]        (the two factors B(+-z, z_i):
 *                                                                          1/(z_i-z)^2 + 1/(z_i+z)^2),
 * and the base omega_{0,3} = -r_0 prod dz_i / z_i^2 (the same residue with two factors B).
 * A Bessel-type curve, y_odd = z^{-1} sum_k y_k z^{2k}, has 1/y_odd = z sum_k (1/y)_k z^{2k}: the
 * same formulas with r_0 = 0 and r_{k+1} = (1/y)_k, so omega_{0,3} and with it all of genus 0 vanish.
 * Each kernel then raises the degree in the 1/z_i^2 by one less, and by induction over 2g-2+n
 * W_{g,n}[d] = 0 for |d| > g-1: the recursion takes the lower omega as zero there, and the rows
 * of the requested omega_{g,n} beyond g-1 are still computed, which checks the induction step.
 * Values are memoised on (g, sorted d) in an open-addressing hash table.
 */
#include <stdatomic.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>
#include "hash.h"
#include "spectral.h"

typedef struct {
    const fmpq_mpoly_ctx_struct *ctx;
    fmpq_mpoly_struct *r;      /* r[k], k = 0..rlen-1: 1/y_odd = z^{-1} sum r_k z^{2k} */
    slong rlen;
    int bessel;                /* SP_CURVE_BESSEL: r[0] = 0 */
    slong top_chi;             /* 2g-2+n of the requested omega_{g,n} */
    fmpq_t y0inv;
    slong nslots, len;
    slong **keys;              /* keys[s] = {length, g, d sorted}, NULL when free */
    fmpq_mpoly_struct **vals;
    double max_entries;
    atomic_int *cancel;
    fmpq_mpoly_t zero;
} sp_res;

static int res_get(sp_res *S, slong g, const slong *d, slong n, const fmpq_mpoly_struct **v);

/* Hash of a key (length, g, d...). */
static ulong res_hash(const slong *key)
{
    return hash_slongs(key, key[0] + 1);
}

/* Slot of key: where it is stored, or the free slot where it would go. */
static slong res_slot(const sp_res *S, const slong *key)
{
    slong s = (slong) (res_hash(key) % (ulong) S->nslots);
    while (S->keys[s] != NULL && (S->keys[s][0] != key[0]
           || memcmp(S->keys[s], key, (size_t) (key[0] + 1) * sizeof(slong)) != 0))
        s = (s + 1) % S->nslots;
    return s;
}

/* Doubles the table when it is half full.  Returns 0 when memory runs out. */
static int res_grow(sp_res *S)
{
    slong i, old = S->nslots, s;
    slong **ok = S->keys;
    fmpq_mpoly_struct **ov = S->vals;
    if (2 * (S->len + 1) <= S->nslots)
        return 1;
    S->nslots = 2 * old + 64;
    S->keys = calloc((size_t) S->nslots, sizeof(slong *));
    S->vals = calloc((size_t) S->nslots, sizeof(fmpq_mpoly_struct *));
    if (S->keys == NULL || S->vals == NULL) {
        free(S->keys), free(S->vals);
        S->keys = ok, S->vals = ov, S->nslots = old;
        return 0;
    }
    for (i = 0; i < old; i++)
        if (ok[i] != NULL) {
            s = res_slot(S, ok[i]);
            S->keys[s] = ok[i];
            S->vals[s] = ov[i];
        }
    free(ok), free(ov);
    return 1;
}

/* Sorts a[0..n-1] decreasingly (insertion sort: n is small). */
static void res_sort(slong *a, slong n)
{
    slong i, j, v;
    for (i = 1; i < n; i++) {
        v = a[i];
        for (j = i; j > 0 && a[j - 1] < v; j--)
            a[j] = a[j - 1];
        a[j] = v;
    }
}

/* T += c * W_{g,n}[d] for an unsorted d (copied into scratch of n entries). */
static int res_addmul(sp_res *S, fmpq_mpoly_t T, const fmpq_mpoly_t c, slong g, const slong *d,
                      slong n, slong *scratch)
{
    const fmpq_mpoly_struct *v;
    fmpq_mpoly_t t;
    int st;
    memcpy(scratch, d, (size_t) n * sizeof(slong));
    res_sort(scratch, n);
    st = res_get(S, g, scratch, n, &v);
    if (st != SP_OK || fmpq_mpoly_is_zero(v, S->ctx))
        return st;
    fmpq_mpoly_init(t, S->ctx);
    fmpq_mpoly_mul(t, c, v, S->ctx);
    fmpq_mpoly_add(T, T, t, S->ctx);
    fmpq_mpoly_clear(t, S->ctx);
    return SP_OK;
}

/* 1 when omega_{g,n} is one of the recursion's stable correlators (2g-2+n > 0, not omega_{0,2}). */
static int res_stable(slong g, slong n)
{
    return 2 * g - 2 + n > 0 && !(g == 0 && n <= 2);
}

/* First term: T += sum_{a+b=p-2} W_{g-1,m+2}[a, b, J]; B(z,-z) = -dz^2/(4z^2) when g = 1, m = 0. */
static int res_term_handle(sp_res *S, fmpq_mpoly_t T, slong g, const slong *J, slong m, slong p,
                           slong *key, slong *scratch)
{
    slong a;
    int st = SP_OK;
    fmpq_mpoly_t one;
    if (g == 0)
        return SP_OK;
    fmpq_mpoly_init(one, S->ctx);
    fmpq_mpoly_one(one, S->ctx);
    if (g == 1 && m == 0) {
        if (p == 1) {
            fmpq_mpoly_scalar_div_si(one, one, 4, S->ctx);
            fmpq_mpoly_add(T, T, one, S->ctx);
        }
    } else {
        if (m > 0)
            memcpy(key + 2, J, (size_t) m * sizeof(slong));
        for (a = 0; st == SP_OK && a <= p - 2; a++) {
            key[0] = a;
            key[1] = p - 2 - a;
            st = res_addmul(S, T, one, g - 1, key, m + 2, scratch);
        }
    }
    fmpq_mpoly_clear(one, S->ctx);
    return st;
}

/* The split's factors for one choice (k_i of the c_i copies of the i-th distinct value v_i of J go
   to I): key1 = {a, I}, key2 = {b, J \ I} sorted, lengths *n1, *n2; returns prod binom(c_i, k_i). */
static slong res_split_keys(const slong *v, const slong *c, const slong *k, slong nd, slong a, slong b,
                            slong *key1, slong *n1, slong *key2, slong *n2)
{
    slong i, t, w = 1;
    fmpz_t bin;
    fmpz_init(bin);
    *n1 = 1, *n2 = 1;
    key1[0] = a, key2[0] = b;
    for (i = 0; i < nd; i++) {
        for (t = 0; t < k[i]; t++)
            key1[(*n1)++] = v[i];
        for (t = k[i]; t < c[i]; t++)
            key2[(*n2)++] = v[i];
        fmpz_bin_uiui(bin, (ulong) c[i], (ulong) k[i]);
        w *= fmpz_get_si(bin);
    }
    fmpz_clear(bin);
    res_sort(key1, *n1);
    res_sort(key2, *n2);
    return w;
}

/* T += w * sum_{a+b=p-2} W_{g_1}[a, I] W_{g_2}[b, J \ I] for one split (the choice k). */
static int res_split_add(sp_res *S, fmpq_mpoly_t T, slong g1, slong g2, const slong *v, const slong *c,
                         const slong *k, slong nd, slong p, slong w, slong *key1, slong *key2)
{
    slong a, n1, n2;
    int st = SP_OK;
    const fmpq_mpoly_struct *v1, *v2;
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, S->ctx);
    for (a = 0; a <= p - 2 && st == SP_OK; a++) {
        slong wt = w * res_split_keys(v, c, k, nd, a, p - 2 - a, key1, &n1, key2, &n2);
        if (!res_stable(g1, n1) || !res_stable(g2, n2))
            break;
        st = res_get(S, g1, key1, n1, &v1);
        if (st == SP_OK && !fmpq_mpoly_is_zero(v1, S->ctx))
            st = res_get(S, g2, key2, n2, &v2);
        if (st != SP_OK || fmpq_mpoly_is_zero(v1, S->ctx) || fmpq_mpoly_is_zero(v2, S->ctx))
            continue;
        fmpq_mpoly_mul(t, v1, v2, S->ctx);
        fmpq_mpoly_scalar_mul_si(t, t, wt, S->ctx);
        fmpq_mpoly_add(T, T, t, S->ctx);
    }
    fmpq_mpoly_clear(t, S->ctx);
    return st;
}

/* Product terms: T += sum over g_1 + g_2 = g and I in J (both factors stable) of
   sum_{a+b=p-2} W_{g_1}[a, I] W_{g_2}[b, J \ I].  J (sorted) is taken as a multiset: a split
   keeps k_i of the c_i copies of each distinct value, weighted by prod binom(c_i, k_i); each
   unordered pair {(g_1, k), (g_2, c - k)} is visited once and doubled. */
static int res_term_split(sp_res *S, fmpq_mpoly_t T, slong g, const slong *J, slong m, slong p,
                          slong *key1, slong *key2)
{
    slong v[SP_RESIDUE_MAX_POINTS], c[SP_RESIDUE_MAX_POINTS], k[SP_RESIDUE_MAX_POINTS], nd = 0, i, g1;
    int st = SP_OK;
    if (m >= SP_RESIDUE_MAX_POINTS)
        return SP_LIMIT;
    for (i = 0; i < m; i++) {
        if (nd > 0 && v[nd - 1] == J[i])
            c[nd - 1]++;
        else
            v[nd] = J[i], c[nd++] = 1;
    }
    for (g1 = 0; g1 <= g - g1 && st == SP_OK; g1++) {
        memset(k, 0, sizeof k);
        for (;;) {
            int cmp = 0;                          /* k against its complement c - k, lexicographic */
            for (i = 0; i < nd && cmp == 0; i++)
                cmp = (k[i] > c[i] - k[i]) - (k[i] < c[i] - k[i]);
            if (g1 < g - g1 || cmp <= 0)
                st = res_split_add(S, T, g1, g - g1, v, c, k, nd, p, (g1 == g - g1 && cmp == 0) ? 1 : 2,
                                   key1, key2);
            for (i = 0; i < nd && k[i] == c[i]; i++)      /* next choice vector */
                k[i] = 0;
            if (i == nd || st != SP_OK)
                break;
            k[i]++;
        }
    }
    return st;
}

/* Terms with one factor B(+-z, z_i): T += 2 (2 d_i + 1) W_{g,m}[p + d_i - 1, J \ i]. */
static int res_term_bergman(sp_res *S, fmpq_mpoly_t T, slong g, const slong *J, slong m, slong p,
                            slong *key, slong *scratch)
{
    slong i, j, c;
    int st = SP_OK;
    fmpq_mpoly_t coef;
    if (!res_stable(g, m))
        return SP_OK;
    fmpq_mpoly_init(coef, S->ctx);
    for (i = 0; i < m && st == SP_OK; i++) {
        if (p + J[i] - 1 < 0)
            continue;
        key[0] = p + J[i] - 1;
        for (j = 0, c = 1; j < m; j++)
            if (j != i)
                key[c++] = J[j];
        fmpq_mpoly_set_si(coef, 2 * (2 * J[i] + 1), S->ctx);
        st = res_addmul(S, T, coef, g, key, m, scratch);
    }
    fmpq_mpoly_clear(coef, S->ctx);
    return st;
}

/* res = W_{g,n}[d], d sorted, n >= 1, stable, |d| <= 3g-3+n: the residue formula of the file
   comment with d_0 = d[0] and J the rest. */
static int res_compute(sp_res *S, fmpq_mpoly_t res, slong g, const slong *d, slong n)
{
    slong m = n - 1, sJ = 0, i, p, P;
    slong *key = malloc((size_t) (4 * n + 8) * sizeof(slong));
    int st = SP_OK;
    fmpq_mpoly_t T;
    fmpq_mpoly_zero(res, S->ctx);
    if (key == NULL)
        return SP_LIMIT;
    if (g == 0 && n == 3) {
        if (d[0] == 0)
            fmpq_mpoly_neg(res, S->r + 0, S->ctx);
        free(key);
        return SP_OK;
    }
    for (i = 1; i < n; i++)
        sJ += d[i];
    P = 3 * g - 2 + m - sJ;
    fmpq_mpoly_init(T, S->ctx);
    for (p = d[0]; p <= P && st == SP_OK; p++) {
        if (p - d[0] >= S->rlen || fmpq_mpoly_is_zero(S->r + (p - d[0]), S->ctx))
            continue;
        fmpq_mpoly_zero(T, S->ctx);
        st = res_term_handle(S, T, g, d + 1, m, p, key, key + n + 2);
        if (st == SP_OK)
            st = res_term_split(S, T, g, d + 1, m, p, key, key + n + 2);
        if (st == SP_OK)
            st = res_term_bergman(S, T, g, d + 1, m, p, key, key + n + 2);
        fmpq_mpoly_mul(T, T, S->r + (p - d[0]), S->ctx);
        fmpq_mpoly_add(res, res, T, S->ctx);
    }
    fmpq_mpoly_scalar_div_si(res, res, -2, S->ctx);
    fmpq_mpoly_clear(T, S->ctx);
    free(key);
    return st;
}

/* *v = W_{g,n}[d] (d sorted; pointer into the memo, or to zero when |d| > 3g-3+n), computing and
   storing it when new.  Returns SP_OK, SP_LIMIT (memo limit, memory) or SP_CANCELLED. */
static int res_get(sp_res *S, slong g, const slong *d, slong n, const fmpq_mpoly_struct **v)
{
    slong i, sum = 0, s, *key;
    fmpq_mpoly_struct *val;
    int st;
    *v = S->zero;
    for (i = 0; i < n; i++)
        sum += d[i];
    if (sum > 3 * g - 3 + n)
        return SP_OK;
    if (S->bessel && sum > g - 1 && 2 * g - 2 + n < S->top_chi)
        return SP_OK;                       /* the degree bound, proved row by row at the top */
    if (S->cancel && *S->cancel)
        return SP_CANCELLED;
    key = malloc((size_t) (n + 2) * sizeof(slong));
    if (key == NULL)
        return SP_LIMIT;
    key[0] = n + 1;
    key[1] = g;
    memcpy(key + 2, d, (size_t) n * sizeof(slong));
    s = res_slot(S, key);
    if (S->keys[s] != NULL) {
        *v = S->vals[s];
        free(key);
        return SP_OK;
    }
    if ((S->max_entries > 0 && (double) S->len >= S->max_entries)
        || (val = flint_malloc(sizeof(fmpq_mpoly_struct))) == NULL) {
        free(key);
        return SP_LIMIT;
    }
    fmpq_mpoly_init(val, S->ctx);
    st = res_compute(S, val, g, d, n);
    if (st != SP_OK || !res_grow(S)) {
        fmpq_mpoly_clear(val, S->ctx);
        flint_free(val);
        free(key);
        return st != SP_OK ? st : SP_LIMIT;
    }
    s = res_slot(S, key);                   /* the table may have grown meanwhile */
    S->keys[s] = key;
    S->vals[s] = val;
    S->len++;
    *v = val;
    return SP_OK;
}

/* v_k with sum_k v_k w^k = 1 / sum_k y_k w^k: v_0 = 1/y_0, v_k = -(1/y_0) sum_{j=1}^{k} y_j v_{k-j},
   stored at r[k] (Airy kind) or r[k+1] with r[0] = 0 (Bessel kind). */
static void res_fill_inverse(sp_res *S, const fmpq_mpoly_struct *y, slong K)
{
    slong k, j, o = S->bessel ? 1 : 0;
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, S->ctx);
    for (k = 0; k < S->rlen; k++)
        fmpq_mpoly_init(S->r + k, S->ctx);
    for (k = 0; k + o < S->rlen; k++) {
        if (k == 0) {
            fmpq_mpoly_set_fmpq(S->r + o, S->y0inv, S->ctx);
            continue;
        }
        for (j = 1; j <= k && j <= K; j++) {
            fmpq_mpoly_mul(t, y + j, S->r + (k - j + o), S->ctx);
            fmpq_mpoly_sub(S->r + k + o, S->r + k + o, t, S->ctx);
        }
        fmpq_mpoly_scalar_mul_fmpq(S->r + k + o, S->r + k + o, S->y0inv, S->ctx);
    }
    fmpq_mpoly_clear(t, S->ctx);
}

/* Releases the memo and the inverse series. */
static void res_clear(sp_res *S)
{
    slong i;
    for (i = 0; i < S->nslots; i++)
        if (S->keys[i] != NULL) {
            free(S->keys[i]);
            fmpq_mpoly_clear(S->vals[i], S->ctx);
            flint_free(S->vals[i]);
        }
    free(S->keys), free(S->vals);
    for (i = 0; i < S->rlen; i++)
        fmpq_mpoly_clear(S->r + i, S->ctx);
    flint_free(S->r);
    fmpq_mpoly_clear(S->zero, S->ctx);
    fmpq_clear(S->y0inv);
}

int sp_omega_residue(sp_table *out, slong g, slong n, const fmpq_mpoly_struct *y, slong K,
                     double max_entries, atomic_int *cancel, const fmpq_mpoly_ctx_t ctx)
{
    return sp_omega_residue_kind(out, SP_CURVE_AIRY, g, n, y, K, max_entries, cancel, ctx);
}

/* See spectral.h: every row of the table through the memo. */
int sp_omega_residue_kind(sp_table *out, int kind, slong g, slong n, const fmpq_mpoly_struct *y, slong K,
                          double max_entries, atomic_int *cancel, const fmpq_mpoly_ctx_t ctx)
{
    sp_res S;
    slong i;
    int st;
    const fmpq_mpoly_struct *v;
    if (out == NULL)
        return SP_BADARG;
    sp_table_clear(out, ctx);
    st = sp_curve_check(y, K, ctx);
    if (st == SP_OK && kind != SP_CURVE_AIRY && kind != SP_CURVE_BESSEL)
        st = SP_BADARG;
    if (st == SP_OK && g >= 0 && n >= 1 && g + n > SP_RESIDUE_MAX_POINTS)
        st = SP_LIMIT;                  /* the recursion reaches omega_{g',n'} with n' <= n + g */
    if (st == SP_OK)
        st = sp_table_make_rows(out, g, n, ctx);
    if (st != SP_OK)
        return st;
    memset(&S, 0, sizeof S);
    S.ctx = ctx;
    S.max_entries = max_entries;
    S.cancel = cancel;
    S.bessel = kind == SP_CURVE_BESSEL;
    S.top_chi = 2 * g - 2 + n;
    S.rlen = 3 * g - 2 + n;
    S.r = flint_malloc((size_t) S.rlen * sizeof(fmpq_mpoly_struct));
    fmpq_init(S.y0inv);
    fmpq_mpoly_get_fmpq(S.y0inv, y + 0, ctx);
    fmpq_inv(S.y0inv, S.y0inv);
    fmpq_mpoly_init(S.zero, ctx);
    res_fill_inverse(&S, y, K);
    if (!res_grow(&S))
        st = SP_LIMIT;
    for (i = 0; i < out->len && st == SP_OK; i++) {
        st = res_get(&S, g, out->d + i * n, n, &v);
        if (st == SP_OK)
            fmpq_mpoly_set(out->c + i, v, ctx);
    }
    res_clear(&S);
    if (st != SP_OK)
        sp_table_clear(out, ctx);
    return st;
}

/* Rows of every (g', n') the recursion can reach from (g, n): g' <= g, n' <= n + g - g',
   2g'-2+n' <= 2g-2+n, each with the partitions of |d| <= 3g'-3+n' into at most n' parts. */
double sp_residue_estimate(slong g, slong n)
{
    slong gp, np, m, j, D, Dmax = 3 * g - 3 + n;
    double total = 0.0, *rows;
    if (g < 0 || n < 1 || Dmax < 0)
        return 0.0;
    if (Dmax > SP_MAX_DIM || n + g > SP_MAX_DIM)
        return HUGE_VAL;
    rows = malloc((size_t) (Dmax + 1) * sizeof(double));
    if (rows == NULL)
        return HUGE_VAL;
    for (gp = 0; gp <= g; gp++)
        for (np = 1; np <= n + g - gp; np++) {
            D = 3 * gp - 3 + np;
            if (2 * gp - 2 + np <= 0 || 2 * gp - 2 + np > 2 * g - 2 + n || D > Dmax)
                continue;
            memset(rows, 0, (size_t) (Dmax + 1) * sizeof(double));
            rows[0] = 1.0;
            for (j = 1; j <= np && j <= D; j++)
                for (m = j; m <= D; m++)
                    rows[m] += rows[m - j];
            for (m = 0; m <= D; m++)
                total += rows[m];
        }
    free(rows);
    return total > 1e18 ? HUGE_VAL : total;
}
