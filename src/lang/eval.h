/* Evaluation of expressions and names (eval.c). */
#ifndef PSIKAPPA_EVAL_H
#define PSIKAPPA_EVAL_H

#include "interp.h"

/* Names, items of lists, subscripted names L_{i} and V_{g,n} (eval_names.c). */
value *eval_name(interp *I, scope *s, const node *n);
value *eval_indexed(interp *I, scope *s, const node *n);
value *eval_subscript(interp *I, scope *s, const node *n);
/* Reports a name reserved for a class that is not available (unavailable.h)
   at `at`; 1 when name is one. */
int names_check_reserved(const srcloc *at, const char *name);

/* Evaluation entry points shared by the statement executor and builtins. */
value *eval_expr(interp *I, scope *s, const node *n);
/* Evaluates n as an integer >= lo; reports an error naming `what` otherwise. */
int eval_slong(interp *I, scope *s, const node *n, const char *what, slong lo, slong *out);
/* Evaluates n as a condition (a number; nonzero is true); 0 after an error. */
int eval_truth(interp *I, scope *s, const node *n, int *truth);

#endif
