/* The language side of Norbury's class Theta (the engine is src/engines/theta/): the name Theta as a
   class, int_{g,n} of integrands holding Theta, <Theta | tau_...>_g, supervolume(g, n). */
#ifndef PSIKAPPA_THETA_LANG_H
#define PSIKAPPA_THETA_LANG_H

#include "interp.h"
#include "classes/cpoly.h"
#include "series/spec.h"
#include "theta/theta.h"

/* Whether name is a class name this module evaluates (Theta) when the script has not bound it. */
int theta_is_class_name(const char *name);

/* The class Theta as a value (new reference); n is the node for messages. */
value *theta_class_value(interp *I, const node *n);

/* Whether v is a class expression holding Theta. */
int theta_in_value(const value *v);

/* The Theta order of an additive term of an integrand: negative when it cannot be read. */
enum { TH_DEEP = -2, TH_BAD = -1, TH_FREE = 0, TH_LINEAR = 1, TH_SQUARE = 2 };

/* Calls fn on each additive term of e with its Theta order and its Theta-free rest (the term
   divided by Theta, for TH_LINEAR); returns 0 as soon as fn does. */
typedef int (*theta_term_visit)(void *data, const cx *term, int order, cx *rest);
int theta_each_term(const cx *e, theta_term_visit fn, void *data);

/* Reports why a term cannot be integrated with Theta, at its Theta node. */
void theta_report_bad(const node *where, const cx *term, int order);

/* Expands the Theta-free rest R of a Theta-linear term up to degree g-1 into P (made by
   cpoly_init_degree), reporting errors at their nodes; 1 on success. */
int theta_expand_rest(cpoly *P, const node *where, const cx *rest);
/* Whether genus g is within the Theta engine's reach and --max-table; reports at where. */
int theta_rest_genus_ok(interp *I, const node *where, slong g);

/* Splits an integrand holding Theta into the sum of its Theta-free terms and the sum of its
   Theta-linear terms (new references, NULL for an empty sum); terms with Theta^2 are zero and
   dropped. Returns 0 after reporting a term Theta cannot be read in. */
int theta_split_integrand(interp *I, const node *where, slong g, const cx *e, cx **free_part, cx **theta_part,
                          int *why);

/* Why an integral with Theta is 0, as bits: genus 0, Theta^2, no cofactor of degree g-1; and
   THETA_ZERO_NOT when some term may be nonzero. */
enum { THETA_ZERO_GENUS0 = 1, THETA_ZERO_SQUARE = 2, THETA_ZERO_DEGREE = 4, THETA_ZERO_NOT = 8 };
/* Says once per integral `where` why it is 0 (why without THETA_ZERO_NOT): the answer is right,
   but the question was probably not the one meant. */
void theta_warn_zero(interp *I, const node *where, slong g, slong n, int why);


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
