/* test_wk.c - unit tests for the psi-correlator engine (src/engines/correlators/wk.h).
 *
 * Published values name their source; values recalled without a reference at hand are marked
 * "from memory".  String, dilaton, DVV, KdV and the genus-0 product formula are property tests
 * (mathematical identities checked on random inputs with a fixed seed), computed here by code that
 * is independent of the engine's recursion (e.g. DVV and KdV sums run over all 2^n subsets).
 */
#include <math.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/ulong_extras.h>
#include "correlators/wk.h"
#include "unit.h"
#include "wk_published.h"

static unit_report rep;

/* Prints an index list to stderr after a failure message.
   Failures must show their input so that they can be reproduced by hand. */
static void print_list(const char *label, slong g, const slong *d, slong n)
{
    slong i;
    fprintf(stderr, "    %s: g=%ld d=(", label, (long) g);
    for (i = 0; i < n; i++)
        fprintf(stderr, i ? ",%ld" : "%ld", (long) d[i]);
    fprintf(stderr, ")\n");
}

/* out = <tau_d>_g, unstable counting as zero (the convention of every identity tested here).
   Any other engine error is recorded as a failure. */
static void corr(fmpq_t out, wk_table *T, slong g, const slong *d, slong n)
{
    int st = wk_table_correlator(out, T, g, d, n);
    if (st == WK_UNSTABLE)
        return;
    if (st != WK_OK) {                                  /* only failures are counted here */
        UNIT_CHECK(&rep, st == WK_OK, "engine status %d", st);
        print_list("input", g, d, n);
    }
}

/* out = <tau_d>_g with g read off the degree (sum d = 3g-3+n); zero if no genus fits.
   Used for products whose genus split is fixed by degrees. */
static void corr_auto(fmpq_t out, wk_table *T, const slong *d, slong n)
{
    slong i, D = 0;
    fmpq_zero(out);
    for (i = 0; i < n; i++)
        D += d[i];
    if (D + 3 - n < 0 || (D + 3 - n) % 3 != 0)
        return;
    corr(out, T, (D + 3 - n) / 3, d, n);
}

/* Fills d[0..n-1] with a random composition of D (each unit goes to a uniform slot).
   n >= 1, or n = 0 with D = 0. */
static void rand_composition(flint_rand_t st, slong *d, slong n, slong D)
{
    slong i;
    for (i = 0; i < n; i++)
        d[i] = 0;
    for (i = 0; i < D; i++)
        d[n_randint(st, (ulong) n)]++;
}

/* Compares <tau_d>_g with num/den and reports the input on mismatch.
   src names the source of the published value in the failure message. */
static void check_value(wk_table *T, slong g, const slong *d, slong n, slong num, slong den, const char *src)
{
    fmpq_t v, e;
    fmpq_init(v);
    fmpq_init(e);
    corr(v, T, g, d, n);
    fmpq_set_si(e, num, (ulong) den);
    UNIT_CHECK(&rep, fmpq_equal(v, e), "published value (%s) mismatch", src);
    if (!fmpq_equal(v, e)) {
        print_list("input", g, d, n);
        unit_print_fmpq("got", v);
        unit_print_fmpq("expected", e);
    }
    fmpq_clear(v);
    fmpq_clear(e);
}

/* Published small values (genus 0..3) of wk_published.h, each with its source
   (Witten 1991; genus 2 and 3 from memory). */
static void test_published_small(wk_table *T)
{
    for (slong i = 0; i < WK_PUBLISHED_COUNT; i++) {
        const wk_published_value *w = wk_published_values + i;
        check_value(T, w->g, w->d, w->n, w->num, w->den, w->source);
    }
}

/* <tau_{3g-2}>_g = 1/(24^g g!) for g = 1..15 (Witten 1991, op. cit.; Itzykson-Zuber 1992,
   "Combinatorics of the modular group II: the Kontsevich integrals"). */
static void test_one_point(wk_table *T)
{
    slong g, d;
    fmpz_t den, f;
    fmpq_t v, e;
    fmpz_init(den);
    fmpz_init(f);
    fmpq_init(v);
    fmpq_init(e);
    for (g = 1; g <= 15; g++) {
        d = 3 * g - 2;
        corr(v, T, g, &d, 1);
        fmpz_set_ui(den, 24);
        fmpz_pow_ui(den, den, (ulong) g);
        fmpz_fac_ui(f, (ulong) g);
        fmpz_mul(den, den, f);
        fmpz_one(f);
        fmpq_set_fmpz_frac(e, f, den);
        UNIT_CHECK(&rep, fmpq_equal(v, e), "<tau_%ld>_%ld != 1/(24^g g!)", (long) d, (long) g);
    }
    fmpz_clear(den);
    fmpz_clear(f);
    fmpq_clear(v);
    fmpq_clear(e);
}

/* Property test (closed formula, from memory; it follows from the string equation):
   <tau_{d_1}...tau_{d_n}>_0 = (n-3)! / prod d_i!. */
static void test_genus0_formula(wk_table *T, flint_rand_t st)
{
    long it, iters = unit_iterations(1000);
    slong d[12], n, i;
    fmpz_t num, den, f;
    fmpq_t v, e;
    fmpz_init(num); fmpz_init(den); fmpz_init(f);
    fmpq_init(v); fmpq_init(e);
    for (it = 0; it < iters; it++) {
        n = 3 + (slong) n_randint(st, 10);
        rand_composition(st, d, n, n - 3);
        corr(v, T, 0, d, n);
        fmpz_fac_ui(num, (ulong) (n - 3));
        fmpz_one(den);
        for (i = 0; i < n; i++) {
            fmpz_fac_ui(f, (ulong) d[i]);
            fmpz_mul(den, den, f);
        }
        fmpq_set_fmpz_frac(e, num, den);
        UNIT_CHECK(&rep, fmpq_equal(v, e), "genus-0 product formula");
        if (!fmpq_equal(v, e))
            print_list("input", 0, d, n);
    }
    fmpz_clear(num); fmpz_clear(den); fmpz_clear(f);
    fmpq_clear(v); fmpq_clear(e);
}

/* Draws a random stable (g, n) with g <= gmax and 1 <= n <= nmax.
   Rejection sampling keeps the distribution simple and the code obviously correct. */
static void rand_stable(flint_rand_t st, slong gmax, slong nmax, slong *g, slong *n)
{
    do {
        *g = (slong) n_randint(st, (ulong) gmax + 1);
        *n = 1 + (slong) n_randint(st, (ulong) nmax);
    } while (2 * *g - 2 + *n <= 0);
}

/* Property test (string equation): <tau_0 tau_S>_g = sum_j <tau_{d_j - 1} tau_{S \ j}>_g
   for random stable (g, |S|), S of degree 3g-2+|S|. */
static void test_string(wk_table *T, flint_rand_t st)
{
    long it, iters = unit_iterations(1000);
    slong d[10], e[10], g, n, j;
    fmpq_t lhs, rhs, t;
    fmpq_init(lhs); fmpq_init(rhs); fmpq_init(t);
    for (it = 0; it < iters; it++) {
        rand_stable(st, 5, 7, &g, &n);
        rand_composition(st, d + 1, n, 3 * g - 2 + n);
        d[0] = 0;
        corr(lhs, T, g, d, n + 1);
        fmpq_zero(rhs);
        for (j = 1; j <= n; j++) {
            if (d[j] == 0)
                continue;
            memcpy(e, d + 1, (size_t) n * sizeof(slong));
            e[j - 1]--;
            corr(t, T, g, e, n);
            fmpq_add(rhs, rhs, t);
        }
        UNIT_CHECK(&rep, fmpq_equal(lhs, rhs), "string equation");
        if (!fmpq_equal(lhs, rhs))
            print_list("input", g, d, n + 1);
    }
    fmpq_clear(lhs); fmpq_clear(rhs); fmpq_clear(t);
}

/* Property test (dilaton equation): <tau_1 tau_S>_g = (2g-2+|S|) <tau_S>_g
   for random stable (g, |S|) and S of degree 3g-3+|S|. */
static void test_dilaton(wk_table *T, flint_rand_t st)
{
    long it, iters = unit_iterations(1000);
    slong d[10], g, n;
    fmpq_t lhs, rhs;
    fmpq_init(lhs); fmpq_init(rhs);
    for (it = 0; it < iters; it++) {
        rand_stable(st, 5, 7, &g, &n);               /* (g,|S|) stable excludes <tau_1>_1 */
        rand_composition(st, d + 1, n, 3 * g - 3 + n);
        d[0] = 1;
        corr(lhs, T, g, d, n + 1);
        corr(rhs, T, g, d + 1, n);
        fmpq_mul_si(rhs, rhs, 2 * g - 2 + n);
        UNIT_CHECK(&rep, fmpq_equal(lhs, rhs), "dilaton equation");
        if (!fmpq_equal(lhs, rhs))
            print_list("input", g, d, n + 1);
    }
    fmpq_clear(lhs); fmpq_clear(rhs);
}

/* r = (2m+1)!! ((-1)!! = 1 for m = -1).
   Direct product, deliberately independent of the engine's normalisation. */
static void dfact(fmpz_t r, slong m)
{
    slong j;
    fmpz_one(r);
    for (j = 3; j <= 2 * m + 1; j += 2)
        fmpz_mul_ui(r, r, (ulong) j);
}

/* Right-hand side of the DVV relation for <tau_{k+1} tau_S>_g, in its original (unnormalised)
   form, with the splitting sum over all 2^|S| subsets and all genus pairs; divided by (2k+3)!!. */
static void dvv_rhs(fmpq_t out, wk_table *T, slong g, slong k, const slong *S, slong ns)
{
    slong j, r, g1, i, nI, nJ, I[12], J[12], e[12];
    ulong mask;
    fmpz_t a, b;
    fmpq_t t, u, half;
    fmpz_init(a); fmpz_init(b); fmpq_init(t); fmpq_init(u); fmpq_init(half);
    fmpq_zero(out);
    for (j = 0; j < ns; j++) {                          /* first sum */
        memcpy(e, S, (size_t) ns * sizeof(slong));
        e[j] = S[j] + k;
        corr(t, T, g, e, ns);
        dfact(a, k + S[j]);
        dfact(b, S[j] - 1);
        fmpz_divexact(a, a, b);
        fmpq_mul_fmpz(t, t, a);
        fmpq_add(out, out, t);
    }
    for (r = 0; r <= k - 1; r++) {                      /* r + s = k - 1 */
        slong s = k - 1 - r;
        fmpq_zero(half);
        e[0] = r; e[1] = s;
        memcpy(e + 2, S, (size_t) ns * sizeof(slong));
        if (g >= 1) {
            corr(t, T, g - 1, e, ns + 2);
            fmpq_add(half, half, t);
        }
        for (mask = 0; mask < (UWORD(1) << ns); mask++)
            for (g1 = 0; g1 <= g; g1++) {
                I[0] = r; J[0] = s; nI = nJ = 1;
                for (i = 0; i < ns; i++) {
                    if (mask & (UWORD(1) << i)) I[nI++] = S[i]; else J[nJ++] = S[i];
                }
                corr(t, T, g1, I, nI);
                corr(u, T, g - g1, J, nJ);
                fmpq_mul(t, t, u);
                fmpq_add(half, half, t);
            }
        dfact(a, r);
        dfact(b, s);
        fmpz_mul(a, a, b);
        fmpq_mul_fmpz(half, half, a);
        fmpz_set_ui(b, 2);
        fmpq_div_fmpz(half, half, b);
        fmpq_add(out, out, half);
    }
    dfact(a, k + 1);
    fmpq_div_fmpz(out, out, a);
    fmpz_clear(a); fmpz_clear(b); fmpq_clear(t); fmpq_clear(u); fmpq_clear(half);
}

/* Property test (DVV / Virasoro recursion as an identity): random g <= 4, |S| <= 6 and any
   k >= 0 (k+1 need not be the largest index, and S may contain 0 and 1, unlike in the engine). */
static void test_dvv(wk_table *T, flint_rand_t st)
{
    long it, iters = unit_iterations(1000);
    slong S[8], d[9], g, ns, k, D;
    fmpq_t lhs, rhs;
    fmpq_init(lhs); fmpq_init(rhs);
    for (it = 0; it < iters; it++) {
        do {
            g = (slong) n_randint(st, 5);
            ns = (slong) n_randint(st, 7);
            D = 3 * g - 3 + ns;                         /* = k + sum S */
        } while (2 * g - 1 + ns <= 0 || D < 0 || (g == 1 && ns == 0));
        k = (slong) n_randint(st, (ulong) D + 1);
        if (ns == 0)
            k = D;
        else
            rand_composition(st, S, ns, D - k);
        d[0] = k + 1;
        memcpy(d + 1, S, (size_t) ns * sizeof(slong));
        corr(lhs, T, g, d, ns + 1);
        dvv_rhs(rhs, T, g, k, S, ns);
        UNIT_CHECK(&rep, fmpq_equal(lhs, rhs), "DVV identity (k=%ld)", (long) k);
        if (!fmpq_equal(lhs, rhs)) {
            print_list("input", g, d, ns + 1);
            unit_print_fmpq("lhs", lhs);
            unit_print_fmpq("rhs", rhs);
        }
    }
    fmpq_clear(lhs); fmpq_clear(rhs);
}

/* Coefficient of t_M / Aut in the KdV equation in Witten's correlator form
     (2p+1) <<tau_p tau_0^2>> = <<tau_{p-1} tau_0>> <<tau_0^3>> + 2 <<tau_{p-1} tau_0^2>> <<tau_0^2>>
                                + (1/4) <<tau_{p-1} tau_0^4>> ,
   where <<X>> = d_X F at t, F = sum_g F_g (genus-graded with hbar = 1), F_g = sum <...>_g t^.. / Aut.
   Differentiating by the multiset M at t = 0 turns each product into a Leibniz sum over the
   subsets I of the positions of M; the genus of every factor is then fixed by its degree. */
static void kdv_sides(fmpq_t lhs, fmpq_t rhs, wk_table *T, slong p, const slong *M, slong nm)
{
    slong A[16], B[16], nA, nB, i;
    ulong mask;
    fmpq_t x, y;
    fmpq_init(x); fmpq_init(y);
    A[0] = p; A[1] = 0; A[2] = 0;
    memcpy(A + 3, M, (size_t) nm * sizeof(slong));
    corr_auto(lhs, T, A, nm + 3);
    fmpq_mul_si(lhs, lhs, 2 * p + 1);
    A[0] = p - 1; A[1] = A[2] = A[3] = A[4] = 0;
    memcpy(A + 5, M, (size_t) nm * sizeof(slong));
    corr_auto(rhs, T, A, nm + 5);
    fmpq_set_si(x, 1, 4);
    fmpq_mul(rhs, rhs, x);
    for (mask = 0; mask < (UWORD(1) << nm); mask++) {
        A[0] = p - 1; A[1] = 0; A[2] = 0; nA = 2;           /* <<tau_{p-1} tau_0>> <<tau_0^3>> */
        B[0] = B[1] = B[2] = 0; nB = 3;
        for (i = 0; i < nm; i++) {
            if (mask & (UWORD(1) << i)) A[nA++] = M[i]; else B[nB++] = M[i];
        }
        corr_auto(x, T, A, nA);
        corr_auto(y, T, B, nB);
        fmpq_addmul(rhs, x, y);
        memmove(A + 3, A + 2, (size_t) (nA - 2) * sizeof(slong));   /* add a tau_0 to A ... */
        A[2] = 0;
        memmove(B + 2, B + 3, (size_t) (nB - 3) * sizeof(slong));   /* ... and drop one from B */
        corr_auto(x, T, A, nA + 1);
        corr_auto(y, T, B, nB - 1);
        fmpq_mul(x, x, y);
        fmpq_mul_si(x, x, 2);
        fmpq_add(rhs, rhs, x);
    }
    fmpq_clear(x); fmpq_clear(y);
}

/* Checks one KdV coefficient (both sides computed by kdv_sides).
   Prints the multiset M and both sides on failure. */
static void kdv_check(wk_table *T, slong p, const slong *M, slong nm, const char *what)
{
    fmpq_t lhs, rhs;
    fmpq_init(lhs); fmpq_init(rhs);
    kdv_sides(lhs, rhs, T, p, M, nm);
    UNIT_CHECK(&rep, fmpq_equal(lhs, rhs), "KdV coefficient (%s), p=%ld", what, (long) p);
    if (!fmpq_equal(lhs, rhs)) {
        print_list("M", -1, M, nm);
        unit_print_fmpq("lhs", lhs);
        unit_print_fmpq("rhs", rhs);
    }
    fmpq_clear(lhs); fmpq_clear(rhs);
}

/* KdV convention check on hand-computed cases, then the property test on random multisets.
   Hand cases: p=1, M={0}: 3<tau_1 tau_0^3>_0 = 3 = <tau_0^3>_0 <tau_0^3>_0 + 2 <tau_0^3>_0 <tau_0^3>_0;
   p=3, M={}: 7<tau_3 tau_0^2>_1 = 7/24 = <tau_2 tau_0>_1 <tau_0^3>_0 + (1/4)<tau_2 tau_0^4>_0. */
static void test_kdv(wk_table *T, flint_rand_t st)
{
    long it, iters = unit_iterations(1000);
    slong M[6], zero = 0, g, nm, p, D;
    fmpq_t lhs, rhs, e;
    fmpq_init(lhs); fmpq_init(rhs); fmpq_init(e);
    kdv_sides(lhs, rhs, T, 1, &zero, 1);
    fmpq_set_si(e, 3, 1);
    UNIT_CHECK(&rep, fmpq_equal(lhs, e) && fmpq_equal(rhs, e), "KdV hand case p=1, M={0}");
    kdv_sides(lhs, rhs, T, 3, M, 0);
    fmpq_set_si(e, 7, 24);
    UNIT_CHECK(&rep, fmpq_equal(lhs, e) && fmpq_equal(rhs, e), "KdV hand case p=3, M={}");
    for (it = 0; it < iters; it++) {
        do {
            g = (slong) n_randint(st, 5);
            nm = (slong) n_randint(st, 6);
        } while (3 * g + nm < 1);
        p = 1 + (slong) n_randint(st, (ulong) (3 * g + nm));
        if (nm == 0)
            p = 3 * g;                                   /* the only p with a non-empty degree */
        D = 3 * g + nm - p;                              /* sum M, from the degree of the LHS */
        if (nm > 0)
            rand_composition(st, M, nm, D);
        kdv_check(T, p, M, nm, "random");
    }
    fmpq_clear(lhs); fmpq_clear(rhs); fmpq_clear(e);
}

/* Checks that a call returns the expected status and leaves res = 0.
   res is preset to 5 so that a forgotten reset is caught. */
static void expect_status(wk_table *T, slong g, const slong *d, slong n, int want, const char *what)
{
    fmpq_t r;
    int st;
    fmpq_init(r);
    fmpq_set_si(r, 5, 1);
    st = wk_table_correlator(r, T, g, d, n);
    UNIT_CHECK(&rep, st == want && fmpq_is_zero(r), "%s: status %d (want %d)", what, st, want);
    fmpq_clear(r);
}

/* Error codes: unstable spaces, negative arguments, NULL pointers, BADARG before UNSTABLE,
   depth limit, and zero (WK_OK) for a degree mismatch. */
static void test_errors(wk_table *T)
{
    slong z[3] = {0, 0, 0}, neg[2] = {-1, 3}, big = 3 * 3000 - 2;
    expect_status(T, 0, NULL, 0, WK_UNSTABLE, "(0,0)");
    expect_status(T, 0, z, 1, WK_UNSTABLE, "(0,1)");
    expect_status(T, 0, z, 2, WK_UNSTABLE, "(0,2)");
    expect_status(T, 1, NULL, 0, WK_UNSTABLE, "(1,0)");
    expect_status(T, -1, z, 3, WK_BADARG, "g < 0");
    expect_status(T, 1, z, -2, WK_BADARG, "n < 0");
    expect_status(T, 2, neg, 2, WK_BADARG, "d_i < 0");
    expect_status(T, 0, neg, 2, WK_BADARG, "d_i < 0 on an unstable space");
    expect_status(T, 1, NULL, 2, WK_BADARG, "d = NULL");
    expect_status(NULL, 0, z, 3, WK_BADARG, "T = NULL");
    expect_status(T, 3000, &big, 1, WK_LIMIT, "beyond WK_MAX_DEPTH");
    expect_status(T, 2, z, 3, WK_OK, "degree mismatch");
    expect_status(T, 2, NULL, 0, WK_OK, "n = 0, degree 3 mismatch");
}

/* The entry limit: a small limit stops with WK_LIMIT (res = 0, size capped); lifting it resumes
   and gives the correct value 1/(24^4 4!) (Witten 1991, op. cit.). */
static void test_limit(void)
{
    wk_table *T = wk_table_new();
    slong d = 10;
    int st;
    fmpq_t r, e;
    fmpq_init(r);
    fmpq_init(e);
    wk_table_set_limit(T, 10);
    st = wk_table_correlator(r, T, 4, &d, 1);
    UNIT_CHECK(&rep, st == WK_LIMIT && fmpq_is_zero(r) && wk_table_entries(T) <= 10,
               "limit 10: status %d, entries %ld", st, (long) wk_table_entries(T));
    wk_table_set_limit(T, 0);
    st = wk_table_correlator(r, T, 4, &d, 1);
    fmpq_set_si(e, 1, 24 * 24 * 24 * 24 * 24);      /* 24^4 * 4! = 24^5 */
    UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(r, e), "after lifting the limit: status %d", st);
    fmpq_clear(r);
    fmpq_clear(e);
    wk_table_free(T);
}

/* Order independence and memo independence: a random permutation of the input and a fresh
   table must give the same value as the warm shared table. */
static void test_consistency(wk_table *T, flint_rand_t st)
{
    long it, iters = unit_iterations(200);
    slong d[10], g, n, i, j, tmp;
    fmpq_t a, b;
    fmpq_init(a); fmpq_init(b);
    for (it = 0; it < iters; it++) {
        wk_table *F = wk_table_new();
        rand_stable(st, 4, 6, &g, &n);
        rand_composition(st, d, n, 3 * g - 3 + n);
        corr(a, T, g, d, n);
        for (i = n - 1; i > 0; i--) {
            j = (slong) n_randint(st, (ulong) i + 1);
            tmp = d[i]; d[i] = d[j]; d[j] = tmp;
        }
        corr(b, F, g, d, n);
        UNIT_CHECK(&rep, fmpq_equal(a, b) && !fmpq_is_zero(a), "fresh table / permuted input");
        if (!fmpq_equal(a, b))
            print_list("input", g, d, n);
        wk_table_free(F);
    }
    fmpq_clear(a); fmpq_clear(b);
}

/* Evaluates all non-increasing multi-indices d[i..n-1] with entries <= cap summing to rem.
   Used to compute every correlator of one Mbar_{g,n}. */
static void all_correlators(wk_table *T, slong g, slong *d, slong n, slong i, slong rem, slong cap)
{
    slong v;
    fmpq_t r;
    if (i == n) {
        if (rem == 0) {
            fmpq_init(r);
            corr(r, T, g, d, n);
            fmpq_clear(r);
        }
        return;
    }
    for (v = (rem < cap ? rem : cap); v >= 0; v--) {
        d[i] = v;
        all_correlators(T, g, d, n, i + 1, rem - v, v);
    }
}

/* Property of the estimate (an upper bound by construction, see wk_estimate.c): computing every
   correlator of Mbar_{g,n} from an empty table never stores more entries than estimated. */
static void test_estimate(void)
{
    slong g, n, d[12];
    for (g = 0; g <= 5; g++)
        for (n = 0; n <= 7; n++) {
            wk_table *F;
            double est = wk_estimate_entries(g, n);
            if (2 * g - 2 + n <= 0)
                continue;
            F = wk_table_new();
            all_correlators(F, g, d, n, 0, 3 * g - 3 + n, 3 * g - 3 + n);
            UNIT_CHECK(&rep, (double) wk_table_entries(F) <= est,
                       "estimate (%ld,%ld): %ld entries > %g", (long) g, (long) n,
                       (long) wk_table_entries(F), est);
            wk_table_free(F);
        }
    UNIT_CHECK(&rep, wk_estimate_entries(-1, 3) == 0.0, "estimate of g < 0");
    UNIT_CHECK(&rep, wk_estimate_entries(5000, 0) == HUGE_VAL, "estimate of g = 5000");
    UNIT_CHECK(&rep, wk_estimate_entries(12, 0) > 1000.0, "estimate of g = 12 is not tiny");
}

int main(void)
{
    flint_rand_t st;
    wk_table *T = wk_table_new();
    flint_randinit(st);
    flint_randseed(st, 20240601, 77);
    test_published_small(T);
    test_one_point(T);
    test_genus0_formula(T, st);
    test_string(T, st);
    test_dilaton(T, st);
    test_dvv(T, st);
    test_kdv(T, st);
    test_errors(T);
    test_limit();
    test_consistency(T, st);
    test_estimate();
    wk_table_free(T);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_wk", &rep);
}
