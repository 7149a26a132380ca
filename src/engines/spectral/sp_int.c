/* sp_int.c - omega_{g,n} of a spectral curve by intersection numbers (spectral.h).
 *
 * int_{Mbar_{g,n}} exp(sum_j s_j kappa_j) prod psi_i^{d_i} is, by the Kaufmann-Manin-Zagier shift
 * (docs/conventions.md), < prod tau_{d_i} exp(sum_{k>=1} q_k tau_{k+1}) >_g with q_k = -p_k and
 * p_k = (2k+1)!! y_k / y_0 the coefficients of exp(-sum s_j u^j) itself, so no logarithm is needed:
 * the kappa degree R = 3g-3+n-|d| is spread over extra points tau_{k+1} (a partition of R into
 * parts k <= K), each partition weighted by prod_k q_k^{e_k} / e_k!.  One walk over the partitions
 * of R serves every row of psi degree 3g-3+n-R.  For a rational curve the weights are rationals
 * carried down the walk; otherwise each leaf only records the term corr / prod e_k! times the
 * monomial prod Q_k^{e_k} in one formal variable per time, and each row's polynomial in the Q_k is
 * composed with the q_k once at the end (adding every leaf's product of polynomials into a large
 * accumulator cost a pass over the accumulator per leaf).  When only s_1 is nonzero up to the
 * polynomial-time volume engine gives int psi^a kappa_1^{D-|a|}/(D-|a|)! instead (g >= 2, n <= 6).
 * A Bessel-type curve runs the same walk with Theta: int Theta exp(sum s_j kappa_j) psi^d is
 * < Theta | prod tau_{d_i} exp(sum_{k>=1} q_k tau_k) >_g (the shift of theta_kappa_shift: one psi at
 * each forgotten point belongs to Theta, so the extra points carry tau_k), of degree D = g-1.
 */
#include <stdatomic.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>
#include <flint/fmpq_mpoly.h>
#include "volumes/wpoly.h"
#include "spectral.h"

typedef struct {
    sp_table *out;
    wk_table *Tw;
    atomic_int *cancel;
    slong g, n, D, kmax;       /* D: the degree of the classes, sp_curve_degree */
    int bessel;                /* Theta-psi numbers from Tt, extra points tau_k (not tau_{k+1}) */
    theta_table *Tt;
    fmpq_mpoly_struct *q;      /* q[k] = -p_k, k = 1..kmax */
    slong *e;                  /* e[k]: multiplicity of tau_{k+1} chosen so far */
    slong *key;                /* correlator key, n + D entries */
    slong *start, *idx;        /* rows of psi degree m: idx[start[m] .. start[m+1]-1] */
    fmpq_t corr, c;
    const fmpq_mpoly_ctx_struct *ctx;
    int rational;              /* every q_k is a rational number: the walk runs on fmpq */
    fmpq *qq;                  /* q_k as rationals (rational walk) */
    fmpq *acc;                 /* row sums (rational walk) */
    fmpq_mpoly_ctx_t qctx;     /* symbolic walk: one variable Q_v per nonzero q_k */
    slong nq, *qvar;           /* qvar[k] = v, or -1 when q_k = 0 */
    ulong *qexp;               /* exponent scratch, nq entries */
    fmpq_mpoly_struct *B;      /* per row: sum over leaves of corr prod Q^e / e! */
} sp_walk;

/* x = x / c for a word-size c > 0 (FLINT has no fmpq_div_si in every version we build on). */
static void sp_fmpq_div_si(fmpq_t x, slong c)
{
    fmpz_mul_si(fmpq_denref(x), fmpq_denref(x), c);
    fmpq_canonicalise(x);
}

/* Adds the leaf's term to every row d of psi degree D - R: corr * Pq in the rational walk (Pq =
   prod q_k^{e_k}/e_k!), else the term (corr / prod e_k!) prod Q_v^{e_k} of the row's polynomial
   in the Q variables, substituted once at the end.  Returns SP_OK, SP_LIMIT or SP_CANCELLED. */
static int sp_walk_leaf(sp_walk *W, slong R, const fmpq_t Pq)
{
    slong m = W->D - R, r, k, c, len;
    if (W->cancel && *W->cancel)
        return SP_CANCELLED;
    for (r = W->start[m]; r < W->start[m + 1]; r++) {
        slong row = W->idx[r];
        memcpy(W->key, W->out->d + row * W->n, (size_t) W->n * sizeof(slong));
        for (k = 1, len = W->n; k <= W->kmax; k++)
            for (c = 0; c < W->e[k]; c++)
                W->key[len++] = W->bessel ? k : k + 1;
        int st = W->bessel ? theta_correlator(W->corr, W->Tt, W->g, W->key, len)
                           : wk_table_correlator(W->corr, W->Tw, W->g, W->key, len);
        if (st != WK_OK)
            return st == WK_CANCELLED ? SP_CANCELLED : SP_LIMIT;
        if (fmpq_is_zero(W->corr))
            continue;
        if (W->rational) {
            fmpq_addmul(W->acc + row, Pq, W->corr);
            continue;
        }
        fmpq_set(W->c, W->corr);
        for (k = 1; k <= W->kmax; k++)
            if (W->qvar[k] >= 0) {
                W->qexp[W->qvar[k]] = (ulong) W->e[k];
                for (c = 2; c <= W->e[k]; c++)
                    sp_fmpq_div_si(W->c, c);
            }
        fmpq_mpoly_push_term_fmpq_ui(W->B + row, W->c, W->qexp, W->qctx);
    }
    return SP_OK;
}

/* Walks the parts k, k-1, ..., 1 with remaining weight R0 - (chosen weight) = R, Pq the product
   so far in the rational walk (prod over chosen parts of q_k^{e_k}/e_k!).  Recursion depth at
   most R0. */
static int sp_walk_parts(sp_walk *W, slong R0, slong k, slong R, const fmpq_t Pq)
{
    slong e;
    int st = SP_OK;
    fmpq_t Qq;
    if (R == 0)
        return sp_walk_leaf(W, R0, Pq);
    if (k > R)
        k = R;
    while (k > 0 && W->qvar[k] < 0)
        k--;
    if (k == 0)
        return SP_OK;
    fmpq_init(Qq);
    fmpq_set(Qq, Pq);
    for (e = 0; st == SP_OK && e * k <= R; e++) {
        if (e > 0 && W->rational) {
            fmpq_mul(Qq, Qq, W->qq + k);
            sp_fmpq_div_si(Qq, e);
        }
        W->e[k] = e;
        st = sp_walk_parts(W, R0, k - 1, R - e * k, Qq);
    }
    W->e[k] = 0;
    fmpq_clear(Qq);
    return st;
}
/* Groups the rows of W->out with psi degree |d| <= W->D by that degree (counting sort into
   start/idx; the other rows stay zero).  Returns SP_LIMIT when memory runs out. */
static int sp_walk_group_rows(sp_walk *W)
{
    slong r, j, m, *fill;
    const sp_table *T = W->out;
    W->start = calloc((size_t) W->D + 2, sizeof(slong));
    W->idx = malloc((size_t) (T->len > 0 ? T->len : 1) * sizeof(slong));
    fill = calloc((size_t) W->D + 2, sizeof(slong));
    if (W->start == NULL || W->idx == NULL || fill == NULL) {
        free(fill);
        return SP_LIMIT;
    }
    for (r = 0; r < T->len; r++) {
        for (j = 0, m = 0; j < T->n; j++)
            m += T->d[r * T->n + j];
        if (m <= W->D)
            W->start[m + 1]++;
    }
    for (m = 0; m <= W->D; m++)
        W->start[m + 1] += W->start[m];
    for (r = 0; r < T->len; r++) {
        for (j = 0, m = 0; j < T->n; j++)
            m += T->d[r * T->n + j];
        if (m <= W->D)
            W->idx[W->start[m] + fill[m]++] = r;
    }
    free(fill);
    return SP_OK;
}

/* Sets up the times of the walk: q_k = -p_k, their rational values when all are rational, and
   one variable Q_v of W->qctx per nonzero q_k (W->qvar) for the symbolic walk. */
static void sp_walk_times(sp_walk *W, const fmpq_mpoly_struct *y, slong K, const fmpq_mpoly_ctx_t ctx)
{
    slong k;
    W->q = flint_malloc((size_t) (W->D + 1) * sizeof(fmpq_mpoly_struct));
    for (k = 0; k <= W->D; k++)
        fmpq_mpoly_init(W->q + k, ctx);
    sp_shift_times_kind(W->q, W->D, W->bessel ? SP_CURVE_BESSEL : SP_CURVE_AIRY, y, K, ctx);
    W->rational = 1;
    W->qvar = malloc((size_t) (W->D + 1) * sizeof(slong));
    for (k = 0; k <= W->D; k++) {
        fmpq_mpoly_neg(W->q + k, W->q + k, ctx);
        W->rational &= fmpq_mpoly_is_fmpq(W->q + k, ctx);
        W->qvar[k] = (k >= 1 && k <= W->kmax && !fmpq_mpoly_is_zero(W->q + k, ctx)) ? W->nq++ : -1;
    }
    W->qq = _fmpq_vec_init(W->D + 1);
    for (k = 0; W->rational && k <= W->D; k++)
        fmpq_mpoly_get_fmpq(W->qq + k, W->q + k, ctx);
    fmpq_mpoly_ctx_init(W->qctx, W->nq > 0 ? W->nq : 1, ORD_LEX);
    W->qexp = calloc((size_t) (W->nq > 0 ? W->nq : 1), sizeof(ulong));
}

/* Symbolic walk, last step: out[row] = B[row] with Q_v -> q_k (one composition per row).
   Returns SP_OK, or SP_LIMIT when FLINT refuses the composition (exponent overflow). */
static int sp_walk_substitute(sp_walk *W)
{
    slong k, r;
    int st = SP_OK;
    fmpq_mpoly_struct **C = flint_malloc((size_t) (W->nq > 0 ? W->nq : 1) * sizeof(fmpq_mpoly_struct *));
    fmpq_mpoly_struct zero;
    fmpq_mpoly_init(&zero, W->ctx);
    C[0] = &zero;                                     /* the unused variable when nq = 0 */
    for (k = 1; k <= W->kmax; k++)
        if (W->qvar[k] >= 0)
            C[W->qvar[k]] = W->q + k;
    for (r = 0; r < W->out->len && st == SP_OK; r++) {
        fmpq_mpoly_sort_terms(W->B + r, W->qctx);
        fmpq_mpoly_combine_like_terms(W->B + r, W->qctx);
        if (!fmpq_mpoly_compose_fmpq_mpoly(W->out->c + r, W->B + r, C, W->qctx, W->ctx))
            st = SP_LIMIT;
    }
    fmpq_mpoly_clear(&zero, W->ctx);
    flint_free(C);
    return st;
}

/* Releases what sp_walk_times and sp_int_by_shift allocated. */
static void sp_walk_clear(sp_walk *W)
{
    slong k;
    for (k = 0; k <= W->D; k++)
        fmpq_mpoly_clear(W->q + k, W->ctx);
    flint_free(W->q);
    _fmpq_vec_clear(W->qq, W->D + 1);
    for (k = 0; W->B != NULL && k < W->out->len; k++)
        fmpq_mpoly_clear(W->B + k, W->qctx);
    flint_free(W->B);
    fmpq_mpoly_ctx_clear(W->qctx);
    if (W->acc != NULL)
        _fmpq_vec_clear(W->acc, W->out->len);
    fmpq_clear(W->corr), fmpq_clear(W->c);
    free(W->qvar), free(W->qexp), free(W->e), free(W->key), free(W->start), free(W->idx);
}

/* Fills the rows of out with int exp(sum s kappa) psi^d (times Theta for the Bessel kind) by the
   shift: one walk per kappa degree R.  out has its rows (all zero); y is a checked curve. */
static int sp_int_by_shift(sp_table *out, int kind, const fmpq_mpoly_struct *y, slong K, wk_table *Tw,
                           theta_table *Tt, const sp_options *o, const fmpq_mpoly_ctx_t ctx)
{
    sp_walk W;
    slong k, R;
    int st;
    fmpq_t one;
    memset(&W, 0, sizeof W);
    W.out = out, W.Tw = Tw, W.cancel = o->cancel, W.ctx = ctx;
    W.g = out->g, W.n = out->n, W.D = sp_curve_degree(kind, out->g, out->n);
    W.bessel = kind == SP_CURVE_BESSEL, W.Tt = Tt;
    if (W.D < 0)
        return SP_OK;                                 /* Theta vanishes in genus 0 */
    W.kmax = K < W.D ? K : W.D;
    sp_walk_times(&W, y, K, ctx);
    if (W.rational) {
        W.acc = _fmpq_vec_init(out->len);
    } else {
        W.B = flint_malloc((size_t) out->len * sizeof(fmpq_mpoly_struct));
        for (k = 0; k < out->len; k++)
            fmpq_mpoly_init(W.B + k, W.qctx);
    }
    W.e = calloc((size_t) W.D + 1, sizeof(slong));
    W.key = malloc((size_t) (W.n + W.D + 1) * sizeof(slong));
    st = (W.e == NULL || W.key == NULL || W.qvar == NULL || W.qexp == NULL) ? SP_LIMIT : sp_walk_group_rows(&W);
    fmpq_init(W.corr), fmpq_init(W.c), fmpq_init(one);
    fmpq_one(one);
    for (R = 0; st == SP_OK && R <= W.D; R++)
        if (W.start[W.D - R + 1] > W.start[W.D - R])
            st = sp_walk_parts(&W, R, W.kmax, R, one);
    for (k = 0; st == SP_OK && W.rational && k < out->len; k++)
        fmpq_mpoly_set_fmpq(out->c + k, W.acc + k, ctx);
    if (st == SP_OK && !W.rational)
        st = sp_walk_substitute(&W);
    fmpq_clear(one);
    sp_walk_clear(&W);
    return st;
}

/* 1 when s_j = 0 for 2 <= j <= D, so that exp(sum s kappa) = exp(s_1 kappa_1) up to the dimension;
   then s1 = s_1. */
static int sp_int_only_kappa1(fmpq_mpoly_t s1, const fmpq_mpoly_struct *y, slong K, slong D,
                              const fmpq_mpoly_ctx_t ctx)
{
    slong j;
    int ok = 1;
    fmpq_mpoly_struct *s = flint_malloc((size_t) (D + 1) * sizeof(fmpq_mpoly_struct));
    for (j = 0; j <= D; j++)
        fmpq_mpoly_init(s + j, ctx);
    sp_times(s, D, y, K, ctx);
    for (j = 2; j <= D && ok; j++)
        ok = fmpq_mpoly_is_zero(s + j, ctx);
    fmpq_mpoly_set(s1, s + 1, ctx);
    for (j = 0; j <= D; j++)
        fmpq_mpoly_clear(s + j, ctx);
    flint_free(s);
    return ok;
}

/* Fills the rows of out from the volume engine: W_a s_1^{D-|a|}, W_a = int psi^a kappa_1^{D-|a|}/(D-|a|)!.
   Returns SP_LIMIT when the engine refuses or the rows differ from its indices. */
static int sp_int_by_volumes(sp_table *out, const fmpq_mpoly_t s1, const sp_options *o,
                             const fmpq_mpoly_ctx_t ctx)
{
    slong g = out->g, n = out->n, D = 3 * g - 3 + n, len = wpoly_indices(NULL, g, n), r, j, m;
    slong *idx;
    fmpq *w;
    fmpq_mpoly_struct *pw;
    int st;
    if (len != out->len)
        return SP_LIMIT;
    idx = malloc((size_t) len * (size_t) n * sizeof(slong));
    if (idx == NULL)
        return SP_LIMIT;
    wpoly_indices(idx, g, n);
    w = _fmpq_vec_init(len);
    st = memcmp(idx, out->d, (size_t) len * (size_t) n * sizeof(slong)) != 0 ? SP_LIMIT
         : wpoly_coeffs(w, g, n, o->threads > 0 ? o->threads : 1) == WPVOL_OK ? SP_OK : SP_LIMIT;
    pw = flint_malloc((size_t) (D + 1) * sizeof(fmpq_mpoly_struct));
    for (j = 0; j <= D; j++) {
        fmpq_mpoly_init(pw + j, ctx);
        if (j == 0)
            fmpq_mpoly_one(pw, ctx);
        else
            fmpq_mpoly_mul(pw + j, pw + j - 1, s1, ctx);
    }
    for (r = 0; st == SP_OK && r < len; r++) {
        for (j = 0, m = 0; j < n; j++)
            m += out->d[r * n + j];
        fmpq_mpoly_scalar_mul_fmpq(out->c + r, pw + (D - m), w + r, ctx);
    }
    for (j = 0; j <= D; j++)
        fmpq_mpoly_clear(pw + j, ctx);
    flint_free(pw);
    _fmpq_vec_clear(w, len);
    free(idx);
    return st;
}

/* Multiplies every row by (-1)^n y_0^{2-2g-n} prod (2d_i+1)!!: intersection numbers -> W[d]. */
static void sp_int_normalise(sp_table *out, const fmpq_mpoly_struct *y, const fmpq_mpoly_ctx_t ctx)
{
    slong r, j, i;
    fmpq_t y0, f;
    fmpz_t df;
    fmpq_init(y0);
    fmpq_init(f);
    fmpz_init(df);
    fmpq_mpoly_get_fmpq(y0, y + 0, ctx);
    for (r = 0; r < out->len; r++) {
        fmpq_pow_si(f, y0, 2 - 2 * out->g - out->n);
        if (out->n % 2)
            fmpq_neg(f, f);
        for (j = 0; j < out->n; j++) {
            fmpz_one(df);
            for (i = 3; i <= 2 * out->d[r * out->n + j] + 1; i += 2)
                fmpz_mul_ui(df, df, (ulong) i);
            fmpq_mul_fmpz(f, f, df);
        }
        fmpq_mpoly_scalar_mul_fmpq(out->c + r, out->c + r, f, ctx);
    }
    fmpz_clear(df);
    fmpq_clear(f);
    fmpq_clear(y0);
}

/* See spectral.h. */
int sp_omega_shift(sp_table *out, slong g, slong n, const fmpq_mpoly_struct *y, slong K,
                   wk_table *Tw, const sp_options *o, const fmpq_mpoly_ctx_t ctx)
{
    return sp_omega_shift_kind(out, SP_CURVE_AIRY, g, n, y, K, Tw, o, ctx);
}

/* See spectral.h.  The volume engine serves only the Airy kind; a Bessel-type curve without the
   caller's Theta table gets a private one for the call. */
int sp_omega_shift_kind(sp_table *out, int kind, slong g, slong n, const fmpq_mpoly_struct *y, slong K,
                        wk_table *Tw, const sp_options *o, const fmpq_mpoly_ctx_t ctx)
{
    sp_options def;
    fmpq_mpoly_t s1;
    theta_table *Tt = NULL;
    int st, vol = 0, bessel = kind == SP_CURVE_BESSEL;
    if (o == NULL) {
        sp_options_default(&def);
        o = &def;
    }
    if (out == NULL || (!bessel && Tw == NULL) || (kind != SP_CURVE_AIRY && !bessel))
        return SP_BADARG;
    sp_table_clear(out, ctx);
    st = sp_curve_check(y, K, ctx);
    if (st == SP_OK)
        st = sp_table_make_rows(out, g, n, ctx);
    if (st == SP_OK && o->max_terms > 0 && sp_shift_estimate_kind(kind, g, n, K) > o->max_terms)
        st = SP_LIMIT;
    if (st == SP_OK && bessel && (Tt = o->theta) == NULL) {
        Tt = theta_table_new(THETA_ROUTE_VIRASORO);
        if (Tt == NULL)
            st = SP_LIMIT;
        else
            theta_table_set_cancel(Tt, o->cancel);
    }
    if (st != SP_OK) {
        sp_table_clear(out, ctx);
        return st;
    }
    fmpq_mpoly_init(s1, ctx);
    if (!bessel && !o->force_shift && g >= 2 && n <= WPOLY_MAX_POINTS
        && sp_int_only_kappa1(s1, y, K, 3 * g - 3 + n, ctx))
        vol = sp_int_by_volumes(out, s1, o, ctx) == SP_OK;
    fmpq_mpoly_clear(s1, ctx);
    if (!vol) {
        for (slong r = 0; r < out->len; r++)
            fmpq_mpoly_zero(out->c + r, ctx);
        st = sp_int_by_shift(out, kind, y, K, Tw, Tt, o, ctx);
    }
    if (Tt != o->theta)
        theta_table_free(Tt);
    if (st == SP_OK)
        sp_int_normalise(out, y, ctx);
    else
        sp_table_clear(out, ctx);
    return st;
}

/* Partitions of every m <= D into parts <= kmax (cnt) and into at most n parts (rows), in
   doubles; see spectral.h. */
double sp_shift_estimate(slong g, slong n, slong K)
{
    return sp_shift_estimate_kind(SP_CURVE_AIRY, g, n, K);
}

double sp_shift_estimate_kind(int kind, slong g, slong n, slong K)
{
    slong D = sp_curve_degree(kind, g, n), m, k, j;
    double *cnt, *rows, total = 0.0;
    if (g < 0 || n < 1 || D < 0 || 3 * g - 3 + n > SP_MAX_DIM || n > SP_MAX_DIM)
        return D < 0 ? 0.0 : HUGE_VAL;
    cnt = calloc((size_t) D + 1, sizeof(double));
    rows = calloc((size_t) D + 1, sizeof(double));
    if (cnt == NULL || rows == NULL) {
        free(cnt), free(rows);
        return HUGE_VAL;
    }
    cnt[0] = rows[0] = 1.0;
    for (k = 1; k <= D && k <= K; k++)
        for (m = k; m <= D; m++)
            cnt[m] += cnt[m - k];
    for (j = 1; j <= n && j <= D; j++)        /* partitions into parts <= n = into <= n parts */
        for (m = j; m <= D; m++)
            rows[m] += rows[m - j];
    for (m = 0; m <= D; m++)
        total += rows[m] * cnt[D - m];
    free(cnt), free(rows);
    return total > 1e18 ? HUGE_VAL : total;
}

/* See spectral.h. */
int sp_shift_uses_volumes(slong g, slong n, const fmpq_mpoly_struct *y, slong K, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_t s1;
    int r;
    if (g < 2 || n < 1 || n > WPOLY_MAX_POINTS || 3 * g - 3 + n > SP_MAX_DIM || sp_curve_check(y, K, ctx) != SP_OK)
        return 0;
    fmpq_mpoly_init(s1, ctx);
    r = sp_int_only_kappa1(s1, y, K, 3 * g - 3 + n, ctx);
    fmpq_mpoly_clear(s1, ctx);
    return r;
}
