#include "util.h"

#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>

/* Per thread: a worker thread that never called util_stack_init is not
   measured against the main thread's stack (its frames live elsewhere). */
static _Thread_local char *util_stack_base;
static _Thread_local size_t util_stack_budget;

void util_stack_init(void *base)
{
    struct rlimit r;
    size_t size = 8u << 20;
    if (getrlimit(RLIMIT_STACK, &r) == 0 && r.rlim_cur != RLIM_INFINITY && r.rlim_cur > (1u << 20))
        size = (size_t)r.rlim_cur;
    util_stack_base = base;
    /* keep a quarter (at least 1 MiB) for the libraries called from the deepest frame */
    util_stack_budget = size - (size / 4 > (1u << 20) ? size / 4 : (1u << 20));
}

int util_stack_exhausted(void)
{
    char here;
    if (!util_stack_base)
        return 0;
    size_t used = util_stack_base > &here ? (size_t)(util_stack_base - &here) : (size_t)(&here - util_stack_base);
    return used > util_stack_budget;
}

static void (*util_oom_handler)(size_t n);

void util_set_out_of_memory_handler(void (*handler)(size_t n))
{
    util_oom_handler = handler;
}

/* Reports a failed allocation of n bytes and exits. */
static void util_fail_allocation(size_t n) __attribute__((noreturn));
static void util_fail_allocation(size_t n)
{
    if (util_oom_handler)
        util_oom_handler(n);
    fputs("psikappa: error: out of memory\n", stderr);
    fflush(stdout);
    _Exit(1);
}

void util_out_of_memory(void)
{
    util_fail_allocation(0);
}

static int (*util_inject)(void);

void util_set_failure_injection(int (*hook)(void))
{
    util_inject = hook;
}

/* 1 when the test hook wants this allocation to fail. */
static int util_injected(void)
{
    return util_inject && util_inject();
}

void *xmalloc(size_t n)
{
    void *p = util_injected() ? NULL : malloc(n ? n : 1);
    if (!p)
        util_fail_allocation(n);
    return p;
}

void *xcalloc(size_t n, size_t size)
{
    void *p = util_injected() ? NULL : calloc(n ? n : 1, size ? size : 1);
    if (!p)
        util_fail_allocation(n * size);
    return p;
}

void *xrealloc(void *p, size_t n)
{
    void *q = util_injected() ? NULL : realloc(p, n ? n : 1);
    if (!q)
        util_fail_allocation(n);
    return q;
}

char *xstrdup(const char *s)
{
    size_t n = strlen(s) + 1;
    char *p = xmalloc(n);
    memcpy(p, s, n);
    return p;
}

char *xasprintf(const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    int n = vsnprintf(NULL, 0, fmt, ap);
    va_end(ap);
    char *p = xmalloc((size_t)n + 1);
    va_start(ap, fmt);
    vsnprintf(p, (size_t)n + 1, fmt, ap);
    va_end(ap);
    return p;
}
