/* bench_engine.c - wall-clock time and peak memory of the correlator engine.
 *
 * Usage:  bench_engine psi G   all <tau_d>_G with every d_i >= 2 (all n), one fresh table
 *         bench_engine wp G    V_{G,0}: int_{Mbar_G} kappa_1^{3G-3}/(3G-3)! via pf_integral
 *         bench_engine         every case (psi G=2..12, wp G=2..10), one child process per case
 * One process per case makes the peak RSS (getrusage ru_maxrss) meaningful per case.
 * Output columns: mode, g, count (correlators resp. multiset partitions), memo entries, seconds,
 * peak MiB, value (psi: the sum of all the correlators, as a double checksum; wp: the exact
 * rational, followed by the coefficient c in V_{G,0} = c pi^(6G-6) of the plain integral).
 */
#include <stdio.h>
#include <string.h>
#include <flint/fmpq.h>
#include "correlators/pushforward.h"
#include "bench_util.h"

/* Accumulator for the psi sweep: table, running sum, count, first error. */
typedef struct {
    wk_table *T;
    fmpq_t sum;
    long count;
    int status;
} bench_psi_acc;

/* Evaluates every non-increasing d[i..n-1] with parts in [2, cap+2] summing to rem + 2(n-i).
   Adds each value to A->sum and keeps the first engine error in A->status. */
static void bench_psi_rec(bench_psi_acc *A, slong g, slong *d, slong n, slong i, slong rem, slong cap)
{
    slong v;
    if (i == n) {
        fmpq_t r;
        fmpq_init(r);
        if (rem == 0) {
            int st = wk_table_correlator(r, A->T, g, d, n);
            A->status = A->status ? A->status : st;
            fmpq_add(A->sum, A->sum, r);
            A->count++;
        }
        fmpq_clear(r);
        return;
    }
    for (v = (rem < cap ? rem : cap); v >= 0 && v * (n - i) >= rem; v--) {
        d[i] = v + 2;
        bench_psi_rec(A, g, d, n, i + 1, rem - v, v);
    }
}

/* Case "psi": all <tau_d>_g with every d_i >= 2, in one fresh table; prints one row.
   n ranges over 1..3g-3 since sum d = 3g-3+n >= 2n.  Returns the first engine error. */
static int bench_psi(slong g)
{
    bench_psi_acc A;
    bench_timer t;
    slong n, d[64];
    double secs;
    A.T = wk_table_new();
    fmpq_init(A.sum);
    A.count = 0;
    A.status = WK_OK;
    bench_timer_start(&t);
    for (n = 1; n <= 3 * g - 3; n++)
        bench_psi_rec(&A, g, d, n, 0, 3 * g - 3 - n, 3 * g - 3 - n);
    secs = bench_timer_wall(&t);
    printf("psi  %3ld  %8ld  %9ld  %9.3f  %8.1f  %.6e%s\n", (long) g, A.count,
           (long) wk_table_entries(A.T), secs, bench_peak_mib(), fmpq_get_d(A.sum),
           A.status ? "  (engine error)" : "");
    fmpq_clear(A.sum);
    wk_table_free(A.T);
    return A.status;
}

/* Case "wp": int_{Mbar_g} kappa_1^{3g-3}/(3g-3)! in one fresh table; prints one row with
   the rational and the pi^(6g-6) coefficient of V_{g,0}.  Returns the engine status. */
static int bench_wp(slong g)
{
    wk_table *T = wk_table_new();
    slong km[2] = {0, 3 * g - 3};
    bench_timer t;
    fmpq_t v;
    int st;
    double secs;
    fmpq_init(v);
    bench_timer_start(&t);
    st = pf_integral(v, T, g, NULL, 0, km, 1);
    bench_div_factorial(v, (ulong) (3 * g - 3));
    secs = bench_timer_wall(&t);
    printf("wp   %3ld  %8.0f  %9ld  %9.3f  %8.1f  ", (long) g, pf_estimate_terms(km, 1),
           (long) wk_table_entries(T), secs, bench_peak_mib());
    fmpq_print(v);
    fmpq_mul_2exp(v, v, (ulong) (3 * g - 3));
    printf("  V=");
    fmpq_print(v);
    printf("%s\n", st ? "  (engine error)" : "");
    fmpq_clear(v);
    wk_table_free(T);
    return st;
}

/* One case of the sweep: the mode (psi or wp) and the genus. */
typedef struct {
    int psi;
    slong g;
} bench_case;

/* Child body for bench_child_run_or_here: runs the case described by arg (a bench_case).
   The row goes to stdout, nothing to out; returns the engine status. */
static int bench_case_run(void *arg, FILE *out)
{
    const bench_case *c = arg;
    (void) out;
    return c->psi ? bench_psi(c->g) : bench_wp(c->g);
}

/* Every case, each in its own child process so that its peak memory is measured alone.
   Returns nonzero if any case failed. */
static int bench_run_all(void)
{
    bench_case c;
    int bad = 0;
    for (c.psi = 1, c.g = 2; c.g <= 12; c.g++)
        bad |= bench_child_run_or_here(bench_case_run, &c);
    for (c.psi = 0, c.g = 2; c.g <= 10; c.g++)
        bad |= bench_child_run_or_here(bench_case_run, &c);
    return bad;
}

int main(int argc, char **argv)
{
    slong g = -1;
    int bad = 0;
    printf("mode   g     count    entries    seconds  peak_MiB  value\n");
    if (argc == 1)
        return bench_run_all();
    if (argc != 3 || !bench_arg_slong(&g, argv[2], 2, 30)
        || (strcmp(argv[1], "psi") != 0 && strcmp(argv[1], "wp") != 0)) {
        fprintf(stderr, "usage: %s [psi|wp G]   (2 <= G <= 30)\n", argv[0]);
        return 2;
    }
    bad = strcmp(argv[1], "psi") == 0 ? bench_psi(g) : bench_wp(g);
    flint_cleanup();
    return bad ? 1 : 0;
}
