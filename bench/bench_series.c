/* bench_series.c - Weil-Petersson free energies F_g at the WP point (t_0 = x, t_1 = 0,
 * t_k = (-1)^k/(k-1)!) to order x^N by spec_plan (one plan, one shared correlator memo per g),
 * against computing the same V_{g,n} = int kappa_1^{3g-3+n}/(3g-3+n)! = n! [x^n] F_g one by one
 * with pf_integral and a fresh wk_table for each n.
 *
 * Every measurement runs in its own child process (fork), so that the peak resident memory
 * (getrusage ru_maxrss) is that of the measurement alone and a per-measurement time limit
 * (alarm) can stop infeasible cases.  Both methods' values are compared exactly.
 *
 * Usage: bench_series [G [N [seconds]]]   defaults G = 8, N = 20, 600 seconds per measurement.
 */
#include <limits.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <flint/fmpq.h>
#include "correlators/pushforward.h"
#include "series/spec.h"
#include "bench_util.h"

#define NVARS 128

typedef struct {
    int ok;                /* 1 when the child finished */
    bench_usage u;         /* wall-clock, CPU (user + system) seconds, peak MiB */
    double terms;
    char *values;          /* the V_{g,n}, one per line (owned) */
} measurement;

/* Valuation of t_k at the WP point: 1 for t_0, -1 (zero) for t_1, 0 otherwise.
   data is unused. */
static slong wp_valuation(void *data, slong k)
{
    (void) data;
    return k == 0 ? 1 : k == 1 ? -1 : 0;
}

/* Builds t_k at the WP point (order N) into the initialised series t.
   Same times as docs/conventions.md. */
static void wp_time(tseries *t, slong k, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_t c;
    fmpq_init(c);
    fmpq_mpoly_zero(t->p, ctx);
    if (k == 0)
        fmpq_mpoly_gen(t->p, 0, ctx);
    else if (k >= 2) {
        fmpz_fac_ui(fmpq_denref(c), (ulong) (k - 1));
        fmpz_set_si(fmpq_numref(c), k % 2 ? -1 : 1);
        fmpq_mpoly_set_fmpq(t->p, c, ctx);
    }
    fmpq_clear(c);
}

/* Writes n! [x^n] F for n = 0..N to out, one rational per line.
   Non-rational coefficients (never expected) print as 0. */
static void print_volumes(FILE *out, const tseries *F, slong N, const fmpq_mpoly_ctx_t ctx)
{
    fmpq_mpoly_t c;
    fmpq_t q;
    fmpz_t f;
    slong n;
    fmpq_mpoly_init(c, ctx), fmpq_init(q), fmpz_init(f);
    for (n = 0; n <= N; n++) {
        tseries_coeff(c, F, n, ctx);
        fmpq_zero(q);
        if (fmpq_mpoly_is_fmpq(c, ctx))
            fmpq_mpoly_get_fmpq(q, c, ctx);
        fmpz_fac_ui(f, (ulong) n);
        fmpq_mul_fmpz(q, q, f);
        fmpq_fprint(out, q);
        fputc('\n', out);
    }
    fmpq_mpoly_clear(c, ctx), fmpq_clear(q), fmpz_clear(f);
}

/* Method A: plan + evaluate F_g to x^N with one wk_table; prints "terms" then the volumes.
   Returns 0 on success. */
static int run_spec(FILE *out, slong g, slong N, double *terms)
{
    fmpq_mpoly_ctx_t ctx;
    spec_plan *P;
    wk_table *T = wk_table_new();
    tseries F, *t;
    slong k, K;
    int st;
    fmpq_mpoly_ctx_init(ctx, NVARS, ORD_DEGLEX);
    st = spec_plan_build(&P, g, N, wp_valuation, NULL, 1e9);
    if (st != SPEC_OK)
        return st;
    K = spec_plan_max_k(P);
    *terms = spec_plan_terms(P);
    t = malloc((size_t) (K + 2) * sizeof(tseries));
    for (k = 0; k <= K; k++)
        tseries_init(t + k, 0, N, ctx), wp_time(t + k, k, ctx);
    tseries_init(&F, 0, N, ctx);
    st = spec_plan_evaluate(&F, P, T, t, ctx);
    if (st == SPEC_OK)
        print_volumes(out, &F, N, ctx);
    for (k = 0; k <= K; k++)
        tseries_clear(t + k, ctx);
    free(t);
    tseries_clear(&F, ctx);
    spec_plan_free(P);
    wk_table_free(T);
    fmpq_mpoly_ctx_clear(ctx);
    return st;
}

/* Method B: V_{g,n} one by one by pf_integral, a fresh wk_table for each n.
   Returns 0 on success; counts the correlators evaluated in *terms. */
static int run_direct(FILE *out, slong g, slong N, double *terms)
{
    slong n, d[64] = {0}, km[2];
    fmpq_t v;
    int st = WK_OK;
    fmpq_init(v);
    *terms = 0;
    for (n = 0; n <= N && st == WK_OK; n++) {
        wk_table *T = wk_table_new();
        fmpq_zero(v);
        km[0] = 0, km[1] = 3 * g - 3 + n;
        if (2 * g - 2 + n > 0) {
            st = pf_integral(v, T, g, d, n, km, 1);
            bench_div_factorial(v, (ulong) km[1]);
            *terms += pf_estimate_terms(km, 1);
        }
        fmpq_fprint(out, v);
        fputc('\n', out);
        wk_table_free(T);
    }
    fmpq_clear(v);
    return st;
}

/* One measurement: the method (0 spec_plan, 1 pf_integral one by one), genus and order. */
typedef struct {
    int method;
    slong g, N;
} series_case;

/* Child body: runs one method (arg, a series_case); on success writes the usage line, the
   terms and the values to out.  CPU is the child's whole getrusage time.  Returns 0 on success. */
static int child_run(void *arg, FILE *out)
{
    const series_case *c = arg;
    FILE *vals = tmpfile();
    bench_timer t;
    bench_usage u;
    double terms = 0;
    int st;
    char buf[4096];
    size_t len;
    if (vals == NULL)
        return 1;
    bench_timer_start(&t);
    st = c->method == 0 ? run_spec(vals, c->g, c->N, &terms) : run_direct(vals, c->g, c->N, &terms);
    u.wall = bench_timer_wall(&t);
    u.cpu = bench_cpu_used();
    u.mib = bench_peak_mib();
    if (st == 0) {
        bench_usage_write(out, &u);
        fprintf(out, "%.0f\n", terms);
        rewind(vals);
        while ((len = fread(buf, 1, sizeof buf, vals)) > 0)
            fwrite(buf, 1, len, out);
    }
    fclose(vals);
    return st;
}

/* Runs one method in a child process under the time limit and collects its measurement.
   ok = 0 when the child failed or was stopped by the alarm. */
static measurement measure(int method, slong g, slong N, unsigned limit)
{
    measurement m = {0, {0, 0, 0}, 0, NULL};
    series_case c = {method, g, N};
    bench_child_result ch = bench_child_run(child_run, &c, limit);
    const char *rest = bench_child_ok(&ch) ? bench_usage_read(&m.u, ch.text) : NULL;
    const char *nl = rest != NULL ? strchr(rest, '\n') : NULL;
    if (nl != NULL && sscanf(rest, "%lf", &m.terms) == 1) {
        m.values = strdup(nl + 1);
        m.ok = m.values != NULL;
    }
    bench_child_clear(&ch);
    return m;
}

/* Prints one measurement's columns: CPU (wall) seconds, peak MB, terms; "(stopped)" if failed.
   Part of a table row. */
static void print_measurement(const measurement *m)
{
    char t[64];
    if (!m->ok) {
        printf("%18s %8s %8s | ", "(stopped)", "-", "-");
        return;
    }
    snprintf(t, sizeof t, "%.2f (%.2f)", m->u.cpu, m->u.wall);
    printf("%18s %8.1f %8.0f | ", t, m->u.mib, m->terms);
}

/* Prints one line per genus with both methods side by side.
   Arguments: G, N, seconds per measurement. */
int main(int argc, char **argv)
{
    slong G = 8, N = 20, secs = 600, g;
    unsigned limit;
    if (argc > 4 || (argc > 1 && !bench_arg_slong(&G, argv[1], 0, WORD_MAX))
        || (argc > 2 && !bench_arg_slong(&N, argv[2], 0, WORD_MAX))
        || (argc > 3 && !bench_arg_slong(&secs, argv[3], 0, UINT_MAX))) {
        fprintf(stderr, "usage: %s [G [N [seconds]]]   (defaults 8 20 600; 0 seconds: no limit)\n",
                argv[0]);
        return 2;
    }
    limit = (unsigned) secs;
    printf("WP free energies F_g to x^%ld: spec_plan (shared memo) vs pf_integral one by one "
           "(fresh memo per n); limit %u s per run\n", (long) N, limit);
    printf("times: CPU seconds (wall-clock in parentheses); ratio = direct CPU / spec CPU\n");
    printf("%3s | %18s %8s %8s | %18s %8s %8s | %6s %s\n", "g", "spec s", "peak MB", "corrs",
           "direct s", "peak MB", "pf terms", "ratio", "values");
    for (g = 0; g <= G; g++) {
        measurement a = measure(0, g, N, limit), b = measure(1, g, N, limit);
        printf("%3ld | ", (long) g);
        print_measurement(&a);
        print_measurement(&b);
        if (a.ok && b.ok)
            printf("%6.2f %s\n", bench_ratio(b.u.cpu, a.u.cpu),
                   strcmp(a.values, b.values) ? "DIFFER" : "equal");
        else
            printf("%6s %s\n", "-", "-");
        free(a.values), free(b.values);
    }
    return 0;
}
