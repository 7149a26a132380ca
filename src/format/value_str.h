/* The text of a value (value_str.c). */
#ifndef PSIKAPPA_VALUE_STR_H
#define PSIKAPPA_VALUE_STR_H

#include "value.h"

/* Human-readable text of v; the caller frees it. */
char *value_get_str(const value *v, const scalar_ring *R);

#endif
