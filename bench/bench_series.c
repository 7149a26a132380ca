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
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>
#include <flint/fmpq.h>
#include "correlators/pushforward.h"
#include "series/spec.h"

#define NVARS 128

typedef struct {
    int ok;                /* 1 when the child finished */
    double seconds, cpu;   /* wall-clock and CPU (user + system) seconds */
    double terms;
    long maxrss_kb;
    char *values;          /* the V_{g,n}, one per line (owned) */
} measurement;

/* Monotonic wall-clock time in seconds.
   CLOCK_MONOTONIC. */
static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double) ts.tv_sec + 1e-9 * (double) ts.tv_nsec;
}

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
    fmpz_t f;
    int st = WK_OK;
    fmpq_init(v), fmpz_init(f);
    *terms = 0;
    for (n = 0; n <= N && st == WK_OK; n++) {
        wk_table *T = wk_table_new();
        fmpq_zero(v);
        km[0] = 0, km[1] = 3 * g - 3 + n;
        if (2 * g - 2 + n > 0) {
            st = pf_integral(v, T, g, d, n, km, 1);
            fmpz_fac_ui(f, (ulong) km[1]);
            fmpq_div_fmpz(v, v, f);
            *terms += pf_estimate_terms(km, 1);
        }
        fmpq_fprint(out, v);
        fputc('\n', out);
        wk_table_free(T);
    }
    fmpq_clear(v), fmpz_clear(f);
    return st;
}

/* Child body: runs one method, then writes "wall cpu maxrss terms\n" and the values to fd.
   Exits the process; status 0 only when the method succeeded. */
static void child_run(int fd, int method, slong g, slong N, unsigned limit)
{
    FILE *out = fdopen(fd, "w"), *vals = tmpfile();
    struct rusage ru;
    double t0 = now(), terms = 0, secs;
    int st;
    char buf[4096];
    size_t len;
    alarm(limit);
    st = method == 0 ? run_spec(vals, g, N, &terms) : run_direct(vals, g, N, &terms);
    secs = now() - t0;
    getrusage(RUSAGE_SELF, &ru);
    if (st == 0) {
        fprintf(out, "%.6f %.6f %ld %.0f\n", secs, (double) ru.ru_utime.tv_sec
                + 1e-6 * (double) ru.ru_utime.tv_usec + (double) ru.ru_stime.tv_sec
                + 1e-6 * (double) ru.ru_stime.tv_usec, (long) ru.ru_maxrss, terms);
        rewind(vals);
        while ((len = fread(buf, 1, sizeof buf, vals)) > 0)
            fwrite(buf, 1, len, out);
    }
    fclose(vals);
    fclose(out);
    flint_cleanup();
    _exit(st == 0 ? 0 : 1);
}

/* Reads everything from fd into a malloc'ed string.
   The caller frees the result. */
static char *read_all(int fd)
{
    size_t cap = 4096, len = 0;
    char *s = malloc(cap);
    ssize_t r;
    while ((r = read(fd, s + len, cap - len - 1)) > 0) {
        len += (size_t) r;
        if (cap - len < 2)
            s = realloc(s, cap *= 2);
    }
    s[len] = '\0';
    return s;
}

/* Runs one method in a child process and collects its measurement.
   ok = 0 when the child failed or was stopped by the alarm. */
static measurement measure(int method, slong g, slong N, unsigned limit)
{
    measurement m = {0, 0, 0, 0, 0, NULL};
    int fds[2], status;
    pid_t pid;
    char *text;
    if (pipe(fds) != 0)
        return m;
    fflush(stdout);
    pid = fork();
    if (pid == 0) {
        close(fds[0]);
        child_run(fds[1], method, g, N, limit);
    }
    close(fds[1]);
    text = read_all(fds[0]);
    close(fds[0]);
    waitpid(pid, &status, 0);
    if (pid > 0 && WIFEXITED(status) && WEXITSTATUS(status) == 0
        && sscanf(text, "%lf %lf %ld %lf", &m.seconds, &m.cpu, &m.maxrss_kb, &m.terms) == 4) {
        m.ok = 1;
        m.values = strdup(strchr(text, '\n') + 1);
    }
    free(text);
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
    snprintf(t, sizeof t, "%.2f (%.2f)", m->cpu, m->seconds);
    printf("%18s %8.1f %8.0f | ", t, m->maxrss_kb / 1024.0, m->terms);
}

/* Prints one line per genus with both methods side by side.
   Arguments: G, N, seconds per measurement. */
int main(int argc, char **argv)
{
    slong G = argc > 1 ? atol(argv[1]) : 8, N = argc > 2 ? atol(argv[2]) : 20, g;
    unsigned limit = argc > 3 ? (unsigned) atoi(argv[3]) : 600;
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
            printf("%6.2f %s\n", b.cpu / a.cpu, strcmp(a.values, b.values) ? "DIFFER" : "equal");
        else
            printf("%6s %s\n", "-", "-");
        free(a.values), free(b.values);
    }
    return 0;
}
