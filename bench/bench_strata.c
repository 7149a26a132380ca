/* bench_strata.c - stable graphs and Masur-Veech volumes.
 *
 * Usage:  bench_strata         graphs for 3g-3+n = 6..10 and volumes for 3g-3+n <= 9, every
 *                              (g, n) whose estimated graph count is at most 1e5
 *         bench_strata full    the same up to an estimate of 1.2e6 (genus 0 with 9 legs: about
 *                              660000 graphs, tens of seconds and about 1 GiB)
 * Part 1, per (g, n): graphs found by degeneration, the estimate, wall and CPU seconds, and the
 * number with each edge count summed to the total.  Part 2, per (g, n) with 3g-3+n <= 9 (10 with
 * full): the number of shapes (graphs with unlabelled legs), wall and CPU seconds of Vol Q_{g,n}
 * by the shapes, CPU seconds of the sum over the labelled graphs where the estimate allows it
 * (the two must agree), and Vol Q_{g,n} as a rational times pi^{6g-6+2n}; then the total time.
 * In-process, one shared DVV table.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <flint/fmpq.h>

#include "correlators/wk.h"
#include "strata/mvvol.h"
#include "strata/sgraph.h"
#include "bench_util.h"

static void bench_graphs(double cap)
{
    printf("%-4s %-3s %-3s %10s %10s %8s %8s\n", "dim", "g", "n", "graphs", "estimate", "wall s", "cpu s");
    for (int dim = 6; dim <= 10; dim++)
        for (int g = 0; 3 * g - 3 <= dim; g++) {
            int n = dim - 3 * g + 3;
            double est = sg_estimate_count(g, n);
            if (n < 0 || 2 * g - 2 + n <= 0)
                continue;
            if (est > cap) {
                printf("%-4d %-3d %-3d %10s %10.3g   (skipped: estimate above %.3g)\n", dim, g, n, "-", est, cap);
                continue;
            }
            sg_list L;
            bench_timer t;
            sg_list_init(&L);
            bench_timer_start(&t);
            int rc = sg_enumerate(&L, g, n, -1, 0, NULL);
            double wall = bench_timer_wall(&t), cpu = bench_timer_cpu(&t);
            printf("%-4d %-3d %-3d %10ld %10.3g %8.2f %8.2f%s\n", dim, g, n, (long) L.len, est, wall, cpu,
                   rc == SG_OK ? "" : "  (engine error)");
            sg_list_clear(&L);
        }
}

/* Part 2: Vol Q_{g,n} for 3g-3+n <= dmax by the shapes (graphs with unlabelled legs), beside the
   sum over the labelled graphs where their estimate is at most cap; both must agree. */
static void bench_volumes(double cap, int dmax)
{
    wk_table *T = wk_table_new();
    mv_source src = {T, NULL};
    bench_timer all;
    fmpq_t v, w;
    fmpq_init(v);
    fmpq_init(w);
    bench_timer_start(&all);
    printf("\n%-3s %-3s %8s %8s %8s %10s  %s\n", "g", "n", "shapes", "wall s", "cpu s", "labelled s",
           "Vol Q_{g,n} / pi^(6g-6+2n)");
    for (int dim = 1; dim <= dmax; dim++)
        for (int g = 0; 3 * g - 3 <= dim; g++) {
            int n = dim - 3 * g + 3;
            sg_list L;
            bench_timer t;
            if (n < 0 || 2 * g - 2 + n <= 0)
                continue;
            sg_list_init(&L);
            sg_enumerate_shapes(&L, g, n, 0, NULL);
            bench_timer_start(&t);
            int rc = mv_volume_by_shapes(v, g, n, &src, 0, NULL);
            double wall = bench_timer_wall(&t), cpu = bench_timer_cpu(&t);
            printf("%-3d %-3d %8ld %8.2f %8.2f ", g, n, (long) L.len, wall, cpu);
            sg_list_clear(&L);
            if (sg_estimate_count(g, n) <= cap) {
                bench_timer_start(&t);
                int rl = mv_volume(w, g, n, &src, 0, NULL);
                printf("%10.2f  ", bench_timer_cpu(&t));
                if (rl != SG_OK || !fmpq_equal(v, w))
                    printf("(DIFFERENT from the labelled sum) ");
            } else {
                printf("%10s  ", "-");
            }
            if (rc == SG_OK)
                fmpq_print(v);
            else
                printf("(engine error %d)", rc);
            printf("\n");
        }
    printf("total %.2f s wall, %.2f s CPU (shapes and labelled sums; the shapes' enumeration is timed twice)\n",
           bench_timer_wall(&all), bench_timer_cpu(&all));
    fmpq_clear(v);
    fmpq_clear(w);
    wk_table_free(T);
}

int main(int argc, char **argv)
{
    double cap = 1e5;
    if (argc > 1 && strcmp(argv[1], "full") == 0)
        cap = 1.2e6;
    else if (argc > 1) {
        fprintf(stderr, "usage: bench_strata [full]\n");
        return 2;
    }
    bench_graphs(cap);
    bench_volumes(cap, cap > 1e5 ? 10 : 9);
    return 0;
}
