/* bench_volumes.c - wall-clock time and peak memory of the Weil-Petersson volume engine
 * (src/volumes, wpvol_table).
 *
 * Usage:  bench_volumes G N THREADS   one table (all g <= G, n <= N) with THREADS threads
 *         bench_volumes compare GMAX  the single V_{g,n}, g = 4..GMAX, n = 0 and 2, by the
 *                                     foundation route (pf_integral of kappa_1^{3g-3+n} with a
 *                                     fresh wk_table, divided by (3g-3+n)!) and by wpvol_table
 *                                     (G = g, N = n, 1 thread), each in its own child process;
 *                                     the two exact values must be identical
 *         bench_volumes               the standard cases: (50,5), (100,5), (3,500), each with
 *                                     1 and 2 threads, one child process per run; then
 *                                     compare 12
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
#include <string.h>
#include <time.h>
#include <sys/resource.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <unistd.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>

#include "volumes/wpvol.h"
#include "correlators/wk.h"
#include "correlators/pushforward.h"

/* Seconds elapsed since t0 on the given clock.
   Reads the clock once; t0 must come from the same clock. */
static double bench_since(clockid_t clk, const struct timespec *t0)
{
    struct timespec t1;

    clock_gettime(clk, &t1);
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

/* Checksum of a table: sum of numerators and denominators modulo 2^61 - 1.
   Identical tables give identical checksums. */
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

/* One timed table; prints one line.
   Returns 0 on success. */
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

/* Runs one case in a child process so that its peak memory is its own.
   Returns 0 on success. */
static int bench_child(slong G, slong N, int threads)
{
    pid_t pid;
    int status = 0;

    fflush(stdout);   /* the child must not inherit (and print again) pending output */
    pid = fork();

    if (pid < 0)
        return bench_run(G, N, threads);   /* no fork: run here (peak RSS then cumulative) */
    if (pid == 0)
        _exit(bench_run(G, N, threads));
    if (waitpid(pid, &status, 0) < 0)
        return 1;
    return !(WIFEXITED(status) && WEXITSTATUS(status) == 0);
}

/* Seconds one foundation run may take before its child is stopped (SIGALRM); larger genera of
   the same n are then skipped. */
#define CMP_BUDGET_S 600

/* v = V_{g,n} by the foundation route: pf_integral of kappa_1^{3g-3+n} (fresh memo) / (3g-3+n)!.
   n <= 2 (psi exponents all zero); returns the WK_* status (v = 0 on error). */
static int cmp_foundation(fmpq_t v, slong g, slong n)
{
    slong d[2] = { 0, 0 }, kmult[2] = { 0, 3 * g - 3 + n };
    wk_table *T = wk_table_new();
    fmpz_t f;
    int st;

    if (T == NULL || n > 2)
    {
        wk_table_free(T);
        fmpq_zero(v);
        return WK_LIMIT;
    }
    st = pf_integral(v, T, g, d, n, kmult, 1);
    wk_table_free(T);
    fmpz_init(f);
    fmpz_fac_ui(f, (ulong) (3 * g - 3 + n));
    fmpq_div_fmpz(v, v, f);
    fmpz_clear(f);
    return st;
}

/* v = V_{g,n} by the fast engine: wpvol_table(., g, n, 1), entry (g, n).
   The output table is allocated and freed inside; returns the WPVOL_* status. */
static int cmp_fast(fmpq_t v, slong g, slong n)
{
    slong nv = (g + 1) * (n + 1);
    fmpq *out = _fmpq_vec_init(nv);
    int st = wpvol_table(out, g, n, 1);

    fmpq_set(v, out + g * (n + 1) + n);
    _fmpq_vec_clear(out, nv);
    return st;
}

/* Child body: times one route (whole call, allocation included) and writes
   "status wall cpu peakMiB value" to fd.  Never returns. */
static void cmp_child(int fd, int foundation, slong g, slong n)
{
    struct timespec w0, c0;
    double wall, cpu;
    fmpq_t v;
    char *str;
    FILE *f = fdopen(fd, "w");
    int st;

    if (foundation)
        alarm(CMP_BUDGET_S);
    fmpq_init(v);
    clock_gettime(CLOCK_MONOTONIC, &w0);
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &c0);
    st = foundation ? cmp_foundation(v, g, n) : cmp_fast(v, g, n);
    wall = bench_since(CLOCK_MONOTONIC, &w0);
    cpu = bench_since(CLOCK_PROCESS_CPUTIME_ID, &c0);
    str = fmpq_get_str(NULL, 10, v);
    if (f != NULL)
    {
        fprintf(f, "%d %.9f %.9f %.3f %s\n", st, wall, cpu, bench_peak_mib(), str);
        fclose(f);
    }
    flint_free(str);
    fmpq_clear(v);
    flint_cleanup_master();
    _exit(f == NULL || st != 0);
}

/* Reads fd to end of file into a new NUL-terminated string.
   The caller frees the result; NULL if memory runs out. */
static char *cmp_read_all(int fd)
{
    size_t cap = 4096, len = 0;
    char *s = malloc(cap), *t;
    ssize_t r;

    while (s != NULL && (r = read(fd, s + len, cap - len - 1)) > 0)
    {
        len += (size_t) r;
        if (cap - len < 2)
        {
            t = realloc(s, cap *= 2);
            if (t == NULL)
                free(s);
            s = t;
        }
    }
    if (s != NULL)
        s[len] = '\0';
    return s;
}

/* One route's measurement; value is malloc'ed text of the exact rational (NULL unless ok). */
typedef struct { int ok; double wall, cpu, mib; char *value; } cmp_meas;

/* Runs one route in a child process and collects its measurement through a pipe.
   m.ok = 0 when the child failed, was stopped by the alarm, or fork/pipe failed. */
static cmp_meas cmp_measure(int foundation, slong g, slong n)
{
    cmp_meas m = { 0, 0.0, 0.0, 0.0, NULL };
    int fds[2], status = 0, st = -1, off = 0;
    pid_t pid;
    char *text;

    if (pipe(fds) != 0)
        return m;
    fflush(stdout);
    pid = fork();
    if (pid == 0)
    {
        close(fds[0]);
        cmp_child(fds[1], foundation, g, n);
    }
    close(fds[1]);
    text = pid > 0 ? cmp_read_all(fds[0]) : NULL;
    close(fds[0]);
    if (pid > 0 && waitpid(pid, &status, 0) == pid && WIFEXITED(status)
        && WEXITSTATUS(status) == 0 && text != NULL
        && sscanf(text, "%d %lf %lf %lf %n", &st, &m.wall, &m.cpu, &m.mib, &off) == 4 && st == 0)
    {
        text[strcspn(text, "\n")] = '\0';
        m.value = strdup(text + off);
        m.ok = m.value != NULL;
    }
    free(text);
    return m;
}

/* Largest (g, n) so far, in run order, on which both routes finished and agreed. */
typedef struct { slong g, n; double ratio; } cmp_best;

/* Prints one comparison row for (g, n) (tried = 0: foundation skipped); on agreement records
   (g, n, CPU ratio) in *best.  Returns 1 on mismatch or fast-engine failure, else 0. */
static int cmp_row(const cmp_meas *a, const cmp_meas *b, slong g, slong n, int tried,
                   cmp_best *best)
{
    double rw = (b->ok && b->wall > 0.0) ? a->wall / b->wall : 0.0;
    double rc = (b->ok && b->cpu > 0.0) ? a->cpu / b->cpu : 0.0;

    if (!b->ok)
    {
        printf("%3ld %2ld  fast engine failed\n", g, n);
        return 1;
    }
    if (!a->ok)
    {
        printf("%3ld %2ld %10s %10s %9s %10.4f %10.4f %8.1f %8s %8s  ", g, n, "-", "-", "-",
               b->wall, b->cpu, b->mib, "-", "-");
        if (tried)
            printf("foundation not finished (limit %d s, or error)\n", CMP_BUDGET_S);
        else
            printf("foundation skipped (a smaller g did not finish)\n");
        return 0;
    }
    printf("%3ld %2ld %10.4f %10.4f %9.1f %10.4f %10.4f %8.1f %8.1f %8.1f  %s\n", g, n, a->wall,
           a->cpu, a->mib, b->wall, b->cpu, b->mib, rw, rc,
           strcmp(a->value, b->value) == 0 ? "OK" : "MISMATCH");
    if (strcmp(a->value, b->value) != 0)
        return 1;
    best->g = g, best->n = n, best->ratio = rc;
    return 0;
}

/* The compare mode: g = 4..gmax, n = 0 and 2, foundation vs fast engine, one child per run.
   Returns 0 when every finished pair agrees and the fast engine never failed. */
static int bench_compare(slong gmax)
{
    cmp_best best = { -1, -1, 0.0 };
    slong g, n;
    int bad = 0, stopped[3] = { 0, 0, 0 };

    printf("compare: V_{g,n} by pf_integral (fresh wk_table) vs wpvol_table(G=g, N=n, 1 thread);"
           " ratios = foundation / fast (wall, CPU)\n");
    printf("  g  n  found.wall  found.cpu found.MiB  fast.wall   fast.cpu fast.MiB  r(wall)   r(cpu)"
           "  check\n");
    for (g = 4; g <= gmax; g++)
        for (n = 0; n <= 2; n += 2)
        {
            cmp_meas a = { 0, 0.0, 0.0, 0.0, NULL }, b = cmp_measure(0, g, n);
            int tried = !stopped[n];

            if (tried)
                a = cmp_measure(1, g, n);
            stopped[n] |= !a.ok;
            bad |= cmp_row(&a, &b, g, n, tried, &best);
            fflush(stdout);
            free(a.value), free(b.value);
        }
    if (best.g >= 0)
        printf("largest case the foundation route finishes in this run: g=%ld, n=%ld, "
               "ratio %.1f (CPU)\n", best.g, best.n, best.ratio);
    return bad;
}

/* Dispatches on the arguments (see the header comment).
   Returns nonzero if any run failed or the compare mode found a mismatch. */
int main(int argc, char **argv)
{
    static const slong cases[3][2] = { { 50, 5 }, { 100, 5 }, { 3, 500 } };
    static const char *head =
        "   G    N th   wall(s)    cpu(s) peak(MiB) primes   est(s)             checksum\n";
    int c, t, bad = 0;

    if (argc == 3 && strcmp(argv[1], "compare") == 0 && atol(argv[2]) >= 4)
        return bench_compare(atol(argv[2]));
    if (argc == 4)
    {
        printf("%s", head);
        return bench_child(atol(argv[1]), atol(argv[2]), atoi(argv[3]));
    }
    if (argc != 1)
    {
        fprintf(stderr, "usage: %s [G N THREADS | compare GMAX (GMAX >= 4)]\n", argv[0]);
        return 2;
    }
    printf("%s", head);
    fflush(stdout);
    for (c = 0; c < 3; c++)
        for (t = 1; t <= 2; t++)
            bad |= bench_child(cases[c][0], cases[c][1], t);
    printf("\n");
    bad |= bench_compare(12);
    return bad;
}
