/* hodge_fp_split.c - the separating term of the Faber-Pandharipande operator (hodge_fp.c):
 *     1/2 sum_a (-1)^a sum <tau_a tau_{d_I} | C_1>_{g_1} <tau_{2l-2-a} tau_{d_J} | C_2>_{g_2}
 * over ordered splittings g_1 + g_2 = g, I + J = {1..n} and distributions of the labelled ch
 * factors of C, unstable correlators counted as zero; a kept lambda_g becomes
 * lambda_{g_1} lambda_{g_2} (c(E) = c(E_1) c(E_2) on the divisor).  The splittings are walked by
 * counters (how many legs of each value and how many ch factors of each index go to side 1); the
 * node exponent a is fixed by the dimension of side 1, so only counters with a in 0..2l-2 are
 * visited, and a splitting and its mirror image (which give the same term) are summed once.
 */
#include <stdlib.h>
#include <string.h>
#include "binom.h"
#include "hodge_fp_internal.h"

/* Scratch of one splitting enumeration: distinct leg values and their counts, the counters.
   The counters are walked as one list x[0..m-1]: the r leg groups, then ch_1..ch_cmax (y = x + r - 1);
   each unit of item t moves s = deg1 - (n1 - 1) by wt[t], and side 1 has node exponent
   a = 3 g1 - 2 - s (less g1 when lambda_g is kept), so only the s in a window of width 2l-2 give
   terms. */
typedef struct {
    slong r, *val, *cnt, *x;       /* legs */
    slong *cy, *y;                 /* ch multiplicities 1..cmax and the part going to side 1 */
    int top;                       /* lambda_g kept whole */
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

/* sum += weight/2 * <e1 | c1>_{g1} <e2 | c2>_{g2}, times lambda_{g1} and lambda_{g2} when lambda_g
   is kept (weight doubled if twice; the second factor only if the first is nonzero).  The first value stays where it is
   while the second is found: the memo never moves its entries. */
static int fp_split_eval(hodge_fp_sum *S, hodge_ctx *H, const fp_split_buf *B, slong g1, slong g2,
                         slong n1, slong n2, slong cmax, slong a, int twice)
{
    const fmpq *v1, *v2;
    slong f1, f2;
    int st = hodge_fp_corr(&v1, &f1, H, g1, B->e1, n1, B->c1, cmax, B->top);
    if (st != WK_OK || fmpq_is_zero(v1))
        return st;
    st = hodge_fp_corr(&v2, &f2, H, g2, B->e2, n2, B->c2, cmax, B->top);
    if (st != WK_OK || fmpq_is_zero(v2))
        return st;
    fp_split_weight(S->w, S->b, B, cmax, a);
    fmpz_mul_si(S->w, S->w, f1);
    fmpz_mul_si(S->w, S->w, f2);
    fmpz_mul(S->p, fmpq_numref(v1), fmpq_numref(v2));
    fmpz_mul(S->p, S->p, S->w);
    fmpz_mul(S->q, fmpq_denref(v1), fmpq_denref(v2));
    if (!twice)
        fmpz_mul_2exp(S->q, S->q, 1);
    hodge_fp_sum_add_term(S);
    return st;
}

/* sum += sign * weight/2 * <tau_a tau_{d_I} | C_1>_{g1} <tau_b tau_{d_J} | C_2>_{g2} for the current
   counters (weight doubled if twice; with lambda_{g1} and lambda_{g2} when lambda_g is kept); a
   fixed by the dimension of side 1.  The ch classes vanish in genus 0 (E = 0). */
static int fp_split_term(hodge_fp_sum *S, hodge_ctx *H, fp_split_buf *B, slong g1, slong g, slong n, slong cmax,
                         slong l, int twice)
{
    slong n1 = 1, deg1 = 0, ych = 0, ytot = 0, k1 = 0, k2 = 0, a, g2 = g - g1;
    for (slong t = 0; t < B->r; t++)
        n1 += B->x[t], deg1 += B->x[t] * B->val[t];
    for (slong k = 1; k <= cmax; k++)
        ych += B->y[k], ytot += B->cy[k], deg1 += k * B->y[k];
    deg1 += B->top ? g1 : 0;
    if ((g1 == 0 && ych > 0) || (g2 == 0 && ych < ytot) || 2 * g1 - 2 + n1 <= 0 || 2 * g2 - 2 + (n - n1 + 2) <= 0)
        return WK_OK;
    a = 3 * g1 - 3 + n1 - deg1;
    if (a < 0 || a > 2 * l - 2)
        return WK_OK;
    for (slong t = 0; t < B->r; t++)
        for (slong j = 0; j < B->cnt[t]; j++)
            if (j < B->x[t])
                B->e1[k1++] = B->val[t];
            else
                B->e2[k2++] = B->val[t];
    B->e1[k1++] = a;
    B->e2[k2++] = 2 * l - 2 - a;
    for (slong k = 1; k <= cmax; k++)
        B->c1[k] = B->y[k], B->c2[k] = B->cy[k] - B->y[k];
    return fp_split_eval(S, H, B, g1, g2, k1, k2, cmax, a, twice);
}

/* Allocates the scratch of a splitting of sorted d[0..n-1] and cm[1..cmax] (one block).  Returns 0
   if memory is exhausted. */
static int fp_split_alloc(fp_split_buf *B, const slong *d, slong n, const slong *cm, slong cmax, int top)
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
    B->top = top;
    B->m = B->r + cmax;
    B->y = B->x + B->r - 1;
    for (slong i = 0; i < B->r; i++)
        B->wt[i] = B->val[i] - 1;
    for (slong k = 1; k <= cmax; k++)
        B->wt[B->r + k - 1] = k;
    return 1;
}

/* Sets the counts of the items for side 1 of genus g1 (no ch class in genus 0) and the bounds
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
    for (slong t = 0; t < B->r; t++)
        if (B->x[t] != B->cnt[t] - B->x[t])
            return B->x[t] < B->cnt[t] - B->x[t] ? -1 : 1;
    for (slong k = 1; k <= cmax; k++)
        if (B->y[k] != B->cy[k] - B->y[k])
            return B->y[k] < B->cy[k] - B->y[k] ? -1 : 1;
    return 0;
}

/* Walks the counters x[i..m-1] whose s (x[0..i-1] give s0) lies in [lo, hi]; at the end adds the
   term of a splitting that is not larger than its mirror image (file comment). */
static int fp_split_walk(hodge_fp_sum *S, hodge_ctx *H, fp_split_buf *B, slong i, slong s0, slong lo, slong hi,
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

int hodge_fp_split(hodge_fp_sum *S, hodge_ctx *H, slong g, const slong *d, slong n, const slong *cm, slong cmax,
                   slong l, int top)
{
    fp_split_buf B;
    int st = WK_OK;
    if (!fp_split_alloc(&B, d, n, cm, cmax, top))
        return WK_LIMIT;
    for (slong g1 = 0; 2 * g1 <= g && st == WK_OK; g1++) {
        slong hi = 3 * g1 - 2 - (top ? g1 : 0);     /* lambda_{g1} takes g1 of side 1's degree */
        fp_split_limits(&B, g1, cmax);
        st = fp_split_walk(S, H, &B, 0, 0, hi - (2 * l - 2), hi, g1, g, n, cmax, l);
    }
    free(B.val);
    return st;
}
