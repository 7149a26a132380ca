/* Progress of long computations on stderr, only when stderr is a terminal:
   one line, rewritten in place at most a few times a second, saying what is
   being computed, how far it is, and an estimate of the rest. Nothing is
   written to pipes or files. */
#include "progress.h"

#include <stdio.h>
#include <time.h>
#include <unistd.h>

/* Computations shorter than this never show a line. */
#define PROGRESS_DELAY 1.0
#define PROGRESS_INTERVAL 0.25

static double progress_now(void)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

void progress_start(progress *p, const char *what, double total)
{
    p->what = what;
    p->total = total;
    p->start = progress_now();
    p->last = p->start;
    p->shown = 0;
    p->enabled = isatty(STDERR_FILENO);
}

void progress_update(progress *p, double done)
{
    if (!p->enabled)
        return;
    double now = progress_now();
    if (now - p->start < PROGRESS_DELAY || now - p->last < PROGRESS_INTERVAL)
        return;
    p->last = now;
    double rate = done > 0 ? (now - p->start) / done : 0;
    double left = p->total > done ? rate * (p->total - done) : 0;
    fprintf(stderr, "\r\033[K%s: %.0f of %.0f (%.0f%%), about %.0f s left", p->what, done, p->total,
            p->total > 0 ? 100.0 * done / p->total : 0.0, left);
    fflush(stderr);
    p->shown = 1;
}

void progress_note(const char *what, double seconds)
{
    if (seconds >= PROGRESS_DELAY && isatty(STDERR_FILENO)) {
        fprintf(stderr, "\r\033[K%s (estimated %.0f s)...", what, seconds);
        fflush(stderr);
    }
}

void progress_end(progress *p)
{
    if (p->shown || (p->enabled && progress_now() - p->start >= PROGRESS_DELAY)) {
        fputs("\r\033[K", stderr);
        fflush(stderr);
    }
    p->shown = 0;
}

void progress_clear_note(double seconds)
{
    if (seconds >= PROGRESS_DELAY && isatty(STDERR_FILENO)) {
        fputs("\r\033[K", stderr);
        fflush(stderr);
    }
}
