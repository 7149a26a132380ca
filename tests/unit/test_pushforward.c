/* test_pushforward.c - unit tests for the psi-kappa expansion (src/engines/correlators/pushforward.h).
 *
 * The main property test compares pf_expand / pf_integral with an independent naive expansion
 * that enumerates all set partitions of the m labelled kappa factors (restricted growth strings),
 * both term by term (sign and multiplicity of every grouped term) and in value.
 */
#include <math.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/ulong_extras.h>
#include "correlators/pushforward.h"
#include "unit.h"

#define MAXK 8      /* kappa factors in the naive expansion */
#define MAXP 12     /* points of a correlator */

static unit_report rep;

/* A naive term: sorted key and integer coefficient.
   Plain slong suffices: at most Bell(7) = 877 set partitions contribute +-1 each. */
typedef struct {
    slong n, d[MAXP];
    slong coeff;
} naive_term;

/* Prints psi exponents and kappa multiplicities to stderr after a failure.
   Enough to reproduce the failing input by hand. */
static void print_input(slong g, const slong *d, slong n, const slong *km, slong kmax)
{
    slong i;
    fprintf(stderr, "    g=%ld psi=(", (long) g);
    for (i = 0; i < n; i++)
        fprintf(stderr, i ? ",%ld" : "%ld", (long) d[i]);
    fprintf(stderr, ") kmult[1..]=(");
    for (i = 1; i <= kmax; i++)
        fprintf(stderr, i > 1 ? ",%ld" : "%ld", (long) km[i]);
    fprintf(stderr, ")\n");
}

/* qsort comparator, descending slong order.
   Matches the engine's key order so keys can be compared with memcmp. */
static int cmp_desc(const void *x, const void *y)
{
    slong a = *(const slong *) x, b = *(const slong *) y;
    return (a < b) - (a > b);
}

/* Adds coeff * <tau_key> to the naive list, merging with an equal key.
   Linear search: simple and obviously correct, sizes are tiny. */
static void naive_add(naive_term *L, slong *len, const slong *key, slong n, slong coeff)
{
    slong i;
    for (i = 0; i < *len; i++)
        if (L[i].n == n && memcmp(L[i].d, key, (size_t) n * sizeof(slong)) == 0) {
            L[i].coeff += coeff;
            return;
        }
    L[*len].n = n;
    memcpy(L[*len].d, key, (size_t) n * sizeof(slong));
    L[*len].coeff = coeff;
    (*len)++;
}

/* Naive expansion: every set partition of the labelled factors b[0..m-1] (restricted growth
   strings a), term (-1)^{m-|P|} <tau_d prod_B tau_{b_B+1}>.  Returns the number of distinct keys. */
static slong naive_expand(naive_term *L, const slong *d, slong n, const slong *b, slong m)
{
    slong a[MAXK], sum[MAXK], key[MAXP], len = 0, i, k, blocks;
    memset(a, 0, sizeof(a));
    for (;;) {
        for (i = 0, blocks = 0; i < m; i++)
            blocks = a[i] + 1 > blocks ? a[i] + 1 : blocks;
        memset(sum, 0, sizeof(sum));
        for (i = 0; i < m; i++)
            sum[a[i]] += b[i];
        memcpy(key, d, (size_t) n * sizeof(slong));
        for (k = 0; k < blocks; k++)
            key[n + k] = sum[k] + 1;
        qsort(key, (size_t) (n + blocks), sizeof(slong), cmp_desc);
        naive_add(L, &len, key, n + blocks, (m - blocks) % 2 ? -1 : 1);
        for (i = m - 1; i >= 1; i--) {              /* next restricted growth string */
            slong mx = 0;
            for (k = 0; k < i; k++)
                mx = a[k] > mx ? a[k] : mx;
            if (a[i] <= mx) {
                a[i]++;
                break;
            }
            a[i] = 0;
        }
        if (i < 1)
            return len;
    }
}

/* Whether E has exactly the non-zero terms of the naive list L.
   Same keys and same coefficients, so signs and multiplicities are all checked. */
static int same_terms(const pf_expansion *E, const naive_term *L, slong len)
{
    slong i, j, nonzero = 0;
    for (i = 0; i < len; i++) {
        if (L[i].coeff == 0)
            continue;
        nonzero++;
        for (j = 0; j < E->len; j++)
            if (E->terms[j].n == L[i].n
                && memcmp(E->terms[j].d, L[i].d, (size_t) L[i].n * sizeof(slong)) == 0)
                break;
        if (j == E->len || fmpz_cmp_si(E->terms[j].coeff, L[i].coeff) != 0)
            return 0;
    }
    return nonzero == E->len;
}

/* res = value of a naive expansion at genus g.
   Engine errors are recorded as failures. */
static void naive_value(fmpq_t res, wk_table *T, slong g, const naive_term *L, slong len)
{
    slong i;
    fmpq_t c;
    fmpq_init(c);
    fmpq_zero(res);
    for (i = 0; i < len; i++) {
        if (wk_table_correlator(c, T, g, L[i].d, L[i].n) != WK_OK)
            UNIT_CHECK(&rep, 0, "naive correlator failed");
        fmpq_mul_si(c, c, L[i].coeff);
        fmpq_add(res, res, c);
    }
    fmpq_clear(c);
}

/* Draws a random degree-matching input: stable (g,n), 1..7 kappa factors, psi exponents.
   Fills b (the labelled kappa indices) and kmult; returns m. */
static slong rand_input(flint_rand_t st, slong *g, slong *d, slong *n, slong *b, slong *km, slong *kmax)
{
    slong D, m, K, i;
    do {
        *g = (slong) n_randint(st, 4);
        *n = (slong) n_randint(st, 5);
        D = 3 * *g - 3 + *n;
    } while (2 * *g - 2 + *n <= 0 || D < 1);
    m = 1 + (slong) n_randint(st, (ulong) (D < 7 ? D : 7));
    K = (*n == 0) ? D : m + (slong) n_randint(st, (ulong) (D - m + 1));
    for (i = 0; i < m; i++)
        b[i] = 1;
    for (i = 0; i < K - m; i++)
        b[n_randint(st, (ulong) m)]++;
    for (i = 0; i < *n; i++)
        d[i] = 0;
    for (i = 0; i < D - K; i++)
        d[n_randint(st, (ulong) *n)]++;
    memset(km, 0, (size_t) (D + 1) * sizeof(slong));
    for (i = 0, *kmax = 0; i < m; i++) {
        km[b[i]]++;
        *kmax = b[i] > *kmax ? b[i] : *kmax;
    }
    return m;
}

/* Whether E contains the correlator key (length n) with coefficient exactly c.
   Used to check signs and multiplicities of grouped terms. */
static int has_term(const pf_expansion *E, slong c, const slong *key, slong n)
{
    slong j;
    for (j = 0; j < E->len; j++)
        if (E->terms[j].n == n && memcmp(E->terms[j].d, key, (size_t) n * sizeof(slong)) == 0)
            return fmpz_cmp_si(E->terms[j].coeff, c) == 0;
    return 0;
}

/* int_{Mbar_{2,0}} kappa_1^3 = <tau_4>_2 - 3 <tau_2 tau_3>_2 + <tau_2^3>_2 = 43/2880 (from memory;
   equivalently V_{2,0} = 43 pi^6 / 2160 in Mirzakhani 2007, Invent. Math. 167, table of volumes).
   The grouped coefficients +1, -3, +1 are the signs and set-partition counts of 3 factors. */
static void test_kappa1_cubed(wk_table *T)
{
    slong km[2] = {0, 3}, k4[1] = {4}, k32[2] = {3, 2}, k222[3] = {2, 2, 2};
    pf_expansion E;
    fmpq_t v, e;
    int st;
    pf_expansion_init(&E);
    fmpq_init(v);
    fmpq_init(e);
    st = pf_expand(&E, 2, NULL, 0, km, 1, 0);
    UNIT_CHECK(&rep, st == WK_OK && E.len == 3 && E.g == 2, "kappa_1^3 expansion: status %d, %ld terms", st, (long) E.len);
    UNIT_CHECK(&rep, has_term(&E, 1, k4, 1), "kappa_1^3: +<tau_4>");
    UNIT_CHECK(&rep, has_term(&E, -3, k32, 2), "kappa_1^3: -3<tau_3 tau_2>");
    UNIT_CHECK(&rep, has_term(&E, 1, k222, 3), "kappa_1^3: +<tau_2^3>");
    st = pf_expansion_evaluate(v, T, &E);
    fmpq_set_si(e, 43, 2880);
    UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(v, e), "int_{M_2} kappa_1^3 = 43/2880");
    st = pf_integral(v, T, 2, NULL, 0, km, 1);
    UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(v, e), "pf_integral kappa_1^3 on M_2");
    fmpq_clear(v);
    fmpq_clear(e);
    pf_expansion_clear(&E);
}

/* Small spaces: int_{Mbar_{1,1}} kappa_1 = 1/24 (Arbarello-Cornalba convention, from memory;
   Arbarello-Cornalba 1996, "Combinatorial and algebro-geometric cohomology classes on the moduli
   spaces of curves"); int_{Mbar_{0,4}} kappa_1 = 1 (from memory; V_{0,4} = 2 pi^2 = 2 pi^2 * 1).
   kmult[0] (kappa_0) must be ignored. */
static void test_small_spaces(wk_table *T)
{
    slong km[2] = {7, 1}, d1[1] = {0}, d4[4] = {0, 0, 0, 0};
    fmpq_t v, e;
    int st;
    fmpq_init(v);
    fmpq_init(e);
    st = pf_integral(v, T, 1, d1, 1, km, 1);
    fmpq_set_si(e, 1, 24);
    UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(v, e), "int_{M_{1,1}} kappa_1 = 1/24");
    st = pf_integral(v, T, 0, d4, 4, km, 1);
    fmpq_set_si(e, 1, 1);
    UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(v, e), "int_{M_{0,4}} kappa_1 = 1");
    fmpq_clear(v);
    fmpq_clear(e);
}

/* Property test: grouped expansion == naive set-partition expansion (term by term and in value)
   on random inputs with m <= 7 kappa factors. */
static void test_vs_naive(wk_table *T, flint_rand_t st)
{
    long it, iters = unit_iterations(1000);
    slong g, n, m, kmax, d[MAXP], b[MAXK], km[16], len;
    static naive_term L[1000];                         /* Bell(7) = 877 keys at most */
    pf_expansion E;
    fmpq_t v, w;
    int s1, s2;
    pf_expansion_init(&E);
    fmpq_init(v);
    fmpq_init(w);
    for (it = 0; it < iters; it++) {
        m = rand_input(st, &g, d, &n, b, km, &kmax);
        len = naive_expand(L, d, n, b, m);
        s1 = pf_expand(&E, g, d, n, km, kmax, 0);
        s2 = pf_expansion_evaluate(v, T, &E);
        naive_value(w, T, g, L, len);
        UNIT_CHECK(&rep, s1 == WK_OK && s2 == WK_OK && same_terms(&E, L, len), "grouped terms differ from naive");
        UNIT_CHECK(&rep, fmpq_equal(v, w) && !fmpq_is_zero(v), "value differs from naive (m=%ld)", (long) m);
        if (!fmpq_equal(v, w) || !same_terms(&E, L, len))
            print_input(g, d, n, km, kmax);
    }
    fmpq_clear(v);
    fmpq_clear(w);
    pf_expansion_clear(&E);
}

/* pf_estimate_terms on known counts: p(m) for kappa_1^m (partition numbers, from memory),
   Bell numbers for distinct kappas (from memory), 9 partitions of {a,a,b,b} (from memory). */
static void test_estimate_known(void)
{
    static const double part[11] = {1, 1, 2, 3, 5, 7, 11, 15, 22, 30, 42};
    static const double bell[8] = {1, 1, 2, 5, 15, 52, 203, 877};
    slong km[9], m;
    for (m = 0; m <= 10; m++) {
        km[0] = 0;
        km[1] = m;
        UNIT_CHECK(&rep, pf_estimate_terms(km, 1) == part[m], "estimate kappa_1^%ld", (long) m);
    }
    for (m = 0; m <= 7; m++) {
        slong j;
        for (j = 0; j <= 8; j++)
            km[j] = (j >= 1 && j <= m);
        UNIT_CHECK(&rep, pf_estimate_terms(km, 8) == bell[m], "estimate of %ld distinct kappas", (long) m);
    }
    km[1] = 2; km[2] = 2;
    UNIT_CHECK(&rep, pf_estimate_terms(km, 2) == 9.0, "estimate kappa_1^2 kappa_2^2");
    km[1] = 100000;
    UNIT_CHECK(&rep, pf_estimate_terms(km, 1) == HUGE_VAL, "estimate kappa_1^100000 is HUGE_VAL");
    km[1] = -1;
    UNIT_CHECK(&rep, pf_estimate_terms(km, 1) == 0.0, "estimate with negative exponent");
}

/* Property test: the estimate equals the number of multiset partitions pf_expand enumerates,
   observed through max_terms (a budget of exactly est succeeds, est - 1 gives WK_LIMIT). */
static void test_estimate_exact(flint_rand_t st)
{
    long it, iters = unit_iterations(1000);
    slong g, n, kmax, d[MAXP], b[MAXK], km[16], est;
    pf_expansion E;
    int s1, s2;
    pf_expansion_init(&E);
    for (it = 0; it < iters; it++) {
        rand_input(st, &g, d, &n, b, km, &kmax);
        est = (slong) pf_estimate_terms(km, kmax);
        s1 = pf_expand(&E, g, d, n, km, kmax, est);
        s2 = WK_LIMIT;                                  /* a budget of 0 means "no limit" */
        if (est > 1) {
            s2 = pf_expand(&E, g, d, n, km, kmax, est - 1);
            s2 = (E.len == 0) ? s2 : WK_OK;             /* E must be emptied by the failure */
        }
        UNIT_CHECK(&rep, s1 == WK_OK && s2 == WK_LIMIT, "estimate %ld is not the enumerated count", (long) est);
        if (s1 != WK_OK || s2 != WK_LIMIT)
            print_input(g, d, n, km, kmax);
    }
    pf_expansion_clear(&E);
}

/* Error handling: bad arguments, unstable spaces, degree mismatch (zero, empty expansion),
   and res / E reset to zero / empty on every error. */
static void test_errors(wk_table *T)
{
    slong km[3] = {0, 1, 0}, neg[3] = {0, -1, 0}, d[2] = {0, -2}, z[5] = {0, 0, 0, 0, 0};
    pf_expansion E;
    fmpq_t v;
    pf_expansion_init(&E);
    fmpq_init(v);
    UNIT_CHECK(&rep, pf_expand(&E, 0, z, 4, neg, 2, 0) == WK_BADARG && E.len == 0, "negative kmult");
    UNIT_CHECK(&rep, pf_expand(&E, 0, z, 4, NULL, 2, 0) == WK_BADARG, "kmult = NULL");
    UNIT_CHECK(&rep, pf_expand(&E, 0, z, 4, km, -1, 0) == WK_BADARG, "kmax < 0");
    UNIT_CHECK(&rep, pf_expand(&E, 1, d, 2, km, 1, 0) == WK_BADARG, "negative psi exponent");
    UNIT_CHECK(&rep, pf_expand(&E, -1, z, 4, km, 1, 0) == WK_BADARG, "g < 0");
    UNIT_CHECK(&rep, pf_expand(&E, 0, z, 4, km, 1, -3) == WK_BADARG, "max_terms < 0");
    UNIT_CHECK(&rep, pf_expand(NULL, 0, z, 4, km, 1, 0) == WK_BADARG, "E = NULL");
    UNIT_CHECK(&rep, pf_expand(&E, 0, z, 2, km, 1, 0) == WK_UNSTABLE, "Mbar_{0,2}");
    UNIT_CHECK(&rep, pf_expand(&E, 1, NULL, 0, km, 1, 0) == WK_UNSTABLE, "Mbar_{1,0}");
    UNIT_CHECK(&rep, pf_expand(&E, 0, z, 4, km, 1, 0) == WK_OK && E.len == 1, "kappa_1 on Mbar_{0,4}");
    UNIT_CHECK(&rep, pf_expand(&E, 0, z, 5, km, 1, 0) == WK_OK && E.len == 0, "degree mismatch: empty");
    fmpq_set_si(v, 3, 1);
    UNIT_CHECK(&rep, pf_integral(v, T, 0, z, 5, km, 1) == WK_OK && fmpq_is_zero(v), "degree mismatch: zero");
    fmpq_set_si(v, 3, 1);
    UNIT_CHECK(&rep, pf_integral(v, T, 0, z, 4, neg, 2) == WK_BADARG && fmpq_is_zero(v), "error: res = 0");
    UNIT_CHECK(&rep, pf_integral(v, NULL, 0, z, 4, km, 1) == WK_BADARG, "T = NULL");
    UNIT_CHECK(&rep, pf_expansion_evaluate(v, T, NULL) == WK_BADARG, "E = NULL in evaluate");
    fmpq_clear(v);
    pf_expansion_clear(&E);
}

/* Budget: kappa_1^5 on Mbar_{2,2} (degree 5) has p(5) = 7 multiset partitions.
   A budget of 6 must fail with an empty expansion, 7 must succeed. */
static void test_budget(void)
{
    slong km[2] = {0, 5}, z[2] = {0, 0};
    pf_expansion E;
    pf_expansion_init(&E);
    UNIT_CHECK(&rep, pf_expand(&E, 2, z, 2, km, 1, 6) == WK_LIMIT && E.len == 0, "budget 6 < 7");
    UNIT_CHECK(&rep, pf_expand(&E, 2, z, 2, km, 1, 7) == WK_OK && E.len == 7, "budget 7");
    pf_expansion_clear(&E);
}

int main(void)
{
    flint_rand_t st;
    wk_table *T = wk_table_new();
    flint_randinit(st);
    flint_randseed(st, 314159, 2653);
    test_kappa1_cubed(T);
    test_small_spaces(T);
    test_vs_naive(T, st);
    test_estimate_known();
    test_estimate_exact(st);
    test_errors(T);
    test_budget();
    wk_table_free(T);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_pushforward", &rep);
}
