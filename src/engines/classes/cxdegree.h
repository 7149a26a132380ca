/* The degrees that the terms of a class expression have (psi_i has degree 1,
   kappa_j degree j, scalars degree 0), found without expanding it: an
   integrand with no term of the dimension integrates to 0, and the caller
   can say why. */
#ifndef PSIKAPPA_CXDEGREE_H
#define PSIKAPPA_CXDEGREE_H

#include "classexpr.h"

/* Sets has[d] = 1 for every degree d < cap that a term of e may have, and
   has[cap] = 1 when some term may have a degree >= cap (has holds cap + 1
   bytes, cleared by the caller; a zero scalar has no degree). Cancellation
   between terms is not seen, so a degree may be listed that cancels. Returns
   0 (has unspecified) when the expression is too deep or the work would pass
   about `budget` steps. */
int cx_degree_set(const cx *e, slong cap, unsigned char *has, double budget);

#endif
