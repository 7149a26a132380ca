/* theta_shift.c - kappa integrals against Theta by the time shift (derived in theta_kappa.c):
 *     int Theta psi^d exp(sum_j s_j kappa_j) = <Theta | tau_d exp(-sum_{k>=1} p_k(s) tau_k)>_g ,
 * exp(-sum_j s_j z^j) = sum_k p_k(s) z^k.  Each p_k is weighted-homogeneous of degree k (s_j of
 * weight j), so the coefficient of s^m, of weight K = sum_j j m_j, collects the multisets of extra
 * points tau_{lambda_1} .. tau_{lambda_r} with lambda a partition of K, weighted by the coefficient
 * of s^m in prod_k (-p_k)^{e_k} / e_k! (e_k the multiplicity of k in lambda).
 */
#include <stdlib.h>
#include <flint/fmpq_mpoly.h>
#include "theta_internal.h"

/* Largest kappa degree theta_kappa_shift accepts (its polynomials grow with the partitions). */
#define THETA_SHIFT_MAX_DEGREE 60

typedef struct {
    theta_table *T;
    slong g, n, K, kmax, len;
    slong *key;               /* d then the parts of lambda */
    ulong *mono;              /* exponent vector of s^m */
    fmpq_mpoly_struct *p;     /* p_0 .. p_K */
    fmpq_mpoly_ctx_t ctx;
    fmpq_t acc;
} theta_ks;

/* p_0 = 1 and k p_k = -sum_{j=1}^{min(k,kmax)} j s_j p_{k-j} (from P' = -(sum j s_j z^{j-1}) P).
   The polynomials live in S->ctx, with one variable per kappa index 1..kmax. */
static void ks_fill_p(theta_ks *S)
{
    slong k, j;
    fmpq_mpoly_t t, v;
    fmpq_mpoly_init(t, S->ctx);
    fmpq_mpoly_init(v, S->ctx);
    fmpq_mpoly_one(S->p + 0, S->ctx);
    for (k = 1; k <= S->K; k++) {
        fmpq_mpoly_zero(S->p + k, S->ctx);
        for (j = 1; j <= k && j <= S->kmax; j++) {
            fmpq_mpoly_gen(v, j - 1, S->ctx);
            fmpq_mpoly_mul(t, v, S->p + k - j, S->ctx);
            fmpq_mpoly_scalar_mul_si(t, t, j, S->ctx);
            fmpq_mpoly_sub(S->p + k, S->p + k, t, S->ctx);
        }
        fmpq_mpoly_scalar_div_si(S->p + k, S->p + k, k, S->ctx);
    }
    fmpq_mpoly_clear(t, S->ctx);
    fmpq_mpoly_clear(v, S->ctx);
}

/* For the partition in key[n..len-1] (descending): acc += [s^m] prod_k (-p_k)^{e_k}/e_k! times
   <Theta | tau_key>_g.  Returns the correlator's status. */
static int ks_leaf(theta_ks *S)
{
    slong i = S->n, j;
    int st = WK_OK;
    fmpq_mpoly_t P, q;
    fmpq_t c, v;
    fmpq_mpoly_init(P, S->ctx);
    fmpq_mpoly_init(q, S->ctx);
    fmpq_init(c);
    fmpq_init(v);
    fmpq_mpoly_one(P, S->ctx);
    while (i < S->len) {
        for (j = i; j < S->len && S->key[j] == S->key[i]; j++)
            ;
        fmpq_mpoly_neg(q, S->p + S->key[i], S->ctx);
        fmpq_mpoly_pow_ui(q, q, (ulong) (j - i), S->ctx);
        fmpq_mpoly_mul(P, P, q, S->ctx);
        fmpz_fac_ui(fmpq_numref(c), (ulong) (j - i));
        fmpq_mpoly_scalar_div_fmpz(P, P, fmpq_numref(c), S->ctx);
        i = j;
    }
    fmpq_mpoly_get_coeff_fmpq_ui(c, P, S->mono, S->ctx);
    if (!fmpq_is_zero(c)) {
        st = theta_correlator(v, S->T, S->g, S->key, S->len);
        fmpq_addmul(S->acc, c, v);
    }
    fmpq_mpoly_clear(P, S->ctx);
    fmpq_mpoly_clear(q, S->ctx);
    fmpq_clear(c);
    fmpq_clear(v);
    return st;
}

/* Enumerates the partitions of rest into parts <= maxpart (appended to key), then ks_leaf. */
static int ks_partitions(theta_ks *S, slong rest, slong maxpart)
{
    slong k;
    int st = WK_OK;
    if (rest == 0)
        return ks_leaf(S);
    if (S->T->cancel && *S->T->cancel)
        return WK_CANCELLED;
    for (k = rest < maxpart ? rest : maxpart; st == WK_OK && k >= 1; k--) {
        S->key[S->len++] = k;
        st = ks_partitions(S, rest - k, k);
        S->len--;
    }
    return st;
}

/* Sets up the polynomials and the exponent vector of s^m for a kappa degree K.
   Returns WK_LIMIT when memory runs out (S is then safe to release with ks_clear). */
static int ks_init(theta_ks *S, theta_table *T, slong g, const slong *d, slong n, const slong *kmult,
                   slong kmax, slong K)
{
    slong j;
    S->T = T;
    S->g = g;
    S->n = n;
    S->K = K;
    S->kmax = kmax;
    S->len = n;
    fmpq_mpoly_ctx_init(S->ctx, kmax, ORD_LEX);
    fmpq_init(S->acc);
    S->key = malloc((size_t) (n + K + 1) * sizeof(slong));
    S->mono = malloc((size_t) kmax * sizeof(ulong));
    S->p = malloc((size_t) (K + 1) * sizeof(fmpq_mpoly_struct));
    if (S->key == NULL || S->mono == NULL || S->p == NULL)
        return WK_LIMIT;
    for (j = 0; j < n; j++)
        S->key[j] = d[j];
    for (j = 0; j < kmax; j++)
        S->mono[j] = (ulong) kmult[j + 1];
    for (j = 0; j <= K; j++)
        fmpq_mpoly_init(S->p + j, S->ctx);
    ks_fill_p(S);
    return WK_OK;
}

/* Releases what ks_init allocated (also after a failed init). */
static void ks_clear(theta_ks *S)
{
    slong j;
    if (S->p != NULL)
        for (j = 0; j <= S->K; j++)
            fmpq_mpoly_clear(S->p + j, S->ctx);
    free(S->p);
    free(S->key);
    free(S->mono);
    fmpq_clear(S->acc);
    fmpq_mpoly_ctx_clear(S->ctx);
}

/* The integral of theta_kappa_pushforward by the time shift (see theta.h).
   Refuses kappa degrees above THETA_SHIFT_MAX_DEGREE with WK_LIMIT. */
int theta_kappa_shift(fmpq_t res, theta_table *T, slong g, const slong *d, slong n,
                      const slong *kmult, slong kmax)
{
    theta_ks S;
    slong K, j;
    int st = theta_kappa_check(&K, g, d, n, kmult, kmax);
    fmpz_t f;
    fmpq_zero(res);
    if (T == NULL)
        return WK_BADARG;
    if (st != WK_OK || K < 0)
        return st;
    if (K == 0)
        return theta_correlator(res, T, g, d, n);
    if (K > THETA_SHIFT_MAX_DEGREE)
        return WK_LIMIT;
    st = ks_init(&S, T, g, d, n, kmult, kmax, K);
    if (st == WK_OK)
        st = ks_partitions(&S, K, K);
    fmpz_init(f);
    for (j = 1; st == WK_OK && j <= kmax; j++) {
        fmpz_fac_ui(f, (ulong) kmult[j]);
        fmpq_mul_fmpz(S.acc, S.acc, f);
    }
    if (st == WK_OK)
        fmpq_set(res, S.acc);
    fmpz_clear(f);
    ks_clear(&S);
    return st;
}
