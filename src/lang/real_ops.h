/* Real numbers as certified balls (Arb): made on request with real(x, digits),
   they combine with exact numbers in + - * / and integer powers, and every
   digit they print is certain. Exact values never turn into reals by themselves. */
#ifndef PSIKAPPA_REAL_OPS_H
#define PSIKAPPA_REAL_OPS_H

#include "interp.h"

/* a op b (op in + - * /) where one of a, b is real and the other real or an
   exact number in Q[pi]; NULL after reporting at n. */
value *real_arith(interp *I, const node *n, int op, const value *a, const value *b);
value *real_pow(interp *I, const node *n, const value *a, slong e);

/* Compares a and b (one of them real, the other real or a number in pi): -1, 0, 1,
   or -2 after reporting at n when the balls overlap and the order is undecided. */
int real_compare(interp *I, const node *n, const value *a, const value *b);

/* real(x, digits): x (in Q[pi]) as a ball with at least `digits` correct digits. */
value *real_from_exact(interp *I, const node *at, const value *x, slong digits);

#endif
