/* Statements (exec.c). */
#ifndef PSIKAPPA_EXEC_H
#define PSIKAPPA_EXEC_H

#include "interp.h"

/* table_{...} E, output FORMAT [digits] and precision DIGITS (exec_table.c). */
int exec_table(interp *I, scope *s, const node *n);
int exec_output(interp *I, scope *s, const node *n);
int exec_precision(interp *I, scope *s, const node *n);

/* load "file" (load.c). */
int exec_load(interp *I, const node *n);

/* Runs one statement; 0 after reporting an error. */
int exec_stmt(interp *I, scope *s, const node *n);

#endif
