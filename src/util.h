/* Allocation helpers: every allocation of the front end goes through here so
   that running out of memory ends with a clear message instead of a crash. */
#ifndef PSIKAPPA_UTIL_H
#define PSIKAPPA_UTIL_H

#include <stddef.h>

void *xmalloc(size_t n);
void *xcalloc(size_t n, size_t size);
void *xrealloc(void *p, size_t n);
char *xstrdup(const char *s);
/* Returns a new string formatted like printf; the caller frees it. */
char *xasprintf(const char *fmt, ...) __attribute__((format(printf, 1, 2)));

/* Called when memory runs out: prints a message and exits with status 1. */
void util_out_of_memory(void) __attribute__((noreturn));

#endif
