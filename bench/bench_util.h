/* bench_util.h - what the benchmark programs share: wall and CPU timers, peak memory, one child
 * process per measurement (so that getrusage's peak RSS and an alarm-based time limit belong to
 * that measurement alone), the record a child sends back through its pipe, strict integer
 * arguments, table checksums and the common row layout of the volume benchmarks.
 */
#ifndef PSIKAPPA_BENCH_UTIL_H
#define PSIKAPPA_BENCH_UTIL_H

#include <stdio.h>
#include <time.h>
#include <flint/fmpq.h>

/* Start points of one timed region on the monotonic and the process CPU clocks. */
typedef struct {
    struct timespec wall, cpu;
} bench_timer;

/* Wall seconds, CPU seconds (user + system, all threads) and peak resident MiB of one run. */
typedef struct {
    double wall, cpu, mib;
} bench_usage;

/* Outcome of bench_child_run.  text is everything the child wrote to its pipe, NUL-terminated,
   owned by this struct (bench_child_clear frees it); NULL when nothing could be read. */
typedef struct {
    int ran;        /* 1 when the child was started (pipe and fork succeeded) */
    int exited;     /* 1 when it exited normally; code is then its exit status */
    int code;
    int signaled;   /* 1 when a signal stopped it, e.g. SIGALRM at the time limit */
    char *text;
} bench_child_result;

/* Body of a child run: writes its record to out (NULL when run in-process) and returns 0 on
   success.  arg is the caller's, borrowed. */
typedef int (*bench_child_fn)(void *arg, FILE *out);

/* Starts the timer: reads the monotonic clock, then the process CPU clock.
   Monotonic, so that wall-clock adjustments cannot distort timings. */
void bench_timer_start(bench_timer *t);

/* Wall seconds since bench_timer_start(t).
   Reads the clock once; read it before bench_timer_cpu so the order matches the start. */
double bench_timer_wall(const bench_timer *t);

/* CPU seconds of this process (all threads) since bench_timer_start(t).
   On a shared machine this is steadier than wall time, which also measures the other load. */
double bench_timer_cpu(const bench_timer *t);

/* CPU seconds (user + system, from getrusage) this process has used since it started.
   For a child started by bench_child_run that is the child's own time. */
double bench_cpu_used(void);

/* Peak resident set size of this process in MiB.
   Linux reports ru_maxrss in KiB; meaningful per case only in a fresh child process. */
double bench_peak_mib(void);

/* Forks a child that runs fn(arg, out) with out the write end of a pipe, limit_s seconds of
   alarm (0: none), then exits 0 iff fn returned 0 and out was written; collects what it wrote. */
bench_child_result bench_child_run(bench_child_fn fn, void *arg, unsigned limit_s);

/* Runs fn(arg, .) in a child (its peak RSS then its own), or in this process if no child can be
   started (peak RSS then cumulative); what it writes to out is dropped.  Returns 0 on success. */
int bench_child_run_or_here(bench_child_fn fn, void *arg);

/* 1 when the child ran and exited with status 0.
   Anything else (no fork, signal, nonzero status) counts as failure. */
int bench_child_ok(const bench_child_result *c);

/* Frees c->text.
   c may be reused afterwards. */
void bench_child_clear(bench_child_result *c);

/* Writes u as the first line of a child's record, at full precision.
   Parsed back by bench_usage_read without loss. */
void bench_usage_write(FILE *out, const bench_usage *u);

/* Reads a line written by bench_usage_write at the start of text into *u.
   Returns the text after that line, or NULL when text is NULL or malformed. */
const char *bench_usage_read(bench_usage *u, const char *text);

/* num / den, or 0 when den is not positive.
   Sub-resolution timings can be 0; the ratio is then reported as 0 rather than inf. */
double bench_ratio(double num, double den);

/* *out = s when s is a whole decimal integer (as strtol reads it, no trailing text) in [lo, hi].
   Returns 1 on success, 0 otherwise (then *out is unchanged). */
int bench_arg_slong(slong *out, const char *s, slong lo, slong hi);

/* Sum of all numerators and denominators of v[0..n-1] modulo 2^61 - 1.
   Identical tables give identical checksums, so runs can be compared by one number. */
ulong bench_checksum_fmpq(const fmpq *v, slong n);

/* v = v / m!.
   Turns int kappa_1^m into the normalised volume's integrand int kappa_1^m / m!. */
void bench_div_factorial(fmpq_t v, ulong m);

/* Prints one row of a timed volume run: lead (the key columns), wall, CPU, peak MiB, primes,
   estimated single-core seconds, checksum, and "(error)" unless ok; flushes stdout. */
void bench_print_row(const char *lead, const bench_usage *u, slong primes, double est_s,
                     ulong checksum, int ok);

#endif
