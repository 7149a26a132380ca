/* Integrands without a term of the dimension (integrand_check.c). */
#ifndef PSIKAPPA_INTEGRAND_CHECK_H
#define PSIKAPPA_INTEGRAND_CHECK_H

#include "interp.h"

/* Whether int_{g,n} of integrand is 0 because no term has degree 3g-3+n,
   saying so once per integral `where` (integrand_check.c); it also warns once
   about a formal variable added to a class, which contributes 0. */
int integrand_is_zero(interp *I, const node *where, slong g, slong n, const value *integrand);

/* 1 the first time `where` asks, so that an integral in a loop warns once (the list every
   warning about an integral shares). */
int integrand_first_warning(interp *I, const node *where);

/* Warns once per correlator `where` whose exponents add up to `sum` instead of `want` (the
   degree its class leaves for psi classes on Mbar_{g,n}), the reason it is 0; `what` names
   the kind of correlator in the message. */
void integrand_warn_correlator(interp *I, const node *where, slong g, slong n, slong sum, slong want,
                               const char *what);

#endif
