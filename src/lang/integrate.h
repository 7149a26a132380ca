/* Integrals: int_{g,n}, correlators, volume polynomials (integrate.c). */
#ifndef PSIKAPPA_INTEGRATE_H
#define PSIKAPPA_INTEGRATE_H

#include "interp.h"

/* int_{g,n} of a value (integrate.c). `where` locates errors. */
value *integrate_value(interp *I, const node *where, slong g, slong n, const value *integrand);
/* Prints the psi-only reduction of int_{g,n} integrand, then its value. */
int integrate_explain(interp *I, const node *where, slong g, slong n, const value *integrand);
/* V_{g,n}(L_1..L_n) in Mirzakhani's normalisation, declaring L_1..L_n. */
value *integrate_volume(interp *I, const node *where, slong g, slong n);
/* Declares the formal variables L_1..L_n, their ring indices into vars[0..n);
   returns 0 after reporting an error at where. */
int integrate_declare_lengths(interp *I, const node *where, slong n, int *vars);
/* --verify: compares the reference result slow (NULL: out of reach, nothing to compare) with
   the engine's fast. Takes both references; returns fast, or NULL after reporting. */
value *integrate_compare_routes(interp *I, const node *where, value *slow, value *fast);
/* <tau_d>_g with the same limits and messages as integrals. */
value *integrate_correlator(interp *I, const node *where, slong g, const slong *d, slong n);

#endif
