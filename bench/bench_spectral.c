/* bench_spectral.c - omega_{g,n} of spectral curves (src/engines/spectral/spectral.h) by the intersection
 * route (sp_omega_shift_kind: psi correlators at the shifted KdV times, the volume engine when only
 * kappa_1 appears, Theta-psi numbers for a Bessel-type curve) and by the recursion's residues
 * (sp_omega_residue_kind), side by side in one run.
 *
 * Curves:  jt    x = z^2/2, y = -sin(2 pi z)/(2 pi) (the Weil-Petersson curve; coefficients in pi;
 *                only kappa_1 appears, so the intersection route is the volume engine for g >= 2)
 *          sym   y_0 = 1, y_k = c_k + a_k for k = 1..6: six symbolic coefficients a_1..a_6 on fixed
 *                rationals c_k (a deformation of the Airy curve in every direction up to z^13;
 *                the intersection route is the psi correlators at the shifted times)
 *          rat   the same with a_k = 0 (rational coefficients)
 *          sjt   the Bessel-type curve y = -cos(2 pi z)/z (super volumes; Theta-psi numbers)
 *
 * Usage:  bench_spectral CURVE N G ROUTE         one run (ROUTE: shift or residue)
 *         bench_spectral                         the short run: g <= 6 (n = 1, 2) by both routes,
 *                                                n = 1 up to g = 10 by the intersection route,
 *                                                each run stopped after 30 s
 *         bench_spectral full                    g <= 10 by both routes, n = 1 up to g = 16 by
 *                                                the intersection route, 120 s per run
 *         bench_spectral GMAX1 GMAX [BUDGET_S]   the same with other bounds
 * One child process per run, so that the peak RSS is that run's own.  When the residue route
 * passes the budget the row says it was capped, and that curve's larger cases skip it.  Columns:
 * curve, n, g, then for each route wall s, CPU s, peak MiB, and the checksum of the coefficients
 * (sum of numerators and denominators mod 2^61-1); ratio is residue CPU / intersection CPU (the
 * wall clock of a shared machine measures the other load too, and the budget is wall time), and
 * "equal" means the two checksums agree.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>
#include <flint/fmpq_mpoly.h>

#include "correlators/wk.h"
#include "spectral/spectral.h"
#include "bench_util.h"

#define NVARS 7                     /* pi, a_1..a_6 */

static unsigned budget_s = 30;      /* seconds per run, then the child is stopped */

/* One run: the curve, (g, n) and the route. */
typedef struct { const char *curve; slong g, n; int residue; } bs_case;

/* y_0..y_K of the named curve, K = 3g-3+n for jt and sjt (their series), 6 otherwise.  Returns K,
   or -1 for an unknown name; *y then holds K + 1 initialised polynomials (free with bs_curve_free). */
static slong bs_curve(fmpq_mpoly_struct **y, const char *name, slong D, const fmpq_mpoly_ctx_t ctx)
{
    static const slong num[7] = {1, -2, 3, 5, -7, 1, 4}, den[7] = {1, 3, 7, 2, 11, 5, 9};
    int sjt = strcmp(name, "sjt") == 0, jt = sjt || strcmp(name, "jt") == 0, sym = strcmp(name, "sym") == 0;
    slong K = jt ? D : 6, k;
    fmpz_t f;
    fmpq_mpoly_t a;
    if (!jt && !sym && strcmp(name, "rat") != 0)
        return -1;
    *y = flint_malloc((size_t) (K + 1) * sizeof(fmpq_mpoly_struct));
    fmpz_init(f);
    fmpq_mpoly_init(a, ctx);
    for (k = 0; k <= K; k++) {
        fmpq_mpoly_init(*y + k, ctx);
        if (jt) {                  /* -(-1)^k (2 pi)^{2k} / (2k+1)!, or / (2k)! for sjt */
            fmpq_mpoly_gen(*y + k, 0, ctx);
            fmpq_mpoly_scalar_mul_si(*y + k, *y + k, 2, ctx);
            fmpq_mpoly_pow_ui(*y + k, *y + k, (ulong) (2 * k), ctx);
            fmpz_fac_ui(f, (ulong) (sjt ? 2 * k : 2 * k + 1));
            fmpq_mpoly_scalar_div_fmpz(*y + k, *y + k, f, ctx);
            if (k % 2 == 0)
                fmpq_mpoly_neg(*y + k, *y + k, ctx);
            continue;
        }
        fmpq_mpoly_set_si(*y + k, num[k], ctx);
        fmpq_mpoly_scalar_div_si(*y + k, *y + k, den[k], ctx);
        if (sym && k > 0) {
            fmpq_mpoly_gen(a, k, ctx);
            fmpq_mpoly_add(*y + k, *y + k, a, ctx);
        }
    }
    fmpq_mpoly_clear(a, ctx);
    fmpz_clear(f);
    return K;
}

static void bs_curve_free(fmpq_mpoly_struct *y, slong K, const fmpq_mpoly_ctx_t ctx)
{
    for (slong k = 0; k <= K; k++)
        fmpq_mpoly_clear(y + k, ctx);
    flint_free(y);
}

/* Checksum of every term coefficient of the table (in row order). */
static ulong bs_checksum(const sp_table *W, const fmpq_mpoly_ctx_t ctx)
{
    slong r, i, len = 0, at = 0;
    fmpq *v;
    ulong h;
    for (r = 0; r < W->len; r++)
        len += fmpq_mpoly_length(W->c + r, ctx);
    v = _fmpq_vec_init(len > 0 ? len : 1);
    for (r = 0; r < W->len; r++)
        for (i = 0; i < fmpq_mpoly_length(W->c + r, ctx); i++)
            fmpq_mpoly_get_term_coeff_fmpq(v + at++, W->c + r, i, ctx);
    h = bench_checksum_fmpq(v, len);
    _fmpq_vec_clear(v, len > 0 ? len : 1);
    return h;
}

/* Child body: one timed run of the case in arg; writes usage and checksum to out. */
static int bs_run(void *arg, FILE *out)
{
    const bs_case *c = arg;
    fmpq_mpoly_ctx_t ctx;
    fmpq_mpoly_struct *y;
    sp_table W;
    bench_timer t;
    bench_usage u;
    wk_table *Tw = wk_table_new();
    slong K;
    int st;
    fmpq_mpoly_ctx_init(ctx, NVARS, ORD_LEX);
    int kind = strcmp(c->curve, "sjt") == 0 ? SP_CURVE_BESSEL : SP_CURVE_AIRY;
    K = bs_curve(&y, c->curve, 3 * c->g - 3 + c->n, ctx);
    if (K < 0)
        return 1;
    sp_table_init(&W, ctx);
    bench_timer_start(&t);
    st = c->residue ? sp_omega_residue_kind(&W, kind, c->g, c->n, y, K, 0, NULL, ctx)
                    : sp_omega_shift_kind(&W, kind, c->g, c->n, y, K, Tw, NULL, ctx);
    u.wall = bench_timer_wall(&t);
    u.cpu = bench_timer_cpu(&t);
    u.mib = bench_peak_mib();
    if (out != NULL && st == SP_OK) {
        bench_usage_write(out, &u);
        fprintf(out, "%lu\n", (unsigned long) bs_checksum(&W, ctx));
    }
    sp_table_clear(&W, ctx);
    bs_curve_free(y, K, ctx);
    wk_table_free(Tw);
    fmpq_mpoly_ctx_clear(ctx);
    return st == SP_OK ? 0 : 1;
}

/* Runs one case in a child; fills u and *sum and returns 1 on success, 0 on failure and -1 when
   the child was stopped at the budget. */
static int bs_measure(bs_case *c, bench_usage *u, unsigned long *sum)
{
    bench_child_result r = bench_child_run(bs_run, c, budget_s);
    const char *rest = bench_child_ok(&r) ? bench_usage_read(u, r.text) : NULL;
    int ok = rest != NULL && sscanf(rest, "%lu", sum) == 1 ? 1 : r.signaled ? -1 : 0;
    bench_child_clear(&r);
    return ok;
}

/* One row: the intersection route, then the residue route unless *res_on is 0 (it is turned
   off once a residue run fails or passes BUDGET_S). */
static void bs_row(const char *curve, slong g, slong n, int *res_on)
{
    bs_case a = {curve, g, n, 0}, b = {curve, g, n, 1};
    bench_usage ua, ub;
    unsigned long sa = 0, sb = 0;
    int oka = bs_measure(&a, &ua, &sa), okb = 0;
    printf("%-4s %2ld %3ld", curve, (long) n, (long) g);
    if (oka == 1)
        printf("  %9.3f %9.3f %8.1f %20lu", ua.wall, ua.cpu, ua.mib, sa);
    else
        printf("  %-50s", oka < 0 ? "(capped: stopped at the budget)" : "(failed)");
    if (*res_on && (okb = bs_measure(&b, &ub, &sb)) == 1)
        printf("  %9.3f %9.3f %8.1f %20lu  %8.1f %s", ub.wall, ub.cpu, ub.mib, sb,
               bench_ratio(ub.cpu, ua.cpu), oka == 1 && sa == sb ? "equal" : oka == 1 ? "DIFFERENT" : "");
    else if (*res_on && okb < 0)
        printf("  residue route capped at the budget of %u s (not finished); larger g skip it", budget_s);
    else if (*res_on)
        printf("  residue route failed");
    printf("\n");
    fflush(stdout);
    if (*res_on && okb != 1)
        *res_on = 0;
}

/* The standard table: n = 1, 2 for g <= gmax by both routes, then n = 1 up to gmax1 by the
   intersection route alone. */
static void bs_table(slong gmax1, slong gmax)
{
    const char *curves[3] = {"jt", "sym", "sjt"};
    slong g, n;
    printf("budget %u s per run; g <= %ld by both routes, n = 1 up to g = %ld by the intersection route\n",
           budget_s, (long) gmax, (long) gmax1);
    printf("curve n   g   intersection: wall s     CPU s  peak MiB             checksum"
           "     residue: wall s     CPU s  peak MiB             checksum     ratio\n");
    for (int c = 0; c < 3; c++)
        for (n = 1; n <= 2; n++) {
            int res_on = 1;
            for (g = (n == 1); g <= gmax; g++)
                if (2 * g - 2 + n > 0)
                    bs_row(curves[c], g, n, &res_on);
        }
    for (int c = 0; c < 3; c++)
        for (g = gmax + 1; g <= gmax1; g++) {
            int res_on = 0;
            bs_row(curves[c], g, 1, &res_on);
        }
}

int main(int argc, char **argv)
{
    slong gmax1 = 10, gmax = 6, b = 30;
    static const char usage[] = "usage: bench_spectral [jt|sym|rat|sjt N G shift|residue] | full | [GMAX1 GMAX [BUDGET_S]]\n";
    if (argc == 5) {
        bs_case c;
        bench_usage u;
        unsigned long sum;
        c.curve = argv[1];
        c.residue = strcmp(argv[4], "residue") == 0;
        budget_s = 600;
        if (!bench_arg_slong(&c.n, argv[2], 1, 50) || !bench_arg_slong(&c.g, argv[3], 0, 100)
            || (!c.residue && strcmp(argv[4], "shift") != 0) || bs_measure(&c, &u, &sum) != 1) {
            fputs(usage, stderr);
            return 1;
        }
        printf("%s n=%s g=%s %s: wall %.3f s, CPU %.3f s, peak %.1f MiB, checksum %lu\n",
               argv[1], argv[2], argv[3], argv[4], u.wall, u.cpu, u.mib, sum);
        return 0;
    }
    if (argc == 2 && strcmp(argv[1], "full") == 0)
        gmax1 = 16, gmax = 10, b = 120;
    else if (argc != 1 && (argc < 3 || argc > 4 || !bench_arg_slong(&gmax1, argv[1], 1, 40)
                           || !bench_arg_slong(&gmax, argv[2], 1, 40)
                           || (argc == 4 && !bench_arg_slong(&b, argv[3], 1, 3600)))) {
        fputs(usage, stderr);
        return 1;
    }
    budget_s = (unsigned) b;
    bs_table(gmax1, gmax);
    return 0;
}
