#include "memory.h"

#include <gmp.h>
#include <stdlib.h>
#include <sys/resource.h>

#include <flint/flint.h>

#include "util.h"

static void *memory_alloc(size_t n)
{
    void *p = malloc(n ? n : 1);
    if (!p)
        util_out_of_memory();
    return p;
}

static void *memory_calloc(size_t n, size_t size)
{
    void *p = calloc(n ? n : 1, size ? size : 1);
    if (!p)
        util_out_of_memory();
    return p;
}

static void *memory_realloc(void *p, size_t n)
{
    void *q = realloc(p, n ? n : 1);
    if (!q)
        util_out_of_memory();
    return q;
}

static void *memory_gmp_realloc(void *p, size_t old, size_t n)
{
    (void)old;
    return memory_realloc(p, n);
}

static void memory_gmp_free(void *p, size_t n)
{
    (void)n;
    free(p);
}

void memory_install_hooks(void)
{
    mp_set_memory_functions(memory_alloc, memory_gmp_realloc, memory_gmp_free);
    __flint_set_memory_functions(memory_alloc, memory_calloc, memory_realloc, free);
}

int memory_set_limit(double bytes)
{
    if (bytes <= 0)
        return 1;
    struct rlimit r;
    r.rlim_cur = r.rlim_max = (rlim_t)bytes;
    return setrlimit(RLIMIT_AS, &r) == 0;
}
