/* wk_kdv.c - psi-class correlators by the KdV equation, the string and the dilaton equations.
 *
 * A second route to the numbers of wk.c, sharing none of its code: the DVV relation is not used.
 * With <<X>> the derivative of F = sum_g F_g (docs/conventions.md) at t = 0, the KdV equation in
 * Witten's correlator form (E. Witten, "Two-dimensional gravity and intersection theory on moduli
 * space", Surveys in Diff. Geom. 1 (1991) 243-310) is
 *     (2k+1) <<tau_k tau_0^2>> = <<tau_{k-1} tau_0>> <<tau_0^3>> + 2 <<tau_{k-1} tau_0^2>> <<tau_0^2>>
 *                                + 1/4 <<tau_{k-1} tau_0^4>> .
 * Differentiating by t_M (a multiset M) at t = 0 gives, with every genus fixed by its degree and
 * unstable correlators counted as zero,
 *   (K)  (2k+1) <tau_k tau_0^2 tau_M> = sum_{I+J=M} [ <tau_{k-1} tau_0 tau_I> <tau_0^3 tau_J>
 *                 + 2 <tau_{k-1} tau_0^2 tau_I> <tau_0^2 tau_J> ] + 1/4 <tau_{k-1} tau_0^4 tau_M>,
 * the sum running over the 2^|M| splittings of the positions of M.
 *
 * The step.  Let X = <tau_a tau_M>_g with every index >= 2 and a the largest (so g >= 2).  Apply (K)
 * with k = a+2 and expand the two left-hand tau_0 by the string equation:
 *     <tau_{a+2} tau_0^2 tau_M>_g = X + S2,
 *     S2 = sum_j <tau_{a+2} tau_M (m_j - 2)> + 2 sum_{j<l} <tau_{a+2} tau_M (m_j - 1, m_l - 1)> + 2 S1
 * (the last from lowering tau_{a+2} once and one m_j once).
 * On the right, the term I = M, J = {} is <tau_{a+1} tau_0 tau_M>_g <tau_0^3>_0, and by the string
 * equation <tau_{a+1} tau_0 tau_M>_g = X + S1, S1 = sum_j <tau_{a+1} tau_M (m_j - 1)>.  Every other
 * product has both genera below g: the factor <tau_0^3 tau_J> (J non-empty) has genus
 * (sum J - |J|)/3 >= |J|/3 > 0, <tau_0^2 tau_J> has genus (sum J - |J| + 1)/3 > 0 (and vanishes for
 * J = {}), and the factors holding tau_{a+1} have genus >= (a+1)/3 > 0.  Call their sum R, and
 * A = 1/4 <tau_{a+1} tau_0^4 tau_M>_{g-1}.  Then (2a+5)(X + S2) = X + S1 + R + A, that is
 *     X = (S1 + R + A - (2a+5) S2) / (2a+4),
 * the coefficient 2a+4 of the unknown being >= 8.  Keys with a 0 use the string equation, keys with
 * a 1 (and no 0) the dilaton equation; the bases are <tau_0^3>_0 = 1 and <tau_1>_1 = 1/24.
 *
 * Termination.  Order the memo keys (g, n, d) lexicographically by g, then by n, then by the sorted
 * multi-index d in decreasing lexicographic order.  String and dilaton go to (g, n-1).  In the step,
 * A and the products R live at genus < g; S1 and S2 live at (g, n) and their largest index is a+1 or
 * a+2 > a, so their sorted keys are lexicographically larger.  For fixed (g, n) the degree 3g-3+n is
 * fixed and there are finitely many keys, so an increasing chain at one (g, n) is finite, and (g, n)
 * itself decreases in the well-order of N x N.  Hence every recursion terminates; the nesting is
 * also capped (WK_KDV_MAX_NEST) so that the C stack cannot overflow.
 *
 * Memo bound.  At genus g the keys have at most n points.  One step from a key with n' points at
 * genus g' reaches genus g'-1 with n'+4 points (A) and lower genera with at most n'+2 points (R);
 * string and dilaton lower n.  By induction a key of genus g' has at most n + 4(g-g') points, and it
 * is a partition of 3g'-3+n' into at most n' parts: wk_kdv_estimate_entries counts these.
 */
#include <stdatomic.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include "hash.h"
#include "util.h"
#include "wk_kdv.h"
#include "wk_kdv_internal.h"

/* Working data of one KdV step for X = <tau_a tau_M>_g (M sorted descending, entries >= 2).
   The arrays share one heap block owned by the step, so recursion frames stay small. */
typedef struct {
    slong g, a;
    const slong *M;
    slong nm;
    slong p;                        /* number of distinct values of M */
    slong *val, *mul, *cnt;         /* distinct values (descending), multiplicities, odometer */
    slong *buf, *buf2;              /* key buffers of length nm + 6 */
} kdv_step;

static int kdv_eval(wk_kdv_table *T, const slong *key, slong n, fmpq_t out);

/* Creates an empty table.
   Returns NULL if memory is exhausted; the caller owns the result. */
wk_kdv_table *wk_kdv_table_new(void)
{
    wk_kdv_table *T = calloc(1, sizeof(wk_kdv_table));
    if (T == NULL)
        return NULL;
    if (!keyset_init(&T->keys)) {
        free(T);
        return NULL;
    }
    return T;
}

/* Releases the table with all keys and values.
   NULL is accepted so that cleanup paths need no special case. */
void wk_kdv_table_free(wk_kdv_table *T)
{
    if (T == NULL)
        return;
    for (slong i = 0; i < T->alloc; i++)
        fmpq_clear(T->val + i);
    free(T->val);
    keyset_clear(&T->keys);
    free(T);
}

/* Sets the entry limit (0 or negative = unlimited).
   Lowering it below the current size only prevents growth. */
void wk_kdv_table_set_limit(wk_kdv_table *T, slong max_entries)
{
    if (T != NULL)
        T->limit = max_entries > 0 ? max_entries : 0;
}

/* Installs the cancel flag polled by the recursion (NULL: none).
   The flag stays the caller's. */
void wk_kdv_table_set_cancel(wk_kdv_table *T, atomic_int *flag)
{
    if (T != NULL)
        T->cancel = flag;
}

/* Number of memoised correlators.
   0 for NULL so that callers can report sizes unconditionally. */
slong wk_kdv_table_entries(const wk_kdv_table *T)
{
    return T == NULL ? 0 : T->keys.len;
}

/* Deepest nesting reached since the table was created.
   0 for NULL. */
slong wk_kdv_table_max_nest(const wk_kdv_table *T)
{
    return T == NULL ? 0 : T->max_nest;
}

/* Sorts key[0..n-1] into descending order in place.
   Insertion sort: the keys built by the steps are short and almost sorted. */
static void kdv_key_sort(slong *key, slong n)
{
    slong i, j, t;
    for (i = 1; i < n; i++)
        for (j = i; j > 0 && key[j - 1] < key[j]; j--) {
            t = key[j];
            key[j] = key[j - 1];
            key[j - 1] = t;
        }
}

/* Evaluates an unsorted key (sorting buf in place first).
   Same contract as kdv_eval. */
static int kdv_eval_unsorted(wk_kdv_table *T, slong *buf, slong n, fmpq_t out)
{
    kdv_key_sort(buf, n);
    return kdv_eval(T, buf, n, out);
}

/* String equation: key ends with a 0, which is removed; each distinct value v >= 1 of the rest is
   lowered once, the term counted with the multiplicity of v (lowering the last copy keeps order). */
static int kdv_compute_string(wk_kdv_table *T, const slong *key, slong n, fmpq_t x)
{
    slong m = n - 1, i = 0, j;
    int st = WK_OK;
    fmpq_t t;
    slong *buf = malloc((size_t) (m + 1) * sizeof(slong));
    if (buf == NULL)
        return WK_LIMIT;
    fmpq_init(t);
    memcpy(buf, key, (size_t) m * sizeof(slong));
    while (st == WK_OK && i < m && key[i] > 0) {
        for (j = i; j < m && key[j] == key[i]; j++)
            ;
        buf[j - 1] = key[i] - 1;
        st = kdv_eval(T, buf, m, t);
        buf[j - 1] = key[i];
        fmpq_mul_si(t, t, j - i);
        fmpq_add(x, x, t);
        i = j;
    }
    fmpq_clear(t);
    free(buf);
    return st;
}

/* Dilaton equation: key ends with a 1 and has no 0: X = (2g-3+n) <key without that 1>.
   The prefix of a sorted key is sorted. */
static int kdv_compute_dilaton(wk_kdv_table *T, slong g, const slong *key, slong n, fmpq_t x)
{
    int st = kdv_eval(T, key, n - 1, x);
    fmpq_mul_si(x, x, 2 * g - 3 + n);
    return st;
}

/* Fills the distinct values and multiplicities of c->M and allocates the buffers in one block.
   WK_LIMIT when memory is exhausted; on success c->val must be freed by the caller. */
static int kdv_step_init(kdv_step *c)
{
    slong i, len = c->nm + 6;
    slong *blk = malloc((size_t) (3 * (c->nm + 1) + 2 * len) * sizeof(slong));
    if (blk == NULL)
        return WK_LIMIT;
    c->val = blk;
    c->mul = blk + (c->nm + 1);
    c->cnt = blk + 2 * (c->nm + 1);
    c->buf = blk + 3 * (c->nm + 1);
    c->buf2 = c->buf + len;
    c->p = 0;
    for (i = 0; i < c->nm; i++) {
        if (c->p > 0 && c->val[c->p - 1] == c->M[i]) {
            c->mul[c->p - 1]++;
        } else {
            c->val[c->p] = c->M[i];
            c->mul[c->p] = 1;
            c->cnt[c->p] = 0;
            c->p++;
        }
    }
    return WK_OK;
}

/* Writes top, then v_i repeated cnt_i times (i = 0..p-1, or mul_i - cnt_i when complement), then
   `zeros` zeros into out; returns the length.  top < 0 means no top entry. */
static slong kdv_step_write_key(const kdv_step *c, slong *out, slong top, int complement, slong zeros)
{
    slong i, r, o = 0;
    if (top >= 0)
        out[o++] = top;
    for (i = 0; i < c->p; i++)
        for (r = complement ? c->mul[i] - c->cnt[i] : c->cnt[i]; r > 0; r--)
            out[o++] = c->val[i];
    while (zeros-- > 0)
        out[o++] = 0;
    return o;
}

/* Adds w * <top, M with the values of positions i1 (and i2 >= 0 if given) lowered by `by`> to x.
   Positions are indices into the distinct values; the key is re-sorted. */
static int kdv_step_add_lowered(wk_kdv_table *T, kdv_step *c, slong top, slong i1, slong i2, slong by,
                                slong w, fmpq_t x)
{
    slong i, o = 1;
    int st, done1 = 0, done2 = i2 < 0;
    fmpq_t t;
    c->buf[0] = top;
    for (i = 0; i < c->nm; i++) {
        slong v = c->M[i];
        if (!done1 && v == c->val[i1]) {
            v -= by;
            done1 = 1;
        } else if (!done2 && v == c->val[i2]) {
            v -= by;
            done2 = 1;
        }
        c->buf[o++] = v;
    }
    fmpq_init(t);
    st = kdv_eval_unsorted(T, c->buf, o, t);
    fmpq_mul_si(t, t, w);
    fmpq_add(x, x, t);
    fmpq_clear(t);
    return st;
}

/* S1 = sum_j <tau_{a+1} tau_M(m_j - 1)>, grouped by distinct values.
   Every term is at the same (g, n) with largest index a+1. */
static int kdv_step_sum_s1(wk_kdv_table *T, kdv_step *c, fmpq_t s1)
{
    slong i;
    int st = WK_OK;
    for (i = 0; st == WK_OK && i < c->p; i++)
        st = kdv_step_add_lowered(T, c, c->a + 1, i, -1, 1, c->mul[i], s1);
    return st;
}

/* S2' = sum_j <tau_{a+2} tau_M(m_j - 2)> + 2 sum_{j<l} <tau_{a+2} tau_M(m_j - 1, m_l - 1)>, pairs of
   positions grouped by values (C(c_i, 2) inside a value, c_i c_k across two); S2 = S2' + 2 S1. */
static int kdv_step_sum_s2(wk_kdv_table *T, kdv_step *c, fmpq_t s2)
{
    slong i, k;
    int st = WK_OK;
    for (i = 0; st == WK_OK && i < c->p; i++) {
        st = kdv_step_add_lowered(T, c, c->a + 2, i, -1, 2, c->mul[i], s2);
        if (st == WK_OK && c->mul[i] >= 2)
            st = kdv_step_add_lowered(T, c, c->a + 2, i, i, 1, c->mul[i] * (c->mul[i] - 1), s2);
        for (k = i + 1; st == WK_OK && k < c->p; k++)
            st = kdv_step_add_lowered(T, c, c->a + 2, i, k, 1, 2 * c->mul[i] * c->mul[k], s2);
    }
    return st;
}

/* Advances the odometer cnt (0 <= cnt_i <= mul_i) to the next sub-multiset I of M.
   Returns 0 after the last one (cnt is then all zero again). */
static int kdv_step_next_subset(kdv_step *c)
{
    slong i;
    for (i = 0; i < c->p; i++) {
        if (c->cnt[i] < c->mul[i]) {
            c->cnt[i]++;
            return 1;
        }
        c->cnt[i] = 0;
    }
    return 0;
}

/* Adds w * <tau_{a+1} tau_I tau_0^z1> <tau_J tau_0^z2> to x for the current sub-multiset I.
   Both factors are read off their degrees; either may be zero (unstable or no integral genus). */
static int kdv_step_add_product(wk_kdv_table *T, kdv_step *c, slong z1, slong z2, const fmpz_t w, fmpq_t x)
{
    slong n1 = kdv_step_write_key(c, c->buf, c->a + 1, 0, z1), n2 = kdv_step_write_key(c, c->buf2, -1, 1, z2);
    int st;
    fmpq_t u, v;
    fmpq_init(u);
    fmpq_init(v);
    st = kdv_eval(T, c->buf, n1, u);
    if (st == WK_OK && !fmpq_is_zero(u))
        st = kdv_eval(T, c->buf2, n2, v);
    fmpq_mul(u, u, v);
    fmpq_mul_fmpz(u, u, w);
    fmpq_add(x, x, u);
    fmpq_clear(u);
    fmpq_clear(v);
    return st;
}

/* R = sum over proper sub-multisets I of M (each standing for prod C(mul_i, cnt_i) splittings) of
   <tau_{a+1} tau_0 tau_I><tau_0^3 tau_J> + 2 <tau_{a+1} tau_0^2 tau_I><tau_0^2 tau_J>. */
static int kdv_step_sum_products(wk_kdv_table *T, kdv_step *c, fmpq_t r)
{
    slong i, size;
    int st = WK_OK;
    fmpz_t w, b;
    fmpz_init(w);
    fmpz_init(b);
    do {
        for (i = 0, size = 0; i < c->p; i++)
            size += c->cnt[i];
        if (size == c->nm)
            continue;                               /* I = M: the unknown's own term, see above */
        fmpz_one(w);
        for (i = 0; i < c->p; i++) {
            fmpz_bin_uiui(b, (ulong) c->mul[i], (ulong) c->cnt[i]);
            fmpz_mul(w, w, b);
        }
        st = kdv_step_add_product(T, c, 1, 3, w, r);
        fmpz_mul_2exp(w, w, 1);
        if (st == WK_OK)
            st = kdv_step_add_product(T, c, 2, 2, w, r);
    } while (st == WK_OK && kdv_step_next_subset(c));
    fmpz_clear(w);
    fmpz_clear(b);
    return st;
}

/* A = 1/4 <tau_{a+1} tau_0^4 tau_M>_{g-1}; needs the odometer at zero (the complement is M).
   The key is written already sorted. */
static int kdv_step_get_a(wk_kdv_table *T, kdv_step *c, fmpq_t a)
{
    slong n = kdv_step_write_key(c, c->buf, c->a + 1, 1, 4);
    int st = kdv_eval(T, c->buf, n, a);
    fmpq_div_2exp(a, a, 2);
    return st;
}

/* The KdV step of the file comment: X = (S1 + R + A - (2a+5) S2) / (2a+4) for
   X = <tau_a tau_M>_g, key = (a, M) sorted with every entry >= 2; S2 = S2' + 2 S1. */
static int kdv_compute_step(wk_kdv_table *T, slong g, const slong *key, slong n, fmpq_t x)
{
    kdv_step c;
    int st;
    fmpq_t s1, s2;
    fmpz_t den;
    c.g = g;
    c.a = key[0];
    c.M = key + 1;
    c.nm = n - 1;
    if (kdv_step_init(&c) != WK_OK)
        return WK_LIMIT;
    fmpq_init(s1);
    fmpq_init(s2);
    fmpz_init_set_si(den, 2 * c.a + 4);
    st = kdv_step_get_a(T, &c, x);
    if (st == WK_OK)
        st = kdv_step_sum_products(T, &c, x);
    if (st == WK_OK)
        st = kdv_step_sum_s1(T, &c, s1);
    if (st == WK_OK)
        st = kdv_step_sum_s2(T, &c, s2);
    fmpq_add(x, x, s1);
    fmpq_add(s2, s2, s1);
    fmpq_add(s2, s2, s1);
    fmpq_mul_si(s2, s2, 2 * c.a + 5);
    fmpq_sub(x, x, s2);
    fmpq_div_fmpz(x, x, den);
    fmpq_clear(s1);
    fmpq_clear(s2);
    fmpz_clear(den);
    free(c.val);
    return st;
}

/* Value of a stable, degree-matching sorted key of genus g: bases, string, dilaton or the KdV step.
   x is zero on entry. */
static int kdv_compute(wk_kdv_table *T, slong g, const slong *key, slong n, fmpq_t x)
{
    if (g == 0 && n == 3) {
        fmpq_one(x);
        return WK_OK;
    }
    if (g == 1 && n == 1) {
        fmpq_set_si(x, 1, 24);
        return WK_OK;
    }
    if (key[n - 1] == 0)
        return kdv_compute_string(T, key, n, x);
    if (key[n - 1] == 1)
        return kdv_compute_dilaton(T, g, key, n, x);
    return kdv_compute_step(T, g, key, n, x);
}

/* Genus of a sorted key read off its degree (sum d = 3g-3+n), or -1 when no stable genus fits.
   Callers build keys whose genus is fixed by degree, so this is the only place that decides it. */
static slong kdv_key_get_genus(const slong *key, slong n)
{
    slong i, D = 0, g;
    for (i = 0; i < n; i++)
        D += key[i];
    if (D + 3 - n < 0 || (D + 3 - n) % 3 != 0)
        return -1;
    g = (D + 3 - n) / 3;
    return 2 * g - 2 + n > 0 ? g : -1;
}

/* out = <tau_key>, key sorted descending, genus from the degree (zero if none or unstable).
   Memo lookup, else computes under the nesting cap and stores; out is zero on error. */
static int kdv_eval(wk_kdv_table *T, const slong *key, slong n, fmpq_t out)
{
    slong g = kdv_key_get_genus(key, n), idx;
    ulong h;
    int st;
    fmpq_zero(out);
    if (g < 0)
        return WK_OK;
    h = hash_slongs(key, n);
    idx = kdv_memo_find(T, key, n, h);
    if (idx >= 0) {
        fmpq_set(out, T->val + idx);
        return WK_OK;
    }
    if (T->cancel && *T->cancel)
        return WK_CANCELLED;
    if (T->nest >= WK_KDV_MAX_NEST || util_stack_exhausted())
        return WK_LIMIT;
    if (++T->nest > T->max_nest)
        T->max_nest = T->nest;
    st = kdv_compute(T, g, key, n, out);
    T->nest--;
    if (st == WK_OK)
        st = kdv_memo_insert(T, key, n, h, out);
    if (st != WK_OK)
        fmpq_zero(out);
    return st;
}

/* Validates the public arguments in the documented order (BADARG, UNSTABLE, LIMIT).
   WK_OK when the correlator may be computed. */
static int kdv_check_args(const wk_kdv_table *T, slong g, const slong *d, slong n)
{
    int st = wk_check_space(T == NULL, g, d, n);
    if (st != WK_OK)
        return st;
    if (g > WK_KDV_MAX_EULER || n > WK_KDV_MAX_EULER + 2 || 2 * g - 2 + n > WK_KDV_MAX_EULER)
        return WK_LIMIT;
    return WK_OK;
}

/* res = <tau_d>_g by the KdV route; see wk_kdv.h for the status codes.
   Checks the degree without overflow, sorts a private copy and evaluates through the memo. */
int wk_kdv_correlator(fmpq_t res, wk_kdv_table *T, slong g, const slong *d, slong n)
{
    slong *key, i, D, sum = 0;
    int st;
    fmpq_zero(res);
    st = kdv_check_args(T, g, d, n);
    if (st != WK_OK)
        return st;
    D = 3 * g - 3 + n;
    for (i = 0; i < n; i++) {
        if (d[i] > D - sum)
            return WK_OK;
        sum += d[i];
    }
    if (sum != D)
        return WK_OK;
    key = malloc((size_t) (n + 1) * sizeof(slong));
    if (key == NULL)
        return WK_LIMIT;
    if (n > 0)
        memcpy(key, d, (size_t) n * sizeof(slong));
    T->nest = 0;
    st = kdv_eval_unsorted(T, key, n, res);
    free(key);
    return st;
}

/* Upper bound on memo entries (file comment, "Memo bound"): the sum over n' <= n + 4g and genera
   g' <= g with n' <= n + 4(g-g') of the partitions of 3g'-3+n' into at most n' parts. */
double wk_kdv_estimate_entries(slong g, slong n)
{
    slong Nmax, k, N, gp;
    double *q, total = 0.0;
    if (g < 0 || n < 0)
        return 0.0;
    if (g > 1000 || n > 1000)
        return HUGE_VAL;
    Nmax = 4 * g + n - 3;              /* largest degree: g' = 0 with n + 4g points */
    if (Nmax < 0)
        return 0.0;
    q = calloc((size_t) (Nmax + 1), sizeof(double));
    if (q == NULL)
        return HUGE_VAL;
    q[0] = 1.0;
    for (k = 0; k <= n + 4 * g; k++) {
        for (N = k; k > 0 && N <= Nmax; N++)
            q[N] += q[N - k];          /* q[N] = partitions of N into at most k parts */
        for (gp = 0; gp <= g && k <= n + 4 * (g - gp); gp++)
            if (2 * gp - 2 + k > 0 && 3 * gp - 3 + k >= 0 && 3 * gp - 3 + k <= Nmax)
                total += q[3 * gp - 3 + k];
    }
    free(q);
    return total > 1e300 ? HUGE_VAL : total;
}
