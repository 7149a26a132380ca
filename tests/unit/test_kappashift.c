/* test_kappashift.c - unit tests for mixed psi-kappa integrals by the Kaufmann-Manin-Zagier time
 * shift (src/engines/correlators/kappashift.h), the second route next to the pushforward formula.
 *
 * 1. Hand-computed cases that fix the sign of the shift (worked out in the comments), and published
 *    values, each with its source.
 * 2. Property test: time shift == set-partition pushforward (pf_integral) on random monomials
 *    prod psi_i^{d_i} prod kappa_j^{m_j}, g <= 5, n <= 5, kappa indices <= 4.
 * 3. The work estimate against an independent partition count, and every error code.
 */
#include <stdatomic.h>
#include <math.h>
#include <signal.h>
#include <string.h>
#include <flint/ulong_extras.h>
#include "correlators/kappashift.h"
#include "correlators/pushforward.h"
#include "unit.h"

#define KMAX 4

static unit_report rep;

/* Prints a monomial to stderr after a failure message, so it can be reproduced by hand. */
static void print_monomial(slong g, const slong *d, slong n, const slong *km, slong kmax)
{
    slong i;
    fprintf(stderr, "    g=%ld psi=(", (long) g);
    for (i = 0; i < n; i++)
        fprintf(stderr, i ? ",%ld" : "%ld", (long) d[i]);
    fprintf(stderr, ") kappa multiplicities=(");
    for (i = 1; i <= kmax; i++)
        fprintf(stderr, i > 1 ? ",%ld" : "%ld", (long) km[i]);
    fprintf(stderr, ")\n");
}

/* Checks int psi^d kappa^km on Mbar_{g,n} by the time shift against num/den (source in src). */
static void check_value(wk_table *T, slong g, slong n, const slong *km, slong kmax, slong num, slong den,
                        const char *src)
{
    slong d[8] = {0};
    fmpq_t v, e;
    int st;
    fmpq_init(v);
    fmpq_init(e);
    st = ks_integral(v, T, g, d, n, km, kmax, NULL);
    fmpq_set_si(e, num, (ulong) den);
    UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(v, e), "time shift, value (%s): status %d", src, st);
    if (!fmpq_equal(v, e)) {
        print_monomial(g, d, n, km, kmax);
        unit_print_fmpq("got", v);
        unit_print_fmpq("expected", e);
    }
    fmpq_clear(v);
    fmpq_clear(e);
}

/* Signs of the shift on hand-computed cases, then published values.
   With exp(-s_1 z - s_2 z^2) = sum p_k z^k and q_k = -p_k: q_1 = s_1, q_2 = s_2 - s_1^2/2,
   q_3 = s_1^3/6 - s_1 s_2.  Genus-0 correlators are (n-3)!/prod d_i!.
   - kappa_2 on Mbar_{0,5}: q_2 gives + <tau_3 tau_0^5>_0 = 1.
   - kappa_1^2 on Mbar_{0,5}: 2! [s_1^2] (q_1^2/2 <tau_2^2 ..> + q_2 <tau_3 ..>) = <tau_2^2 tau_0^5>_0
     - <tau_3 tau_0^5>_0 = 6 - 1 = 5.
   - kappa_1 kappa_2 on Mbar_{0,6}: [s_1 s_2] (q_1 q_2 <tau_2 tau_3 ..> + q_3 <tau_4 ..>) = 10 - 1 = 9. */
static void test_hand_and_published(wk_table *T)
{
    slong km[KMAX + 1] = {0};
    km[2] = 1; check_value(T, 0, 5, km, 2, 1, 1, "hand-computed");
    km[2] = 0; km[1] = 2; check_value(T, 0, 5, km, 1, 5, 1, "hand-computed");
    km[1] = 1; km[2] = 1; check_value(T, 0, 6, km, 2, 9, 1, "hand-computed");
    km[2] = 0;
    /* E. Arbarello, M. Cornalba, "Combinatorial and algebro-geometric cohomology classes on the
       moduli spaces of curves" (1996), from memory: int_{Mbar_{1,1}} kappa_1 = 1/24,
       int_{Mbar_{0,4}} kappa_1 = 1. */
    km[1] = 1; check_value(T, 1, 1, km, 1, 1, 24, "Arbarello-Cornalba 1996, from memory");
    check_value(T, 0, 4, km, 1, 1, 1, "Arbarello-Cornalba 1996, from memory");
    /* Weil-Petersson volumes V = (2 pi^2)^D/D! int kappa_1^D (docs/conventions.md):
       V_{0,5} = 10 pi^4 (P. Zograf, "The Weil-Petersson volume of the moduli space of punctured
       spheres", 1993, from memory) gives 5 (also hand-computed above);
       V_{1,2} = pi^4/4 (M. Mirzakhani, "Simple geodesics and Weil-Petersson volumes", Invent. Math.
       2007, from memory; no orbifold factor for (1,2)) gives 1/8, and V_{2,0} = 43 pi^6/2160 in the
       stack normalisation (docs/conventions.md, the example int kappa_1^3 = 43/2880 there). */
    km[1] = 2; check_value(T, 1, 2, km, 1, 1, 8, "Mirzakhani 2007, from memory");
    km[1] = 3; check_value(T, 2, 0, km, 1, 43, 2880, "docs/conventions.md, from memory");
}

/* Fills km[1..KMAX] with a random kappa multiset of total weight K; returns the largest index used. */
static slong rand_kappas(flint_rand_t st, slong *km, slong K)
{
    slong j, kmax = 0;
    for (j = 0; j <= KMAX; j++)
        km[j] = 0;
    while (K > 0) {
        j = 1 + (slong) n_randint(st, (ulong) (K < KMAX ? K : KMAX));
        km[j]++;
        K -= j;
        if (j > kmax)
            kmax = j;
    }
    return kmax;
}

/* Property test (two independent routes): time shift == pushforward on random mixed monomials.
   The kappa weight K is at least 1; the psi exponents take the rest of the dimension. */
static void test_shift_vs_pushforward(wk_table *T, flint_rand_t st)
{
    long it, iters = unit_iterations(5000), agree = 0;
    slong g, n, D, K, kmax, i, d[8], km[KMAX + 1];
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    for (it = 0; it < iters; it++) {
        do {
            g = (slong) n_randint(st, 6);
            n = (slong) n_randint(st, 6);
            D = 3 * g - 3 + n;
        } while (2 * g - 2 + n <= 0 || D < 1);
        K = n == 0 ? D : 1 + (slong) n_randint(st, (ulong) D);
        kmax = rand_kappas(st, km, K);
        for (i = 0; i < n; i++)
            d[i] = 0;
        for (i = 0; i < D - K; i++)
            d[n_randint(st, (ulong) n)]++;
        int s1 = pf_integral(a, T, g, d, n, km, kmax), s2 = ks_integral(b, T, g, d, n, km, kmax, NULL);
        int ok = s1 == WK_OK && s2 == WK_OK && fmpq_equal(a, b);
        agree += ok;
        UNIT_CHECK(&rep, ok, "pushforward vs time shift (status %d, %d)", s1, s2);
        if (!ok) {
            print_monomial(g, d, n, km, kmax);
            unit_print_fmpq("pushforward", a);
            unit_print_fmpq("time shift", b);
        }
    }
    printf("pushforward vs time shift: %ld of %ld random psi-kappa monomials (genus <= 5, <= 5 points) "
           "agree\n", agree, iters);
    fmpq_clear(a);
    fmpq_clear(b);
}

/* Number of partitions of N into parts divisible by step (independent DP, N < 256). */
static double partitions_step(slong N, slong step)
{
    double p[256] = {1.0};
    slong i, j;
    for (i = step; i <= N; i += step)
        for (j = i; j <= N; j++)
            p[j] += p[j - i];
    return p[N];
}

/* The work estimate is (reachable partitions of K) x (monomials below s^m): for kappa_1^m that is
   p(m) (m+1); for kappa_2^m only even parts survive, p(m) (m+1) again. */
static void test_estimate(void)
{
    slong km[3] = {0, 0, 0}, m;
    for (m = 1; m <= 30; m++) {
        km[1] = m;
        km[2] = 0;
        UNIT_CHECK(&rep, ks_estimate_work(km, 1) == partitions_step(m, 1) * (double) (m + 1),
                   "estimate of kappa_1^%ld", (long) m);
        km[1] = 0;
        km[2] = m;
        UNIT_CHECK(&rep, ks_estimate_work(km, 2) == partitions_step(2 * m, 2) * (double) (m + 1),
                   "estimate of kappa_2^%ld", (long) m);
    }
    km[1] = 20000;
    UNIT_CHECK(&rep, ks_estimate_work(km, 1) == HUGE_VAL, "estimate of kappa_1^20000");
    km[1] = -1;
    UNIT_CHECK(&rep, ks_estimate_work(km, 1) == 0.0 && ks_kappa_degree(km, 1) == -1, "negative multiplicity");
    km[1] = 2;
    km[2] = 3;
    UNIT_CHECK(&rep, ks_kappa_degree(km, 2) == 8, "kappa degree");
}

/* Error codes (res preset to 5 must come back 0), a mismatch is zero, no kappa is one correlator,
   and a raised cancel flag stops the walk. */
static void test_errors(wk_table *T)
{
    slong d[3] = {0, 0, 0}, km[3] = {0, 1, 0}, bad[2] = {0, -1};
    atomic_int flag = 1;
    fmpq_t r;
    fmpq_init(r);
    fmpq_set_si(r, 5, 1);
    UNIT_CHECK(&rep, ks_integral(r, NULL, 1, d, 1, km, 1, NULL) == WK_BADARG && fmpq_is_zero(r), "T = NULL");
    fmpq_set_si(r, 5, 1);
    UNIT_CHECK(&rep, ks_integral(r, T, 1, d, 1, bad, 1, NULL) == WK_BADARG && fmpq_is_zero(r), "kappa^-1");
    d[0] = -1;
    UNIT_CHECK(&rep, ks_integral(r, T, 1, d, 1, km, 1, NULL) == WK_BADARG, "psi^-1");
    d[0] = 0;
    UNIT_CHECK(&rep, ks_integral(r, T, 0, d, 2, km, 1, NULL) == WK_UNSTABLE, "Mbar_{0,2}");
    fmpq_set_si(r, 5, 1);
    UNIT_CHECK(&rep, ks_integral(r, T, 2, d, 1, km, 1, NULL) == WK_OK && fmpq_is_zero(r), "degree mismatch");
    d[0] = 1;
    UNIT_CHECK(&rep, ks_integral(r, T, 1, d, 1, km, 0, NULL) == WK_OK && fmpz_equal_si(fmpq_numref(r), 1)
               && fmpz_equal_si(fmpq_denref(r), 24), "no kappa: <tau_1>_1 = 1/24 (Witten 1991)");
    d[0] = 0;
    fmpq_set_si(r, 5, 1);
    UNIT_CHECK(&rep, ks_integral(r, T, 1, d, 1, km, 1, &flag) == WK_CANCELLED && fmpq_is_zero(r),
               "cancel flag");
    fmpq_clear(r);
}

int main(void)
{
    flint_rand_t st;
    wk_table *T = wk_table_new();
    flint_randinit(st);
    flint_randseed(st, 20261202, 23);
    test_hand_and_published(T);
    test_shift_vs_pushforward(T, st);
    test_estimate();
    test_errors(T);
    wk_table_free(T);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_kappashift", &rep);
}
