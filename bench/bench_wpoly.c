/* bench_wpoly.c - wall-clock time and peak memory of the few-point volume polynomials
 * (src/volumes/wpoly.h, all coefficients of V_{g,n}(L)), and the same coefficients by the
 * reduction (pf_integral of psi^a kappa_1^{D-|a|} for every sorted a, one fresh wk_table).
 *
 * Usage:  bench_wpoly G N THREADS   one engine run
 *         bench_wpoly ref G N       one reduction run (stopped after REF_BUDGET_S seconds or
 *                                   when its table exceeds 3e7 entries, the default limit)
 *         bench_wpoly               the standard cases: n = 1 for g = 5, 10, 15, 20, 25;
 *                                   n = 2 for g = 3, 6, 9, 12; n = 3 for g = 3, 5, 7 (2 threads),
 *                                   then both routes side by side, 1 thread, for n = 1, 2
 *                                   (g <= 14) and n = 3 (g <= 9), until the reduction fails
 * One child process per run, so that the peak RSS (getrusage ru_maxrss) is that run's own.
 * Columns: g, n, threads, wall s, CPU s (all threads), peak MiB, primes, estimate (single-core
 * s), checksum of the coefficients (sum of num and den mod 2^61-1; equal results, equal sums).
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

#include <flint/fmpz.h>
#include <flint/fmpq.h>

#include "volumes/wpoly.h"
#include "correlators/wk.h"
#include "correlators/pushforward.h"

#define REF_BUDGET_S 300

/* Seconds since t0 on clock clk. */
static double bw_since(clockid_t clk, const struct timespec *t0)
{
    struct timespec t1;

    clock_gettime(clk, &t1);
    return (double) (t1.tv_sec - t0->tv_sec) + 1e-9 * (double) (t1.tv_nsec - t0->tv_nsec);
}

/* Peak RSS of this process in MiB (Linux: ru_maxrss in KiB). */
static double bw_peak_mib(void)
{
    struct rusage ru;

    getrusage(RUSAGE_SELF, &ru);
    return (double) ru.ru_maxrss / 1024.0;
}

/* Sum of numerators and denominators modulo 2^61-1. */
static unsigned long bw_checksum(const fmpq *v, slong nv)
{
    const ulong p = (UWORD(1) << 61) - 1;
    ulong s = 0;
    slong k;

    for (k = 0; k < nv; k++)
        s = (s + fmpz_fdiv_ui(fmpq_numref(v + k), p) + fmpz_fdiv_ui(fmpq_denref(v + k), p)) % p;
    return s;
}

/* All W_a by the reduction, in the order of wpoly_indices.  Returns 0 on success. */
static int bw_reference(fmpq *out, slong g, slong n)
{
    slong nv = wpoly_indices(NULL, g, n), D = 3 * g - 3 + n, k, i;
    slong *idx = malloc((size_t) (nv * n) * sizeof(slong));
    wk_table *T = wk_table_new();
    fmpz_t f;
    int st = (idx == NULL || T == NULL) ? 1 : 0;

    fmpz_init(f);
    if (st == 0)
    {
        wk_table_set_limit(T, 30000000);   /* the language's default --max-table */
        wpoly_indices(idx, g, n);
    }
    for (k = 0; st == 0 && k < nv; k++)
    {
        slong kmult[2] = { 0, D };
        for (i = 0; i < n; i++)
            kmult[1] -= idx[k * n + i];
        st = pf_integral(out + k, T, g, idx + k * n, n, kmult, kmult[1] > 0 ? 1 : 0);
        fmpz_fac_ui(f, (ulong) kmult[1]);
        fmpq_div_fmpz(out + k, out + k, f);
    }
    fmpz_clear(f);
    wk_table_free(T);
    free(idx);
    return st;
}

/* One timed run (engine if threads >= 1, reduction if threads == 0); prints one line and
   writes the CPU seconds to fd (if >= 0). */
static int bw_run(slong g, slong n, int threads, int fd)
{
    slong nv = wpoly_indices(NULL, g, n), primes = 0;
    fmpq *out = _fmpq_vec_init(nv);
    struct timespec w0, c0;
    double wall, cpu, est_s = 0.0, est_b = 0.0;
    int st;

    if (threads == 0)
        alarm(REF_BUDGET_S);
    else
        wpoly_estimate(&est_s, &est_b, g, n);
    clock_gettime(CLOCK_MONOTONIC, &w0);
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &c0);
    st = threads == 0 ? bw_reference(out, g, n)
                      : wpoly_coeffs_ex(out, g, n, threads, 62, 1, 0, &primes);
    wall = bw_since(CLOCK_MONOTONIC, &w0);
    cpu = bw_since(CLOCK_PROCESS_CPUTIME_ID, &c0);
    printf("%4ld %2ld %-9s %9.2f %9.2f %8.1f %6ld %9.1f %20lu%s\n", g, n,
           threads == 0 ? "reduction" : (threads == 1 ? "engine/1" : "engine/2"), wall, cpu,
           bw_peak_mib(), primes, est_s, bw_checksum(out, nv), st == 0 ? "" : "  (error)");
    fflush(stdout);
    if (fd >= 0)
    {
        char buf[64];
        int len = snprintf(buf, sizeof buf, "%.6f\n", cpu);
        if (write(fd, buf, (size_t) len) != len)
            st = 1;
    }
    _fmpq_vec_clear(out, nv);
    flint_cleanup_master();
    return st != 0;
}

/* Runs bw_run in a child; *cpu (may be NULL) receives its CPU seconds.  Returns 0 if it
   finished (within the budget) without error. */
static int bw_child(slong g, slong n, int threads, double *cpu)
{
    pid_t pid;
    int status = 0, fds[2];
    char buf[64] = "";
    ssize_t r;

    if (pipe(fds) != 0)
        return 1;
    fflush(stdout);
    pid = fork();
    if (pid < 0)
        return 1;
    if (pid == 0)
    {
        close(fds[0]);
        _exit(bw_run(g, n, threads, fds[1]));
    }
    close(fds[1]);
    r = read(fds[0], buf, sizeof buf - 1);
    close(fds[0]);
    if (cpu != NULL)
        *cpu = r > 0 ? atof(buf) : 0.0;
    if (waitpid(pid, &status, 0) < 0)
        return 1;
    if (WIFSIGNALED(status))
        printf("%4ld %2ld %-9s stopped after %d s\n", g, n, threads == 0 ? "reduction" : "engine",
               REF_BUDGET_S);
    return !(WIFEXITED(status) && WEXITSTATUS(status) == 0);
}

int main(int argc, char **argv)
{
    static const slong n1[] = { 5, 10, 15, 20, 25 }, n2[] = { 3, 6, 9, 12 }, n3[] = { 3, 5, 7 };
    slong g, n;
    int bad = 0;
    size_t i;

    if (argc == 4 && strcmp(argv[1], "ref") == 0)
        return bw_child(atol(argv[2]), atol(argv[3]), 0, NULL);
    if (argc == 4)
        return bw_child(atol(argv[1]), atol(argv[2]), atoi(argv[3]), NULL);
    printf("   g  n route          wall       CPU  peakMiB primes  estimate             checksum\n");
    for (i = 0; i < sizeof n1 / sizeof n1[0]; i++)
        bad |= bw_child(n1[i], 1, 2, NULL);
    for (i = 0; i < sizeof n2 / sizeof n2[0]; i++)
        bad |= bw_child(n2[i], 2, 2, NULL);
    for (i = 0; i < sizeof n3 / sizeof n3[0]; i++)
        bad |= bw_child(n3[i], 3, 2, NULL);
    printf("side by side, 1 thread (same checksum expected; reduction stopped after %d s)\n",
           REF_BUDGET_S);
    for (n = 1; n <= 3; n++)
        for (g = (n == 1 ? 5 : 3); g <= (n == 3 ? 9 : 14); g++)
        {
            double ce = 0.0, cr = 0.0;
            bad |= bw_child(g, n, 1, &ce);
            if (bw_child(g, n, 0, &cr) != 0)
                break;
            printf("%4ld %2ld ratio reduction/engine CPU = %.1f\n", g, n, ce > 0.0 ? cr / ce : 0.0);
        }
    return bad;
}
