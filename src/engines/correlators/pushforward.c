/* pushforward.c - kappa classes via the forgetful-map pushforward formula (see pushforward.h).
 *
 * Grouping: the m kappa factors form a multiset with t distinct indices (types).  A set partition
 * of the m labelled factors induces a multiset partition (a multiset of blocks, each block a vector
 * beta in [0, M]^t).  The number of set partitions inducing a given multiset partition is
 *     prod_j M_j! / ( prod_blocks prod_j beta_j!  *  prod_{distinct blocks} (repetitions)! ),
 * and the sign (-1)^{m-|P|} depends only on the number of blocks, so each multiset partition is
 * one term.  Multiset partitions are generated as block sequences beta^1 >= beta^2 >= ... in
 * lexicographic order, iteratively (no recursion, so huge inputs cannot exhaust the C stack).
 */
#include <stdatomic.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "pushforward.h"
#include "wk_internal.h"

/* State of the multiset-partition enumeration; every array is owned by the state. */
typedef struct {
    slong t, m;           /* number of kappa types, number of kappa factors */
    slong *kidx, *M;      /* kappa index and multiplicity of each type */
    slong *blocks;        /* block of level l at blocks + l*t (at most m levels) */
    slong *rem;           /* factors not yet placed before level l, at rem + l*t */
    const slong *d;       /* psi exponents (n of them) */
    slong n;
    slong *key;           /* scratch correlator key, n + m entries */
    fmpz_t numer;         /* prod_j M_j! */
    slong count, max_terms;
} pf_enum;

/* Initialises E as empty.
   Pairs with pf_expansion_clear. */
void pf_expansion_init(pf_expansion *E)
{
    E->g = 0;
    E->len = 0;
    E->alloc = 0;
    E->terms = NULL;
}

/* Frees every term and the term array; E stays a valid empty expansion.
   Safe to call repeatedly and on NULL. */
void pf_expansion_clear(pf_expansion *E)
{
    slong i;
    if (E == NULL)
        return;
    for (i = 0; i < E->len; i++) {
        fmpz_clear(E->terms[i].coeff);
        free(E->terms[i].d);
    }
    free(E->terms);
    E->terms = NULL;
    E->len = 0;
    E->alloc = 0;
}

/* qsort comparator for descending slong order.
   Comparison without subtraction avoids overflow. */
static int pf_cmp_slong_desc(const void *x, const void *y)
{
    slong a = *(const slong *) x, b = *(const slong *) y;
    return (a < b) - (a > b);
}

/* Appends coeff * <tau_key> (key of length len, already sorted) to E.
   Returns WK_OK or WK_LIMIT when memory runs out (E is unchanged then). */
static int pf_term_append(pf_expansion *E, const fmpz_t coeff, const slong *key, slong len)
{
    pf_term *tm;
    slong *d = malloc((size_t) (len + 1) * sizeof(slong));
    if (d == NULL)
        return WK_LIMIT;
    if (E->len == E->alloc) {
        slong na = E->alloc < 16 ? 16 : 2 * E->alloc;
        pf_term *nt = realloc(E->terms, (size_t) na * sizeof(pf_term));
        if (nt == NULL) {
            free(d);
            return WK_LIMIT;
        }
        E->terms = nt;
        E->alloc = na;
    }
    if (len > 0)
        memcpy(d, key, (size_t) len * sizeof(slong));
    tm = E->terms + E->len++;
    fmpz_init_set(tm->coeff, coeff);
    tm->n = len;
    tm->d = d;
    return WK_OK;
}

/* qsort comparator on terms: by length, then lexicographically on d.
   Brings equal correlators next to each other for merging. */
static int pf_term_cmp(const void *x, const void *y)
{
    const pf_term *a = x, *b = y;
    slong i;
    if (a->n != b->n)
        return (a->n > b->n) - (a->n < b->n);
    for (i = 0; i < a->n; i++)
        if (a->d[i] != b->d[i])
            return (a->d[i] > b->d[i]) - (a->d[i] < b->d[i]);
    return 0;
}

/* Sorts the terms, adds the coefficients of equal correlators and drops zero coefficients.
   Terms are moved by struct copy (an fmpz is a single word), duplicates are released. */
static void pf_terms_merge(pf_expansion *E)
{
    slong i, w = 0;
    if (E->len > 1)
        qsort(E->terms, (size_t) E->len, sizeof(pf_term), pf_term_cmp);
    for (i = 0; i < E->len; i++) {
        if (w > 0 && pf_term_cmp(E->terms + w - 1, E->terms + i) == 0) {
            fmpz_add(E->terms[w - 1].coeff, E->terms[w - 1].coeff, E->terms[i].coeff);
            fmpz_clear(E->terms[i].coeff);
            free(E->terms[i].d);
        } else {
            E->terms[w++] = E->terms[i];
        }
    }
    E->len = w;
    for (i = 0, w = 0; i < E->len; i++) {
        if (fmpz_is_zero(E->terms[i].coeff)) {
            fmpz_clear(E->terms[i].coeff);
            free(E->terms[i].d);
        } else {
            E->terms[w++] = E->terms[i];
        }
    }
    E->len = w;
}

/* Lexicographically largest block beta <= R componentwise and <= U lexicographically (U = NULL:
   no bound).  Such a block always contains the first type present in R, so no dead ends arise. */
static void pf_block_first(slong *beta, const slong *R, const slong *U, slong t)
{
    slong j;
    int tied = (U != NULL);
    for (j = 0; j < t; j++) {
        if (tied) {
            beta[j] = R[j] < U[j] ? R[j] : U[j];
            tied = (beta[j] == U[j]);
        } else {
            beta[j] = R[j];
        }
    }
}

/* Replaces beta by its lexicographic predecessor inside the box [0, R] that still contains the
   first type present in R.  Returns 0 when there is none. */
static int pf_block_next(slong *beta, const slong *R, slong t)
{
    slong j, lead = 0, last = -1;
    while (lead < t && R[lead] == 0)
        lead++;
    for (j = t - 1; j >= 0 && last < 0; j--)
        if (beta[j] > 0)
            last = j;
    if (last < 0 || (last == lead && beta[lead] == 1))
        return 0;
    beta[last]--;
    for (j = last + 1; j < t; j++)
        beta[j] = R[j];
    return 1;
}

/* Multiplicity (number of set partitions) of the multiset partition blocks[0..L-1], into c.
   Equal blocks are adjacent because the sequence is lexicographically non-increasing. */
static void pf_partition_multiplicity(fmpz_t c, const pf_enum *P, slong L)
{
    slong l, j, run = 1;
    fmpz_t den, f;
    fmpz_init(den);
    fmpz_init(f);
    fmpz_one(den);
    for (l = 0; l < L; l++) {
        const slong *b = P->blocks + l * P->t;
        for (j = 0; j < P->t; j++) {
            fmpz_fac_ui(f, (ulong) b[j]);
            fmpz_mul(den, den, f);
        }
        if (l > 0 && memcmp(b, b - P->t, (size_t) P->t * sizeof(slong)) == 0)
            run++;
        else
            run = 1;
        fmpz_mul_ui(den, den, (ulong) run);   /* builds prod (repetitions)! incrementally */
    }
    fmpz_divexact(c, P->numer, den);
    fmpz_clear(den);
    fmpz_clear(f);
}

/* Turns the multiset partition blocks[0..L-1] into the term (-1)^{m-L} mult <tau_d prod tau_{b_B+1}>.
   Returns WK_LIMIT if the term budget is exceeded or memory runs out. */
/* The stop flag of the table pf_integral works for, polled while it enumerates (NULL: none). */
static _Thread_local atomic_int *pf_cancel;

static int pf_emit_partition(pf_expansion *E, pf_enum *P, slong L)
{
    slong l, j, len = P->n;
    int st;
    fmpz_t c;
    if (++P->count > P->max_terms && P->max_terms > 0)
        return WK_LIMIT;
    if ((P->count & 1023) == 0 && pf_cancel && *pf_cancel)
        return WK_CANCELLED;   /* a million partitions take about a second */
    if (P->n > 0)
        memcpy(P->key, P->d, (size_t) P->n * sizeof(slong));
    for (l = 0; l < L; l++) {
        slong b = 0;
        for (j = 0; j < P->t; j++)
            b += P->kidx[j] * P->blocks[l * P->t + j];
        P->key[len++] = b + 1;
    }
    qsort(P->key, (size_t) len, sizeof(slong), pf_cmp_slong_desc);
    fmpz_init(c);
    pf_partition_multiplicity(c, P, L);
    if ((P->m - L) % 2 != 0)
        fmpz_neg(c, c);
    st = pf_term_append(E, c, P->key, len);
    fmpz_clear(c);
    return st;
}

/* Depth-first enumeration of all multiset partitions with an explicit level stack.
   Level L holds a block; when the remainder after it is empty the partition is emitted. */
static int pf_enumerate_partitions(pf_expansion *E, pf_enum *P)
{
    slong L = 0, j, t = P->t;
    int st, empty;
    memcpy(P->rem, P->M, (size_t) t * sizeof(slong));
    pf_block_first(P->blocks, P->rem, NULL, t);
    for (;;) {
        slong *beta = P->blocks + L * t, *R = P->rem + L * t, *Rn = R + t;
        for (j = 0, empty = 1; j < t; j++) {
            Rn[j] = R[j] - beta[j];
            if (Rn[j] != 0)
                empty = 0;
        }
        if (!empty) {
            L++;
            pf_block_first(P->blocks + L * t, Rn, beta, t);
            continue;
        }
        st = pf_emit_partition(E, P, L + 1);
        if (st != WK_OK)
            return st;
        while (L >= 0 && !pf_block_next(P->blocks + L * t, P->rem + L * t, t))
            L--;
        if (L < 0)
            return WK_OK;
    }
}

/* Releases the arrays of an enumeration state (safe after a partial pf_enum_init).
   kidx owns the single heap block holding every array. */
static void pf_enum_clear(pf_enum *P)
{
    free(P->kidx);
    fmpz_clear(P->numer);
}

/* Collects the kappa types and allocates the level stacks (one heap block).
   Returns WK_OK or WK_LIMIT if memory runs out; pf_enum_clear must be called in both cases. */
static int pf_enum_init(pf_enum *P, const slong *d, slong n, const slong *kmult, slong kmax, slong max_terms)
{
    slong j, t = 0, m = 0;
    fmpz_t f;
    fmpz_init(P->numer);
    for (j = 1; j <= kmax; j++)
        if (kmult[j] > 0) {
            t++;
            m += kmult[j];
        }
    P->t = t;
    P->m = m;
    P->d = d;
    P->n = n;
    P->count = 0;
    P->max_terms = max_terms;
    P->kidx = malloc((size_t) (2 * t + m * t + (m + 1) * t + n + m + 1) * sizeof(slong));
    if (P->kidx == NULL)
        return WK_LIMIT;
    P->M = P->kidx + t;
    P->blocks = P->M + t;
    P->rem = P->blocks + m * t;
    P->key = P->rem + (m + 1) * t;
    fmpz_init(f);
    fmpz_one(P->numer);
    for (j = 1, t = 0; j <= kmax; j++)
        if (kmult[j] > 0) {
            P->kidx[t] = j;
            P->M[t++] = kmult[j];
            fmpz_fac_ui(f, (ulong) kmult[j]);
            fmpz_mul(P->numer, P->numer, f);
        }
    fmpz_clear(f);
    return WK_OK;
}

/* Validates pf_expand's arguments: WK_BADARG, then WK_UNSTABLE, then WK_LIMIT for sizes the
   correlator engine would refuse anyway (keeps 3g-3+n far from overflow). */
static int pf_check_args(const pf_expansion *E, slong g, const slong *d, slong n,
                         const slong *kmult, slong kmax, slong max_terms)
{
    slong i;
    if (E == NULL || g < 0 || n < 0 || (n > 0 && d == NULL) || kmax < 0
        || (kmax > 0 && kmult == NULL) || max_terms < 0)
        return WK_BADARG;
    for (i = 0; i < n; i++)
        if (d[i] < 0)
            return WK_BADARG;
    for (i = 1; i <= kmax; i++)
        if (kmult[i] < 0)
            return WK_BADARG;
    if ((g == 0 && n <= 2) || (g == 1 && n == 0))
        return WK_UNSTABLE;
    if (g > WK_MAX_DEPTH || n > WK_MAX_DEPTH + 2)
        return WK_LIMIT;
    return WK_OK;
}

/* Whether sum d_i + sum_j j*kmult[j] = 3g-3+n, without overflow for huge entries.
   Each partial sum is compared against the remaining budget before being added. */
static int pf_degree_matches(slong g, const slong *d, slong n, const slong *kmult, slong kmax)
{
    slong i, D = 3 * g - 3 + n, sum = 0;
    for (i = 0; i < n; i++) {
        if (d[i] > D - sum)
            return 0;
        sum += d[i];
    }
    for (i = 1; i <= kmax; i++) {
        if (kmult[i] > (D - sum) / i)
            return 0;
        sum += i * kmult[i];
    }
    return sum == D;
}

/* Expands the psi-kappa integral into psi correlators (see pushforward.h).
   Without kappa factors the single term is the sorted psi correlator itself. */
int pf_expand(pf_expansion *E, slong g, const slong *d, slong n, const slong *kmult, slong kmax, slong max_terms)
{
    pf_enum P;
    int st = pf_check_args(E, g, d, n, kmult, kmax, max_terms);
    if (E == NULL)
        return st;
    pf_expansion_clear(E);
    E->g = g;
    if (st != WK_OK || !pf_degree_matches(g, d, n, kmult, kmax))
        return st;
    st = pf_enum_init(&P, d, n, kmult, kmax, max_terms);
    if (st == WK_OK && P.m == 0) {
        if (n > 0)
            memcpy(P.key, d, (size_t) n * sizeof(slong));
        qsort(P.key, (size_t) n, sizeof(slong), pf_cmp_slong_desc);
        st = pf_term_append(E, P.numer, P.key, n);   /* numer = 1 here */
    } else if (st == WK_OK) {
        st = pf_enumerate_partitions(E, &P);
    }
    pf_enum_clear(&P);
    if (st != WK_OK)
        pf_expansion_clear(E);
    else
        pf_terms_merge(E);
    return st;
}

/* Counts multiset partitions of [0,M]^t by unbounded-knapsack DP over blocks (mixed radix index).
   a has S = prod (M_j+1) zeroed entries; work holds 3t slongs.  Returns a[S-1]. */
static double pf_count_partitions(const slong *M, slong t, slong S, double *a, slong *work)
{
    slong *beta = work, *v = work + t, *stride = work + 2 * t;
    slong b, j, idx;
    for (j = 0, idx = 1; j < t; j++) {
        stride[j] = idx;
        idx *= M[j] + 1;
    }
    a[0] = 1.0;
    for (b = 1; b < S; b++) {                       /* the block beta has mixed-radix index b */
        for (j = 0, idx = b; j < t; j++) {
            beta[j] = v[j] = idx % (M[j] + 1);
            idx /= M[j] + 1;
        }
        for (idx = b;;) {                           /* v runs over the box [beta, M] upwards */
            a[idx] += a[idx - b];
            for (j = 0; j < t && v[j] == M[j]; j++) {
                idx -= (M[j] - beta[j]) * stride[j];
                v[j] = beta[j];
            }
            if (j == t)
                break;
            v[j]++;
            idx += stride[j];
        }
    }
    return a[S - 1];
}

/* Number of multiset partitions of the kappa multiset (exact DP, see pushforward.h for HUGE_VAL).
   The DP costs prod (M_j+1)(M_j+2)/2 <= S^2 steps; above 1e8 we return HUGE_VAL (then S > 1e4). */
double pf_estimate_terms(const slong *kmult, slong kmax)
{
    slong j, t = 0, S;
    slong *M;
    double cost = 1.0, size = 1.0, res;
    double *a;
    if (kmax < 0 || (kmax > 0 && kmult == NULL))
        return 0.0;
    for (j = 1; j <= kmax; j++) {
        if (kmult[j] < 0)
            return 0.0;
        cost *= 0.5 * ((double) kmult[j] + 1.0) * ((double) kmult[j] + 2.0);
        size *= (double) kmult[j] + 1.0;
        t += kmult[j] > 0;
    }
    if (cost > 1e8)
        return HUGE_VAL;
    S = (slong) size;
    M = malloc((size_t) (4 * t + 1) * sizeof(slong));
    a = calloc((size_t) S, sizeof(double));
    if (M == NULL || a == NULL) {
        free(M);
        free(a);
        return HUGE_VAL;
    }
    for (j = 1, t = 0; j <= kmax; j++)
        if (kmult[j] > 0)
            M[t++] = kmult[j];
    res = pf_count_partitions(M, t, S, a, M + t);
    free(M);
    free(a);
    return res;
}

/* res = sum coeff * <tau_d>_g over the terms of E, each by a closed form when one applies
   (wk_correlator), else from T.  Stops at the first engine error and then returns it with res = 0. */
int pf_expansion_evaluate(fmpq_t res, wk_table *T, const pf_expansion *E)
{
    slong i;
    int st = WK_OK;
    fmpq_t c;
    fmpq_zero(res);
    if (T == NULL || E == NULL)
        return WK_BADARG;
    fmpq_init(c);
    for (i = 0; st == WK_OK && i < E->len; i++) {
        st = wk_correlator(c, T, E->g, E->terms[i].d, E->terms[i].n);
        fmpq_mul_fmpz(c, c, E->terms[i].coeff);
        fmpq_add(res, res, c);
    }
    fmpq_clear(c);
    if (st != WK_OK)
        fmpq_zero(res);
    return st;
}

/* Expands and evaluates in one call, with a temporary expansion.
   Zero (and WK_OK) when the degree does not match; errors leave res = 0. */
int pf_integral(fmpq_t res, wk_table *T, slong g, const slong *d, slong n, const slong *kmult, slong kmax)
{
    pf_expansion E;
    int st;
    fmpq_zero(res);
    if (T == NULL)
        return WK_BADARG;
    pf_expansion_init(&E);
    pf_cancel = T->cancel;
    st = pf_expand(&E, g, d, n, kmult, kmax, 0);
    pf_cancel = NULL;
    if (st == WK_OK)
        st = pf_expansion_evaluate(res, T, &E);
    pf_expansion_clear(&E);
    return st;
}
