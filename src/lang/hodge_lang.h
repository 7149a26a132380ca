/* The language's bridge to the Hodge engine (src/engines/hodge/): the names lambda_j and ch_k, and
   int_{g,n} of integrands that contain them (hodge_lang.c). */
#ifndef PSIKAPPA_HODGE_LANG_H
#define PSIKAPPA_HODGE_LANG_H

#include "classes/cpoly.h"
#include "interp.h"

/* When n is the name lambda_J or ch_K (J, K decimal), sets *out to the class (NULL after an
   error at n) and returns 1; returns 0 for any other name. */
int hodge_lang_name(interp *I, const node *n, value **out);

/* When n is lambda_{e} or ch_{e} (one computed index e >= 0), sets *out to the class (NULL
   after an error, e.g. a negative index) and returns 1; returns 0 for any other name. */
int hodge_lang_subscript(interp *I, scope *s, const node *n, value **out);

/* Whether the integrand holds a Hodge class, so that int_{g,n} goes to the Hodge routes (route_hodge.c). */
int hodge_lang_applies(const value *integrand);

/* The session's Hodge engine context, created on first use with the correlator table and the
   limits; NULL when memory is exhausted. The interpreter owns it. */
struct hodge_ctx *hodge_lang_ctx(interp *I);

/* explain for such an integral, expanded into P with the Hodge slots (hodge_lang_explain.c): the
   source line, the integrand with every lambda monomial written in ch classes, the steps of
   Mumford's formula with their Bernoulli weights and the psi-kappa integrals they end in.  Returns 0 after reporting an error. */
int hodge_lang_explain(interp *I, const node *where, const cpoly *P);

/* Total degree of the lambda and ch factors of a term (multiplicities lmult[1..lmax],
   cmult[1..cmax]; either may be NULL with its max 0). */
slong hodge_lang_degree(const slong *lmult, slong lmax, const slong *cmult, slong cmax);
/* Reports an engine status other than WK_OK at where (a cancellation first). */
void hodge_lang_report(interp *I, const node *where, int st);
/* Warns once when the value r of int_{g,n} integrand is 0 because the integrand holds a class
   that is zero on the space (lambda_j above the rank g, a Hodge class in genus 0). */
void hodge_lang_warn_zero(interp *I, const node *where, slong g, slong n, const value *integrand, const value *r);
/* Releases the Hodge engine's memo (called by interp_clear). */
void hodge_lang_clear(interp *I);

#endif
