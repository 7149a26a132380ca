/* wk.c - psi-class correlators by memoised string / dilaton / DVV recursion.
 *
 * Internal normalisation (why the memo holds integers).  Write
 *     <<tau_d>>_g = prod_i (2 d_i + 1)!! <tau_d>_g      and      X(d) = 2^(4g+n-2) <<tau_d>>_g.
 * In <<.>> form the three relations have small integer coefficients:
 *   string   <<tau_0 tau_S>>   = sum_j (2d_j+1) <<tau_{d_j-1} tau_{S\j}>>
 *   dilaton  <<tau_1 tau_S>>_g = 3 (2g-2+|S|) <<tau_S>>_g
 *   DVV      <<tau_{k+1} tau_S>>_g = sum_j (2d_j+1) <<tau_{d_j+k} tau_{S\j}>>_g
 *              + 1/2 sum_{r+s=k-1} [ <<tau_r tau_s tau_S>>_{g-1} + sum <<tau_r tau_I>>_{g1} <<tau_s tau_J>>_{g2} ]
 * (multiply the usual DVV relation by prod_{j in S} (2d_j+1)!!; (2k+3)!! and (2r+1)!!(2s+1)!!
 * are absorbed).  The exponent 4g+n-2 is additive-compatible: 4g+n-2 = (4g1+n1-2)+(4g2+n2-2)+1
 * when g1+g2 = g and n1+n2 = n+1, and it exceeds the exponent of every other right-hand term,
 * so with the bases X(tau_0^3) = 2, X(tau_1 at g=1) = 1 every X is an integer:
 *   string   X = 2 sum_j (2d_j+1) X(...)            dilaton  X = 6 (2g-3+n) X(...)
 *   DVV      X = 2 sum_j (2d_j+1) X(...) + 4 sum_{r+s=k-1} X_{g-1}(...) + sum X_{g1}(...) X_{g2}(...)
 * Working in fmpz avoids all rational canonicalisation in the inner loop.
 */
#include <stdatomic.h>
#include <stdlib.h>
#include <string.h>
#include "binom.h"
#include "util.h"
#include "wk_internal.h"

static int wk_eval_key(wk_table *T, slong g, const slong *key, slong n, slong *idx);

/* Working data of one DVV step for <tau_{k+1} tau_S>_g (S sorted descending).
   All arrays live in one heap block owned by the step, keeping C stack frames small. */
typedef struct {
    slong g, k;
    const slong *S;
    slong ns;
    slong p;                 /* number of distinct values in S */
    slong *val, *mul, *a;    /* distinct values (descending), multiplicities, odometer */
    slong *buf1, *buf2;      /* key buffers of length ns + 2 */
    fmpz_t t, b;             /* scratch of the split terms, kept for the whole step */
} wk_dvv_ctx;

/* Creates an empty table.
   Returns NULL if memory is exhausted; the caller owns the result. */
wk_table *wk_table_new(void)
{
    wk_table *T = calloc(1, sizeof(wk_table));
    if (T == NULL)
        return NULL;
    if (!keyset_init(&T->keys)) {
        free(T);
        return NULL;
    }
    return T;
}

/* Releases the table, all keys and all values.
   NULL is accepted so that cleanup paths need no special case. */
void wk_table_free(wk_table *T)
{
    if (T == NULL)
        return;
    for (slong i = 0; i < T->alloc; i++)
        fmpz_clear(T->val + i);
    free(T->val);
    keyset_clear(&T->keys);
    free(T);
}

/* Sets the entry limit (0 or negative = unlimited).
   Lowering it below the current size only prevents further growth. */
void wk_table_set_limit(wk_table *T, slong max_entries)
{
    if (T != NULL)
        T->limit = max_entries > 0 ? max_entries : 0;
}

slong wk_table_limit(const wk_table *T)
{
    return T == NULL ? 0 : T->limit;
}

/* Number of memoised correlators.
   Returns 0 for NULL so callers can report sizes unconditionally. */
void wk_table_set_cancel(wk_table *T, atomic_int *flag)
{
    if (T)
        T->cancel = flag;
}

slong wk_table_entries(const wk_table *T)
{
    return T == NULL ? 0 : T->keys.len;
}

/* Merges two descending arrays A (na) and B (nb) into out (na+nb entries), descending.
   Used to build the keys of right-hand terms without a full sort. */
static void wk_key_merge(slong *out, const slong *A, slong na, const slong *B, slong nb)
{
    slong i = 0, j = 0, o = 0;
    while (i < na && j < nb)
        out[o++] = (A[i] >= B[j]) ? A[i++] : B[j++];
    while (i < na)
        out[o++] = A[i++];
    while (j < nb)
        out[o++] = B[j++];
}

/* Writes the multiset {extra} + {val[i] repeated cnt[i] times} into out, descending.
   Returns its length; val must be descending. */
static slong wk_key_from_counts(slong *out, const slong *val, const slong *cnt, slong p, slong extra)
{
    slong i, c, o = 0;
    int placed = 0;
    for (i = 0; i < p; i++) {
        if (!placed && extra >= val[i]) {
            out[o++] = extra;
            placed = 1;
        }
        for (c = 0; c < cnt[i]; c++)
            out[o++] = val[i];
    }
    if (!placed)
        out[o++] = extra;
    return o;
}

/* String equation: key ends with a 0 (removed); each distinct value v >= 1 of the rest is lowered.
   Equal values give equal terms, so each distinct value is evaluated once with its multiplicity. */
static int wk_compute_string(wk_table *T, slong g, const slong *key, slong n, fmpz_t x)
{
    slong m = n - 1, i = 0, j, idx;
    int st = WK_OK;
    slong *buf = malloc((size_t) (m + 1) * sizeof(slong));
    if (buf == NULL)
        return WK_LIMIT;
    memcpy(buf, key, (size_t) m * sizeof(slong));
    fmpz_zero(x);
    while (st == WK_OK && i < m && key[i] > 0) {
        slong v = key[i];
        for (j = i; j < m && key[j] == v; j++)
            ;
        buf[j - 1] = v - 1;          /* lowering the last copy keeps buf sorted */
        st = wk_eval_key(T, g, buf, m, &idx);
        buf[j - 1] = v;
        if (st == WK_OK && idx >= 0)
            fmpz_addmul_ui(x, T->val + idx, (ulong) (2 * (2 * v + 1) * (j - i)));
        i = j;
    }
    free(buf);
    return st;
}

/* Dilaton equation: key ends with a 1 and has no 0; the prefix of length n-1 is still sorted.
   X = 6 (2g-3+n) X(prefix). */
static int wk_compute_dilaton(wk_table *T, slong g, const slong *key, slong n, fmpz_t x)
{
    slong idx;
    int st = wk_eval_key(T, g, key, n - 1, &idx);
    fmpz_zero(x);
    if (st == WK_OK && idx >= 0)
        fmpz_mul_ui(x, T->val + idx, (ulong) (6 * (2 * g - 3 + n)));
    return st;
}

/* DVV first sum: replace one d_j = v by v+k, coefficient 2(2v+1) times the multiplicity of v.
   Terms live at the same genus with one point fewer. */
static int wk_dvv_sum_first(wk_table *T, wk_dvv_ctx *c, fmpz_t x)
{
    slong i, idx, v;
    int st = WK_OK;
    for (i = 0; st == WK_OK && i < c->p; i++) {
        v = c->val[i];
        c->mul[i]--;                                 /* temporarily drop one copy of v */
        wk_key_from_counts(c->buf1, c->val, c->mul, c->p, v + c->k);
        c->mul[i]++;
        st = wk_eval_key(T, c->g, c->buf1, c->ns, &idx);
        if (st == WK_OK && idx >= 0)
            fmpz_addmul_ui(x, T->val + idx, (ulong) (2 * (2 * v + 1) * c->mul[i]));
    }
    return st;
}

/* DVV genus-reduction sum: 4 sum_{r+s=k-1} X_{g-1}(tau_r tau_s tau_S).
   The summand is symmetric in (r,s), so pairs r<s are counted once with weight 8. */
static int wk_dvv_sum_lower(wk_table *T, const wk_dvv_ctx *c, fmpz_t x)
{
    slong r, s, idx, rs[2];
    int st = WK_OK;
    if (c->g < 1)
        return WK_OK;
    for (r = 0; st == WK_OK && 2 * r <= c->k - 1; r++) {
        s = c->k - 1 - r;
        rs[0] = s;
        rs[1] = r;
        wk_key_merge(c->buf1, c->S, c->ns, rs, 2);
        st = wk_eval_key(T, c->g - 1, c->buf1, c->ns + 2, &idx);
        if (st == WK_OK && idx >= 0)
            fmpz_addmul_ui(x, T->val + idx, r == s ? 4 : 8);
    }
    return st;
}

/* Advances the odometer a (0 <= a_i <= mul_i) over all sub-multisets I of S.
   Returns 0 after the last one (a is then back to all zeros). */
static int wk_dvv_next_subset(wk_dvv_ctx *c)
{
    slong i;
    for (i = 0; i < c->p; i++) {
        if (c->a[i] < c->mul[i]) {
            c->a[i]++;
            return 1;
        }
        c->a[i] = 0;
    }
    return 0;
}

/* Symmetry weight of the split term (r, I) versus its mirror (s, J): 0 = skip (mirror is counted),
   1 = self-mirror, 2 = counted for both.  Halves the work of the ordered split sum. */
static int wk_dvv_get_split_weight(const wk_dvv_ctx *c, slong r, slong s)
{
    slong i;
    if (r != s)
        return r < s ? 2 : 0;
    for (i = 0; i < c->p; i++)
        if (c->a[i] != c->mul[i] - c->a[i])
            return c->a[i] < c->mul[i] - c->a[i] ? 2 : 0;
    return 1;
}

/* Adds w * prod_i C(mul_i, a_i) * X_{g1}(tau_r tau_I) * X_{g2}(tau_s tau_J) to x.
   Both factors are evaluated before either value is read, because evaluation may move T->val. */
static int wk_dvv_add_split_term(wk_table *T, wk_dvv_ctx *c, slong r, slong g1, int w, fmpz_t x)
{
    slong i, i1, i2, s = c->k - 1 - r, n1;
    int st;
    n1 = wk_key_from_counts(c->buf1, c->val, c->a, c->p, r);
    for (i = 0; i < c->p; i++)
        c->a[i] = c->mul[i] - c->a[i];               /* a now describes J */
    wk_key_from_counts(c->buf2, c->val, c->a, c->p, s);
    for (i = 0; i < c->p; i++)
        c->a[i] = c->mul[i] - c->a[i];               /* restore I */
    st = wk_eval_key(T, g1, c->buf1, n1, &i1);
    if (st == WK_OK)
        st = wk_eval_key(T, c->g - g1, c->buf2, c->ns + 2 - n1, &i2);
    if (st != WK_OK || i1 < 0 || i2 < 0)
        return st;
    fmpz_set_ui(c->b, (ulong) w);
    for (i = 0; i < c->p; i++)
        binom_mul(c->b, c->t, c->mul[i], c->a[i]);
    fmpz_mul(c->t, T->val + i1, T->val + i2);
    fmpz_addmul(x, c->t, c->b);
    return WK_OK;
}

/* DVV splitting sum over sub-multisets I of S (with binomial multiplicities, never 2^|S| subsets).
   For each I the genus g1 fixes r by degree: r = 3 g1 - 2 + |I| - sum(I). */
static int wk_dvv_sum_split(wk_table *T, wk_dvv_ctx *c, fmpz_t x)
{
    slong i, g1, sizeI, sumI, r;
    int st = WK_OK, w;
    do {
        for (i = 0, sizeI = 0, sumI = 0; i < c->p; i++) {
            sizeI += c->a[i];
            sumI += c->a[i] * c->val[i];
        }
        /* r = 3 g1 - 2 + |I| - sum(I) must lie in 0..k-1: only a third of the genera can */
        slong lo = sumI - sizeI + 2, hi = sumI - sizeI + 1 + c->k;
        lo = lo <= 0 ? 0 : (lo + 2) / 3;
        hi = hi < 0 ? -1 : FLINT_MIN(hi / 3, c->g);
        for (g1 = lo; st == WK_OK && g1 <= hi; g1++) {
            r = 3 * g1 - 2 + sizeI - sumI;
            if ((g1 == 0 && sizeI < 2) || (g1 == c->g && c->ns - sizeI < 2))
                continue;                            /* unstable factor: counts as zero */
            w = wk_dvv_get_split_weight(c, r, c->k - 1 - r);
            if (w > 0)
                st = wk_dvv_add_split_term(T, c, r, g1, w, x);
        }
    } while (st == WK_OK && wk_dvv_next_subset(c));
    return st;
}

/* Fills the distinct values / multiplicities of c->S and allocates the buffers in one block.
   Returns WK_OK or WK_LIMIT (out of memory); on success c->val must be freed by the caller. */
static int wk_dvv_init_ctx(wk_dvv_ctx *c)
{
    slong i, p = 0, len = c->ns + 2;
    slong *blk = malloc((size_t) (3 * (c->ns + 1) + 2 * len) * sizeof(slong));
    if (blk == NULL)
        return WK_LIMIT;
    c->val = blk;
    c->mul = blk + (c->ns + 1);
    c->a = blk + 2 * (c->ns + 1);
    c->buf1 = blk + 3 * (c->ns + 1);
    c->buf2 = c->buf1 + len;
    for (i = 0; i < c->ns; i++) {
        if (p > 0 && c->val[p - 1] == c->S[i]) {
            c->mul[p - 1]++;
        } else {
            c->val[p] = c->S[i];
            c->mul[p] = 1;
            c->a[p] = 0;
            p++;
        }
    }
    c->p = p;
    return WK_OK;
}

/* DVV recursion on the largest index key[0] = k+1 >= 2 (all indices >= 2 here).
   Sums the three contributions in X normalisation (see the file comment). */
static int wk_compute_dvv(wk_table *T, slong g, const slong *key, slong n, fmpz_t x)
{
    wk_dvv_ctx c;
    int st;
    c.g = g;
    c.k = key[0] - 1;
    c.S = key + 1;
    c.ns = n - 1;
    if (wk_dvv_init_ctx(&c) != WK_OK)
        return WK_LIMIT;
    fmpz_init(c.t);
    fmpz_init(c.b);
    fmpz_zero(x);
    st = wk_dvv_sum_first(T, &c, x);
    if (st == WK_OK)
        st = wk_dvv_sum_lower(T, &c, x);
    if (st == WK_OK)
        st = wk_dvv_sum_split(T, &c, x);
    fmpz_clear(c.t);
    fmpz_clear(c.b);
    free(c.val);
    return st;
}

/* X of a stable, degree-matching sorted key: base cases, else string, dilaton or DVV.
   The bases are <tau_0^3>_0 = 1 (X = 2) and <tau_1>_1 = 1/24 (X = 2^3 * 3!! / 24 = 1). */
static int wk_compute_key(wk_table *T, slong g, const slong *key, slong n, fmpz_t x)
{
    if (g == 0 && n == 3) {
        fmpz_set_ui(x, 2);
        return WK_OK;
    }
    if (g == 1 && n == 1) {
        fmpz_one(x);
        return WK_OK;
    }
    if (key[n - 1] == 0)
        return wk_compute_string(T, g, key, n, x);
    if (key[n - 1] == 1)
        return wk_compute_dilaton(T, g, key, n, x);
    return wk_compute_dvv(T, g, key, n, x);
}

/* Memo lookup, computing and storing on a miss; *idx = -1 means the value is zero (unstable).
   Keys reaching here are sorted and degree-matching by construction of every caller. */
static int wk_eval_key(wk_table *T, slong g, const slong *key, slong n, slong *idx)
{
    ulong h;
    int st;
    fmpz_t x;
    *idx = -1;
    if (2 * g - 2 + n <= 0)
        return WK_OK;
    h = wk_memo_hash(key, n);
    *idx = wk_memo_find(T, key, n, h);
    if (*idx >= 0)
        return WK_OK;
    if (T->cancel && *T->cancel)
        return WK_CANCELLED;
    if (util_stack_exhausted())
        return WK_TOO_DEEP;
    fmpz_init(x);
    st = wk_compute_key(T, g, key, n, x);
    if (st == WK_OK)
        st = wk_memo_insert(T, key, n, h, x, idx);
    fmpz_clear(x);
    if (st != WK_OK)
        *idx = -1;
    return st;
}

/* Validates the public arguments in the documented order (BADARG, UNSTABLE, LIMIT).
   Returns WK_OK when the correlator may be computed. */
static int wk_check_args(const wk_table *T, slong g, const slong *d, slong n)
{
    int st = wk_check_space(T == NULL, g, d, n);
    if (st != WK_OK)
        return st;
    if (g > WK_MAX_DEPTH || n > WK_MAX_DEPTH + 2 || 2 * g - 2 + n > WK_MAX_DEPTH)
        return WK_LIMIT;
    return WK_OK;
}

/* qsort comparator for descending slong order.
   Avoids subtraction so no overflow is possible. */
static int wk_cmp_slong_desc(const void *x, const void *y)
{
    slong a = *(const slong *) x, b = *(const slong *) y;
    return (a < b) - (a > b);
}

/* res = X / (2^(4g+n-2) prod (2d_i+1)!!), undoing the internal normalisation.
   key holds the indices (any order). */
static void wk_value_to_fmpq(fmpq_t res, const fmpz_t X, slong g, const slong *key, slong n)
{
    slong i, j;
    fmpz_t den;
    fmpz_init(den);
    fmpz_one(den);
    fmpz_mul_2exp(den, den, (ulong) (4 * g + n - 2));
    for (i = 0; i < n; i++)
        for (j = 3; j <= 2 * key[i] + 1; j += 2)
            fmpz_mul_ui(den, den, (ulong) j);
    fmpq_set_fmpz_frac(res, X, den);
    fmpz_clear(den);
}

/* res = <tau_{d[0]} ... tau_{d[n-1]}>_g; see wk.h for the status codes.
   Sorts a private copy of d, evaluates through the memo and converts back to a rational. */
int wk_table_correlator(fmpq_t res, wk_table *T, slong g, const slong *d, slong n)
{
    slong *key, idx;
    int st;
    fmpq_zero(res);
    st = wk_check_args(T, g, d, n);
    if (st != WK_OK || !wk_degree_matches(g, d, n))
        return st;
    key = malloc((size_t) (n + 1) * sizeof(slong));
    if (key == NULL)
        return WK_LIMIT;
    if (n > 0)
        memcpy(key, d, (size_t) n * sizeof(slong));
    qsort(key, (size_t) n, sizeof(slong), wk_cmp_slong_desc);
    st = wk_eval_key(T, g, key, n, &idx);
    if (st == WK_OK && idx >= 0)
        wk_value_to_fmpq(res, T->val + idx, g, key, n);
    free(key);
    return st;
}
