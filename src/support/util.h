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

/* Records the base of the C stack (call first thing in main, or at the start
   of a thread that evaluates scripts) and how much of it may be used. */
void util_stack_init(void *base);

/* 1 when the evaluation is so deep that the C stack is nearly used up:
   recursive code stops with an error instead of crashing. */
int util_stack_exhausted(void);

/* Called when memory runs out: hands over to the handler set below, or prints
   a message without a location; exits with status 1 either way. */
void util_out_of_memory(void) __attribute__((noreturn));

/* Sets the function that reports a failed allocation of n bytes (n = 0: size
   unknown) and ends the program; it must not return. The language installs
   one that names the statement being run; NULL restores the plain message. */
void util_set_out_of_memory_handler(void (*handler)(size_t n));

/* Test hook (PSIKAPPA_FAIL_ALLOC, see memory.h): when set, every allocation
   of the front end first asks it, and fails as if memory ran out when it
   returns 1. NULL removes it. */
void util_set_failure_injection(int (*hook)(void));

#endif
