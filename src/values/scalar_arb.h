/* Decimal values of exact scalars: a polynomial in pi with rational
   coefficients evaluated as an Arb ball. */
#ifndef PSIKAPPA_SCALAR_ARB_H
#define PSIKAPPA_SCALAR_ARB_H

#include "arb_compat.h"
#include "scalar.h"

/* r = p at precision prec; p must involve pi and 1/pi only (scalar_is_pi_only). */
void scalar_get_arb(arb_t r, const fmpq_mpoly_t p, const scalar_ring *R, slong prec);

#endif
