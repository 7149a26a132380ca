/* kappashift.c - mixed psi-kappa integrals by the Kaufmann-Manin-Zagier time shift (kappashift.h).
 *
 * Only the distinct kappa indices j with m_j > 0 matter; s_j is a variable for each of them and every
 * polynomial lives in Q[s] / (s_j^{m_j+1}), the truncation being a ring map, so truncating after each
 * product is exact for the coefficient of s^m.  The weight of s_j is j and p_k is homogeneous of
 * weight k, so a product over a multiset of parts k of total weight K = sum_j j m_j, once truncated,
 * holds at most the monomial s^m itself: that coefficient is read at the leaves of a walk over the
 * partitions of K (parts k = K down to 1, multiplicity e_k), and a branch stops as soon as its
 * truncated product is zero.  p_k comes from the power-series exponential by the recurrence
 *     p_0 = 1,   k p_k = - sum_{j <= k} j s_j p_{k-j}        (f = exp(h)  =>  k f_k = sum_i i h_i f_{k-i}).
 */
#include <stdatomic.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <flint/fmpq_mpoly.h>
#include "util.h"
#include "kappashift.h"

/* The walk's data: the space, the truncation, the shifted times -p_k and the extra points chosen. */
typedef struct {
    wk_table *T;
    atomic_int *cancel;
    slong g, n, K;
    const slong *d;
    slong r;                   /* number of kappa variables */
    ulong *m;                  /* truncation exponents m_j, one per variable */
    fmpq_mpoly_ctx_t ctx;
    fmpq_mpoly_struct *q;      /* q[k] = -p_k, k = 0..K */
    slong *e;                  /* e[k] = multiplicity of tau_{k+1} chosen so far */
    slong *key;                /* scratch correlator key, n + K entries */
    fmpq_t coeff, corr;
    fmpq *res;                 /* the caller's result */
} ks_walk;

/* A = A mod (s_j^{m_j+1}): drops every term with an exponent above its bound.
   The kept terms keep their order, so the result is canonical. */
static void ks_poly_truncate(fmpq_mpoly_t A, const ks_walk *W)
{
    slong i, j, len = fmpq_mpoly_length(A, W->ctx);
    ulong *exp = flint_malloc((size_t) W->r * sizeof(ulong));
    fmpq_mpoly_t B;
    fmpq_t c;
    fmpq_mpoly_init(B, W->ctx);
    fmpq_init(c);
    for (i = 0; i < len; i++) {
        fmpq_mpoly_get_term_exp_ui(exp, A, i, W->ctx);
        for (j = 0; j < W->r && exp[j] <= W->m[j]; j++)
            ;
        if (j < W->r)
            continue;
        fmpq_mpoly_get_term_coeff_fmpq(c, A, i, W->ctx);
        fmpq_mpoly_push_term_fmpq_ui(B, c, exp, W->ctx);
    }
    fmpq_mpoly_sort_terms(B, W->ctx);
    fmpq_mpoly_combine_like_terms(B, W->ctx);
    fmpq_mpoly_swap(A, B, W->ctx);
    fmpq_mpoly_clear(B, W->ctx);
    fmpq_clear(c);
    flint_free(exp);
}

/* Fills W->q[k] = -p_k(s) (k = 1..K) truncated, from the recurrence in the file comment.
   idx[v] is the kappa index of variable v; p_0 = 1 is kept in q[0] with the opposite sign. */
static void ks_fill_times(ks_walk *W, const slong *idx)
{
    slong k, v;
    fmpq_mpoly_t t, s;
    fmpq_mpoly_init(t, W->ctx);
    fmpq_mpoly_init(s, W->ctx);
    fmpq_mpoly_set_si(W->q + 0, -1, W->ctx);            /* -p_0 */
    for (k = 1; k <= W->K; k++) {
        fmpq_mpoly_zero(W->q + k, W->ctx);
        for (v = 0; v < W->r; v++) {
            if (idx[v] > k)
                continue;
            fmpq_mpoly_gen(s, v, W->ctx);
            fmpq_mpoly_mul(t, s, W->q + (k - idx[v]), W->ctx);   /* s_j (-p_{k-j}) */
            fmpq_mpoly_scalar_mul_si(t, t, idx[v], W->ctx);
            fmpq_mpoly_add(W->q + k, W->q + k, t, W->ctx);      /* k p_k = sum j s_j (-p_{k-j}) */
        }
        fmpq_mpoly_scalar_div_si(W->q + k, W->q + k, -k, W->ctx);   /* q_k = -p_k */
        ks_poly_truncate(W->q + k, W);
    }
    fmpq_mpoly_clear(t, W->ctx);
    fmpq_mpoly_clear(s, W->ctx);
}

/* Leaf of the walk: adds coefficient(s^m in P) * <prod tau_{d_i} prod_k tau_{k+1}^{e_k}>_g.
   Returns the correlator's status, or WK_CANCELLED when a stop was requested. */
static int ks_walk_add_leaf(ks_walk *W, const fmpq_mpoly_t P)
{
    slong k, c, len = W->n;
    int st;
    if (W->cancel && *W->cancel)
        return WK_CANCELLED;
    fmpq_mpoly_get_coeff_fmpq_ui(W->coeff, P, W->m, W->ctx);
    if (fmpq_is_zero(W->coeff))
        return WK_OK;
    if (W->n > 0)
        memcpy(W->key, W->d, (size_t) W->n * sizeof(slong));
    for (k = 1; k <= W->K; k++)
        for (c = 0; c < W->e[k]; c++)
            W->key[len++] = k + 1;
    st = wk_correlator(W->corr, W->T, W->g, W->key, len);   /* closed forms first */
    if (st == WK_UNSTABLE)
        return WK_OK;                                   /* cannot happen with n + len >= n stable */
    fmpq_addmul(W->res, W->coeff, W->corr);
    return st;
}

/* Walks the parts k, k-1, ..., 1 with remaining weight R, P the truncated product so far
   (prod over chosen parts of q_k^{e_k}/e_k!).  Recursion depth is at most K. */
static int ks_walk_parts(ks_walk *W, slong k, slong R, const fmpq_mpoly_t P)
{
    slong e;
    int st = WK_OK;
    fmpq_mpoly_t Q;
    if (R == 0)
        return ks_walk_add_leaf(W, P);
    if (util_stack_exhausted())
        return WK_TOO_DEEP;
    if (k == 0)
        return WK_OK;
    if (k > R)
        return ks_walk_parts(W, R, R, P);
    fmpq_mpoly_init(Q, W->ctx);
    fmpq_mpoly_set(Q, P, W->ctx);
    for (e = 0; st == WK_OK && e * k <= R; e++) {
        if (e > 0) {
            fmpq_mpoly_mul(Q, Q, W->q + k, W->ctx);
            fmpq_mpoly_scalar_div_si(Q, Q, e, W->ctx);
            ks_poly_truncate(Q, W);
            if (fmpq_mpoly_is_zero(Q, W->ctx))
                break;                                  /* every larger e is zero as well */
        }
        W->e[k] = e;
        st = ks_walk_parts(W, k - 1, R - e * k, Q);
    }
    W->e[k] = 0;
    fmpq_mpoly_clear(Q, W->ctx);
    return st;
}

/* sum_j j kmult[j], or -1 on negative entries or when it would pass WORD_MAX / 4.
   See kappashift.h. */
slong ks_kappa_degree(const slong *kmult, slong kmax)
{
    slong j, K = 0;
    if (kmax < 0 || (kmax > 0 && kmult == NULL))
        return -1;
    for (j = 1; j <= kmax; j++) {
        if (kmult[j] < 0 || (kmult[j] > 0 && kmult[j] > (WORD_MAX / 4 - K) / j))
            return -1;
        K += j * kmult[j];
    }
    return K;
}

/* Sets up the variables (one per kappa index present), runs the walk and scales by prod m_j!.
   W->g, n, d, K, T, cancel and res are set by the caller. */
static int ks_integral_run(ks_walk *W, const slong *kmult, slong kmax)
{
    slong j, v, *idx;
    int st;
    fmpq_mpoly_t one;
    fmpz_t f;
    for (j = 1, W->r = 0; j <= kmax; j++)
        W->r += kmult[j] > 0;
    idx = malloc((size_t) W->r * sizeof(slong));
    W->m = malloc((size_t) W->r * sizeof(ulong));
    W->e = calloc((size_t) W->K + 1, sizeof(slong));
    W->key = malloc((size_t) (W->n + W->K + 1) * sizeof(slong));
    if (idx == NULL || W->m == NULL || W->e == NULL || W->key == NULL) {
        free(idx), free(W->m), free(W->e), free(W->key);
        return WK_LIMIT;
    }
    for (j = 1, v = 0; j <= kmax; j++)
        if (kmult[j] > 0) {
            idx[v] = j;
            W->m[v++] = (ulong) kmult[j];
        }
    fmpq_mpoly_ctx_init(W->ctx, W->r, ORD_LEX);
    W->q = flint_malloc((size_t) (W->K + 1) * sizeof(fmpq_mpoly_struct));
    for (j = 0; j <= W->K; j++)
        fmpq_mpoly_init(W->q + j, W->ctx);
    fmpq_init(W->coeff);
    fmpq_init(W->corr);
    fmpq_mpoly_init(one, W->ctx);
    fmpq_mpoly_one(one, W->ctx);
    ks_fill_times(W, idx);
    st = ks_walk_parts(W, W->K, W->K, one);
    fmpz_init(f);
    for (v = 0; v < W->r; v++) {
        fmpz_fac_ui(f, W->m[v]);
        fmpq_mul_fmpz(W->res, W->res, f);
    }
    fmpz_clear(f);
    fmpq_mpoly_clear(one, W->ctx);
    fmpq_clear(W->coeff);
    fmpq_clear(W->corr);
    for (j = 0; j <= W->K; j++)
        fmpq_mpoly_clear(W->q + j, W->ctx);
    flint_free(W->q);
    fmpq_mpoly_ctx_clear(W->ctx);
    free(idx), free(W->m), free(W->e), free(W->key);
    return st;
}

/* res = the mixed integral by the time shift; see kappashift.h.
   Degree mismatch gives zero at once; no kappa at all is one correlator. */
int ks_integral(fmpq_t res, wk_table *T, slong g, const slong *d, slong n, const slong *kmult, slong kmax,
                atomic_int *cancel)
{
    ks_walk W;
    slong i, sum = 0, K = ks_kappa_degree(kmult, kmax);
    int st;
    fmpq_zero(res);
    if (T == NULL || g < 0 || n < 0 || (n > 0 && d == NULL) || K < 0 || g > WORD_MAX / 8 || n > WORD_MAX / 8)
        return WK_BADARG;
    for (i = 0; i < n; i++) {
        if (d[i] < 0)
            return WK_BADARG;
        if (d[i] > WORD_MAX / 8 - sum)
            return WK_OK;                               /* far beyond any dimension */
        sum += d[i];
    }
    if (2 * g - 2 + n <= 0)
        return WK_UNSTABLE;
    if (sum + K != 3 * g - 3 + n)
        return WK_OK;
    if (K == 0)
        return wk_correlator(res, T, g, d, n);
    memset(&W, 0, sizeof W);
    W.T = T;
    W.cancel = cancel;
    W.g = g;
    W.n = n;
    W.d = d;
    W.K = K;
    W.res = res;
    st = ks_integral_run(&W, kmult, kmax);
    if (st != WK_OK)
        fmpq_zero(res);
    return st;
}

/* Marks in ok[0..K] the weights k reachable as sum_j j a_j with 0 <= a_j <= m_j (bounded subset
   sums); p_k survives truncation only for such k. */
static void ks_mark_reachable(char *ok, slong K, const slong *kmult, slong kmax)
{
    slong j, a, k;
    ok[0] = 1;
    for (j = 1; j <= kmax; j++)
        for (a = 0; a < kmult[j]; a++)
            for (k = K; k >= j; k--)
                if (ok[k - j])
                    ok[k] = 1;
}

/* Leaves of the walk (partitions of K into reachable parts) times the monomials below s^m.
   See kappashift.h for the bounds. */
double ks_estimate_work(const slong *kmult, slong kmax)
{
    slong K = ks_kappa_degree(kmult, kmax), j, k, N;
    double *cnt, mono = 1.0, leaves;
    char *ok;
    if (K < 0)
        return 0.0;
    if (K > 10000)
        return HUGE_VAL;
    for (j = 1; j <= kmax; j++)
        mono *= (double) (kmult[j] + 1);
    ok = calloc((size_t) K + 1, 1);
    cnt = calloc((size_t) K + 1, sizeof(double));
    if (ok == NULL || cnt == NULL) {
        free(ok), free(cnt);
        return HUGE_VAL;
    }
    ks_mark_reachable(ok, K, kmult, kmax);
    cnt[0] = 1.0;
    for (k = 1; k <= K; k++)                  /* partitions of N into allowed parts */
        if (ok[k])
            for (N = k; N <= K; N++)
                cnt[N] += cnt[N - k];
    leaves = cnt[K];
    free(ok), free(cnt);
    return leaves * mono > 1e18 ? HUGE_VAL : leaves * mono;
}
