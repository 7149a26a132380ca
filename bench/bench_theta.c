/* bench_theta.c - wall-clock time and peak memory of the Theta engine (src/engines/theta/).
 *
 * Usage:  bench_theta psi G     every Theta-psi number <Theta | tau_d>_G with all d_i >= 1 (the
 *                                partitions of G-1; the others follow by the tau_0 equation), by
 *                                the Virasoro route and by the KdV route, compared one by one
 *         bench_theta vol G N   every coefficient of the super volume V^Theta_{G,N}(L) (sorted d
 *                                with |d| <= G-1; the polynomial is symmetric)
 *         bench_theta            psi for G = 1..12, vol for G = 2..20 and N = 1..3, one child
 *                                process per case, 60 s at most each (a few seconds in all)
 *         bench_theta long       the same, then psi for G = 16, 20, 24 and vol for G = 25, 30
 *                                (N = 1): how the cost grows beyond the sweep (about a minute)
 * Output columns: mode, g, n, count (numbers resp. coefficients), memo entries (Virasoro table),
 * seconds (psi: both routes), peak MiB, growth (seconds over those of the previous row of the same
 * mode and n; "-" for the first), and a check value: psi "agree" or "DIFFER" and the sum of the
 * numbers as a double; vol the value V^Theta_{G,N}(0) / pi^(2G-2) as a double.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <flint/fmpq.h>
#include "theta/theta.h"
#include "bench_util.h"

typedef struct {
    theta_table *V, *K;
    fmpq_t sum;
    long count, differ;
    int status;
} bench_th_acc;

/* Every non-increasing d[i..] with parts in [1, cap] adding up to rem, then both routes. */
static void bench_th_rec(bench_th_acc *A, slong g, slong *d, slong i, slong rem, slong cap)
{
    slong v;
    if (rem == 0) {
        fmpq_t a, b;
        fmpq_init(a);
        fmpq_init(b);
        int s1 = theta_correlator(a, A->V, g, d, i), s2 = theta_correlator(b, A->K, g, d, i);
        A->status = A->status ? A->status : (s1 ? s1 : s2);
        A->differ += !fmpq_equal(a, b);
        fmpq_add(A->sum, A->sum, a);
        A->count++;
        fmpq_clear(a);
        fmpq_clear(b);
        return;
    }
    for (v = rem < cap ? rem : cap; v >= 1; v--) {
        d[i] = v;
        bench_th_rec(A, g, d, i + 1, rem - v, v);
    }
}

/* Case "psi": all zero-free Theta-psi numbers of genus g (n = 1 for g = 1: <Theta | tau_0>_1).
   The row (without the growth column) goes to row, the seconds to *secs. */
static int bench_th_psi(slong g, char *row, size_t len, double *secs_out)
{
    bench_th_acc A;
    bench_timer t;
    slong d[512];
    double secs;
    A.V = theta_table_new(THETA_ROUTE_VIRASORO);
    A.K = theta_table_new(THETA_ROUTE_KDV);
    fmpq_init(A.sum);
    A.count = A.differ = 0;
    A.status = WK_OK;
    bench_timer_start(&t);
    d[0] = 0;
    if (g == 1)
        bench_th_rec(&A, g, d, 1, 0, 0);
    else
        bench_th_rec(&A, g, d, 0, g - 1, g - 1);
    secs = bench_timer_wall(&t);
    snprintf(row, len, "psi  %3ld  %3s  %8ld  %9ld  %9.3f  %8.1f|%s  %.6e%s", (long) g, "-", A.count,
             (long) theta_table_entries(A.V), secs, bench_peak_mib(), A.differ ? "DIFFER" : "agree",
             fmpq_get_d(A.sum), A.status ? "  (engine error)" : "");
    *secs_out = secs;
    fmpq_clear(A.sum);
    theta_table_free(A.V);
    theta_table_free(A.K);
    return A.status || A.differ;
}

typedef struct {
    theta_table *T;
    fmpq_t v0;            /* V^Theta_{g,n}(0) / pi^(2g-2) = 2^(g-1) c_0 */
    long count;
    int status;
} bench_vol_acc;

/* Every non-increasing d[i..n-1] with parts in [0, cap] and sum <= rem: one coefficient each. */
static void bench_vol_rec(bench_vol_acc *A, slong g, slong *d, slong n, slong i, slong rem, slong cap)
{
    slong v;
    if (i == n) {
        fmpq_t c;
        fmpq_init(c);
        int st = theta_volume_coeff(c, A->T, g, d, n);
        A->status = A->status ? A->status : st;
        if (rem == g - 1) {                    /* d = 0: the constant term c (2 pi^2)^(g-1) */
            fmpq_mul_2exp(c, c, (ulong) (g - 1));
            fmpq_set(A->v0, c);
        }
        A->count++;
        fmpq_clear(c);
        return;
    }
    for (v = rem < cap ? rem : cap; v >= 0; v--) {
        d[i] = v;
        bench_vol_rec(A, g, d, n, i + 1, rem - v, v);
    }
}

/* Case "vol": all coefficients of V^Theta_{g,n}(L) in one fresh table; the row as for psi. */
static int bench_th_vol(slong g, slong n, char *row, size_t len, double *secs_out)
{
    bench_vol_acc A;
    bench_timer t;
    slong d[8];
    double secs;
    A.T = theta_table_new(THETA_ROUTE_VIRASORO);
    fmpq_init(A.v0);
    A.count = 0;
    A.status = WK_OK;
    bench_timer_start(&t);
    bench_vol_rec(&A, g, d, n, 0, g - 1, g - 1);
    secs = bench_timer_wall(&t);
    snprintf(row, len, "vol  %3ld  %3ld  %8ld  %9ld  %9.3f  %8.1f|V(0)/pi^%ld = %.6e%s", (long) g, (long) n,
             A.count, (long) theta_table_entries(A.T), secs, bench_peak_mib(), (long) (2 * g - 2),
             fmpq_get_d(A.v0), A.status ? "  (engine error)" : "");
    *secs_out = secs;
    fmpq_clear(A.v0);
    theta_table_free(A.T);
    return A.status;
}

typedef struct {
    int vol;
    slong g, n;
} bench_th_case;

/* Prints a row, with the growth column (secs / prev; "-" when prev <= 0) at the '|'. */
static void bench_th_print(const char *row, double secs, double prev)
{
    const char *bar = strchr(row, '|');
    int head = bar ? (int) (bar - row) : (int) strlen(row);
    char growth[32];
    if (prev > 0 && secs > 0)
        snprintf(growth, sizeof growth, "%7.2f", secs / prev);
    else
        snprintf(growth, sizeof growth, "%7s", "-");
    printf("%.*s  %s  %s\n", head, row, growth, bar ? bar + 1 : "");
    fflush(stdout);
}

/* Child body: runs one case and sends "status seconds" and the row through out. */
static int bench_th_case_run(void *arg, FILE *out)
{
    const bench_th_case *c = arg;
    char row[256];
    double secs = 0;
    int st = c->vol ? bench_th_vol(c->g, c->n, row, sizeof row, &secs) : bench_th_psi(c->g, row, sizeof row, &secs);
    if (out)
        fprintf(out, "%d %.9g\n%s\n", st, secs, row);
    return st;
}

/* One case in a child with a 60 s limit; prints its row with the growth over *prev (the seconds
   of the previous row of the series, updated).  A case that runs out of time is reported. */
static int bench_th_child(bench_th_case *c, double *prev)
{
    bench_child_result r = bench_child_run(bench_th_case_run, c, 60);
    int ok = bench_child_ok(&r), st = 1;
    double secs = 0;
    char *nl = r.text ? strchr(r.text, '\n') : NULL;
    if (ok && nl && sscanf(r.text, "%d %lg", &st, &secs) == 2) {
        char *end = strchr(nl + 1, '\n');
        if (end)
            *end = '\0';
        bench_th_print(nl + 1, secs, *prev);
        *prev = secs;
    } else if (r.signaled) {
        printf("%s  %3ld  %3ld  stopped at the 60 s limit\n", c->vol ? "vol" : "psi", (long) c->g, (long) c->n);
        *prev = 0;
    }
    bench_child_clear(&r);
    return !ok || st != 0;
}

/* The default sweep (psi g <= 12, vol g <= 20, n <= 3) and, with long_run, the cases beyond it. */
static int bench_th_all(int long_run)
{
    bench_th_case c;
    int bad = 0;
    double prev = 0;
    static const slong more_psi[3] = {16, 20, 24}, more_vol[2] = {25, 30};
    for (c.vol = 0, c.n = 0, c.g = 1; c.g <= 12; c.g++)
        bad |= bench_th_child(&c, &prev);
    for (int i = 0; long_run && i < 3; i++) {
        c.g = more_psi[i];
        bad |= bench_th_child(&c, &prev);
    }
    for (c.vol = 1, c.n = 1; c.n <= 3; c.n++) {
        prev = 0;
        for (c.g = 2; c.g <= 20; c.g++)
            bad |= bench_th_child(&c, &prev);
        for (int i = 0; long_run && c.n == 1 && i < 2; i++) {
            c.g = more_vol[i];
            bad |= bench_th_child(&c, &prev);
        }
    }
    return bad;
}

int main(int argc, char **argv)
{
    slong g = -1, n = -1;
    int bad;
    char row[256];
    double secs = 0;
    printf("mode   g    n     count    entries    seconds  peak_MiB   growth  check\n");
    fflush(stdout);
    if (argc == 1 || (argc == 2 && strcmp(argv[1], "long") == 0))
        return bench_th_all(argc == 2);
    if (argc == 3 && strcmp(argv[1], "psi") == 0 && bench_arg_slong(&g, argv[2], 1, 60)) {
        bad = bench_th_psi(g, row, sizeof row, &secs);
        bench_th_print(row, secs, 0);
    } else if (argc == 4 && strcmp(argv[1], "vol") == 0 && bench_arg_slong(&g, argv[2], 1, 60)
               && bench_arg_slong(&n, argv[3], 1, 6)) {
        bad = bench_th_vol(g, n, row, sizeof row, &secs);
        bench_th_print(row, secs, 0);
    } else {
        fprintf(stderr, "usage: %s [long | psi G | vol G N]   (1 <= G <= 60, 1 <= N <= 6)\n", argv[0]);
        return 2;
    }
    flint_cleanup();
    return bad ? 1 : 0;
}
