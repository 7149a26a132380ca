/* bench_hodge.c - the Hodge routes of src/engines/hodge/hodge.h side by side: every
 * int_{Mbar_{g,1}} psi_1^a lambda_j lambda_k with 0 <= j <= k <= g and a = 3g-2-j-k >= 0, for
 * g = 1..G, by the Faber-Pandharipande operator (FP), by Mumford's formula with the pushforward
 * reduction (GRR), and as int_{g,1} computes them (AUTO: the closed form for lambda_g lambda_{g-1},
 * the operator for the rest), and by the generating polynomial of hodge_pair.c (PAIR: fresh tables
 * per integral, as AUTO; ratio PAIR/AUTO); one child process per genus and route, each with fresh tables.
 * Then the closed form of lambda_g lambda_{g-1} psi_1^{g-1} and of lambda_{g-1}^3 alone for
 * g = 2..50 (no table: one call each).
 *
 * Usage:  bench_hodge [G [BUDGET_S [GMIN [ROUTES]]]]   (defaults 12, 120 seconds per child, 1,
 *         all routes): genera GMIN..G; ROUTES is a word of the letters g (GRR), f (FP), a (AUTO)
 *         and p (PAIR), e.g. "fa" for the two that int_{g,1} uses
 * Columns: g, integrals, route, wall s, CPU s, peak MiB, memo states, checksum of the values
 * (equal results, equal sums), the slowest single integral (CPU s) and its (j, k); then the CPU
 * ratio GRR/FP.  FP and GRR keep their tables from one integral to the next (the slowest is the
 * extra cost in that order); AUTO computes each integral with fresh tables, as int_{g,1} in a new
 * process does, and its states column is the most one integral needed.  A route stopped by
 * the budget is not run for larger genera.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

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

#define BH_AUTO 2
#define BH_PAIR 3
static const char *bh_route_name[4] = {"GRR", "FP", "AUTO", "PAIR"};

/* The slowest integral of a run: CPU seconds and its lambda indices. */
typedef struct {
    double cpu;
    slong j, k;
    slong states;                   /* AUTO: the most memo states of one integral */
} bh_slowest;

/* One integral by the route; BH_AUTO as int_{g,1} does (closed form, else the operator). */
static int bh_integral(fmpq_t v, hodge_ctx *H, int route, slong g, slong a, const slong *lm)
{
    if (route == BH_PAIR) {
        slong j = 0, k = 0;
        for (slong t = 1; t <= g; t++)
            for (slong c = 0; c < lm[t]; c++)
                *(j == 0 ? &j : &k) = t;
        return hodge_pair_integral(v, H, g, &a, 1, j, k);
    }
    if (route == BH_AUTO && hodge_closed_kind(g, &a, 1, NULL, 0, lm, g, NULL, 0) != HODGE_CLOSED_NONE)
        return hodge_closed_integral(v, g, &a, 1, NULL, 0, lm, g, NULL, 0);
    return hodge_integral_lambda(v, H, route == BH_AUTO ? HODGE_ROUTE_FP : route, g, &a, 1, NULL, 0, lm, g, NULL,
                                 0, 0);
}

/* All integrals of genus g by the route into v (in the order of bh_count), timing each; 0 on success. */
static int bh_compute(fmpq *v, hodge_ctx *H, slong g, int route, bh_slowest *slow)
{
    slong i = 0, lm[64];
    int st = WK_OK;
    slow->cpu = -1.0;
    for (slong j = 0; j <= g && st == WK_OK; j++)
        for (slong k = j; k <= g && st == WK_OK; k++) {
            slong a = 3 * g - 2 - j - k;
            if (a < 0)
                continue;
            for (slong t = 0; t <= g; t++)
                lm[t] = 0;
            lm[j] += j > 0, lm[k] += k > 0;
            double c0 = bench_cpu_used();
            if (route >= BH_AUTO) {         /* fresh tables: one integral as a new process runs it */
                wk_table *T = wk_table_new();
                hodge_ctx *H1 = hodge_new(T);
                int memo = route == BH_PAIR ? HODGE_MEMO_PAIR : HODGE_ROUTE_FP;
                st = bh_integral(v + i++, H1, route, g, a, lm);
                if (hodge_entries(H1, memo) > slow->states)
                    slow->states = hodge_entries(H1, memo);
                hodge_free(H1);
                wk_table_free(T);
            } else {
                st = bh_integral(v + i++, H, route, g, a, lm);
            }
            double c = bench_cpu_used() - c0;
            if (c > slow->cpu)
                slow->cpu = c, slow->j = j, slow->k = k;
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
    bh_slowest slow = {0.0, 0, 0, 0};
    bench_timer_start(&t);
    int st = bh_compute(v, H, c->g, c->route, &slow);
    u.wall = bench_timer_wall(&t);
    u.cpu = bench_timer_cpu(&t);
    u.mib = bench_peak_mib();
    printf("%3ld %5ld %-4s %9.3f %9.3f %8.1f %9ld %20lu %9.3f (%ld,%ld)%s\n", (long) c->g, (long) n,
           bh_route_name[c->route], u.wall, u.cpu, u.mib,
           (long) (c->route >= BH_AUTO ? slow.states : hodge_entries(H, c->route)), bench_checksum_fmpq(v, n),
           slow.cpu, (long) slow.j, (long) slow.k, st ? " (error)" : "");
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
        printf("%3ld %5ld %-4s stopped after %u s\n", (long) g, (long) bh_count(g), bh_route_name[route], budget);
    bench_child_clear(&ch);
    return !ok;
}

/* The closed forms alone for g = 2..gmax: CPU seconds of each call, the values' checksum. */
static void bh_closed(slong gmax)
{
    fmpq *v = _fmpq_vec_init(2 * gmax + 2);
    double worst = 0.0, total = 0.0;
    slong worst_g = 0;
    for (slong g = 2; g <= gmax; g++) {
        slong a = g - 1;
        double c0 = bench_cpu_used();
        hodge_closed_top_pair(v + 2 * g, g, &a, 1);
        hodge_closed_lambda_cubed(v + 2 * g + 1, g);
        double c = bench_cpu_used() - c0;
        total += c;
        if (c > worst)
            worst = c, worst_g = g;
    }
    printf("closed forms, lambda_g lambda_{g-1} psi_1^{g-1} and lambda_{g-1}^3, g = 2..%ld: CPU %.4f s in all, "
           "slowest genus %ld (%.4f s), checksum %lu\n",
           (long) gmax, total, (long) worst_g, worst, bench_checksum_fmpq(v, 2 * gmax + 2));
    _fmpq_vec_clear(v, 2 * gmax + 2);
}

/* live[r] = 1 for the routes named by the letters of arg (g, f, a, p), else 0; 0 on a bad letter. */
static int bh_routes(int *live, const char *arg)
{
    const char *letters = "gfap";
    for (int r = 0; r < 4; r++)
        live[r] = 0;
    for (const char *c = arg; *c; c++) {
        const char *at = strchr(letters, *c);
        if (at == NULL)
            return 0;
        live[at - letters] = 1;
    }
    return *arg != 0;
}

int main(int argc, char **argv)
{
    slong G = 12, budget = 120, gmin = 1;
    int live[4] = {1, 1, 1, 1};
    if (argc > 5 || (argc > 1 && !bench_arg_slong(&G, argv[1], 1, 40))
        || (argc > 2 && !bench_arg_slong(&budget, argv[2], 1, 86400))
        || (argc > 3 && !bench_arg_slong(&gmin, argv[3], 1, G)) || (argc > 4 && !bh_routes(live, argv[4]))) {
        fprintf(stderr, "usage: %s [G [BUDGET_S [GMIN [ROUTES]]]]   (1 <= GMIN <= G <= 40; ROUTES: letters of "
                        "g (GRR), f (FP), a (AUTO), p (PAIR), default all)\n", argv[0]);
        return 2;
    }
    printf("  g count route     wall       CPU  peakMiB    states             checksum   slowest (j,k)\n");
    for (slong g = gmin; g <= G && (live[0] || live[1] || live[2] || live[3]); g++) {
        double cpu[4] = {0.0, 0.0, 0.0, 0.0};
        for (int r = BH_PAIR; r >= HODGE_ROUTE_GRR; r--)
            if (live[r] && bh_child(g, r, (unsigned) budget, cpu + r) != 0)
                live[r] = 0;
        if (live[0] && live[1])
            printf("        GRR/FP CPU ratio %.2f\n", bench_ratio(cpu[HODGE_ROUTE_GRR], cpu[HODGE_ROUTE_FP]));
        if (live[BH_AUTO] && live[BH_PAIR])
            printf("        PAIR/AUTO CPU ratio %.2f (fresh tables per integral in both)\n",
                   bench_ratio(cpu[BH_PAIR], cpu[BH_AUTO]));
    }
    bh_closed(50);
    return 0;
}
