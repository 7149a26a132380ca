/* sp_curve.c - the curve check, the dictionary (kappa times s_j and shifted KdV times p_k) and
 * the coefficient tables shared by both routes (spectral.h).
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>
#include "spectral.h"

void sp_options_default(sp_options *o)
{
    o->force_shift = 0;
    o->threads = 1;
    o->max_terms = 0.0;
    o->cancel = NULL;
    o->theta = NULL;
}

slong sp_curve_degree(int kind, slong g, slong n)
{
    return kind == SP_CURVE_BESSEL ? g - 1 : 3 * g - 3 + n;
}

void sp_table_init(sp_table *T, const fmpq_mpoly_ctx_t ctx)
{
    (void) ctx;
    T->g = 0;
    T->n = 0;
    T->len = 0;
    T->d = NULL;
    T->c = NULL;
}

void sp_table_clear(sp_table *T, const fmpq_mpoly_ctx_t ctx)
{
    slong i;
    for (i = 0; i < T->len; i++)
        fmpq_mpoly_clear(T->c + i, ctx);
    flint_free(T->c);
    free(T->d);
    sp_table_init(T, ctx);
}

/* Visits the sorted rows with entries <= cap below position i and total <= R, in lexicographic
   order; writes them to T->d when fill is set.  Returns the number of rows. */
static slong sp_rows_walk(sp_table *T, slong *row, slong i, slong cap, slong R, slong count, int fill)
{
    slong v;
    if (i == T->n) {
        if (fill)
            memcpy(T->d + count * T->n, row, (size_t) T->n * sizeof(slong));
        return count + 1;
    }
    for (v = 0; v <= cap && v <= R; v++) {
        row[i] = v;
        count = sp_rows_walk(T, row, i + 1, v, R - v, count, fill);
    }
    return count;
}

/* Number of sorted rows of n entries with |d| <= D (partitions of each m <= D into at most n
   parts), as a double. */
static double sp_rows_count(slong n, slong D)
{
    double *c = calloc((size_t) D + 1, sizeof(double)), total = 0.0;
    slong j, m;
    if (c == NULL)
        return HUGE_VAL;
    c[0] = 1.0;
    for (j = 1; j <= n && j <= D; j++)
        for (m = j; m <= D; m++)
            c[m] += c[m - j];
    for (m = 0; m <= D; m++)
        total += c[m];
    free(c);
    return total;
}

/* See spectral.h.  The rows are counted first (refused beyond SP_MAX_ROWS), then written. */
int sp_table_make_rows(sp_table *T, slong g, slong n, const fmpq_mpoly_ctx_t ctx)
{
    slong D, len, i, *row;
    sp_table_clear(T, ctx);
    if (g < 0 || n < 1)
        return SP_BADARG;
    if (2 * g - 2 + n <= 0)
        return SP_UNSTABLE;
    if (g > SP_MAX_DIM || n > SP_MAX_DIM || 3 * g - 3 + n > SP_MAX_DIM)
        return SP_LIMIT;
    D = 3 * g - 3 + n;
    if (sp_rows_count(n, D) > SP_MAX_ROWS)
        return SP_LIMIT;
    row = malloc((size_t) n * sizeof(slong));
    if (row == NULL)
        return SP_LIMIT;
    T->g = g;
    T->n = n;
    len = sp_rows_walk(T, row, 0, D, D, 0, 0);
    T->d = malloc((size_t) len * (size_t) n * sizeof(slong));
    T->c = flint_malloc((size_t) len * sizeof(fmpq_mpoly_struct));
    if (T->d == NULL) {
        free(row);
        return SP_LIMIT;
    }
    sp_rows_walk(T, row, 0, D, D, 0, 1);
    for (i = 0; i < len; i++)
        fmpq_mpoly_init(T->c + i, ctx);
    T->len = len;
    free(row);
    return SP_OK;
}

/* Lexicographic comparison of two rows of length n. */
static int sp_row_cmp(const slong *a, const slong *b, slong n)
{
    slong i;
    for (i = 0; i < n; i++)
        if (a[i] != b[i])
            return a[i] < b[i] ? -1 : 1;
    return 0;
}

slong sp_table_find(const sp_table *T, const slong *d)
{
    slong lo = 0, hi = T->len - 1;
    while (lo <= hi) {
        slong mid = lo + (hi - lo) / 2;
        int c = sp_row_cmp(T->d + mid * T->n, d, T->n);
        if (c == 0)
            return mid;
        if (c < 0)
            lo = mid + 1;
        else
            hi = mid - 1;
    }
    return -1;
}

int sp_table_equal(const sp_table *A, const sp_table *B, const fmpq_mpoly_ctx_t ctx)
{
    slong i;
    if (A->g != B->g || A->n != B->n || A->len != B->len)
        return 0;
    for (i = 0; i < A->len; i++)
        if (sp_row_cmp(A->d + i * A->n, B->d + i * B->n, A->n) != 0
            || !fmpq_mpoly_equal(A->c + i, B->c + i, ctx))
            return 0;
    return 1;
}

int sp_curve_check(const fmpq_mpoly_struct *y, slong K, const fmpq_mpoly_ctx_t ctx)
{
    if (y == NULL || K < 0)
        return SP_BADARG;
    if (fmpq_mpoly_is_zero(y + 0, ctx))
        return SP_Y0_ZERO;
    if (!fmpq_mpoly_is_fmpq(y + 0, ctx))
        return SP_Y0_NOT_RATIONAL;
    return SP_OK;
}

/* See spectral.h: p_k = w_k y_k / y_0 with w_k = (2k+1)!! (Airy kind) or (2k-1)!! (Bessel kind),
   the double factorial built up as k grows. */
int sp_shift_times_kind(fmpq_mpoly_struct *p, slong N, int kind, const fmpq_mpoly_struct *y, slong K,
                        const fmpq_mpoly_ctx_t ctx)
{
    slong k;
    int st = sp_curve_check(y, K, ctx);
    fmpq_t y0, c;
    fmpz_t df;
    if (st == SP_OK && (p == NULL || N < 0 || (kind != SP_CURVE_AIRY && kind != SP_CURVE_BESSEL)))
        st = SP_BADARG;
    if (st != SP_OK)
        return st;
    fmpq_init(y0);
    fmpq_init(c);
    fmpz_init_set_ui(df, 1);
    fmpq_mpoly_get_fmpq(y0, y + 0, ctx);
    for (k = 0; k <= N; k++) {
        if (k > 0)
            fmpz_mul_ui(df, df, (ulong) (kind == SP_CURVE_BESSEL ? 2 * k - 1 : 2 * k + 1));
        if (k > K) {
            fmpq_mpoly_zero(p + k, ctx);
            continue;
        }
        fmpq_set_fmpz_frac(c, df, fmpq_numref(y0));
        fmpq_mul_fmpz(c, c, fmpq_denref(y0));                 /* c = w_k / y_0 */
        fmpq_mpoly_scalar_mul_fmpq(p + k, y + k, c, ctx);
    }
    fmpz_clear(df);
    fmpq_clear(c);
    fmpq_clear(y0);
    return SP_OK;
}

int sp_shift_times(fmpq_mpoly_struct *p, slong N, const fmpq_mpoly_struct *y, slong K,
                   const fmpq_mpoly_ctx_t ctx)
{
    return sp_shift_times_kind(p, N, SP_CURVE_AIRY, y, K, ctx);
}

int sp_times(fmpq_mpoly_struct *s, slong N, const fmpq_mpoly_struct *y, slong K,
             const fmpq_mpoly_ctx_t ctx)
{
    return sp_times_kind(s, N, SP_CURVE_AIRY, y, K, ctx);
}

/* See spectral.h.  With f = sum p_k u^k (p_0 = 1) and h = log f, f' = h' f gives
   k h_k = k p_k - sum_{i=1}^{k-1} i h_i p_{k-i};  s_j = -h_j. */
int sp_times_kind(fmpq_mpoly_struct *s, slong N, int kind, const fmpq_mpoly_struct *y, slong K,
                  const fmpq_mpoly_ctx_t ctx)
{
    slong k, i;
    int st;
    fmpq_mpoly_struct *p;
    fmpq_mpoly_t t;
    if (s == NULL || N < 0)
        return SP_BADARG;
    p = flint_malloc((size_t) (N + 1) * sizeof(fmpq_mpoly_struct));
    for (k = 0; k <= N; k++)
        fmpq_mpoly_init(p + k, ctx);
    st = sp_shift_times_kind(p, N, kind, y, K, ctx);
    fmpq_mpoly_init(t, ctx);
    fmpq_mpoly_zero(s + 0, ctx);
    for (k = 1; st == SP_OK && k <= N; k++) {
        fmpq_mpoly_scalar_mul_si(s + k, p + k, k, ctx);            /* k p_k, then minus the sum */
        for (i = 1; i < k; i++) {
            fmpq_mpoly_mul(t, s + i, p + k - i, ctx);              /* s_i = -h_i, so add */
            fmpq_mpoly_scalar_mul_si(t, t, i, ctx);
            fmpq_mpoly_add(s + k, s + k, t, ctx);
        }
        fmpq_mpoly_scalar_div_si(s + k, s + k, -k, ctx);          /* s_k = -h_k */
    }
    fmpq_mpoly_clear(t, ctx);
    for (k = 0; k <= N; k++)
        fmpq_mpoly_clear(p + k, ctx);
    flint_free(p);
    return st;
}

/* See spectral.h: the Laplace pair L^{2d}/(2d+1)! <-> 1/z^{2d+2} (times L dL and dz). */
void sp_table_to_volume(sp_table *V, const sp_table *W, const fmpq_mpoly_ctx_t ctx)
{
    slong i, j;
    fmpz_t f, t;
    if (V != W) {
        sp_table_clear(V, ctx);
        sp_table_make_rows(V, W->g, W->n, ctx);
    }
    fmpz_init(f);
    fmpz_init(t);
    for (i = 0; i < W->len && i < V->len; i++) {
        fmpz_one(f);
        for (j = 0; j < W->n; j++) {
            fmpz_fac_ui(t, (ulong) (2 * W->d[i * W->n + j] + 1));
            fmpz_mul(f, f, t);
        }
        fmpq_mpoly_scalar_div_fmpz(V->c + i, W->c + i, f, ctx);
    }
    fmpz_clear(f);
    fmpz_clear(t);
}

const char *sp_status_string(int status)
{
    switch (status) {
    case SP_OK: return "ok";
    case SP_BADARG: return "invalid arguments";
    case SP_UNSTABLE: return "not a stable (g, n): needs 2g-2+n > 0";
    case SP_Y0_ZERO: return "the first odd coefficient y_0 (of z) vanishes: the branch point is not simple";
    case SP_Y0_NOT_RATIONAL: return "the first odd coefficient y_0 (of z) must be a nonzero rational number";
    case SP_LIMIT: return "beyond the size limit";
    case SP_CANCELLED: return "cancelled";
    default: return "unknown status";
    }
}
