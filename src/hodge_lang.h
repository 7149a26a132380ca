/* The language's bridge to the Hodge engine (src/hodge/): the names lambda_j and ch_k, and
   int_{g,n} of integrands that contain them (hodge_lang.c). */
#ifndef PSIKAPPA_HODGE_LANG_H
#define PSIKAPPA_HODGE_LANG_H

#include "interp.h"
#include "classes/cpoly.h"

/* When n is the name lambda_J or ch_K (J, K decimal), sets *out to the class (NULL after an
   error at n) and returns 1; returns 0 for any other name. */
int hodge_lang_name(interp *I, const node *n, value **out);

/* When n is lambda_{e} or ch_{e} (one computed index e >= 0), sets *out to the class (NULL
   after an error, e.g. a negative index) and returns 1; returns 0 for any other name. */
int hodge_lang_subscript(interp *I, scope *s, const node *n, value **out);

/* Whether the integrand holds a Hodge class, so that int_{g,n} goes to hodge_lang_integrate. */
int hodge_lang_applies(const value *integrand);

/* int_{g,n} of an integrand with Hodge classes on a stable space (checked by the caller): exact,
   by the Faber-Pandharipande operator; with --verify also by Mumford's formula, compared.
   Returns a new value, or NULL after reporting an error at where. */
value *hodge_lang_integrate(interp *I, const node *where, slong g, slong n, const value *integrand);

/* explain for such an integral (hodge_lang_explain.c): the source line, the integrand with every
   lambda monomial written in ch classes, the steps of Mumford's formula with their Bernoulli
   weights and the psi-kappa integrals they end in.  Returns 0 after reporting an error. */
int hodge_lang_explain(interp *I, const node *where, slong g, slong n, const value *integrand);

/* Shared with hodge_lang_explain.c: the engine context (created on first use; NULL when memory
   is exhausted), the report of an engine status at where, and the expansion of an integrand
   into P with the refusal by estimate (1 when P is ready). */
struct hodge_ctx *hodge_lang_ctx(interp *I);
void hodge_lang_report(interp *I, const node *where, int st);
int hodge_lang_prepare(interp *I, const node *where, cpoly *P, const value *integrand);

/* Releases the Hodge engine's memo (called by interp_clear). */
void hodge_lang_clear(interp *I);

#endif
