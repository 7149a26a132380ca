/* bench_util.c - helpers shared by the benchmark programs (see bench_util.h). */
#define _POSIX_C_SOURCE 200809L
#include <errno.h>
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

#include "bench_util.h"

/* Seconds elapsed since t0 on clock clk.
   t0 must come from the same clock. */
static double bench_clock_since(clockid_t clk, const struct timespec *t0)
{
    struct timespec t1;

    clock_gettime(clk, &t1);
    return (double) (t1.tv_sec - t0->tv_sec) + 1e-9 * (double) (t1.tv_nsec - t0->tv_nsec);
}

void bench_timer_start(bench_timer *t)
{
    clock_gettime(CLOCK_MONOTONIC, &t->wall);
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t->cpu);
}

double bench_timer_wall(const bench_timer *t)
{
    return bench_clock_since(CLOCK_MONOTONIC, &t->wall);
}

double bench_timer_cpu(const bench_timer *t)
{
    return bench_clock_since(CLOCK_PROCESS_CPUTIME_ID, &t->cpu);
}

double bench_cpu_used(void)
{
    struct rusage ru;

    getrusage(RUSAGE_SELF, &ru);
    return (double) ru.ru_utime.tv_sec + 1e-6 * (double) ru.ru_utime.tv_usec
           + (double) ru.ru_stime.tv_sec + 1e-6 * (double) ru.ru_stime.tv_usec;
}

double bench_peak_mib(void)
{
    struct rusage ru;

    getrusage(RUSAGE_SELF, &ru);
    return (double) ru.ru_maxrss / 1024.0;
}

/* Reads fd to end of file into a new NUL-terminated string.
   The caller frees the result; NULL if memory runs out. */
static char *bench_read_all(int fd)
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

/* Child side of bench_child_run: runs fn with the pipe as out under the alarm, then exits.
   Never returns; exit status 0 only when fn succeeded and its record reached the pipe. */
static void bench_child_exec(bench_child_fn fn, void *arg, int fd, unsigned limit_s)
{
    FILE *out = fdopen(fd, "w");
    int st = 1;

    if (limit_s > 0)
        alarm(limit_s);
    if (out != NULL)
    {
        st = fn(arg, out) != 0;
        st |= fclose(out) != 0;
    }
    fflush(stdout);   /* _exit does not flush, and the parent's table needs the child's rows */
    flint_cleanup_master();
    _exit(st);
}

bench_child_result bench_child_run(bench_child_fn fn, void *arg, unsigned limit_s)
{
    bench_child_result c = { 0, 0, 0, 0, NULL };
    int fds[2], status = 0;
    pid_t pid;

    if (pipe(fds) != 0)
        return c;
    fflush(stdout);   /* the child must not inherit (and print again) pending output */
    pid = fork();
    if (pid == 0)
    {
        close(fds[0]);
        bench_child_exec(fn, arg, fds[1], limit_s);
    }
    close(fds[1]);
    /* read before waiting: a child blocked on a full pipe would never exit */
    c.text = pid > 0 ? bench_read_all(fds[0]) : NULL;
    close(fds[0]);
    c.ran = pid > 0;
    if (pid > 0 && waitpid(pid, &status, 0) == pid)
    {
        c.exited = WIFEXITED(status);
        c.code = c.exited ? WEXITSTATUS(status) : 0;
        c.signaled = WIFSIGNALED(status);
    }
    return c;
}

int bench_child_run_or_here(bench_child_fn fn, void *arg)
{
    bench_child_result c = bench_child_run(fn, arg, 0);
    int bad = c.ran ? !bench_child_ok(&c) : fn(arg, NULL) != 0;

    bench_child_clear(&c);
    return bad;
}

int bench_child_ok(const bench_child_result *c)
{
    return c->ran && c->exited && c->code == 0;
}

void bench_child_clear(bench_child_result *c)
{
    free(c->text);
    c->text = NULL;
}

void bench_usage_write(FILE *out, const bench_usage *u)
{
    fprintf(out, "%.17g %.17g %.17g\n", u->wall, u->cpu, u->mib);
}

const char *bench_usage_read(bench_usage *u, const char *text)
{
    const char *nl = text != NULL ? strchr(text, '\n') : NULL;

    if (nl == NULL || sscanf(text, "%lf %lf %lf", &u->wall, &u->cpu, &u->mib) != 3)
        return NULL;
    return nl + 1;
}

double bench_ratio(double num, double den)
{
    return den > 0.0 ? num / den : 0.0;
}

int bench_arg_slong(slong *out, const char *s, slong lo, slong hi)
{
    char *end;
    long v;

    errno = 0;
    v = strtol(s, &end, 10);
    if (end == s || *end != '\0' || errno != 0 || v < lo || v > hi)
        return 0;
    *out = (slong) v;
    return 1;
}

ulong bench_checksum_fmpq(const fmpq *v, slong n)
{
    const ulong p = (UWORD(1) << 61) - 1;
    ulong s = 0;
    slong k;

    /* each term is below p < 2^61, so the sum of three stays below 2^64 */
    for (k = 0; k < n; k++)
        s = (s + fmpz_fdiv_ui(fmpq_numref(v + k), p) + fmpz_fdiv_ui(fmpq_denref(v + k), p)) % p;
    return s;
}

void bench_div_factorial(fmpq_t v, ulong m)
{
    fmpz_t f;

    fmpz_init(f);
    fmpz_fac_ui(f, m);
    fmpq_div_fmpz(v, v, f);
    fmpz_clear(f);
}

void bench_print_row(const char *lead, const bench_usage *u, slong primes, double est_s,
                     ulong checksum, int ok)
{
    printf("%s %9.2f %9.2f %8.1f %6ld %9.1f %20lu%s\n", lead, u->wall, u->cpu, u->mib,
           (long) primes, est_s, (unsigned long) checksum, ok ? "" : "  (error)");
    fflush(stdout);
}
