#include "memory.h"

#include <gmp.h>
#include <malloc.h>
#include <stdatomic.h>
#include <stdio.h>
#include <stdlib.h>
#include <sys/resource.h>
#include <unistd.h>

#include <flint/flint.h>

#include "diag.h"
#include "util.h"

#if defined(__has_include)
#if __has_include(<valgrind/valgrind.h>)
#include <valgrind/valgrind.h>
#define MEMORY_UNDER_VALGRIND() RUNNING_ON_VALGRIND
#endif
#endif
#ifndef MEMORY_UNDER_VALGRIND
#define MEMORY_UNDER_VALGRIND() 0
#endif

#if defined(__SANITIZE_ADDRESS__)
#define MEMORY_SANITIZED 1
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
#define MEMORY_SANITIZED 1
#endif
#endif
#ifndef MEMORY_SANITIZED
#define MEMORY_SANITIZED 0
#endif

/* Bytes held by GMP and FLINT through the hooks, counted by the allocator's
   own block sizes so that frees (which do not say the size) balance. Signed:
   blocks allocated before the hooks were installed may be freed through them. */
static atomic_llong memory_live;
static long long memory_cap;               /* 0: no cap (--max-memory) */

/* PSIKAPPA_FAIL_ALLOC=k: the k-th allocation through the hooks (GMP, FLINT
   and the front end's xmalloc) fails, to test that running out of memory
   anywhere ends with a clean message; k = 0 only counts them and prints the
   count at exit. memory_inject_on is 0 when the variable is not set. */
static int memory_inject_on;
static long long memory_fail_at;
static atomic_llong memory_allocations;

/* Counts one allocation; 1 when it is the one that must fail. */
static int memory_inject(void)
{
    if (!memory_inject_on)
        return 0;
    return atomic_fetch_add(&memory_allocations, 1) + 1 == memory_fail_at;
}

static void memory_report_count(void)
{
    fprintf(stderr, "psikappa: %lld allocations\n", (long long)atomic_load(&memory_allocations));
}

/* Reads PSIKAPPA_FAIL_ALLOC (a whole number >= 0); anything else leaves it off. */
static void memory_read_injection(void)
{
    const char *s = getenv("PSIKAPPA_FAIL_ALLOC");
    char *end;
    if (!s || !*s)
        return;
    long long k = strtoll(s, &end, 10);
    if (*end || k < 0)
        return;
    memory_inject_on = 1;
    memory_fail_at = k;
    util_set_failure_injection(memory_inject);
    if (k == 0)
        atexit(memory_report_count);
}
static const srcloc *memory_where;         /* statement being run, NULL between statements */

const srcloc *memory_set_statement(const srcloc *loc)
{
    const srcloc *prev = memory_where;
    memory_where = loc;
    return prev;
}

/* Ends the program with an error at the statement being run. Only stdio on
   unbuffered stderr is used: there may be no memory left to report with. */
static void memory_exhausted(size_t n) __attribute__((noreturn));
static void memory_exhausted(size_t n)
{
    diag_set_stream(NULL);
    if (memory_cap > 0 && (double)memory_live + (double)n > (double)memory_cap)
        diag_error(memory_where, "out of memory: the computation needs more than the %.3g GiB allowed by --max-memory",
                   (double)memory_cap / 1073741824.0);
    else if (n > 0)
        diag_error(memory_where, "out of memory (an allocation of %zu bytes failed)", n);
    else
        diag_error(memory_where, "out of memory");
    fflush(stdout);
    _Exit(1);
}

/* Counts a new block p of at least n bytes, or ends the program when p is NULL. */
static void *memory_count(void *p, size_t n)
{
    if (!p)
        memory_exhausted(n);
    atomic_fetch_add_explicit(&memory_live, (long long)malloc_usable_size(p), memory_order_relaxed);
    return p;
}

/* Refuses an allocation that would take the counted bytes past the cap. */
static void memory_check_cap(size_t n, size_t freed)
{
    if (memory_cap > 0 && (double)atomic_load_explicit(&memory_live, memory_order_relaxed) - (double)freed
                              + (double)n > (double)memory_cap)
        memory_exhausted(n);
}

static void *memory_alloc(size_t n)
{
    memory_check_cap(n, 0);
    return memory_count(memory_inject() ? NULL : malloc(n ? n : 1), n);
}

static void *memory_calloc(size_t n, size_t size)
{
    size_t total = n && size && n > (size_t)-1 / size ? (size_t)-1 : n * size;
    memory_check_cap(total, 0);
    return memory_count(memory_inject() ? NULL : calloc(n ? n : 1, size ? size : 1), total);
}

static void *memory_realloc(void *p, size_t n)
{
    size_t old = p ? malloc_usable_size(p) : 0;
    memory_check_cap(n, old);
    void *q = memory_inject() ? NULL : realloc(p, n ? n : 1);
    if (q)
        atomic_fetch_sub_explicit(&memory_live, (long long)old, memory_order_relaxed);
    return memory_count(q, n);
}

static void memory_free(void *p)
{
    if (p)
        atomic_fetch_sub_explicit(&memory_live, (long long)malloc_usable_size(p), memory_order_relaxed);
    free(p);
}

static void *memory_gmp_realloc(void *p, size_t old, size_t n)
{
    (void)old;
    return memory_realloc(p, n);
}

static void memory_gmp_free(void *p, size_t n)
{
    (void)n;
    memory_free(p);
}

void memory_install_hooks(void)
{
    mp_set_memory_functions(memory_alloc, memory_gmp_realloc, memory_gmp_free);
    __flint_set_memory_functions(memory_alloc, memory_calloc, memory_realloc, memory_free);
    util_set_out_of_memory_handler(memory_exhausted);   /* the front end's own allocations too */
    memory_read_injection();
}

int memory_set_limit(double bytes)
{
    if (bytes <= 0)
        return 1;
    memory_cap = bytes > 9e18 ? (long long)9e18 : (long long)bytes;
    /* The address-space cap catches the allocations that do not go through
       the hooks; it leaves room above the counted cap (code, stacks, the
       allocator's reserves) so that the counted cap, which can name the
       statement, trips first. Sanitizers and valgrind reserve address space
       of their own and would fail under it. */
    if (MEMORY_SANITIZED || MEMORY_UNDER_VALGRIND())
        return 1;
    double room = bytes / 2 > 536870912.0 ? bytes / 2 : 536870912.0;
    struct rlimit r;
    r.rlim_cur = r.rlim_max = (rlim_t)(bytes + room > 9e18 ? 9e18 : bytes + room);
    return setrlimit(RLIMIT_AS, &r) == 0;
}
