/* test_closed.c - the table-free correlators of wk_closed.c and wk_twopoint.c.
 *
 * 1. The two-point closed form <tau_k tau_{3g-1-k}>_g (R. Dijkgraaf, "Intersection theory,
 *    integrable hierarchies and topological field theory", 1992, from memory; derivation in
 *    wk_twopoint.c) against the DVV recursion of wk.c on random (g, k), and against the published
 *    two-point values of wk_published.h (their sources are named there).
 * 2. The string and dilaton reductions to closed forms (property test: the identities themselves)
 *    against the DVV recursion on random correlators with indices 0 and 1 added.
 * 3. Correlators far beyond any table answer at once: <tau_0 tau_299>_100 = <tau_298>_100 (string),
 *    <tau_1 tau_298>_100 = 199 <tau_298>_100 (dilaton), with <tau_{3g-2}>_g = 1/(24^g g!) (E. Witten,
 *    "Two-dimensional gravity and intersection theory on moduli space", 1991, from memory; also in
 *    test_wk.c against DVV); and int_{Mbar_{30,0}} kappa_87 = <tau_88>_30 by the pushforward with no
 *    table entry.
 * 4. Symmetry <tau_k tau_l>_g = <tau_l tau_k>_g at large genus (property test of the formula, whose
 *    sum is not visibly symmetric).
 */
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/flint.h>
#include <flint/ulong_extras.h>
#include "correlators/pushforward.h"
#include "correlators/wk.h"
#include "unit.h"
#include "wk_published.h"

static unit_report rep;

/* Random (g, k) with 1 <= g <= 16: the closed form against a fresh DVV table, which shares
   nothing with it.  Prints how many cases agreed. */
static void test_two_point_vs_dvv(flint_rand_t st)
{
    long iters = unit_iterations(1500), agree = 0;
    wk_table *T = wk_table_new();
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    for (long it = 0; it < iters; it++) {
        slong g = 1 + (slong) n_randint(st, 16), k = (slong) n_randint(st, (ulong) (3 * g)), d[2];
        d[0] = k;
        d[1] = 3 * g - 1 - k;
        int ok = wk_two_point(a, g, k) && wk_table_correlator(b, T, g, d, 2) == WK_OK && fmpq_equal(a, b);
        UNIT_CHECK(&rep, ok, "two-point form vs DVV at g = %ld, k = %ld", (long) g, (long) k);
        agree += ok;
    }
    printf("two-point form vs DVV: %ld of %ld random (g <= 16, k) agree\n", agree, iters);
    fmpq_clear(a);
    fmpq_clear(b);
    wk_table_free(T);
}

/* Every published two-point value of wk_published.h, by the formula alone. */
static void test_two_point_published(void)
{
    fmpq_t a, want;
    long count = 0;
    fmpq_init(a);
    fmpq_init(want);
    for (slong i = 0; i < WK_PUBLISHED_COUNT; i++) {
        const wk_published_value *p = wk_published_values + i;
        if (p->n != 2)
            continue;
        fmpq_set_si(want, p->num, (ulong) p->den);
        UNIT_CHECK(&rep, wk_two_point(a, p->g, p->d[0]) && fmpq_equal(a, want),
                   "two-point form vs published <tau_%ld tau_%ld>_%ld (%s)", (long) p->d[0], (long) p->d[1],
                   (long) p->g, p->source);
        UNIT_CHECK(&rep, wk_two_point(a, p->g, p->d[1]) && fmpq_equal(a, want), "the same, other order");
        count++;
    }
    UNIT_CHECK(&rep, count >= 4, "the published table has two-point values (%ld)", count);
    fmpq_clear(a);
    fmpq_clear(want);
}

/* Random correlators: a few indices >= 2 (at most two of them, so that a closed form must be
   found) plus random indices 0 and 1, completed to the dimension; closed form vs DVV. */
static void test_reductions_vs_dvv(flint_rand_t st)
{
    long iters = unit_iterations(400), agree = 0, closed = 0;
    wk_table *T = wk_table_new();
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    for (long it = 0; it < iters; it++) {
        slong g = (slong) n_randint(st, 7), z = (slong) n_randint(st, 4), o = (slong) n_randint(st, 4);
        slong n = z + o + 2, d[12], i;
        slong D = 3 * g - 3 + n - o, k;   /* what the two big indices must sum to */
        if (2 * g - 2 + n <= 0 || D < 0)
            continue;
        k = (slong) n_randint(st, (ulong) D + 1);
        for (i = 0; i < z; i++)
            d[i] = 0;
        for (; i < z + o; i++)
            d[i] = 1;
        d[i++] = k;
        d[i] = D - k;
        int kind = wk_closed_form(a, g, d, n);
        if (kind == WK_CLOSED_NONE)
            continue;     /* e.g. both big indices 1 or 0: a table-only shape is not this test's concern */
        closed++;
        int ok = wk_table_correlator(b, T, g, d, n) == WK_OK && fmpq_equal(a, b);
        UNIT_CHECK(&rep, ok, "string/dilaton reduction vs DVV at g = %ld, %ld zeros, %ld ones, k = %ld, %ld",
                   (long) g, (long) z, (long) o, (long) k, (long) (D - k));
        agree += ok;
    }
    printf("string/dilaton reductions vs DVV: %ld of %ld closed cases agree\n", agree, closed);
    UNIT_CHECK(&rep, closed > iters / 2, "most random shapes have a closed form (%ld of %ld)", closed, iters);
    fmpq_clear(a);
    fmpq_clear(b);
    wk_table_free(T);
}

/* <tau_{3g-2}>_g = 1/(24^g g!) times c, as a check value.  g >= 1. */
static void one_point_times(fmpq_t r, slong g, slong c)
{
    fmpz_t f;
    fmpz_init(f);
    fmpz_set_ui(fmpq_denref(r), 24);
    fmpz_pow_ui(fmpq_denref(r), fmpq_denref(r), (ulong) g);
    fmpz_fac_ui(f, (ulong) g);
    fmpz_mul(fmpq_denref(r), fmpq_denref(r), f);
    fmpz_set_si(fmpq_numref(r), c);
    fmpq_canonicalise(r);
    fmpz_clear(f);
}

/* Large cases with an empty table that refuses every entry (limit 1): the answers must come from
   the closed forms alone. */
static void test_large_without_table(void)
{
    wk_table *T = wk_table_new();
    wk_table_set_limit(T, 1);
    fmpq_t a, want;
    fmpq_init(a);
    fmpq_init(want);
    slong s[2] = {0, 299}, dl[2] = {1, 298}, kmult[88] = {0};
    one_point_times(want, 100, 1);
    UNIT_CHECK(&rep, wk_correlator(a, T, 100, s, 2) == WK_OK && fmpq_equal(a, want), "<tau_0 tau_299>_100");
    one_point_times(want, 100, 199);
    UNIT_CHECK(&rep, wk_correlator(a, T, 100, dl, 2) == WK_OK && fmpq_equal(a, want), "<tau_1 tau_298>_100");
    kmult[87] = 1;
    one_point_times(want, 30, 1);
    UNIT_CHECK(&rep, pf_all_closed(30, NULL, 0, kmult, 87), "kappa_87 on Mbar_{30,0} needs no table");
    UNIT_CHECK(&rep, pf_integral(a, T, 30, NULL, 0, kmult, 87) == WK_OK && fmpq_equal(a, want),
               "int_{Mbar_{30,0}} kappa_87 = <tau_88>_30");
    slong p[2] = {2, 87};
    UNIT_CHECK(&rep, wk_correlator(a, T, 30, p, 2) == WK_OK && !fmpq_is_zero(a), "<tau_2 tau_87>_30");
    UNIT_CHECK(&rep, wk_table_entries(T) == 0, "no table entry was made");
    fmpq_clear(a);
    fmpq_clear(want);
    wk_table_free(T);
}

/* Property test: the formula is symmetric in k <-> 3g-1-k, at genera far beyond the table. */
static void test_two_point_symmetry(flint_rand_t st)
{
    long iters = unit_iterations(20);
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    for (long it = 0; it < iters; it++) {
        slong g = 20 + (slong) n_randint(st, 200), k = (slong) n_randint(st, (ulong) (3 * g));
        UNIT_CHECK(&rep, wk_two_point(a, g, k) && wk_two_point(b, g, 3 * g - 1 - k) && fmpq_equal(a, b)
                   && fmpq_sgn(a) > 0, "symmetry and positivity at g = %ld, k = %ld", (long) g, (long) k);
    }
    UNIT_CHECK(&rep, !wk_two_point(a, WK_TWO_POINT_MAX_G + 1, 2) && fmpq_is_zero(a), "beyond the cap: 0");
    fmpq_clear(a);
    fmpq_clear(b);
}

int main(void)
{
    flint_rand_t st;
    flint_randinit(st);
    test_two_point_vs_dvv(st);
    test_two_point_published();
    test_reductions_vs_dvv(st);
    test_large_without_table();
    test_two_point_symmetry(st);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_closed", &rep);
}
