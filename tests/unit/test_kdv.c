/* test_kdv.c - unit tests for the second correlator route (src/engines/correlators/wk_kdv.h) and the
 * closed forms (wk_closed_form in src/engines/correlators/wk.h).
 *
 * 1. Published values computed by the KdV recursion alone (no DVV table involved).
 * 2. Property test: the KdV recursion against the DVV engine on random correlators of genus <= 8
 *    (two independent recursions must agree on every input).
 * 3. Property tests of the closed forms against both recursions; error codes, the entry limit, the
 *    cancel flag, the nesting cap and the memo estimate (an upper bound by construction).
 */
#include <stdatomic.h>
#include <math.h>
#include <signal.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/ulong_extras.h>
#include "correlators/wk.h"
#include "correlators/wk_kdv.h"
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

/* Fills d[0..n-1] with a random composition of D (each unit goes to a uniform slot); n >= 1. */
static void rand_composition(flint_rand_t st, slong *d, slong n, slong D)
{
    slong i;
    for (i = 0; i < n; i++)
        d[i] = 0;
    for (i = 0; i < D; i++)
        d[n_randint(st, (ulong) n)]++;
}

/* Compares <tau_d>_g by the KdV route with num/den; src names the published source. */
static void check_kdv_value(wk_kdv_table *K, slong g, const slong *d, slong n, slong num, slong den,
                            const char *src)
{
    fmpq_t v, e;
    int st;
    fmpq_init(v);
    fmpq_init(e);
    st = wk_kdv_correlator(v, K, g, d, n);
    fmpq_set_si(e, num, (ulong) den);
    UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(v, e), "KdV route, published value (%s): status %d", src, st);
    if (!fmpq_equal(v, e)) {
        print_list("input", g, d, n);
        unit_print_fmpq("got", v);
        unit_print_fmpq("expected", e);
    }
    fmpq_clear(v);
    fmpq_clear(e);
}

/* Published small values (wk_published.h: Witten 1991; genus 2 and 3 from memory) by the KdV
   route alone, on a fresh table so no value comes from elsewhere. */
static void test_published(void)
{
    wk_kdv_table *K = wk_kdv_table_new();
    for (slong i = 0; i < WK_PUBLISHED_COUNT; i++) {
        const wk_published_value *w = wk_published_values + i;
        check_kdv_value(K, w->g, w->d, w->n, w->num, w->den, w->source);
    }
    wk_kdv_table_free(K);
}

/* e = 1/(24^g g!).
   The one-point formula, written out independently of wk_closed.c. */
static void one_point_formula(fmpq_t e, slong g)
{
    fmpz_t f;
    fmpz_init(f);
    fmpz_set_ui(fmpq_denref(e), 24);
    fmpz_pow_ui(fmpq_denref(e), fmpq_denref(e), (ulong) g);
    fmpz_fac_ui(f, (ulong) g);
    fmpz_mul(fmpq_denref(e), fmpq_denref(e), f);
    fmpz_one(fmpq_numref(e));
    fmpz_clear(f);
}

/* <tau_{3g-2}>_g = 1/(24^g g!) for g = 1..15 by the KdV route (Witten 1991; Itzykson-Zuber 1992;
   from memory), and the closed form of wk_closed_form against the same formula up to g = 40. */
static void test_one_point(wk_kdv_table *K)
{
    slong g, d;
    fmpq_t v, e;
    fmpq_init(v);
    fmpq_init(e);
    for (g = 1; g <= 40; g++) {
        d = 3 * g - 2;
        one_point_formula(e, g);
        if (g <= 15) {
            int st = wk_kdv_correlator(v, K, g, &d, 1);
            UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(v, e), "KdV <tau_%ld>_%ld != 1/(24^g g!)", (long) d,
                       (long) g);
        }
        UNIT_CHECK(&rep, wk_closed_form(v, g, &d, 1) == WK_CLOSED_VALUE && fmpq_equal(v, e),
                   "closed form <tau_%ld>_%ld", (long) d, (long) g);
    }
    fmpq_clear(v);
    fmpq_clear(e);
}

/* Property test (two independent recursions): KdV route == DVV engine on random correlators,
   genus 0..8, 1..8 points, random multi-indices of the right degree; prints the count. */
static void test_kdv_vs_dvv(wk_table *T, wk_kdv_table *K, flint_rand_t st)
{
    long it, iters = unit_iterations(6000), agree = 0;
    slong d[10], g, n;
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    for (it = 0; it < iters; it++) {
        do {
            g = (slong) n_randint(st, 9);
            n = 1 + (slong) n_randint(st, 8);
        } while (2 * g - 2 + n <= 0);
        rand_composition(st, d, n, 3 * g - 3 + n);
        int s1 = wk_table_correlator(a, T, g, d, n), s2 = wk_kdv_correlator(b, K, g, d, n);
        int ok = s1 == WK_OK && s2 == WK_OK && fmpq_equal(a, b) && !fmpq_is_zero(a);
        agree += ok;
        UNIT_CHECK(&rep, ok, "DVV vs KdV (status %d, %d)", s1, s2);
        if (!ok) {
            print_list("input", g, d, n);
            unit_print_fmpq("DVV", a);
            unit_print_fmpq("KdV", b);
        }
    }
    printf("DVV vs KdV: %ld of %ld random correlators (genus <= 8, <= 8 points) agree\n", agree, iters);
    fmpq_clear(a);
    fmpq_clear(b);
}

/* Property test: the genus-0 closed form (n-3)!/prod d_i! (Witten 1991, from memory; it follows
   from the string equation) against the KdV route and the DVV engine, random n <= 14. */
static void test_genus0(wk_table *T, wk_kdv_table *K, flint_rand_t st)
{
    long it, iters = unit_iterations(500);
    slong d[16], n;
    fmpq_t c, a, b;
    fmpq_init(c);
    fmpq_init(a);
    fmpq_init(b);
    for (it = 0; it < iters; it++) {
        n = 3 + (slong) n_randint(st, 12);
        rand_composition(st, d, n, n - 3);
        int kind = wk_closed_form(c, 0, d, n);
        wk_table_correlator(a, T, 0, d, n);
        wk_kdv_correlator(b, K, 0, d, n);
        UNIT_CHECK(&rep, kind == WK_CLOSED_VALUE && fmpq_equal(c, a) && fmpq_equal(c, b),
                   "genus-0 closed form vs DVV and KdV");
        if (!fmpq_equal(c, a) || !fmpq_equal(c, b))
            print_list("input", 0, d, n);
    }
    fmpq_clear(c);
    fmpq_clear(a);
    fmpq_clear(b);
}

/* Which inputs have a closed form: degree mismatch (even on huge spaces) is WK_CLOSED_ZERO, three
   points of index >= 2 in genus >= 1 have none (no string or dilaton step applies), invalid or
   unstable input is left to the engine. */
static void test_closed_kinds(void)
{
    slong one = 1, big = 598, neg[2] = {-1, 4}, two[2] = {2, 3}, three[3] = {2, 2, 2}, z[2] = {0, 0};
    fmpq_t r;
    fmpq_init(r);
    fmpq_set_si(r, 5, 1);
    UNIT_CHECK(&rep, wk_closed_form(r, 100000, &one, 1) == WK_CLOSED_ZERO && fmpq_is_zero(r),
               "<tau_1>_100000 is a degree mismatch");
    UNIT_CHECK(&rep, wk_closed_form(r, 200, &big, 1) == WK_CLOSED_VALUE, "<tau_598>_200 has a closed form");
    big = 500;
    UNIT_CHECK(&rep, wk_closed_form(r, 200, &big, 1) == WK_CLOSED_ZERO, "<tau_500>_200 is a mismatch");
    UNIT_CHECK(&rep, wk_closed_form(r, 2, three, 3) == WK_CLOSED_NONE && fmpq_is_zero(r), "<tau_2^3>_2");
    UNIT_CHECK(&rep, wk_closed_form(r, 2, neg, 2) == WK_CLOSED_NONE, "negative index left to the engine");
    UNIT_CHECK(&rep, wk_closed_form(r, 0, z, 2) == WK_CLOSED_NONE, "unstable space left to the engine");
    UNIT_CHECK(&rep, wk_closed_form(r, -1, z, 2) == WK_CLOSED_NONE, "negative genus left to the engine");
    UNIT_CHECK(&rep, wk_closed_form_kind(3, two, 2) == WK_CLOSED_ZERO, "kind without a value");
    fmpq_clear(r);
}

/* Checks that a KdV call returns the expected status and leaves res = 0 (preset to 5). */
static void expect_status(wk_kdv_table *K, slong g, const slong *d, slong n, int want, const char *what)
{
    fmpq_t r;
    int st;
    fmpq_init(r);
    fmpq_set_si(r, 5, 1);
    st = wk_kdv_correlator(r, K, g, d, n);
    UNIT_CHECK(&rep, st == want && fmpq_is_zero(r), "KdV %s: status %d (want %d)", what, st, want);
    fmpq_clear(r);
}

/* Error codes in the documented order, the Euler-characteristic cap and zero for a mismatch. */
static void test_errors(wk_kdv_table *K)
{
    slong z[3] = {0, 0, 0}, neg[2] = {-1, 3}, big = 3 * 300 - 2;
    expect_status(K, 0, NULL, 0, WK_UNSTABLE, "(0,0)");
    expect_status(K, 0, z, 2, WK_UNSTABLE, "(0,2)");
    expect_status(K, 1, NULL, 0, WK_UNSTABLE, "(1,0)");
    expect_status(K, -1, z, 3, WK_BADARG, "g < 0");
    expect_status(K, 1, z, -2, WK_BADARG, "n < 0");
    expect_status(K, 2, neg, 2, WK_BADARG, "d_i < 0");
    expect_status(K, 0, neg, 2, WK_BADARG, "d_i < 0 on an unstable space");
    expect_status(K, 1, NULL, 2, WK_BADARG, "d = NULL");
    expect_status(NULL, 0, z, 3, WK_BADARG, "T = NULL");
    expect_status(K, 300, &big, 1, WK_LIMIT, "beyond WK_KDV_MAX_EULER");
    expect_status(K, 2, z, 3, WK_OK, "degree mismatch");
}

/* Entry limit, cancel flag: a small limit stops with WK_LIMIT (size capped), lifting it resumes and
   gives 1/(24^5 5!) (Witten 1991, from memory); a raised flag stops a fresh table at once. */
static void test_limit_cancel(void)
{
    wk_kdv_table *K = wk_kdv_table_new();
    atomic_int flag = 1;
    slong d = 13;
    int st;
    fmpq_t r, e;
    fmpq_init(r);
    fmpq_init(e);
    wk_kdv_table_set_limit(K, 10);
    st = wk_kdv_correlator(r, K, 5, &d, 1);
    UNIT_CHECK(&rep, st == WK_LIMIT && fmpq_is_zero(r) && wk_kdv_table_entries(K) <= 10,
               "KdV limit 10: status %d, entries %ld", st, (long) wk_kdv_table_entries(K));
    wk_kdv_table_set_limit(K, 0);
    wk_kdv_table_set_cancel(K, &flag);
    st = wk_kdv_correlator(r, K, 5, &d, 1);
    UNIT_CHECK(&rep, st == WK_CANCELLED && fmpq_is_zero(r), "KdV cancel flag: status %d", st);
    flag = 0;
    st = wk_kdv_correlator(r, K, 5, &d, 1);
    one_point_formula(e, 5);
    UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(r, e), "KdV after lifting limit and flag: status %d", st);
    fmpq_clear(r);
    fmpq_clear(e);
    wk_kdv_table_free(K);
}

/* Evaluates every non-increasing multi-index d[i..n-1] with entries <= cap summing to rem. */
static void all_correlators(wk_kdv_table *K, slong g, slong *d, slong n, slong i, slong rem, slong cap)
{
    slong v;
    if (i == n) {
        if (rem == 0) {
            fmpq_t r;
            fmpq_init(r);
            wk_kdv_correlator(r, K, g, d, n);
            fmpq_clear(r);
        }
        return;
    }
    for (v = (rem < cap ? rem : cap); v >= 0; v--) {
        d[i] = v;
        all_correlators(K, g, d, n, i + 1, rem - v, v);
    }
}

/* Property of the estimate (an upper bound by the argument in wk_kdv.c): computing every correlator
   of Mbar_{g,n} from an empty table stores no more entries than estimated; the nesting stays far
   below WK_KDV_MAX_NEST even at genus 12. */
static void test_estimate_nest(void)
{
    slong g, n, d[12];
    for (g = 0; g <= 5; g++)
        for (n = 0; n <= 6; n++) {
            wk_kdv_table *F;
            double est = wk_kdv_estimate_entries(g, n);
            if (2 * g - 2 + n <= 0)
                continue;
            F = wk_kdv_table_new();
            all_correlators(F, g, d, n, 0, 3 * g - 3 + n, 3 * g - 3 + n);
            UNIT_CHECK(&rep, (double) wk_kdv_table_entries(F) <= est, "KdV estimate (%ld,%ld): %ld entries > %g",
                       (long) g, (long) n, (long) wk_kdv_table_entries(F), est);
            wk_kdv_table_free(F);
        }
    UNIT_CHECK(&rep, wk_kdv_estimate_entries(-1, 3) == 0.0, "KdV estimate of g < 0");
    UNIT_CHECK(&rep, wk_kdv_estimate_entries(5000, 0) == HUGE_VAL, "KdV estimate of g = 5000");
    {
        wk_kdv_table *F = wk_kdv_table_new();
        slong e[3] = {10, 12, 14};
        fmpq_t r;
        fmpq_init(r);
        UNIT_CHECK(&rep, wk_kdv_correlator(r, F, 12, e, 3) == WK_OK && !fmpq_is_zero(r)
                   && wk_kdv_table_max_nest(F) < WK_KDV_MAX_NEST / 10,
                   "KdV nesting at genus 12: %ld", (long) wk_kdv_table_max_nest(F));
        fmpq_clear(r);
        wk_kdv_table_free(F);
    }
}

int main(void)
{
    flint_rand_t st;
    wk_table *T = wk_table_new();
    wk_kdv_table *K = wk_kdv_table_new();
    flint_randinit(st);
    flint_randseed(st, 20261202, 11);
    test_published();
    test_one_point(K);
    test_kdv_vs_dvv(T, K, st);
    test_genus0(T, K, st);
    test_closed_kinds();
    test_errors(K);
    test_limit_cancel();
    test_estimate_nest();
    wk_kdv_table_free(K);
    wk_table_free(T);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_kdv", &rep);
}
