/* bench_wpoly.c - wall-clock time and peak memory of the few-point volume polynomials
 * (src/engines/volumes/wpoly.h, all coefficients of V_{g,n}(L)), and the same coefficients by the
 * reduction (pf_integral of psi^a kappa_1^{D-|a|} for every sorted a, one fresh wk_table).
 *
 * Usage:  bench_wpoly G N THREADS   one engine run
 *         bench_wpoly ref G N       one reduction run (stopped after REF_BUDGET_S seconds or
 *                                   when its table exceeds 3e7 entries, the default limit)
 *         bench_wpoly side [G [T]]  V_{G,1}(L) by the per-index route and by the transposed
 *                                   route (wpoly_adjoint.c), side by side (G = 20, T = 2 threads
 *                                   by default); `new` instead of `side`: the transposed only
 *         bench_wpoly               the standard cases: n = 1 for g = 5, 10, 15, 20, 25;
 *                                   n = 2 for g = 3, 6, 9, 12; n = 3 for g = 3, 5, 7 (2 threads),
 *                                   then both routes side by side, 1 thread, for n = 1, 2
 *                                   (g <= 14) and n = 3 (g <= 9), until the reduction fails
 * One child process per run, so that the peak RSS (getrusage ru_maxrss) is that run's own.
 * A reduction run also prints the number of entries its table reached, beside the upper bound
 * by which the language refuses the reduction (wk_estimate_entries(g, n + D), --max-table).
 * Columns: g, n, threads, wall s, CPU s (all threads), peak MiB, primes, estimate (single-core
 * s), checksum of the coefficients (sum of num and den mod 2^61-1; equal results, equal sums).
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "volumes/wpoly.h"
#include "correlators/wk.h"
#include "correlators/pushforward.h"
#include "bench_util.h"

#define REF_BUDGET_S 300

/* All W_a by the reduction, in the order of wpoly_indices; *entries receives the number of
   entries its table reached (set only on success or on reaching the limit).  Returns 0 on
   success. */
static int bw_reference(fmpq *out, slong g, slong n, slong *entries)
{
    slong nv = wpoly_indices(NULL, g, n), D = 3 * g - 3 + n, k, i;
    slong *idx = malloc((size_t) (nv * n) * sizeof(slong));
    wk_table *T = wk_table_new();
    int st = (idx == NULL || T == NULL) ? 1 : 0;

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
        bench_div_factorial(out + k, (ulong) kmult[1]);
    }
    if (T != NULL)
        *entries = wk_table_entries(T);
    wk_table_free(T);
    free(idx);
    return st;
}

/* One run: g, n and the route (threads >= 1: engine with that many threads, 0: reduction). */
typedef struct { slong g, n; int threads, route; } bw_case;

/* Child body: one timed run of the route in arg (a bw_case); prints one row to stdout and
   writes its usage line to out (the CPU seconds feed the ratio).  Returns 0 on success. */
static int bw_run(void *arg, FILE *out)
{
    const bw_case *c = arg;
    slong nv = wpoly_indices(NULL, c->g, c->n), primes = 0, entries = 0;
    fmpq *v = _fmpq_vec_init(nv);
    bench_timer t;
    bench_usage u;
    double est_s = 0.0, est_b = 0.0;
    char lead[64];
    int st;

    if (c->threads > 0)
    {
        slong *idx = malloc((size_t) (nv * c->n) * sizeof(slong));
        if (idx != NULL)
        {
            wpoly_indices(idx, c->g, c->n);
            wpoly_estimate_at_route(&est_s, &est_b, c->g, c->n, idx, nv, c->route);
        }
        free(idx);
    }
    bench_timer_start(&t);
    st = c->threads == 0 ? bw_reference(v, c->g, c->n, &entries)
                         : wpoly_coeffs_route(v, c->g, c->n, c->threads,
                                              wpvol_default_prime_bits(), 1, 0, c->route,
                                              &primes);
    u.wall = bench_timer_wall(&t);
    u.cpu = bench_timer_cpu(&t);
    u.mib = bench_peak_mib();
    snprintf(lead, sizeof lead, "%4ld %2ld %-9s", c->g, c->n,
             c->threads == 0 ? "reduction"
             : c->route == WPOLY_ROUTE_PER_INDEX ? (c->threads == 1 ? "perindex/1" : "perindex/2")
             : c->route == WPOLY_ROUTE_TRANSPOSED ? (c->threads == 1 ? "transp/1" : "transp/2")
             : (c->threads == 1 ? "engine/1" : "engine/2"));
    bench_print_row(lead, &u, primes, est_s, bench_checksum_fmpq(v, nv), st == 0);
    if (c->threads == 0)   /* the table reached against the bound the language refuses by */
    {
        double ms = 0.0, me = 0.0;
        if (c->n >= 2)
            wk_estimate_volume_reduction(&ms, &me, c->g, c->n);
        printf("%4ld %2ld table entries %ld, bound wk_estimate_entries(g, n + D) = %.3g; model (n >= 2) "
               "%.3g entries, %.3g s\n", c->g, c->n, (long) entries,
               wk_estimate_entries(c->g, 2 * c->n + 3 * c->g - 3), me, ms);
    }
    bench_usage_write(out, &u);
    _fmpq_vec_clear(v, nv);
    return st != 0;
}

/* Runs bw_run in a child (the reduction under the REF_BUDGET_S alarm); *cpu (may be NULL)
   receives its CPU seconds.  Returns 0 if it finished (within the budget) without error. */
static int bw_child_route(slong g, slong n, int threads, int route, double *cpu)
{
    bw_case c = { g, n, threads, route };
    bench_child_result ch = bench_child_run(bw_run, &c, threads == 0 ? REF_BUDGET_S : 0);
    bench_usage u = { 0.0, 0.0, 0.0 };
    int ok = bench_child_ok(&ch);

    if (cpu != NULL)
        *cpu = bench_usage_read(&u, ch.text) != NULL ? u.cpu : 0.0;
    if (ch.signaled)
        printf("%4ld %2ld %-9s stopped after %d s\n", g, n, threads == 0 ? "reduction" : "engine",
               REF_BUDGET_S);
    bench_child_clear(&ch);
    return !ok;
}

/* The default route (bench_wpoly G N THREADS, the standard cases). */
static int bw_child(slong g, slong n, int threads, double *cpu)
{
    return bw_child_route(g, n, threads, WPOLY_ROUTE_AUTO, cpu);
}

/* V_{g,1}(L) by the per-index route and by the transposed route, side by side (old: 0 skips
   the per-index run, for genera beyond its reach).  Returns nonzero on failure. */
static int bw_side(slong g, int threads, int old)
{
    double co = 0.0, cn = 0.0;
    int bad = 0;

    printf("   g  n route          wall       CPU  peakMiB primes  estimate             checksum\n");
    if (old)
        bad |= bw_child_route(g, 1, threads, WPOLY_ROUTE_PER_INDEX, &co);
    bad |= bw_child_route(g, 1, threads, WPOLY_ROUTE_TRANSPOSED, &cn);
    if (old)
        printf("%4ld  1 ratio per-index/transposed CPU = %.1f\n", g, bench_ratio(co, cn));
    return bad;
}

int main(int argc, char **argv)
{
    static const slong n1[] = { 5, 10, 15, 20, 25 }, n2[] = { 3, 6, 9, 12 }, n3[] = { 3, 5, 7 };
    slong g, n, threads;
    int bad = 0, ref = argc == 4 && strcmp(argv[1], "ref") == 0;
    size_t i;

    if (ref && bench_arg_slong(&g, argv[2], 0, WORD_MAX)
        && bench_arg_slong(&n, argv[3], 0, WORD_MAX))
        return bw_child(g, n, 0, NULL);
    if (!ref && argc == 4 && bench_arg_slong(&g, argv[1], 0, WORD_MAX)
        && bench_arg_slong(&n, argv[2], 0, WORD_MAX) && bench_arg_slong(&threads, argv[3], 1, 1024))
        return bw_child(g, n, (int) threads, NULL);
    if (argc >= 2 && argc <= 4 && (strcmp(argv[1], "side") == 0 || strcmp(argv[1], "new") == 0))
    {
        g = 20;
        threads = 2;
        if ((argc >= 3 && !bench_arg_slong(&g, argv[2], 2, 1000))
            || (argc == 4 && !bench_arg_slong(&threads, argv[3], 1, 1024)))
            return 2;
        return bw_side(g, (int) threads, strcmp(argv[1], "side") == 0);
    }
    if (argc != 1)
    {
        fprintf(stderr, "usage: %s [G N THREADS | ref G N | side [G [THREADS]] | new [G [THREADS]]]"
                        "   (THREADS >= 1; side: V_{G,1} per index and transposed, default G = 20;"
                        " new: transposed only)\n", argv[0]);
        return 2;
    }
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
            printf("%4ld %2ld ratio reduction/engine CPU = %.1f\n", g, n, bench_ratio(cr, ce));
        }
    return bad;
}
