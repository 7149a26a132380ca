/* test_spectral_routes.c - property test: the two routes to omega_{g,n} of a spectral curve
 * (src/engines/spectral/spectral.h) agree, the intersection numbers at the Kaufmann-Manin-Zagier shifted
 * times against the topological recursion's residues, on random curves:
 *   1. 2000 random rational curves (times PSIKAPPA_TEST_MULTIPLIER), y_0..y_K with K <= 5 and
 *      random (g, n) with 2g-2+n <= 6;
 *   2. curves with symbolic coefficients y_k = c_k + a_k (a_1..a_6 formal variables), exact
 *      polynomial identity in the a_k, 2g-2+n <= 3;
 *   3. the dictionary: exp(-sum s_j u^j) reproduces sum (2k+1)!! y_k/y_0 u^k (series identity).
 */
#include <flint/flint.h>
#include <flint/fmpq_poly.h>
#include <flint/ulong_extras.h>
#include "correlators/wk.h"
#include "spectral_util.h"
#include "unit.h"

static unit_report rep;

static const slong cases[][2] = {{0, 3}, {0, 4}, {0, 5}, {0, 6}, {1, 1}, {1, 2}, {1, 3}, {1, 4},
                                 {2, 1}, {2, 2}, {3, 1}, {0, 7}, {1, 5}, {2, 3}, {3, 2}, {4, 1}};
#define NCASES ((slong) (sizeof cases / sizeof cases[0]))

/* A random small rational in [-9, 9] / [1, 6], nonzero when nonzero is set. */
static void random_rational(fmpq_t q, flint_rand_t st, int nonzero)
{
    slong num;
    do
        num = (slong) n_randint(st, 19) - 9;
    while (nonzero && num == 0);
    fmpq_set_si(q, num, 1 + n_randint(st, 6));
}

/* Compares both routes on one curve and (g, n); prints the curve on failure, returns 1 when they
   agree. */
static int compare(slong g, slong n, const fmpq_mpoly_struct *y, slong K, wk_table *Tw,
                    const fmpq_mpoly_ctx_t ctx)
{
    sp_table A, B;
    sp_options o;
    int s1, s2, ok;
    slong k;
    sp_options_default(&o);
    sp_table_init(&A, ctx), sp_table_init(&B, ctx);
    s1 = sp_omega_shift(&A, g, n, y, K, Tw, &o, ctx);
    s2 = sp_omega_residue(&B, g, n, y, K, 0, NULL, ctx);
    ok = s1 == SP_OK && s2 == SP_OK && A.len > 0 && sp_table_equal(&A, &B, ctx);
    UNIT_CHECK(&rep, ok, "routes differ, (g,n) = (%ld,%ld), status %d %d", (long) g, (long) n, s1, s2);
    if (!ok)
        for (k = 0; k <= K; k++) {
            fprintf(stderr, "    y_%ld = ", (long) k);
            fmpq_mpoly_fprint_pretty(stderr, y + k, spu_names, ctx);
            fprintf(stderr, "\n");
        }
    sp_table_clear(&A, ctx), sp_table_clear(&B, ctx);
    return ok;
}

/* Part 1: random rational curves; returns the number of curves on which the routes agree. */
static long test_rational(flint_rand_t st, wk_table *Tw, const fmpq_mpoly_ctx_t ctx)
{
    long it, iters = unit_iterations(2000), agreed = 0;
    slong k, K, c;
    fmpq_t q;
    fmpq_init(q);
    for (it = 0; it < iters; it++) {
        fmpq_mpoly_struct *y;
        K = (slong) n_randint(st, 6);
        y = spu_curve_new(K, ctx);
        for (k = 0; k <= K; k++) {
            random_rational(q, st, k == 0);
            if (k > 0 && n_randint(st, 4) == 0)
                fmpq_zero(q);                           /* sparse curves too */
            fmpq_mpoly_set_fmpq(y + k, q, ctx);
        }
        c = (slong) n_randint(st, NCASES);
        agreed += compare(cases[c][0], cases[c][1], y, K, Tw, ctx);
        spu_curve_free(y, K, ctx);
    }
    fmpq_clear(q);
    UNIT_CHECK(&rep, agreed >= 2000 || iters < 2000, "routes agree on only %ld of %ld rational curves", agreed, iters);
    return agreed;
}

/* Part 2: y_k = c_k + a_k with symbolic a_k (y_0 rational); returns the number of curves on which
   the routes agree. */
static long test_symbolic(flint_rand_t st, wk_table *Tw, const fmpq_mpoly_ctx_t ctx)
{
    long it, iters = unit_iterations(30), agreed = 0;
    slong k, K, c;
    fmpq_t q;
    fmpq_mpoly_t a;
    fmpq_init(q);
    fmpq_mpoly_init(a, ctx);
    for (it = 0; it < iters; it++) {
        fmpq_mpoly_struct *y;
        K = 1 + (slong) n_randint(st, 6);
        y = spu_curve_new(K, ctx);
        for (k = 0; k <= K; k++) {
            random_rational(q, st, k == 0);
            fmpq_mpoly_set_fmpq(y + k, q, ctx);
            if (k > 0) {
                fmpq_mpoly_gen(a, SPU_A(k), ctx);
                fmpq_mpoly_add(y + k, y + k, a, ctx);
            }
        }
        do
            c = (slong) n_randint(st, NCASES);
        while (2 * cases[c][0] - 2 + cases[c][1] > 3);
        agreed += compare(cases[c][0], cases[c][1], y, K, Tw, ctx);
        spu_curve_free(y, K, ctx);
    }
    fmpq_mpoly_clear(a, ctx);
    fmpq_clear(q);
    return agreed;
}

/* Part 3 (series identity): for random rational curves, exp(-sum_{j<=N} s_j u^j) = sum_k p_k u^k
   + O(u^{N+1}) with p_k = (2k+1)!! y_k / y_0, by FLINT's exp_series. */
static long test_dictionary(flint_rand_t st, const fmpq_mpoly_ctx_t ctx)
{
    long it, iters = unit_iterations(200);
    slong N = 12, k, K;
    fmpq_t q;
    fmpq_poly_t h, f, e;
    fmpq_init(q);
    fmpq_poly_init(h), fmpq_poly_init(f), fmpq_poly_init(e);
    for (it = 0; it < iters; it++) {
        fmpq_mpoly_struct *y, *s = spu_curve_new(N, ctx), *p = spu_curve_new(N, ctx);
        K = (slong) n_randint(st, 8);
        y = spu_curve_new(K, ctx);
        for (k = 0; k <= K; k++) {
            random_rational(q, st, k == 0);
            fmpq_mpoly_set_fmpq(y + k, q, ctx);
        }
        sp_times(s, N, y, K, ctx);
        sp_shift_times(p, N, y, K, ctx);
        fmpq_poly_zero(h), fmpq_poly_zero(f);
        for (k = 0; k <= N; k++) {
            fmpq_mpoly_get_fmpq(q, s + k, ctx);
            fmpq_neg(q, q);
            fmpq_poly_set_coeff_fmpq(h, k, q);
            fmpq_mpoly_get_fmpq(q, p + k, ctx);
            fmpq_poly_set_coeff_fmpq(f, k, q);
        }
        fmpq_poly_exp_series(e, h, N + 1);
        UNIT_CHECK(&rep, fmpq_poly_equal(e, f), "dictionary: exp(-sum s_j u^j) != sum p_k u^k");
        spu_curve_free(y, K, ctx), spu_curve_free(s, N, ctx), spu_curve_free(p, N, ctx);
    }
    fmpq_poly_clear(h), fmpq_poly_clear(f), fmpq_poly_clear(e);
    fmpq_clear(q);
    return iters;
}

int main(void)
{
    fmpq_mpoly_ctx_t ctx;
    flint_rand_t st;
    wk_table *Tw = wk_table_new();
    long a, b, c;
    flint_randinit(st);
    fmpq_mpoly_ctx_init(ctx, SPU_NVARS, ORD_LEX);
    a = test_rational(st, Tw, ctx);
    b = test_symbolic(st, Tw, ctx);
    c = test_dictionary(st, ctx);
    printf("routes agree on %ld random rational curves and %ld symbolic curves; dictionary on %ld\n", a, b, c);
    wk_table_free(Tw);
    fmpq_mpoly_ctx_clear(ctx);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_spectral_routes", &rep);
}
