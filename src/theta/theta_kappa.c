/* theta_kappa.c - kappa classes against Theta: the pushforward formula and the time shift.
 *
 * Pushforward.  Let pi: Mbar_{g,n+m} -> Mbar_{g,n} forget the last m points.  Iterating
 * Theta_{g,n+1} = psi_{n+1} pi^* Theta_{g,n} gives Theta_{g,n+m} = psi_{n+1}..psi_{n+m} pi^* Theta_{g,n}
 * (each step uses psi_{n+j} D_{n+i,n+j} = 0, as in theta_key.c).  The pushforward
 *     pi_*(psi_{n+1}^{b_1+1} .. psi_{n+m}^{b_m+1}) = sum_{sigma in S_m} prod_{cycles c} kappa_{b(c)}
 * (E. Arbarello, M. Cornalba, J. Algebraic Geom. 5 (1996) 705-749; docs/conventions.md) and the
 * projection formula give
 *     int_{g,n} Theta psi^d pi_*(prod psi_{n+j}^{b_j+1}) = int_{g,n+m} pi^*(Theta psi^d) prod psi_{n+j}^{b_j+1}.
 * Here pi^* psi_i differs from psi_i by divisors where i lies on a rational tail carrying only
 * forgotten points T; on such a divisor prod_{j in T} psi_{n+j}^{b_j+1} restricts to a class of
 * degree >= |T| on the tail's Mbar_{0,|T|+2}, of dimension |T|-1, so it vanishes and pi^* psi_i may
 * be replaced by psi_i.  One power psi_{n+j} of each forgotten point is taken by Theta_{g,n+m}:
 *     int_{g,n} Theta psi^d pi_*(prod psi_{n+j}^{b_j+1}) = <Theta | tau_d tau_{b_1} .. tau_{b_m}>_g ,
 * the forgotten points carrying one psi less than in the psi-only formula.  Inverting the sum over
 * permutations as in the psi-only case,
 *     int Theta psi^d prod_j kappa_{b_j} = sum over set partitions P of (-1)^{m-|P|}
 *                                          <Theta | tau_d prod_{B in P} tau_{b_B}>_g .
 * With b = 0 this is the tau_0 equation, consistent with kappa_0 = 2g-2+n.  Set partitions are
 * enumerated by the block of one factor of the largest remaining index, the other members of the
 * block chosen by type with binomial counts (each choice stands for that many set partitions).
 *
 * Time shift.  Summing the formula over exp(sum_j s_j kappa_j) by the exponential formula gives
 *     int Theta psi^d exp(sum_j s_j kappa_j) = <Theta | tau_d exp(-sum_{k>=1} p_k(s) tau_k)>_g ,
 *     exp(-sum_j s_j z^j) = sum_k p_k(s) z^k ,
 * as for Witten-Kontsevich numbers (Kaufmann-Manin-Zagier 1996) but with tau_k in place of
 * tau_{k+1}.  theta_kappa_shift extracts coefficients of this identity; it shares nothing with the
 * set-partition enumeration except the correlators.
 */
#include <stdlib.h>
#include <flint/fmpq_mpoly.h>
#include "theta_internal.h"

typedef struct {
    theta_table *T;
    slong g, kmax, klen, count, max_terms;
    slong *key, *rem, *beta;   /* key: d then block sums; beta: kmax+1 entries per level */
    fmpq_t acc;
} theta_pf;

static int pf_recurse(theta_pf *P, slong level, const fmpz_t coeff);

/* Evaluates one block choice for the block holding a factor of index t0 (beta = the others).
   Updates rem and key, recurses, and restores them. */
static int pf_take_block(theta_pf *P, slong level, slong t0, const slong *beta, const fmpz_t coeff)
{
    slong j, size = 0, sum = t0;
    int st;
    fmpz_t c, b;
    fmpz_init(c);
    fmpz_init(b);
    fmpz_set(c, coeff);
    for (j = 1; j <= P->kmax; j++) {
        fmpz_bin_uiui(b, (ulong) (P->rem[j] - (j == t0)), (ulong) beta[j]);
        fmpz_mul(c, c, b);
        size += beta[j];
        sum += j * beta[j];
    }
    if (size % 2)
        fmpz_neg(c, c);
    for (j = 1; j <= P->kmax; j++)
        P->rem[j] -= beta[j] + (j == t0);
    P->key[P->klen++] = sum;
    st = pf_recurse(P, level + 1, c);
    P->klen--;
    for (j = 1; j <= P->kmax; j++)
        P->rem[j] += beta[j] + (j == t0);
    fmpz_clear(c);
    fmpz_clear(b);
    return st;
}

/* Leaf of the enumeration: acc += coeff * <Theta | tau_key>_g.
   Counts leaves against max_terms (WK_LIMIT beyond it). */
static int pf_leaf(theta_pf *P, const fmpz_t coeff)
{
    fmpq_t v;
    int st;
    if (P->max_terms > 0 && ++P->count > P->max_terms)
        return WK_LIMIT;
    if (P->T->cancel && *P->T->cancel)
        return WK_CANCELLED;
    fmpq_init(v);
    st = theta_correlator(v, P->T, P->g, P->key, P->klen);
    fmpq_mul_fmpz(v, v, coeff);
    fmpq_add(P->acc, P->acc, v);
    fmpq_clear(v);
    return st;
}

/* Places the factor of largest remaining index in a block with every possible choice of
   companions (an odometer over types), or evaluates the leaf when nothing remains. */
static int pf_recurse(theta_pf *P, slong level, const fmpz_t coeff)
{
    slong t0 = P->kmax, j;
    slong *beta = P->beta + level * (P->kmax + 1);
    int st = WK_OK;
    while (t0 >= 1 && P->rem[t0] == 0)
        t0--;
    if (t0 == 0)
        return pf_leaf(P, coeff);
    for (j = 0; j <= P->kmax; j++)
        beta[j] = 0;
    for (;;) {
        st = pf_take_block(P, level, t0, beta, coeff);
        for (j = 1; st == WK_OK && j <= P->kmax; j++) {
            if (beta[j] < P->rem[j] - (j == t0)) {
                beta[j]++;
                break;
            }
            beta[j] = 0;
        }
        if (st != WK_OK || j > P->kmax)
            return st;
    }
}

/* Kappa degree sum_{j>=1} j kmult[j] if every multiplicity is sane and d sums to g-1-K >= 0;
   -1 for bad input, -2 when the degrees cannot match (the integral is 0). */
static slong theta_kappa_degree(slong g, const slong *d, slong n, const slong *kmult, slong kmax)
{
    slong j, K = 0, D = 0;
    if (kmax < 0 || (kmax > 0 && kmult == NULL) || n < 0 || (n > 0 && d == NULL))
        return -1;
    for (j = 1; j <= kmax; j++) {
        if (kmult[j] < 0)
            return -1;
        if (kmult[j] > g || K > g)
            return -2;
        K += j * kmult[j];
    }
    for (j = 0; j < n; j++) {
        if (d[j] < 0)
            return -1;
        D += d[j] > g ? g + 1 : d[j];
    }
    return (K + D == g - 1) ? K : -2;
}

/* Common checks: BADARG, UNSTABLE, LIMIT as for theta_correlator; *K receives the kappa degree,
   or -2 when the integral is zero by degree. */
int theta_kappa_check(slong *K, slong g, const slong *d, slong n, const slong *kmult, slong kmax)
{
    *K = -1;
    if (g < 0 || n < 0)
        return WK_BADARG;
    *K = theta_kappa_degree(g, d, n, kmult, kmax);
    if (*K == -1)
        return WK_BADARG;
    if ((g == 0 && n <= 2) || (g == 1 && n == 0))
        return WK_UNSTABLE;
    if (g > THETA_MAX_GENUS)
        return WK_LIMIT;
    return WK_OK;
}

/* Set-partition sum of the file comment (see theta.h).
   The enumeration allocates one beta row per level (at most m levels). */
int theta_kappa_pushforward(fmpq_t res, theta_table *T, slong g, const slong *d, slong n,
                            const slong *kmult, slong kmax, slong max_terms)
{
    theta_pf P;
    slong K, m = 0, j;
    int st = theta_kappa_check(&K, g, d, n, kmult, kmax);
    fmpz_t one;
    fmpq_zero(res);
    if (st != WK_OK || K < 0)
        return T == NULL ? WK_BADARG : st;
    for (j = 1; j <= kmax; j++)
        m += kmult[j];
    P.T = T;
    P.g = g;
    P.kmax = kmax;
    P.klen = n;
    P.count = 0;
    P.max_terms = max_terms;
    P.key = malloc((size_t) (n + m + 1) * sizeof(slong));
    P.rem = malloc((size_t) (kmax + 1) * sizeof(slong));
    P.beta = malloc((size_t) ((m + 1) * (kmax + 1)) * sizeof(slong));
    st = (P.key == NULL || P.rem == NULL || P.beta == NULL) ? WK_LIMIT : WK_OK;
    for (j = 0; st == WK_OK && j < n; j++)
        P.key[j] = d[j];
    for (j = 0; st == WK_OK && j <= kmax; j++)
        P.rem[j] = j == 0 ? 0 : kmult[j];
    fmpq_init(P.acc);
    fmpz_init_set_ui(one, 1);
    if (st == WK_OK)
        st = pf_recurse(&P, 0, one);
    if (st == WK_OK)
        fmpq_set(res, P.acc);
    fmpz_clear(one);
    fmpq_clear(P.acc);
    free(P.key);
    free(P.rem);
    free(P.beta);
    return st;
}
