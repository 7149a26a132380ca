/* bench_closed.c - the table-free correlators against the DVV table.
 *
 * Usage:  bench_closed        g = 12 (where the table route runs), 30, 100, 1000
 *         bench_closed G ...  the genera given (1 <= G <= WK_TWO_POINT_MAX_G)
 * For each genus three questions, each by two routes, every run in its own child process:
 *   <tau_2 tau_{3g-3}>_g        closed: wk_correlator (two-point form of wk_twopoint.c)
 *                               table:  wk_table_correlator, a fresh table limited to 3e7 entries
 *   <tau_k tau_{3g-1-k}>_g, k = floor(3g/2): the same, where the sum of the form is longest
 *   int_{Mbar_{g,0}} kappa_{3g-3} = <tau_{3g-2}>_g
 *                               closed: pf_integral (one-point form, no table entry)
 *                               table:  pf_expand then wk_table_correlator on each term
 * The table route runs only when the engine's estimate (wk_estimate_entries) is within 3e7, the
 * language's default --max-table, and is stopped after TABLE_BUDGET_S seconds; otherwise the row
 * says why it did not run.  Columns: question, g, route, wall s, CPU s, peak MiB, entries of the
 * table, bits of the denominator (the same in both routes when both ran, else "-").
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>

#include "correlators/pushforward.h"
#include "correlators/wk.h"
#include "bench_util.h"

#define TABLE_BUDGET_S 30
#define TABLE_LIMIT 30000000

/* One run: the question (0: two-point, 1: kappa_{3g-3}, 2: middle two-point) and the route
   (0: closed, 1: table). */
typedef struct {
    slong g;
    int question, table;
} bc_case;

/* res = the question by the table alone, with T.  Returns the engine status. */
static int bc_by_table(fmpq_t res, wk_table *T, slong g, int question)
{
    slong d[2] = {2, 3 * g - 3}, one = 3 * g - 2;
    if (question == 2)
        d[0] = 3 * g / 2, d[1] = 3 * g - 1 - d[0];
    if (question != 1)
        return wk_table_correlator(res, T, g, d, 2);
    return wk_table_correlator(res, T, g, &one, 1);   /* the only term of the pushforward of kappa_{3g-3} */
}

/* res = the question by the closed forms (no table entry may be made: T is limited to one). */
static int bc_by_closed(fmpq_t res, wk_table *T, slong g, int question)
{
    slong d[2] = {2, 3 * g - 3}, *kmult;
    if (question == 2)
        d[0] = 3 * g / 2, d[1] = 3 * g - 1 - d[0];
    if (question != 1)
        return wk_correlator(res, T, g, d, 2);
    kmult = calloc((size_t) (3 * g - 2), sizeof(slong));
    kmult[3 * g - 3] = 1;
    int st = pf_integral(res, T, g, NULL, 0, kmult, 3 * g - 3);
    free(kmult);
    return st;
}

/* Child body: one timed run; writes its usage line, then entries and denominator bits. */
static int bc_run(void *arg, FILE *out)
{
    const bc_case *c = arg;
    wk_table *T = wk_table_new();
    wk_table_set_limit(T, c->table ? TABLE_LIMIT : 1);
    fmpq_t r;
    fmpq_init(r);
    bench_timer t;
    bench_usage u;
    bench_timer_start(&t);
    int st = c->table ? bc_by_table(r, T, c->g, c->question) : bc_by_closed(r, T, c->g, c->question);
    u.wall = bench_timer_wall(&t);
    u.cpu = bench_timer_cpu(&t);
    u.mib = bench_peak_mib();
    if (out) {
        bench_usage_write(out, &u);
        fprintf(out, "%ld %ld %d\n", (long) wk_table_entries(T), (long) fmpz_bits(fmpq_denref(r)), st);
    }
    fmpq_clear(r);
    wk_table_free(T);
    return st == WK_OK ? 0 : 1;
}

/* Runs one case in a child and prints its row. */
static void bc_row(slong g, int question, int table)
{
    static const char *names[3] = {"<tau_2 tau_{3g-3}>_g", "int kappa_{3g-3}", "<tau_k tau_{3g-1-k}>_g"};
    bc_case c = {g, question, table};
    double est = table ? wk_estimate_entries(g, question == 1 ? 1 : 2) : 0.0;
    printf("%-22s %5ld %-7s ", names[question], (long) g, table ? "table" : "closed");
    if (table && est > TABLE_LIMIT) {
        printf("not run: the table estimate is %.3g entries, above %.3g\n", est, (double) TABLE_LIMIT);
        return;
    }
    fflush(stdout);
    bench_child_result res = bench_child_run(bc_run, &c, table ? TABLE_BUDGET_S : 0);
    bench_usage u;
    long entries = 0, bits = 0;
    int st = -1;
    const char *rest = bench_usage_read(&u, res.text);
    if (rest && sscanf(rest, "%ld %ld %d", &entries, &bits, &st) == 3 && bench_child_ok(&res))
        printf("%9.3f %9.3f %8.1f %10ld %8ld\n", u.wall, u.cpu, u.mib, entries, bits);
    else if (res.signaled)
        printf("stopped after %d s\n", TABLE_BUDGET_S);
    else
        printf("failed (engine status %d)\n", st);
    bench_child_clear(&res);
}

int main(int argc, char **argv)
{
    slong defaults[4] = {12, 30, 100, 1000}, gs[64];
    int count = 0;
    for (int i = 1; i < argc && count < 64; i++)
        if (!bench_arg_slong(gs + count++, argv[i], 1, WK_TWO_POINT_MAX_G)) {
            fprintf(stderr, "usage: bench_closed [G ...] with 1 <= G <= %d\n", WK_TWO_POINT_MAX_G);
            return 2;
        }
    if (count == 0)
        for (count = 0; count < 4; count++)
            gs[count] = defaults[count];
    printf("%-22s %5s %-7s %9s %9s %8s %10s %8s\n", "question", "g", "route", "wall_s", "cpu_s", "peak_MiB",
           "entries", "den_bits");
    for (int i = 0; i < count; i++)
        for (int q = 0; q < 3; q++) {
            bc_row(gs[i], q, 0);
            bc_row(gs[i], q, 1);
        }
    flint_cleanup();
    return 0;
}
