/* Memory hooks: GMP and FLINT allocate through functions of ours, so that
   running out of memory ends the program with a clear message at the
   statement being run (and exit status 1) instead of an abort deep inside a
   library. */
#ifndef PSIKAPPA_MEMORY_H
#define PSIKAPPA_MEMORY_H

#include <stddef.h>

#include "source.h"

/* Routes GMP's and FLINT's allocations through checked functions (call once, first).
   For tests, PSIKAPPA_FAIL_ALLOC=k makes the k-th allocation through these hooks or the
   front end's xmalloc fail as if memory ran out (k = 0: count them, print the count at exit). */
void memory_install_hooks(void);

/* Caps the bytes that GMP and FLINT may hold at `bytes` (0: no cap), and the
   address space of the process somewhat above it; 1 on success. */
int memory_set_limit(double bytes);

/* Names the statement being run (NULL: none) for the out-of-memory message;
   returns the one named before, to be restored when the statement ends.
   loc must stay valid while it is named. */
const srcloc *memory_set_statement(const srcloc *loc);

#endif
