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
 * With b = 0 this is the tau_0 equation, consistent with kappa_0 = 2g-2+n.  Equal kappa indices
 * are grouped as in src/engines/correlators/pushforward.c: a multiset partition (blocks beta, vectors of
 * counts per kappa index, listed in non-increasing lexicographic order) stands for
 * prod_j M_j! / (prod_blocks prod_j beta_j! * prod_{equal blocks} repetitions!) set partitions,
 * all of sign (-1)^(m - #blocks), so kappa_1^m costs one term per partition of m.
 *
 * Time shift.  Summing the formula over exp(sum_j s_j kappa_j) by the exponential formula gives
 *     int Theta psi^d exp(sum_j s_j kappa_j) = <Theta | tau_d exp(-sum_{k>=1} p_k(s) tau_k)>_g ,
 *     exp(-sum_j s_j z^j) = sum_k p_k(s) z^k ,
 * as for Witten-Kontsevich numbers (Kaufmann-Manin-Zagier 1996) but with tau_k in place of
 * tau_{k+1}.  theta_kappa_shift extracts coefficients of this identity; it shares nothing with the
 * set-partition enumeration except the correlators.
 */
#include <string.h>
#include <stdlib.h>
#include <flint/fmpq_mpoly.h>
#include "theta_internal.h"

typedef struct {
    theta_term_fn fn;
    void *data;
    slong g, t, m, klen, count, max_terms;
    slong *idx, *M, *rem;      /* kappa index and multiplicity of each type, factors left */
    slong *blk;                /* block of level l at blk + l*t */
    slong *key;                /* d, then the block sums */
    fmpz_t numer;              /* prod_j M_j! */
} theta_pf;

static int pf_recurse(theta_pf *P, slong level);

/* Leaf: the multiset partition blk[0..nb-1] stands for prod M_j! / (prod_blocks prod_j beta_j!
   prod_{equal blocks} rep!) set partitions, each with sign (-1)^(m - nb). */
static int pf_leaf(theta_pf *P, slong nb)
{
    slong l, j, rep = 1;
    int st;
    fmpz_t c, den, f;
    if (P->max_terms > 0 && ++P->count > P->max_terms)
        return WK_LIMIT;
    fmpz_init(c);
    fmpz_init_set_ui(den, 1);
    fmpz_init(f);
    for (l = 0; l < nb; l++) {
        for (j = 0; j < P->t; j++) {
            fmpz_fac_ui(f, (ulong) P->blk[l * P->t + j]);
            fmpz_mul(den, den, f);
        }
        rep = (l > 0 && memcmp(P->blk + l * P->t, P->blk + (l - 1) * P->t, (size_t) P->t * sizeof(slong)) == 0)
                  ? rep + 1 : 1;
        fmpz_mul_ui(den, den, (ulong) rep);       /* accumulates rep! over each run */
    }
    fmpz_divexact(c, P->numer, den);
    if ((P->m - nb) % 2)
        fmpz_neg(c, c);
    st = P->fn(P->data, P->g, P->key, P->klen, c);
    fmpz_clear(c);
    fmpz_clear(den);
    fmpz_clear(f);
    return st;
}

/* Whether block a (length t) is lexicographically <= block b. */
static int pf_lex_le(const slong *a, const slong *b, slong t)
{
    slong j;
    for (j = 0; j < t; j++)
        if (a[j] != b[j])
            return a[j] < b[j];
    return 1;
}

/* Uses the block at this level (already written): updates rem and key, recurses, restores. */
static int pf_use_block(theta_pf *P, slong level)
{
    slong j, sum = 0, *b = P->blk + level * P->t;
    int st;
    for (j = 0; j < P->t; j++) {
        P->rem[j] -= b[j];
        sum += b[j] * P->idx[j];
    }
    P->key[P->klen++] = sum;
    st = pf_recurse(P, level + 1);
    P->klen--;
    for (j = 0; j < P->t; j++)
        P->rem[j] += b[j];
    return st;
}

/* Chooses the block of this level among the nonzero vectors beta <= rem, lexicographically at most
   the previous block, so that each multiset partition is met once. */
static int pf_recurse(theta_pf *P, slong level)
{
    slong j, *b = P->blk + level * P->t;
    int st = WK_OK, any = 0;
    for (j = 0; j < P->t; j++)
        any |= P->rem[j] > 0;
    if (!any)
        return pf_leaf(P, level);
    for (j = 0; j < P->t; j++)
        b[j] = 0;
    for (;;) {
        for (j = 0; j < P->t; j++) {              /* odometer over 0 <= beta <= rem */
            if (b[j] < P->rem[j]) {
                b[j]++;
                break;
            }
            b[j] = 0;
        }
        if (j == P->t)
            return st;
        if (level == 0 || pf_lex_le(b, b - P->t, P->t))
            st = pf_use_block(P, level);
        if (st != WK_OK)
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

/* Fills the types of P (kappa index, multiplicity, factors left) and prod_j M_j!; P->idx, M and
   rem share one block of 3t slongs allocated by the caller. */
static void pf_setup_types(theta_pf *P, const slong *kmult, slong kmax)
{
    slong j, t = 0;
    fmpz_t f;
    fmpz_init(f);
    P->M = P->idx + P->t;
    P->rem = P->M + P->t;
    for (j = 1; j <= kmax; j++)
        if (kmult[j] > 0) {
            P->idx[t] = j;
            P->M[t] = P->rem[t] = kmult[j];
            fmpz_fac_ui(f, (ulong) kmult[j]);
            fmpz_mul(P->numer, P->numer, f);
            t++;
        }
    fmpz_clear(f);
}

/* Set-partition terms of the file comment grouped by multiset partition, handed to fn.
   The enumeration holds one block per level (at most m levels) for the t kappa types. */
int theta_kappa_terms(slong g, const slong *d, slong n, const slong *kmult, slong kmax, slong max_terms,
                      theta_term_fn fn, void *data)
{
    theta_pf P;
    slong K, j;
    int st = theta_kappa_check(&K, g, d, n, kmult, kmax);
    if (st != WK_OK || K < 0 || fn == NULL)
        return fn == NULL ? WK_BADARG : st;
    memset(&P, 0, sizeof P);
    P.fn = fn;
    P.data = data;
    P.g = g;
    P.klen = n;
    P.max_terms = max_terms;
    for (j = 1; j <= kmax; j++) {
        P.t += kmult[j] > 0;
        P.m += kmult[j];
    }
    P.idx = malloc((size_t) (3 * P.t + 1) * sizeof(slong));
    P.blk = malloc((size_t) ((P.m + 1) * (P.t + 1)) * sizeof(slong));
    P.key = malloc((size_t) (n + P.m + 1) * sizeof(slong));
    fmpz_init_set_ui(P.numer, 1);
    st = (P.idx == NULL || P.blk == NULL || P.key == NULL) ? WK_LIMIT : WK_OK;
    if (st == WK_OK) {
        pf_setup_types(&P, kmult, kmax);
        for (j = 0; j < n; j++)
            P.key[j] = d[j];
        st = pf_recurse(&P, 0);
    }
    fmpz_clear(P.numer);
    free(P.idx);
    free(P.blk);
    free(P.key);
    return st;
}

typedef struct {
    theta_table *T;
    fmpq_t acc;
} theta_pf_sum;

/* The evaluating term function of theta_kappa_pushforward: acc += coeff * <Theta | tau_key>_g. */
static int pf_sum_term(void *data, slong g, const slong *key, slong len, const fmpz_t coeff)
{
    theta_pf_sum *S = data;
    fmpq_t v;
    int st;
    if (S->T->cancel && *S->T->cancel)
        return WK_CANCELLED;
    fmpq_init(v);
    st = theta_correlator(v, S->T, g, key, len);
    fmpq_mul_fmpz(v, v, coeff);
    fmpq_add(S->acc, S->acc, v);
    fmpq_clear(v);
    return st;
}

/* The set-partition sum evaluated with the table T (see theta.h). */
int theta_kappa_pushforward(fmpq_t res, theta_table *T, slong g, const slong *d, slong n,
                            const slong *kmult, slong kmax, slong max_terms)
{
    theta_pf_sum S;
    int st;
    fmpq_zero(res);
    if (T == NULL)
        return WK_BADARG;
    S.T = T;
    fmpq_init(S.acc);
    st = theta_kappa_terms(g, d, n, kmult, kmax, max_terms, pf_sum_term, &S);
    if (st == WK_OK)
        fmpq_set(res, S.acc);
    fmpq_clear(S.acc);
    return st;
}
