/* The volume engine as a route of the language (fastvol.c). */
#ifndef PSIKAPPA_FASTVOL_H
#define PSIKAPPA_FASTVOL_H

#include "interp.h"

/* Volume integrals by the fast engine (fastvol.c). fastvol_try sets *handled
   when it recognised the integrand (the result is then NULL after an error). */
value *fastvol_try(interp *I, const node *where, slong g, slong n, const value *integrand, int *handled);
int fastvol_get(interp *I, const node *where, fmpq_t v, slong g, slong n);
void fastvol_clear(interp *I);
/* V_{g,n} by the polynomial engine when the reduction would be large
   (or route_volumes is set); *handled as for fastvol_try. */
value *fastvol_try_polynomial(interp *I, const node *where, slong g, slong n, int *handled);

#endif
