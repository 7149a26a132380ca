/* Text forms of class expressions and correlators. */
#ifndef PSIKAPPA_PRINT_H
#define PSIKAPPA_PRINT_H

#include <flint/flint.h>

#include "classes/classexpr.h"
#include "series/tseries.h"
#include "arb_compat.h"
#include "scalar.h"
#include "strbuf.h"

/* e.g. exp(2*pi^2*kappa_1 + L_1^2/2*psi_1); the caller frees the result. */
char *print_class(const cx *e, const scalar_ring *R);

/* Appends a boundary divisor (CX_BOUNDARY): delta_{irr}, delta_{1}, delta_{0,[1,2]}, or with
   latex \delta_{\mathrm{irr}}, \delta_{0,\{1,2\}}; or a stratum (CX_STRATUM), stratum_{g,n,k}. */
void print_boundary(strbuf *b, const cx *e, int latex);

/* The printers stop at the C-stack guard (util_stack_exhausted) and write
   "..." there; print_mark_too_deep records that, and print_take_too_deep
   returns whether it happened since the last call (and clears it), so that
   output of a value can be refused instead of shown incomplete. */
void print_mark_too_deep(void);
int print_take_too_deep(void);

/* c0 + c1*x + ... + O(x^(N+1)); the caller frees the result. */
char *print_series(const tseries *s, const scalar_ring *R);

/* The digits of a ball that are certain (rounded), e.g. 0.3183098861837906715;
   the caller frees the result. */
char *print_real(const arb_t x);

/* Appends <tau_2 tau_3^2>_g for a multi-index d sorted in descending order
   (printed ascending, equal entries shown as powers). */
void print_correlator(strbuf *b, slong g, const slong *d, slong n);

/* Appends the coefficient c of a term of a sum being written out: " + c*",
   " - c*" (c*, -c* when first); only the sign for 1; (c)* when c has several
   terms. */
void print_signed_coeff(strbuf *b, const fmpq_mpoly_t c, int first, const scalar_ring *ring);

#endif
