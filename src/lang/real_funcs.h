/* Functions of real numbers (Arb balls): exp, log, sqrt, sin, cos, sinh, cosh,
   gamma, zeta, the Bessel function J_nu, and numeric(x). An exact argument
   gives an exact answer where one exists in the value ring (exp(0) = 1,
   sqrt(9/4) = 3/2, gamma(5) = 24, zeta(2) = pi^2/6, ...), otherwise a real
   computed at the working precision (the statement `precision D`). */
#ifndef PSIKAPPA_REAL_FUNCS_H
#define PSIKAPPA_REAL_FUNCS_H

#include "builtins.h"

enum { RF_EXP, RF_LOG, RF_SQRT, RF_SIN, RF_COS, RF_SINH, RF_COSH, RF_GAMMA, RF_ZETA };

/* Working precision in bits of reals made from exact values. */
slong real_work_prec(const interp *I);

/* Whether v has a real value: a real, or a number in pi and 1/pi only. */
int real_applies(const interp *I, const value *v);

/* Sets r to v as a ball at precision prec (a real keeps its own ball);
   0 after reporting at `at` why v has no real value, naming the function fname. */
int real_get_ball(interp *I, const node *at, arb_t r, const value *v, slong prec, const char *fname);

/* f(x) for one of the RF_ functions; new reference, NULL after reporting at call. */
value *real_unary(interp *I, const node *call, int f, const value *x);

extern const builtin builtins_real[];   /* sqrt, gamma, zeta, besselj, numeric */

#endif
