/* test_wpoly.c - the few-point volume polynomials (src/engines/volumes/wpoly.h) against the reduction,
 * a published polynomial, property tests and engine invariants.
 *
 * Notation: W_a = int psi^a kappa_1^{D-|a|} / (D-|a|)!, D = 3g-3+n, and the coefficient of
 * L^{2a} pi^{2(D-|a|)} in V_{g,n}(L) is c_a = W_a 2^{D-|a|} / prod (2^{a_i} a_i!).
 *
 * - Independent method: the pushforward reduction of kappa_1 to psi classes and DVV
 *   correlators (pf_integral, src/correlators), every coefficient for g >= 2, n <= 3, D <= 14,
 *   and random coefficients beyond.
 * - Published: M. Mirzakhani, "Simple geodesics and Weil-Petersson volumes of moduli spaces of
 *   bordered Riemann surfaces", Invent. Math. 167 (2007), table of volume polynomials:
 *   V_{2,1}(L) = (4pi^2+L^2)(12pi^2+L^2)(6960pi^4+384pi^2L^2+5L^4)/2211840 (from memory; it
 *   agrees with the reduction, checked here too).
 * - Property tests (N. Do and P. Norbury, "Weil-Petersson volumes and cone surfaces", Geom.
 *   Dedicata 141 (2009)): V_{g,1}(2 pi i) = 0, V_{g,1}'(2 pi i) = 2 pi i (2g-2) V_{g,0}, and
 *   V_{g,2}(L, 2 pi i) = int_0^L x V_{g,1}(x) dx, at genera beyond the reduction's reach, with
 *   V_{g,0} from the table engine (wpvol.h).  At L = 2 pi i, L^{2a} = (-4)^a pi^{2a}: every
 *   identity becomes one between rationals (the powers of pi match term by term).
 * - Invariants: 1 and 2 threads, 62-bit, 40-bit and 63-bit primes (the last ones force FLINT's
 *   products instead of the transforms), a larger truncation; V_{g,1}(0) = table V_{g,1}.
 */
#include <string.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>
#include <flint/ulong_extras.h>

#include "classes/classexpr.h"
#include "correlators/pushforward.h"
#include "correlators/wk.h"
#include "volumes/wpoly.h"
#include "volumes/wpvol.h"
#include "volumes/wpvol_internal.h"
#include "unit.h"

static unit_report rep;

/* All W_a of (g, n) by the engine (1 thread), in the order of wpoly_indices; caller clears. */
static fmpq *engine(slong g, slong n, slong *nidx, slong **idx)
{
    fmpq *out;
    int st;

    *nidx = wpoly_indices(NULL, g, n);
    *idx = flint_malloc((size_t) (*nidx * n) * sizeof(slong));
    wpoly_indices(*idx, g, n);
    out = _fmpq_vec_init(*nidx);
    st = wpoly_coeffs(out, g, n, 1);
    UNIT_CHECK(&rep, st == WPVOL_OK, "wpoly_coeffs(%ld, %ld) status %d", g, n, st);
    return out;
}

/* W_a by the reduction (independent method). */
static void reference(fmpq_t w, wk_table *T, slong g, const slong *a, slong n)
{
    slong i, kmult[2] = { 0, 3 * g - 3 + n };
    fmpz_t f;

    for (i = 0; i < n; i++)
        kmult[1] -= a[i];
    pf_integral(w, T, g, a, n, kmult, kmult[1] > 0 ? 1 : 0);
    fmpz_init(f);
    fmpz_fac_ui(f, (ulong) kmult[1]);
    fmpq_div_fmpz(w, w, f);
    fmpz_clear(f);
}

/* c = W_a 2^{D-|a|} / prod (2^{a_i} a_i!): the coefficient of V_{g,n}(L). */
static void coeff(fmpq_t c, const fmpq_t w, slong g, const slong *a, slong n)
{
    slong i, s = 0;
    fmpz_t f;

    fmpz_init(f);
    fmpq_set(c, w);
    for (i = 0; i < n; i++)
    {
        s += a[i];
        fmpz_fac_ui(f, (ulong) a[i]);
        fmpq_div_fmpz(c, c, f);
    }
    fmpq_mul_2exp(c, c, (ulong) (3 * g - 3 + n - s));
    fmpq_div_2exp(c, c, (ulong) s);
    fmpz_clear(f);
}

/* Every coefficient against the reduction, g >= 2, n <= 3, D <= 14. */
static void test_reduction_all(void)
{
    slong g, n, k;
    wk_table *T = wk_table_new();

    for (g = 2; g <= 5; g++)
        for (n = 1; n <= 3 && 3 * g - 3 + n <= 14; n++)
        {
            slong nidx, *idx, bad = 0;
            fmpq *out = engine(g, n, &nidx, &idx);
            fmpq_t w;
            fmpq_init(w);
            for (k = 0; k < nidx; k++)
            {
                reference(w, T, g, idx + k * n, n);
                bad += !fmpq_equal(w, out + k);
            }
            UNIT_CHECK(&rep, bad == 0, "(g,n) = (%ld,%ld): %ld of %ld coefficients differ from the "
                       "reduction", g, n, bad, nidx);
            fmpq_clear(w);
            _fmpq_vec_clear(out, nidx);
            flint_free(idx);
        }
    wk_table_free(T);
}

/* Random coefficients of larger cases against the reduction. */
static void test_reduction_random(void)
{
    static const slong cases[][2] = { { 6, 1 }, { 7, 1 }, { 6, 2 }, { 5, 3 }, { 4, 4 } };
    flint_rand_t st;
    wk_table *T = wk_table_new();
    size_t c;
    long it, iters = unit_iterations(4);

    flint_randinit(st);
    for (c = 0; c < sizeof cases / sizeof cases[0]; c++)
    {
        slong g = cases[c][0], n = cases[c][1], nidx, *idx;
        fmpq *out = engine(g, n, &nidx, &idx);
        fmpq_t w;
        fmpq_init(w);
        for (it = 0; it < iters; it++)
        {
            slong k = (slong) n_randint(st, (ulong) nidx);
            reference(w, T, g, idx + k * n, n);
            UNIT_CHECK(&rep, fmpq_equal(w, out + k), "(g,n) = (%ld,%ld), index %ld: engine "
                       "differs from the reduction", g, n, k);
        }
        fmpq_clear(w);
        _fmpq_vec_clear(out, nidx);
        flint_free(idx);
    }
    flint_randclear(st);
    wk_table_free(T);
}

/* Mirzakhani 2007 (from memory): V_{2,1}(L) = (4pi^2+L^2)(12pi^2+L^2)(6960pi^4+384pi^2L^2
   +5L^4)/2211840, i.e. in powers of L^2 (pi = 1): 334080, 129792, 13344, 464, 5 over 2211840. */
static void test_mirzakhani(void)
{
    static const slong num[5] = { 334080, 129792, 13344, 464, 5 };
    slong nidx, *idx, a;
    fmpq *out = engine(2, 1, &nidx, &idx);
    fmpq_t c, q;

    fmpq_init(c);
    fmpq_init(q);
    UNIT_CHECK(&rep, nidx == 5, "V_{2,1} has %ld coefficients", nidx);
    for (a = 0; a < 5 && a < nidx; a++)
    {
        coeff(c, out + a, 2, &a, 1);
        fmpq_set_si(q, num[a], 2211840);
        UNIT_CHECK(&rep, fmpq_equal(c, q), "V_{2,1}: coefficient of L^%ld (Mirzakhani 2007, from "
                   "memory)", 2 * a);
    }
    fmpq_clear(c);
    fmpq_clear(q);
    _fmpq_vec_clear(out, nidx);
    flint_free(idx);
}

/* Property test (Do-Norbury 2009): with c_a the coefficients of V_{g,1},
   sum_a c_a (-4)^a = 0 and sum_a 2a c_a (-4)^a = -4 (2g-2) 2^{3g-3} V_{g,0}. */
static void test_do_norbury_one(slong gmax)
{
    slong g, a;
    fmpq *tab = _fmpq_vec_init((gmax + 1) * 1);
    int st = wpvol_table(tab, gmax, 0, 1);

    UNIT_CHECK(&rep, st == WPVOL_OK, "wpvol_table(%ld, 0)", gmax);
    for (g = 2; g <= gmax; g++)
    {
        slong nidx, *idx;
        fmpq *out = engine(g, 1, &nidx, &idx);
        fmpq_t c, s0, s1, t, rhs;
        fmpz_t p;

        fmpq_init(c);
        fmpq_init(s0);
        fmpq_init(s1);
        fmpq_init(t);
        fmpq_init(rhs);
        fmpz_init(p);
        for (a = 0; a < nidx; a++)
        {
            coeff(c, out + a, g, &a, 1);
            fmpz_set_si(p, -4);
            fmpz_pow_ui(p, p, (ulong) a);
            fmpq_mul_fmpz(t, c, p);
            fmpq_add(s0, s0, t);
            fmpq_mul_si(t, t, 2 * a);
            fmpq_add(s1, s1, t);
        }
        fmpq_mul_si(rhs, tab + g, -4 * (2 * g - 2));
        fmpq_mul_2exp(rhs, rhs, (ulong) (3 * g - 3));
        UNIT_CHECK(&rep, fmpq_is_zero(s0), "V_{%ld,1}(2 pi i) = 0 (Do-Norbury 2009, property)", g);
        UNIT_CHECK(&rep, fmpq_equal(s1, rhs), "V_{%ld,1}'(2 pi i) = 2 pi i (2g-2) V_{g,0} "
                   "(Do-Norbury 2009, property)", g);
        fmpq_clear(c);
        fmpq_clear(s0);
        fmpq_clear(s1);
        fmpq_clear(t);
        fmpq_clear(rhs);
        fmpz_clear(p);
        _fmpq_vec_clear(out, nidx);
        flint_free(idx);
    }
    _fmpq_vec_clear(tab, gmax + 1);
}

/* Position of the sorted pair (a1, a2) in the order of wpoly_indices (n = 2), or -1. */
static slong pair_pos(const slong *idx, slong nidx, slong a1, slong a2)
{
    slong k, x = a1 > a2 ? a1 : a2, y = a1 > a2 ? a2 : a1;

    for (k = 0; k < nidx; k++)
        if (idx[2 * k] == x && idx[2 * k + 1] == y)
            return k;
    return -1;
}

/* Property test (Do-Norbury 2009): V_{g,2}(L, 2 pi i) = int_0^L x V_{g,1}(x) dx, i.e. for the
   coefficients c_{a1,a2} of V_{g,2} and c_b of V_{g,1}:
   sum_{a2} c_{a1,a2} (-4)^{a2} = c_{a1-1} / (2 a1) (a1 >= 1), and 0 for a1 = 0. */
static void test_do_norbury_two(slong gmin, slong gmax)
{
    slong g;

    for (g = gmin; g <= gmax; g++)
    {
        slong n1, *i1, n2, *i2, a1, a2, D2 = 3 * g - 1, bad = 0;
        fmpq *v1 = engine(g, 1, &n1, &i1), *v2 = engine(g, 2, &n2, &i2);
        fmpq_t c, s, t;
        fmpz_t p;

        fmpq_init(c);
        fmpq_init(s);
        fmpq_init(t);
        fmpz_init(p);
        for (a1 = 0; a1 <= D2; a1++)
        {
            fmpq_zero(s);
            for (a2 = 0; a1 + a2 <= D2; a2++)
            {
                slong k = pair_pos(i2, n2, a1, a2), a[2];
                a[0] = i2[2 * k];
                a[1] = i2[2 * k + 1];
                coeff(c, v2 + k, g, a, 2);
                fmpz_set_si(p, -4);
                fmpz_pow_ui(p, p, (ulong) a2);
                fmpq_mul_fmpz(c, c, p);
                fmpq_add(s, s, c);
            }
            fmpq_zero(t);
            if (a1 >= 1)
            {
                slong b = a1 - 1;
                coeff(t, v1 + b, g, &b, 1);
                fmpq_div_fmpz(t, t, (fmpz_set_si(p, 2 * a1), p));
            }
            bad += !fmpq_equal(s, t);
        }
        UNIT_CHECK(&rep, bad == 0, "V_{%ld,2}(L, 2 pi i) = int_0^L x V_{%ld,1}(x) dx: %ld "
                   "coefficients differ (Do-Norbury 2009, property)", g, g, bad);
        fmpq_clear(c);
        fmpq_clear(s);
        fmpq_clear(t);
        fmpz_clear(p);
        _fmpq_vec_clear(v1, n1);
        _fmpq_vec_clear(v2, n2);
        flint_free(i1);
        flint_free(i2);
    }
}

/* W_{(0)} = V_{g,1} of the table engine (string direction, no change of I_2). */
static void test_table_agreement(slong gmax)
{
    slong g;
    fmpq *tab = _fmpq_vec_init((gmax + 1) * 2);
    int st = wpvol_table(tab, gmax, 1, 2);

    UNIT_CHECK(&rep, st == WPVOL_OK, "wpvol_table(%ld, 1)", gmax);
    for (g = 2; g <= gmax; g++)
    {
        slong zero = 0;
        fmpq_t w;
        fmpq_init(w);
        st = wpoly_coeffs_at(w, g, 1, &zero, 1, 2);
        UNIT_CHECK(&rep, st == WPVOL_OK && fmpq_equal(w, tab + 2 * g + 1),
                   "W_0 = V_{%ld,1} of the table engine", g);
        fmpq_clear(w);
    }
    _fmpq_vec_clear(tab, (gmax + 1) * 2);
}

/* 1 if the two vectors of n rationals are equal. */
static int vec_equal(const fmpq *a, const fmpq *b, slong n)
{
    slong k;

    for (k = 0; k < n; k++)
        if (!fmpq_equal(a + k, b + k))
            return 0;
    return 1;
}

/* Same result for 1 and 2 threads, 62-, 40- and 63-bit primes, and 3 extra orders of
   truncation (the last checks the bound S = 3g + n - 4 empirically). */
static void test_invariants(void)
{
    static const slong cases[][2] = { { 9, 1 }, { 5, 2 }, { 3, 3 } };
    size_t c;

    for (c = 0; c < sizeof cases / sizeof cases[0]; c++)
    {
        slong g = cases[c][0], n = cases[c][1], nidx = wpoly_indices(NULL, g, n), k, used = 0;
        fmpq *ref = _fmpq_vec_init(nidx), *x = _fmpq_vec_init(nidx);
        static const int bits[] = { 62, 40, 63 };
        int st = wpoly_coeffs_ex(ref, g, n, 1, 62, 1, 0, NULL);

        UNIT_CHECK(&rep, st == WPVOL_OK, "(%ld,%ld) status %d", g, n, st);
        st = wpoly_coeffs_ex(x, g, n, 2, 62, 1, 0, NULL);
        UNIT_CHECK(&rep, st == WPVOL_OK && vec_equal(ref, x, nidx),
                   "(%ld,%ld): 2 threads", g, n);
        for (k = 1; k < 3; k++)
        {
            st = wpoly_coeffs_ex(x, g, n, 2, bits[k], 1, 0, &used);
            UNIT_CHECK(&rep, st == WPVOL_OK && vec_equal(ref, x, nidx),
                       "(%ld,%ld): %d-bit primes (%ld used)", g, n, bits[k], used);
        }
        st = wpoly_coeffs_ex(x, g, n, 1, 62, 1, 3, NULL);
        UNIT_CHECK(&rep, st == WPVOL_OK && vec_equal(ref, x, nidx),
                   "(%ld,%ld): truncation S + 3", g, n);
        _fmpq_vec_clear(ref, nidx);
        _fmpq_vec_clear(x, nidx);
    }
}

/* wpoly_coeffs_at on chosen indices gives the entries of the full output; invalid lists are
   refused. */
static void test_coeffs_at(void)
{
    slong g = 6, n = 2, nidx, *idx, pick[6], k;
    fmpq *all = engine(g, n, &nidx, &idx), *some = _fmpq_vec_init(3);
    slong at[3] = { nidx - 1, nidx / 2, 3 }, bad[2] = { 1, 2 };
    int st;

    for (k = 0; k < 3; k++)
    {
        pick[2 * k] = idx[2 * at[k]];
        pick[2 * k + 1] = idx[2 * at[k] + 1];
    }
    st = wpoly_coeffs_at(some, g, n, pick, 3, 2);
    for (k = 0; k < 3; k++)
        UNIT_CHECK(&rep, st == WPVOL_OK && fmpq_equal(some + k, all + at[k]),
                   "wpoly_coeffs_at entry %ld (index %ld)", k, at[k]);
    UNIT_CHECK(&rep, wpoly_coeffs_at(some, g, n, bad, 1, 1) == WPVOL_BADARG, "unsorted index");
    bad[0] = 3 * g;
    bad[1] = 0;
    UNIT_CHECK(&rep, wpoly_coeffs_at(some, g, n, bad, 1, 1) == WPVOL_BADARG, "|a| > D refused");
    _fmpq_vec_clear(all, nidx);
    _fmpq_vec_clear(some, 3);
    flint_free(idx);
}

/* The matcher that routes int_{g,n} monomials: products of scalars, psi_i (i <= n), kappa_1,
   their powers and at most one exp(c kappa_1); anything else is left to the reduction. */
static void test_matcher(void)
{
    fmpq_mpoly_ctx_t ctx;
    fmpq_mpoly_t three;
    cx_monomial m;
    cx *e;

    fmpq_mpoly_ctx_init(ctx, 2, ORD_DEGLEX);
    fmpq_mpoly_init(three, ctx);
    fmpq_mpoly_init(m.factor, ctx);
    fmpq_mpoly_init(m.c, ctx);
    fmpq_mpoly_set_si(three, 3, ctx);
    /* 3 * psi_1^2 * (kappa_1^4 * psi_2) * psi_1 */
    e = cx_mul(cx_mul(cx_scalar(three, ctx), cx_pow(cx_psi(1, ctx, NULL), 2, NULL)),
               cx_mul(cx_mul(cx_pow(cx_kappa(1, ctx, NULL), 4, NULL), cx_psi(2, ctx, NULL)),
                      cx_psi(1, ctx, NULL)));
    UNIT_CHECK(&rep, cx_match_psi_kappa1(e, 2, &m) && m.psi[0] == 3 && m.psi[1] == 1
               && m.kappa1 == 4 && !m.is_exp && fmpq_mpoly_equal(m.factor, three, ctx),
               "3 psi_1^3 psi_2 kappa_1^4 recognised");
    UNIT_CHECK(&rep, !cx_match_psi_kappa1(e, 1, &m), "psi_2 on one point refused");
    cx_release(e);
    /* psi_1 * exp(3 kappa_1) * exp(kappa_1): two exponentials are not a monomial */
    e = cx_mul(cx_psi(1, ctx, NULL), cx_exp(cx_mul(cx_scalar(three, ctx), cx_kappa(1, ctx, NULL)), NULL));
    UNIT_CHECK(&rep, cx_match_psi_kappa1(e, 1, &m) && m.is_exp && fmpq_mpoly_equal(m.c, three, ctx)
               && m.psi[0] == 1 && m.kappa1 == 0, "psi_1 exp(3 kappa_1) recognised");
    e = cx_mul(e, cx_exp(cx_kappa(1, ctx, NULL), NULL));
    UNIT_CHECK(&rep, !cx_match_psi_kappa1(e, 1, &m), "two exponentials refused");
    cx_release(e);
    e = cx_add(cx_psi(1, ctx, NULL), cx_kappa(1, ctx, NULL));
    UNIT_CHECK(&rep, !cx_match_psi_kappa1(e, 1, &m), "a sum refused");
    cx_release(e);
    e = cx_mul(cx_psi(1, ctx, NULL), cx_kappa(2, ctx, NULL));
    UNIT_CHECK(&rep, !cx_match_psi_kappa1(e, 1, &m), "kappa_2 refused");
    cx_release(e);
    fmpq_mpoly_clear(three, ctx);
    fmpq_mpoly_clear(m.factor, ctx);
    fmpq_mpoly_clear(m.c, ctx);
    fmpq_mpoly_ctx_clear(ctx);
}

/* Bad arguments, an absurd request refused by the estimate, the index counts. */
static void test_errors(void)
{
    fmpq_t q;
    slong idx[3 * 10];

    fmpq_init(q);
    UNIT_CHECK(&rep, wpoly_coeffs(q, 1, 1, 1) == WPVOL_BADARG, "g = 1 refused");
    UNIT_CHECK(&rep, wpoly_coeffs(q, 2, 0, 1) == WPVOL_BADARG, "n = 0 refused");
    UNIT_CHECK(&rep, wpoly_coeffs(q, 2, WPOLY_MAX_POINTS + 1, 1) == WPVOL_BADARG, "n too large");
    UNIT_CHECK(&rep, wpoly_coeffs(q, 2, 1, 0) == WPVOL_BADARG, "0 threads refused");
    UNIT_CHECK(&rep, wpoly_coeffs(NULL, 2, 1, 1) == WPVOL_BADARG, "NULL output refused");
    {
        slong nbig = wpoly_indices(NULL, 100000, 1);
        fmpq *big = _fmpq_vec_init(nbig);
        double sec, bytes;
        wpoly_estimate(&sec, &bytes, 100000, 1);
        UNIT_CHECK(&rep, sec > WPVOL_MAX_SECONDS, "estimate for g = 100000: %g s", sec);
        UNIT_CHECK(&rep, wpoly_coeffs(big, 100000, 1, 1) == WPVOL_LIMIT, "g = 100000 refused by "
                   "the estimate");
        _fmpq_vec_clear(big, nbig);
    }
    UNIT_CHECK(&rep, wpoly_indices(NULL, 5, 1) == 14, "n = 1: D + 1 indices");
    UNIT_CHECK(&rep, wpoly_indices(NULL, 2, 2) == 12, "(2,2): partitions of 0..5 in 2 parts");
    UNIT_CHECK(&rep, wpoly_indices(idx, 2, 1) == 5 && idx[0] == 0 && idx[4] == 4,
               "n = 1 order a = 0..D");
    fmpq_clear(q);
}

/* With the argument "threads", only the parts that run the engine on several
   threads (for the ThreadSanitizer build, where the rest is too slow). */
/* Property of the size model's guess (not a theorem): the denominator multiple B of (g, n)
   that the engine offers the driver (wpvol_estimate_den_mult) is a multiple of the denominator
   of (D-|a|)! W_a for every multi-index a, n = 1 with g <= 16 and n = 2 with g <= 7 (a wrong
   guess would only cost primes; this keeps the guess honest). */
static void test_den_mult(void)
{
    slong miss = 0, seen = 0;
    fmpz_t B, f;
    fmpz_init(B);
    fmpz_init(f);
    for (slong n = 1; n <= 2; n++)
        for (slong g = 2; g <= (n == 1 ? 16 : 7); g++) {
            slong nidx = wpoly_indices(NULL, g, n), *idx = malloc((size_t)(nidx * n) * sizeof(slong));
            fmpq *out = _fmpq_vec_init(nidx);
            wpoly_indices(idx, g, n);
            int st = wpoly_coeffs(out, g, n, 2);
            UNIT_CHECK(&rep, st == WPVOL_OK, "wpoly_coeffs(%ld, %ld) status %d", g, n, st);
            wpvol_estimate_den_mult(B, g, n);
            for (slong k = 0; st == WPVOL_OK && k < nidx; k++) {
                slong s = 3 * g - 3 + n;
                for (slong i = 0; i < n; i++)
                    s -= idx[k * n + i];
                fmpz_fac_ui(f, (ulong)s);   /* den of (D-|a|)! W_a divides B iff B (D-|a|)! W_a is an integer */
                fmpz_mul(f, f, B);
                fmpz_mul(f, f, fmpq_numref(out + k));
                miss += !fmpz_divisible(f, fmpq_denref(out + k));
                seen++;
            }
            _fmpq_vec_clear(out, nidx);
            free(idx);
        }
    UNIT_CHECK(&rep, miss == 0 && seen > 0, "denominator multiple of every coefficient: %ld of %ld missed", miss,
               seen);
    fmpz_clear(B);
    fmpz_clear(f);
}

int main(int argc, char **argv)
{
    if (argc > 1 && strcmp(argv[1], "threads") == 0) {
        test_errors();
        test_invariants();
        flint_cleanup_master();
        return unit_finish("test_wpoly threads", &rep);
    }
    test_errors();
    test_reduction_all();
    test_reduction_random();
    test_mirzakhani();
    test_coeffs_at();
    test_matcher();
    test_table_agreement(30);
    test_invariants();
    test_do_norbury_one(15);
    test_do_norbury_two(2, 8);
    test_den_mult();
    flint_cleanup_master();
    return unit_finish("test_wpoly", &rep);
}
