/* Integrals: int_{g,n} (the router, router.c), correlators <tau_d>_g and the checks every
   route shares (integrate.c), explain (integral_explain.c), V_{g,n}(L) (volume_poly.c). */
#ifndef PSIKAPPA_INTEGRATE_H
#define PSIKAPPA_INTEGRATE_H

#include "interp.h"

/* int_{g,n} of a value. `where` locates errors. */
value *integrate_value(interp *I, const node *where, slong g, slong n, const value *integrand);
/* Prints the reduction of int_{g,n} integrand to the numbers of its engine, then its value. */
int integrate_explain(interp *I, const node *where, slong g, slong n, const value *integrand);
/* V_{g,n}(L_1..L_n) in Mirzakhani's normalisation, declaring L_1..L_n: by the volume engine
   when it should take it, else by the reduction. */
value *integrate_volume(interp *I, const node *where, slong g, slong n);
/* The same, kept for the run and in the results store (volume_cache.c); new reference. */
value *volume_cached(interp *I, const node *where, slong g, slong n);
void volume_cache_clear(interp *I);
/* Declares the formal variables L_1..L_n, their ring indices into vars[0..n);
   returns 0 after reporting an error at where. */
int integrate_declare_lengths(interp *I, const node *where, slong n, int *vars);
/* <tau_d>_g with the same limits and messages as integrals. */
value *integrate_correlator(interp *I, const node *where, slong g, const slong *d, slong n);

/* --- shared by the routes */

/* Returned by the integration callbacks when a stop was requested. */
#define INTEGRATE_CANCELLED (-1)

/* Reports an unstable or oversized space; returns 1 when (g, n) is usable. */
int integrate_space_ok(interp *I, const node *where, slong g, slong n);
/* Refuses, before any walk over it, an integrand whose tree is too large (router.c). */
int integrate_tree_ok(const node *where, const value *integrand);
/* Memo entries of the correlator table that correlators of genus g with `points` points
   need, `terms` being the reduction's correlator terms. */
double integrate_table_estimate(slong g, slong n, slong points, double terms);
/* Whether the table for correlators of genus g with n points is within the limits; reports. */
int integrate_table_ok(interp *I, const node *where, slong g, slong n);
/* Reports an engine status (WK_* or INTEGRATE_CANCELLED) in words: a cancellation first,
   then the code. */
void integrate_report_engine(const node *where, int rc);
/* res = <tau_d>_g by the KdV recursion when within --max-table: WK_OK, WK_LIMIT (out of
   reach; *why says why) or WK_CANCELLED. */
int integrate_compute_kdv(interp *I, fmpq_t res, slong g, const slong *d, slong n, const char **why);

/* d_1 + ... + d_n of a correlator's exponents (nonnegative), saturated at WORD_MAX / 2. */
slong integrate_exponent_sum(const slong *d, slong n);

#endif
