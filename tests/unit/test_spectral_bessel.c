/* test_spectral_bessel.c - Bessel-type spectral curves x = z^2/2, y_odd = sum_k y_k z^(2k-1)
 * (src/engines/spectral/spectral.h, kind SP_CURVE_BESSEL), whose correlators insert Norbury's class Theta:
 *   1. the Bessel curve y = 1/z: omega_{g,n} = (-1)^n prod (2d_i+1)!! <Theta | tau_d>_g
 *      (N. Do, P. Norbury, "Topological recursion on the Bessel curve", Commun. Number Theory
 *      Phys. 12 (2018) 53-73: the Bessel curve's correlators are the Brezin-Gross-Witten /
 *      Theta numbers; the sign (-1)^n is our kernel's, docs/conventions.md), with the Theta
 *      numbers from the KdV route of src/engines/theta/ (the intersection route uses the Virasoro one),
 *      and the residue route against both;
 *   2. published values: int_{Mbar_{1,1}} Theta = 1/8 (P. Norbury, "A new cohomology class on the
 *      moduli space of curves", 2017) and the one-point numbers
 *      <Theta | tau_{g-1}>_g = (2g-1)!! (2g-3)!! / (8^g g!) (Do-Norbury 2018, from memory; here
 *      both routes to omega_{g,1} of the Bessel curve must give them, g <= 12);
 *   3. property test: the two routes agree on random rational Bessel-type curves (the mixed
 *      curves y = y_0/z + y_1 z + ... with y_1 != 0 among them) and on curves with symbolic
 *      coefficients;
 *   4. the super JT curve y = -cos(2 pi z)/z: V_{g,n}(L) = int Theta exp(2 pi^2 kappa_1 +
 *      sum L_i^2 psi_i / 2), compared with theta_volume_coeff (the time shift with s_1 only).
 */
#include <flint/flint.h>
#include <flint/ulong_extras.h>
#include "theta/theta.h"
#include "spectral_util.h"
#include "unit.h"

static unit_report rep;

/* Compares both routes on one Bessel-type curve; returns 1 when they agree. */
static int compare(slong g, slong n, const fmpq_mpoly_struct *y, slong K, theta_table *Tt,
                   const fmpq_mpoly_ctx_t ctx)
{
    sp_table A, B;
    sp_options o;
    int s1, s2, ok;
    slong k;
    sp_options_default(&o);
    o.theta = Tt;
    sp_table_init(&A, ctx), sp_table_init(&B, ctx);
    s1 = sp_omega_shift_kind(&A, SP_CURVE_BESSEL, g, n, y, K, NULL, &o, ctx);
    s2 = sp_omega_residue_kind(&B, SP_CURVE_BESSEL, g, n, y, K, 0, NULL, ctx);
    ok = s1 == SP_OK && s2 == SP_OK && A.len > 0 && sp_table_equal(&A, &B, ctx);
    UNIT_CHECK(&rep, ok, "Bessel routes differ, (g,n) = (%ld,%ld), status %d %d", (long) g, (long) n, s1, s2);
    if (!ok)
        for (k = 0; k <= K; k++) {
            fprintf(stderr, "    y_%ld = ", (long) k);
            fmpq_mpoly_fprint_pretty(stderr, y + k, spu_names, ctx);
            fprintf(stderr, "\n");
        }
    sp_table_clear(&A, ctx), sp_table_clear(&B, ctx);
    return ok;
}

/* v = p when p is a rational number: returns 1, else 0. */
static int get_rational(fmpq_t v, const fmpq_mpoly_t p, const fmpq_mpoly_ctx_t ctx)
{
    if (!fmpq_mpoly_is_fmpq(p, ctx))
        return 0;
    fmpq_mpoly_get_fmpq(v, p, ctx);
    return 1;
}

/* c = (-1)^n prod (2d_i+1)!! <Theta | tau_d>_g by the KdV route. */
static void bessel_expected(fmpq_t c, theta_table *Tk, slong g, const slong *d, slong n)
{
    slong i, j;
    theta_correlator(c, Tk, g, d, n);
    for (i = 0; i < n; i++)
        for (j = 3; j <= 2 * d[i] + 1; j += 2)
            fmpq_mul_si(c, c, j);
    if (n % 2)
        fmpq_neg(c, c);
}

/* Part 1: every coefficient of omega_{g,n} of y = 1/z, both routes, 2g-2+n <= 7. */
static long test_bessel_curve(theta_table *Tt, theta_table *Tk, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_struct *y = spu_curve_new(0, ctx);
    slong g, n, r;
    long rows = 0;
    fmpq_t c, v;
    sp_options o;
    fmpq_init(c), fmpq_init(v);
    sp_options_default(&o);
    o.theta = Tt;
    fmpq_mpoly_one(y, ctx);
    for (g = 0; g <= 4; g++)
        for (n = 1; 2 * g - 2 + n <= 7; n++) {
            sp_table A, B;
            if (2 * g - 2 + n <= 0)
                continue;
            sp_table_init(&A, ctx), sp_table_init(&B, ctx);
            UNIT_CHECK(&rep, sp_omega_shift_kind(&A, SP_CURVE_BESSEL, g, n, y, 0, NULL, &o, ctx) == SP_OK
                       && sp_omega_residue_kind(&B, SP_CURVE_BESSEL, g, n, y, 0, 0, NULL, ctx) == SP_OK,
                       "Bessel curve (%ld,%ld): status", (long) g, (long) n);
            for (r = 0; r < A.len && r < B.len; r++, rows++) {
                bessel_expected(c, Tk, g, A.d + r * n, n);
                UNIT_CHECK(&rep, get_rational(v, A.c + r, ctx), "intersection route not rational");
                UNIT_CHECK(&rep, fmpq_equal(v, c), "Bessel curve (%ld,%ld) row %ld: intersection route", (long) g, (long) n, (long) r);
                UNIT_CHECK(&rep, get_rational(v, B.c + r, ctx), "residue route not rational");
                UNIT_CHECK(&rep, fmpq_equal(v, c), "Bessel curve (%ld,%ld) row %ld: residue route", (long) g, (long) n, (long) r);
            }
            sp_table_clear(&A, ctx), sp_table_clear(&B, ctx);
        }
    fmpq_clear(c), fmpq_clear(v);
    spu_curve_free(y, 0, ctx);
    return rows;
}

/* Part 2: omega_{1,1} = -1/(8 z^2) (Norbury's 1/8) and the one-point closed form, g <= 12. */
static void test_one_point(theta_table *Tt, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_struct *y = spu_curve_new(0, ctx);
    slong g, r, d[1];
    fmpq_t c, v;
    fmpz_t t;
    sp_options o;
    fmpq_init(c), fmpq_init(v), fmpz_init(t);
    sp_options_default(&o);
    o.theta = Tt;
    fmpq_mpoly_one(y, ctx);
    for (g = 1; g <= 12; g++) {
        sp_table A, B;
        sp_table_init(&A, ctx), sp_table_init(&B, ctx);
        sp_omega_shift_kind(&A, SP_CURVE_BESSEL, g, 1, y, 0, NULL, &o, ctx);
        sp_omega_residue_kind(&B, SP_CURVE_BESSEL, g, 1, y, 0, 0, NULL, ctx);
        /* -(2g-1)!! * (2g-1)!! (2g-3)!! / (8^g g!): the closed form times -(2d+1)!!, d = g-1 */
        fmpz_one(t);
        for (r = 3; r <= 2 * g - 1; r += 2)
            fmpz_mul_si(t, t, r * r);
        for (r = 3; r <= 2 * g - 3; r += 2)
            fmpz_mul_si(t, t, r);
        fmpq_set_fmpz(c, t);
        fmpz_fac_ui(t, (ulong) g);
        fmpq_div_fmpz(c, c, t);
        fmpq_div_2exp(c, c, (ulong) (3 * g));
        fmpq_neg(c, c);
        d[0] = g - 1;
        r = sp_table_find(&A, d);
        UNIT_CHECK(&rep, r >= 0 && get_rational(v, A.c + r, ctx) && fmpq_equal(v, c),
                   "Bessel omega_{%ld,1}: intersection route against the closed form", (long) g);
        r = sp_table_find(&B, d);
        UNIT_CHECK(&rep, r >= 0 && get_rational(v, B.c + r, ctx) && fmpq_equal(v, c),
                   "Bessel omega_{%ld,1}: residue route against the closed form", (long) g);
        if (g == 1)
            UNIT_CHECK(&rep, fmpz_equal_si(fmpq_denref(v), 8) && fmpz_equal_si(fmpq_numref(v), -1),
                       "omega_{1,1} of the Bessel curve is -1/8 (Norbury's int Theta = 1/8)");
        sp_table_clear(&A, ctx), sp_table_clear(&B, ctx);
    }
    fmpq_clear(c), fmpq_clear(v), fmpz_clear(t);
    spu_curve_free(y, 0, ctx);
}

static const slong cases[][2] = {{1, 1}, {1, 2}, {1, 3}, {1, 4}, {2, 1}, {2, 2}, {2, 3}, {3, 1},
                                 {3, 2}, {4, 1}, {0, 3}, {0, 4}, {1, 5}, {5, 1}};
#define NCASES ((slong) (sizeof cases / sizeof cases[0]))

/* Part 3: random Bessel-type curves, rational (K <= 5, some entries zero) and symbolic
   (y_k = c_k + a_k, 2g-2+n <= 3); returns the number of curves compared. */
static long test_random(flint_rand_t st, theta_table *Tt, const fmpq_mpoly_ctx_t ctx, int symbolic)
{
    long it, iters = unit_iterations(symbolic ? 30 : 600), agreed = 0;
    slong k, K, c;
    fmpq_t q;
    fmpq_mpoly_t a;
    fmpq_init(q);
    fmpq_mpoly_init(a, ctx);
    for (it = 0; it < iters; it++) {
        K = (symbolic ? 1 : 0) + (slong) n_randint(st, 6);
        fmpq_mpoly_struct *y = spu_curve_new(K, ctx);
        for (k = 0; k <= K; k++) {
            slong num;
            do
                num = (slong) n_randint(st, 19) - 9;
            while (k == 0 && num == 0);
            fmpq_set_si(q, (k > 0 && !symbolic && n_randint(st, 4) == 0) ? 0 : num, 1 + n_randint(st, 6));
            fmpq_mpoly_set_fmpq(y + k, q, ctx);
            if (symbolic && k > 0) {
                fmpq_mpoly_gen(a, SPU_A(k), ctx);
                fmpq_mpoly_add(y + k, y + k, a, ctx);
            }
        }
        do
            c = (slong) n_randint(st, NCASES);
        while (symbolic && 2 * cases[c][0] - 2 + cases[c][1] > 3);
        agreed += compare(cases[c][0], cases[c][1], y, K, Tt, ctx);
        spu_curve_free(y, K, ctx);
    }
    fmpq_mpoly_clear(a, ctx);
    fmpq_clear(q);
    return agreed;
}

/* Part 4: y = -cos(2 pi z)/z, y_k = -(-1)^k (2 pi)^(2k) / (2k)!: the volume coefficients against
   theta_volume_coeff times (2 pi^2)^k prod 1/(2^d_i d_i!), 2g-2+n <= 5. */
static void test_super_jt(theta_table *Tt, const fmpq_mpoly_ctx_t ctx)
{
    slong K = 8, k, g, n, r, i;
    fmpq_mpoly_struct *y = spu_curve_new(K, ctx);
    fmpz_t f;
    fmpq_t c;
    fmpq_mpoly_t e, twopi2;
    sp_options o;
    fmpz_init(f), fmpq_init(c), fmpq_mpoly_init(e, ctx), fmpq_mpoly_init(twopi2, ctx);
    spu_set(twopi2, "2*pi^2", ctx);
    for (k = 0; k <= K; k++) {
        fmpq_mpoly_gen(y + k, SPU_PI, ctx);
        fmpq_mpoly_scalar_mul_si(y + k, y + k, 2, ctx);
        fmpq_mpoly_pow_ui(y + k, y + k, (ulong) (2 * k), ctx);
        fmpz_fac_ui(f, (ulong) (2 * k));
        fmpq_mpoly_scalar_div_fmpz(y + k, y + k, f, ctx);
        if (k % 2 == 0)
            fmpq_mpoly_neg(y + k, y + k, ctx);
    }
    sp_options_default(&o);
    o.theta = Tt;
    for (g = 1; g <= 4; g++)
        for (n = 1; 2 * g - 2 + n <= 5; n++) {
            sp_table A;
            sp_table_init(&A, ctx);
            UNIT_CHECK(&rep, sp_omega_shift_kind(&A, SP_CURVE_BESSEL, g, n, y, K, NULL, &o, ctx) == SP_OK,
                       "super JT (%ld,%ld)", (long) g, (long) n);
            sp_table_to_volume(&A, &A, ctx);
            for (r = 0; r < A.len; r++) {
                const slong *d = A.d + r * n;
                slong sd = 0;
                theta_volume_coeff(c, Tt, g, d, n);
                for (i = 0; i < n; i++) {
                    sd += d[i];
                    fmpz_fac_ui(f, (ulong) d[i]);
                    fmpz_mul_2exp(f, f, (ulong) d[i]);
                    fmpq_div_fmpz(c, c, f);
                }
                fmpq_mpoly_pow_ui(e, twopi2, (ulong) (sd <= g - 1 ? g - 1 - sd : 0), ctx);
                fmpq_mpoly_scalar_mul_fmpq(e, e, c, ctx);
                UNIT_CHECK(&rep, fmpq_mpoly_equal(e, A.c + r, ctx), "super JT (%ld,%ld) row %ld", (long) g, (long) n, (long) r);
            }
            sp_table_clear(&A, ctx);
        }
    fmpz_clear(f), fmpq_clear(c), fmpq_mpoly_clear(e, ctx), fmpq_mpoly_clear(twopi2, ctx);
    spu_curve_free(y, K, ctx);
}

int main(void)
{
    fmpq_mpoly_ctx_t ctx;
    flint_rand_t st;
    theta_table *Tt = theta_table_new(THETA_ROUTE_VIRASORO), *Tk = theta_table_new(THETA_ROUTE_KDV);
    long rows, a, b;
    flint_randinit(st);
    fmpq_mpoly_ctx_init(ctx, SPU_NVARS, ORD_LEX);
    rows = test_bessel_curve(Tt, Tk, ctx);
    test_one_point(Tt, ctx);
    a = test_random(st, Tt, ctx, 0);
    b = test_random(st, Tt, ctx, 1);
    test_super_jt(Tt, ctx);
    printf("Bessel curve: %ld coefficients against Theta numbers; routes agree on %ld random rational "
           "and %ld symbolic Bessel-type curves\n", rows, a, b);
    theta_table_free(Tt), theta_table_free(Tk);
    fmpq_mpoly_ctx_clear(ctx);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_spectral_bessel", &rep);
}
