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
#define _POSIX_C_SOURCE 200809L
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <sys/resource.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <unistd.h>
#include <flint/fmpq.h>
#include "correlators/pushforward.h"

/* Seconds elapsed since t0 on the monotonic clock.
   Monotonic, so wall-clock adjustments cannot distort timings. */
static double bench_seconds_since(const struct timespec *t0)
{
    struct timespec t1;
    clock_gettime(CLOCK_MONOTONIC, &t1);
    return (double) (t1.tv_sec - t0->tv_sec) + 1e-9 * (double) (t1.tv_nsec - t0->tv_nsec);
}

/* Peak resident set size of this process in MiB.
   Linux reports ru_maxrss in KiB. */
static double bench_peak_mib(void)
{
    struct rusage ru;
    getrusage(RUSAGE_SELF, &ru);
    return (double) ru.ru_maxrss / 1024.0;
}

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
    struct timespec t0;
    slong n, d[64];
    double secs;
    A.T = wk_table_new();
    fmpq_init(A.sum);
    A.count = 0;
    A.status = WK_OK;
    clock_gettime(CLOCK_MONOTONIC, &t0);
    for (n = 1; n <= 3 * g - 3; n++)
        bench_psi_rec(&A, g, d, n, 0, 3 * g - 3 - n, 3 * g - 3 - n);
    secs = bench_seconds_since(&t0);
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
    struct timespec t0;
    fmpq_t v;
    fmpz_t f;
    int st;
    double secs;
    fmpq_init(v);
    fmpz_init(f);
    clock_gettime(CLOCK_MONOTONIC, &t0);
    st = pf_integral(v, T, g, NULL, 0, km, 1);
    fmpz_fac_ui(f, (ulong) (3 * g - 3));
    fmpq_div_fmpz(v, v, f);
    secs = bench_seconds_since(&t0);
    printf("wp   %3ld  %8.0f  %9ld  %9.3f  %8.1f  ", (long) g, pf_estimate_terms(km, 1),
           (long) wk_table_entries(T), secs, bench_peak_mib());
    fmpq_print(v);
    fmpz_one(f);
    fmpz_mul_2exp(f, f, (ulong) (3 * g - 3));
    fmpq_mul_fmpz(v, v, f);
    printf("  V=");
    fmpq_print(v);
    printf("%s\n", st ? "  (engine error)" : "");
    fmpq_clear(v);
    fmpz_clear(f);
    wk_table_free(T);
    return st;
}

/* Runs one case in a child process so that its peak memory is measured alone.
   Falls back to running in-process if fork fails; returns nonzero on any failure. */
static int bench_fork_case(int (*fn)(slong), slong g)
{
    int status = 0;
    pid_t pid;
    fflush(stdout);
    pid = fork();
    if (pid < 0)
        return fn(g);
    if (pid == 0) {
        int st = fn(g);
        fflush(stdout);
        flint_cleanup();
        _exit(st ? 1 : 0);
    }
    if (waitpid(pid, &status, 0) < 0 || !WIFEXITED(status))
        return 1;
    return WEXITSTATUS(status);
}

/* Parses the genus argument.
   Returns -1 when it is not an integer in [2, 30]. */
static slong bench_parse_genus(const char *s)
{
    char *end;
    long g = strtol(s, &end, 10);
    return (end == s || *end != '\0' || g < 2 || g > 30) ? -1 : (slong) g;
}

int main(int argc, char **argv)
{
    slong g;
    int bad = 0;
    printf("mode   g     count    entries    seconds  peak_MiB  value\n");
    if (argc == 1) {
        for (g = 2; g <= 12; g++)
            bad |= bench_fork_case(bench_psi, g);
        for (g = 2; g <= 10; g++)
            bad |= bench_fork_case(bench_wp, g);
        return bad;
    }
    g = argc == 3 ? bench_parse_genus(argv[2]) : -1;
    if (g < 0 || (strcmp(argv[1], "psi") != 0 && strcmp(argv[1], "wp") != 0)) {
        fprintf(stderr, "usage: %s [psi|wp G]   (2 <= G <= 30)\n", argv[0]);
        return 2;
    }
    bad = strcmp(argv[1], "psi") == 0 ? bench_psi(g) : bench_wp(g);
    flint_cleanup();
    return bad ? 1 : 0;
}
