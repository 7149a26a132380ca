/* Diagnostics: errors with a location, printed as
   file:line:column: error: message, then the source line and a caret. */
#ifndef PSIKAPPA_DIAG_H
#define PSIKAPPA_DIAG_H

#include <stdio.h>

#include "source.h"

/* Prints an error at loc (or without a location when loc is NULL) to stderr
   and counts it. */
void diag_error(const srcloc *loc, const char *fmt, ...) __attribute__((format(printf, 2, 3)));

/* Prints a warning at loc: the program goes on (not counted as an error). */
void diag_warning(const srcloc *loc, const char *fmt, ...) __attribute__((format(printf, 2, 3)));

/* Prints a note that belongs to the previous error (e.g. where a call came from). */
void diag_note(const srcloc *loc, const char *fmt, ...) __attribute__((format(printf, 2, 3)));


/* Redirects diagnostics (tests and the interactive session use this). */
void diag_set_stream(FILE *f);

#endif
