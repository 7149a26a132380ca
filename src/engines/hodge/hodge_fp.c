/* hodge_fp.c - Hodge integrals by the operator of Faber-Pandharipande (second route).
 *
 * C. Faber, R. Pandharipande, "Hodge integrals and Gromov-Witten theory", Invent. Math. 139
 * (2000) 173-199, section 2: with F(t, s) = sum_g hbar^{2g-2} sum_n 1/n! sum_d
 * <tau_{d_1}..tau_{d_n} exp(sum_l s_{2l-1} ch_{2l-1})>_g t_{d_1}..t_{d_n} and Z = exp F,
 *     Z(t, s) = exp(sum_{l>=1} B_{2l}/(2l)! s_{2l-1} D_l) Z(t, 0),
 *     D_l = d/dt_{2l} - sum_{i>=0} t_i d/dt_{i+2l-1} + hbar^2/2 sum_{i=0}^{2l-2} (-1)^i d^2/dt_i dt_{2l-2-i}.
 * The D_l commute and do not depend on s, so d Z/d s_{2l-1} = B_{2l}/(2l)! D_l Z, i.e. for F
 *     dF/ds_{2l-1} = B_{2l}/(2l)! [ F_{t_{2l}} - sum_i t_i F_{t_{i+2l-1}}
 *                    + hbar^2/2 sum_i (-1)^i (F_{t_i t_{2l-2-i}} + F_{t_i} F_{t_{2l-2-i}}) ].
 * Taking the coefficient of t_{d_1}..t_{d_n} s^m/m! gives, for a correlator with the multiset
 * C + {ch_{2l-1}} of ch factors, with c_l = B_{2l}/(2l)!,
 *     <tau_d | C + ch_{2l-1}>_g = c_l [ <tau_{2l} tau_d | C>_g - sum_i <tau_{d + (2l-1) e_i} | C>_g
 *        + 1/2 sum_a (-1)^a <tau_a tau_{2l-2-a} tau_d | C>_{g-1}
 *        + 1/2 sum_a (-1)^a sum <tau_a tau_{d_I} | C_1>_{g_1} <tau_{2l-2-a} tau_{d_J} | C_2>_{g_2} ],
 * the last sum over ordered splittings g_1 + g_2 = g, I + J = {1..n}, and distributions of the
 * (labelled) factors of C, unstable correlators counted as zero.  The string and dilaton
 * equations hold with ch factors (E is pulled back along the forgetful map), which removes
 * psi exponents 0 and 1 first.  Kappa classes are traded for points first:
 *     int_{g,n} X kappa_a prod_b kappa_b = int_{g,n+1} X psi_{n+1}^{a+1} prod_b (kappa_b - psi_{n+1}^b)
 * (Arbarello-Cornalba kappa, pi^* kappa_b = kappa_b - psi_{n+1}^b).  No code is shared with
 * hodge_grr.c.
 */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include "binom.h"
#include "hodge_internal.h"

static int fp_corr(const fmpq **val, hodge_ctx *H, slong g, const slong *din, slong n, const slong *cm, slong cmax);

/* The value of the states that vanish (unstable, wrong degree, E = 0, ch_{2k} = 0). */
static const fmpq fp_zero = {0, 1};

/* Keys and sorted copies up to this length live on the stack (one malloc per call cost more
   than the memo lookup). */
#define FP_STACK 64

/* The sum of the terms of one recursion step, num/den, kept over the least common multiple of the
   term denominators seen so far and reduced once at the end: the terms of a step mostly share
   their denominators, so a division replaces the gcds of a rational addition per term.  p/q is
   the term being added (q > 0); x, y, w and b are scratch. */
typedef struct {
    fmpz_t num, den, p, q, x, y, w, b;
} fp_sum;

static void fp_sum_init(fp_sum *S)
{
    fmpz_init(S->num);
    fmpz_init_set_ui(S->den, 1);
    fmpz_init(S->p);
    fmpz_init(S->q);
    fmpz_init(S->x);
    fmpz_init(S->y);
    fmpz_init(S->w);
    fmpz_init(S->b);
}

static void fp_sum_clear(fp_sum *S)
{
    fmpz_clear(S->num);
    fmpz_clear(S->den);
    fmpz_clear(S->p);
    fmpz_clear(S->q);
    fmpz_clear(S->x);
    fmpz_clear(S->y);
    fmpz_clear(S->w);
    fmpz_clear(S->b);
}

/* num/den += p/q (q > 0), den growing to lcm(den, q) when q does not divide it. */
static void fp_sum_add_term(fp_sum *S)
{
    if (fmpz_equal(S->q, S->den)) {
        fmpz_add(S->num, S->num, S->p);
        return;
    }
    if (!fmpz_divisible(S->den, S->q)) {
        fmpz_gcd(S->y, S->den, S->q);
        fmpz_divexact(S->x, S->q, S->y);
        fmpz_mul(S->num, S->num, S->x);
        fmpz_mul(S->den, S->den, S->x);
    }
    fmpz_divexact(S->x, S->den, S->q);
    fmpz_addmul(S->num, S->p, S->x);
}

/* res = num/den in canonical form. */
static void fp_sum_get(fmpq_t res, const fp_sum *S)
{
    fmpq_set_fmpz_frac(res, S->num, S->den);
}

/* sum += (num/den) * (g, e, cm) (den > 0); returns the status of the correlator. */
static int fp_addmul(fp_sum *S, hodge_ctx *H, slong num, slong den, slong g, const slong *e, slong n,
                     const slong *cm, slong cmax)
{
    const fmpq *v;
    int st = fp_corr(&v, H, g, e, n, cm, cmax);
    if (st != WK_OK || fmpq_is_zero(v))
        return st;
    fmpz_mul_si(S->p, fmpq_numref(v), num);
    fmpz_mul_si(S->q, fmpq_denref(v), den);
    fp_sum_add_term(S);
    return st;
}

/* The string equation (d[n-1] = 0) or the dilaton equation (d[n-1] = 1) on sorted d, when
   Mbar_{g,n-1} is stable.  Equal exponents are grouped: each distinct value counts once per leg. */
static int fp_string_dilaton(fmpq_t res, hodge_ctx *H, slong g, slong *d, slong n, const slong *cm, slong cmax)
{
    int st = WK_OK;
    fp_sum S;
    fp_sum_init(&S);
    if (d[n - 1] == 1)
        st = fp_addmul(&S, H, 2 * g - 3 + n, 1, g, d, n - 1, cm, cmax);
    for (slong j = 0; j < n - 1 && st == WK_OK && d[n - 1] == 0; j++) {
        slong c = 1;
        if (d[j] == 0 || (j > 0 && d[j] == d[j - 1]))
            continue;
        while (j + c < n - 1 && d[j + c] == d[j])
            c++;
        d[j]--;
        st = fp_addmul(&S, H, c, 1, g, d, n - 1, cm, cmax);
        d[j]++;
    }
    fp_sum_get(res, &S);
    fp_sum_clear(&S);
    return st;
}

/* Scratch of one splitting enumeration: distinct leg values and their counts, the counters.
   The counters are walked as one list t[0..m-1]: the r leg groups, then ch_1..ch_cmax (y = t + r - 1);
   each unit of item i moves s = deg1 - (n1 - 1) by wt[i], and side 1 has node exponent
   a = 3 g1 - 2 - s, so only the s in a window of width 2l-2 give terms. */
typedef struct {
    slong r, *val, *cnt, *x;       /* legs */
    slong *cy, *y;                 /* ch multiplicities 1..cmax and the part going to side 1 */
    slong *e1, *e2, *c1, *c2;
    slong m, *wt, *lim, *rmin, *rmax;   /* per item: step of s, largest count, bounds of the rest */
} fp_split_buf;

/* w = prod_i binom(cnt_i, x_i) prod_k binom(cy_k, y_k) (-1)^a: the labelled distributions
   of legs and ch factors giving the current counters (b is scratch). */
static void fp_split_weight(fmpz_t w, fmpz_t b, const fp_split_buf *B, slong cmax, slong a)
{
    fmpz_set_si(w, a % 2 ? -1 : 1);
    for (slong i = 0; i < B->r; i++)
        binom_mul(w, b, B->cnt[i], B->x[i]);
    for (slong k = 1; k <= cmax; k++)
        binom_mul(w, b, B->cy[k], B->y[k]);
}

/* sum += weight/2 * <e1 | c1>_{g1} <e2 | c2>_{g2} (weight doubled if twice; the second factor
   only if the first is nonzero).  The first value is copied into p/q at once: finding the second
   may move the memo's entries. */
static int fp_split_eval(fp_sum *S, hodge_ctx *H, const fp_split_buf *B, slong g1, slong g2,
                         slong n1, slong n2, slong cmax, slong a, int twice)
{
    const fmpq *v;
    int st = fp_corr(&v, H, g1, B->e1, n1, B->c1, cmax);
    if (st != WK_OK || fmpq_is_zero(v))
        return st;
    fmpz_set(S->p, fmpq_numref(v));
    fmpz_set(S->q, fmpq_denref(v));
    st = fp_corr(&v, H, g2, B->e2, n2, B->c2, cmax);
    if (st != WK_OK || fmpq_is_zero(v))
        return st;
    fp_split_weight(S->w, S->b, B, cmax, a);
    fmpz_mul(S->p, S->p, fmpq_numref(v));
    fmpz_mul(S->p, S->p, S->w);
    fmpz_mul(S->q, S->q, fmpq_denref(v));
    if (!twice)
        fmpz_mul_2exp(S->q, S->q, 1);
    fp_sum_add_term(S);
    return st;
}

/* sum += sign * weight/2 * <tau_a tau_{d_I} | C_1>_{g1} <tau_b tau_{d_J} | C_2>_{g2} for the
   current counters (weight doubled if twice); a fixed by the dimension of side 1. */
static int fp_split_term(fp_sum *S, hodge_ctx *H, fp_split_buf *B, slong g1, slong g, slong n, slong cmax, slong l,
                         int twice)
{
    slong n1 = 1, deg1 = 0, ych = 0, ytot = 0, k1 = 0, k2 = 0, a;
    for (slong i = 0; i < B->r; i++)
        n1 += B->x[i], deg1 += B->x[i] * B->val[i];
    for (slong k = 1; k <= cmax; k++)
        ych += B->y[k], ytot += B->cy[k], deg1 += k * B->y[k];
    if ((g1 == 0 && ych > 0) || (g - g1 == 0 && ych < ytot) || 2 * g1 - 2 + n1 <= 0
        || 2 * (g - g1) - 2 + (n - n1 + 2) <= 0)
        return WK_OK;
    a = 3 * g1 - 3 + n1 - deg1;
    if (a < 0 || a > 2 * l - 2)
        return WK_OK;
    for (slong i = 0; i < B->r; i++)
        for (slong j = 0; j < B->cnt[i]; j++)
            if (j < B->x[i])
                B->e1[k1++] = B->val[i];
            else
                B->e2[k2++] = B->val[i];
    B->e1[k1++] = a;
    B->e2[k2++] = 2 * l - 2 - a;
    for (slong k = 1; k <= cmax; k++)
        B->c1[k] = B->y[k], B->c2[k] = B->cy[k] - B->y[k];
    return fp_split_eval(S, H, B, g1, g - g1, k1, k2, cmax, a, twice);
}

/* Allocates the scratch of a splitting of sorted d[0..n-1] and cm[1..cmax] (one block).
   Returns 0 if memory is exhausted. */
static int fp_split_alloc(fp_split_buf *B, const slong *d, slong n, const slong *cm, slong cmax)
{
    slong m = n + cmax;
    slong *p = calloc((size_t) (2 * n + 2 * (n + 2) + 3 * (cmax + 1) + 5 * m + 2) + 1, sizeof(slong));
    if (p == NULL)
        return 0;
    B->val = p, B->cnt = p + n;
    B->e1 = p + 2 * n, B->e2 = B->e1 + n + 2;
    B->cy = B->e2 + n + 2, B->c1 = B->cy + cmax + 1, B->c2 = B->c1 + cmax + 1;
    B->x = B->c2 + cmax + 1, B->wt = B->x + m, B->lim = B->wt + m, B->rmin = B->lim + m, B->rmax = B->rmin + m + 1;
    B->r = 0;
    for (slong i = 0; i < n; i++) {
        if (i == 0 || d[i] != d[i - 1])
            B->val[B->r++] = d[i];
        B->cnt[B->r - 1]++;
    }
    for (slong k = 1; k <= cmax; k++)
        B->cy[k] = cm[k];
    B->m = B->r + cmax;
    B->y = B->x + B->r - 1;
    for (slong i = 0; i < B->r; i++)
        B->wt[i] = B->val[i] - 1;
    for (slong k = 1; k <= cmax; k++)
        B->wt[B->r + k - 1] = k;
    return 1;
}

/* Sets the counts of the items for side 1 of genus g1 (no ch factor in genus 0) and the bounds
   rmin[i], rmax[i] of the s that items i..m-1 can add. */
static void fp_split_limits(fp_split_buf *B, slong g1, slong cmax)
{
    for (slong i = 0; i < B->r; i++)
        B->lim[i] = B->cnt[i];
    for (slong k = 1; k <= cmax; k++)
        B->lim[B->r + k - 1] = g1 == 0 ? 0 : B->cy[k];
    B->rmin[B->m] = B->rmax[B->m] = 0;
    for (slong i = B->m - 1; i >= 0; i--) {
        slong v = B->wt[i] * B->lim[i];
        B->rmin[i] = B->rmin[i + 1] + (v < 0 ? v : 0);
        B->rmax[i] = B->rmax[i + 1] + (v > 0 ? v : 0);
    }
}

/* Compares the splitting (g1, legs x, ch factors y) with its mirror image (g2, cnt - x, cy - y),
   whose term is the same (node exponents a and 2l-2-a, same sign and binomials): -1, 0 (its own
   image) or 1. */
static int fp_mirror_cmp(const fp_split_buf *B, slong g1, slong g2, slong cmax)
{
    if (g1 != g2)
        return g1 < g2 ? -1 : 1;
    for (slong i = 0; i < B->r; i++)
        if (B->x[i] != B->cnt[i] - B->x[i])
            return B->x[i] < B->cnt[i] - B->x[i] ? -1 : 1;
    for (slong k = 1; k <= cmax; k++)
        if (B->y[k] != B->cy[k] - B->y[k])
            return B->y[k] < B->cy[k] - B->y[k] ? -1 : 1;
    return 0;
}

/* Walks the counters t[i..m-1] whose s (t[0..i-1] give s0) lies in [lo, hi]; at the end adds the
   term of a splitting that is not larger than its mirror image (file comment of fp_split). */
static int fp_split_walk(fp_sum *S, hodge_ctx *H, fp_split_buf *B, slong i, slong s0, slong lo, slong hi,
                         slong g1, slong g, slong n, slong cmax, slong l)
{
    int st = WK_OK;
    if (i == B->m) {
        int side = fp_mirror_cmp(B, g1, g - g1, cmax);
        if (side <= 0)              /* a splitting and its mirror image give equal terms */
            st = fp_split_term(S, H, B, g1, g, n, cmax, l, side < 0);
        return st;
    }
    slong t0 = 0, t1 = B->lim[i], w = B->wt[i];
    if (w > 0) {                        /* the counts t whose s can still reach the window */
        slong up = hi - B->rmin[i + 1] - s0, down = lo - B->rmax[i + 1] - s0;
        t1 = up < 0 ? -1 : FLINT_MIN(t1, up / w);
        t0 = down <= 0 ? 0 : (down + w - 1) / w;
    }
    for (slong t = t0; t <= t1 && st == WK_OK; t++) {
        slong s = s0 + w * t;
        if (s + B->rmin[i + 1] > hi || s + B->rmax[i + 1] < lo)
            continue;
        B->x[i] = t;
        st = fp_split_walk(S, H, B, i + 1, s, lo, hi, g1, g, n, cmax, l);
    }
    B->x[i] = 0;
    return st;
}

/* sum += 1/2 sum over ordered splittings of the separating boundary term;
   a splitting and its mirror image are summed once, doubled.  Only the counters whose node
   exponent a lies in 0..2l-2 are visited. */
static int fp_split(fp_sum *S, hodge_ctx *H, slong g, const slong *d, slong n, const slong *cm,
                    slong cmax, slong l)
{
    fp_split_buf B;
    int st = WK_OK;
    if (!fp_split_alloc(&B, d, n, cm, cmax))
        return WK_LIMIT;
    for (slong g1 = 0; 2 * g1 <= g && st == WK_OK; g1++) {
        fp_split_limits(&B, g1, cmax);
        st = fp_split_walk(S, H, &B, 0, 0, 3 * g1 - 2 - (2 * l - 2), 3 * g1 - 2, g1, g, n, cmax, l);
    }
    free(B.val);
    return st;
}

/* sum += sum_{a=0}^{2l-2} (-1)^a/2 <tau_a tau_{2l-2-a} tau_d | C>_{g-1} (irreducible boundary),
   pairing a with 2l-2-a, which give the same correlator with the same sign. */
static int fp_irreducible(fp_sum *S, hodge_ctx *H, slong g, const slong *d, slong n, slong *e,
                          const slong *cm, slong cmax, slong l)
{
    int st = WK_OK;
    memcpy(e, d, (size_t) n * sizeof(slong));
    for (slong a = 0; a <= l - 1 && st == WK_OK; a++) {
        slong sign = a % 2 ? -1 : 1;
        e[n] = a, e[n + 1] = 2 * l - 2 - a;
        st = fp_addmul(S, H, sign, a == l - 1 ? 2 : 1, g - 1, e, n + 2, cm, cmax);
    }
    return st;
}

/* res = <tau_d | C + ch_{2l-1}>_g by the coefficient form of the operator (file comment);
   d sorted, cm holds C + ch_{2l-1} and is restored before returning. */
static int fp_step(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n, slong *cm, slong cmax)
{
    slong k = cmax, l = (k + 1) / 2;
    slong *e = malloc((size_t) (n + 2) * sizeof(slong));
    fmpq_t c;
    fp_sum S;
    int st = WK_OK;
    if (e == NULL)
        return WK_LIMIT;
    fmpq_init(c);
    fp_sum_init(&S);
    cm[k]--;
    memcpy(e, d, (size_t) n * sizeof(slong));
    e[n] = 2 * l;
    st = fp_addmul(&S, H, 1, 1, g, e, n + 1, cm, cmax);
    for (slong i = 0; i < n && st == WK_OK; i++) {
        e[i] += k;
        st = fp_addmul(&S, H, -1, 1, g, e, n, cm, cmax);
        e[i] -= k;
    }
    if (st == WK_OK)
        st = fp_irreducible(&S, H, g, d, n, e, cm, cmax, l);
    if (st == WK_OK)
        st = fp_split(&S, H, g, d, n, cm, cmax, l);
    cm[k]++;
    fp_sum_get(res, &S);
    hodge_coef(c, H, l);
    fmpq_mul(res, res, c);
    fmpq_clear(c);
    fp_sum_clear(&S);
    free(e);
    return st;
}

/* Key of a kappa-free state: g, n, sorted d, cm[1..cmax] (cmax trimmed).  key has room for
   n + cmax + 2 entries; returns its length. */
static slong fp_key(slong *key, slong g, const slong *d, slong n, const slong *cm, slong cmax)
{
    key[0] = g, key[1] = n;
    memcpy(key + 2, d, (size_t) n * sizeof(slong));
    memcpy(key + 2 + n, cm + 1, (size_t) cmax * sizeof(slong));
    return n + cmax + 2;
}

/* Packed key of a state that reaches the memo of fp_corr (sorted d, no ch_{2k}): g, n, cmax, then
   d and the odd multiplicities cm[1], cm[3], .. four to a word in 16-bit fields; the memo hashes
   and compares far fewer words than with fp_key.  An entry of 2^16 or more (not met in practice)
   gives the unpacked form, told apart by a negative third word.  key has room for n + cmax + 3
   entries; returns its length. */
static slong fp_key_packed(slong *key, slong g, const slong *d, slong n, const slong *cm, slong cmax)
{
    slong len = 3, f = 0;
    ulong w = 0;
    int wide = 0;
    for (slong i = 0; i < n; i++)
        wide |= d[i] >= 0x10000;
    for (slong k = 1; k <= cmax; k += 2)
        wide |= cm[k] >= 0x10000;
    key[0] = g, key[1] = n, key[2] = wide ? -1 - cmax : cmax;
    if (wide)
        return 3 + fp_key(key + 3, g, d, n, cm, cmax);
    for (slong i = 0; i < n + (cmax + 1) / 2; i++) {
        w |= (ulong) (i < n ? d[i] : cm[2 * (i - n) + 1]) << (16 * f);
        if (++f == 4)
            key[len++] = (slong) w, w = 0, f = 0;
    }
    if (f > 0)
        key[len++] = (slong) w;
    return len;
}

/* Degree of a state: sum of d plus the ch (or kappa) degrees sum_k k m[k]. */
static slong fp_degree(const slong *d, slong n, const slong *m, slong mmax)
{
    slong s = 0;
    for (slong i = 0; i < n; i++)
        s += d[i];
    for (slong k = 1; k <= mmax; k++)
        s += k * m[k];
    return s;
}

/* res = the step of a state with ch factors, on sorted d: string/dilaton or the operator; the
   psi correlator itself when there is none. */
static int fp_corr_compute(fmpq_t res, hodge_ctx *H, slong g, slong *d, slong n, slong *cm, slong cmax)
{
    int reduce = n > 0 && d[n - 1] <= 1 && 2 * g - 3 + n > 0;
    if (cmax == 0)
        return wk_table_correlator(res, H->T, g, d, n);     /* kept here: the table's lookups cost more */
    return reduce ? fp_string_dilaton(res, H, g, d, n, cm, cmax) : fp_step(res, H, g, d, n, cm, cmax);
}

/* *val = the memoised value of the state (sorted d), computed and stored on a miss.  States
   with psi exponents 0 or 1 are memoised too: their string and dilaton expansions branch over
   the points and met the same states again and again. */
static int fp_corr_memo(const fmpq **val, hodge_ctx *H, slong g, slong *d, slong n, slong *cm, slong cmax)
{
    slong *key, small[FP_STACK];
    slong klen;
    fmpq_t res;
    int st;
    key = 2 * (n + cmax + 3) <= FP_STACK ? small : malloc((size_t) (2 * (n + cmax + 3)) * sizeof(slong));
    if (key == NULL)
        return WK_LIMIT;
    klen = fp_key_packed(key, g, d, n, cm, cmax);
    *val = keymap_get(&H->memo[HODGE_ROUTE_FP], key, klen);
    st = *val != NULL ? WK_OK : hodge_poll(H, HODGE_ROUTE_FP);
    if (*val == NULL && st == WK_OK) {
        fmpq_init(res);
        st = fp_corr_compute(res, H, g, d, n, cm, cmax);
        if (st == WK_OK && H->limit > 0 && H->memo[HODGE_ROUTE_FP].len >= H->limit)
            st = WK_LIMIT;              /* states finished during the recursion count too */
        if (st == WK_OK)
            *val = keymap_set(&H->memo[HODGE_ROUTE_FP], key, klen, res);
        fmpq_clear(res);
    }
    if (key != small)
        free(key);
    return st;
}

/* *val = <tau_d | C>_g, C given by cm[1..cmax]; zero for unstable spaces and wrong degrees.  *val
   points into the memo (or at fp_zero) and stays valid until the next state is stored. */
static int fp_corr(const fmpq **val, hodge_ctx *H, slong g, const slong *din, slong n, const slong *cmin, slong cmax)
{
    slong *buf, small[FP_STACK];
    int st;
    *val = &fp_zero;
    while (cmax > 0 && cmin[cmax] == 0)
        cmax--;
    if (2 * g - 2 + n <= 0 || fp_degree(din, n, cmin, cmax) != 3 * g - 3 + n)
        return WK_OK;
    if (g == 0 && cmax > 0)
        return WK_OK;                   /* E = 0 in genus 0 */
    for (slong k = 2; k <= cmax; k += 2)
        if (cmin[k] > 0)
            return WK_OK;               /* ch_{2k} = 0 (Mumford) */
    buf = n + cmax + 1 <= FP_STACK ? small : malloc((size_t) (n + cmax + 1) * sizeof(slong));
    if (buf == NULL)
        return WK_LIMIT;
    memcpy(buf, din, (size_t) n * sizeof(slong));
    memcpy(buf + n, cmin, (size_t) (cmax + 1) * sizeof(slong));
    hodge_sort_desc(buf, n);
    st = fp_corr_memo(val, H, g, buf, n, buf + n, cmax);
    if (buf != small)
        free(buf);
    if (st != WK_OK || *val == NULL)
        *val = &fp_zero;
    return st;
}

static int fp_kappa(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n, const slong *km, slong kmax,
                    const slong *cm, slong cmax);

/* res += sum over j_b <= km[b] of prod binom(km[b], j_b) (-1)^{j_b} times the state with one
   more point of exponent e0 + sum b j_b and kappa multiplicities km[b] - j_b: the expansion of
   prod_b (kappa_b - psi_{n+1}^b)^{km[b]}.  e has room for n + 1 entries and starts with d. */
static int fp_kappa_pull(fmpq_t res, hodge_ctx *H, slong g, slong *e, slong n, slong e0, const slong *km,
                         slong kmax, const slong *cm, slong cmax)
{
    slong *j = calloc((size_t) (2 * kmax + 2), sizeof(slong)), *rest;
    int st = WK_OK;
    fmpq_t v;
    if (j == NULL)
        return WK_LIMIT;
    rest = j + kmax + 1;
    fmpq_init(v);
    do {
        slong ex = e0, sj = 0;
        fmpz_t w, b;
        fmpz_init_set_ui(w, 1);
        fmpz_init(b);
        for (slong t = 1; t <= kmax; t++) {
            ex += t * j[t], sj += j[t], rest[t] = km[t] - j[t];
            fmpz_bin_uiui(b, (ulong) km[t], (ulong) j[t]);
            fmpz_mul(w, w, b);
        }
        e[n] = ex;
        st = fp_kappa(v, H, g, e, n + 1, rest, kmax, cm, cmax);
        fmpq_mul_fmpz(v, v, w);
        (sj % 2 ? fmpq_sub : fmpq_add)(res, res, v);
        fmpz_clear(w);
        fmpz_clear(b);
    } while (st == WK_OK && hodge_counter_next(j + 1, km + 1, kmax));
    fmpq_clear(v);
    free(j);
    return st;
}

/* res = int prod psi^d prod kappa^km prod ch^cm on Mbar_{g,n}: removes the largest kappa index a
   by int_{g,n} X kappa_a = int_{g,n+1} pi^*X psi_{n+1}^{a+1} (file comment); memoised. */
static int fp_kappa(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n, const slong *km, slong kmax,
                    const slong *cm, slong cmax)
{
    slong *buf, klen;
    const fmpq *hit;
    int st;
    fmpq_zero(res);
    while (kmax > 0 && km[kmax] == 0)
        kmax--;
    while (cmax > 0 && cm[cmax] == 0)
        cmax--;
    if (kmax == 0) {
        const fmpq *v;
        int stc = fp_corr(&v, H, g, d, n, cm, cmax);
        fmpq_set(res, v);
        return stc;
    }
    if (fp_degree(d, n, km, kmax) + fp_degree(d, 0, cm, cmax) != 3 * g - 3 + n)
        return WK_OK;
    buf = malloc((size_t) (2 * n + 2 * kmax + cmax + 8) * sizeof(slong));
    if (buf == NULL)
        return WK_LIMIT;
    slong *key = buf + n + 1, *km1 = key + n + kmax + cmax + 4;
    memcpy(buf, d, (size_t) n * sizeof(slong));
    hodge_sort_desc(buf, n);
    key[0] = -1, key[1] = kmax;
    memcpy(key + 2, km + 1, (size_t) kmax * sizeof(slong));
    klen = 2 + kmax + fp_key(key + 2 + kmax, g, buf, n, cm, cmax);
    hit = keymap_get(&H->memo[HODGE_ROUTE_FP], key, klen);
    if (hit != NULL) {
        fmpq_set(res, hit);
        free(buf);
        return WK_OK;
    }
    memcpy(km1, km, (size_t) (kmax + 1) * sizeof(slong));
    km1[kmax]--;
    st = hodge_poll(H, HODGE_ROUTE_FP);
    if (st == WK_OK)
        st = fp_kappa_pull(res, H, g, buf, n, kmax + 1, km1, kmax, cm, cmax);
    if (st == WK_OK)
        keymap_set(&H->memo[HODGE_ROUTE_FP], key, klen, res);
    else
        fmpq_zero(res);
    free(buf);
    return st;
}

int hodge_fp_integral(fmpq_t res, hodge_ctx *H, slong g, const slong *d, slong n,
                      const slong *km, slong kmax, const slong *cm, slong cmax)
{
    return fp_kappa(res, H, g, d, n, km, kmax, cm, cmax);
}
