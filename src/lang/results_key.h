/* Keys of the results store: the SHA-256 of a canonical, complete
   serialisation of a question, never of its printed form (the printer elides
   deep expressions and is not injective). Two questions have the same key only
   if they are the same question; the same question asked with its variables
   declared in another order, or built with a different sharing of
   subexpressions, may get another key (a miss, never a wrong answer). */
#ifndef PSIKAPPA_RESULTS_KEY_H
#define PSIKAPPA_RESULTS_KEY_H

#include "classes/classexpr.h"
#include "scalar.h"

/* The key of "the integral of e over Mbar_{g,n}" as 64 hex digits in hex.
   Returns 1, or 0 when no key can be formed (an exponent beyond a machine
   word, an unnamed variable): the answer is then neither looked up nor stored. */
int results_key_integral(const scalar_ring *R, slong g, slong n, const cx *e, char hex[65]);

/* Appends the canonical text of the scalar p to the hash: its terms as
   (coefficient, sorted name^exponent list), sorted. Returns 0 when it cannot
   be formed. Exposed for the tests. */
struct sha256_ctx;
int results_key_scalar(struct sha256_ctx *h, const fmpq_mpoly_t p, const scalar_ring *R);

/* Number of distinct nodes hashed by the last results_key_integral call. */
slong results_key_last_nodes(void);

#endif
