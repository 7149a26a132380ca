/* Arithmetic of values (eval_arith.c), called by eval_expr for its operator nodes. */
#ifndef PSIKAPPA_EVAL_ARITH_H
#define PSIKAPPA_EVAL_ARITH_H

#include "interp.h"

value *eval_neg(interp *I, scope *s, const node *n);
/* + - * / ^ of two operands. */
value *eval_binop(interp *I, scope *s, const node *n);
/* == != < <= > >=: 1 or 0. */
value *eval_compare(interp *I, scope *s, const node *n);
/* a op b (op = n->op) of two numbers, or of numbers and classes (sum_{} and prod_{} too). */
value *eval_arith_num(interp *I, const node *n, const value *a, const value *b);
value *eval_arith_class(interp *I, const node *n, const value *a, const value *b);
value *eval_factorial(interp *I, scope *s, const node *n);
/* Reports msg at n and returns NULL (eval.c). */
value *eval_fail(const node *n, const char *msg);

#endif
