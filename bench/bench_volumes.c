/* bench_volumes.c - wall-clock time and peak memory of the Weil-Petersson volume engine
 * (src/volumes, wpvol_table).
 *
 * Usage:  bench_volumes G N THREADS   one table (all g <= G, n <= N) with THREADS threads
 *         bench_volumes               the standard cases: (50,5), (100,5), (3,500), each with
 *                                     1 and 2 threads, one child process per run
 * One process per run makes the peak RSS (getrusage ru_maxrss, KiB on Linux) belong to that run
 * alone.  The timed region is the wpvol_table call only (allocation of the output excluded).
 * Columns: G, N, threads, wall seconds (CLOCK_MONOTONIC), CPU seconds of the process (user +
 * system, all threads; on a shared machine wall time also measures the other load), peak MiB,
 * primes used by the timed call (wpvol_table_ex with wpvol_table's settings), the estimate of
 * wpvol_estimate (single-core seconds), and a checksum of the table (sum over all entries of
 * num mod p and den mod p for p = 2^61-1) so that runs can be compared.
 */
#define _POSIX_C_SOURCE 200809L
#include <stdio.h>
#include <stdlib.h>
#include <time.h>
#include <sys/resource.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <unistd.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>

#include "volumes/wpvol.h"

/* Seconds elapsed since t0 on the given clock. */
static double bench_since(clockid_t clk, const struct timespec *t0)
{
    struct timespec t1;

    clock_gettime(clk, &t1);
    return (double) (t1.tv_sec - t0->tv_sec) + 1e-9 * (double) (t1.tv_nsec - t0->tv_nsec);
}

/* Peak resident set size of this process in MiB (Linux reports KiB). */
static double bench_peak_mib(void)
{
    struct rusage ru;

    getrusage(RUSAGE_SELF, &ru);
    return (double) ru.ru_maxrss / 1024.0;
}

/* Checksum of a table: sum of numerators and denominators modulo 2^61 - 1. */
static unsigned long bench_checksum(const fmpq *out, slong nv)
{
    const ulong p = (UWORD(1) << 61) - 1;
    ulong s = 0;
    slong k;

    for (k = 0; k < nv; k++)
    {
        s = (s + fmpz_fdiv_ui(fmpq_numref(out + k), p)) % p;
        s = (s + fmpz_fdiv_ui(fmpq_denref(out + k), p)) % p;
    }
    return s;
}

/* One timed table; prints one line.  Returns 0 on success. */
static int bench_run(slong G, slong N, int threads)
{
    slong nv = (G + 1) * (N + 1), primes = 0;
    fmpq *out = _fmpq_vec_init(nv);
    struct timespec w0, c0;
    double wall, cpu, est_s, est_b;
    int st;

    wpvol_estimate(&est_s, &est_b, G, N);
    clock_gettime(CLOCK_MONOTONIC, &w0);
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &c0);
    st = wpvol_table_ex(out, G, N, threads, 62, 1, &primes);   /* = wpvol_table's settings */
    wall = bench_since(CLOCK_MONOTONIC, &w0);
    cpu = bench_since(CLOCK_PROCESS_CPUTIME_ID, &c0);
    printf("%4ld %4ld %2d %9.2f %9.2f %8.1f %6ld %9.1f %20lu%s\n", G, N, threads, wall, cpu,
           bench_peak_mib(), primes, est_s, bench_checksum(out, nv),
           st == WPVOL_OK ? "" : "  (error)");
    fflush(stdout);
    _fmpq_vec_clear(out, nv);
    flint_cleanup_master();
    return st != WPVOL_OK;
}

/* Runs one case in a child process so that its peak memory is its own.  Returns 0 on success. */
static int bench_child(slong G, slong N, int threads)
{
    pid_t pid = fork();
    int status = 0;

    if (pid < 0)
        return bench_run(G, N, threads);   /* no fork: run here (peak RSS then cumulative) */
    if (pid == 0)
        _exit(bench_run(G, N, threads));
    if (waitpid(pid, &status, 0) < 0)
        return 1;
    return !(WIFEXITED(status) && WEXITSTATUS(status) == 0);
}

int main(int argc, char **argv)
{
    static const slong cases[3][2] = { { 50, 5 }, { 100, 5 }, { 3, 500 } };
    int c, t, bad = 0;

    printf("   G    N th   wall(s)    cpu(s) peak(MiB) primes   est(s)             checksum\n");
    fflush(stdout);
    if (argc == 4)
        return bench_child(atol(argv[1]), atol(argv[2]), atoi(argv[3]));
    if (argc != 1)
    {
        fprintf(stderr, "usage: %s [G N THREADS]\n", argv[0]);
        return 2;
    }
    for (c = 0; c < 3; c++)
        for (t = 1; t <= 2; t++)
            bad |= bench_child(cases[c][0], cases[c][1], t);
    return bad;
}
