/* The language side of Norbury's class Theta (the engine is src/theta/): the name Theta as a
   class, int_{g,n} of integrands holding Theta, <Theta | tau_...>_g, supervolume(g, n). */
#ifndef PSIKAPPA_THETA_LANG_H
#define PSIKAPPA_THETA_LANG_H

#include "interp.h"
#include "series/spec.h"
#include "theta/theta.h"

/* Whether name is a class name this module evaluates (Theta) when the script has not bound it. */
int theta_is_class_name(const char *name);

/* The class Theta as a value (new reference); n is the node for messages. */
value *theta_class_value(interp *I, const node *n);

/* Whether v is a class expression holding Theta. */
int theta_in_value(const value *v);

/* int_{g,n} of an integrand holding Theta: Theta-linear terms by the Theta pushforward,
   Theta-free terms by the ordinary integral, terms with Theta^2 are zero.  New reference, or NULL
   after reporting an error at where. */
value *theta_integrate_value(interp *I, const node *where, slong g, slong n, const value *integrand);

/* theta_integrate_value through the results store, like every integral: looked up first, and
   saved when it took long enough.  --verify, genus 0 and unstable spaces bypass the store.
   New reference, or NULL after reporting an error at where. */
value *theta_integrate_stored(interp *I, const node *where, slong g, slong n, const value *integrand);

/* explain int_{g,n} ... for such an integrand: prints the reduction to <Theta | ...>_g numbers.
   Returns 0 after reporting an error. */
int theta_explain(interp *I, const node *where, slong g, slong n, const value *integrand);

/* <Name | tau_d>_g with Name = where->text (Theta is the only one): new reference or NULL. */
value *theta_correlator_value(interp *I, const node *where, slong g, const slong *d, slong n);

/* supervolume(g, n): V^Theta_{g,n}(L_1..L_n) as a polynomial in L_i and pi (declares L_i). */
value *theta_builtin_supervolume(interp *I, const node *call, value **args);

/* VTheta_{g,n} and supervolume(g, n) for evaluated g, n >= 0: V^Theta_{g,n}(L_1..L_n), declaring
   L_1..L_n.  New reference, or NULL after reporting at where. */
value *theta_supervolume_value(interp *I, const node *where, slong g, slong n);

/* The Virasoro (route 0) or KdV (route 1) table of the session, created on first use with the
   session's limits; NULL when memory is exhausted.  The interpreter owns it. */
theta_table *theta_lang_table(interp *I, int route);

/* Refuses (reporting at where) a genus beyond the engine's limit or whose Theta table would pass
   --max-table by estimate.  Returns 1 when the Theta numbers of genus g may be computed. */
int theta_genus_ok(interp *I, const node *where, slong g);

/* res = the planned Brezin-Gross-Witten specialisation P (spec_plan_build_theta) at the times t, by
   the Virasoro table; with --verify also by the KdV table, compared.  res is initialised by the
   caller.  Returns 0 after reporting an error at where. */
int theta_spec_evaluate(interp *I, const node *where, tseries *res, const spec_plan *P, const tseries *t);

/* Reports an engine status of the Theta routes at where (cancel, limits, inexact division). */
void theta_lang_report(interp *I, const node *where, int rc);

/* Releases the session's Theta tables (interp teardown). */
void theta_lang_clear(interp *I);

#endif
