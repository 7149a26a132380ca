/* binom.h - multiplying by binomial coefficients in the inner loops of the recursions (the
 * splitting sums of the DVV table and of the Hodge operator route). */
#ifndef PSIKAPPA_BINOM_H
#define PSIKAPPA_BINOM_H

#include <flint/fmpz.h>

/* w *= binom(n, k) (0 <= k <= n): in one machine word when n <= 60 (binom(60, 30) < 2^57 and the
   running product times n stays below 2^63), else through FLINT with b as scratch. */
void binom_mul(fmpz_t w, fmpz_t b, slong n, slong k);

#endif
