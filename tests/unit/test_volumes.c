/* test_volumes.c - the Weil-Petersson volume engine (src/volumes) against published values,
 * against independent small computations, and property tests.
 *
 * Normalisation: V_{g,n} = int_{Mbar_{g,n}} kappa_1^{3g-3+n} / (3g-3+n)! (Arbarello-Cornalba
 * kappa_1, plain integral without orbifold correction); the Weil-Petersson volume of the
 * symplectic form 2 pi^2 kappa_1 is (2 pi^2)^{3g-3+n} V_{g,n}.
 *
 * Sources of the published values (all quoted from memory, converted to this normalisation by
 * dividing by (2 pi^2)^{3g-3+n}):
 *  - M. Mirzakhani, "Simple geodesics and Weil-Petersson volumes of moduli spaces of bordered
 *    Riemann surfaces", Invent. Math. 167 (2007), table of volume polynomials:
 *    V_{1,1}(0) = pi^2/12 for the integral (the table lists twice that, counting the elliptic
 *    involution), V_{0,4}(0) = 2 pi^2, V_{0,5}(0) = 10 pi^4, V_{1,2}(0) = pi^4/4,
 *    V_{0,6}(0) = 244 pi^6/3, V_{1,3}(0) = 14 pi^6/9, V_{2,0} = 43 pi^6/2160,
 *    V_{2,1}(L) = (4pi^2+L^2)(12pi^2+L^2)(6960pi^4+384pi^2L^2+5L^4)/2211840, so V_{2,1}(0) = 29 pi^8/192.
 *  - P. Zograf's tables of Weil-Petersson volumes (and Mirzakhani's later papers):
 *    V_{3,0} = 176557 pi^12 / 1209600, V_{4,0} = 1959225867017 pi^18 / 493807104000.
 * Note on V_{0,5}: in this normalisation it is 5/2, not 5/4 (int_{Mbar_{0,5}} kappa_1^2 = 5, and
 * 10 pi^4 / (2 pi^2)^2 = 5/2).
 *
 * Independent computations (sharing no code with the engine):
 *  - genus 0: P. Zograf, "The Weil-Petersson volume of the moduli space of punctured spheres",
 *    Contemp. Math. 150 (1993): v_3 = 1,
 *        v_n = 1/2 sum_{i=1}^{n-3} i(n-i-2)/(n-1) C(n-4,i-1) C(n,i+1) v_{i+2} v_{n-i},
 *    and V_{0,n} = v_n/(n-3)! here (recursion recalled from memory; its normalisation is fixed by
 *    V_{0,4} = 1).
 *  - genus 1: the genus-one free energy F_1 = (1/24) log(d_0^2 F_0 derivative) (Witten;
 *    Itzykson-Zuber 1992; in the Weil-Petersson setting Kaufmann-Manin-Zagier 1996, from
 *    memory): along the Weil-Petersson point sum_n V_{1,n} x^n/n! = (1/24) log u'(x), where u(x)
 *    inverts x(u) = sum_{k>=1} (-1)^{k-1} u^k/(k!(k-1)!) (genus-zero string equation), computed
 *    here with exact rational series.
 */
#include <math.h>
#include <string.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>
#include <flint/fmpq_poly.h>
#include <flint/nmod_poly.h>
#include <flint/ulong_extras.h>

#include "volumes/wpvol.h"
#include "volumes/wpvol_internal.h"
#include "unit.h"

static unit_report rep;

/* Checks out[g*(N+1)+n] == a/b and reports the difference otherwise. */
static void check_value(const fmpq *out, slong N, slong g, slong n, slong a, slong b,
                        const char *src)
{
    fmpq_t q;
    int ok;

    fmpq_init(q);
    fmpq_set_si(q, a, (ulong) b);
    ok = fmpq_equal(out + g * (N + 1) + n, q);
    UNIT_CHECK(&rep, ok, "V_{%ld,%ld} = %ld/%ld (%s)", g, n, a, b, src);
    if (!ok)
        unit_print_fmpq("engine", out + g * (N + 1) + n);
    fmpq_clear(q);
}

/* Published values (sources in the header comment). */
static void test_published(void)
{
    slong G = 4, N = 6;
    fmpq *out = _fmpq_vec_init((G + 1) * (N + 1));
    int st = wpvol_table(out, G, N, 1);

    UNIT_CHECK(&rep, st == WPVOL_OK, "wpvol_table(4, 6) status %d", st);
    check_value(out, N, 1, 1, 1, 24, "Mirzakhani 2007, from memory");
    check_value(out, N, 0, 3, 1, 1, "Mbar_{0,3} is a point");
    check_value(out, N, 0, 4, 1, 1, "Mirzakhani 2007 / Zograf 1993, from memory");
    check_value(out, N, 0, 5, 5, 2, "Mirzakhani 2007, from memory");
    check_value(out, N, 0, 6, 61, 6, "Mirzakhani 2007 / Zograf 1993, from memory");
    check_value(out, N, 1, 2, 1, 16, "Mirzakhani 2007, from memory");
    check_value(out, N, 1, 3, 7, 36, "Mirzakhani 2007, from memory");
    check_value(out, N, 2, 0, 43, 17280, "Mirzakhani 2007 / Zograf, from memory");
    check_value(out, N, 2, 1, 29, 3072, "Mirzakhani 2007, from memory");
    check_value(out, N, 3, 0, 176557, 77414400, "Zograf's tables, from memory");
    /* 1959225867017 pi^18 / 493807104000 divided by (2 pi^2)^9 */
    check_value(out, N, 4, 0, WORD(1959225867017), WORD(252829237248000),
                "Zograf's tables, from memory");
    /* unstable entries are 0 by contract */
    UNIT_CHECK(&rep, fmpq_is_zero(out + 0) && fmpq_is_zero(out + 1) && fmpq_is_zero(out + 2)
               && fmpq_is_zero(out + (N + 1)), "unstable entries are zero");
    _fmpq_vec_clear(out, (G + 1) * (N + 1));
}

/* Zograf's genus-0 recursion, exact: v[n] for 3 <= n <= nmax (v must hold nmax+1 entries). */
static void zograf_genus0(fmpq *v, slong nmax)
{
    slong n, i;
    fmpz_t b1, b2;
    fmpq_t t;

    fmpz_init(b1);
    fmpz_init(b2);
    fmpq_init(t);
    fmpq_one(v + 3);
    for (n = 4; n <= nmax; n++)
    {
        fmpq_zero(v + n);
        for (i = 1; i <= n - 3; i++)
        {
            fmpz_bin_uiui(b1, (ulong) (n - 4), (ulong) (i - 1));
            fmpz_bin_uiui(b2, (ulong) n, (ulong) (i + 1));
            fmpz_mul(b1, b1, b2);
            fmpz_mul_si(b1, b1, i * (n - i - 2));
            fmpq_mul(t, v + i + 2, v + n - i);
            fmpq_mul_fmpz(t, t, b1);
            fmpz_set_si(b2, 2 * (n - 1));
            fmpq_div_fmpz(t, t, b2);
            fmpq_add(v + n, v + n, t);
        }
    }
    fmpz_clear(b1);
    fmpz_clear(b2);
    fmpq_clear(t);
}

/* Cross-check of genus 0, n <= 20, against Zograf's recursion (independent computation). */
static void test_genus0_zograf(void)
{
    slong N = 20, n;
    fmpq *out = _fmpq_vec_init(N + 1), *v = _fmpq_vec_init(N + 1);
    fmpz_t f;
    fmpq_t w;
    int st = wpvol_table(out, 0, N, 2), all = 1;

    fmpz_init(f);
    fmpq_init(w);
    UNIT_CHECK(&rep, st == WPVOL_OK, "wpvol_table(0, 20) status %d", st);
    zograf_genus0(v, N);
    for (n = 3; n <= N; n++)
    {
        fmpz_fac_ui(f, (ulong) (n - 3));
        fmpq_div_fmpz(w, v + n, f);
        all &= fmpq_equal(w, out + n);
    }
    UNIT_CHECK(&rep, all, "V_{0,n} = v_n/(n-3)! for 3 <= n <= 20 (Zograf 1993 recursion)");
    fmpz_clear(f);
    fmpq_clear(w);
    _fmpq_vec_clear(out, N + 1);
    _fmpq_vec_clear(v, N + 1);
}

/* Cross-check of genus 1, 1 <= n <= 20: n! [x^n] (1/24) log u'(x) with exact series. */
static void test_genus1_log(void)
{
    slong N = 20, n;
    fmpq *out = _fmpq_vec_init(2 * (N + 1));
    fmpq_poly_t xu, ux, du, lg;
    fmpz_t f, num;
    fmpq_t c, w;
    int st = wpvol_table(out, 1, N, 1), all = 1;

    UNIT_CHECK(&rep, st == WPVOL_OK, "wpvol_table(1, 20) status %d", st);
    fmpq_poly_init(xu);
    fmpq_poly_init(ux);
    fmpq_poly_init(du);
    fmpq_poly_init(lg);
    fmpz_init(f);
    fmpz_init(num);
    fmpq_init(c);
    fmpq_init(w);
    /* x(u) = sum_{k>=1} (-1)^{k-1} u^k / (k! (k-1)!) */
    for (n = 1; n <= N + 2; n++)
    {
        fmpz_fac_ui(f, (ulong) n);
        fmpz_fac_ui(num, (ulong) (n - 1));
        fmpz_mul(f, f, num);
        fmpz_set_si(num, (n % 2 == 1) ? 1 : -1);
        fmpq_set_fmpz_frac(c, num, f);
        fmpq_poly_set_coeff_fmpq(xu, n, c);
    }
    fmpq_poly_revert_series(ux, xu, N + 2);
    fmpq_poly_derivative(du, ux);
    fmpq_poly_log_series(lg, du, N + 1);
    for (n = 1; n <= N; n++)
    {
        fmpq_poly_get_coeff_fmpq(c, lg, n);
        fmpz_fac_ui(f, (ulong) n);
        fmpq_mul_fmpz(c, c, f);
        fmpz_set_ui(num, 24);
        fmpq_div_fmpz(c, c, num);
        all &= fmpq_equal(c, out + (N + 1) + n);
    }
    UNIT_CHECK(&rep, all, "V_{1,n} = n! [x^n] log(u'(x))/24 for 1 <= n <= 20");
    fmpq_poly_clear(xu);
    fmpq_poly_clear(ux);
    fmpq_poly_clear(du);
    fmpq_poly_clear(lg);
    fmpz_clear(f);
    fmpz_clear(num);
    fmpq_clear(c);
    fmpq_clear(w);
    _fmpq_vec_clear(out, 2 * (N + 1));
}

/* 1 if the vectors of rationals are entrywise equal. */
static int vec_equal(const fmpq *a, const fmpq *b, slong n)
{
    slong i;

    for (i = 0; i < n; i++)
        if (!fmpq_equal(a + i, b + i))
            return 0;
    return 1;
}

/* Property: the table does not depend on threads, prime size, number of primes or product
   algorithm (transforms for 62-bit primes 1 mod 2^28, FLINT products for primes above 2^62,
   many small primes with some genera beyond their transform reach). */
static void test_independence(void)
{
    slong G = 12, N = 6, nv = (G + 1) * (N + 1), used1 = 0, used2 = 0, used3 = 0, used4 = 0;
    fmpq *a = _fmpq_vec_init(nv), *b = _fmpq_vec_init(nv), *c = _fmpq_vec_init(nv),
         *d = _fmpq_vec_init(nv);
    int s1 = wpvol_table_ex(a, G, N, 1, 62, 1, &used1);
    int s2 = wpvol_table_ex(b, G, N, 2, 40, 1, &used2);
    int s3 = wpvol_table_ex(c, G, N, 2, 63, 1, &used3);
    int s4 = wpvol_table_ex(d, G, N, 2, 62, 40, &used4);

    UNIT_CHECK(&rep, s1 == 0 && s2 == 0 && s3 == 0 && s4 == 0, "statuses %d %d %d %d", s1, s2,
               s3, s4);
    UNIT_CHECK(&rep, used2 > used1 && used4 >= 40, "prime counts %ld %ld %ld %ld", used1, used2,
               used3, used4);
    UNIT_CHECK(&rep, vec_equal(a, b, nv), "1 thread 62-bit == 2 threads 40-bit primes");
    UNIT_CHECK(&rep, vec_equal(a, c, nv), "transform products == FLINT products");
    UNIT_CHECK(&rep, vec_equal(a, d, nv), "first batch of 40 primes gives the same table");
    _fmpq_vec_clear(a, nv);
    _fmpq_vec_clear(b, nv);
    _fmpq_vec_clear(c, nv);
    _fmpq_vec_clear(d, nv);
}

/* A residue source for wpvol_table_combine that works prime by prime in reverse order (as a
   distributed source gets shares back in any order); ctx points to {G, N, calls, fail_at}:
   the call number fail_at (1-based, 0: never) fails with WPVOL_NOMEM. */
typedef struct
{
    slong G, N, calls, fail_at;
} combine_src_t;

static int combine_src(void *ctx, ulong *res, const ulong *primes, slong count)
{
    combine_src_t *c = ctx;
    slong i, nv = (c->G + 1) * (c->N + 1);

    if (++c->calls == c->fail_at)
        return WPVOL_NOMEM;
    for (i = count - 1; i >= 0; i--)
    {
        int st = wpvol_table_residues(res + i * nv, c->G, c->N, primes + i, 1, 1);
        if (st != WPVOL_OK)
            return st;
    }
    return WPVOL_OK;
}

/* Property: the combination gives the threaded table whatever the residue source and its
   width; a source's failure ends it with that status and a zero table; the residues refuse
   what is not a suitable prime; the spread model scales with the processes. */
static void test_combine_sources(void)
{
    slong G = 10, N = 4, nv = (G + 1) * (N + 1), used = 0, k;
    fmpq *a = _fmpq_vec_init(nv), *b = _fmpq_vec_init(nv), *c = _fmpq_vec_init(nv);
    combine_src_t src = {G, N, 0, 0};
    ulong res[(10 + 1) * (4 + 1)], bad[2] = {UWORD(1099511627777), 101};   /* 257 * 4278255361 */
    double s1, e1, r1, p1, s2, e2, r2, p2;
    int st0 = wpvol_table_ex(a, G, N, 1, 62, 1, NULL), st1, st2, zero = 1;

    st1 = wpvol_table_combine(b, G, N, combine_src, &src, 5, 62, 1, &used);
    UNIT_CHECK(&rep, st0 == WPVOL_OK && st1 == WPVOL_OK && vec_equal(a, b, nv) && used >= 5,
               "prime-by-prime source of width 5 gives the threaded table (%d %d, %ld primes)",
               st0, st1, used);
    src.calls = 0;
    src.fail_at = 2;
    fmpq_one(c + 5);
    st2 = wpvol_table_combine(c, G, N, combine_src, &src, 1, 62, 1, NULL);
    for (k = 0; k < nv; k++)
        zero &= fmpq_is_zero(c + k);
    UNIT_CHECK(&rep, st2 == WPVOL_NOMEM && zero, "a failing source ends the combination: %d", st2);
    UNIT_CHECK(&rep, wpvol_table_residues(res, G, N, bad, 1, 1) == WPVOL_BADARG
                     && wpvol_table_residues(res, G, N, bad + 1, 1, 1) == WPVOL_BADARG,
               "a composite and a small prime are refused");
    wpvol_estimate_spread(&s1, &e1, &r1, &p1, 50, 5, 1);
    wpvol_estimate_spread(&s2, &e2, &r2, &p2, 50, 5, 2);
    UNIT_CHECK(&rep, s2 < 0.6 * s1 && e1 == e2 && p1 >= 3 && p1 == p2,
               "spread model: %.2f s on 1 process, %.2f s on 2", s1, s2);
    _fmpq_vec_clear(a, nv);
    _fmpq_vec_clear(b, nv);
    _fmpq_vec_clear(c, nv);
}

/* Property: one prime, both product paths of the per-prime engine agree residue by residue,
   also where the truncation orders are largest (G = 20, N = 4 and G = 2, N = 60), and over
   several genus blocks of the pointwise sums with truncated transforms (G = 41: the blocks
   16-23, 24-31, 32-39 and a short one, 40-41). */
static void test_modp_paths(void)
{
    slong cases[3][2] = { { 20, 4 }, { 2, 60 }, { 41, 1 } }, k, j;
    nmod_t mod;

    for (j = 0; j < 6; j++)   /* a 62-bit prime, and a 50-bit one (the vector code if enabled) */
    {
        slong G = cases[j % 3][0], N = cases[j % 3][1], nv = (G + 1) * (N + 1);
        ulong *r1 = flint_malloc((size_t) nv * sizeof(ulong));
        ulong *r2 = flint_malloc((size_t) nv * sizeof(ulong));
        int s1, s2, same = 1;
        nmod_init(&mod, wpvol_ntt_prime_below(j < 3 ? 0 : UWORD(1) << 50, 28));
        s1 = wpvol_modp_table_ex(r1, G, N, mod, 1);
        s2 = wpvol_modp_table_ex(r2, G, N, mod, 0);
        for (k = 0; k < nv; k++)
            same &= (r1[k] == r2[k]);
        UNIT_CHECK(&rep, s1 == 0 && s2 == 0 && same, "mod-p paths agree for G=%ld N=%ld, p=%lu",
                   G, N, mod.n);
        flint_free(r1);
        flint_free(r2);
    }
}

/* Property: the pointwise sums of the transform products, 2 sum_k a_k b_k + s^2 mod p, equal
   FLINT's nmod arithmetic, also where the exact 128-bit sums overflow most often (every entry
   p - 1, up to 4500 pairs: beyond the vector code's fold of its low halves at 2048) and for
   random entries; 62-bit, 40-bit and 50-bit primes (for the two smaller ones the vector code,
   where it is enabled, takes 32 entries of 37 and the scalar code the rest). */
static void test_ntt_dot2(void)
{
    enum { NP = 4500, N = 37 };
    ulong primes[3] = { wpvol_ntt_prime_below(0, 28), n_nextprime(UWORD(1) << 40, 1),
                        wpvol_ntt_prime_below(UWORD(1) << 50, 28) };
    ulong *v = flint_malloc((size_t) (2 * NP + 1) * N * sizeof(ulong));
    ulong *out = flint_malloc(N * sizeof(ulong));
    ulong *a[NP], *b[NP];
    slong np[4] = { 1, 17, 300, NP }, i, j, k, t;
    flint_rand_t st;

    flint_randinit(st);
    for (k = 0; k < NP; k++)
    {
        a[k] = v + 2 * k * N;
        b[k] = v + (2 * k + 1) * N;
    }
    for (j = 0; j < 3; j++)
        for (t = 0; t < 2; t++)
        {
            nmod_t mod;
            int ok = 1;
            nmod_init(&mod, primes[j]);
            for (i = 0; i < (2 * NP + 1) * N; i++)
                v[i] = t == 0 ? primes[j] - 1 : n_randint(st, primes[j]);
            for (k = 0; k < 4; k++)
            {
                const ulong *sq = k == 1 ? NULL : v + 2 * NP * N;
                wpvol_ntt_dot2(out, a, b, np[k], sq, N, mod);
                for (i = 0; i < N; i++)
                {
                    ulong r = sq == NULL ? 0 : nmod_mul(sq[i], sq[i], mod), d = 0;
                    slong q;
                    for (q = 0; q < np[k]; q++)
                        d = nmod_add(d, nmod_mul(a[q][i], b[q][i], mod), mod);
                    ok &= out[i] == nmod_add(r, nmod_add(d, d, mod), mod);
                }
            }
            UNIT_CHECK(&rep, ok, "pointwise sums agree with nmod, prime %lu, %s entries",
                       primes[j], t == 0 ? "p - 1" : "random");
        }
    flint_randclear(st);
    flint_free(v);
    flint_free(out);
}

/* Property: several sums in one pass of wpvol_ntt_dot2_many (shared factors, different
   lengths, an added term, a square or none) equal FLINT's nmod arithmetic, entry by entry;
   a 62-bit and a 50-bit prime. */
static void test_ntt_dot2_many_prime(ulong p)
{
    enum { NF = 40, N = 700, NS = 5 };
    ulong *v = flint_malloc((size_t) (NF + NS) * N * sizeof(ulong));
    ulong *out = flint_malloc((size_t) NS * N * sizeof(ulong));
    ulong *a[NS][NF], *b[NS][NF];
    slong len[NS] = { 700, 1, 256, 513, 699 }, np[NS] = { 19, 3, 0, 40, 16 }, i, j, k;
    wpvol_dot_t d[NS];
    flint_rand_t st;
    nmod_t mod;
    int ok = 1;

    flint_randinit(st);
    nmod_init(&mod, p);
    for (i = 0; i < (NF + NS) * N; i++)
        v[i] = i % 7 == 0 ? p - 1 : n_randint(st, p);
    for (j = 0; j < NS; j++)
    {
        for (k = 0; k < np[j]; k++)
        {
            a[j][k] = v + ((k + j) % NF) * N;       /* factors shared between the sums */
            b[j][k] = v + ((3 * k + 1) % NF) * N;
        }
        d[j].out = out + j * N;
        d[j].a = a[j];
        d[j].b = b[j];
        d[j].npairs = np[j];
        d[j].sq = j % 2 == 0 ? v + (NF - 1 - j) * N : NULL;
        d[j].add = j >= 2 ? v + (NF + j) * N : NULL;
        d[j].n = len[j];
    }
    wpvol_ntt_dot2_many(d, NS, mod);
    for (j = 0; j < NS; j++)
        for (i = 0; i < len[j]; i++)
        {
            ulong r = d[j].sq == NULL ? 0 : nmod_mul(d[j].sq[i], d[j].sq[i], mod), s2 = 0;
            for (k = 0; k < np[j]; k++)
                s2 = nmod_add(s2, nmod_mul(a[j][k][i], b[j][k][i], mod), mod);
            r = nmod_add(r, nmod_add(s2, s2, mod), mod);
            if (d[j].add != NULL)
                r = nmod_add(r, d[j].add[i], mod);
            ok &= out[j * N + i] == r;
        }
    UNIT_CHECK(&rep, ok, "five pointwise sums in one pass agree with nmod, p = %lu", p);
    flint_randclear(st);
    flint_free(v);
    flint_free(out);
}

static void test_ntt_dot2_many(void)
{
    test_ntt_dot2_many_prime(wpvol_ntt_prime_below(0, 28));
    test_ntt_dot2_many_prime(wpvol_ntt_prime_below(UWORD(1) << 50, 28));
}

/* Property: the truncated transforms give the first n values of the full transform (inputs of
   d <= n terms; garbage beyond d is not read) and invert them back to the coefficients given
   any tail of coefficients, for random lengths N <= 2^12, n <= N, d <= n. */
static void test_ntt_trunc(void)
{
    ulong p = wpvol_ntt_prime_below(0, 28);
    slong it, j, bad = 0;
    wpvol_ntt_t F;
    flint_rand_t st;
    nmod_t mod;

    flint_randinit(st);
    nmod_init(&mod, p);
    UNIT_CHECK(&rep, wpvol_ntt_init(F, mod, WORD(1) << 12) == 0, "transform tables");
    for (it = 0; it < 400; it++)
    {
        slong N = WORD(1) << n_randint(st, 13), n = n_randint(st, N + 1), d = n_randint(st, n + 1);
        ulong *x = flint_malloc((size_t) (4 * N) * sizeof(ulong));
        ulong *y = x + N, *z = y + N, *e = z + N;
        for (j = 0; j < N; j++)
        {
            x[j] = j < d ? n_randint(st, p) : 0;
            y[j] = j < d ? x[j] : n_randint(st, p);   /* must be ignored */
            e[j] = n_randint(st, p);
        }
        wpvol_ntt_fwd(x, N, F);
        wpvol_ntt_fwd_trunc(y, N, n, d, F);
        bad += memcmp(x, y, (size_t) n * sizeof(ulong)) != 0;
        memcpy(z, e, (size_t) N * sizeof(ulong));
        wpvol_ntt_fwd(z, N, F);
        memcpy(z + n, e + n, (size_t) (N - n) * sizeof(ulong));
        wpvol_ntt_inv_trunc(z, N, n, F);
        bad += memcmp(z, e, (size_t) n * sizeof(ulong)) != 0;
        flint_free(x);
    }
    UNIT_CHECK(&rep, bad == 0, "truncated transforms: %ld of 800 comparisons differ", bad);
    wpvol_ntt_clear(F);
    flint_randclear(st);
}

/* Property: with a 50-bit prime, the vector butterflies (when this processor has them) give
   the scalar code's transforms value for value (full and truncated, forward and inverse, on
   random entries and on entries p - 1 and 2p - 1, the extremes of the lazy range), and a
   product through either equals FLINT's nmod_poly_mul. */
static void test_ntt_simd(void)
{
    ulong p = wpvol_ntt_prime_below(UWORD(1) << 50, 28);
    slong it, j, bad = 0, badmul = 0;
    wpvol_ntt_t F, S;
    flint_rand_t st;
    nmod_t mod;

    flint_randinit(st);
    nmod_init(&mod, p);
    UNIT_CHECK(&rep, wpvol_ntt_init(F, mod, WORD(1) << 14) == 0, "transform tables, 50 bits");
    *S = *F;
    S->simd = 0;   /* the same tables through the scalar butterflies */
    for (it = 0; it < 300; it++)
    {
        slong N = WORD(1) << n_randint(st, 15), n = n_randint(st, N + 1), kind = it % 3;
        slong d = n_randint(st, n + 1);
        ulong *x = flint_malloc((size_t) (6 * N) * sizeof(ulong)), *y = x + N, *u = y + N;
        ulong *v = u + N, *w = v + N, *z = w + N;
        nmod_poly_t A, B, C;
        for (j = 0; j < N; j++)
            x[j] = kind == 0 ? n_randint(st, p) : p - 1;
        memcpy(y, x, (size_t) N * sizeof(ulong));
        wpvol_ntt_fwd(x, N, F);
        wpvol_ntt_fwd(y, N, S);
        bad += memcmp(x, y, (size_t) N * sizeof(ulong)) != 0;
        for (j = 0; j < N; j++)   /* inverse inputs anywhere in [0, 2p) */
            x[j] = y[j] = kind == 2 ? 2 * p - 1 : n_randint(st, 2 * p);
        wpvol_ntt_inv(x, N, F);
        wpvol_ntt_inv(y, N, S);
        bad += memcmp(x, y, (size_t) N * sizeof(ulong)) != 0;
        for (j = 0; j < N; j++)   /* d terms; what follows them must not be read */
        {
            x[j] = y[j] = n_randint(st, p);
            z[j] = j < d ? x[j] : 0;
        }
        wpvol_ntt_fwd_trunc(x, N, n, d, F);
        wpvol_ntt_fwd_trunc(y, N, n, d, S);
        wpvol_ntt_fwd(z, N, F);
        bad += memcmp(x, y, (size_t) n * sizeof(ulong)) != 0;
        bad += memcmp(x, z, (size_t) n * sizeof(ulong)) != 0;
        wpvol_ntt_inv_trunc(x, N, n, F);
        wpvol_ntt_inv_trunc(y, N, n, S);
        bad += memcmp(x, y, (size_t) n * sizeof(ulong)) != 0;
        /* a product of lengths N/2 and N/2 through the transforms of length N */
        nmod_poly_init(A, p);
        nmod_poly_init(B, p);
        nmod_poly_init(C, p);
        for (j = 0; j < N; j++)
        {
            u[j] = j < N / 2 ? (kind == 0 ? n_randint(st, p) : p - 1) : 0;
            v[j] = j < N / 2 ? n_randint(st, p) : 0;
            nmod_poly_set_coeff_ui(A, j, u[j]);
            nmod_poly_set_coeff_ui(B, j, v[j]);
        }
        nmod_poly_mul(C, A, B);
        wpvol_ntt_fwd(u, N, F);
        wpvol_ntt_fwd(v, N, F);
        for (j = 0; j < N; j++)
            w[j] = nmod_mul(u[j], v[j], mod);
        wpvol_ntt_inv(w, N, F);
        for (j = 0; j < N; j++)
        {
            z[j] = nmod_div(w[j], N % p, mod);
            badmul += z[j] != nmod_poly_get_coeff_ui(C, j);
        }
        nmod_poly_clear(A);
        nmod_poly_clear(B);
        nmod_poly_clear(C);
        flint_free(x);
    }
    UNIT_CHECK(&rep, bad == 0, "vector (%s) and scalar transforms: %ld of 1500 comparisons "
               "differ", F->simd ? "enabled" : "not on this processor", bad);
    UNIT_CHECK(&rep, badmul == 0, "transform products against nmod_poly_mul: %ld coefficients "
               "differ", badmul);
    wpvol_ntt_clear(F);
    flint_randclear(st);
}

/* Property: the products of rows by I_2 and 1/I_2 (truncated transforms from WPVOL_ROW_MIN
   terms on) equal FLINT's truncated products for every row length up to 420 (all truncations
   of the two series); a 62-bit and a 50-bit prime. */
static void test_mul_i2_prime(ulong p)
{
    enum { LEN = 420 };
    ulong x[LEN], r1[LEN], r2[LEN];
    slong l, j, bad = 0;
    wpvol_ntt_t F;
    wpvol_ctx_t ctx;
    flint_rand_t st;
    nmod_t mod;

    flint_randinit(st);
    nmod_init(&mod, p);
    UNIT_CHECK(&rep, wpvol_ntt_init(F, mod, WORD(1) << 12) == 0
               && wpvol_ctx_init(ctx, mod, LEN, 40) == 0
               && wpvol_ctx_attach_ntt(ctx, F, LEN) == 0 && ctx->ntt != NULL,
               "row transforms enabled");
    for (l = 1; l <= LEN; l++)
    {
        for (j = 0; j < l; j++)
            x[j] = n_randint(st, p);
        wpvol_ctx_mul_i2(r1, x, l, ctx);
        _nmod_poly_mullow(r2, x, l, ctx->i2, l, l, mod);
        bad += memcmp(r1, r2, (size_t) l * sizeof(ulong)) != 0;
        wpvol_ctx_mul_i2inv(r1, x, l, ctx);
        _nmod_poly_mullow(r2, x, l, ctx->i2inv, l, l, mod);
        bad += memcmp(r1, r2, (size_t) l * sizeof(ulong)) != 0;
    }
    UNIT_CHECK(&rep, bad == 0, "rows times I_2 and 1/I_2, p = %lu: %ld of %d products differ",
               p, bad, (int) (2 * LEN));
    wpvol_ctx_clear(ctx);
    wpvol_ntt_clear(F);
    flint_randclear(st);
}

static void test_mul_i2(void)
{
    test_mul_i2_prime(wpvol_ntt_prime_below(0, 28));
    test_mul_i2_prime(wpvol_ntt_prime_below(UWORD(1) << 50, 28));   /* the vector code */
}

/* A driver job of fixed rationals (tests only): value k is q[k]; the multiple offered for
   the denominators is chosen by `mult_mode` (0: none, 1: the exact denominator, 2: it without
   one large prime factor, 3: an unrelated number). */
typedef struct
{
    const fmpq *q;
    slong nv;
    int mult_mode;
    ulong big;   /* the large prime factor of the denominators */
} test_fixed_t;

static void *test_fixed_ws_new(const wpvol_job_t *job)
{
    return (void *) job->data;
}

static void test_fixed_ws_free(void *ws)
{
    (void) ws;
}

static int test_fixed_run(void *ws, ulong *res, nmod_t mod)
{
    const test_fixed_t *f = ws;
    slong k;

    for (k = 0; k < f->nv; k++)
    {
        ulong n = fmpz_fdiv_ui(fmpq_numref(f->q + k), mod.n);
        ulong d = fmpz_fdiv_ui(fmpq_denref(f->q + k), mod.n);
        res[k] = nmod_mul(n, nmod_inv(d, mod), mod);
    }
    return WPVOL_OK;
}

static double test_fixed_need(const wpvol_job_t *job, slong k)
{
    (void) job;
    (void) k;
    return 64.0;   /* far too small: the driver must grow the modulus */
}

static slong test_fixed_den(const wpvol_job_t *job, slong k)
{
    (void) job;
    (void) k;
    return 40;
}

static void test_fixed_mult(const wpvol_job_t *job, slong k, fmpz_t B)
{
    const test_fixed_t *f = job->data;

    if (f->mult_mode == 1)
        fmpz_set(B, fmpq_denref(f->q + k));
    else if (f->mult_mode == 2)
        fmpz_divexact_ui(B, fmpq_denref(f->q + k), f->big);
    else
        fmpz_set_ui(B, 1000003);
}

/* Property: the driver's reconstruction with a denominator multiple returns exactly the job's
   rationals whether the multiple is right, misses a large factor (fallback to the bounds) or
   is unrelated, and with the right multiple it needs fewer primes than without one. */
static void test_driver_mult(void)
{
    enum { NV = 6 };
    fmpq q[NV], out[NV];
    slong k, used[4];
    int mode, ok = 1;
    ulong big = n_nextprime(UWORD(1) << 45, 1);

    for (k = 0; k < NV; k++)
    {
        fmpq_init(q + k);
        fmpq_init(out + k);
        /* numerators of about 1500 bits over denominators 2^(100+k) 3^80 big (about 300 bits) */
        fmpz_set_ui(fmpq_numref(q + k), 7 + 2 * (ulong) k);
        fmpz_pow_ui(fmpq_numref(q + k), fmpq_numref(q + k), 500);
        fmpz_set_ui(fmpq_denref(q + k), 3);
        fmpz_pow_ui(fmpq_denref(q + k), fmpq_denref(q + k), 80);
        fmpz_mul_2exp(fmpq_denref(q + k), fmpq_denref(q + k), 100 + (ulong) k);
        fmpz_mul_ui(fmpq_denref(q + k), fmpq_denref(q + k), big);
        fmpq_canonicalise(q + k);
    }
    for (mode = 0; mode < 4; mode++)
    {
        test_fixed_t f = { q, NV, mode, big };
        wpvol_job_t job = { .nv = NV, .ws_new = test_fixed_ws_new, .ws_free = test_fixed_ws_free,
                            .run = test_fixed_run, .need_bits = test_fixed_need,
                            .den_bits = test_fixed_den,
                            .den_mult = mode == 0 ? NULL : test_fixed_mult,
                            .first_bits = 64.0, .data = &f };
        ok &= wpvol_drive(out, &job, 1, 62, 1, &used[mode]) == WPVOL_OK;
        for (k = 0; k < NV; k++)
            ok &= fmpq_equal(out + k, q + k);
    }
    UNIT_CHECK(&rep, ok && used[1] < used[0],
               "driver with denominator multiples: exact values, %ld primes with the right "
               "multiple, %ld without, %ld missing a factor, %ld unrelated",
               used[1], used[0], used[2], used[3]);
    for (k = 0; k < NV; k++)
    {
        fmpq_clear(q + k);
        fmpq_clear(out + k);
    }
}

/* Property of the size model's guess (not a theorem): the denominator multiple B of
   wpvol_estimate.c is a multiple of the denominator of (3g-3+n)! V_{g,n} for g <= 40, n <= 5
   (the values of the engine, themselves checked against the published values above). */
static void test_den_mult(void)
{
    slong G = 40, N = 5, g, n, miss = 0;
    fmpq *v = _fmpq_vec_init((G + 1) * (N + 1));
    fmpz_t B, f, r;
    int st = wpvol_table(v, G, N, 2);

    fmpz_init(B);
    fmpz_init(f);
    fmpz_init(r);
    for (g = 2; st == WPVOL_OK && g <= G; g++)
        for (n = 0; n <= N; n++)
        {
            fmpz_fac_ui(f, (ulong) (3 * g - 3 + n));
            fmpz_mul(f, f, fmpq_numref(v + g * (N + 1) + n));
            fmpz_gcd(f, f, fmpq_denref(v + g * (N + 1) + n));
            fmpz_divexact(r, fmpq_denref(v + g * (N + 1) + n), f);   /* den of (3g-3+n)! V */
            wpvol_estimate_den_mult(B, g, n);
            miss += !fmpz_divisible(B, r);
        }
    UNIT_CHECK(&rep, st == WPVOL_OK && miss == 0,
               "denominator multiple divisible by every denominator, g <= 40, n <= 5: %ld misses",
               miss);
    fmpz_clear(B);
    fmpz_clear(f);
    fmpz_clear(r);
    _fmpq_vec_clear(v, (G + 1) * (N + 1));
}

/* Property (KdV structure): the engine's top-down step for V_{g,0} checks one redundant
   equation per genus and reports WPVOL_INTERNAL if it fails; a clean run up to G = 30 is the
   test.  Also a one-prime run with a prime that is too small must be refused, not wrong. */
static void test_modp_guards(void)
{
    slong G = 30, N = 1;
    ulong *r = flint_malloc((size_t) ((G + 1) * (N + 1)) * sizeof(ulong));
    nmod_t mod;
    int st;

    nmod_init(&mod, n_nextprime(UWORD(1) << 40, 1));
    st = wpvol_modp_table(r, G, N, mod);
    UNIT_CHECK(&rep, st == WPVOL_OK, "consistency of the top-down step up to g = 30: %d", st);
    nmod_init(&mod, 101);
    st = wpvol_modp_table(r, G, N, mod);
    UNIT_CHECK(&rep, st == WPVOL_BADARG, "prime 101 refused for G=30: %d", st);
    flint_free(r);
}

/* Asymptotic sanity (Manin-Zograf, from memory): V_{0,n}/n! ~ C n^{-7/2} x*^{-n} with
   x* = j_0 J_1(j_0)/2 = -j_0 J_0'(j_0)/2, j_0 the first zero of J_0 (the critical point of the
   genus-0 string equation), so V_{0,n+1} / ((n+1) V_{0,n}) (1 + 7/(2n)) -> 1/x* = 1.60197...
   Large-genus sanity (Mirzakhani-Zograf, "Towards large genus asymptotics of intersection
   numbers on moduli spaces of curves", 2015, from memory): in this normalisation
   V_{g,n+1} / ((2g-2+n) V_{g,n}) -> 2 as g grows, with error O(1/g) (checked at g = 20 to 1%;
   measured 1.9950 for n = 0). */
static void test_asymptotics(void)
{
    slong N = 300, G = 20, n;
    fmpq *out0 = _fmpq_vec_init(N + 1), *outg = _fmpq_vec_init((G + 1) * 3);
    double j0 = 2.404825557695773, j1 = 0.5191474972894669, xs = j0 * j1 / 2.0;
    fmpq_t r;
    int st = wpvol_table(out0, 0, N, 2), stg;

    fmpq_init(r);
    UNIT_CHECK(&rep, st == WPVOL_OK, "wpvol_table(0, 300): %d", st);
    for (n = 100; n <= 299; n += 199)
    {
        double q;
        fmpq_div(r, out0 + n + 1, out0 + n);
        q = fmpq_get_d(r) / (double) (n + 1) * (1.0 + 3.5 / (double) n);
        UNIT_CHECK(&rep, fabs(q * xs - 1.0) < 2.0e-3, "genus-0 ratio at n=%ld: %.6f vs %.6f", n,
                   q, 1.0 / xs);
    }
    /* measured: 1.99496 and 1.98478 at g = 20 (1.99756, 1.99248 at g = 40) */
    stg = wpvol_table(outg, G, 2, 2);
    UNIT_CHECK(&rep, stg == WPVOL_OK, "wpvol_table(20, 2): %d", stg);
    for (n = 0; n <= 1; n++)
    {
        double q;
        fmpq_div(r, outg + G * 3 + n + 1, outg + G * 3 + n);
        q = fmpq_get_d(r) / (double) (2 * G - 2 + n);
        UNIT_CHECK(&rep, fabs(q / 2.0 - 1.0) < 0.01, "V_{20,%ld}/((2g-2+n) V_{20,%ld}) = %.5f, "
                   "expected 2 + O(1/g)", n + 1, n, q);
    }
    fmpq_clear(r);
    _fmpq_vec_clear(out0, N + 1);
    _fmpq_vec_clear(outg, (G + 1) * 3);
}

/* Error handling: bad arguments and absurd sizes are refused with out zeroed. */
static void test_errors(void)
{
    fmpq *out = _fmpq_vec_init(4);
    double s, b;

    fmpq_set_si(out + 0, 7, 1);
    UNIT_CHECK(&rep, wpvol_table(NULL, 1, 1, 1) == WPVOL_BADARG, "NULL out");
    UNIT_CHECK(&rep, wpvol_table(out, -1, 1, 1) == WPVOL_BADARG, "G < 0");
    UNIT_CHECK(&rep, wpvol_table(out, 1, -1, 1) == WPVOL_BADARG, "N < 0");
    UNIT_CHECK(&rep, wpvol_table(out, 1, 1, 0) == WPVOL_BADARG, "threads < 1");
    UNIT_CHECK(&rep, wpvol_table_ex(out, 1, 1, 1, 19, 1, NULL) == WPVOL_BADARG, "prime bits");
    UNIT_CHECK(&rep, wpvol_table(out, 1, 1, 1) == WPVOL_OK && fmpq_is_zero(out + 0)
               && fmpq_is_zero(out + 2), "(1,1) table: unstable entries zero");
    wpvol_estimate(&s, &b, 100000, 5);
    UNIT_CHECK(&rep, s > WPVOL_MAX_SECONDS || b > WPVOL_MAX_BYTES, "estimate of g=100000");
    {
        fmpq *big = _fmpq_vec_init(100001);   /* the contract: room for (G+1)(N+1) entries */
        UNIT_CHECK(&rep, wpvol_table(big, 100000, 0, 1) == WPVOL_LIMIT, "g=100000 refused");
        _fmpq_vec_clear(big, 100001);
    }
    wpvol_estimate(&s, &b, -1, 5);
    UNIT_CHECK(&rep, s == 0.0 && b == 0.0, "estimate of a bad request is 0");
    wpvol_estimate(&s, &b, 50, 5);
    UNIT_CHECK(&rep, s > 0.0 && b > 0.0, "estimate of (50,5) positive");
    _fmpq_vec_clear(out, 4);
}

int main(void)
{
    test_published();
    test_genus0_zograf();
    test_genus1_log();
    test_independence();
    test_combine_sources();
    test_modp_paths();
    test_driver_mult();
    test_den_mult();
    test_ntt_dot2();
    test_ntt_dot2_many();
    test_ntt_trunc();
    test_ntt_simd();
    test_mul_i2();
    test_modp_guards();
    test_asymptotics();
    test_errors();
    flint_cleanup_master();
    return unit_finish("test_volumes", &rep);
}
