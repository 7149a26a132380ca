/* bench_hodge.c - the two Hodge routes of src/engines/hodge/hodge.h side by side: every
 * int_{Mbar_{g,1}} psi_1^a lambda_j lambda_k with 0 <= j <= k <= g and a = 3g-2-j-k >= 0, for
 * g = 1..G, by the Faber-Pandharipande operator (FP) and by Mumford's formula with the pushforward
 * reduction (GRR); one child process per genus and route, each with fresh tables.
 *
 * Usage:  bench_hodge [G [BUDGET_S [GMIN]]]   (defaults 12, 120 seconds per child, 1): genera
 *         GMIN..G
 * Columns: g, integrals, route, wall s, CPU s, peak MiB, memo states, checksum of the values
 * (equal results, equal sums), then the CPU ratio GRR/FP.  A route stopped by the budget is not
 * run for larger genera.
 */
#include <stdio.h>
#include <stdlib.h>

#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "hodge/hodge.h"
#include "bench_util.h"

typedef struct {
    slong g;
    int route;
} bh_case;

/* Number of integrals of genus g (pairs j <= k with j + k <= 3g-2). */
static slong bh_count(slong g)
{
    slong c = 0;
    for (slong j = 0; j <= g; j++)
        for (slong k = j; k <= g; k++)
            c += j + k <= 3 * g - 2;
    return c;
}

/* All integrals of genus g by the route into v (in the order of bh_count); 0 on success. */
static int bh_compute(fmpq *v, hodge_ctx *H, slong g, int route)
{
    slong i = 0, lm[64];
    int st = WK_OK;
    for (slong j = 0; j <= g && st == WK_OK; j++)
        for (slong k = j; k <= g && st == WK_OK; k++) {
            slong a = 3 * g - 2 - j - k;
            if (a < 0)
                continue;
            for (slong t = 0; t <= g; t++)
                lm[t] = 0;
            lm[j] += j > 0, lm[k] += k > 0;
            st = hodge_integral_lambda(v + i++, H, route, g, &a, 1, NULL, 0, lm, g, NULL, 0, 0);
        }
    return st != WK_OK;
}

/* Child body: one timed run; prints its row and writes its usage line to out. */
static int bh_run(void *arg, FILE *out)
{
    const bh_case *c = arg;
    slong n = bh_count(c->g);
    fmpq *v = _fmpq_vec_init(n);
    wk_table *T = wk_table_new();
    hodge_ctx *H = hodge_new(T);
    bench_timer t;
    bench_usage u;
    bench_timer_start(&t);
    int st = bh_compute(v, H, c->g, c->route);
    u.wall = bench_timer_wall(&t);
    u.cpu = bench_timer_cpu(&t);
    u.mib = bench_peak_mib();
    printf("%3ld %5ld %-4s %9.3f %9.3f %8.1f %9ld %20lu%s\n", (long) c->g, (long) n,
           c->route == HODGE_ROUTE_FP ? "FP" : "GRR", u.wall, u.cpu, u.mib,
           (long) hodge_entries(H, c->route), bench_checksum_fmpq(v, n), st ? " (error)" : "");
    fflush(stdout);
    bench_usage_write(out, &u);
    hodge_free(H);
    wk_table_free(T);
    _fmpq_vec_clear(v, n);
    return st;
}

/* Runs one case in a child under the budget; *cpu gets its CPU seconds.  0 if it finished. */
static int bh_child(slong g, int route, unsigned budget, double *cpu)
{
    bh_case c = {g, route};
    bench_child_result ch = bench_child_run(bh_run, &c, budget);
    bench_usage u = {0.0, 0.0, 0.0};
    int ok = bench_child_ok(&ch);
    *cpu = bench_usage_read(&u, ch.text) != NULL ? u.cpu : 0.0;
    if (ch.signaled)
        printf("%3ld %5ld %-4s stopped after %u s\n", (long) g, (long) bh_count(g),
               route == HODGE_ROUTE_FP ? "FP" : "GRR", budget);
    bench_child_clear(&ch);
    return !ok;
}

int main(int argc, char **argv)
{
    slong G = 12, budget = 120, gmin = 1;
    int live[2] = {1, 1};
    if (argc > 4 || (argc > 1 && !bench_arg_slong(&G, argv[1], 1, 40))
        || (argc > 2 && !bench_arg_slong(&budget, argv[2], 1, 86400))
        || (argc > 3 && !bench_arg_slong(&gmin, argv[3], 1, G))) {
        fprintf(stderr, "usage: %s [G [BUDGET_S [GMIN]]]   (1 <= GMIN <= G <= 40)\n", argv[0]);
        return 2;
    }
    printf("  g count route     wall       CPU  peakMiB    states             checksum\n");
    for (slong g = gmin; g <= G && (live[0] || live[1]); g++) {
        double cpu[2] = {0.0, 0.0};
        for (int r = HODGE_ROUTE_FP; r >= HODGE_ROUTE_GRR; r--)
            if (live[r] && bh_child(g, r, (unsigned) budget, cpu + r) != 0)
                live[r] = 0;
        if (live[0] && live[1])
            printf("        GRR/FP CPU ratio %.2f\n", bench_ratio(cpu[HODGE_ROUTE_GRR], cpu[HODGE_ROUTE_FP]));
    }
    return 0;
}
