/* bench_volumes.c - wall-clock time and peak memory of the Weil-Petersson volume engine
 * (src/volumes, wpvol_table).
 *
 * Usage:  bench_volumes G N THREADS   one table (all g <= G, n <= N) with THREADS threads
 *         bench_volumes compare GMAX  the single V_{g,n}, g = 4..GMAX, n = 0 and 2, by the
 *                                     foundation route (pf_integral of kappa_1^{3g-3+n} with a
 *                                     fresh wk_table, divided by (3g-3+n)!) and by wpvol_table
 *                                     (G = g, N = n, 1 thread), each in its own child process;
 *                                     the two exact values must be identical
 *         bench_volumes single [G [T]] one V_{G,0} (default G = 40) on 1 thread and on T threads
 *                                     (default: every processor online), each in its own child
 *                                     process, side by side: wall, CPU, CPU/wall, peak MiB,
 *                                     primes, the ratios, and whether the two values are equal.
 *                                     The engine computes V_{G,0} as the table g <= G, n = 0
 *                                     (the recursion runs through every lower genus anyway), so
 *                                     that is what is timed.  Keep G small on a shared machine.
 *         bench_volumes prime G N [R] R (default 3) primes of the table (G, N) one after the
 *                                     other on one thread (wpvol_modp_run with one workspace,
 *                                     primes of the driver's form c 2^28 + 1), in this process:
 *                                     seconds of each prime, their minimum and median, peak
 *                                     MiB.  The per-prime cost is what profiles and the time
 *                                     model describe; the minimum is the least disturbed by
 *                                     other load on a shared machine.
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
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "volumes/wpvol.h"
#include "volumes/wpvol_internal.h"
#include "correlators/wk.h"
#include "correlators/pushforward.h"
#include "bench_util.h"

/* One table run: G, N and the number of threads. */
typedef struct { slong G, N; int threads; } bench_case;

/* Child body: one timed table (the wpvol_table call only); prints one row to stdout.
   arg is a bench_case, out is unused; returns 0 on success. */
static int bench_run(void *arg, FILE *out)
{
    const bench_case *c = arg;
    slong nv = (c->G + 1) * (c->N + 1), primes = 0;
    fmpq *out_v = _fmpq_vec_init(nv);
    bench_timer t;
    bench_usage u;
    double est_s, est_b;
    char lead[64];
    int st;

    (void) out;
    wpvol_estimate(&est_s, &est_b, c->G, c->N);
    bench_timer_start(&t);
    /* wpvol_table's own settings, with the count of primes exposed */
    st = wpvol_table_ex(out_v, c->G, c->N, c->threads, wpvol_default_prime_bits(), 1,
                        &primes);
    u.wall = bench_timer_wall(&t);
    u.cpu = bench_timer_cpu(&t);
    u.mib = bench_peak_mib();
    snprintf(lead, sizeof lead, "%4ld %4ld %2d", c->G, c->N, c->threads);
    bench_print_row(lead, &u, primes, est_s, bench_checksum_fmpq(out_v, nv), st == WPVOL_OK);
    _fmpq_vec_clear(out_v, nv);
    return st != WPVOL_OK;
}

/* Runs one table in a child process so that its peak memory is its own.
   Returns 0 on success. */
static int bench_table_child(slong G, slong N, int threads)
{
    bench_case c = { G, N, threads };

    return bench_child_run_or_here(bench_run, &c);
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
    int st;

    if (T == NULL || n > 2)
    {
        wk_table_free(T);
        fmpq_zero(v);
        return WK_LIMIT;
    }
    st = pf_integral(v, T, g, d, n, kmult, 1);
    wk_table_free(T);
    bench_div_factorial(v, (ulong) (3 * g - 3 + n));
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

/* One route of the comparison: foundation (1) or fast (0) for V_{g,n}. */
typedef struct { int foundation; slong g, n; } cmp_case;

/* Child body: times one route (whole call, allocation included) and writes its usage line and
   the exact value to out.  arg is a cmp_case; returns the route's status (0 = success). */
static int cmp_child(void *arg, FILE *out)
{
    const cmp_case *c = arg;
    bench_timer t;
    bench_usage u;
    fmpq_t v;
    char *str;
    int st;

    fmpq_init(v);
    bench_timer_start(&t);
    st = c->foundation ? cmp_foundation(v, c->g, c->n) : cmp_fast(v, c->g, c->n);
    u.wall = bench_timer_wall(&t);
    u.cpu = bench_timer_cpu(&t);
    u.mib = bench_peak_mib();
    str = fmpq_get_str(NULL, 10, v);
    bench_usage_write(out, &u);
    fprintf(out, "%s\n", str);
    flint_free(str);
    fmpq_clear(v);
    return st;
}

/* One route's measurement; value is malloc'ed text of the exact rational (NULL unless ok). */
typedef struct { int ok; bench_usage u; char *value; } cmp_meas;

/* Runs one route in a child process (foundation under the CMP_BUDGET_S alarm) and collects its
   measurement.  m.ok = 0 when the child failed, was stopped by the alarm, or fork/pipe failed. */
static cmp_meas cmp_measure(int foundation, slong g, slong n)
{
    cmp_meas m = { 0, { 0.0, 0.0, 0.0 }, NULL };
    cmp_case c = { foundation, g, n };
    bench_child_result ch = bench_child_run(cmp_child, &c, foundation ? CMP_BUDGET_S : 0);
    const char *rest = bench_child_ok(&ch) ? bench_usage_read(&m.u, ch.text) : NULL;

    if (rest != NULL)
    {
        m.value = strndup(rest, strcspn(rest, "\n"));
        m.ok = m.value != NULL;
    }
    bench_child_clear(&ch);
    return m;
}

/* Largest (g, n) so far, in run order, on which both routes finished and agreed. */
typedef struct { slong g, n; double ratio; } cmp_best;

/* Prints one comparison row for (g, n) (tried = 0: foundation skipped); on agreement records
   (g, n, CPU ratio) in *best.  Returns 1 on mismatch or fast-engine failure, else 0. */
static int cmp_row(const cmp_meas *a, const cmp_meas *b, slong g, slong n, int tried,
                   cmp_best *best)
{
    double rw = bench_ratio(a->u.wall, b->u.wall), rc = bench_ratio(a->u.cpu, b->u.cpu);

    if (!b->ok)
    {
        printf("%3ld %2ld  fast engine failed\n", g, n);
        return 1;
    }
    if (!a->ok)
    {
        printf("%3ld %2ld %10s %10s %9s %10.4f %10.4f %8.1f %8s %8s  ", g, n, "-", "-", "-",
               b->u.wall, b->u.cpu, b->u.mib, "-", "-");
        if (tried)
            printf("foundation not finished (limit %d s, or error)\n", CMP_BUDGET_S);
        else
            printf("foundation skipped (a smaller g did not finish)\n");
        return 0;
    }
    printf("%3ld %2ld %10.4f %10.4f %9.1f %10.4f %10.4f %8.1f %8.1f %8.1f  %s\n", g, n, a->u.wall,
           a->u.cpu, a->u.mib, b->u.wall, b->u.cpu, b->u.mib, rw, rc,
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
            cmp_meas a = { 0, { 0.0, 0.0, 0.0 }, NULL }, b = cmp_measure(0, g, n);
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

/* One V_{G,0} on a number of threads. */
typedef struct { slong G; int threads; } single_case;

/* Child body: times wpvol_table_ex(G, 0) on c->threads threads and writes its usage line, then
   "primes value" with the exact V_{G,0}.  Returns the engine's status (0 = success). */
static int single_child(void *arg, FILE *out)
{
    const single_case *c = arg;
    fmpq *v = _fmpq_vec_init(c->G + 1);
    slong primes = 0;
    bench_timer t;
    bench_usage u;
    char *str;
    int st;

    bench_timer_start(&t);
    st = wpvol_table_ex(v, c->G, 0, c->threads, wpvol_default_prime_bits(), 1, &primes);
    u.wall = bench_timer_wall(&t);
    u.cpu = bench_timer_cpu(&t);
    u.mib = bench_peak_mib();
    str = fmpq_get_str(NULL, 10, v + c->G);
    bench_usage_write(out, &u);
    fprintf(out, "%ld %s\n", (long) primes, str);
    flint_free(str);
    _fmpq_vec_clear(v, c->G + 1);
    return st;
}

/* Runs single_child in a child process; m->value gets the exact value (malloc'ed), *primes the
   primes used.  Returns 1 on success. */
static int single_measure(slong G, int threads, cmp_meas *m, long *primes)
{
    single_case c = { G, threads };
    bench_child_result ch = bench_child_run(single_child, &c, 0);
    const char *rest = bench_child_ok(&ch) ? bench_usage_read(&m->u, ch.text) : NULL;
    int used = 0;

    m->ok = 0;
    m->value = NULL;
    if (rest != NULL && sscanf(rest, "%ld %n", primes, &used) == 1 && used > 0)
    {
        m->value = strndup(rest + used, strcspn(rest + used, "\n"));
        m->ok = m->value != NULL;
    }
    bench_child_clear(&ch);
    return m->ok;
}

/* The single mode: V_{G,0} on 1 thread and on `threads` threads, side by side.
   Returns 0 when both runs succeed with the same value. */
static int bench_single(slong G, int threads)
{
    cmp_meas m[2];
    long primes[2] = { 0, 0 };
    int t[2] = { 1, threads }, i, same;

    printf("one V_{%ld,0} (the table g <= %ld, n = 0) on 1 thread and on %d threads, each in its own"
           " process\n", (long) G, (long) G, threads);
    printf("threads   wall(s)    cpu(s)  cpu/wall peak(MiB) primes\n");
    for (i = 0; i < 2; i++)
    {
        if (!single_measure(G, t[i], &m[i], &primes[i]))
        {
            printf("%7d  failed\n", t[i]);
            free(m[0].value);
            return 1;
        }
        printf("%7d %9.2f %9.2f %9.2f %9.1f %6ld\n", t[i], m[i].u.wall, m[i].u.cpu,
               bench_ratio(m[i].u.cpu, m[i].u.wall), m[i].u.mib, primes[i]);
        fflush(stdout);
    }
    same = strcmp(m[0].value, m[1].value) == 0;
    printf("1 thread / %d threads: wall %.2f, cpu %.2f; values %s\n", threads,
           bench_ratio(m[0].u.wall, m[1].u.wall), bench_ratio(m[0].u.cpu, m[1].u.cpu),
           same ? "identical" : "DIFFER");
    free(m[0].value);
    free(m[1].value);
    return !same;
}

/* qsort comparison of doubles. */
static int bench_cmp_double(const void *a, const void *b)
{
    double x = *(const double *) a, y = *(const double *) b;

    return (x > y) - (x < y);
}

/* The prime mode (see the header comment).  Returns nonzero if a prime failed. */
static int bench_primes(slong G, slong N, slong R)
{
    wpvol_ws_t *ws = wpvol_ws_new(G, N);
    ulong *res = flint_malloc((size_t) ((G + 1) * (N + 1)) * sizeof(ulong));
    double *sec = flint_malloc((size_t) R * sizeof(double));
    int bits = wpvol_default_prime_bits();
    ulong p = UWORD(1) << bits;
    slong r;
    int bad = ws == NULL;

    printf("primes below 2^%d (PSIKAPPA_SIMD=off for the scalar code)\n", bits);

    for (r = 0; r < R && !bad; r++)
    {
        nmod_t mod;
        bench_timer t;
        p = wpvol_ntt_prime_below(p, 28);
        nmod_init(&mod, p);
        bench_timer_start(&t);
        bad = wpvol_modp_run(ws, res, mod, 1) != WPVOL_OK;
        sec[r] = bench_timer_wall(&t);
        printf("prime %ld: %.3f s\n", (long) r + 1, sec[r]);
        fflush(stdout);
    }
    if (!bad)
    {
        qsort(sec, (size_t) R, sizeof(double), bench_cmp_double);
        printf("G = %ld, N = %ld: %ld primes, min %.3f s, median %.3f s, peak %.1f MiB\n",
               (long) G, (long) N, (long) R, sec[0], sec[R / 2], bench_peak_mib());
    }
    wpvol_ws_free(ws);
    flint_free(res);
    flint_free(sec);
    return bad;
}

/* Dispatches on the arguments (see the header comment).
   Returns nonzero if any run failed or the compare mode found a mismatch. */
int main(int argc, char **argv)
{
    static const slong cases[3][2] = { { 50, 5 }, { 100, 5 }, { 3, 500 } };
    static const char *head =
        "   G    N th   wall(s)    cpu(s) peak(MiB) primes   est(s)             checksum\n";
    slong G, N, threads;
    int c, t, bad = 0;

    if (argc >= 2 && argc <= 4 && strcmp(argv[1], "single") == 0)
    {
        long online = sysconf(_SC_NPROCESSORS_ONLN);
        slong T = online < 1 ? 1 : online;
        G = 40;
        if ((argc >= 3 && !bench_arg_slong(&G, argv[2], 2, 1000))
            || (argc == 4 && !bench_arg_slong(&T, argv[3], 1, 1024)))
        {
            fprintf(stderr, "usage: %s single [G [THREADS]] (2 <= G <= 1000)\n", argv[0]);
            return 2;
        }
        return bench_single(G, (int) T);
    }
    if (argc >= 4 && argc <= 5 && strcmp(argv[1], "prime") == 0)
    {
        slong R = 3;
        if (!bench_arg_slong(&G, argv[2], 2, 1000) || !bench_arg_slong(&N, argv[3], 0, 1000)
            || (argc == 5 && !bench_arg_slong(&R, argv[4], 1, 1000)))
        {
            fprintf(stderr, "usage: %s prime G N [R] (2 <= G <= 1000)\n", argv[0]);
            return 2;
        }
        return bench_primes(G, N, R);
    }
    if (argc == 3 && strcmp(argv[1], "compare") == 0 && bench_arg_slong(&G, argv[2], 4, WORD_MAX))
        return bench_compare(G);
    if (argc == 4 && bench_arg_slong(&G, argv[1], 0, WORD_MAX)
        && bench_arg_slong(&N, argv[2], 0, WORD_MAX) && bench_arg_slong(&threads, argv[3], 1, 1024))
    {
        printf("%s", head);
        return bench_table_child(G, N, (int) threads);
    }
    if (argc != 1)
    {
        fprintf(stderr, "usage: %s [G N THREADS | compare GMAX (GMAX >= 4) | single [G [THREADS]]"
                " | prime G N [R]]\n", argv[0]);
        return 2;
    }
    printf("%s", head);
    fflush(stdout);
    for (c = 0; c < 3; c++)
        for (t = 1; t <= 2; t++)
            bad |= bench_table_child(cases[c][0], cases[c][1], t);
    printf("\n");
    bad |= bench_compare(12);
    return bad;
}
