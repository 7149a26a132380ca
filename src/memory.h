/* Memory hooks: GMP and FLINT allocate through functions of ours, so that
   running out of memory ends the program with a clear message (and exit
   status 1) instead of an abort deep inside a library. */
#ifndef PSIKAPPA_MEMORY_H
#define PSIKAPPA_MEMORY_H

#include <stddef.h>

/* Routes GMP's and FLINT's allocations through checked functions (call once, first). */
void memory_install_hooks(void);

/* Caps the address space of the process at `bytes` (0: no cap); 1 on success. */
int memory_set_limit(double bytes);

#endif
